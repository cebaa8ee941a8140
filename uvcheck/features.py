"""Spectral features: noise floor, peak, centroid, FWHM and emission lines.

Pure functions on a :class:`~uvcheck.spectrum.Spectrum` or on raw arrays; numpy only.

Noise floor. Array spectrometers return noise around zero where the lamp emits nothing;
after dark subtraction half of those samples are negative. Two estimators are used:

* ``negative-samples``: with at least 8 negative samples, σ = RMS of the negative values
  (for zero-mean Gaussian noise the RMS of the negative half equals σ);
* ``second-difference``: otherwise, σ = 1.4826·MAD(Δ²v)/√6 over the lowest-signal quarter
  of the samples (the second difference of white noise has variance 6σ²; 1.4826·MAD is the
  usual robust estimate of a Gaussian σ).

The larger of the two is kept when both apply.

Dynamic-range floor. Noise-free data (a synthetic spectrum, a model, heavily smoothed or
fitted data) give an estimate near zero (1e-173 is possible), which would make every tail of
a Gaussian "measured" and give detection limits no instrument has. No spectrometer resolves
more than about 1e-6 to 1e-9 of its own peak in one spectrum (array spectrometers far less;
only scanning double monochromators approach 1e-8), so σ is never taken below
:data:`DYNAMIC_RANGE_FLOOR` (1e-6, common practice) times the largest magnitude in the data.
When the floor sets σ the method is ``dynamic-range floor`` and the estimate from the data
is kept in ``data_sigma`` / ``data_method``. An all-zero spectrum keeps σ = 0.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from functools import lru_cache
from typing import Sequence

import numpy as np

from uvcheck.data_files import read_table
from uvcheck.spectrum import Spectrum, grid_weights, median, quantile, remembered


@dataclass(frozen=True)
class NoiseEstimate:
    """Per-sample noise of a spectrum.

    sigma : 1-σ noise of one sample, in the spectrum's spectral unit (None: too few samples).
    method : ``negative-samples`` | ``second-difference`` | ``dynamic-range floor`` | ``none``.
    n_samples : samples the estimate rests on.
    n_negative : negative samples in the spectrum.
    data_sigma : the estimate from the data themselves, before the floor. [spectral unit]
    data_method : the estimator that gave ``data_sigma``.
    floor : the dynamic-range floor, ``floor_fraction`` × the largest magnitude. [spectral unit]
    floor_fraction : :data:`DYNAMIC_RANGE_FLOOR` (common practice). [-]
    basis : one sentence on how σ was obtained (why the floor, when it applies).
    """

    sigma: float | None
    method: str
    n_samples: int
    n_negative: int
    data_sigma: float | None = None
    data_method: str | None = None
    floor: float | None = None
    floor_fraction: float | None = None
    basis: str = ""

    def to_dict(self) -> dict:
        return {f.name: getattr(self, f.name) for f in fields(self)}  # flat: as asdict


#: Smallest per-sample noise σ, as a fraction of the largest magnitude in the spectrum (common
#: practice: no spectrometer resolves more than about 1e-6 to 1e-9 of its peak in one
#: spectrum; array spectrometers reach 1e-3 to 1e-5, scanning double monochromators about
#: 1e-8; the strictest end of that range is used, so that a value is reported as measured only
#: where an instrument could have measured it). [-]
DYNAMIC_RANGE_FLOOR = 1e-6


def dynamic_range_floor(values: np.ndarray, fraction: float = DYNAMIC_RANGE_FLOOR) -> float:
    """``fraction`` × the largest finite magnitude of ``values`` (0 for an all-zero spectrum).
    [spectral unit]

    >>> dynamic_range_floor(np.array([0.0, 2.0, -0.5]))
    2e-06
    """
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    return float(fraction * np.max(np.abs(v))) if v.size else 0.0


#: A spectrum sits below zero when its deepest dip exceeds its highest point this many times
#: (with more than half of its samples negative): our own rule, see :func:`negative_dominated`.
NEGATIVE_DIP_RATIO = 3.0


def negative_dominated(values: np.ndarray) -> tuple[int, int] | None:
    """(negative samples, samples) when a spectrum sits below zero as a whole, else None.

    Dark-subtracted noise is negative in about half of the samples where a lamp emits
    nothing, so a narrow emitter measured over a wide range can have half its samples
    negative; but its peak stands far above the noise. A spectrum is taken to be below zero
    when more than half of its samples are negative *and* its deepest dip is more than 3
    times its highest point (our own rule: a sign-flipped or swapped dark subtraction, a
    dark taken with the lamp on, the wrong column).

    Examples
    --------
    >>> negative_dominated(np.array([-0.1, 0.05, -0.02, 5.0, -0.03]))   # noise and a peak
    >>> negative_dominated(-np.array([0.1, 0.05, 0.02, 5.0, 0.03]))
    (5, 5)
    """
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    n = int(v.size)
    n_neg = int(np.count_nonzero(v < 0))
    if n == 0 or 2 * n_neg <= n:
        return None
    if not -float(v.min()) > NEGATIVE_DIP_RATIO * max(float(v.max()), 0.0):
        return None
    return n_neg, n


def estimate_noise(values: np.ndarray, floor_fraction: float = DYNAMIC_RANGE_FLOOR) -> NoiseEstimate:
    """Estimate the per-sample noise floor from the data themselves.

    values : spectral values in sample order (any unit). [spectral unit]
    floor_fraction : σ is at least this fraction of the largest magnitude in ``values``
        (the dynamic-range floor; 0 turns it off). [-]

    Examples
    --------
    >>> rng = np.random.default_rng(1)
    >>> v = np.concatenate([rng.normal(0, 0.01, 500), 1 + rng.normal(0, 0.01, 20)])
    >>> e = estimate_noise(v)
    >>> (e.method, round(e.sigma, 2))
    ('negative-samples', 0.01)

    A noise-free Gaussian: the estimate from the data is ~0, the floor sets σ.

    >>> g = estimate_noise(np.exp(-0.5 * ((np.arange(200.0, 800.0) - 450) / 10) ** 2))
    >>> (g.method, g.sigma, g.data_method)
    ('dynamic-range floor', 1e-06, 'second-difference')
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
        return NoiseEstimate(None, "none", 0, int(neg.size),
                             basis="too few samples to estimate the noise")
    sigma, method, used = max(estimates, key=lambda e: e[0])
    floor = dynamic_range_floor(v, floor_fraction) if floor_fraction > 0 else 0.0
    frac = floor_fraction if floor_fraction > 0 else None
    if floor > 0 and sigma < floor:
        basis = (f"the noise estimated from the data ({method}, {sigma:.3g}) is below "
                 f"{floor_fraction:g} of the largest value, which no spectrometer resolves "
                 f"(common practice): σ is set to that dynamic-range floor; noise-free data "
                 f"are synthetic, modelled or smoothed")
        return NoiseEstimate(floor, "dynamic-range floor", used, int(neg.size), data_sigma=sigma,
                             data_method=method, floor=floor, floor_fraction=frac, basis=basis)
    basis = f"estimated from the data ({method}, {used} samples)"
    if floor > 0:
        basis += f"; above the dynamic-range floor ({floor_fraction:g} of the largest value)"
    return NoiseEstimate(sigma, method, used, int(neg.size), data_sigma=sigma, data_method=method,
                         floor=floor if frac else None, floor_fraction=frac, basis=basis)


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
    j = _last_not_above(v, i, half)
    j = 0 if j is None else j
    if v[j] > half:
        return None
    k = _first_not_above(v, i, half)
    k = v.size - 1 if k is None else k
    if v[k] > half:
        return None
    left = wl[j] + (half - v[j]) * (wl[j + 1] - wl[j]) / (v[j + 1] - v[j]) if v[j + 1] != v[j] else wl[j]
    right = wl[k - 1] + (v[k - 1] - half) * (wl[k] - wl[k - 1]) / (v[k - 1] - v[k]) if v[k - 1] != v[k] else wl[k]
    return float(right - left)


#: The first window :func:`_last_not_above` and :func:`_first_not_above` look in (samples);
#: each further window is four times the last. Half maximum lies within a few samples of
#: most peaks, so the search seldom reads far.
_SEARCH_WINDOW = 32


def _last_not_above(v: np.ndarray, i: int, level: float) -> int | None:
    """The last index j <= i with v[j] <= level, or None: what np.flatnonzero(v[:i + 1] <=
    level)[-1] gives, looking in growing windows back from i."""
    stop, step = i + 1, _SEARCH_WINDOW
    while stop > 0:
        start = max(0, stop - step)
        idx = np.flatnonzero(v[start:stop] <= level)
        if idx.size:
            return start + int(idx[-1])
        stop, step = start, step * 4
    return None


def _first_not_above(v: np.ndarray, i: int, level: float) -> int | None:
    """The first index k >= i with v[k] <= level, or None (np.flatnonzero(v[i:] <= level)[0]
    + i), looking in growing windows on from i."""
    start, step = i, _SEARCH_WINDOW
    while start < v.size:
        stop = min(v.size, start + step)
        idx = np.flatnonzero(v[start:stop] <= level)
        if idx.size:
            return start + int(idx[0])
        start, step = stop, step * 4
    return None


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
        c = grid_weights(spectrum)   # the trapezoid rule on this grid, as one dot product
        area = float(np.dot(c, pos))
        centroid = float(np.dot(c, pos * wl) / area) if area > 0 else None
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

    A peak's prominence is its height above the higher of its two bases: on each side, the
    lowest value between the peak and the first sample higher than the peak, or the end of a
    ±20 nm window (the topographic prominence, as ``scipy.signal.peak_prominences`` computes
    it with a window). A noise ripple on a broad band is therefore measured against the
    ripple beside it, not against the foot of the band. Identification: the nearest known
    line within max(1 nm, 1.5 × the sample spacing). Nominal line sources report their
    lines directly.
    """
    key = ("find_lines", float(min_snr), float(min_relative), int(max_lines))
    return list(remembered(spectrum, key, lambda: tuple(
        _find_lines(spectrum, min_snr, min_relative, max_lines))))


#: A continuum peak this close to a nominal model's discrete line is that line (our own rule). [nm]
SAME_LINE_NM = 1.0


def _find_lines(spectrum: Spectrum, min_snr: float, min_relative: float,
                max_lines: int) -> list[DetectedLine]:
    # a nominal line source reports its lines; the peaks of a continuum beside them (a
    # mercury lamp's, an LED band) follow, except where they repeat a line
    discrete = [DetectedLine(ln.wavelength_nm, ln.value, None, None,
                             _identify(ln.wavelength_nm, 1.0)) for ln in spectrum.lines]
    if discrete and spectrum.wavelength_nm.size == 0:
        return discrete
    found = _continuum_peaks(spectrum, min_snr, min_relative, max_lines)
    if not discrete:
        return found
    rest = [d for d in found
            if not any(abs(d.wavelength_nm - x.wavelength_nm) < SAME_LINE_NM for x in discrete)]
    # the strongest continuum peaks fill the list (found is sorted by wavelength)
    rest = sorted(rest, key=lambda d: -d.height)[:max(0, max_lines - len(discrete))]
    return sorted(discrete + rest, key=lambda d: d.wavelength_nm)


def _continuum_peaks(spectrum: Spectrum, min_snr: float, min_relative: float,
                     max_lines: int) -> list[DetectedLine]:
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
    # an upper bound on every candidate's prominence at once (the minima over the whole
    # ±20 nm window, past any higher peak): a candidate below the threshold on it is out
    lo = np.searchsorted(wl, wl[cand] - PROMINENCE_WINDOW_NM)
    hi = np.searchsorted(wl, wl[cand] + PROMINENCE_WINDOW_NM, side="right")
    base = np.maximum(_window_min(v, lo, cand + 1), _window_min(v, cand, hi))
    keep = ~(v[cand] - base < thr)
    cand, lo, hi = cand[keep], lo[keep], hi[keep]
    # the exact prominence of the few left
    prom = np.array([_prominence(v, int(i), int(a), int(b)) for i, a, b in zip(cand, lo, hi)])
    keep = ~(prom < thr)
    cand, prom = cand[keep], prom[keep]
    if cand.size == 0:
        return []
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
        width = _fwhm(wl, v, i)
        found.append(DetectedLine(float(pos[k]), p, width,
                                  p / sigma if sigma > 0 else None,
                                  _identify(float(pos[k]), max(1.0, 1.5 * step))
                                  if line_like(width, step) else None))
    return sorted(found, key=lambda d: d.wavelength_nm)


#: A wavelength-scale shift is looked for within ±this of the mercury lines. [nm]
SHIFT_SEARCH_NM = 5.0
#: Peaks match shifted mercury lines when within this of one (after the shift). [nm]
SHIFT_MATCH_NM = 0.5
#: At least this many peaks must match (our own rule: three lines fix a shift beyond chance).
SHIFT_MIN_LINES = 3


@dataclass(frozen=True)
class ScaleShift:
    """Peaks that match the mercury lines once the wavelength scale is shifted.

    shift_nm : the shift (measured minus reference, the median over the matched lines). [nm]
    matched : (peak, mercury line) pairs. [nm]
    """

    shift_nm: float
    matched: tuple[tuple[float, float], ...]

    def to_dict(self) -> dict:
        return {"shift_nm": self.shift_nm, "matched": [list(m) for m in self.matched]}


def mercury_scale_shift(lines: list[DetectedLine], step_nm: float | None = None
                        ) -> ScaleShift | None:
    """A shift of the wavelength scale that the peaks reveal, or None.

    A low-pressure mercury spectrum holds several lines at known wavelengths (the lines of
    ``data/emitters/emission_lines.csv``, the doublets left out), so they are the usual
    check of a spectrometer's wavelength calibration. When at least :data:`SHIFT_MIN_LINES`
    peaks, and at least half of all the line-like peaks (so that a lamp of many lines does
    not line three up by chance), sit within :data:`SHIFT_MATCH_NM` of mercury lines moved by one common shift
    (within ±:data:`SHIFT_SEARCH_NM`), more than match them unshifted (a fluorescent lamp's
    named mercury lines outvote phosphor peaks that a shift would line up), the scale is
    likely off by that shift; it is reported only where it is larger than the
    identification tolerance (max(1 nm, 1.5 steps)), so that the lines went unnamed. Our
    own rule.

    >>> mk = lambda w: DetectedLine(w, 1.0, 1.0, 50.0, None)
    >>> s = mercury_scale_shift([mk(255.9), mk(367.2), mk(438.0), mk(548.3)], 0.5)
    >>> round(s.shift_nm, 2), len(s.matched)
    (2.2, 4)
    """
    tol = max(1.0, 1.5 * (step_nm or 0.0))
    refs = [k["wavelength_nm"] for k in known_lines()
            if k["emitter"] == "low-pressure mercury" and "/" not in k["label"]]
    peaks = [ln.wavelength_nm for ln in lines]
    if sum(ln.identified_as is None for ln in lines) < SHIFT_MIN_LINES:
        return None

    def matches(delta: float) -> list[tuple[float, float]]:
        out = []
        for p in peaks:
            near = min(refs, key=lambda r: abs(p - delta - r))
            if abs(p - delta - near) <= SHIFT_MATCH_NM:
                out.append((p, near))
        return out

    cands = sorted({round(p - r, 2) for p in peaks for r in refs if abs(p - r) <= SHIFT_SEARCH_NM})
    best: list[tuple[float, float]] = []
    for delta in cands:
        m = matches(delta)
        if len(m) > len(best):
            best = m
    if len(best) < max(SHIFT_MIN_LINES, len(peaks) / 2):
        return None
    shift = float(np.median([p - r for p, r in best]))
    if abs(shift) <= tol or len(best) <= len(matches(0.0)):
        return None
    return ScaleShift(shift, tuple(best))


def second_order_suspects(lines: list[DetectedLine], step_nm: float | None = None
                          ) -> list[tuple[DetectedLine, DetectedLine]]:
    """Peaks that sit at twice the wavelength of a stronger peak: (parent, suspect) pairs.

    A grating spectrometer without an order-sorting filter shows a strong line again in the
    second diffraction order, at twice its wavelength (253.7 nm reappears near 507.4 nm). A
    suspect is a peak within max(1 nm, 1.5 × the sample spacing) of twice a peak that is
    higher than it, and not itself a known emission line (a line the table of known lines
    names as a second-order artefact counts as a suspect). It may be real; it is flagged.

    Examples
    --------
    >>> a = DetectedLine(253.7, 1.0, 0.5, 900.0, "Hg 253.7 nm")
    >>> b = DetectedLine(507.5, 0.01, 0.9, 9.0, None)
    >>> [(p.wavelength_nm, q.wavelength_nm) for p, q in second_order_suspects([a, b], 0.5)]
    [(253.7, 507.5)]
    """
    tol = max(1.0, 1.5 * (step_nm or 0.0))
    out = []
    for q in lines:
        if q.identified_as is not None and "second order" not in q.identified_as:
            continue
        for p in lines:
            if p is not q and p.height > q.height and abs(q.wavelength_nm - 2.0 * p.wavelength_nm) <= tol:
                out.append((p, q))
                break
    return out


#: Half-width of the window a peak's prominence is measured in. [nm]
PROMINENCE_WINDOW_NM = 20.0


def _prominence(v: np.ndarray, i: int, lo: int, hi: int) -> float:
    """The prominence of the sample ``i`` within the window ``v[lo:hi]``: ``v[i]`` minus the
    higher of its two bases, each the lowest value from ``i`` outwards up to (not including)
    the first sample higher than ``v[i]``, or to the window's end: the definition of
    ``scipy.signal.peak_prominences`` with ``wlen`` (tests/test_peak_prominence.py compares
    them). One difference: on the right a sample *equal* to ``v[i]`` also ends the search,
    so of two equal maxima (rounded counts often give them) only the right one is measured
    to the far bases and the left one to the dip between them, where scipy measures both to
    the far bases and reports one band as two peaks.

    >>> float(_prominence(np.array([0.0, 3.0, 1.0, 2.0, 1.5, 0.0]), 3, 0, 6))
    1.0
    >>> [round(float(_prominence(np.array([0.0, 2.0, 1.9, 2.0, 0.0]), k, 0, 5)), 9)
    ...  for k in (1, 3)]
    [0.1, 2.0]
    """
    top = v[i]
    left = v[lo:i]
    higher = np.flatnonzero(left > top)
    start = lo + int(higher[-1]) + 1 if higher.size else lo
    right = v[i + 1:hi]
    higher = np.flatnonzero(right >= top)
    stop = i + 1 + int(higher[0]) if higher.size else hi
    return float(top - max(v[start:i + 1].min(), v[i:stop].min()))


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


#: The widest peak (FWHM) that can be an atomic or excimer line as a compact spectrometer
#: shows it, whose optical resolution is typically 0.5–5 nm; an LED band is about 10 nm wide
#: or more. Our own rule (the resolution and LED widths are common practice, from memory);
#: on a coarse grid a line cannot look narrower than about 2.5 sample steps, so that width
#: is allowed too. [nm]
LINE_MAX_FWHM_NM = 6.0


def line_like(fwhm_nm: float | None, step_nm: float) -> bool:
    """Whether a peak is narrow enough to be named as a known line: a peak at a mercury or
    excimer wavelength that is wider than a spectrometer shows such a line (an LED band at
    254 or 365 nm) is not that line. An unresolved width (None) does not rule it out.

    >>> line_like(1.8, 0.5), line_like(12.0, 0.5), line_like(12.0, 5.0), line_like(None, 1.0)
    (True, False, True, True)
    """
    return fwhm_nm is None or fwhm_nm <= max(LINE_MAX_FWHM_NM, 2.5 * step_nm)


def _identify(wavelength_nm: float, tol_nm: float) -> str | None:
    best = None
    for k in known_lines():
        d = abs(k["wavelength_nm"] - wavelength_nm)
        if d <= tol_nm and (best is None or d < best[0]):
            best = (d, k["label"])
    return None if best is None else best[1]


#: A line narrower than this many sampling steps (its measured FWHM) is undersampled (our own
#: rule; a Gaussian line of FWHM w sampled at a step w is integrated by the trapezoid rule
#: within about ±6 %, at a step 2w only within −76 % to +87 %, depending on where the line
#: falls between samples [derived: tests/test_undersampled_lines.py]). [-]
UNDERSAMPLED_STEPS = 2.0
#: Lines below this share of the strongest line's height, or this signal-to-noise ratio, are
#: not reported as undersampled: a noise spike is one sample wide whatever the step (our own
#: rule). [-]
UNDERSAMPLED_MIN_SHARE = 0.1
UNDERSAMPLED_MIN_SNR = 20.0


def undersampled_lines(spectrum: Spectrum, lines: Sequence[DetectedLine]) -> list[DetectedLine]:
    """The strong lines (at least :data:`UNDERSAMPLED_MIN_SHARE` of the strongest, and
    :data:`UNDERSAMPLED_MIN_SNR` above the noise) whose
    measured FWHM is less than :data:`UNDERSAMPLED_STEPS` times the sampling step where they
    lie: their integrals depend on where the line falls between samples, unless the
    instrument's bandpass is matched to the step.

    Examples
    --------
    >>> wl = np.arange(240.0, 270.0, 2.0)
    >>> s = Spectrum(wl, 1e-6 + np.exp(-0.5 * ((wl - 253.7) / 0.42) ** 2), "irradiance")
    >>> [round(x.wavelength_nm) for x in undersampled_lines(s, find_lines(s))]
    [254]
    """
    wl = spectrum.wavelength_nm
    strong = [x for x in lines if x.fwhm_nm is not None and x.height > 0]
    if wl.size < 3 or not strong:
        return []
    top = max(x.height for x in strong)
    out = []
    for x in strong:
        if x.height < UNDERSAMPLED_MIN_SHARE * top or (x.snr is not None
                                                       and x.snr < UNDERSAMPLED_MIN_SNR):
            continue
        i = int(np.clip(np.searchsorted(wl, x.wavelength_nm), 1, wl.size - 1))
        step = float(wl[i] - wl[i - 1])
        if step > 0 and x.fwhm_nm < UNDERSAMPLED_STEPS * step:  # type: ignore[operator]
            out.append(x)
    return out
