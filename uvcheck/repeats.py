"""Repeat scans of one lamp: their mean spectrum, and how far the scans agree.

A tester often takes several scans of the same lamp in the same position. Their mean is the
better estimate, its noise is the scan noise divided by √n (the standard deviation of a mean,
JCGM 100:2008 §4.2, a type A evaluation), and the scan-to-scan spread shows whether the lamp
was stable (a mercury lamp warming up, an LED heating, a battery running down) or the probe
moved. :func:`combine_scans` gives both; the scans must be of one quantity, and the mean is
taken on the first scan's wavelengths over the range every scan covers (the others linearly
interpolated there, as the integrals of :mod:`uvcheck.spectrum` interpolate; a gap of any scan
is a gap of the mean: missing data are never filled).
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any, Sequence

import numpy as np

from uvcheck.errors import ConfigurationError
from uvcheck.bands import BAND_RANGES
from uvcheck.spectrum import Spectrum, integrate, median

#: A scan-to-scan spread of the total above this share of the mean is reported as an unstable
#: lamp or setup (our own rule; stabilised lamps repeat to about 1 %). [-]
REPEAT_SPREAD_WARN = 0.05


@dataclass(frozen=True)
class RepeatSummary:
    """How the repeat scans agree.

    files : the scans' sources, in the order given.
    n : number of scans.
    range_nm : the range every scan covers (the mean's range). [nm]
    totals : each scan's integral over that range. [integrated unit]
    uvc : each scan's UV-C (200–280 nm) integral where the range covers UV-C in part, else
        None. [integrated unit]
    spread : (largest − smallest total) / mean total. [-]
    stable : the spread is at most :data:`REPEAT_SPREAD_WARN`.
    noise_basis : how the mean's noise floor was found.
    """

    files: tuple[str, ...]
    n: int
    range_nm: tuple[float, float]
    totals: tuple[float, ...]
    uvc: tuple[float, ...] | None
    spread: float | None
    stable: bool
    noise_basis: str

    def to_dict(self) -> dict[str, Any]:
        return {"files": list(self.files), "n": self.n, "range_nm": list(self.range_nm),
                "totals": list(self.totals), "uvc": None if self.uvc is None else list(self.uvc),
                "spread": self.spread, "stable": self.stable, "noise_basis": self.noise_basis}

    def warning(self) -> str | None:
        """The import-report warning when the scans disagree, else None."""
        if self.stable or self.spread is None:
            return None
        return (f"the {self.n} repeat scans differ by {self.spread:.1%} in total (more than "
                f"{REPEAT_SPREAD_WARN:.0%}, our own rule): a lamp not yet stable (warm-up, "
                "heating, a battery running down) or a probe that moved? The mean is used; "
                "check the setup and scan again once the output is steady")


def on_shared_range(scans: Sequence[Spectrum], what: str = "the repeat scans"
                    ) -> tuple[np.ndarray, np.ndarray, float, float, tuple]:
    """The scans on the first one's wavelengths over the range every one covers: (those
    wavelengths, a row of values per scan, the range's ends, the gaps of any scan within
    it). A scan on other wavelengths is linearly interpolated there, as the integrals of
    :mod:`uvcheck.spectrum` interpolate; a gap of any scan is a gap of the result (missing
    data are never filled). ``what`` names the scans in an error."""
    lo = max(s.range_nm[0] for s in scans)
    hi = min(s.range_nm[1] for s in scans)
    if not hi > lo:
        raise ConfigurationError(f"{what} share no wavelength range",
                                 todo="give scans of the same range")
    wl0 = scans[0].wavelength_nm
    keep = (wl0 >= lo) & (wl0 <= hi)
    wl = wl0[keep]
    if wl.size < 2:
        raise ConfigurationError(f"{what} share fewer than two samples of the first")
    rows = []
    for s in scans:
        same = s.wavelength_nm.shape == wl0.shape and bool(np.array_equal(s.wavelength_nm, wl0))
        rows.append(s.values[keep] if same else np.interp(wl, s.wavelength_nm, s.values))
    gaps = tuple(sorted({(max(a, lo), min(b, hi)) for s in scans for a, b in s.gaps_nm
                         if min(b, hi) > max(a, lo)}))
    return wl, np.vstack(rows), float(lo), float(hi), gaps


def combine_scans(scans: Sequence[Spectrum], files: Sequence[str] | None = None
                  ) -> tuple[Spectrum, RepeatSummary]:
    """The mean of repeat scans of one lamp, and how far they agree (see the module notes).

    scans : two or more measured spectra of one quantity.
    files : their sources, for the summary (default: each spectrum's ``meta['source']``).

    Examples
    --------
    >>> a = Spectrum([300.0, 400.0, 500.0], [1.0, 2.0, 1.0], "irradiance", noise_floor=0.1)
    >>> b = Spectrum([300.0, 400.0, 500.0], [1.2, 2.2, 1.2], "irradiance", noise_floor=0.1)
    >>> m, s = combine_scans([a, b], ["a.csv", "b.csv"])
    >>> [round(float(v), 6) for v in m.values], round(s.spread, 4), s.stable   # 40 / 320
    ([1.1, 2.1, 1.1], 0.125, False)
    """
    if len(scans) < 2:
        raise ConfigurationError("repeat scans need at least two spectra")
    files = tuple(files) if files is not None else tuple(
        str(s.meta.get("source", f"scan {k + 1}")) for k, s in enumerate(scans))
    first = scans[0]
    for k, s in enumerate(scans[1:], 2):
        if s.quantity != first.quantity:
            raise ConfigurationError(f"scan {k} ({files[k - 1]}) is {s.quantity}, scan 1 is "
                                     f"{first.quantity}: repeat scans must be of one quantity",
                                     todo="give scans of the same export and unit")
        if s.lines or first.lines:
            raise ConfigurationError("repeat scans must be measured spectra (no modelled lines)")
    wl, stack, lo, hi, gaps = on_shared_range(scans)
    n = len(scans)
    mean = stack.mean(axis=0)
    # the noise of a mean of n scans: σ/√n, σ the larger of the scans' own noise (rms) and
    # the median scan-to-scan standard deviation per sample (JCGM 100:2008 §4.2)
    sig_scan = [s.noise_floor for s in scans if s.noise_floor is not None]
    own = math.sqrt(sum(x * x for x in sig_scan) / len(sig_scan)) if sig_scan else 0.0
    between = median(stack.std(axis=0, ddof=1))
    sigma = max(own, between) / math.sqrt(n)
    basis = (f"mean of {n} scans: σ/√{n} with σ = {sigma * math.sqrt(n):.3g}, the larger of the "
             "scans' own noise (rms) and the median scan-to-scan standard deviation per sample "
             "(JCGM 100:2008 §4.2)")
    totals = tuple(integrate(s, lo, hi).value for s in scans)
    u_lo, u_hi = max(lo, BAND_RANGES["UV-C"][0]), min(hi, BAND_RANGES["UV-C"][1])
    uvc = tuple(integrate(s, u_lo, u_hi).value for s in scans) if u_hi > u_lo else None
    m_tot = sum(totals) / n
    spread = (max(totals) - min(totals)) / abs(m_tot) if m_tot else None
    summary = RepeatSummary(files, n, (float(lo), float(hi)), totals, uvc, spread,
                            spread is not None and spread <= REPEAT_SPREAD_WARN, basis)
    meta = dict(first.meta)
    digest = hashlib.sha256("\n".join(str(s.meta.get("sha256", "")) for s in scans).encode())
    meta.update(repeats=summary.to_dict(), sha256=digest.hexdigest(),
                file_name=f"{meta.get('file_name', files[0])} (+{n - 1} repeat scan"
                          f"{'s' if n > 2 else ''})")
    out = Spectrum(wl, mean, first.quantity, noise_floor=sigma if sigma > 0 else None,
                   covered_nm=(float(lo), float(hi)), gaps_nm=tuple(gaps),
                   meta=MappingProxyType(meta))
    return out, summary
