"""Property-based fuzzing of the spectrum reader (issue 7).

Files are written to a temporary folder from generated tables (random delimiters, decimal
marks, number formats, headers, units rows, metadata, NaN and placeholder tokens, ragged and
blank rows, footers, line endings, encodings, truncation), from random text over a
number-heavy alphabet, and from random or mutated bytes. For every one of them
``read_spectrum`` may do exactly one of two things:

* return a (Spectrum, ImportReport) whose spectrum keeps its invariants (finite, positive,
  strictly increasing wavelengths; finite values within the reader's bound; as many rows as
  the report says) and whose report is strict JSON; or
* raise a :class:`UvcheckError` whose message is one line naming the file.

Nothing else: no other exception, and no Python warning (a numpy RuntimeWarning would reach
the user's terminal as extra stderr lines). A last property checks that the fast numpy path
and the tolerant row-by-row parser read clean tables to the same numbers.

Default run: 2 050 generated cases (see N_* below). A longer run: tests/benchmarks/fuzz_long.py.
"""

from __future__ import annotations

import atexit
import json
import math
import shutil
import tempfile
import warnings
from pathlib import Path
from unittest import mock

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from uvcheck.errors import UvcheckError
from uvcheck.io import reader
from uvcheck.io.reader import MAX_ABS_VALUE, ImportReport, read_spectrum
from uvcheck.report.jsonout import clean
from uvcheck.spectrum import QUANTITIES, Spectrum

#: Examples per property in the default run (total 2 050).
N_TABLES = 900
N_TEXT = 450
N_BYTES = 300
N_MUTATED = 200
N_OPTIONS = 100
N_FAST_SLOW = 100

WORK = Path(tempfile.mkdtemp(prefix="uvcheck-fuzz-"))
atexit.register(shutil.rmtree, WORK, True)

COMMON = dict(deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                    HealthCheck.filter_too_much,
                                                    HealthCheck.data_too_large])

# ---------------------------------------------------------------------------------------------
# The property
# ---------------------------------------------------------------------------------------------


def check_read(data: bytes, name: str = "fuzz case.csv", **options) -> tuple | None:
    """Write ``data`` to a file and read it; assert the only allowed outcomes."""
    p = WORK / name
    p.write_bytes(data)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            spec, rep = read_spectrum(p, **options)
        except UvcheckError as exc:
            line = exc.one_line()
            assert "\n" not in line and "\r" not in line, f"a multi-line message: {line!r}"
            assert exc.where and str(p) in exc.where, f"the message names no file: {line!r}"
            assert not caught, [str(w.message) for w in caught]
            return None
    assert not caught, [f"{w.category.__name__}: {w.message}" for w in caught]
    check_spectrum(spec, rep)
    return spec, rep


def check_spectrum(spec: Spectrum, rep: ImportReport) -> None:
    wl, v = spec.wavelength_nm, spec.values
    assert wl.dtype == np.float64 and v.dtype == np.float64
    assert wl.ndim == 1 and wl.shape == v.shape and wl.size >= 2
    assert np.all(np.isfinite(wl)) and np.all(np.isfinite(v))
    assert wl[0] > 0 and np.all(np.diff(wl) > 0), "wavelengths strictly increasing"
    assert wl[-1] <= 1e5, "optical radiation only"
    assert np.all(np.abs(v) <= MAX_ABS_VALUE)
    assert spec.quantity in QUANTITIES and rep.quantity == spec.quantity
    assert rep.rows_used == wl.size <= rep.rows_read
    assert spec.noise_floor is None or (math.isfinite(spec.noise_floor) and spec.noise_floor >= 0)
    json.dumps(clean(rep.to_dict()), allow_nan=False)  # strict JSON


# ---------------------------------------------------------------------------------------------
# Strategies
# ---------------------------------------------------------------------------------------------

SPECIAL = ["NaN", "nan", "-nan", "inf", "-Infinity", "", "n.d.", "#VALUE!", "1.#INF", "--",
           "null", "N/A", "1e999", "-0", "0x1F", "1_000", "١٢٣", "1.2.3", "1,2,3", "+.5", "5.",
           "1e", "e5", "\u22121.5", "1\u00a0234"]
HEADERS = ["Wavelength (nm)", "Wavelength [nm]", "wavelength_nm", "nm", "λ [µm]", "lambda (um)",
           "Wavelength (m)", "Wavenumber (cm-1)", "Raman shift (cm-1)", "Pixel", "Index", "#",
           "Irradiance (W/m2/nm)", "Irradiance (µW/cm²/nm)", "E [W m-2 nm-1]", "Counts",
           "Intensity (a.u.)", "Radiance [W/(m²·sr·nm)]", "Flux (mW/nm)", "E (W/m2)",
           "PPFD (umol/m2/s/nm)", "Sample", "Dark", "Reference", "Wellenlänge [nm]", "x", "y"]
UNITS_ROW = ["nm", "um", "W/m2/nm", "uW/cm^2/nm", "counts", "a.u.", "mW/m2/nm", "cm-1", "kg", ""]
META = ["Integration time: 100 ms", "Distance: 20 cm", "Distance: -3 m", "Distance: far",
        "[Data]", "[Instrument]", "# comment", "// exported", "Units: mW/m2/nm",
        "Data type: irradiance", "Wavelength unit: um", "Model = invented test device",
        "Operator;test", "sep=;", "Date: 2026-01-01", "Temperature: 25 °C", "12:30:00"]
FOOTERS = ["End of data", "Total,123", "Saved by invented software", "800.5,", "900,1", "# end"]
ENCODINGS = ["utf-8", "utf-8-sig", "utf-16", "utf-16-le", "utf-16-be", "cp1252", "latin-1"]

floats = st.floats(allow_nan=True, allow_infinity=True, width=64)


STYLES = ["repr", "e", "f", "g", "int", "thousands"]


def fmt(x: float, style: str, dec: str = ".") -> str:
    """A number as an export might write it (style: repr, e, f, g, int, thousands)."""
    try:
        tok = {"repr": repr, "e": lambda y: f"{y:.6e}", "f": lambda y: f"{y:.3f}",
               "g": lambda y: f"{y:g}", "int": lambda y: str(int(y)),
               "thousands": lambda y: f"{y:,.2f}"}[style](x)
    except (OverflowError, ValueError):
        tok = repr(x)
    if dec == ",":
        tok = tok.replace(",", "\u2009").replace(".", ",").replace("\u2009", ".")
    return tok


@st.composite
def wavelength_column(draw) -> list[float]:
    n = draw(st.integers(0, 40))
    kind = draw(st.sampled_from(["grid", "grid", "grid", "random", "descending", "repeat"]))
    if kind == "random":
        return draw(st.lists(floats, min_size=n, max_size=n))
    start = draw(st.sampled_from([250.0, 200.0, 380.0, 0.25, 2.5e-7, 25000.0, 12500.0, 0.0,
                                  1.0, -10.0, 1e30, 3000.0]))
    step = draw(st.sampled_from([1.0, 0.5, 5.0, 0.001, 1e-9, 100.0, 0.0]))
    col = [start + k * step for k in range(n)]
    if kind == "descending":
        col.reverse()
    if kind == "repeat" and col:
        col = col + col[: draw(st.integers(0, len(col)))]
    return col


@st.composite
def value_column(draw, n: int) -> list[float]:
    kind = draw(st.sampled_from(["smooth", "smooth", "random", "zeros", "huge", "counts"]))
    if kind == "random":
        return draw(st.lists(floats, min_size=n, max_size=n))
    if kind == "zeros":
        return [0.0] * n
    if kind == "huge":
        return [draw(st.sampled_from([1e300, 1e150, 1e99, -1e200])) for _ in range(n)]
    if kind == "counts":
        return [float(draw(st.integers(0, 65535))) for _ in range(n)]
    scale = draw(st.sampled_from([1e-3, 1.0, 100.0, 1e-9]))
    return [scale * math.exp(-0.5 * ((k - n / 2) / 3.0) ** 2) for k in range(n)]


@st.composite
def table_file(draw) -> bytes:
    """A text table in a random dialect, with the damage real exports show."""
    wl = draw(wavelength_column())
    n = len(wl)
    ncols = draw(st.integers(1, 4))
    cols = [wl] + [draw(value_column(n)) for _ in range(ncols - 1)]
    styles = draw(st.lists(st.sampled_from(STYLES), min_size=ncols, max_size=ncols))
    quote = draw(st.sampled_from(["{}", "{}", "{}", '"{}"', " {} ", "+{}"]))
    delim = draw(st.sampled_from([",", ";", "\t", " ", "   ", "|", ", "]))
    dec = draw(st.sampled_from([".", ".", ","]))
    lines: list[str] = []
    lines += draw(st.lists(st.one_of(st.sampled_from(META), st.text(max_size=30)), max_size=4))
    if draw(st.booleans()):
        names = draw(st.lists(st.one_of(st.sampled_from(HEADERS), st.text(max_size=12)),
                              min_size=ncols, max_size=ncols + 1))
        lines.append(delim.join(names))
        if draw(st.booleans()):
            lines.append(delim.join(draw(st.lists(st.sampled_from(UNITS_ROW),
                                                  min_size=ncols, max_size=ncols))))
    rows = [[quote.format(fmt(cols[c][r], styles[c], dec)) for c in range(ncols)]
            for r in range(n)]
    blank_after: set[int] = set()
    damages = st.sampled_from(["drop", "extra", "garbage", "blank", "special"])
    for r, damage in draw(st.lists(st.tuples(st.integers(0, max(n - 1, 0)), damages),
                                   max_size=4 if n else 0)):
        toks = rows[r]
        if damage == "drop" and toks:
            toks.pop(draw(st.integers(0, len(toks) - 1)))
        elif damage == "extra":
            toks.append(draw(st.sampled_from(SPECIAL + ["1.5", "7"])))
        elif damage == "garbage" and toks:
            toks[draw(st.integers(0, len(toks) - 1))] = draw(st.text(max_size=6))
        elif damage == "special" and toks:
            toks[draw(st.integers(0, len(toks) - 1))] = draw(st.sampled_from(SPECIAL))
        elif damage == "blank":
            blank_after.add(r)
    for r, toks in enumerate(rows):
        lines.append(delim.join(toks))
        if r in blank_after:
            lines.append(draw(st.sampled_from(["", "   ", "\t", "\x0c"])))
    lines += draw(st.lists(st.sampled_from(FOOTERS), max_size=3))
    eol = draw(st.sampled_from(["\n", "\r\n", "\r"]))
    text = eol.join(lines) + draw(st.sampled_from(["", eol]))
    enc = draw(st.sampled_from(ENCODINGS))
    data = text.encode(enc, errors="replace")
    if draw(st.integers(0, 9)) == 0 and data:  # a truncated copy
        data = data[: draw(st.integers(0, len(data)))]
    return data


ALPHABET = (list("0123456789.,;:\t -+eEnaNIif\n\r#[]()=/\"'xX|") +
            ["µ", "²", "°", "λ", "\u00a0", "\u2212", "١", "\ufeff", "\x00", "\x0c", "é", "Ω"])
number_text = st.text(alphabet=st.sampled_from(ALPHABET), max_size=400)


def _base_file() -> bytes:
    wl = np.arange(250.0, 450.0, 5.0)
    v = 1e-3 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2)
    return ("Wavelength (nm),Irradiance (W/m2/nm)\n"
            + "\n".join(f"{a:.1f},{b:.6e}" for a, b in zip(wl, v)) + "\n").encode()


BASE = _base_file()


@st.composite
def mutated_file(draw) -> bytes:
    data = bytearray(BASE)
    for _ in range(draw(st.integers(1, 8))):
        at = draw(st.integers(0, len(data)))
        op = draw(st.sampled_from(["insert", "delete", "replace"]))
        chunk = draw(st.binary(min_size=1, max_size=4))
        if op == "insert":
            data[at:at] = chunk
        elif op == "delete":
            del data[at:at + len(chunk)]
        else:
            data[at:at + len(chunk)] = chunk
    return bytes(data)


reader_options = st.fixed_dictionaries({}, optional={
    "encoding": st.sampled_from(["utf-8", "utf-16", "latin-1", "ascii", "rot13", "nope", "utf-8-sig"]),
    "delimiter": st.sampled_from(["tab", "semicolon", "comma", "pipe", "space", "colon"]),
    "decimal": st.sampled_from([".", ",", ";"]),
    "column": st.sampled_from(["1", "2", "3", "0", "²", "Irradiance (W/m2/nm)", "nope", "-1"]),
    "wavelength_column": st.sampled_from(["1", "2", "9", "Wavelength (nm)", "x"]),
    "wavelength_unit": st.sampled_from(["nm", "um", "m", "cm-1", "kg", "A", "mm", ""]),
    "unit": st.sampled_from(["W/m2/nm", "uW/cm2/nm", "relative", "W/m2", "kg", "umol/m2/s/nm", ""]),
    "block": st.integers(-2, 4),
    "data_start": st.integers(-2, 60),
})


@st.composite
def clean_table(draw) -> tuple[bytes, bool]:
    """A clean numeric table the fast path may take; returns (bytes, has_header)."""
    n = draw(st.integers(2, 40))
    start = draw(st.floats(200.0, 900.0))
    step = draw(st.sampled_from([0.1, 0.5, 1.0, 2.5]))
    ncols = draw(st.integers(2, 3))
    delim, dec = draw(st.sampled_from([(",", "."), (";", "."), (";", ","), ("\t", "."),
                                       ("\t", ","), (" ", "."), ("|", ".")]))
    vals = st.floats(-1e6, 1e6, allow_nan=False, allow_infinity=False)
    fmt = draw(st.sampled_from(["{!r}", "{:.6e}", "{:.4f}", "{:g}"]))
    rows = []
    for k in range(n):
        cells = [f"{start + k * step:.4f}"] + [fmt.format(draw(vals)) for _ in range(ncols - 1)]
        rows.append(delim.join(c.replace(".", ",") if dec == "," else c for c in cells))
    header = draw(st.booleans())
    names = ["Wavelength (nm)", "Irradiance (W/m2/nm)", "Sample"][:ncols]
    text = ((delim.join(names) + "\n") if header else "") + "\n".join(rows) + "\n"
    return text.encode(), header


# ---------------------------------------------------------------------------------------------
# Tests (the long run in tests/benchmarks/fuzz_long.py re-wraps the check_* functions)
# ---------------------------------------------------------------------------------------------


@settings(max_examples=N_TABLES, **COMMON)
@given(table_file())
def test_fuzz_tables(data):
    check_read(data)


@settings(max_examples=N_TEXT, **COMMON)
@given(number_text)
def test_fuzz_number_text(text):
    check_read(text.encode("utf-8"))


@settings(max_examples=N_BYTES, **COMMON)
@given(st.binary(max_size=3000))
def test_fuzz_bytes(data):
    check_read(data, name="fuzz bytes.dat")


@settings(max_examples=N_MUTATED, **COMMON)
@given(mutated_file())
def test_fuzz_mutated_file(data):
    check_read(data)


@settings(max_examples=N_OPTIONS, **COMMON)
@given(st.one_of(st.just(BASE), table_file()), reader_options)
def test_fuzz_options(data, options):
    check_read(data, **options)


def check_fast_equals_slow(table: tuple[bytes, bool]) -> None:
    data, _ = table
    fast = check_read(data, name="fast.csv")
    with mock.patch.object(reader, "_fast_block", lambda *a, **k: None):
        slow = check_read(data, name="slow.csv")
    assert (fast is None) == (slow is None)
    if fast is not None:
        (sf, rf), (ss, rs) = fast, slow
        assert np.array_equal(sf.wavelength_nm, ss.wavelength_nm)
        assert np.array_equal(sf.values, ss.values)
        assert rf.rows_read == rs.rows_read and rf.data_lines == rs.data_lines
        assert rf.warnings == rs.warnings


@settings(max_examples=N_FAST_SLOW, **COMMON)
@given(clean_table())
def test_fast_path_reads_the_same_numbers(table):
    check_fast_equals_slow(table)


def test_default_run_size():
    # issue 7: at least 2 000 generated cases in the default run
    assert N_TABLES + N_TEXT + N_BYTES + N_MUTATED + N_OPTIONS + N_FAST_SLOW >= 2000
