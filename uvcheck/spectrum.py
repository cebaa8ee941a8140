"""The one spectrum type, and integration with honest coverage.

A :class:`Spectrum` is immutable and validated once. Its *covered range* is the wavelength
span it represents (the measured range for a measurement, the model range for a nominal
spectrum), minus any *gaps* inside it. Every integral over [a, b] reports how much of [a, b]
(or of a weighting's area over [a, b]) the spectrum covered: missing range is never read as
zero emission.

Integration rule (used for bands, hazards and germicidal quantities alike): the spectrum is
taken as piecewise linear between its samples, the weighting is evaluated at the samples
(and at the integration limits), and the product is integrated by the trapezoid rule on the
spectrum's own grid. This is the Σ E_λ·W(λ)·Δλ of IEC 62471:2006 clause 4.3 with Δλ the
measurement's spacing; evaluating the weighting on the spectrum's grid (rather than
resampling the spectrum onto a coarse weighting grid) keeps narrow lines intact. Discrete
lines (nominal line sources) add ``value × W(λ_line)``. Bands are half-open [a, b) for
lines, so a partition of bands adds up to the total exactly.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields, replace
from types import MappingProxyType
from typing import Any, Callable, Iterator, Mapping

import numpy as np

from uvcheck.errors import ConfigurationError, InputFormatError

#: Quantities a spectrum can hold, with their spectral and integrated SI units.
SPECTRAL_UNIT = {"irradiance": "W m-2 nm-1", "radiance": "W m-2 sr-1 nm-1",
                 "flux": "W nm-1", "relative": "relative"}
INTEGRATED_UNIT = {"irradiance": "W m-2", "radiance": "W m-2 sr-1", "flux": "W",
                   "relative": "relative"}
QUANTITIES = tuple(SPECTRAL_UNIT)


@dataclass(frozen=True)
class Line:
    """A discrete emission line of a nominal line source.

    wavelength_nm : line centre. [nm]
    value : line strength in the spectrum's integrated unit (W m⁻² for irradiance). [W m⁻²]
    """

    wavelength_nm: float
    value: float


def median(values: Any) -> float:
    """The median of the values, the very number ``float(numpy.median(values))`` gives (the
    middle value, or the mean of the two middle ones, summed from 0.0 as numpy's mean does;
    NaN when a value is NaN or there are none), without numpy.median's import of numpy.ma
    on its first call (about 20 ms of every run's start-up).

    Examples
    --------
    >>> median([3.0, 1.0, 2.0]), median([4.0, 1.0, 3.0, 2.0])
    (2.0, 2.5)
    """
    a = np.asarray(values, dtype=float).ravel()
    n = a.size
    if n == 0:
        return math.nan
    h = n // 2
    part = np.partition(a, [h - 1, h, n - 1] if n % 2 == 0 else [h, n - 1])
    if np.isnan(part[-1]):
        return math.nan
    if n % 2:
        return float((0.0 + part[h]) / 1.0)
    return float((0.0 + part[h - 1] + part[h]) / 2.0)


def quantile(values: Any, q: float) -> float:
    """The q-quantile of the values, the very number ``float(numpy.quantile(values, q))``
    gives with its default ("linear", method 7 of Hyndman and Fan 1996): the sorted values
    interpolated at index (n − 1)·q, by numpy's two-sided formula (from the upper neighbour
    when the fraction is 0.5 or more); NaN when a value is NaN. Like :func:`median`, without
    numpy's import of numpy.ma on the first call.

    Examples
    --------
    >>> quantile([4.0, 1.0, 3.0, 2.0], 0.25)
    1.75
    """
    a = np.asarray(values, dtype=float).ravel()
    n = a.size
    if n == 0:
        return math.nan
    vi = (n - 1) * q
    prev = math.floor(vi)
    nxt = prev + 1
    if vi >= n - 1:
        prev = nxt = -1  # at or past the last value: the largest
    part = np.partition(a, sorted({0, n - 1, prev % n, nxt % n}))
    if np.isnan(part[-1]):
        return math.nan
    lo, hi = part[prev], part[nxt]
    g = vi - prev
    diff = hi - lo
    return float(hi - diff * (1 - g)) if g >= 0.5 else float(lo + diff * g)


def _frozen_array(a: Any, name: str) -> np.ndarray:
    arr = np.array(a, dtype=np.float64, copy=True)
    if arr.ndim != 1:
        raise InputFormatError(f"{name} must be one-dimensional, got shape {arr.shape}")
    arr.setflags(write=False)
    return arr


@dataclass(frozen=True, eq=False)
class Spectrum:
    """A spectral distribution: irradiance, radiance, flux or a relative shape.

    wavelength_nm : sample wavelengths, finite, positive, strictly increasing. [nm]
    values : spectral values, finite (negative values are kept: they are noise). Units by
        ``quantity``: [W m⁻² nm⁻¹], [W m⁻² sr⁻¹ nm⁻¹], [W nm⁻¹] or relative.
    quantity : ``irradiance`` | ``radiance`` | ``flux`` | ``relative``.
    lines : discrete lines (nominal line sources), strengths in the integrated unit.
    noise_floor : 1-σ noise of one sample, in the spectral unit, or None if unknown.
    gaps_nm : intervals inside the covered range with no data. [nm]
    covered_nm : the range the spectrum represents; defaults to the span of samples and
        lines. A nominal model declares its own range. [nm]
    meta : source file, sha256, instrument notes, scaling history (read-only mapping).

    Examples
    --------
    >>> s = Spectrum([250.0, 260.0], [1.0, 1.0], "irradiance")
    >>> s.range_nm
    (250.0, 260.0)
    """

    wavelength_nm: np.ndarray
    values: np.ndarray
    quantity: str
    lines: tuple[Line, ...] = ()
    noise_floor: float | None = None
    gaps_nm: tuple[tuple[float, float], ...] = ()
    covered_nm: tuple[float, float] | None = None
    meta: Mapping[str, Any] = field(default_factory=lambda: MappingProxyType({}))

    def __post_init__(self) -> None:
        wl = _frozen_array(self.wavelength_nm, "wavelength_nm")
        v = _frozen_array(self.values, "values")
        object.__setattr__(self, "wavelength_nm", wl)
        object.__setattr__(self, "values", v)
        if self.quantity not in SPECTRAL_UNIT:
            raise ConfigurationError(f"unknown quantity {self.quantity!r}; "
                                     f"available: {', '.join(QUANTITIES)}")
        if wl.shape != v.shape:
            raise InputFormatError(f"{wl.size} wavelengths but {v.size} values")
        if not np.all(np.isfinite(wl)) or not np.all(np.isfinite(v)):
            raise InputFormatError("wavelengths and values must be finite")
        if wl.size and wl[0] <= 0:
            raise InputFormatError(f"wavelengths must be positive, found {wl[0]:g} nm")
        if wl.size > 1 and not np.all(np.diff(wl) > 0):
            raise InputFormatError("wavelengths must be strictly increasing")
        if wl.size == 1:
            raise InputFormatError("a spectrum needs at least two samples")
        lines = tuple(ln if isinstance(ln, Line) else Line(float(ln[0]), float(ln[1]))
                      for ln in self.lines)
        for ln in lines:
            if not (math.isfinite(ln.wavelength_nm) and ln.wavelength_nm > 0
                    and math.isfinite(ln.value)):
                raise InputFormatError(f"bad line {ln}")
        object.__setattr__(self, "lines", tuple(sorted(lines, key=lambda ln: ln.wavelength_nm)))
        if wl.size == 0 and not lines:
            raise InputFormatError("a spectrum needs samples or lines")
        if self.covered_nm is None:
            pts = [float(wl[0]), float(wl[-1])] if wl.size else []
            pts += [ln.wavelength_nm for ln in lines]
            cov = (min(pts), max(pts))
        else:
            cov = (float(self.covered_nm[0]), float(self.covered_nm[1]))
            if not cov[0] < cov[1]:
                raise InputFormatError(f"covered range {cov} is empty")
        object.__setattr__(self, "covered_nm", cov)
        gaps = tuple(sorted((float(a), float(b)) for a, b in self.gaps_nm))
        object.__setattr__(self, "gaps_nm", gaps)
        if self.noise_floor is not None and not (math.isfinite(self.noise_floor)
                                                  and self.noise_floor >= 0):
            raise InputFormatError(f"noise floor must be finite and >= 0, got {self.noise_floor}")
        if not isinstance(self.meta, MappingProxyType):
            object.__setattr__(self, "meta", MappingProxyType(dict(self.meta)))

    # --- derived, read-only views -------------------------------------------------------
    @property
    def range_nm(self) -> tuple[float, float]:
        """The covered range. [nm]"""
        return self.covered_nm  # type: ignore[return-value]

    @property
    def is_absolute(self) -> bool:
        return self.quantity != "relative"

    @property
    def spectral_unit(self) -> str:
        return SPECTRAL_UNIT[self.quantity]

    @property
    def integrated_unit(self) -> str:
        return INTEGRATED_UNIT[self.quantity]

    @property
    def step_nm(self) -> float | None:
        """Median sample spacing. [nm]"""
        if self.wavelength_nm.size < 2:
            return None
        return remembered(self, ("step_nm",), lambda: median(np.diff(self.wavelength_nm)))

    def segments(self) -> list[tuple[float, float]]:
        """Covered sub-intervals: the covered range minus the gaps. [nm]"""
        if not self.gaps_nm:
            lo, hi = self.range_nm
            return [(lo, hi)] if lo < hi else []
        lo, hi = self.range_nm
        segs = []
        cur = lo
        for a, b in self.gaps_nm:
            if b <= cur or a >= hi:
                continue
            if a > cur:
                segs.append((cur, min(a, hi)))
            cur = max(cur, b)
        if cur < hi:
            segs.append((cur, hi))
        return segs

    def derive(self, **changes: Any) -> "Spectrum":
        """A new spectrum with some fields changed (the original is untouched)."""
        return replace(self, **changes)


#: The fields of :class:`Spectrum`, in order (for :func:`_trusted`).
_SPECTRUM_FIELDS = tuple(f.name for f in fields(Spectrum))


# ---------------------------------------------------------------------------------------------
# Integration
# ---------------------------------------------------------------------------------------------

Weight = Callable[[np.ndarray], np.ndarray]


def partly_measured(block: Mapping[str, Any]) -> bool:
    """A reading (its dict) whose band the data cover only in part: its coverage is given and
    short of the whole (:func:`covers_all`)."""
    cov = block.get("coverage")
    return isinstance(cov, (int, float)) and not covers_all(cov)


def below_detection(block: Mapping[str, Any]) -> bool:
    """A reading (its dict: a hazard's, a band's) whose value is under its detection limit, so
    the value given is a bound, not what the lamp gives (whatever its coverage)."""
    v, dl = block.get("value"), block.get("detection_limit")
    return block.get("status") == "below-detection" or (v is not None and dl is not None
                                                        and v < dl)


def is_nominal(spectrum: "Spectrum") -> bool:
    """A spectrum modelled from a listing's stated data (an estimate), not a measurement."""
    meta = spectrum.meta or {}
    return bool(meta.get("estimate")) or meta.get("origin") == "nominal"


def covers_all(coverage: float | None) -> bool:
    """True when a coverage (the measured share of a band or weighting) is the whole of it,
    to rounding: the one test of "complete" for integrals and for the readings reported from
    them (a band covered in part is a lower bound, or below detection only in its measured
    part).

    >>> covers_all(1.0), covers_all(0.999), covers_all(None)
    (True, False, False)
    """
    return coverage is not None and coverage >= 1.0 - 1e-9


@dataclass(frozen=True)
class Integral:
    """A (weighted) integral over [lo, hi] and how much of it was measured.

    value : the integral over the covered part, in the spectrum's integrated unit.
    coverage : share of the weighting's area over [lo, hi] (of the length for an unweighted
        band) that the spectrum covers, 0–1. [-]
    sigma : 1-σ of the value from the sample noise floor, or None. [integrated unit]
    lo_nm, hi_nm : the limits asked for. [nm]
    covered_nm : the covered sub-intervals of [lo, hi]. [nm]
    """

    value: float
    coverage: float
    sigma: float | None
    lo_nm: float
    hi_nm: float
    covered_nm: tuple[tuple[float, float], ...]

    @property
    def complete(self) -> bool:
        return covers_all(self.coverage)

    @property
    def detection_limit(self) -> float | None:
        """3 σ (the IUPAC limit-of-detection convention, k = 3), or None."""
        return None if self.sigma is None else 3.0 * self.sigma


_AREA_CACHE: dict[tuple[int, float, float], tuple[Any, float]] = {}


def _area(weight: Weight | None, a: float, b: float) -> float:
    """∫ₐᵇ W(λ) dλ on a dense grid (0.05 nm or finer), used only for coverage shares.

    Results for tabulated weightings (immutable, loaded once per process) are cached.
    """
    if b <= a:
        return 0.0
    if weight is None:
        return b - a
    cacheable = type(weight).__name__ == "Weighting"
    key = (id(weight), a, b)
    if cacheable and key in _AREA_CACHE and _AREA_CACHE[key][0] is weight:
        return _AREA_CACHE[key][1]
    n = max(3, int(math.ceil((b - a) / 0.05)) + 1)
    x = np.linspace(a, b, n)
    area = float(np.trapezoid(np.asarray(weight(x), dtype=float), x))
    if cacheable:
        if len(_AREA_CACHE) > 4096:
            _AREA_CACHE.clear()
        _AREA_CACHE[key] = (weight, area)  # holding the weight keeps its id unique
    return area


class _BoundedCache:
    """A dictionary that keeps at most ``max_bytes`` of arrays: the oldest entries go first
    when a new one needs room (so a batch that mixes instruments keeps the recent grids, and
    a very long spectrum cannot fill memory with its coefficient vectors). An entry larger
    than the whole budget is not kept."""

    def __init__(self, max_bytes: int):
        self.max_bytes = max_bytes
        self.nbytes = 0
        self._d: dict[Any, tuple[Any, int]] = {}

    def get(self, key: Any) -> Any:
        hit = self._d.get(key)
        return None if hit is None else hit[0]

    def put(self, key: Any, value: Any, nbytes: int) -> None:
        if nbytes > self.max_bytes or key in self._d:
            return
        while self._d and self.nbytes + nbytes > self.max_bytes:
            _, n = self._d.pop(next(iter(self._d)))
            self.nbytes -= n
        self._d[key] = (value, nbytes)
        self.nbytes += nbytes

    def clear(self) -> None:
        self._d.clear()
        self.nbytes = 0

    def __iter__(self) -> Iterator[Any]:
        return iter(self._d)

    def __len__(self) -> int:
        return len(self._d)


#: Memory for the integration plans (:class:`_Plan`): their coefficient vectors. [bytes]
PLAN_CACHE_BYTES = 64 << 20
#: Memory for the whole-grid trapezoid weights (:func:`grid_weights`). [bytes]
GRID_WEIGHTS_BYTES = 16 << 20


def _grid_key(spectrum: Spectrum) -> bytes:
    """The bytes of the spectrum's wavelength grid, computed once per spectrum (a key for
    :data:`_PLAN_CACHE`; Python keeps the hash of a bytes object once computed)."""
    key = spectrum.__dict__.get("_grid_bytes")
    if key is None:
        key = spectrum.wavelength_nm.tobytes()
        object.__setattr__(spectrum, "_grid_bytes", key)
    return key


def trapezoid_weights(x: np.ndarray, weight: Weight | None = None) -> np.ndarray:
    """Coefficients c with Σ c·y = the trapezoid rule for ∫ y·W dλ on the nodes ``x`` (half
    the spacing on each side of a node, times the weighting there). [nm]

    The one integration rule of the project: :func:`integrate` and the uncertainty
    evaluation's coefficient vectors (:func:`uvcheck.uncertainty.integral_coefficients`) use it.

    Examples
    --------
    >>> trapezoid_weights(np.array([0.0, 1.0, 3.0])).tolist()
    [0.5, 1.5, 1.0]
    """
    w = np.ones_like(x) if weight is None else np.asarray(weight(x), dtype=float)
    dx = np.diff(x)
    c = np.zeros_like(x)
    c[:-1] += dx / 2
    c[1:] += dx / 2
    c *= w
    return c


@dataclass(frozen=True)
class _Plan:
    """How one integral is taken on one grid: per covered part, the sample indices i0:i1,
    the coefficients c (limits, samples, limit) and where each limit falls (the sample j
    before it and the limit itself, for :func:`_interp_at`); the covered parts, the
    coverage, and Σc² (for the noise). It depends on the grid, the covered range and gaps,
    the limits and the weighting only, so spectra from one instrument share it."""

    parts: tuple[tuple[int, int, np.ndarray, int, float, int, float], ...]
    covered: tuple[tuple[float, float], ...]
    coverage: float
    var: float


#: Plans per (grid, covered range, gaps, limits, weighting). Spectra from one instrument share
#: a grid, so a batch computes each weighted coefficient vector once. Only tabulated weightings
#: (immutable, loaded once per process; the key holds the object) and plain bands are kept;
#: the arrays are read-only.
_PLAN_CACHE = _BoundedCache(PLAN_CACHE_BYTES)


def _interp_at(wl: np.ndarray, y: np.ndarray, j: int, x: float) -> float:
    """The spectrum at ``x`` (wl[j] <= x <= wl[-1], j the last sample at or before x),
    linearly interpolated as ``np.interp`` does it (the same operations in the same order)."""
    x0 = wl[j]
    if x0 == x or j == wl.size - 1:
        return float(y[j])
    y0, y1 = float(y[j]), float(y[j + 1])
    slope = (y1 - y0) / float(wl[j + 1] - x0)
    return slope * (x - float(x0)) + y0


def _plan(spectrum: Spectrum, lo: float, hi: float, weight: Weight | None,
          cache_ok: bool) -> _Plan:
    key = ((_grid_key(spectrum), spectrum.covered_nm, spectrum.gaps_nm, lo, hi, weight)
           if cache_ok else None)
    hit = _PLAN_CACHE.get(key) if key is not None else None
    if hit is not None:
        return hit
    wl = spectrum.wavelength_nm
    covered: list[tuple[float, float]] = []
    parts = []
    var = 0.0
    for s0, s1 in spectrum.segments():
        a, b = max(lo, s0), min(hi, s1)
        if b <= a:
            continue
        covered.append((a, b))
        if wl.size >= 2:
            a_d, b_d = max(a, float(wl[0])), min(b, float(wl[-1]))
            if b_d > a_d:
                i0 = int(np.searchsorted(wl, a_d, side="right"))
                i1 = int(np.searchsorted(wl, b_d, side="left"))
                c = trapezoid_weights(np.concatenate(([a_d], wl[i0:i1], [b_d])), weight)
                c.setflags(write=False)
                ja = int(np.searchsorted(wl, a_d, side="right")) - 1
                jb = int(np.searchsorted(wl, b_d, side="right")) - 1
                parts.append((i0, i1, c, ja, a_d, jb, b_d))
                var += float(np.dot(c, c))
    full = _area(weight, lo, hi)
    got = sum(_area(weight, a, b) for a, b in covered)
    if full > 0:
        coverage = min(1.0, got / full)
    else:
        coverage = 1.0 if covered and math.isclose(sum(b - a for a, b in covered), hi - lo) else 0.0
    plan = _Plan(parts=tuple(parts), covered=tuple(covered), coverage=coverage, var=var)
    if key is not None:
        _PLAN_CACHE.put(key, plan, sum(p[2].nbytes for p in plan.parts) + 512)
    return plan


_GRID_WEIGHTS = _BoundedCache(GRID_WEIGHTS_BYTES)


def grid_weights(spectrum: Spectrum) -> np.ndarray:
    """The trapezoid coefficients over the spectrum's whole grid (read-only, kept per grid):
    ``np.dot(grid_weights(s), y)`` is the trapezoid integral of y on s's wavelengths, as
    ``np.trapezoid(y, s.wavelength_nm)`` gives it (to rounding). [nm]"""
    key = _grid_key(spectrum)
    c = _GRID_WEIGHTS.get(key)
    if c is None:
        c = trapezoid_weights(spectrum.wavelength_nm)
        c.setflags(write=False)
        _GRID_WEIGHTS.put(key, c, c.nbytes)
    return c


def integrate(spectrum: Spectrum, lo_nm: float, hi_nm: float,
              weight: Weight | None = None) -> Integral:
    """∫ E(λ)·W(λ) dλ over [lo, hi] on the spectrum's grid, with coverage. [integrated unit]

    spectrum : the spectrum E(λ). [spectral unit]
    lo_nm, hi_nm : integration limits. [nm]
    weight : W(λ), dimensionless, vectorised; None for an unweighted band. [-]

    Notes
    -----
    Trapezoid rule on the samples inside [lo, hi] plus the two limits (the spectrum is
    interpolated linearly there). Parts of [lo, hi] outside the covered range, or in a gap,
    are left out of the value and counted in the coverage; they are never filled.

    Examples
    --------
    >>> flat = Spectrum([200.0, 300.0, 400.0], [1.0, 1.0, 1.0], "irradiance")
    >>> r = integrate(flat, 250.0, 450.0)
    >>> (r.value, round(r.coverage, 3))
    (150.0, 0.75)
    """
    lo, hi = float(lo_nm), float(hi_nm)
    if not hi > lo:
        raise ConfigurationError(f"integration range {lo:g}–{hi:g} nm is empty")
    # the coefficients c (trapezoid weights times W) depend on the grid, the limits and the
    # weighting only: they are kept per grid for tabulated weightings and plain bands; and a
    # spectrum, being immutable, keeps the integrals already asked of it (bands, hazards,
    # germicidal quantities and claims ask for some of the same ones)
    cache_ok = weight is None or type(weight).__name__ == "Weighting"
    memo = None
    if cache_ok:
        memo = spectrum.__dict__.get("_integrals")
        if memo is None:
            memo = {}
            object.__setattr__(spectrum, "_integrals", memo)
        hit = memo.get((lo, hi, weight))
        if hit is not None:
            return hit
    wl, y = spectrum.wavelength_nm, spectrum.values
    plan = _plan(spectrum, lo, hi, weight, cache_ok)
    covered, coverage, var = plan.covered, plan.coverage, plan.var
    total = 0.0
    for i0, i1, c, ja, ta, jb, tb in plan.parts:
        yy = np.empty(i1 - i0 + 2)
        yy[0] = _interp_at(wl, y, ja, ta)  # the spectrum at the limits
        yy[-1] = _interp_at(wl, y, jb, tb)
        yy[1:-1] = y[i0:i1]
        total += float(np.dot(c, yy))
    for ln in spectrum.lines:
        if lo <= ln.wavelength_nm < hi and any(a <= ln.wavelength_nm <= b for a, b in covered):
            wv = 1.0 if weight is None else float(np.asarray(weight(np.array([ln.wavelength_nm])))[0])
            total += ln.value * wv
    sigma = None if spectrum.noise_floor is None else spectrum.noise_floor * math.sqrt(var)
    result = Integral(value=total, coverage=coverage, sigma=sigma, lo_nm=lo, hi_nm=hi,
                      covered_nm=tuple(covered))
    if memo is not None and len(memo) < 512:
        memo[(lo, hi, weight)] = result
    return result


def total_integral(spectrum: Spectrum) -> float:
    """∫ E(λ) dλ over the whole covered range (continuum and lines). [integrated unit]"""
    lo, hi = spectrum.range_nm
    return integrate(spectrum, lo, math.nextafter(hi, math.inf)).value


# ---------------------------------------------------------------------------------------------
# Scaling (relative -> absolute) and plain transformations
# ---------------------------------------------------------------------------------------------

def scaled(spectrum: Spectrum, factor: float, quantity: str | None = None,
           note: Mapping[str, Any] | None = None) -> Spectrum:
    """The spectrum multiplied by ``factor``, optionally becoming absolute.

    spectrum : any spectrum.
    factor : multiplier (> 0). [-] or [spectral unit per relative unit]
    quantity : new quantity (e.g. ``irradiance`` when scaling a relative spectrum).
    note : a record of the scaling (method, reading, source) appended to ``meta['scaling']``.

    Examples
    --------
    >>> s = scaled(Spectrum([400.0, 500.0], [1.0, 1.0], "relative"), 2.0, "irradiance")
    >>> (s.quantity, float(s.values[0]))
    ('irradiance', 2.0)
    """
    if not (math.isfinite(factor) and factor > 0):
        raise ConfigurationError(f"scaling factor must be finite and positive, got {factor}")
    meta = dict(spectrum.meta)
    if note is not None:
        meta["scaling"] = list(meta.get("scaling", [])) + [dict(note)]
    return replace(
        spectrum,
        values=spectrum.values * factor,
        lines=tuple(Line(ln.wavelength_nm, ln.value * factor) for ln in spectrum.lines),
        noise_floor=None if spectrum.noise_floor is None else spectrum.noise_floor * factor,
        quantity=quantity or spectrum.quantity,
        meta=MappingProxyType(meta),
    )


def remembered(spectrum: Any, key: tuple, compute: Callable[[], Any]) -> Any:
    """``compute()`` once per spectrum and key: a spectrum is immutable, so a pure function
    of it (a cut, its peak, its lines) gives the same answer every time it is asked, and the
    evaluators ask some of the same questions. Give only immutable results (or copy them).
    Works for any frozen dataclass instance (e.g. an organism row)."""
    memo = spectrum.__dict__.get("_memo")
    if memo is None:
        memo = {}
        object.__setattr__(spectrum, "_memo", memo)
    if key not in memo:
        memo[key] = compute()
    return memo[key]


def restricted(spectrum: Spectrum, lo_nm: float, hi_nm: float) -> Spectrum:
    """The spectrum cut to [lo, hi]: what an instrument with that range would have seen.

    Used by property tests ("less measured range never improves a verdict") and to model
    instruments. Samples outside are dropped and the covered range shrinks.
    """
    return remembered(spectrum, ("restricted", float(lo_nm), float(hi_nm)),
                      lambda: _restricted(spectrum, lo_nm, hi_nm))


def _restricted(spectrum: Spectrum, lo_nm: float, hi_nm: float) -> Spectrum:
    lo, hi = max(lo_nm, spectrum.range_nm[0]), min(hi_nm, spectrum.range_nm[1])
    if not hi > lo:
        raise ConfigurationError(f"{lo_nm:g}–{hi_nm:g} nm does not overlap the spectrum")
    wl, v = spectrum.wavelength_nm, spectrum.values
    if wl.size:
        lo, hi = max(lo, float(wl[0])), min(hi, float(wl[-1]))
        if not hi > lo:
            raise ConfigurationError(f"{lo_nm:g}–{hi_nm:g} nm holds no samples")
        inner = (wl > lo) & (wl < hi)
        # the cut points are interpolated, so the restricted data span exactly [lo, hi]
        wl_new = np.concatenate(([lo], wl[inner], [hi]))
        v_new = np.concatenate(([np.interp(lo, wl, v)], v[inner], [np.interp(hi, wl, v)]))
    else:
        wl_new, v_new = wl, v
    lines = tuple(ln for ln in spectrum.lines if lo <= ln.wavelength_nm <= hi)
    if wl_new.size == 0 and not lines:
        return replace(spectrum, wavelength_nm=wl_new, values=v_new, lines=lines,
                       covered_nm=(lo, hi))   # raises: a spectrum needs samples or lines
    # a cut of a valid spectrum is valid by construction (finite, strictly increasing, at
    # least the two limits; lines and gaps already checked and sorted): made without
    # validating again (tests/test_batch.py compares it with the validated construction)
    return _trusted(spectrum, wavelength_nm=wl_new, values=v_new, lines=lines,
                    covered_nm=(float(lo), float(hi)),
                    gaps_nm=tuple((a, b) for a, b in spectrum.gaps_nm if b > lo and a < hi))


def _trusted(spectrum: Spectrum, **changes: Any) -> Spectrum:
    """``replace(spectrum, **changes)`` for changes that keep every invariant
    :meth:`Spectrum.__post_init__` checks, without checking them again: the new arrays are
    float64 and made read-only here; lines, gaps and the covered range must already be in
    their normal form (tuples of floats, sorted)."""
    new = object.__new__(Spectrum)
    for f in _SPECTRUM_FIELDS:
        v = changes[f] if f in changes else getattr(spectrum, f)
        if f in ("wavelength_nm", "values") and f in changes:
            v = np.asarray(v, dtype=np.float64)
            if v.flags.writeable:
                v.setflags(write=False)
        object.__setattr__(new, f, v)
    return new
