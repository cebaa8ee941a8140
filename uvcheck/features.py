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
from dataclasses import asdict, dataclass
from functools import lru_cache

import numpy as np

from uvcheck.data_files import read_table
from uvcheck.spectrum import Spectrum


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
        return asdict(self)


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
        low = mid <= np.quantile(mid, 0.25)
        sel = d2[low]
        if sel.size >= 4:
            mad = float(np.median(np.abs(sel - np.median(sel))))
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
        return asdict(self)


def _fwhm(wl: np.ndarray, v: np.ndarray, i: int) -> float | None:
    half = v[i] / 2.0
    if not half > 0:
        return None
    j = i
    while j > 0 and v[j] > half:
        j -= 1
    if v[j] > half:
        return None
    k = i
    while k < v.size - 1 and v[k] > half:
        k += 1
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
        return asdict(self)


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
    found = []
    for i in cand:
        lo = int(np.searchsorted(wl, wl[i] - 20.0))
        hi = int(np.searchsorted(wl, wl[i] + 20.0, side="right"))
        base = max(float(v[lo:i + 1].min()), float(v[i:hi].min()))
        prom = float(v[i] - base)
        if prom < thr:
            continue
        # parabolic refinement of the position
        y0, y1, y2 = v[i - 1], v[i], v[i + 1]
        den = y0 - 2 * y1 + y2
        shift = 0.5 * (y0 - y2) / den if den != 0 else 0.0
        pos = float(wl[i] + shift * (wl[i + 1] - wl[i - 1]) / 2)
        step = float(wl[min(i + 1, wl.size - 1)] - wl[i - 1]) / 2
        found.append(DetectedLine(pos, prom, _fwhm(wl, v, int(i)),
                                  prom / sigma if sigma > 0 else None,
                                  _identify(pos, max(1.0, 1.5 * step))))
    found.sort(key=lambda d: -d.height)
    return sorted(found[:max_lines], key=lambda d: d.wavelength_nm)


def _identify(wavelength_nm: float, tol_nm: float) -> str | None:
    best = None
    for k in known_lines():
        d = abs(k["wavelength_nm"] - wavelength_nm)
        if d <= tol_nm and (best is None or d < best[0]):
            best = (d, k["label"])
    return None if best is None else best[1]
