"""Peak prominence in find_lines: the topographic prominence within a ±20 nm window.

Reference: SciPy's ``scipy.signal.peak_prominences`` (a general-purpose library; its
documentation defines the prominence as the peak's height above the higher of its two bases,
each the lowest point between the peak and the first higher sample or the window's border).
On a uniform grid of step 0.5 nm the ±20 nm window is ``wlen = 2 · 40 + 1`` samples.
The spectra are invented test data.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.signal import peak_prominences

from uvcheck.features import PROMINENCE_WINDOW_NM, _prominence, find_lines
from uvcheck.spectrum import Spectrum


def _gauss(wl, c, s, a):
    return a * np.exp(-0.5 * ((wl - c) / s) ** 2)


@pytest.mark.filterwarnings("ignore:some peaks have a prominence of 0")
@pytest.mark.parametrize("seed", range(20))
def test_prominence_is_scipys_with_a_window(seed):
    rng = np.random.default_rng(seed)
    wl = 200.0 + 0.5 * np.arange(1600)          # exact in binary: the window ends are exact
    v = rng.normal(0, 10 ** rng.uniform(-4, -2), wl.size)
    for _ in range(int(rng.integers(1, 5))):
        v += _gauss(wl, rng.uniform(220, 980), rng.uniform(0.5, 60), 10 ** rng.uniform(-2, 0))
    if seed % 4 == 0:
        v = np.round(v, 3)                      # plateaus and ties
    peaks = np.flatnonzero((v[1:-1] >= v[:-2]) & (v[1:-1] > v[2:])) + 1
    half = int(PROMINENCE_WINDOW_NM / 0.5)
    ref = peak_prominences(v, peaks, wlen=2 * half + 1)[0]
    lo = np.searchsorted(wl, wl[peaks] - PROMINENCE_WINDOW_NM)
    hi = np.searchsorted(wl, wl[peaks] + PROMINENCE_WINDOW_NM, side="right")
    ours = np.array([_prominence(v, int(i), int(a), int(b)) for i, a, b in zip(peaks, lo, hi)])
    # equal to scipy's, except for a peak with an equal sample to its right before any higher
    # one (our tie rule: that peak is measured to the dip between them, never more than scipy)
    for k, (i, b) in enumerate(zip(peaks, hi)):
        right = v[i + 1:b]
        stop = np.flatnonzero(right > v[i])
        tie = np.any(right[:stop[0] if stop.size else right.size] == v[i])
        if tie:
            assert ours[k] <= ref[k]
        else:
            assert ours[k] == ref[k], (seed, int(i))
    if seed % 4:
        assert np.array_equal(ours, ref)        # no ties in unrounded data


def test_two_equal_maxima_of_one_band_are_one_peak():
    # invented counts: a band at 258 nm written as whole counts, whose top holds two equal
    # maxima with a noise dip between them; scipy's prominence gives both the band's full
    # prominence (two peaks 0.65 nm apart), ours only the right one
    wl = 250.0 + 0.327 * np.arange(50)
    v = np.round(900 + 900 * np.exp(-0.5 * ((wl - 258.0) / 3.0) ** 2))
    i, j = int(np.argmin(np.abs(wl - 257.4))), int(np.argmin(np.abs(wl - 258.05)))
    v[i] = v[j] = v.max() + 5
    v[i + 1] = v[i] - 9
    s = Spectrum(wl, v, "irradiance", noise_floor=3.0)      # the 9-count dip is 3 σ: noise
    peaks = [x for x in find_lines(s, min_relative=0.0) if 255 < x.wavelength_nm < 261]
    assert len(peaks) == 1 and abs(peaks[0].wavelength_nm - 258.0) < 0.5
    ref = peak_prominences(v, np.array([i, j]), wlen=2 * int(20 / 0.327) + 1)[0]
    assert ref[0] > 100 and ref[1] > 100       # scipy: two peaks


def test_noise_on_a_broad_band_is_not_a_row_of_peaks():
    # an invented white-LED-like spectrum: a blue die at 450 nm and a broad phosphor band
    # near 560 nm, with sample noise; the ripples on the phosphor band used to be measured
    # against the band's foot 20 nm away and came out as peaks 1-2 nm apart
    rng = np.random.default_rng(3)
    wl = np.arange(380.0, 780.0, 0.5)
    sigma = 4e-4
    v = _gauss(wl, 450.0, 9.0, 0.05) + _gauss(wl, 560.0, 45.0, 0.03)
    v = v + rng.normal(0, sigma, wl.size)
    s = Spectrum(wl, v, "irradiance", noise_floor=sigma)
    found = [x.wavelength_nm for x in find_lines(s)]
    # (before: 14 peaks, 11 of them on the phosphor band between 554 and 569 nm)
    band = [x for x in found if 500 < x < 700]
    blue = [x for x in found if 440 < x < 460]
    assert len(band) == 1 and abs(band[0] - 560) <= 15, found
    assert len(blue) == 1 and abs(blue[0] - 450) <= 2, found


def test_a_shoulder_within_the_window_keeps_its_own_base():
    # two lines 10 nm apart: the smaller one's prominence is its height above the dip
    # between them (where the walk stops at the higher line), not above the floor
    wl = np.arange(240.0, 300.0, 0.5)
    v = 1e-6 + _gauss(wl, 254.0, 1.0, 1.0) + _gauss(wl, 264.0, 1.0, 0.2)
    s = Spectrum(wl, v, "irradiance", noise_floor=1e-6)
    small = next(x for x in find_lines(s) if abs(x.wavelength_nm - 264.0) < 1.0)
    i = int(np.argmin(np.abs(wl - 264.0)))
    dip = float(v[(wl > 256) & (wl < 262)].min())
    assert small.height == pytest.approx(float(v[i]) - dip, rel=1e-12)
