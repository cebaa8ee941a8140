"""Plain-text summary for the terminal, rendered from ``Assessment.to_dict()``.

No colour codes and no third-party libraries: the output reads the same in a terminal, a
log file or an e-mail. Every absolute value is shown in SI and in the trade unit.
"""

from __future__ import annotations

from typing import Any, Sequence

from uvcheck.units import format_duration, sig

STATUS_TEXT = {"complete": "measured", "partial": "partly measured (lower bound)",
               "not-covered": "not measured", "below-detection": "below detection limit",
               "not-assessable": "not assessable"}


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


def _band_value(b: dict, key: str) -> str:
    if b["status"] == "not-covered":
        return "—"
    if b["status"] == "below-detection":
        dl = b["detection_limit" if key == "value" else "detection_limit_trade"]
        return "< " + sig(dl) if dl is not None else "< DL"
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
    if r.get("measurement_distance_m"):
        lines.append(f"  measurement distance in the file: {sig(r['measurement_distance_m'])} m")
    return lines


def render_assessment(d: dict) -> str:
    """The whole terminal summary of an assessment dict."""
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
    out.append("")
    out.append("Emission by band")
    bands = d["bands"]
    any_b = next(iter(bands.values()))
    unit = any_b["unit"]
    trade = any_b["trade_unit"]
    rows = []
    for name, b in bands.items():
        rows.append([name, f"{b['range_nm'][0]:g}–{b['range_nm'][1]:g}", _band_value(b, "value"),
                     _band_value(b, "value_trade"), _pct(b["fraction"]), _pct(b["coverage"]),
                     STATUS_TEXT.get(b["status"], b["status"])])
    out.append(table(["band", "nm", unit, trade, "share", "coverage", "status"], rows,
                     right=(2, 3, 4, 5)))
    out.append(f"  ({d['band_convention']})")
    sp = d["spectral"]
    out.append("")
    pk = f"Peak {sig(sp['peak_nm'], 4)} nm" if sp["peak_nm"] is not None else "No peak"
    out.append(f"{pk}; centroid {sig(sp['centroid_nm'], 4)} nm; FWHM {sig(sp['fwhm_nm'])} nm")
    if sp["lines"]:
        names = [f"{sig(ln['wavelength_nm'], 4)} nm" + (f" ({ln['identified_as']})" if ln["identified_as"] else "")
                 for ln in sp["lines"][:8]]
        out.append("Emission peaks found: " + ", ".join(names))
    out.append("Mercury 253.7 nm line: " + ("present" if sp["hg_253_7_present"] else "not found"))
    ph = d["photometry"]
    if ph["value"] is not None:
        out.append(f"{ph['quantity'].replace('_', ' ').capitalize()}: {sig(ph['value'])} {ph['unit']}"
                   + ("" if ph["coverage"] >= 0.99 else f" (V(λ) {ph['coverage']:.0%} covered: lower bound)"))
    if ph["x"] is not None:
        out.append(f"Chromaticity x = {ph['x']:.4f}, y = {ph['y']:.4f}"
                   + (f"; CCT {ph['cct_K']:.0f} K, Duv {ph['duv']:+.4f}" if ph["cct_K"] else
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


def _hazard_value(h: dict) -> str:
    if h["value"] is None:
        return "—"
    dl = h.get("detection_limit")
    if h["status"] == "below-detection":
        return "< " + sig(h["value"])
    if h["status"] == "partial":
        if dl is not None and h["value"] < dl:
            return "< " + sig(dl) + " so far"
        return "≥ " + sig(h["value"])
    return sig(h["value"])


def render_hazards(hazards: dict, d: dict) -> list[str]:
    ev = d.get("evaluation") or {}
    rg = d.get("risk_group") or {}
    out = [f"Photobiological hazards (IEC 62471 / CIE S 009; limit set {ev.get('limit_set', '?')})"]
    dist = ev.get("distance_m")
    out.append(f"  evaluated at {sig(dist) + ' m' if dist else 'the measurement position'}"
               f"{': ' + ev['distance_rule'] if ev.get('distance_rule') else ''}")
    rows = []
    for hid, h in hazards.items():
        if h["t_max_s"] is not None:
            tmax = format_duration(h["t_max_s"])
        elif h["status"] in ("not-assessable", "not-applicable") or h["value"] is None:
            tmax = "—"
        else:
            tmax = "> 8 h" if hid == "actinic_uv" else "unlimited"
        rows.append([f"{h['symbol']} {SHORT_HAZARD.get(hid, hid)}", _hazard_value(h), h["unit"],
                     sig(h["limit"]) if h["limit"] is not None else "—", tmax,
                     group_text(h["risk_group"], h["risk_group_is_lower_bound"], h.get("risk_group_bound")),
                     _pct(h["coverage"]) if h["coverage"] is not None else "—",
                     STATUS_TEXT.get(h["status"], h["status"])])
    out.append(table(["hazard", "value", "unit", "Exempt limit", "t_max", "group", "coverage",
                      "status"], rows, right=(1, 3, 4, 6)))
    if any(h["risk_group_is_lower_bound"] and h["risk_group"] == "Exempt" for h in hazards.values()):
        out.append("  * partly measured: below the Exempt limit so far, but cannot be called Exempt")
    for hid, h in hazards.items():
        if h.get("reason"):
            out.append(f"  - {h['symbol']}: {h['reason']}")
    out.append("")
    out.append(f"Overall risk group: {group_text(rg.get('group'), rg.get('is_lower_bound', False))}"
               + (f", set by {rg['governing']}" if rg.get("governing") else ""))
    if rg.get("note") and rg.get("is_lower_bound"):
        out.append(f"  ({rg['note']})")
    hd = d.get("hazard_distances") or {}
    lines = []
    for key in ("actinic_uv", "near_uv", "blue_light"):
        x = hd.get(key)
        if x and x.get("distance_m") is not None:
            b = x.get("boundaries_m") or {}
            bl = ", ".join(f"{g} beyond {sig(b[g])} m" for g in ("RG2", "RG1", "Exempt") if b.get(g))
            lines.append(f"  {x['symbol']}: {format_duration(hd.get('exposure_time_s'))} limit reached "
                         f"closer than {sig(x['distance_m'])} m" + (f"; {bl}" if bl else ""))
    if lines:
        out.append("Hazard distances (point-source inverse-square approximation):")
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
                t = format_duration(h["t_max_s"]) if h.get("t_max_s") is not None else "no time limit within the limit's range"
                out.append(f"  {h['symbol']} {_hazard_value(h)} {h['unit']}; t_max {t}")
    return out


def _trade(block: dict) -> str:
    if block.get("value") is not None:
        pre = "≥ " if block.get("is_lower_bound") else ""
        return (f"{pre}{sig(block['value'])} {block['unit']} "
                f"({pre}{sig(block['value_trade'])} {block['trade_unit']})")
    if block.get("upper_bound") is not None:
        return (f"< {sig(block['upper_bound'])} {block['unit']} "
                f"(< {sig(block['upper_bound_trade'])} {block['trade_unit']})")
    return "not measured" if block.get("status") == "not-covered" else "—"


def render_germicidal(g: dict, d: dict) -> list[str]:
    out = ["Germicidal output" + (f" at {sig(g['position']['distance_m'])} m"
                                  if (g.get("position") or {}).get("distance_m") else
                                  " at the measurement position")]
    out.append(f"  {g['statement']}")
    out.append(f"  UV-C 200–280 nm: {_trade(g['uvc'])}; far-UVC 200–235 nm: {_trade(g['far_uvc'])}")
    eq = (g.get("effective") or {}).get("equivalent_254") or {}
    if eq.get("most_favourable") is not None:
        out.append(f"  254-nm-equivalent: {sig(eq['least_favourable'])}–{sig(eq['most_favourable'])} W m-2 "
                   f"across action spectra (claims use the most favourable, {eq['most_favourable_id']})")
    vb = (g.get("effective") or {}).get("violet_blue_405")
    if vb and vb.get("value") is not None:
        out.append(f"  violet-blue (≈405 nm) effective: {_trade(vb)}")
    oz = g.get("ozone") or {}
    if oz:
        out.append(f"  ozone (output below 240 nm): {oz.get('status')} — {oz.get('note') or oz.get('basis') or ''}")
    for a in g.get("artefacts") or []:
        out.append(f"  ! {a['kind']}: {a['detail']}")
    eff = g.get("efficiency") or {}
    if eff.get("efficiency") is not None:
        out.append(f"  UV-C efficiency: {eff['efficiency']:.3g} W/W ({eff.get('verdict')}; {eff.get('note') or ''})")
    rows = []
    for e in (g.get("inactivation") or [])[:14]:
        rows.append([e["organism"], e["medium"], f"{e['wavelength_nm']:g}",
                     ("≥ " if e["times_are"] == "at_least" else "") + format_duration(e["time_to_90_s"]),
                     ("≥ " if e["times_are"] == "at_least" else "") + format_duration(e["time_to_99_9_s"])
                     if e["time_to_99_9_s"] is not None else "beyond data"])
    if rows:
        out.append("  Time to inactivate at this position (reciprocity assumed; no shadowing or soiling):")
        out.append(table(["organism", "medium", "data nm", "90 %", "99.9 %"], rows, right=(3, 4)))
    return out


VERDICT_TEXT = {"holds": "HOLDS", "cannot-hold": "CANNOT HOLD", "unlikely": "UNLIKELY",
                "not-assessable": "NOT ASSESSABLE"}


def wrap(text: str, indent: int, width: int = 100) -> list[str]:
    import textwrap

    return textwrap.wrap(text, width=width, initial_indent=" " * indent,
                         subsequent_indent=" " * indent) or [" " * indent]


def render_claims(claims: list, d: dict) -> list[str]:
    lst = d.get("listing") or {}
    origin = (d.get("input") or {}).get("origin")
    on = "the measured spectrum" if origin == "measured" else "a nominal ESTIMATE from the listing"
    out = [f"Claims of \"{lst.get('name', 'the product')}\" (judged on {on})"]
    for c in claims:
        label = VERDICT_TEXT.get(c["verdict"], c["verdict"])
        text = c.get("text") or c["kind"]
        out.append(f"  [{label}] \"{text}\" ({c['kind']})")
        out += wrap(c["basis"], 6)
        if c.get("missing"):
            out += wrap("missing: " + "; ".join(c["missing"]), 6)
    summ = (d.get("claims_summary") or {})
    if summ.get("decision_rule"):
        out += wrap("Decision rule: " + summ["decision_rule"], 2)
    pl = d.get("plausibility") or {}
    used = {(c.get("details") or {}).get("finding") for c in claims}
    other = [f for f in pl.get("findings", []) if f["status"] in ("cannot-hold", "unlikely")
             and f["id"] not in used]
    if other:
        out.append("  Other findings from the listing's stated data:")
        for f in other:
            out += wrap(f"- [{VERDICT_TEXT.get(f['status'], f['status'])}] {f['message']}", 4)
    return out


#: Renderers for later sections (room …), keyed by JSON section name; claims come first.
def render_uncertainty(u: dict, d: dict) -> list[str]:
    from uvcheck.uncertainty import render_uncertainty_lines

    return render_uncertainty_lines(u, d)


SECTION_RENDERERS: dict[str, Any] = {"hazards": render_hazards, "germicidal": render_germicidal,
                                     "uncertainty": render_uncertainty}


def duration(seconds: float | None) -> str:
    return format_duration(seconds)
