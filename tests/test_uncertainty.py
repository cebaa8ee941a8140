"""Measurement uncertainty (Monte Carlo, first-order cross-check) and decision rules.

Sources of expected values (each test repeats the one it uses):
- S(λ): IEC 62471:2006 / CIE S 009:2002 Table 4.1 as copied into data/weightings/S_actinic_uv.csv
  (S(300) = 0.30, S(303) = 0.12, S(297) = 0.46, S(270) = 1.0, S(253.7) by log-linear
  interpolation between S(250) = 0.43 and S(254) = 0.5); the ICNIRP 2004 analytic form
  0.3·0.736^(λ−300) near 300 nm (quoted in the same file's header) as an independent check.
- Risk-group boundaries of E_S: IEC 62471:2006 Table 6.1, Exempt 0.001 and RG1 0.003 W m⁻²
  (reference notes §3: [memory], equal to 30 J m⁻² at the 30 000 / 10 000 s time bases [derived]).
- Normal quantiles: z(0.975) = 1.959964 (standard normal table); the standard error of an
  empirical p-quantile, sqrt(p(1−p)/M)/φ(z_p), is the binomial order-statistic result [derived].
- Decision rules: ILAC-G8:09/2019 §4.2 (simple acceptance w = 0; guard band AL = TL − w;
  pass / conditional pass / conditional fail / fail), read in a public transcription.
- GUM law of propagation: JCGM 100:2008 5.1 (first order); Monte Carlo: JCGM 101:2008.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from conftest import zero_inputs

from uvcheck.conditions import Conditions
from uvcheck.errors import ConfigurationError
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.hazards import evaluate_hazards
from uvcheck.inactivation import get_organism, log_for_percent
from uvcheck.spectrum import Line, Spectrum, integrate
from uvcheck.uncertainty import (MERGED_HAZARD_FIELDS, Distribution, coverage_indices, decide,
                                 default_inputs, evaluate_uncertainty, integral_coefficients,
                                 merge_into, organism_time_intervals, parse_calibration,
                                 parse_distance, parse_stray_light, parse_wavelength,
                                 render_uncertainty_lines, shifted_integral,
                                 uncertainty_options_from_cli)
from uvcheck.weighting import get_weighting

Z975 = 1.959964          # standard normal 97.5 % quantile (table value)
PHI_Z975 = 0.0584409     # standard normal density at z = 1.959964 (table value)
MODEL_RANGE = (180.0, 3000.0)
AT_200MM = Conditions(measurement_distance_m=0.2)


def line_source(wavelength_nm: float, irradiance_W_m2: float) -> Spectrum:
    return Spectrum([], [], "irradiance", lines=[Line(wavelength_nm, irradiance_W_m2)],
                    covered_nm=MODEL_RANGE)


def gaussian(wl, centre, width, peak):
    return peak * np.exp(-0.5 * ((wl - centre) / width) ** 2)


def run(spec, cond, inputs, draws=4000, seed=7, germ=False):
    hz = evaluate_hazards(spec, cond)
    gr = evaluate_germicidal(spec, cond) if germ else None
    return hz, evaluate_uncertainty(spec, cond, hz, gr, inputs, draws=draws, seed=seed)


def quantile_se(p: float, u: float, m: int) -> float:
    """Standard error of an empirical p-quantile of a normal output [derived]."""
    return math.sqrt(p * (1 - p) / m) / PHI_Z975 * u


# ---------------------------------------------------------------------------------------------
# The linear functionals reproduce integrate()
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("lo,hi,wid", [(200.0, 400.0, "S_actinic"), (315.0, 400.0, None),
                                       (300.0, 700.0, "B_blue"), (383.3, 1107.7, "R_thermal"),
                                       (150.0, 3000.0, None)])
def test_coefficients_reproduce_integrate(lo, hi, wid):
    # invariant: same trapezoid rule as uvcheck.spectrum.integrate, to rounding
    rng = np.random.default_rng(3)
    wl = np.sort(rng.uniform(190.0, 1200.0, 700))
    s = Spectrum(wl, rng.normal(1.0, 0.5, wl.size), "irradiance",
                 lines=[(253.7, 0.3), (404.7, 0.2), (1000.0, 0.1)],
                 gaps_nm=((500.0, 520.5),))
    w = None if wid is None else get_weighting(wid)
    c, cl = integral_coefficients(s, lo, hi, w)
    got = float(c @ s.values + cl @ np.array([ln.value for ln in s.lines]))
    assert got == pytest.approx(integrate(s, lo, hi, w).value, rel=1e-12, abs=1e-12)


# ---------------------------------------------------------------------------------------------
# Nominal (undrawn) case equals hazards.py
# ---------------------------------------------------------------------------------------------

NOMINAL_CASES = [
    ("mercury lines at 1 m", Spectrum(np.arange(200.0, 801.0, 0.5),
                                      gaussian(np.arange(200.0, 801.0, 0.5), 253.7, 0.6, 0.2)
                                      + gaussian(np.arange(200.0, 801.0, 0.5), 365.0, 0.6, 0.01)
                                      + gaussian(np.arange(200.0, 801.0, 0.5), 546.1, 0.6, 0.02),
                                      "irradiance"), Conditions(measurement_distance_m=1.0)),
    ("blue LED, large source (L_B)", Spectrum(np.arange(300.0, 1401.0, 1.0),
                                              gaussian(np.arange(300.0, 1401.0, 1.0), 450, 10, 0.5),
                                              "irradiance"),
     Conditions(measurement_distance_m=0.2, source_size_m=0.02)),
    ("white lamp, general lighting", Spectrum(np.arange(200.0, 1101.0, 1.0),
                                              gaussian(np.arange(200.0, 1101.0, 1.0), 560, 80, 0.05),
                                              "irradiance"),
     Conditions(measurement_distance_m=0.5, general_lighting=True)),
]


@pytest.mark.parametrize("name,spec,cond", NOMINAL_CASES, ids=[c[0] for c in NOMINAL_CASES])
def test_nominal_case_equals_hazards_module(name, spec, cond):
    # invariant: with every input uncertainty zero, every draw is the hazards.py result
    hz, r = run(spec, cond, zero_inputs(), draws=200)
    d = r.to_dict()["hazards"]
    for h in hz.hazards:
        u = d[h.id]
        if u["interval_95"] is None:
            continue
        assert u["interval_95"][0] == pytest.approx(h.value, rel=1e-12, abs=1e-300), h.id
        assert u["interval_95"][1] == pytest.approx(h.value, rel=1e-12, abs=1e-300), h.id
        if h.t_max_s is not None:
            assert u["t_max_interval_95_s"] == pytest.approx([h.t_max_s, h.t_max_s], rel=1e-12)
        if u["risk_group_probability"] is not None:
            assert u["risk_group_probability"][h.risk_group] == 1.0, h.id
            assert u["borderline"] is False


# ---------------------------------------------------------------------------------------------
# Issue test 1: Gaussian calibration on a single line reproduces the analytic interval
# ---------------------------------------------------------------------------------------------

def test_gaussian_calibration_single_line_analytic_interval():
    # A 270 nm line (S(270) = 1.0, IEC 62471 Table 4.1) of 0.002 W m-2 at 200 mm: E_S = 0.002.
    # Calibration factor f ~ N(1, 0.10) in the UV band only: E_S·f has the analytic 95 %
    # interval E_S·(1 ± 1.959964·0.10) (normal quantiles); Monte Carlo ends within 4 standard
    # errors of a 2.5 % quantile (derived), the first-order u exact (the model is linear).
    u_rel, e_s, m = 0.10, 0.002, 4000
    inputs = zero_inputs(calibration_u_rel={"UV": u_rel, "visible": 0.0, "IR": 0.0})
    _, r = run(line_source(270.0, e_s), AT_200MM, inputs, draws=m)
    h = r.to_dict()["hazards"]["actinic_uv"]
    se = quantile_se(0.025, u_rel * e_s, m)
    assert h["interval_95"][0] == pytest.approx(e_s * (1 - Z975 * u_rel), abs=4 * se)
    assert h["interval_95"][1] == pytest.approx(e_s * (1 + Z975 * u_rel), abs=4 * se)
    assert h["standard_uncertainty"] == pytest.approx(u_rel * e_s, rel=0.05)
    assert h["standard_uncertainty_first_order"] == pytest.approx(u_rel * e_s, rel=1e-9)
    # t_max = 30 J m-2 / E_S (IEC 62471 4.3): its interval is 30 / the interval ends, flipped
    assert h["t_max_interval_95_s"][0] == pytest.approx(30.0 / h["interval_95"][1], rel=1e-9)
    assert h["t_max_interval_95_s"][1] == pytest.approx(30.0 / h["interval_95"][0], rel=1e-9)


def test_coverage_index_rule():
    # JCGM 101:2008 7.7 (from memory): M = 4000, p = 0.95 -> q = 3800, r = 100: y(100), y(3900)
    assert coverage_indices(4000) == (99, 3899)
    # M - q odd: M = 1001, q = 951, r = (1001 - 951)/2 = 25 -> y(25), y(976)
    assert coverage_indices(1001) == (24, 975)


# ---------------------------------------------------------------------------------------------
# Issue test 2: a spectrum placed on a group boundary is borderline
# ---------------------------------------------------------------------------------------------

def test_spectrum_on_group_boundary_is_borderline():
    # E_S = 0.003 W m-2 exactly: the RG1 limit of IEC 62471:2006 Table 6.1 (RG1/RG2 boundary).
    # A 270 nm line (S = 1.0) at the 200 mm assessment distance; defaults (UV 5 %).
    _, r = run(line_source(270.0, 0.003), AT_200MM, default_inputs())
    h = r.to_dict()["hazards"]["actinic_uv"]
    assert h["risk_group"] == "RG1"            # the measured value meets the RG1 limit
    assert h["borderline"] is True
    assert h["boundaries_within_interval"] == ["RG1/RG2"]
    p = h["risk_group_probability"]
    # symmetric uncertainty around the boundary: about half the draws on each side
    assert p["RG1"] == pytest.approx(0.5, abs=0.05) and p["RG2"] == pytest.approx(0.5, abs=0.05)
    assert p["Exempt"] == 0.0 and p["RG3"] == 0.0
    ov = r.to_dict()["overall"]
    assert ov["borderline"] is True


def test_far_from_boundary_is_not_borderline():
    # E_S = 0.002 W m-2: midway between the Exempt (0.001) and RG1 (0.003) limits (Table 6.1)
    _, r = run(line_source(270.0, 0.002), AT_200MM, default_inputs())
    h = r.to_dict()["hazards"]["actinic_uv"]
    assert h["borderline"] is False and h["risk_group_probability"]["RG1"] == 1.0


def test_guarded_rule_classifies_by_the_upper_end():
    # On the RG1/RG2 boundary: simple acceptance keeps the measured group (RG1); guarded
    # acceptance accepts RG1 only when below its limit by U, so it says RG2 (ILAC-G8 §4.2.2)
    lamp = line_source(270.0, 0.003)
    _, simple = run(lamp, AT_200MM, default_inputs().with_(decision_rule="simple"))
    _, guarded = run(lamp, AT_200MM, default_inputs().with_(decision_rule="guarded"))
    assert simple.to_dict()["hazards"]["actinic_uv"]["risk_group_by_rule"] == "RG1"
    assert guarded.to_dict()["hazards"]["actinic_uv"]["risk_group_by_rule"] == "RG2"
    assert guarded.to_dict()["decision_rule"]["rule"] == "guarded"


# ---------------------------------------------------------------------------------------------
# Issue test 3: a 1 nm shift at 300 nm changes E_S by the factor S(λ) changes there
# ---------------------------------------------------------------------------------------------

S_TABLE_300_301 = (0.12 / 0.30) ** (1.0 / 3.0)   # log-linear between S(300) = 0.30, S(303) = 0.12


def test_wavelength_shift_at_300nm_follows_S_table():
    # IEC 62471 Table 4.1: S(300) = 0.30, S(303) = 0.12; log-linear interpolation gives
    # S(301)/S(300) = 0.4^(1/3) = 0.7368. ICNIRP 2004 analytic form: 0.736 per nm (within 0.2 %).
    S = get_weighting("S_actinic")
    line = line_source(300.0, 1.0)
    ratio = shifted_integral(line, 200.0, 400.0, S, 1.0) / shifted_integral(line, 200.0, 400.0, S, 0.0)
    assert ratio == pytest.approx(S_TABLE_300_301, rel=1e-9)
    assert ratio == pytest.approx(0.736, rel=2e-3)
    # A sampled narrow line inside one log-linear segment of the table (300.5-302.5 nm before
    # and after the shift, within 300-303 nm): S(λ + 1) = S(λ)·0.4^(1/3) for every sample, so
    # the ratio is exact whatever the line shape.
    wl = np.arange(295.0, 310.0, 0.02)
    narrow = Spectrum(wl, gaussian(wl, 301.0, 0.08, 1.0), "irradiance", covered_nm=(295.0, 310.0))
    r2 = shifted_integral(narrow, 200.0, 400.0, S, 1.0) / shifted_integral(narrow, 200.0, 400.0, S, 0.0)
    assert r2 == pytest.approx(S_TABLE_300_301, rel=1e-6)
    # across the table point at 300 nm the slope changes (S(297) = 0.46): a line centred on it
    # changes by a factor between the two segments' per-nm factors
    on = Spectrum(wl, gaussian(wl, 300.0, 0.3, 1.0), "irradiance", covered_nm=(295.0, 310.0))
    r3 = shifted_integral(on, 200.0, 400.0, S, 1.0) / shifted_integral(on, 200.0, 400.0, S, 0.0)
    assert S_TABLE_300_301 < r3 < (0.30 / 0.46) ** (1.0 / 3.0)


def test_wavelength_uncertainty_interval_at_300nm():
    # Rectangular ±1 nm, nothing else: E_S(δ) = E·S(300 + δ) decreases with δ, so the interval
    # is E·[S(300 + a), S(300 − a)] with a the 97.5 % quantile of U(−1, 1), 0.95 nm;
    # S(300 + a) = 0.3·0.4^(a/3), S(300 − a) = 0.3·(0.46/0.3)^(a/3) (Table 4.1: S(297) = 0.46).
    inputs = zero_inputs(wavelength_nm=Distribution("rectangular", 1.0))
    _, r = run(line_source(300.0, 1e-3), AT_200MM, inputs)
    lo, hi = r.to_dict()["hazards"]["actinic_uv"]["interval_95"]
    a = 0.95
    assert lo == pytest.approx(1e-3 * 0.3 * 0.4 ** (a / 3), rel=0.01)
    assert hi == pytest.approx(1e-3 * 0.3 * (0.46 / 0.3) ** (a / 3), rel=0.01)


# ---------------------------------------------------------------------------------------------
# First-order cross-check on a smooth case
# ---------------------------------------------------------------------------------------------

def test_first_order_matches_monte_carlo_on_smooth_spectrum():
    # A broad UV-A/violet band (smooth: the model is close to linear in every input) with all
    # inputs at their defaults plus a larger wavelength uncertainty; GUM first order (JCGM 100
    # 5.1) and the Monte Carlo standard deviation agree within 3 % (the Monte Carlo standard
    # deviation itself has a sampling error of 1/sqrt(2M) ≈ 1.1 % [derived]).
    wl = np.arange(250.0, 900.0, 1.0)
    spec = Spectrum(wl, gaussian(wl, 370.0, 25.0, 0.02), "irradiance", noise_floor=1e-6)
    inputs = default_inputs().with_(wavelength_nm=Distribution("normal", 1.0))
    _, r = run(spec, Conditions(measurement_distance_m=0.3), inputs, draws=8000)
    d = r.to_dict()["hazards"]
    for hid in ("actinic_uv", "near_uv", "blue_light", "skin_thermal"):
        h = d[hid]
        assert h["standard_uncertainty"] == pytest.approx(h["standard_uncertainty_first_order"],
                                                          rel=0.03), hid
        assert set(h["budget_first_order"]) == {"calibration", "wavelength", "distance",
                                                "stray_light", "noise"}


# ---------------------------------------------------------------------------------------------
# Properties
# ---------------------------------------------------------------------------------------------

def test_more_calibration_uncertainty_never_narrows_an_interval():
    wl = np.arange(200.0, 1000.0, 0.5)
    spec = Spectrum(wl, gaussian(wl, 254.0, 0.7, 0.1) + gaussian(wl, 450.0, 15.0, 0.01),
                    "irradiance", noise_floor=1e-6)
    cond = Conditions(measurement_distance_m=0.5, source_size_m=0.01)
    hz = evaluate_hazards(spec, cond)
    widths = []
    for u in (0.0, 0.02, 0.05, 0.1, 0.2):
        inputs = default_inputs().with_(calibration_u_rel={"UV": u, "visible": u / 2, "IR": u})
        d = evaluate_uncertainty(spec, cond, hz, None, inputs, draws=2000, seed=5).to_dict()
        widths.append({k: h["interval_95"][1] - h["interval_95"][0]
                       for k, h in d["hazards"].items() if h["interval_95"]})
    for a, b in zip(widths, widths[1:]):
        for k in a:
            assert b[k] >= a[k] * (1 - 1e-12), k


def test_seed_makes_output_byte_identical():
    wl = np.arange(200.0, 800.0, 0.5)
    spec = Spectrum(wl, gaussian(wl, 253.7, 0.6, 0.2) + gaussian(wl, 546.1, 0.6, 0.02),
                    "irradiance", noise_floor=2e-6)
    cond = Conditions(measurement_distance_m=1.0)
    a = json.dumps(run(spec, cond, default_inputs(), seed=11, germ=True)[1].to_dict(),
                   sort_keys=True, allow_nan=False)
    b = json.dumps(run(spec, cond, default_inputs(), seed=11, germ=True)[1].to_dict(),
                   sort_keys=True, allow_nan=False)
    c = json.dumps(run(spec, cond, default_inputs(), seed=12, germ=True)[1].to_dict(),
                   sort_keys=True, allow_nan=False)
    assert a == b
    assert a != c


def test_stray_light_only_lowers_uv():
    # the pedestal is subtracted (stray light only adds false signal): with nothing else
    # uncertain, the E_S interval ends at the measured value and extends below it
    wl = np.arange(200.0, 800.0, 1.0)
    white = gaussian(wl, 450.0, 20.0, 0.01) + 1e-6        # a flat 1e-6 floor in the UV
    spec = Spectrum(wl, white, "irradiance")
    inputs = zero_inputs(stray_light_fraction=1e-3)       # allowance 1e-5 > floor: capped
    hz, r = run(spec, AT_200MM, inputs)
    d = r.to_dict()
    lo, hi = d["hazards"]["actinic_uv"]["interval_95"]
    v = hz.hazard("actinic_uv").value
    assert hi <= v * (1 + 1e-12) and lo < v
    alw = d["method"]["stray_light_allowance"]
    assert alw["capped_by_data"] is True and alw["used"] < alw["nominal"]


def test_distance_cancels_for_general_lighting_at_500lx():
    # GLS lamps are assessed at the 500 lx distance (IEC 62471:2006), which moves with the
    # measurement distance: E_hazard ∝ E·500/E_v, independent of d₀ [derived]
    wl = np.arange(300.0, 1101.0, 1.0)
    spec = Spectrum(wl, gaussian(wl, 560.0, 80.0, 0.05), "irradiance")
    cond = Conditions(measurement_distance_m=0.5, general_lighting=True)
    inputs = zero_inputs(distance=Distribution("normal", 0.05))
    hz, r = run(spec, cond, inputs, draws=500)
    assert hz.evaluation.distance_m > 0.2
    lo, hi = r.to_dict()["hazards"]["blue_light"]["interval_95"]
    assert lo == pytest.approx(hi, rel=1e-9)
    # not general lighting: assessed at 200 mm, the distance error enters as (d₀'/d₀)²
    _, r2 = run(spec, Conditions(measurement_distance_m=0.5), inputs, draws=500)
    h2 = r2.to_dict()["hazards"]["blue_light"]
    assert h2["standard_uncertainty_first_order"] == pytest.approx(
        2 * 0.05 / 0.5 * h2["value"], rel=1e-3)


def test_organism_dose_drawn_log_uniformly_within_the_range():
    # MS2 in water at 254 nm (Rockey et al. 2021 row, k range 0.064-0.2 cm²/mJ base 10, as
    # in data/organisms): at a fixed irradiance E the 99.9 % time is dose/E with the dose
    # log-uniform on [a, b] = the range across studies, so the 95 % interval is
    # exp(ln a + {0.025, 0.975}·(ln b − ln a)) / E (log-uniform quantiles [derived]).
    o = get_organism("ms2_water_254_rockey2021")
    a, b = o.dose_range_for_log(log_for_percent(99.9))
    e = np.full(20000, 0.5)
    d = organism_time_intervals(o, e, seed=3)
    lo, hi = d["time_to_99_9_interval_95_s"]
    q = lambda p: math.exp(math.log(a) + p * (math.log(b) - math.log(a))) / 0.5
    assert lo == pytest.approx(q(0.025), rel=0.01) and hi == pytest.approx(q(0.975), rel=0.01)
    assert "log-uniformly" in d["organism_spread"]
    off = organism_time_intervals(o, e, seed=3, spread=False)
    assert off["time_to_99_9_interval_95_s"][0] == pytest.approx(off["time_to_99_9_interval_95_s"][1])


def test_germicidal_intervals_and_named_organisms():
    # A 253.7 nm line of 0.5 W m-2 at 1 m: UV-C and the 254-nm-equivalent get intervals
    # around the measured value; a named row with a range across studies gets a wider time
    # interval than with the lamp inputs alone.
    lamp = line_source(253.7, 0.5)
    cond = Conditions(measurement_distance_m=1.0)
    hz = evaluate_hazards(lamp, cond)
    gr = evaluate_germicidal(lamp, cond)
    ids = ["ms2_water_254_rockey2021"]
    r = evaluate_uncertainty(lamp, cond, hz, gr, default_inputs(), seed=2, organisms=ids)
    r0 = evaluate_uncertainty(lamp, cond, hz, gr, default_inputs().with_(organism_spread=False),
                              seed=2, organisms=ids)
    g, g0 = r.to_dict()["germicidal"], r0.to_dict()["germicidal"]
    assert g["uvc"]["interval_95"][0] < 0.5 < g["uvc"]["interval_95"][1]
    mf = g["equivalent_254"]["most_favourable"]
    assert mf["interval_95"][0] < mf["value"] < mf["interval_95"][1]
    iv = g["inactivation"][ids[0]]["time_to_99_9_interval_95_s"]
    iv0 = g0["inactivation"][ids[0]]["time_to_99_9_interval_95_s"]
    assert iv[1] - iv[0] > 2 * (iv0[1] - iv0[0])
    assert g["inactivation_most_susceptible"]          # the most susceptible rows are given
    for e in g["inactivation_most_susceptible"].values():
        t, ivm = e["time_to_99_9_s"], e["time_to_99_9_interval_95_s"]
        if t is not None and ivm is not None and "no range" in e["organism_spread"]:
            assert ivm[0] < t < ivm[1]


def test_relative_spectrum_not_evaluated():
    spec = Spectrum([300.0, 400.0, 500.0], [1.0, 2.0, 1.0], "relative")
    r = evaluate_uncertainty(spec, Conditions(), evaluate_hazards(spec), None)
    d = r.to_dict()
    assert d["status"] == "not-evaluated" and "relative" in d["reason"]
    json.dumps(d, allow_nan=False)


def test_partial_hazard_gives_lower_bound_probabilities():
    # a blue LED measured from 340 nm: actinic UV only partly measured (hazards.py: "at least")
    wl = np.arange(340.0, 801.0)
    led = Spectrum(wl, gaussian(wl, 450.0, 10.0, 1e-3), "irradiance")
    _, r = run(led, AT_200MM, default_inputs(), draws=500)
    h = r.to_dict()["hazards"]["actinic_uv"]
    assert h["interval_is_lower_bound"] is True
    assert h["risk_group_probability"] is None and h["lower_bound_group_probability"] is not None


def test_too_few_draws_refused():
    with pytest.raises(ConfigurationError, match="at least 100 draws"):
        evaluate_uncertainty(line_source(270.0, 1e-3), AT_200MM,
                             evaluate_hazards(line_source(270.0, 1e-3), AT_200MM), draws=50)


# ---------------------------------------------------------------------------------------------
# Decision rules (ILAC-G8:09/2019 §4.2)
# ---------------------------------------------------------------------------------------------

def test_simple_acceptance_decides_on_the_measured_value():
    # w = 0: pass when the measured value meets the limit, whatever the uncertainty
    assert decide(10.0, (8.0, 14.0), "simple", measured=10.5).verdict == "pass"
    assert decide(10.0, (8.0, 14.0), "simple", measured=9.9).verdict == "fail"
    d = decide(10.0, (8.0, 14.0), "simple", measured=10.5)
    assert d.guard_band == 0.0 and d.acceptance_limit == 10.0


def test_guarded_acceptance_needs_the_guard_band():
    # w = U (measured value to the interval end on the side of the limit): AL = TL + U
    d = decide(10.0, (9.0, 13.0), "guarded", measured=11.0)      # U = 2 -> AL = 12
    assert (d.verdict, d.expanded_uncertainty, d.acceptance_limit) == ("fail", 2.0, 12.0)
    assert decide(10.0, (12.5, 15.5), "guarded", measured=14.0).verdict == "pass"
    # an explicit guard band
    assert decide(10.0, (9.0, 13.0), "guarded", guard_band=0.5, measured=11.0).verdict == "pass"


@pytest.mark.parametrize("measured,interval,statement", [
    (14.0, (12.5, 15.5), "pass"),              # whole interval above the need
    (11.0, (9.0, 13.0), "conditional pass"),   # measured meets it, the interval straddles
    (9.0, (7.0, 11.0), "conditional fail"),    # measured short, the interval reaches it
    (6.0, (4.0, 8.0), "fail"),
])
def test_non_binary_statements(measured, interval, statement):
    # ILAC-G8:09/2019 §4.2: pass, conditional pass, conditional fail, fail (w = U)
    assert decide(10.0, interval, "simple", measured=measured).statement == statement


def test_limit_direction_for_safety():
    # at_most: an exposure value must stay under a limit
    samples = np.random.default_rng(0).normal(0.92, 0.05, 4000)
    d = decide(1.0, samples, "simple", direction="at_most")
    # conformance probability Φ((1.0 - 0.92)/0.05) = Φ(1.6) = 0.945 (normal table)
    assert d.verdict == "pass" and d.probability == pytest.approx(0.945, abs=0.01)
    g = decide(1.0, samples, "guarded", direction="at_most")
    # guarded: AL = 1.0 - U with U ≈ 1.96·0.05 = 0.098, and 0.92 > 0.902: fail
    assert g.verdict == "fail" and g.acceptance_limit == pytest.approx(1.0 - 0.098, abs=0.01)
    assert decide(1.0, samples - 0.05, "guarded", direction="at_most").verdict == "pass"
    verdict, p, basis = d
    assert "ILAC-G8" in basis and verdict == "pass"


def test_conformance_probability_at_the_limit_is_half():
    # simple acceptance at the limit: up to 50 % risk (ILAC-G8 §4.2.1); symmetric interval
    d = decide(10.0, (8.0, 12.0), "simple", measured=10.0)
    assert d.verdict == "pass" and d.probability == pytest.approx(0.5, abs=1e-12)


def test_decide_errors_name_the_choices():
    with pytest.raises(ConfigurationError, match="available: simple, guarded"):
        decide(1.0, 2.0, "strict")
    with pytest.raises(ConfigurationError, match="available: at_least, at_most"):
        decide(1.0, 2.0, "simple", direction="above")


# ---------------------------------------------------------------------------------------------
# Option texts and wiring
# ---------------------------------------------------------------------------------------------

def test_option_parsers():
    assert parse_calibration("10 %") == {"UV": 0.1, "visible": 0.1, "IR": 0.1}
    c = parse_calibration("UV=15 %,visible=5 %")
    assert c["UV"] == 0.15 and c["visible"] == 0.05 and c["IR"] == default_inputs().calibration_u_rel["IR"]
    assert parse_calibration("10 % k=2")["UV"] == pytest.approx(0.05)
    assert parse_wavelength("±0.5 nm") == Distribution("rectangular", 0.5)
    assert parse_wavelength("0.3 nm") == Distribution("normal", 0.3)
    assert parse_wavelength("0.6 nm k=2") == Distribution("normal", 0.3)
    assert parse_distance("2 cm") == (Distribution("normal", 0.02), False)
    assert parse_distance("±5") == (Distribution("rectangular", 0.005), False)   # bare: mm
    assert parse_distance("1 %") == (Distribution("normal", 0.01), True)
    assert parse_stray_light("0.01 %") == (pytest.approx(1e-4), None)
    assert parse_stray_light("2 uW/cm2/nm") == (None, pytest.approx(0.02))
    assert parse_stray_light("none") == (0.0, None)


def test_option_parser_errors():
    with pytest.raises(ConfigurationError, match="unknown band 'UVC'; available: UV, visible, IR"):
        parse_calibration("UVC=10 %")
    with pytest.raises(ConfigurationError, match="decision rule"):
        uncertainty_options_from_cli(decision_rule="strict")


def test_options_from_cli_mark_their_basis():
    u = uncertainty_options_from_cli(calibration="UV=15 %,visible=5 %", wavelength="±1 nm",
                                     distance="2 cm", stray_light="0.05 %", decision_rule="guarded")
    assert u.calibration_u_rel["UV"] == 0.15 and u.wavelength_nm.value == 1.0
    assert u.distance.value == 0.02 and u.stray_light_fraction == pytest.approx(5e-4)
    assert u.basis["calibration"].startswith("given") and u.basis["noise"]
    assert uncertainty_options_from_cli() == default_inputs()


def test_defaults_uv_larger_than_visible_and_labelled():
    d = default_inputs()
    assert d.calibration_u_rel["UV"] > d.calibration_u_rel["visible"]
    for key in ("calibration", "wavelength", "distance", "stray_light"):
        assert "common practice" in d.basis[key], key


def test_merge_into_and_renderer():
    wl = np.arange(200.0, 800.0, 0.5)
    spec = Spectrum(wl, gaussian(wl, 253.7, 0.6, 0.2), "irradiance", noise_floor=2e-6)
    cond = Conditions(measurement_distance_m=1.0)
    hz, r = run(spec, cond, default_inputs(), germ=True, draws=1000)
    d = {"hazards": hz.to_dict()["hazards"], "notes": []}
    merge_into(d, r)
    for hid, h in d["hazards"].items():
        for k in MERGED_HAZARD_FIELDS:
            assert k in h
    assert d["hazards"]["actinic_uv"]["interval_95"] == r.to_dict()["hazards"]["actinic_uv"]["interval_95"]
    assert d["uncertainty"]["decision_rule"]["rule"] == "simple"
    assert any(n.startswith("Uncertainty: Monte Carlo") and "simple acceptance" in n
               for n in d["notes"])
    json.dumps(d, allow_nan=False)
    lines = render_uncertainty_lines(d["uncertainty"])
    text = "\n".join(lines)
    assert "E_S" in text and "95 %" in text and "\x1b" not in text
    assert render_uncertainty_lines(d) == lines      # the whole dict works too


def test_terminal_marks_a_partly_measured_uvc_interval_as_a_lower_bound():
    # the UV-C line of the uncertainty block carries '≥' where UV-C was partly measured (an
    # invented 278 nm LED measured from 220 nm), as the hazard rows and the germicidal
    # section do; a fully measured UV-C line carries none
    import numpy as np

    from uvcheck.assessment import AssessOptions, assess
    from uvcheck.conditions import Conditions
    from uvcheck.spectrum import Spectrum
    from uvcheck.uncertainty import render_uncertainty_lines

    for start, mark in ((220.0, "≥ "), (200.0, "")):
        wl = np.arange(start, 701.0)
        v = 8e-3 * np.exp(-0.5 * ((wl - 278.0) / 5.5) ** 2) + 1e-7
        d = assess(Spectrum(wl, v, "irradiance", noise_floor=3e-6),
                   Conditions(measurement_distance_m=0.05), options=AssessOptions()).to_dict()
        line = next(x for x in render_uncertainty_lines(d) if x.strip().startswith("UV-C"))
        assert line.strip().startswith(f"UV-C {mark}") and f"(95 %: {mark}" in line, line
        assert (d["uncertainty"]["germicidal"]["uvc"]["interval_is_lower_bound"]) == bool(mark)


@pytest.mark.parametrize("reading, u", [("UV-A=1000 uW/cm2 ± 5 %", 0.05),
                                        ("UV-A=1000 uW/cm2 +/- 100 uW/cm2", 0.10),
                                        ("UV-A=1000 uW/cm2", None)])
def test_the_scaling_readings_uncertainty_reaches_every_value(tmp_path, reading, u):
    """A spectrum scaled by a radiometer reading carries that reading's uncertainty: one
    factor for every value, on top of the per-band calibration. E_UVA of the scaled spectrum is
    linear in the factor, so its first-order budget entry is E_UVA · u exactly (GUM, JCGM
    100:2008 5.1); with no uncertainty given, the default 10 % (k = 1, common practice)
    applies and the output says it is a default. Invented relative spectrum: a Gaussian at
    395 nm."""
    from conftest import gaussian
    from typer.testing import CliRunner

    from uvcheck.cli import app
    from uvcheck.uncertainty import SCALE_U_REL_DEFAULT

    wl = np.arange(250.0, 800.0, 1.0)
    p = tmp_path / "rel.csv"
    p.write_text("\n".join(f"{a},{b}" for a, b in zip(wl, gaussian(wl, 395, 6, 1.0) + 1e-5)))
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["assess", str(p), "--scale-band", reading, "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    assert d["input"]["scaling"][0]["reading_u_rel"] == (pytest.approx(u) if u else None)
    used = u if u else SCALE_U_REL_DEFAULT
    h = d["uncertainty"]["hazards"]["near_uv"]
    assert h["budget_first_order"]["scaling"] == pytest.approx(h["value"] * used, rel=1e-6)
    cal = d["uncertainty"]["inputs"]["calibration"]["u_rel_by_band"]["UV"]
    # Monte Carlo and first order agree on the combined relative uncertainty (≈ √(cal² + u²),
    # the wavelength term is small): within 5 % of each other with 4000 draws
    assert h["relative_standard_uncertainty"] == pytest.approx(
        h["standard_uncertainty_first_order"] / h["value"], rel=0.05)
    assert h["relative_standard_uncertainty"] > math.hypot(cal, used) * 0.97
    basis = d["uncertainty"]["inputs"]["scaling"]["basis"]
    assert basis.startswith("given") if u else "default" in basis
    assert f"scaling reading {100 * used:.3g} %" in r.output


def test_an_unscaled_spectrum_has_no_scaling_term():
    from uvcheck.uncertainty import default_inputs, scaling_uncertainty

    s = Spectrum(np.arange(200.0, 801.0), np.ones(601), "irradiance")
    inputs, note = scaling_uncertainty(s, default_inputs())
    assert inputs.scale_u_rel == 0.0 and note is None
