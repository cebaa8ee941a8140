"""Sample against reference (uvcheck compare). The ratios are checked against the two
assessments' own values (the JSON contract), so the check is that the comparison reports them
faithfully and refuses what does not compare; the ±5 % threshold is our own rule. Spectra
are invented."""

from __future__ import annotations

import json

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.compare import compare
from uvcheck.errors import ConfigurationError

WL = np.arange(200.0, 801.0, 0.5)


def write(path, amp, distance="20 cm", shift=0.0):
    rng = np.random.default_rng(int(amp * 1000))
    v = amp * 3e-3 * np.exp(-0.5 * ((WL - 365.0 - shift) / 6.0) ** 2) + rng.normal(0, 1e-7, WL.size)
    path.write_text(f"Distance: {distance}\nWavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
        f"{a:.1f},{b:.6e}" for a, b in zip(WL, v)) + "\n", encoding="utf-8")
    return path


def run(tmp_path, a, b):
    out = tmp_path / "c.json"
    r = CliRunner().invoke(app, ["compare", str(a), str(b), "--json", str(out)])
    return r, (json.loads(out.read_text()) if out.exists() else None)


def test_ratios_are_the_two_assessments_values(tmp_path):
    s = write(tmp_path / "s.csv", 1.3, shift=2.0)
    ref = write(tmp_path / "r.csv", 1.0)
    r, c = run(tmp_path, s, ref)
    assert r.exit_code == 0, r.output
    uva = next(x for x in c["bands"] if x["name"] == "UV-A")
    assert uva["ratio"] == pytest.approx(uva["sample"] / uva["reference"], rel=1e-6)
    assert uva["ratio"] == pytest.approx(1.3, rel=0.02)
    assert c["peak_shift_nm"] == pytest.approx(2.0, abs=0.6)
    assert any(d.startswith("UV-A: the sample is") for d in c["differences"])
    # a band not measured in either has no ratio, and says why
    below = next(x for x in c["bands"] if x["name"] == "below-200nm")
    assert below["ratio"] is None and "not-covered" in below["note"]
    assert "sample/reference" in r.output


def test_the_same_lamp_shows_no_difference(tmp_path):
    a = write(tmp_path / "a.csv", 1.0)
    b = write(tmp_path / "b.csv", 1.0)
    r, c = run(tmp_path, a, b)
    assert r.exit_code == 0 and c["differences"] == []
    assert "No difference beyond 5%" in r.output


def test_different_positions_do_not_compare(tmp_path):
    a = write(tmp_path / "a.csv", 1.0, distance="20 cm")
    b = write(tmp_path / "b.csv", 1.0, distance="50 cm")
    r, _ = run(tmp_path, a, b)
    assert r.exit_code == 2 and "different positions" in r.output


def test_different_quantities_do_not_compare():
    a = {"input": {"quantity": "irradiance"}, "conditions": {}}
    b = {"input": {"quantity": "relative"}, "conditions": {}}
    with pytest.raises(ConfigurationError, match="different quantities"):
        compare(a, b)


def test_values_below_detection_read_as_bounds(tmp_path):
    # a 365 nm LED has no UV-C or UV-B above the noise: those rows show the detection limit as
    # "< x" (DEVELOPERS.md: below the detection limit is reported as "< X", never as a number),
    # as the assessment itself shows them, and give no ratio
    r, c = run(tmp_path, write(tmp_path / "s.csv", 1.3), write(tmp_path / "r.csv", 1.0))
    assert r.exit_code == 0, r.output
    uvb = next(x for x in c["bands"] if x["name"] == "UV-B")
    assert uvb["sample_status"] == "below-detection" and uvb["ratio"] is None
    assert uvb["sample_text"].startswith("< ")
    row = next(ln for ln in r.output.splitlines() if ln.strip().startswith("UV-B "))
    assert row.count("< ") == 2
    # E_IR, measured only to 800 nm and at noise level there: "< x so far", not a number
    ir = next(x for x in c["hazards"] if x["id"] == "ir_eye")
    assert ir["sample_status"] == "partial" and ir["sample_text"].startswith("< ")
    assert ir["sample_text"].endswith("so far")
    line = next(ln for ln in r.output.splitlines() if ln.strip().startswith("E_IR "))
    assert line.split()[1] == "<"
