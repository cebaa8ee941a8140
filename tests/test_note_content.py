"""What the note's first screen and tables say (issue 6 and 9 audit findings).

Every expected value is taken from the assessment dict the note is built from
(``Assessment.to_dict()``, the single source of truth) or from a synthetic result dict built
in the test; no number here is typed in from a document. Where a spectrum is made up for a
test, its construction is given beside it.
"""

from __future__ import annotations

import html as htmlmod
import re
import shutil
import subprocess
from pathlib import Path

import numpy as np
import pytest

from uvcheck.cli_note import note_result, render_note
from uvcheck.report import cautions, figures, note, pdf
from uvcheck.units import format_duration

ROOT = Path(__file__).resolve().parent.parent
SPECTRA = ROOT / "examples" / "spectra"
LISTINGS = ROOT / "examples" / "listings"
WAND = (SPECTRA / "wand_395nm_led.csv", LISTINGS / "wand_395nm_sold_as_uvc.toml")
TUBE = (SPECTRA / "mercury_tube_254nm.txt", LISTINGS / "mercury_tube_sold_pet_safe.toml")
BOX = LISTINGS / "uvc_box_48_leds_8w.toml"
CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
POPPLER = shutil.which("pdftoppm") and shutil.which("pdftotext")


def text_of(html: str) -> str:
    return htmlmod.unescape(re.sub(r"<[^>]+>", " ", html))


@pytest.fixture(scope="module")
def wand():
    """The demo wand: measured at 10 cm, used at 2 cm (examples/demo/scenario.toml)."""
    result, spec = note_result(*WAND, distance="10 cm", use_distance="2 cm")
    html, _, view = render_note(result, spec, pdf=False, salt="w", date="2026-01-01")
    return {"result": result, "view": view, "html": html}


@pytest.fixture(scope="module")
def tube():
    # as in the demo (examples/demo/scenario.toml), with the kennel room
    room = {"size": "4 x 5 x 2.5 m", "lamp_at": "0.15, 2.5, 2.2 m", "pattern": "cylinder",
            "tube_length": "0.55 m", "axis": "y"}
    result, spec = note_result(*TUBE, distance="1 m", use_distance="2 m", room=room)
    html, data, view = render_note(result, spec, pdf=True, salt="t", date="2026-01-01")
    return {"result": result, "view": view, "html": html, "pdf": data}


def risk_card(html: str) -> str:
    m = re.search(r'<div class="card risk.*?</div>', html, re.S)
    assert m, "the first screen has a risk-group box"
    return text_of(m.group(0))


# ---------------------------------------------------------------------------------------------
# 1. The headline group covers the distance of use
# ---------------------------------------------------------------------------------------------

def test_headline_shows_the_worse_group_at_the_distance_of_use(wand):
    res, v = wand["result"], wand["view"]
    at_use = res["use_distance"]["risk_group"]["group"]
    here = res["risk_group"]["group"]
    rank = {"Exempt": 0, "RG1": 1, "RG2": 2, "RG3": 3}
    assert rank[at_use] > rank[here]  # the wand: worse at its 2 cm distance of use
    rk = v["risk"]
    assert rk["headline"] == at_use and rk["group"] == at_use
    ud = note.distance(res["use_distance"]["evaluation"]["distance_m"])
    assert ud in rk["where"] and "distance of use" in rk["where"]
    # the assessment distance is still shown, with its own group
    assert here in rk["other"]
    assert note.distance(res["evaluation"]["distance_m"]) in rk["other"]
    card = risk_card(wand["html"])
    assert at_use in card and "distance of use" in card and here in card
    # the overview line: the worse group, labelled with its distance
    assert rk["overview"].startswith(f"{at_use} ") and "distance of use" in rk["overview"]


def test_no_meaningless_at_least_wording(wand):
    """'At least Exempt' said nothing; a lower bound now says why the group could be higher."""
    v = wand["view"]
    assert "At least" not in risk_card(wand["html"])
    assert "At least" not in v["risk"]["overview"]
    # the assessment-distance group is a lower bound: its open hazards are named
    opened = wand["result"]["risk_group"]["open_hazards"]
    syms = [wand["result"]["hazards"][k]["symbol"] for k in opened]
    assert all(s in v["risk"]["other"] for s in syms)
    assert "could raise it" in v["risk"]["other"]


def test_lower_bound_from_partial_coverage_says_measured_range():
    """A group that is a lower bound only because bands are partly measured (synthetic)."""
    res = {"input": {"origin": "measured"}, "evaluation": {"distance_m": 0.2},
           "hazards": {"actinic_uv": {"symbol": "E_S", "status": "partial", "risk_group": "Exempt"}},
           "risk_group": {"group": "Exempt", "is_lower_bound": True, "governing": "actinic_uv",
                          "upper_bound": "RG2", "open_hazards": ["actinic_uv"]}}
    rk = note.risk_summary(res)
    assert rk["headline"] == "Exempt" and rk["qualifier"] == "on the measured range"
    assert "the unmeasured range could raise it (up to rg2)" in rk["detail"].lower()
    assert "E_S only partly measured" in rk["detail"]
    # under the headline "Exempt on the measured range" the box does not say it again
    assert "Exempt on the measured range" not in rk["detail"]


def test_worse_group_in_the_overview_of_the_demo(tmp_path):
    from typer.testing import CliRunner

    from test_note import cli

    out = tmp_path / "demo"
    r = CliRunner().invoke(cli(), ["demo", "--out", str(out), "--no-pdf"])
    assert r.exit_code == 0, r.output
    idx = (out / "index.html").read_text(encoding="utf-8")
    row = re.search(r'<tr data-product="wand">.*?</tr>', idx, re.S)
    assert row
    import json

    d = json.loads((out / "wand.json").read_text(encoding="utf-8"))
    cell = text_of(re.search(r'<td class="group">(.*?)</td>', row.group(0), re.S).group(1))
    assert cell.startswith(d["use_distance"]["risk_group"]["group"])
    assert "distance of use" in cell
    # the overview carries a caution of its own, not only the notes it links to
    from uvcheck.report.cautions import OVERVIEW_CAUTION

    assert OVERVIEW_CAUTION in htmlmod.unescape(idx)


# ---------------------------------------------------------------------------------------------
# 2. Borderline and group probabilities on the first screen
# ---------------------------------------------------------------------------------------------

def _line_spectrum(tmp_path: Path, scale: float) -> Path:
    """A 270 nm Gaussian line (σ 1 nm) on a 0.5 nm grid, 200–800 nm, in W/(m²·nm)."""
    wl = np.arange(200.0, 800.0001, 0.5)
    v = scale * np.exp(-0.5 * ((wl - 270.0) / 1.0) ** 2)
    p = tmp_path / f"line_{scale:.6g}.csv"
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:.1f},{b:.8e}" for a, b in zip(wl, v)), encoding="utf-8")
    return p


def test_borderline_result_is_flagged_on_the_first_screen(tmp_path):
    """A line scaled so that E_S is 0.98 × its Exempt limit: with the default 5 % UV
    calibration uncertainty (k = 1, common practice, uvcheck.uncertainty) the 95 % interval
    spans the Exempt/RG1 boundary."""
    r1, _ = note_result(_line_spectrum(tmp_path, 1e-3), None, distance="20 cm")
    h = r1["hazards"]["actinic_uv"]
    scale = 1e-3 * 0.98 * h["limit"] / h["value"]  # E_S is linear in the spectrum
    res, spec = note_result(_line_spectrum(tmp_path, scale), None, distance="20 cm")
    ov = res["uncertainty"]["overall"]
    assert ov["borderline"] and ov["risk_group_range_95"][0] != ov["risk_group_range_95"][1]
    html, _, v = render_note(res, spec, pdf=False, date="2026-01-01")
    card = risk_card(html)
    assert "Borderline" in card and "E_S" in card
    for g, p in ov["risk_group_probability"].items():
        if p >= 0.005:
            assert f"{g} {100 * p:.0f} %" in card


def test_borderline_hazard_that_does_not_set_the_group_is_not_a_borderline_group():
    res = {"evaluation": {"distance_m": 0.2},
           "hazards": {"actinic_uv": {"symbol": "E_S", "status": "complete", "risk_group": "Exempt",
                                      "borderline": True},
                       "blue_light": {"symbol": "E_B", "status": "complete", "risk_group": "RG2",
                                      "t_max_s": 60.0, "name": "Blue light"}},
           "risk_group": {"group": "RG2", "is_lower_bound": False, "governing": "blue_light"},
           "uncertainty": {"status": "evaluated", "overall": {
               "borderline": True, "risk_group_range_95": ["RG2", "RG2"],
               "risk_group_probability": {"Exempt": 0.0, "RG1": 0.0, "RG2": 1.0, "RG3": 0.0}}}}
    rk = note.risk_summary(res)
    assert not rk["borderline"]
    assert "E_S is borderline" in rk["borderline_text"] and "without changing" in rk["borderline_text"]
    assert rk["probability"] == "Probability at 20 cm: RG2 100 %."


# ---------------------------------------------------------------------------------------------
# 3. Intervals in the times table and the use-distance table
# ---------------------------------------------------------------------------------------------

def test_times_table_shows_the_95_percent_intervals(tube):
    res, v = tube["result"], tube["view"]
    u = res["uncertainty"]["germicidal"]["inactivation_most_susceptible"]
    hl = v["germicidal"]["highlight"]
    assert hl
    for o in hl:
        medium = o["label"].split("(")[1].rstrip(")")
        e = u[f"uvc/{medium}"]
        lo, hi = e["time_to_90_interval_95_s"]
        assert o["t90_interval"] == (f"{format_duration(lo)}–{format_duration(hi)}"
                                     .replace(" ", "\u00a0"))
        row = re.search(rf'<tr data-organism="{o["id"]}">.*?</tr>', tube["html"], re.S).group(0)
        assert o["t90_interval"] in htmlmod.unescape(row)
    # the caption names only what the table shows: no study ranges for these rows
    assert not any(o["t90_range"] for o in hl)
    assert "pooled" not in v["germicidal"]["times_caption"]
    assert "95 %" in v["germicidal"]["times_caption"]


def test_times_caption_mentions_study_ranges_only_when_shown():
    rows = [{"t90_range": "1 s–2 s", "t999_range": None, "t90_interval": None, "t999_interval": None}]
    assert "studies pooled" in note.times_caption("1 m", rows)
    rows[0]["t90_range"] = None
    assert "no range across studies" in note.times_caption("1 m", rows)


def test_use_distance_table_shows_intervals_when_the_result_has_them(wand):
    res = {k: v for k, v in wand["result"].items()}
    ud = dict(res["use_distance"])
    hz = {k: dict(h) for k, h in ud["hazards"].items()}
    e = hz["actinic_uv"]
    e["interval_95"] = [0.9 * e["value"], 1.1 * e["value"]]
    e["t_max_interval_95_s"] = [0.9 * e["t_max_s"], 1.1 * e["t_max_s"]]
    ud["hazards"] = hz
    res["use_distance"] = ud
    rows = {r["symbol"]: r for r in note.risk_summary(res)["use_distance"]["rows"]}
    assert rows["E_S"]["interval"].startswith("95 %: ")
    assert format_duration(0.9 * e["t_max_s"]).replace(" ", "\u00a0") in rows["E_S"]["t_max_interval"]
    # and without them, none is invented
    plain = {r["symbol"]: r for r in note.risk_summary(wand["result"])["use_distance"]["rows"]}
    assert plain["E_S"]["interval"] is None


def test_hazard_table_shows_the_time_interval(tube):
    h = tube["result"]["hazards"]["actinic_uv"]
    lo, hi = h["t_max_interval_95_s"]
    row = [r for r in tube["view"]["hazards"] if r["id"] == "actinic_uv"][0]
    assert format_duration(lo).replace(" ", "\u00a0") in row["t_max_interval"]
    assert format_duration(hi).replace(" ", "\u00a0") in row["t_max_interval"]


# ---------------------------------------------------------------------------------------------
# 4. A listing alone is an estimate, everywhere
# ---------------------------------------------------------------------------------------------

def test_listing_only_note_never_calls_the_estimate_measured():
    res, spec = note_result(None, BOX)
    assert res["input"]["origin"] == "nominal"
    html, _, v = render_note(res, spec, pdf=False, date="2026-01-01")
    assert v["finding"].startswith("ESTIMATE")
    assert "measured output" not in v["finding"] and "estimated output" in v["finding"]
    assert all("measured" not in b["status"] for b in v["bands"] or [])
    assert "measured output" not in (v["germicidal"]["statement"] or "")
    assert "estimate" in risk_card(html).lower()
    assert "estimated" in v["risk"]["overview"].lower()


# ---------------------------------------------------------------------------------------------
# 5. A relative spectrum: the box gives the reason; partial coverage is a lower bound
# ---------------------------------------------------------------------------------------------

def _relative_spectrum(tmp_path: Path) -> Path:
    """A 395 nm LED shape (Gaussian, σ 6 nm) on 250–1000 nm with no unit: a relative spectrum
    whose UV-C band (200–280 nm) is only partly covered."""
    wl = np.arange(250.0, 1000.0001, 1.0)
    v = np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2)
    p = tmp_path / "relative.csv"
    p.write_text("wavelength,value\n" + "\n".join(f"{a:.1f},{b:.6e}" for a, b in zip(wl, v)),
                 encoding="utf-8")
    return p


def test_relative_spectrum_box_says_why_and_how_to_scale(tmp_path):
    res, spec = note_result(_relative_spectrum(tmp_path), None)
    assert res["input"]["quantity"] == "relative"
    html, _, v = render_note(res, spec, pdf=False, date="2026-01-01")
    card = risk_card(html)
    assert "Not assessable" in card and "relative" in card and "--scale-band" in card
    assert "—." not in card
    # the UV-C band is only partly covered: no exponent percent, worded as partly measured
    uvc = res["germicidal"]["uvc"]
    assert 0 < uvc["coverage"] < 1
    assert f"only partly measured ({note.percent(uvc['coverage'])} of the band)" in v["finding"]
    assert not re.search(r"\de-\d+ %", v["finding"])
    assert v["key_caution"]["id"] == "unscaled"


# ---------------------------------------------------------------------------------------------
# 6. Cautions fit the lamp; the key caution follows the hazard that sets the group
# ---------------------------------------------------------------------------------------------

def _uva_lamp(group: str = "RG2") -> dict:
    """No UV-C; a UV-A hazard above Exempt (synthetic)."""
    return {"germicidal": {"status": "no-uvc"}, "spectral": {"peak_nm": 392.0},
            "evaluation": {"distance_m": 0.2},
            "hazards": {"actinic_uv": {"risk_group": "Exempt", "status": "complete"},
                        "near_uv": {"risk_group": group, "status": "complete", "t_max_s": 120.0},
                        "blue_light": {"risk_group": "Exempt", "status": "complete"}},
            "risk_group": {"group": group, "is_lower_bound": False, "governing": "near_uv"}}


def test_no_uvc_cautions_for_a_lamp_without_uvc():
    ids = [c["id"] for c in cautions.applicable(_uva_lamp(), {"band_name": "UV-C", "claims": []})]
    assert "invisible-hazard" not in ids and "no-people-pets" not in ids
    assert "uva-eyes" in ids


def test_key_caution_follows_the_governing_hazard():
    d = _uva_lamp()
    kc = note.key_caution(d, cautions.applicable(d))
    assert kc["id"] == "uva-eyes" and format_duration(120.0) in kc["text"]
    white = {"germicidal": {"status": "not-assessed"}, "spectral": {"peak_nm": 450.0},
             "evaluation": {"distance_m": 0.5},
             "hazards": {"blue_light": {"risk_group": "RG2", "status": "complete", "t_max_s": 64.0}},
             "risk_group": {"group": "RG2", "is_lower_bound": True, "governing": "blue_light",
                            "open_hazards": []}}
    cs = cautions.applicable(white)
    assert "violet-glow" not in [c["id"] for c in cs]  # a white lamp, not sold as UV-C
    kc = note.key_caution(white, cs)
    assert kc["id"] == "blue-light" and format_duration(64.0) in kc["text"]


def test_wand_key_caution_is_the_hazard_at_its_distance_of_use(wand):
    res, v = wand["result"], wand["view"]
    kc = v["key_caution"]
    assert kc["id"] == "uva-eyes"
    ud = res["use_distance"]
    t = min(ud["hazards"][h]["t_max_s"] for h in ("actinic_uv", "near_uv")
            if ud["hazards"][h].get("t_max_s") is not None)
    assert format_duration(t) in kc["text"] and "distance of use" in kc["text"]
    ids = [c["id"] for c in v["cautions"]]
    assert "invisible-hazard" not in ids and "violet-glow" in ids


# ---------------------------------------------------------------------------------------------
# 7. Layout: no word breaks in table headings, RG labels clear of the bars, print gaps
# ---------------------------------------------------------------------------------------------

def test_table_columns_fit_every_heading_word():
    doc = pdf._new("footer", "title")
    heads = ("", "Organism", "Medium", "Data at", "Lamp, equivalent", "90 %", "99.9 %", "Reliability")
    w = pdf._fit_widths(doc, heads, [("a",) * 8], (16, 18, 10, 8, 18, 11, 11, 9), 7.2, 1.2)
    assert sum(w) == pytest.approx(pdf.BODY_W_MM)
    doc.set_font("DejaVu", "B", 7.2)
    for h, width in zip(heads, w):
        for word in h.split():
            assert pdf._wrap(doc, word, width - 2.4) == [word]


def test_pdf_text_has_whole_headings(tube):
    if not POPPLER:
        pytest.skip("poppler-utils is not installed")
    import tempfile

    with tempfile.TemporaryDirectory() as d:
        p = Path(d) / "n.pdf"
        p.write_bytes(tube["pdf"])
        text = subprocess.run(["pdftotext", "-layout", str(p), "-"], capture_output=True,
                              text=True, check=True).stdout
    assert "Reliability" in text and "Reliabilit\n" not in text
    assert not re.search(r"\n\s*y\s*\n", text)


def test_rg_labels_do_not_overlap_the_bars(tube):
    fig = figures.hazard_figure(tube["result"])
    try:
        fig.canvas.draw()
        r = fig.canvas.get_renderer()
        ax = fig.axes[0]
        bars = [p.get_window_extent(r) for p in ax.patches]
        labels = [t.get_window_extent(r) for t in ax.texts if t.get_text() in ("RG1", "RG2")]
        assert labels and bars
        for lb in labels:
            for b in bars:
                overlap_h = min(lb.y1, b.y1) - max(lb.y0, b.y0)
                overlap_w = min(lb.x1, b.x1) - max(lb.x0, b.x0)
                assert overlap_h <= 0.5 or overlap_w <= 0.5, (lb, b)
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)


@pytest.mark.skipif(not (CHROMIUM and POPPLER), reason="chromium or poppler-utils missing")
def test_printed_html_leaves_no_half_page_blank(tube, tmp_path):
    """Chromium's print of the note: every page but the last is more than 60 % full (a page
    that ends early because a figure did not fit leaves the rest blank)."""
    from PIL import Image

    html = tmp_path / "n.html"
    html.write_text(tube["html"], encoding="utf-8")
    out = tmp_path / "n.pdf"
    subprocess.run([CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu",
                    f"--user-data-dir={tmp_path / 'profile'}", "--no-pdf-header-footer",
                    f"--print-to-pdf={out}", html.as_uri()], capture_output=True, timeout=120)
    assert out.exists()
    subprocess.run(["pdftoppm", "-r", "30", "-png", str(out), str(tmp_path / "p")], check=True)
    pages = sorted(tmp_path.glob("p-*.png"))
    assert len(pages) > 2
    for f in pages[:-1]:
        a = np.asarray(Image.open(f).convert("L"))
        body = a[: int(0.93 * a.shape[0])]  # above the page footer
        ink = np.where((body < 200).sum(axis=1) > 0)[0]
        assert ink.max() / a.shape[0] > 0.6, f.name


# ---------------------------------------------------------------------------------------------
# 8. Speed: figures drawn once, PDF text set without fpdf2's per-character line breaking
# ---------------------------------------------------------------------------------------------

def test_each_figure_is_built_once_for_both_formats(tube, monkeypatch):
    calls = []
    for name in ("spectrum_figure", "hazard_figure", "room_figure"):
        orig = getattr(figures, name)
        monkeypatch.setattr(figures, name, lambda *a, _o=orig, _n=name, **k: (calls.append(_n), _o(*a, **k))[1])
    res, spec = note_result(*TUBE, distance="1 m")
    out = figures.render(res, spec, svg=True, png=True)
    assert sorted(calls) == sorted({"spectrum": "spectrum_figure", "hazards": "hazard_figure"}[f["id"]]
                                   for f in out)
    assert all(f["svg"] and f["png"] for f in out)


def test_pdf_does_not_use_fpdf_line_breaking(tube, monkeypatch):
    """fpdf2's multi_cell/table re-measure the line for every character; the note's PDF sets
    its own wrapped lines (the PDF render time halved in the audit's profile)."""
    from fpdf import FPDF

    def boom(*a, **k):
        raise AssertionError("slow fpdf2 text layout used")

    monkeypatch.setattr(FPDF, "multi_cell", boom)
    monkeypatch.setattr(FPDF, "table", boom)
    data = pdf.render_note_pdf(tube["view"], [])
    assert data.startswith(b"%PDF")


def test_box_names_a_shorter_time_limit_than_the_governing_hazards(wand):
    """At the wand's distance of use E_S sets RG3, but another hazard reaches its limit sooner;
    the first screen gives that shortest time too (both from result['use_distance'])."""
    ud = wand["result"]["use_distance"]
    gid = ud["risk_group"]["governing"]
    t, k = min((h["t_max_s"], hid) for hid, h in ud["hazards"].items() if h.get("t_max_s") is not None)
    assert k != gid and t < ud["hazards"][gid]["t_max_s"]
    detail = wand["view"]["risk"]["detail"]
    assert format_duration(ud["hazards"][gid]["t_max_s"]) in detail
    assert f"shortest time to a limit is {format_duration(t)}" in detail


def test_band_below_detection_without_a_limit_is_not_a_broken_cell(tmp_path):
    res, _ = note_result(_relative_spectrum(tmp_path), None)
    vals = [r["value"] for r in note.band_rows(res)]
    assert not any(v.startswith("< —") for v in vals)


def test_interval_of_a_lower_bound_is_a_bound_not_a_range():
    h = {"status": "partial", "value": 1.40, "unit": "W m-2", "interval_95": [1.32, 1.47]}
    assert note._interval_text(h) == "95 %: ≥ 1.32 W/m²"
    h["status"] = "complete"
    assert note._interval_text(h) == "95 %: 1.32–1.47 W/m²"


def test_note_and_terminal_word_estimate_statuses_alike():
    # one question "is this an estimate" (report.terminal.is_estimate) and one set of words
    # for statuses: the note's band table says what the terminal says, for a measurement and
    # for a listing screened without one (the bundled invented example listing)
    from uvcheck.report.note import band_rows
    from uvcheck.report.terminal import is_estimate, status_text

    measured, _ = note_result(*WAND, distance="10 cm")
    nominal, _ = note_result(None, WAND[1])
    assert not is_estimate(measured) and is_estimate(nominal)
    for result in (measured, nominal):
        shown = [r["status"] for r in band_rows(result)]
        words = [status_text(b["status"], result, bool(b.get("below_detection")))
                 for b in result["bands"].values()]
        assert sorted(shown) == sorted(words)
    assert all("measured" not in w for w in (r["status"] for r in band_rows(nominal)))


def test_a_spectrum_file_that_says_it_is_invented_gets_the_banner(tmp_path):
    """The bundled example spectra open with '# INVENTED DEMO DATA …': their notes must carry
    the invented-demonstration banner with or without a listing (a note of a real file must
    not)."""
    from uvcheck.cli_note import note_result
    from uvcheck.report.note import build_note

    ex = Path(__file__).resolve().parents[1] / "examples" / "spectra" / "mercury_tube_254nm.txt"
    res, _ = note_result(ex, None)
    assert res["input"]["invented"] is True and build_note(res)["invented"] is True
    plain = tmp_path / "plain.csv"
    wl = np.arange(200.0, 801.0)
    plain.write_text("wavelength (nm),irradiance (W/m2/nm)\n"
                     + "".join(f"{a},{1e-3 * np.exp(-0.5 * ((a - 450) / 10) ** 2) + 1e-7:.6e}\n"
                               for a in wl), encoding="utf-8")
    res, _ = note_result(plain, None)
    assert res["input"]["invented"] is False and build_note(res)["invented"] is False


def test_note_names_action_spectra_and_patterns_in_words(tube):
    # readers see names, not internal ids (our own wording rule); the ids stay as data
    # attributes for tools that read the HTML
    text = text_of(tube["html"].split("<h2", 1)[1])
    table = text_of(re.search(r'<table class="spectra">.*?</table>', tube["html"], re.S).group(0))
    assert "DNA nucleobase absorption" in table and "germicidal_dna" not in table
    assert "uvc_unweighted" not in table and "Unweighted UV-C" in table
    assert 'data-action-spectrum="germicidal_dna"' in tube["html"]
    assert "cylinder (a bare tube)" in text
    assert "alpha_min" not in text


@pytest.mark.skipif(not POPPLER, reason="poppler (pdftotext) not installed")
def test_pdf_table_heading_is_never_left_alone_at_a_page_foot(tmp_path):
    # our own layout rule: a table's heading goes to the page where its first row fits
    pdf_doc = pdf._new("footer", "t")
    pdf_doc.set_y(pdf_doc.h - pdf_doc.b_margin - 12)  # room for the heading, not for the row
    tall = "\n".join(f"line {k} of a long basis" for k in range(12))
    pdf._table(pdf_doc, ("Claim as sold", "Basis"), [("a claim", tall)], (30, 70))
    out = tmp_path / "t.pdf"
    out.write_bytes(bytes(pdf_doc.output()))
    pages = [subprocess.run(["pdftotext", "-f", str(k), "-l", str(k), str(out), "-"],
                            capture_output=True, text=True, check=True).stdout for k in (1, 2)]
    assert "Claim as sold" not in pages[0]
    assert "Claim as sold" in pages[1] and "line 11 of a long basis" in pages[1]


def test_note_writes_units_in_one_style(wand, tube):
    # the science modules write SI ids ("W m-2 nm-1") inside sentences; the note shows them
    # as it shows every other unit (W/(m²·nm), W/m²), in the HTML text and the PDF view
    for case in (wand, tube):
        html_text = text_of(re.sub(r"<script.*?</script>", "", case["html"], flags=re.S))
        assert not re.search(r"W m-2|J m-2|nm-1", html_text)
    assert note.units_in_words("E_S 1.2 W m-2 sr-1 nm-1 and 3 J m-2") == \
        "E_S 1.2 W/(m²·sr·nm) and 3 J/m²"


def test_note_spells_out_cjk_unit_characters_its_fonts_lack(tmp_path):
    # the JSON keeps the seller's characters; the note, whose fonts lack U+33A1 (SQUARE M
    # SQUARED, by its Unicode name), shows 'm²'
    from uvcheck.io.listing import parse_listing
    from uvcheck.screening import screen_listing_file

    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "box (invented)"\n'
                        'invented = true\n[[claims]]\ntext = "for rooms up to 30㎡"\n', "b.toml")
    result = screen_listing_file(lst).to_dict()
    assert result["claims"][0]["text"] == "for rooms up to 30㎡"
    view = note.build_note(result, date="2026-01-01", references=[])
    assert view["claims"][0]["text"].endswith("30m²") and "㎡" not in str(view)


def test_no_weighting_runs_off_the_top_of_the_spectrum_figure(tmp_path):
    # the germicidal proxy exceeds 1 below 240 nm (DNA absorption rises there): the weighting
    # axis of the linear plot must reach the highest weighting drawn, so no curve is clipped
    res, spec = note_result(*TUBE, distance="1 m")
    fig = figures.spectrum_figure(spec, res)
    try:
        tw0 = fig.axes[2]   # the first twin axis (linear plot's weightings)
        top = max(float(np.nanmax(ln.get_ydata())) for ln in tw0.get_lines())
        assert top > 1.0                      # the proxy is drawn above 1 in this range
        assert tw0.get_ylim()[1] >= top
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)
