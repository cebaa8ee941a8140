"""Plain-text summary for the terminal, rendered from ``Assessment.to_dict()``.

No colour codes and no third-party libraries: the output reads the same in a terminal, a
log file or an e-mail. Every absolute value is shown in SI and in the trade unit.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Mapping, Sequence

from uvcheck.spectrum import below_detection, partly_measured
from uvcheck.units import bounded_duration, format_duration, sig, to_trade

STATUS_TEXT = {"complete": "measured", "partial": "partly measured (lower bound)",
               "partial-below-detection": "partly measured, below detection",
               "not-covered": "not measured", "below-detection": "below detection limit",
               "not-assessable": "not assessable"}
#: The same statuses for a nominal ESTIMATE (``uvcheck screen``): nothing there was measured.
ESTIMATE_STATUS_TEXT = {"complete": "estimated", "partial": "partly modelled (lower bound)",
                        "partial-below-detection": "partly modelled, below detection",
                        "not-covered": "not modelled", "below-detection": "below detection limit",
                        "not-assessable": "not assessable"}


def is_estimate(d: dict) -> bool:
    """The result comes from a listing's stated data (a nominal model, ``uvcheck screen``),
    not from a measurement: every renderer asks this one question."""
    return (d.get("input") or {}).get("origin") == "nominal" or d.get("nominal") is not None


def listing_only(d: Mapping[str, Any]) -> bool:
    """A listing screened with no lamp model (:class:`uvcheck.screening.ListingOnly`): only
    its claims, no figures."""
    return (d.get("input") or {}).get("origin") == "listing-only"


def status_text(status: str, d: dict, below: bool = False) -> str:
    """A band or hazard status in words; an estimate is never called 'measured'.
    below : the value is under its detection limit; a partly measured value is then no
    lower bound (its measured part lies anywhere from 0 to the limit), and is not called one."""
    if below and status == "partial":
        status = "partial-below-detection"
    return (ESTIMATE_STATUS_TEXT if is_estimate(d) else STATUS_TEXT).get(status, status)


def peak_caveat(d: Mapping[str, Any]) -> str | None:
    """Why the highest sample may not be the lamp's peak: it lies at the edge of a gap in the
    data, or at the first or last sample (the output may rise on beyond it); None otherwise.

    >>> peak_caveat({"spectral": {"peak_nm": 420.0}, "input": {"range_nm": [200, 900],
    ...              "step_nm": 1.0, "inferred": {"gaps_nm": [[399.0, 420.0]]}}})
    'the highest sample lies at the edge of a gap in the data (399–420 nm): the true peak, and the FWHM, may lie in the gap'
    """
    pk = (d.get("spectral") or {}).get("peak_nm")
    inp = d.get("input") or {}
    if pk is None or is_estimate(d):
        return None
    tol = 1.5 * (inp.get("step_nm") or 0.0) + 1e-9   # within 1.5 sample steps (our own rule)
    for a, b in (inp.get("inferred") or {}).get("gaps_nm") or ():
        if abs(pk - a) <= tol or abs(pk - b) <= tol:
            return (f"the highest sample lies at the edge of a gap in the data ({a:g}–{b:g} nm): "
                    "the true peak, and the FWHM, may lie in the gap")
    lo, hi = inp.get("range_nm") or (None, None)
    if lo is not None and (abs(pk - lo) <= tol or abs(pk - hi) <= tol):
        return (f"the highest sample is at the end of the data ({sig(pk, 4)} nm): the output may "
                "rise on beyond it, so the true peak may lie outside the measured range")
    return None


def hg_line_text(present: Any, d: Mapping[str, Any]) -> str:
    """Whether the mercury 253.7 nm line is there, in words; an estimate models it or not,
    nothing was found or missed in it."""
    if is_estimate(d):
        return "modelled" if present else "not in the model (no mercury lamp)"
    if present:
        return "present"
    if present is None:
        rng = (d.get("input") or {}).get("range_nm") or ()
        return ("not measured (the data cover " + "–".join(f"{x:g}" for x in rng) + " nm)"
                if len(rng) == 2 else "not measured")
    sh = (d.get("spectral") or {}).get("wavelength_scale_shift") or {}
    at = next((p for p, r in sh.get("matched") or [] if abs(r - 253.7) < 0.05), None)
    if at is not None:
        return (f"not found at 253.7 nm; the peak at {at:.1f} nm is that line if the "
                f"wavelength scale is off by {sh['shift_nm']:+.1f} nm (see the warnings)")
    return "not found"


def hazard_below_detection(h: Mapping[str, Any]) -> bool:
    """The hazard's value is under its detection limit (whatever its coverage)."""
    return below_detection(h)


def table(headers: Sequence[str], rows: Sequence[Sequence[Any]], right: Sequence[int] = ()) -> str:
    """A fixed-width text table; columns listed in ``right`` are right-aligned."""
    cells = [[str(h) for h in headers]] + [["" if c is None else str(c) for c in r] for r in rows]
    widths = [max(len(r[i]) for r in cells) for i in range(len(headers))]
    out = []
    for k, r in enumerate(cells):
        parts = [c.rjust(widths[i]) if i in right else c.ljust(widths[i]) for i, c in enumerate(r)]
        out.append("  " + "  ".join(parts).rstrip())
        if k == 0:
            out.append("  " + "  ".join("-" * w for w in widths))
    return "\n".join(out)


def _pct(x: float | None) -> str:
    return "—" if x is None else (f"{100 * x:.3g} %" if x < 0.999995 or x > 1 else "100 %")


def band_value_text(b: dict, key: str) -> str:
    """A band's value as shown: '< x' below detection, '≥ x' partly measured."""
    if b["status"] == "not-covered":
        return "—"
    if b["status"] == "below-detection" or b.get("below_detection"):
        dl = b["detection_limit" if key == "value" else "detection_limit_trade"]
        so_far = " so far" if b["status"] == "partial" else ""  # partial: the measured part only
        return ("< " + sig(dl) if dl is not None else "< DL") + so_far
    v = b[key]
    if v is None:
        return "(relative)"
    return ("≥ " if b["status"] == "partial" else "") + sig(v)


def render_import(inp: dict) -> list[str]:
    r = inp.get("inferred") or {}
    if not r:
        return [f"Input: {inp.get('origin', 'spectrum')} ({inp.get('quantity')})"]
    lines = [f"Import report for {r['path']}",
             f"  text: {r['encoding']} ({r['encoding_how']}); {r['delimiter']}-separated, "
             f"decimal mark '{r['decimal']}'" + (f", thousands '{r['thousands']}'" if r.get("thousands") else ""),
             f"  header line {r['header_line'] or '—'}, units line {r['units_line'] or '—'}, "
             f"data lines {r['data_lines'][0]}–{r['data_lines'][1]} "
             f"({r['rows_read']} rows read, {r['rows_used']} used)",
             f"  wavelength: column {r['wavelength_column']!r} in {r['wavelength_unit']} "
             f"({r['wavelength_unit_how']}); {r['sorted']}",
             f"  values: column {r['value_column']!r} in {r['value_unit']} ({r['value_unit_how']})"
             f" -> {r['quantity']}",
             f"  range {sig(inp['range_nm'][0], 4)}–{sig(inp['range_nm'][1], 4)} nm, median step "
             f"{sig(r['step_nm']['median'])} nm" + ("" if r["step_nm"]["uniform"] else " (non-uniform)"),
             ]
    nz = r.get("noise") or {}
    if nz.get("sigma") is not None:
        lines.append(f"  noise floor (1 σ per sample): {sig(inp.get('noise_floor'))} {inp['unit']} "
                     f"({nz['method']}, {nz['n_negative']} negative samples)")
    for k, v in (inp.get("test_record") or {}).items():
        lines.append(f"  test record: {k} = {v}")
    rep = inp.get("repeats")
    if rep:
        lines.append(f"  repeat scans: the mean of {rep['n']} ("
                     + ", ".join(Path(f).name for f in rep["files"]) + ")"
                     + (f"; totals differ by {rep['spread']:.1%}" if rep.get("spread") is not None
                        else ""))
    if inp.get("digitised"):
        lines.append("  DIGITISED: a curve read off a graph (--digitised), not a measurement of "
                     "the lamp; every figure below is indicative only")
    dark = inp.get("dark")
    if dark:
        from uvcheck.background import level_text

        lines.append(f"  dark scan subtracted: {Path(dark['file']).name}, median level "
                     f"{level_text(dark['level'], dark.get('unit') or 'relative')}")
    if r.get("measurement_distance_m"):
        lines.append(f"  measurement distance in the file: {sig(r['measurement_distance_m'])} m")
    return lines


def render_listing_only(d: dict) -> str:
    """The terminal summary of a listing that states too little to model the lamp
    (:class:`uvcheck.screening.ListingOnly`): no figures, only its claims."""
    inp = d.get("input") or {}
    out: list[str] = [f"uvcheck {d['tool']['version']}: listing screening (no lamp model)", "",
                      f"Input: listing {inp.get('path')}"
                      + (" (INVENTED example)" if inp.get("invented") else "")]
    out.append("")
    out.append("Warnings")
    out += [f"  ! {w}" for w in d.get("warnings", [])]
    out.append("")
    out += render_claims(d.get("claims") or [], d)
    from uvcheck.report.cautions import LOCAL_CODES, applicable

    cautions = applicable(d)
    if cautions:
        # no figures to show, so the cautions that a lamp sold like this calls for
        out.append("")
        out.append("Cautions (for a lamp sold like this; none of them rests on a measurement)")
        for c in cautions:
            item = wrap(f"{c['title']}: {c['text']}", 4)
            out += ["  - " + item[0][4:]] + item[1:]
        out += wrap(LOCAL_CODES, 2)
    out.append("")
    out += [f"Note: {n}" for n in d.get("notes", [])]
    return "\n".join(out) + "\n"


def render_assessment(d: dict) -> str:
    """The whole terminal summary of an assessment dict."""
    if listing_only(d):
        return render_listing_only(d)
    out: list[str] = [f"uvcheck {d['tool']['version']}: lamp assessment", ""]
    out += render_import(d["input"])
    for s in d["input"].get("scaling", []):
        out.append(f"  scaling: {s.get('method')}"
                   + (f" ({s['text']})" if s.get("text") else ""))
    out.append(f"  {d['position']}")
    warn = list(dict.fromkeys(list(d["input"].get("warnings", [])) + list(d.get("warnings", []))))
    if warn:
        out.append("")
        out.append("Warnings")
        out += [f"  ! {w}" for w in warn]
    if d.get("claims"):
        out.append("")
        out += render_claims(d["claims"], d)
    if d.get("nominal"):
        out.append("")
        out += render_nominal(d["nominal"], d)
    out.append("")
    out.append("Emission by band")
    bands = d["bands"]
    any_b = next(iter(bands.values()))
    unit = any_b["unit"]
    trade = any_b["trade_unit"]
    rows = []
    for name, b in bands.items():
        rows.append([name, f"{b['range_nm'][0]:g}–{b['range_nm'][1]:g}", band_value_text(b, "value"),
                     band_value_text(b, "value_trade"), _pct(b["fraction"]), _pct(b["coverage"]),
                     status_text(b["status"], d, bool(b.get("below_detection")))])
    out.append(table(["band", "nm", unit, trade, "share", "coverage", "status"], rows,
                     right=(2, 3, 4, 5)))
    out.append(f"  ({d['band_convention']})")
    sp = d["spectral"]
    out.append("")
    pk = f"Peak {sig(sp['peak_nm'], 4)} nm" if sp["peak_nm"] is not None else "No peak"
    out.append(f"{pk}; centroid {sig(sp['centroid_nm'], 4)} nm; FWHM {sig(sp['fwhm_nm'])} nm")
    caveat = peak_caveat(d)
    if caveat:
        out += wrap(f"({caveat})", 2)
    if sp["lines"]:
        names = [f"{sig(ln['wavelength_nm'], 4)} nm" + (f" ({ln['identified_as']})" if ln["identified_as"] else "")
                 for ln in sp["lines"][:8]]
        out.append(("Emission lines modelled: " if is_estimate(d) else "Emission peaks found: ")
                   + ", ".join(names))
    out.append("Mercury 253.7 nm line: " + hg_line_text(sp["hg_253_7_present"], d))
    ph = d["photometry"]
    if ph["value"] is not None:
        out.append(f"{ph['quantity'].replace('_', ' ').capitalize()}: {sig(ph['value'])} {ph['unit']}"
                   + ("" if ph["coverage"] >= 0.99 else f" (V(λ) {ph['coverage']:.0%} covered: lower bound)"))
    elif ph.get("status") in ("below-detection", "not-meaningful") and ph.get("value_note"):
        out.append(f"{ph['quantity'].replace('_', ' ').capitalize()}: not given ({ph['value_note']})")
    if ph["x"] is not None:
        out.append(f"Chromaticity x = {ph['x']:.4f}, y = {ph['y']:.4f}"
                   + (f"; CCT {ph['cct_K']:.0f} K, Duv {(round(ph['duv'], 4) or 0.0):+.4f}" if ph["cct_K"] else
                      f"; no CCT: {ph['cct_note']}"))
    for key, renderer in SECTION_RENDERERS.items():
        if d.get(key) is not None:
            out.append("")
            out += renderer(d[key], d)
    out.append("")
    out += [f"Note: {n}" for n in d.get("notes", [])]
    return "\n".join(out) + "\n"


GROUP_TEXT = {"Exempt": "Exempt", "RG1": "RG1", "RG2": "RG2", "RG3": "RG3"}


SHORT_HAZARD = {"actinic_uv": "actinic UV, skin & eye", "near_uv": "near UV, eye",
                "blue_light": "blue light, retina", "retinal_thermal": "retinal thermal",
                "retinal_thermal_weak_stimulus": "retinal thermal, weak stimulus",
                "ir_eye": "infrared, eye", "skin_thermal": "thermal, skin"}


def group_text(group: str | None, lower: bool, bound: str | None = None) -> str:
    """'RG2', 'at least RG1', 'at most RG1', or 'at least Exempt*' (* not assessable as Exempt)."""
    if group is None:
        return "—"
    if lower:
        return "at least Exempt*" if group == "Exempt" else f"at least {group}"
    if bound == "at-most":
        return f"at most {group}"
    return group


def hazard_value_text(h: dict) -> str:
    """A hazard's value as shown: '< x' below detection, '≥ x' partly measured."""
    if h["value"] is None:
        return "—"
    dl = h.get("detection_limit")
    if h["status"] == "below-detection":
        return "< " + sig(h["value"])
    if h["status"] == "partial":
        if hazard_below_detection(h):
            return "< " + sig(dl) + " so far"
        return "≥ " + sig(h["value"])
    return sig(h["value"])


def _rule_lines(rg: dict) -> list[str]:
    """Under the headline group: what the other decision rule gives, and the borderline flag
    with the group probabilities (from the ``risk_group`` entry; uncertainty.merge_into)."""
    if not rg.get("decision_rule"):
        return []
    low = rg.get("is_lower_bound", False)
    simple, guarded = rg.get("group_simple"), rg.get("group_guarded")
    parts = []
    if rg["decision_rule"] == "guarded" and simple and simple != rg.get("group"):
        parts.append(f"the measured values alone (simple acceptance) give {group_text(simple, low)}")
    elif rg["decision_rule"] == "simple" and guarded and guarded != rg.get("group"):
        parts.append(f"guarded acceptance (--decision-rule guarded) would give {group_text(guarded, low)}")
    p = rg.get("group_probability") or {}
    if rg.get("borderline"):
        probs = ", ".join(f"{g} {100 * v:.0f} %" for g, v in p.items() if v >= 0.005)
        parts.append("BORDERLINE: the 95 % interval spans a group boundary; group probabilities"
                     + (" (of at least each group)" if rg.get("group_probability_is_at_least") else "")
                     + f": {probs}")
    return [f"  {x}" for x in parts]


#: What the headline says when no measurement distance was given (our own wording): the
#: values, and so the group, hold at the measurement position, wherever that was.
NO_DISTANCE_TEXT = ("this is the group at the measurement position, wherever that was: no "
                    "measurement distance was given, so the IEC 62471 assessment distance could "
                    "not be applied and this is not the lamp's IEC 62471 classification; give "
                    "the measurement distance with --distance")

#: How a hazard distance reads, by its ``bound`` (hazard_distances.<id>.bound): sign before
#: each distance, suffix for 'at every distance', and why.
_DISTANCE_BOUND = {"at-least": ("at least ", " so far", "partly measured: lower bounds, the "
                                "true distances can only be larger"),
                   "at-most": ("at most ", "", "from the detection limit: upper bounds, the true "
                               "distances can only be smaller")}


def no_assessment_distance(d: Mapping[str, Any]) -> bool:
    """The hazards were evaluated where the spectrum was measured, at an unknown distance,
    not at the IEC 62471 assessment distance (``evaluation.distance_m`` is None)."""
    ev = d.get("evaluation") or {}
    return bool(ev) and ev.get("distance_m") is None and bool(d.get("hazards"))


def tmax_is_upper_bound(h: Mapping[str, Any]) -> bool:
    """The hazard value is a lower bound (part of its range not measured), so its t_max is an
    upper bound: the true time can only be shorter."""
    return h.get("status") == "partial" or bool(h.get("risk_group_is_lower_bound"))


def tmax_text(hid: str, h: Mapping[str, Any]) -> str:
    """The t_max cell: '2.93 h', '> 8 h', 'unlimited', '—'; for a partly measured hazard
    '≤ 2.93 h', '> 8 h so far', 'unlimited so far' (the measured part alone gives it)."""
    if h.get("t_max_s") is not None:
        return bounded_duration(h["t_max_s"], "at_most" if tmax_is_upper_bound(h) else None)
    if h.get("status") in ("not-assessable", "not-applicable") or h.get("value") is None:
        return "—"
    tmax = "> 8 h" if hid == "actinic_uv" else "unlimited"
    return tmax + (" so far" if tmax_is_upper_bound(h) else "")


def render_hazards(hazards: dict, d: dict) -> list[str]:
    ev = d.get("evaluation") or {}
    rg = d.get("risk_group") or {}
    out = [f"Photobiological hazards (IEC 62471 / CIE S 009; limit set {ev.get('limit_set', '?')})"]
    dist = ev.get("distance_m")
    if no_assessment_distance(d):
        out.append("  evaluated at the measurement position (no measurement distance given), "
                   "not at the IEC 62471 assessment distance")
    else:
        out.append(f"  evaluated at {sig(dist) + ' m' if dist else 'the measurement position'}"
                   f"{': ' + ev['distance_rule'] if ev.get('distance_rule') else ''}")
    rows = []
    for hid, h in hazards.items():
        tmax = tmax_text(hid, h)
        rows.append([f"{h['symbol']} {SHORT_HAZARD.get(hid, hid)}", hazard_value_text(h), h["unit"],
                     sig(h["limit"]) if h["limit"] is not None else "—", tmax,
                     group_text(h["risk_group"], h["risk_group_is_lower_bound"], h.get("risk_group_bound")),
                     _pct(h["coverage"]) if h["coverage"] is not None else "—",
                     status_text(h["status"], d, hazard_below_detection(h))])
    out.append(table(["hazard", "value", "unit", "Exempt limit", "t_max", "group", "coverage",
                      "status"], rows, right=(1, 3, 4, 6)))
    if any(h["risk_group_is_lower_bound"] and h["risk_group"] == "Exempt" for h in hazards.values()):
        out.append("  * partly measured: below the Exempt limit so far, but cannot be called Exempt")
    if any(tmax_is_upper_bound(h) and h["status"] not in ("not-assessable", "not-applicable")
           and h["value"] is not None for h in hazards.values()):
        out.append("  t_max '≤' or 'so far': partly measured, from the measured part alone; the "
                   "unmeasured part can only shorten it")
    for hid, h in hazards.items():
        if h.get("reason"):
            out.append(f"  - {h['symbol']}: {h['reason']}")
    out.append("")
    at_position = no_assessment_distance(d) and rg.get("group") is not None
    out.append("Overall risk group" + (" at the measurement position" if at_position else "")
               + f": {group_text(rg.get('group'), rg.get('is_lower_bound', False))}"
               + (f", set by {(hazards.get(rg['governing']) or {}).get('symbol') or rg['governing']}"
                  if rg.get("governing") else "")
               + (f" (decision rule: {rg['decision_rule']} acceptance)" if rg.get("decision_rule") else ""))
    if at_position:
        out += wrap(f"({NO_DISTANCE_TEXT})", 2)
    out += _rule_lines(rg)
    if rg.get("note") and rg.get("is_lower_bound"):
        out.append(f"  ({rg['note']})")
    hd = d.get("hazard_distances") or {}
    lines = []
    for key in ("actinic_uv", "near_uv", "blue_light"):
        x = hd.get(key)
        if x and x.get("distance_m") is not None:
            b = x.get("boundaries_m") or {}
            bn = x.get("boundary_notes") or {}
            every = [g for g in ("Exempt", "RG1", "RG2")
                     if not b.get(g) and (bn.get(g) or "").startswith(f"{g} or lower at every")]
            # a distance from a lower-bound value (partly measured) is itself a lower bound:
            # the true one can only be larger; one from a detection limit is an upper bound
            sign, so_far, why = _DISTANCE_BOUND.get(x.get("bound") or "", ("", "", ""))
            bl = ", ".join(f"{g} beyond {sign}{sig(b[g])} m" if b.get(g)
                           else f"{g} or lower at every distance{so_far}"
                           for g in ("RG2", "RG1", "Exempt")
                           if b.get(g) or (every and g == every[0]))
            reach = f"out to {sign}" if sign else "closer than "
            lines.append(f"  {x['symbol']}: {format_duration(hd.get('exposure_time_s'))} limit reached "
                         f"{reach}{sig(x['distance_m'])} m" + (f"; {bl}" if bl else "")
                         + (f" ({why})" if why else ""))
            if x.get("regimes") and x.get("meaning"):   # L_B: what its distances mean
                lines += wrap(f"({x['meaning']}.)", 4)
        elif x and (x.get("note") or "").startswith("not determinable"):
            lines += wrap(f"{x['symbol']}: {x['note']}", 2)
    if lines:
        radiance = any((hd.get(k) or {}).get("regimes") for k in ("blue_light",))
        model = (d.get("evaluation") or {}).get("distance_model") or "point"
        approx = ("point-source inverse-square approximation" if model == "point"
                  else f"{model} emitter model given, an approximation")
        out.append(f"Hazard distances ({approx}"
                   + ("; L_B by the field of view, see below it" if radiance else "") + "):")
        out += lines
    use = d.get("use_distance")
    if use:
        urg = use.get("risk_group") or {}
        ud = (use.get("evaluation") or {}).get("distance_m")
        out.append(f"At the distance of use ({sig(ud)} m): risk group "
                   f"{group_text(urg.get('group'), urg.get('is_lower_bound', False))}")
        for hid in ("actinic_uv", "near_uv", "blue_light"):
            h = (use.get("hazards") or {}).get(hid)
            if h and h.get("value") is not None:
                base = hazards.get(hid) or {}
                h = {**base, **{k: v for k, v in h.items() if v is not None}}
                upper = tmax_is_upper_bound(h)
                if h.get("t_max_s") is not None:
                    t = bounded_duration(h["t_max_s"], "at_most" if upper else None)
                else:
                    t = "no time limit within the limit's range" + (" so far" if upper else "")
                t += " (measured part only)" if upper else ""
                out.append(f"  {h['symbol']} {hazard_value_text(h)} {h['unit']}; t_max {t}")
    return out


def _trade(block: dict) -> str:
    if block.get("value") is not None:
        pre = "≥ " if block.get("is_lower_bound") else ""
        return (f"{pre}{sig(block['value'])} {block['unit']} "
                f"({pre}{sig(block['value_trade'])} {block['trade_unit']})")
    if block.get("status") == "below-detection" and block.get("detection_limit") is not None:
        # the detection limit, as in the band table (the upper bound is a different number);
        # a band only partly measured is below it in the measured part only, as the band
        # table's "so far" says: the part not measured could hold anything
        dl = block["detection_limit"]
        so_far, why = ((" so far", "partly measured, nothing above the detection limit in the "
                        "measured part") if partly_measured(block)
                       else ("", "below detection limit"))
        return (f"< {sig(dl)} {block['unit']}{so_far} (< {sig(to_trade(dl, block['unit'])[0])} "
                f"{block['trade_unit']}; {why})")
    if block.get("upper_bound") is not None:
        part = ("so far ", "; partly measured") if partly_measured(block) else ("", "")
        return (f"< {sig(block['upper_bound'])} {block['unit']} {part[0]}"
                f"(< {sig(block['upper_bound_trade'])} {block['trade_unit']}{part[1]})")
    return "not measured" if block.get("status") == "not-covered" else "—"


#: How a 254-nm equivalent reads, by the status of the reading behind it: a lower bound (part
#: of the band not measured) or an upper bound (nothing established: the favourable reading
#: the claims are given); a complete reading is a value.
_EQUIVALENT_BOUND = {"partial": ("≥ ", "lower bound", "part of UV-C was not measured"),
                     "below-detection": ("< ", "upper bound", "UV-C below the detection limit"),
                     "likely-stray-light": ("≤ ", "upper bound",
                                            "the apparent UV-C is likely stray light or noise")}


def _equivalent_span(eq: Mapping[str, Any], unit: str = "W m-2") -> str:
    """'0.0412–0.0484 W m-2', or with the bound each end is ('≤ 2.33e-06–2.45e-06 W m-2
    (≤ upper bound: …)'): an upper bound used as the favourable reading is never shown as a
    value, and one of a band measured in part says so."""
    ends = [(sig(eq[f"{k}_favourable"]), eq.get(f"{k}_favourable_reads"),
             eq.get(f"{k}_favourable_coverage")) for k in ("least", "most")]
    why = []
    for _, reads, _ in ends:
        if reads in _EQUIVALENT_BOUND:
            sign, kind, reason = _EQUIVALENT_BOUND[reads]
            if f"{sign}{kind}: {reason}" not in why:
                why.append(f"{sign}{kind}: {reason}")
    if any(_EQUIVALENT_BOUND.get(reads, ("", ""))[1] == "upper bound"
           and partly_measured({"coverage": cov}) for _, reads, cov in ends):
        why.append("part of UV-C was not measured, and the upper bound holds for the measured "
                   "part only")
    (lo, lo_r, _), (hi, hi_r, _) = ends
    if lo_r == hi_r:
        span = f"{lo}–{hi}" if lo != hi else lo
        sign = _EQUIVALENT_BOUND[lo_r][0] if lo_r in _EQUIVALENT_BOUND else ""
        body = f"{sign}{span} {unit}"
    else:
        signs = [_EQUIVALENT_BOUND[r][0] if r in _EQUIVALENT_BOUND else "" for r in (lo_r, hi_r)]
        body = f"{signs[0]}{lo} to {signs[1]}{hi} {unit}"
    return body + (f" ({'; '.join(why)})" if why else "")


#: The efficiency verdict in words (germicidal.efficiency.verdict); our own wording.
_EFFICIENCY_VERDICT = {"within": "within the usual range for this lamp technology",
                       "below-range": "below the usual range for this lamp technology",
                       "above-range": "above the usual range for this lamp technology",
                       "implausible": "implausibly high for this lamp technology"}


def efficiency_text(g: Mapping[str, Any]) -> str | None:
    """'3.18e-05 W/W (within …; the flux is an estimate …)', or with '≤' where the UV-C reading
    behind it is only an upper bound (``efficiency.status`` 'upper-bound'); None when no
    efficiency was computed. No verdict is given for an upper bound (the JSON has none)."""
    eff = g.get("efficiency") or {}
    if eff.get("efficiency") is None:
        return None
    upper = eff.get("status") == "upper-bound"
    bits = []
    if upper:
        reads = (g.get("uvc") or {}).get("status")
        reason = _EQUIVALENT_BOUND.get(reads, ("", "", "no UV-C output is established"))[2]
        bits.append(f"upper bound: {reason}")
    if eff.get("verdict"):
        bits.append(_EFFICIENCY_VERDICT.get(eff["verdict"], str(eff["verdict"])))
    if eff.get("note"):
        bits.append(eff["note"])
    return (f"{'≤ ' if upper else ''}{eff['efficiency']:.3g} W/W"
            + (f" ({'; '.join(bits)})" if bits else ""))


def render_germicidal(g: dict, d: dict) -> list[str]:
    out = ["Germicidal output" + (f" at {sig(g['position']['distance_m'])} m"
                                  if (g.get("position") or {}).get("distance_m") else
                                  " at the measurement position")]
    out.append(f"  {g['statement']}")
    out.append(f"  UV-C 200–280 nm: {_trade(g['uvc'])}; far-UVC 200–235 nm: {_trade(g['far_uvc'])}")
    eq = (g.get("effective") or {}).get("equivalent_254") or {}
    if eq.get("most_favourable") is not None:
        fav = eq["most_favourable_id"]
        name = ((g["effective"].get("by_action_spectrum") or {}).get(fav) or {}).get("name")
        out.append(f"  254-nm-equivalent: {_equivalent_span(eq, g.get('unit') or 'W m-2')} "
                   f"across action spectra (claims use the most favourable: {name or fav})")
    vb = (g.get("effective") or {}).get("violet_blue_405")
    if vb and vb.get("value") is not None:
        out.append(f"  violet-blue (≈405 nm) effective: {_trade(vb)}")
    oz = g.get("ozone") or {}
    if oz:
        out.append(f"  ozone (output below 240 nm): {oz.get('status')} — {oz.get('note') or oz.get('basis') or ''}")
    for a in g.get("artefacts") or []:
        out.append(f"  ! {a['kind']}: {a['detail']}")
    line = efficiency_text(g)
    if line:
        out += wrap(f"UV-C efficiency: {line}", 2)
    out += render_inactivation(g.get("inactivation") or [])
    return out


#: Media in the order a practitioner asks about them; reviews and legacy charts last.
_MEDIA_ORDER = (("air", "air"), ("surface", "surface"), ("water", "water"),
                ("mixed", "mixed media (review)"), ("unspecified", "medium unspecified (legacy)"))
#: Rows shown per medium in the terminal; the JSON holds them all.
ROWS_PER_MEDIUM = 4


def _time_cell(e: dict, key: str, percent: str) -> str:
    t = e.get(key)
    if t is not None:
        return bounded_duration(t, e.get("times_are"))
    why = (e.get("time_missing_reason") or {}).get(percent) or ""
    if why.startswith("not reached") and e.get("max_log_reduction") is not None:
        return f"not reached (data ≤ {e['max_log_reduction']:g} log)"
    if why.startswith("never"):
        return "never (resistant fraction)"
    if why.startswith("no irradiance"):
        return "no irradiance"
    return "—"


def _id_tail(e: dict, twins: list) -> str:
    """The part of a row id that tells it from rows with the same organism and medium."""
    import os

    ids = [e["organism_id"]] + [x["organism_id"] for x in twins]
    head = os.path.commonprefix(ids)
    return (e["organism_id"][len(head):] or e["organism_id"]).strip("_")


def render_inactivation(rows: list) -> list[str]:
    """The inactivation table grouped by medium: per medium the most susceptible rows and the
    most resistant one (phages, laboratory surrogates, only where nothing else is listed), the
    substrate that tells duplicate rows apart, the source key, and why a time is missing."""
    if not rows:
        return []

    def speed(e: dict) -> float:
        t = e.get("time_to_99_9_s")
        if t is None and e.get("time_to_90_s") is not None:
            t = 3.0 * e["time_to_90_s"]             # 3 log at the 1-log rate: ordering only
        return float("inf") if t is None else t
    body: list[list[str]] = []
    shown = 0
    for medium, label in _MEDIA_ORDER:
        group = [e for e in rows if e.get("medium") == medium]
        if not group:
            continue
        real = [e for e in group if e.get("group") != "phage"] or group
        real.sort(key=speed)
        pick = real if len(real) <= ROWS_PER_MEDIUM else real[:ROWS_PER_MEDIUM - 1] + [real[-1]]
        for i, e in enumerate(pick):
            where = e["medium"] + (f", {e['substrate']}" if e.get("substrate") else "")
            twins = [x for x in pick if x is not e and x["organism"] == e["organism"]
                     and x.get("substrate") == e.get("substrate")
                     and x["wavelength_nm"] == e["wavelength_nm"]]
            if twins:   # same organism, medium and substrate: name what differs (the row id)
                where += f" ({_id_tail(e, twins)})"
            mem = "" if str(e.get("from_memory") or "no").lower() == "no" else " *"
            body.append([e["organism"] + (" (hardest listed)" if len(real) > ROWS_PER_MEDIUM
                                          and i == len(pick) - 1 else ""),
                         where, f"{e['wavelength_nm']:g}" + (" †" if _moved(e) else ""),
                         _time_cell(e, "time_to_90_s", "90"),
                         _time_cell(e, "time_to_99_9_s", "99.9"),
                         (e.get("source_key") or "") + mem])
        shown += len(pick)
        if len(group) > len(pick):
            body.append([f"  … {len(group) - len(pick)} more {label} rows", "", "", "", "", ""])
    out = ["  Time to inactivate at this position, by medium, most susceptible first (reciprocity "
           "assumed; no shadowing or soiling):"]
    out.append(table(["organism", "medium, substrate", "data nm", "90 %", "99.9 %", "source"],
                     body, right=(2, 3, 4)))
    out.append(f"  {shown} of {len(rows)} rows shown; all {len(rows)}, with doses, ranges across "
               "studies and notes, are in the JSON (germicidal.inactivation). 'not reached': the "
               "study's data stop below that reduction and are not extrapolated; mixed and "
               "unspecified rows (reviews, legacy charts) count for every medium; * partly from "
               "memory; sources: uvcheck organisms.")
    if any(_moved(e) for e in rows):
        from uvcheck.germicidal import CROSS_WAVELENGTH_NM, TRANSFERRED

        out[-1] += (" † data measured more than "
                    f"{CROSS_WAVELENGTH_NM:g} nm from the lamp's UV-C peak: {TRANSFERRED}, which "
                    "adds uncertainty beyond the data's own.")
    return out


def _moved(e: dict) -> bool:
    """Whether an organism row's dose was carried over from another wavelength."""
    from uvcheck.germicidal import TRANSFERRED

    return TRANSFERRED in (e.get("irradiance_basis") or "")


VERDICT_TEXT = {"holds": "HOLDS", "cannot-hold": "CANNOT HOLD", "unlikely": "UNLIKELY",
                "not-assessable": "NOT ASSESSABLE"}


def wrap(text: str, indent: int, width: int = 100) -> list[str]:
    import textwrap

    return textwrap.wrap(text, width=width, initial_indent=" " * indent,
                         subsequent_indent=" " * indent) or [" " * indent]


def render_claims(claims: list, d: dict) -> list[str]:
    lst = d.get("listing") or {}
    origin = (d.get("input") or {}).get("origin")
    on = {"measured": "the measured spectrum",
          "listing-only": "the listing alone: no lamp data"}.get(origin,
                                                                 "a nominal ESTIMATE from the listing")
    out = [f"Claims of \"{lst.get('name', 'the product')}\" (judged on {on})"]
    for c in claims:
        label = VERDICT_TEXT.get(c["verdict"], c["verdict"])
        text = c.get("text") or c["kind"]
        out.append(f"  [{label}] \"{text}\" ({c['kind']})")
        out += wrap(c["basis"], 6)
        if c.get("assumptions"):
            # the choices made on the listing's behalf (a distance, an organism, a medium)
            out += wrap("assumed: " + "; ".join(c["assumptions"]), 6)
        if c.get("missing"):
            out += wrap("missing: " + "; ".join(c["missing"]), 6)
    summ = (d.get("claims_summary") or {})
    if summ.get("decision_rule"):
        out += wrap("Decision rule: " + summ["decision_rule"], 2)
    other = other_findings(claims, d.get("plausibility") or {})
    if other:
        out.append("  Other findings from the listing's stated data:")
        for f in other:
            out += wrap(f"- [{VERDICT_TEXT.get(f['status'], f['status'])}] {f['message']}", 4)
    return out


def _three(values: Sequence[Any], fmt: Any) -> str:
    """'min / typical / max' in one cell."""
    return " / ".join("—" if v is None else fmt(v) for v in values)


def _compact(v: float) -> str:
    """A number in few characters (2 significant digits; no trailing zeros)."""
    a = abs(v)
    if a == 0:
        return "0"
    if a >= 100:
        return f"{v:.0f}"
    if a >= 1e-3:
        return f"{v:.2g}"
    return f"{v:.1e}"


def _rg_short(group: str | None, lower: bool) -> str:
    if group is None:
        return "—"
    return (f"≥{group}" + ("*" if group == "Exempt" else "")) if lower else group


def render_nominal(n: dict, d: dict) -> list[str]:
    """The nominal estimate's min / typical / max cases, one row per way of reading the listing
    (``nominal.estimates`` and ``nominal.readings`` of the JSON)."""
    from uvcheck.nominal import CASES

    rows_by = {r["label"]: r for r in n.get("readings") or []}
    dist = next((r.get("distance_m") for r in rows_by.values() if r.get("distance_m")), None)
    at = f" at {dist:g} m" if dist else ""
    out = [f"Nominal estimate{at}, cases min / typical / max (an ESTIMATE from the listing's "
           "stated data, not a measurement)"]
    rows, notes = [], []
    for e in n.get("estimates") or []:
        name = e["reading"]
        cases = [rows_by.get(f"{name}/{c}") for c in CASES]
        if not any(cases):
            cases = [rows_by.get(f"{name}/shape")] * 3
        first = next((c for c in cases if c), {}) or {}
        lamp = e.get("technology") or "?"
        if e.get("peak_nm"):
            lamp += f" {e['peak_nm']:g} nm"
        if e.get("cover"):
            lamp += f", {e['cover']} cover"
        pw = e.get("power") or {}
        power = (_three([pw.get("min_W"), pw.get("typical_W"), pw.get("max_W")], _compact)
                 if pw.get("typical_W") is not None else "not stated")

        def col(key: str, scale: float = 1.0) -> str:
            return _three([None if not c or c.get(key) is None else c[key] * scale
                           for c in cases], _compact)

        tes = _three([None if not c or not c.get("t_max_s") else
                      ((c["t_max_s"] or {}).get("actinic_uv") or "> 8 h") for c in cases],
                     lambda v: v if isinstance(v, str) else format_duration(v))
        rg = " / ".join(_rg_short(c.get("risk_group"), c.get("risk_group_is_lower_bound", False))
                        if c else "—" for c in cases)
        rows.append([name, lamp, power, col("uvc_W_m2", 100.0), col("uva_W_m2", 100.0), tes, rg])
        if first.get("refuted_by"):
            notes.append(f"'{name}' is refuted by the listing's own data "
                         f"({', '.join(first['refuted_by'])}): not used as the favourable reading")
    out.append(table(["reading", "lamp model", "optical W", "UV-C µW/cm²", "UV-A µW/cm²",
                      "E_S t_max", "risk group"], rows))
    likely = n.get("most_likely_reading")
    hd = next((r.get("hazard_distance_m") for r in rows_by.values() if r.get("hazard_distance_m")),
              None)
    where = (f"UV-C and UV-A at {dist:g} m; E_S t_max and risk group at {hd:g} m, where IEC 62471 "
             "evaluates them. " if dist and hd and abs(hd - dist) > 1e-9 else "")
    out += wrap(f"Efficacy claims use the max case of a reading the listing does not refute; "
                f"the tables below use the most likely case, '{likely}'; safety claims hold "
                f"only when every case stays within the limits. "
                f"{where}Optical W is the emitted power before the cover; the irradiances are "
                "after it." + (" * not assessable as Exempt (part of a hazard could not be "
                               "evaluated)." if any("≥Exempt*" in r[-1] for r in rows) else ""), 2)
    for t in notes:
        out += wrap(t, 2)
    return out


def _finding_key(f: dict) -> tuple:
    """What a finding says, as numbers: two findings with the same key say the same thing."""
    def val(a: Any) -> Any:
        return None if not a else a.get("value")
    return (f.get("status"), val(f.get("needed")), val(f.get("available")), f.get("ratio"))


def other_findings(claims: list, pl: dict) -> list[dict]:
    """Plausibility findings (unlikely / cannot-hold) that no claim verdict already states,
    each once: a finding a verdict was built on, or one with the same numbers as such a finding
    or as another finding shown, is left out."""
    findings = pl.get("findings", []) or []
    used = {(c.get("details") or {}).get("finding") for c in claims}
    seen = {_finding_key(f) for f in findings if f["id"] in used}
    out = []
    for f in findings:
        if f["status"] not in ("cannot-hold", "unlikely") or f["id"] in used:
            continue
        key = _finding_key(f)
        if key in seen or any(f["message"] == g["message"] for g in out):
            continue
        seen.add(key)
        out.append(f)
    return out


#: Renderers for later sections (room …), keyed by JSON section name; claims come first.
def render_uncertainty(u: dict, d: dict) -> list[str]:
    from uvcheck.uncertainty import render_uncertainty_lines

    lines = render_uncertainty_lines(u, d)
    ov = (u.get("overall") or {}) if u.get("status") == "evaluated" else {}
    rg = d.get("risk_group") or {}
    if ov and (ov.get("is_lower_bound") or rg.get("is_lower_bound")):
        # the overall group is a lower bound: its line carries the headline's 'at least' (the
        # probabilities are then of at least each group)
        lines = [overall_uncertainty_line(ov) if ln.startswith("  overall group ") else ln
                 for ln in lines]
    return lines


def overall_uncertainty_line(ov: Mapping[str, Any]) -> str:
    """The uncertainty block's overall line for a lower-bound group: 'overall group at least
    Exempt*: probability of at least each group: Exempt 100%; by the decision rule: at least
    Exempt*'."""
    p = ov.get("risk_group_probability") or {}
    probs = ", ".join(f"{g} {100 * v:.0f}%" for g, v in p.items() if v >= 0.005) or "—"
    return (f"  overall group {group_text(ov.get('risk_group'), True)}: "
            f"probability of at least each group: {probs}"
            + ("; borderline" if ov.get("borderline") else "")
            + (f"; by the decision rule: {group_text(ov['risk_group_by_rule'], True)}"
               if ov.get("risk_group_by_rule") else ""))


SECTION_RENDERERS: dict[str, Any] = {"hazards": render_hazards, "germicidal": render_germicidal,
                                     "uncertainty": render_uncertainty}


def duration(seconds: float | None) -> str:
    return format_duration(seconds)
