"""Scaling by a meter reading with the meter's spectral response. The check values are
computed here with numpy's trapezoid rule on the same points: the meter reads
R = ∫ s(λ)·E(λ) dλ (s normalised to 1 at its peak), so the absolute spectrum is E_rel·R/∫ s·E_rel.
The invented meter is flat at 254 nm and falls to half at 280 nm; the invented lamp is a
275 nm LED, where a meter calibrated on the mercury line under-reads."""

from __future__ import annotations

import json

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.errors import ConfigurationError
from uvcheck.scaling import read_meter_response, scale_by_band
from uvcheck.spectrum import Spectrum, integrate

WL = np.arange(200.0, 330.0 + 1e-9, 0.5)
E_REL = np.exp(-0.5 * ((WL - 275.0) / 5.0) ** 2) + 1e-6
RESP_WL = np.array([240.0, 254.0, 280.0, 300.0])
RESP = np.array([0.9, 1.0, 0.5, 0.0])


def write_response(path):
    path.write_text("Wavelength (nm),Response\n" + "\n".join(
        f"{a},{b}" for a, b in zip(RESP_WL, RESP)) + "\n", encoding="utf-8")
    return path


def test_reading_is_the_response_weighted_integral(tmp_path):
    meter = read_meter_response(write_response(tmp_path / "meter.csv"))
    rel = Spectrum(WL, E_REL, "relative", noise_floor=1e-7)
    out = scale_by_band(rel, "UV-C=100 uW/cm2", meter)      # 100 µW/cm² = 1 W/m²
    s = np.interp(WL, RESP_WL, RESP, left=0.0, right=0.0)
    m = (WL >= 240.0) & (WL <= 300.0)
    k = 1.0 / np.trapezoid(s[m] * E_REL[m], WL[m])
    assert out.quantity == "irradiance"
    assert out.values == pytest.approx(E_REL * k, rel=1e-6)
    rec = out.meta["scaling"][-1]
    flat = np.trapezoid(E_REL[WL <= 280], WL[WL <= 280])
    assert rec["spectral_mismatch"] == pytest.approx(flat * k, rel=1e-3)
    assert rec["spectral_mismatch"] > 1.0     # the meter under-reads a 275 nm LED
    assert "spectral mismatch" in rec["note"]


def test_the_spectrum_must_cover_the_meters_range(tmp_path):
    meter = read_meter_response(write_response(tmp_path / "meter.csv"))
    narrow = Spectrum(WL[WL >= 250.0], E_REL[WL >= 250.0], "relative")
    with pytest.raises(ConfigurationError, match="meter's response"):
        scale_by_band(narrow, "UV-C=100 uW/cm2", meter)


def test_cli_meter_response_needs_a_band_reading(tmp_path):
    spec = tmp_path / "led.csv"
    spec.write_text("Wavelength (nm),Counts\n" + "\n".join(
        f"{a},{b:.6e}" for a, b in zip(WL, E_REL)) + "\n", encoding="utf-8")
    meter = write_response(tmp_path / "meter.csv")
    r = CliRunner().invoke(app, ["assess", str(spec), "--meter-response", str(meter),
                                 "--no-uncertainty"])
    assert r.exit_code == 2 and "--scale-band" in r.output
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["assess", str(spec), "--scale-band", "UV-C=100 uW/cm2",
                                 "--meter-response", str(meter), "--distance", "10 cm",
                                 "--no-uncertainty", "--json", str(out)])
    assert r.exit_code == 0, r.output
    rec = json.loads(out.read_text())["input"]["scaling"][-1]
    assert rec["method"] == "band reading with the meter's response"
