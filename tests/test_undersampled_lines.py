"""Lines narrower than the sampling step. The check values are derived here: a Gaussian line
of FWHM 1 nm (area σ√(2π), σ = FWHM/2.3548, the Gaussian integral) sampled at several steps
and offsets, and integrated by uvcheck's trapezoid rule; the rule of thumb in
uvcheck.features.UNDERSAMPLED_STEPS (2 steps) is our own, set from these numbers."""

from __future__ import annotations

import math

import numpy as np
import pytest

from uvcheck.assessment import AssessOptions, assess
from uvcheck.conditions import Conditions
from uvcheck.features import find_lines, undersampled_lines
from uvcheck.spectrum import Spectrum, integrate

FWHM = 1.0
SIG = FWHM / 2.3548


def line(step: float, offset: float) -> Spectrum:
    wl = np.arange(200.0, 400.0 + step / 2, step) + offset
    return Spectrum(wl, 1e-7 + np.exp(-0.5 * ((wl - 253.7) / SIG) ** 2), "irradiance",
                    noise_floor=1e-6)


def worst_error(step: float) -> float:
    errs = []
    for off in np.linspace(0.0, step, 7)[:-1]:
        s = line(step, off)
        got = integrate(s, 240.0, 270.0).value - 1e-7 * 30.0
        errs.append(abs(got / (SIG * math.sqrt(2 * math.pi)) - 1.0))
    return max(errs)


def test_the_trapezoid_error_grows_once_the_step_reaches_the_line_width():
    assert worst_error(0.5) < 1e-3          # two or more samples per FWHM: fine
    assert 0.02 < worst_error(1.0) < 0.08   # one sample per FWHM: several percent
    assert worst_error(2.0) > 0.5           # half a sample per FWHM: tens of percent


@pytest.mark.parametrize("step,flagged", [(0.25, False), (0.5, False), (1.0, True), (2.0, True)])
def test_undersampled_lines_are_the_ones_with_too_few_samples(step, flagged):
    s = line(step, 0.1)
    assert bool(undersampled_lines(s, find_lines(s))) is flagged


def test_assessment_warns_of_an_undersampled_line():
    a = assess(line(2.0, 0.1), Conditions(measurement_distance_m=0.2), None,
               AssessOptions(uncertainty=False))
    assert any("narrower than 2 sampling steps" in w for w in a.to_dict()["warnings"])
    fine = assess(line(0.25, 0.1), Conditions(measurement_distance_m=0.2), None,
                  AssessOptions(uncertainty=False))
    assert not any("sampling steps" in w for w in fine.to_dict()["warnings"])


def test_a_noise_spike_is_not_an_undersampled_line():
    # one sample 6 σ above a broad band: below the 20 σ the rule asks (our own rule)
    wl = np.arange(300.0, 900.0, 0.45)
    v = 4e-5 * np.exp(-0.5 * ((wl - 800.0) / 40.0) ** 2) + 2e-6
    v[np.argmin(abs(wl - 584.0))] += 6e-6
    s = Spectrum(wl, v, "irradiance", noise_floor=1e-6)
    assert undersampled_lines(s, find_lines(s)) == []
