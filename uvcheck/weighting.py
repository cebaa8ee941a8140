"""Weighting functions (hazard and action spectra) as data with provenance.

Each weighting is a table in ``data/weightings/`` with an entry in
``data/weightings/weightings.toml`` naming its source, edition, table, where the digits came
from, which rows are from memory, its interpolation rule and the sha256 of the file (a test
recomputes it, so an accidental edit fails CI).

Out-of-range rule: a weighting is zero outside its defined range. Interpolation is named per
table: ``log-linear`` (linear in log10 of the value) for functions that span decades such as
the actinic UV function S(λ) — the standard does not prescribe a rule and log-linear is the
usual practice, exact for the exponential segments of S, B and R — or ``linear``.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache
from types import MappingProxyType
from typing import Any, Mapping

import numpy as np

from uvcheck.data_files import read_table, read_toml
from uvcheck.errors import ConfigurationError

INTERPOLATIONS = ("linear", "log-linear")


@dataclass(frozen=True, eq=False)
class Weighting:
    """A tabulated relative weighting W(λ).

    id : registry key, e.g. ``S_actinic``.
    name : what it is called in reports.
    wavelength_nm, value : table nodes. [nm], [-]
    range_nm : defined range; W = 0 outside. [nm]
    interpolation : ``linear`` or ``log-linear``.
    provenance : source, edition, table, digits_from, from_memory, file, sha256.

    Examples
    --------
    >>> S = get_weighting("S_actinic")
    >>> float(S(np.array([254.0, 270.0]))[0])
    0.5
    """

    id: str
    name: str
    wavelength_nm: np.ndarray
    value: np.ndarray
    range_nm: tuple[float, float]
    interpolation: str
    provenance: Mapping[str, Any] = field(default_factory=lambda: MappingProxyType({}))

    def __post_init__(self) -> None:
        wl = np.array(self.wavelength_nm, dtype=float)
        v = np.array(self.value, dtype=float)
        if self.interpolation not in INTERPOLATIONS:
            raise ConfigurationError(f"unknown interpolation {self.interpolation!r}; "
                                     f"available: {', '.join(INTERPOLATIONS)}")
        if wl.ndim != 1 or wl.shape != v.shape or wl.size < 2:
            raise ConfigurationError(f"weighting {self.id}: table shape mismatch")
        if not np.all(np.diff(wl) > 0):
            raise ConfigurationError(f"weighting {self.id}: wavelengths not increasing")
        if np.any(v < 0):
            raise ConfigurationError(f"weighting {self.id}: negative weights")
        if self.interpolation == "log-linear" and np.any(v <= 0):
            raise ConfigurationError(f"weighting {self.id}: log-linear needs positive values")
        wl.setflags(write=False)
        v.setflags(write=False)
        object.__setattr__(self, "wavelength_nm", wl)
        object.__setattr__(self, "value", v)
        object.__setattr__(self, "_log", np.log10(v) if self.interpolation == "log-linear" else None)
        object.__setattr__(self, "_at_memo", {})
        if not isinstance(self.provenance, MappingProxyType):
            object.__setattr__(self, "provenance", MappingProxyType(dict(self.provenance)))

    def __call__(self, wavelength_nm: Any) -> np.ndarray:
        """W(λ) at the given wavelengths; 0 outside the defined range. [-]"""
        x = np.asarray(wavelength_nm, dtype=float)
        lo, hi = self.range_nm
        inside = (x >= lo) & (x <= hi)
        if self._log is not None:  # type: ignore[attr-defined]
            w = np.power(10.0, np.interp(x, self.wavelength_nm, self._log))  # type: ignore[attr-defined]
        else:
            w = np.interp(x, self.wavelength_nm, self.value)
        return np.where(inside, w, 0.0)

    def at(self, wavelength_nm: float) -> float:
        """W(λ) at one wavelength: ``float(self(np.array([λ]))[0])``, remembered per weighting
        (the table is immutable, so the value never changes; claims and organism tables ask
        for the same few wavelengths many times). [-]

        Examples
        --------
        >>> get_weighting("S_actinic").at(270.0)
        1.0
        """
        key = float(wavelength_nm)
        memo: dict[float, float] = self._at_memo  # type: ignore[attr-defined]
        v = memo.get(key)
        if v is None:
            v = float(self(np.array([key]))[0])
            if len(memo) < 4096:
                memo[key] = v
        return v

    def describe(self) -> dict[str, Any]:
        """Provenance record for reports and ``uvcheck references``."""
        return {"id": self.id, "name": self.name, "range_nm": list(self.range_nm),
                "interpolation": self.interpolation, **dict(self.provenance)}


@lru_cache(maxsize=1)
def _registry() -> dict[str, dict[str, Any]]:
    return read_toml("weightings/weightings.toml")


def available_weightings() -> list[str]:
    return sorted(_registry())


@lru_cache(maxsize=None)
def get_weighting(weighting_id: str) -> Weighting:
    """Load a weighting by its exact id (loaded once per process).

    Raises ConfigurationError naming the available ids for an unknown id.
    """
    reg = _registry()
    if weighting_id not in reg:
        raise ConfigurationError(f"unknown weighting {weighting_id!r}; "
                                 f"available: {', '.join(sorted(reg))}")
    entry = reg[weighting_id]
    table = read_table("weightings/" + entry["file"])
    wl = table.floats("wavelength_nm")
    v = table.floats("value")
    rng = tuple(entry.get("range_nm", (wl[0], wl[-1])))
    prov = {k: entry[k] for k in entry if k not in ("name", "range_nm", "interpolation")}
    return Weighting(id=weighting_id, name=entry["name"], wavelength_nm=np.array(wl),
                     value=np.array(v), range_nm=(float(rng[0]), float(rng[1])),
                     interpolation=entry["interpolation"], provenance=prov)


def constant_weighting(weighting_id: str, name: str, lo_nm: float, hi_nm: float,
                       provenance: Mapping[str, Any] | None = None) -> Weighting:
    """W = 1 on [lo, hi], 0 outside: an unweighted band as a Weighting."""
    return Weighting(id=weighting_id, name=name, wavelength_nm=np.array([lo_nm, hi_nm]),
                     value=np.array([1.0, 1.0]), range_nm=(lo_nm, hi_nm),
                     interpolation="linear", provenance=provenance or {"source": "definition"})
