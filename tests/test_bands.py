"""Band breakdown: partition, coverage and detection-limit semantics (DESIGN.md rules)."""

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.bands import BANDS, band_breakdown
from uvcheck.spectrum import Spectrum


def test_partition_adds_up_to_total():
    wl = np.arange(180.0, 1400.0, 0.5)
    s = Spectrum(wl, np.ones(wl.size), "irradiance")
    b = band_breakdown(s)
    parts = [b[n].value for n, lo, hi, part, _ in BANDS if part]
    # analytic: flat 1 W m^-2 nm^-1 over 180–1399.5 nm
    assert sum(parts) == pytest.approx(1399.5 - 180.0)
    assert sum(b[n].fraction for n, *_r, part, _d in [(x[0], x[3], x[4]) for x in BANDS] if part) \
        == pytest.approx(1.0)


def test_band_values_of_gaussians():
    # two Gaussians of known area: 0.5 W/m² at 254 nm (UV-C) and 2 W/m² at 450 nm (visible)
    wl = np.arange(200.0, 800.0, 0.2)
    s = Spectrum(wl, gaussian(wl, 254.0, 2.0, 0.5) + gaussian(wl, 450.0, 10.0, 2.0), "irradiance")
    b = band_breakdown(s)
    assert b["UV-C"].value == pytest.approx(0.5, rel=1e-6)
    assert b["visible"].value == pytest.approx(2.0, rel=1e-4)
    assert b["UV-C"].fraction == pytest.approx(0.2, rel=1e-4)
    assert b["UV-C"].to_dict()["value_trade"] == pytest.approx(50.0, rel=1e-6)  # µW/cm²


def test_not_covered_is_none_never_zero():
    wl = np.arange(380.0, 780.0, 1.0)
    b = band_breakdown(Spectrum(wl, np.ones(wl.size), "irradiance"))
    assert b["UV-C"].status == "not-covered" and b["UV-C"].value is None
    assert b["UV-A"].status == "partial" and b["UV-A"].is_lower_bound


def test_below_detection_reported_as_limit():
    rng = np.random.default_rng(3)
    wl = np.arange(200.0, 800.0, 0.5)
    noise = 1e-6
    v = gaussian(wl, 400.0, 8.0, 0.01) + rng.normal(0.0, noise, wl.size)
    s = Spectrum(wl, v, "irradiance", noise_floor=noise)
    b = band_breakdown(s)
    assert b["UV-C"].status == "below-detection"
    assert b["UV-C"].value is None and b["UV-C"].detection_limit > 0
    assert b["UV-A"].status == "complete"


def test_relative_gives_fractions_only():
    wl = np.arange(200.0, 800.0, 1.0)
    b = band_breakdown(Spectrum(wl, np.ones(wl.size), "relative"))
    assert b["UV-C"].value is None
    assert b["UV-C"].fraction == pytest.approx(80 / 599)
