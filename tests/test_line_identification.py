"""A peak is named as a known line only when it is as narrow as a line.

A compact spectrometer shows a mercury or excimer line with its own resolution (typically
0.5–5 nm FWHM, common practice); an LED band is about 10 nm wide or more (common practice).
Before this rule an invented UV-C LED at 254.5 nm with a 12 nm FWHM was reported as "Hg 253.7
nm" and "Mercury 253.7 nm line: present", which also raised the mercury caution. Spectra here
are invented Gaussians on a small noisy floor (not real products); FWHM = 2.3548 σ for a
Gaussian (analytic).
"""

from __future__ import annotations

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.assessment import AssessOptions, assess
from uvcheck.conditions import Conditions
from uvcheck.features import LINE_MAX_FWHM_NM, find_lines, line_like
from uvcheck.spectrum import Spectrum


def _spectrum(centre: float, fwhm: float, step: float = 0.5, seed: int = 1) -> Spectrum:
    wl = np.arange(200.0, 800.0 + step / 2, step)
    rng = np.random.default_rng(seed)
    v = gaussian(wl, centre, fwhm / 2.3548, 1e-2) + 1e-7 + rng.normal(0, 1e-8, wl.size)
    return Spectrum(wl, v, "irradiance", noise_floor=1e-8)


@pytest.mark.parametrize("centre, label", [(253.7, "Hg 253.7 nm"), (365.0, "Hg 365.0 nm"),
                                           (222.0, "KrCl* 222 nm")])
def test_narrow_peaks_are_named_and_led_bands_are_not(centre, label):
    narrow = find_lines(_spectrum(centre, 1.5))
    assert [ln.identified_as for ln in narrow] == [label]
    assert narrow[0].fwhm_nm == pytest.approx(1.5, rel=0.1)
    led = find_lines(_spectrum(centre + 0.8, 12.0))
    assert len(led) == 1 and led[0].identified_as is None
    assert led[0].fwhm_nm == pytest.approx(12.0, rel=0.05)


def test_an_led_at_254_nm_is_not_a_mercury_lamp():
    d = assess(_spectrum(254.5, 12.0), Conditions(measurement_distance_m=0.2),
               options=AssessOptions(uncertainty=False)).to_dict()
    assert d["spectral"]["hg_253_7_present"] is False
    d = assess(_spectrum(253.7, 1.5), Conditions(measurement_distance_m=0.2),
               options=AssessOptions(uncertainty=False)).to_dict()
    assert d["spectral"]["hg_253_7_present"] is True


def test_coarse_grids_allow_the_width_they_impose():
    # on a 5 nm grid a line cannot look narrower than a few steps: it may still be named
    assert line_like(10.0, 5.0) and not line_like(10.0, 0.5)
    assert line_like(LINE_MAX_FWHM_NM, 0.1) and not line_like(LINE_MAX_FWHM_NM + 0.1, 0.1)
    assert line_like(None, 1.0)


def test_a_full_line_list_keeps_the_strongest_continuum_peaks():
    # a model's discrete lines come first; the continuum peaks that fill the rest of the list
    # are the strongest ones, not the shortest-wavelength ones (invented spectrum)
    wl = np.arange(300.0, 800.0, 0.5)
    v = sum(gaussian(wl, c, 1.0, a) for c, a in ((320, 1e-4), (340, 2e-4), (600, 5e-2), (700, 4e-2)))
    s = Spectrum(wl, v + 1e-9, "irradiance", noise_floor=1e-9, lines=((253.7, 1.0),))
    got = [round(ln.wavelength_nm) for ln in find_lines(s, min_relative=1e-4, max_lines=3)]
    assert got == [254, 600, 700]
