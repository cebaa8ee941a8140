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
import re
from typing import Any, Iterable, Mapping

from uvcheck.germicidal import TRANSFERRED, UVC_EMITTING
from uvcheck.limits import GROUPS
from uvcheck.report.terminal import (hazard_below_detection, hg_line_text, is_estimate,
                                     listing_only, no_assessment_distance, peak_caveat,
                                     status_text, tmax_is_upper_bound)
from uvcheck.spectrum import partly_measured
from uvcheck.report.cautions import (DOES_NOT_COVER, DOES_NOT_COVER_ESTIMATE,
                                     DOES_NOT_COVER_LISTING, LOCAL_CODES, applicable)
from uvcheck.units import UNIT_CHARACTERS, bounded_duration, format_duration, sig, to_trade

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


#: SI unit ids as the science modules write them inside sentences, longest first, and their
#: display forms (the note shows one unit style throughout).
_UNIT_IN_TEXT = [(re.compile(r"(?<![\w/^])" + re.escape(k) + r"(?![\w^])"), v)
                 for k, v in sorted({**{k: v for k, v in _SI_LABEL.items() if " " in k},
                                     "W m-2 sr-1 nm-1": "W/(m²·sr·nm)", "J m-2 sr-1": "J/(m²·sr)",
                                     "W nm-1": "W/nm"}.items(), key=lambda kv: -len(kv[0]))]
#: View keys whose texts are data, not prose (kept as they are).
_DATA_KEYS = {"id", "file", "sha256", "schema", "json"}


def units_in_words(view: Any) -> Any:
    """The view with SI unit ids inside its texts ('2.9e-05 W m-2 nm-1') in the note's display
    form ('2.9e-05 W/(m²·nm)'), and unit characters of CJK fonts ('㎡', which the note's fonts
    lack) spelled out ('m²'); keys in :data:`_DATA_KEYS` left alone.

    Examples
    --------
    >>> units_in_words({"basis": "a flat level (2.95e-05 W m-2 nm-1) at 1 W m-2", "id": "W m-2"})
    {'basis': 'a flat level (2.95e-05 W/(m²·nm)) at 1 W/m²', 'id': 'W m-2'}
    """
    if isinstance(view, str):
        # unit characters of CJK fonts ('㎡') spelled out: the note's fonts lack them
        view = view.translate(UNIT_CHARACTERS)
        if "m-2" not in view and "nm-1" not in view:
            return view
        for rx, label in _UNIT_IN_TEXT:
            view = rx.sub(label, view)
        return view
    if isinstance(view, dict):
        return {k: (v if k in _DATA_KEYS else units_in_words(v)) for k, v in view.items()}
    if isinstance(view, list):
        return [units_in_words(v) for v in view]
    if isinstance(view, tuple):
        return tuple(units_in_words(v) for v in view)
    return view


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
    >>> percent(0.9999599), percent(0.833), percent(0.0157), percent(6.1e-82)
    ('> 99.9 %', '83.3 %', '1.6 %', '< 0.01 %')
    """
    if x is None:
        return "—"
    if x == 0:
        return "0 %"
    if 0 < x < 1e-4:
        return "< 0.01 %"
    if x >= 0.999995:
        return "100 %"
    if x > 0.999:
        return "> 99.9 %"
    return f"{sig(100 * x, 2 if x < 0.1 else 3)} %"


def duration(seconds: float | None, bound: str | None = None) -> str:
    """format_duration with a bound sign: at_least → '≥', at_most → '≤'."""
    if seconds is None:
        return "—"
    return bounded_duration(seconds, bound)


def place(d_m: float | None) -> str:
    """Where a value holds, for a sentence: '20 cm', or 'the measurement position' when no
    distance is known (the values then hold where the spectrum was measured).

    Examples
    --------
    >>> place(0.2), place(None)
    ('20 cm', 'the measurement position')
    """
    return "the measurement position" if d_m is None else distance(d_m)


#: Why the group of a result without a measurement distance is not the lamp's classification
#: (our own wording; the result says it in ``evaluation.assumptions``).
NO_DISTANCE_TEXT = ("no measurement distance was given, so the IEC 62471 assessment distance "
                    "could not be applied and this is not the lamp's IEC 62471 classification; "
                    "give the measurement distance (--distance)")


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
        elif st == "below-detection" or b.get("below_detection"):
            dl = b.get("detection_limit")
            val = f"< {quantity(dl, b.get('unit'))}" if dl is not None else "below detection"
            val += " so far" if st == "partial" else ""  # partial: the measured part only
        elif b.get("value") is None:
            val = "(relative spectrum)"
        else:
            val = ("≥ " if st == "partial" else "") + quantity(b.get("value"), b.get("unit"))
        rows.append({"band": BAND_NAMES.get(k, k), "range": f"{lo:g}–{hi:g} nm" if lo is not None else "",
                     "value": val, "fraction": percent(b.get("fraction")),
                     "coverage": percent(b.get("coverage")),
                     "status": status_text(st, result, bool(b.get("below_detection")))
                     if st else ""})
    return rows


def _estimated(text: str, result: Result) -> str:
    """Display text with 'measured' worded as 'estimated' for a result from stated data.

    Examples
    --------
    >>> _estimated("partly measured (lower bound)", {"input": {"origin": "nominal"}})
    'partly estimated (lower bound)'
    """
    if not is_estimate(result) or not text:
        return text
    for a, b in (("not measured", "not covered by the model"), ("unmeasured", "not modelled"),
                 ("measurable", "modelled"), ("measured", "estimated"),
                 ("Measured", "Estimated")):
        text = text.replace(a, b)
    return text


def spectral_facts(result: Result) -> list[dict[str, str]] | None:
    sp = result.get("spectral")
    if not sp:
        return None
    out = []
    if sp.get("peak_nm") is not None:
        caveat = peak_caveat(result)
        out.append({"label": "Peak", "value": f"{sp['peak_nm']:.4g} nm"
                    + (f", FWHM {sig(sp['fwhm_nm'])} nm" if sp.get("fwhm_nm") else "")
                    + (f" ({caveat})" if caveat else "")})
    if sp.get("centroid_nm") is not None:
        out.append({"label": "Centroid", "value": f"{sp['centroid_nm']:.4g} nm"})
    # each name once: the two lines of a doublet carry the same name ("Hg 312.6/313.2 nm")
    lines = list(dict.fromkeys(ln.get("identified_as") for ln in sp.get("lines") or []
                               if ln.get("identified_as")))
    if lines:
        out.append({"label": "Lines identified", "value": ", ".join(lines)})
    out.append({"label": "Mercury 253.7 nm line",
                "value": hg_line_text(sp.get("hg_253_7_present"), result)})
    ph = result.get("photometry") or {}
    if ph.get("value") is not None:
        where = "the position of the estimate" if is_estimate(result) else "the measurement position"
        out.append({"label": f"Illuminance at {where}", "value": f"{sig(ph['value'])} lx"})
    return out


# ---------------------------------------------------------------------------------------------
# Hazards
# ---------------------------------------------------------------------------------------------

def _value_text(h: Mapping[str, Any]) -> str:
    st, v, unit = h.get("status"), h.get("value"), h.get("unit")
    dl = h.get("detection_limit")
    if st == "not-assessable" or (v is None and st != "below-detection"):
        return "not assessable"
    if hazard_below_detection(h):
        if dl is None:
            return "below detection"
        # partly measured: the detection limit of the measured part, no bound on the rest
        return f"< {quantity(dl, unit)} (detection limit" + (
            ", measured part only)" if st == "partial" else ")")
    return ("≥ " if st == "partial" else "") + quantity(v, unit)


def _tmax_text(h: Mapping[str, Any]) -> str:
    """The maximum exposure time in words. A partly measured hazard (its value a lower bound)
    gives an upper bound on it: 'at most 2.93 h (measured part only)', 'none so far (within
    the long-term limit on the measured part only)', 'not reached within 10 s so far
    (measured part only)'."""
    if h.get("status") == "not-assessable":
        return "—"
    part = (h.get("status") == "partial" or bool(h.get("risk_group_is_lower_bound"))
            or "on the measured part only" in (h.get("t_max_note") or ""))
    if h.get("t_max_s") is not None:
        t = format_duration(h["t_max_s"])
        return f"at most {t} (measured part only)" if part else t
    note = h.get("t_max_note") or ""
    out = note
    if note.startswith("no time limit"):
        out = ("none so far (within the long-term limit on the measured part only)" if part
               else "none (within the long-term limit)")
    elif note.startswith("within the limit for every duration it covers"):
        tail = note.split("(up to", 1)[-1].split(")", 1)[0].strip()
        try:
            out = f"not reached within {format_duration(float(tail.split()[0]))}"
            out += " so far (measured part only)" if part else ""
        except (ValueError, IndexError):
            out = note
    elif note.startswith("no measurable emission"):
        out = "none (no measurable emission)" + (" (measured part only)" if part else "")
    elif part and out and "measured part only" not in out:
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
            "t_max": _estimated(_tmax_text(h), result), "t_max_interval": _tmax_interval_text(h),
            "group": _group_text(h),
            "distance": distance(ev.get("distance_m")) if ev.get("distance_m") is not None
            else "measurement position",
            "coverage": percent(h.get("coverage")), "status": h.get("status"),
            "reason": _estimated(h.get("reason") or "", result) or None,
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
    if h.get("status") == "partial":
        # a lower bound: its interval's lower end is the bound at 95 %; an upper end means nothing
        return f"95 %: ≥ {sig(iv[0])} {unit}"
    return f"95 %: {sig(iv[0])}–{sig(iv[1])} {unit}"


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
    overall = _probability_text(ov.get("risk_group_probability"))
    by_rule = ov.get("risk_group_by_rule")
    lower = bool(ov.get("is_lower_bound") or (result.get("risk_group") or {}).get("is_lower_bound"))
    if lower:   # the group is a lower bound: so is each probability's group (as the headline)
        if overall:
            overall = (f"{overall} (probability of at least each group: the overall group "
                       "is a lower bound)")
        if by_rule:
            by_rule = f"at least {by_rule}"
    return {"evaluated": True, "text": uncertainty_note(u),
            "overall": overall, "overall_by_rule": by_rule,
            "borderline": border, "rule": rule.get("name"), "rule_text": rule.get("statement")}


def open_hazards_text(result: Result, section: Mapping[str, Any] | None = None) -> str:
    """Why the overall group is only a lower bound: 'L_R, L_IR not assessable; E_IR partly measured'.

    section : the part of the result that holds ``risk_group`` and ``hazards`` (default: the
    result itself, i.e. the assessment distance; ``result['use_distance']`` for the other one).
    """
    sec = section if section is not None else result
    rg = sec.get("risk_group") or {}
    hz = dict(result.get("hazards") or {})
    for k, h in (sec.get("hazards") or {}).items():
        hz[k] = {**hz.get(k, {}), **{a: b for a, b in h.items() if b is not None}}
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


_RANK = {g: k for k, g in enumerate(GROUPS)}


def _bound_words(result: Result, section: Mapping[str, Any]) -> tuple[str, str]:
    """(qualifier after the group, why it could be higher) for a lower-bound group.

    Partly measured hazards: '... on the measured range; the unmeasured range could raise it';
    hazards that could not be assessed at all are named with that reason instead.
    """
    rg = section.get("risk_group") or {}
    hz = dict(result.get("hazards") or {})
    for k, h in (section.get("hazards") or {}).items():
        hz[k] = {**hz.get(k, {}), **{a: b for a, b in h.items() if b is not None}}
    opened = rg.get("open_hazards") or []
    na = [hz.get(k, {}).get("symbol") or k for k in opened
          if hz.get(k, {}).get("status") == "not-assessable"]
    part = [hz.get(k, {}).get("symbol") or k for k in opened
            if hz.get(k, {}).get("status") != "not-assessable"]
    data = "estimated" if is_estimate(result) else "measured"
    up = rg.get("upper_bound")
    upto = f" (up to {up})" if up and up != rg.get("group") else ""
    rest = "the range the model does not cover" if data == "estimated" else "the unmeasured range"
    if part and not na:
        return (f"on the {data} range",
                f"{rest} could raise it{upto}: {', '.join(part)} only partly {data}")
    if na and not part:
        return ("for the hazards that could be assessed",
                f"{', '.join(na)} could not be assessed and could raise it{upto}")
    return ("for what could be assessed",
            f"{', '.join(na)} not assessable and {', '.join(part)} only partly {data}: "
            f"they could raise it{upto}")


def _group_at(result: Result, section: Mapping[str, Any], where: str,
              label: str) -> dict[str, Any] | None:
    """One risk-group statement (group, words, governing hazard and its time) at one distance."""
    rg = section.get("risk_group") or {}
    g = rg.get("group")
    if not g:
        return None
    hz = section.get("hazards") or {}
    base = result.get("hazards") or {}
    gid = rg.get("governing") or ""
    gov = {**base.get(gid, {}), **{a: b for a, b in (hz.get(gid) or {}).items() if b is not None}}
    box = None
    if rg.get("is_lower_bound"):
        qual, why = _bound_words(result, section)
        detail = f"{g} {qual}; {why}."
        box = why[:1].upper() + why[1:] + "."   # under a headline that already says "g qual"
    else:
        qual = ""
        words = GROUP_TEXT.get(g, "")
        detail = words[:1].upper() + words[1:]
        if gov and g != "Exempt":
            detail += f"; set by {gov.get('name', gid)}" + (
                f" ({gov.get('symbol')})" if gov.get("symbol") else "")
            if gov.get("t_max_s") is not None:
                detail += f": the limit {_reached(gov, gov['t_max_s'])}"
            # another hazard (a lower group) can still reach its limit sooner: say so
            times = [(h.get("t_max_s"), k) for k, h in hz.items() if h.get("t_max_s") is not None]
            if times:
                t, k = min(times)
                if k != gid and (gov.get("t_max_s") is None or t < gov["t_max_s"]):
                    detail += (f"; the shortest time to a limit is {format_duration(t)} "
                               f"({LIMIT_WORDS.get(k, k)})")
        detail += "."
    return {"group": g, "rank": _RANK.get(g, -1), "qualifier": qual, "detail": detail,
            "box_detail": box or detail,
            "is_lower_bound": bool(rg.get("is_lower_bound")), "where": where, "label": label,
            "governing": gid or None, "governing_t_max": gov.get("t_max_s") if gov else None,
            "text": f"{g} {qual}".strip()}


def _not_assessable_reason(result: Result) -> str:
    """Why no group at all: a relative spectrum (and how to scale it), or the hazards' reasons."""
    inp = result.get("input") or {}
    if inp.get("origin") == "relative" or inp.get("quantity") == "relative" \
            or inp.get("unit") == "relative":
        return ("The spectrum is relative (shape only, no absolute scale), so no hazard value "
                "can be computed. Scale it with a radiometer or lux reading at a known distance "
                "(--scale-band, --scale-lux) or a total radiant flux (--scale-total), or give "
                "the unit of its values (--unit).")
    reasons = _uniq(h.get("reason") or "" for h in (result.get("hazards") or {}).values()
                    if h.get("status") == "not-assessable")
    why = "; ".join(reasons) if reasons else (
        (result.get("risk_group") or {}).get("note") or "no hazard could be assessed")
    why = _estimated(why, result)
    return why[:1].upper() + why[1:] + "."


def risk_summary(result: Result) -> dict[str, Any] | None:
    """The first screen's risk-group box: the group at the assessment distance and at the
    distance of use (the worse one first and in the headline), the borderline flag and the
    group probabilities from the uncertainty evaluation, or why no group could be given."""
    rg = result.get("risk_group")
    if not rg:
        return None
    ev = result.get("evaluation") or {}
    here = place(ev.get("distance_m"))
    rule = ev.get("distance_rule") or ""
    no_dist = no_assessment_distance(result)
    main = _group_at(result, result, here, "the IEC 62471 assessment distance")
    if main is not None and no_dist:
        # the values hold where the spectrum was measured: not the lamp's classification
        main["where"] = "the measurement position, not at the IEC 62471 assessment distance"
        main["detail"] += f" This is the group at the measurement position: {NO_DISTANCE_TEXT}."
        main["box_detail"] += f" This is the group at the measurement position: {NO_DISTANCE_TEXT}."
    u = result.get("use_distance") or {}
    use = None
    if u.get("risk_group"):
        ud = distance((u.get("evaluation") or {}).get("distance_m"))
        use = _group_at(result, u, ud, "the distance of use")
    est = is_estimate(result)
    if main is None and use is None:
        reason = _not_assessable_reason(result)
        return {"group": None, "headline": "Not assessable", "where": "", "detail": reason,
                "other": None, "is_lower_bound": False, "distance": here, "distance_rule": rule,
                "governing": None, "governing_t_max": None, "use_distance": _use_distance(result),
                "probability": None, "borderline": False, "borderline_hazards": [],
                "borderline_text": None, "qualifier": "",
                "by_rule": None, "estimate": est, "overview": "Not assessable",
                "not_assessable": True}
    first, second = main, use
    if main is None or (use is not None and use["rank"] > main["rank"]):
        first, second = use, main
    assert first is not None
    where = f"at {first['where']}" + (f" ({first['label']})" if first is use else "")
    other = None
    if second is not None:
        det = second["detail"]
        if not second["is_lower_bound"]:
            det = f"{second['group']}, {det[:1].lower()}{det[1:]}"
        other = f"At {second['where']} ({second['label']}): {det}"
    # uncertainty: at the assessment distance only (that is where it was evaluated)
    unc = (result.get("uncertainty") or {})
    ov = unc.get("overall") or {} if unc.get("status") == "evaluated" else {}
    hz = result.get("hazards") or {}
    border = [hz[k].get("symbol") or k for k in hz if hz[k].get("borderline")]
    prob = _probability_text(ov.get("risk_group_probability"))
    # the overall group is borderline when its own 95 % range spans two groups; a borderline
    # hazard that does not set the group is named, but does not make the group borderline
    rng = ov.get("risk_group_range_95") or []
    borderline = bool(ov.get("borderline")) and (len(rng) != 2 or rng[0] != rng[1])
    by_rule = ov.get("risk_group_by_rule")
    rule_name = ((unc.get("decision_rule") or {}).get("name") or "")
    by_rule_text = None
    if main is not None and by_rule and by_rule != main["group"]:
        by_rule_text = (f"Under the decision rule ({rule_name or 'as chosen'}) the group at "
                        f"{here} is {by_rule}.")
    prob_text = None
    if prob and main is not None:
        prob_text = (f"Probability at {here}"
                     + (" of at least each group" if ov.get("is_lower_bound") else "")
                     + f": {prob}"
                     + (" (for the hazards that could be assessed)" if ov.get("is_lower_bound") else "")
                     + ".")
    if borderline:
        border_text = ("Borderline: the 95 % interval spans a group boundary"
                       + (f" ({', '.join(border)})" if border else "") + ".")
    elif border:
        border_text = (f"{', '.join(border)} {'is' if len(border) == 1 else 'are'} borderline "
                       "(the 95 % interval spans a group boundary), without changing the "
                       "overall group.")
    else:
        border_text = None
    headline = first["group"]
    overview = f"{first['text']} {where}"
    if second is not None and second["group"] != first["group"]:
        overview += f"; at {second['where']}: {second['text']}"
    if est:
        overview = "Estimated: " + overview
    return {"group": first["group"], "headline": headline, "qualifier": first["qualifier"],
            "where": where, "detail": first["box_detail"], "other": other,
            "is_lower_bound": first["is_lower_bound"],
            "distance": here, "distance_rule": rule,
            "governing": first["governing"], "governing_t_max": first["governing_t_max"],
            "governing_at": first["where"],
            "use_distance": _use_distance(result),
            "probability": prob_text, "borderline": borderline, "borderline_hazards": border,
            "borderline_text": border_text,
            "by_rule": by_rule_text, "estimate": est, "overview": overview,
            "not_assessable": False}


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
                     "value": _value_text(h), "t_max": _tmax_text(h), "group": _group_text(h),
                     "interval": _interval_text(h), "t_max_interval": _tmax_interval_text(h),
                     "borderline": bool(h.get("borderline"))})
    return {"distance": distance(ev.get("distance_m")), "rule": ev.get("distance_rule") or "",
            "group": rg.get("group"), "is_lower_bound": bool(rg.get("is_lower_bound")),
            "rows": rows}


def _tmax_interval_text(h: Mapping[str, Any]) -> str | None:
    """'95 %: 5.20–6.36 s' for the permissible exposure time, where the uncertainty gives one."""
    iv = h.get("t_max_interval_95_s")
    if not iv or len(iv) != 2 or h.get("t_max_s") is None:
        return None
    lo, hi = iv
    if lo is None and hi is None:
        return None
    nb = "\u00a0"
    if lo is None:
        return f"95{nb}%: up to {format_duration(hi).replace(' ', nb)}"
    if hi is None:
        return f"95{nb}%: {format_duration(lo).replace(' ', nb)} or longer"
    return f"95{nb}%: {_span(iv)}"


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
        dl = quantity(r.get('detection_limit'), r.get('unit'))
        if partly_measured(r):  # below it in the measured part only
            return (f"< {dl} so far (partly measured, nothing above the detection limit in "
                    "the measured part)")
        return f"< {dl} (below detection)"
    if st == "likely-stray-light":
        part = "; partly measured, so for the measured part only" if partly_measured(r) else ""
        return (f"≤ {quantity(r.get('upper_bound'), r.get('unit'))} (likely stray light, not "
                f"emission{part})")
    if st == "shape-only":
        return f"{percent(r.get('fraction'))} of the output (relative spectrum)"
    v = quantity(r.get("value"), r.get("unit"))
    return ("≥ " if st == "partial" else "") + v


def _span(iv: Any) -> str | None:
    """'6.03–7.34 s' for a [lo, hi] pair of durations; None when either end is missing."""
    if not iv or len(iv) != 2 or iv[0] is None or iv[1] is None:
        return None
    nb = "\u00a0"  # no-break space: an interval wraps as a whole, not inside '6.03 s'
    return f"{format_duration(iv[0]).replace(' ', nb)}–{format_duration(iv[1]).replace(' ', nb)}"


def organism_rows(g: Mapping[str, Any], unc: Mapping[str, Any] | None = None
                  ) -> tuple[list[dict[str, Any]], list[dict[str, Any]]]:
    """(highlight rows: the most susceptible organism per medium; all rows, fastest first).

    unc : ``result['uncertainty']['germicidal']``, for the 95 % intervals of the times
    (``inactivation_most_susceptible['<pathway>/<medium>']`` and ``inactivation[<id>]``).
    Each row carries the study-spread range (``time_to_90_s_range``) and the 95 % interval
    (``time_to_90_interval_95_s``) as text where the result has them.
    """
    pathway = "uvc" if g.get("status") in UVC_EMITTING else "violet_blue"
    ms = (g.get("most_susceptible") or {}).get(pathway) or {}
    u_ms = (unc or {}).get("inactivation_most_susceptible") or {}
    u_named = (unc or {}).get("inactivation") or {}

    def row(e: Mapping[str, Any], label: str = "", u: Mapping[str, Any] | None = None) -> dict[str, Any]:
        ta = e.get("times_are")
        bound = "at_least" if ta == "at_least" else ("at_most" if ta == "at_most" else None)
        u = u if u is not None else u_named.get(e.get("organism_id") or "") or {}
        if u and u.get("organism_id") not in (None, e.get("organism_id")):
            u = {}
        return {"label": label, "organism": e.get("organism"), "id": e.get("organism_id"),
                "medium": e.get("medium"), "wavelength": f"{sig(e.get('wavelength_nm'), 3)} nm",
                "t90": duration(e.get("time_to_90_s"), bound),
                "t999": duration(e.get("time_to_99_9_s"), bound) if e.get("time_to_99_9_s") is not None
                else "not reached in the data",
                "t90_range": _span(e.get("time_to_90_s_range")),
                "t999_range": _span(e.get("time_to_99_9_s_range")),
                "t90_interval": _span(u.get("time_to_90_interval_95_s")),
                "t999_interval": _span(u.get("time_to_99_9_interval_95_s")),
                "reliability": e.get("reliability"), "source": e.get("source"),
                "from_memory": e.get("from_memory"),
                "basis": e.get("irradiance_basis"),
                "irradiance": quantity(e.get("irradiance_W_m2"), "W m-2")}

    hl = [row(ms[m], f"most susceptible ({m})", u_ms.get(f"{pathway}/{m}") or {})
          for m in ORG_MEDIA if ms.get(m)]
    rows = [e for e in g.get("inactivation") or [] if e.get("pathway") == pathway
            and e.get("group") not in ("phage",)]
    rows.sort(key=lambda e: (e.get("time_to_99_9_s") is None, e.get("time_to_99_9_s") or 0.0,
                             e.get("time_to_90_s") or 0.0))
    return hl, [row(e) for e in rows]


def times_caption(where: str, rows: list[dict[str, Any]]) -> str:
    """The caption of the times table, naming only the ranges the rows actually show."""
    txt = (f"Times at {where} from the lamp, using the lamp's irradiance weighted to the "
           "wavelength at which each organism was measured (the most favourable action "
           "spectrum; ≥: the lamp's figure is only an upper bound, so times are at least this).")
    if any(o.get("t90_interval") or o.get("t999_interval") for o in rows):
        txt += (" “95 %”: the 95 % interval from the measurement uncertainty (calibration, "
                "wavelength, distance, stray light, noise and the organism data's spread).")
    if any(o.get("t90_range") or o.get("t999_range") for o in rows):
        txt += " “studies”: the range across the studies pooled by the source."
    else:
        txt += " The table gives no range across studies for these organisms."
    return txt + (" Real surfaces, shadows and soil slow this down; the most susceptible "
                  "organism is not a typical germ.")


def _fov_text(fv: Mapping[str, Any] | None) -> str | None:
    """The occupant's figure under the eye-level field-of-view convention, in words."""
    if not fv:
        return None
    return (f"Under the {fv['fov_deg']:g}° field-of-view convention (a detector at eye height "
            f"facing horizontally): {fv.get('symbol', 'E_S')} "
            f"{quantity(fv.get('effective_S_W_m2'), 'W m-2')}, the "
            f"8-hour limit reached in {duration(fv.get('time_to_limit_s'))}"
            + (" — exceeds the 8-hour limit" if fv.get("exceeds_8h_limit") else "") + ".")


def _pattern_words(pattern: str | None) -> str | None:
    from uvcheck.room import PATTERN_WORDS

    return PATTERN_WORDS.get(pattern or "", pattern)


def germicidal_block(result: Result) -> dict[str, Any] | None:
    g = result.get("germicidal")
    if not g:
        return None
    eff = (g.get("effective") or {})
    spectra = []
    for aid, e in (eff.get("by_action_spectrum") or {}).items():
        eq = e.get("equivalent") if e.get("equivalent") is not None else e.get("equivalent_upper_bound")
        # the equivalent is what its reading is: an upper bound (the favourable reading where
        # none is established) or, for a band measured in part, a lower bound
        sign = ("≤ " if e.get("equivalent") is None else
                "≥ " if e.get("status") == "partial" else "") if eq is not None else ""
        name = e.get("name") or aid
        spectra.append({"id": aid, "label": name, "value": _reading_text(e),
                        "equivalent": sign + quantity(eq, e.get("unit")),
                        # said once: a name that says it already needs no flag
                        "from_memory": bool(e.get("from_memory")) and "from memory" not in name})
    vb = eff.get("violet_blue_405") or {}
    unc = result.get("uncertainty") or {}
    hl, rows = organism_rows(g, unc.get("germicidal") if unc.get("status") == "evaluated" else None)
    pos = g.get("position") or {}
    oz = g.get("ozone") or {}
    return {"status": g.get("status"), "statement": _estimated(g.get("statement") or "", result),
            "times_caption": times_caption(place(pos.get("distance_m")), hl),
            "position": pos.get("basis"), "distance": distance(pos.get("distance_m")),
            "uvc": _reading_text(g.get("uvc")), "far_uvc": _reading_text(g.get("far_uvc")),
            "spectra": spectra, "violet_blue": _reading_text(vb) if vb else None,
            "spread": (eff.get("equivalent_254") or {}).get("spread_ratio"),
            "ozone": {"status": oz.get("status"), "note": oz.get("note")},
            "artefacts": [a.get("detail") for a in g.get("artefacts") or []],
            "technology": (g.get("technology") or {}).get("name"),
            "technology_basis": (g.get("technology") or {}).get("basis"),
            "pathway": "UV-C" if g.get("status") in UVC_EMITTING else "violet-blue (about 405 nm)",
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
        "pattern": _pattern_words(lamp.get("pattern")), "flux_basis": lamp.get("flux_basis"),
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
                     "note": occ.get("note"), "limit": occ.get("limit"),
                     "symbol": occ.get("symbol") or "E_S",
                     "fov": _fov_text({**(occ.get("fov_convention") or {}),
                                       "symbol": occ.get("symbol") or "E_S"}
                                      if occ.get("fov_convention") else None)},
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
    """'UV-A 74.9 %, visible 25.1 % of the measured output' (≥ for a partly measured band)."""
    bands = result.get("bands") or {}
    names = ["UV-C", "UV-B", "UV-A", "visible", "IR-A"]
    far = (bands.get("far-UVC") or {}).get("fraction") or 0.0
    if far > 0.5 * ((bands.get("UV-C") or {}).get("fraction") or 1.0):
        names[0] = "far-UVC"
    parts = [(k, b.get("fraction"), b.get("status")) for k, b in bands.items()
             if k in names and b.get("fraction")]
    parts = sorted([p for p in parts if p[1] >= 0.01], key=lambda p: -p[1])[:3]
    if not parts:
        return ""
    data = "estimated" if is_estimate(result) else "measured"
    txt = ", ".join(f"{k} {'≥ ' if st == 'partial' else ''}{percent(f)}" for k, f, st in parts)
    txt += f" of the {data} output"
    if any(st == "partial" for _, _, st in parts):
        txt += f" (≥: the band was only partly {data})"
    return txt


def _fastest(hl: list[dict[str, Any]], g: Mapping[str, Any]) -> Mapping[str, Any] | None:
    pathway = "uvc" if g.get("status") in UVC_EMITTING else "violet_blue"
    ms = (g.get("most_susceptible") or {}).get(pathway) or {}
    cands = [e for e in ms.values() if e and e.get("time_to_99_9_s") is not None]
    return min(cands, key=lambda e: e["time_to_99_9_s"]) if cands else None


def _shape_only_uvc(result: Result) -> str:
    """The UV-C sentence for a relative spectrum, worded by the band's coverage."""
    b = (result.get("bands") or {}).get("UV-C") or {}
    r = (result.get("germicidal") or {}).get("uvc") or {}
    frac = r.get("fraction") if r.get("fraction") is not None else b.get("fraction")
    cov = r.get("coverage") if r.get("coverage") is not None else b.get("coverage")
    head = ("Relative spectrum (shape only): no irradiance, dose or time can be given until it "
            "is scaled.")
    if not cov:
        return head + " UV-C was not measured."
    none = frac is None or frac < 1e-4 or bool(b.get("below_detection"))
    if cov < 0.999995:
        part = ("holds essentially no UV-C" if none else
                f"makes UV-C at least {percent(frac)} of the output")
        return (head + f" UV-C is only partly measured ({percent(cov)} of the band): the "
                f"measured part {part}; the unmeasured part could add more.")
    return head + (" It emits essentially no UV-C." if none else
                   f" UV-C is {percent(frac)} of the measured output.")


def finding(result: Result, claims: list[dict[str, Any]] | None = None) -> str:
    """The one-paragraph plain-language finding, every number from the result dict.

    A result from a listing alone (nominal model) is worded as an estimate throughout; a
    relative spectrum as shape only; partly measured bands and groups as lower bounds.
    """
    s: list[str] = []
    g = result.get("germicidal") or {}
    sp = result.get("spectral") or {}
    inp = result.get("input") or {}
    est = is_estimate(result)
    if listing_only(result):
        s.append("Nothing was measured, and the listing states too little to model the lamp "
                 "(no technology, wavelength or band): there are no figures, and nothing here "
                 "says whether the lamp is safe or works.")
    peak = sp.get("peak_nm")
    st = g.get("status")
    gpos = place((g.get("position") or {}).get("distance_m"))
    lamp = "On this estimate the lamp" if est else "This lamp"
    if est:
        s.append("ESTIMATE from the seller's stated data: nothing was measured, so every figure "
                 "below is a model estimate, not a measurement.")
    if st == "no-uvc":
        s.append(f"{lamp} emits essentially no germicidal UV-C.")
        if g.get("artefacts") and not est:
            s.append("The faint signal recorded below 280 nm looks like stray light in the "
                     "spectrometer, not emission.")
    elif st == "germicidal-uvc":
        s.append(f"{lamp} emits germicidal UV-C: {_reading_text(g.get('uvc'))} at {gpos}"
                 + (" (estimated)." if est else "."))
    elif st == "partial":
        s.append(f"{lamp} emits UV-C ({_reading_text(g.get('uvc'))} at {gpos}); part of the "
                 "UV-C band was not measured, so the true output can be higher.")
    elif st == "shape-only":
        s.append(_shape_only_uvc(result))
    elif st == "not-assessed":
        s.append(g.get("statement") or "Whether this lamp emits UV-C could not be assessed.")
    if peak is not None and inp:
        lines = [ln for ln in sp.get("lines") or [] if ln.get("identified_as")]
        strongest = max(lines, key=lambda ln: ln.get("height") or 0.0) if lines else None
        comp = _composition(result)
        what = light_name(peak)
        its = "Its estimated output" if est else "Its output"
        txt = f"{its} is {what} peaking at {peak:.4g} nm"
        if strongest and strongest["identified_as"].startswith("Hg"):
            txt = (f"{its} is the mercury line spectrum, strongest on the "
                   f"{strongest['identified_as'][3:]} line ({what.replace(' radiation', '')})")
        elif strongest and strongest["identified_as"].startswith("KrCl"):
            txt = f"{its} is a narrow {what.replace(' radiation', '')} band peaking at {peak:.4g} nm"
        s.append(txt + (f"; {comp}." if comp else "."))
    oz = g.get("ozone") or {}
    if oz.get("status") == "present":
        s.append("The listing says the lamp makes ozone (or emits at 185 nm), and ozone forms "
                 "in the air it lights: air the room after use before anyone goes in."
                 if oz.get("basis") == "stated" else
                 f"{'On this estimate it' if est else 'It'} emits below 240 nm, where light "
                 "forms ozone from the oxygen in the air: air the room after use before anyone "
                 "goes in.")
    if g:
        hl, _ = organism_rows(g)
        best = _fastest(hl, g)
        if best is not None:
            t = duration(best["time_to_99_9_s"], best.get("times_are"))
            # "about 8 s", or "at most about 8 s" where the time is a bound ("≤ 8 s")
            bound = {"≤ ": "at most about ", "≥ ": "at least about "}.get(t[:2])
            t = bound + t[2:] if bound else "about " + t
            if st in UVC_EMITTING:
                moved = (f", data measured at {best['wavelength_nm']:g} nm and carried over to "
                         "this lamp's wavelength by an action spectrum"
                         if TRANSFERRED in (best.get("irradiance_basis") or "") else "")
                s.append(f"At {gpos}, even the most susceptible organism in uvcheck's table "
                         f"({best['organism']}, {best['medium']}{moved}) needs {t} for a 99.9 % "
                         "reduction; most real germs need longer.")
            else:
                s.append(f"Violet and blue light inactivate some bacteria, but slowly: a 99.9 % reduction "
                         f"would take {t} at {gpos} even for the most susceptible organism "
                         f"in the table ({best['organism']}, {best['medium']}).")
    s += _risk_sentences(result)
    cs = claims_summary(claims)
    if cs:
        s.append(cs)
    return " ".join(s)


def _risk_sentences(result: Result) -> list[str]:
    """The finding's risk-group sentences: at the assessment distance and, when different, at
    the distance of use."""
    est = is_estimate(result)
    is_ = "is estimated to be" if est else "is"
    ev = result.get("evaluation") or {}
    main = _group_at(result, result, place(ev.get("distance_m")), "")
    u = result.get("use_distance") or {}
    use = _group_at(result, u, distance((u.get("evaluation") or {}).get("distance_m")), "") \
        if u.get("risk_group") else None
    out: list[str] = []
    if main is None:
        if not result.get("hazards") and not result.get("input"):
            return ["No spectrum was given, so its hazards were not assessed."]
        if result.get("risk_group") is not None and (result.get("input") or {}):
            r = _not_assessable_reason(result)
            out.append("Its risk group could not be assessed: " + r[0].lower() + r[1:])
        return out
    hz = result.get("hazards") or {}
    if main["is_lower_bound"]:
        qual, why = _bound_words(result, result)
        out.append(f"At {main['where']} it {is_} {main['group']} {qual}; {why}; see what "
                   "could not be assessed.")
    elif main["group"] == "Exempt":
        are = "are estimated to be" if est else "are"
        out.append(f"At {main['where']} its photobiological hazards {are} within the Exempt group.")
    else:
        gov = hz.get(main["governing"] or "", {})
        t = gov.get("t_max_s")
        out.append(f"It is hazardous: at {main['where']} the "
                   f"{LIMIT_WORDS.get(main['governing'] or '', 'exposure limit')} "
                   f"{_reached(gov, t)}{' (estimated)' if est else ''} "
                   f"(risk group {main['group']}, {GROUP_TEXT.get(main['group'], '')})."
                   if t is not None else
                   f"At {main['where']} it {is_} in risk group {main['group']} "
                   f"({GROUP_TEXT.get(main['group'], '')}).")
    if no_assessment_distance(result):
        out.append("That is the group where the spectrum was measured, at an unknown distance: "
                   + NO_DISTANCE_TEXT + ".")
    if use is not None and use["rank"] > main["rank"]:
        ugov = (u.get("hazards") or {}).get(use["governing"] or "", {})
        t = ugov.get("t_max_s")
        out.append(f"At the distance of use, {use['where']}, it {is_} in risk group {use['group']}"
                   + (" or higher" if use["is_lower_bound"] else "")
                   + (f": the {LIMIT_WORDS.get(use['governing'] or '', 'exposure limit')} "
                      f"{_reached({**(hz.get(use['governing'] or '') or {}), **ugov}, t)}."
                      if t is not None else "."))
    return out


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
    if listing_only(result):
        out.append({"what": "The lamp's output, hazards and germicidal dose",
                    "why": "no measurement, and the listing states nothing the output can be "
                           "modelled from (no technology, wavelength or band)"})
    elif result.get("input") and g is None:
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
    if inp and listing_only(result):
        inputs.append({"label": "Data", "value": "none: the listing alone (no lamp model)"})
    elif inp:
        inputs.append({"label": "Spectrum file", "value": os.path.basename(str(inp.get("path")))})
        rep = inp.get("repeats")
        if rep:
            inputs.append({"label": "Repeat scans", "value": (
                f"the mean of {rep['n']} scans ("
                + ", ".join(os.path.basename(str(f)) for f in rep["files"]) + ")"
                + (f"; their totals differ by {100 * rep['spread']:.1f} %"
                   if rep.get("spread") is not None else ""))})
        dark = inp.get("dark")
        if dark:
            inputs.append({"label": "Dark scan subtracted",
                           "value": os.path.basename(str(dark.get("file")))})
        inputs.append({"label": "sha256", "value": str(inp.get("sha256"))})
        lo, hi = inp.get("range_nm") or (None, None)
        origin = ("digitised (read off a graph, not a measurement)" if inp.get("digitised")
                  else inp.get("origin"))
        inputs.append({"label": "Data", "value": f"{origin} {inp.get('quantity')} in "
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
        for k, v in (inp.get("test_record") or {}).items():
            inputs.append({"label": f"Test record: {k}", "value": str(v)})
        inputs.append({"label": "Model placed at" if is_estimate(result) else "Measurement distance",
                       "value": distance(cond.get("measurement_distance_m"))
                       if cond.get("measurement_distance_m") is not None else "not given"})
        sc = inp.get("scaling") or []
        inputs.append({"label": "Scaling", "value": "; ".join(
            f"{s.get('method')}: {s.get('text', '')}".strip(": ") for s in sc) if sc else "none (values as in the file)"})
        if ev and ev.get("distance_m") is None:
            inputs.append({"label": "Hazards assessed at", "value": ev.get("distance_rule")
                           or "the measurement position"})
        elif ev:
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
    assumptions = [_estimated(a, result) for a in _uniq(assumptions)
                   if not a.startswith("Screening assessment")]
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

#: The caution that goes with each hazard when that hazard sets the risk group.
_HAZARD_CAUTION = {"actinic_uv": ("invisible-hazard", "uva-eyes"),
                   "near_uv": ("uva-eyes", "invisible-hazard"),
                   "blue_light": ("blue-light",),
                   "retinal_thermal": ("thermal-eye",),
                   "retinal_thermal_weak_stimulus": ("thermal-eye",),
                   "ir_eye": ("thermal-eye",)}
#: The hazards a caution speaks for (for its shortest time limit).
_CAUTION_HAZARDS = {"invisible-hazard": ("actinic_uv", "near_uv"),
                    "uva-eyes": ("actinic_uv", "near_uv"),
                    "blue-light": ("blue_light",),
                    "thermal-eye": ("retinal_thermal", "retinal_thermal_weak_stimulus", "ir_eye")}


def _reached(h: Mapping[str, Any], t: float) -> str:
    """'is reached in 8.96 min', or 'is reached in at most 8.96 min' for a hazard measured in
    part (its value a lower bound, so its time an upper bound), as the hazard table says."""
    return ("is reached in at most " if tmax_is_upper_bound(h) else "is reached in ") + \
        format_duration(t)


def _shortest_limit(result: Result, cid: str, use: bool) -> tuple[str, float, str] | None:
    """(limit in words, time) of the caution's hazard with the shortest time limit, at the
    distance of use (use=True) or at the assessment distance."""
    sec = (result.get("use_distance") or {}) if use else result
    hz = sec.get("hazards") or {}
    best = None
    for hid in _CAUTION_HAZARDS.get(cid, ()):
        h = hz.get(hid) or {}
        t = h.get("t_max_s")
        if t is not None and (best is None or t < best[1]):
            # 'is reached in at most' where the hazard is only partly measured
            best = (LIMIT_WORDS.get(hid, "exposure limit"), float(t),
                    _reached({**((result.get("hazards") or {}).get(hid) or {}), **h}, t))
    return best


def key_caution(result: Result, cautions: list[dict[str, Any]]) -> dict[str, str]:
    """The most important caution, with the result's own numbers where they sharpen it.

    When the lamp is above the Exempt group (at the assessment distance or at the distance of
    use, whichever is worse) the caution for the hazard that sets that group comes first;
    otherwise the catalogue's order decides.
    """
    if not cautions:
        return {"title": "What this check does not cover", "text": DOES_NOT_COVER}
    by_id = {c["id"]: c for c in cautions}
    rk = risk_summary(result) or {}
    c, use = cautions[0], False
    if rk.get("group") in ("RG1", "RG2", "RG3") and rk.get("governing"):
        for cid in _HAZARD_CAUTION.get(rk["governing"], ()):
            if cid in by_id:
                c = by_id[cid]
                use = "distance of use" in (rk.get("where") or "")
                break
    text = c["text"]
    d = rk.get("governing_at") if use else place((result.get("evaluation") or {}).get("distance_m"))
    lim = _shortest_limit(result, c["id"], use)
    if c["id"] == "invisible-hazard" and lim is not None:
        where = f"{d}, the distance of use," if use else d
        text = (f"At {where} the {lim[0]} {lim[2]}, and the "
                "harm shows up only hours later. Never look at the lit lamp, keep skin out of "
                "its light, and run it only in a room with no people or animals in it.")
    elif c["id"] in _CAUTION_HAZARDS and lim is not None:
        where = f"{d}, the distance of use," if use else d
        text = f"At {where} the {lim[0]} {lim[2]}. " + text
    return {"title": c["title"], "text": text, "id": c["id"]}


def _does_not_cover(result: Result) -> str:
    if listing_only(result):
        return DOES_NOT_COVER_LISTING
    if (result.get("input") or {}).get("digitised"):
        # a curve read off a graph: said first, in the box every note carries
        return ("The spectrum is a curve read off a graph (a datasheet or a listing's picture), "
                "not a measurement of this lamp: every figure is indicative only. "
                + DOES_NOT_COVER)
    return DOES_NOT_COVER_ESTIMATE if is_estimate(result) else DOES_NOT_COVER


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
    inv = (bool(invented) if invented is not None else
           bool(product and product["invented"]) or bool((result.get("input") or {}).get("invented")))
    name = title or (product["name"] if product else None) or (
        os.path.basename(str(inp.get("path"))) if inp.get("path") else "Lamp")
    return units_in_words({
        "title": name,
        "subtitle": "Consumer-safety note",
        "invented": inv, "invented_text": INVENTED_TEXT,
        "screening_title": SCREENING_TITLE,
        "screening_text": _does_not_cover(result),
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
        "hazard_note": (NO_DISTANCE_TEXT if no_assessment_distance(result)
                        else (result.get("evaluation") or {}).get("distance_rule")),
        "germicidal": germicidal_block(result),
        "room": room_block(result),
        "plausibility": [{"id": f.get("id"), "status": f.get("status"),
                          "status_text": VERDICT_TEXT.get(f.get("status"), f.get("status")),
                          "subject": f.get("subject"), "message": f.get("message"),
                          "basis": f.get("basis")}
                         for f in (result.get("plausibility") or {}).get("findings") or []] or None,
        "not_assessed": [{"what": n["what"], "why": _estimated(n["why"], result)}
                         for n in not_assessed(result, li)],
        "estimate": is_estimate(result),
        "data_word": "estimated" if is_estimate(result) else "measured",
        "cautions": cautions,
        "does_not_cover": _does_not_cover(result),
        "provenance": provenance(result, li, date or generated_date(), references),
    })
