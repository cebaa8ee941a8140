"""Unit parsing and conversion (SI definitions; 1 µW/cm² = 10 mW/m² by the SI prefixes)."""

import math

import pytest

from uvcheck.errors import UnitError
from uvcheck.units import (format_duration, parse_quantity, parse_spectral_unit,
                           parse_wavelength_unit, to_trade)


@pytest.mark.parametrize("text,quantity,factor", [
    # factor to W m^-2 nm^-1 from the SI prefixes: µ = 1e-6, m = 1e-3, c = 1e-2, n = 1e-9
    ("W/m²/nm", "irradiance", 1.0),
    ("W m-2 nm-1", "irradiance", 1.0),
    ("W/(m²·nm)", "irradiance", 1.0),
    ("W.m-2.nm-1", "irradiance", 1.0),
    ("mW/m2/nm", "irradiance", 1e-3),
    ("µW/cm²/nm", "irradiance", 1e-2),   # 1 µW/cm² = 1e-6 W / 1e-4 m² = 1e-2 W/m²
    ("μW/cm²/nm", "irradiance", 1e-2),   # Greek mu
    ("uW/cm^2/nm", "irradiance", 1e-2),
    ("mW/cm2/nm", "irradiance", 10.0),
    ("W/m2/um", "irradiance", 1e-3),     # per µm -> per nm
    ("irradiance_W_m2_nm", "irradiance", 1.0),
    ("uW_per_cm2_per_nm", "irradiance", 1e-2),
    ("W/m2/sr/nm", "radiance", 1.0),
    ("W·m⁻²·sr⁻¹·nm⁻¹", "radiance", 1.0),
    ("W/nm", "flux", 1.0),
    ("mW/nm", "flux", 1e-3),
    ("counts", "relative", 1.0),
    ("a.u.", "relative", 1.0),
    ("relative", "relative", 1.0),
    ("%", "relative", 1.0),
])
def test_spectral_units(text, quantity, factor):
    u = parse_spectral_unit(text)
    assert u.quantity == quantity
    assert u.factor == pytest.approx(factor, rel=1e-12)


def test_one_microwatt_per_cm2_is_ten_milliwatt_per_m2():
    # SI: 1 µW/cm² = 1e-6 W / 1e-4 m² = 1e-2 W/m² = 10 mW/m²
    assert parse_quantity("1 µW/cm²", "irradiance").value_si == pytest.approx(10e-3)
    assert parse_quantity("10 mW/m2", "irradiance").value_si == pytest.approx(1e-2)
    assert to_trade(0.01, "W m-2") == (pytest.approx(1.0), "µW/cm²")
    # 1 mJ/cm² = 10 J/m²
    assert parse_quantity("1 mJ/cm2", "dose").value_si == pytest.approx(10.0)


def test_photon_units_flagged():
    u = parse_spectral_unit("umol/m2/s/nm")
    assert u.photon and u.quantity == "irradiance"


@pytest.mark.parametrize("text,kind,si", [
    ("30 min", "time", 1800.0), ("1.5 h", "time", 5400.0), ("2 m", "length", 2.0),
    ("20 cm", "length", 0.2), ("254nm", "length", 254e-9), ("20 m²", "area", 20.0),
    ("50 m3", "volume", 50.0), ("8 W", "power", 8.0), ("3,1 V", "voltage", 3.1),
    ("99.9 %", "fraction", 0.999), ("0.1 cm2/mJ", "rate_constant", 0.01),
])
def test_quantities(text, kind, si):
    assert parse_quantity(text, kind).value_si == pytest.approx(si)


def test_wrong_kind_named():
    with pytest.raises(UnitError, match="is not a time"):
        parse_quantity("30 kg", "time")
    with pytest.raises(UnitError, match="has no unit"):
        parse_quantity("30", "time")
    with pytest.raises(UnitError, match="cannot read"):
        parse_quantity("soon", "time")


def test_not_per_wavelength_is_refused():
    with pytest.raises(UnitError, match="not per wavelength"):
        parse_spectral_unit("W/m2")


def test_wavelength_units():
    assert parse_wavelength_unit("nm") == ("length", 1.0)
    assert parse_wavelength_unit("µm") == ("length", 1000.0)
    assert parse_wavelength_unit("m") == ("length", 1e9)
    assert parse_wavelength_unit("cm-1")[0] == "wavenumber"


def test_durations():
    assert format_duration(90) == "1.5 min"
    assert format_duration(math.inf) == "unlimited"


def test_parsed_units_are_kept_and_errors_name_each_place():
    """parse_unit keeps what it has read (a batch reads '8 h' and the same spectral units for
    every product) without changing a result or an error: the kept unit equals a fresh parse,
    and an unreadable unit is refused every time, naming the place of that call (our own
    rule for error messages)."""
    from uvcheck.units import _parse_unit, parse_unit

    first = parse_unit("uW/cm2/nm")
    assert parse_unit("uW/cm2/nm", "elsewhere") is first
    fresh = _parse_unit("uW/cm2/nm")
    assert (first.scale, dict(first.dims), first.text) == (fresh.scale, dict(fresh.dims),
                                                           fresh.text)
    for place in ("exposure_time", "--exposure-time"):
        with pytest.raises(UnitError) as err:
            parse_unit("W m - 2", place)
        assert err.value.where == place
    with pytest.raises(UnitError) as err:
        parse_quantity("3 furlongs", "length", "distance")
    assert err.value.where == "distance"


# Imperial lengths, areas and volumes as listings write them. Exact factors of the
# international yard and pound agreement (1959; from memory, as NIST SP 811 Appendix B lists
# them): 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 yd = 0.9144 m, so 1 ft² = 0.09290304 m² and
# 1 ft³ = 0.028316846592 m³ [derived].
@pytest.mark.parametrize("text,kind,si", [
    ("6 inches", "length", 6 * 0.0254), ("8 in", "length", 8 * 0.0254),
    ("2 feet", "length", 2 * 0.3048), ("1 foot", "length", 0.3048), ("2 yd", "length", 1.8288),
    ("3 yards", "length", 3 * 0.9144),
    ("200 sq ft", "area", 200 * 0.09290304), ("200 square feet", "area", 200 * 0.09290304),
    ("200 sq. ft.", "area", 200 * 0.09290304), ("200 Sq.Ft.", "area", 200 * 0.09290304),
    ("12 sqm", "area", 12.0), ("12 sq m", "area", 12.0), ("12 square metres", "area", 12.0),
    ("12 square meters", "area", 12.0), ("1 square inch", "area", 0.0254 ** 2),
    ("1000 cu ft", "volume", 1000 * 0.028316846592), ("1000 cubic feet", "volume", 28.316846592),
    ("30 cubic metres", "volume", 30.0),
])
def test_imperial_and_worded_units(text, kind, si):
    assert parse_quantity(text, kind).value_si == pytest.approx(si, rel=1e-12)


def test_worded_areas_keep_their_kind():
    # an area is never read as a length, nor a volume as an area
    with pytest.raises(UnitError):
        parse_quantity("200 sq ft", "length")
    with pytest.raises(UnitError):
        parse_quantity("30 cubic metres", "area")


# Spectral units as exports write them without separators or with a quotient in parentheses;
# factors by the SI prefixes (1 µW/cm² = 10 mW/m², 1 mW/cm² = 10 W/m²).
@pytest.mark.parametrize("text,factor", [
    ("W/m2nm", 1.0), ("uW/cm2nm", 0.01), ("(W/m2)/nm", 1.0), ("(mW/cm2)/nm", 10.0),
    ("W/(m2 nm)", 1.0), ("µW/(cm²·nm)", 0.01),
])
def test_run_together_and_parenthesised_spectral_units(text, factor):
    u = parse_spectral_unit(text)
    assert u.quantity == "irradiance"
    assert u.factor == pytest.approx(factor, rel=1e-12)


def test_a_quotient_in_a_denominator_inverts():
    from uvcheck.units import parse_unit

    # nm/(W/m2) = nm·m²/W: dimensions m³ W⁻¹ (SI definitions)
    assert dict(parse_unit("nm/(W/m2)").dims_key()) == {"m": 3, "W": -1}


def test_cjk_unit_characters():
    # the characters, by their names in the Unicode database (Python's unicodedata)
    import unicodedata

    assert [unicodedata.name(c) for c in "㎡㎝㎽"] == ["SQUARE M SQUARED", "SQUARE CM", "SQUARE MW"]
    assert parse_quantity("30㎡", "area").value_si == pytest.approx(30.0)
    assert parse_quantity("10㎝", "length").value_si == pytest.approx(0.1)
    assert parse_quantity("5 ㎽", "power").value_si == pytest.approx(0.005)


@pytest.mark.parametrize("text, factor, quantity, mentions", [
    # 1 mW/cm²/nm = 10 W/m²/nm, 1 µW/cm²/nm = 0.01 W/m²/nm (SI prefixes, BIPM SI Brochure,
    # 9th edition, Table 7, from memory); a unit in capitals is read in lower case, W capital
    ("MW/CM2/NM", 10.0, "irradiance", "milli, not mega"),
    ("UW/CM2/NM", 0.01, "irradiance", "written in capitals"),
    ("W/M2/NM", 1.0, "irradiance", "written in capitals"),
    ("W/M2/SR/NM", 1.0, "radiance", "written in capitals"),
    # a leading MW is a capitalised milliwatt: a megawatt per cm² per nm is no lamp's output
    ("MW/cm2/nm", 10.0, "irradiance", "megawatts"),
])
def test_units_in_capitals_and_a_capital_mw_are_read_as_an_export_means_them(
        text, factor, quantity, mentions):
    u = parse_spectral_unit(text)
    assert u.quantity == quantity and u.factor == pytest.approx(factor)
    assert u.note is not None and mentions in u.note


def test_a_unit_as_written_has_no_case_note():
    for text in ("mW/cm2/nm", "W/m2/nm", "uW/cm^2/nm", "W m-2 nm-1", "counts"):
        assert parse_spectral_unit(text).note is None, text


@pytest.mark.parametrize("text, quantity, factor", [
    ("W/m2/cm-1", "irradiance", 1.0), ("W/(m2 cm-1)", "irradiance", 1.0),
    ("W/m2/cm^-1", "irradiance", 1.0), ("W m-2 (cm-1)-1", "irradiance", 1.0),
    ("mW/cm2/cm-1", "irradiance", 10.0), ("W/m2/sr/cm-1", "radiance", 1.0),
    ("W/cm-1", "flux", 1.0)])
def test_a_density_per_wavenumber_is_no_flux(text, quantity, factor):
    # W m⁻² per cm⁻¹ was read as W m⁻² × cm, a "flux" 10⁻¹¹ too small; the factor is to the
    # base unit per cm⁻¹ (SI prefixes); the reader converts per sample
    # (tests/test_reader_wavenumber_density.py)
    u = parse_spectral_unit(text)
    assert u.per_wavenumber and u.quantity == quantity and u.factor == pytest.approx(factor)
    assert not parse_spectral_unit("W/m2/nm").per_wavenumber


@pytest.mark.parametrize("text, factor", [
    # 1 µW/cm²/nm = 0.01 W/m²/nm, 1 mW/m²/nm = 0.001 W/m²/nm (SI prefixes)
    ("irradiance_uW/cm2/nm", 0.01), ("E_W/m2/nm", 1.0),
    ("microW/cm2/nm", 0.01), ("milliW/m2/nm", 0.001)])
def test_a_unit_after_a_name_or_with_a_prefix_word_is_read(text, factor):
    u = parse_spectral_unit(text)
    assert u.quantity == "irradiance" and u.factor == pytest.approx(factor)
