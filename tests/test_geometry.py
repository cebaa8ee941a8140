"""Distance scaling: point, Lambertian and tube (Keitz) models, with their limits.

Check values: NOTES.md §7 (C12 inverse square, C13 Keitz and its far field). Analytic anchors
are derived in the comments.
"""

import doctest
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from uvcheck import geometry
from uvcheck.errors import ConfigurationError
from uvcheck.geometry import (distance_for_irradiance, distance_scaling, far_field_deviation,
                              flux_from_irradiance, irradiance_at, irradiance_from_flux,
                              keitz_irradiance, scale_factor)
from uvcheck.inactivation import time_for_dose


def test_doctests():
    assert doctest.testmod(geometry).failed == 0


def test_c12_point_source_inverse_square():
    # NOTES.md §7 C12: Φ = 10 mW, r = 10 cm -> 7.96 µW/cm²; 10 mJ/cm² in 1257 s
    e = irradiance_from_flux(0.010, 0.10, "point")
    assert e * 100 == pytest.approx(7.96, abs=0.005)        # W/m² -> µW/cm² (×100)
    assert time_for_dose(100.0, e) == pytest.approx(1257, abs=1)   # 10 mJ/cm² = 100 J/m²


def test_c13_keitz_and_far_field():
    # NOTES.md §7 C13: Φ = 10 W, L = 0.8 m: d = 1 m -> 0.9186 W/m²; d = 10 m -> 0.01012 vs 0.01013
    assert keitz_irradiance(10.0, 1.0, 0.8) == pytest.approx(0.9186, abs=1e-4)
    assert irradiance_from_flux(10.0, 10.0, "tube", tube_length_m=0.8) == pytest.approx(0.01012, abs=5e-6)
    far = 10.0 / (math.pi ** 2 * 10.0 ** 2)                 # Φ/(π²d²), NOTES.md §5
    assert far == pytest.approx(0.01013, abs=5e-6)


def test_keitz_close_in_is_the_infinite_cylinder():
    # derived: d ≪ L -> α -> π/2, E -> Φ/(2πLd), the Lambertian infinite cylinder
    L, d = 1.0, 1e-4
    assert keitz_irradiance(1.0, d, L) == pytest.approx(1.0 / (2 * math.pi * L * d), rel=1e-3)


def test_lambertian_on_axis_and_disc():
    # NOTES.md §5: on-axis Lambertian E = Φ/(πr²)
    assert irradiance_from_flux(1.0, 2.0, "lambertian") == pytest.approx(1 / (4 * math.pi))
    # derived (disc configuration factor): E = Φ/(π(a² + d²)); at d = 10a it is 1/101 below Φ/(πd²)
    a, d = 0.05, 0.5
    e_disc = irradiance_from_flux(1.0, d, "lambertian", source_size_m=2 * a)
    assert e_disc == pytest.approx(1 / (math.pi * (a * a + d * d)))
    assert far_field_deviation(d, "lambertian", source_size_m=2 * a) == pytest.approx(-1 / 101)


def test_round_trips_and_scaling():
    for model, kw in (("point", {}), ("lambertian", {}), ("tube", {"tube_length_m": 1.2})):
        e = irradiance_from_flux(3.0, 0.7, model, **kw)
        assert flux_from_irradiance(e, 0.7, model, **kw) == pytest.approx(3.0)
        assert distance_for_irradiance(e, flux_W=3.0, emitter=model, **kw) == pytest.approx(0.7, rel=1e-9)
        assert irradiance_at(1.4, emitter=model, irradiance_W_m2=e, measured_at_m=0.7, **kw) == \
            pytest.approx(irradiance_from_flux(3.0, 1.4, model, **kw))
    assert scale_factor(0.2, 0.4) == pytest.approx(0.25)   # inverse square


def test_vectorised():
    d = np.array([0.5, 1.0, 2.0])
    e = irradiance_from_flux(1.0, d, "tube", tube_length_m=0.8)
    assert e.shape == (3,) and np.all(np.diff(e) < 0)


def test_regimes():
    # a 0.8 m tube: far-field within 1 % at 10 m (C13 numbers: 0.01012 vs 0.01013), not at 0.2 m
    assert distance_scaling(5.0, 10.0, "tube", tube_length_m=0.8).regime == "far-field"
    assert distance_scaling(0.2, 1.0, "tube", tube_length_m=0.8).regime == "near-field"
    assert distance_scaling(0.2, 1.0, "point").regime == "unknown"   # source size not given
    assert "five times" in distance_scaling(0.2, 1.0, "point").note


def test_errors_say_what_to_do():
    with pytest.raises(ConfigurationError, match="tube length"):
        irradiance_from_flux(1.0, 1.0, "tube")
    with pytest.raises(ConfigurationError, match="positive"):
        irradiance_from_flux(1.0, -1.0)
    with pytest.raises(ConfigurationError, match="available: point, lambertian, tube"):
        irradiance_from_flux(1.0, 1.0, "spot")
    with pytest.raises(ConfigurationError, match="measured at"):
        irradiance_at(1.0, irradiance_W_m2=1.0)


@settings(max_examples=200, deadline=None)
@given(d1=st.floats(0.01, 50.0), factor=st.floats(1.0001, 20.0),
       model=st.sampled_from(["point", "lambertian", "tube"]), L=st.floats(0.05, 3.0))
def test_moving_closer_never_lowers_irradiance(d1, factor, model, L):
    # property: irradiance is a decreasing function of distance for every model
    kw = {"tube_length_m": L} if model == "tube" else {}
    assert irradiance_from_flux(1.0, d1, model, **kw) >= irradiance_from_flux(1.0, d1 * factor, model, **kw)
