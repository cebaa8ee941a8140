"""The spectrum as assessed, written out (uvcheck.io.export, assess --export-spectrum).

Cross-checks: the TM-27-14 document is read back by colour-science's own TM-27-14 reader
(``colour.SpectralDistribution_IESTM2714``, a general-purpose library) and by uvcheck's
reader; the CSV table is read back by uvcheck's reader. Both must give the assessed samples
(a dark-subtracted, scaled scan of an invented lamp) to the digits they are written with,
the quantity, and the provenance. Invented data.
"""

from __future__ import annotations

import warnings
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.io.export import write_spectrum
from uvcheck.io.reader import read_spectrum
from uvcheck.pipeline import ProductInputs, assess_files

WL = np.round(np.linspace(230.0, 450.0, 700), 3)


def _counts(path: Path, v: np.ndarray) -> Path:
    path.write_text("# invented test data\nWavelength (nm),Counts\n"
                    + "\n".join(f"{a:.3f},{b:.1f}" for a, b in zip(WL, v)) + "\n",
                    encoding="utf-8")
    return path


@pytest.fixture
def assessed(tmp_path):
    rng = np.random.default_rng(7)
    dark = 500 + rng.normal(0, 3, WL.size)
    lamp = _counts(tmp_path / "lamp.csv", dark + 9000 * np.exp(-0.5 * ((WL - 253.7) / 1.2) ** 2)
                   + rng.normal(0, 3, WL.size))
    d = _counts(tmp_path / "dark.csv", 500 + rng.normal(0, 3, WL.size))
    a = assess_files(lamp, None, ProductInputs(dark=d, scale_total="2 W/m2", distance="40 cm"),
                     None)
    return a, a.to_dict()


def test_a_csv_export_reads_back_as_assessed(tmp_path, assessed):
    a, result = assessed
    p = write_spectrum(a.spectrum, tmp_path / "out.csv", result)
    spec, rep = read_spectrum(p)
    np.testing.assert_array_equal(spec.wavelength_nm, a.spectrum.wavelength_nm)
    np.testing.assert_array_equal(spec.values, a.spectrum.values)   # repr: every digit
    assert spec.quantity == "irradiance" and rep.measurement_distance_m == pytest.approx(0.4)
    text = p.read_text(encoding="utf-8")
    assert f"sha256 of what was assessed: {result['input']['sha256']}" in text
    assert "dark scan subtracted: dark.csv" in text and "scaling: known total (2 W/m2)" in text
    assert "INVENTED data" in text and "not a certification" in text
    # read back, it says it was scaled: no calibrated measurement
    assert any("the file says its values were scaled" in w for w in rep.warnings)


def test_a_tm2714_export_reads_back_in_colour_and_in_uvcheck(tmp_path, assessed):
    from colour import SpectralDistribution_IESTM2714

    a, result = assessed
    p = write_spectrum(a.spectrum, tmp_path / "out.spdx", result)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        sd = SpectralDistribution_IESTM2714(str(p)).read()
    assert sd.spectral_quantity == "irradiance"
    np.testing.assert_allclose(sd.wavelengths, a.spectrum.wavelength_nm, rtol=1e-11)
    # colour-science writes 12 significant digits
    np.testing.assert_allclose(sd.values, a.spectrum.values, rtol=1e-11,
                               atol=1e-12 * np.abs(a.spectrum.values).max())
    assert "dark scan subtracted: dark.csv" in sd.header.comments
    assert "None" not in p.read_text(encoding="utf-8")   # no unset header field
    spec, rep = read_spectrum(p)
    assert spec.quantity == "irradiance"
    np.testing.assert_allclose(spec.values, a.spectrum.values, rtol=1e-11,
                               atol=1e-12 * np.abs(a.spectrum.values).max())
    # the provenance in the comments comes back: the distance and the scaling (before, the
    # distance was lost, and every value then held at an unstated position)
    assert rep.measurement_distance_m == pytest.approx(0.4)
    assert any("the file says its values were scaled" in w for w in rep.warnings)


def test_the_command_checks_the_export_before_any_work(tmp_path):
    rng = np.random.default_rng(1)
    lamp = _counts(tmp_path / "lamp.csv", 100 + 1000 * np.exp(-0.5 * ((WL - 365) / 5) ** 2)
                   + rng.normal(0, 2, WL.size))
    out = tmp_path / "shape.csv"
    r = CliRunner().invoke(app, ["assess", str(lamp), "--export-spectrum", str(out), "--quiet"])
    assert r.exit_code == 0, r.output
    spec, _ = read_spectrum(out)
    assert spec.quantity == "relative"                  # a relative spectrum stays relative
    assert "Relative spectrum (relative)" in out.read_text(encoding="utf-8")
    before = out.read_bytes()
    r = CliRunner().invoke(app, ["assess", str(lamp), "--export-spectrum", str(out), "--quiet"])
    assert r.exit_code == 2 and "exists" in r.output and out.read_bytes() == before
