"""The Spectrum type and integration: analytic anchors (STYLE.md habit 9)."""

import math

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.errors import InputFormatError
from uvcheck.spectrum import Spectrum, integrate, restricted, scaled, total_integral
from uvcheck.weighting import constant_weighting, get_weighting


def test_validation_messages():
    with pytest.raises(InputFormatError, match="strictly increasing"):
        Spectrum([400.0, 399.0], [1.0, 1.0], "irradiance")
    with pytest.raises(InputFormatError, match="finite"):
        Spectrum([400.0, 401.0], [1.0, float("nan")], "irradiance")
    with pytest.raises(InputFormatError, match="positive"):
        Spectrum([0.0, 1.0], [1.0, 1.0], "irradiance")


def test_immutable():
    s = Spectrum([400.0, 401.0], [1.0, 2.0], "irradiance")
    with pytest.raises(ValueError):
        s.values[0] = 5.0
    with pytest.raises(AttributeError):
        s.quantity = "radiance"  # type: ignore[misc]


def test_gaussian_of_known_area():
    # analytic: the integral of a Gaussian of area A is A (within the ±6σ window)
    wl = np.arange(200.0, 600.0, 0.25)
    s = Spectrum(wl, gaussian(wl, 400.0, 8.0, 2.5), "irradiance")
    assert integrate(s, 200.0, 600.0).value == pytest.approx(2.5, rel=1e-6)
    # half of it lies below the centre
    assert integrate(s, 200.0, 400.0).value == pytest.approx(1.25, rel=1e-4)


def test_flat_spectrum_and_partition():
    # analytic: a flat spectrum of 1 W m^-2 nm^-1 integrates to the band width
    wl = np.arange(200.0, 800.5, 1.0)
    s = Spectrum(wl, np.ones(wl.size), "irradiance")
    assert integrate(s, 280.0, 315.0).value == pytest.approx(35.0)
    parts = sum(integrate(s, a, b).value for a, b in [(200, 280), (280, 315), (315, 400), (400, 800)])
    assert parts == pytest.approx(total_integral(s))


def test_flat_spectrum_against_weighting_area():
    # STYLE.md habit 9: a flat spectrum of 1 W m^-2 nm^-1 gives the integral of the weighting
    wl = np.arange(200.0, 400.01, 0.1)
    s = Spectrum(wl, np.ones(wl.size), "irradiance")
    S = get_weighting("S_actinic")
    x = np.linspace(200, 400, 20001)
    assert integrate(s, 200.0, 400.0, S).value == pytest.approx(np.trapezoid(S(x), x), rel=1e-4)


def test_line_gives_weight_at_line():
    # a monochromatic line of 1 W m^-2 at λ0 must give W(λ0): S(254) = 0.5 (IEC 62471 Table 4.1)
    s = Spectrum([200.0, 400.0], [0.0, 0.0], "irradiance", lines=((254.0, 1.0),))
    assert integrate(s, 200.0, 400.0, get_weighting("S_actinic")).value == pytest.approx(0.5)


def test_coverage_is_share_of_weighting_area():
    wl = np.arange(300.0, 401.0, 1.0)
    s = Spectrum(wl, np.ones(wl.size), "irradiance")
    r = integrate(s, 200.0, 400.0)
    assert r.coverage == pytest.approx(0.5)
    assert not r.complete
    uv = constant_weighting("flat", "flat", 200.0, 400.0)
    assert integrate(s, 200.0, 400.0, uv).coverage == pytest.approx(0.5, rel=1e-3)


def test_gaps_are_not_bridged():
    wl = np.concatenate([np.arange(200.0, 250.0, 1.0), np.arange(300.0, 401.0, 1.0)])
    s = Spectrum(wl, np.ones(wl.size), "irradiance", gaps_nm=((249.0, 300.0),))
    r = integrate(s, 200.0, 400.0)
    assert r.value == pytest.approx(49.0 + 100.0)
    assert r.coverage == pytest.approx(149.0 / 200.0)


def test_detection_limit_from_noise():
    # with iid noise σ per sample on a uniform grid of step h, σ(∫) = σ·h·sqrt(N) (trapezoid)
    wl = np.arange(0.0, 101.0, 1.0) + 300.0
    s = Spectrum(wl, np.zeros(wl.size), "irradiance", noise_floor=0.1)
    r = integrate(s, 300.0, 400.0)
    expected = 0.1 * math.sqrt(99 + 2 * 0.25)
    assert r.sigma == pytest.approx(expected)
    assert r.detection_limit == pytest.approx(3 * expected)


def test_scaled_and_restricted():
    s = Spectrum([300.0, 400.0, 500.0], [1.0, 1.0, 1.0], "relative")
    a = scaled(s, 2.0, "irradiance", {"method": "test"})
    assert a.quantity == "irradiance" and a.meta["scaling"][0]["method"] == "test"
    assert s.quantity == "relative"  # original untouched
    r = restricted(a, 350.0, 500.0)
    assert r.range_nm == (350.0, 500.0)
