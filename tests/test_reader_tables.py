"""A file that holds a second table behind the spectrum: a heading row ends the data block.

Exports and hand-made files often append a second table (a calibration table, another scan,
the next sheet of a workbook saved as text) after a blank line and a heading. The reader lets
up to two stray lines sit inside a block (our own rule), so before the heading rule a label
line and a heading row read as such stray lines and the second table ran on as more rows of the
first: sorted in, its values averaged into the spectrum's at shared wavelengths (found by
trying such a file). The data here are invented for the test.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from uvcheck.errors import InputFormatError
from uvcheck.io import reader
from uvcheck.io.reader import read_spectrum

WL = np.arange(250.0, 450.0, 1.0)
E = 1e-3 * np.exp(-0.5 * ((WL - 300.0) / 8.0) ** 2) + 1e-7


def _two_tables(path: Path, rows: int = WL.size, label: str = "Calibration") -> Path:
    """A spectrum table, a blank line, a label, then a calibration table of its own heading."""
    wl = np.linspace(250.0, 450.0, rows)
    e = 1e-3 * np.exp(-0.5 * ((wl - 300.0) / 8.0) ** 2) + 1e-7
    lines = ["Wavelength (nm),Irradiance (W/m2/nm)"]
    lines += [f"{a:.4f},{b:.6e}" for a, b in zip(wl, e)]
    lines += ["", label, "nm,factor"]
    lines += [f"{a:.4f},{1.0 + 1e-3 * k:.4f}" for k, a in enumerate(wl)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def test_a_second_table_is_not_read_into_the_first(tmp_path):
    p = _two_tables(tmp_path / "two.csv", rows=WL.size)  # 250–450 nm in 200 rows
    wl = np.linspace(250.0, 450.0, WL.size)
    with pytest.raises(InputFormatError, match="holds 2 data blocks") as exc:
        read_spectrum(p)
    # "(1: lines 2–201 ...; 2: lines N–..." : the second block's first line, as --block counts
    start = int(str(exc.value).split("2: lines ", 1)[1].split("–", 1)[0])
    assert start == WL.size + 5  # 1-based: heading, rows, blank, label, heading, first row
    assert "--block N" in exc.value.todo
    spec, rep = read_spectrum(p, block=1)
    assert rep.rows_used == WL.size and rep.duplicates_averaged == 0
    np.testing.assert_allclose(spec.values, 1e-3 * np.exp(-0.5 * ((wl - 300.0) / 8.0) ** 2) + 1e-7,
                               rtol=1e-6)  # the first table alone, as written
    assert rep.sorted == "ascending"
    for spec2, rep2 in (read_spectrum(p, data_start=start), read_spectrum(p, block=2)):
        np.testing.assert_allclose(spec2.values, 1.0 + 1e-3 * np.arange(WL.size), rtol=1e-9)
    with pytest.raises(InputFormatError, match="no data block 3; the file has 2"):
        read_spectrum(p, block=3)


def test_a_second_table_beyond_the_head_ends_the_block(tmp_path):
    # more rows than the reader's head sample holds: the rest is streamed, with the same rule
    rows = reader.HEAD_BYTES // 20 + 2000
    p = _two_tables(tmp_path / "long.csv", rows=rows)
    with pytest.raises(InputFormatError, match="several data blocks") as exc:
        read_spectrum(p)
    start = int(exc.value.todo.rsplit(" ", 1)[1].rstrip("."))  # "--data-start N"
    assert start == rows + 5  # 1-based: heading, rows, blank, label, heading, first row
    spec, rep = read_spectrum(p, data_start=start)
    assert spec.wavelength_nm.size == rows and np.all(spec.values >= 1.0)


def test_stray_lines_inside_a_block_still_stay_inside(tmp_path):
    # a marker line and a note inside the data (not a row of column names) keep one block
    lines = ["Wavelength (nm),Irradiance (W/m2/nm)"]
    rows = [f"{a:.1f},{b:.6e}" for a, b in zip(WL, E)]
    lines += rows[:100] + ["-- lamp flickered --", "note: rescanned"] + rows[100:]
    p = tmp_path / "marked.csv"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec, rep = read_spectrum(p)
    assert spec.wavelength_nm.size == WL.size
    assert any("unreadable line" in w for w in rep.warnings)


def test_a_repeated_heading_for_fewer_columns_is_a_stray_line(tmp_path):
    # the rule needs as many names as the block has columns: a two-word note in a
    # three-column file stays a stray line
    lines = ["nm,counts,W/m2/nm"]
    rows = [f"{a:.1f},{1000 + k},{b:.6e}" for k, (a, b) in enumerate(zip(WL, E))]
    lines += rows[:50] + ["saturated,check"] + rows[50:]
    p = tmp_path / "three.csv"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec, _ = read_spectrum(p, column="W/m2/nm")
    assert spec.wavelength_nm.size == WL.size


def test_names_row_rule():
    num = reader._Num(".")
    assert reader._names_row(["nm", "factor"], 2, num)
    assert reader._names_row(["Wavelength (nm)", "E (W/m2/nm)"], 2, num)
    assert not reader._names_row(["nm", "factor"], 3, num)      # fewer names than columns
    assert not reader._names_row(["nm", "1.5e-3"], 2, num)      # a number is no name
    assert not reader._names_row(["nan", "inf"], 2, num)        # missing-value words
    assert not reader._names_row(["--", "***"], 2, num)         # no letter
    assert not reader._names_row(["x"], 1, num)                 # one column: no heading rule
    assert num.mixed == num.thousands_seen == 0                 # the caller's counts untouched


@pytest.mark.parametrize("sep", [",", ";", "\t"])
def test_a_note_beside_the_first_data_row_does_not_take_the_headers_place(tmp_path, sep):
    # A note typed beside the first data row ("240,0.0100,,calibrated 2026-05") made that
    # line the header (split on its spaces), so the real header and its unit were lost and
    # the spectrum was read as relative. The header is now found above it, and the row is
    # reported as not read (it does not read as numbers). Invented data.
    rows = [f"{a:.1f}{sep}{b:.6e}" for a, b in zip(WL, E)]
    rows[0] += f"{sep}{sep}calibrated 2026-05"
    p = tmp_path / "noted.txt"
    p.write_text(f"Wavelength (nm){sep}E (uW/cm2/nm)\n" + "\n".join(rows) + "\n",
                 encoding="utf-8")
    spec, rep = read_spectrum(p)
    assert rep.header_line == 1 and rep.value_column == "E (uW/cm2/nm)"
    assert spec.quantity == "irradiance"
    np.testing.assert_allclose(spec.values, E[1:] * 1e-2, rtol=1e-6)   # µW/cm² → W/m²
    assert any(w.startswith("line 2 holds a data row with a note beside it "
                            "('calibrated 2026-05')") for w in rep.warnings)


def test_numbers_then_note_rule():
    assert reader._numbers_then_note(["240", "0.01", "", "calibrated"], 2, ".")
    assert reader._numbers_then_note(["240", "0.01", "see note 3"], 2, ".")  # words with a number
    assert not reader._numbers_then_note(["240", "0.01"], 2, ".")            # a plain row
    assert not reader._numbers_then_note(["240", "0.01", "5"], 2, ".")       # a third number
    assert not reader._numbers_then_note(["Integration", "time", "ms"], 2, ".")
    assert not reader._numbers_then_note(["12", "05", "2024", "Lab A"], 2, ".")
    assert not reader._numbers_then_note(["240", "nm", "note"], 2, ".")      # not ncols numbers
    assert not reader._numbers_then_note(["240", "0.01", "---"], 2, ".")     # no letter
