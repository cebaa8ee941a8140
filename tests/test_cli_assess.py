"""The assess command through typer's test runner, and the start-up budget."""

from __future__ import annotations

import json
import math
import subprocess
import sys

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.io.reader import read_spectrum
from uvcheck.spectrum import integrate

runner = CliRunner()


@pytest.fixture
def lamp_file(tmp_path):
    wl = np.arange(240.0, 800.0, 0.5)
    v = gaussian(wl, 253.7, 0.6, 0.8) + gaussian(wl, 546.1, 0.6, 0.2)
    p = tmp_path / "lamp one.csv"   # a space in the name on purpose
    p.write_text("Wavelength (nm),Irradiance (uW/cm2/nm)\n"
                 + "\n".join(f"{a:.1f},{b * 100:.8e}" for a, b in zip(wl, v)), encoding="utf-8")
    return p


def test_assess_prints_summary(lamp_file):
    r = runner.invoke(app, ["assess", str(lamp_file)])
    assert r.exit_code == 0, r.output
    assert "Emission by band" in r.output and "µW/cm²" in r.output
    assert "Hg 253.7 nm" in r.output


def test_json_numbers_equal_direct_computation(lamp_file, tmp_path):
    out = tmp_path / "r.json"
    r = runner.invoke(app, ["assess", str(lamp_file), "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text(encoding="utf-8"))
    assert d["schema"] == "uvcheck.assessment/1"
    assert set(d["bands"]) >= {"below-200nm", "UV-C", "far-UVC", "UV-B", "UV-A", "visible", "IR-A"}
    spec, _ = read_spectrum(lamp_file)
    direct = integrate(spec, 200.0, 280.0).value
    assert d["bands"]["UV-C"]["value"] == pytest.approx(direct, rel=1e-6)
    assert d["bands"]["UV-C"]["value"] == pytest.approx(0.8, rel=1e-4)  # analytic Gaussian area
    for key in ("path", "sha256", "quantity", "unit", "range_nm", "step_nm", "inferred", "warnings"):
        assert key in d["input"]


def test_json_to_stdout_is_pure_json(lamp_file):
    r = runner.invoke(app, ["assess", str(lamp_file), "--json", "-"])
    assert r.exit_code == 0
    assert json.loads(r.stdout)["tool"]["name"] == "uvcheck"


def test_no_overwrite_without_force(lamp_file, tmp_path):
    out = tmp_path / "r.json"
    out.write_text("keep me")
    r = runner.invoke(app, ["assess", str(lamp_file), "--json", str(out)])
    assert r.exit_code == 2
    assert out.read_text() == "keep me"
    r = runner.invoke(app, ["assess", str(lamp_file), "--json", str(out), "--force"])
    assert r.exit_code == 0 and out.read_text().startswith("{")


def test_bad_input_one_line_exit_2(tmp_path):
    p = tmp_path / "empty.csv"
    p.write_text("")
    r = runner.invoke(app, ["assess", str(p)])
    assert r.exit_code == 2
    assert "empty" in r.stderr and "Traceback" not in r.stderr
    assert len(r.stderr.strip().splitlines()) == 1


def test_relative_scaling_recorded(tmp_path):
    wl = np.arange(250.0, 800.0, 1.0)
    p = tmp_path / "rel.csv"
    p.write_text("\n".join(f"{a},{b}" for a, b in zip(wl, gaussian(wl, 395, 6, 1.0))))
    out = tmp_path / "r.json"
    r = runner.invoke(app, ["assess", str(p), "--scale-band", "UV-A=1000 uW/cm2", "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    assert d["bands"]["UV-A"]["value"] == pytest.approx(10.0, rel=1e-9)  # 1000 µW/cm² = 10 W/m²
    assert d["input"]["scaling"][0]["method"] == "band reading"
    r = runner.invoke(app, ["assess", str(p), "--scale-lux", "100"])
    assert "lux says nothing about UV" in r.output
    # a relative spectrum has no calibration to replace: no such warning, the factor recorded
    # (the Gaussian's share inside 315–400 nm, analytic: ½[erf(5/(6√2)) − erf(−80/(6√2))])
    inside = 0.5 * (math.erf(5 / (6 * math.sqrt(2))) - math.erf(-80 / (6 * math.sqrt(2))))
    assert d["input"]["scaling"][0]["factor"] == pytest.approx(10.0 / inside, rel=1e-3)
    assert "replaces that calibration" not in r.output
    assert not any("replaces that calibration" in w for w in d["input"]["warnings"])


def test_scaling_an_absolute_spectrum_says_it_replaces_the_calibration(tmp_path):
    # an invented 395 nm LED in W/m2/nm (area 2 W m-2): a band reading of 1000 µW/cm²
    # (10 W m-2, analytic) in UV-A, where the Gaussian lies whole, multiplies it by 5
    wl = np.arange(250.0, 800.0, 1.0)
    p = tmp_path / "abs.csv"
    p.write_text("wavelength (nm),irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a},{b:.9e}" for a, b in zip(wl, gaussian(wl, 357.5, 6, 2.0))))
    out = tmp_path / "a.json"
    r = runner.invoke(app, ["assess", str(p), "--scale-band", "UV-A=1000 uW/cm2", "--json",
                            str(out), "--no-uncertainty"])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    s = d["input"]["scaling"][0]
    assert s["replaced_calibration"] is True and s["factor"] == pytest.approx(5.0, rel=1e-6)
    assert any("replaces that calibration, multiplying every value by 5" in w
               for w in d["input"]["warnings"])
    assert "replaces that calibration" in r.output


def test_python_dash_m_and_console_script(lamp_file):
    r = subprocess.run([sys.executable, "-m", "uvcheck", "--version"], capture_output=True, text=True)
    assert r.returncode == 0 and r.stdout.startswith("uvcheck ")


def test_help_imports_no_heavy_modules():
    # DESIGN.md start-up budget: `uvcheck --help` imports none of these
    code = ("import sys\nfrom uvcheck.cli import app\n"
            "try:\n    app(['--help'], prog_name='uvcheck')\nexcept SystemExit:\n    pass\n"
            "heavy = [m for m in ('numpy', 'pandas', 'scipy', 'colour', 'matplotlib') if m in sys.modules]\n"
            "print('HEAVY:' + ','.join(heavy))")
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert r.returncode == 0, r.stderr
    assert r.stdout.strip().splitlines()[-1] == "HEAVY:"


def test_assess_path_needs_numpy_only(lamp_file):
    # DESIGN.md: the plain assessment path needs numpy only
    code = ("import sys\nfrom uvcheck.cli import app\n"
            f"try:\n    app(['assess', {str(lamp_file)!r}, '--quiet'], prog_name='uvcheck')\n"
            "except SystemExit as e:\n    assert e.code in (0, None), e.code\n"
            "heavy = [m for m in ('pandas', 'scipy', 'colour', 'matplotlib') if m in sys.modules]\n"
            "print('HEAVY:' + ','.join(heavy))")
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert r.returncode == 0, r.stderr
    assert r.stdout.strip().splitlines()[-1] == "HEAVY:"


def test_hazard_sections_in_json(lamp_file, tmp_path):
    # issue 3 JSON contract: hazards, risk_group, evaluation; blue light as E_B without a size
    out = tmp_path / "h.json"
    r = runner.invoke(app, ["assess", str(lamp_file), "--distance", "1 m", "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    assert set(d["hazards"]) == {"actinic_uv", "near_uv", "blue_light", "retinal_thermal",
                                 "retinal_thermal_weak_stimulus", "ir_eye", "skin_thermal"}
    for h in d["hazards"].values():
        assert {"symbol", "value", "unit", "limit", "t_max_s", "risk_group",
                "risk_group_is_lower_bound", "coverage", "status", "assumptions"} <= set(h)
    assert d["hazards"]["blue_light"]["symbol"] == "E_B"
    assert set(d["risk_group"]) >= {"group", "is_lower_bound", "governing"}
    assert d["evaluation"]["distance_m"] == pytest.approx(0.2)
    assert d["evaluation"]["limit_set"] == "iec62471_2006"
    # 0.8 W/m² of 253.7 nm at 1 m: at 0.2 m E_S = 0.8·S(253.7)·25 ≈ 10 W/m² -> RG3
    assert d["risk_group"]["group"] == "RG3" and d["risk_group"]["governing"] == "actinic_uv"
    r = runner.invoke(app, ["assess", str(lamp_file), "--source-size", "20", "--distance", "1 m", "--json", "-"])
    assert json.loads(r.stdout)["hazards"]["blue_light"]["symbol"] == "L_B"


def test_debug_shows_the_traceback(tmp_path):
    # DESIGN.md errors: one line without --debug, the traceback with it
    p = tmp_path / "empty.csv"
    p.write_text("")
    r = subprocess.run([sys.executable, "-m", "uvcheck", "--debug", "assess", str(p)],
                       capture_output=True, text=True)
    assert r.returncode != 0 and "Traceback" in r.stderr and "InputFormatError" in r.stderr
    r = subprocess.run([sys.executable, "-m", "uvcheck", "assess", str(p)], capture_output=True, text=True)
    assert r.returncode == 2 and "Traceback" not in r.stderr


def _claims_json(*extra: str) -> dict:
    from pathlib import Path

    ex = Path(__file__).resolve().parents[1] / "examples"
    r = runner.invoke(app, ["assess", str(ex / "spectra" / "mercury_tube_254nm.txt"),
                            "--distance", "1 m", "--claims",
                            str(ex / "listings" / "mercury_tube_sold_pet_safe.toml"),
                            "--no-uncertainty", "--json", "-", "--quiet", *extra])
    assert r.exit_code in (0, 1), r.output
    return json.loads(r.stdout[r.stdout.index("{"):])


def test_emitter_option_chooses_the_distance_model():
    # the claim 'kills 99.9 % ... in 15 minutes' is judged at the listing's distance of use
    # (2 m): a 0.55 m tube measured at 1 m falls off more slowly than 1/d² near it (Keitz),
    # so it delivers more there than the inverse-square point model says
    tube = _claims_json()                                   # the listing says tube, 0.55 m
    point = _claims_json("--emitter", "point")
    assert tube["conditions"]["emitter"] == "tube" and point["conditions"]["emitter"] == "point"
    kt = next(c for c in tube["claims"] if c["id"] == "kill")["available"]["value"]
    kp = next(c for c in point["claims"] if c["id"] == "kill")["available"]["value"]
    assert kt > kp
    longer = _claims_json("--tube-length", "1.2 m")
    assert longer["conditions"]["tube_length_m"] == pytest.approx(1.2)


@pytest.mark.parametrize("args, where", [(["--emitter", "disc"], "--emitter"),
                                         (["--emitter", "point", "--tube-length", "1 m"],
                                          "--tube-length")])
def test_emitter_option_errors_name_the_option(args, where):
    from pathlib import Path

    ex = Path(__file__).resolve().parents[1] / "examples"
    r = runner.invoke(app, ["assess", str(ex / "spectra" / "mercury_tube_254nm.txt"), *args])
    assert r.exit_code == 2
    assert where in r.output and "Traceback" not in r.output


def test_terminal_names_hazards_and_action_spectra_in_words(lamp_file):
    # the lamp file stops at 800 nm: the infrared hazards are open, so the group is a lower
    # bound and the "could be higher" line lists them; every hazard is named by its IEC 62471
    # symbol (E_S, L_R, E_IR), never by the JSON key
    r = runner.invoke(app, ["assess", str(lamp_file), "--distance", "0.5 m"])
    assert r.exit_code == 0, r.output
    import re

    named = re.findall(r"set by (\S+?)[),;]?(?:\s|$)", r.output)
    assert named and all(n.startswith(("E_", "L_")) for n in named), named
    for key in ("actinic_uv", "near_uv", "blue_light", "retinal_thermal", "ir_eye",
                "germicidal_dna", "germicidal_classical", "uvc_unweighted"):
        assert key not in r.output, key
    assert "claims use the most favourable: " in r.output


def test_partly_measured_hazard_below_detection_reads_as_such(tmp_path):
    # An invented blue-LED file measured from 260 nm (E_S is weighted from 200 nm in
    # IEC 62471:2006) with UV at noise level: the E_S row is a "<" value, not a lower bound,
    # and its hazard distances are not determinable (no bound either way) rather than
    # "at least" distances computed from noise.
    rng = np.random.default_rng(1)
    wl = np.arange(260.0, 1000.0, 0.5)
    v = gaussian(wl, 450.0, 10.0, 0.01) + 6e-7 + rng.normal(0, 2e-6, wl.size)
    p = tmp_path / "blue.csv"
    p.write_text("wavelength_nm,irradiance_W_m2_nm\n"
                 + "\n".join(f"{a:.2f},{b:.4e}" for a, b in zip(wl, v)), encoding="utf-8")
    r = runner.invoke(app, ["assess", str(p), "--distance", "0.2 m", "--no-uncertainty"])
    assert r.exit_code == 0, r.output
    row = next(ln for ln in r.output.splitlines() if ln.strip().startswith("E_S actinic"))
    assert "< " in row and "so far" in row and "partly measured, below detection" in row
    assert "lower bound" not in row
    dist = next(ln for ln in r.output.splitlines() if ln.strip().startswith("E_S:"))
    assert "not determinable" in dist and "at least" not in dist
    # the band table words a partly measured band under its detection limit the same way
    uvc = next(ln for ln in r.output.splitlines() if ln.strip().startswith("UV-C "))
    assert "< " in uvc and "partly measured, below detection" in uvc and "lower bound" not in uvc


@pytest.mark.parametrize("case", ["gap", "edge"])
def test_a_peak_at_a_gap_or_the_data_edge_is_flagged(tmp_path, case):
    # invented files: a violet band at 410 nm whose top falls in a 399-420 nm gap, and a
    # UV-C LED at 265 nm measured from 270 nm only: the highest sample is not the lamp's peak,
    # and the terminal and the note say so
    from uvcheck.cli_note import note_result
    from uvcheck.report.note import spectral_facts

    if case == "gap":
        wl = np.concatenate([np.arange(200.0, 400.0), np.arange(420.0, 900.0)])
        v = gaussian(wl, 410.0, 8.0, 0.5)
    else:
        wl = np.arange(270.0, 500.0, 0.5)
        v = gaussian(wl, 265.0, 5.0, 0.01)
    v = v + 1e-6 * np.sin(wl)
    p = tmp_path / f"{case}.csv"
    p.write_text("wavelength_nm,irradiance_W_m2_nm\n"
                 + "\n".join(f"{a:.1f},{b:.6e}" for a, b in zip(wl, v)), encoding="utf-8")
    r = runner.invoke(app, ["assess", str(p), "--no-uncertainty"])
    assert r.exit_code == 0, r.output
    words = "edge of a gap" if case == "gap" else "end of the data"
    assert words in r.output
    res, _ = note_result(p, None)
    peak = next(f for f in spectral_facts(res) if f["label"] == "Peak")
    assert words in peak["value"]


def test_a_peak_inside_the_data_is_not_flagged(lamp_file):
    r = runner.invoke(app, ["assess", str(lamp_file)])
    assert "edge of a gap" not in r.output and "end of the data" not in r.output
