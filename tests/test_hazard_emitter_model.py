"""Hazards moved from the measurement distance by the emitter model given (issue 8 review).

Before, hazards were always rescaled by the inverse-square law, while the germicidal figures
of the same report used the emitter model (a stated tube, say): two different irradiances at
one distance in one report. Now both use :func:`uvcheck.hazards.distance_factor`.

Sources of the check values:
* Keitz formula for a linear tube on its perpendicular bisector, E = Φ(2α + sin 2α)/(2π²Ld),
  α = arctan(L/2d) (Keitz, *Light Calculations and Measurements*, as NOTES.md §5 gives it);
  the ratio E(d₁)/E(d₀) is computed here from the formula, independently of geometry.py.
* IEC 62471:2006 §4.3.1: actinic UV exposure limit 30 J m⁻² effective (H = E_S·t), so
  t_max = 30/E_S s; the distance where t_max equals the exposure time is where E_S(d)·t = 30.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from conftest import zero_inputs

from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.hazards import distance_factor, distance_for_factor, evaluate_hazards
from uvcheck.spectrum import Spectrum

L_TUBE = 0.9  # invented lamp: a 0.9 m tube


def keitz(d: float, L: float = L_TUBE) -> float:
    """Keitz irradiance per watt [m⁻²] (the formula, written out here)."""
    a = math.atan(L / (2.0 * d))
    return (2.0 * a + math.sin(2.0 * a)) / (2.0 * math.pi ** 2 * L * d)


def tube_spectrum() -> Spectrum:
    """Invented low-pressure mercury-like spectrum: a 254 nm band on a small floor, W m⁻² nm⁻¹."""
    wl = np.arange(200.0, 801.0, 0.5)
    v = 1e-7 + 0.02 * np.exp(-0.5 * ((wl - 253.7) / 0.6) ** 2)
    return Spectrum(wl, v, "irradiance")


TUBE_AT_1M = Conditions(measurement_distance_m=1.0, emitter="tube", tube_length_m=L_TUBE)
POINT_AT_1M = Conditions(measurement_distance_m=1.0)


def test_distance_factor_is_the_keitz_ratio_for_a_tube():
    # Keitz formula written out above
    for d0, d1 in ((1.0, 0.2), (0.2, 1.0), (0.5, 3.0)):
        assert float(distance_factor(TUBE_AT_1M, d0, d1)) == pytest.approx(
            keitz(d1) / keitz(d0), rel=1e-12)
    # the point model is the inverse-square law, exactly
    assert distance_factor(POINT_AT_1M, 1.0, 0.2) == (1.0 / 0.2) ** 2


def test_distance_for_factor_inverts_the_factor():
    for r in (0.01, 0.5, 3.0, 40.0):
        d = distance_for_factor(TUBE_AT_1M, 1.0, r)
        assert r * float(distance_factor(TUBE_AT_1M, 1.0, d)) == pytest.approx(1.0, rel=1e-9)
    # arrays, element by element (the Monte Carlo path)
    rs = np.array([0.01, 0.5, 3.0])
    ds = distance_for_factor(TUBE_AT_1M, np.array([1.0, 1.0, 1.0]), rs)
    assert ds == pytest.approx([distance_for_factor(TUBE_AT_1M, 1.0, r) for r in rs], rel=1e-12)
    # nothing to reach: zero; within at 1 mm: 1 mm
    assert distance_for_factor(TUBE_AT_1M, 1.0, 0.0) == 0.0
    assert distance_for_factor(TUBE_AT_1M, 1.0, 1e-9) == 1e-3


def test_tube_hazards_at_200mm_use_the_keitz_ratio():
    s = tube_spectrum()
    tube = evaluate_hazards(s, TUBE_AT_1M)
    point = evaluate_hazards(s, POINT_AT_1M)
    assert tube.evaluation.distance_m == pytest.approx(0.2)  # IEC 62471: non-GLS at 200 mm
    k = keitz(0.2) / keitz(1.0)
    assert tube.evaluation.distance_factor == pytest.approx(k, rel=1e-12)
    assert point.evaluation.distance_factor == pytest.approx(25.0, rel=1e-12)
    es_t = tube.hazard("actinic_uv").value
    es_p = point.hazard("actinic_uv").value
    assert es_t == pytest.approx(es_p * k / 25.0, rel=1e-9)
    # IEC 62471 §4.3.1: t_max = 30 J m⁻² / E_S
    assert tube.hazard("actinic_uv").t_max_s == pytest.approx(30.0 / es_t, rel=1e-6)
    d = tube.to_dict()
    assert d["evaluation"]["distance_model"] == "tube"
    said = " ".join(d["evaluation"]["assumptions"])
    assert "tube emitter model" in said and "inverse-square law would give 25" in said
    assert any("linear-tube model" in n for n in d["notes"])


def test_tube_hazard_distance_meets_the_limit_by_keitz():
    s = tube_spectrum()
    tube = evaluate_hazards(s, TUBE_AT_1M)
    es_1m = tube.hazard("actinic_uv").value / tube.evaluation.distance_factor  # at 1 m
    dist = next(e for e in tube.hazard_distances.entries if e.hazard_id == "actinic_uv")
    t = TUBE_AT_1M.exposure_time_s
    # IEC 62471 §4.3.1: E_S(d)·t = 30 J m⁻² at the hazard distance, E_S(d) by Keitz
    assert es_1m * keitz(dist.distance_m) / keitz(1.0) * t == pytest.approx(30.0, rel=1e-6)
    # a tube falls slower than 1/d² beyond the measurement distance: farther than a point's
    point = evaluate_hazards(s, POINT_AT_1M)
    d_point = next(e for e in point.hazard_distances.entries if e.hazard_id == "actinic_uv")
    assert dist.distance_m > d_point.distance_m
    assert d_point.distance_m == pytest.approx(math.sqrt(es_1m * t / 30.0), rel=1e-9)


def test_hazards_and_germicidal_agree_on_the_irradiance_at_one_distance():
    s = tube_spectrum()
    cond = Conditions(measurement_distance_m=1.0, use_distance_m=0.2, emitter="tube",
                      tube_length_m=L_TUBE)
    hz = evaluate_hazards(s, cond)
    g = evaluate_germicidal(s, cond, distance_m=0.2)
    # the germicidal position's scaling factor and the hazards' factor at 0.2 m are one number
    assert g.position.scaling["factor"] == pytest.approx(hz.use_distance.evaluation.distance_factor,
                                                          rel=1e-12)


def test_lambertian_without_size_is_the_inverse_square_law_and_says_so():
    s = tube_spectrum()
    lam = evaluate_hazards(s, Conditions(measurement_distance_m=1.0, emitter="lambertian"))
    point = evaluate_hazards(s, POINT_AT_1M)
    assert lam.hazard("actinic_uv").value == pytest.approx(point.hazard("actinic_uv").value,
                                                           rel=1e-12)
    said = " ".join(lam.evaluation.assumptions)
    assert "inverse-square law here (no source size given)" in said


def test_tube_general_lighting_500_lx_distance_by_keitz():
    # an invented white tube for general lighting: the 500 lx distance solves E_v(d) = 500 lx
    wl = np.arange(380.0, 781.0, 1.0)
    v = 0.01 * np.exp(-0.5 * ((wl - 550.0) / 60.0) ** 2)
    cond = Conditions(measurement_distance_m=1.0, emitter="tube", tube_length_m=L_TUBE,
                      general_lighting=True)
    hz = evaluate_hazards(Spectrum(wl, v, "irradiance"), cond)
    ev_1m = hz.evaluation.illuminance_lx / hz.evaluation.distance_factor
    d = hz.evaluation.distance_m
    assert ev_1m > 500.0 and d > 0.2
    assert ev_1m * keitz(d) / keitz(1.0) == pytest.approx(500.0, rel=1e-6)


# ---------------------------------------------------------------------------------------------
# The Monte Carlo evaluation moves its draws by the same model
# ---------------------------------------------------------------------------------------------

def _mc(spec, cond, inputs, draws=400):
    from uvcheck.uncertainty import evaluate_uncertainty

    hz = evaluate_hazards(spec, cond)
    return hz, evaluate_uncertainty(spec, cond, hz, None, inputs, draws=draws, seed=7).to_dict()


def test_undrawn_tube_case_equals_the_hazards_module():
    # invariant: with every input uncertainty zero, every draw is the hazards.py result
    hz, r = _mc(tube_spectrum(), TUBE_AT_1M, zero_inputs())
    h = hz.hazard("actinic_uv")
    lo, hi = r["hazards"]["actinic_uv"]["interval_95"]
    assert lo == pytest.approx(h.value, rel=1e-12) and hi == pytest.approx(h.value, rel=1e-12)


def test_tube_distance_error_enters_by_the_keitz_slope():
    from uvcheck.uncertainty import Distribution

    # first order: u(E_S)/E_S = |d ln k / d ln d₀|·u(d₀)/d₀, with k(d₀) = keitz(0.2)/keitz(d₀)
    # (the Keitz formula above; for a point source the slope is 2)
    u_d = 0.02
    hz, r = _mc(tube_spectrum(), TUBE_AT_1M, zero_inputs(distance=Distribution("normal", u_d)),
                draws=4000)
    h = r["hazards"]["actinic_uv"]
    eps = 1e-6
    slope = (math.log(keitz(1.0 - eps)) - math.log(keitz(1.0 + eps))) / (2 * eps)
    assert 1.0 < slope < 2.0
    assert h["standard_uncertainty_first_order"] == pytest.approx(slope * u_d * h["value"],
                                                                 rel=1e-3)


def test_tube_distance_cancels_for_general_lighting_at_500lx():
    from uvcheck.uncertainty import Distribution

    # at the 500 lx distance E_hazard = E·500/E_v whatever the model and d₀ [derived]
    wl = np.arange(300.0, 1101.0, 1.0)
    spec = Spectrum(wl, 0.05 * np.exp(-0.5 * ((wl - 560.0) / 80.0) ** 2), "irradiance")
    cond = Conditions(measurement_distance_m=0.5, general_lighting=True, emitter="tube",
                      tube_length_m=L_TUBE)
    hz, r = _mc(spec, cond, zero_inputs(distance=Distribution("normal", 0.05)), draws=300)
    assert hz.evaluation.distance_m > 0.2
    lo, hi = r["hazards"]["blue_light"]["interval_95"]
    assert lo == pytest.approx(hi, rel=1e-6)


def test_terminal_names_the_model_of_the_hazard_distances():
    from uvcheck.assessment import AssessOptions, assess
    from uvcheck.report.jsonout import clean
    from uvcheck.report.terminal import render_assessment

    s = tube_spectrum()
    text = render_assessment(clean(assess(s, TUBE_AT_1M, None, AssessOptions()).to_dict()))
    assert "Hazard distances (tube emitter model given, an approximation" in text
    text = render_assessment(clean(assess(s, POINT_AT_1M, None, AssessOptions()).to_dict()))
    assert "Hazard distances (point-source inverse-square approximation" in text
