"""Germicidal output: UV-C, far-UVC, effective irradiance, efficiency, ozone, artefacts, doses.

``evaluate_germicidal(spectrum, conditions) -> GermicidalResult`` answers "how much germicidal
radiation does this lamp deliver here, and what can it do to microorganisms".

Quantities (band edges NOTES.md §4 and PRACTICE.md P0-4):

* UV-C = ∫ E dλ over 200–280 nm, the part of UV-C that travels through air (the CIE band is
  100–280 nm; 100–200 nm is vacuum UV, see :mod:`uvcheck.bands`); far-UVC over 200–235 nm;
* effective irradiance E_eff = ∫ E(λ)·s(λ) dλ with a named action spectrum s, and the
  254-nm-equivalent E_eff/s(253.7 nm), so that doses measured with the 253.7 nm mercury line
  apply (NOTES.md §4 writes s(254); 253.7 nm is used so that a pure mercury line gives back
  its own irradiance). Three readings are always given: ``germicidal_dna`` (DNA absorption,
  Kowalski 2009), ``germicidal_classical`` (three points from memory) and ``uvc_unweighted``
  (every UV-C watt counts alike). They are reported side by side with their spread; claims
  are judged with the most favourable to the lamp;
* the violet-blue pathway (≈405 nm): ∫ E·w dλ with ``violet_blue_405``, a reading favourable
  to the lamp; doses are about a thousand times those of UV-C (NOTES.md §4).

Honest results: a band that is not measured is ``not-covered`` (never 0); a partly measured
band is a lower bound; a band below its detection limit (3 σ of the band integral, from the
spectrum's noise floor, estimated from the data when the reader gave none) is
``below-detection`` and carries an upper bound; a UV-C "signal" that looks like stray light
or noise is ``likely-stray-light``, reported with its apparent value as an upper bound and
never as germicidal output. A relative spectrum gives shape results only.

Numpy only at import time (this module is on the ``uvcheck assess`` path).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property, lru_cache
from typing import Any, Iterable, Mapping

import numpy as np

from uvcheck.conditions import Conditions
from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError
from uvcheck.features import estimate_noise, known_lines, peak_info
from uvcheck.geometry import (distance_scaling, far_field_deviation, flux_from_irradiance,
                              irradiance_per_watt)
from uvcheck.inactivation import (InactivationEstimate, Organism, estimate, get_organism,
                                  most_susceptible)
from uvcheck.inactivation import organisms as organism_table
from uvcheck.spectrum import (Integral, Spectrum, integrate, is_nominal, median, quantile, restricted, scaled,
                              total_integral)
from uvcheck.units import sig, to_trade
from uvcheck.weighting import Weighting, constant_weighting, get_weighting

UVC_BAND_NM = (200.0, 280.0)
#: How a no-UV-C statement starts ("No germicidal UV-C: <why>."); see
#: :meth:`GermicidalResult.statement_clause`.
NO_UVC_HEAD = "No germicidal UV-C:"
FAR_UVC_BAND_NM = (200.0, 235.0)
#: Ozone: oxygen absorbs below about 240 nm (NOTES.md §4, PRACTICE.md §4-6).
OZONE_EDGE_NM = 240.0
#: The ozone check covers the 184.9 nm mercury line when the data start at or below this. [nm]
OZONE_LINE_COVERED_NM = 184.0
#: Doses in the table were measured with the 253.7 nm mercury line. [nm]
REFERENCE_WAVELENGTH_NM = 253.7
ACTION_SPECTRA = ("germicidal_dna", "germicidal_classical", "uvc_unweighted")
VIOLET_BLUE_ID = "violet_blue_405"
VIOLET_BLUE_REFERENCE_NM = 405.0
#: Statuses under which the lamp is shown to emit germicidal UV-C (``partial``: found, with part
#: of the band not measured, so the figures are lower bounds).
UVC_EMITTING = ("germicidal-uvc", "partial")

#: Heuristic thresholds (ours unless a source is named).
NO_UVC_FRACTION = 1e-3          # UV-C under 0.1 % of the measured output: "essentially no UV-C"
PEDESTAL_MAX_RELATIVE = 0.01    # a flat UV-C level under 1 % of the peak above 280 nm: typical
                                # stray-light levels of compact array spectrometers are about
                                # 0.01-1 % (from memory)
PEDESTAL_FLATNESS = 2.0         # no UV-C sample reaches twice the band's median: flat
BASELINE_QUANTILE = 0.05        # the floor of a spectrum outside UV-C: its 5th percentile
BASELINE_MATCH = 1.5            # a flat UV-C level within 1.5× that floor is the floor (ours)
FEATURE_SNR = 5.0               # 5 σ: the threshold features.find_lines uses for a feature
LINE_TOLERANCE_NM = 2.0         # wavelength calibration of compact spectrometers ±1-2 nm (from memory)
MIN_SIGNIFICANT_SHARE = 0.01    # ozone band "present": above 1 % of the UV-C (or of the total)
CROSS_WAVELENGTH_NM = 10.0      # organism data this far from the lamp's UV-C peak are flagged
TRANSFERRED = "transferred by the action spectrum"  # how a basis says so (cross_wavelength_note)
# stray light needs a source to scatter: a UV-C feature is read as stray light only when the
# output outside UV-C is at least this many times the apparent UV-C (ours: the reciprocal of
# PEDESTAL_MAX_RELATIVE, the upper end of typical stray-light levels; from memory)
STRAY_SOURCE_MIN_RATIO = 1.0 / PEDESTAL_MAX_RELATIVE

SCREENING_NOTE = ("Screening assessment, not a certification: it does not establish efficacy "
                  "against a specific pathogen on a specific surface, and exposure figures "
                  "defer to local codes and licensed practice.")


# ---------------------------------------------------------------------------------------------
# Data: technologies and action spectra
# ---------------------------------------------------------------------------------------------

@lru_cache(maxsize=1)
def technologies() -> Mapping[str, dict]:
    """Emitter technologies from ``data/technologies.toml`` (loaded once)."""
    return read_toml("technologies.toml")


def get_technology(technology_id: str) -> dict:
    techs = technologies()
    if technology_id not in techs:
        raise ConfigurationError(f"unknown technology {technology_id!r}; available: "
                                 f"{', '.join(sorted(techs))}")
    return techs[technology_id]


@lru_cache(maxsize=None)
def action_spectrum(action_id: str) -> Weighting:
    """A germicidal action spectrum by id: the two registered curves or unweighted UV-C."""
    if action_id == "uvc_unweighted":
        return constant_weighting("uvc_unweighted", "Unweighted UV-C 200–280 nm", *UVC_BAND_NM,
                                  provenance={"source": "definition: every UV-C watt counts alike",
                                              "from_memory": "none"})
    if action_id not in ACTION_SPECTRA and action_id != VIOLET_BLUE_ID:
        raise ConfigurationError(f"unknown action spectrum {action_id!r}; available: "
                                 f"{', '.join(ACTION_SPECTRA + (VIOLET_BLUE_ID,))}")
    return get_weighting(action_id)


def _from_memory(w: Weighting) -> bool:
    fm = str(w.provenance.get("from_memory", "none")).lower()
    return fm.startswith("all") or "from memory" in str(w.provenance.get("digits_from", "")).lower()


# ---------------------------------------------------------------------------------------------
# Result types
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Reading:
    """A band or weighted integral at the evaluation position.

    id, name : what was integrated.
    range_nm : integration limits. [nm]
    value : the integral [``unit``]; None when not covered, below detection, likely stray
        light or relative.
    unit : ``W m-2`` (irradiance), ``W`` (flux), ``W m-2 sr-1`` (radiance) or ``relative``.
    status : ``complete`` | ``partial`` (value is a lower bound) | ``not-covered`` |
        ``below-detection`` | ``likely-stray-light`` | ``shape-only``.
    coverage : share of the band (of the weighting's area) that was measured. [-]
    detection_limit : 3 σ of the integral. [``unit``]
    upper_bound : the favourable reading where ``value`` is None: apparent value + 3 σ. [``unit``]
    fraction : share of the measured total (also for relative spectra). [-]
    apparent : the integral as computed, whatever the status (for diagnostics). [``unit``]
    """

    id: str
    name: str
    range_nm: tuple[float, float]
    value: float | None
    unit: str
    status: str
    coverage: float
    detection_limit: float | None
    upper_bound: float | None
    fraction: float | None
    apparent: float

    def favourable(self) -> float | None:
        """The reading to use with the benefit of the doubt. [``unit``]"""
        return self.value if self.value is not None else self.upper_bound

    def to_dict(self) -> dict:
        trade, label = to_trade(self.value, self.unit)
        ub, _ = to_trade(self.upper_bound, self.unit)
        return {"id": self.id, "name": self.name, "range_nm": list(self.range_nm),
                "value": self.value, "unit": self.unit, "status": self.status,
                "is_lower_bound": self.status == "partial", "coverage": self.coverage,
                "detection_limit": self.detection_limit, "upper_bound": self.upper_bound,
                "fraction": self.fraction, "value_trade": trade, "upper_bound_trade": ub,
                "trade_unit": label}


@dataclass(frozen=True)
class EffectiveReading:
    """Effective irradiance with one action spectrum, and its reference-wavelength equivalent.

    reading : the weighted integral E_eff. [unit]
    reference_nm : wavelength of the equivalent (253.7 nm for UV-C, 405 nm violet-blue). [nm]
    weight_at_reference : s(reference). [-]
    equivalent : E_eff / s(reference), or None. [unit]
    equivalent_upper_bound : the same for the favourable reading. [unit]
    defined_share : share of the lamp's UV-C (violet-blue: 380–500 nm) output inside the
        action spectrum's defined range; below 1 the spectrum credits only part of it. [-]
    from_memory : the action spectrum's values were not read in a document.
    """

    reading: Reading
    reference_nm: float
    weight_at_reference: float
    equivalent: float | None
    equivalent_upper_bound: float | None
    defined_share: float | None
    from_memory: bool

    def equivalent_at(self, wavelength_nm: float, favourable: bool = True) -> float | None:
        """E_eff / s(λ): the irradiance at λ with the same effect, by this spectrum. [unit]"""
        s = action_spectrum(self.reading.id).at(wavelength_nm)
        v = self.reading.favourable() if favourable else self.reading.value
        if v is None or not s > 0:
            return None
        return v / s

    def to_dict(self) -> dict:
        d = self.reading.to_dict()
        d.update({"reference_nm": self.reference_nm,
                  "weight_at_reference": self.weight_at_reference,
                  "equivalent": self.equivalent,
                  "equivalent_upper_bound": self.equivalent_upper_bound,
                  "defined_share": self.defined_share, "from_memory": self.from_memory})
        return d


#: Artefact kinds that leave the UV-C undecided rather than read it as stray light.
UNDECIDED_KINDS = frozenset({"data-edge"})


@dataclass(frozen=True)
class Artefact:
    """A reason to read an apparent UV-C signal as stray light or noise.

    kind : ``pedestal`` | ``noise-floor`` | ``no-emitter`` | ``data-edge`` (the signal is
        highest where data that start inside UV-C begin: emission below them or stray light,
        undecided; the readings keep their measured values).
    detail : what was seen, with numbers.
    """

    kind: str
    detail: str

    @property
    def is_stray(self) -> bool:
        """A reason to read the UV-C as stray light or noise; ``data-edge`` is undecided."""
        return self.kind not in UNDECIDED_KINDS

    def to_dict(self) -> dict:
        return {"kind": self.kind, "detail": self.detail}


@dataclass(frozen=True)
class Efficiency:
    """UV-C conversion efficiency: UV-C watts per electrical watt, next to the technology's range.

    status : ``computed`` | ``upper-bound`` | ``not-computed``.
    uvc_flux_W : UV-C flux, measured (flux spectrum) or estimated from the irradiance with the
        emitter model. [W]
    efficiency : UV-C W per electrical W. [-]
    verdict : ``within`` | ``below-range`` | ``above-range`` | ``implausible`` (above the
        technology's flag) | None.
    """

    status: str
    electrical_power_W: float | None
    uvc_flux_W: float | None
    flux_basis: str | None
    efficiency: float | None
    technology: str | None
    range: dict | None
    verdict: str | None
    note: str

    def to_dict(self) -> dict:
        return {"status": self.status, "electrical_power_W": self.electrical_power_W,
                "uvc_flux_W": self.uvc_flux_W, "flux_basis": self.flux_basis,
                "efficiency": self.efficiency, "technology": self.technology,
                "range": self.range, "verdict": self.verdict, "note": self.note}


@dataclass(frozen=True)
class Ozone:
    """Output below 240 nm (where oxygen absorbs and ozone forms).

    status : ``present`` | ``absent`` | ``unknown``.
    basis : ``measured`` | ``modelled`` (a nominal spectrum) | ``stated`` (a nominal spectrum whose
        output below 240 nm the listing states) | ``technology`` | ``not-measurable``.
    below_240 : the measured integral over [data start, 240) nm (None if not covered). [unit]
    checked_nm : the wavelengths looked at. [nm]
    covers_185nm : the data reach the 184.9 nm mercury line.
    """

    status: str
    basis: str
    below_240: float | None
    unit: str
    checked_nm: tuple[float, float] | None
    covers_185nm: bool
    note: str

    def to_dict(self) -> dict:
        return {"status": self.status, "basis": self.basis, "below_240": self.below_240,
                "unit": self.unit,
                "checked_nm": None if self.checked_nm is None else list(self.checked_nm),
                "covers_185nm": self.covers_185nm, "note": self.note}


@dataclass(frozen=True)
class Position:
    """Where the figures apply.

    distance_m : distance from the lamp, None if unknown (or a flux: no position). [m]
    basis : ``measurement position`` (``position of the estimate`` for a nominal spectrum), a
        scaling description, or ``flux``.
    scaling : the distance scaling used (model, factor, regime, note), or None.
    """

    distance_m: float | None
    basis: str
    scaling: dict | None

    def to_dict(self) -> dict:
        return {"distance_m": self.distance_m, "basis": self.basis, "scaling": self.scaling}


@dataclass(frozen=True)
class GermicidalResult:
    """Everything germicidal about one spectrum at one position (see :func:`evaluate_germicidal`).

    status : ``germicidal-uvc`` | ``partial`` (UV-C found, part of UV-C not measured) |
        ``no-uvc`` | ``not-assessed`` (UV-C not or hardly measured) | ``shape-only``.
    statement : the plain-language summary.
    quantity, unit : the spectrum's quantity and the unit of every ``value`` below.
    """

    status: str
    statement: str
    quantity: str
    unit: str
    position: Position
    uvc: Reading
    far_uvc: Reading
    effective: tuple[EffectiveReading, ...]
    violet_blue: EffectiveReading
    efficiency: Efficiency
    ozone: Ozone
    artefacts: tuple[Artefact, ...]
    technology: dict
    noise: dict
    organisms: "OrganismPlan"
    notes: tuple[str, ...] = field(default_factory=tuple)

    # --- doses and times: computed on first use (a batch summary needs none of them) --------
    @cached_property
    def _organism_results(self) -> tuple[tuple[InactivationEstimate, ...],
                                         Mapping[str, Mapping[str, InactivationEstimate | None]]]:
        return self.organisms.evaluate()

    @property
    def inactivation(self) -> tuple[InactivationEstimate, ...]:
        """Doses and times for every organism row of the pathways this lamp has."""
        return self._organism_results[0]

    @property
    def most_susceptible(self) -> Mapping[str, Mapping[str, InactivationEstimate | None]]:
        """Per pathway (``uvc``, ``violet_blue``) and medium, the most susceptible relevant
        organism's estimate (None where no row gives a time)."""
        return self._organism_results[1]

    # --- questions the claims engine asks -------------------------------------------------
    def statement_clause(self, keep_head: bool = False) -> str:
        """The statement as a clause that can sit inside a one-line basis: without its
        closing full stop and (unless ``keep_head``) without the leading
        :data:`NO_UVC_HEAD` of a no-UV-C statement."""
        s = self.statement.strip()
        if not keep_head and s.startswith(NO_UVC_HEAD):
            s = s[len(NO_UVC_HEAD):].strip()
        return s[:-1] if s.endswith(".") else s

    def effective_by_id(self, action_id: str) -> EffectiveReading:
        for e in self.effective:
            if e.reading.id == action_id:
                return e
        raise ConfigurationError(f"unknown action spectrum {action_id!r}; available: "
                                 f"{', '.join(e.reading.id for e in self.effective)}")

    def equivalent_irradiance(self, wavelength_nm: float = REFERENCE_WAVELENGTH_NM,
                              pathway: str = "uvc", favourable: bool = True) -> float | None:
        """The irradiance at ``wavelength_nm`` with the same effect as this lamp. [unit]

        pathway ``uvc``: the largest (``favourable``) or smallest E_eff/s(λ) over the action
        spectra that are defined at λ; ``violet_blue``: by the violet-blue weighting. Uses the
        upper bound where UV-C is below detection or likely stray light (favourable reading).

        Examples
        --------
        >>> s = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 1.0),))
        >>> round(evaluate_germicidal(s).equivalent_irradiance(), 6)
        1.0
        """
        if pathway == "violet_blue":
            return self.violet_blue.equivalent_at(wavelength_nm, favourable=True)
        vals = [e.equivalent_at(wavelength_nm, favourable=favourable) for e in self.effective]
        vals = [v for v in vals if v is not None]
        if not vals:
            return None
        return max(vals) if favourable else min(vals)

    def irradiance_for(self, organism: Organism) -> float | None:
        """The lamp's favourable equivalent irradiance at an organism row's wavelength. [unit]"""
        if self.unit != "W m-2":
            return None
        return self.equivalent_irradiance(organism.wavelength_nm, organism.pathway)

    def most_susceptible_for(self, medium: str = "any", percent: float = 99.9
                             ) -> InactivationEstimate | None:
        """The relevant organism this lamp inactivates soonest, over both pathways.

        For a generic claim about germs (the estimate's notes say so). Times are
        ``at_least`` where the lamp's figure is only an upper bound.
        """
        if self.unit != "W m-2":
            return None
        best = most_susceptible(self.irradiance_for, medium, None, percent)
        if best is None:
            return None
        return _rebased(best, best.irradiance_basis,
                        times_are(best.organism, self.uvc, self.violet_blue))

    def estimate_for(self, organism: str | Organism | None = None, medium: str = "any",
                     percent: float = 99.9) -> InactivationEstimate | None:
        """Doses and times for one organism (id or row) here, or, without one, for the most
        susceptible relevant organism (a generic claim about germs). None without an
        irradiance (flux, radiance or relative spectra)."""
        if self.unit != "W m-2":
            return None
        if organism is None:
            return self.most_susceptible_for(medium, percent)
        o = organism if isinstance(organism, Organism) else get_organism(organism)
        return estimate(o, self.irradiance_for(o), basis="favourable equivalent irradiance",
                        times_are=times_are(o, self.uvc, self.violet_blue))

    def spread_254(self) -> dict:
        """Most and least favourable 254-nm-equivalent values across action spectra.

        Where an action spectrum's reading has no value (below detection, likely stray
        light) its upper bound stands in (the favourable reading claims are given). What
        each end is says ``*_reads``, the status of the reading behind it: ``complete`` (a
        value), ``partial`` (a lower bound: part of the band not measured),
        ``below-detection`` or ``likely-stray-light`` (an upper bound; with ``*_coverage``
        below 1 an upper bound of the measured part only)."""
        pairs = [(e.reading.id, e.equivalent if e.equivalent is not None else e.equivalent_upper_bound,
                  e.reading) for e in self.effective if spans_the_output(e)]
        pairs = [(i, v, r) for i, v, r in pairs if v is not None and v > 0]
        if not pairs:
            return {"most_favourable": None, "most_favourable_id": None,
                    "least_favourable": None, "least_favourable_id": None, "spread_ratio": None,
                    "most_favourable_reads": None, "least_favourable_reads": None,
                    "most_favourable_coverage": None, "least_favourable_coverage": None}
        hi = max(pairs, key=lambda p: p[1])
        lo = min(pairs, key=lambda p: p[1])
        return {"most_favourable": hi[1], "most_favourable_id": hi[0],
                "least_favourable": lo[1], "least_favourable_id": lo[0],
                "spread_ratio": hi[1] / lo[1],
                "most_favourable_reads": hi[2].status, "least_favourable_reads": lo[2].status,
                "most_favourable_coverage": hi[2].coverage,
                "least_favourable_coverage": lo[2].coverage}

    def to_dict(self) -> dict:
        spread = self.spread_254()
        spread["note"] = ("claims are judged with the most favourable reading; the spread shows "
                          "how much the choice of action spectrum matters for this lamp")
        return {
            "status": self.status, "statement": self.statement,
            "quantity": self.quantity, "unit": self.unit,
            "position": self.position.to_dict(),
            "uvc": self.uvc.to_dict(), "far_uvc": self.far_uvc.to_dict(),
            "effective": {
                "reference_wavelength_nm": REFERENCE_WAVELENGTH_NM,
                "by_action_spectrum": {e.reading.id: e.to_dict() for e in self.effective},
                "equivalent_254": spread,
                "violet_blue_405": self.violet_blue.to_dict(),
            },
            "efficiency": self.efficiency.to_dict(), "ozone": self.ozone.to_dict(),
            "artefacts": [a.to_dict() for a in self.artefacts],
            "technology": dict(self.technology), "noise_floor": dict(self.noise),
            "inactivation": [e.to_dict() for e in self.inactivation],
            "most_susceptible": {p: {m: (None if e is None else e.to_dict())
                                     for m, e in by_medium.items()}
                                 for p, by_medium in self.most_susceptible.items()},
            "notes": list(self.notes),
        }


# ---------------------------------------------------------------------------------------------
# Pieces
# ---------------------------------------------------------------------------------------------

def _reading(spec: Spectrum, rid: str, name: str, lo: float, hi: float, weight: Weighting | None,
             total: float, artefact: bool = False) -> Reading:
    r: Integral = integrate(spec, lo, hi, weight)
    unit = spec.integrated_unit
    dl = r.detection_limit
    frac = r.value / total if total > 0 and r.coverage > 0 else None
    ub = None
    if not spec.is_absolute:
        status, value, dl = "shape-only", None, None
    elif r.coverage <= 0.0:
        status, value, frac = "not-covered", None, None
    elif artefact:
        status, value, frac = "likely-stray-light", None, None
        ub = max(r.value, 0.0) + (dl or 0.0)
    elif dl is not None and dl > 0 and r.value <= dl:
        status, value, frac = "below-detection", None, None
        ub = max(r.value, 0.0) + dl
    else:
        status, value = ("complete" if r.complete else "partial"), r.value
    return Reading(id=rid, name=name, range_nm=(lo, hi), value=value, unit=unit, status=status,
                   coverage=r.coverage, detection_limit=dl, upper_bound=ub, fraction=frac,
                   apparent=r.value)


def _effective(spec: Spectrum, action_id: str, total: float, artefact: bool, reference_nm: float,
               share_band: tuple[float, float]) -> EffectiveReading:
    w = action_spectrum(action_id)
    lo, hi = w.range_nm
    rd = _reading(spec, action_id, w.name, lo, hi, w, total, artefact)
    s_ref = w.at(reference_nm)
    eq = rd.value / s_ref if rd.value is not None and s_ref > 0 else None
    equb = rd.upper_bound / s_ref if rd.upper_bound is not None and s_ref > 0 else None
    band = integrate(spec, *share_band).value
    inside_lo, inside_hi = max(share_band[0], lo), min(share_band[1], hi)
    share = None
    if band > 0 and inside_hi > inside_lo:
        share = min(1.0, max(0.0, integrate(spec, inside_lo, inside_hi).value / band))
    elif band > 0:
        share = 0.0
    return EffectiveReading(reading=rd, reference_nm=reference_nm, weight_at_reference=s_ref,
                            equivalent=eq, equivalent_upper_bound=equb, defined_share=share,
                            from_memory=_from_memory(w))


#: An action spectrum takes part in the spread of 254-nm equivalents (and the statement's
#: range) only where at least this share of the lamp's UV-C lies inside its defined range:
#: outside it the spectrum credits nothing, and a "least favourable" equivalent from a curve
#: not defined where the lamp emits (the 250–280 nm classical curve for a 222 nm lamp) says
#: nothing about the lamp. Our own rule; every action spectrum stays in the table with its
#: defined share. [-]
SPREAD_MIN_DEFINED_SHARE = 0.5


def spans_the_output(e: EffectiveReading) -> bool:
    """Whether an action spectrum is defined over most of the lamp's UV-C (see
    :data:`SPREAD_MIN_DEFINED_SHARE`); unknown (no UV-C to share) counts as defined."""
    return e.defined_share is None or e.defined_share >= SPREAD_MIN_DEFINED_SHARE


def _band_samples(spec: Spectrum, lo: float, hi: float) -> tuple[np.ndarray, np.ndarray]:
    m = (spec.wavelength_nm >= lo) & (spec.wavelength_nm <= hi)
    return spec.wavelength_nm[m], spec.values[m]


@lru_cache(maxsize=1)
def _known_uvc_lines() -> tuple[tuple[float, str], ...]:
    """Known lines in 195–285 nm (the line table and the technologies' lines; both are
    loaded once per process)."""
    out = [(k["wavelength_nm"], k["label"]) for k in known_lines()
           if k["emitter"] != "spectrometer artefact" and 195.0 <= k["wavelength_nm"] <= 285.0]
    for tid, t in technologies().items():
        for wl in t.get("lines_nm", []):
            if 195.0 <= wl <= 285.0 and not any(abs(wl - x) < 0.5 for x, _ in out):
                out.append((float(wl), f"{t['name']} {wl:g} nm"))
    return tuple(out)


#: A stray level read in UV-C is taken to go on, flat, up to here: scattered light inside an
#: array spectrometer lifts the whole short-wavelength end, not UV-C alone (our own rule, as
#: the pedestal test reads the level as flat). [nm]
STRAY_LEVEL_UP_TO_NM = 400.0


def without_stray_uvc(spectrum: Spectrum, artefacts: Iterable[Artefact]) -> Spectrum | None:
    """The most favourable reading of a spectrum whose UV-C is read as stray light or noise
    (an artefact with ``is_stray``): every sample below 280 nm set to zero (and any line there
    dropped), since stray light is scattered inside the instrument, not emitted by the lamp;
    and from 280 nm to :data:`STRAY_LEVEL_UP_TO_NM` the same level taken off (the median of
    the samples below 280 nm; a sample under it goes to zero, a negative one is kept), since
    the stray level does not stop at 280 nm. None when no artefact reads the UV-C so, or
    nothing lies below 280 nm.

    Examples
    --------
    >>> s = Spectrum(np.array([250.0, 270.0, 290.0, 350.0, 400.0]),
    ...              np.array([1e-3, 1e-3, 1e-3, 5e-3, 1.0]), "irradiance")
    >>> without_stray_uvc(s, [Artefact("pedestal", "flat")]).values.tolist()
    [0.0, 0.0, 0.0, 0.004, 1.0]
    >>> without_stray_uvc(s, [Artefact("data-edge", "undecided")]) is None
    True
    """
    if not any(a.is_stray for a in artefacts):
        return None
    wl, v = spectrum.wavelength_nm, spectrum.values
    below = wl < UVC_BAND_NM[1]
    lines = tuple(ln for ln in spectrum.lines if ln.wavelength_nm >= UVC_BAND_NM[1])
    if not below.any() and len(lines) == len(spectrum.lines):
        return None
    level = max(median(v[below]), 0.0) if below.any() else 0.0
    rest = ~below & (wl < STRAY_LEVEL_UP_TO_NM)
    out = np.where(below, 0.0, v)
    out[rest] = v[rest] - np.clip(v[rest], 0.0, level)
    return spectrum.derive(values=out, lines=lines)


def uvc_artefacts(spectrum: Spectrum, sigma: float | None = None) -> tuple[Artefact, ...]:
    """Reasons to read the UV-C part of a spectrum as stray light or noise, not as output.

    spectrum : a sampled spectrum (absolute or relative).
    sigma : per-sample noise [spectral unit]; default the spectrum's noise floor.

    Checks (PRACTICE.md P0-11), thresholds in the module constants:

    * ``noise-floor``: no UV-C sample rises ``FEATURE_SNR`` (5) σ above zero;
    * ``pedestal``: a flat UV-C level (no sample at twice the band median) under
      ``PEDESTAL_MAX_RELATIVE`` (1 %) of the strongest output above 280 nm, or no higher than
      ``BASELINE_MATCH`` (1.5) times the level the spectrum never goes below there (its 5th
      percentile: an un-subtracted dark level or stray light lifts the whole spectrum);
    * ``no-emitter``: the UV-C maximum is a feature standing out of the band but sits at no
      known line (``data/emitters/emission_lines.csv`` and ``data/technologies.toml``, within
      ±2 nm) and is not an LED-like band (230–290 nm, FWHM ≥ 5 nm), **and** there is a source
      that stray light could come from: the measured output outside UV-C is at least
      ``STRAY_SOURCE_MIN_RATIO`` (100) times the apparent UV-C. Without such a source a narrow
      UV-C line is accepted as emission (filtered lamps, narrow LEDs, excimer or other lines
      not in the list). Also ``no-emitter``: the signal rises into the 200 nm edge of the data
      (noise amplified where detectors are least sensitive).

    Examples
    --------
    >>> wl = np.arange(200.0, 781.0)
    >>> blue = np.exp(-0.5 * ((wl - 450) / 10) ** 2) + 1e-3      # flat pedestal under a blue LED
    >>> [a.kind for a in uvc_artefacts(Spectrum(wl, blue, "irradiance"), sigma=1e-5)]
    ['pedestal']
    """
    sigma = spectrum.noise_floor if sigma is None else sigma
    wl, v = _band_samples(spectrum, *UVC_BAND_NM)
    if wl.size < 3:
        return ()
    out: list[Artefact] = []
    vmax = float(v.max())
    if sigma is not None and sigma > 0 and vmax < FEATURE_SNR * sigma:
        out.append(Artefact("noise-floor", f"no UV-C sample rises {FEATURE_SNR:g} σ above zero "
                            f"(highest {vmax / sigma:.1f} σ, σ = {sig(sigma)} {spectrum.spectral_unit})"))
        return tuple(out)
    med = median(v)
    # the strongest output outside UV-C (a UV-A LED at 365 nm has almost nothing in 380–780 nm),
    # and the level the spectrum never goes below there (its floor: the 5th percentile)
    ow = spectrum.wavelength_nm > UVC_BAND_NM[1]
    wv, vv = spectrum.wavelength_nm[ow], spectrum.values[ow]
    out_peak = float(vv.max()) if vv.size else 0.0
    floor = quantile(vv, BASELINE_QUANTILE) if vv.size >= 20 else 0.0
    flat = med > 0 and vmax < PEDESTAL_FLATNESS * med and out_peak > 0
    if flat and med < PEDESTAL_MAX_RELATIVE * out_peak:
        out.append(Artefact("pedestal", f"flat UV-C level ({sig(med)} {spectrum.spectral_unit}, "
                            f"{med / out_peak:.2g} of the peak at "
                            f"{float(wv[int(np.argmax(vv))]):g} nm) with no feature: typical of "
                            "stray light in an array spectrometer"))
        return tuple(out)
    if flat and floor > 0 and med <= BASELINE_MATCH * floor:
        out.append(Artefact("pedestal", f"flat UV-C level ({sig(med)} {spectrum.spectral_unit}) "
                            f"no higher than the level the whole spectrum sits on outside UV-C "
                            f"({sig(floor)}, its {100 * BASELINE_QUANTILE:g}th percentile above "
                            "280 nm): an offset (a dark level not subtracted, or stray light), "
                            "not emission"))
        return tuple(out)
    i = int(np.argmax(v))
    lam = float(wl[i])
    stands_out = vmax >= PEDESTAL_FLATNESS * max(med, 0.0) and (
        sigma is None or sigma == 0 or vmax >= FEATURE_SNR * sigma)
    if not stands_out:
        return tuple(out)
    lo_edge = spectrum.range_nm[0]
    if i == 0 and lam <= UVC_BAND_NM[0] + 1.0 and lo_edge >= UVC_BAND_NM[0] - 1.0 \
            and v.size > 3 and v[0] > v[1] > v[2]:
        out.append(Artefact("no-emitter", f"the UV-C signal rises into the {lo_edge:g} nm edge of "
                            "the data, where detectors are least sensitive and noise is amplified"))
        return tuple(out)
    if i == 0 and lo_edge > UVC_BAND_NM[0] + 1.0 and v.size > 3 and v[0] > v[1] > v[2]:
        # data that start inside UV-C, highest at their first sample and falling from it, with
        # no peak in the measured part: emission below the data, or stray light
        out.append(Artefact("data-edge", f"the UV-C signal is highest at {lo_edge:g} nm, where "
                            "the data start, and falls from there with no peak in the measured "
                            f"part: emission below {lo_edge:g} nm or stray light, which these "
                            "data cannot tell apart"))
        return tuple(out)
    if i == v.size - 1:
        return tuple(out)  # the tail of a peak above 280 nm (UV-B/UV-A LED or Hg 296.7 nm)
    step = spectrum.step_nm or 1.0
    tol = max(LINE_TOLERANCE_NM, 1.5 * step)
    known = _known_uvc_lines()
    near = [lab for x, lab in known if abs(x - lam) <= tol]
    if near:
        return tuple(out)
    pk = peak_info(restricted(spectrum, *UVC_BAND_NM))
    fwhm = pk.fwhm_nm
    led = get_technology("uvc_led")
    wlo, whi = led["peak_window_nm"]
    if wlo <= lam <= whi and (fwhm is None or fwhm >= led["fwhm_nm"]["min"]):
        return tuple(out)
    # Evidence of stray light: a strong out-of-band source whose light could scatter into UV-C.
    uvc_apparent = integrate(spectrum, *UVC_BAND_NM).value
    outside = total_integral(spectrum) - uvc_apparent
    if not (uvc_apparent > 0 and outside >= STRAY_SOURCE_MIN_RATIO * uvc_apparent):
        return tuple(out)   # no source to scatter from: a real UV-C line, even if not a known one
    out.append(Artefact("no-emitter", f"UV-C maximum at {lam:g} nm"
                        + (f" (FWHM {fwhm:.1f} nm)" if fwhm else "")
                        + ": no known line within ±" + f"{tol:g} nm and not an LED-like band "
                        f"({wlo:g}–{whi:g} nm, FWHM ≥ {led['fwhm_nm']['min']:g} nm), next to "
                        f"out-of-band output {sig(outside / uvc_apparent)}× the apparent UV-C "
                        "that stray light can come from"))
    return tuple(out)


#: Distinct mercury lines among the peaks that name a mercury discharge when the data do not
#: reach its 253.7 nm line (404.7, 435.8, 546.1, 577/579 nm...; our own rule: no LED or
#: phosphor has three narrow peaks at mercury lines). [-]
MERCURY_LINES_TO_NAME = 3


def _mercury_lines(spectrum: Spectrum) -> bool:
    """Whether the spectrum's peaks include :data:`MERCURY_LINES_TO_NAME` distinct mercury
    lines (:func:`uvcheck.features.find_lines`)."""
    from uvcheck.features import find_lines

    hg = {ln.identified_as for ln in find_lines(spectrum)
          if (ln.identified_as or "").startswith("Hg ")}
    return len(hg) >= MERCURY_LINES_TO_NAME


def detect_technology(spectrum: Spectrum) -> str | None:
    """A best guess of the emitter technology from the spectrum's shape, or None.

    Rules (windows and widths from ``data/technologies.toml``): a narrow UV-C maximum at a
    technology's line (253.7 nm low-pressure mercury, 222 nm KrCl*) names it; otherwise the
    global peak's window names an LED type (a blue peak with more than 30 % of the output in
    500–700 nm is a phosphor white LED). Data that do not reach UV-C but show three or more
    mercury lines are a mercury discharge. A guess only: give ``technology=`` to override.

    Examples
    --------
    >>> s = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 1.0),))
    >>> detect_technology(s)
    'lp_mercury'
    """
    techs = technologies()
    if spectrum.lines and spectrum.wavelength_nm.size <= 2:
        ln = max(spectrum.lines, key=lambda x: x.value)
        for tid, t in techs.items():
            if any(abs(ln.wavelength_nm - x) <= LINE_TOLERANCE_NM for x in t.get("lines_nm", [])):
                return tid
        lam, fwhm = ln.wavelength_nm, None
    else:
        wl, v = _band_samples(spectrum, *UVC_BAND_NM)
        total = total_integral(spectrum)
        uvc = integrate(spectrum, *UVC_BAND_NM).value if wl.size >= 3 else 0.0
        if wl.size >= 3 and total > 0 and uvc > MIN_SIGNIFICANT_SHARE * total:
            pk = peak_info(restricted(spectrum, *UVC_BAND_NM))
            if pk.peak_nm is not None:
                for tid in ("lp_mercury", "krcl_excimer"):
                    t = techs[tid]
                    lo, hi = t["peak_window_nm"]
                    if lo <= pk.peak_nm <= hi and (pk.fwhm_nm is None or pk.fwhm_nm <= 10.0):
                        return tid
        if integrate(spectrum, *UVC_BAND_NM).coverage < 0.5 and _mercury_lines(spectrum):
            return "lp_mercury"
        pk = peak_info(spectrum)
        if pk.peak_nm is None:
            return None
        lam, fwhm = pk.peak_nm, pk.fwhm_nm
    for tid in ("uvc_led", "uva_led", "violet_led", "blue_led"):
        t = techs[tid]
        lo, hi = t["peak_window_nm"]
        if lo <= lam <= hi:
            if tid == "uvc_led" and fwhm is not None and not (
                    t["fwhm_nm"]["min"] <= fwhm <= t["fwhm_nm"]["max"]):
                return None
            if tid == "blue_led" and spectrum.wavelength_nm.size > 2:
                tot = total_integral(spectrum)
                if tot > 0 and integrate(spectrum, 500.0, 700.0).value > 0.3 * tot:
                    return "white_led"
            return tid
    return None


def rules_out_below_240(tech_id: str | None, uvc_peak_nm: float | None) -> bool:
    """Whether the technology table says this emitter has no output below 240 nm: always
    (``below_240 = "no"``), or at a UV-C peak at or above its ``no_below_240_if_peak_above_nm``
    (a UV-C LED peaking at 255 nm or more; data/technologies.toml gives the source)."""
    tech = technologies().get(tech_id or "", {})
    edge = tech.get("no_below_240_if_peak_above_nm")
    return tech.get("below_240") == "no" or (
        edge is not None and uvc_peak_nm is not None and uvc_peak_nm >= edge)


def _ozone(spec: Spectrum, uvc: Reading, total: float, tech_id: str | None,
           uvc_peak_nm: float | None, artefact: bool, tech_given: bool = True,
           undecided_uvc: bool = False) -> Ozone:
    unit = spec.integrated_unit
    lo_data = spec.range_nm[0]
    covers_185 = lo_data <= OZONE_LINE_COVERED_NM and not any(
        a <= 184.9 <= b for a, b in spec.gaps_nm)
    below = None
    checked = None
    present = False
    if lo_data < OZONE_EDGE_NM:
        a = max(lo_data, 100.0)
        r = integrate(spec, a, OZONE_EDGE_NM)
        below = r.value
        checked = (a, OZONE_EDGE_NM)
        dl = r.detection_limit or 0.0
        ref = uvc.apparent if uvc.apparent > 0 else total
        present = r.value > dl and ref > 0 and r.value > MIN_SIGNIFICANT_SHARE * ref
    tech = technologies().get(tech_id or "", {})
    tech_no = rules_out_below_240(tech_id, uvc_peak_nm)
    stated = ((spec.meta or {}).get("parameters") or {}).get("envelope_from_listing")
    if present and not artefact and stated and _seen(spec) != "measured":
        # a nominal model that lets the 184.9 nm line out because the listing says the lamp
        # makes ozone (or emits 185 nm): the seller's statement, not the model's guess
        return Ozone("present", "stated", below, unit, checked, covers_185,
                     f"the listing says the lamp makes ozone or emits 185 nm ({stated!r}), so the "
                     f"model lets the 184.9 nm line out ({sig(below)} {unit} over "
                     f"{checked[0]:g}–240 nm): the lamp can make ozone; ventilate after use")  # type: ignore[index]
    if (present and not artefact and _seen(spec) != "measured"
            and tech.get("below_240") == "possible" and not tech_no
            and uvc_peak_nm is not None and uvc_peak_nm >= OZONE_EDGE_NM):
        # a nominal model's short-wavelength tail is its assumed line shape, not a fact
        # about the lamp: for a technology that may or may not emit there, nothing is known
        return Ozone("unknown", "not-measurable", below, unit, checked, covers_185,
                     f"the nominal model has a tail below 240 nm ({sig(below)} {unit} over "
                     f"{checked[0]:g}–240 nm), but its shape there is the model's assumption; "  # type: ignore[index]
                     f"whether a {tech['name']} emits below 240 nm a listing cannot show "
                     f"({tech.get('below_240_source', '')})")
    if present and not artefact:
        return Ozone("present", "measured" if _seen(spec) == "measured" else "modelled", below, unit, checked, covers_185,
                     f"output below 240 nm is present ({sig(below)} {unit} over "
                     f"{checked[0]:g}–240 nm): the lamp can make ozone; ventilate after use")  # type: ignore[index]
    if present and artefact and not tech_no:
        return Ozone("unknown", "not-measurable", below, unit, checked, covers_185,
                     "apparent output below 240 nm, but the UV-C signal looks like stray light")
    if (checked is not None and not present and _seen(spec) != "measured"
            and tech.get("below_240") == "possible" and not tech_no):
        # nothing below 240 nm in a nominal model of a technology that may emit there (a
        # mercury lamp modelled with an ozone-free envelope): the model's assumption, not a
        # fact about the lamp
        return Ozone("unknown", "not-measurable", below, unit, checked, covers_185,
                     f"the nominal model has no output below 240 nm, but that is its "
                     f"assumption; whether a {tech['name']} emits there a listing cannot show "
                     f"({tech.get('below_240_source', '')})")
    if checked is not None and covers_185 and not present:
        seen = _seen(spec)
        return Ozone("absent", "measured" if seen == "measured" else "modelled", below, unit,
                     checked, covers_185,
                     f"no output found below 240 nm, {'measured' if seen == 'measured' else 'modelled'}"
                     f" down to {lo_data:g} nm "
                     "(including the 184.9 nm mercury line)")
    if tech_no and not tech_given and (uvc.coverage <= 0.0 or undecided_uvc):
        # a technology guessed from a spectrum without any UV-C (or whose UV-C signal rises
        # into the start of the data): the guess rests on the longer-wavelength shape, and
        # says nothing of an emitter the data do not reach
        return Ozone("unknown", "not-measurable", None, unit, None, False,
                     f"the data start at {lo_data:g} nm, so output below 240 nm was not "
                     f"measured; the shape looks like a {tech['name']} (a guess from the "
                     "spectrum), which would emit nothing there, but only a spectrum that "
                     "reaches below 240 nm can show it")
    if tech_no:
        return Ozone("absent", "technology", below, unit, checked, covers_185,
                     f"a {tech['name']} emits nothing below 240 nm ({tech.get('below_240_source', '')})"
                     + ("" if checked is None else "; the apparent output there is stray light"
                        if present else "; none measured either"))
    if checked is None:
        return Ozone("unknown", "not-measurable", None, unit, None, False,
                     f"the data start at {lo_data:g} nm: output below 240 nm cannot be known")
    return Ozone("unknown", "not-measurable", below, unit, checked, False,
                 f"nothing found in {checked[0]:g}–240 nm, but the 184.9 nm mercury line lies "
                 "outside the measured range: 'ozone-free' depends on the envelope glass and "
                 "cannot be confirmed from this spectrum")


def _efficiency(uvc: Reading, spec: Spectrum, position: Position, cond: Conditions,
                tech_id: str | None) -> Efficiency:
    p_el = cond.electrical_power_W
    tech = technologies().get(tech_id or "")
    rng = None
    if tech is not None:
        rng = dict(tech["uvc_efficiency"])
        rng["flag_above"] = tech.get("uvc_efficiency_flag_above")
        rng["source"] = tech.get("uvc_efficiency_source")
    if p_el is None:
        return Efficiency("not-computed", None, None, None, None, tech_id, rng, None,
                          "no electrical input power given")
    val = uvc.favourable()
    if val is None or not spec.is_absolute:
        return Efficiency("not-computed", p_el, None, None, None, tech_id, rng, None,
                          "no absolute UV-C figure")
    if spec.quantity == "flux":
        flux, basis = val, "measured flux"
    elif spec.quantity == "irradiance" and position.distance_m is not None:
        flux = float(flux_from_irradiance(val, position.distance_m, cond.emitter,
                                          cond.tube_length_m, cond.source_size_m))
        model = {"point": "4πd²E, isotropic point", "lambertian": "πd²E, Lambertian",
                 "tube": "Keitz inverse, linear tube"}[cond.emitter]
        basis = f"estimated from the irradiance at {position.distance_m:g} m ({model})"
    else:
        return Efficiency("not-computed", p_el, None, None, None, tech_id, rng, None,
                          "the UV-C flux needs a flux spectrum or the measurement distance")
    eff = flux / p_el
    status = "computed" if uvc.value is not None else "upper-bound"
    verdict = None
    if rng is not None and status == "computed":
        if rng.get("flag_above") is not None and eff > rng["flag_above"]:
            verdict = "implausible"
        elif eff > rng["max"]:
            verdict = "above-range"
        elif eff < rng["min"]:
            verdict = "below-range"
        else:
            verdict = "within"
    note = ("the flux is an estimate that assumes the emitter model's pattern; an isotropic "
            "model credits a flat LED with four times its real flux" if spec.quantity != "flux"
            else "measured radiant flux")
    return Efficiency(status, p_el, flux, basis, eff, tech_id, rng, verdict, note)


#: The fewest samples the noise is estimated from (uvcheck.features.estimate_noise needs 12). [-]
NOISE_MIN_SAMPLES = 12


def with_noise_floor(spectrum: Spectrum) -> tuple[Spectrum, Any]:
    """The spectrum with a noise floor, and the estimate made for it: its own floor (estimate
    None), else one estimated from the data (:func:`uvcheck.features.estimate_noise`; at
    least :data:`NOISE_MIN_SAMPLES` samples), else the spectrum as it is (None)."""
    if spectrum.noise_floor is None and spectrum.wavelength_nm.size >= NOISE_MIN_SAMPLES:
        ne = estimate_noise(spectrum.values)
        if ne.sigma is not None:
            return spectrum.derive(noise_floor=ne.sigma), ne
    return spectrum, None


def spectrum_at(spectrum: Spectrum, cond: Conditions, distance_m: float | None) -> Spectrum:
    """The spectrum at ``distance_m`` on the lamp's axis, scaled with the conditions' emitter
    model as every germicidal figure at a distance is (a flux spectrum becomes an on-axis
    irradiance); the spectrum itself for None. [m]"""
    return _at_position(spectrum, cond, distance_m)[0]


def _at_position(spectrum: Spectrum, cond: Conditions, distance_m: float | None
                 ) -> tuple[Spectrum, Position]:
    if distance_m is None:
        if spectrum.quantity == "flux":
            return spectrum, Position(None, "flux: the lamp's total output, no position", None)
        # a nominal estimate is placed at a distance, not measured there
        where = "position of the estimate" if is_nominal(spectrum) else "measurement position"
        return spectrum, Position(cond.measurement_distance_m, where, None)
    d = float(distance_m)
    if not (math.isfinite(d) and d > 0):
        raise ConfigurationError(f"distance must be positive, got {distance_m}")
    kw = dict(emitter=cond.emitter, tube_length_m=cond.tube_length_m,
              source_size_m=cond.source_size_m)
    if spectrum.quantity == "irradiance":
        d0 = cond.measurement_distance_m
        if d0 is None:
            raise ConfigurationError("scaling to another distance needs the measurement distance",
                                     todo="give the measurement distance, e.g. --distance '20 cm'")
        sc = distance_scaling(d0, d, **kw)
        out = scaled(spectrum, sc.factor, note={"method": "distance", "from_m": d0, "to_m": d,
                                                "emitter": cond.emitter, "factor": sc.factor})
        return out, Position(d, f"scaled from {d0:g} m to {d:g} m ({cond.emitter} model)",
                             sc.to_dict())
    if spectrum.quantity == "flux":
        f = float(irradiance_per_watt(d, **kw))
        out = scaled(spectrum, f, quantity="irradiance",
                     note={"method": "flux to irradiance", "to_m": d, "emitter": cond.emitter})
        dev = far_field_deviation(d, **kw)
        return out, Position(d, f"irradiance from the flux at {d:g} m on axis ({cond.emitter} model)",
                             {"emitter": cond.emitter, "factor": f, "far_field_deviation": dev})
    if spectrum.quantity == "radiance":
        raise ConfigurationError("a radiance spectrum does not give an irradiance at a distance",
                                 todo="give a spectral irradiance or a flux")
    return spectrum, Position(None, "relative spectrum: no position", None)


# ---------------------------------------------------------------------------------------------
# Entry point
# ---------------------------------------------------------------------------------------------

def evaluate_germicidal(spectrum: Spectrum, conditions: Conditions | None = None,
                        organisms: Iterable[str | Organism] | None = None, *,
                        technology: str | None = None,
                        distance_m: float | None = None) -> GermicidalResult:
    """Germicidal output of a lamp at one position, and what it can do to microorganisms.

    spectrum : the spectrum at the measurement position (irradiance [W m⁻² nm⁻¹]), a flux
        spectrum [W nm⁻¹], or a relative shape (shape results only).
    conditions : measurement distance, emitter model, electrical power. [m], [W]
    organisms : organism ids (or rows) to evaluate; default every row of the pathways the
        lamp has (UV-C; violet-blue where it outweighs UV-C).
    technology : emitter technology id (``data/technologies.toml``); default detected.
    distance_m : evaluate at this distance instead of the measurement position (scaled with
        the conditions' emitter model; a flux spectrum becomes an on-axis irradiance). [m]

    Examples
    --------
    >>> lp = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 0.5),))
    >>> r = evaluate_germicidal(lp, Conditions(measurement_distance_m=1.0))
    >>> (r.status, r.uvc.value, r.ozone.status)
    ('germicidal-uvc', 0.5, 'unknown')
    """
    cond = conditions or Conditions()
    spec, position = _at_position(spectrum, cond, distance_m)
    notes: list[str] = []
    noise: dict[str, Any] = {"sigma": spec.noise_floor, "basis": "given by the reader"}
    if spec.noise_floor is None and spec.wavelength_nm.size < NOISE_MIN_SAMPLES:
        noise = {"sigma": None, "basis": "unknown"}
    spec, ne = with_noise_floor(spec)
    if ne is not None:
        noise = {"sigma": ne.sigma, "basis": f"estimated from the data ({ne.method})"}
    total = total_integral(spec)
    artefacts = () if spec.wavelength_nm.size <= 2 else uvc_artefacts(spec)
    # a signal rising into the start of data that begin inside UV-C is undecided, not stray
    # light: the readings keep their (partial) values and the status says why it is open
    art = any(a.is_stray for a in artefacts)
    uvc = _reading(spec, "uvc", "UV-C 200–280 nm", *UVC_BAND_NM, None, total, art)
    far = _reading(spec, "far_uvc", "far-UVC 200–235 nm", *FAR_UVC_BAND_NM, None, total, art)
    effective = tuple(_effective(spec, a, total, art, REFERENCE_WAVELENGTH_NM, UVC_BAND_NM)
                      for a in ACTION_SPECTRA)
    vb = _effective(spec, VIOLET_BLUE_ID, total, False, VIOLET_BLUE_REFERENCE_NM, (380.0, 500.0))
    tech_id = technology if technology is not None else detect_technology(spec)
    tech = {"id": tech_id, "name": None, "basis": "given" if technology else (
        "detected from the spectrum (a guess)" if tech_id else "not recognised")}
    if tech_id is not None:
        tech["name"] = get_technology(tech_id)["name"]
    uvc_peak = None
    if spec.wavelength_nm.size > 2 and uvc.coverage > 0:
        try:
            uvc_peak = peak_info(restricted(spec, *UVC_BAND_NM)).peak_nm
        except ConfigurationError:
            uvc_peak = None
    elif spec.lines:
        uvc_lines = [ln for ln in spec.lines if UVC_BAND_NM[0] <= ln.wavelength_nm < UVC_BAND_NM[1]]
        uvc_peak = max(uvc_lines, key=lambda x: x.value).wavelength_nm if uvc_lines else None
    ozone = _ozone(spec, uvc, total, tech_id, uvc_peak, art, tech_given=technology is not None,
                   undecided_uvc=any(not a.is_stray for a in artefacts))
    efficiency = _efficiency(uvc, spec, position, cond, tech_id)
    status, statement = _status(spec, uvc, far, artefacts, position, effective, vb)
    # --- inactivation (evaluated on first use: OrganismPlan) ---------------------------------
    irr = spec.quantity == "irradiance"
    if organisms is not None:
        rows = tuple(o if isinstance(o, Organism) else get_organism(o) for o in organisms)
    else:
        rows_l: list[Organism] = []
        uvc_fav = uvc.favourable() or 0.0
        vb_fav = vb.reading.favourable() or 0.0
        if status in UVC_EMITTING:
            rows_l += [o for o in organism_table() if o.pathway == "uvc"]
        if vb_fav > 0 and (status not in UVC_EMITTING or vb_fav > uvc_fav):
            rows_l += [o for o in organism_table() if o.pathway == "violet_blue"]
        rows = tuple(rows_l)
    plan = OrganismPlan(rows=rows, irradiance=irr, distance_m=position.distance_m, uvc=uvc,
                        effective=effective, violet_blue=vb, uvc_peak_nm=uvc_peak)
    if irr:
        if position.distance_m is None:
            notes.append("the measurement distance is not known: doses and times apply at the "
                         "(unstated) measurement position")
    elif spec.is_absolute:
        notes.append("doses and times need an irradiance: give a distance (a flux becomes an "
                     "on-axis irradiance there) or use the room model")
    else:
        notes.append("relative spectrum: no dose or time until it is scaled to absolute units")
    if status == "no-uvc":
        notes.append("no germicidal UV-C: the UV-A and blue-light hazards are evaluated all the "
                     "same (see hazards)")
    if any(e.from_memory for e in effective):
        notes.append("germicidal_classical is three points from memory, labelled as such")
    notes.append("UV-C is integrated over 200–280 nm (the CIE band is 100–280 nm; 100–200 nm is "
                 "absorbed by air and reported separately as below-200nm; output below 240 nm "
                 "is what forms ozone)")
    notes.append(SCREENING_NOTE)
    return GermicidalResult(
        status=status, statement=statement, quantity=spec.quantity, unit=spec.integrated_unit,
        position=position, uvc=uvc, far_uvc=far, effective=effective, violet_blue=vb,
        efficiency=efficiency, ozone=ozone, artefacts=artefacts, technology=tech, noise=noise,
        organisms=plan, notes=tuple(notes))


def cross_wavelength_note(organism: Organism, uvc_peak_nm: float | None) -> str | None:
    """The caution for organism data measured at a wavelength more than
    :data:`CROSS_WAVELENGTH_NM` from the lamp's UV-C peak (e.g. 222-nm data for a 254-nm lamp),
    whose dose the action spectrum carries over to the lamp's wavelength; None otherwise.

    >>> o = next(r for r in organism_table() if r.pathway == "uvc")
    >>> cross_wavelength_note(o, o.wavelength_nm) is None
    True
    """
    if (organism.pathway != "uvc" or uvc_peak_nm is None
            or abs(uvc_peak_nm - organism.wavelength_nm) <= CROSS_WAVELENGTH_NM):
        return None
    return (f"data measured at {organism.wavelength_nm:g} nm, lamp UV-C peak at "
            f"{round(uvc_peak_nm, 1):g} nm: {TRANSFERRED}, which adds "
            "uncertainty beyond the data's own")


@dataclass(frozen=True)
class OrganismPlan:
    """What the doses and times of one lamp position are computed from (on first use, by
    :meth:`evaluate`; :attr:`GermicidalResult.inactivation` and
    :attr:`GermicidalResult.most_susceptible` give the results).

    rows : the organism rows to estimate (every row of the pathways the lamp has).
    irradiance : whether the spectrum is an irradiance (else no dose or time).
    distance_m : the position's distance (None: the unstated measurement position). [m]
    uvc, effective, violet_blue : the lamp's UV-C reading and effective readings.
    uvc_peak_nm : the UV-C peak, for the note on data measured at another wavelength. [nm]
    """

    rows: tuple[Organism, ...]
    irradiance: bool
    distance_m: float | None
    uvc: "Reading"
    effective: tuple["EffectiveReading", ...]
    violet_blue: "EffectiveReading"
    uvc_peak_nm: float | None

    def evaluate(self) -> tuple[tuple[InactivationEstimate, ...],
                                dict[str, dict[str, InactivationEstimate | None]]]:
        """(an estimate per row, the most susceptible per pathway and medium)."""
        if not self.irradiance:
            return (), {}
        effective, vb, uvc = self.effective, self.violet_blue, self.uvc
        by_key: dict[tuple[str, float], float | None] = {}  # the same rows are asked many times

        def irradiance_for(o: Organism) -> float | None:
            key = (o.pathway, o.wavelength_nm)
            if key in by_key:
                return by_key[key]
            if o.pathway == "violet_blue":
                out = vb.equivalent_at(o.wavelength_nm)
            else:
                vals = [e.equivalent_at(o.wavelength_nm) for e in effective]
                vals = [v for v in vals if v is not None and v > 0]
                out = max(vals) if vals else None
            by_key[key] = out
            return out

        def basis(o: Organism) -> str:
            where = "here" if self.distance_m is None else f"at {self.distance_m:g} m"
            if o.pathway == "violet_blue":
                return f"{o.wavelength_nm:g}-nm-equivalent by {VIOLET_BLUE_ID} (favourable), {where}"
            best = max(effective, key=lambda e: e.equivalent_at(o.wavelength_nm) or -1.0)
            txt = (f"{o.wavelength_nm:g}-nm-equivalent, most favourable action spectrum "
                   f"({best.reading.id}), {where}")
            note = cross_wavelength_note(o, self.uvc_peak_nm)
            return txt if note is None else f"{txt}; {note}"

        inact = tuple(estimate(o, irradiance_for(o), basis=basis(o),
                               times_are=times_are(o, uvc, vb)) for o in self.rows)
        ms: dict[str, dict[str, InactivationEstimate | None]] = {}
        for pathway in ("uvc", "violet_blue"):
            ms[pathway] = {}
            for medium in ("air", "surface", "water"):
                best = most_susceptible(irradiance_for, medium, pathway)
                if best is not None:
                    best = _rebased(best, basis(best.organism), times_are(best.organism, uvc, vb))
                ms[pathway][medium] = best
        return inact, ms


def times_are(o: Organism, uvc: "Reading", violet_blue: "EffectiveReading") -> str:
    """How an organism's times read at this lamp: ``at_least`` where its pathway's figure is
    only an upper bound (no value), ``at_most`` where the band was partly measured (the
    irradiance is a lower bound), else ``estimate``."""
    rd = violet_blue.reading if o.pathway == "violet_blue" else uvc
    if rd.value is None:
        return "at_least"
    return "at_most" if rd.status == "partial" else "estimate"


def _rebased(e: InactivationEstimate, basis: str, times_are: str) -> InactivationEstimate:
    return InactivationEstimate(organism=e.organism, irradiance_W_m2=e.irradiance_W_m2,
                                irradiance_basis=basis, times_are=times_are,
                                doses_J_m2=e.doses_J_m2, times_s=e.times_s,
                                time_ranges_s=e.time_ranges_s, notes=e.notes)


def _fmt(value: float | None, unit: str) -> str:
    if value is None:
        return "—"
    t, label = to_trade(value, unit)
    if label == unit:
        return f"{sig(value)} {unit}"
    return f"{sig(value)} {unit} ({sig(t)} {label})"


def _seen(spec: Spectrum) -> str:
    """How the spectrum's output is known, for the wording: "estimated" for a nominal
    spectrum built from a listing's statements, else "measured"."""
    return "estimated" if is_nominal(spec) else "measured"


def _not_ruled_out(above: str, lo: float) -> tuple[str, str]:
    """Nothing above ``above`` in the measured part of UV-C, whose start ``lo`` lies inside
    the band: the status and statement (the part not measured is never read as zero)."""
    a, b = UVC_BAND_NM
    return "not-assessed", (f"No UV-C above {above} in the measured {max(lo, a):g}–{b:g} nm; "
                            f"{a:g}–{lo:g} nm was not measured, so UV-C cannot be ruled out.")


def _status(spec: Spectrum, uvc: Reading, far: Reading, artefacts: tuple[Artefact, ...],
            position: Position, effective: tuple[EffectiveReading, ...],
            vb: EffectiveReading) -> tuple[str, str]:
    lo, hi = spec.range_nm
    where = "" if position.distance_m is None else f" at {position.distance_m:g} m"
    if not spec.is_absolute:
        frac = uvc.fraction
        if uvc.coverage <= 0:
            return "not-assessed", f"UV-C not assessed: the data cover {lo:g}–{hi:g} nm."
        return "shape-only", (f"Relative spectrum: UV-C is {sig((frac or 0) * 100)} % of the "
                              f"{_seen(spec)} output; no irradiance, dose or time until it is scaled.")
    if uvc.status == "not-covered":
        return "not-assessed", f"UV-C not assessed: the data cover {lo:g}–{hi:g} nm only."
    if artefacts and uvc.coverage < 1.0 and all(a.kind == "noise-floor" for a in artefacts):
        # nothing above the noise in the measured part: that says nothing of the part not
        # measured, so UV-C is not ruled out (missing range is never read as zero)
        return _not_ruled_out("the noise", lo)
    if artefacts and not any(a.is_stray for a in artefacts):
        a, b = UVC_BAND_NM
        return "not-assessed", (f"UV-C not established: {artefacts[0].detail}; {a:g}–{lo:g} nm "
                                "was not measured, so UV-C can be neither confirmed nor ruled "
                                f"out (apparent {_fmt(uvc.apparent, uvc.unit)}{where} in the "
                                "measured part).")
    if artefacts:
        reason = "; ".join(a.detail for a in artefacts)
        return "no-uvc", (f"{NO_UVC_HEAD} the apparent UV-C ({_fmt(uvc.upper_bound, uvc.unit)}"
                          f"{where}) is likely stray light or noise, not germicidal output "
                          f"({reason}).")
    if uvc.status == "below-detection":
        if uvc.coverage < 1.0:
            return _not_ruled_out("the detection limit", lo)
        return "no-uvc", (f"{NO_UVC_HEAD} UV-C is below the detection limit "
                          f"(< {_fmt(uvc.detection_limit, uvc.unit)}{where}).")
    frac = uvc.fraction or 0.0
    if uvc.status == "partial":
        if frac < NO_UVC_FRACTION:
            return "not-assessed", (f"No significant UV-C in the measured {max(lo, 200):g}–280 nm; "
                                    f"below {lo:g} nm was not measured, so UV-C cannot be ruled out.")
        return "partial", (f"UV-C at least {_fmt(uvc.value, uvc.unit)}{where}: the data start at "
                           f"{lo:g} nm, so part of UV-C was not measured.")
    if frac < NO_UVC_FRACTION:
        return "no-uvc", (f"{NO_UVC_HEAD} UV-C is {sig(frac * 100)} % of the {_seen(spec)} "
                          f"output ({_fmt(uvc.value, uvc.unit)}{where}).")
    eqs = [e.equivalent for e in effective
           if e.equivalent is not None and e.equivalent > 0 and spans_the_output(e)]
    eq_txt = ""
    if eqs:
        eq_txt = (f"; 254-nm-equivalent {_fmt(min(eqs), uvc.unit)} to {_fmt(max(eqs), uvc.unit)} "
                  "across action spectra")
    return "germicidal-uvc", f"UV-C {_fmt(uvc.value, uvc.unit)}{where}{eq_txt}."
