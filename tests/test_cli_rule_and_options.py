"""The decision rule in the headline risk group, and the uncertainty and room options of
`note`, `demo` and `batch` (shared with `assess` and `room`), checked before any work.

Sources of expected values:
- E_S Exempt limit 0.001 W m⁻² (30 J m⁻² over 30 000 s): IEC 62471:2006 Table 6.1 (from
  memory, as in tests/test_uncertainty.py); S(270 nm) = 1.0: IEC 62471:2006 / CIE S 009:2002
  Table 4.1 as copied into data/weightings/S_actinic_uv.csv.
- Guarded acceptance (a group is accepted only when the value is below its limit by U):
  ILAC-G8:09/2019 §4.2, read in a public transcription.
- The demo room (4 × 5 × 2.5 m, tube 0.55 m along y at (0.15, 2.5, 2.2) m) is the invented
  scenario in examples/demo/scenario.toml; the expected room figures are those the demo's own
  path computes for it (a regression value of the same code path, not a typed-in number).
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

import uvcheck.cli_note as cli_note
from uvcheck.cli import app
from uvcheck.conditions import Conditions
from uvcheck.hazards import evaluate_hazards
from uvcheck.spectrum import Spectrum
from uvcheck.uncertainty import (RISK_GROUP_FIELDS, Distribution, apply_rule_to_risk_group,
                                 default_inputs, evaluate_uncertainty)

ROOT = Path(__file__).resolve().parent.parent
SPECTRA = ROOT / "examples" / "spectra"
LISTINGS = ROOT / "examples" / "listings"
TUBE = SPECTRA / "mercury_tube_254nm.txt"
TUBE_LISTING = LISTINGS / "mercury_tube_sold_pet_safe.toml"
runner = CliRunner()
EXEMPT_ES = 0.001   # W m-2, IEC 62471:2006 Table 6.1 (from memory)


@pytest.fixture
def borderline(tmp_path):
    """A 270 nm band whose E_S is 0.98 × the Exempt limit at the measurement distance: with
    the default 5 % UV calibration uncertainty its 95 % interval spans the Exempt/RG1 edge."""
    wl = np.arange(200.0, 800.0 + 1e-9, 0.5)
    v = gaussian(wl, 270.0, 1.0, 0.98 * EXEMPT_ES)   # S ≈ 1.0 around 270 nm (Table 4.1)
    p = tmp_path / "line270.csv"
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:.1f},{b:.8e}" for a, b in zip(wl, v)), encoding="utf-8")
    return p


def assess_json(path, *extra):
    r = runner.invoke(app, ["assess", str(path), "--distance", "20 cm", "--json", "-", *extra])
    assert r.exit_code == 0, r.output
    return json.loads(r.stdout)


def headline(path, *extra) -> str:
    r = runner.invoke(app, ["assess", str(path), "--distance", "20 cm", *extra])
    assert r.exit_code == 0, r.output
    lines = r.output.splitlines()
    i = next(k for k, ln in enumerate(lines) if ln.startswith("Overall risk group:"))
    return "\n".join(lines[i:i + 3])


def embedded_json(text: str) -> dict:
    m = re.search(r'<script type="application/json" id="uvcheck-result">(.*?)</script>', text, re.S)
    assert m, "the note embeds its result"
    return json.loads(m.group(1))


# ---------------------------------------------------------------------------------------------
# The decision rule reaches the headline group (issue 9)
# ---------------------------------------------------------------------------------------------

def test_guarded_rule_sets_the_risk_group_and_the_headline(borderline):
    d = assess_json(borderline, "--decision-rule", "guarded")
    rg, ov = d["risk_group"], d["uncertainty"]["overall"]
    assert d["hazards"]["actinic_uv"]["value"] < EXEMPT_ES          # measured: Exempt
    assert ov["risk_group_by_rule"] == "RG1"                        # guarded: the upper end
    assert rg["group"] == ov["risk_group_by_rule"] == "RG1"         # one answer, not two
    assert rg["decision_rule"] == "guarded" and rg["group_simple"] == "Exempt"
    assert rg["group_guarded"] == "RG1" and rg["borderline"] is True
    assert rg["group_range_95"] == ["Exempt", "RG1"]
    assert sum(rg["group_probability"].values()) == pytest.approx(1.0)
    assert 0.0 < rg["group_probability"]["RG1"] < 1.0
    assert rg["group_probability"] == ov["risk_group_probability"]
    assert "guarded acceptance" in rg["rule_note"] and "Exempt" in rg["rule_note"]
    head = headline(borderline, "--decision-rule", "guarded")
    first = head.splitlines()[0]
    assert "RG1" in first and "guarded" in first and "Exempt" not in first
    assert "simple acceptance) give" in head and "Exempt" in head and "BORDERLINE" in head


def test_simple_rule_keeps_the_measured_group_and_says_what_guarded_gives(borderline):
    d = assess_json(borderline)
    rg = d["risk_group"]
    assert rg["group"] == "Exempt" and rg["decision_rule"] == "simple"
    assert rg["group_simple"] == "Exempt" and rg["group_guarded"] == "RG1"
    assert rg["borderline"] is True and rg["group_probability"]["Exempt"] > 0
    head = headline(borderline)
    assert "simple acceptance" in head.splitlines()[0]
    assert "guarded acceptance (--decision-rule guarded) would give" in head and "RG1" in head


def test_risk_group_keys_exist_without_the_uncertainty(borderline):
    d = assess_json(borderline, "--no-uncertainty")
    rg = d["risk_group"]
    assert set(RISK_GROUP_FIELDS) <= set(rg)
    assert rg["group_simple"] == rg["group"] == "Exempt"
    assert rg["decision_rule"] is None and rg["group_probability"] is None
    assert rg["borderline"] is None


def test_guarded_is_never_more_lenient_than_the_measured_value():
    # A flat UV pedestal, E_S 1.02 × the Exempt limit (RG1 measured), and a stray-light
    # allowance of 99 % of it: the pedestal is subtracted, so the whole interval lies below
    # the measured value and below the limit. Guarded acceptance must still not say Exempt.
    wl = np.arange(200.0, 400.0 + 1e-9, 1.0)
    s0 = Spectrum(wl, np.ones(wl.size), "irradiance", noise_floor=1e-12)
    cond = Conditions(measurement_distance_m=0.2)
    es_per_unit = evaluate_hazards(s0, cond).hazard("actinic_uv").value
    spec = Spectrum(wl, np.full(wl.size, 1.02 * EXEMPT_ES / es_per_unit), "irradiance",
                    noise_floor=1e-12)
    base = default_inputs()
    inputs = base.with_(calibration_u_rel={b: 0.0 for b in base.bands},
                        wavelength_nm=Distribution("normal", 0.0),
                        distance=Distribution("normal", 0.0), stray_light_fraction=0.99,
                        include_noise=False, decision_rule="guarded")
    hz = evaluate_hazards(spec, cond)
    u = evaluate_uncertainty(spec, cond, hz, None, inputs, draws=400, seed=3).to_dict()
    h = u["hazards"]["actinic_uv"]
    assert h["risk_group"] == "RG1" and h["interval_95"][1] < EXEMPT_ES
    assert h["risk_group_by_rule"] == "RG1" and h["risk_group_guarded"] == "RG1"
    assert u["overall"]["risk_group_by_rule"] == "RG1"


def test_apply_rule_without_an_overall_section_keeps_the_group():
    rg = {"group": "RG2", "is_lower_bound": False, "governing": "blue_light", "note": "RG2"}
    u = {"status": "evaluated", "overall": None, "decision_rule": {"rule": "guarded"}}
    out = apply_rule_to_risk_group(rg, u)
    assert out["group"] == "RG2" and out["decision_rule"] == "guarded"
    assert out["group_probability"] is None and "no group probability" in out["rule_note"]


# ---------------------------------------------------------------------------------------------
# note: uncertainty options, room options, checks before any work
# ---------------------------------------------------------------------------------------------

def test_note_uses_the_labs_inputs_and_rule_and_prints_them(borderline, tmp_path):
    out = tmp_path / "n.html"
    r = runner.invoke(app, ["note", str(borderline), "--distance", "20 cm", "--out", str(out),
                            "--no-pdf", "--decision-rule", "guarded",
                            "--calibration-uncertainty", "UV=8 %", "--draws", "500"])
    assert r.exit_code == 0, r.output
    text = out.read_text(encoding="utf-8")
    d = embedded_json(text)
    u = d["uncertainty"]
    assert u["decision_rule"]["rule"] == "guarded" and u["method"]["draws"] == 500
    assert u["inputs"]["calibration"]["u_rel_by_band"]["UV"] == 0.08
    assert d["risk_group"]["group"] == "RG1" and d["risk_group"]["decision_rule"] == "guarded"
    plain = re.sub(r"\s+", " ", re.sub(r"<[^>]+>", " ", text))
    assert "decision rule: guarded acceptance" in plain      # the rule, printed
    assert "given for calibration" in plain and "UV 8 %" in plain   # the lab's own input


def test_note_without_uncertainty(borderline, tmp_path):
    out = tmp_path / "n.html"
    r = runner.invoke(app, ["note", str(borderline), "--distance", "20 cm", "--out", str(out),
                            "--no-pdf", "--no-uncertainty"])
    assert r.exit_code == 0, r.output
    assert "uncertainty" not in embedded_json(out.read_text(encoding="utf-8"))


def test_note_room_options_reproduce_the_demo_room(tmp_path):
    sc = {p["id"]: p for p in cli_note.load_scenario()["products"]}
    room = sc["mercury-tube"]["room"]
    demo, _ = cli_note.note_result(TUBE, TUBE_LISTING, distance="1 m", room=room,
                                   uncertainty={"no_uncertainty": True})
    out = tmp_path / "tube.html"
    r = runner.invoke(app, ["note", str(TUBE), "--listing", str(TUBE_LISTING), "--distance",
                            "1 m", "--room", room["size"], "--lamp-at", room["lamp_at"],
                            "--pattern", "cylinder", "--tube-length", room["tube_length"],
                            "--axis", room["axis"], "--no-uncertainty", "--no-pdf",
                            "--out", str(out)])
    assert r.exit_code == 0, r.output
    got = embedded_json(out.read_text(encoding="utf-8"))["room"]
    assert got["lamp"]["tube_length_m"] == 0.55 and got["lamp"]["axis"] == "y"
    assert got["lamp"] == demo["room"]["lamp"]
    assert got["fluence_rate_avg_W_m2"] == demo["room"]["fluence_rate_avg_W_m2"]


def test_note_room_settings_reach_the_model(tmp_path):
    out = tmp_path / "tube.html"
    r = runner.invoke(app, ["note", str(TUBE), "--distance", "1 m", "--room", "4 x 5 x 2.5 m",
                            "--reflectance", "20 %", "--work-plane", "1 m", "--eye-height",
                            "1.2 m", "--no-uncertainty", "--no-pdf", "--out", str(out)])
    assert r.exit_code == 0, r.output
    room = embedded_json(out.read_text(encoding="utf-8"))["room"]
    assert room["reflectance"] == pytest.approx(0.20)
    assert room["plane"]["height_m"] == pytest.approx(1.0)
    assert room["occupant"]["eye_height_m"] == pytest.approx(1.2)


def test_note_cylinder_without_tube_length_points_to_the_listings_one(tmp_path):
    rs = cli_note.room_spec({"size": "4 x 5 x 2.5 m", "lamp_at": "0.15, 2.5, 2.2 m",
                             "pattern": "cylinder"}, tube_from_listing_m=0.55)
    assert rs["geometry"].tube_length_m == 0.0          # not used silently
    assert "0.55 m" in rs["notes"][0] and "--tube-length" in rs["notes"][0]


@pytest.fixture
def no_work(monkeypatch):
    """note_result must not be reached: the errors below are found before any work."""
    def fail(*a, **k):
        raise AssertionError("the assessment ran before the options were checked")
    monkeypatch.setattr(cli_note, "note_result", fail)


@pytest.mark.parametrize("args,where,what", [
    (["--out", "{tmp}/missing/x.html"], "missing", "output folder does not exist"),
    (["--room", "4 x 5 x 2.5 m", "--lamp-at", "9,9,9 m"], "--lamp-at", "outside the room"),
    (["--room", "4 x 5 x 2.5 m", "--lamp-at", "0.1, 2.5, 2.2 m", "--pattern", "cylinder",
      "--tube-length", "1 m"], "--lamp-at", "outside the room"),
    (["--room", "4 x 5 x 2.5 m", "--axis", "z"], "--axis", "unknown tube axis"),
    (["--room", "4 x 5 x 2.5 m", "--reflectance", "150 %"], "--reflectance", ""),
    (["--tube-length", "1 m"], "--tube-length", "need --room"),
    (["--decision-rule", "strict"], "--decision-rule", "unknown decision rule"),
    (["--no-uncertainty", "--draws", "500"], "--draws", "--no-uncertainty"),
    (["--calibration-uncertainty", "lots"], "--calibration-uncertainty", ""),
])
def test_note_errors_before_any_work(no_work, tmp_path, args, where, what):
    args = [a.replace("{tmp}", str(tmp_path)) for a in args]
    if "--out" not in args:
        args += ["--out", str(tmp_path / "x.html")]
    r = runner.invoke(app, ["note", str(TUBE), "--no-pdf", *args])
    assert r.exit_code == 2, r.output
    assert where in r.output and what in r.output
    assert not any(tmp_path.glob("*.html"))


def test_note_refuses_uncertainty_options_for_a_listing_alone(no_work, tmp_path):
    r = runner.invoke(app, ["note", "--listing", str(TUBE_LISTING), "--decision-rule",
                            "guarded", "--out", str(tmp_path / "x.html")])
    assert r.exit_code == 2 and "--decision-rule" in r.output and "measured spectrum" in r.output


def test_assess_checks_its_json_folder_first(tmp_path):
    r = runner.invoke(app, ["assess", str(TUBE), "--json", str(tmp_path / "nope" / "x.json")])
    assert r.exit_code == 2 and "output folder does not exist" in r.output


# ---------------------------------------------------------------------------------------------
# demo and batch
# ---------------------------------------------------------------------------------------------

def test_demo_product_takes_the_uncertainty_options():
    p = next(p for p in cli_note.load_scenario()["products"] if p["id"] == "wand")
    _, _, result, _ = cli_note._demo_product(
        (p, False, "2026-01-01", {"decision_rule": "guarded", "draws": 300}))
    assert result["uncertainty"]["decision_rule"]["rule"] == "guarded"
    assert result["uncertainty"]["method"]["draws"] == 300
    assert result["risk_group"]["decision_rule"] == "guarded"


def test_demo_rejects_a_wrong_rule_before_any_work(tmp_path):
    r = runner.invoke(app, ["demo", "--out", str(tmp_path / "d"), "--decision-rule", "strict"])
    assert r.exit_code == 2 and "--decision-rule" in r.output
    assert not (tmp_path / "d").exists()


def batch_rows(tmp_path, src, *extra):
    out = tmp_path / f"s{len(list(tmp_path.glob('s*.csv')))}.csv"
    r = runner.invoke(app, ["batch", str(src), "--out", str(out), "--jobs", "1",
                            "--distance", "20 cm", *extra])
    assert r.exit_code == 0, r.output
    return [json.loads(x) for x in out.with_suffix(".jsonl").read_text().splitlines()]


def test_batch_decision_rule_and_notes(borderline, tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    borderline.rename(src / borderline.name)
    assert batch_rows(tmp_path, src)[0]["risk_group"] == "Exempt"       # no uncertainty
    rows = batch_rows(tmp_path, src, "--decision-rule", "guarded")      # implies it
    assert rows[0]["risk_group"] == "RG1"
    notes = tmp_path / "notes"
    rows = batch_rows(tmp_path, src, "--notes", str(notes), "--no-pdf",
                      "--calibration-uncertainty", "UV=8 %")
    d = embedded_json(Path(rows[0]["note_path"]).read_text(encoding="utf-8"))
    assert d["uncertainty"]["inputs"]["calibration"]["u_rel_by_band"]["UV"] == 0.08
    r = runner.invoke(app, ["batch", str(src), "--out", str(tmp_path / "x.csv"),
                            "--no-uncertainty", "--decision-rule", "guarded"])
    assert r.exit_code == 2 and "--decision-rule" in r.output
