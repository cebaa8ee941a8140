"""Photobiological hazard evaluation of a lamp spectrum (IEC 62471:2006 / CIE S 009:2002).

A **screening assessment, not a certification**: the result applies to the measured sample
at the stated distance and conditions; exposure limits are guidance, not a sharp line between
safe and harmful; local codes and licensed practice take precedence.

Entry point: :func:`evaluate_hazards` (pure: no I/O, printing or plotting). Hazards, ids and
quantities (IEC 62471:2006 clause 4.3; units in brackets):

==============================  ======  =========  ==========================  ==============
id                              symbol  range nm   weighting                   unit
==============================  ======  =========  ==========================  ==============
``actinic_uv``                  E_S     200–400    S(λ) (ICNIRP set: 180–400)  [W m⁻²]
``near_uv``                     E_UVA   315–400    none                        [W m⁻²]
``blue_light``                  L_B     300–700    B(λ)                        [W m⁻² sr⁻¹]
  (small source, α < 0.011)     E_B     300–700    B(λ)                        [W m⁻²]
``retinal_thermal``             L_R     380–1400   R(λ)                        [W m⁻² sr⁻¹]
``retinal_thermal_weak_stim…``  L_IR    780–1400   R(λ)                        [W m⁻² sr⁻¹]
``ir_eye``                      E_IR    780–3000   none                        [W m⁻²]
``skin_thermal``                E_H     380–3000   none                        [W m⁻²]
==============================  ======  =========  ==========================  ==============

The limits, fields of view, α clamps and risk-group emission limits are data
(:mod:`uvcheck.limits`, ``data/limits/``), each value labelled "doc", "from memory" or
"derived". Weighted integrals use :func:`uvcheck.spectrum.integrate` on the spectrum's own
grid; S(λ), B(λ) and R(λ), which span decades, are interpolated **log-linearly** between their
table points (the standard prescribes no rule; log-linear is exact for their exponential
segments), and every result says so in its assumptions.

How to read a hazard's status and risk group
--------------------------------------------
``complete``
    The weighting's range is fully measured: ``value`` and ``risk_group`` are the result.
``partial``
    Part of the range is unmeasured (missing range is never read as zero). ``value`` is a
    **lower bound**, ``t_max_s`` an upper bound, and the group computed from the value is a
    lower bound: ``risk_group`` = X with ``risk_group_is_lower_bound: true`` reads "at least X".
    Partial data are never Exempt: when the lower bound is under the Exempt limit the result is
    ``risk_group: "Exempt"`` with ``risk_group_is_lower_bound: true``, which renderers print as
    "at least Exempt – not assessable as Exempt".
``below-detection``
    Fully measured, but the value is under the detection limit (3 σ of the spectrum's noise
    floor, :attr:`~uvcheck.spectrum.Integral.detection_limit`). ``value`` is then the detection
    limit (print "< value"), ``value_estimate`` the raw estimate; the group from the detection
    limit is an upper bound (``risk_group_bound: "at-most"``) unless it is Exempt, which is then
    certain.
``not-assessable``
    No measured overlap with the range, a relative or flux spectrum, or geometry that is missing
    (a radiance hazard without the source size). ``value`` and ``risk_group`` are None and
    ``reason`` says what is missing.
``not-applicable``
    The weak-visual-stimulus hazard L_IR for a source whose luminance shows the stimulus is not
    weak (IEC 62471:2006; criterion 10 cd m⁻², from memory).

``risk_group_bound`` is ``exact``, ``at-least``, ``at-most`` or None, and ``risk_group_range``
gives the lowest and highest group the data allow. The skin thermal hazard has no risk groups
in Table 6.1 (its ``risk_group`` is None). The **overall group** is the worst lowest-possible
group; it is a lower bound (``is_lower_bound``) whenever some hazard could still be worse
(partial, not assessable, or below detection with an upper bound above it), and ``governing``
names the hazard that sets it.

Geometry
--------
- Input may be spectral irradiance or radiance. Radiance from irradiance is L = E/Ω with Ω the
  solid angle of the source (uniform source radiance assumed); a source smaller than a field of
  view γ is averaged over it, L = E/Ω(max(α, γ)). Irradiance from radiance is E = L·Ω(α).
  Neither conversion is made without α; with a radiance input and no α the source is taken to
  fill every field (the measured radiance is used as is, which can only overstate) and
  α-dependent limits use the upper α clamp (the lowest limit).
- Blue light: with α < 0.011 rad, or with no size given, the small-source irradiance E_B is
  evaluated (the no-size case is recorded as an assumption); otherwise the radiance L_B with
  fields of 0.1 rad (Exempt, 10 000 s), 0.011 rad (RG1, 100 s) and 0.0017 rad (RG2, 0.25 s).
  The reported ``value`` is the one compared with the Exempt limit; ``group_limits`` gives the
  value over each group's field.
- Retinal thermal: α clamped to 0.0017–0.1 rad (L_R) or 0.011–0.1 rad (L_IR); the lower clamp
  is also the averaging field.
- Assessment distance: lamps for general lighting service at the 500 lx distance, never under
  200 mm; others at 200 mm. A spectrum measured elsewhere is rescaled by the inverse-square law
  of a point source (flagged: invalid close to an extended source). With no measurement distance
  everything is evaluated at the measurement position and the result says so.

Known non-monotonicity (by the standard, not by this code): the weak-stimulus criterion can
switch L_IR off when a source is scaled up to a luminance of 10 cd m⁻² or more; all other
values and groups never decrease when a spectrum is scaled up, moved closer, or gains range.

Examples
--------
A low-pressure mercury line of 0.01 W m⁻² at 253.7 nm, measured at 200 mm (a nominal line
source, model range 180–3000 nm):

>>> from uvcheck.spectrum import Line, Spectrum
>>> from uvcheck.conditions import Conditions
>>> lamp = Spectrum([], [], "irradiance", lines=[Line(253.7, 0.01)], covered_nm=(180.0, 3000.0))
>>> ev = evaluate_hazards(lamp, Conditions(measurement_distance_m=0.2))
>>> e_s = ev.hazard("actinic_uv")
>>> round(e_s.value, 5), e_s.risk_group, round(e_s.t_max_s)
(0.00494, 'RG2', 6068)
>>> ev.risk_group.group, ev.risk_group.governing
('RG2', 'actinic_uv')
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property
from types import MappingProxyType
from typing import Any, Callable, Mapping

import numpy as np

from uvcheck.conditions import Conditions
from uvcheck.constants import K_M_LM_PER_W
from uvcheck.errors import ConfigurationError
from uvcheck.limits import (DEFAULT_LIMIT_SET, GROUPS, HAZARD_IDS, HazardLimits, LimitSet,
                            available_limit_sets, get_limit_set, solid_angle_sr)
from uvcheck.photometry import v_lambda, visible_share
from uvcheck.spectrum import Integral, Spectrum, integrate, remembered
from uvcheck.units import sig as _sig
from uvcheck.weighting import get_weighting

#: Status values of a hazard result.
STATUSES = ("complete", "partial", "below-detection", "not-assessable", "not-applicable")
#: IEC 62471:2006: non-GLS lamps at 200 mm; GLS at the 500 lx distance, never under 200 mm.
MIN_ASSESSMENT_DISTANCE_M = 0.2
GLS_ILLUMINANCE_LX = 500.0
#: Inverse-square law from a source of size D is taken as fair beyond 5 D (common practice).
POINT_SOURCE_DIAMETERS = 5.0
#: V(λ) share that counts as a complete luminous measurement (≥ 99.9 %, our choice).
_V_COMPLETE = 0.999
#: Search range of hazard distances. [m]
_D_MIN_M, _D_MAX_M = 1e-3, 1e4
#: UV lamp product in the sense of IEC 62471-6:2022: > 50 % of 180–3000 nm output in 180–400 nm.
_UV_PRODUCT_NM = (180.0, 400.0, 3000.0)

SCREENING_NOTE = ("Screening assessment, not a certification: it applies to the measured "
                  "sample at the stated distance and conditions; exposure limits are guidance "
                  "values, and local codes and licensed practice take precedence.")
_DISTANCE_NOTE = ("Values away from the measurement position use the inverse-square law of a "
                  "point source: an approximation, invalid close to an extended source.")
#: What each emitter model makes of a move from the measurement distance, in words (the point
#: model's is :data:`_DISTANCE_NOTE`).
_MODEL_NOTES = {
    "lambertian": ("Values away from the measurement position follow the on-axis Lambertian "
                   "emitter model, E ∝ 1/(a² + d²) for a disc of radius a (a = 0, the "
                   "inverse-square law, when no source size is given): an approximation, on "
                   "axis only."),
    "tube": ("Values away from the measurement position follow the linear-tube model (Keitz "
             "formula, on the perpendicular bisector facing the tube), the model given for "
             "this lamp: it ignores the tube's diameter, electrodes and any reflector, so it is "
             "inaccurate within a few tube diameters and off the bisector."),
}


def distance_note(cond: Conditions) -> str:
    """How values are moved away from the measurement position under ``cond``'s emitter
    model, in one sentence."""
    return _MODEL_NOTES.get(cond.emitter, _DISTANCE_NOTE)


def distance_factor(cond: Conditions, d_from: Any, d_to: Any) -> Any:
    """E(d_to)/E(d_from) on axis by the conditions' emitter model (:mod:`uvcheck.geometry`),
    the factor that moves a measured irradiance from ``d_from`` to ``d_to``; the point model
    is the inverse-square law (d_from/d_to)². Scalars or arrays. [-]

    Examples
    --------
    >>> distance_factor(Conditions(), 0.5, 0.25)
    4.0
    >>> round(float(distance_factor(Conditions(emitter="tube", tube_length_m=0.8), 10.0, 5.0)), 3)
    3.987
    """
    if cond.emitter == "point":
        return (d_from / d_to) ** 2
    from uvcheck.geometry import scale_factor

    return scale_factor(d_from, d_to, cond.emitter, cond.tube_length_m, cond.source_size_m)


def distance_for_factor(cond: Conditions, d_from: Any, r: Any) -> Any:
    """The distance d at which ``distance_factor(cond, d_from, d)`` equals 1/r: where a
    quantity r times its limit at ``d_from`` meets the limit. The inverse of the emitter model
    (:func:`uvcheck.geometry.distance_for_irradiance`, for the irradiance per watt at
    ``d_from`` divided by r), kept to the search range of hazard distances: 1 mm where even
    1 mm is far enough (or the model never reaches that irradiance, as a Lambertian disc's
    finite on-axis maximum), 20 km where even 10 km is not; 0 for r ≤ 0. Scalars or
    arrays. [m]

    Examples
    --------
    >>> distance_for_factor(Conditions(), 0.2, 4.0)
    0.4
    >>> tube = Conditions(emitter="tube", tube_length_m=0.8)
    >>> d = distance_for_factor(tube, 0.2, 4.0)
    >>> round(float(4.0 * distance_factor(tube, 0.2, d)), 9)
    1.0
    """
    scalar = np.ndim(d_from) == 0 and np.ndim(r) == 0
    if cond.emitter == "point":
        return d_from * math.sqrt(r) if scalar else np.asarray(d_from) * np.sqrt(r)
    from uvcheck.geometry import distance_for_irradiance, irradiance_per_watt

    d0, rr = np.broadcast_arrays(np.asarray(d_from, dtype=float), np.asarray(r, dtype=float))
    ok = rr > 0
    per_w = np.asarray(irradiance_per_watt(d0, cond.emitter, cond.tube_length_m,
                                           cond.source_size_m))
    d = distance_for_irradiance(per_w / np.where(ok, rr, 1.0), flux_W=1.0, emitter=cond.emitter,
                                tube_length_m=cond.tube_length_m,
                                source_size_m=cond.source_size_m)
    d = np.nan_to_num(np.asarray(np.nan if d is None else d, dtype=float), nan=0.0)
    # the search range of hazard distances: within at 1 mm reads 1 mm, beyond 10 km 20 km
    d = np.where(d < _D_MIN_M, _D_MIN_M, np.where(d > _D_MAX_M, 2.0 * _D_MAX_M, d))
    d = np.where(ok, d, 0.0)
    return float(d) if scalar else d


def _num(x: float | None) -> float | None:
    """JSON-safe float: None for None, NaN or ±inf."""
    return None if x is None or not math.isfinite(x) else float(x)


# ---------------------------------------------------------------------------------------------
# Result objects
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class GroupLimit:
    """One risk-group boundary as applied: emission limit, time base, field, and the value.

    group : ``Exempt``, ``RG1`` or ``RG2``.
    limit : emission limit (α applied), hazard unit. [W m⁻²] or [W m⁻² sr⁻¹]
    time_base_s : duration the limit stands for. [s]
    fov_rad : averaging field of view for radiance (None for irradiance). [rad]
    value : the hazard value averaged over that field (None if not assessable). [hazard unit]
    """

    group: str
    limit: float | None
    time_base_s: float
    fov_rad: float | None
    value: float | None

    def to_dict(self) -> dict[str, Any]:
        return {"group": self.group, "limit": _num(self.limit), "time_base_s": self.time_base_s,
                "fov_rad": _num(self.fov_rad), "value": _num(self.value)}


@dataclass(frozen=True)
class HazardResult:
    """One hazard: weighted value, limit, t_max, risk group, coverage and status.

    value : weighted value at the evaluation distance (lower bound if ``partial``; the
        detection limit if ``below-detection``); None if not assessable. [unit]
    value_estimate : raw estimate where ``value`` is a detection limit. [unit]
    limit : Exempt emission limit (Table 6.1, α applied) or, for a hazard without groups, the
        exposure limit at ``report_limit_at_s``; ``limit_basis`` says which. [unit]
    t_max_s : maximum exposure time; None when the limit is never reached or unknown
        (``t_max_note`` says which). [s]
    risk_group, risk_group_is_lower_bound, risk_group_bound, risk_group_range : see the
        module notes.
    coverage : share of the weighting's area measured, 0–1. [-]
    alpha_rad : α_eff used in α-dependent limits (after the clamp). [rad]
    """

    id: str
    symbol: str
    name: str
    unit: str
    value: float | None
    value_estimate: float | None
    limit: float | None
    limit_basis: str
    t_max_s: float | None
    t_max_note: str | None
    risk_group: str | None
    risk_group_is_lower_bound: bool
    risk_group_bound: str | None
    risk_group_range: tuple[str, str] | None
    coverage: float
    status: str
    reason: str | None
    assumptions: tuple[str, ...]
    range_nm: tuple[float, float]
    covered_nm: tuple[tuple[float, float], ...]
    weighting: str | None
    sigma: float | None
    detection_limit: float | None
    alpha_rad: float | None
    group_limits: tuple[GroupLimit, ...]
    also: Mapping[str, Any] | None = None

    @property
    def ratio_to_limit(self) -> float | None:
        """value / limit (None if either is unknown). [-]"""
        if self.value is None or not self.limit:
            return None
        return self.value / self.limit

    def to_dict(self) -> dict[str, Any]:
        return {
            "symbol": self.symbol, "value": _num(self.value), "unit": self.unit,
            "limit": _num(self.limit), "t_max_s": _num(self.t_max_s),
            "risk_group": self.risk_group,
            "risk_group_is_lower_bound": self.risk_group_is_lower_bound,
            "coverage": float(self.coverage), "status": self.status,
            "assumptions": list(self.assumptions),
            "name": self.name, "reason": self.reason, "value_estimate": _num(self.value_estimate),
            "limit_basis": self.limit_basis, "t_max_note": self.t_max_note,
            "risk_group_bound": self.risk_group_bound,
            "risk_group_range": None if self.risk_group_range is None else list(self.risk_group_range),
            "range_nm": list(self.range_nm), "covered_nm": [list(c) for c in self.covered_nm],
            "weighting": self.weighting, "sigma": _num(self.sigma),
            "detection_limit": _num(self.detection_limit), "alpha_rad": _num(self.alpha_rad),
            "group_limits": [g.to_dict() for g in self.group_limits],
            "also": None if self.also is None else dict(self.also),
        }


@dataclass(frozen=True)
class OverallRiskGroup:
    """The lamp's risk group: the worst hazard's group.

    group : lowest group the data allow (None if no hazard could be assessed).
    is_lower_bound : True when some hazard could still raise it ("at least").
    governing : id of the hazard that sets ``group``.
    upper_bound : highest group the data allow.
    open_hazards : ids of hazards that keep the group from being exact.
    """

    group: str | None
    is_lower_bound: bool
    governing: str | None
    upper_bound: str | None
    open_hazards: tuple[str, ...]
    note: str

    def to_dict(self) -> dict[str, Any]:
        return {"group": self.group, "is_lower_bound": self.is_lower_bound,
                "governing": self.governing, "upper_bound": self.upper_bound,
                "open_hazards": list(self.open_hazards), "note": self.note}


@dataclass(frozen=True)
class EvaluationInfo:
    """Where and how the hazards were evaluated.

    distance_m : evaluation distance (None = at the measurement position). [m]
    distance_rule : how it was chosen, in words.
    alpha_rad : angular subtense of the source at that distance (None if unknown). [rad]
    measurement_distance_m : where the spectrum was measured (None if not given). [m]
    distance_factor : irradiance factor applied, E(d)/E(d_meas) by the emitter model ((d_meas/d)²
        for the point model; 1 if not rescaled). [-]
    distance_model : the emitter model of that factor (``point``, ``lambertian``, ``tube``).
    illuminance_lx : illuminance at the evaluation distance, where known. [lx]
    """

    distance_m: float | None
    distance_rule: str
    alpha_rad: float | None
    limit_set: str
    measurement_distance_m: float | None
    distance_factor: float
    rescaled: bool
    input_quantity: str
    source_size_m: float | None
    illuminance_lx: float | None
    assumptions: tuple[str, ...]
    distance_model: str = "point"

    def to_dict(self) -> dict[str, Any]:
        return {"distance_m": _num(self.distance_m), "distance_rule": self.distance_rule,
                "alpha_rad": _num(self.alpha_rad), "limit_set": self.limit_set,
                "measurement_distance_m": _num(self.measurement_distance_m),
                "distance_factor": _num(self.distance_factor),
                "distance_model": self.distance_model,
                "rescaled": self.rescaled, "input_quantity": self.input_quantity,
                "source_size_m": _num(self.source_size_m),
                "illuminance_lx": _num(self.illuminance_lx),
                "assumptions": list(self.assumptions)}


@dataclass(frozen=True)
class HazardDistance:
    """Distances from the lamp for one hazard (inverse-square law, point source).

    distance_m : distance beyond which ``t_max`` ≥ the exposure time. [m]
    boundaries_m : for Exempt, RG1, RG2, the distance beyond which the hazard is in that group
        or a lower one. [m]
    bound : ``exact``; ``at-least`` (partial data: the true distances can be larger);
        ``at-most`` (from a detection limit); None if not computable (also for partial data
        whose measured part is below the detection limit: no bound either way).
    meaning : what a boundary distance means for this hazard, in words (blue light: the
        field-of-view and small-source regimes, see :func:`_blue_regimes`).
    regimes : blue light with a known source size: ``source_size_m``, the distance within
        which the source fills each group's averaging field (``fills_field_within_m``), the
        distance beyond which it is a small source assessed by E_B
        (``small_source_beyond_m``), and the source's own radiance
        (``source_radiance``, W m⁻² sr⁻¹). None otherwise. [m]
    """

    hazard_id: str
    symbol: str | None
    exposure_time_s: float
    distance_m: float | None
    note: str | None
    boundaries_m: Mapping[str, float | None]
    boundary_notes: Mapping[str, str | None]
    bound: str | None
    meaning: str | None = None
    regimes: Mapping[str, Any] | None = None

    def to_dict(self) -> dict[str, Any]:
        reg = None
        if self.regimes is not None:
            reg = {k: ({g: _num(x) for g, x in v.items()} if isinstance(v, Mapping) else _num(v))
                   for k, v in self.regimes.items()}
        return {"symbol": self.symbol, "exposure_time_s": self.exposure_time_s,
                "distance_m": _num(self.distance_m), "note": self.note,
                "boundaries_m": {k: _num(v) for k, v in self.boundaries_m.items()},
                "boundary_notes": dict(self.boundary_notes), "bound": self.bound,
                "meaning": self.meaning, "regimes": reg}


@dataclass(frozen=True)
class HazardDistances:
    """Hazard distances for the UV hazards and blue light, and which UV hazard governs."""

    exposure_time_s: float
    entries: tuple[HazardDistance, ...]
    governing_uv: str | None
    note: str

    def to_dict(self) -> dict[str, Any]:
        return {"exposure_time_s": self.exposure_time_s, "governing_uv": self.governing_uv,
                "note": self.note, **{e.hazard_id: e.to_dict() for e in self.entries}}


@dataclass(frozen=True)
class UvLampProduct:
    """Whether the lamp is a UV lamp product in the sense of IEC 62471-6:2022.

    uv_fraction : share of the measured 180–3000 nm output within 180–400 nm. [-]
    is_uv_lamp_product : the finding (on the measured part when not ``determined``).
    determined : True when the unmeasured range cannot change the finding.
    """

    uv_fraction: float | None
    coverage_uv: float
    coverage_rest: float
    is_uv_lamp_product: bool | None
    determined: bool
    note: str

    def to_dict(self) -> dict[str, Any]:
        return {"uv_fraction": _num(self.uv_fraction), "coverage_180_400": self.coverage_uv,
                "coverage_400_3000": self.coverage_rest,
                "is_uv_lamp_product": self.is_uv_lamp_product, "determined": self.determined,
                "note": self.note}


@dataclass(frozen=True)
class BlueLightWhiteSource:
    """Blue-light hazard efficacy of luminous radiation (IEC TR 62778).

    K_B_v_W_per_lm : K_B,v = E_B / E_v. [W lm⁻¹]
    E_thr_lx : illuminance at which E_B reaches the small-source RG1 limit (1 W m⁻²),
        E_thr = 1 W m⁻² / K_B,v (formula from memory). [lx]
    illuminance_lx : illuminance at the evaluation distance, where known. [lx]
    exceeds_threshold : illuminance_lx > E_thr (None if unknown).
    visible_fraction : share of the measured output within 380–780 nm; under 0.5 the source
        is not white and K_B,v is given for information only. [-]
    """

    K_B_v_W_per_lm: float | None
    E_thr_lx: float | None
    illuminance_lx: float | None
    exceeds_threshold: bool | None
    visible_fraction: float | None
    status: str
    note: str

    def to_dict(self) -> dict[str, Any]:
        return {"K_B_v_W_per_lm": _num(self.K_B_v_W_per_lm), "E_thr_lx": _num(self.E_thr_lx),
                "illuminance_lx": _num(self.illuminance_lx),
                "exceeds_threshold": self.exceeds_threshold,
                "visible_fraction": _num(self.visible_fraction), "status": self.status,
                "note": self.note}


@dataclass(frozen=True)
class DistanceEvaluation:
    """Hazards and group at one distance (used for the distance of use)."""

    evaluation: EvaluationInfo
    hazards: tuple[HazardResult, ...]
    risk_group: OverallRiskGroup

    def hazard(self, hazard_id: str) -> HazardResult:
        return next(h for h in self.hazards if h.id == hazard_id)

    def to_dict(self) -> dict[str, Any]:
        return {"evaluation": self.evaluation.to_dict(),
                "hazards": {h.id: h.to_dict() for h in self.hazards},
                "risk_group": self.risk_group.to_dict()}


@dataclass(frozen=True)
class HazardEvaluation:
    """Everything :func:`evaluate_hazards` found. ``to_dict()`` is the JSON contract."""

    hazards: tuple[HazardResult, ...]
    risk_group: OverallRiskGroup
    evaluation: EvaluationInfo
    use_distance: DistanceEvaluation | None
    limit_set: Mapping[str, Any]
    available_limit_sets: tuple[str, ...]
    #: the notes of the evaluation; :attr:`notes` adds the UV-lamp-product note after them
    base_notes: tuple[str, ...]
    #: what the distances, the UV-lamp-product check and the white-source check are computed
    #: from, on first use (a batch summary row needs none of them)
    spectrum: Spectrum
    source: "_Source"

    @cached_property
    def hazard_distances(self) -> HazardDistances:
        """Distances at which each hazard meets the RG boundaries (:func:`_hazard_distances`)."""
        return _hazard_distances(self.source)

    @cached_property
    def uv_lamp_product(self) -> UvLampProduct:
        """Whether the lamp counts as a UV lamp product (IEC 62471-6 flag)."""
        return _uv_lamp_product(self.spectrum)

    @cached_property
    def blue_light_white_source(self) -> BlueLightWhiteSource:
        """The blue-light check for white sources (E_v-based screening)."""
        return _blue_white(self.spectrum, self.source, self.evaluation)

    @property
    def notes(self) -> tuple[str, ...]:
        uvp = self.uv_lamp_product
        return self.base_notes + ((uvp.note,) if uvp.is_uv_lamp_product else ())

    def hazard(self, hazard_id: str) -> HazardResult:
        """The result for one hazard id (``actinic_uv``, …)."""
        for h in self.hazards:
            if h.id == hazard_id:
                return h
        raise KeyError(f"unknown hazard {hazard_id!r}; available: {', '.join(HAZARD_IDS)}")

    def to_dict(self) -> dict[str, Any]:
        return {
            "hazards": {h.id: h.to_dict() for h in self.hazards},
            "risk_group": self.risk_group.to_dict(),
            "evaluation": self.evaluation.to_dict(),
            "hazard_distances": self.hazard_distances.to_dict(),
            "uv_lamp_product": self.uv_lamp_product.to_dict(),
            "blue_light_white_source": self.blue_light_white_source.to_dict(),
            "use_distance": None if self.use_distance is None else self.use_distance.to_dict(),
            "limit_sets": {"used": self.evaluation.limit_set,
                           "available": list(self.available_limit_sets)},
            "limit_set": dict(self.limit_set),
            "notes": list(self.notes),
        }


# ---------------------------------------------------------------------------------------------
# Geometry
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class _Geo:
    """Conversion factors at one evaluation distance.

    input_quantity : ``irradiance`` or ``radiance`` (the measured spectrum).
    k : irradiance factor E(d)/E(d_meas) by the emitter model ((d_meas / d)² for a point
        source), 1 when not rescaled. [-]
    alpha : angular subtense at the evaluation distance, or None. [rad]
    alpha_meas : angular subtense at the measurement distance (where the irradiance was
        measured), or None. [rad]
    """

    input_quantity: str
    k: float
    alpha: float | None
    alpha_meas: float | None = None

    def factor(self, hazard_quantity: str, fov: float | None) -> float | None:
        """Multiplier from the measured integral to the hazard quantity (None: impossible)."""
        a = self.alpha
        if hazard_quantity == "irradiance":
            if self.input_quantity == "irradiance":
                return self.k
            return None if a is None else solid_angle_sr(a)
        # radiance averaged over the field fov (a source smaller than it is averaged over it)
        if self.input_quantity == "irradiance":
            if a is None:
                return None
            if self.alpha_meas is not None:
                # L = E_meas/Ω(α_meas) is the source's radiance, the same at every distance
                # (radiance invariance); a field wider than the source averages it down:
                # L·Ω(α)/Ω(max(α, fov)). Equal to k/Ω(max(α, fov)) for small angles, and right
                # close to the source, where the inverse-square law of the irradiance fails.
                return solid_angle_sr(a) / (solid_angle_sr(self.alpha_meas)
                                            * solid_angle_sr(max(a, fov or 0.0)))
            return self.k / solid_angle_sr(max(a, fov or 0.0))
        if a is None:
            return 1.0
        return solid_angle_sr(a) / solid_angle_sr(max(a, fov or 0.0))


def _alpha_at(cond: Conditions, d_eval: float | None, d_meas: float | None) -> float | None:
    """α at the evaluation distance: from the source size, or a given α scaled with distance."""
    if cond.alpha_rad is not None:
        if d_eval is None or d_meas is None or d_eval == d_meas:
            return cond.alpha_rad
        size = 2.0 * d_meas * math.tan(cond.alpha_rad / 2.0)
        return 2.0 * math.atan(size / (2.0 * d_eval))
    if cond.source_size_m is not None and d_eval is not None:
        return 2.0 * math.atan(cond.source_size_m / (2.0 * d_eval))
    return None


@dataclass(frozen=True)
class _Source:
    """What the spectrum gives, independent of the evaluation distance."""

    quantity: str
    range_nm: tuple[float, float]
    cond: Conditions
    lset: LimitSet
    integrals: Mapping[str, Integral]
    lum: Integral
    d_meas: float | None
    weak_stimulus: tuple[bool, str]
    #: why the data cannot stand for the lamp's output at all (a mostly negative spectrum)
    unusable: str | None = None

    def geo(self, d_eval: float | None) -> _Geo:
        k = (1.0 if d_eval is None or self.d_meas is None
             else float(distance_factor(self.cond, self.d_meas, d_eval)))
        a = _alpha_at(self.cond, d_eval, self.d_meas)
        a_meas = a if d_eval is None or self.d_meas is None else _alpha_at(self.cond, self.d_meas,
                                                                           self.d_meas)
        return _Geo(self.quantity, k, a, a_meas)


# ---------------------------------------------------------------------------------------------
# One hazard
# ---------------------------------------------------------------------------------------------

_WEIGHTING_SYMBOL = {"S_actinic": "S(λ)", "B_blue": "B(λ)", "R_thermal": "R(λ)"}


def _pick_variant(src: _Source, hazard_id: str, alpha: float | None) -> HazardLimits:
    """The entry that applies at angular subtense ``alpha`` (no explanations; fast)."""
    entries = src.lset.variants(hazard_id)
    if len(entries) == 1:
        return entries[0]
    small = next(e for e in entries if e.small_source_below_rad is not None)
    large = next(e for e in entries if e.small_source_below_rad is None)
    if alpha is None:
        return large if src.quantity == "radiance" else small
    return small if alpha < small.small_source_below_rad else large  # type: ignore[operator]


def _choose_variant(src: _Source, hazard_id: str, geo: _Geo) -> tuple[HazardLimits, list[str]]:
    """The entry that applies (blue light: small source E_B or radiance L_B) and why."""
    entries = src.lset.variants(hazard_id)
    if len(entries) == 1:
        return entries[0], []
    small = next(e for e in entries if e.small_source_below_rad is not None)
    large = next(e for e in entries if e.small_source_below_rad is None)
    lim = small.small_source_below_rad
    if geo.alpha is None:
        if src.quantity == "radiance":
            return large, ["No source size given: the measured radiance is used for every field "
                           "of view (the source is taken to fill it), which can only overstate "
                           "L_B."]
        return small, [f"No source size given: blue light is evaluated as a small source "
                       f"(E_B, α < {lim:g} rad). This is an assumption; a larger source is "
                       f"assessed by its radiance L_B, which can give another group."]
    if geo.alpha < lim:
        return small, [f"Small source: α = {geo.alpha:.3g} rad < {lim:g} rad, so blue light is "
                       f"assessed as the irradiance E_B."]
    return large, [f"α = {geo.alpha:.3g} rad ≥ {lim:g} rad: blue light is assessed as the "
                   f"radiance L_B."]


def _interp_sentences(entry: HazardLimits) -> list[str]:
    out = []
    for wid in entry.weighting_ids:
        w = get_weighting(wid)
        rule = "log-linearly" if w.interpolation == "log-linear" else "linearly"
        out.append(f"{_WEIGHTING_SYMBOL.get(wid, wid)} ({w.provenance.get('edition', '')}) "
                   f"interpolated {rule} between its table points; IEC 62471 prescribes no rule.")
    return out


def _range_sentence(entry: HazardLimits, lset: LimitSet) -> str:
    lo, hi = entry.range_nm
    if entry.hazard_id == "actinic_uv":
        return (f"{entry.symbol} integrated over {lo:g}–{hi:g} nm ({lset.name}); IEC 62471:2006 "
                f"integrates 200–400 nm, ICNIRP 180–400 nm.")
    wsym = " · ".join(_WEIGHTING_SYMBOL.get(w, w) for w in entry.weighting_ids) or "unweighted"
    return f"{entry.symbol} integrated over {lo:g}–{hi:g} nm ({wsym})."


def _not_assessable(hazard_id: str, entry: HazardLimits, integ: Integral | None, reason: str,
                    assumptions: list[str], status: str = "not-assessable") -> HazardResult:
    has_groups = bool(entry.groups)
    return HazardResult(
        id=hazard_id, symbol=entry.symbol, name=entry.name, unit=entry.unit, value=None,
        value_estimate=None, limit=None, limit_basis="", t_max_s=None, t_max_note=None,
        risk_group=None, risk_group_is_lower_bound=False, risk_group_bound=None,
        risk_group_range=(GROUPS[0], GROUPS[-1]) if has_groups and status == "not-assessable"
        else None,
        coverage=0.0 if integ is None else integ.coverage, status=status, reason=reason,
        assumptions=tuple(assumptions), range_nm=entry.range_nm,
        covered_nm=() if integ is None else integ.covered_nm,
        weighting=",".join(entry.weighting_ids) or None, sigma=None, detection_limit=None,
        alpha_rad=None, group_limits=())


def _evaluate_hazard(src: _Source, hazard_id: str, geo: _Geo) -> HazardResult:
    entry, assumptions = _choose_variant(src, hazard_id, geo)
    integ = src.integrals[entry.key]
    # the same sentences for every lamp: made once per limit entry
    assumptions = list(remembered(entry, ("sentences", src.lset.id, src.lset.name), lambda: (
        _range_sentence(entry, src.lset), *_interp_sentences(entry)))) + assumptions
    if entry.note:
        assumptions.append(entry.note)
    lo, hi = entry.range_nm
    if src.quantity == "relative":
        return _not_assessable(hazard_id, entry, integ, "relative spectrum: no absolute values; "
                               "scale it to absolute (a radiometer or lux reading at a known "
                               "distance, or a radiant flux) first", assumptions)
    if src.unusable is not None:
        return _not_assessable(hazard_id, entry, integ, src.unusable, assumptions)
    if src.quantity == "flux":
        return _not_assessable(hazard_id, entry, integ, "radiant-flux spectrum: hazards need the "
                               "irradiance or radiance at the eye, which needs an emission model "
                               "and a distance; convert it first", assumptions)
    if hazard_id == "retinal_thermal_weak_stimulus" and not src.weak_stimulus[0]:
        return _not_assessable(hazard_id, entry, integ, src.weak_stimulus[1], assumptions,
                               status="not-applicable")
    if hazard_id == "retinal_thermal_weak_stimulus":
        assumptions.append(src.weak_stimulus[1])
    if not integ.covered_nm or integ.coverage <= 0.0:
        a, b = src.range_nm
        return _not_assessable(hazard_id, entry, integ, f"no measured data in {lo:g}–{hi:g} nm "
                               f"(the spectrum covers {a:g}–{b:g} nm); missing range is never "
                               f"read as zero", assumptions)

    partial = not integ.complete
    est = integ.value
    dl = integ.detection_limit
    below = (not partial) and dl is not None and est < dl
    status = "partial" if partial else ("below-detection" if below else "complete")
    x = dl if below else est            # the figure the group and t_max are computed from
    zero = (not partial) and dl is None and est <= 0.0

    # α for α-dependent limits
    alpha_lim: float | None = None
    if entry.depends_on_alpha:
        if geo.alpha is not None:
            alpha_lim = entry.alpha_eff(geo.alpha)
            lo_c, hi_c = entry.alpha_clamp_rad or (geo.alpha, geo.alpha)
            assumptions.append(f"α = {geo.alpha:.3g} rad, α_eff = {alpha_lim:.3g} rad (α clamped "
                               f"to {lo_c:g}–{hi_c:g} rad in the limit).")
        elif src.quantity == "radiance" and entry.alpha_clamp_rad is not None:
            alpha_lim = entry.alpha_clamp_rad[1]
            assumptions.append(f"No source size given: the limit uses α_eff = {alpha_lim:g} rad, "
                               f"the upper clamp, which gives the lowest limit.")

    def factor(fov: float | None) -> float | None:
        return geo.factor(entry.quantity, fov)

    if factor(None) is None or (entry.depends_on_alpha and alpha_lim is None):
        if zero:
            assumptions.append(f"No emission in {lo:g}–{hi:g} nm: within every limit whatever "
                               f"the source size.")
            return _zero_result(hazard_id, entry, integ, assumptions)
        need = ("the apparent source size or its angular subtense α (to turn the measured "
                "irradiance into radiance), or a radiance measurement"
                if entry.quantity == "radiance" else
                "the angular subtense α of the source (to turn the measured radiance into "
                "irradiance)")
        return _not_assessable(hazard_id, entry, integ, f"{entry.symbol} needs {need}",
                               assumptions)

    if entry.quantity == "radiance":
        if src.quantity == "irradiance":
            assumptions.append("Radiance from irradiance: L = E/Ω with Ω the solid angle of the "
                               "source, uniform source radiance assumed; a source smaller than "
                               "the averaging field is averaged over the field.")
        else:
            assumptions.append("Measured radiance taken as the uniform radiance of the source.")
    elif src.quantity == "radiance":
        assumptions.append("Irradiance from the measured radiance: E = L·Ω(α), uniform source.")

    if partial:
        miss = 1.0 - integ.coverage
        assumptions.append(f"Only {integ.coverage:.1%} of the weighted {lo:g}–{hi:g} nm range is "
                           f"measured ({miss:.1%} missing): the value is a lower bound and the "
                           f"group is 'at least'; partial data are never Exempt.")
    if below:
        assumptions.append("Below the detection limit (3 σ of the noise floor): the value shown "
                           "is the detection limit and the true value is under it.")

    # risk groups
    gl_rows = entry.group_limits(alpha_lim) if entry.groups else []
    groups: list[GroupLimit] = []
    idx = len(GROUPS) - 1
    for i, (g, lim, tb, fov) in enumerate(gl_rows):
        f = factor(fov)
        v = None if f is None else x * f
        groups.append(GroupLimit(g, lim, tb, fov, v))
    for i, gr in enumerate(groups):
        if gr.value is not None and max(gr.value, 0.0) <= gr.limit:  # type: ignore[operator]
            idx = i
            break
    if entry.quantity == "radiance" and groups:
        fovs = ", ".join(f"{gr.group} {gr.fov_rad:g} rad at {gr.time_base_s:g} s" for gr in groups)
        assumptions.append(f"Averaging fields of view: {fovs}.")

    if groups:
        if partial:
            rng = (GROUPS[idx], GROUPS[-1])
            rg, bound, is_lb = GROUPS[idx], "at-least", True
        elif below:
            rng = (GROUPS[0], GROUPS[idx])
            rg, bound, is_lb = GROUPS[idx], ("exact" if idx == 0 else "at-most"), False
        else:
            rng = (GROUPS[idx], GROUPS[idx])
            rg, bound, is_lb = GROUPS[idx], "exact", False
        limit = groups[0].limit
        fov_txt = "" if groups[0].fov_rad is None else f", field of view {groups[0].fov_rad:g} rad"
        basis = (f"Exempt emission limit at a time base of {groups[0].time_base_s:g} s"
                 f"{fov_txt}; {src.lset.provenance.get('risk_groups_from', '')}")
        f0 = factor(groups[0].fov_rad)
    else:
        rng, rg, bound, is_lb = None, None, None, False
        t_rep = entry.report_limit_at_s or entry.pieces[-1].to_s
        limit = entry.limit_at(t_rep, alpha_lim)
        basis = (f"exposure limit for {t_rep:g} s ({src.lset.name}); Table 6.1 sets no risk "
                 f"groups for this hazard")
        f0 = factor(None)
    value = None if f0 is None else (x if below else est) * f0
    estimate = None if f0 is None else est * f0

    t_max, t_note = entry.t_max(lambda fov: x * (factor(fov) or 0.0), alpha_lim)
    if t_max is not None and partial:
        t_note = "; ".join(filter(None, [t_note, "an upper bound (the value is a lower bound)"]))
    if t_max is not None and below:
        t_note = "; ".join(filter(None, [t_note, "a lower bound (from the detection limit)"]))
    if t_max is None and partial:
        t_note = "; ".join(filter(None, [t_note, "on the measured part only"]))

    also = None
    if entry.also is not None:
        ai = src.integrals[entry.also.key]
        af = geo.factor(entry.also.quantity, None)
        av = None if af is None else ai.value * af
        at, anote = (None, None) if av is None else entry.also.t_max(lambda fov: av)
        also = MappingProxyType({"name": entry.also.name, "symbol": entry.also.symbol,
                                 "value": _num(av), "unit": entry.also.unit,
                                 "t_max_s": _num(at), "t_max_note": anote,
                                 "coverage": ai.coverage, "source": entry.also.source})
    sig = None if integ.sigma is None or f0 is None else integ.sigma * f0
    return HazardResult(
        id=hazard_id, symbol=entry.symbol, name=entry.name, unit=entry.unit, value=value,
        value_estimate=estimate if below else None, limit=limit, limit_basis=basis,
        t_max_s=t_max, t_max_note=t_note, risk_group=rg, risk_group_is_lower_bound=is_lb,
        risk_group_bound=bound, risk_group_range=rng, coverage=integ.coverage, status=status,
        reason=None, assumptions=tuple(assumptions), range_nm=entry.range_nm,
        covered_nm=integ.covered_nm, weighting=",".join(entry.weighting_ids) or None,
        sigma=sig, detection_limit=None if dl is None or f0 is None else dl * f0,
        alpha_rad=alpha_lim, group_limits=tuple(groups), also=also)


def _zero_result(hazard_id: str, entry: HazardLimits, integ: Integral,
                 assumptions: list[str]) -> HazardResult:
    has = bool(entry.groups)
    return HazardResult(
        id=hazard_id, symbol=entry.symbol, name=entry.name, unit=entry.unit, value=0.0,
        value_estimate=None, limit=None, limit_basis="depends on α, which is not known",
        t_max_s=None, t_max_note="no measurable emission in the hazard's range",
        risk_group=GROUPS[0] if has else None, risk_group_is_lower_bound=False,
        risk_group_bound="exact" if has else None,
        risk_group_range=(GROUPS[0], GROUPS[0]) if has else None, coverage=integ.coverage,
        status="complete", reason=None, assumptions=tuple(assumptions), range_nm=entry.range_nm,
        covered_nm=integ.covered_nm, weighting=",".join(entry.weighting_ids) or None,
        sigma=None, detection_limit=None, alpha_rad=None, group_limits=())


# ---------------------------------------------------------------------------------------------
# Overall group
# ---------------------------------------------------------------------------------------------

def _overall(hazards: tuple[HazardResult, ...]) -> OverallRiskGroup:
    ranged = [h for h in hazards if h.risk_group_range is not None]
    assessed = [h for h in ranged if h.risk_group is not None]
    if not assessed:
        return OverallRiskGroup(None, False, None, None, tuple(h.id for h in ranged),
                                "no hazard could be assessed")
    lo = max(GROUPS.index(h.risk_group_range[0]) for h in ranged)  # type: ignore[index]
    hi = max(GROUPS.index(h.risk_group_range[1]) for h in ranged)  # type: ignore[index]
    cands = [h for h in assessed if GROUPS.index(h.risk_group_range[0]) == lo]  # type: ignore[index]
    gov = max(cands, key=lambda h: (h.status == "complete", h.ratio_to_limit or 0.0))
    open_ = tuple(h.id for h in ranged if GROUPS.index(h.risk_group_range[1]) > lo)  # type: ignore[index]
    # in words by symbol (E_S, L_R): the ids are for the JSON keys
    if lo == hi:
        note = f"{GROUPS[lo]}, set by {gov.symbol}"
    else:
        parts = [f"{h.symbol} {h.status}" for h in ranged if h.id in open_]
        note = f"at least {GROUPS[lo]} (set by {gov.symbol}); could be higher: {', '.join(parts)}"
    return OverallRiskGroup(GROUPS[lo], lo != hi, gov.id, GROUPS[hi], open_, note)


# ---------------------------------------------------------------------------------------------
# Distances
# ---------------------------------------------------------------------------------------------

def _luminous_at_measurement(src: _Source, illuminance_lx: float | None,
                             ) -> tuple[float | None, str | None]:
    """Illuminance at the measurement position [lx] and where it came from."""
    lum = src.lum
    if src.quantity in ("irradiance", "radiance") and lum.coverage >= _V_COMPLETE:
        if src.quantity == "irradiance":
            return K_M_LM_PER_W * lum.value, "from the spectrum"
        a = _alpha_at(src.cond, src.d_meas, src.d_meas)
        if a is not None:
            return K_M_LM_PER_W * lum.value * solid_angle_sr(a), "from the radiance and α"
    if illuminance_lx is not None:
        return illuminance_lx, "the illuminance reading given"
    return None, None


def _assessment_distance(src: _Source, e_v_meas: float | None, e_v_from: str | None,
                         ) -> tuple[float | None, str, list[str]]:
    cond = src.cond
    notes: list[str] = []
    if src.d_meas is None:
        notes.append("No measurement distance given: every value applies at the measurement "
                     "position, not at the IEC 62471 assessment distance, and no hazard "
                     "distances can be given.")
        return None, "at the measurement position (no measurement distance given)", notes
    if not cond.general_lighting:
        return (MIN_ASSESSMENT_DISTANCE_M, "200 mm (lamps not for general lighting service, "
                "IEC 62471:2006)", notes)
    if e_v_meas is None or e_v_meas <= 0:
        notes.append("The 500 lx distance could not be found (no complete V(λ) coverage and no "
                     "illuminance reading): 200 mm is used, the closest the rule allows and so "
                     "the more cautious choice.")
        return MIN_ASSESSMENT_DISTANCE_M, "200 mm (500 lx distance unknown)", notes
    d500 = distance_for_factor(cond, src.d_meas, e_v_meas / GLS_ILLUMINANCE_LX)
    notes.append(f"Illuminance at the measurement position {e_v_meas:.4g} lx ({e_v_from}).")
    if d500 < MIN_ASSESSMENT_DISTANCE_M:
        return (MIN_ASSESSMENT_DISTANCE_M, f"200 mm (general lighting service: 500 lx is reached "
                f"at {d500:.3g} m, closer than 200 mm; IEC 62471:2006)", notes)
    return d500, (f"500 lx distance {d500:.3g} m (general lighting service, IEC 62471:2006)"), notes


def _evaluation_info(src: _Source, d: float | None, rule: str, e_v_meas: float | None,
                     extra: list[str]) -> EvaluationInfo:
    geo = src.geo(d)
    cond = src.cond
    notes = list(extra)
    rescaled = d is not None and src.d_meas is not None and d != src.d_meas
    if rescaled and cond.emitter != "point":
        square = (src.d_meas / d) ** 2  # type: ignore[operator]
        if math.isclose(geo.k, square, rel_tol=1e-12):
            how = "which is the inverse-square law here (no source size given)"
        else:
            how = f"factor {geo.k:.4g}; the inverse-square law would give {square:.4g}"
        notes.append(f"Rescaled from the measurement distance {src.d_meas:g} m to {d:.3g} m by "
                     f"the {cond.emitter} emitter model given ({how}). "
                     + _MODEL_NOTES[cond.emitter])
    elif rescaled:
        notes.append(f"Rescaled from the measurement distance {src.d_meas:g} m to {d:.3g} m by "
                     f"the inverse-square law as a point source: an approximation, invalid close "
                     f"to an extended source.")
        if src.quantity == "radiance":
            notes.append("The measured radiance is taken as unchanged with distance.")
        size = cond.source_size_m
        if size is None and cond.alpha_rad is not None and src.d_meas is not None:
            size = 2.0 * src.d_meas * math.tan(cond.alpha_rad / 2.0)
        if (size is not None and cond.emitter == "point"
                and min(d, src.d_meas) < POINT_SOURCE_DIAMETERS * size):  # type: ignore[type-var]
            notes.append(f"Distance under {POINT_SOURCE_DIAMETERS:g} source sizes "
                         f"({POINT_SOURCE_DIAMETERS * size:.3g} m, common practice limit): the "
                         f"point-source rescaling is unreliable here.")
    if cond.alpha_rad is not None and src.d_meas is not None:
        notes.append("The α given is taken as seen from the measurement position.")
    if cond.source_size_m is not None and cond.alpha_rad is None and src.d_meas is None:
        notes.append("A source size was given without a measurement distance: α is unknown.")
    ev = None
    if e_v_meas is not None and src.quantity == "irradiance":
        ev = e_v_meas * geo.k
    elif e_v_meas is not None and src.quantity == "radiance" and geo.alpha is not None:
        a_m = _alpha_at(cond, src.d_meas, src.d_meas)
        ev = e_v_meas * (solid_angle_sr(geo.alpha) / solid_angle_sr(a_m) if a_m else 1.0)
    return EvaluationInfo(distance_m=d, distance_rule=rule, alpha_rad=geo.alpha,
                          limit_set=src.lset.id, measurement_distance_m=src.d_meas,
                          distance_factor=geo.k, rescaled=rescaled,
                          input_quantity=src.quantity, source_size_m=cond.source_size_m,
                          illuminance_lx=ev, assumptions=tuple(notes),
                          distance_model=cond.emitter)


def _crossing(ratio: Callable[[float], float | None]) -> tuple[float | None, str | None]:
    """Smallest distance beyond which ratio ≤ 1 (ratio non-increasing in d). [m]"""
    r_lo, r_hi = ratio(_D_MIN_M), ratio(_D_MAX_M)
    if r_lo is None or r_hi is None:
        return None, "cannot be computed"
    if r_lo <= 1.0:
        return None, f"within the limit at every distance from {_D_MIN_M * 1e3:g} mm"
    if r_hi > 1.0:
        return None, (f"not within the limit at any distance up to {_D_MAX_M:g} m (a radiance "
                      f"that fills the field does not fall with distance)")
    a, b = _D_MIN_M, _D_MAX_M
    for _ in range(200):
        m = math.sqrt(a * b)
        r = ratio(m)
        if r is not None and r > 1.0:
            a = m
        else:
            b = m
        if b / a < 1.0 + 1e-10:
            break
    return b, None


def _crossing_model(r_meas: float | None, d_meas: float, cond: Conditions,
                    ) -> tuple[float | None, str | None]:
    """As :func:`_crossing` for ratio(d) = r_meas·k(d), k the emitter model's factor from
    d_meas (:func:`distance_factor`); for a point source d = d_meas·√r_meas. [m]"""
    if r_meas is None:
        return None, "cannot be computed"
    d = distance_for_factor(cond, d_meas, max(r_meas, 0.0))
    if d <= _D_MIN_M:
        return None, f"within the limit at every distance from {_D_MIN_M * 1e3:g} mm"
    if d > _D_MAX_M:
        return None, f"not within the limit at any distance up to {_D_MAX_M:g} m"
    return d, None


def _distance_for(src: _Source, hazard_id: str, exposure_s: float) -> HazardDistance:
    entry0, _ = _choose_variant(src, hazard_id, src.geo(src.d_meas))
    # all variants of a hazard share one spectral integral (checked when the set is loaded)
    integ = src.integrals[entry0.key]
    empty = {g: None for g in GROUPS[:3]}
    na = {g: None for g in GROUPS[:3]}

    def none(note: str) -> HazardDistance:
        return HazardDistance(hazard_id, entry0.symbol, exposure_s, None, note,
                              MappingProxyType(empty), MappingProxyType(na), None)

    if src.quantity not in ("irradiance", "radiance"):
        return none(f"not assessable: {src.quantity} spectrum")
    if src.d_meas is None:
        return none("no measurement distance given")
    if not integ.covered_nm or integ.coverage <= 0.0:
        return none("not assessable: no measured data in the hazard's range")
    partial = not integ.complete
    dl = integ.detection_limit
    if partial and dl is not None and integ.value < dl:
        # the measured part is noise (its value lies anywhere from 0 to the detection limit)
        # and the rest is unknown: neither a lower nor an upper bound on the distances
        return none("not determinable: the measured part of the hazard's range is below the "
                    "detection limit and the rest is not measured, so the distances are "
                    "bounded in neither direction; measure the whole range")
    below = (not partial) and dl is not None and integ.value < dl
    x = dl if below else integ.value
    bound = "at-least" if partial else ("at-most" if below else "exact")
    if x <= 0.0:
        return HazardDistance(hazard_id, entry0.symbol, exposure_s, None,
                              "no measurable emission in the hazard's range",
                              MappingProxyType(empty), MappingProxyType(na), bound)

    def entry_geo(d: float) -> tuple[HazardLimits, _Geo, float | None]:
        geo = src.geo(d)
        entry = _pick_variant(src, hazard_id, geo.alpha)
        a = None
        if entry.depends_on_alpha:
            if geo.alpha is not None:
                a = entry.alpha_eff(geo.alpha)
            elif entry.alpha_clamp_rad is not None:
                a = entry.alpha_clamp_rad[1]
        return entry, geo, a

    def ratio_time(d: float) -> float | None:
        entry, geo, a = entry_geo(d)
        lim = entry.limit_at(exposure_s, a)
        f = geo.factor(entry.quantity, entry.fov_at(exposure_s))
        if lim is None or f is None:
            return None
        return x * f / lim

    def ratio_group(i: int) -> Callable[[float], float | None]:
        def r(d: float) -> float | None:
            entry, geo, a = entry_geo(d)
            g, lim, tb, fov = entry.group_limits(a)[i]
            f = geo.factor(entry.quantity, fov)
            return None if f is None else x * f / lim
        return r

    # Irradiance hazard from an irradiance spectrum, variant fixed: ratio(d) = ratio(d_meas)·k(d),
    # k the emitter model's factor (1/d² for a point source: closed form).
    fixed = (src.quantity == "irradiance" and entry0.quantity == "irradiance"
             and (len(src.lset.variants(hazard_id)) == 1 or src.geo(src.d_meas).alpha is None))
    crossing = (lambda r: _crossing_model(r(src.d_meas), src.d_meas, src.cond)) if fixed \
        else _crossing
    dist, note = crossing(ratio_time)
    if dist is None and note == "cannot be computed":
        entry, geo, a = entry_geo(src.d_meas)
        if entry.limit_at(exposure_s, a) is None:
            note = f"the limit does not cover an exposure of {exposure_s:g} s"
        else:
            note = "needs the source size (radiance hazard)"
    bounds, bnotes = {}, {}
    for i, g in enumerate(GROUPS[:3]):
        bounds[g], bnotes[g] = crossing(ratio_group(i))
    meaning, regimes = _irradiance_meaning(src.cond), None
    if len(src.lset.variants(hazard_id)) > 1:
        meaning, regimes, bnotes = _blue_regimes(src, hazard_id, x, bounds, bnotes)
    elif entry0.quantity == "radiance":
        meaning = _RADIANCE_MEANING
    return HazardDistance(hazard_id, entry0.symbol, exposure_s, dist, note,
                          MappingProxyType(bounds), MappingProxyType(bnotes), bound, meaning,
                          None if regimes is None else MappingProxyType(regimes))


_IRRADIANCE_MEANING = ("an irradiance falls as 1/d² from the measurement distance (point-source "
                       "approximation): a boundary distance is where it meets that group's limit")


def _irradiance_meaning(cond: Conditions) -> str:
    if cond.emitter == "point":
        return _IRRADIANCE_MEANING
    return (f"an irradiance falls with distance as the {cond.emitter} emitter model given says "
            f"(from the measurement distance): a boundary distance is where it meets that "
            f"group's limit")
_RADIANCE_MEANING = ("a radiance does not fall with distance while the source fills the "
                     "averaging field of view")


def _source_size_m(src: _Source) -> float | None:
    """Apparent source size from the conditions (size, or α at the measurement distance). [m]"""
    c = src.cond
    if c.source_size_m is not None:
        return c.source_size_m
    if c.alpha_rad is not None and src.d_meas is not None:
        return 2.0 * src.d_meas * math.tan(c.alpha_rad / 2.0)
    return None


def _blue_regimes(src: _Source, hazard_id: str, x: float, bounds: Mapping[str, float | None],
                  bnotes: Mapping[str, str | None]
                  ) -> tuple[str, dict[str, Any] | None, dict[str, str | None]]:
    """What the blue-light boundary distances mean, and the distances where the regime changes.

    L_B is a radiance: while the source's angular size α = 2·atan(s/2d) exceeds a group's
    averaging field γ, the field sees only source, and the field-averaged radiance is the
    source's own radiance L, whatever the distance. Beyond d = s/(2·tan(γ/2)) the source
    underfills the field and the average falls as L·Ω(α)/Ω(γ) ∝ 1/d² [derived: Ω(α) ∝ α² for
    small α]. Beyond α < 0.011 rad (IEC 62471:2006, small source) blue light is the irradiance
    E_B = L·Ω(α), again ∝ 1/d². So an L_B boundary distance exists only in the underfilled
    regime; when the source's own radiance is within a group's limit, that group holds at every
    distance, and when it is not, it holds only from the distance where the source has become
    small enough.
    """
    entries = src.lset.variants(hazard_id)
    small = next(e for e in entries if e.small_source_below_rad is not None)
    large = next(e for e in entries if e.small_source_below_rad is None)
    lim_small = small.small_source_below_rad
    size = _source_size_m(src)
    notes = dict(bnotes)
    if size is None:
        if src.quantity == "irradiance":
            return (f"no source size given: blue light is evaluated as a small source (E_B, an "
                    f"irradiance) at every distance, {_irradiance_meaning(src.cond)}; a source wider than "
                    f"{lim_small:g} rad seen from the eye is assessed by its radiance L_B, which "
                    "does not fall with distance while the source fills the field"), None, notes
        return ("measured radiance with no source size: L_B is taken as filling every field at "
                "every distance, so it does not change with distance and no boundary distance "
                "exists"), None, notes

    def d_for(angle_rad: float) -> float:
        return size / (2.0 * math.tan(angle_rad / 2.0))
    fields = {g: fov for g, _, _, fov in large.group_limits(None)}
    limits = {g: lim for g, lim, _, _ in large.group_limits(None)}
    geo0 = src.geo(src.d_meas)
    f_own = geo0.factor("radiance", 0.0)          # no averaging: the source's own radiance
    l_src = None if f_own is None else x * f_own
    d_small = d_for(lim_small)
    # a field narrower than the small-source angle stays filled until E_B takes over
    fills = {g: (min(d_for(fov), d_small) if fov else None) for g, fov in fields.items()}
    regimes = {"source_size_m": size, "fills_field_within_m": fills,
               "small_source_beyond_m": d_small, "source_radiance": l_src,
               "fields_of_view_rad": dict(fields)}
    for g in GROUPS[:3]:
        if bounds.get(g) is not None or l_src is None or g not in limits:
            continue
        note = notes.get(g) or ""
        if note.startswith("within"):
            notes[g] = (f"{g} or lower at every distance: even where the source fills the "
                        f"{fields[g]:.3g} rad field (closer than {_sig(fills[g])} m), its radiance "
                        f"{_sig(l_src)} W m-2 sr-1 is within the {g} limit {_sig(limits[g])} W m-2 sr-1")
    meaning = (f"L_B is a radiance and does not fall with distance while the source (size "
               f"{_sig(size)} m) fills a group's averaging field: closer than "
               + ", ".join(f"{_sig(fills[g])} m for {g} ({fields[g]:.3g} rad)" for g in GROUPS[:3]
                           if fills.get(g))
               + f". Farther away the field-averaged radiance falls as 1/d², and beyond "
               f"{_sig(d_small)} m (α < {lim_small:g} rad) blue light is the small-source "
               f"irradiance E_B, also 1/d². A boundary distance is where the field-averaged L_B "
               f"(or E_B) meets that group's limit; it exists only where the source underfills "
               f"the field")
    return meaning, regimes, notes


def _hazard_distances(src: _Source) -> HazardDistances:
    t = src.cond.exposure_time_s
    entries = tuple(_distance_for(src, h, t) for h in ("actinic_uv", "near_uv", "blue_light"))
    uv = [e for e in entries if e.hazard_id in ("actinic_uv", "near_uv")]
    gov = max(uv, key=lambda e: (e.distance_m or 0.0,
                                 max((v or 0.0) for v in e.boundaries_m.values())))
    governing = gov.hazard_id if (gov.distance_m or any(gov.boundaries_m.values())) else None
    return HazardDistances(exposure_time_s=t, entries=entries, governing_uv=governing,
                           note=(f"Distance beyond which t_max ≥ {t:g} s, and beyond which each "
                                 f"group boundary holds. " + distance_note(src.cond) +
                                 " 'at-least' distances come from partial data (true distances "
                                 "can be larger)."))


# ---------------------------------------------------------------------------------------------
# Scope flags and TR 62778
# ---------------------------------------------------------------------------------------------

def _uv_lamp_product(spectrum: Spectrum) -> UvLampProduct:
    a, b, c = _UV_PRODUCT_NM
    uv = integrate(spectrum, a, b)
    rest = integrate(spectrum, b, c)
    u, r = max(uv.value, 0.0), max(rest.value, 0.0)
    part6 = ("IEC 62471-6:2022 then applies, with application-specific distances and "
             "time-weighted exposure; uvcheck implements the base standard IEC 62471:2006, "
             "so treat these results as indicative for such a product.")
    if u + r <= 0.0:
        return UvLampProduct(None, uv.coverage, rest.coverage, None, False,
                             "no measurable output in 180–3000 nm")
    frac = u / (u + r)
    is_uv = frac > 0.5
    # missing UV range can only raise the UV share, missing 400–3000 nm only lower it
    determined = (uv.complete and rest.complete) or (is_uv and rest.complete) or \
        (not is_uv and uv.complete)
    if is_uv:
        note = (f"UV lamp product (IEC 62471-6:2022): {frac:.0%} of the measured 180–3000 nm "
                f"output lies in 180–400 nm. " + part6)
    else:
        note = (f"Not a UV lamp product in the sense of IEC 62471-6:2022: {frac:.0%} of the "
                f"measured 180–3000 nm output lies in 180–400 nm.")
    if not determined:
        note += (" The unmeasured range could change this finding (180–3000 nm is "
                 f"{uv.coverage:.0%} / {rest.coverage:.0%} covered below / above 400 nm).")
    return UvLampProduct(frac, uv.coverage, rest.coverage, is_uv, bool(determined), note)


def _blue_white(spectrum: Spectrum, src: _Source, info: EvaluationInfo) -> BlueLightWhiteSource:
    b = src.integrals["blue_light"]
    lum = src.lum
    small = next(e for e in src.lset.variants("blue_light") if e.small_source_below_rad)
    e_rg1 = small.group_limits()[1][1]
    what = "IEC TR 62778; meaningful for white (broadband visible) sources"
    lo, hi = spectrum.range_nm
    total = integrate(spectrum, lo, math.nextafter(hi, math.inf)).value
    vis = integrate(spectrum, 380.0, 780.0).value
    vf = None if total <= 0.0 else max(vis, 0.0) / total

    def na(why: str) -> BlueLightWhiteSource:
        return BlueLightWhiteSource(None, None, None, None, vf, "not-assessable", why)

    if not b.complete or lum.coverage < _V_COMPLETE:
        return na(f"needs complete coverage of 300–700 nm and 360–830 nm ({what})")
    lum_dl = lum.detection_limit
    if lum.value <= 0.0 or (lum_dl is not None and lum.value < lum_dl):
        return na(f"no measurable visible output ({what})")
    k_bv = b.value / (K_M_LM_PER_W * lum.value)
    if k_bv <= 0.0:
        return na(f"no measurable B(λ)-weighted output ({what})")
    e_thr = e_rg1 / k_bv
    ev = info.illuminance_lx
    exceeds = None if ev is None else ev > e_thr
    note = (f"K_B,v = E_B/E_v; E_thr = {e_rg1:g} W m⁻² / K_B,v, the illuminance at which E_B "
            f"reaches the small-source RG1 limit (formula from memory). A ratio of two integrals, "
            f"so it holds for relative spectra too ({what}).")
    share = visible_share(spectrum)   # infrared left out: a filament lamp is a white source
    if share is not None and share < 0.5:
        note += (f" Only {share:.0%} of the measured ultraviolet and visible output lies in "
                 f"380–780 nm: not a white source, shown for information only.")
    return BlueLightWhiteSource(k_bv, e_thr, ev, exceeds, vf, "complete", note)


def _weak_stimulus(spectrum: Spectrum, cond: Conditions, lset: LimitSet, lum: Integral,
                   d_meas: float | None) -> tuple[bool, str]:
    """Whether the weak-visual-stimulus hazard applies, from the source luminance."""
    entry = lset.variants("retinal_thermal_weak_stimulus")[0]
    thr = entry.weak_stimulus_below_cd_m2
    if thr is None:
        return True, "Evaluated for any source (no weak-stimulus criterion in this limit set)."
    lv = None
    if spectrum.quantity == "radiance":
        lv = K_M_LM_PER_W * lum.value
    elif spectrum.quantity == "irradiance":
        a = _alpha_at(cond, d_meas, d_meas)
        if a is not None:
            lv = K_M_LM_PER_W * lum.value / solid_angle_sr(a)
    if lv is None:
        return True, (f"Source luminance unknown: a weak visual stimulus (under {thr:g} cd m⁻², "
                      f"from memory) cannot be ruled out, so L_IR is evaluated.")
    if lv >= thr:  # a lower bound when V(λ) is partly covered: still ≥ the threshold
        return False, (f"Not applicable: the source luminance {lv:.3g} cd m⁻² is at or above "
                       f"{thr:g} cd m⁻² (weak-stimulus criterion, from memory), so the visual "
                       f"stimulus is not weak; the retinal thermal hazard L_R covers it.")
    if lum.coverage < _V_COMPLETE:
        return True, (f"Source luminance at least {lv:.3g} cd m⁻² on the measured part of V(λ); "
                      f"a weak visual stimulus (under {thr:g} cd m⁻²) cannot be ruled out.")
    return True, (f"Weak visual stimulus: source luminance {lv:.3g} cd m⁻² under {thr:g} cd m⁻² "
                  f"(criterion from memory).")


# ---------------------------------------------------------------------------------------------
# Entry point
# ---------------------------------------------------------------------------------------------

def _integrals(spectrum: Spectrum, lset: LimitSet) -> dict[str, Integral]:
    out: dict[str, Integral] = {}
    cache: dict[tuple, Integral] = {}
    entries = list(lset.entries.values())
    entries += [e.also for e in entries if e.also is not None]  # type: ignore[misc]
    for e in entries:
        sig = tuple((c.lo_nm, c.hi_nm, c.weighting, c.scale) for c in e.components)
        if sig not in cache:
            lo, hi = e.range_nm
            cache[sig] = integrate(spectrum, lo, hi, e.weight())
        out[e.key] = cache[sig]
    out["blue_light"] = out[next(e.key for e in lset.variants("blue_light"))]
    return out


def _at_distance(src: _Source, d: float | None, rule: str, e_v_meas: float | None,
                 extra: list[str]) -> DistanceEvaluation:
    info = _evaluation_info(src, d, rule, e_v_meas, extra)
    geo = src.geo(d)
    hazards = tuple(_evaluate_hazard(src, h, geo) for h in HAZARD_IDS)
    return DistanceEvaluation(info, hazards, _overall(hazards))


def _mostly_negative(spectrum: Spectrum) -> str | None:
    """The reason a spectrum cannot stand for any lamp's output, or None: it sits below zero
    as a whole (:func:`uvcheck.features.negative_dominated`: a sign-flipped or swapped dark
    subtraction, or the wrong column). Every hazard is then not assessable: a "below
    detection" reading of such data would read as Exempt while the lamp's real output is
    unknown."""
    from uvcheck.features import NEGATIVE_DIP_RATIO, negative_dominated

    found = negative_dominated(spectrum.values)
    if found is None:
        return None
    n_neg, n = found
    return (f"the spectrum sits below zero ({n_neg} of {n} samples negative, its deepest dip "
            f"more than {NEGATIVE_DIP_RATIO:g} times its highest point): a sign-flipped or swapped dark "
            "subtraction, or the wrong column? No hazard is computed from it; check the "
            "export, --column and the unit")


def evaluate_hazards(spectrum: Spectrum, conditions: Conditions | None = None,
                     limit_set: str = DEFAULT_LIMIT_SET,
                     illuminance_lx: float | None = None) -> HazardEvaluation:
    """IEC 62471 hazard values, t_max, risk groups and hazard distances of a lamp spectrum.

    spectrum : absolute spectral irradiance [W m⁻² nm⁻¹] or radiance [W m⁻² sr⁻¹ nm⁻¹] at the
        measurement position. A relative or flux spectrum gives every hazard
        ``not-assessable`` with the reason (K_B,v and the UV-share flag, being ratios, are
        still given).
    conditions : measurement distance (None: evaluate at the measurement position and say
        so), source size or α, general lighting service (500 lx rule), distance of use,
        exposure time for hazard distances (default 8 h). [m], [rad], [s]
    limit_set : id of the limit set (``iec62471_2006`` default, ``icnirp_2013``,
        ``acgih_2022_far_uvc``); unknown ids raise ConfigurationError listing the ids.
    illuminance_lx : an illuminance reading at the measurement position, used for the 500 lx
        rule where the spectrum does not cover V(λ). [lx]

    Returns a :class:`HazardEvaluation`; ``to_dict()`` gives the JSON keys ``hazards``,
    ``risk_group``, ``evaluation``, ``hazard_distances``, ``uv_lamp_product``,
    ``blue_light_white_source``, ``use_distance``, ``limit_sets``, ``limit_set``, ``notes``.

    Examples
    --------
    A blue LED measured from 340 nm has unknown UV below 340 nm: actinic UV is only partly
    assessed ("at least Exempt", never Exempt).

    >>> import numpy as np
    >>> from uvcheck.spectrum import Spectrum
    >>> wl = np.arange(340.0, 801.0)
    >>> led = Spectrum(wl, 1e-3 * np.exp(-0.5 * ((wl - 450) / 10) ** 2), "irradiance")
    >>> ev = evaluate_hazards(led, Conditions(measurement_distance_m=0.2))
    >>> h = ev.hazard("actinic_uv")
    >>> h.status, h.risk_group, h.risk_group_is_lower_bound
    ('partial', 'Exempt', True)
    >>> ev.hazard("blue_light").symbol, ev.hazard("retinal_thermal").status
    ('E_B', 'not-assessable')
    """
    cond = conditions if conditions is not None else Conditions()
    lset = get_limit_set(limit_set)
    if illuminance_lx is not None and not (math.isfinite(illuminance_lx) and illuminance_lx > 0):
        raise ConfigurationError(f"illuminance must be positive, got {illuminance_lx}")
    d_meas = cond.measurement_distance_m
    integrals = _integrals(spectrum, lset)
    lum = integrate(spectrum, 360.0, 830.0, v_lambda())
    src = _Source(quantity=spectrum.quantity, range_nm=spectrum.range_nm, cond=cond, lset=lset,
                  integrals=MappingProxyType(integrals), lum=lum, d_meas=d_meas,
                  weak_stimulus=_weak_stimulus(spectrum, cond, lset, lum, d_meas),
                  unusable=_mostly_negative(spectrum))
    absolute = spectrum.quantity in ("irradiance", "radiance")
    e_v_meas, e_v_from = _luminous_at_measurement(src, illuminance_lx) if absolute else (None, None)
    if absolute:
        d, rule, extra = _assessment_distance(src, e_v_meas, e_v_from)
    else:
        d, rule, extra = None, f"not applied ({spectrum.quantity} spectrum)", []
    main = _at_distance(src, d, rule, e_v_meas, extra)

    use = None
    notes = [SCREENING_NOTE,
             f"Limit set: {lset.name} ({lset.id}); risk groups: "
             f"{lset.provenance.get('risk_groups_from', '')}.", *lset.notes]
    if cond.use_distance_m is not None:
        if absolute and d_meas is not None:
            use = _at_distance(src, cond.use_distance_m, "distance of use (given)", e_v_meas, [])
        else:
            notes.append("A distance of use was given, but without a measurement distance (or "
                         "an absolute spectrum) nothing can be rescaled to it.")
    if main.evaluation.rescaled or use is not None:
        notes.append(distance_note(cond))
    return HazardEvaluation(
        hazards=main.hazards, risk_group=main.risk_group, evaluation=main.evaluation,
        use_distance=use, limit_set=MappingProxyType(lset.describe()),
        available_limit_sets=tuple(available_limit_sets()), base_notes=tuple(notes),
        spectrum=spectrum, source=src)
