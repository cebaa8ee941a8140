"""Photometry against colour-science (the reference library for CIE data and colorimetry)."""

import colour
import numpy as np
import pytest

from uvcheck.data_files import read_table, sha256_of, read_toml
from uvcheck.photometry import cct_ohno2013, luminous_value, photometry, v_lambda
from uvcheck.spectrum import Spectrum


def test_cached_v_lambda_equals_colour_science():
    # the shipped cache must equal colour-science's CIE 1924 photopic V(λ) exactly
    ref = colour.colorimetry.SDS_LEFS_PHOTOPIC["CIE 1924 Photopic Standard Observer"]
    v = v_lambda()
    assert np.array_equal(v.wavelength_nm, ref.wavelengths)
    assert np.allclose(v.value, ref.values, rtol=0, atol=1e-15)


def test_cached_cmfs_equal_colour_science():
    ref = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    t = read_table("cie/cmf_1931_2deg.csv")
    assert np.allclose(np.array(t.floats("x_bar")), ref.values[:, 0], atol=1e-15)
    assert np.allclose(np.array(t.floats("z_bar")), ref.values[:, 2], atol=1e-15)


def test_cie_cache_checksums():
    reg = read_toml("cie/cie.toml")
    for entry in reg.values():
        assert sha256_of("cie/" + entry["file"]) == entry["sha256"]


def test_km_is_683():
    # colour-science uses K_m = 683 lm/W (CONSTANT_K_M)
    assert colour.constants.CONSTANT_K_M == 683
    s = Spectrum([554.0, 555.0, 556.0], [0.0, 1.0, 0.0], "irradiance")  # 1 W/m² at 555 nm
    assert luminous_value(s)[0] == pytest.approx(683.0 * 1.0, rel=1e-6)


@pytest.mark.parametrize("name", ["A", "D65", "FL2"])
def test_illuminance_of_scaled_cie_illuminant(name):
    # colour-science's luminous flux of a CIE illuminant (K_m = 683) equals ours
    sd = colour.SDS_ILLUMINANTS[name].copy()
    wl, v = sd.wavelengths, sd.values * 1e-3  # read as W m^-2 nm^-1
    s = Spectrum(wl, v, "irradiance")
    ref = colour.luminous_flux(colour.SpectralDistribution(v, wl), K_m=683)
    ours = luminous_value(s)[0]
    assert ours == pytest.approx(ref, rel=2e-3)


@pytest.mark.parametrize("name", ["A", "D65", "FL2", "FL11"])
def test_cct_against_colour_science(name):
    sd = colour.SDS_ILLUMINANTS[name]
    s = Spectrum(sd.wavelengths, sd.values, "irradiance")
    p = photometry(s, 1.0)
    xy = colour.XYZ_to_xy(colour.sd_to_XYZ(sd))
    assert p.x == pytest.approx(xy[0], abs=2e-4) and p.y == pytest.approx(xy[1], abs=2e-4)
    uv = colour.UCS_to_uv(colour.XYZ_to_UCS(colour.xy_to_XYZ(xy)))
    ref = colour.temperature.uv_to_CCT(uv, method="Ohno 2013")
    assert p.cct_K == pytest.approx(ref[0], rel=1e-4)
    assert p.duv == pytest.approx(ref[1], abs=2e-5)


def test_cct_refused_for_violet_led():
    wl = np.arange(360.0, 831.0)
    s = Spectrum(wl, np.exp(-0.5 * ((wl - 395) / 6) ** 2), "irradiance")
    p = photometry(s, 0.2)
    assert p.cct_K is None and "not a white source" in p.cct_note


def test_a_filament_lamp_measured_into_the_infrared_gets_its_cct():
    # A 2800 K blackbody (colour-science's sd_blackbody, Planck's law) from 300 to 2500 nm
    # sends most of its output into the infrared, yet it is a white source: its CCT is its
    # temperature (Ohno 2013 via colour-science on the same chromaticity). Measured through the
    # assessment, which decides "white" from the ultraviolet and visible output only.
    from uvcheck.assessment import assess
    from uvcheck.photometry import visible_share

    sd = colour.sd_blackbody(2800, colour.SpectralShape(300, 2500, 1))
    s = Spectrum(sd.wavelengths, sd.values / sd.values.max() * 0.05, "irradiance")
    assert visible_share(s) > 0.9
    ph = assess(s).photometry
    xy = colour.XYZ_to_xy(colour.sd_to_XYZ(colour.sd_blackbody(2800)))
    uv = colour.UCS_to_uv(colour.XYZ_to_UCS(colour.xy_to_XYZ(xy)))
    ref = colour.temperature.uv_to_CCT(uv, method="Ohno 2013")
    assert ph.cct_K == pytest.approx(ref[0], rel=1e-3) and ph.cct_K == pytest.approx(2800, rel=2e-3)
    # a mercury-like UV lamp whose visible lines are a small part of its UV and visible
    # output still gets none
    wl = np.arange(240.0, 800.0, 0.5)
    hg = sum(a * np.exp(-0.5 * ((wl - c) / 0.6) ** 2)
             for c, a in ((253.7, 100.0), (404.7, 3.0), (435.8, 5.0), (546.1, 4.0), (577.0, 1.0)))
    ph = assess(Spectrum(wl, hg, "irradiance")).photometry
    assert ph.cct_K is None and "not a white source" in ph.cct_note


def test_no_chromaticity_when_the_visible_output_is_below_detection():
    """A UV-C LED whose visible band is noise got 'CCT 5879 K, Duv +0.0437', the colour of the
    noise. Where the luminous value is below its detection limit (3 σ, IUPAC convention) no
    chromaticity is given. Invented spectrum."""
    import numpy as np

    from uvcheck.photometry import photometry
    from uvcheck.spectrum import Spectrum

    wl = np.arange(230.0, 850.0, 0.5)
    rng = np.random.default_rng(21)
    v = 1.8e-3 * np.exp(-0.5 * ((wl - 266) / 5.2) ** 2) + rng.normal(0, 1.5e-6, wl.size)
    ph = photometry(Spectrum(wl, v, "irradiance", noise_floor=1.5e-6))
    assert ph.status == "below-detection"
    assert ph.x is None and ph.cct_K is None and "detection limit" in ph.cct_note
