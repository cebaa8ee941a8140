"""The consumer-safety note (issue 6): one source of truth, escaping, cautions, CLI wiring.

The expected values here are not typed-in numbers: each note is checked against the
assessment dict it was built from (``Assessment.to_dict()``, the same JSON as
``uvcheck assess --json``), or against an analytic construction named beside the test.
Rendering in a browser and in poppler is tested in tests/test_note_render.py.
"""

from __future__ import annotations

import html as htmlmod
import json
import re
import subprocess
import sys
from pathlib import Path

import pytest
import typer
from typer.testing import CliRunner

from uvcheck.cli import app as main_app
from uvcheck.cli import guarded
from uvcheck.cli_note import demo_command, note_command, note_result, render_note, write_note
from uvcheck.report import cautions, figures, note
from uvcheck.report.jsonout import clean

ROOT = Path(__file__).resolve().parent.parent
SPECTRA = ROOT / "examples" / "spectra"
LISTINGS = ROOT / "examples" / "listings"
PAIRS = {
    "wand": (SPECTRA / "wand_395nm_led.csv", LISTINGS / "wand_395nm_sold_as_uvc.toml"),
    "tube": (SPECTRA / "mercury_tube_254nm.txt", LISTINGS / "mercury_tube_sold_pet_safe.toml"),
    "faruv": (SPECTRA / "faruv_222nm_unit.csv", LISTINGS / "faruv_222nm_ceiling_unit.toml"),
}
runner = CliRunner()


def cli() -> typer.Typer:
    """The two commands as the lead registers them in cli.py (guarded: errors → exit 2)."""
    app = typer.Typer(add_completion=False, pretty_exceptions_enable=False)
    app.command("note")(guarded(note_command))
    app.command("demo")(guarded(demo_command))
    return app


@pytest.fixture(scope="module")
def notes():
    """result dict, spectrum, HTML (no PDF here) and view for the three example products."""
    out = {}
    for k, (spec, lst) in PAIRS.items():
        result, spectrum = note_result(spec, lst)
        text, _, view = render_note(result, spectrum, pdf=False, salt=k, date="2026-01-01")
        out[k] = {"result": result, "spectrum": spectrum, "html": text, "view": view}
    return out


def embedded_json(text: str) -> dict:
    m = re.search(r'<script type="application/json" id="uvcheck-result">(.*?)</script>', text, re.S)
    assert m, "the note embeds its result"
    return json.loads(m.group(1))


# ---------------------------------------------------------------------------------------------
# One source of truth
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("key", list(PAIRS))
def test_embedded_result_is_the_assess_json(notes, key, tmp_path):
    """The note's embedded JSON is the same JSON `uvcheck assess --claims --json` writes."""
    spec, lst = PAIRS[key]
    out = tmp_path / "r.json"
    r = runner.invoke(main_app, ["assess", str(spec), "--claims", str(lst), "--json", str(out),
                                 "--quiet"])
    assert r.exit_code == 0, r.output
    from_cli = json.loads(out.read_text(encoding="utf-8"))
    embedded = embedded_json(notes[key]["html"])
    for k in ("hazards", "risk_group", "claims", "germicidal", "bands", "evaluation"):
        assert embedded[k] == from_cli[k], k


@pytest.mark.parametrize("key", list(PAIRS))
def test_claims_table_shows_the_result_verdicts(notes, key):
    res, text = notes[key]["result"], notes[key]["html"]
    claims = res["claims"]
    assert claims, "the example listings have claims"
    shown = re.findall(r'data-claim-id="([^"]+)" data-verdict="([^"]+)"', text)
    assert shown == [(c["id"], c["verdict"]) for c in claims]
    from markupsafe import escape

    for c in claims:
        assert str(escape(c["text"])) in text
        assert note.VERDICT_TEXT[c["verdict"]] in text


@pytest.mark.parametrize("key", list(PAIRS))
def test_hazard_table_shows_the_result_numbers(notes, key):
    res, text = notes[key]["result"], notes[key]["html"]
    for hid, h in res["hazards"].items():
        row = re.search(rf'<tr data-hazard="{hid}".*?</tr>', text, re.S)
        assert row, hid
        cells = htmlmod.unescape(re.sub(r"<[^>]+>", " ", row.group(0)))
        if h["status"] == "not-assessable":
            assert "not assessable" in cells
        elif h["value"] is not None and h["status"] in ("complete", "partial") and (
                h["detection_limit"] is None or h["value"] >= h["detection_limit"]):
            si = note.quantity(h["value"], h["unit"]).split(" (")[0]
            assert si in cells, (hid, si)
        if h["risk_group"]:
            assert h["risk_group"] in cells


def test_figures_come_from_the_same_result(notes):
    """The hazard figure plots value / limit from the dict: check the points it draws."""
    res = notes["tube"]["result"]
    pts = {p["id"]: p for p in figures.hazard_points(res)}
    h = res["hazards"]["actinic_uv"]
    assert pts["actinic_uv"]["ratio"] == pytest.approx(h["value"] / h["limit"], rel=1e-12)
    assert pts["retinal_thermal"]["kind"] == "none"  # not assessable: no bar
    text = notes["tube"]["html"]
    assert 'data-figure="spectrum"' in text and 'data-figure="hazards"' in text
    # the ratio label is text inside the inline SVG (svg.fonttype none keeps text as text)
    from uvcheck.units import sig
    assert f"{sig(h['value'] / h['limit'])}×" in text


def test_room_map_only_with_a_grid(notes):
    """No grid in the room dict → no map; a grid (analytic: a 1/r² bowl) → a map."""
    res = dict(notes["tube"]["result"])
    assert figures.room_grid(res) is None
    xs = [i * 0.5 for i in range(9)]
    ys = [j * 0.5 for j in range(11)]
    grid = [[1.0 / ((x - 2.0) ** 2 + (y - 2.5) ** 2 + 1.0) for y in ys] for x in xs]
    res["room"] = {"dimensions_m": {"width": 4, "length": 5, "height": 2.5}, "volume_m3": 50.0,
                   "reflectance": 0.05, "lamp": {"position_m": [2.0, 2.5, 2.2], "pattern": "isotropic"},
                   "plane": {"height_m": 0.75, "grid": {"x_m": xs, "y_m": ys, "values_W_m2": grid}},
                   "air": [], "occupant": {}, "notes": []}
    figs = figures.render(res, None, svg=True, png=False)
    assert [f["id"] for f in figs] == ["hazards", "room"]


# ---------------------------------------------------------------------------------------------
# Content: finding, cautions, absent sections
# ---------------------------------------------------------------------------------------------

def test_finding_for_the_violet_wand(notes):
    v = notes["wand"]["view"]
    peak = notes["wand"]["result"]["spectral"]["peak_nm"]
    assert v["finding"].startswith("This lamp emits essentially no germicidal UV-C.")
    assert f"peaking at {peak:.4g} nm" in v["finding"]
    assert "violet" in v["finding"]
    # at the listing's distance of use (2 cm) UV-A sets RG3: the key caution follows that
    # hazard; the violet-glow caution stays in the list (test_only_applicable_cautions)
    assert notes["wand"]["result"]["conditions"]["use_distance_m"] == pytest.approx(0.02)
    assert v["key_caution"]["title"] == "Strong UV-A and violet light can harm the eyes and skin"


def test_finding_for_the_mercury_tube_names_its_limit_time(notes):
    v, res = notes["tube"]["view"], notes["tube"]["result"]
    from uvcheck.units import format_duration
    assert "germicidal UV-C" in v["finding"] and "RG3" in v["finding"]
    assert format_duration(res["hazards"]["actinic_uv"]["t_max_s"]) in v["finding"]
    assert format_duration(res["hazards"]["actinic_uv"]["t_max_s"]) in v["key_caution"]["text"]


@pytest.mark.parametrize("key,must,must_not", [
    ("wand", {"violet-glow", "claims-suspicion"}, {"mercury", "far-uvc", "materials"}),
    ("tube", {"invisible-hazard", "no-people-pets", "mercury", "ozone", "materials"}, {"violet-glow", "far-uvc"}),
    ("faruv", {"invisible-hazard", "far-uvc", "ozone"}, {"violet-glow", "mercury"}),
])
def test_only_applicable_cautions(notes, key, must, must_not):
    ids = {c["id"] for c in notes[key]["view"]["cautions"]}
    assert must <= ids
    assert not (must_not & ids)
    text = notes[key]["html"]
    assert 'data-caution="does-not-cover"' in text  # always
    assert cautions.LOCAL_CODES in text
    assert "not a certification" in text


def test_caution_conditions_on_synthetic_results():
    # ozone: measured output below 240 nm and nothing else
    assert [c["id"] for c in cautions.applicable({"germicidal": {"status": "no-uvc",
                                                                "ozone": {"status": "present"}}})] \
        == ["violet-glow", "ozone"]
    # an empty result shows no caution; the note still carries the does-not-cover block
    assert cautions.applicable({}) == []
    v = note.build_note({}, date="2026-01-01", references=[])
    assert v["key_caution"]["text"] == cautions.DOES_NOT_COVER
    assert v["does_not_cover"] == cautions.DOES_NOT_COVER


def test_absent_sections_are_absent(notes):
    res = {k: v for k, v in notes["wand"]["result"].items()
           if k not in ("germicidal", "claims", "listing", "plausibility", "claims_summary")}
    text, _, view = render_note(res, notes["wand"]["spectrum"], pdf=False, date="2026-01-01")
    assert view["germicidal"] is None and view["claims"] is None and view["room"] is None
    assert 'id="germicidal"' not in text and 'id="room"' not in text and 'id="claims"' not in text
    whats = [n["what"] for n in view["not_assessed"]]
    assert "Germicidal output" in whats and "Room figures" in whats


def test_not_assessed_lists_the_open_hazards(notes):
    res, view = notes["wand"]["result"], notes["wand"]["view"]
    open_na = [h for h in res["hazards"].values() if h["status"] == "not-assessable"]
    assert open_na
    whats = " ".join(n["what"] for n in view["not_assessed"])
    for h in open_na:
        assert h["symbol"] in whats


def test_provenance_names_inputs_and_tables(notes):
    res, text = notes["tube"]["result"], notes["tube"]["html"]
    assert res["input"]["sha256"] in text
    assert res["listing"]["sha256"] in text
    assert res["limit_set"]["edition"] in htmlmod.unescape(text)
    for wid in ("S_actinic", "B_blue", "germicidal_dna"):
        assert f"· {wid}" in text
    assert "2026-01-01" in text
    assert "fpdf2" in text  # the PDF library choice is justified in the note


def test_demo_notes_say_invented(notes):
    for k in PAIRS:
        assert notes[k]["view"]["invented"]  # the example listings declare invented = true
        assert note.INVENTED_TEXT in notes[k]["html"]


# ---------------------------------------------------------------------------------------------
# Safety of user text and of the page
# ---------------------------------------------------------------------------------------------

HOSTILE_NAME = '<script>alert("x")</script> Lamp & Co'
HOSTILE_CLAIM = '<img src=x onerror=alert(1)> **kills** 99.9 % </td>'


def hostile_listing(tmp_path: Path) -> Path:
    p = tmp_path / "hostile.toml"
    p.write_text(f'''format = "uvcheck-listing/1"
[product]
name = {json.dumps(HOSTILE_NAME)}
seller_note = "<b>bold</b>"
[lamp]
peak_wavelength = "254 nm"
[[claims]]
text = {json.dumps(HOSTILE_CLAIM)}
''', encoding="utf-8")
    return p


def test_user_text_is_escaped(tmp_path):
    result, spec = note_result(PAIRS["tube"][0], hostile_listing(tmp_path))
    text, _, _ = render_note(result, spec, pdf=False, date="2026-01-01")
    assert "<script>alert" not in text and "<img src=x" not in text and "<b>bold</b>" not in text
    from markupsafe import escape  # the escaping jinja's autoescape applies

    assert str(escape(HOSTILE_NAME)) in text
    assert str(escape(HOSTILE_CLAIM)) in text
    # the embedded JSON cannot close its script element
    body = text.split('id="uvcheck-result">', 1)[1]
    assert body.count("</script>") == 1
    assert embedded_json(text)["listing"]["name"] == HOSTILE_NAME


def test_html_loads_nothing_from_the_network(notes):
    for k in PAIRS:
        text = notes[k]["html"]
        assert not re.search(r'(?:src|href)\s*=\s*["\']?(?:https?:)?//', text, re.I), k
        assert not re.search(r"url\(\s*['\"]?(?:https?:)?//", text, re.I), k
        assert "@import" not in text
        assert "<script src" not in text and "<link" not in text


# ---------------------------------------------------------------------------------------------
# Commands
# ---------------------------------------------------------------------------------------------

def test_note_command_writes_html_and_pdf_and_never_overwrites(tmp_path):
    out = tmp_path / "n.html"
    args = ["note", str(PAIRS["faruv"][0]), "--listing", str(PAIRS["faruv"][1]), "--out", str(out)]
    r = runner.invoke(cli(), args)
    assert r.exit_code == 0, r.output
    assert out.exists() and out.with_suffix(".pdf").read_bytes().startswith(b"%PDF-")
    before = out.read_bytes()
    r = runner.invoke(cli(), args)
    assert r.exit_code == 2 and "exists" in r.output and "--force" in r.output
    assert out.read_bytes() == before
    r = runner.invoke(cli(), args + ["--force", "--no-pdf"])
    assert r.exit_code == 0, r.output


def test_note_needs_a_spectrum_or_a_listing(tmp_path):
    r = runner.invoke(cli(), ["note", "--out", str(tmp_path / "x.html")])
    assert r.exit_code == 2 and "spectrum file, a --listing file, or both" in r.output


def test_note_out_must_be_html(tmp_path):
    r = runner.invoke(cli(), ["note", str(PAIRS["wand"][0]), "--out", str(tmp_path / "x.pdf")])
    assert r.exit_code == 2 and ".html" in r.output


def test_listing_only_note_is_an_estimate(tmp_path):
    out = tmp_path / "listing.html"
    r = runner.invoke(cli(), ["note", "--listing", str(LISTINGS / "uvc_box_48_leds_8w.toml"),
                              "--out", str(out), "--no-pdf"])
    assert r.exit_code == 0, r.output
    text = out.read_text(encoding="utf-8")
    assert "ESTIMATE" in text
    d = embedded_json(text)
    assert d["input"]["origin"] == "nominal" and d["claims"]


def test_demo_writes_every_note_and_the_overview(tmp_path):
    out = tmp_path / "demo"
    r = runner.invoke(cli(), ["demo", "--out", str(out), "--no-pdf"])
    assert r.exit_code == 0, r.output
    assert "INVENTED" in r.output
    names = sorted(p.name for p in out.iterdir())
    assert names == sorted(["index.html", "wand.html", "wand.json", "mercury-tube.html",
                            "mercury-tube.json", "far-uv-unit.html", "far-uv-unit.json"])
    index = (out / "index.html").read_text(encoding="utf-8")
    assert note.INVENTED_TEXT in index
    for pid in ("wand", "mercury-tube", "far-uv-unit"):
        d = json.loads((out / f"{pid}.json").read_text(encoding="utf-8"))
        page = (out / f"{pid}.html").read_text(encoding="utf-8")
        assert embedded_json(page) == d  # the note embeds exactly the JSON written beside it
        assert f'href="{pid}.html"' in index
    r = runner.invoke(cli(), ["demo", "--out", str(out), "--no-pdf"])
    assert r.exit_code == 2 and "--force" in r.output


def test_demo_room_section_for_the_fixed_lamps(tmp_path):
    from uvcheck.cli_note import load_scenario

    sc = {p["id"]: p for p in load_scenario()["products"]}
    assert "room" not in sc["wand"]  # handheld: no room
    assert sc["mercury-tube"]["room"]["pattern"] == "cylinder"


def test_note_module_keeps_help_fast():
    """Importing the command module loads no numpy, matplotlib, jinja2 or fpdf (DESIGN.md)."""
    code = ("import sys, uvcheck.cli_note; "
            "print(sorted(m for m in ('numpy', 'matplotlib', 'jinja2', 'fpdf', 'scipy') "
            "if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


def test_write_note_refuses_before_rendering(tmp_path, notes):
    out = tmp_path / "x.html"
    out.write_text("keep", encoding="utf-8")
    from uvcheck.errors import OutputExistsError
    with pytest.raises(OutputExistsError, match="exists"):
        write_note(notes["wand"]["result"], notes["wand"]["spectrum"], out, pdf=False)
    assert out.read_text(encoding="utf-8") == "keep"


def test_result_is_strict_json(notes):
    for k in PAIRS:
        res = notes[k]["result"]
        assert clean(res) == res
        json.dumps(res, allow_nan=False)
