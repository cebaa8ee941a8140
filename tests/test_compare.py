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


def test_a_distance_option_against_the_files_own_is_shown_beside_the_comparison(tmp_path):
    # found by trying the tool: --distance overrode a file's stated 30 cm in silence, and the
    # values at the wrong distance (here (0.3/0.2)² = 2.25× off, inverse-square law) were
    # compared as if right; assess warns of the same conflict, and compare now shows it
    a = write(tmp_path / "a.csv", 1.0, distance="30 cm")
    b = write(tmp_path / "b.csv", 1.0, distance="20 cm")
    out = tmp_path / "c.json"
    r = CliRunner().invoke(app, ["compare", str(a), str(b), "--distance", "20 cm",
                                 "--json", str(out)])
    assert r.exit_code == 0, r.output
    c = json.loads(out.read_text())
    said = "the file states a measurement distance of 0.3 m, but --distance gives 0.2 m"
    assert any(said in w for w in c["warnings"]["sample"])
    assert not any("states a measurement distance" in w for w in c["warnings"]["reference"])
    assert said in r.output and "Warnings (sample" in r.output


def test_the_error_for_two_positions_reads_plainly(tmp_path):
    a = write(tmp_path / "a.csv", 1.0, distance="20 cm")
    b = tmp_path / "b.csv"
    b.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
        f"{x:.1f},{1e-3 * np.exp(-0.5 * ((x - 365) / 6) ** 2):.6e}" for x in WL) + "\n",
        encoding="utf-8")
    r, _ = run(tmp_path, a, b)
    assert r.exit_code == 2
    assert "measured at 0.2 m, the reference at an unstated distance:" in r.output
    assert "distance m" not in r.output


def test_hazard_rows_say_the_distance_they_are_evaluated_at(tmp_path):
    # measured at 1 m; the hazards are evaluated at 200 mm (IEC 62471:2006, lamps not for
    # general lighting service), so the two tables are at two distances and say so
    a = write(tmp_path / "a.csv", 1.0, distance="1 m")
    b = write(tmp_path / "b.csv", 1.1, distance="1 m")
    r, c = run(tmp_path, a, b)
    assert r.exit_code == 0, r.output
    assert c["hazards_at_m"] == pytest.approx(0.2) and c["measurement_distance_m"] == 1.0
    assert "Bands (at 1.00 m)" in r.output and "Hazards (at 0.200 m: 200 mm" in r.output
    assert r.output.count("\n  UV-C ") == 1  # the UV-C row is not repeated below the bands


def test_two_different_products_differ_in_what_one_of_them_lacks():
    def one(tech, uva_status, uva, peak):
        return {"input": {"quantity": "irradiance", "path": tech}, "conditions": {},
                "bands": {"UV-A": {"value": uva, "unit": "W m-2", "status": uva_status,
                                   "detection_limit": 1e-5,
                                   "below_detection": uva_status == "below-detection"}},
                "spectral": {"peak_nm": peak},
                "germicidal": {"technology": {"id": tech, "name": tech.replace("_", " ")}}}
    c = compare(one("uvc_led", "below-detection", 2e-6, 265.2),
                one("low_pressure_mercury", "complete", 0.012, 253.7))
    d = " | ".join(c["differences"])
    assert "UV-A: found in the reference only (sample < 1.00e-05, reference 0.012" in d
    assert "peak: sample 265.2 nm, reference 253.7 nm" in d
    assert "probably not the same product" in d
    # and peaks within 1 nm are one peak (our own rule)
    c2 = compare(one("uvc_led", "complete", 1.0, 265.2), one("uvc_led", "complete", 1.0, 265.6))
    assert c2["differences"] == []
