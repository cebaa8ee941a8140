"""A safety claim whose only exposure above the limit is a hazard's detection limit.

A UV-A LED measured with a noisy spectrometer shows no actinic UV above the noise: E_S is
reported as "< detection limit". At a close distance of use the detection limit itself,
scaled by the inverse-square law, can reach the 8-h limit. That bound is no reading of the
lamp: the safety rule judges the most likely reading, and the bound says only that the
measurement is too insensitive to decide. Such a claim is ``not-assessable`` (our own rule),
not ``cannot-hold`` (found by trying the tool: "safe for pets and children" failed on the
detection limit alone). Where a hazard above detection exceeds its limit, it decides.

Sources:
* IEC 62471:2006 4.3.1: E_S·t ≤ 30 J m⁻² over a day, so t_max = 30 / E_S [s].
* The inverse-square law: E(d) = E(d0)·(d0/d)² for a point source.
The spectra and listings are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.claims import BELOW_DETECTION_NEEDS, judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.hazards import evaluate_hazards
from uvcheck.io.listing import parse_listing
from uvcheck.spectrum import Spectrum, below_detection

COND = Conditions(measurement_distance_m=0.2, source_size_m=0.005)


def listing(distance: str) -> str:
    return f'''format = "uvcheck-listing/1"
[product]
name = "UV-A wand (invented)"
invented = true
[[claims]]
id = "pets"
kind = "safety"
text = "safe for pets and children"
safe_for = ["pets", "children"]
distance = "{distance}"
'''


def uva_led(noise: float, seed: int = 3) -> Spectrum:
    """A 395 nm LED (0.003 W m⁻² nm⁻¹ peak at 0.2 m) on white noise of 1 σ = ``noise`` per
    sample, which the spectrum carries as its noise floor, 200–3000 nm (invented)."""
    wl = np.arange(200.0, 3000.01, 1.0)
    rng = np.random.default_rng(seed)
    v = 0.003 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + rng.normal(0.0, noise, wl.size)
    return Spectrum(wl, v, "irradiance", noise_floor=noise)


def verdict(spec: Spectrum, distance: str):
    lst = parse_listing(listing(distance), "wand.toml")
    return judge(lst, readings_from_measurement(spec, COND), measured=True).verdicts[0]


def test_only_the_detection_limit_reaches_the_limit_so_the_claim_is_open():
    spec = uva_led(1e-5)
    h = evaluate_hazards(spec, COND).to_dict()["hazards"]["actinic_uv"]
    assert below_detection(h)
    # at 2 cm the bound is 100× the bound at 0.2 m (inverse square); find a distance where
    # that bound reaches 30 J m⁻² within 8 h while at 0.2 m it does not
    bound_at_use = h["detection_limit"] * (0.2 / 0.02) ** 2
    assert 30.0 / bound_at_use < 8 * 3600.0 < 30.0 / h["detection_limit"]
    v = verdict(spec, "2 cm")
    assert v.verdict == "not-assessable", v.basis
    assert "below the measurement's detection limit" in v.basis
    assert "not sensitive enough" in v.basis
    assert v.missing == BELOW_DETECTION_NEEDS
    # at the assessment distance the same bound is within the limit: the claim holds there
    assert verdict(spec, "20 cm").verdict == "holds"


def test_a_hazard_above_detection_still_decides():
    # the same LED far brighter in the blue: E_B (above detection) exceeds its limit at 2 cm
    spec = uva_led(1e-5)
    bright = spec.derive(values=spec.values * 40.0)
    v = verdict(bright, "2 cm")
    assert v.verdict == "cannot-hold", v.basis
    assert "below the measurement's detection limit" not in v.basis
