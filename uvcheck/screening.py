"""Screening a listing without a measurement: nominal spectra, full evaluation, verdicts.

``screen_listing_file(listing)`` builds the nominal readings of :mod:`uvcheck.nominal`
(as stated, and what the stated LED voltages allow; each min / typical / max), judges every
claim over them (:mod:`uvcheck.claims`), and runs the full assessment (bands, hazards,
germicidal output) on the *most likely* reading — the typical case of the most credible way
to read the listing — so that the screening result has the same shape as a measured
assessment. Everything is labelled an ESTIMATE.
"""

from __future__ import annotations

from typing import Any

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


def screen_listing_file(listing: Any, limit_set: str = DEFAULT_LIMIT_SET) -> Assessment:
    """The screening assessment of a listing (see the module docstring)."""
    from uvcheck.claims import judge, readings_from_listing
    from uvcheck.nominal import ESTIMATE_LABEL, listing_readings
    from uvcheck.plausibility import screen_listing

    pl = screen_listing(listing)
    ests = listing_readings(listing)
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
