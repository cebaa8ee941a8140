"""A wavelength scale that is off, revealed by the mercury lines (features.mercury_scale_shift).

A spectrometer whose wavelength calibration has drifted shows a mercury lamp's lines all
moved by one amount; the lines' known wavelengths are the usual check. Before this check a
mercury spectrum shifted by 2.2 nm read "Mercury 253.7 nm line: not found" with no word on
the scale. Line wavelengths: data/emitters/emission_lines.csv (253.7 nm from the project's
reference notes; 365.0, 435.8, 546.1 nm from memory, NIST Atomic Spectra Database). The
matching rules (three lines, half the peaks, 0.5 nm, ±5 nm) are our own. Invented spectra.
"""

from __future__ import annotations

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.assessment import assess
from uvcheck.cli import app
from uvcheck.conditions import Conditions
from uvcheck.features import DetectedLine, mercury_scale_shift
from uvcheck.spectrum import Spectrum

WL = np.arange(200.0, 800.0, 0.5)
HG = ((253.7, 0.05), (365.0, 0.004), (435.8, 0.006), (546.1, 0.007))


def mercury(shift: float, seed: int = 2) -> Spectrum:
    rng = np.random.default_rng(seed)
    v = sum(a * np.exp(-0.5 * ((WL - w - shift) / 1.0) ** 2) for w, a in HG)
    return Spectrum(WL, v + 1e-6 + rng.normal(0, 1e-6, WL.size), "irradiance")


@pytest.mark.parametrize("shift", [2.2, -1.6, 3.9])
def test_a_shifted_mercury_spectrum_is_flagged(shift):
    d = assess(mercury(shift), Conditions(measurement_distance_m=1.0)).to_dict()
    sh = d["spectral"]["wavelength_scale_shift"]
    assert sh is not None and sh["shift_nm"] == pytest.approx(shift, abs=0.15)
    assert {r for _, r in sh["matched"]} == {w for w, _ in HG}
    assert any(f"shifted by {shift:+.1f} nm" in w for w in d["warnings"])
    assert d["spectral"]["hg_253_7_present"] is False


@pytest.mark.parametrize("shift", [0.0, 0.6])
def test_a_scale_within_the_identification_tolerance_is_not_flagged(shift):
    d = assess(mercury(shift), Conditions(measurement_distance_m=1.0)).to_dict()
    assert d["spectral"]["wavelength_scale_shift"] is None
    assert d["spectral"]["hg_253_7_present"] is True


def test_the_terminal_says_which_peak_the_line_would_be(tmp_path):
    s = mercury(2.2)
    p = tmp_path / "shifted.csv"
    p.write_text("nm,W/m2/nm\n" + "\n".join(f"{a:.1f},{b:.6e}" for a, b in
                                           zip(s.wavelength_nm, s.values)) + "\n", encoding="utf-8")
    r = CliRunner().invoke(app, ["assess", str(p), "--no-uncertainty"])
    line = next(ln for ln in r.output.splitlines() if ln.startswith("Mercury 253.7 nm line"))
    assert line.startswith("Mercury 253.7 nm line: not found at 253.7 nm; the peak at 255.9 nm")
    assert "+2.2 nm" in line


def _lines(ws, named=()):
    return [DetectedLine(float(w), 1.0, 1.0, 50.0, named[k] if k < len(named) else None)
            for k, w in enumerate(ws)]


def test_a_fluorescent_lamps_phosphor_peaks_do_not_make_a_shift():
    # named mercury lines at their places outvote phosphor peaks (487, 543, 611 nm)
    ls = _lines([404.7, 435.8, 546.1, 487.0, 543.0, 611.0],
                ("Hg 404.7 nm", "Hg 435.8 nm", "Hg 546.1 nm"))
    assert mercury_scale_shift(ls, 0.5) is None


def test_random_narrow_peaks_rarely_line_up():
    # 2000 sets of 10 random line-like peaks over 220-700 nm (seeded): false alarms stay rare
    rng = np.random.default_rng(0)
    hits = sum(mercury_scale_shift(_lines(np.sort(rng.uniform(220, 700, 10))), 0.5) is not None
               for _ in range(2000))
    assert hits <= 2


def test_the_correction_puts_the_lines_back(tmp_path):
    # --wavelength-correction adds a constant to every wavelength: the shifted spectrum,
    # corrected by -2.2 nm, names its mercury lines and shows no shift; the correction is
    # reported, bounded, and read from a manifest too
    import json

    s = mercury(2.2)
    p = tmp_path / "shifted.csv"
    p.write_text("nm,W/m2/nm\n" + "\n".join(f"{a:.1f},{b:.6e}" for a, b in
                                           zip(s.wavelength_nm, s.values)) + "\n", encoding="utf-8")
    out = tmp_path / "r.json"
    r = CliRunner().invoke(app, ["assess", str(p), "--no-uncertainty", "--quiet",
                                 "--wavelength-correction", "-2.2 nm", "--json", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text())
    assert d["spectral"]["hg_253_7_present"] is True
    assert d["spectral"]["wavelength_scale_shift"] is None
    assert d["input"]["range_nm"] == pytest.approx([197.8, 797.3])
    assert any(w.startswith("every wavelength corrected by -2.2 nm") for w in d["input"]["warnings"])
    r = CliRunner().invoke(app, ["assess", str(p), "--wavelength-correction", "-30 nm"])
    assert r.exit_code == 2 and "more than a calibration error" in r.output
    m = tmp_path / "m.csv"
    m.write_text("id,spectrum,wavelength_correction\nfixed,shifted.csv,-2.2 nm\n", encoding="utf-8")
    from uvcheck import batch as B

    row = B.run_product(B.read_manifest(m)[0], B.BatchSettings())
    assert row["status"] == "ok" and row["peak_nm"] == pytest.approx(253.7, abs=0.15)
