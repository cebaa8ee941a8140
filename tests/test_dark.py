"""A dark (background) scan subtracted from a lamp scan (uvcheck.background, --dark).

Checks: the difference is the lamp's own signal to rounding of the files (an invented
mercury-line signal on an invented dark level, written as counts); its noise is the root sum
of squares of the two scans' noise (JCGM 100:2008 §5.1.2, the law of propagation of
uncertainty for a difference of uncorrelated quantities); the reader's "dark level not
subtracted" warning is replaced by the same check on the result; a dark on another grid is
interpolated over the range both cover, never extrapolated; scans of different quantities,
or a swapped pair, are refused or flagged; the batch manifest's ``dark`` column and
``--resume`` follow the dark file's bytes.
"""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.background import subtract_dark
from uvcheck.cli import app
from uvcheck.errors import ConfigurationError
from uvcheck.io import reader
from uvcheck.pipeline import ProductInputs, assess_files
from uvcheck.spectrum import Spectrum

WL = np.round(np.linspace(220.0, 880.0, 2048), 3)
#: invented: the lamp's own counts (a 253.7 nm and a 365.0 nm line) and a sloping dark level
SIGNAL = 20000 * np.exp(-0.5 * ((WL - 253.7) / 1.0) ** 2) + 600 * np.exp(-0.5 * ((WL - 365) / 1.0) ** 2)
DARK = 800 + 0.05 * (WL - 220)


def write_counts(path: Path, v: np.ndarray, wl: np.ndarray = WL) -> Path:
    path.write_text("Wavelength (nm),Counts\n" + "\n".join(f"{a:.3f},{b:.1f}" for a, b in
                                                          zip(wl, v)) + "\n", encoding="utf-8")
    return path


def pair(tmp_path: Path, seed: int = 1) -> tuple[Path, Path]:
    rng = np.random.default_rng(seed)
    lamp = write_counts(tmp_path / "lamp.csv", SIGNAL + DARK + rng.normal(0, 4, WL.size))
    dark = write_counts(tmp_path / "dark.csv", DARK + rng.normal(0, 4, WL.size))
    return lamp, dark


def test_the_difference_is_the_lamps_own_signal(tmp_path):
    lamp, dark = pair(tmp_path)
    raw, rep = reader.read_spectrum(lamp)
    assert any(reader.BASELINE_MARK in w for w in rep.warnings)   # the level is flagged
    a = assess_files(lamp, None, ProductInputs(dark=dark), None)
    spec = a.spectrum
    np.testing.assert_allclose(spec.values, SIGNAL, atol=30)       # 4-count noise, 2 scans
    d, _ = reader.read_spectrum(dark)
    assert spec.noise_floor == pytest.approx(math.hypot(raw.noise_floor, d.noise_floor))
    warnings = a.report.warnings
    assert not any(reader.BASELINE_MARK in w for w in warnings)   # the offset is gone
    assert any(w.startswith("dark scan dark.csv subtracted, over 220–880 nm") for w in warnings)
    inp = a.to_dict()["input"]
    assert inp["dark"]["level"] == pytest.approx(np.median(DARK), abs=2)
    assert inp["dark"]["unit"] == "relative"
    assert inp["sha256"] != rep.sha256                              # a digest of both files
    assert inp["inferred"]["noise"]["n_negative"] == int((spec.values < 0).sum())


def test_a_dark_on_another_grid_is_interpolated_over_the_shared_range():
    # a dark over 300–500 nm only, on a coarser grid: the result covers 300–500 nm
    wl = np.arange(200.0, 601.0, 1.0)
    lamp = Spectrum(wl, 5.0 + np.where(np.abs(wl - 400) < 5, 10.0, 0.0), "relative", noise_floor=0.3)
    dwl = np.arange(300.0, 501.0, 4.0)
    dark = Spectrum(dwl, 5.0 + 0.001 * (dwl - 300), "relative", noise_floor=0.4)
    out, s = subtract_dark(lamp, dark, "d.csv")
    assert out.range_nm == (300.0, 500.0) and s.range_nm == (300.0, 500.0)
    np.testing.assert_allclose(out.values, lamp.values[100:301] - (5.0 + 0.001 * (wl[100:301] - 300)),
                               atol=1e-12)   # linear interpolation of a linear dark is exact
    assert out.noise_floor == pytest.approx(0.5)  # √(0.3² + 0.4²)


def test_scans_of_different_quantities_are_refused():
    wl = np.arange(200.0, 300.0)
    with pytest.raises(ConfigurationError, match="same quantity"):
        subtract_dark(Spectrum(wl, np.ones(wl.size), "irradiance"),
                      Spectrum(wl, np.ones(wl.size), "relative"), "d.csv")


def test_a_swapped_pair_is_flagged_after_the_subtraction(tmp_path):
    # the dark given as the lamp and the lamp as the dark: the result sits below zero, which
    # the reader's own check reports on the result
    lamp, dark = pair(tmp_path)
    a = assess_files(dark, None, ProductInputs(dark=lamp), None)
    assert any(w.startswith("after the dark subtraction") and "swapped" in w
               for w in a.report.warnings)
    a = assess_files(lamp, None, ProductInputs(dark=dark), None)   # the right way round
    assert not any("swapped" in w for w in a.report.warnings)


def test_the_command_and_the_note_name_the_dark_scan(tmp_path):
    lamp, dark = pair(tmp_path)
    out = tmp_path / "a.json"
    r = CliRunner().invoke(app, ["assess", str(lamp), "--dark", str(dark), "--no-uncertainty",
                                 "--json", str(out)])
    assert r.exit_code == 0, r.output
    assert "dark scan subtracted: dark.csv, median level" in r.output
    assert json.loads(out.read_text())["input"]["dark"]["file"].endswith("dark.csv")
    html = tmp_path / "n.html"
    r = CliRunner().invoke(app, ["note", str(lamp), "--dark", str(dark), "--no-uncertainty",
                                 "--out", str(html), "--no-pdf"])
    assert r.exit_code == 0, r.output
    assert "Dark scan subtracted" in html.read_text(encoding="utf-8")


def test_a_manifest_dark_column_and_resume_follow_the_dark_file(tmp_path):
    lamp, dark = pair(tmp_path)
    m = tmp_path / "manifest.csv"
    (tmp_path / "again.csv").write_bytes(lamp.read_bytes())   # a repeat scan
    m.write_text("id,spectrum,dark,repeats\nwith,lamp.csv,dark.csv,\nwithout,lamp.csv,,\n"
                 "mean,lamp.csv,,again.csv\n", encoding="utf-8")
    out = tmp_path / "summary.csv"
    r = CliRunner().invoke(app, ["batch", str(m), "--out", str(out), "--jobs", "1"])
    assert r.exit_code == 0, r.output
    rows = {x["product_id"]: x for x in csv.DictReader(out.open(encoding="utf-8"))}
    assert rows["with"]["status"] == rows["without"]["status"] == "ok"
    assert reader.BASELINE_MARK in rows["without"]["first_import_warning"]
    # --resume keeps every row while nothing changed (a row from a mean of repeat scans was
    # redone every time before: its fingerprint took the digest of the scans in the run and
    # the spectrum file's bytes on resuming), and redoes the one whose dark scan changed
    args = ["batch", str(m), "--out", str(out), "--jobs", "1", "--resume"]
    r = CliRunner().invoke(app, args)
    assert r.exit_code == 0 and "3 kept from the earlier run" in r.output, r.output
    write_counts(dark, DARK + 1.0)
    r = CliRunner().invoke(app, args)
    assert r.exit_code == 0 and "2 kept from the earlier run" in r.output, r.output


def test_every_baseline_warning_names_the_dark_measurement():
    # the mark _with_dark uses to replace the lamp scan's baseline warnings
    rng = np.random.default_rng(3)
    base = rng.normal(0, 1.0, 400)
    for v in (base + 50.0, base - 3.0, -np.abs(base) * 50 - 1):
        w = reader.baseline_warning(v, 1.0, "relative")
        assert w is not None and reader.BASELINE_MARK in w, v[:3]


def test_a_dark_or_repeat_taken_with_other_settings_is_flagged(tmp_path):
    # a dark must be taken with the lamp scan's integration time and averaging (common
    # practice); a metadata line that says otherwise is reported, for repeat scans too
    lamp, dark = pair(tmp_path)
    for path, it in ((lamp, "100000"), (dark, "200000")):
        path.write_text(f"Integration Time (usec): {it}\nScans to average: 3\n"
                        + path.read_text(encoding="utf-8"), encoding="utf-8")
    a = assess_files(lamp, None, ProductInputs(dark=dark), None)
    said = [w for w in a.report.warnings if "do not combine" in w]
    assert len(said) == 1 and "'200000'" in said[0] and "integration time" in said[0]
    again = tmp_path / "again.csv"
    again.write_text(lamp.read_text(encoding="utf-8").replace("Scans to average: 3",
                                                              "Scans to average: 10"),
                     encoding="utf-8")
    a = assess_files(lamp, None, ProductInputs(repeats=(again,)), None)
    said = [w for w in a.report.warnings if "do not combine" in w]
    assert len(said) == 1 and "averaging" in said[0] and "again.csv" in said[0]
    same = tmp_path / "same.csv"
    same.write_text(lamp.read_text(encoding="utf-8"), encoding="utf-8")
    a = assess_files(lamp, None, ProductInputs(repeats=(same,)), None)
    assert not any("do not combine" in w for w in a.report.warnings)


def test_a_dark_column_of_the_same_file_is_subtracted(tmp_path):
    # exports often hold the dark scan as a column beside the raw one; --dark-column takes
    # it from the same file, with the same checks (invented counts)
    rng = np.random.default_rng(8)
    raw = SIGNAL + DARK + rng.normal(0, 4, WL.size)
    dark = DARK + rng.normal(0, 4, WL.size)
    p = tmp_path / "export.txt"
    p.write_text("Wavelength\tDark\tRaw\n" + "\n".join(
        f"{a:.3f}\t{d:.1f}\t{r:.1f}" for a, d, r in zip(WL, dark, raw)) + "\n", encoding="utf-8")
    a = assess_files(p, None, ProductInputs(dark_column="Dark"), None,
                     reader.ReadOptions(column="Raw"))
    np.testing.assert_allclose(a.spectrum.values, SIGNAL, atol=30)
    assert a.to_dict()["input"]["dark"]["file"] == "export.txt, column 'Dark'"
    assert not any(w.startswith("export.txt, column 'Dark': wavelength unit")
                   for w in a.report.warnings)    # the lamp scan's report says it once
    with pytest.raises(ConfigurationError, match="give one dark scan"):
        ProductInputs(dark=p, dark_column="Dark").check()
    r = CliRunner().invoke(app, ["assess", str(p), "--column", "Raw", "--dark-column", "Dark",
                                 "--no-uncertainty"])
    assert r.exit_code == 0 and "dark scan subtracted: export.txt, column 'Dark'" in r.output
