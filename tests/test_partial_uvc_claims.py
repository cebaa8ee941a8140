"""Emission claims and germicidal status on spectra that start inside UV-C or above it.

Invented spectra (not real products). Our own rules, from the project's "missing range is never
read as zero" and "efficacy claims get the benefit of the doubt":

* a stated wavelength the data do not reach is not-assessable (no presence test can be made
  there), and a band claim whose unmeasured part could hold the emission is not-assessable
  when nothing was found in its measured part; a stated wavelength that was measured, with
  nothing there, still cannot hold;
* a UV-C signal that is highest at the first sample of data starting inside UV-C, and falls
  from there, is undecided ("data-edge"): emission below the data or stray light. It is not
  called stray light, its readings keep their measured values, and UV-C is "not-assessed".
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.claims import judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.io.listing import parse_listing
from uvcheck.spectrum import Spectrum, restricted

COND = Conditions(measurement_distance_m=0.1)


def _listing(name: str, claims: str):
    """An invented listing with these claims (TOML [[claims]] tables)."""
    return parse_listing(f'format = "uvcheck-listing/1"\n[product]\nname = "{name} (invented)"\n'
                         f'invented = true\n{claims}', f"{name.split()[0]}.toml")


LISTING = _listing("partial-range test lamp", '''[[claims]]
id = "uvc"
text = "UV-C"
[[claims]]
id = "at254"
text = "UVC 254nm"
[[claims]]
id = "at222"
text = "far-UVC 222nm"
''')


def _verdicts(spec: Spectrum) -> dict[str, tuple[str, str]]:
    return {v.id: (v.verdict, v.basis) for v in
            judge(LISTING, readings_from_measurement(spec, COND), True).verdicts}


def _spectrum(start: float, *bands: tuple[float, float, float], seed: int = 3) -> Spectrum:
    wl = np.arange(start, 800.5, 0.5)
    rng = np.random.default_rng(seed)
    v = sum(gaussian(wl, c, s, a) for c, s, a in bands) + rng.normal(0, 1e-7, wl.size)
    return Spectrum(wl, v, "irradiance", noise_floor=1e-7)


def test_uv_a_lamp_measured_from_250_nm():
    s = _spectrum(250.0, (365.0, 6.0, 0.1))
    g = evaluate_germicidal(s, COND)
    assert g.status == "not-assessed"
    v = _verdicts(s)
    assert v["uvc"][0] == "not-assessable" and "200–250 nm was not measured" in v["uvc"][1]
    assert v["at254"][0] == "cannot-hold" and "which was measured" in v["at254"][1]
    assert v["at222"][0] == "not-assessable" and "outside the measured 250–800 nm" in v["at222"][1]


def test_the_same_lamp_measured_from_200_nm_cannot_hold():
    v = _verdicts(_spectrum(200.0, (365.0, 6.0, 0.1)))
    assert v["uvc"][0] == "cannot-hold" and v["at222"][0] == "cannot-hold"


def test_a_signal_rising_into_the_start_of_the_data_is_undecided():
    # a 232 nm band (σ 5 nm) under a blue LED, measured from 240 nm: the measured UV-C falls
    # from the first sample
    s = _spectrum(240.0, (232.0, 5.0, 0.025), (450.0, 10.0, 0.25))
    g = evaluate_germicidal(s, COND)
    assert [a.kind for a in g.artefacts] == ["data-edge"]
    assert g.status == "not-assessed" and "cannot tell apart" in g.statement
    assert g.uvc.status == "partial" and g.uvc.value > 0      # kept, a lower bound
    assert g.ozone.status == "unknown"                        # the blue-LED guess decides nothing
    assert _verdicts(s)["uvc"][0] == "not-assessable"
    from uvcheck.assessment import AssessOptions, assess

    notes = assess(s, COND, options=AssessOptions(uncertainty=False)).to_dict()["notes"]
    assert not any("stray light or noise" in n for n in notes)
    # measured from 200 nm the band is found and the claim holds
    full = _spectrum(200.0, (232.0, 5.0, 0.025), (450.0, 10.0, 0.25))
    gf = evaluate_germicidal(full, COND)
    assert gf.status == "germicidal-uvc" and not gf.artefacts
    assert _verdicts(full)["uvc"][0] == "holds"


def test_cutting_away_part_of_uv_c_never_turns_a_verdict_into_holds():
    # a counterexample the property test (tests/test_properties.py) found: a broad 220 nm band
    # (σ 17 nm) at 1.5 % of a narrow 380 nm line. Over 200–280 nm the pedestal rule reads its
    # UV-C as flat (no sample at twice the band median: a heuristic, our own rule); from 250 nm
    # the measured UV-C falls from the first sample: undecided, so never "holds".
    wl = np.arange(200.0, 1100.5, 1.0)
    v = (gaussian(wl, 220.0, 17.0, 0.02347 * 17.0 * math.sqrt(2 * math.pi))
         + gaussian(wl, 380.0, 0.5, 2.0))
    full = Spectrum(wl, v, "irradiance")
    cond = Conditions(measurement_distance_m=0.5)
    fv = {x.id: x.verdict for x in judge(LISTING, readings_from_measurement(full, cond), True).verdicts}
    part = restricted(full, 250.0, 1100.0)
    pv = {x.id: x.verdict for x in judge(LISTING, readings_from_measurement(part, cond), True).verdicts}
    assert fv["uvc"] == "cannot-hold"
    assert pv["uvc"] != "holds"
    assert [a.kind for a in evaluate_germicidal(part, cond).artefacts] == ["data-edge"]


EFFICACY = _listing("efficacy test lamp", '''[[claims]]
id = "kill"
text = "kills 99.9% of germs in 10 seconds at 5 cm"
[[claims]]
id = "power"
kind = "optical-power"
text = "UVC output 1 W"
power = "1 W"
band = "UV-C"
''')


def efficacy_verdicts(spec):
    return {v.id: v for v in judge(EFFICACY, readings_from_measurement(spec, COND),
                                   measured=True).verdicts}


def test_an_efficacy_shortfall_on_partly_measured_uvc_is_not_assessable():
    # a flat UV continuum (an invented broadband lamp) measured from 240 nm: the measured
    # UV-C falls short of the claims by far, but 200-240 nm (half of UV-C) was not measured
    # and could hold the rest: benefit of the doubt gives not-assessable, never cannot-hold
    wl = np.arange(240.0, 900.0, 0.5)
    v = 2e-4 * (1 + 0.5 * np.sin(wl / 30.0))
    part = efficacy_verdicts(Spectrum(wl, v, "irradiance"))
    for cid in ("kill", "power"):
        assert part[cid].verdict == "not-assessable", cid
        assert "could make up the shortfall" in part[cid].basis
        # the shortfall (and any 'fail' of a decision rule) is the measured part's, said first
        assert part[cid].basis.startswith("on the measured part alone, "), part[cid].basis
    # the same continuum measured from 200 nm: the shortfall is established
    wl2 = np.arange(200.0, 900.0, 0.5)
    full = efficacy_verdicts(Spectrum(wl2, 2e-4 * (1 + 0.5 * np.sin(wl2 / 30.0)), "irradiance"))
    assert full["kill"].verdict == "cannot-hold" and full["power"].verdict == "cannot-hold"


def test_a_uvc_led_needs_no_data_below_240_nm():
    # a 275 nm UV-C LED measured from 240 nm: the technology emits nothing below 240 nm
    # (data/technologies.toml), so the missing 200-240 nm holds nothing and the verdict stands,
    # saying why
    wl = np.arange(240.0, 420.0, 0.5)
    spec = Spectrum(wl, gaussian(wl, 275.0, 5.0, 5e-4) + 1e-7, "irradiance")
    v = efficacy_verdicts(spec)["kill"]
    assert v.verdict == "cannot-hold"
    assert any("taken as empty" in a and "below 240 nm" in a for a in v.assumptions)
