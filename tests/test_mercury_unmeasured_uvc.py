"""A mercury lamp measured only above UV-C (from 300 nm): the 253.7 nm line was not measured,
so it is neither "found" nor "missed", and the lamp is still named a mercury discharge by its
visible lines, not guessed an LED.

Sources: the mercury lines at 302.2, 313.2, 365.0, 404.7, 435.8, 546.1 and 577.0/579.1 nm,
as data/emitters/emission_lines.csv records them (from memory, marked so there). The
spectrum is invented.
"""

from __future__ import annotations

import numpy as np

from uvcheck.assessment import assess
from uvcheck.conditions import Conditions
from uvcheck.germicidal import detect_technology
from uvcheck.report.terminal import hg_line_text
from uvcheck.spectrum import Spectrum

HG_VISIBLE = (302.2, 313.2, 365.0, 404.7, 435.8, 546.1, 577.0)


def mercury(lo: float = 300.0, lines=HG_VISIBLE, floor: float = 1e-5) -> Spectrum:
    """Narrow lines (σ 0.65 nm) on a small floor, lo–800 nm at 0.5 nm (invented)."""
    wl = np.arange(lo, 800.01, 0.5)
    v = np.full(wl.size, floor)
    for c in lines:
        v += 0.02 * np.exp(-0.5 * ((wl - c) / 0.65) ** 2)
    v += 2e-6 * np.sin(3.1 * wl)
    return Spectrum(wl, v, "irradiance")


def test_a_mercury_lamp_measured_from_300_nm_is_named_by_its_visible_lines():
    assert detect_technology(mercury()) == "lp_mercury"
    # two mercury lines are not enough to name it (MERCURY_LINES_TO_NAME, our own rule)
    assert detect_technology(mercury(lines=(404.7, 435.8))) != "lp_mercury"


def test_the_253_7_nm_line_is_not_measured_rather_than_not_found():
    a = assess(mercury(), Conditions(measurement_distance_m=0.3))
    d = a.to_dict()
    assert d["spectral"]["hg_253_7_present"] is None
    assert hg_line_text(None, d) == "not measured (the data cover 300–800 nm)"
    # the ozone note no longer leans on an LED guess ("would emit nothing there")
    oz = d["germicidal"]["ozone"]
    assert oz["status"] == "unknown" and "LED" not in oz["note"], oz


def test_data_that_reach_253_7_nm_still_say_found_or_not():
    d = assess(mercury(lo=230.0), Conditions(measurement_distance_m=0.3)).to_dict()
    assert d["spectral"]["hg_253_7_present"] is False
    d = assess(mercury(lo=230.0, lines=HG_VISIBLE + (253.7,)),
               Conditions(measurement_distance_m=0.3)).to_dict()
    assert d["spectral"]["hg_253_7_present"] is True
