"""The bad-input catalogue (issue 7): every entry of tests/data/bad/catalogue.toml through the CLI.

Each case must end either in one clear error line (exit status 2, the problem and its place,
no traceback, nothing written) or in success with the named warning (or, where nothing was
guessed, with the expected values). The expected outcomes and their reasons are in the
catalogue itself; the expected numbers there are analytic (see its header).
"""

from __future__ import annotations

import json
import re
import tomllib
from pathlib import Path
from typing import Any, Callable

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app

BAD = Path(__file__).parent / "data" / "bad"
CATALOGUE = BAD / "catalogue.toml"
KINDS = ("spectrum", "listing", "room")
CASES: list[dict[str, Any]] = tomllib.loads(CATALOGUE.read_text(encoding="utf-8"))["case"]
runner = CliRunner()


def _million_rows(folder: Path) -> Path:
    """1 000 000 rows, 200–1100 nm, an invented Gaussian plus a floor (not committed: ~24 MB)."""
    p = folder / "million rows.csv"
    wl = np.linspace(200.0, 1100.0, 1_000_000)
    v = 1e-3 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + 1e-6
    with open(p, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("Wavelength (nm),Irradiance (W/m2/nm)\n")
        np.savetxt(fh, np.column_stack([wl, v]), fmt=["%.6f", "%.6e"], delimiter=",")
    return p


#: Generators for inputs too big to commit, by the name a case gives in `generate`.
GENERATORS: dict[str, Callable[[Path], Path]] = {"million_rows": _million_rows}


def _get(d: Any, dotted: str) -> Any:
    for part in dotted.split("."):
        if isinstance(d, list) and part.isdigit():
            assert int(part) < len(d), f"no {dotted!r} in the JSON (list too short at {part!r})"
            d = d[int(part)]
            continue
        assert isinstance(d, dict) and part in d, f"no {dotted!r} in the JSON (stopped at {part!r})"
        d = d[part]
    return d


def _same(got: Any, want: Any) -> bool:
    if isinstance(want, list):
        return isinstance(got, list) and len(got) == len(want) and all(map(_same, got, want))
    if isinstance(want, float) or (isinstance(want, int) and isinstance(got, float)):
        return got == pytest.approx(want, rel=1e-6, abs=1e-12)
    return got == want


# ---------------------------------------------------------------------------------------------
# The catalogue itself
# ---------------------------------------------------------------------------------------------

def test_catalogue_is_well_formed():
    ids = [c["id"] for c in CASES]
    assert len(ids) == len(set(ids)), "case ids must be unique"
    allowed = {"id", "kind", "file", "generate", "args", "status", "error", "place", "warning",
               "expect", "expect_null", "preexisting", "note"}
    for c in CASES:
        assert set(c) <= allowed, f"{c['id']}: unknown fields {set(c) - allowed}"
        assert c["kind"] in KINDS, c["id"]
        assert ("file" in c) != ("generate" in c), f"{c['id']}: give file or generate"
        if "file" in c:
            assert c["file"].split("/")[0] == c["kind"], f"{c['id']}: files live in {c['kind']}/"
        else:
            assert c["generate"] in GENERATORS, c["id"]
        assert c["status"] in (0, 2), c["id"]
        assert c.get("note"), f"{c['id']}: say what is wrong and why this outcome"
        if c["status"] == 2:
            assert c.get("error") and c.get("place"), f"{c['id']}: an error names what and where"
        else:
            assert c.get("warning") or c.get("expect"), \
                f"{c['id']}: a success shows its warning, or values proving it right"
        if c.get("expect") or c.get("expect_null"):
            assert "{json}" in c["args"], f"{c['id']}: expect needs --json {{json}}"


def test_catalogue_size():
    # issue 7: at least 30 malformed or awkward inputs; of them at least 26 spectrum files
    spectrum = [c for c in CASES if c["kind"] == "spectrum"]
    assert len(spectrum) >= 26
    assert len(CASES) >= 30


def test_every_committed_file_is_catalogued():
    used = {c["file"] for c in CASES if "file" in c}
    for kind in KINDS:
        folder = BAD / kind
        if folder.is_dir():
            for f in folder.iterdir():
                rel = f"{kind}/{f.name}"
                assert rel in used, f"{rel} is in tests/data/bad but not in the catalogue"


# ---------------------------------------------------------------------------------------------
# Every case through the command line
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("case", CASES, ids=[c["id"] for c in CASES])
def test_case(case, tmp_path):
    path = BAD / case["file"] if "file" in case else GENERATORS[case["generate"]](tmp_path)
    out = tmp_path / "result.json"
    subs = {"{file}": str(path), "{json}": str(out), "{tmp}": str(tmp_path)}
    args = [subs.get(a, a) for a in case["args"]]
    if "preexisting" in case:
        out.write_text(case["preexisting"], encoding="utf-8")
    r = runner.invoke(app, args)

    assert r.exception is None or isinstance(r.exception, SystemExit), \
        f"unhandled {type(r.exception).__name__}: {r.exception}"
    assert "Traceback" not in r.stdout + r.stderr
    assert r.exit_code == case["status"], r.stderr or r.stdout[-2000:]

    if case["status"] == 2:
        lines = r.stderr.splitlines()
        assert len(lines) == 1, f"one line on stderr, got: {r.stderr!r}"
        line = lines[0]
        assert line.startswith("uvcheck: error: "), line
        assert re.search(case["error"], line), f"{case['error']!r} not in {line!r}"
        place = case["place"]
        for key in ("{file}", "{json}"):
            place = place.replace(key, re.escape(subs[key]))
        assert re.search("^uvcheck: error: " + place, line), \
            f"the place {case['place']!r} should open the message: {line!r}"
        assert r.stdout == "", "an error prints no partial result"
        if "preexisting" in case:
            assert out.read_text(encoding="utf-8") == case["preexisting"]
        elif "{json}" in case["args"]:
            assert not out.exists(), "an error writes no output file"
        assert not list(tmp_path.glob("*.part")), "no temporary file left behind"
        return

    assert r.stderr == "", f"a success writes nothing on stderr: {r.stderr!r}"
    d = json.loads(out.read_text(encoding="utf-8")) if out.exists() else None
    if case.get("warning"):
        assert d is not None, "a warning case writes --json {json}"
        warnings = list(d["input"]["warnings"]) + list(d["warnings"])
        assert any(re.search(case["warning"], w) for w in warnings), \
            f"{case['warning']!r} not among the warnings: {warnings}"
        assert re.search(case["warning"], r.stdout), "the warning is shown in the terminal too"
    for key, want in case.get("expect", {}).items():
        got = _get(d, key)
        assert _same(got, want), f"{key}: expected {want!r}, got {got!r}"
    for key in case.get("expect_null", []):
        assert _get(d, key) is None, f"{key} should be null"
