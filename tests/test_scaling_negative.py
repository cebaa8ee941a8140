"""Scaling a spectrum that is mostly below zero (a dark and a lamp scan swapped) is refused
with the reason, not only "must be positive". Invented spectra.

The bound of what counts as mostly and deeply below zero is
:func:`uvcheck.features.negative_dominated` (our own rule)."""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.errors import ConfigurationError
from uvcheck.scaling import scale_by_band, scale_by_total
from uvcheck.spectrum import Spectrum

WL = np.arange(200.0, 800.5, 1.0)
LED = 1e-2 * np.exp(-0.5 * ((WL - 275.0) / 5.0) ** 2) + 1e-6 * np.sin(WL)


@pytest.mark.parametrize("scale", [lambda s: scale_by_total(s, "1 W/m2"),
                                   lambda s: scale_by_band(s, "UV-C=1 W/m2")])
def test_a_swapped_dark_is_named_when_scaling_is_refused(scale):
    with pytest.raises(ConfigurationError) as exc:
        scale(Spectrum(WL, -LED, "relative"))
    assert "below zero" in str(exc.value) and "swapped" in str(exc.value)
    # the lamp scan the right way round scales
    assert scale(Spectrum(WL, LED, "relative")).is_absolute


def test_a_non_positive_total_is_its_own_error():
    with pytest.raises(ConfigurationError) as exc:
        scale_by_total(Spectrum(WL, LED, "relative"), "0 W/m2")
    assert "the total must be positive" in str(exc.value)
