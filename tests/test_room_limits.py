"""The room model's occupant exposure under a chosen limit set (room --limits, note).

For a 222 nm lamp the ACGIH 2022 eye TLV (161 mJ/cm² = 1610 J/m² at 222 nm, from memory via
a secondary source, as data/limits/acgih_2022_far_uvc.toml records it) gives the time to the
limit as 1610 J/m² over the occupant's 222 nm irradiance; under IEC 62471:2006 it is
30 J/m² over E_S, with S(222 nm) from the IEC 62471 table (data/weightings). The room model
gave only the IEC figure, and a note that ACGIH's is higher. Invented lamp.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.room import Box, LampGeometry, evaluate_room, lamp_from_uvc_flux


def _room(limit_set=None):
    lamp = lamp_from_uvc_flux(0.5, LampGeometry((2.0, 2.5, 2.4)), 222.0)
    return evaluate_room(Box(4, 5, 2.7), lamp, limit_set=limit_set).occupant


def test_the_acgih_set_times_the_occupant_on_the_222_nm_tlv():
    iec, acgih = _room(), _room("acgih_2022_far_uvc")
    e = acgih["irradiance_W_m2"]                      # the same geometry under both sets
    assert e == pytest.approx(iec["irradiance_W_m2"])
    assert acgih["time_to_limit_s"] == pytest.approx(1610.0 / e, rel=1e-6)
    assert acgih["symbol"] == "E_S,eq" and acgih["limit_set"] == "acgih_2022_far_uvc"
    assert iec["time_to_limit_s"] == pytest.approx(30.0 / iec["effective_S_W_m2"], rel=1e-12)
    assert acgih["time_to_limit_s"] > iec["time_to_limit_s"]
    assert "see --limits acgih_2022_far_uvc" in iec["note"]
    assert "ACGIH 2022 threshold limit values" not in acgih["note"]
    assert acgih["exceeds_8h_limit"] == (acgih["time_to_limit_s"] < 8 * 3600)


def test_the_room_command_and_the_note_take_the_limit_set(tmp_path):
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["room", "--uvc-flux", "0.5 W", "--wavelength", "222 nm",
                                 "--limits", "acgih_2022_far_uvc", "--json", str(out)])
    assert r.exit_code == 0, r.output
    occ = json.loads(out.read_text())["room"]["occupant"]
    assert occ["limit_set"] == "acgih_2022_far_uvc"
    r = CliRunner().invoke(app, ["room", "--uvc-flux", "0.5 W", "--limits", "acgih_2022_far_uvc"])
    assert "E_S,eq" in r.output
    r = CliRunner().invoke(app, ["room", "--uvc-flux", "0.5 W", "--limits", "nope"])
    assert r.exit_code == 2 and "unknown limit set 'nope'" in r.output


def test_the_note_room_section_follows_the_notes_limit_set(tmp_path):
    from pathlib import Path

    listing = Path(__file__).resolve().parents[1] / "examples" / "listings" / \
        "faruv_222nm_ceiling_unit.toml"
    html = tmp_path / "far.html"
    r = CliRunner().invoke(app, ["note", "--listing", str(listing), "--room", "4 x 5 x 2.7 m",
                                 "--limits", "acgih_2022_far_uvc", "--out", str(html),
                                 "--no-pdf"])
    assert r.exit_code == 0, r.output
    text = html.read_text(encoding="utf-8")
    assert "E_S,eq" in text[text.index("Occupant at eye height"):][:400]
