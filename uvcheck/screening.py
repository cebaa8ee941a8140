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
from uvcheck.spectrum import integrate


def _summary(readings: Any) -> list[dict[str, Any]]:
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
        out.append(row)
    return out


def screen_listing_file(listing: Any, limit_set: str = "iec62471_2006") -> Assessment:
    """The screening assessment of a listing (see the module docstring)."""
    from uvcheck.claims import judge, readings_from_listing
    from uvcheck.nominal import ESTIMATE_LABEL, listing_readings
    from uvcheck.plausibility import screen_listing

    pl = screen_listing(listing)
    ests = listing_readings(listing)
    readings = readings_from_listing(listing, pl, ests)
    verdicts = judge(listing, readings, measured=False)
    likely = next((r for r in readings if r.likely), readings[0])
    spec = likely.spectrum.derive(meta={**dict(likely.spectrum.meta), "source": listing.source,
                                        "sha256": listing.sha256, "origin": "nominal",
                                        "estimate": True})
    nominal = {"label": ESTIMATE_LABEL, "most_likely_reading": likely.label,
               "estimates": [e.to_dict() for e in ests], "readings": _summary(readings)}
    a = assess(spec, likely.conditions, None, AssessOptions(limit_set=limit_set,
                                                            technology=likely.technology),
               claims=verdicts, extra={"nominal": nominal})
    warnings = (f"ESTIMATE: no measurement. Every figure comes from the listing's stated data "
                f"through a nominal model (reading '{likely.label}', placed at "
                f"{likely.d_ref:g} m); the figures are ranges, see 'nominal'.",) + a.warnings
    from dataclasses import replace

    return replace(a, warnings=warnings)
