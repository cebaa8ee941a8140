"""Nominal spectra from stated data (uvcheck.nominal): ESTIMATES with declared coverage.

Expected values: the stated inputs themselves (power, peak, FWHM), colour-science's
sd_single_led_Ohno2005 evaluated directly, Wien's and Stefan–Boltzmann's laws with
scipy.constants, the efficiency ranges of data/technologies.toml (which cite NOTES.md §6), and
NOTES.md §7 C12 (10 mW point source at 10 cm gives 7.96 µW/cm²).
"""

import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from uvcheck import nominal as nm
from uvcheck.features import peak_info
from uvcheck.io.listing import parse_listing, read_listing
from uvcheck.spectrum import integrate, total_integral

EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "listings"


def _fwhm(s):
    """FWHM measured independently of uvcheck.features: linear interpolation at half max."""
    wl, v = s.wavelength_nm, s.values
    i = int(np.argmax(v))
    half = v[i] / 2
    left = np.interp(half, v[:i + 1], wl[:i + 1])
    right = np.interp(half, v[i:][::-1], wl[i:][::-1])
    return right - left


def test_ohno_fwhm_factor_derived_independently():
    # half maximum of S = (g + 2 g^5)/3 with g = exp(-x²): solve g + 2g^5 = 3/2 (scipy brentq)
    from scipy.optimize import brentq

    g = brentq(lambda g: g + 2 * g ** 5 - 1.5, 0.5, 1.0)
    assert nm.OHNO_FWHM_PER_WIDTH == pytest.approx(2 * math.sqrt(-math.log(g)), rel=1e-12)


@pytest.mark.parametrize("peak,fwhm", [(275.0, 11.0), (265.0, 12.0), (395.0, 12.0),
                                       (405.0, 15.0), (365.0, 9.0)])
def test_led_peaks_at_stated_wavelength_with_stated_fwhm(peak, fwhm):
    s = nm.led_shape(peak, fwhm)
    assert float(s.wavelength_nm[np.argmax(s.values)]) == pytest.approx(peak, abs=1e-9)
    # stated FWHM, on a grid of at most fwhm/20: interpolation error well under 1 %
    assert _fwhm(s) == pytest.approx(fwhm, rel=5e-3)
    assert peak_info(s).fwhm_nm == pytest.approx(fwhm, rel=5e-3)


def test_led_shape_is_colour_science_ohno2005():
    from colour import SpectralShape
    from colour.colorimetry import sd_single_led_Ohno2005

    s = nm.led_shape(275.0, 11.0)
    ref = sd_single_led_Ohno2005(275.0, 11.0 / nm.OHNO_FWHM_PER_WIDTH,
                                 shape=SpectralShape(250.0, 300.0, 0.5))
    ours = np.interp(ref.wavelengths, s.wavelength_nm, s.values)
    # same shape up to the normalisation constant
    k = ours.max() / ref.values.max()
    assert np.allclose(ours, k * ref.values, rtol=1e-9, atol=1e-12 * ours.max())


def test_typical_fwhm_used_when_not_stated():
    # data/emitters/led_packages.toml [fwhm]: 11 nm for 200–300 nm (from memory)
    s = nm.led_shape(275.0)
    assert _fwhm(s) == pytest.approx(11.0, rel=5e-3)
    assert any("typical FWHM" in x for x in s.meta["sources"])


@pytest.mark.parametrize("make", [
    lambda: nm.led_shape(275.0, 11.0), lambda: nm.mercury_lp_shape(),
    lambda: nm.mercury_lp_shape("ozone-producing"), lambda: nm.krcl_excimer_shape(False),
    lambda: nm.krcl_excimer_shape(True), lambda: nm.white_led_shape("cool"),
    lambda: nm.white_led_shape("warm"), lambda: nm.blackbody_shape(2800.0)],
    ids=["led", "hg", "hg-ozone", "krcl", "krcl-filtered", "white-cool", "white-warm", "bb"])
def test_shapes_are_labelled_complete_estimates(make):
    s = make()
    assert s.quantity == "relative"
    assert total_integral(s) == pytest.approx(1.0, rel=1e-12)
    assert s.range_nm == nm.NOMINAL_RANGE_NM == (180.0, 3000.0)
    assert s.meta["origin"] == "nominal" and s.meta["estimate"] is True
    assert "ESTIMATE" in s.meta["label"] and s.meta["sources"]


@pytest.mark.parametrize("power,band", [(0.048, None), (2.5, (200.0, 280.0)), (1e-3, None)])
def test_nominal_spectra_integrate_to_the_stated_power(power, band):
    for shape in (nm.led_shape(265.0, 12.0), nm.mercury_lp_shape(), nm.krcl_excimer_shape()):
        s = nm.with_power(shape, power, band)
        assert s.quantity == "flux"
        got = total_integral(s) if band is None else integrate(s, *band).value
        assert got == pytest.approx(power, rel=1e-12)


def test_mercury_dominant_line_is_253_7():
    # NOTES.md §6: 253.7 nm dominant [doc]
    s = nm.mercury_lp_shape()
    assert max(s.lines, key=lambda ln: ln.value).wavelength_nm == 253.7
    assert all(ln.wavelength_nm != 184.9 for ln in s.lines)          # ozone-free envelope
    assert any(ln.wavelength_nm == 184.9 for ln in nm.mercury_lp_shape("ozone-producing").lines)
    # the UV-C band (200–280 nm) holds only the 253.7 nm line
    uvc = [ln for ln in s.lines if 200 <= ln.wavelength_nm < 280]
    assert [ln.wavelength_nm for ln in uvc] == [253.7]


def test_krcl_filter_removes_the_side_bands():
    bare, filt = nm.krcl_excimer_shape(False), nm.krcl_excimer_shape(True)
    assert float(bare.wavelength_nm[np.argmax(bare.values)]) == pytest.approx(222.0, abs=0.1)
    above_bare = integrate(bare, 235.0, 330.0).value
    above_filt = integrate(filt, 235.0, 330.0).value
    # data/emitters/lamp_models.toml: side bands 5 % (from memory), filter suppression 0.02
    assert 0.04 < above_bare < 0.07
    assert above_filt < 0.05 * above_bare


def test_blackbody_wien_and_stefan_boltzmann():
    from scipy.constants import Wien, sigma

    s = nm.blackbody_shape(4000.0)
    assert float(s.wavelength_nm[np.argmax(s.values)]) == pytest.approx(Wien / 4000.0 * 1e9, abs=1.0)
    lam = np.linspace(50.0, 2e5, 400_001)
    assert np.trapezoid(nm.planck_exitance(lam, 4000.0), lam) == pytest.approx(
        sigma * 4000.0 ** 4, rel=1e-3)


def test_white_led_has_almost_no_uv():
    for tone in ("cool", "warm"):
        s = nm.white_led_shape(tone)
        assert integrate(s, 180.0, 380.0).value < 0.01
    cool, warm = nm.white_led_shape("cool"), nm.white_led_shape("warm")
    assert integrate(cool, 400, 500).value > integrate(warm, 400, 500).value


def test_irradiance_at_point_source_c12():
    # NOTES.md §7 C12: point source Φ = 10 mW, r = 10 cm -> 7.96 µW/cm²
    s = nm.irradiance_at(nm.with_power(nm.led_shape(275.0), 0.010), 0.10, "point")
    assert s.quantity == "irradiance"
    assert total_integral(s) * 100 == pytest.approx(7.96, abs=0.005)
    assert s.meta["scaling"][-1]["method"] == "geometry"


def test_irradiance_needs_a_flux():
    from uvcheck.errors import ConfigurationError

    with pytest.raises(ConfigurationError, match="flux"):
        nm.irradiance_at(nm.led_shape(275.0), 1.0)


# --------------------------------------------------------------------------------------------
# From a listing
# --------------------------------------------------------------------------------------------

HEAD = '[product]\nname = "Test (invented)"\n'


def test_electrical_power_times_efficiency_range():
    # data/technologies.toml [uvc_led]: wall-plug efficiency 1 / 3 / 6 % (NOTES.md §6)
    L = parse_listing(HEAD + '[lamp]\ntechnology = "uvc_led"\npeak_wavelength = "275 nm"\n'
                      'electrical_power = "8 W"\n')
    est = nm.nominal_from_listing(L)
    assert est.power.basis == "electrical power × efficiency"
    assert (est.power.min_W, est.power.typical_W, est.power.max_W) == pytest.approx((0.08, 0.24, 0.48))
    for case, p in (("min", 0.08), ("typical", 0.24), ("max", 0.48)):
        assert total_integral(est.spectrum(case)) == pytest.approx(p, rel=1e-12)
        assert est.spectrum(case).meta["case"] == case
    d = est.to_dict()
    json.dumps(d, allow_nan=False)
    assert d["label"].startswith("ESTIMATE") and d["covered_nm"] == [180.0, 3000.0]


def test_mercury_normalised_on_uvc():
    # data/technologies.toml [lp_mercury]: 25–40 % UV-C per electrical watt, typical 32.5 %
    L = read_listing(EXAMPLES / "mercury_tube_sold_pet_safe.toml")
    est = nm.nominal_from_listing(L)
    assert est.power.band == "UV-C"
    assert integrate(est.spectrum("typical"), 200, 280).value == pytest.approx(15 * 0.325)
    assert est.emitter == "tube" and est.tube_length_m == pytest.approx(0.55)


def test_stated_optical_power_is_used_as_stated():
    L = parse_listing(HEAD + '[lamp]\ntechnology = "uvc_led"\npeak_wavelength = "270 nm"\n'
                      'optical_power = "50 mW"\nelectrical_power = "8 W"\ncover = "glass"\n')
    est = nm.nominal_from_listing(L)
    assert est.power.basis == "stated optical power"
    assert total_integral(est.spectrum("min")) == pytest.approx(0.05)
    assert est.cover is None and any("cover" in a for a in est.assumptions)


def test_cover_applied_to_electrical_estimate():
    # glass: at most 10 % below 300 nm (lamp_models.toml, from memory) -> max case ≤ 0.1 × 0.48 W
    L = read_listing(EXAMPLES / "uvc_box_48_leds_8w.toml")
    est = nm.nominal_from_listing(L)
    assert est.cover == "glass"
    # (the LED band's tail above the 300 nm cut-on passes at 92 %: a few parts in 10⁸)
    assert total_integral(est.spectrum("max")) == pytest.approx(0.48 * 0.10, rel=1e-6)
    # min case: glass passes nothing below 300 nm; only the tail above 300 nm remains
    assert total_integral(est.spectrum("min")) < 1e-6 * 0.08


def test_no_power_gives_shape_only():
    L = parse_listing(HEAD + '[lamp]\ntechnology = "violet_led"\npeak_wavelength = "405 nm"\n')
    est = nm.nominal_from_listing(L)
    assert est.power is None and not est.is_absolute
    assert est.spectrum().quantity == "relative"
    assert any("shape only" in a for a in est.assumptions)


def test_wand_readings_as_stated_and_from_the_voltage():
    # the wand states 254 nm with 3.1 V dies: the second reading follows the electrical
    # evidence (violet InGaN window 392–425 nm, data/technologies.toml)
    L = read_listing(EXAMPLES / "wand_395nm_sold_as_uvc.toml")
    stated, evidence = nm.listing_readings(L)
    assert (stated.reading, stated.technology, stated.peak_nm) == ("as-stated", "uvc_led", 254.0)
    assert evidence.reading == "electrical-evidence"
    assert evidence.technology == "violet_led" and 392.0 <= evidence.peak_nm <= 425.0
    assert integrate(evidence.spectrum("max"), 200, 280).value < 1e-12 * total_integral(
        evidence.spectrum("max"))


def test_genuine_uvc_led_has_one_reading():
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "275 nm"\nelectrical_power = "3 W"\n'
                      '[leds]\ncount = 4\nforward_voltage = "6.2 V"\n')
    (only,) = nm.listing_readings(L)
    assert only.technology == "uvc_led" and only.peak_nm == 275.0


def test_krcl_unfiltered_unless_stated():
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "222 nm"\nelectrical_power = "10 W"\n')
    est = nm.nominal_from_listing(L)
    assert est.technology == "krcl_excimer"
    assert est.spectrum().meta["parameters"]["filtered"] is False
    assert any("filter not stated" in a for a in est.assumptions)


def test_incandescent_estimate():
    L = parse_listing(HEAD + '[lamp]\ntechnology = "incandescent"\nelectrical_power = "60 W"\n'
                      'colour_temperature = "2800 K"\n')
    est = nm.nominal_from_listing(L)
    share = nm.blackbody_share_in_range(2800.0)
    assert est.power.typical_W == pytest.approx(60 * 0.80 * share)


def test_import_budget_numpy_only():
    # DESIGN.md: modules on the assess path import numpy only at module level
    code = ("import sys, uvcheck.nominal, uvcheck.plausibility, uvcheck.io.listing; "
            "print(sorted(m for m in ('scipy', 'colour', 'matplotlib', 'pandas') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


def test_a_listing_too_thin_to_model_points_at_the_wavelength_its_claims_name():
    # our own rule for errors: say what is wrong and what to do; a claim's wavelength is the
    # statement under test, so it is pointed at, not silently taken as lamp data
    from uvcheck.errors import ConfigurationError
    from uvcheck.io.listing import parse_listing
    from uvcheck.screening import screen_listing_file

    lst = parse_listing('[product]\nname = "thin (invented)"\ninvented = true\n'
                        '[lamp]\nelectrical_power = "36 W"\n'
                        '[[claims]]\ntext = "UVC 253.7nm germicidal"\n', "thin.toml")
    from uvcheck.nominal import nominal_from_listing

    with pytest.raises(ConfigurationError) as err:
        nominal_from_listing(lst)
    assert "claim c1 names 253.7 nm" in err.value.one_line()
    assert "lamp.peak_wavelength" in err.value.one_line()
    # the screening lists the claims (no lamp model) and carries the same pointer
    said = " ".join(screen_listing_file(lst).to_dict()["warnings"])
    assert "claim c1 names 253.7 nm" in said and "lamp.peak_wavelength" in said
