"""Inactivation kinetics and the organism table.

Check values: NOTES.md §7 C9 (D90 from a base-e k), C10 (base-10 k, Robinson et al. 2021),
C11 (HCoV-OC43 at 222 nm, Buonanno et al. 2020), C14 (eACH), C16 (99.9 % in 30 min, Hessling
et al. 2020). Table rows are checked against the values their sources print.
"""

import doctest
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from uvcheck import inactivation
from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError
from uvcheck.inactivation import (GENERIC_NOTE, MEDIA, d90_from_k, each_per_h, estimate,
                                  first_order_dose, first_order_log_reduction,
                                  first_order_survival, get_organism, log_for_percent,
                                  mixed_air_time, most_susceptible, organisms,
                                  required_irradiance, select, time_to_reduction,
                                  two_population_dose, two_population_log_reduction,
                                  two_population_survival)

LN10 = math.log(10)


def test_doctests():
    assert doctest.testmod(inactivation).failed == 0


def test_c9_d90_from_base_e_k():
    # NOTES.md §7 C9: k = 0.1 cm²/mJ (base e) -> D90 = 23.03 mJ/cm²
    assert d90_from_k(0.1, "e") == pytest.approx(23.03, abs=0.005)


def test_c10_d90_from_base_10_k():
    # NOTES.md §7 C10: base-10 k = 0.64 cm²/mJ (Robinson et al. 2021) -> D90 = 1/k = 1.5625 mJ/cm²
    assert d90_from_k(0.64, "10") == pytest.approx(1.5625)
    row = get_organism("sars_cov_2_water_222_robinson2021")
    assert row.k_base == "10"
    assert row.d90_J_m2 == pytest.approx(15.625)           # 1.5625 mJ/cm² × 10
    # the base is kept: the natural-log constant is k₁₀·ln10 (0.64 × 2.3026 = 1.474 cm²/mJ)
    assert row.k_e_m2_per_J == pytest.approx(0.64 * LN10 * 0.1)


def test_bases_agree():
    # definition: 10^(−k₁₀H) = exp(−k₁₀·ln10·H)
    h = np.array([0.0, 1.0, 5.0])
    assert np.allclose(first_order_survival(h, 0.3, "10"), 10 ** (-0.3 * h))
    assert np.allclose(first_order_log_reduction(h, 0.3, "10"), 0.3 * h)
    with pytest.raises(ConfigurationError, match="available: e, 10"):
        d90_from_k(0.1, "2")


def test_percent_to_log():
    # definition: n = −log10(1 − p)
    assert log_for_percent(90) == pytest.approx(1.0)
    assert log_for_percent(99) == pytest.approx(2.0)
    assert log_for_percent(99.9) == pytest.approx(3.0)
    with pytest.raises(ConfigurationError, match="between 0 and 100"):
        log_for_percent(100)


def test_c11_oc43_far_uvc_times():
    # NOTES.md §7 C11 / Buonanno et al. 2020: 3 log at 1.2 mJ/cm², at 3 mJ/cm² per hour:
    # 90 % in 8.0 min, 99 % in 16 min, 99.9 % in 24 min (paper: about 8, 16 and 25 min)
    e = 3 * 10 / 3600                                       # 3 mJ/cm²/h = 30 J/m² per 3600 s
    est = estimate(get_organism("hcov_oc43_air_222_buonanno2020"), e)
    assert est.time_s(90) / 60 == pytest.approx(8.0, abs=0.05)
    assert est.time_s(99) / 60 == pytest.approx(16.0, abs=0.05)
    assert est.time_s(99.9) / 60 == pytest.approx(24.0, abs=0.05)


def test_c16_99_9_percent_in_30_min():
    # NOTES.md §7 C16 / Hessling et al. 2020: D90 = 3.7 mJ/cm² -> 11.1 mJ/cm² for 3 log,
    # at least 6.17 µW/cm² everywhere for 99.9 % in 30 min
    row = get_organism("coronaviruses_mixed_254_hessling2020_best")
    assert row.dose_for_log(3) == pytest.approx(111.0)     # 11.1 mJ/cm² = 111 J/m²
    assert required_irradiance(row, 99.9, 1800) * 100 == pytest.approx(6.17, abs=0.005)


def test_c14_each():
    # NOTES.md §7 C14: k = 0.28 m²/J, E_avg = 0.5 W/m², f_rad = 0.2 -> 100.8 h⁻¹
    assert each_per_h(0.28, 0.5, 0.2) == pytest.approx(100.8)
    # well-mixed air: 3 log in 3·ln10/(k·E) (first-order decay, NOTES.md §4)
    assert mixed_air_time(3, 0.28, 0.5) == pytest.approx(3 * LN10 / 0.14)


def test_two_population_model():
    k1, k2, f = 0.05, 0.005, 0.01
    # f = 0 and k1 = k2 are first order (analytic)
    assert two_population_dose(3, k1, k2, 0.0) == pytest.approx(float(first_order_dose(3, k1)))
    assert two_population_dose(3, k1, k1, 0.3) == pytest.approx(float(first_order_dose(3, k1)))
    # round trip: the dose found gives the asked log reduction
    h = two_population_dose(4, k1, k2, f)
    assert float(two_population_log_reduction(h, k1, k2, f)) == pytest.approx(4.0, abs=1e-9)
    # tail: a resistant fraction makes high logs cost more than first order extrapolation
    assert h > float(first_order_dose(4, k1))
    # k2 = 0: survival never falls below f; 1 log has the closed form −ln((0.1 − f)/(1 − f))/k1
    assert two_population_dose(3, k1, 0.0, 0.01) is None
    assert two_population_dose(1, k1, 0.0, 0.01) == pytest.approx(-math.log(0.09 / 0.99) / k1)
    assert float(two_population_survival(1e9, k1, 0.0, 0.01)) == pytest.approx(0.01)
    with pytest.raises(ConfigurationError, match="resistant fraction"):
        two_population_survival(1.0, k1, k2, 1.0)


def test_dose_table_rows_interpolate_but_never_extrapolate():
    crypto = get_organism("cryptosporidium_water_254_usepa2006")
    assert crypto.model == "dose_table"
    # USEPA UVDGM table: 1 log 2.5, 3.5 log 15 mJ/cm²
    assert crypto.dose_for_log(1) == pytest.approx(25.0)
    assert crypto.dose_for_log(3.5) == pytest.approx(150.0)
    # straight line between the table's 0.5 log (1.6) and 1 log (2.5 mJ/cm²): 0.75 log -> 2.05
    assert crypto.dose_for_log(0.75) == pytest.approx(20.5)
    assert crypto.dose_for_log(4.5) is None                 # beyond the table's 4 log
    assert crypto.log_reduction(25.0) == pytest.approx(1.0)
    # Murdoch et al. 2012 Table 3: Listeria on PVC reaches 0.93 log at 30 J/cm²: no D90
    assert get_organism("listeria_surface_pvc_405_murdoch2012").d90_J_m2 is None
    est = estimate(get_organism("salmonella_surface_pvc_405_murdoch2012"), 1.0)
    assert est.time_s(99.9) is None and any("not extrapolated" in n for n in est.notes)


def test_single_point_rows_are_first_order_and_flag_extrapolation():
    h1n1 = get_organism("influenza_a_h1n1_air_222_welch2018")
    # Welch et al. 2018: > 95 % (1.301 log) at 2 mJ/cm² -> at most 2 mJ/cm² for 1.301 log
    assert h1n1.dose_bound == "at_most"
    assert h1n1.dose_for_log(1.301) == pytest.approx(20.0)
    est = estimate(h1n1, 1.0)
    assert any("extrapolation" in n for n in est.notes)
    assert any("upper bounds" in n for n in est.notes)


def test_ranges_across_studies():
    # Rockey et al. 2021: MS2 k median 0.1155, range 0.064–0.200 cm²/mJ (base e)
    ms2 = get_organism("ms2_water_254_rockey2021")
    assert ms2.d90_J_m2 == pytest.approx(LN10 / 0.01155)    # 19.9 mJ/cm² per log
    lo, hi = ms2.dose_range_for_log(1)
    assert lo == pytest.approx(LN10 / 0.0200) and hi == pytest.approx(LN10 / 0.0064)
    # Hessling et al. 2020: coronaviruses 3.7 (best estimate) to 10.6 (upper limits) mJ/cm²
    cov = get_organism("coronaviruses_mixed_254_hessling2020_best")
    assert cov.dose_range_for_log(1) == pytest.approx((37.0, 106.0))


def test_table_integrity():
    sources = read_toml("organisms/organisms.toml")["sources"]
    rows = organisms()
    assert len({o.id for o in rows}) == len(rows)
    for o in rows:
        assert o.medium in MEDIA
        assert o.source in sources
        assert o.k_published is None or o.k_base in ("e", "10")   # every k keeps its base
        assert o.from_memory
        assert o.d90_J_m2 is None or o.d90_J_m2 > 0


def test_violet_blue_doses_are_about_a_thousand_times_uvc():
    # NOTES.md §4: violet-blue photoinactivation needs doses about 10³–10⁵ times UV-C doses
    uvc = [o.d90_J_m2 for o in select(pathway="uvc") if o.d90_J_m2]
    vb = [o.d90_J_m2 for o in select(pathway="violet_blue") if o.d90_J_m2]
    ratio = np.median(vb) / np.median(uvc)
    assert 1e2 < ratio < 1e5


def test_most_susceptible_says_so_and_skips_phages():
    flat = lambda o: 1.0 if o.pathway == "uvc" else None   # noqa: E731 - same irradiance everywhere
    best = most_susceptible(flat, "water")
    doses = [o.dose_for_log(3) for o in select("water", "uvc", exclude_groups=("phage",))]
    assert best.doses_J_m2[99.9] == pytest.approx(min(d for d in doses if d is not None))
    assert best.organism.group != "phage"
    assert best.notes[0] == GENERIC_NOTE.format(name=best.organism.organism, medium=best.organism.medium)
    assert most_susceptible(lambda o: None, "air") is None


def test_select_and_errors():
    assert all(o.medium in ("air", "mixed", "unspecified") for o in select("air"))
    with pytest.raises(ConfigurationError, match="available"):
        get_organism("unicorn")
    with pytest.raises(ConfigurationError, match="unknown medium"):
        select("space")


@settings(max_examples=100, deadline=None)
@given(e=st.floats(1e-4, 1e3), factor=st.floats(1.0, 1e3),
       i=st.integers(0, len(organisms()) - 1), p=st.sampled_from([90.0, 99.0, 99.9]))
def test_more_output_never_lengthens_a_time(e, factor, i, p):
    # property: time = dose / irradiance, non-increasing in irradiance
    o = organisms()[i]
    t1, t2 = time_to_reduction(o, e, p), time_to_reduction(o, e * factor, p)
    if t1 is not None:
        assert t2 <= t1 * (1 + 1e-12)


@settings(max_examples=100, deadline=None)
@given(i=st.integers(0, len(organisms()) - 1), n=st.floats(0.1, 5.0), dn=st.floats(0.01, 2.0))
def test_more_logs_never_cost_less(i, n, dn):
    o = organisms()[i]
    a, b = o.dose_for_log(n), o.dose_for_log(n + dn)
    if a is not None and b is not None:
        assert b > a
