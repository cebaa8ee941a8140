"""The reader's faster paths decide exactly what their plain definitions decide.

The spectrum reader takes shortcuts for speed: runs of data rows found in one pattern match
over the joined text (:func:`reader._blocks`), lines passed over when they hold a character no
number holds (:func:`reader._may_hold_rows`), thousands-separator evidence found with numpy
(:func:`reader._grouped_anywhere`, :func:`reader._group_possible`,
:func:`reader._int_cell_possible`), the leading digit-led
lines counted on the bytes, the head read into a buffer sized to the file, and array tests
skipped when a cheap test already decides them (spikes, gaps, a second wavelength axis).
Each is checked here against its plain, line-by-line or formula definition (written out below
as the reference) on generated input, and whole files of the usual shapes are read and compared
with what was written into them.

All spectra and texts here are invented test data.
"""

from __future__ import annotations

import hashlib
import math
import os
import re
from itertools import islice
from pathlib import Path
from unittest import mock

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from uvcheck.features import estimate_noise
from uvcheck.io import reader
from uvcheck.io.reader import ReadOptions, read_spectrum
from uvcheck.spectrum import median

COMMON = dict(deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                    HealthCheck.data_too_large])

# ---------------------------------------------------------------------------------------------
# Reference definitions (the line-by-line forms the reader had before its shortcuts)
# ---------------------------------------------------------------------------------------------


def ref_blocks(lines, delim, decimal, first=0):
    """Runs of data rows tested line by line with _split and _row_values; the column count is
    the most common token count among the block's rows in its first 500 lines (our own rule)."""
    num = reader._Num(decimal)
    blocks, cur, pending, n_toks = [], None, [], {}
    for i in range(first, len(lines)):
        line = lines[i]
        if not line.strip():
            if cur is not None:
                pending.append(i)
            continue
        toks = reader._split(line, delim)
        if len(toks) == 1 and delim != "space" and reader.DELIMITERS[delim] in line:
            toks.append("")  # "302.0,": the cell after the delimiter is empty (a missing value)
        n_toks[i] = len(toks)
        if reader._row_values(toks, num) is not None:
            if cur is not None and len([p for p in pending if lines[p].strip()]) <= 2:
                cur.bad.extend(p for p in pending if lines[p].strip())
                cur.end = i
                pending = []
                continue
            if cur is not None:
                blocks.append(cur)
            cur = reader._Block(start=i, end=i, ncols=n_toks[i], bad=[])
            pending = []
        elif cur is not None:
            pending.append(i)
            # a row of column names, as many as the block's first row has, ends it at once
            names = (cur.ncols >= 2 and len(toks) == cur.ncols
                     and all(any(c.isalpha() for c in t) for t in toks)
                     and all(reader._Num(decimal)(t) is None for t in toks))
            if names or len([p for p in pending if lines[p].strip()]) > 2:
                blocks.append(cur)
                cur, pending = None, []
    if cur is not None:
        blocks.append(cur)
    for b in blocks:
        counts = {}
        for j in range(b.start, min(b.end + 1, b.start + 500)):
            if lines[j].strip() and j not in b.bad:
                counts[n_toks[j]] = counts.get(n_toks[j], 0) + 1
        b.ncols = max(counts, key=lambda k: (counts[k], k))
    return blocks, num.mixed + num.thousands_seen


def ref_may_hold_rows(lines, delim, decimal, first):
    num = reader._Num(decimal)
    return any(ln.strip() and reader._is_data(reader._split(ln, delim), num)
               for ln in islice(lines, first, None))


def ref_grouped_anywhere(text, mark, delim):
    m = re.escape(mark)
    pats = [rf"{m}\d{{3}}{m}\d"]
    other = "," if mark == "." else "."
    if delim == "space" or reader.DELIMITERS[delim] != other:
        pats.append(rf"{m}\d{{3}}{re.escape(other)}\d")
    return any(re.search(p, text) is not None for p in pats)


def ref_int_cell_possible(text, n_lines, mark, delim):
    cells = (len(text.split()) if delim == "space"
             else text.count(reader.DELIMITERS[delim]) + n_lines)
    return text.count(mark) < cells


def ref_separator_evidence(lines, start, delim, mark, ncols):
    three, multi = reader._SEP_PATTERNS[mark]
    cols = [reader._SepColumn() for _ in range(ncols)]
    stop = min(len(lines), start + reader.SEPARATOR_SCAN_LINES)
    text = "\n".join(lines[start:stop])
    grouped = ref_grouped_anywhere(text, mark, delim)
    if not grouped and not ref_int_cell_possible(text, stop - start, mark, delim):
        return cols
    rows_left = stop - start if grouped else reader.SEPARATOR_QUICK_ROWS
    for i in range(start, stop):
        if rows_left <= 0 or all(c.other for c in cols):
            break
        if not reader._STARTS_NUMERIC.match(lines[i]):
            continue
        toks = reader._split(lines[i], delim)
        if len(toks) != ncols:
            continue
        rows_left -= 1
        for c, t in zip(cols, toks):
            if mark not in t:
                c.ints += bool(reader._PLAIN_INT.match(t))
            elif three.match(t):
                c.three += 1
                c.example = c.example or (i, t)
            elif multi.match(t):
                c.thousands += 1
                c.thousands_example = c.thousands_example or (i, t)
            else:
                c.other += 1
    return cols


def ref_digit_led_lines(text):
    n = 0
    for line in text.split("\n"):
        if not ("0" <= line[:1] <= "9"):
            break
        n += 1
    return n


def ref_isolated_spikes(v):
    if v.size < 5:
        return []
    a = np.abs(v)
    nb = np.maximum(np.concatenate(([a[1]], a[:-1])), np.concatenate((a[1:], [a[-2]])))
    scale = median(a) or float(a.max()) * 1e-12
    # and at least SPIKE_MIN_SHARE (1e-3) of the largest finite magnitude (our own rule)
    fin = a[np.isfinite(a)]
    floor = 1e-3 * fin.max() if fin.size else np.inf
    return [int(k) for k in np.nonzero((a > 1000.0 * np.maximum(nb, scale * 10))
                                       & (a > floor))[0]]


def ref_gaps(wl, steps):
    if steps.size < 3:
        return []
    left = np.concatenate(([steps[1]], steps[:-1]))
    right = np.concatenate((steps[1:], [steps[-2]]))
    big = (steps > 3.0 * np.maximum(left, right)) & (steps > 1.0)
    return [(float(wl[k]), float(wl[k + 1])) for k in np.nonzero(big)[0]]


def ref_same_axis(wl, other):
    a, b = wl[np.isfinite(wl)], other[np.isfinite(other)]
    if a.size < 5 or b.size < 5:
        return False
    mono = np.all(np.diff(b) > 0) or np.all(np.diff(b) < 0)
    overlap = min(a.max(), b.max()) - max(a.min(), b.min())
    return bool(mono and overlap > 0.5 * (a.max() - a.min()) and b.min() > 0.5 * a.min())


# ---------------------------------------------------------------------------------------------
# Generated lines: numbers in both decimal conventions, words, damage, every delimiter
# ---------------------------------------------------------------------------------------------

NUMBERS = st.one_of(
    st.floats(-1e7, 1e7, allow_nan=False).map(lambda x: f"{x:.3f}"),
    st.floats(-1e7, 1e7, allow_nan=False).map(lambda x: f"{x:.6e}"),
    st.floats(-1e7, 1e7, allow_nan=False).map(repr),
    st.integers(-5000, 5000).map(str),
    st.floats(0, 1e7, allow_nan=False).map(lambda x: f"{x:,.2f}"),
    st.sampled_from(["1.234", "10.000", "1.002.000", "1,5", ",5", "5.", "+.5", "1e5", "1,e5",
                     "1.e5", "1.234,5", "12,345", "1,2,3", "1e", "e5", "0x1F", "1_000", "١٢٣"]),
)
WORDS = st.sampled_from(["NaN", "nan", "-inf", "Infinity", "1.#INF", "1.#QNAN", "N/A", "--",
                         "null", "#VALUE!", "", "x", "Wavelength (nm)", "Irradiance", "µW/cm²",
                         "İNF", "\u212aa"])


def _comma_decimal(tok: str) -> str:
    return tok.replace(",", "\u2009").replace(".", ",").replace("\u2009", ".")


@st.composite
def a_line(draw) -> str:
    kind = draw(st.integers(0, 9))
    if kind == 0:
        return draw(st.sampled_from(["", "   ", "\t", "\x0c", "# comment", "[Data]",
                                     "Integration time: 100 ms", "Distance: 20 cm", "End"]))
    if kind == 1:
        return draw(st.text(st.sampled_from(list("0123456789.,;|\t -+eEnaNIf#\"'xµ\u00a0")),
                            max_size=30))
    cells = draw(st.lists(st.one_of(NUMBERS, NUMBERS, NUMBERS, WORDS), min_size=1, max_size=4))
    if draw(st.booleans()):
        cells = [_comma_decimal(c) for c in cells]
    if draw(st.integers(0, 5)) == 0:
        cells = [f'"{c}"' for c in cells]
    sep = draw(st.sampled_from([",", ";", "\t", " ", "   ", "|", ", ", " ; ", "\t "]))
    line = sep.join(cells)
    if draw(st.integers(0, 5)) == 0:
        line = (draw(st.sampled_from([" ", "\t", ""])) + line
                + draw(st.sampled_from([" ", ";", ","])))
    return line


LINES = st.lists(a_line(), max_size=40)
CONFIGS = [(d, dec) for d, dec in reader._CONFIGS if not (d == "comma" and dec == ",")]


@settings(max_examples=400, **COMMON)
@given(LINES, st.integers(0, 3))
def test_blocks_equal_the_line_by_line_definition(lines, first):
    first = min(first, len(lines))
    text = "\n".join(lines[first:])
    for d, dec in CONFIGS:
        got, against = reader._blocks(lines, d, dec, first, text)
        want, want_against = ref_blocks(lines, d, dec, first)
        assert [vars(b) for b in got] == [vars(b) for b in want], (d, dec)
        assert against == want_against, (d, dec)
        assert reader._blocks(lines, d, dec, first) == (got, against)  # without the text


@settings(max_examples=400, **COMMON)
@given(LINES, st.integers(0, 3))
def test_may_hold_rows_equals_its_definition(lines, first):
    first = min(first, len(lines))
    text = "\n".join(lines[first:])
    spaced = reader._spaced_lines(lines, first)
    for d, dec in CONFIGS:
        want = ref_may_hold_rows(lines, d, dec, first)
        assert reader._may_hold_rows(lines, d, dec, first, text, spaced) == want, (d, dec)
        assert reader._may_hold_rows(lines, d, dec, first) == want, (d, dec)


@settings(max_examples=400, **COMMON)
@given(a_line())
def test_a_line_holding_a_foreign_character_is_no_data_row(line):
    for d, dec in CONFIGS:
        if reader._foreign(d).search(line):
            assert not reader._is_data(reader._split(line, d), reader._Num(dec)), (line, d, dec)


def test_the_foreign_characters_exclude_every_character_of_a_number_or_word():
    # every token _Num accepts, in both conventions, holds no foreign character
    toks = ["1.5", "1,5", "-2.5e-3", "+.5", "1,234.5", "1.234,5", "1.002.000", "١٢٣"]
    toks += sorted(reader._MISSING | reader._INF | reader._NINF)
    toks += [t.upper() for t in toks]
    for d in reader.DELIMITERS:
        for t in toks:
            assert not reader._foreign(d).search(t), (d, t)
    assert reader._foreign("comma").search("1;5") and not reader._foreign("semicolon").search("1;5")


TEXTS = st.text(st.sampled_from(list("0123456789.,;\n\t ae-") + ["٣", "µ"]), max_size=80)


@settings(max_examples=800, **COMMON)
@given(TEXTS)
def test_separator_evidence_shortcuts_equal_their_patterns(text):
    b = reader._ascii_bytes(text)
    assert (b is None) == (not text.isascii())
    for mark in ".,":
        for d in reader.DELIMITERS:
            want = ref_grouped_anywhere(text, mark, d)
            assert reader._grouped_anywhere(text, mark, d) == want, (text, mark, d)
            assert reader._grouped_anywhere(text, mark, d, b) == want, (text, mark, d)
            assert (reader._group_possible(text, mark, b)
                    == (re.search(rf"{re.escape(mark)}\d{{3}}(?!\d)", text) is not None))
            n = text.count("\n") + 1
            assert (reader._int_cell_possible(text, n, mark, d, b)
                    == ref_int_cell_possible(text, n, mark, d)), (text, mark, d)


@settings(max_examples=400, **COMMON)
@given(LINES, st.integers(0, 3), st.integers(1, 4))
def test_separator_evidence_decides_as_the_full_scan(lines, start, ncols):
    # what the reader uses: the ambiguous ('10.000') and grouped ('1.002.000') counts and
    # examples; the other counts matter only beside them
    start = min(start, len(lines))
    text = "\n".join(lines[start:start + reader.SEPARATOR_SCAN_LINES])
    for d in reader.DELIMITERS:
        for mark in ".,":
            got = [vars(c) for c in reader._separator_evidence(lines, start, d, mark, ncols)]
            assert got == [vars(c) for c in reader._separator_evidence(lines, start, d, mark,
                                                                       ncols, text)]
            want = [vars(c) for c in ref_separator_evidence(lines, start, d, mark, ncols)]
            if any(c["three"] or c["thousands"] for c in want):
                assert got == want, (d, mark)
            else:
                assert not any(c["three"] or c["thousands"] for c in got), (d, mark)


@settings(max_examples=800, **COMMON)
@given(st.text(st.sampled_from(list("0123456789a\n .,") + ["é", "٣"]), max_size=40))
def test_digit_led_lines_equal_their_definition(text):
    assert reader._digit_led_lines(text) == ref_digit_led_lines(text)


@settings(max_examples=300, **COMMON)
@given(st.lists(st.one_of(st.floats(-1e6, 1e6), st.sampled_from([0.0, 1e-9, 5e5, -3e4])),
                max_size=30))
def test_array_shortcuts_equal_their_formulas(values):
    v = np.array(values, dtype=float)
    assert reader._isolated_spikes(v) == ref_isolated_spikes(v)
    holed = v.copy()
    holed[::7] = np.nan
    assert reader._isolated_spikes(holed) == ref_isolated_spikes(holed)
    wl = np.cumsum(np.abs(v)) + 200.0  # a non-decreasing axis with steps from the values
    steps = np.diff(wl)
    assert reader._gaps(wl, steps) == ref_gaps(wl, steps)
    for other in (v, holed, wl[::-1], wl * 1.01, np.where(np.isnan(holed), np.nan, wl)):
        got = reader._same_axis(reader._finite_values(wl), reader._finite_values(other))
        assert got == ref_same_axis(wl, other)


def test_the_spike_shortcut_still_finds_a_spike():
    v = np.full(50, 1e-3)
    v[20] = 50.0  # invented: a corrupt row far above its neighbours
    assert reader._isolated_spikes(v) == ref_isolated_spikes(v) == [20]


def test_the_head_is_read_as_one_full_read_gives_it(tmp_path):
    for size in (0, 1, 100, reader.HEAD_BYTES - 1, reader.HEAD_BYTES, reader.HEAD_BYTES + 7):
        p = tmp_path / f"f{size}.csv"
        p.write_bytes(os.urandom(size))
        with open(p, "rb") as fh:
            assert reader._read_head(p) == fh.read(reader.HEAD_BYTES), size
    # a file that grew after its size was taken is read on to the full head
    p = tmp_path / "grown.csv"
    p.write_bytes(b"x" * (reader.HEAD_BYTES + 10))
    real_fstat = os.fstat

    class Small:
        def __init__(self, st):
            self.st_size = 10

    with mock.patch.object(reader.os, "fstat", lambda fd: Small(real_fstat(fd))):
        assert reader._read_head(p) == b"x" * reader.HEAD_BYTES


# ---------------------------------------------------------------------------------------------
# Whole files of the usual shapes, compared with what was written into them
# ---------------------------------------------------------------------------------------------

WL = np.round(np.linspace(200.0, 1100.0, 2000), 3)  # invented grid, 200-1100 nm


def _values(seed: int) -> np.ndarray:
    """An invented lamp spectrum: one to three bands on a small noisy floor [W m⁻² nm⁻¹]."""
    rng = np.random.default_rng(seed)
    v = np.full(WL.size, 2e-6)
    for _ in range(int(rng.integers(1, 4))):
        c, w, a = rng.uniform(220, 900), rng.uniform(0.5, 40), 10 ** rng.uniform(-4, -1)
        v += a * np.exp(-0.5 * ((WL - c) / w) ** 2)
    return v + rng.normal(0, 1e-6, WL.size)


META20 = ([f"Key {j}: value {j}" for j in range(16)]
          + ["Integration time: 100 ms", "Distance: 20 cm", "Model: invented", "[Data]"])
# name: delimiter text, decimal mark, lines above the data, report's header line, units line,
# the unit's text and how it was found, footer lines
SHAPES = {
    "comma": (",", ".", ["Wavelength (nm),Irradiance (W/m2/nm)"], 1, None, []),
    "semicolon_comma": (";", ",", ["Wavelength (nm);Irradiance (W/m2/nm)"], 1, None, []),
    "semicolon": (";", ".", ["Wavelength (nm);Irradiance (W/m2/nm)"], 1, None, []),
    "tab": ("\t", ".", ["Wavelength (nm)\tIrradiance (W/m2/nm)"], 1, None, []),
    "tab_comma": ("\t", ",", ["Wavelength (nm)\tIrradiance (W/m2/nm)"], 1, None, []),
    "space": ("   ", ".", ["Wavelength(nm)   Irradiance(W/m2/nm)"], 1, None, []),
    "pipe": ("|", ".", ["Wavelength (nm)|Irradiance (W/m2/nm)"], 1, None, []),
    "metadata": (",", ".", META20 + ["Wavelength (nm),Irradiance (W/m2/nm)"], 21, None, []),
    "units_row": (",", ".", ["Wavelength,Irradiance", "nm,W/m2/nm"], 1, 2, []),
    "footer": (",", ".", ["Wavelength (nm),Irradiance (W/m2/nm)"], 1, None,
               ["", "End of data", "Saved by invented software"]),
}
DELIM_NAME = {",": "comma", ";": "semicolon", "\t": "tab", "   ": "space", "|": "pipe"}


@pytest.mark.parametrize("shape", sorted(SHAPES))
@pytest.mark.parametrize("eol", ["\n", "\r\n"])
def test_files_of_the_usual_shapes_read_as_written(tmp_path, shape, eol):
    sep, dec, above, header_line, units_line, footer = SHAPES[shape]
    for seed, fmt in ((1, "%.6e"), (2, "%.8f"), (3, "%g")):
        v_text = [fmt % x for x in _values(seed)]
        wl_text = [f"{x:.3f}" for x in WL]
        rows = [f"{a}{sep}{b}" for a, b in zip(wl_text, v_text)]
        if dec == ",":
            rows = [r.replace(".", ",") for r in rows]
        data = (eol.join(above + rows + footer) + eol).encode("utf-8")
        p = tmp_path / f"{shape}{seed}.csv"
        p.write_bytes(data)
        spec, rep = read_spectrum(p, ReadOptions())
        wl = np.array([float(t) for t in wl_text])
        v = np.array([float(t) for t in v_text])
        # the numbers: exactly those written (W/m2/nm is SI already)
        assert np.array_equal(spec.wavelength_nm, wl) and np.array_equal(spec.values, v)
        d = rep.to_dict()
        first = len(above) + 1
        steps = np.diff(wl)
        want_meta = ({f"Key {j}": f"value {j}" for j in range(16)}
                     | {"Integration time": "100 ms", "Distance": "20 cm", "Model": "invented"}
                     if shape == "metadata" else {})
        assert d == d | {
            "path": str(p), "sha256": hashlib.sha256(data).hexdigest(),
            "encoding": "utf-8", "encoding_how": "valid UTF-8",
            "delimiter": DELIM_NAME[sep], "decimal": dec, "thousands": None,
            "header_line": header_line, "units_line": units_line,
            "data_lines": [first, first + WL.size - 1],
            "wavelength_unit": "nm", "value_unit": "W/m2/nm", "quantity": "irradiance",
            "rows_read": WL.size, "rows_used": WL.size, "rows_dropped_nonfinite": 0,
            "duplicates_averaged": 0, "sorted": "ascending", "gaps_nm": [],
            "step_nm": {"median": median(steps), "min": float(steps.min()),
                        "max": float(steps.max()),
                        "uniform": bool(np.allclose(steps, steps[0], rtol=1e-3, atol=1e-6))},
            "noise": estimate_noise(v).to_dict(), "warnings": [], "metadata": want_meta,
        }, shape
        if shape == "metadata":  # 'Distance: 20 cm' in the file = 0.2 m (SI)
            assert math.isclose(d["measurement_distance_m"], 0.2, rel_tol=1e-12)
        else:
            assert d["measurement_distance_m"] is None
        assert d["wavelength_unit_how"] == ("from the units row" if units_line
                                            else "from the header")
        assert len(d["columns"]) == 2 and d["value_column"] == d["columns"][1]
        assert dict(spec.meta) == {"source": str(p), "sha256": d["sha256"], "file_name": p.name,
                                   "instrument": ({"Integration time": "100 ms",
                                                   "Distance": "20 cm", "Model": "invented"}
                                                  if shape == "metadata" else {}),
                                   "origin": "measured",
                                   # 'Model: invented' above the data marks the file invented
                                   "invented": shape == "metadata"}
        assert spec.noise_floor == estimate_noise(v).sigma and spec.gaps_nm == ()


def test_the_fast_and_the_tolerant_parser_agree_on_the_usual_shapes(tmp_path):
    # the whole report, not only the numbers, when the numpy block parser is not used
    for shape, (sep, dec, above, *_rest, footer) in SHAPES.items():
        rows = [f"{a:.3f}{sep}{b:.6e}" for a, b in zip(WL[:300], _values(7)[:300])]
        if dec == ",":
            rows = [r.replace(".", ",") for r in rows]
        p = tmp_path / f"{shape}.txt"
        p.write_text("\n".join(above + rows + footer) + "\n", encoding="utf-8")
        fs, fr = read_spectrum(p)
        with mock.patch.object(reader, "_fast_block", lambda *a, **k: None):
            ss, sr = read_spectrum(p)
        assert np.array_equal(fs.wavelength_nm, ss.wavelength_nm), shape
        assert np.array_equal(fs.values, ss.values), shape
        assert fr.to_dict() == sr.to_dict(), shape
