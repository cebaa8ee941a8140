"""Repeat scans of one lamp: the mean, its noise σ/√n (the standard deviation of a mean,
a type A evaluation in the sense of JCGM 100:2008, section number from memory), the scan-to-scan spread and the 5 % stability rule (our own).
Spectra are invented; expected values are computed here from the same numbers."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.errors import ConfigurationError
from uvcheck.repeats import REPEAT_SPREAD_WARN, combine_scans
from uvcheck.spectrum import Spectrum, integrate

WL = np.arange(220.0, 801.0, 0.5)


def led(amp: float, seed: int) -> np.ndarray:
    rng = np.random.default_rng(seed)
    return amp * 3e-3 * np.exp(-0.5 * ((WL - 365.0) / 6.0) ** 2) + 2e-6 + rng.normal(0, 1e-6, WL.size)


def write(path, values, distance="20 cm"):
    lines = [f"Distance: {distance}", "Wavelength (nm),Irradiance (W/m2/nm)"]
    lines += [f"{a:.1f},{b:.6e}" for a, b in zip(WL, values)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def test_mean_noise_and_spread():
    vals = [led(1.0, 1), led(1.02, 2), led(0.98, 3)]
    scans = [Spectrum(WL, v, "irradiance", noise_floor=1e-6) for v in vals]
    mean, s = combine_scans(scans, ["a", "b", "c"])
    assert mean.values == pytest.approx(np.mean(vals, axis=0), rel=1e-12)
    # σ/√n with σ the larger of the scans' own noise and the median per-sample spread
    between = float(np.median(np.std(vals, axis=0, ddof=1)))
    assert mean.noise_floor == pytest.approx(max(1e-6, between) / math.sqrt(3), rel=1e-9)
    totals = [integrate(x, 220.0, 800.5).value for x in scans]
    assert s.totals == pytest.approx(totals, rel=1e-12)
    assert s.spread == pytest.approx((max(totals) - min(totals)) / np.mean(totals), rel=1e-9)
    assert s.stable and s.spread < REPEAT_SPREAD_WARN


def test_other_grids_are_interpolated_over_the_common_range():
    a = Spectrum(WL, led(1.0, 1), "irradiance")
    wl_b = np.arange(250.0, 901.0, 1.0)
    b = Spectrum(wl_b, np.interp(wl_b, WL, led(1.0, 2), right=2e-6), "irradiance")
    mean, s = combine_scans([a, b])
    assert s.range_nm == (250.0, 800.5)          # the range both scans cover
    assert mean.range_nm == (250.0, 800.5)
    keep = (WL >= 250.0) & (WL <= 800.5)
    assert mean.wavelength_nm == pytest.approx(WL[keep])


def test_scans_of_different_quantities_are_refused():
    a = Spectrum(WL, led(1.0, 1), "irradiance")
    b = Spectrum(WL, led(1.0, 2), "relative")
    with pytest.raises(ConfigurationError, match="one quantity"):
        combine_scans([a, b])


def test_assess_with_repeats_reports_the_mean_and_an_unstable_lamp(tmp_path):
    f1 = write(tmp_path / "s1.csv", led(1.0, 1))
    f2 = write(tmp_path / "s2.csv", led(1.01, 2))
    f3 = write(tmp_path / "s3.csv", led(1.3, 3))       # 30 % more: not stable
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["assess", str(f1), "--repeat", str(f2), "--no-uncertainty",
                                 "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    assert d["input"]["repeats"]["n"] == 2 and d["input"]["repeats"]["stable"] is True
    assert "repeat scans: the mean of 2" in r.output
    single = tmp_path / "one.json"
    CliRunner().invoke(app, ["assess", str(f1), "--no-uncertainty", "--json", str(single)])
    one = json.loads(single.read_text())
    assert one["input"]["repeats"] is None
    # the mean's UV-A lies between the two scans' own
    assert d["bands"]["UV-A"]["value"] == pytest.approx(one["bands"]["UV-A"]["value"] * 1.005,
                                                        rel=2e-3)
    r = CliRunner().invoke(app, ["assess", str(f1), "--repeat", str(f3), "--no-uncertainty"])
    assert r.exit_code == 0 and "lamp not yet stable" in r.output


def test_repeats_taken_at_another_distance_are_refused(tmp_path):
    f1 = write(tmp_path / "s1.csv", led(1.0, 1))
    f2 = write(tmp_path / "s2.csv", led(1.0, 2), distance="50 cm")
    r = CliRunner().invoke(app, ["assess", str(f1), "--repeat", str(f2), "--no-uncertainty"])
    assert r.exit_code == 2 and "one position" in r.output


def test_the_scans_spread_enters_the_uncertainty_as_a_type_a_term(tmp_path):
    # JCGM 100:2008 §4.2: u = s/√n of the mean, s the standard deviation of the n totals
    f1 = write(tmp_path / "s1.csv", led(1.0, 1))
    f2 = write(tmp_path / "s2.csv", led(1.04, 2))
    f3 = write(tmp_path / "s3.csv", led(0.97, 3))
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["assess", str(f1), "--repeat", str(f2), "--repeat", str(f3),
                                 "--draws", "2000", "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    totals = d["input"]["repeats"]["totals"]
    want = float(np.std(totals, ddof=1) / math.sqrt(3) / np.mean(totals))
    rep = d["uncertainty"]["inputs"]["repeatability"]
    assert rep["u_rel"] == pytest.approx(want, rel=1e-6)   # the JSON keeps 7 digits
    assert "type A" in rep["basis"]
    # one scan: no such term
    one = tmp_path / "one.json"
    CliRunner().invoke(app, ["assess", str(f1), "--draws", "2000", "--json", str(one)])
    assert json.loads(one.read_text())["uncertainty"]["inputs"]["repeatability"]["u_rel"] == 0.0


def test_batch_manifest_repeats_column(tmp_path):
    import csv

    write(tmp_path / "s1.csv", led(1.0, 1))
    write(tmp_path / "s2.csv", led(1.01, 2))
    write(tmp_path / "s3.csv", led(0.99, 3))
    (tmp_path / "m.csv").write_text("id,spectrum,repeats\nlamp,s1.csv,s2.csv|s3.csv\n"
                                    "single,s1.csv,\n", encoding="utf-8")
    out = tmp_path / "sum.csv"
    r = CliRunner().invoke(app, ["batch", str(tmp_path / "m.csv"), "--out", str(out)])
    assert r.exit_code == 0, r.output
    rows = {row["product_id"]: row for row in csv.DictReader(out.open(encoding="utf-8"))}
    assert rows["lamp"]["status"] == "ok" and rows["single"]["status"] == "ok"
    # the fingerprint covers every scan's bytes: another repeat file changes it
    assert rows["lamp"]["inputs_sha256"] != rows["single"]["inputs_sha256"]
    lines = [json.loads(x) for x in (tmp_path / "sum.jsonl").read_text().splitlines()]
    assert {x["product_id"] for x in lines} == {"lamp", "single"}
