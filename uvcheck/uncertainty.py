"""Measurement uncertainty of hazard values, times, doses and risk groups; decision rules.

``evaluate_uncertainty(spectrum, conditions, hazards_result, germicidal_result, inputs)``
propagates the uncertainty of the inputs of a lamp measurement through the very evaluation
that :mod:`uvcheck.hazards` and :mod:`uvcheck.germicidal` perform, by a Monte Carlo method
(propagation of distributions, JCGM 101:2008 "GUM Supplement 1"), and cross-checks it with
first-order propagation (the GUM law of propagation of uncertainty, JCGM 100:2008 5.1, with
numerically evaluated sensitivity coefficients, 5.1.3). Pure: no I/O, no printing.

Inputs (defaults in ``data/uncertainty_defaults.toml``, every one labelled "common practice")
---------------------------------------------------------------------------------------------
calibration
    one multiplicative factor per band (UV < 400 nm, visible 400–780 nm, IR ≥ 780 nm) and
    draw, normal with the band's relative standard uncertainty. *Correlation model:* fully
    correlated within a band (a calibration error moves neighbouring wavelengths together),
    correlation coefficient ρ (default 0.5) between bands: f_b = 1 + u_b·(√ρ·z₀ + √(1−ρ)·z_b).
wavelength
    one shift δ of the whole wavelength axis per draw (true λ = recorded λ + δ); every
    weighting is re-evaluated at λ + δ, so the steep slope of S(λ) near 300 nm is felt.
distance
    the true measurement distance d₀' (normal or rectangular) rescales everything stated at
    a distance: hazards by the point-source law (d₀'/d₀)², as :mod:`uvcheck.hazards` rescales;
    germicidal figures by the conditions' emitter model (:func:`uvcheck.geometry.scale_factor`).
    For a general-lighting lamp assessed at its 500 lx distance the distance cancels (the
    500 lx distance moves with it) and the illuminance is re-derived per draw instead.
    Only when a measurement distance is given.
stray light
    a flat pedestal s ~ U(0, allowance) *subtracted* from every sample below 400 nm (stray
    light only adds false signal), the allowance a fraction of the largest spectral value or
    an absolute spectral level.
noise
    the spectrum's noise floor σ per sample, independent between samples: it adds a normal
    term σ·‖c‖ to each weighted integral (c its coefficient vector). The noise terms of
    different integrals are drawn independently (their small correlation is neglected).
organism data
    the dose per log reduction is drawn *log-uniformly* within the range across studies of
    the organism table (:meth:`uvcheck.inactivation.Organism.dose_range_for_log`), one draw per
    organism shared by every percent reduction; rows without a range add no spread.

Method
------
Each weighted integral is a linear functional of the spectrum, Y = Σ cᵢ Eᵢ + Σ c_l L_l, with
the coefficients of :func:`uvcheck.spectrum.integrate` (trapezoid rule on the spectrum's own
grid, the integration limits interpolated linearly): :func:`integral_coefficients` builds
them, and they reproduce ``integrate`` to rounding. The coefficients depend on the wavelength
shift only, so they are tabulated once per integral on a grid of shifts spanning the draws
(each band's share, the stray-light response and ‖c‖ are kept) and interpolated for every
draw; everything else is an elementwise operation on arrays of draws. No array of the
spectrum's length is kept per integral (the coefficients of the touched samples are built in
blocks and reduced at once to the per-band sums), so the memory of the evaluation is a few
arrays of the spectrum's length, whatever the number of integrals and draws. Hazard values, groups
and times then follow from the limits of :mod:`uvcheck.limits`: every hazard value is the
integral times a geometry factor, the group of each draw is found by comparing with the
``group_limits`` in one vectorised step, and the 95 % interval of ``t_max`` is ``t_max`` at the
two interval ends of the integral (``t_max`` is non-increasing in it, so the order statistics
carry over exactly). Coverage intervals are probabilistically symmetric, from the sorted draws
(JCGM 101:2008 7.7; the index rule r = (M − q)/2, q = pM is from memory). With 4000 draws an
interval end is reproducible to about ±0.04 standard uncertainties (binomial sampling error
of a 2.5 % quantile, derived); the fixed seed makes the output byte-identical.

Decision rules (ILAC-G8:09/2019 §4.2, read in a public transcription; JCGM 106:2012 for the
concepts of acceptance limit, guard band and conformance probability, from memory):
*simple acceptance* (guard band w = 0) decides on the measured value, with up to 50 % risk of
a wrong decision at the limit; *guarded acceptance* accepts only when the measured value is
beyond the limit by w = U, the expanded uncertainty (95 % coverage) on the side of the limit.
See :func:`decide`.

A screening assessment, not a certification: the uncertainty stated covers the inputs listed
above only (not the lamp's stability, ageing, temperature, the instrument's linearity or
cosine response, nor the validity of the emitter models), and exposure decisions defer to
local codes and licensed practice.

Numpy only at import time (this module is on the ``uvcheck assess`` path).
"""

from __future__ import annotations

import math
import re
import zlib
from dataclasses import dataclass, field, replace
from functools import lru_cache
from types import MappingProxyType
from typing import Any, Callable, Iterator, Mapping, Sequence

import numpy as np

from uvcheck.conditions import Conditions
from uvcheck.constants import K_M_LM_PER_W
from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError
from uvcheck.geometry import scale_factor
from uvcheck.limits import GROUPS, HazardLimits, get_limit_set, solid_angle_sr
from uvcheck.spectrum import Spectrum, median, trapezoid_weights
from uvcheck.units import BOUND_SIGN, bounded_duration, format_duration, parse_quantity, sig

DEFAULTS_FILE = "uncertainty_defaults.toml"
#: Coverage probability of every interval. [-]
COVERAGE = 0.95
DECISION_RULES = ("simple", "guarded")
DIRECTIONS = ("at_least", "at_most")
DISTRIBUTIONS = ("normal", "rectangular")
#: Shifts tabulated per integral; between them the integrals are interpolated linearly.
#: 33 points over the drawn range (±0.5 nm by default: a 0.03 nm spacing) change every
#: interval of a mercury-line test spectrum by under 1e-5 relative against 97 points
#: (measured on the spectrum of tests/benchmarks/bench_uncertainty.py), at a third of the cost.
SHIFT_GRID_POINTS = 33
#: IEC 62471:2006 assessment distance of lamps not for general lighting (as hazards.py). [m]
MIN_ASSESSMENT_DISTANCE_M = 0.2
GLS_ILLUMINANCE_LX = 500.0
#: V(λ) share that counts as a complete luminous measurement (as hazards.py). [-]
_V_COMPLETE = 0.999
#: Fields merged into each ``hazards[id]`` entry of the assessment dict by :func:`merge_into`.
MERGED_HAZARD_FIELDS = ("interval_95", "t_max_interval_95_s", "risk_group_probability",
                        "borderline", "standard_uncertainty", "risk_group_by_rule",
                        "risk_group_guarded")
#: Fields that :func:`merge_into` adds to the ``risk_group`` entry (None when not evaluated).
RISK_GROUP_FIELDS = ("decision_rule", "group_simple", "group_guarded", "group_probability",
                     "group_probability_is_at_least", "borderline", "group_range_95",
                     "rule_note")
#: Run of UV samples whose median bounds a stray-light pedestal (the data cap, our choice). [-]
STRAY_WINDOW_SAMPLES = 40
#: The percent reductions whose times get intervals. [%]
PERCENTS = (90.0, 99.0, 99.9)

SCREENING_NOTE = ("The intervals cover the stated inputs only (calibration, wavelength scale, "
                  "distance, UV stray light, sample noise, spread of organism data); a "
                  "screening assessment, not a certification.")
_SOURCES = {
    "mcm": "JCGM 101:2008 (GUM Supplement 1), propagation of distributions by a Monte Carlo "
           "method; coverage interval rule of 7.7 from memory",
    "gum": "JCGM 100:2008 (GUM) 5.1, law of propagation of uncertainty, sensitivity "
           "coefficients by central differences (5.1.3)",
    "ilac": "ILAC-G8:09/2019 Guidelines on Decision Rules and Statements of Conformity, §4.2 "
            "(binary simple acceptance w = 0; binary statement with guard band AL = TL − w; "
            "non-binary pass / conditional pass / conditional fail / fail), read in a public "
            "transcription",
    "jcgm106": "JCGM 106:2012 The role of measurement uncertainty in conformity assessment "
               "(acceptance limit, guard band, conformance probability; from memory)",
}


def _num(x: Any) -> float | None:
    """JSON-safe float: None for None, NaN or ±inf."""
    if x is None:
        return None
    x = float(x)
    return x if math.isfinite(x) else None


# ---------------------------------------------------------------------------------------------
# Inputs
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Distribution:
    """A distribution of an input: ``normal`` by its standard uncertainty, ``rectangular`` by
    its half-width a (standard uncertainty a/√3, GUM 4.3.7).

    kind : ``normal`` | ``rectangular``.
    value : standard uncertainty (normal) or half-width (rectangular), in the input's unit.
    """

    kind: str
    value: float

    def __post_init__(self) -> None:
        if self.kind not in DISTRIBUTIONS:
            raise ConfigurationError(f"unknown distribution {self.kind!r}; available: "
                                     f"{', '.join(DISTRIBUTIONS)}")
        if not (math.isfinite(self.value) and self.value >= 0):
            raise ConfigurationError(f"an uncertainty must be finite and >= 0, got {self.value}")

    @property
    def standard_uncertainty(self) -> float:
        return self.value if self.kind == "normal" else self.value / math.sqrt(3.0)

    def draw(self, rng: np.random.Generator, n: int) -> np.ndarray:
        """n draws of the deviation from the estimate (mean 0)."""
        if self.value == 0.0:
            return np.zeros(n)
        if self.kind == "normal":
            return rng.normal(0.0, self.value, n)
        return rng.uniform(-self.value, self.value, n)

    def text(self, unit: str) -> str:
        if self.kind == "normal":
            return f"{sig(self.value)} {unit} (standard uncertainty, normal)"
        return f"±{sig(self.value)} {unit} (rectangular; u = {sig(self.standard_uncertainty)} {unit})"

    def to_dict(self, unit: str) -> dict[str, Any]:
        return {"distribution": self.kind, "value": self.value, "unit": unit,
                "value_is": "standard uncertainty" if self.kind == "normal" else "half-width",
                "standard_uncertainty": self.standard_uncertainty}


@dataclass(frozen=True)
class UncertaintyInputs:
    """What is assumed about the inputs of the measurement (see the module notes).

    calibration_u_rel : relative standard uncertainty of the spectral scale per band. [-]
    calibration_bands_nm : each band's [lo, hi) in recorded wavelength. [nm]
    calibration_correlation : correlation coefficient between bands, 0–1. [-]
    wavelength_nm : shift of the wavelength axis. [nm]
    distance : uncertainty of the measurement distance, [m], or relative [-] if
        ``distance_is_relative``.
    stray_light_fraction : allowance as a fraction of the largest spectral value. [-]
    stray_light_level : allowance as an absolute spectral level (overrides the fraction).
        [spectral unit, W m⁻² nm⁻¹ for irradiance]
    stray_light_below_nm : the pedestal applies to samples below this wavelength. [nm]
    include_noise : use the spectrum's noise floor.
    organism_spread : draw doses within the range across studies.
    decision_rule : ``simple`` | ``guarded``.
    scale_u_rel : relative standard uncertainty of the reading a spectrum was scaled by (a
        band radiometer, a lux meter or a known total): one factor per draw for every value,
        on top of the per-band calibration (which then stands for the spectral shape); 0 for
        a spectrum that was not scaled. [-]
    repeat_u_rel : relative standard uncertainty of the mean of repeat scans from their
        spread (the standard deviation of the scans' totals over √n, a type A evaluation,
        JCGM 100:2008 §4.2): one factor per draw for every value; 0 for one scan. [-]
    basis : per input key (calibration, wavelength, distance, stray_light, noise,
        organism_data, decision_rule), where the figure comes from.
    """

    calibration_u_rel: Mapping[str, float]
    calibration_bands_nm: Mapping[str, tuple[float, float]]
    calibration_correlation: float
    wavelength_nm: Distribution
    distance: Distribution
    distance_is_relative: bool = False
    stray_light_fraction: float | None = None
    stray_light_level: float | None = None
    stray_light_below_nm: float = 400.0
    include_noise: bool = True
    organism_spread: bool = True
    decision_rule: str = "simple"
    basis: Mapping[str, str] = field(default_factory=lambda: MappingProxyType({}))
    scale_u_rel: float = 0.0
    repeat_u_rel: float = 0.0

    def __post_init__(self) -> None:
        if set(self.calibration_u_rel) != set(self.calibration_bands_nm):
            raise ConfigurationError("calibration uncertainties and bands must name the same bands")
        for b, u in self.calibration_u_rel.items():
            if not (math.isfinite(u) and 0.0 <= u < 1.0):
                raise ConfigurationError(f"calibration uncertainty of {b} must be in [0, 1), got {u}")
        if not 0.0 <= self.calibration_correlation <= 1.0:
            raise ConfigurationError("the correlation between bands must be in [0, 1], got "
                                     f"{self.calibration_correlation}")
        if not (math.isfinite(self.repeat_u_rel) and 0.0 <= self.repeat_u_rel < 1.0):
            raise ConfigurationError(f"the repeat scans' uncertainty must be in [0, 1), got "
                                     f"{self.repeat_u_rel}")
        if not (math.isfinite(self.scale_u_rel) and 0.0 <= self.scale_u_rel < 1.0):
            raise ConfigurationError(f"the scaling reading's uncertainty must be in [0, 1), got "
                                     f"{self.scale_u_rel}")
        for name in ("stray_light_fraction", "stray_light_level"):
            v = getattr(self, name)
            if v is not None and not (math.isfinite(v) and v >= 0):
                raise ConfigurationError(f"{name.replace('_', ' ')} must be >= 0, got {v}")
        if self.decision_rule not in DECISION_RULES:
            raise ConfigurationError(f"unknown decision rule {self.decision_rule!r}; available: "
                                     f"{', '.join(DECISION_RULES)}",
                                     todo="use --decision-rule simple or --decision-rule guarded")
        for name in ("calibration_u_rel", "calibration_bands_nm", "basis"):
            v = getattr(self, name)
            if not isinstance(v, MappingProxyType):
                object.__setattr__(self, name, MappingProxyType(dict(v)))

    @property
    def bands(self) -> tuple[str, ...]:
        """Band names ordered by wavelength."""
        return tuple(sorted(self.calibration_bands_nm, key=lambda b: self.calibration_bands_nm[b][0]))

    def with_(self, **changes: Any) -> "UncertaintyInputs":
        """A copy with some fields changed (``basis`` entries are merged, not replaced)."""
        if "basis" in changes:
            changes["basis"] = {**dict(self.basis), **dict(changes["basis"])}
        return replace(self, **changes)

    def to_dict(self) -> dict[str, Any]:
        b = self.basis
        return {
            "calibration": {
                "distribution": "normal",
                "u_rel_by_band": {k: self.calibration_u_rel[k] for k in self.bands},
                "bands_nm": {k: list(self.calibration_bands_nm[k]) for k in self.bands},
                "correlation": (f"one factor per band and draw (fully correlated within a band); "
                                f"correlation coefficient {self.calibration_correlation:g} between "
                                "bands"),
                "correlation_between_bands": self.calibration_correlation,
                "basis": b.get("calibration", ""),
            },
            "wavelength": {**self.wavelength_nm.to_dict("nm"),
                           "model": "one shift of the whole axis per draw; weightings "
                                    "re-evaluated at λ + δ",
                           "basis": b.get("wavelength", "")},
            "distance": {**self.distance.to_dict("relative" if self.distance_is_relative else "m"),
                         "applies": "only when a measurement distance is given",
                         "basis": b.get("distance", "")},
            "stray_light": {"fraction_of_peak": self.stray_light_fraction,
                            "level": self.stray_light_level,
                            "below_nm": self.stray_light_below_nm,
                            "model": "a flat pedestal drawn uniformly in [0, allowance], "
                                     f"subtracted from every sample below "
                                     f"{self.stray_light_below_nm:g} nm",
                            "basis": b.get("stray_light", "")},
            "noise": {"include": self.include_noise, "basis": b.get("noise", "")},
            "scaling": {"u_rel": self.scale_u_rel, "distribution": "normal",
                        "model": "one factor per draw for every value (the reading the "
                                 "spectrum was scaled by)",
                        "basis": b.get("scaling", "not scaled" if not self.scale_u_rel else "")},
            "repeatability": {"u_rel": self.repeat_u_rel, "distribution": "normal",
                              "model": "one factor per draw for every value (the mean of "
                                       "repeat scans, type A)",
                              "basis": b.get("repeatability", "one scan" if not self.repeat_u_rel
                                             else "")},
            "organism_data": {"include": self.organism_spread, "distribution": "log-uniform",
                              "basis": b.get("organism_data", "")},
        }

    def summary(self) -> str:
        """One sentence for the note."""
        cal = ", ".join(f"{k} {100 * self.calibration_u_rel[k]:g} %" for k in self.bands)
        dist = (f"{100 * self.distance.value:g} %" if self.distance_is_relative
                else f"{self.distance.value * 1000:g} mm")
        dist = ("±" if self.distance.kind == "rectangular" else "") + dist
        wl = ("±" if self.wavelength_nm.kind == "rectangular" else "") + f"{self.wavelength_nm.value:g} nm"
        if self.stray_light_level is not None:
            stray = f"≤ {sig(self.stray_light_level)} per nm"
        elif self.stray_light_fraction:
            stray = f"≤ {100 * self.stray_light_fraction:g} % of the spectral peak"
        else:
            stray = "none"
        labels = sorted({v.split(":")[0] for v in self.basis.values() if v})
        scale = (f"; scaling reading {100 * self.scale_u_rel:.3g} % (k = 1)"
                 if self.scale_u_rel else "")
        if self.repeat_u_rel:
            scale += f"; repeatability of the scans {100 * self.repeat_u_rel:.3g} % (k = 1, type A)"
        return (f"calibration {cal} (k = 1){scale}; wavelength scale {wl}; distance {dist}; UV stray "
                f"light {stray}; sample noise {'included' if self.include_noise else 'not included'}"
                f"; organism data {'within the range across studies' if self.organism_spread else 'not varied'}"
                + (f" [{'; '.join(labels)}]" if labels else ""))


@lru_cache(maxsize=1)
def _defaults_raw() -> dict[str, Any]:
    return read_toml(DEFAULTS_FILE)


def default_inputs() -> UncertaintyInputs:
    """The default input uncertainties (``data/uncertainty_defaults.toml``, common practice).

    Examples
    --------
    >>> d = default_inputs()
    >>> d.calibration_u_rel["UV"] > d.calibration_u_rel["visible"]
    True
    >>> d.wavelength_nm.kind, d.wavelength_nm.value
    ('rectangular', 0.5)
    """
    raw = _defaults_raw()
    cal = raw["calibration"]
    bands = cal["bands"]
    label = "default (common practice)"
    wl = raw["wavelength"]
    dist = raw["distance"]
    st = raw["stray_light"]
    return UncertaintyInputs(
        calibration_u_rel={k: float(v["u_rel"]) for k, v in bands.items()},
        calibration_bands_nm={k: (float(v["lo_nm"]), float(v["hi_nm"])) for k, v in bands.items()},
        calibration_correlation=float(cal["correlation_between_bands"]),
        wavelength_nm=Distribution(wl["distribution"], float(wl["half_width_nm"])),
        distance=Distribution(dist["distribution"], float(dist["standard_uncertainty_m"])),
        stray_light_fraction=float(st["fraction_of_peak"]),
        stray_light_below_nm=float(st["below_nm"]),
        include_noise=bool(raw["noise"]["include"]),
        organism_spread=True,
        decision_rule=str(raw["decision_rule"]["default"]),
        basis={"calibration": f"{label}: {cal['basis']}; " + "; ".join(
                   f"{k}: {v['basis']}" for k, v in bands.items()),
               "wavelength": f"{label}: {wl['basis']}",
               "distance": f"{label}: {dist['basis']}",
               "stray_light": f"{label}: {st['basis']}",
               "noise": raw["noise"]["basis"],
               "organism_data": raw["organism_data"]["basis"],
               "decision_rule": "default"},
    )


def default_method() -> tuple[int, int]:
    """(draws, seed) of the defaults file."""
    m = _defaults_raw()["method"]
    return int(m["draws"]), int(m["seed"])


# --- option texts ---------------------------------------------------------------------------

def _split_k(text: str) -> tuple[str, float]:
    """Strip a trailing coverage factor ``k=2`` (the value is then an expanded uncertainty)."""
    t = text.strip()
    low = t.lower().replace(" ", "")
    for sep in ("(k=", "k="):
        i = low.rfind(sep)
        if i >= 0:
            tail = low[i + len(sep):].rstrip(")")
            try:
                k = float(tail)
            except ValueError:
                raise ConfigurationError(f"cannot read the coverage factor in {text!r}",
                                         todo="write it like '10 % k=2'") from None
            if not k > 0:
                raise ConfigurationError(f"coverage factor must be positive in {text!r}")
            # cut the same place in the original text (spaces removed only for the search)
            n_nonspace = i
            j, seen = 0, 0
            while seen < n_nonspace and j < len(t):
                if t[j] != " ":
                    seen += 1
                j += 1
            return t[:j].strip().rstrip("(,;").strip(), k
    return t, 1.0


def _split_pm(text: str) -> tuple[str, str]:
    t = text.strip()
    for pm in ("±", "+/-", "+-"):
        if t.startswith(pm):
            return t[len(pm):].strip(), "rectangular"
    return t, "normal"


def _fraction(text: str, where: str) -> float:
    v = parse_quantity(text, "fraction", where).value_si
    if not (math.isfinite(v) and 0 <= v < 1):
        raise ConfigurationError(f"{text!r} must be a fraction from 0 to under 100 %", where)
    return v


def parse_calibration(text: str, base: UncertaintyInputs | None = None,
                      where: str = "--calibration-uncertainty") -> dict[str, float]:
    """Relative standard uncertainties per band from ``"10 %"`` or ``"UV=15 %,visible=5 %"``.

    A bare figure applies to every band; ``BAND=figure`` pairs (separated by commas or
    semicolons) change the bands named, the others keep ``base``'s value. A trailing ``k=2``
    marks an expanded uncertainty, divided by k. Band names are exact (UV, visible, IR).

    Examples
    --------
    >>> parse_calibration("UV=15 %,visible=5 %")["UV"]
    0.15
    >>> parse_calibration("10 % k=2")["IR"]
    0.05
    """
    base = base or default_inputs()
    out = dict(base.calibration_u_rel)
    parts = [p.strip() for p in text.replace(";", ",").split(",") if p.strip()]
    if not parts:
        raise ConfigurationError("empty calibration uncertainty", where,
                                 "give e.g. '10 %' or 'UV=15 %,visible=5 %'")
    for p in parts:
        pair = re.match(r"^\s*([A-Za-z][A-Za-z0-9_-]*)\s*=(.*)$", p)
        if pair and pair.group(1).lower() != "k":
            name, val = pair.group(1), pair.group(2)
            if name not in out:
                raise ConfigurationError(f"unknown band {name!r}; available: "
                                         f"{', '.join(base.bands)}", where)
            v, k = _split_k(val)
            out[name] = _fraction(v, where) / k
        else:
            v, k = _split_k(p)
            f = _fraction(v, where) / k
            out = {b: f for b in out}
    return out


def parse_wavelength(text: str, where: str = "--wavelength-uncertainty") -> Distribution:
    """``"0.3 nm"`` (standard uncertainty, normal), ``"±0.5 nm"`` (rectangular half-width),
    ``"0.6 nm k=2"`` (expanded). A bare number is in nm.

    Examples
    --------
    >>> parse_wavelength("±0.5 nm")
    Distribution(kind='rectangular', value=0.5)
    """
    t, kind = _split_pm(text)
    t, k = _split_k(t)
    v = parse_quantity(t, "length", where, default_unit="nm").value_si * 1e9
    return Distribution(kind, float(f"{v / k:.12g}"))


def parse_distance(text: str, where: str = "--distance-uncertainty") -> tuple[Distribution, bool]:
    """``"2 cm"`` (standard uncertainty), ``"±1 cm"`` (rectangular), ``"1 %"`` (relative);
    a bare number is in mm. Returns (distribution, is_relative).

    Examples
    --------
    >>> parse_distance("2 cm")
    (Distribution(kind='normal', value=0.02), False)
    >>> parse_distance("1 %")
    (Distribution(kind='normal', value=0.01), True)
    """
    t, kind = _split_pm(text)
    t, k = _split_k(t)
    if t.rstrip().endswith("%"):
        return Distribution(kind, _fraction(t, where) / k), True
    v = parse_quantity(t, "length", where, default_unit="mm").value_si
    return Distribution(kind, float(f"{v / k:.12g}")), False


def parse_stray_light(text: str, where: str = "--stray-light") -> tuple[float | None, float | None]:
    """``"0.01 %"`` or ``"1e-4"`` (fraction of the largest spectral value), ``"2e-6 W/m2/nm"``
    (absolute spectral level), ``"0"`` or ``"none"`` (off). Returns (fraction, level).

    Examples
    --------
    >>> parse_stray_light("0.05 %")
    (0.0005, None)
    >>> parse_stray_light("2 uW/cm2/nm")
    (None, 0.02)
    """
    t = text.strip()
    if t.lower() in ("none", "off", "0", "0 %"):
        return 0.0, None
    try:
        return _fraction(t, where), None
    except Exception:
        pass
    q = parse_quantity(t, ("spectral_irradiance", "spectral_radiance"), where).value_si
    if not (math.isfinite(q) and q >= 0):
        raise ConfigurationError(f"{text!r} must be a non-negative level", where)
    return None, float(f"{q * 1e-9:.12g}")  # per m -> per nm


def uncertainty_options_from_cli(calibration: str | None = None, wavelength: str | None = None,
                                 distance: str | None = None, stray_light: str | None = None,
                                 decision_rule: str | None = None,
                                 base: UncertaintyInputs | None = None) -> UncertaintyInputs:
    """UncertaintyInputs from the ``assess`` option texts; what is not given keeps its default.

    calibration : ``--calibration-uncertainty`` (see :func:`parse_calibration`).
    wavelength : ``--wavelength-uncertainty`` (see :func:`parse_wavelength`).
    distance : ``--distance-uncertainty`` (see :func:`parse_distance`).
    stray_light : ``--stray-light`` (see :func:`parse_stray_light`).
    decision_rule : ``--decision-rule`` ``simple`` | ``guarded``.

    Examples
    --------
    >>> u = uncertainty_options_from_cli(calibration="UV=15 %", wavelength="±1 nm",
    ...                                  decision_rule="guarded")
    >>> u.calibration_u_rel["UV"], u.wavelength_nm.value, u.decision_rule
    (0.15, 1.0, 'guarded')
    """
    u = base or default_inputs()
    changes: dict[str, Any] = {}
    basis: dict[str, str] = {}
    if calibration is not None:
        changes["calibration_u_rel"] = parse_calibration(calibration, u)
        basis["calibration"] = f"given: {calibration}"
    if wavelength is not None:
        changes["wavelength_nm"] = parse_wavelength(wavelength)
        basis["wavelength"] = f"given: {wavelength}"
    if distance is not None:
        changes["distance"], changes["distance_is_relative"] = parse_distance(distance)
        basis["distance"] = f"given: {distance}"
    if stray_light is not None:
        changes["stray_light_fraction"], changes["stray_light_level"] = parse_stray_light(stray_light)
        basis["stray_light"] = f"given: {stray_light}"
    if decision_rule is not None:
        if decision_rule not in DECISION_RULES:
            raise ConfigurationError(f"unknown decision rule {decision_rule!r}; available: "
                                     f"{', '.join(DECISION_RULES)}", "--decision-rule")
        changes["decision_rule"] = decision_rule
        basis["decision_rule"] = "given"
    if basis:
        changes["basis"] = basis
    return u.with_(**changes) if changes else u


# ---------------------------------------------------------------------------------------------
# Weighted integrals as linear functionals
# ---------------------------------------------------------------------------------------------

Weight = Callable[[np.ndarray], np.ndarray]


#: Samples per block when the coefficients of a long spectrum are built: the temporaries of
#: the weighting and the trapezoid rule stay at this size whatever the number of samples. [-]
COEF_BLOCK_SAMPLES = 1 << 16


def _searchsorted_shifted(wl: np.ndarray, shift: float, x: float, side: str) -> int:
    """``np.searchsorted(wl + shift, x, side)`` without forming ``wl + shift``.

    Floating-point addition is monotone, so ``wl + shift`` is sorted; the index found on the
    recorded axis is corrected by comparing the shifted values themselves, so the result is
    the same integer as on the shifted array."""
    n = wl.size
    i = int(np.searchsorted(wl, x - shift, side=side))
    if side == "right":     # first index whose shifted value is > x
        while i > 0 and not (wl[i - 1] + shift <= x):
            i -= 1
        while i < n and wl[i] + shift <= x:
            i += 1
    else:                   # first index whose shifted value is >= x
        while i > 0 and not (wl[i - 1] + shift < x):
            i -= 1
        while i < n and wl[i] + shift < x:
            i += 1
    return i


def _local_coefficients(spectrum: Spectrum, lo_nm: float, hi_nm: float,
                        weight: Weight | None = None, shift_nm: float = 0.0,
                        ) -> tuple[int, np.ndarray, np.ndarray]:
    """(offset, c, c_line): the coefficients of :func:`integral_coefficients`, ``c`` holding
    only the samples from ``offset`` on that the integral touches (every other sample's
    coefficient is 0). The weighting is evaluated in blocks of :data:`COEF_BLOCK_SAMPLES`,
    so the memory is the touched span plus blocks, whatever the length of the spectrum; each
    coefficient is the same number ``integral_coefficients`` gives (the trapezoid rule is
    local: a node's weight depends on its two neighbours only)."""
    wl0 = spectrum.wavelength_nm
    n = wl0.size
    sh = float(shift_nm)
    lo, hi = float(lo_nm), float(hi_nm)
    covered: list[tuple[float, float]] = []
    pieces: list[tuple[float, float, int, int]] = []   # a_d, b_d, i0, i1
    for s0, s1 in spectrum.segments():
        a, b = max(lo, s0 + sh), min(hi, s1 + sh)
        if b <= a:
            continue
        covered.append((a, b))
        if n >= 2:
            a_d, b_d = max(a, wl0[0] + sh), min(b, wl0[-1] + sh)
            if b_d > a_d:
                pieces.append((a_d, b_d, _searchsorted_shifted(wl0, sh, a_d, "right"),
                               _searchsorted_shifted(wl0, sh, b_d, "left")))
    if pieces:
        start = max(min(p[2] for p in pieces) - 1, 0)
        stop = min(max(p[3] for p in pieces) + 2, n)
    else:
        start = stop = 0
    c = np.zeros(stop - start)
    for a_d, b_d, i0, i1 in pieces:
        # interior nodes wl[i0:i1], block by block; each block's trapezoid sees its neighbours
        for p in range(i0, i1, COEF_BLOCK_SAMPLES):
            q = min(p + COEF_BLOCK_SAMPLES, i1)
            x = np.empty(q - p + 2)
            x[1:-1] = wl0[p:q]
            x[1:-1] += sh
            x[0] = a_d if p == i0 else wl0[p - 1] + sh
            x[-1] = b_d if q == i1 else wl0[q] + sh
            t = trapezoid_weights(x, weight)
            c[p - start:q - start] += t[1:-1]
            if p == i0:
                t_first = t[0]
            if q == i1:
                t_last = t[-1]
        if i1 <= i0:   # no sample inside: the two limits only
            t = trapezoid_weights(np.array([a_d, b_d]), weight)
            t_first, t_last = t[0], t[-1]
        for xe, te in ((a_d, t_first), (b_d, t_last)):
            j = min(max(_searchsorted_shifted(wl0, sh, xe, "right") - 1, 0), n - 2)
            wj, wj1 = wl0[j] + sh, wl0[j + 1] + sh
            frac = (xe - wj) / (wj1 - wj)
            c[j - start] += te * (1.0 - frac)
            c[j + 1 - start] += te * frac
    cl = np.zeros(len(spectrum.lines))
    for k, ln in enumerate(spectrum.lines):
        lam = ln.wavelength_nm + sh
        if lo <= lam < hi and any(a <= lam <= b for a, b in covered):
            cl[k] = 1.0 if weight is None else float(np.asarray(weight(np.array([lam])))[0])
    return start, c, cl


def _row_medians(block: np.ndarray) -> np.ndarray:
    """numpy.median(block, axis=1) for a 2-D block of finite values, by numpy.partition
    (numpy.median imports numpy.ma on its first call, about 15 ms of a run).

    Examples
    --------
    >>> _row_medians(np.array([[3.0, 1.0, 2.0], [4.0, 6.0, 5.0]])).tolist()
    [2.0, 5.0]
    """
    n = block.shape[1]
    h = n // 2
    if n % 2:
        return np.partition(block, h, axis=1)[:, h]
    part = np.partition(block, [h - 1, h], axis=1)
    return (part[:, h - 1] + part[:, h]) / 2.0


def integral_coefficients(spectrum: Spectrum, lo_nm: float, hi_nm: float,
                          weight: Weight | None = None, shift_nm: float = 0.0,
                          ) -> tuple[np.ndarray, np.ndarray]:
    """Coefficients c, c_line with ∫ E·W dλ = c·values + c_line·line values. [nm]

    The same rule as :func:`uvcheck.spectrum.integrate` (trapezoid on the spectrum's grid plus
    the limits, the spectrum interpolated linearly at the limits, lines on [lo, hi)), for the
    spectrum with its wavelength axis (samples, lines, covered range, gaps) shifted by
    ``shift_nm``: the true wavelength of a sample is its recorded one plus the shift.
    (The evaluation itself keeps only the touched samples, :func:`_local_coefficients`.)

    Examples
    --------
    >>> s = Spectrum([200.0, 300.0, 400.0], [1.0, 2.0, 1.0], "irradiance")
    >>> c, cl = integral_coefficients(s, 250.0, 350.0)
    >>> float(c @ s.values)                       # = integrate(s, 250, 350).value
    175.0
    """
    start, cloc, cl = _local_coefficients(spectrum, lo_nm, hi_nm, weight, shift_nm)
    c = np.zeros(spectrum.wavelength_nm.size)
    c[start:start + cloc.size] = cloc
    return c, cl


def shifted_integral(spectrum: Spectrum, lo_nm: float, hi_nm: float, weight: Weight | None,
                     shift_nm: float) -> float:
    """∫ E·W dλ with the wavelength axis shifted by ``shift_nm`` (true = recorded + shift).

    Examples
    --------
    >>> from uvcheck.weighting import get_weighting
    >>> line = Spectrum([], [], "irradiance", lines=[(300.0, 1.0)], covered_nm=(180.0, 400.0))
    >>> S = get_weighting("S_actinic")
    >>> round(shifted_integral(line, 200, 400, S, 1.0) / shifted_integral(line, 200, 400, S, 0.0), 4)
    0.7368
    """
    start, c, cl = _local_coefficients(spectrum, lo_nm, hi_nm, weight, shift_nm)
    return float(c @ spectrum.values[start:start + c.size]
                 + cl @ np.array([ln.value for ln in spectrum.lines]))


class _Functional:
    """One weighted integral, split by calibration band, as a function of the wavelength shift.

    Keeps no array of the spectrum's length: the calibration bands and the stray-light range
    are contiguous index ranges of the (sorted) recorded axis, so each band's share is a dot
    product over a slice of the touched coefficients."""

    def __init__(self, spectrum: Spectrum, lo: float, hi: float, weight: Weight | None,
                 inputs: UncertaintyInputs, stray_below_nm: float):
        self.spectrum, self.lo, self.hi, self.weight = spectrum, lo, hi, weight
        bands = inputs.bands
        wl = spectrum.wavelength_nm
        lines_wl = np.array([ln.wavelength_nm for ln in spectrum.lines])
        lines_v = np.array([ln.value for ln in spectrum.lines])
        self.nb = len(bands)
        # band b holds the samples with a <= wl < z: indices [ia, iz) of the sorted axis
        self.band_idx = []
        self.stray_idx = []
        lcols = []
        for b in bands:
            a, z = inputs.calibration_bands_nm[b]
            ia = int(np.searchsorted(wl, a, side="left"))
            self.band_idx.append((ia, int(np.searchsorted(wl, z, side="left"))))
            # stray light: a pedestal under stray_below_nm lies in the bands below that edge
            self.stray_idx.append((ia, max(ia, int(np.searchsorted(wl, min(z, stray_below_nm),
                                                                  side="left")))))
            lcols.append(np.where((lines_wl >= a) & (lines_wl < z), lines_v, 0.0)
                         if lines_v.size else np.zeros(0))
        self.L = (np.column_stack(lcols) if lines_v.size else np.zeros((0, len(bands))))
        self._cache: dict[float, np.ndarray] = {}

    def _row(self, delta: float) -> np.ndarray:
        """[Y_b for each band, P_b (stray response) for each band, ‖c‖] at one shift."""
        key = float(delta)
        if key in self._cache:
            return self._cache[key]
        start, c, cl = _local_coefficients(self.spectrum, self.lo, self.hi, self.weight, key)
        stop = start + c.size
        vals = self.spectrum.values
        yb = np.zeros(self.nb)
        pb = np.zeros(self.nb)
        for i, ((ia, iz), (sa, sz)) in enumerate(zip(self.band_idx, self.stray_idx)):
            a, z = max(ia, start), min(iz, stop)
            if z > a:
                yb[i] = float(c[a - start:z - start] @ vals[a:z])
            a, z = max(sa, start), min(sz, stop)
            if z > a:
                pb[i] = float(np.sum(c[a - start:z - start]))
        if cl.size:
            yb = yb + cl @ self.L
        row = np.concatenate((yb, pb, [math.sqrt(float(c @ c)) if c.size else 0.0]))
        self._cache[key] = row
        return row

    def at(self, deltas: np.ndarray) -> np.ndarray:
        """Rows (len(deltas), 2·bands + 1) for every shift: exact at up to
        SHIFT_GRID_POINTS distinct shifts, else tabulated and interpolated linearly."""
        d = np.asarray(deltas, dtype=float)
        srt = np.sort(d.ravel())  # numpy.unique, without its import of numpy.ma (~15 ms)
        uniq = srt[np.concatenate(([True], srt[1:] != srt[:-1]))] if srt.size else srt
        if uniq.size <= SHIFT_GRID_POINTS:
            rows = np.array([self._row(x) for x in uniq])
            idx = np.searchsorted(uniq, d)
            return rows[idx]
        grid = np.linspace(uniq[0], uniq[-1], SHIFT_GRID_POINTS)
        rows = np.array([self._row(x) for x in grid])
        return np.column_stack([np.interp(d, grid, rows[:, j]) for j in range(rows.shape[1])])


@dataclass
class _Draws:
    """Input draws (M of them, or structured perturbations for first-order propagation)."""

    f: np.ndarray          # (bands, M) calibration factors
    delta: np.ndarray      # (M,) wavelength shift [nm]
    d0: np.ndarray | None  # (M,) measurement distance [m]
    s: np.ndarray          # (M,) stray-light pedestal [spectral unit]
    noise: bool            # add noise terms
    rng_seed: int | None   # for noise and organism draws (None: no random terms)

    @property
    def m(self) -> int:
        return self.delta.size


def _noise_z(seed: int | None, key: str, m: int) -> np.ndarray:
    if seed is None:
        return np.zeros(m)
    ss = np.random.SeedSequence(entropy=seed, spawn_key=(7, zlib.crc32(key.encode())))
    return np.random.default_rng(ss).standard_normal(m)


class _Model:
    """The measurement model shared by the Monte Carlo and the first-order evaluation."""

    def __init__(self, spectrum: Spectrum, inputs: UncertaintyInputs):
        self.spectrum = spectrum
        self.inputs = inputs
        self.functionals: dict[str, _Functional] = {}
        vals = spectrum.values
        peak = max(float(np.max(vals)), -float(np.min(vals))) if vals.size else 0.0  # max |v|
        if inputs.stray_light_level is not None:
            self.stray_allowance = inputs.stray_light_level
        else:
            self.stray_allowance = (inputs.stray_light_fraction or 0.0) * peak
        self.sigma = (spectrum.noise_floor or 0.0) if inputs.include_noise else 0.0
        self.stray_nominal = self.stray_allowance
        self.stray_capped = False
        wl = spectrum.wavelength_nm
        uv = vals[wl < inputs.stray_light_below_nm] if wl.size else vals
        if uv.size == 0:
            self.stray_allowance = 0.0
        elif uv.size >= 2 * STRAY_WINDOW_SAMPLES:
            # True spectral values are non-negative, so a flat pedestal cannot exceed what the
            # darkest part of the UV shows: cap it at the lowest median of any run of
            # STRAY_WINDOW_SAMPLES consecutive UV samples plus 3 standard errors of that median.
            n_w = STRAY_WINDOW_SAMPLES
            win = np.lib.stride_tricks.sliding_window_view(uv, n_w)
            # the medians in blocks of windows (np.median copies its input: a block, not all)
            step = max(1, COEF_BLOCK_SAMPLES // n_w)
            floor = min(float(np.min(_row_medians(win[k:k + step])))
                        for k in range(0, win.shape[0], step))
            cap = max(floor, 0.0) + 3.0 * 1.2533 * (spectrum.noise_floor or 0.0) / math.sqrt(n_w)
            if cap < self.stray_allowance:
                self.stray_allowance = cap
                self.stray_capped = True

    def functional(self, key: str, lo: float, hi: float, weight: Weight | None) -> _Functional:
        if key not in self.functionals:
            self.functionals[key] = _Functional(self.spectrum, lo, hi, weight, self.inputs,
                                                self.inputs.stray_light_below_nm)
        return self.functionals[key]

    def integral(self, key: str, dr: _Draws) -> np.ndarray:
        """The integral at the measurement position for every draw. [integrated unit]"""
        fn = self.functionals[key]
        rows = fn.at(dr.delta)
        nb = fn.nb
        y = np.sum(dr.f.T * (rows[:, :nb] - dr.s[:, None] * rows[:, nb:2 * nb]), axis=1)
        if dr.noise and self.sigma > 0:
            y = y + self.sigma * rows[:, 2 * nb] * _noise_z(dr.rng_seed, key, dr.m)
        return y

    def nominal(self, key: str) -> float:
        fn = self.functionals[key]
        row = fn._row(0.0)
        return float(np.sum(row[:fn.nb]))


#: Relative standard uncertainty (k = 1) of a scaling reading whose uncertainty is not given:
#: a handheld band radiometer or lux meter with its spectral mismatch on a narrow-band lamp
#: (common practice, not from a document). [-]
SCALE_U_REL_DEFAULT = 0.10


def scaling_uncertainty(spectrum: Spectrum, inputs: UncertaintyInputs
                        ) -> tuple[UncertaintyInputs, str | None]:
    """The inputs with the uncertainty of the reading a scaled spectrum was scaled by (the
    last scaling: it set the absolute level), and a note saying what was used; unchanged
    for a spectrum that was not scaled or inputs that already give one."""
    recs = list((spectrum.meta or {}).get("scaling") or [])
    if not recs or inputs.scale_u_rel:
        return inputs, None
    rec = recs[-1]
    u = rec.get("reading_u_rel")
    given = u is not None
    if not given:
        u = SCALE_U_REL_DEFAULT
    what = rec.get("method", "scaling")
    basis = (f"given with the reading ({rec.get('text')})" if given else
             f"default {100 * u:g} % (k = 1) for a {what} without a stated uncertainty "
             "(common practice, not from a document); give it as '… ± 5 %'")
    note = (f"the spectrum was scaled by a {what}: its uncertainty, {100 * u:.3g} % (k = 1, "
            f"{'as given' if given else 'default, common practice'}), applies to every value, "
            "fully correlated, on top of the per-band calibration (which then stands for the "
            "spectrometer's relative response)")
    return inputs.with_(scale_u_rel=float(u), basis={"scaling": basis}), note


def repeat_uncertainty(spectrum: Spectrum, inputs: UncertaintyInputs
                       ) -> tuple[UncertaintyInputs, str | None]:
    """The inputs with the repeatability of a mean of repeat scans (the standard deviation of
    the scans' totals over √n, relative to their mean: JCGM 100:2008 §4.2, type A), and a note;
    unchanged for one scan."""
    rep = (spectrum.meta or {}).get("repeats")
    if not rep or inputs.repeat_u_rel:
        return inputs, None
    totals = [float(t) for t in rep.get("totals") or []]
    n = len(totals)
    mean = sum(totals) / n if n else 0.0
    if n < 2 or not mean > 0:
        return inputs, None
    sd = math.sqrt(sum((t - mean) ** 2 for t in totals) / (n - 1))
    u = min(sd / math.sqrt(n) / mean, 0.99)
    basis = (f"type A from {n} repeat scans: standard deviation of their totals "
             f"{100 * sd / mean:.3g} % of the mean, over √{n} (JCGM 100:2008 §4.2)")
    note = (f"the spectrum is the mean of {n} repeat scans: their spread gives a repeatability "
            f"of {100 * u:.3g} % (k = 1), applied to every value, fully correlated")
    return inputs.with_(repeat_u_rel=float(u), basis={"repeatability": basis}), note


def _level_terms(inputs: UncertaintyInputs) -> tuple[tuple[str, float, int], ...]:
    """The inputs that scale every value alike, one factor per draw: (budget key, relative
    standard uncertainty, SeedSequence child of its stream), those that apply (u > 0)."""
    terms = (("scaling", inputs.scale_u_rel, 5), ("repeatability", inputs.repeat_u_rel, 6))
    return tuple(t for t in terms if t[1] > 0)


def _monte_carlo_draws(inputs: UncertaintyInputs, d0: float | None, stray: float, m: int,
                       seed: int) -> _Draws:
    """Independent streams per input (SeedSequence children), so changing one input never
    changes the draws of another (common random numbers)."""
    kids = np.random.SeedSequence(seed).spawn(7)   # child i is the same for any count
    rng_cal, rng_wl, rng_d, rng_s = (np.random.default_rng(k) for k in kids[:4])
    bands = inputs.bands
    z = rng_cal.standard_normal((len(bands) + 1, m))
    rho = inputs.calibration_correlation
    u = np.array([inputs.calibration_u_rel[b] for b in bands])[:, None]
    f = 1.0 + u * (math.sqrt(rho) * z[0] + math.sqrt(1.0 - rho) * z[1:])
    for _, u_level, child in _level_terms(inputs):
        # one factor for every value, each term with a stream of its own, so the other
        # inputs' draws are unchanged
        rng_a = np.random.default_rng(kids[child])
        f = f * (1.0 + u_level * rng_a.standard_normal(m))[None, :]
    f = np.maximum(f, 0.0)
    delta = inputs.wavelength_nm.draw(rng_wl, m)
    dd = None
    if d0 is not None:
        dev = inputs.distance.draw(rng_d, m)
        dd = d0 * (1.0 + dev) if inputs.distance_is_relative else d0 + dev
        dd = np.maximum(dd, 1e-3 * d0)
    s = rng_s.uniform(0.0, stray, m) if stray > 0 else np.zeros(m)
    return _Draws(f=f, delta=delta, d0=dd, s=s, noise=True, rng_seed=seed)


def _nominal_draws(nb: int, d0: float | None, m: int = 1) -> _Draws:
    return _Draws(f=np.ones((nb, m)), delta=np.zeros(m),
                  d0=None if d0 is None else np.full(m, d0), s=np.zeros(m), noise=False,
                  rng_seed=None)


# ---------------------------------------------------------------------------------------------
# Summaries of draws
# ---------------------------------------------------------------------------------------------

def coverage_indices(m: int, p: float = COVERAGE) -> tuple[int, int]:
    """0-based indices (low, high) of the probabilistically symmetric 100p % coverage interval
    among m sorted draws (JCGM 101:2008 7.7, rule from memory: q = pM rounded, r = (M − q)/2
    rounded up, interval [y_(r), y_(r+q)] in 1-based order statistics).

    Examples
    --------
    >>> coverage_indices(4000)
    (99, 3899)
    """
    q = int(math.floor(p * m + 0.5))
    r = (m - q) // 2 if (m - q) % 2 == 0 else (m - q + 1) // 2
    r = max(r, 1)
    return r - 1, min(r + q - 1, m - 1)


def coverage_interval(y: np.ndarray, p: float = COVERAGE) -> tuple[float, float]:
    """Probabilistically symmetric 100p % coverage interval of draws (see :func:`coverage_indices`)."""
    ys = np.sort(np.asarray(y, dtype=float))
    i, j = coverage_indices(ys.size, p)
    return float(ys[i]), float(ys[j])


def _summary(y: np.ndarray, nominal: float | None) -> dict[str, Any]:
    lo, hi = coverage_interval(y)
    mean = float(np.mean(y))
    u = float(np.std(y, ddof=1)) if y.size > 1 else 0.0
    ref = nominal if nominal not in (None, 0.0) else (mean if mean != 0 else None)
    return {"value": _num(nominal), "interval_95": [_num(lo), _num(hi)], "mean": _num(mean),
            "standard_uncertainty": _num(u),
            "relative_standard_uncertainty": None if ref is None else _num(abs(u / ref))}


def _gum_u(model_fn: Callable[[_Draws], np.ndarray], inputs: UncertaintyInputs,
           d0: float | None, stray: float, sigma_term: float) -> tuple[float, dict[str, float]]:
    """First-order standard uncertainty of a model output, and the budget by input.

    Sensitivity coefficients by central differences of ± one standard uncertainty
    (exact for the linear inputs); bands combined with their correlation coefficient.
    """
    bands = inputs.bands
    nb = len(bands)
    budget: dict[str, float] = {}
    # calibration: perturb each band by ±u_b
    a = np.zeros(nb)
    for i, b in enumerate(bands):
        ub = inputs.calibration_u_rel[b]
        if ub == 0:
            continue
        dr = _nominal_draws(nb, d0, 2)
        dr.f[i] = [1.0 + ub, 1.0 - ub]
        y = model_fn(dr)
        a[i] = (y[0] - y[1]) / 2.0
    rho = inputs.calibration_correlation
    R = np.full((nb, nb), rho)
    np.fill_diagonal(R, 1.0)
    budget["calibration"] = math.sqrt(max(float(a @ R @ a), 0.0))
    for key, u_level, _ in _level_terms(inputs):
        dr = _nominal_draws(nb, d0, 2)
        dr.f[:] = [1.0 + u_level, 1.0 - u_level]
        y = model_fn(dr)
        budget[key] = abs(float(y[0] - y[1])) / 2.0
    uw = inputs.wavelength_nm.standard_uncertainty
    if uw > 0:
        dr = _nominal_draws(nb, d0, 2)
        dr.delta = np.array([uw, -uw])
        y = model_fn(dr)
        budget["wavelength"] = abs(float(y[0] - y[1])) / 2.0
    else:
        budget["wavelength"] = 0.0
    ud = inputs.distance.standard_uncertainty * (d0 if inputs.distance_is_relative and d0 else 1.0)
    if d0 is not None and ud > 0:
        dr = _nominal_draws(nb, d0, 2)
        dr.d0 = np.array([d0 + ud, d0 - ud])
        y = model_fn(dr)
        budget["distance"] = abs(float(y[0] - y[1])) / 2.0
    else:
        budget["distance"] = 0.0
    if stray > 0:
        dr = _nominal_draws(nb, d0, 2)
        dr.s = np.array([stray, 0.0])
        y = model_fn(dr)
        budget["stray_light"] = abs(float(y[0] - y[1])) / math.sqrt(12.0)  # U(0, S): u = S/√12
    else:
        budget["stray_light"] = 0.0
    budget["noise"] = abs(sigma_term)
    u = math.sqrt(sum(v * v for v in budget.values()))
    return u, budget


# ---------------------------------------------------------------------------------------------
# Result
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class UncertaintyResult:
    """Intervals, group probabilities and decisions; :meth:`to_dict` is the JSON section.

    hazards : per hazard id, the dict of :func:`evaluate_uncertainty` (``interval_95``,
        ``t_max_interval_95_s``, ``risk_group_probability``, ``borderline``, ...).
    overall : probability of the lamp's overall group, borderline flag, group by the rule.
    germicidal : intervals of UV-C, far-UVC, the 254-nm-equivalent and inactivation times.
    inputs : the assumed input uncertainties with their basis.
    method : draws, seed, coverage, correlation model, cross-check.
    decision_rule : the rule, its guard band and its sources.
    """

    status: str
    reason: str | None
    hazards: Mapping[str, Mapping[str, Any]]
    overall: Mapping[str, Any] | None
    germicidal: Mapping[str, Any] | None
    inputs: UncertaintyInputs
    method: Mapping[str, Any]
    decision_rule: Mapping[str, Any]
    notes: tuple[str, ...] = ()

    def to_dict(self) -> dict[str, Any]:
        return {"status": self.status, "reason": self.reason,
                "method": dict(self.method), "inputs": self.inputs.to_dict(),
                "decision_rule": dict(self.decision_rule),
                "hazards": {k: dict(v) for k, v in self.hazards.items()},
                "overall": None if self.overall is None else dict(self.overall),
                "germicidal": None if self.germicidal is None else dict(self.germicidal),
                "notes": list(self.notes)}


def decision_rule_block(rule: str) -> dict[str, Any]:
    """The ``decision_rule`` section: which rule, its guard band, what it means, sources."""
    if rule not in DECISION_RULES:
        raise ConfigurationError(f"unknown decision rule {rule!r}; available: "
                                 f"{', '.join(DECISION_RULES)}")
    if rule == "simple":
        text = ("Simple acceptance (guard band w = 0): a limit is met when the measured value "
                "meets it; at the limit the risk of a wrong decision is up to 50 %.")
        group = "the group of the measured value"
    else:
        text = ("Guarded acceptance (guard band w = U, the expanded uncertainty for 95 % "
                "coverage on the side of the limit): a limit is met only when the measured "
                "value is beyond it by U; for a normal distribution the risk of a wrong "
                "acceptance is then about 2.5 % (one-sided; secondary sources, from memory).")
        group = ("the group of the upper end of the 95 % interval, never lower than the measured "
                 "value's (a group is accepted only when the value is below its upper limit by "
                 "U; for a partly measured hazard, its measured part)")
    return {"rule": rule, "name": "simple acceptance" if rule == "simple" else "guarded acceptance",
            "guard_band": "0" if rule == "simple" else "U (95 % coverage, on the side of the limit)",
            "statement": text, "risk_group_by_rule": group,
            "sources": [_SOURCES["ilac"], _SOURCES["jcgm106"]]}


# ---------------------------------------------------------------------------------------------
# Hazards
# ---------------------------------------------------------------------------------------------

def _geometry(cond: Conditions, hz: Any) -> Any:
    """The hazard evaluation's conversion from the measured integral to each hazard quantity
    (hazards._Geo, built as hazards builds it), so the draws are centred on the reported
    values."""
    from uvcheck.hazards import _alpha_at, _Geo

    ev = hz.evaluation
    d_meas = cond.measurement_distance_m
    alpha_meas = (ev.alpha_rad if ev.distance_m is None or d_meas is None
                  else _alpha_at(cond, d_meas, d_meas))
    return _Geo(ev.input_quantity, float(ev.distance_factor), ev.alpha_rad, alpha_meas)


def _sig_key(entry: HazardLimits) -> str:
    return "hz:" + repr(tuple((c.lo_nm, c.hi_nm, c.weighting, c.scale) for c in entry.components))


def _group_index(values: list[np.ndarray], limits: list[float]) -> np.ndarray:
    """Per draw, the first group whose limit the value (over that group's field) meets."""
    idx = np.full(values[0].shape, len(GROUPS) - 1, dtype=int)
    for i in range(len(limits) - 1, -1, -1):
        idx = np.where(np.maximum(values[i], 0.0) <= limits[i], i, idx)
    return idx


def _probabilities(idx: np.ndarray) -> dict[str, float]:
    counts = np.bincount(idx, minlength=len(GROUPS))
    return {g: float(counts[i]) / idx.size for i, g in enumerate(GROUPS)}


def _hazard_distance_factor(model: _Model, cond: Conditions, ev: Mapping[str, Any],
                            dr: _Draws) -> np.ndarray:
    """g per draw: the change of the hazards' irradiance factor k = E(d_eval)/E(d₀) by the
    emitter model ((d₀/d_eval)² for a point source; :func:`uvcheck.hazards.distance_factor`)
    [-]."""
    from uvcheck.hazards import distance_factor, distance_for_factor

    m = dr.m
    d0 = cond.measurement_distance_m
    if d0 is None or dr.d0 is None or model.spectrum.quantity != "irradiance" \
            or ev.get("distance_m") is None:
        return np.ones(m)
    k_nom = float(ev["distance_factor"])

    def k_of(d_eval: Any) -> np.ndarray:
        return np.asarray(distance_factor(cond, dr.d0, d_eval), dtype=float)

    if not cond.general_lighting:
        d_eval = float(ev["distance_m"])
        return k_of(d_eval) / k_nom
    # general lighting: evaluated at the 500 lx distance (never under 200 mm), re-derived
    if "lum" in model.functionals and ev.get("_v_ok"):
        e_v = K_M_LM_PER_W * model.integral("lum", dr)
    elif ev.get("illuminance_lx") is not None:
        e_v = np.full(m, float(ev["illuminance_lx"]) / k_nom)   # a reading: held fixed
    else:
        return k_of(float(ev["distance_m"])) / k_nom
    d500 = distance_for_factor(cond, dr.d0, np.maximum(e_v, 0.0) / GLS_ILLUMINANCE_LX)
    d_eval = np.maximum(d500, MIN_ASSESSMENT_DISTANCE_M)
    return k_of(d_eval) / k_nom


def _hazard_section(model: _Model, cond: Conditions, hz: Any, inputs: UncertaintyInputs,
                    draws: _Draws, rule: str) -> tuple[dict[str, dict], dict[str, Any] | None]:
    ev = hz.evaluation.to_dict()
    lset = get_limit_set(hz.evaluation.limit_set)
    input_q = hz.evaluation.input_quantity
    geo = _geometry(cond, hz)
    spec = model.spectrum
    if cond.general_lighting and input_q == "irradiance":
        from uvcheck.photometry import v_lambda
        from uvcheck.spectrum import integrate

        model.functional("lum", 360.0, 830.0, v_lambda())
        ev["_v_ok"] = integrate(spec, 360.0, 830.0, v_lambda()).coverage >= _V_COMPLETE
    out: dict[str, dict] = {}
    group_idx: dict[str, np.ndarray] = {}
    guard_idx: dict[str, int] = {}
    g_mc = _hazard_distance_factor(model, cond, ev, draws)
    for h in hz.hazards:
        base = {"symbol": h.symbol, "unit": h.unit, "status": h.status, "value": _num(h.value),
                "interval_95": None, "interval_is_lower_bound": False, "mean": None,
                "standard_uncertainty": None, "relative_standard_uncertainty": None,
                "standard_uncertainty_first_order": None, "budget_first_order": None,
                "t_max_s": _num(h.t_max_s), "t_max_interval_95_s": None, "t_max_note": None,
                "risk_group": h.risk_group, "risk_group_probability": None,
                "lower_bound_group_probability": None, "borderline": None,
                "boundaries_within_interval": [], "risk_group_by_rule": None,
                "risk_group_guarded": None, "note": None}
        if h.status in ("not-assessable", "not-applicable") or h.value is None:
            base["note"] = "not evaluated: the hazard itself could not be assessed"
            out[h.id] = base
            continue
        if h.detection_limit is not None and h.value < h.detection_limit:
            # a partly measured hazard whose measured part is below the detection limit: the
            # figure is "< limit so far", and an interval around noise (often negative) would
            # read as a measurement
            base["value"] = None
            base["note"] = (f"not evaluated: below the detection limit (< {sig(h.detection_limit)} "
                            f"{h.unit} over the measured part)")
            out[h.id] = base
            continue
        entry = next((e for e in lset.variants(h.id) if e.symbol == h.symbol), None)
        if entry is None:  # pragma: no cover - the symbol always names a variant
            base["note"] = "internal: limit entry not found"
            out[h.id] = base
            continue
        key = _sig_key(entry)
        lo, hi = entry.range_nm
        model.functional(key, lo, hi, entry.weight())
        alpha = h.alpha_rad

        def fac(fov: float | None, entry: HazardLimits = entry) -> float:
            v = geo.factor(entry.quantity, fov)
            return 0.0 if v is None else v

        if geo.factor(entry.quantity, None) is None or (
                entry.depends_on_alpha and alpha is None):
            base["note"] = ("not evaluated: no emission in the hazard's range, and without the "
                            "source size there is no geometry factor to propagate")
            out[h.id] = base
            continue
        gl = entry.group_limits(alpha) if (entry.groups and h.group_limits) else []
        F = [fac(fov) for (_, _, _, fov) in gl]
        limits = [lim for (_, lim, _, _) in gl]
        F0 = F[0] if gl else fac(None)
        irr_input = input_q == "irradiance"

        def model_fn(dr: _Draws, key: str = key, F0: float = F0) -> np.ndarray:
            g = _hazard_distance_factor(model, cond, ev, dr) if irr_input else np.ones(dr.m)
            return model.integral(key, dr) * g * F0

        x_nom = model.nominal(key)
        S = model.integral(key, draws) * (g_mc if irr_input else 1.0)   # scaled integral
        vals = S * F0
        below = h.status == "below-detection"
        nominal_value = x_nom * F0 if not below else (h.value_estimate if h.value_estimate
                                                      is not None else x_nom * F0)
        summ = _summary(vals, nominal_value)
        base.update(summ)
        base["value"] = _num(h.value)
        if below:
            base["value_estimate"] = _num(nominal_value)
        sigma_term = model.sigma * model.functionals[key]._row(0.0)[-1] * F0
        u1, budget = _gum_u(model_fn, inputs, cond.measurement_distance_m, model.stray_allowance,
                            sigma_term)
        base["standard_uncertainty_first_order"] = _num(u1)
        base["budget_first_order"] = {k: _num(v) for k, v in budget.items()}
        s_lo, s_hi = coverage_interval(S)

        def tmax(s: float) -> tuple[float | None, str | None]:
            return entry.t_max(lambda fov: s * fac(fov), alpha)

        t_lo, n_lo = tmax(s_hi)
        t_hi, n_hi = tmax(s_lo)
        if below:
            base["note"] = ("below the detection limit: the interval is that of the raw "
                            "estimate; no group probabilities (the group is an upper bound "
                            "from the detection limit)")
        else:
            base["t_max_interval_95_s"] = [_num(t_lo), _num(t_hi)]
            notes = []
            if t_hi is None:
                notes.append("upper end: " + (n_hi or "no time limit"))
            if h.status == "partial":
                notes.append("from a lower bound of the value: the times are upper bounds")
            base["t_max_note"] = "; ".join(notes) or None
        if gl and not below:
            idx = _group_index([S * f for f in F], limits)
            probs = _probabilities(idx)
            i_lo = int(_group_index([np.array([s_lo * f]) for f in F], limits)[0])
            i_hi = int(_group_index([np.array([s_hi * f]) for f in F], limits)[0])
            base["borderline"] = i_lo != i_hi
            base["boundaries_within_interval"] = [f"{GROUPS[i]}/{GROUPS[i + 1]}"
                                                  for i in range(i_lo, i_hi)]
            # guarded acceptance: a group is accepted only when the value is below its upper
            # limit by U, i.e. the group of the interval's upper end; never a lower group than
            # the measured value's (the pedestal subtraction can put the interval below it)
            nom_i = GROUPS.index(h.risk_group) if h.risk_group in GROUPS else 0
            g_i = max(i_hi, nom_i)
            base["risk_group_guarded"] = GROUPS[g_i]
            by_rule = GROUPS[g_i] if rule == "guarded" else h.risk_group
            base["risk_group_by_rule"] = by_rule
            guard_idx[h.id] = g_i
            if h.status == "partial":
                base["interval_is_lower_bound"] = True
                base["lower_bound_group_probability"] = probs
                base["note"] = ("partly measured: the value and its interval are lower bounds; "
                                "the probabilities are those of 'at least' each group")
            else:
                base["risk_group_probability"] = probs
            group_idx[h.id] = idx
        elif h.status == "partial":
            base["interval_is_lower_bound"] = True
            base["note"] = "partly measured: the value and its interval are lower bounds"
        out[h.id] = base
    overall = None
    if group_idx:
        stack = np.vstack(list(group_idx.values()))
        ov = np.max(stack, axis=0)
        nom = hz.risk_group
        nom_i = GROUPS.index(nom.group) if nom.group in GROUPS else 0
        guard_i = max([nom_i] + list(guard_idx.values()))
        guarded_by = nom.governing
        if guard_i > nom_i:   # the first hazard (in the evaluation's order) that sets it
            guarded_by = next(k for k, v in guard_idx.items() if v == guard_i)
        by_rule = GROUPS[guard_i] if rule == "guarded" else nom.group
        iv_lo = int(np.sort(ov)[coverage_indices(ov.size)[0]])
        iv_hi = int(np.sort(ov)[coverage_indices(ov.size)[1]])
        overall = {"risk_group": nom.group, "is_lower_bound": nom.is_lower_bound,
                   "risk_group_probability": _probabilities(ov),
                   "borderline": any(out[h]["borderline"] for h in group_idx),
                   "risk_group_range_95": [GROUPS[iv_lo], GROUPS[iv_hi]],
                   "decision_rule": rule,
                   "risk_group_by_rule": by_rule,
                   "governing_by_rule": guarded_by if rule == "guarded" else nom.governing,
                   "risk_group_simple": nom.group,
                   "risk_group_guarded": GROUPS[guard_i],
                   "governing_guarded": guarded_by,
                   "note": ("the worst hazard per draw; 'at least' probabilities where the "
                            "overall group is a lower bound" if nom.is_lower_bound else
                            "the worst hazard per draw")}
    return out, overall


# ---------------------------------------------------------------------------------------------
# Germicidal
# ---------------------------------------------------------------------------------------------

def organism_time_intervals(organism: Any, irradiance_W_m2: np.ndarray, seed: int,
                            spread: bool = True, nominal_times_s: Mapping[float, Any] | None = None,
                            percents: Sequence[float] = PERCENTS) -> dict[str, Any]:
    """95 % intervals of the times to each percent reduction, from irradiance draws.

    organism : a row of the organism table (:func:`uvcheck.inactivation.get_organism`).
    irradiance_W_m2 : draws of the equivalent irradiance at the row's wavelength. [W m⁻²]
    seed : seed of the organism-data stream (one stream per row id).
    spread : draw the dose per log log-uniformly within the row's range across studies
        (:meth:`~uvcheck.inactivation.Organism.dose_range_for_log`), one draw per row shared
        by every percent; otherwise (or without a range) the row's own dose.
    Returns ``time_to_<p>_s`` (nominal, if given), ``time_to_<p>_interval_95_s`` and
    ``dose_to_<p>_interval_95_J_m2`` for p in 90, 99, 99_9, and ``organism_spread``. [s], [J m⁻²]
    """
    from uvcheck.inactivation import log_for_percent

    irr = np.asarray(irradiance_W_m2, dtype=float)
    rng = np.random.default_rng(np.random.SeedSequence(
        entropy=int(seed), spawn_key=(11, zlib.crc32(organism.id.encode()))))
    uu = rng.uniform(0.0, 1.0, irr.size)
    out: dict[str, Any] = {}
    used = False
    for p in percents:
        n = log_for_percent(p)
        dose = organism.dose_for_log(n)
        tag = f"{p:g}".replace(".", "_")
        out[f"time_to_{tag}_s"] = None if nominal_times_s is None else _num(nominal_times_s.get(p))
        if dose is None:
            out[f"time_to_{tag}_interval_95_s"] = None
            out[f"dose_to_{tag}_interval_95_J_m2"] = None
            continue
        rng_d = organism.dose_range_for_log(n) if spread else None
        if rng_d is not None and rng_d[1] > rng_d[0] > 0:
            la, lb = math.log(rng_d[0]), math.log(rng_d[1])
            dd = np.exp(la + uu * (lb - la))
            used = True
        else:
            dd = np.full(irr.size, dose)
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(irr > 0, dd / np.where(irr > 0, irr, 1.0), np.inf)
        out[f"time_to_{tag}_interval_95_s"] = [_num(v) for v in coverage_interval(t)]
        out[f"dose_to_{tag}_interval_95_J_m2"] = [_num(v) for v in coverage_interval(dd)]
    out["organism_spread"] = ("dose per log drawn log-uniformly within the range across studies"
                              if used else "no range across studies in the table (or spread "
                              "off): lamp inputs only")
    return out


def _germicidal_section(model: _Model, cond: Conditions, gr: Any, inputs: UncertaintyInputs,
                        draws: _Draws, organisms: Sequence[str] | None = None) -> dict[str, Any]:
    from uvcheck.germicidal import (FAR_UVC_BAND_NM, UVC_BAND_NM, VIOLET_BLUE_ID, spans_the_output,
                                    action_spectrum)
    from uvcheck.inactivation import get_organism

    spec = model.spectrum
    pos = gr.position
    pf = 1.0
    if pos.scaling and pos.scaling.get("factor") is not None:
        pf = float(pos.scaling["factor"])
    d0 = cond.measurement_distance_m
    dist_applies = spec.quantity == "irradiance" and d0 is not None

    def g_of(dr: _Draws) -> np.ndarray:
        if not dist_applies or dr.d0 is None:
            return np.ones(dr.m)
        return np.asarray(scale_factor(dr.d0, d0, cond.emitter, cond.tube_length_m,
                                       cond.source_size_m), dtype=float)

    g_mc = g_of(draws)
    out: dict[str, Any] = {"unit": gr.unit,
                           "position_m": _num(pos.distance_m),
                           "distance_model": (f"{cond.emitter} emitter model (geometry.scale_factor)"
                                              if dist_applies else "not applied")}

    def reading(rd: Any, key: str, lo: float, hi: float, weight: Weight | None
                ) -> tuple[dict[str, Any], np.ndarray | None]:
        if rd.value is None:
            return ({"value": None, "status": rd.status, "interval_95": None,
                     "note": f"no interval: the reading is {rd.status}"}, None)
        model.functional(key, lo, hi, weight)
        y = model.integral(key, draws) * g_mc * pf

        def mf(dr: _Draws) -> np.ndarray:
            return model.integral(key, dr) * g_of(dr) * pf

        d = {"status": rd.status, **_summary(y, model.nominal(key) * pf)}
        d["value"] = _num(rd.value)
        sig_term = model.sigma * model.functionals[key]._row(0.0)[-1] * pf
        u1, budget = _gum_u(mf, inputs, d0 if dist_applies else None, model.stray_allowance,
                            sig_term)
        d["standard_uncertainty_first_order"] = _num(u1)
        d["budget_first_order"] = {k: _num(v) for k, v in budget.items()}
        d["interval_is_lower_bound"] = rd.status == "partial"
        return d, y

    out["uvc"], y_uvc = reading(gr.uvc, "band:uvc", *UVC_BAND_NM, None)
    out["far_uvc"], _ = reading(gr.far_uvc, "band:far_uvc", *FAR_UVC_BAND_NM, None)
    eff_draws: dict[str, np.ndarray] = {}
    for e in gr.effective:
        w = action_spectrum(e.reading.id)
        if e.reading.value is None:
            continue
        model.functional("act:" + e.reading.id, *w.range_nm, w)
        eff_draws[e.reading.id] = model.integral("act:" + e.reading.id, draws) * g_mc * pf
    vb = gr.violet_blue
    vb_draw = None
    if vb.reading.value is not None:
        w = action_spectrum(VIOLET_BLUE_ID)
        model.functional("act:" + VIOLET_BLUE_ID, *w.range_nm, w)
        vb_draw = model.integral("act:" + VIOLET_BLUE_ID, draws) * g_mc * pf
    eq = {}
    s_ref = {e.reading.id: e.weight_at_reference for e in gr.effective}
    spans = {e.reading.id: spans_the_output(e) for e in gr.effective}  # as spread_254
    eqs = {a: y / s_ref[a] for a, y in eff_draws.items() if s_ref[a] > 0 and spans[a]}
    if eqs:
        mat = np.vstack(list(eqs.values()))
        spread = gr.spread_254()
        eq["most_favourable"] = _summary(np.max(mat, axis=0), spread["most_favourable"])
        eq["least_favourable"] = _summary(np.min(mat, axis=0), spread["least_favourable"])
        eq["note"] = ("254-nm-equivalent E_eff/s(253.7 nm): per draw the largest and smallest "
                      "over the action spectra")
    else:
        eq = {"most_favourable": None, "least_favourable": None,
              "note": "no interval: no action-spectrum reading has a value"}
    out["equivalent_254"] = eq

    # inactivation times: the most susceptible organisms, and any rows asked for
    def irradiance_draws(o: Any) -> np.ndarray | None:
        if o.pathway == "violet_blue":
            w = action_spectrum(VIOLET_BLUE_ID)
            s_o = float(w(np.array([o.wavelength_nm]))[0])
            return None if (vb_draw is None or not s_o > 0) else vb_draw / s_o
        cand = []
        for a, y in eff_draws.items():
            s_o = float(action_spectrum(a)(np.array([o.wavelength_nm]))[0])
            if s_o > 0:
                cand.append(y / s_o)
        return np.max(np.vstack(cand), axis=0) if cand else None

    def entry_for(o: Any, est: Any) -> dict[str, Any]:
        e: dict[str, Any] = {"organism_id": o.id, "organism": o.organism, "medium": o.medium,
                             "wavelength_nm": o.wavelength_nm,
                             "times_are": None if est is None else est.times_are}
        irr = irradiance_draws(o)
        if irr is None:
            e["irradiance_interval_95_W_m2"] = None
            e["note"] = "no interval: the lamp's reading for this pathway is an upper bound or missing"
            return e
        e["irradiance_interval_95_W_m2"] = [_num(v) for v in coverage_interval(irr)]
        e.update(organism_time_intervals(o, irr, draws.rng_seed or 0, inputs.organism_spread,
                                         None if est is None else est.times_s))
        return e

    times: dict[str, Any] = {}
    for pathway, by_medium in (gr.most_susceptible or {}).items():
        for medium, est in by_medium.items():
            if est is not None:
                times[f"{pathway}/{medium}"] = entry_for(est.organism, est)
    named: dict[str, Any] = {}
    for oid in organisms or ():
        o = get_organism(oid)
        named[oid] = entry_for(o, gr.estimate_for(o))
    out["inactivation"] = named
    out["inactivation_most_susceptible"] = times
    out["note"] = ("the organism is the nominal most susceptible one; in some draws another "
                   "row could be faster. Times use the favourable equivalent irradiance, as the "
                   "germicidal section does. Reciprocity is assumed.")
    return out


# ---------------------------------------------------------------------------------------------
# Entry point
# ---------------------------------------------------------------------------------------------

def evaluate_uncertainty(spectrum: Spectrum, conditions: Conditions | None, hazards_result: Any,
                         germicidal_result: Any = None, inputs: UncertaintyInputs | None = None,
                         draws: int | None = None, seed: int | None = None,
                         organisms: Sequence[str] | None = None) -> UncertaintyResult:
    """Monte Carlo uncertainty of every hazard value, time, group and germicidal figure.

    spectrum : the spectrum as measured (at the measurement position), the one that
        ``hazards_result`` and ``germicidal_result`` were computed from.
    conditions : the same conditions (measurement distance, general lighting, emitter model).
    hazards_result : :func:`uvcheck.hazards.evaluate_hazards` output (or None to skip).
    germicidal_result : :func:`uvcheck.germicidal.evaluate_germicidal` output (or None).
    inputs : input uncertainties; default :func:`default_inputs`.
    draws : number of Monte Carlo draws M (default 4000, from the defaults file). [-]
    seed : seed of the random streams (default from the defaults file); the same seed gives
        byte-identical output.
    organisms : organism ids whose time intervals to add under ``germicidal.inactivation``
        (the most susceptible rows are always given).

    Returns an :class:`UncertaintyResult`; ``to_dict()`` per hazard gives ``interval_95``
    [hazard unit], ``t_max_interval_95_s`` [s] (an upper end None means no limit is reached),
    ``risk_group_probability`` {Exempt, RG1, RG2, RG3}, ``borderline`` (the 95 % interval
    spans a group boundary), ``standard_uncertainty`` (Monte Carlo) and
    ``standard_uncertainty_first_order`` with its budget (the GUM cross-check).

    Examples
    --------
    >>> from uvcheck.spectrum import Line
    >>> from uvcheck.hazards import evaluate_hazards
    >>> lamp = Spectrum([], [], "irradiance", lines=[Line(253.7, 0.01)], covered_nm=(180.0, 3000.0))
    >>> cond = Conditions(measurement_distance_m=0.2)
    >>> r = evaluate_uncertainty(lamp, cond, evaluate_hazards(lamp, cond), draws=2000, seed=1)
    >>> h = r.to_dict()["hazards"]["actinic_uv"]
    >>> h["risk_group"], h["borderline"], round(h["risk_group_probability"]["RG2"], 2)
    ('RG2', False, 1.0)
    """
    cond = conditions if conditions is not None else Conditions()
    inputs = inputs or default_inputs()
    d_draws, d_seed = default_method()
    m = int(draws if draws is not None else d_draws)
    sd = int(seed if seed is not None else d_seed)
    if m < 100:
        raise ConfigurationError(f"at least 100 draws are needed for a 95 % interval, got {m}")
    method = {"name": "Monte Carlo propagation of distributions", "source": _SOURCES["mcm"],
              "draws": m, "seed": sd, "coverage_probability": COVERAGE,
              "interval": "probabilistically symmetric, from the sorted draws",
              "correlation_model": (
                  "calibration: one factor per band and draw, fully correlated within a band, "
                  f"coefficient {inputs.calibration_correlation:g} between bands; wavelength: one "
                  "shift of the whole axis per draw; distance: one value per draw shared by "
                  "every quantity; stray light: one pedestal per draw; noise: independent "
                  "between samples and, for simplicity, between integrals; organism data: one "
                  "draw per organism shared by every percent reduction"),
              "cross_check": ("first-order propagation (" + _SOURCES["gum"] + ") in "
                              "'standard_uncertainty_first_order'; it matches the Monte Carlo "
                              "standard uncertainty where the model is close to linear"),
              "numerical_accuracy": ("an interval end is reproducible to about ±0.04 standard "
                                     f"uncertainties with {m} draws (binomial error of a 2.5 % "
                                     "quantile, derived for a normal output)"),
              "shift_grid_points": SHIFT_GRID_POINTS}
    rule_block = decision_rule_block(inputs.decision_rule)
    if spectrum.quantity == "relative":
        return UncertaintyResult("not-evaluated", "relative spectrum: no absolute values to "
                                 "attach an uncertainty to", MappingProxyType({}), None, None,
                                 inputs, MappingProxyType(method), MappingProxyType(rule_block),
                                 (SCREENING_NOTE,))
    inputs, scale_note = scaling_uncertainty(spectrum, inputs)
    inputs, repeat_note = repeat_uncertainty(spectrum, inputs)
    model = _Model(spectrum, inputs)
    dr = _monte_carlo_draws(inputs, cond.measurement_distance_m, model.stray_allowance, m, sd)
    notes = [SCREENING_NOTE] + [n for n in (scale_note, repeat_note) if n]
    if spectrum.noise_floor is None and inputs.include_noise:
        notes.append("no noise floor is known for this spectrum: sample noise is not included")
    if cond.measurement_distance_m is None:
        notes.append("no measurement distance: the distance uncertainty does not apply")
    if model.stray_capped:
        notes.append(f"the UV stray-light allowance ({sig(model.stray_nominal)} "
                     f"{spectrum.spectral_unit}) was capped at {sig(model.stray_allowance)}: the "
                     f"lowest median of {STRAY_WINDOW_SAMPLES} consecutive samples below "
                     f"{inputs.stray_light_below_nm:g} nm plus 3 standard errors of that median "
                     "(true spectral values are non-negative, so a larger pedestal would show)")
    method["stray_light_allowance"] = {"nominal": _num(model.stray_nominal),
                                       "used": _num(model.stray_allowance),
                                       "capped_by_data": model.stray_capped,
                                       "unit": spectrum.spectral_unit}
    if model.stray_allowance > 0:
        notes.append(f"UV stray-light allowance {sig(model.stray_allowance)} "
                     f"{spectrum.spectral_unit} below {inputs.stray_light_below_nm:g} nm, "
                     "subtracted as a pedestal drawn uniformly from 0 to the allowance: the "
                     "intervals of UV quantities extend below the measured value")
    if cond.alpha_rad is not None or cond.source_size_m is not None:
        notes.append("the source's angular subtense and the hazard variant are held at their "
                     "nominal values in every draw")
    hazards: dict[str, dict] = {}
    overall = None
    if hazards_result is not None:
        hazards, overall = _hazard_section(model, cond, hazards_result, inputs, dr,
                                           inputs.decision_rule)
    germ = None
    if germicidal_result is not None and germicidal_result.quantity in ("irradiance", "flux"):
        germ = _germicidal_section(model, cond, germicidal_result, inputs, dr, organisms)
    return UncertaintyResult("evaluated", None, MappingProxyType(hazards),
                             None if overall is None else MappingProxyType(overall),
                             None if germ is None else MappingProxyType(germ), inputs,
                             MappingProxyType(method), MappingProxyType(rule_block), tuple(notes))


# ---------------------------------------------------------------------------------------------
# Decision rules for the claims engine
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Decision:
    """A conformity decision on one requirement.

    verdict : ``pass`` (the requirement is met under the rule) or ``fail``.
    probability : conformance probability, P(true value meets the requirement). [-]
    basis : one line with the numbers and the rule.
    statement : the non-binary ILAC-G8 statement with w = U: ``pass``, ``conditional pass``,
        ``conditional fail`` or ``fail``.
    measured, needed : the measured value and the requirement (same unit).
    guard_band : w used by the rule (0 for simple acceptance). [same unit]
    expanded_uncertainty : U on the side of the limit (95 % coverage). [same unit]
    acceptance_limit : AL = needed ± w. [same unit]

    Unpacks as ``verdict, probability, basis = decide(...)``.
    """

    verdict: str
    probability: float | None
    basis: str
    statement: str
    rule: str
    direction: str
    measured: float
    needed: float
    guard_band: float
    expanded_uncertainty: float
    acceptance_limit: float

    def __iter__(self) -> Iterator[Any]:
        return iter((self.verdict, self.probability, self.basis))

    def to_dict(self) -> dict[str, Any]:
        return {"verdict": self.verdict, "probability": _num(self.probability),
                "basis": self.basis, "statement": self.statement, "rule": self.rule,
                "direction": self.direction, "measured": _num(self.measured),
                "needed": _num(self.needed), "guard_band": _num(self.guard_band),
                "expanded_uncertainty": _num(self.expanded_uncertainty),
                "acceptance_limit": _num(self.acceptance_limit)}


def _phi(x: float) -> float:
    return 0.5 * (1.0 + math.erf(x / math.sqrt(2.0)))


def decide(needed: float, available: Any, rule: str = "simple", guard_band: float | None = None,
           direction: str = "at_least", measured: float | None = None) -> Decision:
    """Decide whether a requirement is met, under a stated decision rule (ILAC-G8:09/2019).

    needed : the requirement: a limit (``at_most``: value ≤ needed, e.g. an exposure limit)
        or a need (``at_least``: value ≥ needed, e.g. a dose for 99.9 %).
    available : Monte Carlo draws (array), a 95 % interval ``(low, high)``, or a bare value
        (no uncertainty).
    rule : ``simple`` (w = 0, decide on the measured value; up to 50 % risk at the limit) or
        ``guarded`` (accept only when the measured value is beyond the limit by w).
    guard_band : w; default U, the expanded uncertainty for 95 % coverage on the side of the
        limit (measured value to the interval end; ≈ 2u for a normal distribution).
    direction : ``at_least`` | ``at_most``.
    measured : the measured value; default the median of the draws, the middle of the
        interval, or the bare value.

    The probability is the conformance probability (JCGM 106:2012, from memory): the share of
    draws meeting the requirement, or for an interval a normal distribution with
    u = width / (2 × 1.96).

    Examples
    --------
    >>> verdict, p, basis = decide(10.0, (9.0, 13.0), rule="simple", measured=11.0)
    >>> verdict, round(p, 3)
    ('pass', 0.836)
    >>> decide(10.0, (9.0, 13.0), rule="guarded", measured=11.0).verdict
    'fail'
    >>> decide(10.0, (9.0, 13.0), rule="guarded", measured=11.0).statement
    'conditional pass'
    """
    if rule not in DECISION_RULES:
        raise ConfigurationError(f"unknown decision rule {rule!r}; available: "
                                 f"{', '.join(DECISION_RULES)}")
    if direction not in DIRECTIONS:
        raise ConfigurationError(f"unknown direction {direction!r}; available: "
                                 f"{', '.join(DIRECTIONS)}")
    need = float(needed)
    up = direction == "at_least"
    samples = None
    if isinstance(available, (int, float)) and not isinstance(available, bool):
        y = float(available) if measured is None else float(measured)
        lo = hi = float(available)
        kind = "a value without uncertainty"
    else:
        arr = np.asarray(available, dtype=float)
        if arr.ndim == 1 and arr.size == 2 and not isinstance(available, np.ndarray):
            lo, hi = float(min(arr)), float(max(arr))
            y = 0.5 * (lo + hi) if measured is None else float(measured)
            kind = "a 95 % interval"
        else:
            samples = arr.ravel()
            if samples.size < 2:
                raise ConfigurationError("decide needs at least two draws, an interval or a value")
            lo, hi = coverage_interval(samples)
            y = median(samples) if measured is None else float(measured)
            kind = f"{samples.size} draws"
    if not all(math.isfinite(v) for v in (need, y, lo, hi)):
        raise ConfigurationError("decide needs finite values")
    U = max(y - lo, 0.0) if up else max(hi - y, 0.0)
    w = 0.0 if rule == "simple" else (U if guard_band is None else float(guard_band))
    if w < 0 or not math.isfinite(w):
        raise ConfigurationError(f"a guard band must be finite and >= 0, got {guard_band}")
    al = need + w if up else need - w
    meets = (lambda v: v >= need) if up else (lambda v: v <= need)
    ok = (y >= al) if up else (y <= al)
    # non-binary statement with w = U
    if (y - U >= need) if up else (y + U <= need):
        statement = "pass"
    elif meets(y):
        statement = "conditional pass"
    elif (y + (hi - y) >= need) if up else (y - (y - lo) <= need):
        statement = "conditional fail"
    else:
        statement = "fail"
    if samples is not None:
        p = float(np.mean(samples >= need)) if up else float(np.mean(samples <= need))
    elif hi > lo:
        u = (hi - lo) / (2.0 * 1.959964)
        z = (y - need) / u
        p = _phi(z) if up else _phi(-z)
    else:
        p = 1.0 if meets(y) else 0.0
    rel = "≥" if up else "≤"
    rname = "simple acceptance (w = 0)" if rule == "simple" else f"guarded acceptance (w = {sig(w)})"
    basis = (f"measured {sig(y)} (95 % interval {sig(lo)}–{sig(hi)}, from {kind}) against "
             f"{rel} {sig(need)}; {rname}: acceptance limit {sig(al)}; conformance probability "
             f"{p:.1%}; ILAC-G8:09/2019")
    return Decision("pass" if ok else "fail", p, basis, statement, rule, direction, y, need, w,
                    U, al)


# ---------------------------------------------------------------------------------------------
# Wiring helpers for the assessment and the terminal
# ---------------------------------------------------------------------------------------------

def merge_into(assessment_dict: dict[str, Any], result: UncertaintyResult) -> dict[str, Any]:
    """Add the per-hazard fields (:data:`MERGED_HAZARD_FIELDS`) to each ``hazards[id]`` entry,
    the ``uncertainty`` section, and one note stating the inputs and the decision rule.
    Changes and returns ``assessment_dict``."""
    d = assessment_dict
    u = result.to_dict()
    for hid, entry in (d.get("hazards") or {}).items():
        src = u["hazards"].get(hid)
        for k in MERGED_HAZARD_FIELDS:
            entry[k] = None if src is None else src.get(k)
    d["uncertainty"] = u
    if d.get("risk_group") is not None:
        apply_rule_to_risk_group(d["risk_group"], u)
    note = uncertainty_note(u)
    notes = d.setdefault("notes", [])
    if note not in notes:
        notes.append(note)
    return d


def apply_rule_to_risk_group(rg: dict[str, Any], u: Mapping[str, Any] | None) -> dict[str, Any]:
    """Make the ``risk_group`` entry follow the decision rule, and add the uncertainty's view.

    Under guarded acceptance ``group`` (and ``governing``) become the group the rule gives;
    ``group_simple`` keeps the measured values' group and ``group_guarded`` the guarded one
    whatever the rule, so a reader sees both. ``group_probability`` (``group_probability_is_
    at_least`` when the group is a lower bound), ``borderline`` and ``group_range_95`` come
    from the Monte Carlo; ``rule_note`` says in one sentence which rule the group follows and
    what the other gives. Every field of :data:`RISK_GROUP_FIELDS` is set (None when the
    uncertainty was not evaluated, e.g. ``u`` None). Changes and returns ``rg``.

    Examples
    --------
    >>> rg = {"group": "Exempt", "is_lower_bound": False, "governing": "actinic_uv",
    ...       "upper_bound": "Exempt", "note": "Exempt"}
    >>> ov = {"risk_group": "Exempt", "is_lower_bound": False, "borderline": True,
    ...       "risk_group_probability": {"Exempt": 0.6, "RG1": 0.4, "RG2": 0.0, "RG3": 0.0},
    ...       "risk_group_range_95": ["Exempt", "RG1"], "risk_group_guarded": "RG1",
    ...       "governing_guarded": "actinic_uv"}
    >>> u = {"status": "evaluated", "overall": ov, "decision_rule": {"rule": "guarded"}}
    >>> r = apply_rule_to_risk_group(rg, u)
    >>> r["group"], r["group_simple"], r["upper_bound"]
    ('RG1', 'Exempt', 'RG1')
    """
    for k in RISK_GROUP_FIELDS:
        rg.setdefault(k, None)
    if rg.get("group_simple") is None:
        rg["group_simple"] = rg.get("group")
    if not u or u.get("status") != "evaluated":
        return rg
    rule = (u.get("decision_rule") or {}).get("rule", "simple")
    rg["decision_rule"] = rule
    ov = u.get("overall")
    if not ov:
        rg["rule_note"] = ("no group probability: no hazard with risk groups has an interval; "
                           f"the group is that of the measured values ({_rule_name(rule)})")
        return rg
    simple = rg["group_simple"]
    guarded = ov.get("risk_group_guarded") or simple
    rg["group_guarded"] = guarded
    rg["group_probability"] = dict(ov.get("risk_group_probability") or {}) or None
    rg["group_probability_is_at_least"] = bool(ov.get("is_lower_bound"))
    rg["borderline"] = bool(ov.get("borderline"))
    rg["group_range_95"] = list(ov.get("risk_group_range_95") or []) or None
    at_least = "at least " if rg.get("is_lower_bound") else ""
    if rule == "guarded" and guarded in GROUPS and simple in GROUPS \
            and GROUPS.index(guarded) > GROUPS.index(simple):
        rg["group"] = guarded
        rg["governing"] = ov.get("governing_guarded") or rg.get("governing")
        if rg.get("upper_bound") in GROUPS and GROUPS.index(rg["upper_bound"]) < GROUPS.index(guarded):
            rg["upper_bound"] = guarded
        rg["rule_note"] = (f"{at_least}{guarded} by guarded acceptance (the decision rule chosen: "
                           f"a group is accepted only when the value is below its limit by the "
                           f"expanded uncertainty U); the measured values alone (simple "
                           f"acceptance) give {at_least}{simple}")
        if rg.get("note"):
            rg["note"] = f"{at_least}{guarded} by guarded acceptance; measured values: {rg['note']}"
    elif rule == "guarded":
        rg["rule_note"] = (f"{at_least}{simple} by guarded acceptance (the decision rule chosen); "
                           "the measured values alone (simple acceptance) give the same group")
    elif guarded != simple:
        rg["rule_note"] = (f"{at_least}{simple} by simple acceptance (the decision rule chosen: "
                           f"the group of the measured values); guarded acceptance (--decision-"
                           f"rule guarded) would give {at_least}{guarded}")
    else:
        rg["rule_note"] = (f"{at_least}{simple} by simple acceptance (the decision rule chosen); "
                           "guarded acceptance would give the same group")
    return rg


def _rule_name(rule: str) -> str:
    return "simple acceptance" if rule == "simple" else "guarded acceptance"


def uncertainty_note(u: Mapping[str, Any]) -> str:
    """The sentence for the note: method, inputs with their basis, decision rule."""
    if u.get("status") != "evaluated":
        return f"Uncertainty: not evaluated ({u.get('reason')})."
    m = u["method"]
    inp = u["inputs"]
    cal = ", ".join(f"{k} {100 * v:g} %" for k, v in inp["calibration"]["u_rel_by_band"].items())
    wl = inp["wavelength"]
    wl_t = ("±" if wl["distribution"] == "rectangular" else "") + f"{wl['value']:g} nm"
    di = inp["distance"]
    di_t = ("±" if di["distribution"] == "rectangular" else "") + (
        f"{100 * di['value']:g} %" if di["unit"] == "relative" else f"{1000 * di['value']:g} mm")
    st = inp["stray_light"]
    st_t = (f"{sig(st['level'])} per nm" if st.get("level") is not None else
            f"{100 * (st.get('fraction_of_peak') or 0):g} % of the spectral peak")
    alw = m.get("stray_light_allowance") or {}
    if alw.get("capped_by_data"):
        st_t += f" (capped by the data at {sig(alw['used'])} {alw['unit']})"
    given = [k for k in ("calibration", "wavelength", "distance", "stray_light", "scaling")
             if str((inp.get(k) or {}).get("basis", "")).startswith("given")]
    src = ("defaults (common practice, not from a document)" if not given else
           f"given for {', '.join(given)}; other inputs are defaults (common practice)")
    sc = inp.get("scaling") or {}
    sc_t = ""
    if sc.get("u_rel"):
        how = ("given" if str(sc.get("basis", "")).startswith("given")
               else "default, common practice")
        sc_t = f", scaling reading {100 * sc['u_rel']:.3g} % (k = 1, {how})"
    rp = inp.get("repeatability") or {}
    if rp.get("u_rel"):
        sc_t += f", repeatability of the scans {100 * rp['u_rel']:.3g} % (k = 1, type A)"
    return (f"Uncertainty: Monte Carlo, {m['draws']} draws, seed {m['seed']}, 95 % intervals; "
            f"inputs {src}: calibration {cal} (k = 1){sc_t}, wavelength scale {wl_t}, distance "
            f"{di_t}, UV stray light up to {st_t}; decision rule: {u['decision_rule']['name']}.")


def _fmt_iv(iv: Sequence[Any] | None) -> str:
    if not iv:
        return "—"
    return f"{sig(iv[0])}–{sig(iv[1])}"


def _fmt_t(iv: Sequence[Any] | None) -> str:
    if not iv:
        return "—"
    if iv[0] is None and iv[1] is None:
        return "no limit"
    lo = format_duration(iv[0]) if iv[0] is not None else "none"
    hi = format_duration(iv[1]) if iv[1] is not None else "no limit"
    return f"{lo}–{hi}"


def _fmt_p(p: Mapping[str, float] | None) -> str:
    if not p:
        return "—"
    parts = [f"{g} {100 * p[g]:.0f}%" for g in GROUPS if p.get(g, 0) >= 0.005]
    return ", ".join(parts) or "—"


def _table(headers: Sequence[str], rows: Sequence[Sequence[str]]) -> list[str]:
    cells = [list(headers)] + [list(r) for r in rows]
    widths = [max(len(r[i]) for r in cells) for i in range(len(headers))]
    out = []
    for k, r in enumerate(cells):
        out.append("  " + "  ".join(c.ljust(widths[i]) for i, c in enumerate(r)).rstrip())
        if k == 0:
            out.append("  " + "  ".join("-" * w for w in widths))
    return out


def render_uncertainty_lines(u: Mapping[str, Any], d: Mapping[str, Any] | None = None) -> list[str]:
    """Plain-text lines (no colour) for the terminal, from the ``uncertainty`` section
    (or a whole assessment dict holding one)."""
    if "uncertainty" in u and "method" not in u:
        u = u["uncertainty"]
    out = ["Measurement uncertainty"]
    if u.get("status") != "evaluated":
        return out + [f"  not evaluated: {u.get('reason')}"]
    m = u["method"]
    out.append(f"  Monte Carlo, {m['draws']} draws, seed {m['seed']}; 95 % coverage intervals "
               f"(first-order GUM propagation as a cross-check)")
    rows = []
    for hid, h in (u.get("hazards") or {}).items():
        if h.get("interval_95") is None or h.get("status") == "below-detection":
            continue  # (below detection: the JSON keeps the raw estimate's interval, with a note)
        lb = "≥ " if h.get("interval_is_lower_bound") else ""
        flag = "BORDERLINE " + ",".join(h["boundaries_within_interval"]) if h.get("borderline") else ""
        probs = h.get("risk_group_probability") or h.get("lower_bound_group_probability")
        rel = h.get("relative_standard_uncertainty")
        rows.append([h["symbol"], lb + sig(h["value"]), lb + _fmt_iv(h["interval_95"]), h["unit"],
                     "—" if rel is None or rel > 1 else f"{100 * rel:.2g} %",
                     _fmt_t(h.get("t_max_interval_95_s")),
                     ("at least: " if h.get("lower_bound_group_probability") else "") + _fmt_p(probs),
                     flag])
    if rows:
        heads = ["hazard", "value", "95 % interval", "unit", "u rel", "t_max 95 %",
                 "group probability", ""]
        if not any(r[-1] for r in rows):
            heads, rows = heads[:-1], [r[:-1] for r in rows]
        out += _table(heads, rows)
    ov = u.get("overall")
    if ov:
        out.append(f"  overall group {ov['risk_group']}: {_fmt_p(ov['risk_group_probability'])}"
                   + ("; borderline" if ov["borderline"] else "")
                   + (f"; by the decision rule: {ov['risk_group_by_rule']}"
                      if ov.get("risk_group_by_rule") else ""))
    g = u.get("germicidal")
    if g:
        uvc = g.get("uvc") or {}
        if uvc.get("interval_95"):
            lb = "≥ " if uvc.get("interval_is_lower_bound") else ""   # as the hazard rows
            out.append(f"  UV-C {lb}{sig(uvc['value'])} {g['unit']} "
                       f"(95 %: {lb}{_fmt_iv(uvc['interval_95'])})")
        mf = (g.get("equivalent_254") or {}).get("most_favourable")
        if mf:
            out.append(f"  254-nm-equivalent (most favourable) {sig(mf['value'])} {g['unit']} "
                       f"(95 %: {_fmt_iv(mf['interval_95'])})")
        ms = g.get("inactivation_most_susceptible") or {}
        shown = {k: v for k, v in ms.items() if k.startswith("uvc/")} or ms
        for label, e in shown.items():
            iv = e.get("time_to_99_9_interval_95_s")
            if iv:
                # the times carry the bound the organism table gives them (germicidal.times_are)
                b = e.get("times_are")
                out.append(f"  99.9 % of {e['organism']} ({label}): "
                           f"{bounded_duration(e.get('time_to_99_9_s'), b)} "
                           f"(95 %: {BOUND_SIGN.get(b or '', '')}{_fmt_t(iv)})")
    out.append(f"  Decision rule: {u['decision_rule']['statement']}")
    out.append(f"  {uncertainty_note(u)}")
    return out
