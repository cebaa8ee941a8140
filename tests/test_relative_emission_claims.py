"""Emission claims judged on a relative spectrum (counts, a shape without a scale).

Whether a lamp emits at a wavelength is a matter of shape: a relative spectrum with a
253.7 nm line shows the line as well as a calibrated one does. An emission claim at 254 nm
on such a spectrum used to be 'cannot-hold' ("with no germicidal UV-C"), because the
germicidal status of a relative spectrum is 'shape-only', which the emission judge read as
"no UV-C". It now decides on the shape: UV-C's share of the output (at least 0.1 %, the
threshold the absolute statuses use, our own) and no spectrometer artefact in UV-C.
The line tolerance is uvcheck's (max(3 nm, FWHM/2), examples/listings/README.md). Mercury
line wavelengths (253.7, 365.0 nm) from the NIST Atomic Spectra Database, from memory. The
spectra and listings are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.claims import judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.io.listing import parse_listing
from uvcheck.spectrum import Spectrum

WL = np.arange(230.0, 800.0, 0.5)
RNG = np.random.default_rng(5)


def verdicts(spec: Spectrum, texts: list[str]) -> dict[str, object]:
    claims = "".join(f'[[claims]]\nid = "c{k}"\ntext = "{t}"\n' for k, t in enumerate(texts))
    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "lamp (invented)"\n'
                        + claims, "t.toml")
    res = judge(lst, readings_from_measurement(spec, Conditions()), measured=True)
    return {v.id: v for v in res.verdicts}


def test_a_relative_mercury_spectrum_holds_its_254_nm_claim():
    counts = (20000 * np.exp(-0.5 * ((WL - 253.7) / 1.0) ** 2)
              + 600 * np.exp(-0.5 * ((WL - 365.0) / 1.0) ** 2) + RNG.normal(0, 4, WL.size))
    vs = verdicts(Spectrum(WL, counts, "relative"), ["UV-C 254nm", "emits UV-C", "UV-A 365 nm"])
    assert vs["c0"].verdict == "holds" and "253.7" in vs["c0"].basis
    assert vs["c1"].verdict == "holds"
    assert vs["c2"].verdict == "holds"


def test_a_relative_violet_led_still_cannot_hold_a_254_nm_claim():
    # a 395 nm LED on a flat floor of stray light down to 230 nm: no UV-C line, and the
    # floor is the spectrometer's, so the claim cannot hold, as on an absolute spectrum
    counts = 30000 * np.exp(-0.5 * ((WL - 395.0) / 6.0) ** 2) + 30 + RNG.normal(0, 3, WL.size)
    vs = verdicts(Spectrum(WL, counts, "relative"), ["UV-C 254nm", "emits UV-C"])
    assert vs["c0"].verdict == "cannot-hold", vs["c0"].basis
    assert vs["c1"].verdict == "cannot-hold", vs["c1"].basis


@pytest.mark.parametrize("quantity", ["relative", "irradiance"])
def test_a_line_far_from_the_stated_wavelength_is_judged_alike(quantity):
    # a 275 nm LED sold as 254 nm: the same verdict on a relative or an absolute spectrum
    v = 1e-3 * np.exp(-0.5 * ((WL - 275.0) / 5.0) ** 2) + 1e-8 + RNG.normal(0, 1e-8, WL.size)
    vs = verdicts(Spectrum(WL, v, quantity), ["254nm"])
    assert vs["c0"].verdict == "cannot-hold" and "275" in vs["c0"].basis, vs["c0"].basis
