"""Exposure-limit sets as data: IEC 62471:2006 (default) and labelled alternatives.

A *limit set* is a TOML file in ``data/limits/`` listed in ``data/limits/limits.toml`` (id,
file, sha256; a test recomputes the checksum). Each file states its provenance per value
("doc", "from memory", "derived") and encodes, per hazard:

- the weighted quantity as a sum of spectral *components* (range, weighting id, scale);
- the exposure limit as pieces ``value ≤ C · t^p · α_eff^q`` over duration ranges;
- the radiance averaging field of view γ(t) as pieces ``γ = fov_rad · t^fov_exponent``;
- the α clamp (α_eff = min(max(α, α_min), α_max)) of α-dependent limits;
- the risk-group emission limits (IEC 62471:2006 Table 6.1) with their time bases.

Piece rule: a piece covers ``from_s ≤ t ≤ to_s``; where two pieces share an end point the later
piece applies there (so the blue-light field at exactly 10 000 s is the 0.1 rad of the Table 6.1
note, and the IR-eye limit at 1000 s is the long-term 100 W m⁻²).

Available sets: ``iec62471_2006`` (default, the standard's own risk groups), ``icnirp_2013``
(ICNIRP 2013 retinal thermal limits and the ICNIRP 180–400 nm actinic range; risk groups
derived at the IEC time bases) and ``acgih_2022_far_uvc`` (ACGIH 2022 222 nm TLVs for
far-UVC sources; an approximation described in its file). Alternative sets inherit every
hazard they do not redefine from the set named in ``inherits``.

Only numpy and the standard library are imported here (fast assessment path).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property, lru_cache
from types import MappingProxyType
from typing import Any, Callable, Mapping

import numpy as np

from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError
from uvcheck.weighting import get_weighting

#: Risk groups in order of increasing hazard (IEC 62471:2006 clause 6).
GROUPS = ("Exempt", "RG1", "RG2", "RG3")
#: The limit set used unless another is asked for.
DEFAULT_LIMIT_SET = "iec62471_2006"
#: Hazard ids, in report order (stable JSON keys).
HAZARD_IDS = ("actinic_uv", "near_uv", "blue_light", "retinal_thermal",
              "retinal_thermal_weak_stimulus", "ir_eye", "skin_thermal")

Weight = Callable[[np.ndarray], np.ndarray]


def solid_angle_sr(full_angle_rad: float) -> float:
    """Solid angle of a cone of full plane angle γ, Ω = 4π sin²(γ/4). [sr]

    full_angle_rad : full apex angle γ (the angular subtense α or a field of view). [rad]

    Examples
    --------
    >>> f"{solid_angle_sr(0.011):.5e}"    # π γ²/4 = 9.50332e-05 for small γ
    '9.50329e-05'
    """
    return 4.0 * math.pi * math.sin(full_angle_rad / 4.0) ** 2


@dataclass(frozen=True)
class Piece:
    """One duration range of a piecewise law ``y = C · t^p`` on ``from_s ≤ t ≤ to_s``.

    from_s, to_s : duration range. [s]
    C, p : coefficient and exponent (unit of C: the hazard unit · s^-p, or rad for a field).
    """

    from_s: float
    to_s: float
    C: float
    p: float

    def contains(self, t_s: float) -> bool:
        return self.from_s <= t_s <= self.to_s

    def at(self, t_s: float) -> float:
        return self.C if self.p == 0.0 else self.C * t_s ** self.p


def _piece_at(pieces: tuple[Piece, ...], t_s: float) -> Piece | None:
    """The piece that applies at ``t_s``: the last one containing it."""
    hit = None
    for pc in pieces:
        if pc.contains(t_s):
            hit = pc
    return hit


@dataclass(frozen=True)
class Component:
    """A spectral part of a weighted quantity: ``scale · ∫ X(λ) W(λ) dλ`` over [lo, hi].

    lo_nm, hi_nm : spectral range. [nm]
    weighting : weighting id (``get_weighting``) or None for an unweighted band.
    scale : multiplier (1, or a ratio of dose limits for combined limits). [-]
    """

    lo_nm: float
    hi_nm: float
    weighting: str | None
    scale: float


@dataclass(frozen=True)
class GroupBoundary:
    """A risk-group emission limit: ``limit · α_eff^q`` at ``time_base_s`` (Table 6.1).

    group : ``Exempt``, ``RG1`` or ``RG2`` (above the RG2 limit: RG3).
    limit : coefficient in the hazard unit (times rad^-q for α-dependent limits).
    time_base_s : the exposure duration the limit stands for. [s]
    source : provenance of the cell.
    """

    group: str
    limit: float
    time_base_s: float
    source: str


@dataclass(frozen=True, eq=False)
class HazardLimits:
    """Limits of one hazard (or one variant of it) in a limit set.

    key : entry key in the file (``blue_light_small_source``); hazard_id : the report id.
    quantity : ``irradiance`` [W m⁻²] or ``radiance`` [W m⁻² sr⁻¹] (the hazard's own quantity).
    components, pieces, fov, alpha_exponent, alpha_clamp_rad, groups : see the module notes.
    small_source_below_rad : for a small-source variant, the α under which it applies. [rad]
    weak_stimulus_below_cd_m2 : luminance under which the visual stimulus is weak. [cd m⁻²]
    report_limit_at_s : duration at which ``limit`` is reported when there are no groups. [s]
    also : a second quantity reported beside this one (ACGIH skin TLV).
    """

    key: str
    hazard_id: str
    name: str
    symbol: str
    quantity: str
    components: tuple[Component, ...]
    pieces: tuple[Piece, ...]
    fov: tuple[Piece, ...]
    alpha_exponent: float
    alpha_clamp_rad: tuple[float, float] | None
    groups: tuple[GroupBoundary, ...]
    source: str
    note: str = ""
    variant: str = ""
    small_source_below_rad: float | None = None
    weak_stimulus_below_cd_m2: float | None = None
    report_limit_at_s: float | None = None
    also: "HazardLimits | None" = None

    # --- spectral side ------------------------------------------------------------------------
    @cached_property
    def range_nm(self) -> tuple[float, float]:
        """Span of the components. [nm]"""
        return (min(c.lo_nm for c in self.components), max(c.hi_nm for c in self.components))

    @property
    def unit(self) -> str:
        return "W m-2" if self.quantity == "irradiance" else "W m-2 sr-1"

    @cached_property
    def weighting_ids(self) -> tuple[str, ...]:
        return tuple(c.weighting for c in self.components if c.weighting)

    @property
    def depends_on_alpha(self) -> bool:
        return self.alpha_exponent != 0.0

    def weight(self) -> Weight | None:
        """The combined weighting W(λ) over :attr:`range_nm`, or None for a plain band. [-]

        Components are half-open [lo, hi) except the last, which includes its upper end.
        """
        comps = self.components
        if len(comps) == 1 and comps[0].scale == 1.0:
            return None if comps[0].weighting is None else get_weighting(comps[0].weighting)
        parts = [(c.lo_nm, c.hi_nm, None if c.weighting is None else get_weighting(c.weighting),
                  c.scale) for c in comps]

        def combined(x: np.ndarray) -> np.ndarray:
            x = np.asarray(x, dtype=float)
            out = np.zeros_like(x)
            for i, (lo, hi, w, s) in enumerate(parts):
                inside = (x >= lo) & ((x <= hi) if i == len(parts) - 1 else (x < hi))
                vals = np.ones_like(x) if w is None else w(x)
                out = out + np.where(inside, s * vals, 0.0)
            return out

        return combined

    # --- limits -------------------------------------------------------------------------------
    def alpha_eff(self, alpha_rad: float) -> float:
        """α clamped to the limit's range (α itself if the limit has no clamp). [rad]"""
        if self.alpha_clamp_rad is None:
            return alpha_rad
        lo, hi = self.alpha_clamp_rad
        return min(max(alpha_rad, lo), hi)

    def _alpha_factor(self, alpha_rad: float | None) -> float:
        if not self.depends_on_alpha:
            return 1.0
        if alpha_rad is None:
            raise ConfigurationError(f"the {self.symbol} limit needs the angular subtense α")
        return self.alpha_eff(alpha_rad) ** self.alpha_exponent

    def limit_at(self, t_s: float, alpha_rad: float | None = None) -> float | None:
        """Exposure limit for a duration ``t_s``, or None outside the durations it covers.

        t_s : exposure duration. [s]
        alpha_rad : angular subtense (α-dependent limits only; clamped here). [rad]
        Returns the limit in the hazard's unit. [W m⁻²] or [W m⁻² sr⁻¹]

        Examples
        --------
        >>> E_UVA = get_limit_set("iec62471_2006").hazard("near_uv")
        >>> E_UVA.limit_at(100.0), E_UVA.limit_at(3600.0)
        (100.0, 10.0)
        """
        pc = _piece_at(self.pieces, t_s)
        return None if pc is None else pc.at(t_s) * self._alpha_factor(alpha_rad)

    def fov_at(self, t_s: float) -> float | None:
        """Radiance averaging field of view γ for a duration, or None (irradiance). [rad]"""
        pc = _piece_at(self.fov, t_s)
        return None if pc is None else pc.at(t_s)

    def group_limits(self, alpha_rad: float | None = None) -> list[tuple[str, float, float, float | None]]:
        """(group, emission limit, time base [s], field of view [rad]) for Exempt, RG1, RG2."""
        f = self._alpha_factor(alpha_rad) if self.groups else 1.0
        return [(g.group, g.limit * f, g.time_base_s, self.fov_at(g.time_base_s))
                for g in self.groups]

    def t_max(self, value_over: Callable[[float | None], float], alpha_rad: float | None = None,
              ) -> tuple[float | None, str | None]:
        """Longest exposure for which the value stays within the limit. [s]

        value_over : the hazard value averaged over a field of view γ [rad] (None for an
            irradiance hazard), in the hazard's unit.
        alpha_rad : angular subtense for α-dependent limits. [rad]
        Returns (t_max, note); t_max is None when the limit is never reached (the note says
        why); the note also flags a t_max outside the durations the limit covers.

        Notes
        -----
        The duration axis is cut at every end point of the limit and field-of-view pieces.
        Within a cut of constant field the solution is analytic,
        t = (C α_eff^q / value)^(1/−p); where the field grows with t (γ ∝ √t) the ratio
        value/limit is non-decreasing inside the cut and the crossing is found by bisection
        in log t. t_max is the first duration at which the value exceeds the limit.

        Examples
        --------
        >>> E_S = get_limit_set("iec62471_2006").hazard("actinic_uv")
        >>> E_S.t_max(lambda fov: 0.5)     # E_S = 0.5 W m-2: 30 J m-2 in 60 s
        (60.0, None)
        """
        af = self._alpha_factor(alpha_rad)
        t0, t_end = self.pieces[0].from_s, self.pieces[-1].to_s
        cuts = {t0, t_end}
        for pc in self.pieces + self.fov:
            cuts.update(t for t in (pc.from_s, pc.to_s) if t0 < t < t_end)
        cuts_sorted = sorted(cuts)
        for a, b in zip(cuts_sorted, cuts_sorted[1:]):
            mid = 0.5 * (a + b) if math.isfinite(b) else 2.0 * a + 1.0
            lp = next((pc for pc in self.pieces if pc.contains(mid)), None)
            if lp is None:
                continue
            fp = next((f for f in self.fov if f.contains(mid)), None)

            def ratio(t: float, lp: Piece = lp, fp: Piece | None = fp) -> float:
                return value_over(None if fp is None else fp.at(t)) / (lp.at(t) * af)

            if fp is None or fp.p == 0.0:
                v = value_over(None if fp is None else fp.C)
                if v <= 0.0:
                    return None, "no measurable emission in the hazard's range"
                coef = lp.C * af
                if lp.p == 0.0:
                    if v <= coef:
                        continue
                    return self._fails_from(a)
                log_t = math.log(coef / v) / -lp.p          # in logs: no overflow for tiny v
                if not math.isfinite(b) and log_t > 700.0 or log_t >= math.log(b):
                    continue
                t_star = (coef / v) ** (1.0 / -lp.p)
                if t_star < a:
                    if a == t0 and a > 0.0:
                        return t_star, (f"shorter than {a:g} s, the shortest duration the "
                                        "limit covers (formula extrapolated)")
                    return self._fails_from(a)
                return t_star, None
            lo = max(a, 1e-9)
            hi = b if math.isfinite(b) else 1e12
            if ratio(lo) > 1.0:
                return self._fails_from(a)
            if ratio(hi) <= 1.0:
                continue
            for _ in range(200):
                m = math.sqrt(lo * hi)
                if ratio(m) > 1.0:
                    hi = m
                else:
                    lo = m
                if hi / lo < 1.0 + 1e-13:
                    break
            return hi, None
        if math.isfinite(t_end):
            return None, f"within the limit for every duration it covers (up to {t_end:g} s)"
        return None, "no time limit: the value is within the long-term limit"

    def _fails_from(self, a: float) -> tuple[float, str | None]:
        if a == self.pieces[0].from_s and a > 0.0:
            return a, f"exceeded from {a:g} s, the shortest duration this limit covers"
        return a, None

    def describe(self) -> dict[str, Any]:
        """Provenance record of this hazard's limits (JSON-able)."""
        d = {"key": self.key, "hazard_id": self.hazard_id, "name": self.name,
             "symbol": self.symbol, "unit": self.unit, "range_nm": list(self.range_nm),
             "weightings": list(self.weighting_ids), "source": self.source,
             "groups": [{"group": g.group, "limit": g.limit, "time_base_s": g.time_base_s,
                         "alpha_exponent": self.alpha_exponent, "source": g.source}
                        for g in self.groups]}
        if self.alpha_clamp_rad is not None:
            d["alpha_clamp_rad"] = list(self.alpha_clamp_rad)
        if self.note:
            d["note"] = self.note
        return d


@dataclass(frozen=True, eq=False)
class LimitSet:
    """A named, versioned collection of hazard limits with its provenance.

    id : registry key (``iec62471_2006``).
    classification : ``standard`` (the risk groups are a standard's own) or ``derived``.
    entries : hazard entries by file key (variants such as ``blue_light_small_source``
        have their own key and share a ``hazard_id``).
    """

    id: str
    name: str
    edition: str
    classification: str
    provenance: Mapping[str, Any]
    entries: Mapping[str, HazardLimits] = field(default_factory=dict)
    notes: tuple[str, ...] = ()

    def variants(self, hazard_id: str) -> list[HazardLimits]:
        return [e for e in self.entries.values() if e.hazard_id == hazard_id]

    def hazard(self, key: str) -> HazardLimits:
        """The entry with file key ``key``; ConfigurationError naming the keys otherwise."""
        try:
            return self.entries[key]
        except KeyError:
            raise ConfigurationError(f"limit set {self.id!r} has no hazard {key!r}; "
                                     f"available: {', '.join(self.entries)}") from None

    def describe(self) -> dict[str, Any]:
        """Provenance of the set (for reports and ``uvcheck references``); JSON-able."""
        return {"id": self.id, "name": self.name, "edition": self.edition,
                "classification": self.classification, **dict(self.provenance),
                "notes": list(self.notes)}


# ---------------------------------------------------------------------------------------------
# Loading
# ---------------------------------------------------------------------------------------------

@lru_cache(maxsize=1)
def _registry() -> dict[str, dict[str, Any]]:
    return read_toml("limits/limits.toml")


def available_limit_sets() -> list[str]:
    """Ids of the limit sets shipped in ``data/limits/``, default first."""
    ids = sorted(_registry())
    return sorted(ids, key=lambda i: i != DEFAULT_LIMIT_SET)


def _pieces(rows: list[dict[str, Any]], c: str, p: str) -> tuple[Piece, ...]:
    return tuple(Piece(float(r["from_s"]), float(r["to_s"]), float(r[c]), float(r.get(p, 0.0)))
                 for r in rows)


def _entry(key: str, raw: Mapping[str, Any]) -> HazardLimits:
    comps = tuple(Component(float(c["lo_nm"]), float(c["hi_nm"]), c.get("weighting") or None,
                            float(c.get("scale", 1.0))) for c in raw["components"])
    clamp = raw.get("alpha_clamp_rad")
    also = raw.get("also")
    e = HazardLimits(
        key=key, hazard_id=raw["hazard_id"], name=raw["name"], symbol=raw["symbol"],
        quantity=raw["quantity"], components=comps,
        pieces=_pieces(raw["limit"], "C", "p"),
        fov=_pieces(raw.get("fov", []), "fov_rad", "fov_exponent"),
        alpha_exponent=float(raw.get("alpha_exponent", 0.0)),
        alpha_clamp_rad=None if clamp is None else (float(clamp[0]), float(clamp[1])),
        groups=tuple(GroupBoundary(g["group"], float(g["limit"]), float(g["time_base_s"]),
                                   g.get("source", "")) for g in raw.get("groups", [])),
        source=raw.get("source", ""), note=raw.get("note", ""), variant=raw.get("variant", ""),
        small_source_below_rad=raw.get("small_source_below_rad"),
        weak_stimulus_below_cd_m2=raw.get("weak_stimulus_below_cd_m2"),
        report_limit_at_s=raw.get("report_limit_at_s"),
        also=None if also is None else _entry(key + ".also", also),
    )
    if e.quantity not in ("irradiance", "radiance"):
        raise ConfigurationError(f"limit entry {key}: unknown quantity {e.quantity!r}")
    if [g.group for g in e.groups] not in ([], list(GROUPS[:3])):
        raise ConfigurationError(f"limit entry {key}: groups must be Exempt, RG1, RG2 in order")
    if e.quantity == "radiance" and not e.fov:
        raise ConfigurationError(f"limit entry {key}: a radiance limit needs a field of view")
    return e


@lru_cache(maxsize=None)
def get_limit_set(limit_set_id: str = DEFAULT_LIMIT_SET) -> LimitSet:
    """Load a limit set by its exact id (once per process), resolving ``inherits``.

    Raises ConfigurationError naming the available ids for an unknown id.

    Examples
    --------
    >>> ls = get_limit_set("iec62471_2006")
    >>> [g[:3] for g in ls.hazard("blue_light").group_limits()]
    [('Exempt', 100.0, 10000.0), ('RG1', 10000.0, 100.0), ('RG2', 4000000.0, 0.25)]
    """
    reg = _registry()
    if limit_set_id not in reg:
        raise ConfigurationError(f"unknown limit set {limit_set_id!r}; "
                                 f"available: {', '.join(available_limit_sets())}",
                                 todo="choose one of the listed ids with --limits")
    meta = reg[limit_set_id]
    raw = read_toml("limits/" + meta["file"])
    head = raw["set"]
    entries: dict[str, HazardLimits] = {}
    if head.get("inherits"):
        entries.update(get_limit_set(head["inherits"]).entries)
    for key, h in raw["hazards"].items():
        entries[key] = _entry(key, h)
    for h in HAZARD_IDS:
        sigs = {tuple((c.lo_nm, c.hi_nm, c.weighting, c.scale) for c in e.components)
                for e in entries.values() if e.hazard_id == h}
        if len(sigs) > 1:
            raise ConfigurationError(f"limit set {limit_set_id!r}: the variants of {h} must "
                                     "share one spectral integral")
    missing = [h for h in HAZARD_IDS if not any(e.hazard_id == h for e in entries.values())]
    if missing:
        raise ConfigurationError(f"limit set {limit_set_id!r} lacks {', '.join(missing)}")
    prov = {k: head[k] for k in ("risk_groups_from", "exposure_limits_from", "digits_from",
                                 "inherits") if k in head}
    prov["file"] = "limits/" + meta["file"]
    prov["sha256"] = meta.get("sha256", "")
    return LimitSet(id=limit_set_id, name=head["name"], edition=head["edition"],
                    classification=head["classification"], provenance=MappingProxyType(prov),
                    entries=MappingProxyType(entries), notes=tuple(head.get("notes", ())))
