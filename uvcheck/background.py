"""A dark (background) scan subtracted from a lamp's scan.

Many spectrometers, and every camera-based one, export the signal as recorded: the lamp plus
the detector's dark signal and whatever else reaches the probe (room light). The lamp's own
spectrum is the scan with the lamp on minus a dark scan taken the same way with the lamp off
or shuttered: the same instrument, integration time, averaging and position. Without it, a
flat level sits under every band and hazard integral (the reader warns of one).
:func:`subtract_dark` does the subtraction and says what it did.

Rules (the same as for repeat scans, :mod:`uvcheck.repeats`): both scans must be of one
quantity; the result is taken on the lamp scan's wavelengths over the range both cover (the
dark linearly interpolated there; a gap of either is a gap of the result: missing data are
never filled). Their noise is independent, so the difference's noise is the root sum of
squares of the two (JCGM 100:2008 §5.1.2, the law of propagation of uncertainty for a
difference of uncorrelated quantities). Whether the two were taken with the same settings
cannot be seen in the data: the import report says so.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any

import numpy as np

from uvcheck.errors import ConfigurationError
from uvcheck.repeats import on_shared_range
from uvcheck.spectrum import Spectrum, median


@dataclass(frozen=True)
class DarkSummary:
    """What the dark subtraction did.

    file : the dark scan's source.
    range_nm : the range both scans cover (the result's range). [nm]
    level : the dark scan's median over that range. [unit]
    unit : the scans' spectral unit (as read: before any scaling).
    peak_share : that level as a share of the lamp scan's highest value there. [-]
    noise_basis : how the result's noise floor was found.
    """

    file: str
    range_nm: tuple[float, float]
    level: float
    unit: str
    peak_share: float | None
    noise_basis: str

    def level_text(self) -> str:
        """The dark level with its unit: '817 (relative units)', '2.1e-05 W m-2 nm-1'."""
        return level_text(self.level, self.unit)

    def to_dict(self) -> dict[str, Any]:
        return {"file": self.file, "range_nm": list(self.range_nm), "level": self.level,
                "unit": self.unit, "peak_share": self.peak_share,
                "noise_basis": self.noise_basis}


def level_text(level: float, unit: str) -> str:
    """A dark level with its unit, as the reports show it."""
    return f"{level:.3g} (relative units)" if unit == "relative" else f"{level:.3g} {unit}"


def subtract_dark(scan: Spectrum, dark: Spectrum, file: str | None = None
                  ) -> tuple[Spectrum, DarkSummary]:
    """The lamp scan minus the dark scan, and what was done (see the module notes).

    scan : the lamp's scan (a measured spectrum).
    dark : the dark scan, of the same quantity.
    file : the dark scan's source, for the summary (default: its ``meta['source']``).

    Examples
    --------
    >>> lamp = Spectrum([300.0, 400.0, 500.0], [5.0, 9.0, 5.0], "relative", noise_floor=0.3)
    >>> dark = Spectrum([300.0, 400.0, 500.0], [4.0, 4.0, 4.0], "relative", noise_floor=0.4)
    >>> out, s = subtract_dark(lamp, dark, "dark.csv")
    >>> [float(v) for v in out.values], s.level, round(out.noise_floor, 6)   # √(0.3² + 0.4²)
    ([1.0, 5.0, 1.0], 4.0, 0.5)
    """
    file = file if file is not None else str(dark.meta.get("source", "dark scan"))
    if dark.quantity != scan.quantity:
        raise ConfigurationError(f"the dark scan ({file}) is {dark.quantity}, the lamp scan "
                                 f"{scan.quantity}: a dark scan must be of the same quantity "
                                 "and unit", todo="export the dark scan as the lamp scan was")
    if scan.lines or dark.lines:
        raise ConfigurationError("a dark scan is subtracted from measured spectra only (no "
                                 "modelled lines)")
    wl, (lamp_v, d), lo, hi, gaps = on_shared_range(
        (scan, dark), f"the dark scan ({file}) and the lamp scan")
    values = lamp_v - d
    s_scan, s_dark = scan.noise_floor, dark.noise_floor
    if s_scan is None and s_dark is None:
        sigma, basis = None, "unknown (neither scan has a noise estimate)"
    else:
        sigma = math.hypot(s_scan or 0.0, s_dark or 0.0)
        basis = (f"root sum of squares of the lamp scan's ({s_scan:.3g}) and the dark scan's "
                 f"({s_dark:.3g}) noise (JCGM 100:2008 §5.1.2)"
                 if s_scan is not None and s_dark is not None else
                 "the one scan's noise that is known (the other's is not)")
    top = float(np.max(lamp_v))
    level = float(median(d))
    summary = DarkSummary(file, (lo, hi), level, scan.spectral_unit,
                          level / top if top > 0 else None, basis)
    meta = dict(scan.meta)
    digest = hashlib.sha256(f"{scan.meta.get('sha256', '')}\n{dark.meta.get('sha256', '')}"
                            .encode())
    meta.update(dark=summary.to_dict(), sha256=digest.hexdigest(),
                file_name=f"{meta.get('file_name', 'scan')} (− dark {file})")
    out = Spectrum(wl, values, scan.quantity, noise_floor=sigma if sigma else None,
                   covered_nm=(lo, hi), gaps_nm=gaps,
                   meta=MappingProxyType(meta))
    return out, summary
