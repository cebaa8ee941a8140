"""The Monte Carlo uncertainty evaluation on long spectra: memory independent of the number of
samples beyond a few arrays, and the same coefficients as the unblocked trapezoid rule.

Sources of expected values:
- The trapezoid rule and the linear interpolation at the integration limits are those of
  uvcheck.spectrum.integrate (the reference below repeats the unblocked construction that
  uvcheck.uncertainty used before the coefficients were built in blocks).
- The memory bound is our own (the budget of tests/benchmarks/bench_big_file.py, 300 MB for
  10⁶ rows, common practice for this project); the bound here is deliberately generous: eight
  arrays of the spectrum's length, where the evaluation needs about four and the former one
  (an n × bands matrix and stray-light masks per integral) needed about forty.
"""

from __future__ import annotations

import tracemalloc

import numpy as np
import pytest

from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.hazards import evaluate_hazards
from uvcheck.spectrum import Spectrum, integrate, trapezoid_weights
from uvcheck.uncertainty import (COEF_BLOCK_SAMPLES, _searchsorted_shifted,
                                 evaluate_uncertainty, integral_coefficients)
from uvcheck.weighting import get_weighting


def reference_coefficients(spectrum, lo, hi, weight, shift):
    """The unblocked construction: the whole shifted axis at once (no lines here)."""
    wl = spectrum.wavelength_nm + shift
    n = wl.size
    c = np.zeros(n)
    for s0, s1 in spectrum.segments():
        a, b = max(lo, s0 + shift), min(hi, s1 + shift)
        if b <= a:
            continue
        a_d, b_d = max(a, wl[0]), min(b, wl[-1])
        if b_d <= a_d:
            continue
        i0 = int(np.searchsorted(wl, a_d, side="right"))
        i1 = int(np.searchsorted(wl, b_d, side="left"))
        t = trapezoid_weights(np.concatenate(([a_d], wl[i0:i1], [b_d])), weight)
        c[i0:i1] += t[1:-1]
        for xe, te in ((a_d, t[0]), (b_d, t[-1])):
            j = min(max(int(np.searchsorted(wl, xe, side="right")) - 1, 0), n - 2)
            frac = (xe - wl[j]) / (wl[j + 1] - wl[j])
            c[j] += te * (1.0 - frac)
            c[j + 1] += te * frac
    return c


def long_spectrum(n: int) -> Spectrum:
    wl = np.linspace(200.0, 1100.0, n)
    v = 1e-3 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + 1e-6
    return Spectrum(wl, v, "irradiance", noise_floor=1e-7, gaps_nm=((600.0, 600.5),))


@pytest.mark.parametrize("lo,hi,wid", [(200.0, 400.0, "S_actinic"), (300.0, 700.0, "B_blue"),
                                       (383.3, 1107.7, "R_thermal"), (250.0, 1000.0, None)])
@pytest.mark.parametrize("shift", [0.0, 0.37, -0.5])
def test_blocked_coefficients_equal_the_unblocked_rule(lo, hi, wid, shift):
    # invariant: building the coefficients in blocks changes no coefficient (the trapezoid
    # weight of a node depends on its neighbours only); the spectrum spans several blocks
    s = long_spectrum(3 * COEF_BLOCK_SAMPLES + 123)
    w = None if wid is None else get_weighting(wid)
    c, _ = integral_coefficients(s, lo, hi, w, shift)
    ref = reference_coefficients(s, lo, hi, w, shift)
    assert np.array_equal(c, ref)
    if shift == 0.0:   # and they reproduce integrate() (uvcheck.spectrum), to rounding
        assert float(c @ s.values) == pytest.approx(integrate(s, lo, hi, w).value, rel=1e-12)


def test_searchsorted_on_the_shifted_axis_without_forming_it():
    # invariant: the same index as np.searchsorted(wl + shift, x), ties and rounding included
    rng = np.random.default_rng(5)
    wl = np.sort(rng.uniform(200.0, 400.0, 5000))
    wl[100:110] = wl[100]                      # repeated values
    for shift in (0.0, 0.1, -0.3, 1e-13, 0.7):
        ws = wl + shift
        xs = np.concatenate((ws[::97], rng.uniform(190.0, 410.0, 200), [ws[0], ws[-1]]))
        for x in xs:
            for side in ("left", "right"):
                assert _searchsorted_shifted(wl, shift, float(x), side) == \
                    int(np.searchsorted(ws, x, side=side))


def test_monte_carlo_memory_does_not_grow_with_the_number_of_samples():
    # regression (issue 7): the evaluation kept an n × bands matrix and n-long stray-light
    # masks per integral and copied 40 × n for the stray-light cap (about 40 arrays of the
    # spectrum's length at 200 000 samples); the bound of 8 arrays is our own, generous
    n = 200_000
    s = long_spectrum(n)
    cond = Conditions(measurement_distance_m=0.2)
    hz, g = evaluate_hazards(s, cond), evaluate_germicidal(s, cond)
    tracemalloc.start()
    try:
        r = evaluate_uncertainty(s, cond, hz, g, draws=200, seed=1)
        peak = tracemalloc.get_traced_memory()[1]
    finally:
        tracemalloc.stop()
    assert r.status == "evaluated"
    assert peak < 8 * n * 8, f"peak {peak / 1e6:.1f} MB for one array of {n * 8 / 1e6:.1f} MB"


def test_no_interval_around_a_hazard_below_its_detection_limit():
    # the bundled mercury tube (invented data) measured to 800 nm: E_IR is partly measured and
    # its measured part is below the detection limit; its interval would straddle zero
    import json
    from pathlib import Path

    from typer.testing import CliRunner

    from uvcheck.cli import app

    ex = Path(__file__).resolve().parents[1] / "examples" / "spectra" / "mercury_tube_254nm.txt"
    r = CliRunner().invoke(app, ["assess", str(ex), "--distance", "1 m", "--json", "-", "--quiet"])
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout[r.stdout.index("{"):])
    ir = d["uncertainty"]["hazards"]["ir_eye"]
    assert ir["interval_95"] is None and "detection limit" in ir["note"]
    for hid, h in d["uncertainty"]["hazards"].items():
        if h.get("interval_95"):
            assert h["interval_95"][0] >= 0, hid


def test_draws_are_centred_on_the_reported_radiance_of_an_extended_source():
    # an invented 450 nm band measured at 0.05 m from a 0.05 m source, evaluated at 0.2 m:
    # the hazards derive L_B from the irradiance with the source's solid angle at the
    # measurement distance (radiance invariance); the Monte Carlo must use the same rule, so
    # its mean sits on the reported value (within the spread of the calibration draws)
    import numpy as np

    from uvcheck.conditions import Conditions
    from uvcheck.hazards import evaluate_hazards
    from uvcheck.spectrum import Spectrum
    from uvcheck.uncertainty import evaluate_uncertainty

    wl = np.arange(380.0, 781.0, 1.0)
    s = Spectrum(wl, 0.5 * np.exp(-0.5 * ((wl - 450) / 10) ** 2), "irradiance")
    c = Conditions(measurement_distance_m=0.05, source_size_m=0.05)
    hz = evaluate_hazards(s, c)
    u = evaluate_uncertainty(s, c, hz, draws=2000, seed=1).to_dict()
    for hid in ("blue_light", "retinal_thermal"):
        h = hz.hazard(hid)
        assert h.symbol in ("L_B", "L_R")
        assert u["hazards"][hid]["mean"] == pytest.approx(h.value, rel=0.02), hid
