"""A listing screened without a spectrum is an estimate: worded as one, and without the
measurement-uncertainty evaluation (whose inputs describe an instrument, not a model)."""

from __future__ import annotations

import json
from pathlib import Path

from typer.testing import CliRunner

from uvcheck.cli import app

LISTINGS = Path(__file__).resolve().parent.parent / "examples" / "listings"


def _screen_json(name: str) -> dict:
    r = CliRunner().invoke(app, ["screen", str(LISTINGS / name), "--json", "-", "--quiet"])
    assert r.exit_code in (0, 1), r.output
    return json.loads(r.stdout[r.stdout.index("{"):])


def test_screening_runs_no_monte_carlo_and_says_why():
    d = _screen_json("uvc_box_48_leds_8w.toml")
    assert d.get("uncertainty") is None  # absent: not evaluated
    assert any("does not apply to a model" in w for w in d["warnings"])


def test_estimate_is_not_called_measured_in_germicidal_wording():
    d = _screen_json("uvc_box_48_leds_8w.toml")
    g = d["germicidal"]
    assert g["ozone"]["basis"] != "measured"
    assert "measured" not in g["ozone"]["note"]
    assert "measured output" not in (g.get("statement") or "")
