"""The note as PDF, from the same view model as the HTML (fpdf2; no browser at run time).

Why fpdf2: it is pure Python and already a dependency, so the PDF is made the same way on any
machine, offline, without a headless browser or an external program; the note's content comes
from :func:`uvcheck.report.note.build_note`, the same view model the HTML template renders, so
the two cannot drift apart. Text is set in DejaVu Sans, which matplotlib ships
(``matplotlib.get_data_path()/fonts/ttf``), so µ, ², λ, σ, ≥ and → print correctly. Figures are
the PNG renderings of the same matplotlib figures the HTML shows as SVG.

fpdf2 and matplotlib are imported inside the functions (start-up budget).
"""

from __future__ import annotations

import io
import re
from pathlib import Path
from typing import Any, Mapping, Sequence

A4_W_MM = 210.0
MARGIN_MM = 14.0
BODY_W_MM = A4_W_MM - 2 * MARGIN_MM
INK = (27, 27, 27)
MUTED = (90, 90, 90)
#: Risk-group box border colours (as the HTML's risk-rg* classes).
GROUP_BORDER = {"Exempt": (106, 159, 88), "RG1": (214, 177, 60), "RG2": (224, 123, 57),
                "RG3": (192, 57, 43)}
VERDICT_COLOURS = {"holds": (46, 107, 46), "cannot-hold": (166, 27, 27), "unlikely": (154, 90, 0),
                   "not-assessable": (85, 85, 85), "info": (85, 85, 85)}


def font_dir() -> Path:
    """Folder of the DejaVu TTF fonts bundled with matplotlib."""
    import matplotlib

    return Path(matplotlib.get_data_path()) / "fonts" / "ttf"


def _pdf_class() -> Any:
    from fpdf import FPDF

    class NotePDF(FPDF):  # type: ignore[misc, valid-type]
        """A4 portrait with the screening line and page numbers in the footer."""

        footer_text = ""

        def footer(self) -> None:
            self.set_y(-11)
            self.set_font("DejaVu", "", 7)
            self.set_text_color(*MUTED)
            self.cell(0, 4, f"{self.footer_text}   page {self.page_no()} of {{nb}}", align="C")
            self.set_text_color(*INK)

    return NotePDF


FONT_FILES = (("", "DejaVuSans.ttf"), ("B", "DejaVuSans-Bold.ttf"), ("I", "DejaVuSans-Oblique.ttf"))


def _new(footer: str, title: str) -> Any:
    pdf = _pdf_class()(orientation="P", unit="mm", format="A4")
    fd = font_dir()
    for style, name in FONT_FILES:
        # parsed for every document: fpdf2 subsets the parsed font in place when it writes
        pdf.add_font("DejaVu", style, str(fd / name))
    pdf.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
    pdf.set_auto_page_break(True, margin=16)
    pdf.footer_text = footer
    pdf.set_title(title)
    pdf.set_creator("uvcheck")
    pdf.alias_nb_pages()
    pdf.add_page()
    pdf.set_font("DejaVu", "", 9)
    return pdf


# ---------------------------------------------------------------------------------------------
# Building blocks
#
# Text is wrapped here, word by word, with fpdf2's string widths, and each line is set with one
# ``cell``: fpdf2's own ``multi_cell``/``table`` line breaking re-measures the growing line for
# every character, which made the tables most of the note's run time. Words are never split
# unless a single word is wider than its column (column widths are widened to fit the longest
# word of each heading, so headings never break inside a word).
# ---------------------------------------------------------------------------------------------

def _wrap(pdf: Any, text: str, width: float) -> list[str]:
    """Greedy word wrap of ``text`` (``\\n`` starts a new line) to ``width`` mm in the
    current font; a word wider than the width is split by characters."""
    out: list[str] = []
    sw = pdf.get_string_width
    space = sw(" ")
    for para in str(text).split("\n"):
        line, lw = "", 0.0
        for word in para.split(" "):
            if not word:
                continue
            ww = sw(word)
            if line and lw + space + ww <= width:
                line, lw = f"{line} {word}", lw + space + ww
                continue
            if line:
                out.append(line)
            line, lw = "", 0.0
            while ww > width and len(word) > 1:  # only a word longer than the column
                k = 1
                while k < len(word) and sw(word[:k + 1]) <= width:
                    k += 1
                out.append(word[:k])
                word = word[k:]
                ww = sw(word)
            line, lw = word, ww
        out.append(line)
    return out


def _lines_out(pdf: Any, lines: Sequence[str], h: float, x: float, w: float) -> None:
    """Set lines at x, one cell each (fpdf2 breaks the page between lines when needed)."""
    for ln in lines:
        pdf.set_x(x)
        pdf.cell(w, h, ln, new_x="LMARGIN", new_y="NEXT")


def _rich_lines(pdf: Any, runs: Sequence[tuple[str, str]], width: float,
                size: float) -> list[list[tuple[str, str]]]:
    """Wrap styled runs [(style, text)] into lines of [(style, text)]."""
    words: list[tuple[str, str, float]] = []
    for style, text in runs:
        pdf.set_font("DejaVu", style, size)
        for w in str(text).split(" "):
            if w:
                words.append((style, w, pdf.get_string_width(w)))
    pdf.set_font("DejaVu", "", size)
    space = pdf.get_string_width(" ")
    lines: list[list[tuple[str, str]]] = []
    cur: list[tuple[str, str]] = []
    lw = 0.0
    for style, w, ww in words:
        if cur and lw + space + ww > width:
            lines.append(cur)
            cur, lw = [], 0.0
        if cur and cur[-1][0] == style:
            cur[-1] = (style, cur[-1][1] + " " + w)
        elif cur:
            cur[-1] = (cur[-1][0], cur[-1][1] + " ")
            cur.append((style, w))
        else:
            cur.append((style, w))
        lw += (space if lw else 0.0) + ww
    if cur:
        lines.append(cur)
    return lines


def _rich_out(pdf: Any, lines: Sequence[Sequence[tuple[str, str]]], h: float, x: float,
              size: float) -> None:
    for ln in lines:
        if pdf.get_y() + h > pdf.page_break_trigger:
            pdf.add_page()
        pdf.set_x(x)
        for style, text in ln:
            pdf.set_font("DejaVu", style, size)
            pdf.cell(pdf.get_string_width(text), h, text, new_x="RIGHT", new_y="TOP")
        pdf.ln(h)
    pdf.set_font("DejaVu", "", size)


def _para(pdf: Any, text: str, size: float = 9, style: str = "", color: tuple = INK,
          h: float | None = None, align: str = "L") -> None:
    pdf.set_font("DejaVu", style, size)
    pdf.set_text_color(*color)
    _lines_out(pdf, _wrap(pdf, text, BODY_W_MM), h or size * 0.46, pdf.l_margin, BODY_W_MM)
    pdf.set_text_color(*INK)


def _lead_para(pdf: Any, lead: str, text: str, size: float, x: float, width: float,
               h: float) -> None:
    """A paragraph with a bold lead-in, wrapped as one text."""
    _rich_out(pdf, _rich_lines(pdf, [("B", lead), ("", text)], width, size), h, x, size)


def _subheading(pdf: Any, text: str, size: float = 9.5, min_space_mm: float = 32) -> None:
    """A bold line kept with what follows (a new page when little room is left)."""
    if pdf.get_y() > pdf.h - pdf.b_margin - min_space_mm:
        pdf.add_page()
    pdf.ln(1)
    _para(pdf, text, size=size, style="B")


def _heading(pdf: Any, text: str, size: float = 12, min_space_mm: float = 35) -> None:
    if pdf.get_y() > pdf.h - pdf.b_margin - min_space_mm:
        pdf.add_page()
    pdf.ln(3)
    pdf.set_font("DejaVu", "B", size)
    pdf.set_x(pdf.l_margin)
    pdf.cell(BODY_W_MM, size * 0.5, text, new_x="LMARGIN", new_y="NEXT")
    y = pdf.get_y() + 0.6
    pdf.set_draw_color(*INK)
    pdf.set_line_width(0.5 if size >= 12 else 0.2)
    pdf.line(pdf.l_margin, y, pdf.l_margin + BODY_W_MM, y)
    pdf.set_line_width(0.2)
    pdf.ln(2)


def _box(pdf: Any, title: str | None, text: str, fill: tuple, border: tuple, size: float = 9,
         bold_lead: str | None = None, dashed: bool = False,
         extra: Sequence[tuple[str, str]] = ()) -> None:
    """A shaded box with an optional small-caps title, a bold lead-in and extra paragraphs
    [(style, text)] below the first."""
    pad = 2.5
    lh = size * 0.46
    inner = BODY_W_MM - 2 * pad
    pdf.set_font("DejaVu", "", size)
    first = _rich_lines(pdf, ([("B", bold_lead)] if bold_lead else []) + [("", text)], inner, size)
    more = []
    for style, t in extra:
        pdf.set_font("DejaVu", style, size * 0.92)
        more.append((style, _wrap(pdf, t, inner)))
    h = (len(first) * lh + sum(len(ls) * size * 0.92 * 0.46 + 0.8 for _, ls in more)
         + 2 * pad + (4.5 if title else 0))
    if pdf.get_y() + h > pdf.h - pdf.b_margin:
        pdf.add_page()
    x, y = pdf.l_margin, pdf.get_y()
    pdf.set_fill_color(*fill)
    pdf.set_draw_color(*border)
    pdf.set_line_width(0.6 if not dashed else 0.4)
    if dashed:
        pdf.set_dash_pattern(dash=1.5, gap=1.0)
    pdf.rect(x, y, BODY_W_MM, h, style="DF")
    pdf.set_dash_pattern()
    pdf.set_line_width(0.2)
    pdf.set_xy(x + pad, y + pad)
    if title:
        pdf.set_font("DejaVu", "B", 7)
        pdf.set_text_color(*MUTED)
        pdf.cell(inner, 3.5, title.upper(), new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(*INK)
        pdf.ln(1)
    _rich_out(pdf, first, lh, x + pad, size)
    for style, ls in more:
        pdf.ln(0.8)
        pdf.set_font("DejaVu", style, size * 0.92)
        _lines_out(pdf, ls, size * 0.92 * 0.46, x + pad, inner)
    pdf.set_y(y + h + 2.5)


def _words(text: Any) -> list[str]:
    """The words _wrap keeps together (split at spaces and line breaks, not at no-break spaces)."""
    return [t for t in re.split(r"[ \n]+", str(text)) if t]


def _fit_widths(pdf: Any, headings: Sequence[str] | None, rows: Sequence[Sequence[str]],
                widths: Sequence[float], size: float, pad: float) -> list[float]:
    """Column widths in mm from relative widths, widened so that no heading word (and no body
    word up to a quarter of the page) has to break; the room comes from the widest columns."""
    total = float(sum(widths))
    w = [BODY_W_MM * x / total for x in widths]
    need = [0.0] * len(w)
    if headings is not None:
        pdf.set_font("DejaVu", "B", size)
        for j, hd in enumerate(headings):
            need[j] = max([pdf.get_string_width(t) for t in _words(hd)] + [0.0]) + 2 * pad + 0.3
    pdf.set_font("DejaVu", "", size)
    cap = BODY_W_MM / 4
    for row in rows:
        for j, cell in enumerate(row[:len(w)]):
            for t in _words(cell):
                if len(t) > 3:
                    ww = pdf.get_string_width(t) + 2 * pad + 0.3
                    if need[j] < ww <= cap:
                        need[j] = ww
    for _ in range(len(w)):
        short = [j for j in range(len(w)) if w[j] < need[j] - 1e-6]
        if not short:
            break
        deficit = sum(need[j] - w[j] for j in short)
        for j in short:
            w[j] = need[j]
        spare = [j for j in range(len(w)) if j not in short and w[j] > need[j]]
        room = sum(w[j] - need[j] for j in spare)
        if room <= 0:
            break
        take = min(1.0, deficit / room)
        for j in spare:
            w[j] -= (w[j] - need[j]) * take
    scale = BODY_W_MM / sum(w)
    return [x * scale for x in w]


def _keep_short(cells: Sequence[Any]) -> list[str]:
    """A short cell ('20 cm', '100 %', '5.71 s') is one unit: its spaces become no-break
    spaces, so a narrow column does not put the unit on a line of its own."""
    return [str(c).replace(" ", "\u00a0") if len(str(c)) <= 10 and "\n" not in str(c)
            else str(c) for c in cells]


def _table(pdf: Any, headings: Sequence[str] | None, rows: Sequence[Sequence[str]],
           widths: Sequence[float], size: float = 7.6, verdict_col: int | None = None,
           verdicts: Sequence[str] | None = None, bold_col: int | None = None) -> None:
    """A table with horizontal rules, the heading row repeated on each page it spans."""
    pad_x, pad_y = 1.2, 1.0
    lh = size * 0.45
    rows = [_keep_short(r) for r in rows]
    w = _fit_widths(pdf, headings, rows, widths, size, pad_x)
    bottom = pdf.h - pdf.b_margin

    def layout(cells: Sequence[str], styles: Sequence[str]) -> tuple[list[list[str]], float]:
        out = []
        for j, cell in enumerate(cells):
            pdf.set_font("DejaVu", styles[j], size)
            out.append(_wrap(pdf, str(cell), w[j] - 2 * pad_x))
        return out, max(len(c) for c in out) * lh + 2 * pad_y

    def draw(lines: list[list[str]], styles: Sequence[str], colours: Sequence[tuple],
             h: float, fill: tuple | None = None) -> None:
        x0, y0 = pdf.l_margin, pdf.get_y()
        if fill:
            pdf.set_fill_color(*fill)
            pdf.rect(x0, y0, BODY_W_MM, h, style="F")
        x = x0
        for j, ls in enumerate(lines):
            pdf.set_font("DejaVu", styles[j], size)
            pdf.set_text_color(*colours[j])
            for k, ln in enumerate(ls):
                if ln:
                    pdf.set_xy(x + pad_x, y0 + pad_y + k * lh)
                    pdf.cell(w[j] - 2 * pad_x, lh, ln)
            x += w[j]
        pdf.set_text_color(*INK)
        pdf.set_draw_color(200, 200, 200)
        pdf.line(x0, y0 + h, x0 + BODY_W_MM, y0 + h)
        pdf.set_xy(x0, y0 + h)

    head = None
    if headings is not None:
        hs = ["B"] * len(headings)
        hl, hh = layout(headings, hs)
        head = (hl, hs, [INK] * len(headings), hh)

    def heading() -> None:
        if head is not None:
            draw(*head, fill=(236, 236, 232))

    def row_style(i: int, row: Sequence[str]) -> tuple[list[str], list[tuple]]:
        styles, colours = [], []
        for j in range(len(row)):
            if verdict_col is not None and j == verdict_col and verdicts:
                styles.append("B")
                colours.append(VERDICT_COLOURS.get(verdicts[i], INK))
            else:
                styles.append("B" if bold_col is not None and j == bold_col else "")
                colours.append(INK)
        return styles, colours

    # the heading goes where its first row fits too (no heading left alone at a page's foot)
    first = layout(rows[0], row_style(0, rows[0])[0])[1] if rows else lh + 2 * pad_y
    need = (head[3] if head is not None else 0.0) + first
    if pdf.get_y() + need > bottom and need < bottom - pdf.t_margin:
        pdf.add_page()
    heading()
    for i, row in enumerate(rows):
        styles, colours = row_style(i, row)
        lines, h = layout(row, styles)
        if pdf.get_y() + h > bottom and h < bottom - pdf.t_margin:
            pdf.add_page()
            heading()
        draw(lines, styles, colours, h)
    pdf.set_font("DejaVu", "", size)
    pdf.ln(1.5)


def _facts(pdf: Any, facts: Sequence[Mapping[str, str]], size: float = 8) -> None:
    if not facts:
        return
    _table(pdf, None, [(f["label"], f["value"]) for f in facts], (34, 66), size=size)


def _figure(pdf: Any, fig: Mapping[str, Any]) -> None:
    from PIL import Image

    png = fig.get("png")
    if not png:
        return
    with Image.open(io.BytesIO(png)) as im:
        w_px, h_px = im.size
    w_mm = BODY_W_MM
    h_mm = w_mm * h_px / w_px
    room = pdf.h - pdf.b_margin - pdf.get_y() - 12  # keep space for the caption
    if h_mm > room:
        if room >= 0.72 * h_mm:      # shrink a little rather than leave half a page empty
            w_mm, h_mm = w_mm * room / h_mm, room
        else:
            pdf.add_page()
    pdf.image(io.BytesIO(png), x=pdf.l_margin + (BODY_W_MM - w_mm) / 2, w=w_mm,
              alt_text=fig.get("title"))
    _para(pdf, f"{fig['title']}. {fig['caption']}", size=7, color=MUTED)
    pdf.ln(2)


# ---------------------------------------------------------------------------------------------
# The note
# ---------------------------------------------------------------------------------------------

def render_note_pdf(view: Mapping[str, Any], figures: Sequence[Mapping[str, Any]] = ()) -> bytes:
    """The note as PDF bytes, from the view model and the figures' PNG renderings."""
    v = view
    figs = {f["id"]: f for f in figures if f.get("png")}
    footer = "uvcheck screening note - not a certification" + (" - INVENTED DEMONSTRATION" if v["invented"] else "")
    pdf = _new(footer, f"{v['title']} - {v['subtitle']}")
    if v["invented"]:
        _box(pdf, None, v["invented_text"], (255, 244, 220), (122, 75, 0), size=8.5, dashed=True)
    _para(pdf, f"{v['subtitle']} · {v['provenance']['date']}", size=8, color=MUTED)
    _para(pdf, v["title"], size=15, style="B", h=7)
    pdf.ln(1)
    _box(pdf, None, v["local_codes"], (238, 242, 247), (47, 79, 127), size=8.5,
         bold_lead=v["screening_title"] + ".")
    _box(pdf, "Finding", v["finding"], (245, 245, 242), (212, 212, 212), size=9.5)
    if v.get("risk"):
        rk = v["risk"]
        lead = " ".join(x for x in (rk["headline"], rk.get("qualifier"), rk.get("where")) if x) + "."
        extra = [("", rk["other"])] if rk.get("other") else []
        if rk.get("borderline_text"):  # a borderline group in bold, as the HTML marks it
            extra.append(("B" if rk.get("borderline") else "", rk["borderline_text"]))
        if rk.get("probability"):
            extra.append(("", rk["probability"] + (f" {rk['by_rule']}" if rk.get("by_rule") else "")))
        _box(pdf, "Overall risk group (IEC 62471)" + (" — estimate" if rk.get("estimate") else ""),
             rk["detail"], (255, 255, 255), GROUP_BORDER.get(rk.get("group") or "", (120, 120, 120)),
             size=8.5, bold_lead=lead, extra=extra)
    kc = v["key_caution"]
    _box(pdf, "Most important caution", kc["text"], (255, 245, 243), (166, 27, 27), size=8.5,
         bold_lead=kc["title"] + ".")
    p = v.get("product")
    if p:
        _heading(pdf, "The product as sold", 11)
        _para(pdf, p["name"], size=9, style="B")
        if p.get("listing_text"):
            _para(pdf, f"“{p['listing_text']}”", size=8.5, style="I")
        if p.get("seller_note"):
            _para(pdf, p["seller_note"], size=8, color=MUTED)
        pdf.ln(1)
        _facts(pdf, p.get("facts") or [])
    if v.get("claims"):
        _heading(pdf, "Claims and verdicts", 11)
        _para(pdf, (v.get("claims_summary") or "") + " " + (
            f"Decision rule: {v['decision_rule']}" if v.get("decision_rule") else
            "A claim “cannot hold” only when even the most favourable reading of the data falls "
            "short; the margin says by how much."), size=7.5)
        rows = [(f"“{c['text']}”", c["verdict_text"],
                 f"needed: {c['needed']}\navailable: {c['available']}" if c["needed"] != "—"
                 or c["available"] != "—" else "—", c["ratio"],
                 c["basis"] + (f"\nAssumed: {'; '.join(c['assumptions'])}" if c["assumptions"] else ""))
                for c in v["claims"]]
        _table(pdf, ("Claim as sold", "Verdict", "Needed → available", "Margin", "Basis"), rows,
               (19, 11, 25, 10, 35), verdict_col=1, verdicts=[c["verdict"] for c in v["claims"]],
               bold_col=0, size=7.2)
    elif v.get("listed_claims"):
        _heading(pdf, "Claims as sold", 11)
        for c in v["listed_claims"]:
            _para(pdf, f"•  “{c}”", size=8.5)
        _para(pdf, "No verdicts are part of this result.", size=8, color=MUTED)

    if v.get("bands") or figs.get("spectrum"):
        _heading(pdf, "What it emits")
        if v.get("bands"):
            _table(pdf, ("Band", "Range", "Irradiance", "Share", "Coverage", "Status"),
                   [(b["band"], b["range"], b["value"], b["fraction"], b["coverage"], b["status"])
                    for b in v["bands"]], (18, 14, 30, 10, 10, 18))
            if v.get("band_convention"):
                _para(pdf, v["band_convention"], size=7, color=MUTED)
        if v.get("spectral"):
            _facts(pdf, v["spectral"])
        if figs.get("spectrum"):
            _figure(pdf, figs["spectrum"])
    if v.get("hazards"):
        _heading(pdf, "Photobiological hazards (IEC 62471)")
        rk = v.get("risk") or {}
        _para(pdf, f"Assessed at {rk.get('distance', '—')}"
              + (f" — {v['hazard_note']}" if v.get("hazard_note") else "") + ". “Limit” is the "
              "Exempt limit of IEC 62471:2006 Table 6.1 (skin thermal: its 10 s exposure limit, no "
              "risk groups); “max. exposure” is the permissible time at this distance; “coverage” "
              f"is the share of the hazard's weighting range that was {v.get('data_word', 'measured')}.", size=7.5)
        _table(pdf, ("Hazard", "Value", "Limit", "Value / limit", "Max. exposure", "Group",
                     "At", "Cov."),
               [(f"{h['name']} ({h['symbol']})",
                 h["value"] + (f"\n{h['interval']}" if h.get("interval") else ""), h["limit"],
                 h["ratio_text"], h["t_max"] + (f"\n{h['t_max_interval']}" if h.get("t_max_interval") else ""),
                 h["group"] + ("\nborderline" if h.get("borderline") else ""), h["distance"],
                 h["coverage"]) for h in v["hazards"]],
               (21, 18, 16, 9, 15, 11, 5, 5), size=7.2, bold_col=5)
        if figs.get("hazards"):
            _figure(pdf, figs["hazards"])
        ud = rk.get("use_distance")
        if ud:
            _subheading(pdf, f"At the distance of use, {ud['distance']}")
            _table(pdf, ("Hazard", "Value", "Max. exposure", "Group"),
                   [(f"{h['name']} ({h['symbol']})",
                     h["value"] + (f"\n{h['interval']}" if h.get("interval") else ""),
                     h["t_max"] + (f"\n{h['t_max_interval']}" if h.get("t_max_interval") else ""),
                     h["group"] + ("\nborderline" if h.get("borderline") else ""))
                    for h in ud["rows"]],
                   (35, 30, 25, 10), size=7.2)
        u = v.get("uncertainty")
        if u:
            _subheading(pdf, "Measurement uncertainty")
            _para(pdf, u["text"], size=7.2)
            if u.get("evaluated"):
                _para(pdf, f"Probability of each overall risk group: {u.get('overall') or '—'}"
                      + (f"; under the decision rule ({u['rule']}): {u['overall_by_rule']}"
                         if u.get("overall_by_rule") else "") + ". "
                      + (f"Borderline (the 95 % interval spans a group boundary): "
                         f"{', '.join(u['borderline'])}." if u.get("borderline") else
                         "No hazard is borderline."), size=7.2)
                if u.get("rule_text"):
                    _para(pdf, u["rule_text"], size=7.2, color=MUTED)
    g = v.get("germicidal")
    if g:
        _heading(pdf, "Germicidal output")
        _para(pdf, g.get("statement") or "", size=8.5)
        pdf.ln(1)
        facts = [{"label": "UV-C (200–280 nm)", "value": g["uvc"]},
                 {"label": "Far-UVC (200–235 nm)", "value": g["far_uvc"]}]
        if g.get("violet_blue"):
            facts.append({"label": "Violet-blue (about 405 nm), weighted", "value": g["violet_blue"]})
        facts.append({"label": "Where", "value": g["position"] + (
            f" ({g['distance']})" if g.get("distance") not in (None, "—") else "")})  # as the HTML
        if g.get("technology"):
            facts.append({"label": "Emitter type", "value": f"{g['technology']} — {g['technology_basis']}"})
        facts.append({"label": "Ozone (output below 240 nm)",
                      "value": f"{g['ozone']['status']}: {g['ozone']['note']}"})
        _facts(pdf, facts)
        if g.get("artefacts"):
            _box(pdf, None, "; ".join(g["artefacts"]) + ".", (255, 249, 232), (192, 138, 0),
                 size=8, bold_lead="Suspect signal.")
        if g.get("spectra"):
            _table(pdf, ("Action spectrum", "Effective irradiance", "254-nm-equivalent"),
                   [(s["label"] + (" (from memory)" if s["from_memory"] else ""), s["value"], s["equivalent"])
                    for s in g["spectra"]], (30, 40, 30), size=7.5)
        if g.get("highlight"):
            _subheading(pdf, f"Times to 90 % and 99.9 % ({g['pathway']})")
            def _times(t: str, iv: str | None, rng: str | None) -> str:
                return t + (f"\n95\u00a0%: {iv}" if iv else "") + (f"\nstudies: {rng}" if rng else "")

            _table(pdf, ("", "Organism", "Medium", "Data at", "Lamp, equivalent", "90 %", "99.9 %", "Reliability"),
                   [(o["label"], o["organism"], o["medium"], o["wavelength"], o["irradiance"],
                     _times(o["t90"], o.get("t90_interval"), o["t90_range"]),
                     _times(o["t999"], o.get("t999_interval"), o["t999_range"]), o["reliability"])
                    for o in g["highlight"]], (15, 17, 10, 8, 17, 13, 13, 10), size=7.2)
            _para(pdf, g.get("times_caption") or "", size=7, color=MUTED)
        if g.get("organisms"):
            _subheading(pdf, f"All {len(g['organisms'])} organisms in uvcheck's table for this "
                        "pathway (fastest first)", size=8.5)
            _table(pdf, ("Organism", "Medium", "Data at", "90 %", "99.9 %", "Reliability", "Source"),
                   [(o["organism"], o["medium"], o["wavelength"], o["t90"], o["t999"], o["reliability"],
                     o["source"] or "") for o in g["organisms"]], (22, 10, 8, 10, 12, 9, 29), size=6.6)
    r = v.get("room")
    if r:
        _heading(pdf, "In the room")
        _facts(pdf, [{"label": "Room", "value": f"{r['size']} ({r['volume']}), wall reflectance {r['reflectance']}"},
                     {"label": "Lamp", "value": f"at {r['lamp_at']}, {r['pattern']}; UV-C flux {r['uvc_flux']} ({r['flux_basis']})"},
                     {"label": "Air: volume-average fluence rate", "value": r["fluence_avg"]}])
        if r.get("plane"):
            _subheading(pdf, f"Work plane at {r['plane_height']}")
            _table(pdf, [p["label"] for p in r["plane"]], [[p["value"] for p in r["plane"]]],
                   [1] * len(r["plane"]), size=7.5)
        if r.get("air"):
            _table(pdf, ("Organism (air)", "eACH [1/h]", "90 %", "99.9 %"),
                   [(a["organism"] + (" (bound)" if a["bound"] else ""), a["each"], a["t90"], a["t999"])
                    for a in r["air"]], (40, 20, 20, 20), size=7.5)
        o = r["occupant"]
        _box(pdf, None, f"UV-C {o['uvc']}, {o.get('symbol', 'E_S')} {o['e_s']}; 8-hour actinic limit reached in {o['t_limit']}"
             + (" — exceeds the 8-hour limit" if o["exceeds"] else "")
             + (f". {o['fov']}" if o.get("fov") else "") + f" {o['limit']}. {o['note']}",
             (255, 249, 232) if o["exceeds"] else (255, 255, 255), (192, 138, 0), size=8,
             bold_lead=f"Occupant at eye height {o['eye_height']}:")
        if figs.get("room"):
            _figure(pdf, figs["room"])
        for n in r.get("notes") or []:
            _para(pdf, f"•  {n}", size=7.5, color=MUTED)
    if v.get("plausibility"):
        _heading(pdf, "Checks on the stated data")
        _table(pdf, ("What was checked", "Result", "Why"),
               [(f["subject"] or "", f["status_text"], f"{f['message']} ({f['basis']})") for f in v["plausibility"]],
               (30, 14, 56), verdict_col=1, verdicts=[f["status"] for f in v["plausibility"]], size=7.5)
    _heading(pdf, "What could not be assessed")
    if v["not_assessed"]:
        for n in v["not_assessed"]:
            _para(pdf, f"•  {n['what']}: {n['why']}", size=8.3)
    else:
        _para(pdf, "Everything this check covers could be assessed from the data.", size=8.5)
    _heading(pdf, "Cautions")
    for c in v["cautions"]:
        _lead_para(pdf, f"•  {c['title']}.", c["text"], 8.5, pdf.l_margin, BODY_W_MM, 4.0)
        _para(pdf, f"    Shown because {c['reason']}.", size=7, style="I", color=MUTED)
        pdf.ln(0.8)
    pdf.ln(1)
    _box(pdf, "What this check does not cover", v["does_not_cover"] + " " + v["local_codes"],
         (238, 242, 247), (47, 79, 127), size=8.5)
    _heading(pdf, "Method and provenance")
    pv = v["provenance"]
    facts = list(pv["inputs"]) + [{"label": "Tool", "value": pv["tool"] + (f" (result schema {pv['schema']})" if pv.get("schema") else "")},
                                  {"label": "Date of this note", "value": pv["date"]}]
    _facts(pdf, facts, size=7.5)
    if pv.get("references"):
        _subheading(pdf, "Reference tables used")
        _table(pdf, ("Table", "Source and edition", "Digits from"),
               [(f"{x['name']} ({x['id']})" + (f"\ndata/{x['file']}" if x.get("file") else "")
                 + (f"\nsha256 {x['sha256'][:16]}…" if x.get("sha256") else ""),
                 (x.get("source") or "") + (f"\nEdition: {x['edition']}" if x.get("edition") else "")
                 + (f"\nFrom memory: {x['from_memory']}" if x.get("from_memory") and x["from_memory"] != "none" else ""),
                 x.get("digits_from") or "") for x in pv["references"]], (32, 40, 28), size=6.8)
    if pv.get("assumptions"):
        _subheading(pdf, "Assumptions", min_space_mm=20)
        for a in pv["assumptions"]:
            _para(pdf, f"•  {a}", size=7.2)
    if pv.get("warnings"):
        _subheading(pdf, "Warnings from the import", min_space_mm=20)
        for w in pv["warnings"]:
            _para(pdf, f"•  {w}", size=7.2)
    pdf.ln(1)
    _para(pdf, pv["pdf_choice"], size=7, color=MUTED)
    return bytes(pdf.output())


def render_overview_pdf(title: str, items: Sequence[Mapping[str, Any]], *, invented: bool,
                        intro: str, date: str, tool: str) -> bytes:
    """The demo overview as PDF (one row per product)."""
    from uvcheck.report.note import DOES_NOT_COVER, INVENTED_TEXT, LOCAL_CODES, SCREENING_TITLE

    pdf = _new("uvcheck screening overview - not a certification"
               + (" - INVENTED DEMONSTRATION" if invented else ""), title)
    if invented:
        _box(pdf, None, INVENTED_TEXT, (255, 244, 220), (122, 75, 0), size=8.5, dashed=True)
    _para(pdf, f"Overview · {date}", size=8, color=MUTED)
    _para(pdf, title, size=15, style="B", h=7)
    _box(pdf, None, LOCAL_CODES, (238, 242, 247), (47, 79, 127), size=8.5,
         bold_lead=SCREENING_TITLE + ".")
    _para(pdf, intro, size=9)
    pdf.ln(2)
    rows = []
    for it in items:
        verdicts = "\n".join(f"{c['verdict_text']}: “{c['text']}”" for c in it.get("verdicts") or []) \
            or (it.get("claims_summary") or "—")
        rows.append((it["title"], it["finding"], it["risk"], verdicts, Path(it["html"]).name))
    _table(pdf, ("Product", "Finding", "Risk group", "Claims", "Note"), rows, (16, 40, 14, 20, 10),
           size=7.2, bold_col=0)
    from uvcheck.report.cautions import OVERVIEW_CAUTION

    _box(pdf, "Caution", OVERVIEW_CAUTION, (255, 249, 232), (192, 138, 0), size=8.5)
    _box(pdf, "What this check does not cover", DOES_NOT_COVER + " " + LOCAL_CODES,
         (238, 242, 247), (47, 79, 127), size=8.5)
    _para(pdf, tool, size=7, color=MUTED)
    return bytes(pdf.output())
