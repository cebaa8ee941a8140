"""IEC 62471 hazard evaluation: published check values, analytic anchors, honesty rules, JSON
contract and properties.

Sources of expected values (each test repeats the one it uses):
- C1-C4 (reference notes section 7): ACGIH/ICNIRP 8-h actinic limit 30 J m-2 effective;
  S(254) = 0.5, S(270) = 1.0, S(280) = 0.88 (IEC 62471:2006 Table 4.1, data/weightings);
  222 nm: 227-229 J m-2 depending on log-linear vs linear interpolation of S(λ).
- B(λ) 500-600 nm = 10^((450-λ)/50); R(λ) 700-1050 nm = 10^((700-λ)/500), 1050-1150 nm 0.2,
  1150-1200 nm 0.2·10^(0.02(1150-λ)), 1200-1400 nm 0.02 (IEC 62471:2006 Table 4.2 formulas,
  as recorded in the data/weightings headers).
- K_B,v of CIE illuminants A and D65: reference notes section 3, computed with colour-science
  0.4.7 (regression: not independently verified; no published figure at hand).
- Geometry: Ω = 4π sin²(γ/4), inverse-square law, illuminance = 683 lm/W · V(λ) · E.
"""

from __future__ import annotations

import doctest
import json
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import uvcheck.hazards as hz
import uvcheck.limits as lim
from uvcheck.conditions import Conditions
from uvcheck.errors import ConfigurationError
from uvcheck.hazards import STATUSES, evaluate_hazards
from uvcheck.limits import GROUPS, HAZARD_IDS, solid_angle_sr
from uvcheck.spectrum import Line, Spectrum, restricted, scaled
from uvcheck.weighting import get_weighting

MODEL_RANGE = (180.0, 3000.0)


def line_source(wavelength_nm: float, irradiance_W_m2: float, **kw) -> Spectrum:
    """A nominal single-line source with a declared model range of 180-3000 nm."""
    return Spectrum([], [], "irradiance", lines=[Line(wavelength_nm, irradiance_W_m2)],
                    covered_nm=MODEL_RANGE, **kw)


def gaussian(wl, centre, width, peak):
    return peak * np.exp(-0.5 * ((wl - centre) / width) ** 2)


AT_200MM = Conditions(measurement_distance_m=0.2)


# ---------------------------------------------------------------------------------------------
# Check values C1-C4: single lines under S(λ)
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("wl,dose_J_m2,rel", [
    (254.0, 60.0, 1e-12),          # C1: 6 mJ/cm² in 8 h (ACGIH/ICNIRP; S(254) = 0.5)
    (270.0, 30.0, 1e-12),          # C2: 3 mJ/cm² (S(270) = 1.0)
    (280.0, 30.0 / 0.88, 1e-12),   # C3: ≈ 3.4 mJ/cm² (S(280) = 0.88)
])
def test_single_line_daily_dose(wl, dose_J_m2, rel):
    e = 1.0   # strong enough that t_max falls inside the 30 000 s the daily limit covers
    h = evaluate_hazards(line_source(wl, e), AT_200MM).hazard("actinic_uv")
    assert h.status == "complete"
    assert e * h.t_max_s == pytest.approx(dose_J_m2, rel=rel)


def test_c1_8h_irradiance_254():
    # C1: the 8-h limit at 254 nm is 6 mJ/cm² → 60 J/m² / 28 800 s = 2.08 mW/m² (0.2 µW/cm²)
    e = 60.0 / 28800.0
    h = evaluate_hazards(line_source(254.0, e), AT_200MM).hazard("actinic_uv")
    assert h.t_max_s == pytest.approx(28800.0, rel=1e-12)


def test_c4_222nm_log_linear():
    # C4: 227-229 J/m² (reference notes); log-linear between S(220) = 0.12 and S(225) = 0.15
    s222 = 0.12 * (0.15 / 0.12) ** (2 / 5)
    e = 1.0
    h = evaluate_hazards(line_source(222.0, e), AT_200MM).hazard("actinic_uv")
    dose = e * h.t_max_s
    assert 227.0 <= dose <= 229.0
    assert dose == pytest.approx(30.0 / s222, rel=1e-12)
    assert any("log-linearly" in a for a in h.assumptions)


# ---------------------------------------------------------------------------------------------
# Weightings against their published formulas
# ---------------------------------------------------------------------------------------------

def round_sig(x: float, n: int) -> float:
    return float(f"{x:.{n}g}")


def _nodes(w, lo, hi):
    keep = (w.wavelength_nm >= lo) & (w.wavelength_nm <= hi)
    return w.wavelength_nm[keep], w.value[keep]


def test_blue_light_function_500_600():
    # IEC 62471:2006 Table 4.2: B(λ) = 10^((450-λ)/50) for 500-600 nm. The table is printed to
    # 3 significant figures at 0.01 and above, 2 below (e.g. 595 nm: 0.0013 for 0.001259).
    B = get_weighting("B_blue")
    wl, table = _nodes(B, 500.0, 600.0)
    assert wl.size == 21
    for x, t in zip(wl, table):
        f = 10 ** ((450 - x) / 50)
        assert t == round_sig(f, 3 if f >= 0.01 - 1e-12 else 2), x
    # between nodes B follows the log-linear interpolation of the printed nodes
    assert float(B(np.array([597.5]))[0]) == pytest.approx(math.sqrt(0.0013 * 0.001), rel=1e-12)


def test_retinal_thermal_function_700_1400():
    # IEC 62471:2006 Table 4.2: R = 10^((700-λ)/500) for 700-1050 nm, 0.2 for 1050-1150 nm,
    # 0.2·10^(0.02(1150-λ)) for 1150-1200 nm, 0.02 for 1200-1400 nm (the 1050 nm node is the
    # start of the flat piece). Nodes are stored to 6 significant figures.
    R = get_weighting("R_thermal")
    wl, table = _nodes(R, 700.0, 1400.0)
    f = np.select([wl < 1050, wl <= 1150, wl <= 1200],
                  [10 ** ((700 - wl) / 500), 0.2 * np.ones_like(wl), 0.2 * 10 ** (0.02 * (1150 - wl))],
                  0.02)
    assert wl.size == 141
    for x, t, e in zip(wl, table, f):
        assert t == pytest.approx(round_sig(e, 6), rel=1e-12), x
    # log-linear interpolation is exact for the exponential pieces between nodes
    mid = np.array([702.5, 877.5, 1162.5])
    assert np.allclose(R(mid), [10 ** (-2.5 / 500), 10 ** (-177.5 / 500), 0.2 * 10 ** (-0.25)],
                       rtol=5e-6)


# ---------------------------------------------------------------------------------------------
# Risk-group boundaries through the evaluator (Table 6.1, "does not exceed")
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("factor,group", [(1.0, "Exempt"), (1.001, "RG1"), (3.0, "RG1"),
                                          (3.01, "RG2"), (30.0, "RG2"), (30.1, "RG3")])
def test_actinic_groups_at_table_boundaries(factor, group):
    # Table 6.1: E_S 0.001 / 0.003 / 0.03 W m-2; a 270 nm line (S = 1) of E_S = factor × 1 mW m-2
    h = evaluate_hazards(line_source(270.0, factor * 1e-3), AT_200MM).hazard("actinic_uv")
    assert h.risk_group == group
    assert h.risk_group_bound == "exact" and not h.risk_group_is_lower_bound


@pytest.mark.parametrize("e_b,group", [(1.0, "Exempt"), (1.01, "RG2"), (400.0, "RG2"),
                                       (401.0, "RG3")])
def test_small_source_blue_light_groups(e_b, group):
    # Table 6.1 (from memory): E_B Exempt 1.0, RG1 1.0, RG2 400 W m-2: the RG1 band is empty.
    # A 440 nm line (B = 1).
    ev = evaluate_hazards(line_source(440.0, e_b), AT_200MM)
    h = ev.hazard("blue_light")
    assert h.symbol == "E_B" and h.value == pytest.approx(e_b)
    assert h.risk_group == group
    assert any("small source" in a for a in h.assumptions)


# ---------------------------------------------------------------------------------------------
# Honest coverage
# ---------------------------------------------------------------------------------------------

def test_blue_led_from_340nm_is_not_exempt_for_actinic_uv():
    wl = np.arange(340.0, 801.0)
    led = Spectrum(wl, gaussian(wl, 450, 10, 1e-3), "irradiance")
    ev = evaluate_hazards(led, AT_200MM)
    h = ev.hazard("actinic_uv")
    assert h.status == "partial" and 0.0 < h.coverage < 1.0
    assert h.risk_group == "Exempt" and h.risk_group_is_lower_bound
    assert h.risk_group_bound == "at-least" and h.risk_group_range == ("Exempt", "RG3")
    assert ev.risk_group.is_lower_bound
    assert "actinic_uv" in ev.risk_group.open_hazards


def test_partial_lower_bound_can_already_be_rg3():
    wl = np.arange(250.0, 801.0)
    lamp = Spectrum(wl, gaussian(wl, 270, 5, 1.0), "irradiance")
    h = evaluate_hazards(lamp, AT_200MM).hazard("actinic_uv")
    assert h.status == "partial" and h.risk_group == "RG3" and h.risk_group_is_lower_bound
    assert "upper bound" in h.t_max_note


def test_no_overlap_is_not_assessable():
    wl = np.arange(450.0, 801.0)
    s = Spectrum(wl, np.full(wl.size, 1e-3), "irradiance")
    h = evaluate_hazards(s, AT_200MM).hazard("actinic_uv")
    assert h.status == "not-assessable" and h.value is None and h.risk_group is None
    assert "no measured data in 200–400 nm" in h.reason


def test_relative_spectrum_gives_no_absolute_figure():
    wl = np.arange(200.0, 1101.0)
    ev = evaluate_hazards(Spectrum(wl, np.ones(wl.size), "relative"), AT_200MM)
    for h in ev.hazards:
        assert h.status == "not-assessable" and h.value is None and h.t_max_s is None
        assert "relative spectrum" in h.reason
    assert ev.risk_group.group is None
    assert ev.hazard_distances.entries[0].distance_m is None
    # K_B,v is a ratio: it still holds for a relative spectrum
    assert ev.blue_light_white_source.K_B_v_W_per_lm is not None


def test_flux_spectrum_not_assessable():
    wl = np.arange(200.0, 1101.0)
    ev = evaluate_hazards(Spectrum(wl, np.ones(wl.size), "flux"), AT_200MM)
    assert all(h.status == "not-assessable" and "flux" in h.reason for h in ev.hazards)


def test_below_detection_limit():
    wl = np.arange(200.0, 1101.0)
    s = Spectrum(wl, gaussian(wl, 450, 10, 1e-2), "irradiance", noise_floor=1e-6)
    h = evaluate_hazards(s, AT_200MM).hazard("actinic_uv")
    assert h.status == "below-detection"
    assert h.value == h.detection_limit and h.value_estimate < h.detection_limit
    # the detection limit is 3 σ (Integral.detection_limit)
    assert h.detection_limit == pytest.approx(3 * h.sigma)
    assert h.risk_group == "Exempt" and h.risk_group_bound == "exact"


def test_below_detection_above_exempt_is_at_most():
    wl = np.arange(200.0, 1101.0)
    s = Spectrum(wl, np.zeros(wl.size), "irradiance", noise_floor=1e-3)
    h = evaluate_hazards(s, AT_200MM).hazard("actinic_uv")
    assert h.status == "below-detection" and h.risk_group_bound == "at-most"
    assert h.risk_group_range[0] == "Exempt" and not h.risk_group_is_lower_bound


# ---------------------------------------------------------------------------------------------
# Geometry: α, fields of view, radiance and irradiance
# ---------------------------------------------------------------------------------------------

def test_radiance_hazards_need_alpha_for_irradiance_input():
    ev = evaluate_hazards(line_source(600.0, 1.0), AT_200MM)
    h = ev.hazard("retinal_thermal")
    assert h.status == "not-assessable" and "source size" in h.reason
    assert ev.risk_group.is_lower_bound


def test_blue_light_small_vs_large_source():
    lamp = line_source(440.0, 0.5)
    small = evaluate_hazards(lamp, Conditions(measurement_distance_m=0.2, source_size_m=0.001))
    large = evaluate_hazards(lamp, Conditions(measurement_distance_m=0.2, source_size_m=0.01))
    assert small.hazard("blue_light").symbol == "E_B"
    assert large.hazard("blue_light").symbol == "L_B"
    # α = 2 atan(0.01 / 0.4) = 0.049997 rad < 0.1: averaged over the 0.1 rad Exempt field
    assert large.hazard("blue_light").value == pytest.approx(0.5 / solid_angle_sr(0.1))
    rg1 = large.hazard("blue_light").group_limits[1]
    alpha = 2 * math.atan(0.01 / 0.4)
    assert rg1.fov_rad == pytest.approx(0.011) and rg1.value == pytest.approx(0.5 / solid_angle_sr(alpha))


def test_radiance_and_irradiance_inputs_agree():
    # E = L·Ω(α) for a uniform source: the same lamp given either way gives the same hazards
    wl = np.arange(200.0, 3001.0, 2.0)
    e = gaussian(wl, 450, 20, 1e-2) + gaussian(wl, 900, 100, 2e-3) + gaussian(wl, 280, 5, 1e-4)
    alpha = 0.02
    ev_e = evaluate_hazards(Spectrum(wl, e, "irradiance"), Conditions(alpha_rad=alpha))
    ev_l = evaluate_hazards(Spectrum(wl, e / solid_angle_sr(alpha), "radiance"),
                            Conditions(alpha_rad=alpha))
    for hid in HAZARD_IDS:
        a, b = ev_e.hazard(hid), ev_l.hazard(hid)
        assert a.status == b.status and a.risk_group == b.risk_group, hid
        if a.value is not None:
            assert a.value == pytest.approx(b.value, rel=1e-9), hid


def test_radiance_without_alpha_is_conservative():
    wl = np.arange(300.0, 1500.0, 2.0)
    L = Spectrum(wl, gaussian(wl, 800, 200, 100.0), "radiance")
    ev = evaluate_hazards(L, Conditions())
    h = ev.hazard("retinal_thermal")
    assert h.status == "complete" and h.alpha_rad == 0.1   # upper clamp: lowest limit
    assert ev.hazard("near_uv").status == "not-assessable"  # irradiance needs α


def test_retinal_thermal_alpha_clamp_and_averaging():
    # 600 nm line (R = 1), E = 1 W m-2, source α = 0.0005 rad < α_min = 0.0017:
    # averaged over α_min, limit uses α_min (IEC 62471:2006, from memory)
    ev = evaluate_hazards(line_source(600.0, 1.0), Conditions(alpha_rad=0.0005))
    h = ev.hazard("retinal_thermal")
    assert h.value == pytest.approx(1.0 / solid_angle_sr(0.0017))
    assert h.limit == pytest.approx(28000 / 0.0017) and h.alpha_rad == 0.0017


def test_weak_stimulus_gate():
    wl = np.arange(300.0, 1500.0, 1.0)
    ir = Spectrum(wl, gaussian(wl, 850, 15, 0.5), "irradiance")
    cond = Conditions(measurement_distance_m=0.2, source_size_m=0.003)
    assert evaluate_hazards(ir, cond).hazard("retinal_thermal_weak_stimulus").status == "complete"
    white = Spectrum(wl, gaussian(wl, 550, 80, 0.01) + gaussian(wl, 850, 15, 0.5), "irradiance")
    h = evaluate_hazards(white, cond).hazard("retinal_thermal_weak_stimulus")
    assert h.status == "not-applicable" and h.risk_group is None and "cd m⁻²" in h.reason


# ---------------------------------------------------------------------------------------------
# Distances
# ---------------------------------------------------------------------------------------------

def test_non_gls_assessed_at_200mm_with_inverse_square():
    e = 1e-3
    ev = evaluate_hazards(line_source(270.0, e), Conditions(measurement_distance_m=1.0))
    assert ev.evaluation.distance_m == 0.2 and ev.evaluation.rescaled
    assert ev.hazard("actinic_uv").value == pytest.approx(e * 25.0)   # (1 / 0.2)²
    assert any("inverse-square" in a for a in ev.evaluation.assumptions)


def test_gls_500_lx_rule():
    # 555 nm line: E_v = 683 lm/W · V(555) · E (V(555) = 1.0 within the table's digits)
    e = 10.0
    v555 = float(hz.v_lambda()(np.array([555.0]))[0])
    lamp = line_source(555.0, e)
    ev = evaluate_hazards(lamp, Conditions(measurement_distance_m=1.0, general_lighting=True))
    e_v = 683.0 * v555 * e
    assert ev.evaluation.distance_m == pytest.approx(1.0 * math.sqrt(e_v / 500.0))
    assert ev.evaluation.illuminance_lx == pytest.approx(500.0)
    # a dim lamp: 500 lx closer than 200 mm → 200 mm
    ev2 = evaluate_hazards(line_source(555.0, 0.01),
                           Conditions(measurement_distance_m=1.0, general_lighting=True))
    assert ev2.evaluation.distance_m == 0.2 and "closer than 200 mm" in ev2.evaluation.distance_rule


def test_no_measurement_distance_evaluates_in_place():
    ev = evaluate_hazards(line_source(270.0, 1e-3), Conditions())
    assert ev.evaluation.distance_m is None and "measurement position" in ev.evaluation.distance_rule
    assert ev.hazard("actinic_uv").value == pytest.approx(1e-3)
    assert all(e.distance_m is None for e in ev.hazard_distances.entries)


def test_hazard_distances_inverse_square():
    # 254 nm line, E = 0.1 W m-2 at 1 m: E_S = 0.05; 8 h needs E_S ≤ 30/28 800 → d = √(E_S/that)
    ev = evaluate_hazards(line_source(254.0, 0.1), Conditions(measurement_distance_m=1.0))
    d = {e.hazard_id: e for e in ev.hazard_distances.entries}["actinic_uv"]
    assert d.distance_m == pytest.approx(math.sqrt(0.05 * 28800 / 30))
    assert d.boundaries_m["Exempt"] == pytest.approx(math.sqrt(0.05 / 0.001))
    assert d.boundaries_m["RG2"] == pytest.approx(math.sqrt(0.05 / 0.03))
    assert ev.hazard_distances.governing_uv == "actinic_uv"


def test_hazard_distances_of_a_partly_measured_hazard_below_detection_are_not_bounded():
    # Invented spectrum measured from 260 nm only (E_S is weighted from 180 nm) with a UV
    # level under the detection limit: the measured part of E_S lies anywhere from 0 to the
    # detection limit and the unmeasured part is unknown, so a distance from the raw value
    # is neither a lower bound ("at least") nor an upper one (rule: DESIGN.md, detection
    # limits and coverage). With the UV level well above the detection limit the distances
    # are lower bounds again.
    wl = np.arange(260.0, 1000.0, 0.5)
    blue = 0.01 * np.exp(-0.5 * ((wl - 450.0) / 10.0) ** 2)
    cond = Conditions(measurement_distance_m=0.2)

    def actinic(level):
        s = Spectrum(wl, blue + level, "irradiance", noise_floor=2e-6)
        ev = evaluate_hazards(s, cond)
        h = ev.hazard("actinic_uv")
        return h, {e.hazard_id: e for e in ev.hazard_distances.entries}["actinic_uv"]

    h, d = actinic(4e-7)
    assert h.status == "partial" and 0 < h.value < h.detection_limit
    assert d.distance_m is None and d.bound is None and not any(d.boundaries_m.values())
    assert "bounded in neither direction" in d.note
    h, d = actinic(1e-4)
    assert h.value > 10 * h.detection_limit
    assert d.bound == "at-least" and d.distance_m is not None


def test_hazard_distance_blue_light_with_size_by_bisection():
    # With a size the blue-light variant changes with distance; at the found distance the
    # hazard must sit on its Exempt boundary.
    lamp = line_source(440.0, 2.0)
    cond = Conditions(measurement_distance_m=0.5, source_size_m=0.005)
    ev = evaluate_hazards(lamp, cond)
    d = {e.hazard_id: e for e in ev.hazard_distances.entries}["blue_light"]
    b = d.boundaries_m["Exempt"]
    near = evaluate_hazards(lamp, Conditions(measurement_distance_m=0.5, source_size_m=0.005,
                                             use_distance_m=b * 0.999)).use_distance
    far = evaluate_hazards(lamp, Conditions(measurement_distance_m=0.5, source_size_m=0.005,
                                            use_distance_m=b * 1.001)).use_distance
    assert near.hazard("blue_light").risk_group != "Exempt"
    assert far.hazard("blue_light").risk_group == "Exempt"


def test_use_distance_second_evaluation():
    ev = evaluate_hazards(line_source(270.0, 1e-2),
                          Conditions(measurement_distance_m=0.2, use_distance_m=2.0))
    assert ev.use_distance is not None
    assert ev.use_distance.evaluation.distance_m == 2.0
    assert ev.use_distance.hazard("actinic_uv").value == pytest.approx(1e-4)


# ---------------------------------------------------------------------------------------------
# Flags and white sources
# ---------------------------------------------------------------------------------------------

def test_uv_lamp_product_flag():
    hg = Spectrum([], [], "irradiance", lines=[Line(253.7, 1.0), Line(546.1, 0.1)],
                  covered_nm=MODEL_RANGE)
    u = evaluate_hazards(hg, AT_200MM).uv_lamp_product
    assert u.is_uv_lamp_product and u.determined and u.uv_fraction == pytest.approx(1 / 1.1)
    assert "IEC 62471-6:2022" in u.note
    wl = np.arange(380.0, 781.0)
    led = evaluate_hazards(Spectrum(wl, gaussian(wl, 450, 10, 1.0), "irradiance"), AT_200MM)
    assert led.uv_lamp_product.is_uv_lamp_product is False
    assert not led.uv_lamp_product.determined   # 180-380 nm unmeasured could hold UV


@pytest.mark.parametrize("name,expected", [("A", 3.10e-4), ("D65", 9.86e-4)])
def test_kbv_cie_illuminants(name, expected):
    # regression: reference notes section 3, computed with colour-science 0.4.7, not
    # independently verified and no published figure at hand. The integration grid and the
    # interpolation of B(λ) differ by up to ~1 %, hence rel=2e-2.
    colour = pytest.importorskip("colour")
    sd = colour.SDS_ILLUMINANTS[name]
    s = Spectrum(np.asarray(sd.wavelengths), np.asarray(sd.values), "relative")
    bw = evaluate_hazards(s).blue_light_white_source
    assert bw.status == "complete"
    assert bw.K_B_v_W_per_lm == pytest.approx(expected, rel=2e-2)
    assert bw.E_thr_lx == pytest.approx(1.0 / bw.K_B_v_W_per_lm)


def test_kbv_illuminant_a_formula_matches_table():
    # CIE 15: S_A(λ) = 100 (560/λ)^5 (e^(c2/(2848·560)) − 1)/(e^(c2/(2848 λ)) − 1),
    # c2 = 1.435e7 nm K. From the formula at 1 nm it must agree with the 5-nm table within 0.5 %.
    colour = pytest.importorskip("colour")
    wl = np.arange(300.0, 831.0)
    sa = 100 * (560 / wl) ** 5 * (np.exp(1.435e7 / (2848 * 560)) - 1) / (np.exp(1.435e7 / (2848 * wl)) - 1)
    k_formula = evaluate_hazards(Spectrum(wl, sa, "relative")).blue_light_white_source.K_B_v_W_per_lm
    sd = colour.SDS_ILLUMINANTS["A"]
    k_table = evaluate_hazards(Spectrum(np.asarray(sd.wavelengths), np.asarray(sd.values),
                                        "relative")).blue_light_white_source.K_B_v_W_per_lm
    assert k_formula == pytest.approx(k_table, rel=5e-3)


# ---------------------------------------------------------------------------------------------
# Limit sets
# ---------------------------------------------------------------------------------------------

def test_acgih_far_uvc_222nm_line():
    # ACGIH 2022 eye TLV at 222 nm: 161 mJ/cm² = 1610 J/m² (from memory, secondary): t_max·E
    e = 1.0
    ev = evaluate_hazards(line_source(222.0, e), AT_200MM, limit_set="acgih_2022_far_uvc")
    h = ev.hazard("actinic_uv")
    assert h.symbol == "E_S,eq" and h.t_max_s * e == pytest.approx(1610.0)
    assert h.also["t_max_s"] * e == pytest.approx(4790.0)    # skin 479 mJ/cm²
    assert ev.evaluation.limit_set == "acgih_2022_far_uvc"
    assert any("ACGIH" in n for n in ev.notes)


def test_icnirp_actinic_range_180_400():
    wl = np.arange(200.0, 401.0)
    s = Spectrum(wl, np.full(wl.size, 1e-6), "irradiance")
    assert evaluate_hazards(s, AT_200MM).hazard("actinic_uv").status == "complete"
    h = evaluate_hazards(s, AT_200MM, limit_set="icnirp_2013").hazard("actinic_uv")
    assert h.status == "partial" and h.risk_group_is_lower_bound
    assert any("180–400" in a for a in h.assumptions)


def test_unknown_limit_set():
    with pytest.raises(ConfigurationError, match="available: iec62471_2006"):
        evaluate_hazards(line_source(270.0, 1e-3), AT_200MM, limit_set="nope")


# ---------------------------------------------------------------------------------------------
# JSON contract
# ---------------------------------------------------------------------------------------------

HAZARD_KEYS = {"symbol", "value", "unit", "limit", "t_max_s", "risk_group",
               "risk_group_is_lower_bound", "coverage", "status", "assumptions"}


def test_json_contract():
    wl = np.arange(340.0, 1101.0)
    s = Spectrum(wl, gaussian(wl, 450, 10, 1e-2), "irradiance", noise_floor=1e-7)
    ev = evaluate_hazards(s, Conditions(measurement_distance_m=0.5, source_size_m=0.01,
                                        use_distance_m=1.0))
    d = ev.to_dict()
    json.dumps(d, allow_nan=False)
    assert set(d["hazards"]) == set(HAZARD_IDS)
    for hid, h in d["hazards"].items():
        assert HAZARD_KEYS <= set(h), hid
        assert h["status"] in STATUSES
        assert isinstance(h["assumptions"], list) and all(isinstance(a, str) for a in h["assumptions"])
        assert h["risk_group"] in (*GROUPS, None)
    assert {"group", "is_lower_bound", "governing"} <= set(d["risk_group"])
    assert {"distance_m", "distance_rule", "alpha_rad", "limit_set"} <= set(d["evaluation"])
    assert d["evaluation"]["limit_set"] == "iec62471_2006"
    assert d["limit_sets"]["available"][0] == "iec62471_2006"
    assert {"actinic_uv", "near_uv", "blue_light", "governing_uv"} <= set(d["hazard_distances"])
    assert {"K_B_v_W_per_lm", "E_thr_lx"} <= set(d["blue_light_white_source"])
    assert "is_uv_lamp_product" in d["uv_lamp_product"]
    assert set(d["use_distance"]) == {"evaluation", "hazards", "risk_group"}
    assert any("not a certification" in n for n in d["notes"])


def test_blue_light_symbol_small_source_in_json():
    d = evaluate_hazards(line_source(440.0, 0.1), AT_200MM).to_dict()
    assert d["hazards"]["blue_light"]["symbol"] == "E_B"
    assert d["hazards"]["blue_light"]["unit"] == "W m-2"


def test_doctests_run():
    for mod in (hz, lim):
        assert doctest.testmod(mod).failed == 0


# ---------------------------------------------------------------------------------------------
# Properties
# ---------------------------------------------------------------------------------------------

WL = np.arange(200.0, 1101.0, 2.0)


@st.composite
def lamps(draw):
    n = draw(st.integers(1, 3))
    y = np.full(WL.size, draw(st.floats(0.0, 1e-5)))
    for _ in range(n):
        y = y + gaussian(WL, draw(st.floats(220.0, 1000.0)), draw(st.floats(2.0, 60.0)),
                         draw(st.floats(1e-6, 1.0)))
    return Spectrum(WL, y, "irradiance")


sizes = st.one_of(st.none(), st.floats(0.0005, 0.05))
_settings = settings(max_examples=40, deadline=None,
                     suppress_health_check=[HealthCheck.too_slow])


def _lo(h) -> int | None:
    return None if h.risk_group_range is None else GROUPS.index(h.risk_group_range[0])


def _hi(h) -> int | None:
    return None if h.risk_group_range is None else GROUPS.index(h.risk_group_range[1])


@_settings
@given(lamps(), st.floats(1.0, 1000.0), sizes)
def test_scaling_up_never_lowers_value_or_group(lamp, k, size):
    cond = Conditions(measurement_distance_m=0.3, source_size_m=size)
    a = evaluate_hazards(lamp, cond)
    b = evaluate_hazards(scaled(lamp, k), cond)
    same_gate = a.hazard("retinal_thermal_weak_stimulus").status != "not-applicable" or \
        b.hazard("retinal_thermal_weak_stimulus").status == "not-applicable"
    for ha, hb in zip(a.hazards, b.hazards):
        if ha.status == "not-applicable" or hb.status == "not-applicable":
            continue   # the weak-stimulus gate (documented exception)
        if ha.value is not None and hb.value is not None:
            assert hb.value >= ha.value * (1 - 1e-12), ha.id
        if _lo(ha) is not None and _lo(hb) is not None:
            assert _lo(hb) >= _lo(ha), ha.id
    if same_gate and a.risk_group.group and b.risk_group.group:
        assert GROUPS.index(b.risk_group.group) >= GROUPS.index(a.risk_group.group)


@_settings
@given(lamps(), st.floats(0.05, 2.0), st.floats(1.01, 10.0), sizes)
def test_moving_closer_never_lowers_a_group(lamp, d_near, ratio, size):
    def at(d):
        return evaluate_hazards(lamp, Conditions(measurement_distance_m=0.5, source_size_m=size,
                                                 use_distance_m=d)).use_distance

    near, far = at(d_near), at(d_near * ratio)
    for hn, hf in zip(near.hazards, far.hazards):
        if _lo(hn) is not None and _lo(hf) is not None:
            assert _lo(hn) >= _lo(hf), hn.id
    if near.risk_group.group and far.risk_group.group:
        assert GROUPS.index(near.risk_group.group) >= GROUPS.index(far.risk_group.group)


@_settings
@given(lamps(), st.floats(200.0, 600.0), st.floats(300.0, 1100.0), sizes)
def test_removing_range_never_gives_a_better_group(lamp, lo, hi, size):
    if hi - lo < 20.0:
        return
    cond = Conditions(measurement_distance_m=0.3, source_size_m=size)
    full = evaluate_hazards(lamp, cond)
    cut = evaluate_hazards(restricted(lamp, lo, hi), cond)
    for hf, hc in zip(full.hazards, cut.hazards):
        if _hi(hf) is not None and _hi(hc) is not None:
            # the most favourable group the data allow never improves
            assert _hi(hc) >= _hi(hf), hf.id
        if hc.status == "complete" and hc.risk_group == "Exempt":
            assert hf.risk_group == "Exempt", hf.id
        if hf.value is not None and hc.value is not None and hc.status == "partial":
            assert hc.value <= hf.value * (1 + 1e-9) + 1e-300, hf.id
    if cut.risk_group.upper_bound and full.risk_group.upper_bound:
        assert GROUPS.index(cut.risk_group.upper_bound) >= GROUPS.index(full.risk_group.upper_bound)


# --- blue-light boundary distances for an extended source (audit issue 3) -------------------
# A line at 450 nm measured at 0.2 m from a 10 mm source (invented). B(450) = 0.9 (ICNIRP/IEC
# 62471 B(λ) table, as shipped in data/weightings). L_B limits (IEC 62471:2006 Table 6.1, L_B
# row, read in the document): Exempt 100, RG1 10 000, RG2 4·10⁶ W m⁻² sr⁻¹, fields 0.1, 0.011
# and 0.0017 rad (from memory); E_B small source (α < 0.011 rad, from memory): RG1 1 W m⁻².

def _blue_at(irradiance_W_m2):
    return evaluate_hazards(line_source(450.0, irradiance_W_m2),
                            Conditions(measurement_distance_m=0.2, source_size_m=0.01))


def test_blue_light_distances_follow_the_field_of_view():
    e_b = 2.0                                       # L ≈ 920 W m⁻² sr⁻¹: between Exempt and RG1
    d = _blue_at(e_b).to_dict()["hazard_distances"]["blue_light"]
    reg = d["regimes"]
    # derived: the source (s = 10 mm) fills a field γ within s / (2 tan(γ/2))
    assert reg["fills_field_within_m"]["Exempt"] == pytest.approx(0.01 / (2 * math.tan(0.05)))
    assert reg["small_source_beyond_m"] == pytest.approx(0.01 / (2 * math.tan(0.0055)))
    b_w = float(get_weighting("B_blue")(np.array([450.0]))[0])
    l_src = e_b * b_w / solid_angle_sr(2 * math.atan(0.01 / 0.4))   # L = E/Ω(α at 0.2 m)
    assert reg["source_radiance"] == pytest.approx(l_src, rel=1e-6)
    # L < 10 000: RG1 holds at every distance (the radiance does not fall while the field is
    # filled) -> no RG1 distance, and the note says why
    assert d["boundaries_m"]["RG1"] is None
    assert d["boundary_notes"]["RG1"].startswith("RG1 or lower at every distance")
    # Exempt: beyond 0.1 m the source underfills the 0.1 rad field; the average L·Ω(α)/Ω(0.1)
    # meets 100 W m⁻² sr⁻¹ at the boundary (derived)
    dx = d["boundaries_m"]["Exempt"]
    assert reg["fills_field_within_m"]["Exempt"] < dx < reg["small_source_beyond_m"]
    avg = l_src * solid_angle_sr(2 * math.atan(0.01 / (2 * dx))) / solid_angle_sr(0.1)
    assert avg == pytest.approx(100.0, rel=1e-6)
    assert "does not fall with distance" in d["meaning"]


def test_bright_blue_source_gets_an_rg1_distance_in_the_small_source_regime():
    e_b = 60.0                                      # L ≈ 2.8·10⁴ > 10 000 W m⁻² sr⁻¹: RG2 close by
    d = _blue_at(e_b).to_dict()["hazard_distances"]["blue_light"]
    b_w = float(get_weighting("B_blue")(np.array([450.0]))[0])
    # RG1 is reached only where the source is small (E_B, inverse square from 0.2 m):
    # E_B·(0.2/d)² = 1 W m⁻²  ->  d = 0.2·√(E_B)  (derived)
    d_rg1 = d["boundaries_m"]["RG1"]
    assert d_rg1 == pytest.approx(0.2 * math.sqrt(e_b * b_w), rel=1e-6)
    assert d_rg1 > d["regimes"]["small_source_beyond_m"]
    assert d["boundary_notes"]["RG2"].startswith("RG2 or lower at every distance")
