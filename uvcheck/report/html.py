"""The note as one self-contained HTML file (and the demo's overview page).

A jinja2 Environment with ``autoescape=True`` and ``StrictUndefined``: every string from the
view model (product names, claims, seller notes, file names: text that came from the user) is
escaped, and a name the template expects but the view model lacks is an error rather than an
empty cell. CSS is inlined, figures are inline SVG (our own, from
:mod:`uvcheck.report.figures`) and the assessment dict is embedded as
``<script type="application/json" id="uvcheck-result">`` (jinja's ``tojson`` escapes ``<``,
``>``, ``&`` and ``'``). Nothing is loaded from the network: no scripts, fonts or images
outside the file.
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path
from typing import Any, Mapping, Sequence

TEMPLATES = Path(__file__).resolve().parent / "templates"
FIGURE_IDS = ("spectrum", "hazards", "room")


@lru_cache(maxsize=1)
def environment() -> Any:
    """The jinja2 environment (autoescape on, StrictUndefined), built once."""
    import jinja2

    env = jinja2.Environment(loader=jinja2.FileSystemLoader(str(TEMPLATES)), autoescape=True,
                             undefined=jinja2.StrictUndefined, trim_blocks=True,
                             lstrip_blocks=True, keep_trailing_newline=True)
    env.filters["qty"] = qty
    return env


def qty(text: str) -> Any:
    """'0.42 W/m² (42 µW/cm²)' → the SI part, then the trade part on its own line (escaped).

    Examples
    --------
    >>> str(qty("0.42 W/m² (42 µW/cm²)"))
    '0.42 W/m²<span class="trade">(42 µW/cm²)</span>'
    >>> str(qty("<b>"))
    '&lt;b&gt;'
    """
    from markupsafe import Markup, escape

    text = str(text)
    i = text.find(" (")
    if i > 0 and text.endswith(")") and ("cm²" in text[i:] or "mW" in text[i:]):
        return Markup(f'{escape(text[:i])}<span class="trade">{escape(text[i + 1:])}</span>')
    return escape(text)


@lru_cache(maxsize=1)
def css() -> str:
    return (TEMPLATES / "note.css").read_text(encoding="utf-8")


def _figs(figures: Sequence[Mapping[str, Any]]) -> dict[str, Any]:
    """Figures by id, SVG marked safe (it is our own matplotlib output, not user text)."""
    from markupsafe import Markup

    out: dict[str, Any] = {k: None for k in FIGURE_IDS}
    for f in figures:
        if f.get("svg"):
            out[f["id"]] = {"id": f["id"], "title": f["title"], "caption": f["caption"],
                            "svg": Markup(f["svg"])}
    return out


def render_note_html(view: Mapping[str, Any], result: Mapping[str, Any],
                     figures: Sequence[Mapping[str, Any]] = ()) -> str:
    """The note's HTML from its view model (:func:`uvcheck.report.note.build_note`), the
    assessment dict it was built from (embedded as JSON) and its figures."""
    from markupsafe import Markup

    t = environment().get_template("note.html.j2")
    return t.render(v=view, result=result, figs=_figs(figures), css=Markup(css()))


def render_overview_html(title: str, items: Sequence[Mapping[str, Any]], *, invented: bool,
                         intro: str, date: str, tool: str) -> str:
    """The demo's overview page: one row per note (product, finding, group, verdicts, links).

    items : [{title, finding, risk, claims_summary, verdicts: [{text, verdict, verdict_text}],
              html, pdf}] with ``html`` / ``pdf`` as paths relative to the overview file.
    """
    from markupsafe import Markup

    from uvcheck.report.cautions import OVERVIEW_CAUTION
    from uvcheck.report.note import DOES_NOT_COVER, INVENTED_TEXT, LOCAL_CODES, SCREENING_TITLE

    t = environment().get_template("overview.html.j2")
    return t.render(title=title, items=items, invented=invented, invented_text=INVENTED_TEXT,
                    intro=intro, date=date, tool=tool, screening_title=SCREENING_TITLE,
                    local_codes=LOCAL_CODES, does_not_cover=DOES_NOT_COVER,
                    overview_caution=OVERVIEW_CAUTION, css=Markup(css()))
