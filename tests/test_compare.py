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
    assert ir["ratio"] is None  # both partly measured over the same wavelengths, but noise


def write_uvc(path, amp, start=240.0):
    # an invented mercury-line unit measured from `start` (inside UV-C) at 20 cm
    wl = np.arange(start, 420.0, 0.5)
    rng = np.random.default_rng(int(amp))
    v = amp * 1e-2 * np.exp(-0.5 * ((wl - 253.7) / 1.1) ** 2) + 1e-4 + rng.normal(0, 2e-6, wl.size)
    path.write_text("Distance: 20 cm\nWavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
        f"{a:.1f},{b:.6e}" for a, b in zip(wl, v)) + "\n", encoding="utf-8")
    return path


def test_two_units_measured_alike_compare_over_the_measured_part(tmp_path):
    # Both spectra start at 240 nm, so UV-C and E_S are partly measured (lower bounds) in
    # both. Over the same wavelengths the measured parts compare like for like: the 0.7 ×
    # UV-C of the sample used to be hidden behind "no ratio" and "No difference beyond 5 %".
    # The expected ratio is the two assessments' own values (the JSON contract) and the
    # invented amplitudes' ratio, 28/40.
    r, c = run(tmp_path, write_uvc(tmp_path / "s.csv", 28), write_uvc(tmp_path / "r.csv", 40))
    assert r.exit_code == 0, r.output
    assert c["same_wavelengths"] is True
    uvc = next(x for x in c["bands"] if x["name"] == "UV-C")
    assert uvc["sample_status"] == uvc["reference_status"] == "partial"
    assert uvc["over"] == "measured part"
    assert uvc["ratio"] == pytest.approx(uvc["sample"] / uvc["reference"], rel=1e-6)
    assert uvc["ratio"] == pytest.approx(28 / 40, rel=0.02)
    es = next(x for x in c["hazards"] if x["id"] == "actinic_uv")
    assert es["over"] == "measured part" and es["ratio"] == pytest.approx(0.7, rel=0.03)
    assert f"UV-C: the sample is {uvc['ratio']:.3g} × the reference (over the measured part only)" \
        in c["differences"]
    assert "over the measured part only" in r.output and "No difference" not in r.output
    # a complete band keeps its plain ratio
    uva = next(x for x in c["bands"] if x["name"] == "UV-A")
    assert uva["over"] is None and uva["ratio"] is not None


def test_partly_measured_over_different_wavelengths_give_no_ratio(tmp_path):
    # one unit measured from 230 nm, the other from 240 nm: the measured parts differ
    r, c = run(tmp_path, write_uvc(tmp_path / "s.csv", 28, start=230.0),
               write_uvc(tmp_path / "r.csv", 40))
    assert r.exit_code == 0, r.output
    assert c["same_wavelengths"] is False
    uvc = next(x for x in c["bands"] if x["name"] == "UV-C")
    assert uvc["ratio"] is None and uvc["over"] is None and "partial" in uvc["note"]
