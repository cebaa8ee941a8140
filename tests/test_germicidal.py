"""Germicidal output: bands, action spectra, 254-nm equivalents, artefacts, ozone, efficiency.

Analytic anchors (a line of 1 W/m² gives back the weighting's value; a line at the reference
wavelength gives back its own irradiance) and values from the shipped tables; sources named
beside each expected number.
"""

import doctest
import json

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from uvcheck import germicidal
from uvcheck.conditions import Conditions
from uvcheck.errors import ConfigurationError
from uvcheck.germicidal import (REFERENCE_WAVELENGTH_NM, detect_technology, evaluate_germicidal,
                                uvc_artefacts)
from uvcheck.spectrum import Spectrum
from uvcheck.weighting import get_weighting

WL = np.arange(200.0, 800.01, 0.5)
# germicidal_dna table (Kowalski 2009): 0.9335 at 253 nm, 0.9552 at 254 nm -> 0.94869 at 253.7
S_DNA_2537 = 0.9335 + 0.7 * (0.9552 - 0.9335)


def gauss(centre, fwhm, area, wl=WL):
    s = fwhm / 2.3548
    return area / (s * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((wl - centre) / s) ** 2)


def line(nm, value=1.0, lo=200.0, hi=800.0, quantity="irradiance"):
    return Spectrum([lo, hi], [0.0, 0.0], quantity, lines=((nm, value),))


def lp_mercury(area=1.0, noise=1e-5, seed=0):
    rng = np.random.default_rng(seed)
    v = gauss(253.7, 1.5, area) + gauss(435.8, 1.5, 0.05 * area) + gauss(546.1, 1.5, 0.05 * area)
    return Spectrum(WL, v + rng.normal(0, noise, WL.size), "irradiance")


def blue_led(area=10.0, noise=1e-4, seed=1):
    rng = np.random.default_rng(seed)
    return Spectrum(WL, gauss(450, 20, area) + rng.normal(0, noise, WL.size), "irradiance")


def test_doctests():
    assert doctest.testmod(germicidal).failed == 0


def test_line_at_reference_gives_its_own_irradiance():
    # analytic anchor: E_eff = E·s(λ0), E_eff/s(λ0) = E for every action spectrum
    r = evaluate_germicidal(line(253.7, 1.0))
    assert r.uvc.value == pytest.approx(1.0)
    dna = r.effective_by_id("germicidal_dna")
    assert dna.reading.value == pytest.approx(S_DNA_2537)
    for e in r.effective:
        assert e.equivalent == pytest.approx(1.0)
    assert r.spread_254()["spread_ratio"] == pytest.approx(1.0)


def test_spread_and_most_favourable_at_265():
    # 265 nm: DNA s = 1.0 (table), classical 1.0 vs 0.85 at 254 (from memory), unweighted 1
    r = evaluate_germicidal(line(265.0, 1.0))
    eq = {e.reading.id: e.equivalent for e in r.effective}
    assert eq["germicidal_dna"] == pytest.approx(1 / S_DNA_2537)
    assert eq["germicidal_classical"] == pytest.approx(1 / 0.85)
    assert eq["uvc_unweighted"] == pytest.approx(1.0)
    sp = r.spread_254()
    assert sp["most_favourable_id"] == "germicidal_classical"
    assert sp["spread_ratio"] == pytest.approx(1 / 0.85)
    assert r.equivalent_irradiance() == pytest.approx(1 / 0.85)   # claims use the favourable one
    assert r.equivalent_irradiance(favourable=False) == pytest.approx(1.0)


def test_far_uvc_line_and_undefined_classical_curve():
    # 222 nm: inside far-UVC (200–235 nm); the classical curve is not defined there (250–280 nm)
    r = evaluate_germicidal(line(222.0, 1.0))
    assert r.far_uvc.value == pytest.approx(1.0)
    cl = r.effective_by_id("germicidal_classical")
    assert cl.defined_share == pytest.approx(0.0)
    # DNA table: 0.6586 at 222 nm
    assert r.effective_by_id("germicidal_dna").equivalent == pytest.approx(0.6586 / S_DNA_2537)
    assert r.spread_254()["most_favourable_id"] == "uvc_unweighted"


def test_mercury_versus_blue_led_orders_of_magnitude():
    # issue: a 254-nm LP-Hg-like spectrum and a 450 nm blue LED differ by orders of magnitude
    hg = evaluate_germicidal(lp_mercury(1.0), Conditions(measurement_distance_m=0.2))
    blue = evaluate_germicidal(blue_led(10.0), Conditions(measurement_distance_m=0.2))
    assert hg.status == "germicidal-uvc" and hg.technology["id"] == "lp_mercury"
    assert blue.status == "no-uvc" and blue.technology["id"] == "blue_led"
    assert blue.statement.startswith("No germicidal UV-C")
    assert blue.uvc.value is None                       # not reported as germicidal output
    # even the blue lamp's favourable (upper-bound) reading is far below the mercury lamp's
    assert hg.equivalent_irradiance() / blue.equivalent_irradiance() > 100
    assert any("blue-light hazards are evaluated" in n for n in blue.notes)
    # the 405 nm pathway: long, and stated. Dougall et al. 2018: 2.05 log at 39.6 J/cm²
    vb = blue.most_susceptible["violet_blue"]["air"]
    assert vb.organism.pathway == "violet_blue"
    assert vb.time_s(90) is not None and vb.time_s(90) > 3600
    assert vb.times_are == "estimate"
    # violet_blue_405 weight at 450 nm: 1 − 0.5·45/65 (straight line 405 -> 470 nm)
    w450 = float(get_weighting("violet_blue_405")(np.array([450.0]))[0])
    assert w450 == pytest.approx(1 - 0.5 * 45 / 65)
    assert blue.violet_blue.reading.value == pytest.approx(10.0 * w450, rel=0.02)


def test_artefacts():
    rng = np.random.default_rng(2)
    white = gauss(450, 20, 3.0) + gauss(560, 100, 7.0)
    ped = Spectrum(WL, white + 2e-4 + rng.normal(0, 1e-5, WL.size), "irradiance")
    assert [a.kind for a in uvc_artefacts(ped)] == ["pedestal"]   # needs no noise floor
    r = evaluate_germicidal(ped)
    assert [a.kind for a in r.artefacts] == ["pedestal"]
    assert r.uvc.status == "likely-stray-light" and r.uvc.upper_bound > 0
    noisy = Spectrum(WL, white + rng.normal(0, 1e-4, WL.size), "irradiance")
    assert [a.kind for a in evaluate_germicidal(noisy).artefacts] == ["noise-floor"]
    fake = Spectrum(WL, white + gauss(240, 1.0, 0.01) + rng.normal(0, 1e-5, WL.size), "irradiance")
    art = evaluate_germicidal(fake).artefacts
    assert [a.kind for a in art] == ["no-emitter"] and "240" in art[0].detail
    # real emitters are not artefacts: LP-Hg line, a 275 nm LED band (FWHM 11 nm), KrCl 222 nm
    led = Spectrum(WL, gauss(275, 11, 0.01) + rng.normal(0, 1e-6, WL.size), "irradiance")
    krcl = Spectrum(WL, gauss(222, 4, 0.02) + rng.normal(0, 1e-6, WL.size), "irradiance")
    for s, tech in ((lp_mercury(), "lp_mercury"), (led, "uvc_led"), (krcl, "krcl_excimer")):
        r = evaluate_germicidal(s)
        assert r.artefacts == () and r.status == "germicidal-uvc"
        assert detect_technology(s) == tech


def test_missing_range_is_never_zero():
    vis = np.arange(380.0, 780.01, 1.0)
    r = evaluate_germicidal(Spectrum(vis, gauss(450, 20, 1.0, vis), "irradiance"))
    assert r.status == "not-assessed" and r.uvc.value is None and r.uvc.status == "not-covered"
    # data from 230 nm: the 253.7 nm line is found, but UV-C is a lower bound
    wl = np.arange(230.0, 800.01, 0.5)
    s = Spectrum(wl, gauss(253.7, 1.5, 1.0, wl), "irradiance")
    r = evaluate_germicidal(s, Conditions(measurement_distance_m=1.0))
    assert r.status == "partial" and r.uvc.to_dict()["is_lower_bound"]
    assert all(e.times_are == "at_most" for e in r.inactivation if e.organism.pathway == "uvc")


def test_relative_spectrum_gives_shape_only():
    v = gauss(253.7, 1.5, 1.0) + gauss(546.1, 1.5, 1.0)
    r = evaluate_germicidal(Spectrum(WL, v, "relative"))
    assert r.status == "shape-only" and r.uvc.value is None
    assert r.uvc.fraction == pytest.approx(0.5, abs=0.01)
    assert r.inactivation == () and r.equivalent_irradiance() is None


def test_below_detection_is_an_upper_bound():
    wl = np.arange(200.0, 800.01, 1.0)
    v = gauss(450, 20, 1.0, wl)
    s = Spectrum(wl, v, "irradiance", noise_floor=1e-3)
    r = evaluate_germicidal(s)
    assert r.uvc.status in ("below-detection", "likely-stray-light")
    assert r.uvc.value is None and r.uvc.upper_bound is not None and r.uvc.upper_bound > 0
    assert r.status == "no-uvc"


def test_ozone():
    # 222 nm is below 240 nm: present (NOTES.md §4)
    assert evaluate_germicidal(line(222.0)).ozone.status == "present"
    # data from 200 nm cannot see the 184.9 nm line: unknown (PRACTICE.md §3)
    oz = evaluate_germicidal(line(253.7)).ozone
    assert oz.status == "unknown" and "184.9" in oz.note and not oz.covers_185nm
    # data from 180 nm with nothing below 240 nm: absent, measured
    oz = evaluate_germicidal(line(253.7, lo=180.0)).ozone
    assert (oz.status, oz.basis, oz.covers_185nm) == ("absent", "measured", True)
    # a blue InGaN LED cannot emit below 240 nm (photon energy, technologies.toml)
    oz = evaluate_germicidal(blue_led()).ozone
    assert (oz.status, oz.basis) == ("absent", "technology")


def test_efficiency_against_technology_range():
    # 1 W/m² UV-C at 1 m, isotropic: Φ = 4π·1²·1 = 12.57 W
    c = Conditions(measurement_distance_m=1.0, electrical_power_W=40.0)
    eff = evaluate_germicidal(line(253.7), c).efficiency
    assert eff.uvc_flux_W == pytest.approx(4 * np.pi)
    assert eff.efficiency == pytest.approx(4 * np.pi / 40)
    # NOTES.md §6: LP mercury 25–40 % UV-C per electrical watt, flag above 45 %
    assert (eff.technology, eff.verdict) == ("lp_mercury", "within")
    assert eff.range["min"] == 0.25 and eff.range["max"] == 0.40
    c2 = Conditions(measurement_distance_m=1.0, electrical_power_W=20.0)
    assert evaluate_germicidal(line(253.7), c2).efficiency.verdict == "implausible"   # 62.8 %
    assert evaluate_germicidal(line(253.7)).efficiency.status == "not-computed"


def test_distance_and_flux():
    c = Conditions(measurement_distance_m=1.0)
    r2 = evaluate_germicidal(line(253.7, 1.0), c, distance_m=2.0)
    assert r2.uvc.value == pytest.approx(0.25)            # inverse square
    assert r2.position.distance_m == 2.0 and "scaled" in r2.position.basis
    f = evaluate_germicidal(line(253.7, 4 * np.pi, quantity="flux"), distance_m=1.0)
    assert f.unit == "W m-2" and f.uvc.value == pytest.approx(1.0)   # Φ/(4πd²)
    flux_only = evaluate_germicidal(line(253.7, 1.0, quantity="flux"))
    assert flux_only.unit == "W" and flux_only.inactivation == ()
    with pytest.raises(ConfigurationError, match="measurement distance"):
        evaluate_germicidal(line(253.7), distance_m=2.0)


def test_inactivation_uses_the_equivalent_at_the_row_wavelength():
    # 1 W/m² at 253.7 nm; OC43 data at 222 nm: most favourable E_eff/s(222) = s_DNA(253.7)/s_DNA(222)
    r = evaluate_germicidal(line(253.7, 1.0), Conditions(measurement_distance_m=1.0),
                            organisms=["hcov_oc43_air_222_buonanno2020",
                                       "coronaviruses_mixed_254_hessling2020_best"])
    oc43, cov = r.inactivation
    assert oc43.irradiance_W_m2 == pytest.approx(S_DNA_2537 / 0.6586)
    assert "transferred by the action spectrum" in oc43.irradiance_basis
    # Hessling 2020: D90 3.7 mJ/cm² = 37 J/m² -> 37 s at 1 W/m²
    assert cov.irradiance_W_m2 == pytest.approx(1.0, rel=1e-3)
    assert cov.time_s(90) == pytest.approx(37.0, rel=1e-3)
    g = r.most_susceptible_for("surface")
    assert "most susceptible" in g.notes[0]


def test_json_contract():
    r = evaluate_germicidal(lp_mercury(), Conditions(measurement_distance_m=0.5, electrical_power_W=10))
    d = json.loads(json.dumps(r.to_dict(), allow_nan=False))
    for key in ("uvc", "far_uvc", "effective", "efficiency", "ozone", "artefacts", "inactivation"):
        assert key in d
    assert set(d["effective"]["by_action_spectrum"]) == {"germicidal_dna", "germicidal_classical",
                                                        "uvc_unweighted"}
    assert d["effective"]["equivalent_254"]["most_favourable"] > 0
    assert d["effective"]["reference_wavelength_nm"] == REFERENCE_WAVELENGTH_NM
    e = d["inactivation"][0]
    for key in ("organism", "medium", "model", "time_to_90_s", "time_to_99_9_s"):
        assert key in e
    assert any("not a certification" in n for n in d["notes"])


@settings(max_examples=30, deadline=None)
@given(factor=st.floats(1.0, 1e3))
def test_more_output_never_lengthens_a_time(factor):
    base = evaluate_germicidal(line(253.7, 0.01), Conditions(measurement_distance_m=1.0))
    more = evaluate_germicidal(line(253.7, 0.01 * factor), Conditions(measurement_distance_m=1.0))
    for a, b in zip(base.inactivation, more.inactivation):
        if a.time_s(99.9) is not None:
            assert b.time_s(99.9) <= a.time_s(99.9) * (1 + 1e-12)


def test_small_api_for_claims():
    # Hessling et al. 2020: D90 3.7 mJ/cm² = 37 J/m² -> 37 s at 1 W/m² of 253.7 nm
    r = evaluate_germicidal(line(253.7, 1.0), Conditions(measurement_distance_m=1.0))
    e = r.estimate_for("coronaviruses_mixed_254_hessling2020_best")
    assert e.time_s(90) == pytest.approx(37.0, rel=1e-3) and e.times_are == "estimate"
    generic = r.estimate_for(medium="surface")
    assert "germs in general" in generic.notes[0]
    # at another distance: inverse square from the measurement at 1 m
    far = evaluate_germicidal(line(253.7, 1.0), Conditions(measurement_distance_m=1.0), distance_m=3.0)
    assert far.equivalent_irradiance() == pytest.approx(r.equivalent_irradiance() / 9)
    assert evaluate_germicidal(line(253.7, 1.0, quantity="flux")).estimate_for() is None


def test_narrow_unknown_uvc_line_without_a_stray_light_source_is_emission():
    # A 270 nm line, FWHM 2.4 nm, no visible light at all (a filtered lamp or a narrow LED):
    # not a known line and narrower than an LED band, but with nothing out of band to scatter
    # it cannot be stray light (audit issue 6 #1). Synthetic data; thresholds are uvcheck's.
    rng = np.random.default_rng(7)
    only = Spectrum(WL, gauss(270, 2.4, 0.01) + rng.normal(0, 1e-7, WL.size), "irradiance")
    r = evaluate_germicidal(only, Conditions(measurement_distance_m=0.2))
    assert r.artefacts == () and r.status == "germicidal-uvc"
    assert r.uvc.value == pytest.approx(0.01, rel=0.01)      # the line's area (construction)
    # the same line beside a modest visible source (UV-C a third of the output): still emission
    both = Spectrum(WL, gauss(270, 2.4, 0.01) + gauss(450, 20, 0.02)
                    + rng.normal(0, 1e-7, WL.size), "irradiance")
    assert uvc_artefacts(both) == ()
    # ... but next to a strong white source (out of band > 100× the UV-C) it is read as stray
    # light: the same feature now has a source to come from
    white = gauss(450, 20, 3.0) + gauss(560, 100, 7.0)
    strong = Spectrum(WL, white + gauss(270, 2.4, 0.01) + rng.normal(0, 1e-7, WL.size),
                      "irradiance")
    art = uvc_artefacts(strong)
    assert [a.kind for a in art] == ["no-emitter"] and "out-of-band" in art[0].detail


def test_spread_leaves_out_an_action_spectrum_not_defined_where_the_lamp_emits():
    # 222 nm: the classical curve (defined 250–280 nm, from memory) credits none of it, so its
    # "least favourable" equivalent would say nothing about the lamp (it made the range span
    # four decades). Our own rule: the spread takes action spectra defined over at least half
    # of the lamp's UV-C; the table keeps every one with its defined share.
    from uvcheck.germicidal import SPREAD_MIN_DEFINED_SHARE, spans_the_output

    r = evaluate_germicidal(line(222.0, 1.0))
    cl = r.effective_by_id("germicidal_classical")
    assert cl.defined_share < SPREAD_MIN_DEFINED_SHARE and not spans_the_output(cl)
    sp = r.spread_254()
    assert {sp["least_favourable_id"], sp["most_favourable_id"]} == {"germicidal_dna",
                                                                     "uvc_unweighted"}
    dna = 0.6586 / S_DNA_2537   # DNA table at 222 nm over its value at 253.7 nm
    assert sp["spread_ratio"] == pytest.approx(max(dna, 1.0) / min(dna, 1.0))
    assert "germicidal_classical" in r.to_dict()["effective"]["by_action_spectrum"]
    # a 254 nm line lies inside every curve's range: all take part
    assert all(spans_the_output(e) for e in evaluate_germicidal(line(253.7, 1.0)).effective)


def test_ozone_is_not_ruled_out_from_a_technology_guessed_without_any_uv_c():
    # an invented white-LED-like spectrum measured from 380 nm only: the technology is a guess
    # from the visible shape, so output below 240 nm is unknown, not "absent" (missing range is
    # never read as zero); given as the technology, the technology's rule still applies
    from conftest import gaussian

    wl = np.arange(380.0, 781.0, 1.0)
    v = gaussian(wl, 450.0, 9.0, 0.3) + gaussian(wl, 570.0, 45.0, 0.7) + 1e-6
    s = Spectrum(wl, v, "irradiance", noise_floor=1e-7)
    guessed = evaluate_germicidal(s)
    assert guessed.technology["basis"].startswith("detected")
    assert guessed.ozone.status == "unknown" and "a guess" in guessed.ozone.note
    given = evaluate_germicidal(s, technology=guessed.technology["id"])
    assert given.ozone.status == "absent" and given.ozone.basis == "technology"


def test_a_pedestal_under_a_uv_a_led_and_an_unsubtracted_dark_level_are_not_uv_c():
    # invented spectra. A 365 nm LED has almost nothing in 380–780 nm, so the pedestal test
    # compares with the strongest output above 280 nm; a flat dark level that lifts the whole
    # spectrum (counts, 6 % of the peak) is recognised by the floor it shares with the rest
    # (our own rules; stray-light levels of compact array spectrometers, 0.01–1 % of the peak,
    # from memory)
    from conftest import gaussian

    from uvcheck.germicidal import uvc_artefacts

    wl = np.arange(200.0, 800.5, 0.5)
    rng = np.random.default_rng(11)
    led = gaussian(wl, 365.0, 10.0 / 2.3548, 2.0)
    ped = Spectrum(wl, led + 3e-3 * led.max() + rng.normal(0, 2e-6, wl.size), "irradiance",
                   noise_floor=2e-6)
    g = evaluate_germicidal(ped, Conditions(measurement_distance_m=0.1))
    assert [a.kind for a in g.artefacts] == ["pedestal"] and g.status == "no-uvc"
    assert g.uvc.value is None and g.ozone.status != "present"
    counts = 16000 * gaussian(wl, 395.0, 6.0, 1.0) / gaussian(wl, 395.0, 6.0, 1.0).max()
    dark = Spectrum(wl, counts + 1000.0 + rng.normal(0, 5.0, wl.size), "relative", noise_floor=5.0)
    kinds = [a.kind for a in uvc_artefacts(dark)]
    assert kinds == ["pedestal"]
    assert "offset" in uvc_artefacts(dark)[0].detail
    # a real UV-C LED on a clean floor is left alone
    uvc = Spectrum(wl, gaussian(wl, 275.0, 5.0, 0.05) + rng.normal(0, 2e-6, wl.size),
                   "irradiance", noise_floor=2e-6)
    assert uvc_artefacts(uvc) == ()


def test_the_uvc_band_note_agrees_with_the_band_convention():
    # both say where 100-200 nm goes (the CIE UV-C band is 100-280 nm; uvcheck reports
    # 100-200 nm as below-200nm): before, one note said "reported as ozone-forming output"
    from uvcheck.bands import UVC_DEFINITION_NOTE

    s = Spectrum(np.arange(200.0, 800.5, 1.0), np.full(601, 1e-4), "irradiance")
    note = next(n for n in evaluate_germicidal(s).notes if n.startswith("UV-C is integrated"))
    assert "reported separately as below-200nm" in note
    assert "reported separately as below-200nm" in UVC_DEFINITION_NOTE
