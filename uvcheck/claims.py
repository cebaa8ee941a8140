"""Claim verdicts: can each marketing statement hold, with the numbers behind it.

One engine for both uses: ``uvcheck assess SPECTRUM --claims LISTING`` (a measurement plus
the listing) and ``uvcheck screen LISTING`` (the listing alone, through nominal spectra built
from its stated data, :mod:`uvcheck.nominal`). The evidence is a set of *readings* of the lamp
— the measurement, or the nominal estimate's min / typical / max cases for each way the
listing can be read — and every claim is judged over them:

* **efficacy and emission claims** get the benefit of the doubt (DESIGN.md): they are judged
  with the *most favourable* reading (highest output, most susceptible organism in the table,
  lowest dose across studies, most favourable action spectrum, the claim's closest place).
  ``cannot-hold`` only when even that reading falls short by more than the decision margin
  (:data:`MARGIN`, a factor of 2 unless the uncertainty module gives an interval);
  ``unlikely`` when it falls short by less than that; ``holds`` when it reaches the need.
  A reading that a plausibility check refutes (an LED voltage that cannot make the stated
  wavelength) is not used as the favourable reading, and UV-C that the germicidal evaluation
  reads as likely stray light is no dose: a kill claim that holds only through it is
  ``not-assessable`` (:func:`_unless_stray_credit`);
* **safety claims** fail as soon as the *most likely* reading (the measurement; without one,
  the typical case of the most credible nominal reading) exceeds an exposure limit of the
  assessment's limit set (``judge(limit_set=...)``; a basis names a set other than the
  default). On an estimate they get no benefit of the doubt either: ``holds`` only when every
  case (min / typical / max) of every reading the listing does not refute stays within the
  limits; when the most likely case does but another case does not, ``not-assessable`` (a
  measurement is needed), naming that case and its time to the limit;
* a *hard bound* decides ``cannot-hold`` at any shortfall, without the margin: physics (the
  photon energy of the stated wavelength against the LED voltage, energy conservation, the
  wall-plug limit), a cover that blocks the band, the best the technology has reached, or no
  emission above the detection limit; checks against technology data or rules of thumb give
  at most ``unlikely`` (:data:`HARD_BOUNDS_TEXT`);
* ``not-assessable`` names what is missing.

Each verdict's ``rule`` says which of these decided it, and the basis ends with it
("…; decided by a hard bound, physics: …").

Every verdict carries ``needed``, ``available`` and their ``ratio`` (available / needed), a
one-line ``basis`` with the numbers ("needs 11.1 mJ/cm² in 30 min at 2 cm; this lamp gives at
most 0.004 mJ/cm² there: short by 2 800×") and the assumptions made on the listing's behalf.
Exposure verdicts are screening results, not certifications.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field, replace
from functools import cached_property
from typing import Any, Callable, Iterable, Mapping, Sequence

from uvcheck.conditions import WORKDAY_S, Conditions
from uvcheck.errors import ConfigurationError
from uvcheck.germicidal import NO_UVC_FRACTION, OZONE_EDGE_NM, UVC_BAND_NM, UVC_EMITTING
from uvcheck.spectrum import Spectrum, below_detection, covers_all, integrate, total_integral
from uvcheck.units import format_duration, sig

VERDICTS = ("holds", "unlikely", "cannot-hold", "not-assessable")
#: The verdicts from best to worst, the one order every part of uvcheck ranks them by (the
#: worst claim of a batch row, ``--fail-on``, the part that decides a claim judged in parts):
#: a claim that cannot be assessed is a weaker finding against the product than one that is
#: unlikely to hold, and a claim made of parts is no better than its worst part, so an
#: unlikely part outranks a part that cannot be assessed.
VERDICT_ORDER = ("holds", "not-assessable", "unlikely", "cannot-hold")
#: Decision margin of the simple rule: a claim is ``cannot-hold`` only when the most favourable
#: reading falls short by more than this factor (covers calibration, distance and organism-data
#: scatter; common practice in screening, not a standard value). The uncertainty module
#: replaces it by the 95 % interval where that is computed.
MARGIN = 2.0
#: Ceiling height assumed for a room given only by its floor area (common practice). [m]
DEFAULT_ROOM_HEIGHT_M = 2.5
#: Benchmark for a coverage claim with no inactivation claim to go with it: 90 % (1 log) of
#: the most susceptible relevant organism within 1 h (uvcheck's default, not a standard).
COVERAGE_BENCHMARK = (90.0, 3600.0)
#: Wavelength tolerance for a stated peak: max(this, half the measured FWHM). [nm]
PEAK_TOLERANCE_NM = 3.0
#: The ``unlikely`` zone for a stated peak, beyond the tolerance. [nm]
PEAK_UNLIKELY_NM = 10.0
#: Names people write for the organisms in the table (lower case) -> words to find in a row.
ORGANISM_ALIASES = {
    "e. coli": "escherichia coli", "e.coli": "escherichia coli", "ecoli": "escherichia coli",
    "staph": "staphylococcus", "mrsa": "staphylococcus aureus", "s. aureus": "staphylococcus aureus",
    "covid": "coronavirus", "covid-19": "coronavirus", "sars-cov-2": "sars-cov-2",
    "corona": "coronavirus", "coronavirus": "coronavirus", "flu": "influenza",
    "flu virus": "influenza", "flu viruses": "influenza", "swine flu": "h1n1",
    "influenza": "influenza", "tb": "tuberculosis", "tuberculosis": "tuberculosis",
    "legionella": "legionella", "norovirus": "norovirus", "salmonella": "salmonella",
    "listeria": "listeria", "mould": "aspergillus", "mold": "aspergillus",
    "pseudomonas": "pseudomonas", "adenovirus": "adenovirus", "polio": "poliovirus",
}


# ---------------------------------------------------------------------------------------------
# Result type
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Quantity:
    """A number with its unit and what it is (for ``needed`` and ``available``)."""

    value: float | None
    unit: str
    what: str

    def text(self) -> str:
        return f"{self.what}: {'unknown' if self.value is None else sig(self.value) + ' ' + self.unit}"

    def to_dict(self) -> dict[str, Any]:
        return {"value": self.value, "unit": self.unit, "what": self.what}


@dataclass(frozen=True)
class Verdict:
    """The verdict on one claim.

    id, kind, text : the claim as sold.
    verdict : ``holds`` | ``unlikely`` | ``cannot-hold`` | ``not-assessable``.
    needed, available : what the claim needs and what the evidence gives.
    ratio : available / needed (> 1: enough; for safety, t_max / exposure time). [-]
    basis : one line with the numbers.
    assumptions : choices made on the listing's behalf.
    missing : data that would make a ``not-assessable`` claim assessable.
    evidence : ``measured`` | ``nominal estimate`` | ``listing``.
    reading : the reading that decided (``measured``, ``as-stated/max`` …).
    rule : the decision rule that decided the verdict, in words ("the benefit-of-the-doubt
        margin …", "a hard physical bound …"); the engine appends it to ``basis``.
    """

    id: str
    kind: str
    text: str | None
    verdict: str
    needed: Quantity | None
    available: Quantity | None
    ratio: float | None
    basis: str
    assumptions: tuple[str, ...] = ()
    missing: tuple[str, ...] = ()
    evidence: str = "measured"
    reading: str | None = None
    details: dict[str, Any] = field(default_factory=dict)
    rule: str | None = None

    def __post_init__(self) -> None:
        if self.verdict not in VERDICTS:
            raise ConfigurationError(f"unknown verdict {self.verdict!r}")

    def to_dict(self) -> dict[str, Any]:
        return {"id": self.id, "kind": self.kind, "text": self.text, "verdict": self.verdict,
                "needed": None if self.needed is None else self.needed.to_dict(),
                "available": None if self.available is None else self.available.to_dict(),
                "ratio": self.ratio, "basis": self.basis,
                "assumptions": list(self.assumptions), "missing": list(self.missing),
                "evidence": self.evidence, "reading": self.reading,
                "rule": self.rule, "details": dict(self.details)}


_EFFICACY = {"simple": {"pass": "holds", "conditional pass": "holds",
                        "conditional fail": "unlikely", "fail": "cannot-hold"},
             "guarded": {"pass": "holds", "conditional pass": "unlikely",
                         "conditional fail": "unlikely", "fail": "cannot-hold"}}
_SAFETY = {"simple": {"pass": "holds", "conditional pass": "holds",
                      "conditional fail": "cannot-hold", "fail": "cannot-hold"},
           "guarded": {"pass": "holds", "conditional pass": "unlikely",
                       "conditional fail": "cannot-hold", "fail": "cannot-hold"}}


def _decide(needed: float, value: float, rel: tuple[float, float], rule: str,
            table: dict[str, dict[str, str]], fmt: Any = sig) -> tuple[str, str]:
    """Verdict and a basis fragment from the 95 % interval value·rel under a decision rule
    (:func:`uvcheck.uncertainty.decide`, ILAC-G8:09/2019)."""
    from uvcheck.uncertainty import decide

    lo, hi = value * rel[0], value * rel[1]
    d = decide(needed, (lo, hi), rule=rule, direction="at_least", measured=value)
    verdict = table[rule][d.statement]
    frag = (f"95 % interval {fmt(lo)} to {fmt(hi)}: {d.statement}, "
            f"probability of meeting it {sig(100 * d.probability, 2)} %")
    return verdict, frag


def _by_ratio(ratio: float | None, margin: float = MARGIN) -> str:
    if ratio is None:
        return "not-assessable"
    if ratio >= 1.0:
        return "holds"
    if ratio >= 1.0 / margin:
        return "unlikely"
    return "cannot-hold"


def _short(ratio: float) -> str:
    if ratio >= 1.0:
        return f"enough by {sig(ratio, 2)}×"
    return f"short by {sig(1.0 / ratio, 2)}×"


# --- the rules that decide a verdict (named in every basis) ---------------------------------

def rule_margin(margin: float = MARGIN) -> str:
    """The simple rule for efficacy claims (benefit of the doubt with a margin)."""
    return (f"the benefit-of-the-doubt rule (most favourable reading; cannot-hold only when "
            f"short by more than {sig(margin, 2)}×)")


def rule_interval(rule: str) -> str:
    """A decision on the 95 % interval of a measurement."""
    return f"{rule} acceptance on the 95 % interval (ILAC-G8:09/2019)"


#: Rule of an emission claim against a measured spectrum.
RULE_PRESENCE = ("the presence test (is there emission above the detection limit where the "
                 "claim needs it; no margin applies)")
#: Rule of a safety claim.
RULE_SAFETY = ("the safety rule (the most likely reading against the exposure limit, no benefit "
               "of the doubt)")
#: Rule of a safety claim on an estimate (nominal min / typical / max cases).
RULE_SAFETY_ESTIMATE = ("the safety rule on an estimate (every case of every reading the "
                        "listing does not refute against the exposure limit, no benefit of "
                        "the doubt)")
#: Rule of a safety or risk-group verdict against the claim that only UV-C read as stray light
#: decides (our own rule: the tool's own reading of that UV-C is that the lamp does not emit it).
RULE_STRAY_UVC = ("the stray-light rule (a verdict against a safety or risk-group claim may not "
                  "rest on UV-C below 280 nm that reads as likely stray light or noise, nor on "
                  "that stray level where it goes on into UV-B and UV-A)")
#: What would decide such a claim.
#: Rule of an efficacy verdict that would hold only on UV-C read as stray light (our own rule).
RULE_STRAY_UVC_EFFICACY = ("the stray-light rule for efficacy (a dose is not credited to UV-C "
                           "below 280 nm that reads as likely stray light or noise)")
STRAY_UVC_NEEDED = ("a measurement below 280 nm with the stray light controlled (a solar-blind "
                    "or short-pass filter, or a double-monochromator spectroradiometer)",)
#: Rule of an emission claim that a nominal estimate can only take at its word.
RULE_TECHNOLOGY_EMITS = "the benefit-of-the-doubt rule (the stated technology emits there)"


def rule_tolerance(tol_nm: float) -> str:
    return (f"the wavelength tolerance (holds within {sig(tol_nm, 2)} nm, unlikely within a "
            f"further {PEAK_UNLIKELY_NM:g} nm)")


def _with_rule(v: "Verdict") -> "Verdict":
    """The verdict with its rule named at the end of the basis (once)."""
    if not v.rule or v.verdict == "not-assessable" or v.basis.endswith(f"decided by {v.rule}"):
        return v
    return replace(v, basis=f"{v.basis}; decided by {v.rule}")


def pct(percent: float) -> str:
    """A reduction percentage with enough digits that its nines show (99.9999, not 100.00).

    Four significant figures below 99 %; from 99 % on, as many decimals as the nines need
    (at least two), so no reduction short of 100 % prints as 100.

    Examples
    --------
    >>> [pct(p) for p in (90.0, 99.9, 99.99, 99.999, 99.9999, 100 * (1 - 10 ** -6))]
    ['90.00', '99.90', '99.99', '99.999', '99.9999', '99.9999']
    """
    if not (math.isfinite(percent) and 99.0 <= percent < 100.0):
        return sig(percent, 4)
    decimals = max(2, math.ceil(-math.log10(100.0 - percent) - 1e-6))
    return f"{percent:.{decimals}f}"


def _mj_cm2(j_m2: float) -> str:
    return f"{sig(j_m2 * 0.1)} mJ/cm²"


def _uw_cm2(w_m2: float) -> str:
    return f"{sig(w_m2 * 100)} µW/cm²"


# ---------------------------------------------------------------------------------------------
# Readings of the lamp
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True, eq=False)
class Reading:
    """One reading of the lamp: an absolute irradiance spectrum at a reference distance.

    label : ``measured``, or ``<reading>/<case>`` for a nominal estimate (``as-stated/max``).
    spectrum : spectral irradiance at ``conditions.measurement_distance_m`` (or a relative
        spectrum, which supports shape claims only).
    conditions : reference distance, emitter model, tube length, source size.
    likely : True for a most-likely reading (used for safety claims).
    refuted : plausibility finding ids that make this reading impossible.
    favourable : True for a reading usable as the most favourable one.
    evidence : ``measured`` | ``nominal estimate``.
    """

    label: str
    spectrum: Spectrum
    conditions: Conditions
    likely: bool = True
    refuted: tuple[str, ...] = ()
    favourable: bool = True
    evidence: str = "measured"
    technology: str | None = None

    @property
    def d_ref(self) -> float | None:
        return self.conditions.measurement_distance_m

    @cached_property
    def _cache(self) -> dict[Any, Any]:
        return {}

    def germicidal_at(self, distance_m: float | None) -> Any:
        from uvcheck.germicidal import evaluate_germicidal

        key = ("g", distance_m)
        if key not in self._cache:
            d = distance_m if (distance_m is not None and self.d_ref is not None) else None
            self._cache[key] = evaluate_germicidal(self.spectrum, self.conditions,
                                                   technology=self.technology, distance_m=d)
        return self._cache[key]

    def stray_free(self) -> "Reading | None":
        """This reading without the UV-C below 280 nm where its germicidal evaluation reads
        that UV-C as likely stray light or noise, and without that stray level up to 400 nm
        (:func:`uvcheck.germicidal.without_stray_uvc`): the most favourable reading of its
        hazards. None where its UV-C is not read so."""
        if self.evidence != "measured":
            return None  # a model emits what it models: nothing in it is stray light
        key = ("stray-free",)
        if key not in self._cache:
            from uvcheck.germicidal import without_stray_uvc

            s = without_stray_uvc(self.spectrum, self.germicidal_at(None).artefacts)
            self._cache[key] = None if s is None else replace(
                self, label=f"{self.label} without its stray UV-C", spectrum=s)
        return self._cache[key]

    def hazards(self, limit_set: str | None = None) -> Any:
        """The hazard evaluation of this reading (the default limit set unless one is given)."""
        from uvcheck.hazards import DEFAULT_LIMIT_SET, evaluate_hazards

        key = ("h", limit_set or DEFAULT_LIMIT_SET)
        if key not in self._cache:
            self._cache[key] = evaluate_hazards(self.spectrum, self.conditions,
                                                limit_set=key[1])
        return self._cache[key]

    def hazards_at(self, distance_m: float, limit_set: str | None = None) -> dict[str, Any]:
        """Hazard values and t_max at a distance of use (the hazard module's use evaluation),
        under ``limit_set`` (the default limit set unless one is given)."""
        from uvcheck.hazards import DEFAULT_LIMIT_SET, evaluate_hazards

        key = ("hd", distance_m, limit_set or DEFAULT_LIMIT_SET)
        if key not in self._cache:
            c = replace(self.conditions, use_distance_m=distance_m)
            use = evaluate_hazards(self.spectrum, c, limit_set=key[2]).use_distance
            self._cache[key] = use.to_dict() if use is not None else {}
        return self._cache[key]

    def _room_lamp(self, box: Any, placement: str) -> Any:
        from uvcheck import room as rm

        key = ("room-lamp", box, placement)
        if key not in self._cache:
            # a ceiling lamp 5 cm below the ceiling, or at 90 % of a low room's height (our own
            # rule for a typical surface mounting)
            ceiling = (box.width_m / 2, box.length_m / 2,
                       max(box.height_m - 0.05, box.height_m * 0.9))
            # the flux comes from the irradiance with the lamp's own emission pattern (a
            # Lambertian LED emits E·πd², not the E·4πd² of a point source; a tube by the
            # cylinder model): the placement may be favourable, the flux may not be invented
            own = self._emission_geometry(ceiling)
            lamp = rm.lamp_from_spectrum(self.spectrum, own, self.d_ref)
            if placement == "centre":
                lamp = rm.RoomLamp(rm.LampGeometry((box.width_m / 2, box.length_m / 2,
                                                    box.height_m / 2)), lamp.flux_spectrum,
                                   lamp.basis + "; placed at the room's centre, radiating in all "
                                   "directions (the most favourable placement for the air)")
            self._cache[key] = lamp
        return self._cache[key]

    def _emission_geometry(self, position: tuple[float, float, float]) -> Any:
        """The lamp's own emission pattern at ``position``: Lambertian downwards, a cylinder
        of the stated tube length, or a point source (isotropic)."""
        from uvcheck import room as rm

        emitter = self.conditions.emitter
        if emitter == "lambertian":
            return rm.LampGeometry(position, "lambertian_down")
        if emitter == "tube" and self.conditions.tube_length_m:
            return rm.LampGeometry(position, "cylinder", tube_length_m=self.conditions.tube_length_m)
        return rm.LampGeometry(position)

    def room(self, box: Any, placement: str) -> Any:
        """The room model for this reading; ``placement``: ``centre`` (favourable, isotropic)
        or ``ceiling`` (the usual mounting, for occupant exposure)."""
        from uvcheck import room as rm

        key = ("room", box, placement)
        if key not in self._cache:
            lamp = self._room_lamp(box, placement)
            # 40 grid steps over the room's longer side (our own rule)
            self._cache[key] = rm.evaluate_room(box, lamp, grid_step_m=max(box.width_m, box.length_m) / 40)
        return self._cache[key]

    def occupant_exposure(self, box: Any, limit_set: str | None = None) -> dict[str, Any]:
        """The room occupant's time to the daily actinic UV limit of ``limit_set`` (lamp at the
        ceiling centre, eyes facing it: the room model's worst case).

        Returns ``time_to_limit_s`` (None: never reached within the limit's durations),
        ``lower_bound`` (the lamp's output is only partly known: the true time is shorter),
        ``symbol``, ``eye_height_m`` and ``limit_set``. Under the default limit set this is the
        room model's own figure (IEC 62471 E_S·t ≤ 30 J/m²); under another set the occupant's
        worst-case irradiance spectrum (the lamp's flux spectrum times the room model's
        highest fluence rate per watt at eye height) is weighted and timed with that set's
        actinic UV entry, as :mod:`uvcheck.hazards` does for a measured irradiance.
        """
        from uvcheck.hazards import DEFAULT_LIMIT_SET
        from uvcheck.spectrum import scaled

        lset = limit_set or DEFAULT_LIMIT_SET
        key = ("occ", box, lset)
        if key in self._cache:
            return self._cache[key]
        room = self.room(box, "ceiling")
        occ = room.occupant
        out: dict[str, Any] = {"eye_height_m": occ.get("eye_height_m"), "limit_set": lset,
                               "symbol": "E_S",
                               "lower_bound": bool(occ.get("effective_S_is_lower_bound"))}
        e_s, phi_s = occ.get("effective_S_W_m2"), room.lamp.get("actinic_flux_W")
        # (as before: no actinic output at all leaves the occupant exposure unevaluated)
        out["evaluated"] = occ.get("time_to_limit_s") is not None
        out["time_to_limit_s"] = occ.get("time_to_limit_s")
        out["effective_W_m2"] = e_s
        if lset != DEFAULT_LIMIT_SET:
            from uvcheck.limits import get_limit_set

            entry = get_limit_set(lset).hazard("actinic_uv")
            out["symbol"] = entry.symbol
            out["time_to_limit_s"] = None
            out["effective_W_m2"] = 0.0
            if e_s and phi_s and e_s > 0 and phi_s > 0:
                # the room model gives E_S = (S-weighted flux) × (highest fluence rate per watt
                # at eye height), so that fluence rate per watt is E_S / (S-weighted flux)
                eye = scaled(self._room_lamp(box, "ceiling").flux_spectrum, e_s / phi_s,
                             "irradiance")
                lo, hi = entry.range_nm
                integ = integrate(eye, lo, hi, entry.weight())
                out["effective_W_m2"] = integ.value
                if integ.value > 0:
                    # None: within the limit for every duration the limit covers
                    out["time_to_limit_s"] = entry.t_max(lambda fov: integ.value)[0]
                # partial data in this limit set's own spectral range (the room model's flag
                # is for the default set's)
                out["lower_bound"] = not integ.complete
        self._cache[key] = out
        return out


@dataclass(frozen=True)
class Evidence:
    """Everything the verdicts rest on: the listing, the readings and the plausibility findings."""

    listing: Any
    readings: tuple[Reading, ...]
    plausibility: Any
    measured: bool
    margin: float = MARGIN
    uncertainty: dict[str, Any] | None = None   # the assessment's ``uncertainty`` section
    rule: str = "simple"                        # decision rule: simple | guarded
    limit_set: str | None = None                # exposure-limit set id; None = the default

    @property
    def limit_set_id(self) -> str:
        from uvcheck.limits import DEFAULT_LIMIT_SET

        return self.limit_set or DEFAULT_LIMIT_SET

    def limits_named(self) -> str:
        """'' under the default limit set, else "; limit set <id>: <name>" for a basis."""
        from uvcheck.limits import DEFAULT_LIMIT_SET, get_limit_set

        if self.limit_set_id == DEFAULT_LIMIT_SET:
            return ""
        return f"; limit set {self.limit_set_id}: {get_limit_set(self.limit_set_id).name}"

    def safety_cases(self) -> list[Reading]:
        """The readings a safety claim must stay within the limits for: every absolute reading
        the listing does not refute (the measurement; for an estimate, every min / typical /
        max case of every reading not refuted)."""
        return [x for x in self.readings if x.spectrum.is_absolute and not x.refuted]

    def relative_interval(self, *path: str) -> tuple[float, float] | None:
        """(low/value, high/value) of a 95 % interval in the uncertainty section, or None."""
        u = self.uncertainty
        if not u or u.get("status") != "evaluated":
            return None
        node: Any = u
        for p in path:
            node = (node or {}).get(p) if isinstance(node, dict) else None
        if not node or not node.get("interval_95") or not node.get("value"):
            return None
        lo, hi = node["interval_95"]
        v = node["value"]
        return (lo / v, hi / v) if v > 0 else None

    def favourable(self) -> list[Reading]:
        r = [x for x in self.readings if x.favourable and not x.refuted and x.spectrum.is_absolute]
        return r or [x for x in self.readings if x.spectrum.is_absolute and not x.refuted]

    def likely(self) -> Reading | None:
        for x in self.readings:
            if x.likely:
                return x
        return self.readings[0] if self.readings else None


def readings_from_measurement(spectrum: Spectrum, conditions: Conditions,
                              technology: str | None = None) -> tuple[Reading, ...]:
    return (Reading("measured", spectrum, conditions, True, (), True, "measured", technology),)


def readings_from_listing(listing: Any, plausibility: Any,
                          estimates: Sequence[Any] | None = None) -> tuple[Reading, ...]:
    """Nominal readings: each way of reading the listing × min / typical / max.

    The reference distance is the listing's use distance, else 0.2 m (the IEC 62471
    assessment distance). The most likely reading is the ``typical`` case of the
    electrical-evidence reading where the LED voltages refute the stated wavelength, else of
    the as-stated reading.
    """
    from uvcheck import nominal

    ests = tuple(estimates) if estimates is not None else nominal.listing_readings(listing)
    d_ref = listing.use_distance_m or 0.2
    refuting = [f.id for f in plausibility.findings
                if f.status == "cannot-hold" and f.id.split(":")[0] in
                ("die-voltage-vs-photon-energy", "led-wavelength")]
    has_evidence = any(e.reading == "electrical-evidence" for e in ests)
    out: list[Reading] = []
    for est in ests:
        refuted = tuple(refuting) if est.reading == "as-stated" and has_evidence else ()
        likely_reading = (est.reading == "electrical-evidence") if has_evidence else (est.reading == "as-stated")
        cond = Conditions(measurement_distance_m=d_ref, emitter=est.emitter,
                          tube_length_m=est.tube_length_m if est.emitter == "tube" else None,
                          source_size_m=est.source_size_m,
                          electrical_power_W=listing.electrical_power_W)
        cases = nominal.CASES if est.is_absolute else ("shape",)
        for case in cases:
            flux = est.spectrum(case) if est.is_absolute else est.spectrum()
            if flux.quantity == "flux":
                spec = nominal.irradiance_at(flux, d_ref, est.emitter, est.tube_length_m,
                                             est.source_size_m)
            else:
                spec = flux
            out.append(Reading(f"{est.reading}/{case}", spec, cond,
                               likely=likely_reading and case in ("typical", "shape"),
                               refuted=refuted, favourable=case in ("max", "shape"),
                               evidence="nominal estimate", technology=est.technology))
    return tuple(out)


# ---------------------------------------------------------------------------------------------
# The engine
# ---------------------------------------------------------------------------------------------

def evaluate_claims(evidence: Evidence) -> list[Verdict]:
    """A verdict for every claim of the listing (in the listing's order)."""
    out = []
    for c in evidence.listing.claims:
        v = _judge_one(c, evidence)
        if c.also_kinds:   # only the free-text reader fills it
            v = _every_kind(c, v, evidence)
        out.append(v)
    return out


def _judge_one(c: Any, evidence: Evidence) -> Verdict:
    fn = _JUDGES.get(c.kind, _unrecognised)
    try:
        v = fn(c, evidence)
    except ConfigurationError as exc:
        v = _na(c, evidence, f"cannot be evaluated: {exc.what}", ())
    return _with_rule(v)


def _every_kind(c: Any, first: Verdict, ev: Evidence) -> Verdict:
    """A text that makes several claims ("no ozone, safe for children") holds only as far as
    each does: every kind it makes is judged, and the worst decides (our own rule, as for
    several organisms or bands), the basis naming the part that decides."""
    from uvcheck.io.listing import parse_claim_text

    subs = [(c.kind, first)]
    for k in c.also_kinds:
        subs.append((k, _judge_one(parse_claim_text(c.text, c.id, kind=k), ev)))
    return _in_parts(c, subs, f"the text makes {len(subs)} claims "
                              f"({', '.join(n for n, _ in subs)}) and holds only as far as each does",
                     "the {name} part", "parts")


#: Why a claim cannot be judged when there is neither a measurement nor a lamp model (a listing
#: that states claims only), and what would decide it.
NO_LAMP_DATA = ("no measurement, and the listing states nothing the lamp's output can be modelled "
                "from (no technology, wavelength or band)")
NO_LAMP_DATA_NEEDS = ("a measured spectrum",
                      "lamp.technology or lamp.peak_wavelength, with lamp.optical_power or "
                      "lamp.electrical_power")


def _na(c: Any, ev: Evidence, basis: str, missing: Sequence[str],
        assumptions: Sequence[str] = ()) -> Verdict:
    return Verdict(c.id, c.kind, c.text, "not-assessable", None, None, None, basis,
                   tuple(assumptions), tuple(missing),
                   "measured" if ev.measured else ("nominal estimate" if ev.readings else "listing"))


def _unrecognised(c: Any, ev: Evidence) -> Verdict:
    return _na(c, ev, "not a statement uvcheck can check" + (f" ({c.note})" if c.note else ""),
               c.missing())


# --- emission ----------------------------------------------------------------------------

def worst_first(verdict: str | None, ratio: Any) -> tuple[int, int, float]:
    """The sort key that puts the worst claim first: the verdict in :data:`VERDICT_ORDER`
    (cannot-hold, then unlikely, not-assessable, holds; an unknown one as holds), then the
    smallest ratio of available to needed, a claim without a ratio after those with one. The
    batch's worst claim and the part that decides a claim judged in parts both sort by it.

    >>> sorted([("unlikely", 0.6), ("cannot-hold", None), ("cannot-hold", 0.01)],
    ...        key=lambda vr: worst_first(*vr))[0]
    ('cannot-hold', 0.01)
    """
    sev = VERDICT_ORDER.index(verdict) if verdict in VERDICT_ORDER else 0
    numeric = isinstance(ratio, (int, float)) and not isinstance(ratio, bool)
    return -sev, 0 if numeric else 1, float(ratio) if numeric else 0.0


def _worst_part(subs: list[tuple[str, Verdict]]) -> tuple[str, Verdict, str]:
    """(name, verdict) of the part that decides a claim judged in parts: the first by
    :func:`worst_first` (the worst verdict, among equals the smallest ratio), and the others'
    verdicts in words."""
    name, worst = min(subs, key=lambda nv: worst_first(nv[1].verdict, nv[1].ratio))
    others = "; ".join(f"{n}: {v.verdict}" for n, v in subs if v is not worst)
    return name, worst, others


def _in_parts(c: Any, subs: list[tuple[str, Verdict]], intro: str, decides: str,
              details_key: str, extra: Mapping[str, Any] | None = None) -> Verdict:
    """The verdict of a claim judged in parts: the worst part's (:func:`_worst_part`), with a
    basis '<intro>; <decides> decides it: <its basis> (the others: …)' and the parts' verdicts
    under ``details[details_key]`` (our own rule: a claim holds only as far as every part)."""
    name, worst, others = _worst_part(subs)
    basis = (f"{intro}; {decides.format(name=name)} decides it: {worst.basis}"
             + (f" (the others: {others})" if others else ""))
    return replace(worst, id=c.id, text=c.text, basis=basis,
                   details={**(worst.details or {}), **(extra or {}),
                            details_key: {n: v.verdict for n, v in subs}})


def _emission_parts(c: Any) -> list[tuple[str, Any]]:
    """The bands and wavelengths of an emission claim that names more than one of either
    ("UVA + UVC", "365nm & 254nm"), each as a claim of its own: [(name, claim)], bands first.
    [] for a claim naming one band and/or one wavelength (judged as a whole, as before)."""
    from uvcheck.io.listing import BANDS_NM

    wls, bands = tuple(c.wavelengths_nm or ()), tuple(c.bands or ())
    if len(wls) < 2 and len(bands) < 2:
        return []
    if not wls and c.wavelength_nm is not None:
        wls = (c.wavelength_nm,)
    if not bands and c.band_name:
        bands = (c.band_name,)
    one = dict(bands=(), wavelengths_nm=())
    parts = [(b, replace(c, wavelength_nm=None, band_name=b, band_nm=BANDS_NM[b], **one))
             for b in bands]
    if c.band_nm is not None and c.band_name is None:   # a range written as wavelengths
        lo, hi = c.band_nm
        parts.append((f"{lo:g}–{hi:g} nm", replace(c, wavelength_nm=None, **one)))
    parts += [(f"{w:g} nm", replace(c, wavelength_nm=w, band_name=None, band_nm=None, **one))
              for w in wls]
    return parts


def _emission(c: Any, ev: Evidence) -> Verdict:
    """An emission claim; one that names several bands or wavelengths ("UVA + UVC") holds only
    as far as the lamp emits in each: every band and wavelength is judged on its own and the
    worst verdict decides, naming the band or wavelength that decides it (our own rule, as for
    several organisms in :func:`_each_organism`)."""
    return _with_unread_wattage(_emission_in_parts(c, ev), c, ev)


def _with_unread_wattage(v: Verdict, c: Any, ev: Evidence) -> Verdict:
    """An emission claim worded with a wattage but no output word ("UVC 30W"): the wattage is
    not an optical power (a bare wattage is the electrical rating, as the listing reader
    takes it), so the basis says it was not checked, and names the listing's own electrical
    power where that is another figure (our own reading)."""
    if not c.text or c.structured:
        return v
    from uvcheck.io.listing import _find_quantities

    w = _find_quantities(c.text).get("power_W")
    if w is None:
        return v
    said = f"the {w:g} W in the claim is not checked: a wattage without 'output' reads as " \
           "the lamp's electrical rating, not its UV output"
    pe = getattr(ev.listing, "electrical_power_W", None)
    if pe is not None and abs(pe - w) > 0.1 * max(pe, w):
        said += (f", and the listing's own electrical power is {pe:g} W: the two figures "
                 "disagree")
    return replace(v, basis=f"{v.basis}; {said}")


def _emission_in_parts(c: Any, ev: Evidence) -> Verdict:
    parts = _emission_parts(c)
    if not parts:
        return _one_emission(c, ev)
    subs = [(name, _one_emission(sub, ev)) for name, sub in parts]
    nb = sum(1 for n, p in parts if p.wavelength_nm is None)
    nw = len(parts) - nb
    what = " and ".join(x for x in (
        f"{nb} band{'s' if nb > 1 else ''}" if nb else "",
        f"{nw} wavelength{'s' if nw > 1 else ''}" if nw else "") if x)
    return _in_parts(c, subs, f"the claim names {what} ({', '.join(n for n, _ in parts)}) and "
                              "the lamp must emit at each", "{name}", "parts",
                     {"decided_by": _worst_part(subs)[0]})


#: Below this share of a nominal reading's output a band is taken as one the stated technology
#: does not emit in (our own rule; a nominal model has no noise floor to compare with). [-]
NOMINAL_BAND_SHARE_MIN = 1e-3


def rule_technology_tolerance(tol_nm: float) -> str:
    return (f"the wavelength tolerance against the stated technology's lines and peak window "
            f"(data/technologies.toml; holds within {sig(tol_nm, 2)} nm, beyond it at most "
            "'unlikely': technology data, not a hard bound)")


#: Rule of a band claim on an estimate: where the technology's nominal model emits.
RULE_TECHNOLOGY_BAND = ("the stated technology's nominal spectrum (technology data: at most "
                        "'unlikely', not a hard bound)")


def _one_emission(c: Any, ev: Evidence) -> Verdict:
    ev_kind = "measured" if ev.measured else "nominal estimate"
    lam = c.wavelength_nm
    band = c.band_nm
    if lam is None and band is None:
        return _na(c, ev, "no wavelength or band stated", c.missing())
    if not ev.measured:
        fav = ev.favourable()
        # listing evidence against it (die voltage, "254 nm LED", a cover that blocks the band)
        refuting = _listing_against(c, ev, lam, band)
        if refuting:
            f = refuting[0]
            return Verdict(c.id, c.kind, c.text, f.status, _q(f.needed), _q(f.available),
                           f.ratio, f.message, tuple(f.assumptions), (), "listing", None,
                           {"finding": f.id, "basis": f.basis}, f.rule)
        if not ev.readings:
            return _na(c, ev, NO_LAMP_DATA, NO_LAMP_DATA_NEEDS)
        if not fav:
            return _na(c, ev, "no power stated and no spectrum: the emission cannot be estimated",
                       ("a spectrum", "lamp.optical_power or lamp.electrical_power"))
        v = _technology_emits(c, ev, fav, lam, band)
        if v is not None:
            return v
        r = fav[0]
        return Verdict(c.id, c.kind, c.text, "holds", None, None, None,
                       f"consistent with the stated technology ({r.technology}); an estimate from "
                       "the listing, not a measurement", (), (), ev_kind, r.label,
                       rule=RULE_TECHNOLOGY_EMITS)
    r = ev.readings[0]
    g = r.germicidal_at(None)
    from uvcheck.features import find_lines, peak_info

    lines = find_lines(r.spectrum)
    pk = peak_info(r.spectrum)
    uvc_ok = g.status in UVC_EMITTING  # (partial: found, part of the band unmeasured)
    shape_open = False
    no_uvc = g.statement_clause()
    if g.status == "shape-only":
        # a relative spectrum: whether it emits UV-C is a matter of shape (UV-C's share of the
        # output, no artefact of the spectrometer), as the statuses of an absolute one say;
        # UV-C that reads as stray light is none (as 'no-uvc'), a share too small to tell
        # with part of UV-C unmeasured is open (as 'not-assessed')
        frac = g.uvc.fraction or 0.0
        stray = [a for a in g.artefacts if a.is_stray]
        uvc_ok = not g.artefacts and frac >= NO_UVC_FRACTION
        shape_open = not uvc_ok and not stray
        if stray:
            no_uvc = (f"the apparent UV-C of this relative spectrum ({sig(frac * 100)} % of the "
                      f"output) is likely stray light or noise, not emission ({stray[0].detail})")
    d_lo, d_hi = r.spectrum.range_nm
    if lam is not None and not any(a <= lam <= b for a, b in r.spectrum.segments()):
        # the stated wavelength itself was not measured: no presence test can be made there
        return _na(c, ev, f"the stated {lam:g} nm lies outside the measured "
                          f"{d_lo:g}–{d_hi:g} nm" + (" (or in a gap of the data)"
                                                     if d_lo <= lam <= d_hi else ""),
                   ("a spectrum covering the stated wavelength",))
    if (lam is None and band is not None and band[1] <= UVC_BAND_NM[1] and not uvc_ok
            and (g.status == "not-assessed" or shape_open)):
        if not covers_all(integrate(r.spectrum, *band).coverage):
            # nothing found in the measured part, but UV-C is not ruled out (the germicidal
            # statement says why): the part of the band not measured could hold the emission
            return _na(c, ev, g.statement_clause(), ("a spectrum covering the whole band",))
    if lam is not None:
        tol = max(PEAK_TOLERANCE_NM, (pk.fwhm_nm or 0.0) / 2)
        near = [ln for ln in lines if abs(ln.wavelength_nm - lam) <= tol]
        close = [ln for ln in lines if abs(ln.wavelength_nm - lam) <= tol + PEAK_UNLIKELY_NM]
        in_uvc = lam < UVC_BAND_NM[1]
        if in_uvc and not uvc_ok:
            ub = g.uvc.upper_bound
            return Verdict(c.id, c.kind, c.text, "cannot-hold",
                           Quantity(lam, "nm", "stated peak"),
                           Quantity(pk.peak_nm, "nm", "measured peak"), None,
                           f"stated {lam:g} nm, but the output peaks at {sig(pk.peak_nm, 4)} nm "
                           + (f"with no germicidal UV-C: {no_uvc}"
                              if g.status != "not-assessed" else
                              f"and nothing stands out at {lam:g} nm, which was measured "
                              f"(the data cover {d_lo:g}–{d_hi:g} nm)"),
                           (), (), ev_kind, r.label, {"uvc_upper_bound_W_m2": ub}, RULE_PRESENCE)
        if near:
            ln = min(near, key=lambda x: abs(x.wavelength_nm - lam))
            return Verdict(c.id, c.kind, c.text, "holds", Quantity(lam, "nm", "stated peak"),
                           Quantity(ln.wavelength_nm, "nm", "emission line found"), None,
                           f"emission found at {sig(ln.wavelength_nm, 4)} nm"
                           + (f" ({ln.identified_as})" if ln.identified_as else "")
                           + f", within {sig(tol, 2)} nm of the stated {lam:g} nm",
                           (), (), ev_kind, r.label, rule=rule_tolerance(tol))
        verdict = "unlikely" if close else "cannot-hold"
        found = ", ".join(f"{sig(x.wavelength_nm, 4)} nm" for x in lines[:5]) or "none"
        return Verdict(c.id, c.kind, c.text, verdict, Quantity(lam, "nm", "stated peak"),
                       Quantity(pk.peak_nm, "nm", "measured peak"), None,
                       f"no emission line within {sig(tol, 2)} nm of the stated {lam:g} nm; "
                       f"peaks found: {found}" + ("; the lamp does emit UV-C, at another wavelength"
                                                  if uvc_ok and in_uvc else ""),
                       (), (), ev_kind, r.label, rule=rule_tolerance(tol))
    lo, hi = band
    integ = integrate(r.spectrum, lo, hi)
    tot = integrate(r.spectrum, *r.spectrum.range_nm).value
    dl = integ.detection_limit or 0.0
    uvc_band = hi <= UVC_BAND_NM[1]
    if integ.coverage <= 0:
        return _na(c, ev, f"the spectrum does not cover {lo:g}–{hi:g} nm", ("a spectrum covering the band",))
    if uvc_band and not uvc_ok:
        return Verdict(c.id, c.kind, c.text, "cannot-hold",
                       Quantity(dl, r.spectrum.integrated_unit, f"emission in {c.band_name or 'the band'} above the detection limit"),
                       Quantity(g.uvc.upper_bound, r.spectrum.integrated_unit, "UV-C, at most"), None,
                       no_uvc if g.status == "shape-only" else g.statement_clause(keep_head=True),
                       (), (), ev_kind, r.label, rule=RULE_PRESENCE)
    if integ.value > dl:
        frac = integ.value / tot if tot > 0 else None
        return Verdict(c.id, c.kind, c.text, "holds",
                       Quantity(dl, r.spectrum.integrated_unit, "detection limit"),
                       Quantity(integ.value, r.spectrum.integrated_unit, f"{c.band_name or 'band'} output"),
                       integ.value / dl if dl > 0 else None,
                       f"{sig(integ.value)} {r.spectrum.integrated_unit} in {lo:g}–{hi:g} nm"
                       + (f" ({sig(100 * frac, 3)} % of the measured output)" if frac else ""),
                       (), (), ev_kind, r.label, rule=RULE_PRESENCE)
    return Verdict(c.id, c.kind, c.text, "cannot-hold",
                   Quantity(dl, r.spectrum.integrated_unit, "detection limit"),
                   Quantity(integ.value, r.spectrum.integrated_unit, "band output"), None,
                   f"nothing above the detection limit ({sig(dl)} {r.spectrum.integrated_unit}) in {lo:g}–{hi:g} nm",
                   (), (), ev_kind, r.label, rule=RULE_PRESENCE)


def _q(a: Any) -> Quantity | None:
    if a is None:
        return None
    return Quantity(a.value, a.unit, a.what)


def _listing_against(c: Any, ev: Evidence, lam: float | None,
                     band: tuple[float, float] | None) -> list[Any]:
    """The plausibility checks (:mod:`uvcheck.plausibility`) of the listing's stated data that
    speak against this emission claim, worst first: the photon energy of the claim's
    wavelength against the LED voltage, an LED at a mercury wavelength, and the stated cover
    at that wavelength (a cover that blocks it is a hard bound). A band is checked at the
    listing's stated peak where that lies in the band, else at the band's longest wavelength
    (the most favourable for the photon energy and for a cover)."""
    from uvcheck import plausibility as pl
    from uvcheck.germicidal import technologies

    L, rep = ev.listing, ev.plausibility
    if lam is not None:
        w, w_note = lam, f"wavelength: the claim's {lam:g} nm"
    elif band is not None:
        pk = L.peak_wavelength_nm
        if pk is not None and band[0] <= pk <= band[1]:
            w, w_note = pk, ("wavelength: stated peak wavelength (lamp.peak_wavelength), in the "
                             "claim's band")
        else:
            w, w_note = band[1], (f"wavelength: {band[1]:g} nm, the longest of the claim's band "
                                  "(most favourable)")
    else:
        return []
    tech = rep.technology if rep is not None else None
    is_led = L.leds is not None or technologies().get(tech or "", {}).get("family") == "led"
    dv = rep.die_voltage_V if rep is not None else None
    found = []
    if is_led and dv is not None:
        found.append(pl.check_die_voltage(w, dv))
    if is_led and w < pl.LED_UV_CHECK_BELOW_NM:
        found.append(pl.check_led_wavelength(w))
    if L.cover is not None and L.cover != "none":
        w_cover = lam if lam is not None else band[1]  # type: ignore[index]
        found.append(pl.check_cover(L.cover, w_cover, L.cover_text))
    out = [replace(f, assumptions=tuple(f.assumptions) + (w_note,)) if f.id != "cover-transmission"
           else f for f in found if f.status in ("cannot-hold", "unlikely")]
    out.sort(key=lambda f: 0 if f.status == "cannot-hold" else 1)
    return out


def _tech_name(tech: str | None, techs: Any) -> str:
    """'a Low-pressure mercury discharge lamp (lp_mercury)', 'an incandescent lamp'."""
    if not tech:
        return "the lamp"
    t = techs.get(tech)
    n = f"{t['name']} ({tech})" if t and t.get("name") else f"{tech.replace('_', ' ')} lamp"
    return f"{'an' if n[:1].lower() in 'aeiou' else 'a'} {n}"


def _technology_emits(c: Any, ev: Evidence, fav: list[Reading], lam: float | None,
                      band: tuple[float, float] | None) -> Verdict | None:
    """On an estimate: does the stated technology emit where the claim says? A wavelength is
    held against the technology's lines and peak window (data/technologies.toml) with the
    same tolerance as a measured peak; a band against the share of the nominal spectrum in it.
    Either gives at most 'unlikely' (technology data are not a hard bound). None for a
    wavelength when no favourable reading has a technology in the table."""
    from uvcheck.germicidal import technologies

    techs = technologies()
    known = [(r, techs[r.technology]) for r in fav if r.technology in techs]
    if lam is not None:
        if not known:
            return None
        tol = max(PEAK_TOLERANCE_NM, (ev.listing.fwhm_nm or 0.0) / 2)
        best = None
        for r, t in known:
            lines = [float(x) for x in (t.get("lines_nm") or ())]
            lo, hi = (float(x) for x in t["peak_window_nm"])
            d_win = 0.0 if lo <= lam <= hi else min(abs(lam - lo), abs(lam - hi))
            dist = min([d_win] + [abs(lam - x) for x in lines])
            where = ((f"lines {', '.join(f'{x:g}' for x in lines)} nm; " if lines else "")
                     + f"peak window {lo:g}–{hi:g} nm")
            if best is None or dist < best[0]:
                best = (dist, r, t, where)
        dist, r, t, where = best
        name = _tech_name(r.technology, techs)
        if dist <= tol:
            return Verdict(c.id, c.kind, c.text, "holds", Quantity(lam, "nm", "stated wavelength"),
                           None, None,
                           f"the stated {lam:g} nm is within {sig(tol, 2)} nm of where {name} "
                           f"emits ({where}); an estimate from the listing, not a measurement",
                           (), (), "nominal estimate", r.label,
                           {"technology": r.technology, "distance_nm": dist},
                           rule_technology_tolerance(tol))
        return Verdict(c.id, c.kind, c.text, "unlikely", Quantity(lam, "nm", "stated wavelength"),
                       None, None,
                       f"no line or peak of {name} lies within {sig(tol, 2)} nm of the stated "
                       f"{lam:g} nm ({where}; the nearest is {sig(dist, 3)} nm away); an estimate "
                       "from the listing, not a measurement",
                       (), ("a measured spectrum",), "nominal estimate", r.label,
                       {"technology": r.technology, "distance_nm": dist},
                       rule_technology_tolerance(tol))
    lo, hi = band  # type: ignore[misc]
    best_share, best_r = -1.0, fav[0]
    for r in fav:
        tot = integrate(r.spectrum, *r.spectrum.range_nm).value
        share = integrate(r.spectrum, lo, hi).value / tot if tot > 0 else 0.0
        if share > best_share:
            best_share, best_r = share, r
    name = _tech_name(best_r.technology, techs)
    label = c.band_name or f"{lo:g}–{hi:g} nm"
    if best_share >= NOMINAL_BAND_SHARE_MIN:
        return Verdict(c.id, c.kind, c.text, "holds", None, None, None,
                       f"the nominal spectrum of {name} puts {sig(100 * best_share, 3)} % of its "
                       f"output in {label} ({lo:g}–{hi:g} nm); an estimate from the listing, not "
                       "a measurement", (), (), "nominal estimate", best_r.label,
                       {"technology": best_r.technology, "share": best_share}, RULE_TECHNOLOGY_BAND)
    return Verdict(c.id, c.kind, c.text, "unlikely", None, None, None,
                   f"the nominal spectrum of {name} puts {sig(100 * best_share, 2)} % of its "
                   f"output in {label} ({lo:g}–{hi:g} nm), under the "
                   f"{sig(100 * NOMINAL_BAND_SHARE_MIN, 1)} % taken as emission there (our own "
                   "rule): the stated technology does not emit in that band; an estimate from "
                   "the listing, not a measurement", (), ("a measured spectrum",),
                   "nominal estimate", best_r.label,
                   {"technology": best_r.technology, "share": best_share}, RULE_TECHNOLOGY_BAND)


# --- inactivation and coverage --------------------------------------------------------------

def _percent(c: Any) -> tuple[float | None, list[str]]:
    notes = []
    if c.log_reduction is not None:
        return 100.0 * (1.0 - 10.0 ** (-c.log_reduction)), notes
    if c.reduction_fraction is not None:
        if c.reduction_fraction >= 1.0:
            notes.append("a 100 % kill cannot be shown by any dose; judged as 99.9999 % (6 log)")
            return 99.9999, notes
        return 100.0 * c.reduction_fraction, notes
    return None, notes


def find_organism(name: str) -> list[Any]:
    """Rows of the organism table that match a name as written ("E. coli", "coronavirus")."""
    from uvcheck.inactivation import organisms

    low = name.strip().lower()
    key = ORGANISM_ALIASES.get(low, low)
    rows = [o for o in organisms() if key in o.organism.lower() or low in o.organism.lower()]
    return rows


def _room_box(c: Any, listing: Any) -> tuple[Any, list[str]] | None:
    from uvcheck.room import Box

    area = c.area_m2 if c.area_m2 is not None else None
    vol = c.volume_m3 if c.volume_m3 is not None else None
    if area is None and vol is None:
        area, vol = listing.area_m2, listing.room_volume_m3
    if area is None and vol is None:
        return None
    notes = []
    h = listing.room_height_m
    if h is None:
        h = DEFAULT_ROOM_HEIGHT_M
        notes.append(f"ceiling height {h:g} m assumed (common practice)")
    if area is None:
        area = vol / h
    side = math.sqrt(area)
    notes.append(f"a square room {sig(side)} m × {sig(side)} m × {sig(h)} m")
    return Box(side, side, h), notes


#: Generic words (and phrases: "mold spores" are fungal spores only) and the organism groups
#: of the table they cover (None: every group).
GENERIC_GROUPS = {"bacteria": ("bacterium",), "bacterium": ("bacterium",),
                  "viruses": ("virus",), "virus": ("virus",), "fungi": ("fungal_spore",),
                  "fungus": ("fungal_spore",), "mould": ("fungal_spore",),
                  "mold": ("fungal_spore",), "moulds": ("fungal_spore",),
                  "molds": ("fungal_spore",), "mould spores": ("fungal_spore",),
                  "mold spores": ("fungal_spore",), "mould spore": ("fungal_spore",),
                  "mold spore": ("fungal_spore",), "fungal spores": ("fungal_spore",),
                  "fungal spore": ("fungal_spore",), "fungus spores": ("fungal_spore",),
                  "bacterial spores": ("bacterial_spore",), "bacterial spore": ("bacterial_spore",),
                  "spores": ("bacterial_spore", "fungal_spore"),
                  "spore": ("bacterial_spore", "fungal_spore")}


def _generic_groups(name: str | None) -> tuple[str, ...] | None:
    if not name:
        return None
    low = name.lower()
    words = set(low.replace(",", " ").replace("/", " ").split())
    groups: list[str] = []
    for item in re.split(r"[,/;&]|\band\b", low):
        item = " ".join(item.split())
        if item in GENERIC_GROUPS:           # a phrase first ("mold spores")
            groups += GENERIC_GROUPS[item]
            continue
        for w in item.split():
            if w in GENERIC_GROUPS:
                groups += GENERIC_GROUPS[w]
    if not groups or words & {"germs", "pathogens", "microbes", "microorganisms", "all"}:
        return None
    # the table's 'mixed' rows pool bacteria ("most bacteria except spores"): they stand for
    # bacteria, not for viruses or fungal spores
    return tuple(dict.fromkeys(groups + (["mixed"] if "bacterium" in groups else [])))


def _organism_candidates(c: Any, medium: str) -> tuple[list[Any] | None, str | None]:
    """(rows to consider, or None for 'most susceptible'; a problem text)."""
    from uvcheck.inactivation import select

    if c.organism is None or c.organism_generic:
        groups = _generic_groups(c.organism)
        if groups is None:
            return None, None
        rows = [o for o in select(medium, exclude_groups=("phage",)) if o.group in groups]
        return (rows or None), None
    rows = find_organism(c.organism)
    if not rows:
        return [], f"uvcheck's organism table has no data for {c.organism!r}"
    rel = set(o.id for o in select(medium))
    use = [o for o in rows if o.id in rel] or rows
    return use, None


def _needed_dose(o: Any, percent: float) -> float | None:
    from uvcheck.inactivation import log_for_percent

    n = log_for_percent(percent)
    d = o.dose_for_log(n)
    rng = o.dose_range_for_log(n)
    if rng is not None and rng[0] is not None:
        d = min(d, rng[0]) if d is not None else rng[0]
    return d


def _best_at_point(g: Any, candidates: list[Any] | None, medium: str, percent: float
                   ) -> tuple[Any, float, float] | None:
    """(organism, needed dose J/m², lamp equivalent irradiance W/m²) with the shortest time."""
    from uvcheck.inactivation import select

    pool = candidates if candidates is not None else list(select(medium, exclude_groups=("phage",)))
    best = None
    for o in pool:
        e = g.irradiance_for(o)
        need = _needed_dose(o, percent)
        if not e or not need:
            continue
        t = need / e
        if best is None or t < best[0]:
            best = (t, o, need, e)
    return None if best is None else best[1:]


#: Between organisms named together in one claim ("E. coli and S. aureus", "MRSA, E. coli").
_ORGANISM_LIST_RE = re.compile(r"\s*(?:,|;|&|\band\b|\bund\b|\bplus\b|/)\s*", re.I)


def _named_organisms(c: Any) -> list[str]:
    """The organisms a claim names, where it names more than one that the table does not
    know as a whole ("E. coli and Staphylococcus aureus"), groups among them ("bacteria and
    viruses": each group is judged by its own most susceptible organism); [] otherwise."""
    if c.organism is None or find_organism(c.organism):
        return []
    names = [n.strip(" .") for n in _ORGANISM_LIST_RE.split(c.organism) if n and n.strip(" .")]
    return names if len(names) > 1 else []


def _inactivation(c: Any, ev: Evidence) -> Verdict:
    names = _named_organisms(c)
    if names:
        return _each_organism(c, ev, names)
    return _one_inactivation(c, ev)


def _each_organism(c: Any, ev: Evidence, names: list[str]) -> Verdict:
    """A claim about several organisms holds only as far as it holds for each: judged per
    organism (each with the benefit of the doubt), the verdict is the worst of theirs
    (cannot-hold, then unlikely, not-assessable, holds; among equals the smallest ratio), and
    the basis says which organism decides it (our own rule: "kills A and B" claims both)."""
    from uvcheck.io.listing import _GENERIC_ORG_RE, _SPECIFIC_ORG_RE

    subs = []
    for n in names:
        generic = bool(_GENERIC_ORG_RE.search(n)) and not _SPECIFIC_ORG_RE.search(n)
        subs.append((n, _one_inactivation(replace(c, organism=n, organism_generic=generic), ev)))
    return _in_parts(c, subs, f"the claim names {len(names)} organisms ({', '.join(names)}) and "
                              "must hold for each", "{name}", "organisms")


def _unmeasured_could_hold(r: Reading, lo: float, hi: float) -> tuple[str, str | None]:
    """Whether the part of ``lo``–``hi`` nm that a measured spectrum does not cover could hold
    output: (``covered``, None) when the data cover it all; (``technology``, why) when only
    the part below 240 nm is missing and the lamp's technology emits nothing there
    (``germicidal._ozone``: absent by technology); else (``open``, why)."""
    integ = integrate(r.spectrum, lo, hi)
    if covers_all(integ.coverage):
        return "covered", None
    d_lo, d_hi = r.spectrum.range_nm
    below_only = d_hi >= hi and not any(a < hi and b > lo for a, b in r.spectrum.gaps_nm)
    g = r.germicidal_at(None)
    oz = g.ozone
    if below_only and d_lo <= OZONE_EDGE_NM and oz.status == "absent" and oz.basis == "technology":
        name = (g.technology or {}).get("name") or "lamp of this kind"
        return "technology", (f"{lo:g}–{d_lo:g} nm was not measured and is taken as empty: a "
                              f"{name} emits nothing below 240 nm")
    return "open", (f"only {integ.coverage:.0%} of {lo:g}–{hi:g} nm was measured (the data "
                    f"cover {d_lo:g}–{d_hi:g} nm), and the unmeasured part could make up the "
                    "shortfall")


def _unless_unmeasured(v: Verdict, r: Reading | None, lo: float, hi: float,
                       needs: str) -> Verdict:
    """An efficacy or output verdict against the lamp (``cannot-hold`` or ``unlikely``) that
    rests on a measured band the data cover only in part: ``not-assessable``, since the
    unmeasured part could hold what is missing (benefit of the doubt; DEVELOPERS.md), unless
    the lamp's technology rules output there out (then the verdict stands and says so). Any
    other verdict is returned as it is."""
    if v.verdict not in ("cannot-hold", "unlikely") or r is None or r.evidence != "measured":
        return v
    kind, why = _unmeasured_could_hold(r, lo, hi)
    if kind == "covered":
        return v
    if kind == "technology":
        return replace(v, assumptions=tuple(v.assumptions) + (why,))
    return replace(v, verdict="not-assessable",
                   basis=f"on the measured part alone, {v.basis}; but {why}",
                   missing=(needs,), rule=None)


def _no_absolute_output(c: Any, ev: Evidence) -> Verdict:
    """``not-assessable`` for an efficacy claim with no absolute reading: no lamp data at all,
    or a relative spectrum with no power stated."""
    if not ev.readings:
        return _na(c, ev, NO_LAMP_DATA, NO_LAMP_DATA_NEEDS)
    return _na(c, ev, "no absolute output: the spectrum is relative and no power is stated",
               ("a scaled spectrum (--scale-band) or lamp.optical_power / lamp.electrical_power",))


def _one_inactivation(c: Any, ev: Evidence) -> Verdict:
    """One organism (or group): judged on the readings, then by the stray-light rule for
    efficacy (:func:`_unless_stray_credit`)."""
    return _unless_stray_credit(_inactivation_on(c, ev), c, ev, _inactivation_on)


def _unless_stray_credit(v: Verdict, c: Any, ev: Evidence,
                         judge_on: Callable[[Any, Evidence], Verdict]) -> Verdict:
    """An efficacy verdict that ``holds`` on a measurement whose UV-C reads as likely stray
    light or noise is judged again without that UV-C (:meth:`Reading.stray_free`). If it
    still holds (on output the tool reads as real), it stands and its basis says so; if not,
    it is ``not-assessable``: crediting a dose to UV-C that the tool itself reads as not
    emitted would contradict its own emission verdict, and a measurement with the stray light
    controlled decides it (the mirror of :func:`_unless_stray` for safety claims; our own
    rule). Any other verdict is returned as it is."""
    if v.verdict != "holds" or not ev.measured:
        return v
    free = [r.stray_free() for r in ev.readings]
    if all(x is None for x in free):
        return v
    ev2 = replace(ev, readings=tuple(x if x is not None else r for r, x in zip(ev.readings, free)),
                  uncertainty=None)
    v2 = judge_on(c, ev2)
    details = {**v.details, "without_stray_uvc": v2.verdict}
    if v2.verdict == "holds":
        return replace(v, basis=f"{v.basis}; it holds even without the UV-C below 280 nm that "
                                f"reads as likely stray light ({v2.basis})", details=details)
    without = (f"{v2.verdict}: {v2.basis}" if v2.verdict != "not-assessable"
               else f"not assessable: {v2.basis}")
    return replace(v, verdict="not-assessable",
                   basis=f"{v.basis}, but only through the UV-C below 280 nm, which reads as "
                         f"likely stray light or noise (see the germicidal artefacts) and is "
                         f"not credited as germicidal output; without it, {without}",
                   missing=STRAY_UVC_NEEDED, details=details, rule=RULE_STRAY_UVC_EFFICACY)


def _inactivation_on(c: Any, ev: Evidence) -> Verdict:
    ev_kind = "measured" if ev.measured else "nominal estimate"
    percent, notes = _percent(c)
    missing = list(c.missing(ev.listing))
    vague = getattr(c, "time_word", None)
    if vague:
        from uvcheck.io.listing import vague_time_text

        notes.append(vague_time_text(vague))
    if missing:
        return _na(c, ev, "the claim does not say " + " or ".join(missing)
                   + (f"; {notes[-1]}" if vague else ""), missing, notes)
    t = c.time_s
    fav = ev.favourable()
    if not fav:
        return _no_absolute_output(c, ev)
    box_info = None
    d = c.distance_m
    if d is None and c.area_m2 is None and c.volume_m3 is None:
        d = ev.listing.use_distance_m
    if d is None:
        box_info = _room_box(c, ev.listing)
    if d is not None and any(r.d_ref is None for r in fav):
        return _na(c, ev, "the spectrum's measurement distance is unknown, so the dose at "
                          f"{sig(d)} m cannot be worked out", ("--distance",))
    media = [c.medium] if c.medium else (["surface"] if d is not None else ["air", "surface"])
    assumptions = list(notes)
    if c.medium is None:
        assumptions.append("the claim names no medium: " + (
            "judged on a surface at that distance" if len(media) == 1 else
            "judged on " + " and ".join(media) + ", whichever is more favourable"))
    best: dict[str, Any] | None = None
    for r in fav:
        for medium in media:
            cands, problem = _organism_candidates(c, medium)
            if problem:
                return _na(c, ev, problem, ("an organism in uvcheck's table (uvcheck organisms)",))
            if d is not None:
                g = r.germicidal_at(d)
                hit = _best_at_point(g, cands, medium, percent)
                if hit is None:
                    continue
                o, need, e = hit
                place = f"at {sig(d)} m"
                avail = e * t
            else:
                box, bnotes = box_info
                if medium == "air":
                    room = r.room(box, "centre")
                    hit = None
                    from uvcheck.inactivation import select

                    pool = cands if cands is not None else list(select("air", exclude_groups=("phage",)))
                    for o in pool:
                        ts = room.air_time_s(o, percent)
                        if ts:
                            e_avg = room.equivalent_fluence_rate(o.wavelength_nm, o.pathway) or 0.0
                            need = _needed_dose(o, percent)
                            if need and (hit is None or need / max(e_avg, 1e-300) < hit[1] / max(hit[2], 1e-300)):
                                hit = (o, need, e_avg)
                    if hit is None:
                        continue
                    o, need, e = hit
                    place = "averaged over the room's air (well mixed)"
                    avail = e * t
                else:
                    room = r.room(box, "centre")
                    p10 = room.plane.get("p10_W_m2")
                    # the organism's equivalent flux times the plane's p10 per watt
                    g_ref = r.germicidal_at(None)
                    hit = _best_at_point(g_ref, cands, "surface", percent)
                    per_w = room.plane.get("p10_per_W_m2")
                    if hit is None or not per_w:
                        continue
                    o, need, _ = hit
                    flux_o = room.germicidal.equivalent_irradiance(o.wavelength_nm, o.pathway)
                    if not flux_o:
                        continue
                    e = flux_o * per_w
                    place = "on the worst-lit 10 % of the work plane"
                    avail = e * t
                assumptions = list(dict.fromkeys(assumptions + bnotes + [
                    "lamp placed at the centre of the room, radiating in all directions "
                    "(the most favourable placement)"]))
            ratio = avail / need
            if best is None or ratio > best["ratio"]:
                best = {"ratio": ratio, "organism": o, "need": need, "avail": avail, "e": e,
                        "place": place, "reading": r.label, "medium": medium}
    if best is None:
        return _na(c, ev, "no organism in uvcheck's table can be evaluated with this lamp's output",
                   ("organism data for the lamp's wavelengths",), assumptions)
    o = best["organism"]
    ratio = best["ratio"]
    r_best = next((x for x in fav if x.label == best["reading"]), None)
    if r_best is not None:
        from uvcheck.germicidal import cross_wavelength_note

        moved = cross_wavelength_note(o, r_best.germicidal_at(None).organisms.uvc_peak_nm)
        if moved is not None:
            assumptions.append(f"{o.organism}: {moved}")
    verdict = _by_ratio(ratio, ev.margin)
    rel = ev.relative_interval("germicidal", "equivalent_254", "most_favourable") if ev.measured else None
    decision = None
    if rel is not None:
        verdict, decision = _decide(best["need"], best["avail"], rel, ev.rule, _EFFICACY, _mj_cm2)
    who = (f"the most susceptible relevant organism in uvcheck's table ({o.organism}, {o.medium} data)"
           if (c.organism is None or c.organism_generic) else o.organism)
    if c.organism is None or c.organism_generic:
        assumptions.append(f"'{c.organism or 'germs'}' judged with {who}; most real pathogens need more")
    in_t = format_duration(t) + (f" ('{vague}', not quantified)" if vague else "")
    basis = (f"{pct(percent)} % of {who} needs {_mj_cm2(best['need'])} in {in_t} "
             f"{best['place']}; this lamp gives at most {_mj_cm2(best['avail'])} there "
             f"({_uw_cm2(best['e'])} × {format_duration(t)}): {_short(ratio)}")
    if decision is not None:
        basis += f" (dose {decision})"
    v = Verdict(c.id, c.kind, c.text, verdict,
                Quantity(best["need"], "J m-2", f"dose for {pct(percent)} %"),
                Quantity(best["avail"], "J m-2", "dose this lamp gives, most favourable reading"),
                ratio, basis, tuple(assumptions), (), ev_kind, best["reading"],
                {"organism_id": o.id, "medium": best["medium"], "time_s": t,
                 "irradiance_W_m2": best["e"], "place": best["place"]},
                rule_interval(ev.rule) if decision is not None else rule_margin(ev.margin))
    return _unless_unmeasured(v, r_best, *UVC_BAND_NM, "a spectrum covering the whole of UV-C "
                              "(200–280 nm)")


def _coverage(c: Any, ev: Evidence) -> Verdict:
    """'for rooms up to 20 m²': the listing's own inactivation claim over that room (the first
    that can be judged there, e.g. not one naming an organism the table lacks), else the
    benchmark of :data:`COVERAGE_BENCHMARK`.

    The basis says what covering the room was taken to mean. When the inactivation claim is
    itself judged over the same room (it names no place of its own and the listing's room is
    this one), its numbers are not repeated: the basis points to that claim and gives the
    factor.
    """
    missing = c.missing()
    if missing:
        return _na(c, ev, "no area or room volume stated", missing)
    from uvcheck.io.listing import Claim

    room = (f"{c.area_m2:g} m²" if c.area_m2 is not None else f"{c.volume_m3:g} m³")
    kills = [k for k in ev.listing.claims if k.kind == "inactivation" and k.time_s
             and (k.reduction_fraction is not None or k.log_reduction is not None)]
    # the first of the listing's kill claims that can be judged over the room (one naming an
    # organism the table lacks would leave the room claim open while another could decide
    # it); when none can, the first, whose verdict says why
    kill, probe, v = None, None, None
    for k in kills:
        p_k = replace(k, id=c.id, text=c.text, kind="inactivation", distance_m=None,
                      area_m2=c.area_m2, volume_m3=c.volume_m3)
        v_k = _inactivation(p_k, ev)
        if kill is None or v.verdict == "not-assessable" and v_k.verdict != "not-assessable":
            kill, probe, v = k, p_k, v_k
        if v.verdict != "not-assessable":
            break
    same_room = False
    if kill is not None:
        how = f"the listing's own claim '{kill.text or kill.id}' applied to the whole room"
        own = (kill.distance_m, kill.area_m2, kill.volume_m3, ev.listing.use_distance_m)
        if all(x is None for x in own):
            same_room = _room_box(probe, ev.listing) == _room_box(kill, ev.listing)
    else:
        p, t = COVERAGE_BENCHMARK
        probe = Claim(id=c.id, kind="inactivation", text=c.text, reduction_fraction=p / 100,
                      log_reduction=-math.log10(1 - p / 100), organism="germs",
                      organism_generic=True, time_s=t, area_m2=c.area_m2, volume_m3=c.volume_m3)
        how = (f"uvcheck's benchmark for a room claim: {p:g} % of the most susceptible relevant "
               f"organism within {format_duration(t)} (not a standard)")
        v = _inactivation(probe, ev)
    if v.verdict == "not-assessable":
        basis = f"covering {room}: {v.basis}"
    elif kill is not None and same_room:
        basis = (f"covering {room} means doing what '{kill.text or kill.id}' says across a room of "
                 f"that size; that claim ({kill.id}) is already judged over this same room, so "
                 f"the numbers are the same: {_short(v.ratio)}" if v.ratio else v.basis)
    elif kill is not None:
        basis = (f"covering {room} means doing what '{kill.text or kill.id}' says across a room of "
                 f"that size: {v.basis}")
    else:
        basis = f"covering {room} by {how}: {v.basis}"
    return replace(v, kind="coverage", text=c.text, basis=basis,
                   assumptions=(f"judged as {how}",) + v.assumptions,
                   details={**v.details, "judged_as": kill.id if kill is not None else "benchmark",
                            "same_room_as_claim": same_room})


# --- ozone ------------------------------------------------------------------------------------

#: What decides an ozone-free claim the data cannot.
OZONE_EVIDENCE_NEEDED = ("a measurement down to 180 nm, or the lamp glass (ozone-free doped "
                         "quartz)",)


def _own_ozone_statement(c: Any, ev: Evidence) -> Any | None:
    """Another claim of the same listing that says the lamp makes ozone (or emits 185 nm):
    "produces ozone", "not ozone-free", "UV-C + ozone", "254nm + 185nm"; an ozone-free wording
    ("0 ozone emission", "Ozonfrei") is not one
    (:func:`uvcheck.io.listing.says_ozone_made`)."""
    from uvcheck.io.listing import ozone_statement

    return ozone_statement(ev.listing.claims, besides=c)


def _ozone(c: Any, ev: Evidence) -> Verdict:
    r = ev.likely()
    if r is None:
        own = _own_ozone_statement(c, ev)
        if own is not None:
            # the seller's own words say otherwise, with no lamp data at all
            return Verdict(c.id, c.kind, c.text, "unlikely", None, None, None,
                           f"the listing's own claim {own.id} ({own.text!r}) says the lamp makes "
                           f"ozone or emits at 185 nm; there are no lamp data", (),
                           OZONE_EVIDENCE_NEEDED, "listing", None, {"contradicted_by": own.id},
                           rule="the listing's own statements (at most 'unlikely')")
        return _na(c, ev, NO_LAMP_DATA, NO_LAMP_DATA_NEEDS)
    oz = r.germicidal_at(None).ozone.to_dict()
    status = oz.get("status")
    note = oz.get("note") or oz.get("basis") or ""
    ev_kind = r.evidence
    own = _own_ozone_statement(c, ev)
    if own is not None and (status != "present" or oz.get("basis") == "stated"):
        # the seller's own words say otherwise; a measurement down to 185 nm would decide
        return Verdict(c.id, c.kind, c.text, "unlikely", None, None, None,
                       f"the listing's own claim {own.id} ({own.text!r}) says the lamp makes "
                       f"ozone or emits at 185 nm; the data say: {note}", (),
                       OZONE_EVIDENCE_NEEDED, ev_kind, r.label,
                       {"contradicted_by": own.id},
                       rule="the listing's own statements (at most 'unlikely')")
    if status == "absent" and r.evidence != "measured":
        from uvcheck.features import peak_info
        from uvcheck.germicidal import rules_out_below_240, technologies

        tech = technologies().get(r.technology or "", {})
        peak = peak_info(r.spectrum).peak_nm
        if tech.get("below_240") == "possible" and not rules_out_below_240(r.technology, peak):
            # the model leaves out what only the envelope glass decides
            return _na(c, ev, f"a {tech.get('name', r.technology)} can emit below 240 nm "
                              f"({tech.get('below_240_source', '')}); the nominal model "
                              "assumes an envelope that blocks it, which a listing cannot show",
                       OZONE_EVIDENCE_NEEDED)
    if status == "absent":
        what = (f"the nominal model of this technology ({r.technology}) has no output below "
                "240 nm" if r.evidence != "measured" else f"no output below 240 nm: {note}")
        return Verdict(c.id, c.kind, c.text, "holds", None, None, None, what, (), (), ev_kind,
                       r.label, rule=("the technology's nominal model" if r.evidence != "measured"
                                      else RULE_PRESENCE))
    if status == "present":
        return Verdict(c.id, c.kind, c.text, "cannot-hold", None, None, None,
                       f"output below 240 nm, which makes ozone from air: {note}", (), (),
                       ev_kind, r.label, rule=RULE_PRESENCE)
    return Verdict(c.id, c.kind, c.text, "not-assessable", None, None, None,
                   f"cannot be known from the data: {note}", (),
                   OZONE_EVIDENCE_NEEDED,
                   ev_kind, r.label)


# --- safety -----------------------------------------------------------------------------------

#: The hazards a safety claim at a distance is judged on: the eye and skin hazards of IEC
#: 62471:2006 clause 4.3 that a lamp's irradiance gives; E_H, the skin's thermal hazard, is
#: left out because its limit covers exposures up to 10 s only (from memory).
SAFETY_HAZARDS = ("actinic_uv", "near_uv", "blue_light", "retinal_thermal", "ir_eye")
#: What a safety claim needs when only a hazard's detection limit reaches its exposure limit.
BELOW_DETECTION_NEEDS = ("a more sensitive measurement of the hazard's range (closer, a longer "
                         "integration or averaging, a dark scan subtracted)",)
#: What a safety claim on an estimate needs when only some of its cases stay within the limits.
SAFETY_MEASUREMENT_NEEDED = ("a measured spectrum of the lamp as sold (through any cover), with "
                             "its measurement distance",)


def _exposure_at(r: Reading, ev: Evidence, d: float) -> tuple[dict[str, Any],
                                                              tuple[float, dict] | None, list[str]]:
    """(hazards, (shortest t_max, its hazard) or None, hazards not fully assessed) of one
    reading at a distance of use, under the evidence's limit set."""
    hz = r.hazards_at(d, ev.limit_set_id).get("hazards") or {}
    worst = None
    open_h = []
    for hid in SAFETY_HAZARDS:
        h = hz.get(hid)
        if not h:
            continue
        if h.get("status") in ("not-assessable", "partial"):
            open_h.append(h.get("symbol") or hid)
        tm = h.get("t_max_s")
        if tm is not None and (worst is None or tm < worst[0]):
            worst = (tm, h)
    return hz, worst, open_h


def _unless_stray(v: Verdict, r: Reading,
                  fails: Callable[[Reading], tuple[bool, str]]) -> Verdict:
    """A verdict against a safety or risk-group claim (``cannot-hold`` or ``unlikely``) where
    the reading's UV-C reads as likely stray light or noise: ``fails(x)`` judges the reading
    without that UV-C (:meth:`Reading.stray_free`), giving (whether the claim still fails,
    what that reading gives, in words). If it still fails, the verdict stands and its basis
    says so; if not, the claim is ``not-assessable``: the verdict would rest on UV-C that the
    tool itself reads as not emitted, and a measurement with the stray light controlled
    decides it. Any other verdict is returned as it is."""
    if v.verdict not in ("cannot-hold", "unlikely"):
        return v
    x = r.stray_free()
    if x is None:
        return v
    still, without = fails(x)
    details = {**v.details, "without_stray_uvc": without}
    if still:
        return replace(v, basis=f"{v.basis}; so even without the UV-C below 280 nm that reads "
                                f"as likely stray light, and without that level above 280 nm "
                                f"({without})", details=details)
    return replace(v, verdict="not-assessable",
                   basis=f"{v.basis}, but only through the UV-C below 280 nm, which reads as "
                         f"likely stray light or noise (see the germicidal artefacts), and that "
                         f"stray level above 280 nm; without them {without}",
                   missing=STRAY_UVC_NEEDED, details=details, rule=RULE_STRAY_UVC)


def _only_likely_within(c: Any, ev: Evidence, r: Reading, t: float, where: str,
                        exceed: list[tuple[float, str, Reading]], cases: list[Reading],
                        assumptions: Sequence[str], details: dict[str, Any]) -> Verdict:
    """``not-assessable``: the most likely case stays within the limits but another case of the
    estimate does not (the estimate's range includes an unsafe exposure)."""
    exceed.sort(key=lambda e: e[0])
    tm, what, x = exceed[0]
    n = len(exceed)
    more = (f"; {n} of the {len(cases)} cases exceed a limit" if n > 1 else "")
    basis = (f"{where}, within the limits in the most likely case ({r.label}) only: "
             f"the {x.label} case reaches {what} in {format_duration(tm)}, against "
             f"{format_duration(t)} of exposure{more}; the estimate's range includes an unsafe "
             f"exposure, so a measurement is needed{ev.limits_named()}")
    return Verdict(c.id, c.kind, c.text, "not-assessable", Quantity(t, "s", "exposure time"),
                   Quantity(tm, "s", f"shortest time to a limit over the estimate's cases "
                                     f"({x.label})"), tm / t, basis, tuple(assumptions),
                   SAFETY_MEASUREMENT_NEEDED, r.evidence, x.label,
                   {**details, "most_likely_reading": r.label,
                    "cases_exceeding": {e[2].label: e[0] for e in exceed},
                    "cases_judged": [y.label for y in cases], "limit_set": ev.limit_set_id},
                   RULE_SAFETY_ESTIMATE)


def _other_cases(c: Any, ev: Evidence, r: Reading, t: float, where: str, cases: list[Reading],
                 probe: Callable[[Reading], tuple[float | None, str, bool]],
                 assumptions: Sequence[str], details: dict[str, Any]
                 ) -> tuple[Verdict | None, tuple[float, Reading] | None]:
    """The one rule for a safety claim on an estimate whose most likely case stays within the
    limits: every other case must too. ``probe(x)`` gives a case's (time to a limit or None,
    which limit in words, whether its figure is confirmed: fully assessed, not a lower
    bound). Returns (the verdict when a case exceeds a limit, or when one cannot be
    confirmed: ``not-assessable`` either way; else None) and the shortest time to a limit over
    the cases, with its case."""
    exceed, unconfirmed = [], []
    shortest: tuple[float, Reading] | None = None
    for x in cases:
        tx, what, confirmed = probe(x)
        if tx is not None and tx < t:
            exceed.append((tx, what, x))
        elif not confirmed:
            unconfirmed.append(x)
        if tx is not None and (shortest is None or tx < shortest[0]):
            shortest = (tx, x)
    if exceed:
        return _only_likely_within(c, ev, r, t, where, exceed, [r] + cases, assumptions,
                                   details), shortest
    if unconfirmed:
        return _na(c, ev, f"{where} within the limits in the most likely case ({r.label}), but "
                          f"{', '.join(x.label for x in unconfirmed)} could not be fully "
                          f"assessed, so safety cannot be confirmed{ev.limits_named()}",
                   SAFETY_MEASUREMENT_NEEDED, assumptions), shortest
    return None, shortest


#: A safety claim made for an empty room ("safe around children when nobody is in the room",
#: "safe: use only in unoccupied rooms"): our own reading of plain English.
_EMPTY_ROOM_RE = re.compile(
    r"\b(?:when|while|if|once|as\s+long\s+as|provided)\s+(?:the\s+room\s+is\s+(?:empty|vacant|"
    r"unoccupied)|(?:nobody|no\s*one|no\s+(?:people|persons?|humans?|one|pets?|animals?|"
    r"children|kids))\s+(?:is|are)\s+(?:in|present|around|inside|there))|\bunoccupied\b|"
    r"\bempty\s+rooms?\b|\bvacant\s+rooms?\b|\bleave\s+the\s+room\b|"
    r"\bno\s*one\s+(?:is\s+)?(?:present|around|in\s+the\s+room)\b|"
    # French and German (a short list, as for the safety words)
    r"\b(?:pièce|salle|chambre)s?\s+vides?\b|\ben\s+l'absence\s+de\s+(?:personnes?|toute\s+personne)\b|"
    r"\bleeren?\s+(?:Raum|Räumen|Zimmer[n]?)\b|\bwenn\s+niemand\b|\bunbewohnt", re.I)
#: A safety claim that rests on a safeguard switching the lamp off when someone is there
#: ("automatic shut-off when a human body is detected", "radar sensor", "switches off when
#: the lid is opened"): our own reading of plain English.
_SAFEGUARD_RE = re.compile(
    r"(?:\b(?:shut|switch|turn|power)(?:s|es|ed)?[\s-]*off|\bauto(?:matic(?:ally)?)?[\s-]*"
    r"(?:off|stop|shut)|\binterlock)"
    r".{0,60}?\b(?:human|body|bodies|person|people|motion|movement|presence|radar|sensor|"
    r"detect\w*|enter\w*|opened|lid|door)"
    r"|\b(?:human|body|motion|presence|radar|pir|microwave)[\s-]*(?:sensor|sensing|detection|"
    r"induction)\b|\binterlock\w*\b", re.I)
#: What decides a safety claim made for an empty room.
EMPTY_ROOM_NEEDS = ("the product's safeguards (a timer, a presence sensor or an interlock that "
                    "keeps it off with people or animals present) and its instructions",)


def _safety(c: Any, ev: Evidence) -> Verdict:
    v = _safety_verdict(c, ev)
    if _SAFEGUARD_RE.search(c.text or "") and "occupied-rooms" not in c.safe_for:
        # the claim rests on a safeguard, which no spectrum or listing tests; the lamp's
        # figures say how fast it must act
        return _na(c, ev, "the claim rests on a safeguard that switches the lamp off when "
                          "someone is there (a sensor, an interlock), which neither a spectrum "
                          "nor a listing can test; it must act before the exposure limit is "
                          "reached, and for anyone it misses: " + v.basis,
                   ("a test of the safeguard: that it keeps the lamp off, or switches it off "
                    "fast enough, with a person or animal present",), v.assumptions)
    if _EMPTY_ROOM_RE.search(c.text or "") and "occupied-rooms" not in c.safe_for:
        # With nobody there, nobody is exposed: the exposure limits do not decide the claim;
        # the lamp's figures stay in the basis, since they say what happens if someone is
        return _na(c, ev, "the claim is made for an empty room, where nobody is exposed, so "
                          "the exposure limits do not decide it; what decides it is whether the "
                          "lamp can be lit with people or animals present (and, for a lamp that "
                          "makes ozone, whether the room is aired before they return); for "
                          "anyone who is there: "
                          + v.basis, EMPTY_ROOM_NEEDS, v.assumptions)
    if v.verdict == "holds" and not ev.measured and _rests_on_stated_filter(ev):
        # the estimate is within the limits because the seller says a filter removes the
        # longer-wavelength UV-C; a listing cannot show that filter (as the envelope glass
        # of a mercury lamp for 'ozone-free')
        return _na(c, ev, f"{v.basis}, but only because the far-UVC "
                          "filter the listing states removes the longer-wavelength UV-C, which "
                          "a listing cannot show",
                   ("a measured spectrum of the lamp as sold, through its filter",),
                   v.assumptions)
    return v


def _rests_on_stated_filter(ev: Evidence) -> bool:
    """The estimate models a KrCl* lamp with the far-UVC filter the listing states."""
    return bool(getattr(ev.listing, "filtered", None)) and any(
        getattr(r, "technology", None) == "krcl_excimer" for r in ev.readings)


def _likely_absolute(c: Any, ev: Evidence, cannot: str) -> Reading | Verdict:
    """The most likely reading, or the ``not-assessable`` verdict when there is none (no lamp
    data at all) or it is relative (``cannot``: what cannot be worked out then)."""
    r = ev.likely()
    if r is None:
        return _na(c, ev, NO_LAMP_DATA, NO_LAMP_DATA_NEEDS)
    if not r.spectrum.is_absolute:
        return _na(c, ev, f"no absolute reading of the lamp: {cannot}",
                   ("a scaled spectrum, or lamp.optical_power / lamp.electrical_power",))
    return r


def _safety_verdict(c: Any, ev: Evidence) -> Verdict:
    missing = c.missing()
    if missing:
        return _na(c, ev, "the claim does not say who or what it is safe for", missing)
    r = _likely_absolute(c, ev, "exposure cannot be worked out")
    if isinstance(r, Verdict):
        return r
    t = c.time_s or WORKDAY_S
    assumptions = []
    if c.time_s is None:
        assumptions.append("exposure for a full 8-h day (no time stated)")
    who = ", ".join(c.safe_for)
    if "pets" in c.safe_for or "animals" in c.safe_for:
        assumptions.append("no exposure limits exist for animals; the human limits are used as a "
                           "proxy (common practice)")
    if "plants" in c.safe_for:
        assumptions.append("no exposure limits exist for plants; the human limits are used as a "
                           "proxy (our own choice): UV-C and UV-B damage leaves as they damage "
                           "skin")
    lnamed = ev.limits_named()
    # an estimate: every case of every reading not refuted must stay within the limits
    cases = [x for x in ev.safety_cases() if x is not r] if not ev.measured else []
    labels = " / ".join(x.label for x in ev.safety_cases())
    occupied = "occupied-rooms" in c.safe_for
    box = _room_box(c, ev.listing) if occupied else None
    if occupied and box is not None:
        occ = r.occupant_exposure(box[0], ev.limit_set_id)
        tl = occ.get("time_to_limit_s")
        assumptions += box[1] + ["lamp at the ceiling centre; occupant's eyes at "
                                 f"{sig(occ.get('eye_height_m'))} m facing the lamp (worst case)"]
        if not occ.get("evaluated"):
            return _na(c, ev, "the occupant exposure could not be evaluated", (), assumptions)
        ratio = None if tl is None else tl / t
        verdict = "holds" if (tl is None or tl >= t) else "cannot-hold"
        if verdict == "holds" and occ.get("lower_bound"):
            verdict = "not-assessable"
        what = ("the daily actinic UV limit" if not lnamed
                else f"the daily actinic UV limit ({occ.get('symbol')})")
        from uvcheck.limits import get_limit_set

        lim = get_limit_set(ev.limit_set_id).hazard("actinic_uv").limit_at(t)
        # the exposure over t as a share of the limit for t (None: t outside its durations)
        share = occ["effective_W_m2"] / lim if lim and occ.get("effective_W_m2") is not None else None
        if tl is not None:
            basis = (f"an occupant reaches {what} in {format_duration(tl)} "
                     f"(needs at least {format_duration(t)})")
        else:
            basis = f"an occupant stays within {what}" + (
                f": {sig(100 * share, 2)} % of it in {format_duration(t)}" if share else "")
        if verdict == "not-assessable":
            basis += (" (from partial data: the spectrum does not cover the limit's whole range, "
                      "so the true time may be shorter)")
        basis += lnamed
        details = {"for": who, "limit_set": ev.limit_set_id, "hazard": occ.get("symbol"),
                   "share_of_limit": share}
        if verdict == "holds" and cases:
            def occupant(x: Reading) -> tuple[float | None, str, bool]:
                ox = x.occupant_exposure(box[0], ev.limit_set_id)  # type: ignore[index]
                ok = bool(ox.get("evaluated"))
                return (ox.get("time_to_limit_s") if ok else None, what,
                        ok and not ox.get("lower_bound"))

            other, _ = _other_cases(c, ev, r, t, "for an occupant", cases, occupant,
                                    assumptions, details)
            if other is not None:
                return other
            basis += f"; so in every case of the estimate ({labels})"
        def occupant_fails(x: Reading) -> tuple[bool, str]:
            ox = x.occupant_exposure(box[0], ev.limit_set_id)  # type: ignore[index]
            tx = ox.get("time_to_limit_s")
            if tx is not None and tx < t:
                return True, f"an occupant reaches {what} in {format_duration(tx)}"
            return False, f"an occupant stays within {what} for {format_duration(t)}"

        return _unless_stray(
            Verdict(c.id, c.kind, c.text, verdict, Quantity(t, "s", "exposure time"),
                    None if tl is None else
                    Quantity(tl, "s", "time to the exposure limit at eye height"), ratio,
                    basis, tuple(assumptions), (), r.evidence, r.label, details,
                    rule=RULE_SAFETY_ESTIMATE if cases and verdict == "holds" else RULE_SAFETY),
            r, occupant_fails)
    d = c.distance_m or ev.listing.use_distance_m
    if d is None:
        d = 0.2
        assumptions.append("no distance stated: judged at 0.2 m, the IEC 62471 assessment distance")
    if r.d_ref is None:
        return _na(c, ev, "the measurement distance is unknown, so exposure at a distance of use "
                          "cannot be worked out", ("--distance",), assumptions)
    hz, worst, open_h = _exposure_at(r, ev, d)
    if worst is not None and below_detection(worst[1]):
        # the shortest time comes from a hazard under the detection limit: its value is that
        # limit, a bound, not the most likely reading the safety rule judges (our own rule)
        seen = [(h["t_max_s"], h) for k, h in hz.items() if k in SAFETY_HAZARDS
                and h.get("t_max_s") is not None and not below_detection(h)]
        detected = min(seen, key=lambda e: e[0]) if seen else None
        if worst[0] < t and (detected is None or detected[0] >= t):
            tm, h = worst
            return _na(c, ev, f"at {sig(d)} m {h.get('symbol')} is below the measurement's "
                              f"detection limit; at that limit the {h.get('name') or 'its'} "
                              f"limit would be reached in {format_duration(tm)}, against "
                              f"{format_duration(t)} of exposure, so the measurement is not "
                              f"sensitive enough to show whether the limit is kept{lnamed}",
                       BELOW_DETECTION_NEEDS, assumptions)
        worst = detected if detected is not None and detected[0] < t else worst
    decision = None
    verdict_u = None
    if worst is not None and ev.measured:
        hid_w = next((k for k, v in hz.items() if v is worst[1]), None)
        rel = ev.relative_interval("hazards", hid_w) if hid_w else None
        if rel is not None and rel[0] > 0:
            # t_max scales as 1/value: its interval is t_max·(1/high, 1/low)
            verdict_u, decision = _decide(t, worst[0], (1.0 / rel[1], 1.0 / rel[0]), ev.rule,
                                          _SAFETY, format_duration)
    if worst is not None and (worst[0] < t or verdict_u in ("cannot-hold", "unlikely")):
        tm, h = worst
        lower = h.get("status") == "partial"
        verdict = verdict_u or "cannot-hold"
        basis = (f"at {sig(d)} m the {h.get('name') or h.get('symbol')} limit ({h.get('symbol')}) "
                 f"is reached in {format_duration(tm)}, against {format_duration(t)} of exposure"
                 + (" (from partial data: the true time is shorter)" if lower else "")
                 + (f" (t_max {decision})" if decision else "") + lnamed)
        def distance_fails(x: Reading) -> tuple[bool, str]:
            _, wx, _ = _exposure_at(x, ev, d)
            if wx is not None and wx[0] < t:
                return True, (f"the {wx[1].get('symbol')} limit is reached in "
                              f"{format_duration(wx[0])}")
            if wx is None:
                return False, f"no assessed hazard reaches its limit in {format_duration(t)}"
            return False, (f"the shortest time to a limit is {format_duration(wx[0])} "
                           f"({wx[1].get('symbol')}), against {format_duration(t)} of exposure")

        return _unless_stray(
            Verdict(c.id, c.kind, c.text, verdict, Quantity(t, "s", "exposure time"),
                    Quantity(tm, "s", f"t_max ({h.get('symbol')})"), tm / t, basis,
                    tuple(assumptions), (), r.evidence, r.label,
                    {"hazard": h.get("symbol"), "distance_m": d, "for": who,
                     "limit_set": ev.limit_set_id},
                    RULE_SAFETY if decision is None else
                    f"{RULE_SAFETY}, with {rule_interval(ev.rule)}"),
            r, distance_fails)
    if open_h:
        return _na(c, ev, f"within the limits so far, but {', '.join(open_h)} could not be fully "
                          f"assessed, so safety cannot be confirmed{lnamed}",
                   ("a spectrum covering 200–1400 nm", "the source size (--source-size)"), assumptions)
    details = {"distance_m": d, "for": who, "limit_set": ev.limit_set_id}
    shortest = (worst[0], r) if worst else None
    if cases:
        def at_distance(x: Reading) -> tuple[float | None, str, bool]:
            if x.d_ref is None:
                return None, "", False
            _, wx, ox = _exposure_at(x, ev, d)
            if wx is None:
                return None, "", not ox
            h = wx[1]
            return wx[0], f"the {h.get('name') or h.get('symbol')} limit ({h.get('symbol')})", \
                not ox

        other, short_x = _other_cases(c, ev, r, t, f"at {sig(d)} m", cases, at_distance,
                                      assumptions, details)
        if other is not None:
            return other
        if short_x is not None and (shortest is None or short_x[0] < shortest[0]):
            shortest = short_x
    tm = shortest[0] if shortest else None
    every = f" in every case of the estimate ({labels})" if cases else ""
    return Verdict(c.id, c.kind, c.text, "holds", Quantity(t, "s", "exposure time"),
                   Quantity(tm, "s", "shortest t_max") if tm else None,
                   (tm / t) if tm else None,
                   f"at {sig(d)} m every assessed hazard stays within its limit for "
                   f"{format_duration(t)}{every}{lnamed}",
                   tuple(assumptions), (), r.evidence,
                   shortest[1].label if shortest else r.label, details,
                   RULE_SAFETY if not cases else RULE_SAFETY_ESTIMATE)


# --- optical power and efficiency ------------------------------------------------------------

def _flux_upper_bound(r: Reading, band: tuple[float, float] | None) -> float | None:
    """Largest flux consistent with the irradiance at d_ref: isotropic emission, Φ = 4πd²E
    (a directional lamp emits less for the same on-axis irradiance). [W]"""
    if r.d_ref is None or not r.spectrum.is_absolute:
        return None
    lo, hi = band if band else r.spectrum.range_nm
    e = integrate(r.spectrum, lo, hi).value
    return 4.0 * math.pi * r.d_ref ** 2 * e


def _optical_power(c: Any, ev: Evidence) -> Verdict:
    if c.power_W is None:
        return _na(c, ev, "no power stated", c.missing())
    f = ev.plausibility.by_id(f"optical-vs-electrical:{c.id}") if ev.plausibility else None
    if not ev.measured:
        if f is not None:
            return Verdict(c.id, c.kind, c.text, f.status if f.status in VERDICTS else "not-assessable",
                           _q(f.needed), _q(f.available), f.ratio, f.message, tuple(f.assumptions),
                           tuple(f.missing), "listing", None, {"finding": f.id, "basis": f.basis},
                           f.rule)
        return _na(c, ev, "a stated optical power can only be checked against a measurement or "
                          "the electrical power", ("a spectrum with --distance", "lamp.electrical_power"))
    r = ev.readings[0]
    ub = _flux_upper_bound(r, c.band_nm)
    if ub is None:
        return _na(c, ev, "needs an absolute spectrum and its measurement distance", ("--distance",))
    ratio = ub / c.power_W
    verdict = _by_ratio(ratio, ev.margin)
    v = Verdict(c.id, c.kind, c.text, verdict, Quantity(c.power_W, "W", "stated optical power"),
                Quantity(ub, "W", "largest flux consistent with the measurement"), ratio,
                f"the measured irradiance at {sig(r.d_ref)} m allows at most {sig(ub)} W "
                f"(all-round emission, Φ = 4πd²E) against the stated {sig(c.power_W)} W: {_short(ratio)}",
                ("a directional lamp emits less than this bound",), (), "measured", r.label,
                rule=rule_margin(ev.margin))
    if c.band_nm is None:
        return v
    return _unless_unmeasured(v, r, *c.band_nm, "a spectrum covering the whole band")


def _irradiance(c: Any, ev: Evidence) -> Verdict:
    """A stated irradiance ("UV-C output 2.5 mW/cm² at 10 cm") against the most favourable
    reading's irradiance in that band at that distance (benefit of the doubt, as for
    efficacy; the emitter model scales it with distance). No band named: all UV, 200–400 nm,
    the most favourable reading. UV-C that reads as stray light is not credited
    (:func:`_unless_stray_credit`)."""
    return _unless_stray_credit(_irradiance_on(c, ev), c, ev, _irradiance_on)


def _irradiance_on(c: Any, ev: Evidence) -> Verdict:
    from uvcheck.germicidal import spectrum_at

    missing = c.missing(ev.listing)
    if missing:
        return _na(c, ev, "the claim does not say " + " or ".join(missing), missing)
    d = c.distance_m or ev.listing.use_distance_m
    assumptions: list[str] = []
    if c.distance_m is None:
        assumptions.append(f"the claim names no distance: judged at the listing's distance of "
                           f"use, {sig(d)} m")
    if c.band_nm is not None:
        (lo, hi), band = c.band_nm, c.band_name or f"{c.band_nm[0]:g}–{c.band_nm[1]:g} nm"
    else:
        from uvcheck.io.listing import ALL_UV_NM

        lo, hi = ALL_UV_NM
        band = f"UV ({lo:g}–{hi:g} nm)"
        assumptions.append(f"the claim names no band: judged on all UV, {lo:g}–{hi:g} nm (the "
                           "most favourable reading)")
    fav = ev.favourable()
    if not fav:
        return _no_absolute_output(c, ev)
    if any(r.d_ref is None and r.spectrum.quantity == "irradiance" for r in fav):
        return _na(c, ev, f"the spectrum's measurement distance is unknown, so the irradiance at "
                          f"{sig(d)} m cannot be worked out", ("--distance",))
    best: tuple[float, Reading, bool] | None = None
    for r in fav:
        spec = spectrum_at(r.spectrum, r.conditions, d)
        if spec.quantity != "irradiance":
            continue
        ig = integrate(spec, lo, hi)
        e, dl = ig.value, ig.detection_limit
        under = dl is not None and dl > 0 and e <= dl
        if under:
            # below the detection limit: the favourable reading is the apparent value + 3 σ,
            # the upper bound the germicidal evaluation (and so the kill claims) use
            e = max(e, 0.0) + dl
        if best is None or e > best[0]:
            best = (e, r, under)
    if best is None:
        return _na(c, ev, "the lamp's output cannot be made an irradiance at that distance",
                   ("an irradiance spectrum with --distance",))
    e, r, under = best
    stated = c.irradiance_W_m2
    ratio = e / stated
    basis = (f"the claim states {_uw_cm2(stated)} of {band} at {sig(d)} m; this lamp gives at "
             f"most {_uw_cm2(e)} there"
             + (" (its output there is below the detection limit: that is the apparent value "
                "plus the limit, an upper bound)" if under else "")
             + f": {_short(ratio)}")
    v = Verdict(c.id, c.kind, c.text, _by_ratio(ratio, ev.margin),
                Quantity(stated, "W m-2", f"stated {band} irradiance"),
                Quantity(e, "W m-2", "irradiance this lamp gives, most favourable reading"),
                ratio, basis, tuple(assumptions), (),
                "measured" if ev.measured else "nominal estimate", r.label,
                {"distance_m": d, "band_nm": [lo, hi]}, rule_margin(ev.margin))
    return _unless_unmeasured(v, r, lo, hi, f"a spectrum covering the whole of {band}")


#: A share of the lamp's output in a band it is said not to emit in at or above which the
#: claim cannot hold; a share above the detection limit but below it is 'unlikely' (traces).
#: Our own rule: 1 % is far above any stray light a measurement would report as emission. [-]
NO_EMISSION_SHARE = 0.01
#: Rule of a no-emission claim ("UV-free"): a safety statement, so no benefit of the doubt.
RULE_NO_EMISSION = ("the no-emission rule (output in the band above the detection limit "
                    f"contradicts the claim: 'cannot-hold' from {NO_EMISSION_SHARE:.0%} of the "
                    "lamp's output, 'unlikely' below; no benefit of the doubt, as for safety "
                    "claims)")


def _no_emission(c: Any, ev: Evidence) -> Verdict:
    """"UV-free", "no UV-C": the lamp emits nothing in the band(s). A safety statement: judged
    on the most likely reading, no benefit of the doubt. Each named band is judged and the
    worst decides. A leakage claim ("no UV leakage") is about an enclosure, which a spectrum
    of the lamp does not show: not assessable."""
    from uvcheck.io.listing import DENIABLE_BANDS_NM

    if c.band_nm is None:
        return _na(c, ev, "the claim names no band", c.missing())
    if re.search(r"(?i)leak", c.text or ""):
        return _na(c, ev, "a claim of no leakage is about the enclosure: a spectrum of the lamp "
                          "(or a listing) does not show what leaves the closed enclosure",
                   ("a measurement outside the closed enclosure, where a person would be",))
    bands = list(c.bands or (c.band_name or f"{c.band_nm[0]:g}–{c.band_nm[1]:g} nm",))
    if len(bands) == 1:
        return _one_no_emission(c, ev, bands[0], c.band_nm)
    subs = [(b, _one_no_emission(c, ev, b, DENIABLE_BANDS_NM[b])) for b in bands]
    return _in_parts(c, subs, f"the claim names {len(bands)} bands ({', '.join(bands)}) and the "
                              "lamp must emit in none", "{name}", "parts",
                     {"decided_by": _worst_part(subs)[0]})


def _share(spec: Spectrum, lo: float, hi: float) -> float | None:
    """The share of the spectrum's output in lo–hi nm, or None when it has no output. [-]"""
    tot = total_integral(spec)
    return integrate(spec, lo, hi).value / tot if tot > 0 else None


def _one_no_emission(c: Any, ev: Evidence, band: str, nm: tuple[float, float]) -> Verdict:
    lo, hi = nm
    r = ev.likely()
    if r is None:
        return _na(c, ev, NO_LAMP_DATA, NO_LAMP_DATA_NEEDS)
    if ev.measured:
        from uvcheck.germicidal import with_noise_floor

        free = r.stray_free()
        spec = with_noise_floor(r.spectrum)[0]   # as the germicidal evaluation takes it
        integ = integrate(spec, lo, hi)
        dl = integ.detection_limit or 0.0
        share = _share(spec, lo, hi)
        what = (f"{band} ({lo:g}–{hi:g} nm): {sig(integ.value)} {spec.integrated_unit}"
                + (f", {share:.2%} of the lamp's output" if share is not None else ""))
        if integ.value > dl and share is not None and free is not None:
            # judged without the UV-C that reads as stray light (the germicidal evaluation)
            xi = integrate(free.spectrum, lo, hi)
            if not xi.value > (xi.detection_limit or 0.0):
                return _na(c, ev, f"the lamp shows {what}, but only through UV-C that reads as "
                                  "likely stray light or noise (see the germicidal artefacts)",
                           STRAY_UVC_NEEDED)
        if integ.value > dl and share is not None:
            verdict = "cannot-hold" if share >= NO_EMISSION_SHARE else "unlikely"
            basis = f"the lamp emits in {what}, above the detection limit ({sig(dl)})"
        elif not covers_all(integ.coverage):
            return _na(c, ev, f"only {integ.coverage:.0%} of {band} was measured (the data "
                              f"cover {spec.range_nm[0]:g}–{spec.range_nm[1]:g} nm); in the "
                              f"measured part the output is below the detection limit",
                       (f"a spectrum covering the whole of {band}",))
        else:
            verdict = "holds"
            basis = (f"{band} ({lo:g}–{hi:g} nm) is below the detection limit "
                     f"({sig(integ.value)} ≤ {sig(dl)} {spec.integrated_unit})")
        return Verdict(c.id, c.kind, c.text, verdict,
                       Quantity(NO_EMISSION_SHARE, "-", f"largest share of the output in {band}"),
                       None if share is None else Quantity(share, "-", f"share in {band}"),
                       None, basis, (), (), "measured", r.label,
                       {"band_nm": [lo, hi], "share": share}, RULE_NO_EMISSION)
    # an estimate: a model shows what the technology emits, not traces
    shares = [_share(x.spectrum, lo, hi) or 0.0 for x in (ev.safety_cases() or [r])]
    likely = _share(r.spectrum, lo, hi) or 0.0
    if likely >= NO_EMISSION_SHARE:
        return Verdict(c.id, c.kind, c.text, "unlikely",
                       Quantity(NO_EMISSION_SHARE, "-", f"largest share of the output in {band}"),
                       Quantity(likely, "-", f"share in {band} (nominal estimate)"), None,
                       f"the nominal estimate puts {likely:.2%} of the lamp's output in {band} "
                       f"({lo:g}–{hi:g} nm); only a measurement can show how much there is",
                       (), ("a measured spectrum covering the band",), "nominal estimate",
                       r.label, {"band_nm": [lo, hi], "share": likely}, RULE_TECHNOLOGY_BAND)
    if max(shares) < 0.1 * NO_EMISSION_SHARE:
        return Verdict(c.id, c.kind, c.text, "holds", None,
                       Quantity(max(shares), "-", f"share in {band} (nominal estimate)"), None,
                       f"the nominal estimate puts at most {max(shares):.2%} of the lamp's output "
                       f"in {band} ({lo:g}–{hi:g} nm): the technology emits next to nothing there",
                       (), (), "nominal estimate", r.label, {"band_nm": [lo, hi]},
                       "the stated technology's nominal spectrum")
    return _na(c, ev, f"the nominal estimate puts up to {max(shares):.2%} of the lamp's output in "
                      f"{band}: whether that is none only a measurement can show",
               ("a measured spectrum covering the band",))


def _efficiency(c: Any, ev: Evidence) -> Verdict:
    f = ev.plausibility.by_id(f"efficiency:{c.id}") if ev.plausibility else None
    if f is None:
        return _na(c, ev, "the technology is not known, so the efficiency cannot be checked",
                   ("lamp.technology",) if c.efficiency_fraction is not None else c.missing())
    return Verdict(c.id, c.kind, c.text, f.status if f.status in VERDICTS else "not-assessable",
                   _q(f.needed), _q(f.available), f.ratio, f.message, tuple(f.assumptions),
                   tuple(f.missing), "listing", None, {"finding": f.id, "basis": f.basis}, f.rule)


# --- a stated risk group, a claimed approval ----------------------------------------------------

#: Rule of a risk-group claim.
RULE_RISK_GROUP = ("the risk-group rule (the IEC 62471:2006 group at its assessment distance, "
                   "no benefit of the doubt; on an estimate, every case)")
#: Rule of an approval claim (our own reading of public agency guidance; not legal advice).
RULE_APPROVAL = ("agency practice (public agency guidance as the project's practice notes "
                 "summarise it; at most 'unlikely'; not legal advice)")
_GROUP_ORDER = ("Exempt", "RG1", "RG2", "RG3")


def _group_span(r: Reading) -> tuple[int, int, Any] | None:
    """(lowest, highest group index the data allow, the OverallRiskGroup) of a reading under
    IEC 62471:2006, or None when no hazard could be assessed."""
    from uvcheck.hazards import DEFAULT_LIMIT_SET

    rg = r.hazards(DEFAULT_LIMIT_SET).risk_group
    if rg.group is None:
        return None
    return (_GROUP_ORDER.index(rg.group), _GROUP_ORDER.index(rg.upper_bound or rg.group), rg)


def _risk_group(c: Any, ev: Evidence) -> Verdict:
    """A stated IEC 62471 risk group ("RG0", "Exempt (EN 62471)") against the group the data
    give at the standard's assessment distance: it holds when the highest group the data
    allow is no higher; it cannot hold when the lowest already is; otherwise (a group known
    only as a lower bound) it is not assessable. On an estimate every case must hold (our own
    rule, as for safety claims). Risk groups are those of IEC 62471:2006, whatever limit set
    the rest of the assessment uses."""
    if c.risk_group is None:
        return _na(c, ev, "no risk group stated", c.missing())
    r = _likely_absolute(c, ev, "no risk group can be given")
    if isinstance(r, Verdict):
        return r
    if r.d_ref is None:
        return _na(c, ev, "the measurement distance is unknown, so the risk group holds at the "
                          "unknown measurement position, not at the IEC 62471 assessment "
                          "distance", ("--distance",))
    stated = _GROUP_ORDER.index(c.risk_group)
    span = _group_span(r)
    if span is None:
        return _na(c, ev, "no hazard could be assessed from the data",
                   ("a spectrum covering 200–1400 nm",))
    lo, hi, rg = span
    hz = r.hazards()

    def sym(hid: str | None) -> str:
        try:
            return hz.hazard(hid).symbol if hid else "?"
        except (KeyError, StopIteration, ConfigurationError):
            return str(hid)

    at = hz.evaluation.distance_m
    where = f"at {sig(at)} m (the IEC 62471 assessment distance)"
    details = {"stated": c.risk_group, "group": rg.group, "upper_bound": rg.upper_bound,
               "governing": rg.governing, "distance_m": at}
    label = (f"at least {rg.group}" if rg.is_lower_bound else rg.group)
    if lo > stated:
        def group_fails(x: Reading) -> tuple[bool, str]:
            sx = _group_span(x)
            if sx is None:
                return False, "no hazard reaches a group above Exempt"
            gx = sx[2]
            return sx[0] > stated, (f"the lamp is {'at least ' if gx.is_lower_bound else ''}"
                                    f"{gx.group} (set by {sym(gx.governing)})")

        return _unless_stray(
            Verdict(c.id, c.kind, c.text, "cannot-hold", None, None, None,
                    f"{where} the lamp is {label} (set by {sym(rg.governing)}), above the "
                    f"stated {c.risk_group}", (), (), r.evidence, r.label, details,
                    RULE_RISK_GROUP),
            r, group_fails)
    if hi > stated:
        return _na(c, ev, f"{where} the lamp is {label} (set by {sym(rg.governing)}); "
                          f"{', '.join(sym(h) for h in rg.open_hazards)} could not be fully "
                          f"assessed, so it "
                          f"could be as high as {rg.upper_bound}, above the stated "
                          f"{c.risk_group}", ("a spectrum covering 200–1400 nm",
                                              "the source size (--source-size)"))
    cases = [x for x in ev.safety_cases() if x is not r] if not ev.measured else []
    above, open_ = [], []
    for x in cases:
        sx = _group_span(x) if x.d_ref is not None else None
        if sx is None:
            open_.append(x.label)
        elif sx[0] > stated:
            above.append(f"{x.label}: {sx[2].group}")
        elif sx[1] > stated:
            open_.append(x.label)
    if above or open_:
        why = (f"the {'; '.join(above)} case{'s' if len(above) > 1 else ''} "
               f"{'are' if len(above) > 1 else 'is'} above it" if above else
               f"{', '.join(open_)} could not be fully assessed")
        return _na(c, ev, f"{where} the most likely case ({r.label}) is {label}, within the "
                          f"stated {c.risk_group}, but {why}; the estimate's range includes a "
                          "higher group, so a measurement is needed", SAFETY_MEASUREMENT_NEEDED)
    every = (f" in every case of the estimate ({' / '.join(x.label for x in ev.safety_cases())})"
             if cases else "")
    return Verdict(c.id, c.kind, c.text, "holds", None, None, None,
                   f"{where} the lamp is {label} (set by {sym(rg.governing)}), within the stated "
                   f"{c.risk_group}{every}", (), (), r.evidence, r.label, details, RULE_RISK_GROUP)


def _approval(c: Any, ev: Evidence) -> Verdict:
    """A claimed approval by an agency. The US EPA approves, certifies and registers no UV
    lamp: a product that kills germs by light alone is a pesticide *device*, which carries
    the EPA establishment number of the factory that made it, and that number is not an
    approval (public agency guidance, as the project's practice notes summarise it): the
    claim is 'unlikely'. An approval by the US FDA concerns medical devices, which the FDA
    clears or approves by number; it can be checked only in the FDA's own device listings,
    not from the lamp's data: 'not-assessable' (from memory; not legal advice)."""
    if c.agency is None:
        return _na(c, ev, "no agency named", c.missing())
    if c.agency == "EPA":
        return Verdict(c.id, c.kind, c.text, "unlikely", None, None, None,
                       "the US EPA does not approve, certify or register UV lamps: a device "
                       "that kills germs by light is a pesticide device, which carries the EPA "
                       "establishment number of the factory that made it, and that number is "
                       "not an approval", (), ("the label's EPA establishment number (not an "
                                               "approval)",), "listing", None,
                       {"agency": "EPA"}, RULE_APPROVAL)
    return _na(c, ev, "the US FDA clears or approves medical devices by number (from memory); "
                      "whether this product has such a number can be checked only in the FDA's "
                      "own device listings, not from the lamp's data",
               ("the FDA clearance or approval number, to look up in the FDA's device listings",))


_JUDGES = {"emission": _emission, "inactivation": _inactivation, "coverage": _coverage,
           "ozone-free": _ozone, "safety": _safety, "optical-power": _optical_power,
           "irradiance": _irradiance, "no-emission": _no_emission,
           "efficiency": _efficiency, "risk-group": _risk_group, "approval": _approval}


# ---------------------------------------------------------------------------------------------
# Entry points
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class ClaimsResult:
    """Verdicts and the evidence summary (the ``claims`` and ``listing`` JSON blocks)."""

    verdicts: tuple[Verdict, ...]
    listing: Any
    plausibility: Any
    readings: tuple[str, ...]
    decision_rule: str

    def counts(self) -> dict[str, int]:
        out = {v: 0 for v in VERDICTS}
        for x in self.verdicts:
            out[x.verdict] += 1
        return out

    def to_dict(self) -> dict[str, Any]:
        return {"claims": [v.to_dict() for v in self.verdicts],
                "claims_summary": {"counts": self.counts(), "readings": list(self.readings),
                                   "decision_rule": self.decision_rule},
                "listing": self.listing.to_dict(),
                "plausibility": None if self.plausibility is None else self.plausibility.to_dict()}


#: The exception to the margin, as printed with every decision rule.
HARD_BOUNDS_TEXT = (
    "Exception: a hard bound decides 'cannot-hold' at any shortfall, with no margin: physics "
    "(a photon energy above what the LED voltage allows, more optical than electrical power, "
    "the wall-plug limit EQE·hc/λ/(e·V)), a cover material that blocks the band, the best the "
    "technology has reached, or no emission above the detection limit where the claim needs "
    "it. Checks against technology data or rules of thumb (common practice) give at most "
    "'unlikely'. Each verdict names the rule that decided it.")


#: How a safety claim is judged on an estimate (printed with the decision rule of a screening).
SAFETY_ESTIMATE_TEXT = (
    "On an estimate, a safety claim holds only when every case (min / typical / max) of every "
    "reading the listing does not refute stays within the limits; when only some cases do, it "
    "is 'not-assessable' until a measurement decides. ")


def decision_rule_text(margin: float = MARGIN, rule: str | None = None,
                       estimate: bool = False) -> str:
    head = ("efficacy claims: benefit of the doubt (most favourable reading, most susceptible "
            "organism, lowest dose across studies; no dose from UV-C that reads as stray "
            "light: 'not-assessable' when only that UV-C would make it hold). Safety claims: "
            "fail as soon as the most "
            "likely reading exceeds an exposure limit, except where only UV-C that reads as "
            "stray light (and that stray level in UV-B and UV-A) makes it exceed "
            "('not-assessable' then). "
            + (SAFETY_ESTIMATE_TEXT if estimate else ""))
    if rule is None:
        return head + (f"Without measurement uncertainty: 'cannot-hold' only when the favourable "
                       f"reading falls short by more than {sig(margin, 2)}×, 'unlikely' within "
                       f"it. " + HARD_BOUNDS_TEXT)
    if rule == "simple":
        return head + ("Simple acceptance on the 95 % interval (ILAC-G8:09/2019): decided on the "
                       "measured value; 'unlikely' when only the upper end of the interval meets "
                       "the need, 'cannot-hold' when even the upper end falls short. "
                       + HARD_BOUNDS_TEXT)
    return head + ("Guarded acceptance on the 95 % interval (ILAC-G8:09/2019, guard band U): "
                   "'holds' only when the whole interval meets the need (for safety: stays within "
                   "the limit); 'cannot-hold' when even the upper end falls short (for safety: "
                   "when the measured value exceeds the limit); otherwise 'unlikely'. "
                   + HARD_BOUNDS_TEXT)


def judge(listing: Any, readings: Iterable[Reading], measured: bool,
          margin: float = MARGIN, uncertainty: dict[str, Any] | None = None,
          rule: str = "simple", limit_set: str | None = None) -> ClaimsResult:
    """Verdicts for a listing's claims over the given readings (see the module docstring).

    uncertainty : the assessment's ``uncertainty`` section; with it, measured efficacy and
        safety verdicts are decided on the 95 % intervals under ``rule`` (``simple`` or
        ``guarded`` acceptance) instead of the fixed :data:`MARGIN`.
    limit_set : the exposure-limit set safety claims are judged against (the assessment's
        ``AssessOptions.limit_set``); None = the default set. A basis names a set other
        than the default.
    """
    from uvcheck.limits import get_limit_set
    from uvcheck.plausibility import screen_listing

    if limit_set is not None:
        get_limit_set(limit_set)   # an unknown id fails here, naming the available ones
    pl = screen_listing(listing)
    ev = Evidence(listing, tuple(readings), pl, measured, margin, uncertainty, rule, limit_set)
    verdicts = tuple(evaluate_claims(ev))
    evaluated = bool(uncertainty and uncertainty.get("status") == "evaluated" and measured)
    return ClaimsResult(verdicts, listing, pl, tuple(r.label for r in ev.readings),
                        decision_rule_text(margin, rule if evaluated else None,
                                           estimate=not measured))
