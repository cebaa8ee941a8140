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


def test_rows_per_case_use_the_chosen_limit_set():
    # the most likely case's row must agree with the main result under any limit set
    from uvcheck.io.listing import read_listing
    from uvcheck.screening import screen_listing_file

    for lset in ("iec62471_2006", "acgih_2022_far_uvc"):
        d = screen_listing_file(read_listing(LISTINGS / "faruv_222nm_ceiling_unit.toml"),
                                limit_set=lset).to_dict()
        likely = next(r for r in d["nominal"]["readings"] if r["likely"])
        assert likely["risk_group"] == d["risk_group"]["group"], lset
        assert likely["t_max_s"]["actinic_uv"] == d["hazards"]["actinic_uv"]["t_max_s"], lset
