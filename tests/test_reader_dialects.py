"""The dialect matrix: generated exports in the formats instruments and spreadsheets write.

Each file carries the same known spectrum (a Gaussian of known area at 395 nm plus noise-free
zero elsewhere); the reader must recover wavelengths and SI values whatever the dialect.
Unit factors follow the SI prefixes (1 µW/cm² = 10 mW/m²).
"""

from __future__ import annotations

import numpy as np
import pytest
from conftest import gaussian

from uvcheck.errors import InputFormatError
from uvcheck.io.reader import read_spectrum
from uvcheck.spectrum import integrate

WL = np.arange(250.0, 800.0 + 1e-9, 0.5)
E = gaussian(WL, 395.0, 6.0, 0.012)          # W m^-2 nm^-1, area 0.012 W m^-2
AREA = 0.012


def rows(fmt: str, wl=WL, v=E, scale=1.0, sep=",", dec="."):
    out = []
    for a, b in zip(wl, v * scale):
        line = fmt.format(a, b)
        if dec == ",":
            line = line.replace(".", ",")
        out.append(line.replace("|", sep))
    return "\n".join(out)


def write(tmp_path, name, text, encoding="utf-8"):
    p = tmp_path / name
    p.write_bytes(text.encode(encoding))
    return p


CASES = {
    # name: (text builder, encoding, expected delimiter, decimal, quantity, value unit factor)
    "comma_header_units.csv": (lambda: "Wavelength (nm),Irradiance (W/m²/nm)\n" + rows("{:.1f}|{:.8e}"),
                               "utf-8", "comma", ".", "irradiance"),
    "semicolon_decimal_comma.csv": (lambda: "Wellenlänge [nm];E [µW/cm²/nm]\n" + rows("{:.1f}|{:.8f}", scale=100, sep=";", dec=","),
                                    "latin-1", "semicolon", ",", "irradiance"),
    "tab_utf16.txt": (lambda: "nm\tmW/m2/nm\n" + rows("{:.1f}|{:.8f}", scale=1000, sep="\t"),
                      "utf-16", "tab", ".", "irradiance"),
    "tab_decimal_comma.txt": (lambda: "Wavelength\tIrradiance\nnm\tW m-2 nm-1\n" + rows("{:.1f}|{:.8e}", sep="\t", dec=","),
                              "utf-8", "tab", ",", "irradiance"),
    "spaces_comments.txt": (lambda: "# exported spectrum\n# units: W/m2/nm\n" + rows("{:8.1f}|{:.8e}", sep="   "),
                            "utf-8", "space", ".", "irradiance"),
    "bom_underscore_names.csv": (lambda: "\ufeffwavelength_nm,irradiance_W_m2_nm\n" + rows("{:.1f}|{:.8e}"),
                                 "utf-8", "comma", ".", "irradiance"),
    "metadata_block.csv": (lambda: "[Instrument]\nModel: invented test spectrometer\nIntegration time: 200 ms\n"
                           "Distance: 20 cm\n\n[Data]\nWavelength;Irradiance\nnm;uW/cm^2/nm\n"
                           + rows("{:.1f}|{:.8f}", scale=100, sep=";") + "\n\nEnd of file\n",
                           "utf-8", "semicolon", ".", "irradiance"),
    "keyvalue_semicolon_meta.csv": (lambda: "Operator;test\nUnits;mW/cm2/nm\nDate;2026-11-30\n\nWL;Value\n"
                                    + rows("{:.1f}|{:.8f}", scale=0.1, sep=";", dec=","),
                                    "utf-8", "semicolon", ",", "irradiance"),
    "descending_um.csv": (lambda: "lambda [um],E [W/m2/um]\n" + rows("{:.5f}|{:.8e}", wl=WL[::-1] / 1000, v=E[::-1], scale=1000),
                          "utf-8", "comma", ".", "irradiance"),
    "radiance.csv": (lambda: "Wavelength [nm],Radiance [W/(m²·sr·nm)]\n" + rows("{:.1f}|{:.8e}"),
                     "utf-8", "comma", ".", "radiance"),
    # a unit whose denominator is bracketed, written after the name without brackets of its own
    "radiance_bare_denominator.csv": (lambda: "Wavelength nm,Spectral radiance W/(m2 sr nm)\n"
                                      + rows("{:.1f}|{:.8e}"), "utf-8", "comma", ".", "radiance"),
    "irradiance_bare_denominator.csv": (lambda: "nm,E mW/(m^2*nm)\n" + rows("{:.1f}|{:.8e}", scale=1000),
                                        "utf-8", "comma", ".", "irradiance"),
    # ISO 80000-1 'quantity / unit' headings, and a unit of several words after the name
    "iso_quantity_over_unit.csv": (lambda: "λ / nm,E(λ) / W m-2 nm-1\n" + rows("{:.1f}|{:.8e}"),
                                   "utf-8", "comma", ".", "irradiance"),
    "quantity_over_bracketed_unit.csv": (lambda: "Wavelength/(nm),Irradiance/(W/m2/nm)\n"
                                         + rows("{:.1f}|{:.8e}"), "utf-8", "comma", ".", "irradiance"),
    "spaced_unit_words.tsv": (lambda: "Wavelength nm\tIrr. uW cm-2 nm-1\n"
                              + rows("{:.1f}|{:.8f}", scale=100, sep="\t"),
                              "utf-8", "tab", ".", "irradiance"),
    "flux_mw.csv": (lambda: "Wavelength [nm],Flux [mW/nm]\n" + rows("{:.1f}|{:.8e}", scale=1000),
                    "utf-8", "comma", ".", "flux"),
    "counts_relative.csv": (lambda: "Wavelength (nm),Intensity (counts)\n" + rows("{:.1f}|{:.8e}", scale=5e6),
                            "utf-8", "comma", ".", "relative"),
    "no_unit_relative.csv": (lambda: rows("{:.1f}|{:.8e}"), "utf-8", "comma", ".", "relative"),
    "pipe_separated.txt": (lambda: "wavelength|irradiance (uW/cm2/nm)\n" + rows("{:.1f}|{:.8f}", scale=100, sep="|"),
                           "utf-8", "pipe", ".", "irradiance"),
    "crlf_footer.csv": (lambda: ("Wavelength (nm),Irradiance (W m-2 nm-1)\n" + rows("{:.1f}|{:.8e}")
                                 + "\nTotal,123\nSaved by invented software\n").replace("\n", "\r\n"),
                        "utf-8", "comma", ".", "irradiance"),
    "index_column.csv": (lambda: "Pixel,Wavelength [nm],Irradiance [W/m2/nm]\n"
                         + "\n".join(f"{i},{a:.1f},{b:.8e}" for i, (a, b) in enumerate(zip(WL, E))),
                         "utf-8", "comma", ".", "irradiance"),
}


@pytest.mark.parametrize("name", sorted(CASES))
def test_dialect(tmp_path, name):
    build, enc, delim, dec, quantity = CASES[name]
    p = write(tmp_path, name, build(), enc)
    spec, rep = read_spectrum(p)
    assert rep.delimiter == delim
    assert rep.decimal == dec
    assert rep.quantity == quantity
    assert spec.wavelength_nm[0] == pytest.approx(250.0)
    assert spec.wavelength_nm[-1] == pytest.approx(800.0)
    assert spec.wavelength_nm.size == WL.size
    if quantity == "relative":
        # shape preserved: the peak is at 395 nm
        assert spec.wavelength_nm[np.argmax(spec.values)] == pytest.approx(395.0)
    else:
        # the Gaussian's analytic area, in SI after the unit conversion
        assert integrate(spec, 250.0, 800.0).value == pytest.approx(AREA, rel=1e-4)


def test_metadata_and_distance(tmp_path):
    build = CASES["metadata_block.csv"][0]
    spec, rep = read_spectrum(write(tmp_path, "m.csv", build()))
    assert rep.measurement_distance_m == pytest.approx(0.2)
    assert rep.metadata["Instrument/Integration time"] == "200 ms"
    assert rep.header_line == 7 and rep.units_line == 8
    assert "Instrument/Model" in spec.meta["instrument"]


def test_unit_from_metadata(tmp_path):
    spec, rep = read_spectrum(write(tmp_path, "k.csv", CASES["keyvalue_semicolon_meta.csv"][0]()))
    assert rep.value_unit == "mW/cm2/nm" and "metadata" in rep.value_unit_how


def test_relative_is_said(tmp_path):
    spec, rep = read_spectrum(write(tmp_path, "r.csv", CASES["no_unit_relative.csv"][0]()))
    assert any("RELATIVE" in w for w in rep.warnings)


def test_descending_reported(tmp_path):
    spec, rep = read_spectrum(write(tmp_path, "d.csv", CASES["descending_um.csv"][0]()))
    assert rep.sorted.startswith("descending")
    assert rep.wavelength_unit == "um"


def test_several_columns_listed(tmp_path):
    text = "Wavelength,Dark,Reference,Sample\n" + "\n".join(f"{a},1,2,{b}" for a, b in zip(WL, E))
    p = write(tmp_path, "multi.csv", text)
    with pytest.raises(InputFormatError, match=r"3 value columns .*'Dark'.*'Reference'.*'Sample'.*--column"):
        read_spectrum(p)
    spec, rep = read_spectrum(p, column="Sample", unit="W/m2/nm")
    assert rep.value_column == "Sample"
    assert integrate(spec, 250, 800).value == pytest.approx(AREA, rel=1e-4)
    spec2, _ = read_spectrum(p, column="4", unit="W/m2/nm")
    assert np.array_equal(spec.values, spec2.values)


def test_overrides(tmp_path):
    # wavelength unit override: the same numbers read as µm would be out of range
    text = "\n".join(f"{a:.1f};{b:.8e}" for a, b in zip(WL, E))
    p = write(tmp_path, "o.csv", text)
    spec, rep = read_spectrum(p, unit="W/m2/nm", delimiter="semicolon", decimal=".")
    assert rep.value_unit_how == "given with --unit"
    assert rep.quantity == "irradiance"


def test_duplicates_averaged_nan_dropped_negatives_kept(tmp_path):
    lines = ["nm,W/m2/nm", "300,1", "301,2", "301,4", "302,nan", "303,-0.5", "304,inf", "305,1", "306,1"]
    spec, rep = read_spectrum(write(tmp_path, "x.csv", "\n".join(lines)))
    assert rep.duplicates_averaged == 1
    assert spec.values[list(spec.wavelength_nm).index(301.0)] == pytest.approx(3.0)
    assert rep.rows_dropped_nonfinite == 2
    assert -0.5 in spec.values


def test_thousands_separator(tmp_path):
    lines = ["Wavelength (nm);Counts"] + [f"{w};{c}" for w, c in [(300, "1,234.5"), (301, "2,000.0"), (302, "999.5"), (303, "12.0")]]
    spec, rep = read_spectrum(write(tmp_path, "t.csv", "\n".join(lines)))
    assert rep.thousands == ","
    assert spec.values[0] == pytest.approx(1234.5)


def test_gap_detected(tmp_path):
    wl = np.concatenate([np.arange(250.0, 300.0, 1.0), np.arange(340.0, 400.0, 1.0)])
    text = "nm,W/m2/nm\n" + "\n".join(f"{a},{1.0}" for a in wl)
    spec, rep = read_spectrum(write(tmp_path, "g.csv", text))
    assert rep.gaps_nm == ((299.0, 340.0),)
    r = integrate(spec, 250.0, 399.0)
    assert r.value == pytest.approx(49.0 + 59.0)


def test_noise_floor_from_negatives(tmp_path):
    rng = np.random.default_rng(7)
    v = E + rng.normal(0.0, 1e-6, WL.size)
    text = "nm,W/m2/nm\n" + "\n".join(f"{a},{b:.6e}" for a, b in zip(WL, v))
    spec, rep = read_spectrum(write(tmp_path, "n.csv", text))
    assert rep.noise["method"] == "negative-samples"
    assert spec.noise_floor == pytest.approx(1e-6, rel=0.15)


# ---------------------------------------------------------------------------------------------
# Thousands separators: ambiguous '10.000' among integers, and '1.002.000' deciding the mark
# (invented counts; the expected numbers follow from how the file was written)
# ---------------------------------------------------------------------------------------------

def _counts_rows(sep: str, thousands: str, top: int = 20000, centre: float = 395.0,
                 pedestal: int = 0):
    wl = np.arange(250.0, 800.0 + 1e-9, 5.0)
    n = pedestal + np.round(top * np.exp(-0.5 * ((wl - centre) / 6.0) ** 2)).astype(int)
    return wl, n, "\n".join(f"{a:.0f}{sep}" + f"{int(b):,}".replace(",", thousands)
                            for a, b in zip(wl, n))


def test_ambiguous_thousands_separator_is_flagged(tmp_path):
    _, _, body = _counts_rows(";", ".")
    spec, rep = read_spectrum(write(tmp_path, "t.csv", "nm;counts\n" + body + "\n"))
    assert rep.decimal == "."
    w = [x for x in rep.warnings if "may be a thousands separator" in x]
    assert len(w) == 1
    assert "column 'counts' (column 2)" in w[0] and "--decimal ','" in w[0]
    assert "'4.987' on line 29" in w[0]  # 4987 counts at 385 nm, written '4.987'


def test_ambiguous_thousands_not_flagged_when_decimal_given(tmp_path):
    _, _, body = _counts_rows(";", ".")
    spec, rep = read_spectrum(write(tmp_path, "t.csv", "nm;counts\n" + body + "\n"), decimal=",")
    assert rep.thousands == "." and float(spec.values.max()) == 20000.0
    assert not any("may be a thousands separator" in x for x in rep.warnings)


def test_ambiguous_thousands_in_comma_file_says_re_export(tmp_path):
    # with ',' as the delimiter the decimal mark cannot be ','; the warning says what to do
    _, _, body = _counts_rows(",", ".")
    _, rep = read_spectrum(write(tmp_path, "t.csv", "nm,counts\n" + body + "\n"))
    w = [x for x in rep.warnings if "may be a thousands separator" in x]
    assert len(w) == 1 and "re-export" in w[0]


def test_three_decimals_without_integers_is_not_flagged(tmp_path):
    text = "nm;W/m2/nm\n" + "\n".join(f"{a:.3f};{b:.3f}" for a, b in
                                      zip(np.arange(250.0, 400.0, 0.125), np.linspace(1, 2, 1200)))
    _, rep = read_spectrum(write(tmp_path, "t.csv", text + "\n"))
    assert not any("thousands" in x for x in rep.warnings)


def test_dot_groups_decide_the_decimal_mark(tmp_path):
    # the only number that shows the separator, '1.200.000', is on line 92: past the lines the
    # format is first decided on
    wl, n, body = _counts_rows(";", ".", top=1_200_000, centre=700.0)
    spec, rep = read_spectrum(write(tmp_path, "t.csv", "nm;counts\n" + body + "\n"))
    assert rep.decimal == "," and rep.thousands == "."
    assert rep.rows_used == wl.size
    assert np.array_equal(spec.values, n.astype(float))
    assert any("'.' is a thousands separator in this file ('1.200.000' on line 92)" in x
               for x in rep.warnings)


def test_comma_groups_decide_the_decimal_mark(tmp_path):
    # the mirror case: ',' between thousands in a semicolon file. A pedestal of 2000 counts
    # puts a ',' in every value, so the first lines read best with ',' as the decimal mark
    # ('2,000'); '1,202,000' on line 92 shows it is a thousands separator
    wl, n, body = _counts_rows(";", ",", top=1_200_000, centre=700.0, pedestal=2000)
    spec, rep = read_spectrum(write(tmp_path, "t.csv", "nm;counts\n" + body + "\n"))
    assert rep.decimal == "." and rep.thousands == ","
    assert np.array_equal(spec.values, n.astype(float))
    assert any("',' is a thousands separator in this file ('1,202,000' on line 92)" in x
               for x in rep.warnings)


def test_the_one_calibrated_column_beside_raw_ones_is_used(tmp_path):
    # raw counts beside a calibrated spectral irradiance (uW/cm²/nm: 1 µW/cm² = 10 mW/m² by
    # the SI prefixes): the column with the absolute unit is the spectrum, and the report
    # says which was used and why
    text = ("Pixel\tWavelength (nm)\tDark\tSample\tIrradiance (uW/cm2/nm)\n"
            + "\n".join(f"{i}\t{a}\t{100 + i % 3}\t{2000 + i}\t{b * 100:.6e}"
                        for i, (a, b) in enumerate(zip(WL, E))))
    spec, rep = read_spectrum(write(tmp_path, "calibrated.txt", text))
    assert rep.value_column == "Irradiance (uW/cm2/nm)"
    assert spec.quantity == "irradiance"
    assert integrate(spec, 250, 800).value == pytest.approx(AREA, rel=1e-4)
    said = " ".join(rep.warnings)
    assert "only one with an absolute spectral unit" in said and "'Dark'" in said


def test_two_calibrated_columns_still_ask(tmp_path):
    text = ("Wavelength (nm),Irradiance (W/m2/nm),Irradiance (uW/cm2/nm)\n"
            + "\n".join(f"{a},{b:.6e},{b * 100:.6e}" for a, b in zip(WL, E)))
    with pytest.raises(InputFormatError, match=r"2 value columns .*--column"):
        read_spectrum(write(tmp_path, "two.csv", text))
