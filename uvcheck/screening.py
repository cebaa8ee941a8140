"""Screening a listing without a measurement: nominal spectra, full evaluation, verdicts.

``screen_listing_file(listing)`` builds the nominal readings of :mod:`uvcheck.nominal`
(as stated, and what the stated LED voltages allow; each min / typical / max), judges every
claim over them (:mod:`uvcheck.claims`), and runs the full assessment (bands, hazards,
germicidal output) on the *most likely* reading — the typical case of the most credible way
to read the listing — so that the screening result has the same shape as a measured
assessment. Everything is labelled an ESTIMATE.

A listing that states too little to model the lamp (no technology, wavelength or band: claims
only, say) is not refused: :class:`ListingOnly` lists its claims, each judged with no lamp
data (not assessable, with what would decide it, unless the listing's own statements decide
it), and its plausibility findings, and says that there is no lamp model.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from uvcheck.conditions import Conditions

from uvcheck.assessment import AssessOptions, Assessment, assess
from uvcheck.limits import DEFAULT_LIMIT_SET
from uvcheck.spectrum import integrate


#: Hazards whose t_max is summarised per reading and case (the ones a UV lamp usually sets).
SUMMARY_HAZARDS = ("actinic_uv", "near_uv", "blue_light")


def _summary(readings: Any, limit_set: str) -> list[dict[str, Any]]:
    """One row per reading and case: band irradiances at the reference distance and, for an
    absolute reading, the overall risk group and the t_max of :data:`SUMMARY_HAZARDS`
    (uvcheck.hazards on that reading; an ESTIMATE like every screening figure)."""
    out = []
    for r in readings:
        s = r.spectrum
        row = {"label": r.label, "likely": r.likely, "favourable": r.favourable,
               "refuted_by": list(r.refuted), "technology": r.technology,
               "distance_m": r.d_ref, "quantity": s.quantity}
        if s.is_absolute:
            row["uvc_W_m2"] = integrate(s, 200.0, 280.0).value
            row["uva_W_m2"] = integrate(s, 315.0, 400.0).value
            row["total_W_m2"] = integrate(s, *s.range_nm).value
            hz = r.hazards(limit_set).to_dict()
            rg = hz.get("risk_group") or {}
            row["risk_group"] = rg.get("group")
            row["risk_group_is_lower_bound"] = bool(rg.get("is_lower_bound"))
            row["governing_hazard"] = rg.get("governing")
            row["hazard_distance_m"] = (hz.get("evaluation") or {}).get("distance_m")
            row["t_max_s"] = {k: (hz.get("hazards") or {}).get(k, {}).get("t_max_s")
                              for k in SUMMARY_HAZARDS}
        out.append(row)
    return out


#: What a listing-only result says first (terminal, JSON warnings, batch).
NO_LAMP_MODEL = ("NO LAMP MODEL: no measurement, and the listing states nothing the lamp's output "
                 "can be modelled from (no technology, wavelength or band). Only its claims are "
                 "listed; none can be confirmed, and nothing here says whether the lamp is safe. "
                 "Measure the lamp, or state lamp.technology or lamp.peak_wavelength (with its "
                 "power) in the listing file")


@dataclass(frozen=True)
class ListingOnly:
    """The screening of a listing that states too little to model the lamp (see the module
    docstring). It answers what the consumers of an :class:`Assessment` ask of one:
    :meth:`to_dict` (the JSON: ``input`` with origin ``listing-only``, ``lamp_model``, the
    claims blocks, warnings and notes, and no spectral, hazard or germicidal sections, there
    being no figures), :meth:`summary_parts`, ``spectrum`` (None), ``conditions`` and
    ``sections``.

    listing : the :class:`~uvcheck.io.listing.Listing`.
    claims : its :class:`~uvcheck.claims.ClaimsResult`, judged with no readings.
    reason : why no lamp model could be built (the nominal model's error, in one line).
    hint : what the listing could state to allow one (the error's advice).
    """

    listing: Any
    claims: Any
    reason: str
    hint: str | None = None
    limit_set: str = DEFAULT_LIMIT_SET
    spectrum: None = None
    conditions: Conditions = field(default_factory=Conditions)

    @property
    def sections(self) -> dict[str, Any]:
        return {"claims": self.claims}

    @property
    def warnings(self) -> tuple[str, ...]:
        return (NO_LAMP_MODEL + (f" ({self.hint})" if self.hint else ""),)

    def _input(self) -> dict[str, Any]:
        lst = self.listing
        return {"path": lst.source, "sha256": lst.sha256, "origin": "listing-only",
                "invented": bool(lst.invented), "quantity": None, "unit": None,
                "range_nm": None, "step_nm": None, "noise_floor": None, "scaling": [],
                "instrument": {}, "inferred": {}, "warnings": []}

    def to_dict(self) -> dict[str, Any]:
        from uvcheck import __version__
        from uvcheck.assessment import SCHEMA, SCREENING_NOTICE

        part = self.claims.to_dict()
        notes = list(part.pop("notes", []))
        d: dict[str, Any] = {
            "schema": SCHEMA, "tool": {"name": "uvcheck", "version": __version__},
            "input": self._input(), "conditions": self.conditions.to_dict(),
            "position": "No lamp model and no measurement: no figure for any position.",
            "lamp_model": {"status": "not-built", "reason": self.reason, "hint": self.hint},
        }
        d.update(part)
        d["warnings"] = list(self.warnings)
        d["notes"] = notes + ([SCREENING_NOTICE] if SCREENING_NOTICE not in notes else [])
        return d

    def summary_parts(self) -> dict[str, Any]:
        """What a batch summary row reads: the origin and the claims (no figures)."""
        part = self.claims.to_dict()
        part.pop("notes", None)
        return {"input": {"origin": "listing-only"}, "spectral": {"peak_nm": None},
                "conditions": self.conditions.to_dict(), **part}


def screen_listing_file(listing: Any, limit_set: str = DEFAULT_LIMIT_SET
                        ) -> Assessment | ListingOnly:
    """The screening assessment of a listing (see the module docstring); a
    :class:`ListingOnly` when the listing states too little to model the lamp but has claims
    to list (a listing with neither is refused: there is nothing to screen)."""
    from uvcheck.claims import judge, readings_from_listing
    from uvcheck.errors import UnmodelledListingError
    from uvcheck.nominal import ESTIMATE_LABEL, listing_readings
    from uvcheck.plausibility import screen_listing

    pl = screen_listing(listing)
    try:
        ests = listing_readings(listing)
    except UnmodelledListingError as exc:
        if not listing.claims:
            raise
        from uvcheck.nominal import claim_wavelength_hint

        verdicts = judge(listing, [], measured=False, limit_set=limit_set)
        return ListingOnly(listing, verdicts, exc.what, claim_wavelength_hint(listing),
                           limit_set)
    readings = readings_from_listing(listing, pl, ests)
    verdicts = judge(listing, readings, measured=False, limit_set=limit_set)
    likely = next((r for r in readings if r.likely), readings[0])
    spec = likely.spectrum.derive(meta={**dict(likely.spectrum.meta), "source": listing.source,
                                        "sha256": listing.sha256, "origin": "nominal",
                                        "estimate": True})
    nominal = {"label": ESTIMATE_LABEL, "most_likely_reading": likely.label,
               "estimates": [e.to_dict() for e in ests], "readings": _summary(readings, limit_set)}
    # no Monte Carlo: its inputs (calibration, wavelength scale, distance, stray light) describe
    # a measurement; the spread of an estimate is the range of its readings (min/typical/max)
    a = assess(spec, likely.conditions, None, AssessOptions(limit_set=limit_set,
                                                            technology=likely.technology,
                                                            uncertainty=False),
               claims=verdicts, extra={"nominal": nominal})
    warnings = (f"ESTIMATE: no measurement. Every figure comes from the listing's stated data "
                f"through a nominal model (reading '{likely.label}', placed at "
                f"{likely.d_ref:g} m); the figures are ranges, see 'nominal' (the spread of an "
                f"estimate is the range of its readings; the measurement-uncertainty "
                f"evaluation does not apply to a model).",) + a.warnings
    from dataclasses import replace

    return replace(a, warnings=warnings)
