"""The note as a reader gets it: headless Chromium (HTML) and poppler (PDF).

Skips cleanly where chromium or poppler-utils are not installed; .ci/run installs both so
that CI runs these tests. Expected strings come from the assessment dict the note was built
from (one source of truth), not from the renderer.
"""

from __future__ import annotations

import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from uvcheck.cli_note import note_result, write_note
from uvcheck.report import note

ROOT = Path(__file__).resolve().parent.parent
SPECTRUM = ROOT / "examples" / "spectra" / "mercury_tube_254nm.txt"
LISTING = ROOT / "examples" / "listings" / "mercury_tube_sold_pet_safe.toml"
CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
POPPLER = shutil.which("pdftoppm") and shutil.which("pdftotext") and shutil.which("pdfinfo")

HOSTILE = '<i>Lamp</i> **bold** & "quoted" -- not markup'


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    """The mercury tube note (HTML + PDF), with a product name full of markup."""
    d = tmp_path_factory.mktemp("note")
    lst = d / "listing.toml"
    lst.write_text(LISTING.read_text(encoding="utf-8").replace(
        'name = "Germicidal tube lamp for kennels and stables (invented example)"',
        f"name = {json.dumps(HOSTILE)}"), encoding="utf-8")
    # the demo's kennel room (examples/demo/scenario.toml): the tube along the short wall
    result, spec = note_result(SPECTRUM, lst, room={"size": "4 x 5 x 2.5 m",
                                                    "lamp_at": "0.15, 2.5, 2.2 m",
                                                    "pattern": "cylinder",
                                                    "tube_length": "0.55 m", "axis": "y"})
    html_path, pdf_path, view = write_note(result, spec, d / "tube.html", pdf=True)
    return {"dir": d, "html": html_path, "pdf": pdf_path, "result": result, "view": view}


def chromium(args: list[str], profile: Path, timeout: float = 90) -> subprocess.CompletedProcess:
    cmd = [CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
           "--no-first-run", "--disable-background-networking", "--disable-component-update",
           "--disable-sync", f"--user-data-dir={profile}", *args]
    return subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)


@pytest.mark.skipif(not CHROMIUM, reason="chromium is not installed")
def test_html_renders_in_chromium_without_console_errors(written, tmp_path):
    png = tmp_path / "note.png"
    r = chromium(["--enable-logging=stderr", "--v=0", f"--screenshot={png}",
                  "--window-size=1280,2000", written["html"].as_uri()], tmp_path / "profile")
    assert png.exists() and png.stat().st_size > 20_000, r.stderr[-2000:]
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    # the note has no scripts, so any console message at all is a fault (Chromium logs
    # console.error and uncaught exceptions as "INFO:CONSOLE(...)" lines on stderr)
    bad = [ln for ln in r.stderr.splitlines() if "CONSOLE" in ln or "Uncaught" in ln]
    assert not bad, bad


@pytest.mark.skipif(not CHROMIUM, reason="chromium is not installed")
def test_rendered_dom_shows_verdicts_and_escaped_text(written, tmp_path):
    r = chromium(["--dump-dom", written["html"].as_uri()], tmp_path / "profile")
    dom = r.stdout
    assert "<i>Lamp</i>" not in dom                  # shown as text, not as markup
    assert "&lt;i&gt;Lamp&lt;/i&gt;" in dom
    for c in written["result"]["claims"]:
        assert f'data-verdict="{c["verdict"]}"' in dom
    # spectrum and hazards, plus the work-plane map when the result has a room with a grid
    has_map = bool(((written["result"].get("room") or {}).get("plane") or {}).get("grid"))
    assert dom.count('data-figure="') == 2 + has_map


@pytest.mark.skipif(not POPPLER, reason="poppler-utils (pdftoppm, pdftotext) not installed")
def test_every_pdf_page_renders_and_text_has_the_verdicts(written, tmp_path):
    info = subprocess.run(["pdfinfo", str(written["pdf"])], capture_output=True, text=True,
                          check=True).stdout
    pages = int(re.search(r"Pages:\s+(\d+)", info).group(1))
    assert pages >= 2
    subprocess.run(["pdftoppm", "-r", "40", "-png", str(written["pdf"]), str(tmp_path / "p")],
                   check=True, capture_output=True, timeout=120)
    pngs = sorted(tmp_path.glob("p-*.png"))
    assert len(pngs) == pages
    assert all(p.stat().st_size > 1000 for p in pngs)
    text = subprocess.run(["pdftotext", "-layout", str(written["pdf"]), "-"], capture_output=True,
                          text=True, check=True).stdout
    flat = " ".join(text.split())
    for c in written["result"]["claims"]:
        assert note.VERDICT_TEXT[c["verdict"]] in flat
    assert "not a certification" in flat
    assert "Local codes" in flat
    assert "INVENTED DEMONSTRATION" in flat
    assert " ".join(HOSTILE.split()) in flat          # user text printed literally (no markdown)
    assert written["result"]["risk_group"]["group"] in flat
    assert "µW/cm²" in flat                           # the Unicode font carries µ and ²
