"""IES TM-27-14 spectral data files. The files are written here by colour-science's
``SpectralDistribution_IESTM2714`` (a general-purpose reference library), read by uvcheck,
and compared with the data written: the band integral with numpy's trapezoid rule over the
same points. Spectra are invented."""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.errors import InputFormatError
from uvcheck.io.reader import read_spectrum
from uvcheck.io.textfile import file_sha256
from uvcheck.spectrum import integrate

WL = np.arange(200.0, 801.0, 1.0)
E = 1e-6 + 0.02 * np.exp(-0.5 * ((WL - 253.7) / 0.8) ** 2) \
    + np.random.default_rng(2).normal(0.0, 2e-7, WL.size)


def write_tm2714(path, quantity="irradiance", values=E, wl=WL):
    from colour import SpectralDistribution_IESTM2714
    from colour.io.tm2714 import Header_IESTM2714

    header = Header_IESTM2714(manufacturer="Invented Lamp Works (invented)",
                              description="invented test tube",
                              measurement_equipment="bench spectroradiometer (invented)")
    sd = SpectralDistribution_IESTM2714(header=header, spectral_quantity=quantity,
                                        data=dict(zip(wl, values)), bandwidth_FWHM=1.0)
    sd.path = str(path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        sd.write()
    return path


def test_irradiance_file_reads_as_written(tmp_path):
    p = write_tm2714(tmp_path / "tube.spdx")
    spec, rep = read_spectrum(p)
    assert spec.quantity == "irradiance"
    assert spec.wavelength_nm == pytest.approx(WL)
    assert spec.values == pytest.approx(E, rel=1e-12)
    # numpy's trapezoid over the same points
    assert integrate(spec, 200.0, 280.0).value == pytest.approx(
        np.trapezoid(E[WL <= 280], WL[WL <= 280]), rel=1e-9)
    assert rep.sha256 == file_sha256(p) == spec.meta["sha256"]   # the XML file's own bytes
    assert rep.metadata["Manufacturer"] == "Invented Lamp Works (invented)"
    assert rep.metadata["Bandwidth FWHM (nm)"] == "1.0"
    said = " ".join(rep.warnings)
    assert "IES TM-27-14" in said and "from memory" in said and "--unit" in said


def test_unit_option_overrides_the_si_reading(tmp_path):
    p = write_tm2714(tmp_path / "tube.spdx")
    spec, _ = read_spectrum(p, unit="uW/cm2/nm")       # 1 µW/cm² = 0.01 W/m² (SI prefixes)
    assert spec.values == pytest.approx(E * 0.01, rel=1e-12)


def test_relative_file_stays_relative(tmp_path):
    spec, _ = read_spectrum(write_tm2714(tmp_path / "rel.spdx", "relative", E / E.max()))
    assert spec.quantity == "relative"


def test_a_reflectance_file_is_refused(tmp_path):
    p = write_tm2714(tmp_path / "r.spdx", "reflectance", np.full(WL.size, 0.5))
    with pytest.raises(InputFormatError, match="reflectance, not a lamp's emission"):
        read_spectrum(p)


def test_batch_reads_spdx_files(tmp_path):
    import csv

    folder = tmp_path / "in"
    folder.mkdir()
    write_tm2714(folder / "tube.spdx")
    out = tmp_path / "s.csv"
    r = CliRunner().invoke(app, ["batch", str(folder), "--out", str(out)])
    assert r.exit_code == 0, r.output
    row = next(csv.DictReader(out.open(encoding="utf-8")))
    assert row["status"] == "ok" and float(row["peak_nm"]) == pytest.approx(254.0, abs=0.5)
