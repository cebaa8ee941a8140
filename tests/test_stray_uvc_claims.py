"""Safety and risk-group verdicts that would rest on UV-C read as stray light.

A bright visible lamp measured with an array spectrometer shows a flat level in UV-C: light
scattered inside the instrument, not emitted by the lamp (the germicidal evaluation reads it
so, as a ``pedestal``). The actinic UV hazard E_S still counts it. A verdict against a safety
or risk-group claim that only this UV-C decides is ``not-assessable`` (the stray-light rule,
our own): the tool's own reading of that UV-C is that the lamp does not emit it, so it cannot
call the claim false on it, nor call it safe without a measurement that controls the stray
light. The stray level does not stop at 280 nm: the favourable reading also takes that level
(the median below 280 nm) off from 280 to 400 nm. Where the claim fails even without them,
the verdict stands.

Sources:
* IEC 62471:2006 4.3.1: E_S·t ≤ 30 J m⁻² over a day, so t_max = 30 / E_S [s]; Table 6.1 (from
  memory, as data/limits/iec62471_2006.toml records it): Exempt E_S < 0.001 W m⁻², RG1 <
  0.003 W m⁻², RG2 < 0.03 W m⁻².
* S(λ), IEC 62471 Table 4.1 as data/weightings records it: 1 at 270 nm, falling to 0.03 at
  200 nm and to 0.001 at 320 nm, so a flat level of 5e-5 W m⁻² nm⁻¹ over 200–400 nm gives
  E_S ≈ 2.3e-3 W m⁻² (RG1), of which about 70 % comes from below 280 nm [derived: the
  table interpolated log-linearly and integrated by the trapezoid rule].
The spectra and listings are invented.
"""

from __future__ import annotations

import numpy as np

from uvcheck.claims import RULE_STRAY_UVC, STRAY_UVC_NEEDED, judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal, without_stray_uvc
from uvcheck.hazards import evaluate_hazards
from uvcheck.io.listing import parse_listing
from uvcheck.spectrum import Spectrum

COND = Conditions(measurement_distance_m=0.2, source_size_m=0.005)

LISTING = '''format = "uvcheck-listing/1"
[product]
name = "red LED panel (invented)"
invented = true
[use]
area = "20 m²"
room_height = "2.5 m"
[[claims]]
id = "people"
kind = "safety"
text = "safe for people"
safe_for = ["people"]
distance = "0.2 m"
[[claims]]
id = "rooms"
kind = "safety"
text = "safe in occupied rooms"
safe_for = ["occupied-rooms"]
[[claims]]
id = "exempt"
text = "Exempt risk group"
[[claims]]
id = "rg1"
text = "RG1"
'''


def red_led(pedestal: float) -> Spectrum:
    """A red LED (630 nm, 0.5 W m⁻² nm⁻¹ at 0.2 m) on a flat level, 200–3000 nm at 1 nm,
    with a small ripple for noise (invented)."""
    wl = np.arange(200.0, 3000.01, 1.0)
    v = 0.5 * np.exp(-0.5 * ((wl - 630.0) / 8.0) ** 2) + pedestal + 1e-6 * np.sin(1.7 * wl)
    return Spectrum(wl, v, "irradiance")


def verdicts(spec: Spectrum) -> dict:
    lst = parse_listing(LISTING, "panel.toml")
    return {v.id: v for v in judge(lst, readings_from_measurement(spec, COND),
                                   measured=True).verdicts}


def e_s(spec: Spectrum) -> float:
    return evaluate_hazards(spec, COND).hazard("actinic_uv").value


def test_the_flat_uvc_level_reads_as_stray_light_and_sets_e_s():
    spec = red_led(5e-5)
    g = evaluate_germicidal(spec, COND)
    assert any(a.is_stray for a in g.artefacts)
    # E_S of the level: RG1 (0.001 to 0.003 W/m², Table 6.1), as derived in the module notes
    assert 0.001 < e_s(spec) < 0.003
    # without the UV-C below 280 nm, and without the same flat level from 280 to 400 nm,
    # nothing of the level remains: Exempt (before, with the level kept above 280 nm, about
    # 30 % of E_S stayed, all of it the same stray light)
    free = without_stray_uvc(spec, g.artefacts)
    wl = free.wavelength_nm
    assert free is not None and not free.values[wl < 280].any()
    uv = (wl >= 280) & (wl < 400)
    level = float(np.median(spec.values[spec.wavelength_nm < 280]))
    assert np.allclose(free.values[uv], np.maximum(spec.values[uv] - level, 0.0), atol=1e-18)
    assert np.array_equal(free.values[wl >= 400], spec.values[wl >= 400])
    assert e_s(free) < 0.01 * e_s(spec)


def test_claims_that_only_stray_uvc_fails_are_not_assessable():
    v = verdicts(red_led(5e-5))
    # t_max = 30 / E_S ≈ 3.6 h < 8 h at 0.2 m with the stray UV-C, none without it
    p = v["people"]
    assert p.verdict == "not-assessable"
    assert "E_S" in p.basis and "stray light" in p.basis and "without them" in p.basis
    assert p.rule == RULE_STRAY_UVC and p.missing == STRAY_UVC_NEEDED
    assert p.available is not None and p.available.value < 8 * 3600  # the measured figure stays
    assert "without_stray_uvc" in p.details
    ex = v["exempt"]
    assert ex.verdict == "not-assessable" and ex.rule == RULE_STRAY_UVC
    assert "RG1" in ex.basis and "without them the lamp is Exempt" in ex.basis
    # stray light can only raise a hazard: a claim that holds with it holds
    assert v["rg1"].verdict == "holds"


def test_claims_that_fail_even_without_the_stray_level_still_fail():
    # the same panel with a real UV-B band standing out of the level (310 nm, σ 5 nm,
    # 0.05 W m⁻² nm⁻¹: 0.63 W m⁻², E_S ≈ 0.63 · S(310) ≈ 0.63 · 0.015 ≈ 9e-3 W m⁻², RG2,
    # t_max ≈ 55 min; S(310) = 0.015, IEC 62471:2006 Table 4.1 as data/weightings records it):
    # the band is not stray light, so the claims fail without the level too
    base = red_led(5e-5)
    wl = base.wavelength_nm
    spec = Spectrum(wl, base.values + 0.05 * np.exp(-0.5 * ((wl - 310.0) / 5.0) ** 2),
                    "irradiance")
    assert any(a.is_stray for a in evaluate_germicidal(spec, COND).artefacts)
    free = without_stray_uvc(spec, evaluate_germicidal(spec, COND).artefacts)
    assert 0.003 < e_s(free) < 0.03
    v = verdicts(spec)
    for cid in ("people", "exempt", "rg1"):
        assert v[cid].verdict == "cannot-hold", cid
        assert "even without the UV-C below 280 nm" in v[cid].basis
        assert v[cid].rule != RULE_STRAY_UVC


def test_a_flat_level_through_the_whole_uv_decides_no_claim():
    # a level ten times higher (5e-4 W m⁻² nm⁻¹, flat from 200 nm on): E_S ≈ 0.023 W m⁻²
    # (RG2) from the level alone, 30 % of it above 280 nm; it reads as stray light and goes
    # on flat into UV-B and UV-A, so no safety or risk-group verdict may rest on it (before,
    # the part above 280 nm made these claims cannot-hold)
    spec = red_led(5e-4)
    assert 0.003 < e_s(spec) < 0.03
    free = without_stray_uvc(spec, evaluate_germicidal(spec, COND).artefacts)
    assert e_s(free) < 1e-4
    v = verdicts(spec)
    for cid in ("people", "exempt", "rooms"):
        assert v[cid].verdict == "not-assessable" and v[cid].rule == RULE_STRAY_UVC, cid
        assert "stray level above 280 nm" in v[cid].basis


def test_real_uvc_is_not_read_as_stray_light():
    # a mercury 253.7 nm line (sampled, 2 nm wide, 4e-3 W/m²) on the red LED: a known line,
    # so real output, and the claims fail on it as before (E_S ≈ 4e-3·S(253.7) ≈ 2e-3 W/m²:
    # RG1)
    base = red_led(0.0)
    wl = base.wavelength_nm
    sd = 2.0 / 2.3548
    line = 4e-3 * np.exp(-0.5 * ((wl - 253.7) / sd) ** 2) / (sd * np.sqrt(2 * np.pi))
    spec = Spectrum(wl, base.values + line, "irradiance")
    assert not any(a.is_stray for a in evaluate_germicidal(spec, COND).artefacts)
    v = verdicts(spec)
    assert v["exempt"].verdict == "cannot-hold" and v["exempt"].rule != RULE_STRAY_UVC
    assert "stray" not in v["exempt"].basis


def test_an_undecided_uvc_reading_is_kept():
    from uvcheck.germicidal import Artefact

    assert without_stray_uvc(red_led(5e-5), [Artefact("data-edge", "undecided")]) is None


def test_a_kill_claim_is_not_credited_with_stray_uvc():
    """The mirror for efficacy (our own rule): the benefit of the doubt does not stretch to a
    dose from UV-C that the tool itself reads as not emitted. With the level, the red panel
    gives about 4e-3 W m⁻² of UV-C (5e-5 W m⁻² nm⁻¹ over 200–280 nm) and, in 24 h, more than
    the 2-log dose of E. coli (2 × 23.3 J m⁻², legacy chart row, data/organisms/organisms.csv):
    before, the claim held. Without the level a 630 nm LED gives no germicidal dose, so the
    claim is 'not-assessable', naming the measurement that decides it."""
    from uvcheck.claims import RULE_STRAY_UVC_EFFICACY

    lst = parse_listing(LISTING + '[[claims]]\nid = "kill"\n'
                        'text = "kills 99% of E. coli in 24 hours at 20 cm"\n', "panel.toml")
    spec = red_led(5e-5)
    v = {x.id: x for x in judge(lst, readings_from_measurement(spec, COND),
                                measured=True).verdicts}["kill"]
    assert v.available.value > v.needed.value       # the dose with the stray level
    assert v.verdict == "not-assessable", v.basis
    assert v.rule == RULE_STRAY_UVC_EFFICACY and v.missing == STRAY_UVC_NEEDED
    assert "stray light" in v.basis and "without it, cannot-hold" in v.basis
    assert v.details["without_stray_uvc"] == "cannot-hold"
    # with no level there is no stray UV-C to discount: the plain verdict on the panel
    plain = {x.id: x for x in judge(lst, readings_from_measurement(red_led(0.0), COND),
                                    measured=True).verdicts}["kill"]
    assert plain.verdict == "cannot-hold", plain.basis
