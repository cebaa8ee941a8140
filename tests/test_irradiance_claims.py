"""Irradiance claims: "UV-C output 2.5 mW/cm² at 10 cm" states an irradiance, not a power.

Before, the reader took "2.5 mW" out of "2.5 mW/cm²" as an optical power of 2.5 mW, and the
claim held against any lamp that emits that much in all; "UVC irradiance 120 µW/cm² at 1 m"
lost its number and was judged as a plain emission claim.

Sources:
* Unit conversion: 1 mW/cm² = 10 W/m², 1 µW/cm² = 0.01 W/m² (SI prefixes, BIPM SI Brochure,
  9th edition, Table 7, from memory).
* A flat irradiance spectrum E_λ over a band of width Δλ gives E = E_λ·Δλ (the integral);
  with a point source, E scales as 1/d² (inverse-square law).
The spectra and listings are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.claims import judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.io.listing import parse_claim_text, parse_listing
from uvcheck.spectrum import Spectrum


@pytest.mark.parametrize("text, w_m2, d_m, band", [
    ("UV-C output 2.5 mW/cm² at 10 cm", 25.0, 0.1, (200.0, 280.0)),
    ("UVC irradiance 120 µW/cm² at 1 m", 1.2, 1.0, (200.0, 280.0)),
    ("UV intensity: 80uW/cm2 (1m)", 0.8, 1.0, None),
    ("irradiance 25 W/m2 at 1 m", 25.0, 1.0, None),
    ("UVC 1.5 mW/cm^2 at 5 cm", 15.0, 0.05, (200.0, 280.0)),
])
def test_an_irradiance_is_read_as_an_irradiance(text, w_m2, d_m, band):
    c = parse_claim_text(text)
    assert c.kind == "irradiance", (c.kind, c.note)
    assert c.irradiance_W_m2 == pytest.approx(w_m2) and c.distance_m == pytest.approx(d_m)
    assert c.band_nm == band and c.power_W is None


def test_a_spectral_irradiance_is_no_irradiance_claim():
    # "per nm" is a spectral value, not what a band gives
    assert parse_claim_text("peak 1.2 mW/cm2/nm at 5 cm").kind != "irradiance"


def _flat_uvc(level: float = 0.01) -> Spectrum:
    """A flat 0.01 W m⁻² nm⁻¹ over 200–280 nm (0.8 W m⁻² of UV-C, 80 µW/cm²), nothing from
    285 nm on, on 200–800 nm at 1 nm (invented)."""
    wl = np.arange(200.0, 800.5, 1.0)
    return Spectrum(wl, np.where(wl <= 280.0, level, 0.0), "irradiance")


def _verdicts(spec: Spectrum, d0: float, *texts: str) -> dict:
    body = "".join(f'[[claims]]\nid = "c{i}"\ntext = "{t}"\n' for i, t in enumerate(texts, 1))
    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "box (invented)"\n'
                        "invented = true\n" + body, "box.toml")
    res = judge(lst, readings_from_measurement(spec, Conditions(measurement_distance_m=d0)),
                measured=True)
    return {v.id: v for v in res.verdicts}


def test_a_stated_irradiance_is_judged_against_the_measured_band():
    # 0.8 W/m² of UV-C at 10 cm (0.01 × 80 nm; the trapezoid takes half a step at 280.5 nm's
    # edge, so within 1 %); at 20 cm a quarter of it (inverse square, point source)
    v = _verdicts(_flat_uvc(), 0.1, "UV-C output 2.5 mW/cm² at 10 cm",
                  "UVC 70 µW/cm² at 10 cm", "UVC 30 µW/cm² at 20 cm", "UVC 15 µW/cm² at 20 cm")
    assert v["c1"].available.value == pytest.approx(0.8, rel=0.01)
    assert v["c1"].needed.value == pytest.approx(25.0)
    assert v["c1"].verdict == "cannot-hold" and v["c1"].ratio == pytest.approx(0.8 / 25, rel=0.01)
    assert v["c2"].verdict == "holds"                       # 80 ≥ 70 µW/cm²
    assert v["c3"].verdict == "unlikely"                    # 20 against 30 µW/cm²: short by 1.5×
    assert v["c3"].available.value == pytest.approx(0.2, rel=0.01)
    assert v["c4"].verdict == "holds"


def test_an_irradiance_claim_without_a_distance_is_not_assessable():
    c = parse_claim_text("UV-C irradiance 120 µW/cm²")
    assert c.kind == "irradiance" and "distance" in c.missing()
    v = _verdicts(_flat_uvc(), 0.1, "UV-C irradiance 120 µW/cm²")["c1"]
    assert v.verdict == "not-assessable" and "distance" in v.basis


def test_a_structured_irradiance_claim():
    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "box (invented)"\n'
                        'invented = true\n[[claims]]\nid = "e"\nkind = "irradiance"\n'
                        'irradiance = "2.5 mW/cm2"\ndistance = "10 cm"\nband = "UV-C"\n', "b.toml")
    c = lst.claims[0]
    assert c.irradiance_W_m2 == pytest.approx(25.0) and c.band_nm == (200.0, 280.0)
    res = judge(lst, readings_from_measurement(_flat_uvc(), Conditions(measurement_distance_m=0.1)),
                measured=True)
    assert res.verdicts[0].verdict == "cannot-hold"


def test_the_terminal_shows_what_was_assumed():
    # a claim with no distance of its own is judged at the listing's distance of use: the
    # terminal says so on an "assumed:" line, as the note and the JSON do
    from uvcheck.report.terminal import render_claims

    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "box (invented)"\n'
                        'invented = true\n[use]\ndistance = "10 cm"\n[[claims]]\nid = "c1"\n'
                        'text = "UVC irradiance 70 µW/cm²"\n', "b.toml")
    res = judge(lst, readings_from_measurement(_flat_uvc(), Conditions(measurement_distance_m=0.1)),
                measured=True)
    claims = res.to_dict()["claims"]
    assert claims[0]["verdict"] == "holds"
    text = "\n".join(render_claims(claims, {"listing": {"name": "box"}}))
    assert "assumed: the claim names no distance: judged at the listing's distance of use" in text


def test_a_kill_claim_at_a_distance_says_it_is_judged_on_a_surface():
    # one medium: no "whichever is more favourable" of one choice
    v = _verdicts(_flat_uvc(), 0.1, "kills 99.9% of germs in 10 minutes at 10 cm")["c1"]
    assert "the claim names no medium: judged on a surface at that distance" in v.assumptions


def test_a_band_below_detection_is_credited_with_its_upper_bound_as_a_kill_claim_is():
    # found by trying the tool: a 395 nm wand's UV-C was "at most 0.0719 µW/cm²" for its
    # irradiance claim (the apparent integral) but "at most 0.253 µW/cm²" for its kill claim
    # (apparent + 3 σ, the germicidal evaluation's favourable reading). Both now use the
    # upper bound: benefit of the doubt for both efficacy claims, the same figure.
    from uvcheck.germicidal import evaluate_germicidal

    wl = np.arange(200.0, 800.5, 1.0)
    rng = np.random.default_rng(5)
    noise = 2e-4
    v = 0.05 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + rng.normal(0.0, noise, wl.size)
    spec = Spectrum(wl, v, "irradiance", noise_floor=noise)
    cond = Conditions(measurement_distance_m=0.1)
    uvc = evaluate_germicidal(spec, cond).uvc
    assert uvc.value is None and uvc.upper_bound is not None  # below detection (or stray)
    got = _verdicts(spec, 0.1, "UV-C output 5 mW/cm² at 10 cm",
                    "kills 99.9% of germs in 30 minutes at 10 cm")
    v1 = got["c1"]
    assert v1.verdict == "cannot-hold"
    assert v1.available.value == pytest.approx(uvc.upper_bound, rel=1e-9)
    assert "below the detection limit" in v1.basis and "upper bound" in v1.basis
    # the kill claim's irradiance is the same figure (its basis: "(X µW/cm² × 30 min)")
    from uvcheck.units import sig
    assert f"({sig(uvc.upper_bound * 100)} µW/cm² ×" in got["c2"].basis
