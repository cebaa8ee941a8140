"""Spectral features: noise floor, peak, centroid, FWHM and emission lines.

Pure functions on a :class:`~uvcheck.spectrum.Spectrum` or on raw arrays; numpy only.

Noise floor. Array spectrometers return noise around zero where the lamp emits nothing;
after dark subtraction half of those samples are negative. Two estimators are used:

* ``negative-samples``: with at least 8 negative samples, σ = RMS of the negative values
  (for zero-mean Gaussian noise the RMS of the negative half equals σ);
* ``second-difference``: otherwise, σ = 1.4826·MAD(Δ²v)/√6 over the lowest-signal quarter
  of the samples (the second difference of white noise has variance 6σ²; 1.4826·MAD is the
  usual robust estimate of a Gaussian σ).

The larger of the two is kept when both apply. A noise-free synthetic spectrum gives σ = 0.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from functools import lru_cache

import numpy as np

from uvcheck.data_files import read_table
from uvcheck.spectrum import Spectrum, median, quantile, remembered


@dataclass(frozen=True)
class NoiseEstimate:
    """Per-sample noise of a spectrum.

    sigma : 1-σ noise of one sample, in the spectrum's spectral unit (None: too few samples).
    method : ``negative-samples`` | ``second-difference`` | ``none``.
    n_samples : samples the estimate rests on.
    n_negative : negative samples in the spectrum.
    """

    sigma: float | None
    method: str
    n_samples: int
    n_negative: int

    def to_dict(self) -> dict:
        return {f.name: getattr(self, f.name) for f in fields(self)}  # flat: as asdict


def estimate_noise(values: np.ndarray) -> NoiseEstimate:
    """Estimate the per-sample noise floor from the data themselves.

    values : spectral values in sample order (any unit). [spectral unit]

    Examples
    --------
    >>> rng = np.random.default_rng(1)
    >>> v = np.concatenate([rng.normal(0, 0.01, 500), 1 + rng.normal(0, 0.01, 20)])
    >>> e = estimate_noise(v)
    >>> (e.method, round(e.sigma, 2))
    ('negative-samples', 0.01)
    """
    v = np.asarray(values, dtype=float)
    n = v.size
    neg = v[v < 0]
    estimates = []
    if neg.size >= 8:
        estimates.append((float(np.sqrt(np.mean(neg ** 2))), "negative-samples", int(neg.size)))
    if n >= 12:
        d2 = v[:-2] - 2 * v[1:-1] + v[2:]
        mid = v[1:-1]
        low = mid <= quantile(mid, 0.25)
        sel = d2[low]
        if sel.size >= 4:
            mad = median(np.abs(sel - median(sel)))
            estimates.append((1.4826 * mad / math.sqrt(6.0), "second-difference", int(sel.size)))
    if not estimates:
        return NoiseEstimate(None, "none", 0, int(neg.size))
    sigma, method, used = max(estimates, key=lambda e: e[0])
    return NoiseEstimate(sigma, method, used, int(neg.size))


@dataclass(frozen=True)
class PeakInfo:
    """Where the output is.

    peak_nm : wavelength of the highest spectral value (or strongest line). [nm]
    peak_value : the value there. [spectral unit]
    centroid_nm : ∫λE dλ / ∫E dλ over positive values. [nm]
    fwhm_nm : full width at half maximum of the main peak (None if it runs off the range). [nm]
    """

    peak_nm: float | None
    peak_value: float | None
    centroid_nm: float | None
    fwhm_nm: float | None

    def to_dict(self) -> dict:
        return {f.name: getattr(self, f.name) for f in fields(self)}  # flat: as asdict


def _fwhm(wl: np.ndarray, v: np.ndarray, i: int) -> float | None:
    half = v[i] / 2.0
    if not half > 0:
        return None
    # j: the last sample at or before i that is not above half (else 0); k: the first at or
    # after i (else the last sample) -- what walking outwards from i one sample at a time finds
    left = np.flatnonzero(v[:i + 1] <= half)
    j = int(left[-1]) if left.size else 0
    if v[j] > half:
        return None
    right = np.flatnonzero(v[i:] <= half)
    k = i + int(right[0]) if right.size else v.size - 1
    if v[k] > half:
        return None
    left = wl[j] + (half - v[j]) * (wl[j + 1] - wl[j]) / (v[j + 1] - v[j]) if v[j + 1] != v[j] else wl[j]
    right = wl[k - 1] + (v[k - 1] - half) * (wl[k] - wl[k - 1]) / (v[k - 1] - v[k]) if v[k - 1] != v[k] else wl[k]
    return float(right - left)


def peak_info(spectrum: Spectrum) -> PeakInfo:
    """Peak wavelength, centroid and FWHM of a spectrum.

    Examples
    --------
    >>> wl = np.arange(380.0, 420.0, 0.5)
    >>> s = Spectrum(wl, np.exp(-0.5 * ((wl - 400) / 5) ** 2), "relative")
    >>> p = peak_info(s); (p.peak_nm, round(p.fwhm_nm, 1))
    (400.0, 11.8)
    """
    return remembered(spectrum, ("peak_info",), lambda: _peak_info(spectrum))


def _peak_info(spectrum: Spectrum) -> PeakInfo:
    wl, v = spectrum.wavelength_nm, spectrum.values
    if wl.size >= 2 and np.any(v > 0):
        i = int(np.argmax(v))
        pos = np.clip(v, 0, None)
        area = float(np.trapezoid(pos, wl))
        centroid = float(np.trapezoid(pos * wl, wl) / area) if area > 0 else None
        return PeakInfo(float(wl[i]), float(v[i]), centroid, _fwhm(wl, v, i))
    if spectrum.lines:
        ln = max(spectrum.lines, key=lambda x: x.value)
        tot = sum(x.value for x in spectrum.lines if x.value > 0)
        cen = sum(x.value * x.wavelength_nm for x in spectrum.lines if x.value > 0) / tot if tot > 0 else None
        return PeakInfo(ln.wavelength_nm, ln.value, cen, None)
    return PeakInfo(None, None, None, None)


@lru_cache(maxsize=1)
def known_lines() -> tuple[dict, ...]:
    """Known emission lines of lamp technologies, from ``data/emitters/emission_lines.csv``."""
    t = read_table("emitters/emission_lines.csv")
    out = []
    for r in t.records():
        out.append({"wavelength_nm": float(r["wavelength_nm"]), "emitter": r["emitter"],
                    "label": r["label"], "source": r["source"],
                    "from_memory": r["from_memory"] == "yes"})
    return tuple(out)


@dataclass(frozen=True)
class DetectedLine:
    """A peak found in the spectrum.

    wavelength_nm : peak position (parabolic interpolation). [nm]
    height : value at the peak above the local baseline. [spectral unit]
    fwhm_nm : width, None if not resolvable. [nm]
    snr : height / noise σ (None without a noise estimate). [-]
    identified_as : label of a known line within tolerance, or None.
    """

    wavelength_nm: float
    height: float
    fwhm_nm: float | None
    snr: float | None
    identified_as: str | None

    def to_dict(self) -> dict:
        return {f.name: getattr(self, f.name) for f in fields(self)}  # flat: as asdict


def find_lines(spectrum: Spectrum, min_snr: float = 5.0, min_relative: float = 0.01,
               max_lines: int = 20) -> list[DetectedLine]:
    """Local maxima that stand out from the noise and from the spectrum's peak.

    spectrum : the spectrum (its ``noise_floor`` sets the SNR threshold).
    min_snr : a peak must be at least this many σ above its local baseline. [-]
    min_relative : and at least this fraction of the highest value. [-]
    max_lines : at most this many, strongest first, then sorted by wavelength.

    A peak's prominence is measured against the lower of the minima to its left and right
    (within ±20 nm). Identification: the nearest known line within max(1 nm, 1.5 × the
    sample spacing). Nominal line sources report their lines directly.
    """
    key = ("find_lines", float(min_snr), float(min_relative), int(max_lines))
    return list(remembered(spectrum, key, lambda: tuple(
        _find_lines(spectrum, min_snr, min_relative, max_lines))))


def _find_lines(spectrum: Spectrum, min_snr: float, min_relative: float,
                max_lines: int) -> list[DetectedLine]:
    if spectrum.lines and spectrum.wavelength_nm.size == 0:
        return [DetectedLine(ln.wavelength_nm, ln.value, None, None,
                             _identify(ln.wavelength_nm, 1.0)) for ln in spectrum.lines]
    wl, v = spectrum.wavelength_nm, spectrum.values
    if wl.size < 5 or not np.any(v > 0):
        return []
    vmax = float(v.max())
    sigma = spectrum.noise_floor or 0.0
    thr = max(min_snr * sigma, min_relative * vmax)
    cand = np.where((v[1:-1] >= v[:-2]) & (v[1:-1] > v[2:]))[0] + 1
    # a peak's baseline is at least the global minimum: drop candidates that cannot qualify
    cand = cand[v[cand] - float(v.min()) >= thr]
    if cand.size == 0:
        return []
    # prominence of every candidate at once: the lower of the minima within ±20 nm
    lo = np.searchsorted(wl, wl[cand] - 20.0)
    hi = np.searchsorted(wl, wl[cand] + 20.0, side="right")
    base = np.maximum(_window_min(v, lo, cand + 1), _window_min(v, cand, hi))
    prom = v[cand] - base
    keep = ~(prom < thr)
    cand, prom = cand[keep], prom[keep]
    # parabolic refinement of the positions
    y0, y1, y2 = v[cand - 1], v[cand], v[cand + 1]
    den = y0 - 2 * y1 + y2
    with np.errstate(divide="ignore", invalid="ignore"):
        shift = np.where(den != 0, 0.5 * (y0 - y2) / den, 0.0)
    pos = wl[cand] + shift * (wl[cand + 1] - wl[cand - 1]) / 2
    # the strongest max_lines (a stable sort, as the list of found lines was sorted)
    top = np.argsort(-prom, kind="stable")[:max_lines]
    found = []
    for k in top:
        i = int(cand[k])
        p = float(prom[k])
        step = float(wl[min(i + 1, wl.size - 1)] - wl[i - 1]) / 2
        found.append(DetectedLine(float(pos[k]), p, _fwhm(wl, v, i),
                                  p / sigma if sigma > 0 else None,
                                  _identify(float(pos[k]), max(1.0, 1.5 * step))))
    return sorted(found, key=lambda d: d.wavelength_nm)


def _window_min(v: np.ndarray, start: np.ndarray, stop: np.ndarray) -> np.ndarray:
    """min(v[start[k]:stop[k]]) for every k (stop > start), from a table of minima over
    windows of 2^j samples (a sparse table): two look-ups per window, exact."""
    length = stop - start
    levels = [v]
    j_of = np.frexp(length.astype(float))[1] - 1  # floor(log2(length)), exact for integers
    for j in range(1, int(j_of.max()) + 1):
        h = 1 << (j - 1)
        levels.append(np.minimum(levels[-1][:-h], levels[-1][h:]))
    out = np.empty(length.size)
    for j in sorted(set(j_of.tolist())):  # (numpy.unique would import numpy.ma)
        sel = j_of == j
        t = levels[int(j)]
        out[sel] = np.minimum(t[start[sel]], t[stop[sel] - (1 << int(j))])
    return out


def _identify(wavelength_nm: float, tol_nm: float) -> str | None:
    best = None
    for k in known_lines():
        d = abs(k["wavelength_nm"] - wavelength_nm)
        if d <= tol_nm and (best is None or d < best[0]):
            best = (d, k["label"])
    return None if best is None else best[1]
