"""Plausibility of stated data (uvcheck.plausibility).

Sources of the expected values:
* NOTES.md §7 C6: E = hc/λ: 253.7 nm → 4.887 eV, 405 nm → 3.061 eV, 222 nm → 5.585 eV
  (scipy.constants; printed to 3 decimals, so abs tolerance 5e-4).
* NOTES.md §7 C7: "254 nm LED" with V_f = 3.2 V is impossible (floor 4.89 V).
* NOTES.md §7 C8: EQE 0.05, 275 nm, V_f 6.5 V → WPE ≤ 3.47 % (printed to 3 s.f.).
* data/technologies.toml (citing NOTES.md §6): UV-C LED wall-plug efficiency up to 6 %,
  flagged above 10 %; UV-C LED forward voltage 5–8 V; violet/blue InGaN 2.8–3.4 V.
* data/emitters/lamp_models.toml: cover transmittances (from memory / common practice).
"""

import json
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from uvcheck import plausibility as pl
from uvcheck.io.listing import LedArray, parse_listing, read_listing

EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "listings"
HEAD = '[product]\nname = "Test (invented)"\n'


@pytest.mark.parametrize("wl,ev", [(253.7, 4.887), (405.0, 3.061), (222.0, 5.585)])
def test_c6_photon_energy(wl, ev):
    assert pl.photon_energy_eV(wl) == pytest.approx(ev, abs=5e-4)


def test_c7_254nm_led_at_3_2_V_is_impossible():
    f = pl.check_die_voltage(253.7, 3.2)
    assert f.status == "cannot-hold"
    assert round(f.needed.value, 2) == 4.89            # "floor 4.89 V"
    assert f.ratio == pytest.approx(3.2 / 4.887, abs=1e-3)
    assert "short by" in f.message and "4.89 V" in f.message


def test_c8_wpe_bound():
    assert pl.wpe_upper_bound(0.05, 275.0, 6.5) * 100 == pytest.approx(3.47, abs=0.005)


def test_254nm_claim_with_3_1_V_dies_cannot_hold():
    # the test: a listing claiming 254 nm with 3.1 V dies -> cannot-hold (wavelength)
    for name in ("wand_395nm_sold_as_uvc.toml", "uvc_box_48_leds_8w.toml"):
        r = pl.screen_listing(read_listing(EXAMPLES / name))
        assert r.die_voltage_V == pytest.approx(3.1)
        f = r.by_id("die-voltage-vs-photon-energy")
        assert f.status == "cannot-hold", name
        assert f.ratio < 0.9
        assert r.by_id("led-wavelength").status == "unlikely"   # the "254 nm LED" flag
        json.dumps(r.to_dict(), allow_nan=False)


def test_shortest_wavelength_in_message():
    # 3.1 V per die: λ ≥ hc/(e·3.1 V) = 399.9 nm (uvcheck.constants doctest; NOTES.md §6)
    assert "400 nm" in pl.check_die_voltage(254.0, 3.1).message


def test_genuine_uvc_led_voltage_holds():
    assert pl.check_die_voltage(275.0, 6.0).status == "holds"


def test_uvc_led_below_practical_voltage_is_unlikely():
    # 4.7 V is above the 265 nm photon energy (4.68 eV) but below the 5–8 V of real UV-C LEDs
    f = pl.check_die_voltage(265.0, 4.7)
    assert f.status == "unlikely"
    assert f.needed.value == 5.0


def test_within_margin_holds_with_a_note():
    # a 405 nm violet LED at 3.05 V (3.061 eV photons, C6): ordinary, within the 10 % margin
    f = pl.check_die_voltage(405.0, 3.05)
    assert f.status == "holds" and f.assumptions


def test_mercury_line_led_flag():
    assert pl.check_led_wavelength(253.7).status == "unlikely"
    assert pl.check_led_wavelength(254.0).status == "unlikely"
    assert pl.check_led_wavelength(265.0).status == "holds"
    assert pl.check_led_wavelength(222.0).status == "unlikely"   # below 230 nm (NOTES.md §6)


def test_per_die_voltage_from_string():
    f = pl.per_die_voltage(LedArray(count=48, series=4, strings=12, string_voltage_V=12.4))
    assert f.status == "info" and f.available.value == pytest.approx(3.1)   # 12.4 V / 4
    g = pl.per_die_voltage(LedArray(count=3))
    assert g.status == "not-assessable" and "leds.forward_voltage" in g.missing
    h = pl.per_die_voltage(LedArray(count=4, series=4, string_voltage_V=24.0, dies_per_package=2))
    assert h.available.value == pytest.approx(3.0)                          # 24 V / 8 dies


def test_no_voltage_is_not_assessable():
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "254 nm"\n[leds]\ncount = 6\n')
    f = pl.screen_listing(L).by_id("die-voltage-vs-photon-energy")
    assert f.status == "not-assessable" and f.missing


def test_optical_vs_electrical():
    # UV-C LED: best 6 %, flagged above 10 % (data/technologies.toml)
    f = pl.check_optical_vs_electrical(2.0, 8.0, "uvc_led")        # 25 %
    assert f.status == "cannot-hold"
    assert f.available.value == pytest.approx(0.8)                  # 8 W × 10 %
    assert f.ratio == pytest.approx(0.4)
    assert pl.check_optical_vs_electrical(0.6, 8.0, "uvc_led").status == "unlikely"   # 7.5 %
    assert pl.check_optical_vs_electrical(0.3, 8.0, "uvc_led").status == "holds"      # 3.75 %
    # more optical than electrical power: energy conservation, for any technology
    assert pl.check_optical_vs_electrical(10.0, 8.0, "blue_led").status == "cannot-hold"


def test_uvc_power_from_a_violet_led_cannot_hold():
    f = pl.check_optical_vs_electrical(0.01, 8.0, "violet_led", band="UV-C")
    assert f.status == "cannot-hold" and f.ratio == 0.0


def test_efficiency_checks():
    assert pl.check_efficiency(0.40, "uvc_led").status == "cannot-hold"      # > 10 % flag
    assert pl.check_efficiency(0.08, "uvc_led").status == "unlikely"         # > 6 %
    assert pl.check_efficiency(0.35, "lp_mercury", "UV-C").status == "holds"  # 25–40 %
    assert pl.check_efficiency(0.50, "lp_mercury", "UV-C").status == "cannot-hold"  # > 45 %
    # with a die voltage, the C8 bound applies: EQE ≤ 0.25 at 275 nm, 6.5 V -> ≤ 17.3 %
    f = pl.check_efficiency(0.05, "uvc_led", wavelength_nm=275.0, die_voltage_V=6.5)
    assert f.status == "holds"


def test_power_per_led_is_at_most_unlikely():
    # common practice (data/emitters/led_packages.toml): never cannot-hold
    assert pl.check_power_per_led(8.0, 48, "uvc_led").status == "holds"
    f = pl.check_power_per_led(200.0, 2, "violet_led", package="indicator")
    assert f.status == "unlikely" and "common practice" in f.basis
    g = pl.check_power_per_led(1.0, 2, "uvc_led", optical=True)        # 0.5 W optical per LED
    assert g.status == "unlikely" and g.id == "optical-per-led"


@pytest.mark.parametrize("cover,status", [
    ("polycarbonate", "cannot-hold"), ("soda_lime", "cannot-hold"), ("pet", "cannot-hold"),
    ("glass", "unlikely"), ("acrylic", "unlikely"), ("plastic", "unlikely"),
    ("borosilicate", "unlikely"), ("fused_silica", "holds"), ("sapphire", "holds"),
    ("none", "holds")])
def test_cover_blocks_uvc(cover, status):
    # "ordinary glass or plastic covers block UV-C" (NOTES.md §6); quartz passes it
    assert pl.check_cover(cover, 254.0).status == status


def test_cover_passes_visible():
    assert pl.check_cover("polycarbonate", 450.0).status == "holds"


def test_mercury_tube_screens_clean():
    r = pl.screen_listing(read_listing(EXAMPLES / "mercury_tube_sold_pet_safe.toml"))
    assert r.technology == "lp_mercury"
    assert all(f.status in ("holds", "info") for f in r.findings)


def test_claims_are_screened():
    L = parse_listing(HEAD + '[lamp]\ntechnology = "uvc_led"\npeak_wavelength = "275 nm"\n'
                      'electrical_power = "8 W"\n[[claims]]\nid = "out"\n'
                      'text = "UV-C output 2 W"\n[[claims]]\nid = "eff"\ntext = "40 % UV-C efficiency"\n')
    r = pl.screen_listing(L)
    assert r.by_id("optical-vs-electrical:out").status == "cannot-hold"
    assert r.by_id("efficiency:eff").status == "cannot-hold"


def test_infer_technology():
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "253.7 nm"\n')
    assert pl.infer_technology(L)[0] == "lp_mercury"
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "222 nm"\n')
    assert pl.infer_technology(L)[0] == "krcl_excimer"
    L = parse_listing(HEAD + '[lamp]\npeak_wavelength = "395 nm"\n[leds]\ncount = 9\n')
    assert pl.infer_technology(L)[0] == "violet_led"


def test_evidence_led():
    # 3.1 V lies in the violet/blue InGaN range 2.8–3.4 V; violet has the shorter window
    assert pl.evidence_led(3.1) == ("violet_led", 392.0)
    assert pl.evidence_led(6.0)[0] == "uvc_led"


def test_finding_status_is_checked():
    from uvcheck.errors import ConfigurationError

    with pytest.raises(ConfigurationError, match="unknown status"):
        pl.Finding("x", "maybe", "s", None, None, None, "m", "b")


# --------------------------------------------------------------------------------------------
# Properties
# --------------------------------------------------------------------------------------------

STATUS_ORDER = {"cannot-hold": 0, "unlikely": 1, "holds": 2}


@settings(max_examples=200, deadline=None)
@given(wl=st.floats(200.0, 1000.0), v=st.floats(0.5, 10.0), k=st.floats(1.0, 3.0))
def test_more_voltage_never_makes_a_wavelength_less_possible(wl, v, k):
    # a higher die voltage can only make a wavelength more reachable (E = hc/λ floor);
    # the one exception is the UV-C practical-range check, which depends on V too but only
    # moves towards "holds" as V rises
    a = STATUS_ORDER[pl.check_die_voltage(wl, v).status]
    b = STATUS_ORDER[pl.check_die_voltage(wl, v * k).status]
    assert b >= a


@settings(max_examples=200, deadline=None)
@given(p_opt=st.floats(0.001, 50.0), p_el=st.floats(0.1, 100.0), k=st.floats(1.0, 10.0),
       tech=st.sampled_from(["uvc_led", "lp_mercury", "krcl_excimer", "blue_led", "violet_led"]))
def test_more_electrical_power_never_hurts_a_stated_output(p_opt, p_el, k, tech):
    a = STATUS_ORDER[pl.check_optical_vs_electrical(p_opt, p_el, tech).status]
    b = STATUS_ORDER[pl.check_optical_vs_electrical(p_opt, p_el * k, tech).status]
    assert b >= a
