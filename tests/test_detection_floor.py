"""Detection limits that an instrument could have: the dynamic-range floor of the noise, partly
covered bands below detection, one far-UVC detection limit, and what a spectrum that sits below
zero gives.

Expected values are analytic (the noise floor is 1e-6, common practice, of the peak; a
detection limit is 3 σ·‖c‖ with c the trapezoid coefficients, the IUPAC k = 3 convention) or
come from the bundled invented example examples/spectra/mercury_tube_254nm.txt.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.assessment import assess
from uvcheck.bands import band_breakdown
from uvcheck.features import DYNAMIC_RANGE_FLOOR, dynamic_range_floor, estimate_noise
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.io.reader import read_spectrum
from uvcheck.photometry import photometry
from uvcheck.report.note import band_rows
from uvcheck.report.terminal import render_assessment
from uvcheck.spectrum import Spectrum

EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "spectra"
WL = np.arange(250.0, 800.0 + 1e-9, 1.0)
LED = gaussian(WL, 450.0, 10.0, 0.025)  # invented blue LED, 0.025 W m-2, 450 nm, σ 10 nm


def _file(tmp_path: Path, wl: np.ndarray, v: np.ndarray, name: str = "s.csv",
          header: str = "nm,irradiance (W/m2/nm)") -> Path:
    p = tmp_path / name
    p.write_text(header + "\n" + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(wl, v)) + "\n",
                 encoding="utf-8")
    return p


# ---------------------------------------------------------------------------------------------
# Dynamic-range floor
# ---------------------------------------------------------------------------------------------

def test_floor_is_common_practice_fraction_of_peak():
    assert DYNAMIC_RANGE_FLOOR == 1e-6  # common practice (features.py)
    assert dynamic_range_floor(np.array([0.0, -3.0, 2.0])) == pytest.approx(3e-6)
    assert dynamic_range_floor(np.zeros(5)) == 0.0


def test_noise_free_data_get_the_floor_not_a_tiny_sigma():
    e = estimate_noise(LED)
    peak = float(LED.max())
    assert e.method == "dynamic-range floor"
    assert e.sigma == pytest.approx(1e-6 * peak, rel=1e-12)
    assert e.floor == e.sigma and e.floor_fraction == 1e-6
    # the data's own estimate is kept, and it is (far) below the floor
    assert e.data_method == "second-difference" and e.data_sigma < e.sigma
    assert "common practice" in e.basis and "dynamic-range floor" in e.basis
    assert e.to_dict()["method"] == "dynamic-range floor"


def test_real_noise_above_the_floor_is_kept():
    rng = np.random.default_rng(11)
    e = estimate_noise(LED + rng.normal(0.0, 1e-5, LED.size))
    assert e.method == "negative-samples"
    assert e.sigma == pytest.approx(1e-5, rel=0.15)
    assert e.floor == pytest.approx(1e-6 * float(LED.max()), rel=0.05) and e.sigma > e.floor


def test_all_zero_spectrum_keeps_sigma_zero():
    e = estimate_noise(np.zeros(100))
    assert e.sigma == 0.0 and e.method == "second-difference"


def test_floor_can_be_turned_off():
    e = estimate_noise(LED, floor_fraction=0.0)
    assert e.method == "second-difference" and e.sigma < 1e-30


def test_reader_records_the_floor_and_warns(tmp_path):
    spec, rep = read_spectrum(_file(tmp_path, WL, LED))
    peak = float(LED.max())
    assert rep.noise["method"] == "dynamic-range floor"
    assert spec.noise_floor == pytest.approx(1e-6 * peak, rel=1e-5)  # 7 digits in the file
    assert rep.noise["data_sigma"] < spec.noise_floor
    assert any("dynamic-range floor, common practice" in w for w in rep.warnings)


def test_tiny_tail_is_below_detection_not_a_number(tmp_path):
    # UV-A (315-400 nm) of a 450 nm, 10 nm-σ Gaussian: the tail below 400 nm (5 σ) is
    # Φ(-5) = 2.87e-7 of 0.025 W m-2 = 7.2e-9 W m-2 (normal distribution, analytic), under the
    # floor's detection limit 3·σ·√85 = 2.8e-8 W m-2 (1 nm steps, 85 samples; σ = 1e-6 of the
    # peak 9.97e-4 W m-2 nm-1)
    spec, _ = read_spectrum(_file(tmp_path, WL, LED))
    b = band_breakdown(spec)
    uva = b["UV-A"]
    assert uva.status == "below-detection" and uva.value is None
    assert uva.detection_limit == pytest.approx(3 * spec.noise_floor * math.sqrt(85.0), rel=0.01)
    text = render_assessment(assess(spec).to_dict())
    table = text.split("Emission by band")[1].split("Peak")[0]
    assert f"< {uva.detection_limit:.3g}" in table
    # no absurd magnitudes (the floor keeps everything within 1e-6 of the peak and 3 σ)
    assert all(int(x) < 12 for x in re.findall(r"e-(\d+)", table))


# ---------------------------------------------------------------------------------------------
# A partly covered band, below detection in the measured part
# ---------------------------------------------------------------------------------------------

def test_partial_band_below_detection_stays_partial():
    spec, _ = read_spectrum(EXAMPLES / "mercury_tube_254nm.txt")
    d = assess(spec).to_dict()
    ira = d["bands"]["IR-A"]
    assert ira["coverage"] < 0.05  # 780-800 nm of 780-1400 nm (the example ends at 800 nm)
    assert ira["status"] == "partial" and ira["is_lower_bound"]
    assert ira["below_detection"] and ira["value"] is None and ira["detection_limit"] > 0
    row = next(r for r in render_assessment(d).splitlines() if r.strip().startswith("IR-A"))
    # 3.23 % = 20 nm / 620 nm: 780-800 nm measured of IR-A 780-1400 nm (the CIE IR-A band,
    # as bands.py states it)
    assert "so far" in row and "partly measured" in row and "3.23 %" in row
    assert "below detection limit" not in row
    note_row = next(r for r in band_rows(d) if r["band"] == "IR-A")
    assert note_row["value"].startswith("< ") and note_row["value"].endswith("so far")


def test_fully_covered_band_below_detection_unchanged():
    spec, _ = read_spectrum(EXAMPLES / "mercury_tube_254nm.txt")
    far = band_breakdown(spec)["far-UVC"]
    assert far.status == "below-detection" and far.below_detection and not far.is_lower_bound


# ---------------------------------------------------------------------------------------------
# One far-UVC detection limit
# ---------------------------------------------------------------------------------------------

def test_far_uvc_detection_limit_is_one_number():
    # band table and germicidal section integrate the same 200-235 nm with the same noise
    # floor; the germicidal upper bound (apparent value + 3 σ) is a different quantity and
    # must not be printed as the "<" value
    spec, _ = read_spectrum(EXAMPLES / "mercury_tube_254nm.txt")
    d = assess(spec).to_dict()
    band, germ = d["bands"]["far-UVC"], d["germicidal"]["far_uvc"]
    assert band["range_nm"] == germ["range_nm"] == [200.0, 235.0]
    assert band["detection_limit"] == pytest.approx(germ["detection_limit"], rel=1e-12)
    assert band["upper_bound"] == pytest.approx(germ["upper_bound"], rel=1e-12)
    text = render_assessment(d)
    dl = f"< {band['detection_limit']:.3g}"
    far_rows = [ln for ln in text.splitlines() if "far-UVC" in ln and "<" in ln]
    assert far_rows and all(dl in ln for ln in far_rows)
    assert all(f"< {germ['upper_bound']:.3g}" not in ln for ln in far_rows)


# ---------------------------------------------------------------------------------------------
# Mostly negative spectra
# ---------------------------------------------------------------------------------------------

def test_mostly_negative_is_warned_with_the_count(tmp_path):
    rng = np.random.default_rng(5)
    v = -LED + rng.normal(0.0, 1e-6, WL.size)
    _, rep = read_spectrum(_file(tmp_path, WL, v))
    n_neg = int(np.count_nonzero(np.array([float(f"{x:.6e}") for x in v]) < 0))
    assert n_neg > WL.size / 2
    w = [x for x in rep.warnings if "are negative" in x]
    assert len(w) == 1 and w[0].startswith(f"{n_neg} of {WL.size} samples")
    assert "dark (background) subtraction" in w[0]


def test_half_negative_noise_is_not_warned(tmp_path):
    rng = np.random.default_rng(6)
    v = LED + rng.normal(0.0, 1e-6, WL.size)  # noise around zero far from the peak
    _, rep = read_spectrum(_file(tmp_path, WL, v))
    assert not any("are negative" in x for x in rep.warnings)


def test_negative_illuminance_is_never_printed():
    # a white-ish source with its sign flipped, noise floor given: the V(λ) integral is far
    # more negative than its detection limit
    s = Spectrum(WL, -gaussian(WL, 555.0, 40.0, 1.0), "irradiance", noise_floor=1e-6)
    ph = photometry(s)
    assert ph.value is None and ph.status == "not-meaningful"
    assert "negative" in ph.value_note and "dark" in ph.value_note
    text = render_assessment(assess(s).to_dict())
    line = next(ln for ln in text.splitlines() if ln.startswith("Illuminance"))
    assert "not given" in line and " lx" in line and "-" not in line.split("(")[0]


def test_illuminance_below_detection_is_not_a_number():
    # 1 W m-2 at 300 nm: V(λ) there is 0 in the CIE table; the tail of the line gives only
    # noise-level luminous values
    s = Spectrum(WL, gaussian(WL, 300.0, 3.0, 1.0), "irradiance", noise_floor=1e-3)
    ph = photometry(s)
    assert ph.status == "below-detection" and ph.value is None
    assert ph.detection_limit > 0 and "detection limit" in ph.value_note


def test_germicidal_noise_basis_names_the_floor():
    # a spectrum built without a noise floor: germicidal estimates it, and the floor applies
    wl = np.arange(240.0, 300.0, 0.5)
    s = Spectrum(wl, gaussian(wl, 270.0, 5.0, 0.01), "irradiance")
    g = evaluate_germicidal(s)
    assert "dynamic-range floor" in g.noise["basis"]
    assert g.noise["sigma"] == pytest.approx(1e-6 * float(gaussian(wl, 270.0, 5.0, 0.01).max()))
