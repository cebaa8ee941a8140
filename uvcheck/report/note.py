"""The consumer-safety note's content, built from ``Assessment.to_dict()``.

:func:`build_note` turns the assessment dict (the single source of truth) and, optionally, the
listing dict into a *view model*: a plain dict of strings, rows and flags that the HTML
template (:mod:`uvcheck.report.html`) and the PDF writer (:mod:`uvcheck.report.pdf`) both
render, so the two outputs say the same thing. Every number in the view model is formatted
from a number in the result dict; nothing is recomputed here and nothing is invented: a section
the result does not have is ``None`` and the renderers leave it out.

Pure functions (no I/O) except :func:`reference_tables`, which reads the provenance records of
the data tables the result names (``data/``, loaded once per process).
"""

from __future__ import annotations

import datetime as _dt
import os
from typing import Any, Iterable, Mapping

from uvcheck.report.cautions import DOES_NOT_COVER, LOCAL_CODES, applicable
from uvcheck.units import format_duration, sig, to_trade

Result = Mapping[str, Any]

VERDICT_TEXT = {"holds": "Holds", "cannot-hold": "Cannot hold", "unlikely": "Unlikely",
                "not-assessable": "Not assessable", "info": "Information"}
#: Risk groups in words (IEC 62471:2006 clause 6.1; the wording is ours).
GROUP_TEXT = {"Exempt": "no photobiological hazard under foreseeable use",
              "RG1": "low risk", "RG2": "moderate risk", "RG3": "high risk, even for brief exposure"}
#: The governing hazard's limit in plain words.
LIMIT_WORDS = {"actinic_uv": "UV exposure limit for skin and eyes",
               "near_uv": "UV-A exposure limit for the eyes",
               "blue_light": "blue-light exposure limit for the retina",
               "retinal_thermal": "retinal thermal limit",
               "retinal_thermal_weak_stimulus": "retinal thermal limit",
               "ir_eye": "infrared limit for the eyes", "skin_thermal": "thermal limit for the skin"}
HAZARD_ORDER = ("actinic_uv", "near_uv", "blue_light", "retinal_thermal",
                "retinal_thermal_weak_stimulus", "ir_eye", "skin_thermal")
BAND_ORDER = ("UV-C", "far-UVC", "UV-B", "UV-A", "visible", "IR-A", "below-200nm")
ORG_MEDIA = ("air", "surface", "water")
SCREENING_TITLE = "Screening assessment — not a certification"
INVENTED_TEXT = ("INVENTED DEMONSTRATION: the products, listings and measurements shown here are "
                 "made up to show the tool. They describe no real product or seller.")
PDF_CHOICE = ("The PDF is written by fpdf2, a pure-Python library: it needs no web browser or "
              "other program at run time, so it is produced the same way on any machine, "
              "offline, from the same content as the HTML. Text is set in DejaVu Sans (bundled "
              "with matplotlib) so that µ, ², λ and → print correctly.")


# ---------------------------------------------------------------------------------------------
# Formatting (display only: SI next to the trade unit)
# ---------------------------------------------------------------------------------------------

_SI_LABEL = {"W m-2": "W/m²", "J m-2": "J/m²", "W m-2 sr-1": "W/(m²·sr)", "W": "W",
             "W m-2 nm-1": "W/(m²·nm)", "lx": "lx"}


def unit_label(unit: str | None) -> str:
    """Display form of an SI unit id ('W m-2' → 'W/m²')."""
    return _SI_LABEL.get(unit or "", unit or "")


def quantity(value: float | None, unit: str | None, digits: int = 3) -> str:
    """'0.420 W/m² (42.0 µW/cm²)'; '—' for None.

    Examples
    --------
    >>> quantity(0.42, "W m-2")
    '0.420 W/m² (42.0 µW/cm²)'
    """
    if value is None:
        return "—"
    t, label = to_trade(value, unit or "")
    si = f"{sig(value, digits)} {unit_label(unit)}".strip()
    if unit and label != unit and t is not None:
        return f"{si} ({sig(t, digits)} {label})"
    return si


def distance(d_m: float | None) -> str:
    """'20 cm', '1 m', '—'.

    Examples
    --------
    >>> distance(0.2), distance(2.0)
    ('20 cm', '2 m')
    """
    if d_m is None:
        return "—"
    if d_m < 1.0:
        return f"{d_m * 100:.3g} cm"
    return f"{d_m:.3g} m"


def percent(x: float | None) -> str:
    """A share in per cent, never rounded up to 100 % unless it is 100 %.

    Examples
    --------
    >>> percent(0.9999599), percent(0.833), percent(0.0157)
    ('> 99.9 %', '83.3 %', '1.6 %')
    """
    if x is None:
        return "—"
    if x >= 0.999995:
        return "100 %"
    if x > 0.999:
        return "> 99.9 %"
    return f"{sig(100 * x, 2 if x < 0.1 else 3)} %"


def duration(seconds: float | None, bound: str | None = None) -> str:
    """format_duration with a bound sign: at_least → '≥', at_most → '≤'."""
    if seconds is None:
        return "—"
    sign = {"at_least": "≥ ", "at_most": "≤ "}.get(bound or "", "")
    return sign + format_duration(seconds)


# ---------------------------------------------------------------------------------------------
# Product as sold
# ---------------------------------------------------------------------------------------------

def product_block(listing: Mapping[str, Any] | None,
                  technology_names: Mapping[str, str] | None = None) -> dict[str, Any] | None:
    """What the seller states, from ``Listing.to_dict()``; None without a listing.

    technology_names : technology id → name (``data/technologies.toml``), for display.
    """
    if not listing:
        return None
    facts: list[tuple[str, str]] = []
    if listing.get("peak_wavelength_nm") is not None:
        facts.append(("Stated wavelength", f"{listing['peak_wavelength_nm']:.4g} nm"))
    if listing.get("band_name") or listing.get("band_nm"):
        b = listing.get("band_name") or "–".join(f"{x:g}" for x in listing["band_nm"]) + " nm"
        facts.append(("Stated band", b))
    if listing.get("technology"):
        tid = str(listing["technology"])
        facts.append(("Stated technology", (technology_names or {}).get(tid, tid)))
    for key, label in (("electrical_power_W", "Electrical power"),
                       ("optical_power_W", "Optical power")):
        if listing.get(key) is not None:
            facts.append((label, f"{sig(listing[key])} W"))
    leds = listing.get("leds") or {}
    if leds.get("count"):
        led = f"{leds['count']} LEDs"
        if leds.get("forward_voltage_V"):
            led += f", {sig(leds['forward_voltage_V'])} V per LED"
        elif leds.get("string_voltage_V"):
            led += f", {sig(leds['string_voltage_V'])} V per string of {leds.get('series')}"
        facts.append(("LEDs", led))
    if listing.get("cover_text") or listing.get("cover"):
        facts.append(("Cover", str(listing.get("cover_text") or listing.get("cover"))))
    use = []
    if listing.get("use_distance_m") is not None:
        use.append(f"at {distance(listing['use_distance_m'])}")
    if listing.get("area_m2") is not None:
        use.append(f"{sig(listing['area_m2'])} m²")
    if listing.get("room_volume_m3") is not None:
        use.append(f"{sig(listing['room_volume_m3'])} m³")
    if use:
        facts.append(("Stated use", ", ".join(use)))
    return {"name": listing.get("name") or "(no name given)",
            "seller_note": listing.get("seller_note"),
            "listing_text": listing.get("listing_text"),
            "invented": bool(listing.get("invented")),
            "facts": [{"label": a, "value": b} for a, b in facts],
            "claims": [c.get("text") or c.get("id") for c in listing.get("claims") or []],
            "source": listing.get("source"), "sha256": listing.get("sha256")}


# ---------------------------------------------------------------------------------------------
# Claims
# ---------------------------------------------------------------------------------------------

def amount_value(a: Any) -> str:
    """The number of a claims engine 'needed'/'available' entry, in display units.

    Examples
    --------
    >>> amount_value({"value": 28800.0, "unit": "s", "what": "exposure time"})
    '8 h'
    >>> amount_value({"value": 38.0, "unit": "J m-2", "what": "dose"})
    '38.0 J/m² (3.80 mJ/cm²)'
    """
    if a is None:
        return "—"
    if not isinstance(a, Mapping):
        return sig(a) if isinstance(a, float) else str(a)
    v, unit = a.get("value"), a.get("unit")
    if v is None:
        return "unknown"
    if unit == "s":
        return format_duration(v)
    if unit == "nm":
        return f"{v:.4g} nm"
    if unit in ("-", "", None):
        return percent(v) if 0 <= v <= 1 else sig(v)
    return quantity(v, unit)


def _amount(a: Any) -> str:
    """'value (what)' for a claims engine entry (plain text, e.g. for the PDF)."""
    if a is None:
        return "—"
    if isinstance(a, Mapping) and a.get("what"):
        return f"{amount_value(a)} — {a['what']}"
    return amount_value(a)


def ratio_text(ratio: float | None) -> str:
    """available / needed in words: 'short by 430×', '12× margin'.

    Examples
    --------
    >>> ratio_text(0.002), ratio_text(4.0), ratio_text(None)
    ('short by 500×', '4.00× what is needed', '—')
    """
    if ratio is None:
        return "—"
    if ratio <= 0:
        return "none available"
    if ratio < 1:
        return f"short by {sig(1 / ratio)}×"
    return f"{sig(ratio)}× what is needed"


def claim_rows(result: Result) -> list[dict[str, Any]] | None:
    """Rows of the claims table, from ``result['claims']``; None when no verdicts exist."""
    claims = result.get("claims")
    if not claims:
        return None
    rows = []
    for c in claims:
        v = c.get("verdict") or "not-assessable"
        rows.append({"id": c.get("id"), "kind": c.get("kind"), "text": c.get("text") or c.get("id"),
                     "verdict": v, "verdict_text": VERDICT_TEXT.get(v, v),
                     "needed": _amount(c.get("needed")), "available": _amount(c.get("available")),
                     "needed_value": amount_value(c.get("needed")),
                     "needed_what": (c.get("needed") or {}).get("what", "") if isinstance(c.get("needed"), Mapping) else "",
                     "available_value": amount_value(c.get("available")),
                     "available_what": (c.get("available") or {}).get("what", "") if isinstance(c.get("available"), Mapping) else "",
                     "ratio": ratio_text(c.get("ratio")), "basis": c.get("basis") or "",
                     "assumptions": list(c.get("assumptions") or [])})
    return rows


def claims_summary(rows: list[dict[str, Any]] | None) -> str | None:
    if not rows:
        return None
    n = len(rows)
    counts = {k: sum(r["verdict"] == k for r in rows) for k in VERDICT_TEXT}
    parts = []
    for k, word in (("cannot-hold", "cannot hold"), ("unlikely", "unlikely"),
                    ("not-assessable", "not assessable"), ("holds", "hold" if counts["holds"] > 1 else "holds")):
        if counts[k]:
            parts.append(f"{counts[k]} {word}")
    return f"Of its {n} claim{'s' if n > 1 else ''}: " + ", ".join(parts) + "."


# ---------------------------------------------------------------------------------------------
# Emission by band
# ---------------------------------------------------------------------------------------------

BAND_NAMES = {"below-200nm": "below 200 nm (vacuum UV)"}
BAND_STATUS_TEXT = {"complete": "measured", "partial": "partly measured (lower bound)",
                    "not-covered": "not measured", "below-detection": "below detection limit",
                    "not-assessable": "not assessable"}


def band_rows(result: Result) -> list[dict[str, Any]] | None:
    """Emission by band: value (SI and trade unit), share of the measured output, status."""
    bands = result.get("bands")
    if not bands:
        return None
    rows = []
    for k in [b for b in BAND_ORDER if b in bands] + [b for b in bands if b not in BAND_ORDER]:
        b = bands[k]
        st = b.get("status")
        lo, hi = b.get("range_nm") or (None, None)
        if st == "not-covered":
            val = "not measured"
        elif st == "below-detection":
            val = f"< {quantity(b.get('detection_limit'), b.get('unit'))}"
        elif b.get("value") is None:
            val = "(relative spectrum)"
        else:
            val = ("≥ " if st == "partial" else "") + quantity(b.get("value"), b.get("unit"))
        rows.append({"band": BAND_NAMES.get(k, k), "range": f"{lo:g}–{hi:g} nm" if lo is not None else "",
                     "value": val, "fraction": percent(b.get("fraction")),
                     "coverage": percent(b.get("coverage")),
                     "status": BAND_STATUS_TEXT.get(st, st or "")})
    return rows


def spectral_facts(result: Result) -> list[dict[str, str]] | None:
    sp = result.get("spectral")
    if not sp:
        return None
    out = []
    if sp.get("peak_nm") is not None:
        out.append({"label": "Peak", "value": f"{sp['peak_nm']:.4g} nm"
                    + (f", FWHM {sig(sp['fwhm_nm'])} nm" if sp.get("fwhm_nm") else "")})
    if sp.get("centroid_nm") is not None:
        out.append({"label": "Centroid", "value": f"{sp['centroid_nm']:.4g} nm"})
    lines = [ln.get("identified_as") for ln in sp.get("lines") or [] if ln.get("identified_as")]
    if lines:
        out.append({"label": "Lines identified", "value": ", ".join(lines)})
    out.append({"label": "Mercury 253.7 nm line", "value": "present" if sp.get("hg_253_7_present") else "not found"})
    ph = result.get("photometry") or {}
    if ph.get("value") is not None:
        out.append({"label": "Illuminance at the measurement position",
                    "value": f"{sig(ph['value'])} lx"})
    return out


# ---------------------------------------------------------------------------------------------
# Hazards
# ---------------------------------------------------------------------------------------------

def _value_text(h: Mapping[str, Any]) -> str:
    st, v, unit = h.get("status"), h.get("value"), h.get("unit")
    dl = h.get("detection_limit")
    if st == "not-assessable" or (v is None and st != "below-detection"):
        return "not assessable"
    if st == "below-detection" or (v is not None and dl is not None and v < dl):
        return f"< {quantity(dl, unit)} (detection limit)" if dl is not None else "below detection"
    return ("≥ " if st == "partial" else "") + quantity(v, unit)


def _tmax_text(h: Mapping[str, Any]) -> str:
    if h.get("status") == "not-assessable":
        return "—"
    if h.get("t_max_s") is not None:
        return format_duration(h["t_max_s"])
    note = h.get("t_max_note") or ""
    out = note
    if note.startswith("no time limit"):
        out = "none (within the long-term limit)"
    elif note.startswith("within the limit for every duration it covers"):
        tail = note.split("(up to", 1)[-1].split(")", 1)[0].strip()
        try:
            out = f"not reached within {format_duration(float(tail.split()[0]))}"
        except (ValueError, IndexError):
            out = note
    elif note.startswith("no measurable emission"):
        out = "none (no measurable emission)"
    if "on the measured part only" in note:
        out += " (measured part only)"
    return out or "—"


def _group_text(h: Mapping[str, Any]) -> str:
    g = h.get("risk_group")
    if g is None:
        return "—" if h.get("status") != "not-assessable" else "not assessable"
    return ("≥ " if h.get("risk_group_is_lower_bound") else "") + g


def _ratio(h: Mapping[str, Any]) -> float | None:
    v, lim = h.get("value"), h.get("limit")
    if v is None or not lim or h.get("status") in ("not-assessable", "below-detection"):
        return None
    dl = h.get("detection_limit")
    if dl is not None and v < dl:
        return None
    return v / lim


def hazard_rows(result: Result) -> list[dict[str, Any]] | None:
    """The hazard table: value, limit, maximum exposure time, group, distance, coverage."""
    hz = result.get("hazards")
    if not hz:
        return None
    ev = result.get("evaluation") or {}
    rows = []
    for hid in [h for h in HAZARD_ORDER if h in hz] + [h for h in hz if h not in HAZARD_ORDER]:
        h = hz[hid]
        r = _ratio(h)
        rows.append({
            "id": hid, "name": h.get("name") or hid, "symbol": h.get("symbol") or "",
            "value": _value_text(h), "limit": quantity(h.get("limit"), h.get("unit")),
            "limit_basis": h.get("limit_basis") or "",
            "ratio": None if r is None else r, "ratio_text": "—" if r is None else f"{sig(r)}×",
            "t_max": _tmax_text(h), "group": _group_text(h),
            "distance": distance(ev.get("distance_m")),
            "coverage": percent(h.get("coverage")), "status": h.get("status"),
            "reason": h.get("reason"),
            "interval": _interval_text(h),
            "borderline": bool(h.get("borderline")),
            "group_probability": _probability_text(h.get("risk_group_probability")),
        })
    return rows


def _interval_text(h: Mapping[str, Any]) -> str | None:
    """'95 %: 4.72–5.77 W/m²' from the uncertainty fields merged into a hazard entry."""
    iv = h.get("interval_95")
    if not iv or iv[0] is None or iv[1] is None:
        return None
    v, dl = h.get("value"), h.get("detection_limit")
    if h.get("status") not in ("complete", "partial") or v is None or iv[0] < 0 or (
            dl is not None and v < dl):
        return None  # an interval of noise around a detection limit tells a reader nothing
    unit = unit_label(h.get("unit"))
    pre = "≥ " if h.get("status") == "partial" else ""
    return f"95 %: {pre}{sig(iv[0])}–{sig(iv[1])} {unit}"


def _probability_text(p: Mapping[str, float] | None) -> str | None:
    if not p:
        return None
    parts = [f"{g} {100 * v:.0f} %" for g, v in p.items() if v and v >= 0.005]
    return ", ".join(parts) or None


def uncertainty_block(result: Result) -> dict[str, Any] | None:
    """The note's uncertainty paragraph: method and inputs, overall group probabilities,
    borderline hazards and the decision rule (issue 9)."""
    u = result.get("uncertainty")
    if not u:
        return None
    if u.get("status") != "evaluated":
        return {"evaluated": False, "text": f"Measurement uncertainty was not evaluated: "
                                            f"{u.get('reason') or 'no absolute spectrum'}."}
    from uvcheck.uncertainty import uncertainty_note

    ov = u.get("overall") or {}
    hz = result.get("hazards") or {}
    border = [hz[k].get("symbol") or k for k in hz if hz[k].get("borderline")]
    rule = (u.get("decision_rule") or {})
    return {"evaluated": True, "text": uncertainty_note(u),
            "overall": _probability_text(ov.get("risk_group_probability")),
            "overall_by_rule": ov.get("risk_group_by_rule"),
            "borderline": border, "rule": rule.get("name"), "rule_text": rule.get("statement")}


def open_hazards_text(result: Result) -> str:
    """Why the overall group is only a lower bound: 'L_R, L_IR not assessable; E_IR partly measured'."""
    rg = result.get("risk_group") or {}
    hz = result.get("hazards") or {}
    na = [hz.get(k, {}).get("symbol") or k for k in rg.get("open_hazards") or []
          if hz.get(k, {}).get("status") == "not-assessable"]
    part = [hz.get(k, {}).get("symbol") or k for k in rg.get("open_hazards") or []
            if hz.get(k, {}).get("status") != "not-assessable"]
    bits = []
    if na:
        bits.append(f"{', '.join(na)} not assessable")
    if part:
        bits.append(f"{', '.join(part)} only partly measured")
    if not bits:
        return ""
    g = rg.get("group")
    return (f"{g} for the hazards that could be assessed; it could be higher: " if g else "") + "; ".join(bits)


def risk_summary(result: Result) -> dict[str, Any] | None:
    rg = result.get("risk_group")
    if not rg:
        return None
    ev = result.get("evaluation") or {}
    hz = result.get("hazards") or {}
    g = rg.get("group")
    gov = hz.get(rg.get("governing") or "", {})
    if rg.get("is_lower_bound"):
        headline = f"At least {g}" if g else "Not established"
        detail = (open_hazards_text(result) + "." if g else rg.get("note", ""))
    else:
        headline = g or "—"
        words = GROUP_TEXT.get(g or "", "")
        detail = (words[:1].upper() + words[1:]) + (
            f"; set by {gov.get('name', rg.get('governing'))}" if gov else "") + "."
    return {"group": g, "headline": headline, "detail": detail,
            "is_lower_bound": bool(rg.get("is_lower_bound")),
            "distance": distance(ev.get("distance_m")),
            "distance_rule": ev.get("distance_rule") or "",
            "governing": rg.get("governing"),
            "governing_t_max": None if not gov else gov.get("t_max_s"),
            "use_distance": _use_distance(result)}


def _use_distance(result: Result) -> dict[str, Any] | None:
    u = result.get("use_distance")
    if not u:
        return None
    ev = u.get("evaluation") or {}
    hz = u.get("hazards") or {}
    rg = u.get("risk_group") or {}
    rows = []
    for hid in [h for h in HAZARD_ORDER if h in hz]:
        h = dict(hz[hid])
        base = (result.get("hazards") or {}).get(hid, {})
        for k in ("name", "symbol", "unit", "limit", "detection_limit", "t_max_note"):
            h.setdefault(k, base.get(k))
        if h.get("status") == "not-assessable":
            continue
        rows.append({"name": h.get("name") or hid, "symbol": h.get("symbol") or "",
                     "value": _value_text(h), "t_max": _tmax_text(h), "group": _group_text(h)})
    return {"distance": distance(ev.get("distance_m")), "rule": ev.get("distance_rule") or "",
            "group": rg.get("group"), "is_lower_bound": bool(rg.get("is_lower_bound")),
            "rows": rows}


# ---------------------------------------------------------------------------------------------
# Germicidal output and inactivation
# ---------------------------------------------------------------------------------------------

def _reading_text(r: Mapping[str, Any] | None) -> str:
    if not r:
        return "—"
    st = r.get("status")
    if st == "not-covered":
        return "not measured"
    if st == "below-detection":
        return f"< {quantity(r.get('detection_limit'), r.get('unit'))} (below detection)"
    if st == "likely-stray-light":
        return f"≤ {quantity(r.get('upper_bound'), r.get('unit'))} (likely stray light, not emission)"
    if st == "shape-only":
        return f"{percent(r.get('fraction'))} of the output (relative spectrum)"
    v = quantity(r.get("value"), r.get("unit"))
    return ("≥ " if st == "partial" else "") + v


def organism_rows(g: Mapping[str, Any]) -> tuple[list[dict[str, Any]], list[dict[str, Any]]]:
    """(highlight rows: the most susceptible organism per medium; all rows, fastest first)."""
    pathway = "uvc" if g.get("status") in ("germicidal-uvc", "partial") else "violet_blue"
    ms = (g.get("most_susceptible") or {}).get(pathway) or {}

    def row(e: Mapping[str, Any], label: str = "") -> dict[str, Any]:
        ta = e.get("times_are")
        bound = "at_least" if ta == "at_least" else ("at_most" if ta == "at_most" else None)
        r90 = e.get("time_to_90_s_range")
        r999 = e.get("time_to_99_9_s_range")
        return {"label": label, "organism": e.get("organism"), "id": e.get("organism_id"),
                "medium": e.get("medium"), "wavelength": f"{sig(e.get('wavelength_nm'), 3)} nm",
                "t90": duration(e.get("time_to_90_s"), bound),
                "t999": duration(e.get("time_to_99_9_s"), bound) if e.get("time_to_99_9_s") is not None
                else "not reached in the data",
                "t90_range": None if not r90 else f"{format_duration(r90[0])}–{format_duration(r90[1])}",
                "t999_range": None if not r999 else f"{format_duration(r999[0])}–{format_duration(r999[1])}",
                "reliability": e.get("reliability"), "source": e.get("source"),
                "from_memory": e.get("from_memory"),
                "basis": e.get("irradiance_basis"),
                "irradiance": quantity(e.get("irradiance_W_m2"), "W m-2")}

    hl = [row(ms[m], f"most susceptible ({m})") for m in ORG_MEDIA if ms.get(m)]
    rows = [e for e in g.get("inactivation") or [] if e.get("pathway") == pathway
            and e.get("group") not in ("phage",)]
    rows.sort(key=lambda e: (e.get("time_to_99_9_s") is None, e.get("time_to_99_9_s") or 0.0,
                             e.get("time_to_90_s") or 0.0))
    return hl, [row(e) for e in rows]


def germicidal_block(result: Result) -> dict[str, Any] | None:
    g = result.get("germicidal")
    if not g:
        return None
    eff = (g.get("effective") or {})
    spectra = []
    for aid, e in (eff.get("by_action_spectrum") or {}).items():
        eq = e.get("equivalent") if e.get("equivalent") is not None else e.get("equivalent_upper_bound")
        spectra.append({"id": aid, "value": _reading_text(e),
                        "equivalent": ("≤ " if e.get("equivalent") is None and eq is not None else "")
                        + quantity(eq, e.get("unit")),
                        "from_memory": bool(e.get("from_memory"))})
    vb = eff.get("violet_blue_405") or {}
    hl, rows = organism_rows(g)
    pos = g.get("position") or {}
    oz = g.get("ozone") or {}
    return {"status": g.get("status"), "statement": g.get("statement"),
            "position": pos.get("basis"), "distance": distance(pos.get("distance_m")),
            "uvc": _reading_text(g.get("uvc")), "far_uvc": _reading_text(g.get("far_uvc")),
            "spectra": spectra, "violet_blue": _reading_text(vb) if vb else None,
            "spread": (eff.get("equivalent_254") or {}).get("spread_ratio"),
            "ozone": {"status": oz.get("status"), "note": oz.get("note")},
            "artefacts": [a.get("detail") for a in g.get("artefacts") or []],
            "technology": (g.get("technology") or {}).get("name"),
            "technology_basis": (g.get("technology") or {}).get("basis"),
            "pathway": "UV-C" if g.get("status") in ("germicidal-uvc", "partial") else "violet-blue (about 405 nm)",
            "highlight": hl, "organisms": rows,
            "efficiency": (g.get("efficiency") or {}).get("note")
            if (g.get("efficiency") or {}).get("status") != "not-computed" else None,
            "notes": list(g.get("notes") or [])}


# ---------------------------------------------------------------------------------------------
# Room
# ---------------------------------------------------------------------------------------------

def room_block(result: Result) -> dict[str, Any] | None:
    r = result.get("room")
    if not r:
        return None
    dim = r.get("dimensions_m") or {}
    pl = r.get("plane") or {}
    occ = r.get("occupant") or {}
    lamp = r.get("lamp") or {}
    air = [{"organism": a.get("organism"), "each": sig(a.get("each_per_h")) if a.get("each_per_h") else "—",
            "t90": duration(a.get("time_to_90_s")), "t999": duration(a.get("time_to_99_9_s")),
            "bound": bool(a.get("each_is_lower_bound"))} for a in r.get("air") or []]
    return {
        "size": f"{sig(dim.get('width'))} × {sig(dim.get('length'))} × {sig(dim.get('height'))} m",
        "volume": f"{sig(r.get('volume_m3'))} m³",
        "reflectance": percent(r.get("reflectance")),
        "lamp_at": ", ".join(sig(v) for v in lamp.get("position_m") or []) + " m",
        "pattern": lamp.get("pattern"), "flux_basis": lamp.get("flux_basis"),
        "uvc_flux": quantity(lamp.get("uvc_flux_W"), "W"),
        "plane_height": distance(pl.get("height_m")),
        "plane": [{"label": k, "value": quantity(pl.get(f"{k}_W_m2"), "W m-2")}
                  for k in ("min", "p10", "mean", "max") if f"{k}_W_m2" in pl],
        "plane_quantity": pl.get("quantity"),
        "fluence_avg": quantity(r.get("fluence_rate_avg_W_m2"), "W m-2"),
        "air": air,
        "occupant": {"eye_height": distance(occ.get("eye_height_m")),
                     "uvc": quantity(occ.get("irradiance_W_m2"), "W m-2"),
                     "e_s": ("≥ " if occ.get("effective_S_is_lower_bound") else "")
                     + quantity(occ.get("effective_S_W_m2"), "W m-2"),
                     "t_limit": duration(occ.get("time_to_limit_s")),
                     "exceeds": bool(occ.get("exceeds_8h_limit")),
                     "note": occ.get("note"), "limit": occ.get("limit")},
        "has_grid": bool((pl.get("grid") or {}).get("values_W_m2")),
        "notes": list(r.get("notes") or []),
    }


# ---------------------------------------------------------------------------------------------
# Plain-language finding
# ---------------------------------------------------------------------------------------------

def light_name(peak_nm: float) -> str:
    """What a peak wavelength is called in plain words.

    Band edges: CIE UV bands (UV-C to 280 nm, UV-B to 315 nm, UV-A to 400 nm); 200–235 nm
    far-UVC (PRACTICE.md P0-4); colour names of the visible range are common practice.

    Examples
    --------
    >>> light_name(396.0)
    'violet light at the UV-A/visible border'
    """
    if peak_nm < 200:
        return "vacuum-UV radiation"
    if peak_nm < 235:
        return "far-UVC radiation"
    if peak_nm < 280:
        return "UV-C radiation"
    if peak_nm < 315:
        return "UV-B radiation"
    if peak_nm < 380:
        return "UV-A (invisible near-UV) radiation"
    if peak_nm < 400:
        return "violet light at the UV-A/visible border"
    for edge, name in ((450, "violet-blue light"), (495, "blue light"), (570, "green light"),
                       (590, "yellow light"), (620, "orange light"), (780, "red light")):
        if peak_nm < edge:
            return name
    return "infrared radiation"


def _composition(result: Result) -> str:
    bands = result.get("bands") or {}
    names = ["UV-C", "UV-B", "UV-A", "visible", "IR-A"]
    far = (bands.get("far-UVC") or {}).get("fraction") or 0.0
    if far > 0.5 * ((bands.get("UV-C") or {}).get("fraction") or 1.0):
        names[0] = "far-UVC"
    parts = [(k, b.get("fraction")) for k, b in bands.items()
             if k in names and b.get("fraction")]
    parts = sorted([p for p in parts if p[1] >= 0.01], key=lambda p: -p[1])[:3]
    if not parts:
        return ""
    return ", ".join(f"{k} {percent(f)}" for k, f in parts) + " of the measured output"


def _fastest(hl: list[dict[str, Any]], g: Mapping[str, Any]) -> Mapping[str, Any] | None:
    pathway = "uvc" if g.get("status") in ("germicidal-uvc", "partial") else "violet_blue"
    ms = (g.get("most_susceptible") or {}).get(pathway) or {}
    cands = [e for e in ms.values() if e and e.get("time_to_99_9_s") is not None]
    return min(cands, key=lambda e: e["time_to_99_9_s"]) if cands else None


def finding(result: Result, claims: list[dict[str, Any]] | None = None) -> str:
    """The one-paragraph plain-language finding, every number from the result dict."""
    s: list[str] = []
    g = result.get("germicidal") or {}
    sp = result.get("spectral") or {}
    inp = result.get("input") or {}
    peak = sp.get("peak_nm")
    st = g.get("status")
    gpos = distance((g.get("position") or {}).get("distance_m"))
    if st == "no-uvc":
        s.append("This lamp emits essentially no germicidal UV-C.")
        if g.get("artefacts"):
            s.append("The faint signal recorded below 280 nm looks like stray light in the "
                     "spectrometer, not emission.")
    elif st == "germicidal-uvc":
        s.append(f"This lamp emits germicidal UV-C: {_reading_text(g.get('uvc'))} at {gpos}.")
    elif st == "partial":
        s.append(f"This lamp emits UV-C ({_reading_text(g.get('uvc'))} at {gpos}); part of the "
                 "UV-C band was not measured, so the true output can be higher.")
    elif st in ("not-assessed", "shape-only"):
        s.append(g.get("statement") or "Whether this lamp emits UV-C could not be assessed.")
    if peak is not None and inp:
        lines = [ln for ln in sp.get("lines") or [] if ln.get("identified_as")]
        strongest = max(lines, key=lambda ln: ln.get("height") or 0.0) if lines else None
        comp = _composition(result)
        what = light_name(peak)
        txt = f"Its output is {what} peaking at {peak:.4g} nm"
        if strongest and strongest["identified_as"].startswith("Hg"):
            txt = (f"Its output is the mercury line spectrum, strongest on the "
                   f"{strongest['identified_as'][3:]} line ({what.replace(' radiation', '')})")
        elif strongest and strongest["identified_as"].startswith("KrCl"):
            txt = f"Its output is a narrow {what.replace(' radiation', '')} band peaking at {peak:.4g} nm"
        s.append(txt + (f"; {comp}." if comp else "."))
    if g:
        hl, _ = organism_rows(g)
        best = _fastest(hl, g)
        if best is not None:
            t = duration(best["time_to_99_9_s"], best.get("times_are"))
            if st in ("germicidal-uvc", "partial"):
                s.append(f"At {gpos}, even the most susceptible organism in uvcheck's table "
                         f"({best['organism']}, {best['medium']}) needs about {t} for a 99.9 % "
                         "reduction; most real germs need longer.")
            else:
                s.append(f"Violet light inactivates some bacteria, but slowly: a 99.9 % reduction "
                         f"would take about {t} at {gpos} even for the most susceptible organism "
                         f"in the table ({best['organism']}, {best['medium']}).")
    rk = risk_summary(result)
    if rk and rk["group"]:
        hz = result.get("hazards") or {}
        gov = hz.get(rk["governing"] or "", {})
        if rk["is_lower_bound"]:
            s.append(f"At {rk['distance']} it is {rk['group']} for every hazard that could be "
                     "assessed, but the classification is not complete (see what was not assessed).")
        elif rk["group"] == "Exempt":
            s.append(f"At {rk['distance']} its photobiological hazards are within the Exempt group.")
        else:
            t = gov.get("t_max_s")
            s.append(f"It is hazardous: at {rk['distance']} the "
                     f"{LIMIT_WORDS.get(rk['governing'] or '', 'exposure limit')} "
                     f"is reached in {format_duration(t)} (risk group {rk['group']}, "
                     f"{GROUP_TEXT.get(rk['group'], '')})." if t is not None else
                     f"At {rk['distance']} it is in risk group {rk['group']} "
                     f"({GROUP_TEXT.get(rk['group'], '')}).")
        u = result.get("use_distance") or {}
        urg = u.get("risk_group") or {}
        rank = {"Exempt": 0, "RG1": 1, "RG2": 2, "RG3": 3}
        if urg.get("group") in rank and rank[urg["group"]] > rank.get(rk["group"], -1):
            ugov = (u.get("hazards") or {}).get(urg.get("governing") or "", {})
            ud = distance((u.get("evaluation") or {}).get("distance_m"))
            t = ugov.get("t_max_s")
            s.append(f"At the distance of use, {ud}, it is in risk group {urg['group']}"
                     + (f": the {LIMIT_WORDS.get(urg.get('governing') or '', 'exposure limit')} "
                        f"is reached in {format_duration(t)}." if t is not None else "."))
    elif not result.get("hazards") and not inp:
        s.append("No spectrum was given, so its hazards were not assessed.")
    cs = claims_summary(claims)
    if cs:
        s.append(cs)
    return " ".join(s)


# ---------------------------------------------------------------------------------------------
# What could not be assessed
# ---------------------------------------------------------------------------------------------

def not_assessed(result: Result, listing: Mapping[str, Any] | None = None) -> list[dict[str, str]]:
    """Everything that could not be assessed, each with the reason."""
    out: list[dict[str, str]] = []
    hz = result.get("hazards") or {}
    if not result.get("input") and not hz:
        out.append({"what": "Spectrum, hazards and germicidal output",
                    "why": "no measured spectrum was given; only the stated data were checked"})
    for hid in [h for h in HAZARD_ORDER if h in hz] + [h for h in hz if h not in HAZARD_ORDER]:
        h = hz[hid]
        name = f"{h.get('name', hid)} ({h.get('symbol', '')})"
        if h.get("status") == "not-assessable":
            out.append({"what": name, "why": h.get("reason") or "not assessable"})
        elif h.get("status") == "partial":
            out.append({"what": name, "why": f"only {percent(h.get('coverage'))} of its weighting "
                                             "was measured: the value is a lower bound"})
    rg = result.get("risk_group") or {}
    if rg.get("is_lower_bound"):
        out.append({"what": "Overall risk group", "why": open_hazards_text(result) or rg.get("note") or "not complete"})
    for k in BAND_ORDER:
        b = (result.get("bands") or {}).get(k) or {}
        if b.get("status") == "not-covered":
            lo, hi = b.get("range_nm") or (None, None)
            out.append({"what": f"{BAND_NAMES.get(k, k + ' band')} ({lo:g}–{hi:g} nm)"
                        if lo is not None else k,
                        "why": "outside the measured range; missing data are never read as zero"})
    g = result.get("germicidal")
    if result.get("input") and g is None:
        out.append({"what": "Germicidal output", "why": "not part of this result"})
    if g:
        oz = g.get("ozone") or {}
        if oz.get("status") == "unknown":
            out.append({"what": "Ozone-forming output (below 240 nm)", "why": oz.get("note") or "unknown"})
        if g.get("status") in ("not-assessed", "shape-only"):
            out.append({"what": "Germicidal dose and times", "why": g.get("statement") or ""})
    for c in result.get("claims") or []:
        if c.get("verdict") == "not-assessable":
            why = _amount(c.get("needed")) if c.get("needed") else (c.get("basis") or "data missing")
            out.append({"what": f"Claim “{c.get('text') or c.get('id')}”", "why": why})
    if not result.get("claims") and (listing or result.get("listing")):
        out.append({"what": "Claim verdicts",
                    "why": "the claims are listed as sold; no verdicts are part of this result"})
    if result.get("input") and not result.get("room"):
        out.append({"what": "Room figures", "why": "no room was given"})
    for w in list((result.get("input") or {}).get("warnings") or []) + list(result.get("warnings") or []):
        if "RELATIVE" in w or "relative" in w[:40]:
            out.append({"what": "Absolute values", "why": w})
    return out


# ---------------------------------------------------------------------------------------------
# Method and provenance
# ---------------------------------------------------------------------------------------------

def _weighting_ids(result: Result) -> list[str]:
    ids = [h.get("weighting") for h in (result.get("hazards") or {}).values() if h.get("weighting")]
    g = result.get("germicidal") or {}
    eff = g.get("effective") or {}
    ids += list((eff.get("by_action_spectrum") or {}).keys())
    if eff.get("violet_blue_405"):
        ids.append(eff["violet_blue_405"].get("id") or "violet_blue_405")
    return [i for i in dict.fromkeys(ids) if i and i != "uvc_unweighted"]


def reference_tables(result: Result) -> list[dict[str, Any]]:
    """Provenance of every reference table the result used (reads the data registries)."""
    from uvcheck.data_files import read_toml

    out: list[dict[str, Any]] = []
    ls = result.get("limit_set")
    if ls:
        out.append({"what": "Exposure limits and risk groups", "id": ls.get("id"),
                    "name": ls.get("name"), "edition": ls.get("edition"),
                    "source": "; ".join(x for x in (ls.get("risk_groups_from"),
                                                    ls.get("exposure_limits_from")) if x),
                    "digits_from": ls.get("digits_from"), "file": ls.get("file"),
                    "sha256": ls.get("sha256"), "from_memory": None})
    for wid in _weighting_ids(result):
        try:
            from uvcheck.weighting import get_weighting

            w = get_weighting(wid).describe()
        except Exception:  # noqa: BLE001 - an unknown id is reported, not fatal to the note
            out.append({"what": "Weighting", "id": wid, "name": wid, "edition": None,
                        "source": "not in the registry", "digits_from": None, "file": None,
                        "sha256": None, "from_memory": None})
            continue
        out.append({"what": "Weighting", "id": wid, "name": w.get("name"),
                    "edition": w.get("edition"), "source": w.get("source"),
                    "digits_from": w.get("digits_from"), "file": "weightings/" + str(w.get("file")),
                    "sha256": w.get("sha256"), "from_memory": w.get("from_memory")})
    g = result.get("germicidal") or {}
    if g.get("inactivation") or (result.get("room") or {}).get("air"):
        t = read_toml("organisms/organisms.toml")
        tab = t.get("table", {})
        srcs = {e.get("source") for e in g.get("inactivation") or []} | {
            a.get("source") for a in (result.get("room") or {}).get("air") or []}
        out.append({"what": "Organism table", "id": "organisms", "name": tab.get("name"),
                    "edition": None, "source": "; ".join(sorted(s for s in srcs if s)),
                    "digits_from": tab.get("digits_from"), "file": "organisms/" + str(tab.get("file")),
                    "sha256": tab.get("sha256"), "from_memory": tab.get("from_memory")})
    if (result.get("photometry") or {}).get("value") is not None:
        cie = read_toml("cie/cie.toml").get("V_photopic_1924", {})
        out.append({"what": "Photometry", "id": "V_photopic_1924",
                    "name": "CIE 1924 photopic luminous efficiency V(λ)", "edition": "CIE 1924",
                    "source": f"generated from {cie.get('generated_from')}",
                    "digits_from": cie.get("generated_from"), "file": "cie/" + str(cie.get("file")),
                    "sha256": cie.get("sha256"), "from_memory": None})
    return out


def technology_names() -> dict[str, str]:
    """Technology id → display name from ``data/technologies.toml`` (empty if unavailable)."""
    from uvcheck.data_files import read_toml

    try:
        return {k: str(v.get("name", k)) for k, v in read_toml("technologies.toml").items()
                if isinstance(v, Mapping)}
    except Exception:  # noqa: BLE001 - display names are a nicety, never fatal
        return {}


def generated_date(now: _dt.datetime | None = None) -> str:
    """ISO date of the note: SOURCE_DATE_EPOCH when set (reproducible builds), else today (UTC)."""
    if now is None:
        epoch = os.environ.get("SOURCE_DATE_EPOCH")
        now = (_dt.datetime.fromtimestamp(int(epoch), _dt.timezone.utc) if epoch and epoch.isdigit()
               else _dt.datetime.now(_dt.timezone.utc))
    return now.date().isoformat()


def _uniq(items: Iterable[str]) -> list[str]:
    return [x for x in dict.fromkeys(i for i in items if i)]


def provenance(result: Result, listing: Mapping[str, Any] | None, date: str,
               references: list[dict[str, Any]] | None = None) -> dict[str, Any]:
    inp = result.get("input") or {}
    cond = result.get("conditions") or {}
    ev = result.get("evaluation") or {}
    inputs: list[dict[str, str]] = []
    if inp:
        inputs.append({"label": "Spectrum file", "value": os.path.basename(str(inp.get("path")))})
        inputs.append({"label": "sha256", "value": str(inp.get("sha256"))})
        lo, hi = inp.get("range_nm") or (None, None)
        inputs.append({"label": "Data", "value": f"{inp.get('origin')} {inp.get('quantity')} in "
                       f"{unit_label(inp.get('unit'))}, {lo:g}–{hi:g} nm, step {sig(inp.get('step_nm'))} nm"
                       if lo is not None else str(inp.get("quantity"))})
        if inp.get("noise_floor") is not None:
            inputs.append({"label": "Noise floor (1 σ per sample)",
                           "value": f"{sig(inp['noise_floor'])} {unit_label(inp.get('unit'))}"})
        meta = dict((inp.get("inferred") or {}).get("metadata") or {})
        for k, v in (inp.get("instrument") or {}).items():
            meta.setdefault(k, v)
        for k, v in meta.items():
            inputs.append({"label": f"File note: {k}", "value": str(v)})
        inputs.append({"label": "Measurement distance",
                       "value": distance(cond.get("measurement_distance_m"))
                       if cond.get("measurement_distance_m") is not None else "not given"})
        sc = inp.get("scaling") or []
        inputs.append({"label": "Scaling", "value": "; ".join(
            f"{s.get('method')}: {s.get('text', '')}".strip(": ") for s in sc) if sc else "none (values as in the file)"})
        if ev:
            inputs.append({"label": "Hazards assessed at", "value": f"{distance(ev.get('distance_m'))} "
                           f"({ev.get('distance_rule', '')})"})
        if cond.get("use_distance_m") is not None:
            inputs.append({"label": "Distance of use", "value": distance(cond["use_distance_m"])})
        if cond.get("exposure_time_s") is not None:
            inputs.append({"label": "Exposure duration for hazard distances",
                           "value": format_duration(cond["exposure_time_s"])})
        if cond.get("source_size_m") is not None:
            inputs.append({"label": "Source size", "value": distance(cond["source_size_m"])})
    li = listing or result.get("listing")
    if li:
        inputs.append({"label": "Listing file", "value": os.path.basename(str(li.get("source")))})
        if li.get("sha256"):
            inputs.append({"label": "Listing sha256", "value": str(li["sha256"])})
    assumptions = list(ev.get("assumptions") or [])
    for h in (result.get("hazards") or {}).values():
        assumptions += list(h.get("assumptions") or [])
    assumptions += [result.get("band_convention") or ""]
    assumptions += list((result.get("germicidal") or {}).get("notes") or [])
    assumptions += [n for n in result.get("notes") or [] if not n.startswith("Screening assessment")]
    for c in result.get("claims") or []:
        assumptions += list(c.get("assumptions") or [])
    assumptions = [a for a in _uniq(assumptions) if not a.startswith("Screening assessment")]
    tool = result.get("tool") or {}
    return {"inputs": inputs, "tool": f"{tool.get('name', 'uvcheck')} {tool.get('version', '')}".strip(),
            "schema": result.get("schema"), "date": date,
            "references": references if references is not None else reference_tables(result),
            "assumptions": assumptions,
            "warnings": _uniq(list(inp.get("warnings") or []) + list(result.get("warnings") or [])),
            "pdf_choice": PDF_CHOICE}


# ---------------------------------------------------------------------------------------------
# The whole view model
# ---------------------------------------------------------------------------------------------

def key_caution(result: Result, cautions: list[dict[str, Any]]) -> dict[str, str]:
    """The most important caution, with the result's own numbers where they sharpen it."""
    if not cautions:
        return {"title": "What this check does not cover", "text": DOES_NOT_COVER}
    c = cautions[0]
    text = c["text"]
    if c["id"] == "invisible-hazard":
        hz = (result.get("hazards") or {}).get("actinic_uv") or {}
        t = hz.get("t_max_s")
        if t is not None:
            d = distance((result.get("evaluation") or {}).get("distance_m"))
            text = (f"At {d} the UV exposure limit for eyes and skin is reached in "
                    f"{format_duration(t)}, and the harm shows up only hours later. Never look at "
                    "the lit lamp, keep skin out of its light, and run it only in a room with no "
                    "people or animals in it.")
    return {"title": c["title"], "text": text}


def build_note(result: Result, listing: Mapping[str, Any] | None = None, *,
               invented: bool | None = None, title: str | None = None, date: str | None = None,
               references: list[dict[str, Any]] | None = None) -> dict[str, Any]:
    """The note's view model from an assessment dict (and a listing dict, if any).

    result : ``Assessment.to_dict()`` (sections that are absent stay absent).
    listing : ``Listing.to_dict()``; default ``result['listing']``.
    invented : mark the note as an invented demonstration (default: the listing says so).
    title : heading (default: the product name, else the spectrum file name).
    date : ISO date of the note (default :func:`generated_date`).
    references : reference-table records (default :func:`reference_tables`).

    Examples
    --------
    >>> v = build_note({"input": {"path": "lamp.csv"}, "germicidal": {"status": "no-uvc"}},
    ...                date="2026-01-01", references=[])
    >>> v["finding"]
    'This lamp emits essentially no germicidal UV-C.'
    """
    li = listing if listing is not None else result.get("listing")
    product = product_block(li, technology_names())
    claims = claim_rows(result)
    cautions = applicable(result, li)
    inp = result.get("input") or {}
    inv = bool(invented) if invented is not None else bool(product and product["invented"])
    name = title or (product["name"] if product else None) or (
        os.path.basename(str(inp.get("path"))) if inp.get("path") else "Lamp")
    return {
        "title": name,
        "subtitle": "Consumer-safety note",
        "invented": inv, "invented_text": INVENTED_TEXT,
        "screening_title": SCREENING_TITLE,
        "screening_text": DOES_NOT_COVER,
        "local_codes": LOCAL_CODES,
        "product": product,
        "finding": finding(result, claims),
        "claims": claims,
        "claims_summary": claims_summary(claims),
        "decision_rule": (result.get("claims_summary") or {}).get("decision_rule")
        if isinstance(result.get("claims_summary"), Mapping) else None,
        "listed_claims": None if claims or not product else product["claims"],
        "risk": risk_summary(result),
        "key_caution": key_caution(result, cautions),
        "bands": band_rows(result),
        "band_convention": result.get("band_convention"),
        "spectral": spectral_facts(result),
        "hazards": hazard_rows(result),
        "uncertainty": uncertainty_block(result),
        "hazard_note": (result.get("evaluation") or {}).get("distance_rule"),
        "germicidal": germicidal_block(result),
        "room": room_block(result),
        "plausibility": [{"id": f.get("id"), "status": f.get("status"),
                          "status_text": VERDICT_TEXT.get(f.get("status"), f.get("status")),
                          "subject": f.get("subject"), "message": f.get("message"),
                          "basis": f.get("basis")}
                         for f in (result.get("plausibility") or {}).get("findings") or []] or None,
        "not_assessed": not_assessed(result, li),
        "cautions": cautions,
        "does_not_cover": DOES_NOT_COVER,
        "provenance": provenance(result, li, date or generated_date(), references),
    }
