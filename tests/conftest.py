"""Shared test helpers: synthetic spectra with analytically known integrals."""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.spectrum import Spectrum


def gaussian(wl: np.ndarray, centre: float, sigma: float, area: float) -> np.ndarray:
    """A Gaussian of given area [W m⁻²] (analytic integral = area)."""
    return area / (sigma * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((wl - centre) / sigma) ** 2)


def line_spectrum(centre_nm: float, value: float = 1.0, lo: float = 180.0, hi: float = 1400.0,
                  quantity: str = "irradiance") -> Spectrum:
    """A single monochromatic line of `value` [W m⁻²] on an empty continuum over [lo, hi]."""
    wl = np.array([lo, hi])
    return Spectrum(wl, np.zeros(2), quantity, lines=((centre_nm, value),))


@pytest.fixture
def grid() -> np.ndarray:
    return np.arange(200.0, 1000.0 + 1e-9, 0.5)


def zero_inputs(**changes):
    """Every input uncertainty switched off (the undrawn, nominal case)."""
    from uvcheck.uncertainty import Distribution, default_inputs

    base = default_inputs()
    z = base.with_(calibration_u_rel={b: 0.0 for b in base.bands},
                   wavelength_nm=Distribution("normal", 0.0),
                   distance=Distribution("normal", 0.0), stray_light_fraction=0.0,
                   include_noise=False, organism_spread=False)
    return z.with_(**changes) if changes else z
