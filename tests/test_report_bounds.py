"""The renderers (terminal summary and note) word bounds as bounds.

Invented spectra only (not measurements of any product), written to a temporary file and read
as the command line reads them. Our own rules, checked here:

* no measurement distance: the values, and so the risk group, hold at the measurement position
  and not at the IEC 62471 assessment distance; the headline says so and asks for --distance;
* a partly measured hazard (its value a lower bound) has an upper-bound t_max ('≤', 'so far',
  'at most') and lower-bound hazard distances ('at least');
* an efficiency computed from an upper-bound UV-C reading carries '≤', and no Python None
  reaches the user;
* where the overall group is a lower bound the uncertainty block says 'at least' as the
  headline does.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.report import note

runner = CliRunner()
WAND = Path(__file__).resolve().parents[1] / "examples" / "spectra" / "wand_395nm_led.csv"


def _write(path: Path, wl: np.ndarray, v: np.ndarray, seed: int) -> Path:
    rng = np.random.default_rng(seed)
    v = v + rng.normal(0.0, 1e-7, wl.size)          # a noise floor for the detection limits
    path.write_text("# invented spectrum, not a real product\nwavelength_nm,irradiance_W_m2_nm\n"
                    + "".join(f"{a:.1f},{b:.6e}\n" for a, b in zip(wl, v)), encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("bounds")
    wl = np.arange(200.0, 400.5, 0.5)
    # a 222 nm band of 0.02 W m-2: E_S above the Exempt limit (RG1 at the measurement position)
    far = _write(tmp / "far222.csv", wl, gaussian(wl, 222.0, 1.7, 0.02), 1)
    vis_wl = np.arange(380.0, 780.5, 1.0)
    # a white-LED-like spectrum measured over 380-780 nm only: UV hazards partly measured
    vis = _write(tmp / "visible.csv", vis_wl,
                 gaussian(vis_wl, 450.0, 10.0, 0.5) + gaussian(vis_wl, 560.0, 50.0, 1.5), 2)
    # a 270 nm LED measured from 250 nm: E_S partly measured and still above its limit
    uv_wl = np.arange(250.0, 800.5, 0.5)
    uvc = _write(tmp / "uvc270.csv", uv_wl, gaussian(uv_wl, 270.0, 5.0, 0.05), 3)
    return {"far": far, "vis": vis, "uvc": uvc}


def _assess(path: Path, *extra: str) -> tuple[str, dict]:
    r = runner.invoke(app, ["assess", str(path), "--no-uncertainty", *extra])
    assert r.exit_code == 0, r.output
    j = runner.invoke(app, ["assess", str(path), "--no-uncertainty", "--json", "-", *extra])
    assert j.exit_code == 0, j.output
    return r.output, json.loads(j.stdout)


def _headline(text: str) -> list[str]:
    lines = text.splitlines()
    i = next(k for k, ln in enumerate(lines) if ln.startswith("Overall risk group"))
    return lines[i:i + 5]


# ---------------------------------------------------------------------------------------------
# 1. no measurement distance
# ---------------------------------------------------------------------------------------------

def test_no_distance_headline_names_the_measurement_position(files):
    text, d = _assess(files["far"])
    assert d["evaluation"]["distance_m"] is None and d["risk_group"]["group"] == "RG1"
    head = " ".join(x.strip() for x in _headline(text))
    assert head.startswith("Overall risk group at the measurement position: at least RG1")
    assert "IEC 62471 assessment distance could not be applied" in head
    assert "not the lamp's IEC 62471 classification" in head and "--distance" in head
    # the evaluation line says it once, not 'at the measurement position: at the measurement …'
    assert "at the measurement position: at the measurement position" not in text


def test_with_a_distance_the_headline_keeps_its_wording(files):
    text, d = _assess(files["far"], "--distance", "20 cm")
    assert d["evaluation"]["distance_m"] == pytest.approx(0.2)
    head = _headline(text)
    assert head[0].startswith("Overall risk group: ")
    assert "measurement position" not in " ".join(head) and "--distance" not in " ".join(head)


def test_no_distance_note_box_and_finding(files):
    _, d = _assess(files["far"])
    rk = note.risk_summary(d)
    assert "—" not in rk["where"] and "measurement position" in rk["where"]
    assert "not at the IEC 62471 assessment distance" in rk["where"]
    assert "could not be applied" in rk["detail"] and "--distance" in rk["detail"]
    f = note.finding(d)
    assert " at —" not in f and "At the measurement position it is RG1" in f
    assert "not the lamp's IEC 62471 classification" in f
    v = note.build_note(d, date="2026-01-01", references=[])
    assert "could not be applied" in v["hazard_note"]
    assert all(h["distance"] != "—" for h in v["hazards"])
    assert " at —" not in v["key_caution"]["text"]
    # with a distance, the note keeps saying where
    _, d2 = _assess(files["far"], "--distance", "20 cm")
    rk2 = note.risk_summary(d2)
    assert rk2["where"] == "at 20 cm" and "could not be applied" not in rk2["detail"]
    assert "could not be applied" not in note.finding(d2)


# ---------------------------------------------------------------------------------------------
# 2. partly measured hazards
# ---------------------------------------------------------------------------------------------

def _row(text: str, symbol: str) -> str:
    return next(ln for ln in text.splitlines() if ln.strip().startswith(symbol + " "))


def test_partly_measured_tmax_and_distances_are_bounds(files):
    text, d = _assess(files["vis"], "--distance", "20 cm")
    h = d["hazards"]["actinic_uv"]
    assert h["status"] == "partial" and h["t_max_s"] is None and h["risk_group_is_lower_bound"]
    es = _row(text, "E_S")
    assert "> 8 h so far" in es
    assert not re.search(r"> 8 h(?! so far)", es)
    assert "unlimited so far" in _row(text, "E_UVA")
    hd = d["hazard_distances"]["actinic_uv"]
    assert hd["bound"] == "at-least" and hd["distance_m"] is not None
    line = next(ln for ln in text.splitlines() if ln.strip().startswith("E_S: "))
    assert f"at least {float(hd['distance_m']):.3g}" in line
    assert "Exempt beyond at least" in line and "can only be larger" in line
    # the note words the same rows the same way (measured part only, not established)
    rows = {r["symbol"]: r for r in note.hazard_rows(d)}
    assert "so far" in rows["E_S"]["t_max"] and "measured part only" in rows["E_S"]["t_max"]
    assert "so far" in rows["E_UVA"]["t_max"] and "measured part only" in rows["E_UVA"]["t_max"]


def test_partly_measured_finite_tmax_is_an_upper_bound(files):
    text, d = _assess(files["uvc"], "--distance", "5 cm")
    h = d["hazards"]["actinic_uv"]
    assert h["status"] == "partial" and h["t_max_s"] is not None
    assert "≤ " in _row(text, "E_S")
    from uvcheck.report.terminal import tmax_text
    assert note.hazard_rows(d)[0]["t_max"].startswith("at most ")
    # a complete hazard keeps its plain time
    full = {**h, "status": "complete", "risk_group_is_lower_bound": False}
    assert tmax_text("actinic_uv", full) == tmax_text("actinic_uv", h)[2:]
    assert not note._tmax_text(full).startswith("at most")


def test_complete_hazard_distances_keep_their_wording(files):
    text, d = _assess(files["far"], "--distance", "20 cm")
    assert d["hazard_distances"]["actinic_uv"]["bound"] == "exact"
    line = next(ln for ln in text.splitlines() if ln.strip().startswith("E_S: "))
    assert "closer than " in line and "at least" not in line
    assert "so far" not in _row(text, "E_S") and "≤" not in _row(text, "E_S")


# ---------------------------------------------------------------------------------------------
# 3. efficiency
# ---------------------------------------------------------------------------------------------

def test_efficiency_from_an_upper_bound_carries_the_sign_and_no_none():
    text, d = _assess(WAND, "--electrical-power", "2.5 W")
    eff = d["germicidal"]["efficiency"]
    assert eff["status"] == "upper-bound" and eff["verdict"] is None
    i = text.index("UV-C efficiency:")
    block = text[i:text.index("\n  Time to inactivate", i)]
    assert "None" not in block
    assert block.startswith(f"UV-C efficiency: ≤ {eff['efficiency']:.3g} W/W")
    assert "upper bound" in block


def test_efficiency_text_for_a_computed_value():
    from uvcheck.report.terminal import efficiency_text

    g = {"uvc": {"status": "complete"},
         "efficiency": {"status": "computed", "efficiency": 0.25, "verdict": "within",
                        "note": "measured radiant flux"}}
    t = efficiency_text(g)
    assert t.startswith("0.25 W/W (") and "≤" not in t and "within the usual range" in t
    g["efficiency"]["verdict"] = None
    assert "None" not in efficiency_text(g)
    assert efficiency_text({"efficiency": {"status": "not-computed", "efficiency": None}}) is None


# ---------------------------------------------------------------------------------------------
# 4. uncertainty block
# ---------------------------------------------------------------------------------------------

def test_uncertainty_overall_line_says_at_least_for_a_lower_bound_group():
    r = runner.invoke(app, ["assess", str(WAND), "--draws", "200"])
    assert r.exit_code == 0, r.output
    j = runner.invoke(app, ["assess", str(WAND), "--draws", "200", "--json", "-"])
    d = json.loads(j.stdout)
    assert d["risk_group"]["is_lower_bound"] and d["uncertainty"]["overall"]["is_lower_bound"]
    head = next(ln for ln in r.output.splitlines() if ln.startswith("Overall risk group"))
    assert "at least Exempt*" in head
    ov = next(ln for ln in r.output.splitlines() if ln.startswith("  overall group "))
    assert ov.startswith("  overall group at least Exempt*:")
    assert "at least each group" in ov
    assert "by the decision rule: at least Exempt*" in ov
    # the note's uncertainty paragraph says the same
    u = note.uncertainty_block(d)
    assert "at least each group" in u["overall"] and u["overall_by_rule"] == "at least Exempt"


def test_finding_risk_box_and_cautions_keep_at_most_for_a_partly_measured_time(tmp_path):
    """The hazard table says 'at most 48.4 s' for a hazard measured in part; the finding, the
    risk box and the cautions said 'is reached in 48.4 s'. Invented mercury-like lines on a
    spectrum measured from 250 nm (its actinic value is a lower bound, so its time an upper
    bound)."""
    from uvcheck.assessment import assess
    from uvcheck.conditions import Conditions
    from uvcheck.io.reader import read_spectrum
    from uvcheck.report.note import build_note

    wl = np.arange(250.0, 800.5, 0.5)
    v = sum(a * np.exp(-0.5 * ((wl - c) / 0.8) ** 2) for c, a in
            ((253.7, 0.5), (365.0, 0.02), (404.7, 0.02), (435.8, 0.03), (546.1, 0.03))) + 1e-7
    p = tmp_path / "hg250.csv"
    p.write_text("# invented\nwavelength (nm),irradiance (W/m2/nm)\n"
                 + "".join(f"{a:.1f},{b:.6e}\n" for a, b in zip(wl, v)), encoding="utf-8")
    spec, rep = read_spectrum(p)
    d = json.loads(json.dumps(assess(spec, Conditions(measurement_distance_m=1.0), rep).to_dict(),
                              default=str))
    assert d["hazards"]["actinic_uv"]["status"] == "partial"
    note = build_note(d)
    text = json.dumps(note, ensure_ascii=False)
    assert "is reached in at most" in text
    import re

    plain = re.findall(r"is reached in (?!at most)[0-9]", text)
    assert not plain, plain
