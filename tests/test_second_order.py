"""A peak at twice the wavelength of a stronger line is flagged as a possible second-order
diffraction artefact (a grating spectrometer without an order-sorting filter shows 253.7 nm
again near 507.4 nm; the doubling is the grating equation, m·λ = const). 253.7 nm is the
mercury resonance line in air (NIST Atomic Spectra Database, Hg I 253.65 nm; the value used
across data/emitters/emission_lines.csv). Invented spectra."""

from __future__ import annotations

import numpy as np

from uvcheck.assessment import AssessOptions, assess
from uvcheck.conditions import Conditions
from uvcheck.spectrum import Spectrum

WL = np.arange(200.0, 800.01, 0.5)


def _spectrum(extra_nm: float | None) -> Spectrum:
    rng = np.random.default_rng(2)
    v = 0.3 * np.exp(-0.5 * ((WL - 253.7) / 0.6) ** 2) + rng.normal(0, 1e-6, WL.size)
    if extra_nm is not None:
        v = v + 0.004 * np.exp(-0.5 * ((WL - extra_nm) / 0.9) ** 2)
    return Spectrum(WL, v, "irradiance", noise_floor=1e-6)


def _warnings(s: Spectrum) -> list[str]:
    a = assess(s, Conditions(measurement_distance_m=1.0), None, AssessOptions(uncertainty=False))
    return [w for w in a.to_dict()["warnings"] if "second diffraction order" in w]


def test_peak_at_twice_the_mercury_line_is_flagged():
    w = _warnings(_spectrum(507.4))
    assert len(w) == 1 and "507.4 nm" in w[0] and "253.7 nm" in w[0]


def test_peak_elsewhere_is_not_flagged():
    assert _warnings(_spectrum(480.0)) == []
    assert _warnings(_spectrum(None)) == []
