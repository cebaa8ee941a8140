"""A sample against a reference: two assessments side by side.

A surveillance officer compares a product sample with a reference sample of the same product,
or two units bought at different times; an occupational-health buyer compares an offered lamp
with the one already approved. :func:`compare` takes the two ``Assessment.to_dict()`` results
(the JSON contract) and gives, band by band and hazard by hazard, both values and their ratio,
the peak shift, both risk groups and the UV-C of each.

Honest-results rules: a ratio is given only where both values are established (complete, not
a bound, not below detection, both in the same unit); otherwise the row says why there is none.
One exception: two spectra measured over the same wavelengths (the same data range and gaps,
two units measured alike) that both leave a band or a hazard partly measured compare over
that measured part. Both values are then lower bounds of the same kind, and their ratio is
the ratio of the parts measured; the row says so (``over = "measured part"``), and so does a
difference it shows. Two values below detection never give a ratio.
Both results must be of one quantity and at one position (the same measurement distance, or
both at an unstated one), else the comparison is refused: values at different distances do
not compare.
"""

from __future__ import annotations

from typing import Any, Mapping

from uvcheck.limits import HAZARD_IDS

#: Statuses whose value is established (not a bound): bands, hazards and UV-C alike.
_ESTABLISHED = ("complete",)
#: A relative difference under this is reported as "the same" (our own rule: within the
#: usual calibration uncertainty of a UV measurement, about 5 %). [-]
SAME_WITHIN = 0.05


def _ratio(a: Any, b: Any) -> float | None:
    if isinstance(a, (int, float)) and isinstance(b, (int, float)) and b > 0 and a >= 0:
        return float(a) / float(b)
    return None


def _why_none(sa: str | None, sb: str | None) -> str:
    bad = [f"{who} {s}" for who, s in (("sample", sa), ("reference", sb))
           if s not in _ESTABLISHED]
    return "no ratio: " + ", ".join(bad) if bad else "no ratio: a value is zero or missing"


def _row(name: str, unit: str | None, va: Any, sa: str | None, vb: Any, sb: str | None,
         ta: str | None = None, tb: str | None = None, part: bool = False) -> dict[str, Any]:
    """ta, tb : the values as the assessment shows them ('< 1.2e-05', '≥ 0.3'), where the
    number alone would mislead (a detection limit, a lower bound).
    part : both values are partly measured, over the same wavelengths, and above detection:
        their ratio is that of the measured parts (see the module notes)."""
    ok = sa in _ESTABLISHED and sb in _ESTABLISHED
    over = None
    if ok:
        r = _ratio(va, vb)
    elif part and sa == sb == "partial":
        r = _ratio(va, vb)
        over = "measured part" if r is not None else None
    else:
        r = None
    note = None if r is not None else _why_none(sa, sb)
    if over is not None:
        note = "over the measured part only (both partly measured, over the same wavelengths)"
    return {"name": name, "unit": unit, "sample": va, "sample_status": sa, "reference": vb,
            "reference_status": sb, "ratio": r, "over": over, "note": note,
            "sample_text": ta, "reference_text": tb}


def _same_wavelengths(a: Mapping[str, Any], b: Mapping[str, Any]) -> bool:
    """Whether two results' spectra cover the same wavelengths: the same data range and the
    same gaps, within half the coarser sampling step."""
    ia, ib = a.get("input") or {}, b.get("input") or {}
    ra, rb = ia.get("range_nm"), ib.get("range_nm")
    if not ra or not rb:
        return False
    step = max(float(ia.get("step_nm") or 0.0), float(ib.get("step_nm") or 0.0))
    tol = 0.5 * step

    def close(x: Any, y: Any) -> bool:
        return len(x) == len(y) and all(abs(float(p) - float(q)) <= tol for p, q in zip(x, y))

    ga = [w for g in ((ia.get("inferred") or {}).get("gaps_nm") or []) for w in g]
    gb = [w for g in ((ib.get("inferred") or {}).get("gaps_nm") or []) for w in g]
    return close(ra, rb) and close(ga, gb)


def _position(d: Mapping[str, Any]) -> float | None:
    return (d.get("conditions") or {}).get("measurement_distance_m")


def compare(sample: Mapping[str, Any], reference: Mapping[str, Any]) -> dict[str, Any]:
    """The comparison of two assessment dicts (see the module notes).

    Examples
    --------
    >>> a = {"input": {"quantity": "irradiance", "path": "a.csv"}, "conditions": {},
    ...      "bands": {"UV-A": {"value": 2.0, "unit": "W m-2", "status": "complete"}},
    ...      "spectral": {"peak_nm": 366.0}}
    >>> b = {"input": {"quantity": "irradiance", "path": "b.csv"}, "conditions": {},
    ...      "bands": {"UV-A": {"value": 4.0, "unit": "W m-2", "status": "complete"}},
    ...      "spectral": {"peak_nm": 365.0}}
    >>> c = compare(a, b)
    >>> c["bands"][0]["ratio"], c["peak_shift_nm"]
    (0.5, 1.0)
    """
    from uvcheck.errors import ConfigurationError
    from uvcheck.report.terminal import band_value_text, hazard_below_detection, hazard_value_text

    qa = (sample.get("input") or {}).get("quantity")
    qb = (reference.get("input") or {}).get("quantity")
    if qa != qb:
        raise ConfigurationError(f"the sample is {qa}, the reference {qb}: values of different "
                                 "quantities do not compare", todo="give two spectra of one kind")
    da, db = _position(sample), _position(reference)
    if (da is None) != (db is None) or (da is not None and abs(da - db) > 0.01 * db):  # type: ignore[operator]
        def at(d: float | None) -> str:
            return "an unstated distance" if d is None else f"{d:g} m"

        raise ConfigurationError(
            f"the sample was measured at {at(da)}, the reference at {at(db)}: values at "
            "different positions do not compare",
            todo="measure both at one distance, or give each file's distance in its metadata "
                 "(--distance applies to both files)")
    same = _same_wavelengths(sample, reference)
    bands = []
    bb = reference.get("bands") or {}
    for name, x in (sample.get("bands") or {}).items():
        y = bb.get(name) or {}
        part = same and bool(y) and not (x.get("below_detection") or y.get("below_detection"))
        bands.append(_row(name, x.get("unit"), x.get("value"), x.get("status"), y.get("value"),
                          y.get("status"), band_value_text(x, "value") if x else None,
                          band_value_text(y, "value") if y else None, part=part))
    hz = []
    ha, hb = sample.get("hazards") or {}, reference.get("hazards") or {}
    for hid in HAZARD_IDS:
        x, y = ha.get(hid), hb.get(hid)
        if not x or not y:
            continue
        part = (same and not hazard_below_detection(x) and not hazard_below_detection(y)
                and x.get("covered_nm") == y.get("covered_nm"))
        row = _row(x.get("symbol") or hid, x.get("unit"), x.get("value"), x.get("status"),
                   y.get("value"), y.get("status"), hazard_value_text(x), hazard_value_text(y),
                   part=part)
        row.update(id=hid, sample_group=x.get("risk_group"), reference_group=y.get("risk_group"))
        hz.append(row)
    ua = (sample.get("germicidal") or {}).get("uvc") or {}
    ub = (reference.get("germicidal") or {}).get("uvc") or {}
    uvc = _row("UV-C 200–280 nm", ua.get("unit"), ua.get("value"), ua.get("status"),
               ub.get("value"), ub.get("status"),
               part=same and _above_detection(ua) and _above_detection(ub))
    pa = (sample.get("spectral") or {}).get("peak_nm")
    pb = (reference.get("spectral") or {}).get("peak_nm")
    rga, rgb = sample.get("risk_group") or {}, reference.get("risk_group") or {}
    findings = []
    for r in bands + hz:  # (the UV-C row repeats the UV-C band's figure)
        if r["ratio"] is not None and abs(r["ratio"] - 1.0) > SAME_WITHIN:
            findings.append(f"{r['name']}: the sample is {r['ratio']:.3g} × the reference"
                            + (" (over the measured part only)" if r["over"] else ""))
        elif r["ratio"] is None and (side := _detected_in_one(r)) is not None:
            findings.append(f"{r['name']}: found in the {side} only (sample "
                            f"{r['sample_text'] or r['sample']}, reference "
                            f"{r['reference_text'] or r['reference']})")
    if pa is not None and pb is not None and abs(pa - pb) > PEAK_SAME_NM:
        findings.append(f"peak: sample {pa:.1f} nm, reference {pb:.1f} nm")
    ta = ((sample.get("germicidal") or {}).get("technology") or {})
    tb = ((reference.get("germicidal") or {}).get("technology") or {})
    if ta.get("id") and tb.get("id") and ta["id"] != tb["id"]:
        findings.append(f"technology: the sample looks like a {ta.get('name')}, the reference "
                        f"like a {tb.get('name')} (each read from its spectrum, a guess): "
                        "probably not the same product")
    if rga.get("group") != rgb.get("group") or bool(rga.get("is_lower_bound")) != bool(
            rgb.get("is_lower_bound")):
        findings.append(f"risk group: sample {_group(rga)}, reference {_group(rgb)}")
    ev = sample.get("evaluation") or {}
    return {
        "schema": "uvcheck.comparison/1",
        "sample": (sample.get("input") or {}).get("path"),
        "reference": (reference.get("input") or {}).get("path"),
        "quantity": qa, "measurement_distance_m": da,
        "hazards_at_m": ev.get("distance_m"), "hazards_distance_rule": ev.get("distance_rule"),
        "warnings": {"sample": list((sample.get("input") or {}).get("warnings") or []),
                     "reference": list((reference.get("input") or {}).get("warnings") or [])},
        "peak_nm": {"sample": pa, "reference": pb},
        "peak_shift_nm": (pa - pb) if pa is not None and pb is not None else None,
        "bands": bands, "hazards": hz, "uvc": uvc,
        "risk_group": {"sample": _group(rga), "reference": _group(rgb)},
        "differences": findings,
        "same_within": SAME_WITHIN,
        "same_wavelengths": same,
        "notes": ["A ratio is given only where both values are established (not a bound, not "
                  "below detection), or, for two spectra over the same wavelengths, where both "
                  "are partly measured: then over the measured part only; differences under "
                  f"{SAME_WITHIN:.0%} (our own rule, about a UV measurement's calibration "
                  "uncertainty) are not listed as differences.",
                  "Screening comparison, not a certification; local codes and licensed "
                  "practice take precedence."],
    }


#: Peaks closer than this are the same peak in the differences (our own rule: the 1 nm used
#: to name emission lines, about a spectrometer's wavelength accuracy). [nm]
PEAK_SAME_NM = 1.0


def _detected_in_one(r: Mapping[str, Any]) -> str | None:
    """'sample' or 'reference' when that side's value is established or a lower bound above
    detection and the other's is below detection; None otherwise."""
    def found(status: Any, text: Any) -> bool:
        return status in ("complete", "partial") and not str(text or "").startswith("<")

    def below(status: Any, text: Any) -> bool:
        return status == "below-detection" or str(text or "").startswith("<")

    a = (r["sample_status"], r["sample_text"])
    b = (r["reference_status"], r["reference_text"])
    if found(*a) and below(*b):
        return "sample"
    if found(*b) and below(*a):
        return "reference"
    return None


def _above_detection(u: Mapping[str, Any]) -> bool:
    """A UV-C reading's value is above its detection limit."""
    v, dl = u.get("value"), u.get("detection_limit")
    return v is not None and (dl is None or v >= dl)


def _group(rg: Mapping[str, Any]) -> str | None:
    g = rg.get("group")
    if g is None:
        return None
    return f"at least {g}" if rg.get("is_lower_bound") else g


def render_comparison(c: Mapping[str, Any]) -> str:
    """The comparison as terminal text."""
    from uvcheck.units import sig

    def num(v: Any, status: str | None = None) -> str:
        if v is None:
            return "—"
        return ("≥ " if status == "partial" else "") + sig(v)   # partly measured: a lower bound

    def nm(v: Any) -> str:
        return "—" if v is None else f"{v:.1f}"

    at = c["measurement_distance_m"]
    out = [f"Comparison: sample {c['sample']} against reference {c['reference']}",
           f"  {c['quantity']}" + (f", both measured at {sig(at)} m" if at is not None else
                                   ", both at an unstated measurement position"), ""]
    pk = c["peak_nm"]
    out.append(f"Peak: sample {nm(pk['sample'])} nm, reference {nm(pk['reference'])} nm"
               + (f" (shift {c['peak_shift_nm']:+.1f} nm)" if c["peak_shift_nm"] is not None
                  else ""))
    out.append(f"Risk group: sample {c['risk_group']['sample']}, reference "
               f"{c['risk_group']['reference']}")
    out.append("")
    hz_at = c.get("hazards_at_m")
    sections = [("Bands" + (f" (at {sig(at)} m)" if at is not None else ""), c["bands"]),
                ("Hazards" + (f" (at {sig(hz_at)} m: {c.get('hazards_distance_rule')})"
                              if hz_at is not None and hz_at != at else ""), c["hazards"])]
    band_uvc = next((r for r in c["bands"] if r["name"] == "UV-C"), None)
    if band_uvc is None or (band_uvc["sample"], band_uvc["reference"]) != (
            c["uvc"]["sample"], c["uvc"]["reference"]):
        sections.append(("UV-C", [c["uvc"]]))  # only where it is not the UV-C band's figure
    every = [r for _, rows in sections for r in rows]
    # as the assessment shows them: a detection limit as '< x', a lower bound '≥ x'
    texts = {id(r): (r.get("sample_text") or num(r["sample"], r["sample_status"]),
                     r.get("reference_text") or num(r["reference"], r["reference_status"]))
             for r in every}
    w = max([12] + [len(t) for pair in texts.values() for t in pair])
    wn = max([28] + [len(r["name"]) for r in every])
    for title, rows in sections:
        out.append(title)
        out.append(f"  {'':<{wn}} {'sample':>{w}}  {'reference':>{w}}  {'unit':<12} "
                   "sample/reference")
        for r in rows:
            ratio = (r["note"] if r["ratio"] is None else f"{r['ratio']:.3g} ×"
                     + (" over the measured part only" if r.get("over") else ""))
            sa, ra = texts[id(r)]
            out.append(f"  {r['name']:<{wn}} {sa:>{w}}  {ra:>{w}}  "
                       f"{r['unit'] or '':<12} {ratio}")
        out.append("")
    for side in ("sample", "reference"):
        said = (c.get("warnings") or {}).get(side) or []
        if said:
            out.append(f"Warnings ({side}, from reading {c[side]})")
            out += [f"  ! {x}" for x in said]
            out.append("")
    out.append("Differences" if c["differences"] else "No difference beyond "
               f"{c['same_within']:.0%} where both values are established.")
    out += [f"  - {f}" for f in c["differences"]]
    out.append("")
    out += [f"Note: {n}" for n in c["notes"]]
    return "\n".join(out) + "\n"
