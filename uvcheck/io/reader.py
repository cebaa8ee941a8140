"""Tolerant reader for spectrometer and spreadsheet text exports.

``read_spectrum(path, **overrides) -> (Spectrum, ImportReport)``

What it copes with, and reports in the :class:`ImportReport`:

* encodings: UTF-8 (with or without BOM), UTF-16 (BOM or NUL pattern), Latin-1/cp1252;
* delimiters: comma, semicolon, tab, pipe, runs of spaces; decimal comma (with semicolon,
  tab or spaces); thousands separators where unambiguous (``1,234.5``, ``1.234,5``, and
  ``1.002.000``, which decides the decimal mark even when it first appears after the lines the
  format is guessed on); a column where every number holding the decimal mark has exactly
  three digits after it next to plain integers (``10.000`` beside ``999``) is read with the
  guessed mark and flagged, naming the column and ``--decimal``;
* a metadata block of any length before the data (``key: value``, ``key;value``,
  ``key=value``, ``[Section]`` lines, comments, blank lines), a header row, an optional
  units row, footer lines after the data;
* units in the header, the units row or the metadata, in the usual spellings
  (see :func:`uvcheck.units.parse_spectral_unit`); none → relative, and it says so;
* several value columns (``column=`` picks one; otherwise an error lists them), an index or
  pixel column, two spectra side by side, several data blocks (``block=``);
* descending or unsorted wavelengths (sorted), duplicates (averaged), gaps (kept as gaps,
  never bridged), non-uniform steps, NaN/inf rows (dropped and counted), negative values
  (kept: they are noise and set the noise floor; more than half of the samples negative is
  flagged, as a sign-flipped dark subtraction), wavelengths in µm, m or cm⁻¹;
* noise-free data (synthetic, modelled, smoothed): the noise floor is the dynamic-range floor,
  1e-6 of the peak (common practice; :func:`uvcheck.features.estimate_noise`), and it is said.

Every guess can be overridden. Unreadable input raises :class:`InputFormatError` naming
the line and column and what to do. The file is streamed: only the head is held as text,
and the numbers go straight into compact arrays, so a million-row file needs little memory.
"""

from __future__ import annotations

import array
import hashlib
import math
import os
import re
from dataclasses import dataclass, field, fields, replace
from collections import Counter
from itertools import islice, repeat
from types import MappingProxyType
from pathlib import Path
from typing import Any, Iterable, Iterator, Sequence

import numpy as np

from uvcheck.errors import InputFormatError, UnitError
from uvcheck.features import estimate_noise, negative_dominated
from uvcheck.io import workbook
from uvcheck.io.tm2714 import as_table, is_tm2714
from uvcheck.io.textfile import (HEAD_BYTES, Decoded, decode_lines, file_sha256, iter_lines,
                                 sniff_encoding)
from uvcheck.spectrum import Spectrum, median
from uvcheck.units import parse_quantity, parse_spectral_unit, parse_wavelength_unit

#: Lines of the file examined to decide the format (the rest is streamed).
HEAD_LINES = 4000
DELIMITERS = {"tab": "\t", "semicolon": ";", "comma": ",", "pipe": "|", "space": None}
_DELIM_NAMES = {v: k for k, v in DELIMITERS.items()}
#: Order of preference when several formats read the head equally well.
_CONFIGS = [("tab", "."), ("tab", ","), ("semicolon", "."), ("semicolon", ","),
            ("comma", "."), ("pipe", "."), ("pipe", ","), ("space", "."), ("space", ",")]
_MISSING = {"", "na", "n/a", "nan", "-nan", "+nan", "--", "-", "null", "none", "#n/a",
            "1.#qnan", "-1.#ind", "1.#ind", "#value!", "#div/0!"}
#: Cells an instrument or laboratory writes for a value below its detection or quantitation
#: limit ("<LOD", "BDL", "n.d.", "<0.002"). The value is not known, only that it lies under
#: a limit, so it is read as missing: those wavelengths count as not measured, never as zero
#: emission (DESIGN.md: missing range is never read as zero). Abbreviations as laboratories
#: use them (common practice).
_BELOW_LIMIT = re.compile(r"^(?:<\s*(?:lod|loq|dl|mdl|ld|lq|[-+]?(?:\d+(?:[.,]\d*)?|[.,]\d+)"
                          r"(?:e[-+]?\d+)?)|bdl|b\.d\.l\.|n\.d\.|nd|below\s+(?:lod|dl|detection))$",
                          re.I)
#: The letters and marks of those cells (for the test of characters no data row holds).
_BELOW_LIMIT_CHARS = "<lodqmbnelwtci"
_INF = {"inf", "+inf", "infinity", "+infinity", "1.#inf"}
_NINF = {"-inf", "-infinity", "-1.#inf"}
# A number with '.' or ',' as the decimal mark; written so that a digit run splits one way
# only (``\d+\.?\d*`` would let the engine try every split of every number of a long line
# that fails at its end). The texts are also the cells of the clean-row patterns below.
_NUM_DOT_TEXT = r"[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_NUM_COMMA_TEXT = r"[-+]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][-+]?\d+)?"
_NUM_DOT = re.compile(rf"^{_NUM_DOT_TEXT}$")
_NUM_COMMA = re.compile(rf"^{_NUM_COMMA_TEXT}$")
_THOUS_DOT = re.compile(r"^[-+]?[1-9]\d{0,2}(,\d{3})+(\.\d*)?$")      # 1,234.5
_THOUS_COMMA = re.compile(r"^[-+]?[1-9]\d{0,2}(\.\d{3})+(,\d*)?$")    # 1.234,5
_STARTS_NUMERIC = re.compile(r"^\s*[-+]?(\d|[.,]\d)")
#: A number with a Fortran-style exponent ("3.116346D-06").
_FORTRAN_EXPONENT = re.compile(r"^[-+]?(?:\d+(?:[.,]\d*)?|[.,]\d+)[dD][-+]?\d+$")
_COMMENT = re.compile(r"^\s*(#|//|%|!|\*|REM\b)")
_SECTION = re.compile(r"^\s*\[([^\]]+)\]\s*$")
_KEYVAL = re.compile(r"^\s*([^:=;\t]{1,60}?)\s*(?::|=|;|\t)\s*(.*?)\s*;*\s*$")
#: A wavelength column's name; λ as an argument or subscript ('E(λ)', 'E_λ', 'E_e,λ': a spectral
#: density) is not one.
_WL_NAME = re.compile(r"(?i)(wave\s*length|wavelength|wellenl|longueur|(?<![(_,])(lambda|λ)(?!\s*\))|"
                      r"^\s*wl\b|^\s*nm\b|^\s*(x|wave)\s*(\[|\(|$))")
_INDEX_NAME = re.compile(r"(?i)^\s*(pixel|pix|index|idx|#|no\.?|n|i|channel|ch|row)\s*(\[.*\]|\(.*\))?\s*$")
_RAMAN = re.compile(r"(?i)raman")
_WAVENUMBER = re.compile(r"(?i)wave\s*number|cm\s*-\s*1|cm⁻¹|1/cm")
#: Largest magnitude accepted for a value. No measurement comes near it; the bound keeps every
#: later product, square and sum finite in float64 (largest ≈ 1.8e308; IEEE 754 binary64).
MAX_ABS_VALUE = 1e100
#: A spectral irradiance above this is taken as a unit or scale error: 1e5 W m⁻² nm⁻¹ is some
#: 50 000 times the peak of full sunlight (about 2 W m⁻² nm⁻¹, from memory), more than a
#: kilowatt lamp's strongest line gives even 1 cm away (our own bound). [W m⁻² nm⁻¹]
IMPLAUSIBLE_W_M2_NM = 1e5


# ---------------------------------------------------------------------------------------------
# Result types
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class ReadOptions:
    """User overrides for every guess the reader makes (None = infer)."""

    encoding: str | None = None
    delimiter: str | None = None          # tab | semicolon | comma | pipe | space
    decimal: str | None = None            # "." or ","
    column: str | None = None             # value column: exact name or 1-based number
    wavelength_column: str | None = None  # name or 1-based number
    wavelength_unit: str | None = None    # nm | um | m | cm-1 | ...
    unit: str | None = None               # value unit, e.g. "uW/cm2/nm" or "relative"
    block: int | None = None              # 1-based data block when a file holds several
    data_start: int | None = None         # 1-based line where the data rows start
    wavelength_correction: str | None = None  # added to every wavelength, e.g. "-2.2 nm"
    digitised: bool = False               # a curve read off a graph (datasheet, listing photo)


@dataclass(frozen=True)
class ImportReport:
    """What the reader inferred, so the user can check (and override) every guess."""

    path: str
    sha256: str
    encoding: str
    encoding_how: str
    delimiter: str
    decimal: str
    thousands: str | None
    header_line: int | None
    units_line: int | None
    data_lines: tuple[int, int]
    columns: tuple[str, ...]
    wavelength_column: str
    wavelength_unit: str
    wavelength_unit_how: str
    value_column: str
    value_unit: str
    value_unit_how: str
    quantity: str
    rows_read: int
    rows_used: int
    rows_dropped_nonfinite: int
    duplicates_averaged: int
    sorted: str                      # "ascending" | "descending (reversed)" | "unsorted (sorted)"
    step_nm: dict
    gaps_nm: tuple[tuple[float, float], ...]
    noise: dict
    metadata: dict
    measurement_distance_m: float | None
    warnings: tuple[str, ...] = field(default_factory=tuple)

    def to_dict(self) -> dict:
        # as dataclasses.asdict, whose deep copies cost more than the rest of this: every
        # field is a scalar, a tuple (listed below) or a dict of scalars (copied)
        d = {f.name: getattr(self, f.name) for f in fields(self)}
        for k in ("step_nm", "noise", "metadata"):
            d[k] = dict(d[k])
        d["data_lines"] = list(self.data_lines)
        d["gaps_nm"] = [list(g) for g in self.gaps_nm]
        d["columns"] = list(self.columns)
        d["warnings"] = list(self.warnings)
        return d


# ---------------------------------------------------------------------------------------------
# Tokenising and numbers
# ---------------------------------------------------------------------------------------------

#: A line holding none of these needs no stripping of its tokens (for tab-separated lines the
#: tab itself does not count: no token holds one).
_STRIP_CHARS = re.compile(r"[\s\"']")
_STRIP_CHARS_TAB = re.compile(r"[^\S\t]|[\"']")


def _split(line: str, delim: str) -> list[str]:
    if delim != "space" and not (_STRIP_CHARS_TAB if delim == "tab" else _STRIP_CHARS).search(line):
        # no whitespace and no quotes: every strip below would change nothing
        toks = line.split(DELIMITERS[delim])
        while toks and toks[-1] == "":
            toks.pop()  # trailing delimiter
        return toks
    if delim == "space":
        toks = line.split()
    else:
        ch = DELIMITERS[delim]
        if '"' in line:
            import csv

            toks = next(csv.reader([line], delimiter=ch), [])
        else:
            toks = line.split(ch)
        toks = [t.strip() for t in toks]
        while toks and toks[-1] == "":
            toks.pop()  # trailing delimiter
    return [t.strip().strip('"').strip("'").strip() for t in toks]


class _Num:
    """Number parser for one (decimal, thousands) convention, counting what it saw."""

    __slots__ = ("decimal", "mixed", "thousands_seen", "below_limit", "below_example")

    def __init__(self, decimal: str):
        self.decimal = decimal
        self.mixed = 0
        self.thousands_seen = 0
        self.below_limit = 0  # cells marked below a detection limit, read as missing
        self.below_example = ""

    def __call__(self, tok: str) -> float | None:
        """The token's value; NaN for a missing-value token; None if not a number."""
        t = tok.strip()
        # a plain number first (no missing-value or infinity word matches these patterns)
        if self.decimal == ".":
            if _NUM_DOT.match(t):
                return float(t)
        elif _NUM_COMMA.match(t):
            return float(t.replace(",", "."))
        low = t.lower()
        if low in _MISSING:
            return math.nan
        if low in _INF:
            return math.inf
        if low in _NINF:
            return -math.inf
        if _BELOW_LIMIT.match(t):
            self.below_limit += 1
            self.below_example = self.below_example or t
            return math.nan
        if self.decimal == ".":
            if _NUM_DOT.match(t):
                return float(t)
            if _THOUS_DOT.match(t):
                self.thousands_seen += 1
                return float(t.replace(",", ""))
            if _NUM_COMMA.match(t) and "," in t:
                self.mixed += 1
                return float(t.replace(",", "."))
            return None
        if _NUM_COMMA.match(t):
            return float(t.replace(",", "."))
        if _THOUS_COMMA.match(t):
            self.thousands_seen += 1
            return float(t.replace(".", "").replace(",", "."))
        if _NUM_DOT.match(t) and "." in t:
            self.mixed += 1
            return float(t)
        return None


def _row_values(toks: list[str], num: _Num) -> list[float] | None:
    """All tokens as numbers (a data row), or None if any token is not a number."""
    if len(toks) < 2:
        return None
    out = []
    real = 0
    for t in toks:
        v = num(t)
        if v is None:
            return None
        if not math.isnan(v):
            real += 1
        out.append(v)
    return out if real >= 1 and not math.isnan(out[0]) or real >= 2 else None


def _is_data(toks: list[str], num: _Num) -> bool:
    return _row_values(toks, num) is not None


def _numbers_then_note(toks: list[str], ncols: int, decimal: str) -> bool:
    """Whether a line is a data row of ``ncols`` numbers with a note typed beside it: its first
    ``ncols`` tokens are numbers (the first one a real number), and every token after them is
    empty or words (a token holding a letter and no number; at least one). Such a line right above
    the data is neither data (it does not read as numbers) nor the header, which lies above
    it; without this rule it was taken for the header, and the real header, with the units,
    was lost."""
    if ncols < 2 or len(toks) <= ncols:
        return False
    probe = _Num(decimal)  # a parser of its own: the caller's counts stay as they were
    lead = [probe(t) for t in toks[:ncols]]
    if any(v is None for v in lead) or lead[0] is None or math.isnan(lead[0]):
        return False
    rest = [t.strip() for t in toks[ncols:]]
    words = [t for t in rest if t]
    return bool(words) and all(probe(t) is None and any(c.isalpha() for c in t) for t in words)


def _names_row(toks: list[str], ncols: int, num: _Num) -> bool:
    """Whether a line inside a data block is a row of column names for as many columns as
    the block has (two or more; every token holds a letter and none is a number or a
    missing-value word): the heading of another table (a second scan, a calibration
    table, the next sheet of a workbook), so the block ends there. Other stray lines, up
    to two in a row, stay inside the block (a note, a marker); without this rule a second
    table behind a heading would be read on as more rows of the first, its values
    averaged into the first's at shared wavelengths."""
    if ncols < 2 or len(toks) != ncols or not all(any(c.isalpha() for c in t) for t in toks):
        return False
    probe = _Num(num.decimal)  # a parser of its own: the caller's counts stay as they were
    return all(probe(t) is None for t in toks)


# ---------------------------------------------------------------------------------------------
# Format detection on the head of the file
# ---------------------------------------------------------------------------------------------

@dataclass
class _Block:
    start: int        # 0-based line index of the first data row
    end: int          # 0-based index of the last data row
    ncols: int
    bad: list[int]    # non-data lines inside the block


_CLEAN_ROWS: dict[tuple[str, str], re.Pattern] = {}


def _clean_row(delim: str, decimal: str) -> re.Pattern:
    """A line of plain numbers (two or more) in this format, and nothing else: for such a
    line :func:`_split` gives exactly those numbers (no quotes, no empty or trailing cell) and
    :func:`_row_values` reads every one on its first pattern, so it is a data row with as many
    columns as numbers; other lines take the general test."""
    key = (delim, decimal)
    if key not in _CLEAN_ROWS:
        num = _NUM_DOT_TEXT if decimal == "." else _NUM_COMMA_TEXT
        if delim != "space" and DELIMITERS[delim] == decimal:
            pat = r"(?!)"  # the delimiter is the decimal mark: no line is plain (never tried)
        elif delim == "space":
            pat = rf"^\s*{num}(?:\s+{num})+\s*$"
        else:
            ch = re.escape(DELIMITERS[delim])
            ws = r"[^\S\t]*" if delim == "tab" else r"\s*"
            pat = rf"^{ws}{num}{ws}(?:{ch}{ws}{num}{ws})+$"
        _CLEAN_ROWS[key] = re.compile(pat)
    return _CLEAN_ROWS[key]


_DATA_RUNS: dict[tuple[str, str], tuple[re.Pattern, str | None]] = {}
#: _NUM_DOT_TEXT and _NUM_COMMA_TEXT with possessive quantifiers (see :func:`_data_run`).
_NUM_DOT_RUN = r"[-+]?+(?:\d++(?:\.\d*+)?+|\.\d++)(?:[eE][-+]?+\d++)?+"
_NUM_COMMA_RUN = r"[-+]?+(?:\d++(?:,\d*+)?+|,\d++)(?:[eE][-+]?+\d++)?+"


def _data_run(delim: str, decimal: str) -> tuple[re.Pattern, str | None]:
    """A pattern for a run of consecutive lines (each ended by a newline) that are all data
    rows in this format, found in one match over the text, and the other decimal mark it
    admits, or None.

    Each line of the run is a line :func:`_clean_row` matches, or one whose numbers use the
    other decimal mark (``1,5`` where the mark is ``.``; not where that mark is the
    delimiter): :class:`_Num` reads such a number ``against`` the convention, counting it
    once (as a mixed decimal or a thousands separator), and every other number of the line
    on its first pattern, so the line is a data row that counts one for each other mark in
    it (a number holds at most one). The whitespace of the line patterns stops at newlines,
    so each repetition is one line; a line without a newline in it is matched the same.

    The quantifiers are possessive (Python 3.11): a number, a run of whitespace and a line
    can each be read one way only (a digit run is followed by no digit, a number by
    whitespace, the delimiter or the newline, none of which a number holds), so giving
    characters back never finds another match; the patterns match what the plain ones do."""
    key = (delim, decimal)
    if key not in _DATA_RUNS:
        this, that = ((_NUM_DOT_RUN, _NUM_COMMA_RUN) if decimal == "."
                      else (_NUM_COMMA_RUN, _NUM_DOT_RUN))
        other: str | None = "," if decimal == "." else "."
        if delim != "space" and DELIMITERS[delim] in (decimal, other):
            # the delimiter is a decimal mark: its own rows only (none for the decimal mark)
            other = None
        cell = this if other is None else rf"(?:{this}|{that})"
        if delim != "space" and DELIMITERS[delim] == decimal:
            line = r"(?!)"
        elif delim == "space":
            line = rf"[^\S\n]*+{cell}(?:[^\S\n]++{cell})++[^\S\n]*+"
        else:
            ch = re.escape(DELIMITERS[delim])
            ws = r"[^\S\t\n]*+" if delim == "tab" else r"[^\S\n]*+"
            line = rf"{ws}{cell}{ws}(?:{ch}{ws}{cell}{ws})++"
        _DATA_RUNS[key] = (re.compile(rf"(?:{line}\n)*+"), other)
    return _DATA_RUNS[key]


def _blocks(lines: list[str], delim: str, decimal: str, first: int = 0,
            text: str | None = None) -> tuple[list[_Block], int]:
    """Runs of data rows (allowing up to 2 stray lines inside a run), and how many numbers
    they were read with against the convention (the other decimal mark, thousands
    separators: the count :class:`_Num` keeps, over every line tested).

    A block's column count is the most common number of tokens among its data rows in its
    first 500 lines (the larger count on a tie). Runs of lines that :func:`_data_run`
    matches are taken at once (data rows, without tokenising; never blank); other lines
    take the general test.

    text : ``"\\n".join(lines[first:])``, when the caller has it."""
    num = _Num(decimal)
    against = 0  # numbers in the runs read against the convention
    blocks: list[_Block] = []
    counts: list[dict[int, int]] = []  # per block: data rows by token count (first 500 lines)
    cur: _Block | None = None
    cur_counts: dict[int, int] = {}
    limit = 0
    pending: list[int] = []  # non-blank, non-data lines since the block's last data row (≤ 2)
    run, other = _data_run(delim, decimal)
    ch = None if delim == "space" else DELIMITERS[delim]
    buf = ("\n".join(islice(lines, first, None)) if text is None else text) + "\n"
    pos = 0  # where line i starts in buf
    i = first
    n_lines = len(lines)
    while i < n_lines:
        end = run.match(buf, pos).end()
        if end > pos:  # lines i … j - 1 are data rows
            j = i + buf.count("\n", pos, end)
            if other is not None:
                against += buf.count(other, pos, end)
            if cur is None:
                line = lines[i]
                cur = _Block(start=i, end=i, ncols=(len(line.split()) if ch is None
                                                    else line.count(ch) + 1), bad=[])
                cur_counts = {}
                counts.append(cur_counts)
                limit = i + 500
            elif pending:
                cur.bad.extend(pending)
                pending = []
            cur.end = j - 1
            seg = lines[i:min(j, limit)]
            widths = (map(len, map(str.split, seg)) if ch is None
                      else map(str.count, seg, repeat(ch)))
            for w, c in Counter(widths).items():
                n = w if ch is None else w + 1
                cur_counts[n] = cur_counts.get(n, 0) + c
            i, pos = j, end
            continue
        line = lines[i]
        pos += len(line) + 1
        if not line.strip():
            i += 1
            continue
        # a line without the delimiter is one token, no row (and no number is read)
        toks = (_split(line, delim) if (ch in line if ch is not None else len(line.split()) > 1)
                else [])
        if len(toks) == 1:
            toks.append("")  # "302.0," : the delimiter is there, the value after it is empty
        if _row_values(toks, num) is None:
            if cur is not None:
                pending.append(i)
                if len(pending) > 2 or _names_row(toks, cur.ncols, num):
                    blocks.append(cur)
                    cur = None
                    pending = []
            i += 1
            continue
        n = len(toks)
        if cur is None:
            cur = _Block(start=i, end=i, ncols=n, bad=[])
            cur_counts = {}
            counts.append(cur_counts)
            limit = i + 500
        else:
            if pending:
                cur.bad.extend(pending)
                pending = []
            cur.end = i
        if i < limit:
            cur_counts[n] = cur_counts.get(n, 0) + 1
        i += 1
    if cur is not None:
        blocks.append(cur)
    for b, c in zip(blocks, counts):
        b.ncols = max(c, key=lambda k: (c[k], k))
    return blocks, against + num.mixed + num.thousands_seen


def _listing(big: list[_Block], head: list[str]) -> str:
    """The blocks as an error lists them: number, lines and the label above each."""
    desc = []
    for k, b in enumerate(big, 1):
        label = next((head[j].strip() for j in range(b.start - 1, max(-1, b.start - 6), -1)
                      if head[j].strip()), "")
        desc.append(f"{k}: lines {b.start + 1}–{b.end + 1}"
                    + (f" after {label[:40]!r}" if label else ""))
    return "; ".join(desc)


def _big_blocks(blocks: list[_Block]) -> list[_Block]:
    """The blocks of at least 3 data rows (what ``--block N`` counts)."""
    return [b for b in blocks if b.end - b.start + 1 - len(b.bad) >= 3]


_FOREIGN: dict[str, re.Pattern] = {}


def _foreign(delim: str) -> re.Pattern:
    """A character no data row of this delimiter holds: none of the characters of a number
    (digits, any that ``\\d`` matches; either decimal mark, thousands separators, exponent,
    sign), of a missing-value or infinity word in either case, the delimiter, whitespace or
    quotes (which :func:`_split` strips). A token holding one is no number for :class:`_Num`
    (no other character lowers to a letter of those words), so a line holding one is no data
    row."""
    if delim not in _FOREIGN:
        word = "".join(sorted(set("".join(_MISSING | _INF | _NINF))))
        word += _BELOW_LIMIT_CHARS
        ok = set("0123456789+-.,eE\"'") | set(word) | set(word.upper())
        if delim != "space":
            ok.add(DELIMITERS[delim])
        _FOREIGN[delim] = re.compile("[^\\s\\d" + "".join(re.escape(c) for c in sorted(ok)) + "]")
    return _FOREIGN[delim]


def _may_hold_rows(lines: list[str], delim: str, decimal: str, first: int,
                   text: str | None = None, spaced: list[str] | None = None) -> bool:
    """Whether any line from ``first`` on is a data row for this delimiter and decimal mark
    (the test :func:`_blocks` applies to each line); if none is, :func:`_blocks` finds no
    block, so the format need not be tried. Lines that cannot split into two tokens are
    passed over without tokenising: :func:`_split` gives one token to a line without the
    delimiter character (and ``str.split()``'s count for whitespace).

    text : ``"\\n".join(lines[first:])``, when the caller has it (no line holds a newline, so
        the delimiter occurs in a line exactly when it occurs in the text).
    spaced : the lines from ``first`` on that split into two or more tokens on whitespace,
        when the caller has them (the candidates for ``delim="space"``)."""
    num = _Num(decimal)
    clean = _clean_row(delim, decimal)
    foreign = _foreign(delim).search
    if delim == "space":
        candidates = spaced if spaced is not None else _spaced_lines(lines, first)
    else:
        ch = DELIMITERS[delim]
        if text is not None and ch not in text:
            return False
        candidates = [ln for ln in islice(lines, first, None) if ch in ln]
    for ln in candidates:
        if foreign(ln):
            continue  # no data row (nor a line _clean_row matches)
        if clean.match(ln) or (ln.strip() and _is_data(_split(ln, delim), num)):
            return True
    return False


def _spaced_lines(lines: list[str], first: int) -> list[str]:
    """The lines from ``first`` on that split into two or more tokens on whitespace."""
    return [ln for ln in islice(lines, first, None) if len(ln.split()) > 1]


def _choose_format(lines: list[str], opts: ReadOptions, where: str) -> tuple[str, str, list[_Block]]:
    delims = [opts.delimiter] if opts.delimiter else None
    if opts.delimiter and opts.delimiter not in DELIMITERS:
        raise InputFormatError(f"unknown delimiter {opts.delimiter!r}", where,
                               f"use one of: {', '.join(DELIMITERS)}")
    if opts.decimal and opts.decimal not in (".", ","):
        raise InputFormatError(f"unknown decimal mark {opts.decimal!r}", where, "use '.' or ','")
    first = (opts.data_start - 1) if opts.data_start else 0
    text = "\n".join(islice(lines, first, None))
    spaced: list[str] | None = None  # found once, for both decimal marks
    best = None
    for d, dec in _CONFIGS:
        if delims and d not in delims:
            continue
        if opts.decimal and dec != opts.decimal:
            continue
        if d == "comma" and dec == ",":
            continue
        if d == "space" and spaced is None:
            spaced = _spaced_lines(lines, first)
        if not _may_hold_rows(lines, d, dec, first, text, spaced):
            continue  # not one data row with this delimiter and decimal mark
        bl, against = _blocks(lines, d, dec, first, text)
        if not bl:
            continue
        top = max(bl, key=lambda b: b.end - b.start - len(b.bad))
        rows = top.end - top.start + 1 - len(top.bad)
        # a delimiter that really occurs in the rows beats whitespace splitting; fewer numbers
        # read against the convention (other decimal mark, thousands separators) win ties
        present = d == "space" or DELIMITERS[d] in lines[top.start]
        score = (rows, -against, present)
        if best is None or score > best[0]:
            best = (score, d, dec, bl)
    if best is None:
        raise _no_rows_error(lines, first, where)
    return best[1], best[2], best[3]


# ---------------------------------------------------------------------------------------------
# Thousands separators: evidence in the data rows of the head
# ---------------------------------------------------------------------------------------------

#: Per mark ``m``: a number that reads the same with ``m`` as a decimal mark or as a thousands
#: separator (one group of exactly three digits after a leading 1-3 digit group not starting
#: with 0: '10.000', '1.103'), and the grouped-number pattern with ``m`` as the thousands
#: separator; tested in that order, the second then matches only what a thousands separator
#: alone explains: '1.002.000' (two or more groups) or '1.234,5' (a group, then the other mark).
_SEP_PATTERNS = {
    ".": (re.compile(r"^[-+]?[1-9]\d{0,2}\.\d{3}$"), _THOUS_COMMA),
    ",": (re.compile(r"^[-+]?[1-9]\d{0,2},\d{3}$"), _THOUS_DOT),
}
_PLAIN_INT = re.compile(r"^[-+]?\d+$")
#: At most this many data lines of the head are examined for separator evidence.
SEPARATOR_SCAN_LINES = HEAD_LINES
#: Without a grouped number ('1.002.000', '1.234,5') anywhere in the head, the ambiguity
#: check ('10.000' among plain integers) looks at this many data rows only: a column printed
#: in fixed-point format ('253.700', every row) would otherwise be read token by token
#: through the whole head, for a warning its first rows already decide in practice.
SEPARATOR_QUICK_ROWS = 200


def _ascii_bytes(text: str) -> np.ndarray | None:
    """The text's characters as bytes, when it is ASCII (one byte a character), else None."""
    return np.frombuffer(text.encode("ascii"), dtype=np.uint8) if text.isascii() else None


def _grouped_anywhere(text: str, mark: str, delim: str, b: np.ndarray | None = None) -> bool:
    """Whether the text may hold a number that only a thousands separator ``mark`` explains:
    two or more groups ('1.002.000'), or a group then the other mark ('1.234,5', not where
    the other mark is the delimiter). A necessary condition (the patterns ``m\\d{3}m\\d`` and
    ``m\\d{3}o\\d``), tested in one pass over the text; the token-by-token scan then decides.
    ASCII text (``b``: its bytes, from :func:`_ascii_bytes`) is tested with numpy: where a
    mark has a mark four characters on, the four characters around must be digits (``\\d`` is
    0-9 there); other text with the regular expressions."""
    other = "," if mark == "." else "."
    seconds = [mark]
    if delim == "space" or DELIMITERS[delim] != other:
        seconds.append(other)
    if b is None:
        b = _ascii_bytes(text)
    if b is None:
        m = re.escape(mark)
        return any(re.search(rf"{m}\d{{3}}{re.escape(c)}\d", text) is not None for c in seconds)
    n = b.size
    if n < 6:
        return False
    # places where the mark has the mark (or the other mark) four characters on: few or none
    pair = b[4:n - 1] == ord(seconds[0])
    for c in seconds[1:]:
        pair |= b[4:n - 1] == ord(c)
    pair &= b[:n - 5] == ord(mark)
    if not pair.any():
        return False
    at = np.flatnonzero(pair)
    zero = np.uint8(48)
    for k in (1, 2, 3, 5):
        pair = (b[at + k] - zero) < 10  # an ASCII digit (uint8 arithmetic wraps below '0')
        at = at[pair]
    return bool(at.size)


def _group_possible(text: str, mark: str, b: np.ndarray | None = None) -> bool:
    """Whether the text may hold a number with a group of three digits after ``mark`` (the
    ambiguous '10.000' and the grouped '1.002.000' both have one: the mark, exactly three
    digits, then no digit). A necessary condition for both; without it the token-by-token
    scan finds neither. With numpy on ``b``, the text's bytes when it is ASCII."""
    if b is None:
        return re.search(rf"{re.escape(mark)}\d{{3}}(?!\d)", text) is not None
    n = b.size
    at = np.flatnonzero(b[:max(n - 3, 0)] == ord(mark))  # a mark with three characters after
    zero = np.uint8(48)
    for k in (1, 2, 3):
        at = at[(b[at + k] - zero) < 10]  # an ASCII digit (uint8 arithmetic wraps below '0')
    after = at + 4
    return bool(np.any((after >= n) | ((b[np.minimum(after, n - 1)] - zero) >= 10)))


def _int_cell_possible(text: str, n_lines: int, mark: str, delim: str,
                       b: np.ndarray | None = None) -> bool:
    """Whether some cell of the text may lack the mark (a plain integer): certainly not when
    there are at least as many marks as cells and no cell holds two (no grouped number).
    Counted in C (with numpy on ``b``, the text's bytes when it is ASCII); an over-count of
    cells only makes the scan run."""
    if b is not None:
        marks = int(np.count_nonzero(b == ord(mark)))
        cells = (len(text.split()) if delim == "space"
                 else int(np.count_nonzero(b == ord(DELIMITERS[delim]))) + n_lines)
        return marks < cells
    cells = len(text.split()) if delim == "space" else text.count(DELIMITERS[delim]) + n_lines
    return text.count(mark) < cells


@dataclass
class _SepColumn:
    """What the tokens of one column show about the mark ``m`` (the decimal mark in use)."""

    ints: int = 0            # plain integers, no mark
    three: int = 0           # one group of exactly three digits after the mark: ambiguous
    other: int = 0           # the mark used as a decimal mark only ('0.5', '12.34', '1.2e-3')
    thousands: int = 0       # the mark used as a thousands separator only ('1.002.000')
    example: tuple[int, str] | None = None       # (0-based line, token) of the first 'three'
    thousands_example: tuple[int, str] | None = None


def _separator_evidence(lines: list[str], start: int, delim: str, mark: str, ncols: int,
                        text: str | None = None) -> list[_SepColumn]:
    """Per column, how the data rows from ``start`` (at most :data:`SEPARATOR_SCAN_LINES`)
    use ``mark``: as a decimal mark, as a thousands separator, or ambiguously.

    The scan stops once every column has used the mark as a plain decimal mark (the usual
    case, decided on the first row): then no column is ambiguous and the mark stays; and,
    where no grouped number appears in the head at all, after
    :data:`SEPARATOR_QUICK_ROWS` data rows. Only the ambiguous and the grouped numbers (and,
    beside them, the other counts) decide anything; where the text cannot hold either, the
    scan is not made and every count stays 0.

    text : ``"\\n".join(lines[start:start + SEPARATOR_SCAN_LINES])``, when the caller has it."""
    three, multi = _SEP_PATTERNS[mark]
    cols = [_SepColumn() for _ in range(ncols)]
    stop = min(len(lines), start + SEPARATOR_SCAN_LINES)
    if text is None:
        text = "\n".join(lines[start:stop])
    b = _ascii_bytes(text)
    grouped = _grouped_anywhere(text, mark, delim, b)
    if not grouped and not _int_cell_possible(text, stop - start, mark, delim, b):
        return cols  # no grouped number and no integer cell: nothing to find
    if not _group_possible(text, mark, b):
        return cols  # no number with three digits after the mark: nothing ambiguous to find
    rows_left = stop - start if grouped else SEPARATOR_QUICK_ROWS
    for i in range(start, stop):
        if rows_left <= 0 or all(c.other for c in cols):
            break
        line = lines[i]
        if not _STARTS_NUMERIC.match(line):
            continue
        toks = _split(line, delim)
        if len(toks) != ncols:
            continue
        rows_left -= 1
        for c, t in zip(cols, toks):
            if mark not in t:
                if _PLAIN_INT.match(t):
                    c.ints += 1
            elif three.match(t):
                c.three += 1
                c.example = c.example or (i, t)
            elif multi.match(t):
                c.thousands += 1
                c.thousands_example = c.thousands_example or (i, t)
            else:
                c.other += 1
    return cols


def _structured_kind(first_text: str) -> str | None:
    """What a file whose first text line is ``first_text`` is, when it is a structured
    document rather than a table: 'JSON', 'XML' or 'HTML' (from its opening characters)."""
    t = first_text.lstrip("\ufeff").lstrip().lower()
    if t.startswith(("{", "[{", '["', "[[")) or t == "[":
        return "JSON"
    if t.startswith(("<!doctype html", "<html")):
        return "HTML"
    if t.startswith("<"):
        return "XML"
    return None


def _no_rows_error(lines: list[str], first: int, where: str) -> InputFormatError:
    """Why no data rows were found, naming the first line that starts like a number."""
    todo = ("the file must hold a table of wavelength and value columns; "
            "check the export, or give --delimiter and --decimal")
    text = [(i, ln) for i, ln in enumerate(lines) if i >= first and ln.strip()]
    if any("\x00" in ln for _, ln in text[:200]):
        return InputFormatError("no rows of numbers found, and the text holds NUL characters",
                                where, "wrong encoding? give --encoding (utf-16, utf-8, latin-1)")
    numeric = next(((i, ln) for i, ln in text if _STARTS_NUMERIC.match(ln)), None)
    if numeric is None:
        first_text = text[0][1].strip()[:50] if text else ""
        kind = _structured_kind(first_text)
        if kind:
            return InputFormatError(f"no rows of numbers found: this looks like {kind}, not a "
                                    "table of columns", where,
                                    "export the spectrum as text columns (CSV or "
                                    "tab-separated: wavelength, value)")
        return InputFormatError(f"no rows of numbers found ({len(text)} line(s) of text, none "
                                f"starting with a number; the first: {first_text!r})", where, todo)
    i, ln = numeric
    dot, comma = _Num("."), _Num(",")
    toks = max((_split(ln, d) for d in DELIMITERS), key=len)
    if len(toks) < 2:
        if dot(toks[0] if toks else "") is not None or comma(toks[0] if toks else "") is not None:
            return InputFormatError("only one column of numbers", f"{where} line {i + 1}",
                                    "a spectrum needs a wavelength column and a value column")
        return InputFormatError(f"{ln.strip()[:40]!r} is not a row of numbers",
                                f"{where} line {i + 1}", todo)
    for k, t in enumerate(toks):
        if dot(t) is None and comma(t) is None:
            if _FORTRAN_EXPONENT.match(t.strip()):
                return InputFormatError(
                    f"{t[:30]!r} writes its exponent with D (Fortran style), which uvcheck does "
                    "not read", f"{where} line {i + 1}, column {k + 1}",
                    "replace the D of the exponents with E (1.5D-03 -> 1.5E-03) and read the "
                    "file again")
            return InputFormatError(f"no rows of numbers found: {t[:30]!r} is not a number",
                                    f"{where} line {i + 1}, column {k + 1}", todo)
    return InputFormatError("no rows of numbers found", f"{where} line {i + 1}", todo)


# ---------------------------------------------------------------------------------------------
# Header, units row, metadata
# ---------------------------------------------------------------------------------------------

_UNIT_IN_BRACKETS = re.compile(r"[\[(]([^\[\]()]*(?:\([^()]*\)[^\[\]()]*)*)[\])]\s*$")


def _reads_as_unit(text: str) -> bool:
    """Whether the text parses as a spectral or a wavelength unit."""
    for parse in (parse_spectral_unit, parse_wavelength_unit):
        try:
            parse(text)
            return True
        except UnitError:
            pass
    return False


def _unit_from_header(cell: str) -> str | None:
    """A unit written in a column name: 'Irradiance (µW/cm²/nm)', 'E [W m-2 nm-1]',
    'E / (W m^-2 nm^-1)' and 'E(λ) / W m-2 nm-1' (ISO 80000-1: quantity / unit),
    'irradiance_W_m2_nm', 'Irradiance, W/m2/nm', 'Radiance W/(m2 sr nm)' (a bracket that
    follows 'W/' is the unit's own), 'Irr. uW cm-2 nm-1' (the longest ending that reads as a
    unit), or the whole cell.

    >>> _unit_from_header("Spectral radiance W/(m2 sr nm)"), _unit_from_header("E (W/(m2·nm))")
    ('W/(m2 sr nm)', 'W/(m2·nm)')
    >>> _unit_from_header("E(λ) / W m-2 nm-1"), _unit_from_header("Irr. uW cm-2 nm-1")
    ('W m-2 nm-1', 'uW cm-2 nm-1')
    >>> _unit_from_header("Irradiance/(W/m2/nm)")
    'W/m2/nm'
    """
    c = cell.strip()
    if not c:
        return None
    m = _UNIT_IN_BRACKETS.search(c)
    if m and m.group(1).strip():
        if m.start() > 0 and c[m.start() - 1] in "/·*.^":
            # 'W/(m2 nm)': the bracket is the unit's denominator, the unit starts before it;
            # 'Irradiance/(W/m2/nm)' is a quantity over its unit
            whole = c[c.rfind(" ", 0, m.start()) + 1:].strip()
            if _reads_as_unit(whole):
                return whole
        return m.group(1).strip()
    if " / " in c:
        tail = c.rsplit(" / ", 1)[1].strip()
        if tail:
            return tail
    if "," in c:
        tail = c.rsplit(",", 1)[1].strip()
        if tail:
            return tail
    if " in " in c:
        return c.rsplit(" in ", 1)[1].strip()
    if "_" in c:
        last = c.rsplit("_", 1)[1]
        try:
            parse_wavelength_unit(last)
            return last
        except UnitError:
            return c
    parts = c.split()
    if len(parts) >= 2:
        for k in range(1, len(parts)):   # the longest ending that reads as a unit
            tail = " ".join(parts[k:])
            if _reads_as_unit(tail):
                return tail
        return parts[-1]
    return c


def _looks_like_unit_row(toks: list[str]) -> bool:
    """Every non-empty cell reads as a unit, and there is one at least."""
    cells = [t for t in toks if t]
    return bool(cells) and all(_reads_as_unit(t) for t in cells)


def _metadata(lines: Iterable[tuple[int, str]]) -> tuple[dict[str, str], list[str]]:
    meta: dict[str, str] = {}
    other: list[str] = []
    section = ""
    for _, line in lines:
        s = line.strip()
        if not s:
            continue
        m = _SECTION.match(s)
        if m:
            section = m.group(1).strip()
            continue
        body = _COMMENT.sub("", s, count=1).strip() if _COMMENT.match(s) else s
        m = _KEYVAL.match(body) or _DIST_NO_SEP.match(body)
        if m and m.group(1).strip():
            key = m.group(1).strip()
            if section:
                key = f"{section}/{key}"
            value = m.group(2).strip()
            if key not in meta:
                meta[key] = value
            elif meta[key] != value:
                # a key given again with another value ("Distance: 50 cm" ... "Distance:
                # 20 cm"): kept as "KEY #2", so that a conflict can be reported
                n = 2
                while f"{key} #{n}" in meta:
                    n += 1
                meta[f"{key} #{n}"] = value
        else:
            other.append(s)
    return meta, other


# Measurement distance in the metadata. The key: "distance", "measurement distance",
# "distance de mesure", "dist.", a key starting "dist" ("Distancia", "Distanza"; not
# "distortion", "distribution"), "d", German "Abstand", "Messabstand", "Entfernung", with or
# without a unit in brackets ("Distance to lamp [cm]", "Distance (mm)"); not a key about the
# unit itself ("distance unit"; its unit is used for a bare number when the key gives none).
# The one-letter "d" only in lower case ("D" is as often a diameter). A line with no separator ("Abstand 20cm") is read too when it
# starts with one of these words and a number follows (our own rule: only these words, so
# that no other free text becomes metadata).
_DIST_WORDS = r"(?:(?:measure(?:ment)?\s*)?distance|dist\b\.?|messabstand|abstand|entfernung)"
_DIST_KEY = re.compile(r"^d$|(?i:distance|abstand|entfernung|^dist(?!or|rib|ill|inct))")
_DIST_NOT = re.compile(r"(?i)\bunits?\b|einheit|unit[eé]")
_DIST_UNITS = r"(?:mm|cm|m|in|inch|inches|ft)"
_DIST_NO_SEP = re.compile(rf"(?i)^\s*({_DIST_WORDS}(?:\s+de\s+mesure)?"
                          rf"(?:\s*[\[(]\s*{_DIST_UNITS}\s*[\])])?)\s+([-+]?\d.*?)\s*$")
_DIST_VALUE = re.compile(rf"(?i)^\s*(?:(?:ca|approx|env)\.?\s*|about\s+|~\s*|≈\s*)?"
                         rf"([-+]?\d+(?:[.,]\d+)?\s*{_DIST_UNITS})(?![a-z])")
_DIST_PLUS_MINUS = re.compile(r"\s*(?:±|\+/-|\+-)\s*\d+(?:[.,]\d+)?(?=\s*[a-zA-Z]|\s*$)")
_DIST_BARE = re.compile(r"^\s*([-+]?\d+(?:[.,]\d+)?)\s*$")
_DIST_KEY_UNIT = re.compile(rf"(?i)(?:[\[(]\s*({_DIST_UNITS})\s*[\])]|[\s_/]in\s+({_DIST_UNITS})"
                            rf"|_({_DIST_UNITS}))\s*$")


def _distance_entry(meta: dict[str, str]) -> tuple[str, str] | None:
    """The first metadata entry that states the measurement distance, as (key, value)."""
    return next(iter(_distance_entries(meta)), None)


def _distance_entries(meta: dict[str, str]) -> list[tuple[str, str]]:
    """Every metadata entry that states a measurement distance, as (key, value), in order."""
    out = []
    for k, v in meta.items():
        key = k.rsplit("/", 1)[-1].strip()
        if v and _DIST_KEY.search(key) and not _DIST_NOT.search(key):
            out.append((k, v))
    return out


def _distance_conflict(meta: dict[str, str], used: tuple[str, str], dist: float) -> str | None:
    """A warning when the metadata state other measurement distances than the one used
    (more than 1 % apart: our own tolerance for the same distance written twice), else None."""
    others = []
    for k, v in _distance_entries(meta):
        if (k, v) == used:
            continue
        d = _read_distance(k, v, meta)
        if d is not None and abs(d - dist) > 0.01 * dist:
            others.append(f"{k} = {v!r}")
    if not others:
        return None
    return (f"the metadata give more than one measurement distance ({used[0]} = {used[1]!r}; "
            f"{'; '.join(others[:3])}): the first, {dist:g} m, is used; check which is right "
            "and give --distance")


def _read_distance(key: str, value: str, meta: dict[str, str]) -> float | None:
    """The distance in metres from a metadata entry, else None: a number with a unit
    ("0,5 m", "20cm", "12 in", "ca. 20 cm"), or a bare number with the unit given in the key
    ("Distance (mm): 200") or in a "distance unit" entry. An uncertainty written with it
    ("50 ± 1 cm", "50 +/- 1 cm") is left out: the reading is the distance."""
    value = _DIST_PLUS_MINUS.sub("", value)
    m = _DIST_VALUE.match(value)
    b = _DIST_BARE.match(value)
    text = m.group(1) if m else value
    if not m and b:
        ku = _DIST_KEY_UNIT.search(key.rsplit("/", 1)[-1])
        unit = next(g for g in ku.groups() if g) if ku else None
        if unit is None:
            unit = next((v.strip() for k, v in meta.items()
                         if _DIST_KEY.search(k.rsplit("/", 1)[-1])
                         and _DIST_NOT.search(k.rsplit("/", 1)[-1])
                         and re.fullmatch(rf"(?i)\s*{_DIST_UNITS}\s*", v)), None)
        if unit is not None:
            text = f"{b.group(1)} {unit}"
    text = re.sub(r"(?i)(?<=\d)\s*(inch|inches)$", " in", text.strip())
    try:
        dist = parse_quantity(text, "length").value_si
    except UnitError:
        return None
    return dist if dist > 0 else None


def _meta_lookup(meta: dict[str, str], *patterns: str) -> tuple[str, str] | None:
    for pat in patterns:
        rx = re.compile(pat, re.I)
        for k, v in meta.items():
            key = k.rsplit("/", 1)[-1]
            if rx.search(key) and v:
                return k, v
    return None


# ---------------------------------------------------------------------------------------------
# The reader
# ---------------------------------------------------------------------------------------------

def _col_ref(ref: str, names: list[str], what: str, where: str) -> int:
    r = ref.strip()
    if r.isascii() and r.isdigit():
        i = int(r) - 1
        if 0 <= i < len(names):
            return i
        raise InputFormatError(f"there is no {what} {r}: the file has {len(names)} columns", where,
                               "columns are numbered from 1")
    low = [n.strip().lower() for n in names]
    if r.lower() in low:
        return low.index(r.lower())
    # the name without the unit written after it ("Sample" for "Sample [counts]")
    bare = [_UNIT_SUFFIX.sub("", n).strip() for n in low]
    hits = [i for i, n in enumerate(bare) if n and n == r.lower()]
    if len(hits) == 1:
        return hits[0]
    listed = "columns: " + ", ".join(f"{i + 1} {n!r}" for i, n in enumerate(names))
    if len(hits) > 1:
        raise InputFormatError(f"{len(hits)} columns are named {ref!r}", where,
                               "give the column's number or its whole name; " + listed)
    raise InputFormatError(f"no column named {ref!r}", where, listed)


#: A unit written after a column name: "Sample [counts]", "Irradiance (W/m2/nm)", "E / W m-2".
_UNIT_SUFFIX = re.compile(r"\s*(?:\[[^\]]*\]|\([^)]*\)|/\s*\S.*)\s*$")


def _lines_from(path: Path, decoded: Decoded, start: int, whole: list[str] | None
                ) -> Iterator[tuple[int, str]]:
    """(0-based index, line) from line ``start`` on: from ``whole`` (the file's lines, when it
    was read whole) or streamed from the file."""
    src = whole if whole is not None else iter_lines(path, decoded)
    return enumerate(islice(src, start, None), start=start)


def _stream_rows(path: Path, decoded: Decoded, delim: str, num: _Num, start: int, ncols: int,
                 stats: dict[str, Any], whole: list[str] | None = None
                 ) -> Iterator[tuple[int, list[float]]]:
    """Data rows from line ``start`` on, until the block ends (3 non-data lines in a row, or
    a row of column names: :func:`_names_row`)."""
    run_bad: list[tuple[int, str]] = []
    for i, line in _lines_from(path, decoded, start, whole):
        if not line.strip():
            continue
        toks = _split(line, delim)
        if len(toks) < ncols and delim != "space" and line.rstrip().endswith(DELIMITERS[delim]):
            # "302.0," in a table of two columns: the cells after the delimiter are empty,
            # missing values (_split drops trailing empty cells, as a trailing delimiter makes)
            toks = toks + [""] * (ncols - len(toks))
        vals = _row_values(toks, num)
        if vals is None:
            run_bad.append((i, line))
            if len(run_bad) > 2 or _names_row(toks, ncols, num):
                stats["footer_start"] = run_bad[0][0]
                stats["footer_sample"] = [t for _, t in run_bad[:3]]
                _look_for_more_blocks(path, decoded, delim, num, i + 1, stats, whole)
                return
            continue
        if run_bad:
            stats.setdefault("bad_rows", []).extend(j for j, _ in run_bad)
            run_bad = []
        if len(vals) != ncols:
            stats["ragged"] = stats.get("ragged", 0) + 1
            stats.setdefault("ragged_lines", []).append(i + 1)
            if len(vals) < ncols:
                vals = vals + [math.nan] * (ncols - len(vals))
            else:
                vals = vals[:ncols]
        stats["last_line"] = i
        yield i, vals
    if run_bad:
        stats["footer_start"] = run_bad[0][0]
        stats["footer_sample"] = [t for _, t in run_bad[:3]]


_FAST_LINE = re.compile(r"^\s*$|^\s*[-+]?(\d|[.,]\d|nan|inf)", re.I)


def _fast_block(path: Path, decoded: Decoded, delim: str, decimal: str, start: int, ncols: int,
                whole: list[str] | None = None, text: str | None = None
                ) -> tuple[np.ndarray, int, int | None, array.array] | None:
    """Parse the clean leading part of a data block with numpy's C parser.

    Returns (rows, index of the last row line, index of the first line not consumed or None
    at end of file, the line index of every row), or None when the block is not clean enough
    (ragged rows, thousands separators, mixed decimals, stray text…), in which case the
    tolerant row-by-row parser reads it instead. Both give the same numbers for a clean block
    (tests/test_fuzz_reader.py checks this).

    text : ``"\\n".join(whole[start:])``, when the caller has it.
    """
    state = {"last": start, "stop": None}
    comma_decimal = decimal == "," and delim != "comma"
    at = array.array("I")  # 0-based line index of every row

    def lines() -> Iterator[str]:
        for i, line in _lines_from(path, decoded, start, None):
            # with a decimal comma, '1.234' is a thousands separator: the slow parser reads it
            if not _FAST_LINE.match(line) or (comma_decimal and "." in line):
                state["stop"] = i
                return
            if line.strip():
                state["last"] = i
                at.append(i)
            yield line.replace(",", ".") if comma_decimal else line

    rows: Iterable[str] = (lines() if whole is None
                           else _clean_lines(whole, start, comma_decimal, state, at, text))
    import warnings as pywarnings

    try:
        with pywarnings.catch_warnings():
            pywarnings.simplefilter("ignore")  # "input contained no data": the slow path decides
            arr = np.loadtxt(rows, delimiter=DELIMITERS[delim], dtype=np.float64, ndmin=2,
                             comments=None, quotechar='"', encoding=None)
    except (ValueError, IndexError):
        return None
    if arr.shape[0] < 1 or arr.shape[1] != ncols or arr.shape[0] != len(at):
        return None
    return arr, state["last"], state["stop"], at


def _digit_led_lines(text: str) -> int:
    """How many leading lines of ``text`` start with an ASCII digit (so match ``_FAST_LINE``
    and are not blank), found with numpy on the bytes: a UTF-8 byte 0x30-0x39 is always
    the character itself, never part of a multi-byte character."""
    try:
        b = np.frombuffer(text.encode("utf-8"), dtype=np.uint8)
    except UnicodeError:
        return 0
    if b.size == 0:
        return 0
    if not 48 <= int(b[0]) <= 57:
        return 0
    zero = np.uint8(48)  # '0'; uint8 arithmetic wraps the bytes below it to 208 and more
    newline = b[:-1] == 10  # newlines followed by a character (a trailing one starts no line)
    bad = newline & (b[1:] - zero >= 10)  # ... by a line that does not start with a digit
    if bad.any():
        # the first such line's index: the newlines up to and including the one before it
        return int(np.count_nonzero(newline[:int(bad.argmax())])) + 1
    # every line starts with a digit but a last, empty one after a trailing newline
    return int(np.count_nonzero(newline)) + 1


def _clean_lines(whole: list[str], start: int, comma_decimal: bool, state: dict[str, Any],
                 at: array.array, text: str | None = None) -> list[str]:
    """What ``_fast_block``'s line generator yields, for a file held as a list of lines, with
    ``state`` and ``at`` filled the same way: the lines from ``start`` up to the first that is
    not clean. The leading lines that start with a digit are found at once; the line-by-line
    test then goes on from the first line that does not (``text``: the lines from ``start``
    joined with newlines, when the caller has them)."""
    part = whole[start:]
    if text is None:
        text = "\n".join(part)
    k = _digit_led_lines(text)
    n = k
    for line in islice(part, k, None):
        if not _FAST_LINE.match(line):
            break
        n += 1
    if comma_decimal:
        # with a decimal comma, '1.234' is a thousands separator: stop at the first '.'
        dot = text.find(".")
        if dot >= 0:
            n = min(n, text.count("\n", 0, dot))
    if n < len(part):
        state["stop"] = start + n
    m = min(k, n)
    at.frombytes(np.arange(start, start + m, dtype=f"u{at.itemsize}").tobytes())
    at.extend(i for i, line in enumerate(islice(part, m, n), start=start + m) if line.strip())
    if at:
        state["last"] = at[-1]
    if n < len(part):
        del part[n:]
        text = None
    if comma_decimal and part:
        # replaced in the text at once: its lines are the lines joined with newlines
        if text is None:
            text = "\n".join(part)
        return text.replace(",", ".").split("\n")
    return part


def _look_for_more_blocks(path: Path, decoded: Decoded, delim: str, num: _Num, start: int,
                          stats: dict[str, Any], whole: list[str] | None = None) -> None:
    """After the footer: note where another run of ≥ 3 data rows starts, if any."""
    run = 0
    first = None
    for i, line in _lines_from(path, decoded, start, whole):
        if not line.strip():
            continue
        if _is_data(_split(line, delim), num):
            first = i if run == 0 else first
            run += 1
            stats.setdefault("stray_rows", []).append(i)
            if run >= 3:
                stats["later_block"] = first
                return
        else:
            run = 0


#: The noise floor of a curve read off a graph, as a share of its peak: about the accuracy
#: with which a point is read off a plotted curve by hand or with a digitiser (common
#: practice, not a standard value). [-]
DIGITISED_FLOOR = 0.01
#: Said with every digitised curve.
DIGITISED_WARNING = ("DIGITISED curve (--digitised): points read off a graph, not a "
                     "measurement of the lamp. The shape is the graph's as read; its floor, "
                     "line widths and weak bands are not known, so values under "
                     f"{DIGITISED_FLOOR:.0%} of the peak are taken as below detection; treat "
                     "every figure as indicative only")


def _digitised_noise(noise: Any, values: np.ndarray) -> Any:
    """The noise estimate of a digitised curve: at least :data:`DIGITISED_FLOOR` of its
    peak (a graph is read to about that; its own ripple says nothing of the lamp)."""
    peak = float(np.max(np.abs(values))) if values.size else 0.0
    floor = DIGITISED_FLOOR * peak
    if not floor > 0 or (noise.sigma is not None and noise.sigma >= floor):
        return noise
    return replace(noise, sigma=floor, method="digitised-graph floor", floor=floor,
                   floor_fraction=DIGITISED_FLOOR,
                   basis=f"a curve read off a graph: {DIGITISED_FLOOR:.0%} of its peak, about "
                         "the accuracy of reading a plotted curve (common practice)")


#: A wavelength correction larger than this is refused (our own bound: a calibration error of
#: an instrument that still works is a few nanometres; more is a wrong unit or a wrong file). [nm]
MAX_WAVELENGTH_CORRECTION_NM = 20.0


def wavelength_correction_nm(text: str) -> float:
    """A ``--wavelength-correction`` text ("-2.2 nm") in nm, checked.

    >>> wavelength_correction_nm("-2.2 nm"), wavelength_correction_nm("0.5nm")
    (-2.2, 0.5)
    """
    q = parse_quantity(text, "length", "--wavelength-correction")
    nm = round(q.value_si * 1e9, 9)
    if not abs(nm) <= MAX_WAVELENGTH_CORRECTION_NM:
        raise UnitError(f"a wavelength correction of {nm:g} nm is more than a calibration error "
                        f"(at most ±{MAX_WAVELENGTH_CORRECTION_NM:g} nm)", "--wavelength-correction",
                        "check the wavelength unit (--wavelength-unit) or the file")
    return nm


def read_spectrum(path: str | Path, options: ReadOptions | None = None, **overrides: Any
                  ) -> tuple[Spectrum, ImportReport]:
    """Read a spectrum from a text export, inferring the format and reporting every guess.

    path : the file.
    options : :class:`ReadOptions` (or give the same fields as keyword arguments).

    Returns the :class:`Spectrum` (in SI spectral units, or relative) and the
    :class:`ImportReport`. Raises :class:`InputFormatError` for unreadable input.
    """
    opts = options or ReadOptions(**overrides)
    p = Path(path)
    where = str(p)
    if not p.exists():
        raise InputFormatError("file not found", where, "check the path")
    if p.is_dir():
        raise InputFormatError("this is a folder, not a file", where)
    head_bytes = _read_head(p)
    if is_tm2714(head_bytes):
        return _read_tm2714(p, opts)
    if head_bytes[:4] in (workbook.ZIP_MAGIC, workbook.OLE2_MAGIC[:4]):
        k = workbook.kind(head_bytes, p)
        if k in ("xlsx", "ods"):
            return _read_workbook(p, opts, k)
        if k is not None:
            raise workbook.refusal(k, where)
    decoded = sniff_encoding(head_bytes, opts.encoding, where)
    base = [decoded.guess] if decoded.guess else []
    # a file shorter than the head is held whole: decoded once, hashed from the same bytes
    raw = head_bytes if len(head_bytes) < HEAD_BYTES else None
    try:
        return _read(p, decoded, opts, list(base), raw)
    except UnicodeError as exc:  # iter_lines converts these; kept as a safety net
        if opts.encoding or decoded.encoding != "utf-8":
            raise InputFormatError(f"the file is not valid {decoded.encoding} text ({exc})",
                                   where, "give the encoding with --encoding (e.g. latin-1)"
                                   ) from None
    except InputFormatError as exc:
        if (opts.encoding or decoded.encoding != "utf-8"
                or not exc.what.startswith("the file is not valid ")):
            raise
    warnings = ["the file mixes encodings (valid UTF-8 at the start, other bytes later); "
                "read as Latin-1 / Windows-1252: check µ, ² and ° in the units"]
    return _read(p, Decoded("cp1252", "mixed: fell back to Latin-1 / Windows-1252", False),
                 opts, warnings, raw)


def _read_tm2714(p: Path, opts: ReadOptions) -> tuple[Spectrum, ImportReport]:
    """An IES TM-27-14 file (:mod:`uvcheck.io.tm2714`): its spectrum read as the table that
    module makes of it, with every check of a text export; the report and the spectrum name
    the XML file's own sha256."""
    table, note = as_table(p, opts.unit)
    decoded = Decoded("utf-8", "IES TM-27-14 XML, parsed with colour-science", False)
    spec, report = _read(p, decoded, opts, [note], table)
    sha = file_sha256(p)
    report = replace(report, sha256=sha)
    return spec.derive(meta=MappingProxyType({**dict(spec.meta), "sha256": sha,
                                              "format": "IES TM-27-14"})), report


def _read_workbook(p: Path, opts: ReadOptions, k: str) -> tuple[Spectrum, ImportReport]:
    """An .xlsx or .ods workbook (:mod:`uvcheck.io.workbook`): its sheets read as the table
    that module makes of them, with every check of a text export; the report and the
    spectrum name the workbook's own sha256."""
    t = workbook.as_table(p, k)
    decoded = Decoded("utf-8", f"{t.format}, cells read with Python's zipfile and XML parser",
                      False)
    try:
        spec, report = _read(p, decoded, opts, [t.warning], t.text)
    except InputFormatError as exc:
        # its line numbers (and --data-start) count the table: say where each sheet is in it
        raise InputFormatError(f"{exc.what.rstrip('.')} (in the table made of the workbook: "
                               f"{t.placed})", exc.where, exc.todo) from None
    sha = file_sha256(p)
    # the metadata's sheet is the one the data were read from (the header lines above the
    # data may hold the 'sheet:' line of an earlier sheet first)
    meta = {k: v for k, v in report.metadata.items() if k.lower() != "sheet"}
    report = replace(report, sha256=sha,
                     metadata={"sheet": t.sheet_at(report.data_lines[0]) or "?", **meta})
    return spec.derive(meta=MappingProxyType({**dict(spec.meta), "sha256": sha,
                                              "format": t.format})), report


def _read_head(p: Path) -> bytes:
    """The first :data:`HEAD_BYTES` bytes of the file (all of it when it is shorter), as
    ``read(HEAD_BYTES)`` gives them; the buffer asked for is sized to the file (a buffer of
    the full head costs more than reading a small file), and a file that grew since its
    size was taken is read on."""
    with open(p, "rb") as fh:
        try:
            want = min(HEAD_BYTES, os.fstat(fh.fileno()).st_size + 1)
        except OSError:
            want = HEAD_BYTES
        head = fh.read(want)
        if len(head) == want < HEAD_BYTES:
            head += fh.read(HEAD_BYTES - want)
    return head


def _read(p: Path, decoded: Decoded, opts: ReadOptions, warnings: list[str],
          raw: bytes | None = None) -> tuple[Spectrum, ImportReport]:
    # Every number is checked (finite, in range) before it is used, so floating-point overflow
    # while analysing the columns of an absurd file (values near 1e308) must not reach the
    # user's terminal as numpy RuntimeWarnings.
    with np.errstate(all="ignore"):
        return _read_file(p, decoded, opts, warnings, raw)


def _read_file(p: Path, decoded: Decoded, opts: ReadOptions, warnings: list[str],
               raw: bytes | None = None) -> tuple[Spectrum, ImportReport]:
    """raw : the whole file's bytes when it was read whole (then it is not read again)."""
    where = str(p)
    n_head = HEAD_LINES if not opts.data_start else max(HEAD_LINES, opts.data_start + 200)
    whole = None if raw is None else decode_lines(raw, decoded)
    head = whole[:n_head] if whole is not None else list(islice(iter_lines(p, decoded), n_head))
    if not any(line.strip() for line in head):
        raise InputFormatError("the file is empty (no text)", where, "export the spectrum again")
    if opts.data_start is not None:
        if opts.data_start < 1:
            raise InputFormatError(f"--data-start {opts.data_start} is not a line number", where,
                                   "lines are numbered from 1")
        if opts.data_start > len(head):
            raise InputFormatError(f"--data-start {opts.data_start} is past the end of the file "
                                   f"({len(head)} lines)", where)
    # Decide the format on a sample: everything up to the first line that starts like a
    # number, plus 60 lines (the rest of the file is streamed with that format).
    first_num = next((k for k, ln in enumerate(head) if _STARTS_NUMERIC.match(ln)), 0)
    if opts.data_start:
        first_num = max(first_num, opts.data_start - 1)
    sample = head[:first_num + 60]
    delim, decimal, blocks = _choose_format(sample, opts, where)
    # thousands separators: a number only a thousands separator explains ('1.002.000') decides
    # the decimal mark when no number uses the mark as a decimal; '10.000' among plain
    # integers is ambiguous and is flagged below
    big0 = _big_blocks(blocks)
    scan = (big0[opts.block - 1] if opts.block and 1 <= opts.block <= len(big0)
            else max(blocks, key=lambda b: b.end - b.start))  # the block read below
    start0 = scan.start
    # a file held whole within the head: the lines from the block on, joined once for the
    # separator scan and the fast parser (both take "\n".join(head[start0:]) then)
    body = ("\n".join(whole[start0:]) if whole is not None and len(whole) == len(head)
            and len(whole) <= start0 + SEPARATOR_SCAN_LINES else None)
    # (a decimal mark given with --decimal is never switched, nor flagged as ambiguous)
    sep_cols = (_separator_evidence(head, start0, delim, decimal, scan.ncols, body)
                if opts.decimal is None else [])
    other_mark = "," if decimal == "." else "."
    switch = (opts.decimal is None and any(c.thousands for c in sep_cols)
              and not any(c.other for c in sep_cols)
              and not (delim == "comma" and other_mark == ","))
    if switch:
        ev = next(c.thousands_example for c in sep_cols if c.thousands_example)
        opts_sw = replace(opts, decimal=other_mark)
        try:
            delim_sw, decimal_sw, blocks_sw = _choose_format(sample, opts_sw, where)
        except InputFormatError:
            switch = False
        else:
            warnings.append(f"'{decimal}' is a thousands separator in this file ({ev[1]!r} on "
                            f"line {ev[0] + 1}), so '{other_mark}' is taken as the decimal "
                            f"mark; if that is wrong give --decimal '{decimal}'")
            delim, decimal, blocks = delim_sw, decimal_sw, blocks_sw
    if not switch:
        _flag_ambiguous_separators(sep_cols, head, start0, delim, decimal, opts, warnings)
    big = _big_blocks(blocks)
    if opts.block and opts.block > len(big) and len(head) > len(sample):
        # the format was chosen on a sample: count the blocks of the whole head, where the
        # error below (and the streamed check for a later block) finds them
        blocks = _blocks(head, delim, decimal)[0]
        big = _big_blocks(blocks)
    if opts.block:
        if not 1 <= opts.block <= len(big):
            raise InputFormatError(f"there is no data block {opts.block}; the file has {len(big)}",
                                   where)
        block = big[opts.block - 1]
    elif len(big) > 1:
        raise InputFormatError(f"the file holds {len(big)} data blocks ({_listing(big, head)})",
                               where, "choose one with --block N")
    else:
        block = max(blocks, key=lambda b: b.end - b.start)
    ncols = block.ncols
    num = _Num(decimal)
    # ---- header and units row -------------------------------------------------------
    header_line = units_line = None
    names = [f"column {k + 1}" for k in range(ncols)]
    col_units: list[str | None] = [None] * ncols
    j = block.start - 1
    above: list[int] = []
    noted: list[int] = []  # data rows with a note beside them, between the header and the data
    first_above = True
    while j >= 0 and len(above) < 2:
        s = head[j].strip()
        if s and not above and _numbers_then_note(_split(s, delim), ncols, num.decimal):
            noted.append(j)
            j -= 1
            continue
        if s and not _COMMENT.match(s):
            above.append(j)
        elif s and first_above:
            # a commented header ("# wavelength, irradiance") right above the data
            body = _COMMENT.sub("", s, count=1)
            if len(_split(body, delim)) == ncols:
                above.append(j)
        elif s and above:
            break  # a comment line ends the header block
        if s:
            first_above = False
        j -= 1

    def cells(k: int) -> list[str]:
        s = head[k]
        if _COMMENT.match(s):
            s = _COMMENT.sub("", s, count=1)
        toks = _split(s, delim)
        if len(toks) != ncols and delim != "space":
            alt = s.split()
            if len(alt) == ncols:
                toks = alt
        return toks

    if above:
        t0 = cells(above[0])
        if len(t0) in (ncols, ncols + 1) and not _is_data(t0, num):
            if _looks_like_unit_row(t0) and len(above) > 1 and len(cells(above[1])) in (ncols, ncols + 1):
                units_line = above[0]
                header_line = above[1]
                for k, t in enumerate(t0[:ncols]):
                    col_units[k] = t or None
            else:
                header_line = above[0]
            hdr = cells(header_line)[:ncols]
            names = [h if h else f"column {k + 1}" for k, h in enumerate(hdr)] + names[len(hdr):]
    for k in sorted(noted):
        note = next(t.strip() for t in _split(head[k], delim)[ncols:] if t.strip())
        warnings.append(f"line {k + 1} holds a data row with a note beside it ({note[:60]!r}), "
                        "so it was not read as data: move the note to a line of its own to "
                        "include that row")
    hint = ""
    if above and header_line is None and delim == "comma":
        t0 = cells(above[0])
        if 2 <= len(t0) < ncols and not _is_data(t0, num):
            hint = (f"; the header (line {above[0] + 1}) names only {len(t0)}: decimal commas "
                    "in a comma-separated file? Those need ';' or tab as the delimiter")
    meta_end = header_line if header_line is not None else block.start
    meta, _other = _metadata((k, head[k]) for k in range(0, meta_end))
    # ---- stream the data ------------------------------------------------------------
    stats: dict[str, Any] = {"bad_rows": list(block.bad)}
    cols = [array.array("d") for _ in range(ncols)]
    first_lines: list[int] = []
    n_rows = 0
    row_lines = array.array("I")  # 0-based line index of every data row, for error places
    resume_at = block.start
    fast = (_fast_block(p, decoded, delim, decimal, block.start, ncols, whole,
                        body if block.start == start0 else None)
            if not block.bad else None)
    if fast is not None:
        arr, last_fast, stop, row_lines = fast
        for k in range(ncols):
            cols[k].frombytes(np.ascontiguousarray(arr[:, k]).tobytes())
        n_rows = arr.shape[0]
        stats["last_line"] = last_fast
        resume_at = stop
        del arr
    if resume_at is not None:
        for i, vals in _stream_rows(p, decoded, delim, num, resume_at, ncols, stats, whole):
            for c, v in zip(cols, vals):
                c.append(v)
            row_lines.append(i)
            if n_rows < 3:
                first_lines.append(i)
            n_rows += 1
    last_line = stats.get("last_line", block.end)
    if stats.get("later_block") is not None and not opts.block:
        lb = stats["later_block"] + 1
        in_head = _big_blocks(_blocks(head, delim, decimal)[0])
        if len(in_head) > 1 and any(b.start == lb - 1 for b in in_head):
            # the later block lies within the head: the blocks are listed, and numbered, as
            # --block counts them
            raise InputFormatError(f"the file holds {len(in_head)} data blocks "
                                   f"({_listing(in_head, head)})", where,
                                   "choose one with --block N")
        raise InputFormatError(
            f"the file holds several data blocks (lines {block.start + 1}–{last_line + 1}, and "
            f"another from line {lb})", where,
            f"read the first with --block 1, or the later one with --data-start {lb}")
    footer_start = stats.get("footer_start")
    if footer_start is not None:
        fmeta, _ = _metadata([(0, t) for t in stats.get("footer_sample", [])])
        for k, v in fmeta.items():
            meta.setdefault(f"footer/{k}", v)
        sample = stats.get("footer_sample", [""])[0]
        if re.match(r"^\s*[-+]?\d", sample):
            warnings.append(f"line {footer_start + 1} looks like a truncated or damaged data row "
                            f"({sample[:40]!r}); it was not used")
    if stats.get("stray_rows"):
        sr = stats["stray_rows"]
        warnings.append(f"{len(sr)} row(s) of numbers after the end of the data not used "
                        f"(line(s) {', '.join(str(j + 1) for j in sr[:3])})")
    if stats.get("bad_rows"):
        bl = sorted(set(stats["bad_rows"]))
        warnings.append(f"{len(bl)} unreadable line(s) inside the data skipped: line(s) "
                        + ", ".join(str(b + 1) for b in bl[:5]) + (" …" if len(bl) > 5 else ""))
    if stats.get("ragged"):
        rl = stats["ragged_lines"]
        warnings.append(f"{stats['ragged']} row(s) with a different number of fields "
                        f"(line(s) {', '.join(map(str, rl[:5]))}{' …' if len(rl) > 5 else ''}); "
                        "missing fields count as missing values")
    if num.mixed and num.mixed >= n_rows * ncols and not num.thousands_seen:
        # every number used the other mark ("240,5" in quotes in a comma-separated file):
        # that mark is the file's, and nothing was mixed
        decimal = "," if decimal == "." else "."
    elif num.mixed:
        warnings.append(f"mixed decimal separators: {num.mixed} number(s) used the other decimal "
                        f"mark than the file's '{decimal}'; they were read as decimals")
    thousands = None
    if num.thousands_seen:
        thousands = "," if decimal == "." else "."
        warnings.append(f"{num.thousands_seen} number(s) with thousands separators "
                        f"('{thousands}') were read")
    if n_rows < 2:
        raise InputFormatError(f"only {n_rows} data row found", f"{where} line {block.start + 1}",
                               "a spectrum needs at least two rows of wavelength and value")
    data = [np.frombuffer(c, dtype=np.float64) for c in cols]
    line_no = np.frombuffer(row_lines, dtype=np.dtype(f"u{row_lines.itemsize}"))
    # ---- choose columns -------------------------------------------------------------
    wl_idx, val_idx, idx_note = _pick_columns(names, data, opts, where, block.start, hint,
                                              col_units)
    if idx_note:
        warnings.append(idx_note)
    wl_raw = data[wl_idx]
    v_raw = data[val_idx]
    # ---- wavelength unit ------------------------------------------------------------
    wl_unit_text = opts.wavelength_unit
    wl_how = "given with --wavelength-unit"
    if wl_unit_text is None:
        hdr_unit = col_units[wl_idx] or _unit_from_header(names[wl_idx])
        if _RAMAN.search(names[wl_idx]):
            raise InputFormatError(f"column {names[wl_idx]!r} is a Raman shift, not a wavelength",
                                   f"{where} line {(header_line or 0) + 1}",
                                   "export the spectrum against wavelength")
        cand = None
        if hdr_unit:
            try:
                parse_wavelength_unit(hdr_unit)
                cand = hdr_unit
            except UnitError:
                cand = None
        if cand is None and _WAVENUMBER.search(names[wl_idx]):
            cand = "cm-1"
        if cand is None:
            found = _meta_lookup(meta, r"(x|wave\s*length|wl|abscissa)[\s_]*unit")
            if found:
                try:
                    parse_wavelength_unit(found[1])
                    cand = found[1]
                    wl_how = f"from metadata {found[0]!r}"
                except UnitError:
                    pass
        if cand is not None:
            wl_unit_text = cand
            if wl_how == "given with --wavelength-unit":
                wl_how = "from the header" if units_line is None else "from the units row"
    col_place = f"{where} line {block.start + 1}, column {wl_idx + 1}"
    if wl_unit_text is not None and wl_how in ("from the header", "from the units row"):
        hl = units_line if units_line is not None else header_line
        if hl is not None:
            col_place = f"{where} line {hl + 1}, column {wl_idx + 1}"

    def row_place(k: int, col: int = wl_idx) -> str:
        return f"{where} line {int(line_no[k]) + 1}, column {col + 1}"

    wl_nm, wl_label, wl_how = _to_nm(wl_raw, wl_unit_text, wl_how, where, warnings,
                                     col_place, row_place)
    if opts.wavelength_correction is not None:
        corr = wavelength_correction_nm(opts.wavelength_correction)
        wl_nm = wl_nm + corr
        warnings.append(f"every wavelength corrected by {corr:+g} nm (--wavelength-correction): "
                        "the report and every figure use the corrected scale")
    # ---- value unit -----------------------------------------------------------------
    unit_text = opts.unit
    unit_how = "given with --unit"
    if unit_text is None:
        cands = []
        if col_units[val_idx]:
            cands.append((col_units[val_idx], "from the units row"))
        hu = _unit_from_header(names[val_idx])
        if hu:
            cands.append((hu, "from the header"))
        if names[val_idx] != hu and "_" in names[val_idx]:
            cands.append((names[val_idx], "from the column name"))
        found = _meta_lookup(meta, r"^(y|data|value|irradiance|intensity|radiance|spectral)?[\s_]*units?$",
                             r"(irradiance|radiance|intensity|y|data)[\s_]*units?")
        if found:
            cands.append((found[1], f"from metadata {found[0]!r}"))
        unusable: list[str] = []
        for text, how in cands:
            try:
                parse_spectral_unit(text)
                unit_text, unit_how = text, how
                break
            except UnitError as exc:
                if how != "from the header" or (header_line is not None
                                                and text.strip() != names[val_idx].strip()):
                    unusable.append(f"{text!r} {how}: {exc.what}")
                continue
        if unit_text is not None:
            conflict = _unit_conflict(unit_text, unit_how, cands)
            if conflict:
                warnings.append(conflict)
    if unit_text is None:
        su = parse_spectral_unit("relative")
        unit_label = "relative"
        unit_how = "no recognisable unit in the header, units row or metadata: treated as relative"
        found_text = (f"no usable unit for the values ({unusable[0]})" if unusable
                      else "no unit found for the values")
        warnings.append(f"{found_text}: the spectrum is treated as RELATIVE "
                        "(shape only); give --unit, or scale it (--scale-band / --scale-lux)")
    else:
        try:
            su = parse_spectral_unit(unit_text, f"{where} unit")
        except UnitError as exc:
            raise InputFormatError(exc.what, where, exc.todo) from None
        unit_label = unit_text
        if su.note:
            warnings.append(su.note)
    dq = _meta_lookup(meta, r"^(data\s*type|quantity|measurement\s*type|mode|type)$")
    if dq and su.quantity == "relative" and re.search(r"(?i)irradiance|radiance", dq[1]) and unit_text is None:
        warnings.append(f"metadata says {dq[0]} = {dq[1]!r} but no unit was found: values kept relative")
    # ---- clean ----------------------------------------------------------------------
    values = v_raw * su.factor
    if su.photon:
        from uvcheck.constants import AVOGADRO_PER_MOL, PLANCK_J_S, SPEED_OF_LIGHT_M_S

        per_photon = PLANCK_J_S * SPEED_OF_LIGHT_M_S / (wl_nm * 1e-9)
        n_factor = AVOGADRO_PER_MOL if re.search(r"mol", unit_text or "") else 1.0
        values = values * n_factor * per_photon
        warnings.append("photon units converted to W with E = hc/λ per sample")
    if su.per_wavenumber:
        # per cm⁻¹ -> per nm: ν̃ = 10⁷/λ, so |dν̃/dλ| = 10⁷/λ² (λ in nm, ν̃ in cm⁻¹)
        values = values * (1e7 / (wl_nm * wl_nm))
        warnings.append("values per wavenumber (per cm⁻¹) converted to per nm with "
                        "E_λ = E_ν̃ · 10⁷/λ² per sample")
    finite = np.isfinite(wl_nm) & np.isfinite(values)
    n_drop = int((~finite).sum())
    last_k = int(line_no[-1]) if line_no.size else 0
    if (n_drop == 1 and not finite[-1] and stats.get("footer_start") is None
            and delim != "space" and last_k < len(head)
            and head[last_k].rstrip().endswith(DELIMITERS[delim])):
        # only the last row lacks a value, and nothing follows it: an export that stopped
        # early ("800.5," and no line end) more likely than a value not resolved
        warnings.append(f"line {int(line_no[-1]) + 1} looks like a truncated or damaged data "
                        "row (the last of the file, with a value missing); it was not used")
        wl_nm, values, line_no = wl_nm[finite], values[finite], line_no[finite]
    elif n_drop:
        bad_at = np.nonzero(~finite)[0][:3]
        warnings.append(f"{n_drop} row(s) with NaN, inf or missing values dropped "
                        f"(line(s) {', '.join(str(int(line_no[b]) + 1) for b in bad_at)}"
                        f"{' …' if n_drop > 3 else ''})"
                        + (f"; {num.below_limit} cell(s) are marked below a detection limit "
                           f"(e.g. {num.below_example!r}): the instrument did not resolve "
                           "them, so those wavelengths count as not measured, not as zero "
                           "emission" if num.below_limit else ""))
        wl_nm, values, line_no = wl_nm[finite], values[finite], line_no[finite]
    if wl_nm.size < 2:
        raise InputFormatError("fewer than two rows with finite wavelength and value",
                               f"{where} column {val_idx + 1}",
                               "check the value column (--column) and the number format")
    if (wl_nm <= 0).any():
        k = int(np.nonzero(wl_nm <= 0)[0][0])
        raise InputFormatError(f"wavelength {wl_nm[k]:g} nm is zero or negative", row_place(k),
                               "the wavelength column must hold wavelengths; "
                               "choose it with --wavelength-column")
    if (wl_nm > 1e5).any():
        k = int(np.nonzero(wl_nm > 1e5)[0][0])
        raise InputFormatError(f"wavelength {wl_nm[k]:g} nm is not optical radiation "
                               f"(read as {wl_label}, {wl_how})", row_place(k),
                               "wrong wavelength unit? give --wavelength-unit (nm, um, m, cm-1)")
    peak_abs = float(np.abs(values).max())
    if peak_abs > MAX_ABS_VALUE:
        k = int(np.nonzero(np.abs(values) > MAX_ABS_VALUE)[0][0])
        raw = v_raw[np.nonzero(finite)[0][k]]
        raise InputFormatError(f"value {raw:g} is too large to be a measurement (limit "
                               f"{MAX_ABS_VALUE:g} {_spectral_unit_text(su)})",
                               row_place(k, val_idx),
                               "the row is corrupt or the column is not a spectrum; repair the file")
    if su.quantity == "irradiance" and peak_abs > IMPLAUSIBLE_W_M2_NM:
        warnings.append(f"values up to {peak_abs:.3g} W/m2/nm (read as "
                        f"{unit_label}): no lamp gives that at a measurement distance (full "
                        f"sunlight peaks near 2 W/m2/nm); check which is right: the unit "
                        f"(--unit) or the scale of the file")
    # a flat top, in the file's order and as written (before sorting and averaging)
    flat = _flat_top(v_raw[finite] if n_drop else v_raw, wl_nm, su.quantity, unit_label)
    d = wl_nm[1:] - wl_nm[:-1]  # numpy.diff, without its wrapper
    if (d > 0).all():
        order = "ascending"
    elif (d < 0).all():
        order = "descending (reversed)"
    else:
        order = "unsorted (sorted)"
        warnings.append("wavelengths were not in order; rows sorted")
    n_dup = 0
    if order != "ascending":  # (strictly ascending: already sorted, no duplicates)
        idx = np.argsort(wl_nm, kind="stable")
        wl_nm, values = wl_nm[idx], values[idx]
        uniq, inv, counts = np.unique(wl_nm, return_inverse=True, return_counts=True)
        n_dup = int((counts > 1).sum())
    if n_dup:
        raw_sorted = values
        values = np.bincount(inv, weights=values) / counts
        wl_nm = uniq
        text = f"{n_dup} duplicated wavelength(s): their values were averaged"
        spread = _duplicate_spread(raw_sorted, inv, values, uniq)
        if spread is not None:
            text += spread
        warnings.append(text)
    if wl_nm.size < 2:
        raise InputFormatError(f"all rows have the same wavelength ({wl_nm[0]:g} nm)",
                               f"{where} lines {int(line_no.min()) + 1}–{int(line_no.max()) + 1}, "
                               f"column {wl_idx + 1}",
                               "the wavelength column must hold wavelengths; "
                               "choose it with --wavelength-column")
    if not values.any():
        warnings.append("all values are zero: was the lamp off, or is this the wrong column? "
                        "(--column)")
    steps = d if order == "ascending" else np.diff(wl_nm)  # (wl_nm unchanged since d)
    gaps = _gaps(wl_nm, steps)
    if gaps:
        warnings.append("gaps in the data (not bridged): " + ", ".join(f"{a:g}–{b:g} nm" for a, b in gaps[:4]))
    spikes = _isolated_spikes(values)
    if spikes:
        warnings.append("isolated spike(s) far above their neighbours at "
                        + ", ".join(f"{wl_nm[k]:g} nm" for k in spikes[:3])
                        + ": a corrupt row or a cosmic-ray hit? check the file")
    clipped = _clipped_at_zero(values)
    if clipped:
        warnings.append(clipped)
    sat = _saturation(values) if su.quantity == "relative" else None
    if sat or flat:
        warnings.append(sat or flat)
    noise = estimate_noise(values)
    if opts.digitised:
        noise = _digitised_noise(noise, values)
        warnings.append(DIGITISED_WARNING)
    elif noise.method == "dynamic-range floor":
        warnings.append(f"the data show almost no noise (estimate {noise.data_sigma:.3g} "
                        f"{_spectral_unit_text(su)}): synthetic, modelled or smoothed data? The "
                        f"noise floor is set to {noise.floor_fraction:g} of the peak (a "
                        "dynamic-range floor, common practice: no spectrometer resolves less), "
                        "so values under it are reported as below detection")
    if not (sat or flat):
        plateau = _noisy_plateau(values, wl_nm, noise.sigma, unit_label)
        if plateau:
            warnings.append(plateau)
    baseline = baseline_warning(values, noise.sigma, su.quantity)
    if baseline:
        warnings.append(baseline)
    if su.quantity != "relative":
        normalised = _normalised_peak(v_raw)
        if normalised is not None:
            warnings.append(
                f"the values peak at {normalised:g} ({unit_label}): a spectrum "
                f"normalised to a peak of {normalised:g} but labelled with an absolute unit? If "
                "so, every hazard and dose figure is meaningless: read it as relative "
                "(--unit relative) and scale it with a reading")
    # ---- metadata of interest ---------------------------------------------------------
    dist = None
    found = _distance_entry(meta)
    if found:
        dist = _read_distance(found[0], found[1], meta)
        if dist is None:
            warnings.append(f"metadata {found[0]} = {found[1]!r} could not be read as a distance")
        else:
            conflict = _distance_conflict(meta, found, dist)
            if conflict:
                warnings.append(conflict)
    scaled_by = _meta_lookup(meta, r"^scal(?:ing|ed)(?:\s+by)?$")
    if scaled_by:
        # uvcheck's own --export-spectrum writes "scaling: band reading (…)" for a spectrum it
        # scaled; any export that says so is read the same way
        warnings.append(f"the file says its values were scaled ({scaled_by[0]}: "
                        f"{scaled_by[1]!r}): they are as good as that reading, not a calibrated "
                        "measurement of the spectrum")
    sha = file_sha256(p) if raw is None else hashlib.sha256(raw).hexdigest()
    step = {"median": median(steps), "min": float(steps.min()), "max": float(steps.max()),
            # numpy.allclose(steps, steps[0], rtol=1e-3, atol=1e-6) for finite steps, its
            # formula written out (allclose's checks cost more than the test itself)
            "uniform": bool(np.all(np.abs(steps - steps[0]) <= 1e-6 + 1e-3 * abs(steps[0])))}
    report = ImportReport(
        path=str(p), sha256=sha, encoding=decoded.encoding, encoding_how=decoded.how,
        delimiter=delim, decimal=decimal, thousands=thousands,
        header_line=None if header_line is None else header_line + 1,
        units_line=None if units_line is None else units_line + 1,
        data_lines=(block.start + 1, last_line + 1), columns=tuple(names),
        wavelength_column=names[wl_idx], wavelength_unit=wl_label, wavelength_unit_how=wl_how,
        value_column=names[val_idx], value_unit=unit_label, value_unit_how=unit_how,
        quantity=su.quantity, rows_read=n_rows, rows_used=int(wl_nm.size),
        rows_dropped_nonfinite=n_drop, duplicates_averaged=n_dup, sorted=order, step_nm=step,
        gaps_nm=tuple(gaps), noise=noise.to_dict(), metadata=dict(list(meta.items())[:60]),
        measurement_distance_m=dist, warnings=tuple(warnings))
    spec = Spectrum(wavelength_nm=wl_nm, values=values, quantity=su.quantity,
                    noise_floor=noise.sigma, gaps_nm=tuple(gaps),
                    meta={"source": str(p), "sha256": sha, "file_name": p.name,
                          "instrument": _instrument_notes(meta), "origin": "measured",
                          **({"digitised": True} if opts.digitised else {}),
                          "invented": _says_invented(head[:block.start])})
    return spec, report


_INVENTED_RE = re.compile(r"\b(invented|made[\s-]up|fictitious|synthetic (?:demo|test))\b", re.I)


def _says_invented(lines: list[str]) -> bool:
    """Whether the lines above the data say the file is invented (demo or test data): the
    note then carries the invented-demonstration banner whatever listing comes with it."""
    return any(_INVENTED_RE.search(ln) for ln in lines)


def _flag_ambiguous_separators(cols: list[_SepColumn], head: list[str], start: int, delim: str,
                               decimal: str, opts: ReadOptions, warnings: list[str]) -> None:
    """Warn, per column, when ``decimal`` may really be a thousands separator: every number
    holding it has exactly three digits after it and the column also holds plain integers
    ('10.000' next to '999'), or a number only a thousands separator explains ('1.002.000')
    could not decide the mark (the file also uses it as a decimal mark, or the delimiter is the
    other mark). Nothing is said when the user gave the decimal mark (--decimal)."""
    names = None
    other_mark = "," if decimal == "." else "."
    can_switch = not (delim == "comma" and other_mark == ",")
    todo = (f"if it separates thousands give --decimal '{other_mark}'" if can_switch else
            "a comma-separated file cannot use ',' as its decimal mark: re-export it without "
            "thousands separators")
    if opts.decimal:
        return  # the user chose the decimal mark
    for k, c in enumerate(cols):
        if names is None:
            hdr = [ln for ln in head[max(0, start - 3):start] if ln.strip()]
            toks = _split(hdr[-1], delim) if hdr else []
            names = toks if len(toks) == len(cols) else [f"column {j + 1}" for j in range(len(cols))]
        label = names[k] if names[k] else f"column {k + 1}"
        if c.three and not c.other and not c.thousands and c.ints:
            line, tok = c.example  # type: ignore[misc]
            warnings.append(
                f"column {label!r} (column {k + 1}): every number with a '{decimal}' has exactly "
                f"three digits after it ({tok!r} on line {line + 1}, {c.three} such number(s)) "
                f"and the column also holds {c.ints} plain integer(s): '{decimal}' may be a "
                f"thousands separator ({tok} = {tok.replace(decimal, '')}), not a decimal mark. "
                f"Read as a decimal mark; {todo}")
        elif c.thousands:
            line, tok = c.thousands_example  # type: ignore[misc]
            warnings.append(
                f"column {label!r} (column {k + 1}): {tok!r} on line {line + 1} uses '{decimal}' "
                f"as a thousands separator, but the file also uses '{decimal}' as its decimal "
                f"mark; such rows cannot be read: check the export")


#: Every baseline warning (:func:`baseline_warning`) names the dark measurement so.
BASELINE_MARK = "dark (background)"


class _Quantity:
    """What the baseline checks need of a spectral unit: its quantity."""

    def __init__(self, quantity: str):
        self.quantity = quantity


def baseline_warning(values: np.ndarray, sigma: float | None, quantity: str) -> str | None:
    """The reader's baseline check on values of a quantity (``irradiance``, ``relative``…):
    a spectrum below zero as a whole, or a baseline offset below or above zero, as a warning
    that names the :data:`BASELINE_MARK`; None when the baseline is sound."""
    su = _Quantity(quantity)
    return (_mostly_negative(values) or _negative_offset(values, sigma, su)
            or _positive_offset(values, sigma, su))


def _mostly_negative(values: np.ndarray) -> str | None:
    """A warning when the spectrum sits below zero as a whole, else None: more than half of
    the samples negative and the deepest dip well beyond the highest point
    (:func:`uvcheck.features.negative_dominated`; a sign-flipped or reversed dark
    subtraction, a dark taken with the lamp on, a wrong column). Dark-subtracted noise alone
    is negative in about half of the samples where the lamp emits nothing."""
    found = negative_dominated(values)
    if found is None:
        return None
    n_neg, n = found
    return (f"{n_neg} of {n} samples ({n_neg / n:.0%}) are negative: a lamp spectrum is mostly "
            "positive. Check the dark (background) subtraction (sign flipped, or the dark and "
            "the lamp spectrum swapped? a dark taken with the lamp on?), the value column "
            "(--column) and the unit; results from it are not meaningful until it is fixed")


def _unit_conflict(used: str, used_how: str, cands: list[tuple[str, str]]) -> str | None:
    """A warning when the file states the value unit in two places and they disagree (another
    quantity, photon or energy units, or another scale), else None. The first readable one in
    the reader's order (units row, header, column name, metadata) is used; the warning names
    both and which was used, as a difference of scale is a factor on every result."""
    a = parse_spectral_unit(used)
    for text, how in cands:
        if how == used_how or text.strip() == used.strip():
            continue
        try:
            b = parse_spectral_unit(text)
        except UnitError:
            continue
        if (a.quantity, a.photon) == (b.quantity, b.photon) and \
                math.isclose(a.factor, b.factor, rel_tol=1e-9):
            continue
        apart = ""
        if (a.quantity, a.photon) == (b.quantity, b.photon) and a.factor > 0 and b.factor > 0:
            apart = f", a factor {max(a.factor, b.factor) / min(a.factor, b.factor):.4g} apart"
        return (f"the value unit is stated twice and the two disagree: {used!r} {used_how} and "
                f"{text!r} {how}{apart}; {used!r} ({used_how.removeprefix('from ')}) was used. "
                "Check which is right, or give --unit")
    return None


#: A floor this many noise σ above zero, and this share of the peak, at both ends of the
#: data is reported as an offset (our own rule). [-]
OFFSET_SIGMAS = 10.0
OFFSET_PEAK_SHARE = 1e-3
#: Both ends' floors agree within this share of the floor (our own rule: a flat pedestal, not
#: a source that emits across the range). [-]
OFFSET_ENDS_AGREE = 0.2


def _positive_offset(values: np.ndarray, sigma: float | None, su: Any) -> str | None:
    """A warning when the whole spectrum sits on a flat positive level, else None: a dark
    (background) level not subtracted, or a stray-light pedestal, which adds the level times
    the range to every band and hazard integral. Our own rule: the medians of the first and of
    the last 5 % of the samples agree within :data:`OFFSET_ENDS_AGREE`, and both stand more
    than :data:`OFFSET_SIGMAS` noise σ and :data:`OFFSET_PEAK_SHARE` of the peak above zero.
    A source that emits across the whole range (a continuum) has unequal ends and is not
    flagged as a rule; at least 100 samples are needed."""
    n = int(values.size)
    if n < 100 or not sigma or not sigma > 0:
        return None
    k = max(5, n // 20)
    lo_end, hi_end = median(values[:k]), median(values[-k:])
    floor = min(lo_end, hi_end)
    top = float(np.max(values))
    if not (floor > OFFSET_SIGMAS * sigma and floor > OFFSET_PEAK_SHARE * top):
        return None
    if abs(lo_end - hi_end) > OFFSET_ENDS_AGREE * floor:
        return None
    unit = _spectral_unit_text(su)
    return (f"the spectrum sits on a flat level of about {floor:.3g} {unit} at both ends of the "
            f"data ({floor / sigma:.0f} σ of the noise, {floor / top:.2g} of the peak): a dark "
            "(background) level not subtracted, or a stray-light pedestal? Every band and "
            "hazard value then includes that level over its whole range, so the UV and IR "
            "values can be overstated; check the dark measurement")


def _negative_offset(values: np.ndarray, sigma: float | None, su: Any) -> str | None:
    """A warning when the whole baseline sits below zero, else None: a dark (background) level
    subtracted too large, which lowers every band and hazard integral by the offset times the
    range. Our own rule: more than half of the samples negative *and* their median below
    −½ σ, σ being the reader's noise estimate (:func:`uvcheck.features.estimate_noise`; with
    an offset −b it is the RMS of the negative samples, about √(b² + σ₀²), so the rule fires
    for b ≳ 0.6 σ₀). Zero-mean noise gives a median at or above about 0 (the lamp's samples
    are positive), off by some 1.25 σ/√n: with at least 100 samples (required) that is 0.125 σ
    or less, so −½ σ is 4 standard errors away (smoothing over L samples leaves about n/L
    independent ones and halves that margin at L = 4). A spectrum below zero as a whole is
    :func:`_mostly_negative`'s."""
    n = int(values.size)
    if n < 100 or not sigma or not sigma > 0:
        return None
    n_neg = int(np.count_nonzero(values < 0))
    if 2 * n_neg <= n:
        return None
    med = median(values)
    if not med < -0.5 * sigma:
        return None
    unit = _spectral_unit_text(su)
    return (f"most samples are below zero ({n_neg} of {n}; median {med:.3g} {unit}, noise "
            f"{sigma:.3g}): a dark level subtracted too large? Band and hazard values are then "
            "understated; check the dark (background) measurement")


#: Duplicated wavelengths whose values differ by more than this share of the spectrum's peak
#: are reported with the spread: two scans or segments joined, not a repeated row (our own
#: rule: 5 %, well above a repeat's noise and below a joined segment at another gain). [-]
DUPLICATE_SPREAD_SHARE = 0.05


def _duplicate_spread(raw: np.ndarray, inv: np.ndarray, mean: np.ndarray,
                      wl: np.ndarray) -> str | None:
    """A clause for the duplicates warning when the values at one wavelength disagree by
    more than :data:`DUPLICATE_SPREAD_SHARE` of the peak, else None. ``raw`` sorted by
    wavelength, ``inv`` each raw value's index into ``mean`` and ``wl``."""
    peak = float(np.abs(mean).max()) if mean.size else 0.0
    if not peak > 0:
        return None
    hi = np.full(mean.size, -np.inf)
    lo = np.full(mean.size, np.inf)
    np.maximum.at(hi, inv, raw)
    np.minimum.at(lo, inv, raw)
    diff = hi - lo
    k = int(np.argmax(diff))
    if not diff[k] > DUPLICATE_SPREAD_SHARE * peak:
        return None
    bad = wl[diff > DUPLICATE_SPREAD_SHARE * peak]
    ratio = (f", {hi[k] / lo[k]:.3g} times" if lo[k] > 0 else "")
    return (f"; but they disagree: at {wl[k]:g} nm by {diff[k] / peak:.0%} of the peak"
            f"{ratio} ({bad.size} wavelength(s), {bad[0]:g}–{bad[-1]:g} nm, differ by more "
            f"than {DUPLICATE_SPREAD_SHARE:.0%}), so two scans or segments may be joined in one "
            "table: the mean there is neither; check the file")


#: The shortest run of samples exactly at the maximum read as a clipped top. A mercury line
#: 1–2 nm wide sampled every 0.5 nm clips over 3 or 4 samples; before, 5 were needed, and a
#: line clipped over 4 passed unflagged with its UV-C halved. Two equal samples at the top are
#: what a symmetric peak between two samples gives, so 3 is the least (our own rule). [-]
FLAT_TOP_RUN = 3


def _flat_top(raw: np.ndarray, wl: np.ndarray, quantity: str, unit_label: str) -> str | None:
    """A warning when the values as written hold a run of at least :data:`FLAT_TOP_RUN`
    consecutive samples exactly equal to their maximum, else None: a spectrum clipped flat at
    the top, as a saturated detector leaves it, whatever the unit after calibration. A smooth
    peak, even a rounded one, does not repeat its maximum exactly 3 times (our own rule; the relative
    counts at an ADC full scale are :func:`_saturation`'s). ``raw`` and ``wl`` in file order.
    A spectrum that is one constant throughout is not flagged (nothing rises to the top), nor
    a run that the rounding of the values as written explains: a broad peak written with 3
    significant digits repeats its maximum over several samples, its neighbours then one
    step of the rounding below. So the run's neighbours must lie more than 2 such steps below
    the maximum, the step being the last decimal place the values in the upper half are
    written to (our own rule; only worked out when such a run is found)."""
    if raw.size < 5:
        return None
    vmax = float(raw.max())
    if not vmax > 0:
        return None
    at = raw == vmax
    n_at = int(np.count_nonzero(at))
    if n_at < FLAT_TOP_RUN or n_at == raw.size:
        return None
    start, length = _longest_run(at)
    if length < FLAT_TOP_RUN:
        return None
    step = _decimal_step(raw[raw >= 0.5 * vmax])
    neighbours = raw[[k for k in (start - 1, start + length) if 0 <= k < raw.size]]
    if neighbours.size and bool((neighbours >= vmax - 2.0 * step).all()):
        return None  # the rounding of the values as written explains the run
    lo, hi = sorted((float(wl[start]), float(wl[start + length - 1])))
    text = (f"{length} consecutive samples at {vmax:g} ({unit_label}), exactly the maximum, "
            f"{lo:g}–{hi:g} nm: the spectrum is clipped flat there, so the detector is "
            "probably saturated; shorten the integration time")
    if quantity != "relative":
        text += ". Band and hazard values are then understated"
    return text


#: A plateau at the maximum whose sides have fallen this many noise σ at 1.5 times its
#: half-width from its centre is a clipped top (our own rule). The plateau is the run within 8 σ of the maximum (wide
#: enough that noise of ±3 σ on a clipped top does not break the run); a smooth peak, near its
#: top a parabola, falls only 1.5² × 8 = 18 σ at 1.5 times the run's half-width from its
#: centre [derived], so 40 σ leaves a margin for the noise and the sampling. [-]
PLATEAU_SHOULDER_SIGMAS = 40.0
PLATEAU_WITHIN_SIGMAS = 8.0


def _noisy_plateau(values: np.ndarray, wl: np.ndarray, sigma: float | None,
                   unit_label: str) -> str | None:
    """A warning when the maximum sits on a plateau with noise on it and steep sides, as a
    saturated detector leaves a peak after the dark is subtracted, else None. The plateau: the
    run of at least 7 samples around the maximum within :data:`PLATEAU_WITHIN_SIGMAS` σ of it;
    it is clipped when, a quarter of its width beyond each end (1.5 times its half-width from
    its centre), the spectrum has fallen by more than
    :data:`PLATEAU_SHOULDER_SIGMAS` σ on both sides (a smooth peak falls only 18 σ there)."""
    n = int(values.size)
    if n < 20 or not sigma or not sigma > 0:
        return None
    i = int(np.argmax(values))
    vmax = float(values[i])
    if not vmax > 0:
        return None
    near = values >= vmax - PLATEAU_WITHIN_SIGMAS * sigma
    a = i
    while a > 0 and near[a - 1]:
        a -= 1
    b = i
    while b < n - 1 and near[b + 1]:
        b += 1
    length = b - a + 1
    if length < 7:
        return None
    h = max(2, -(-length // 4))   # a quarter of the run beyond each end: 1.5 × its half-width
    if a - h < 0 or b + h > n - 1:
        return None
    drop = vmax - max(float(values[a - h]), float(values[b + h]))
    if not drop > PLATEAU_SHOULDER_SIGMAS * sigma:
        return None
    return (f"{length} samples within {PLATEAU_WITHIN_SIGMAS:g} σ of the maximum "
            f"({vmax:.3g} {unit_label}), {float(wl[a]):g}–{float(wl[b]):g} nm, with steep sides: "
            "the top looks clipped, so the detector was possibly saturated; shorten the "
            "integration time and measure again (band and hazard values would then be "
            "understated)")


def _decimal_step(v: np.ndarray) -> float:
    """10⁻ᵏ for the smallest k (−3 to 15) with every value a whole number of 10⁻ᵏ (to 1 part
    in 10⁶: a decimal as a float), i.e. the last decimal place written; 0 when there is none
    (values written to full float precision)."""
    for k in range(-3, 16):
        s = v * 10.0 ** k
        if bool(np.all(np.abs(s - np.round(s)) <= 1e-6 * np.abs(s) + 1e-9)):
            return 10.0 ** -k
    return 0.0


def _longest_run(mask: np.ndarray) -> tuple[int, int]:
    """(start, length) of the longest run of True in a boolean array ((0, 0) when none)."""
    d = np.diff(np.concatenate(([0], mask.view(np.int8), [0])))
    starts = np.flatnonzero(d == 1)
    if starts.size == 0:
        return 0, 0
    lengths = np.flatnonzero(d == -1) - starts
    k = int(lengths.argmax())
    return int(starts[k]), int(lengths[k])


def _spectral_unit_text(su: Any) -> str:
    """The SI spectral unit a value of this kind is checked in (for messages)."""
    return {"irradiance": "W m⁻² nm⁻¹", "radiance": "W m⁻² sr⁻¹ nm⁻¹", "flux": "W nm⁻¹"}.get(
        su.quantity, "relative units")


def _normalised_peak(raw: np.ndarray) -> float | None:
    """1 or 100 where the largest value as written is that, to 1 part in 10⁴ (a normalised
    spectrum; an instrument's calibrated export almost never peaks at a round 1 or 100:
    common practice; the tolerance is our own rule), else None."""
    fin = raw[np.isfinite(raw)]
    if fin.size < 3:
        return None
    peak = float(fin.max())
    return next((t for t in (1.0, 100.0) if abs(peak - t) <= 1e-4 * t), None)


def _instrument_notes(meta: dict[str, str]) -> dict[str, str]:
    keys = (r"(instrument|spectrometer|model|serial|device|integration|exposure|averag|calibrat|"
            r"date|time|operator|detector|dark|boxcar|sensor|distance|lamp|sample|warm|"
            r"diffuser|cosine|optic|fib(re|er)|field of view|fov|slit|resolution|temperature|"
            r"ambient)")
    rx = re.compile(keys, re.I)
    return {k: v for k, v in list(meta.items()) if rx.search(k)}


def _absolute_unit(text: str | None) -> bool:
    """Whether a column's unit text is an absolute spectral unit (irradiance, radiance, flux)."""
    if not text:
        return False
    try:
        return parse_spectral_unit(text).quantity != "relative"
    except UnitError:
        return False


def _pick_columns(names: list[str], data: list[np.ndarray], opts: ReadOptions, where: str,
                  start: int, hint: str = "", col_units: Sequence[str | None] | None = None
                  ) -> tuple[int, int, str | None]:
    n = len(names)
    seen: dict[int, bool] = {}
    fin = [_finite_values(c) for c in data]  # each column's finite values, found once

    def is_index(k: int) -> bool:  # column k looks like a row or pixel index (tested once)
        if k not in seen:
            seen[k] = _is_index(names[k], fin[k])
        return seen[k]

    usable = [k for k in range(n) if fin[k].size]
    note = None
    if opts.wavelength_column:
        wl_idx = _col_ref(opts.wavelength_column, names, "wavelength column", where)
    else:
        named = [k for k in usable if _WL_NAME.search(names[k]) or _WAVENUMBER.search(names[k])
                 or _RAMAN.search(names[k])]
        index_cols = [k for k in usable if is_index(k)]
        if named:
            wl_idx = named[0]
            if index_cols and index_cols[0] < wl_idx:
                note = f"column {index_cols[0] + 1} ({names[index_cols[0]]!r}) looks like a row or pixel index and was ignored"
        else:
            rest = [k for k in usable if k not in index_cols]
            if index_cols and rest and not _monotonic(fin[rest[0]]):
                rest = []
            if not rest:
                raise InputFormatError(
                    "the first column looks like a pixel index (0, 1, 2, …), not wavelengths",
                    f"{where} line {start + 1}, column 1",
                    "export the spectrum with its wavelength calibration, or give "
                    "--wavelength-column if a column does hold wavelengths")
            wl_idx = rest[0]
            if index_cols and index_cols[0] < wl_idx:
                note = f"column {index_cols[0] + 1} ({names[index_cols[0]]!r}) looks like a row or pixel index and was ignored"
        if is_index(wl_idx) and not named:
            raise InputFormatError("the wavelength column looks like a pixel index (0, 1, 2, …)",
                                   f"{where} line {start + 1}, column {wl_idx + 1}",
                                   "export with the wavelength calibration")
    if opts.column:
        val_idx = _col_ref(opts.column, names, "value column", where)
        if val_idx == wl_idx:
            raise InputFormatError("the value column is the wavelength column", where,
                                   "choose another --column")
        return wl_idx, val_idx, note
    cands = [k for k in usable if k != wl_idx and not is_index(k)]
    second_wl = [k for k in cands if _WL_NAME.search(names[k]) or _same_axis(fin[wl_idx], fin[k])]
    if second_wl:
        raise InputFormatError(
            f"the file holds spectra side by side (wavelength columns {wl_idx + 1} and "
            f"{second_wl[0] + 1})", f"{where} line {start + 1}",
            "choose one pair with --wavelength-column N and --column M")
    if not cands:
        empty = [k for k in range(n) if k != wl_idx and k not in usable]
        if empty:
            raise InputFormatError(f"column {empty[0] + 1} ({names[empty[0]]!r}) holds no numbers "
                                   "(every value is missing: NaN, empty or a placeholder)",
                                   f"{where} line {start + 1}, column {empty[0] + 1}",
                                   "export the spectrum again, or choose another --column")
        raise InputFormatError("no value column next to the wavelengths", f"{where} line {start + 1}",
                               "the file needs a wavelength column and a value column")
    if len(cands) > 1:
        # raw columns beside a calibrated one (dark, reference, sample counts and the
        # spectral irradiance): the one column with an absolute spectral unit is the spectrum
        units = list(col_units) if col_units is not None else [None] * n
        calibrated = [k for k in cands
                      if _absolute_unit(units[k] or _unit_from_header(names[k]))]
        if len(calibrated) == 1:
            k = calibrated[0]
            others = ", ".join(f"{j + 1} {names[j]!r}" for j in cands if j != k)
            used = (f"column {k + 1} ({names[k]!r}) was used: of the {len(cands)} value columns "
                    f"it is the only one with an absolute spectral unit (the others, {others}, "
                    "have none); give --column to choose another")
            return wl_idx, k, used if note is None else f"{note}; {used}"
        listing = ", ".join(f"{k + 1} {names[k]!r}" for k in cands)
        raise InputFormatError(f"{len(cands)} value columns ({listing}){hint}",
                               f"{where} line {start + 1}",
                               "choose one with --column NAME or --column NUMBER")
    return wl_idx, cands[0], note


def _finite_values(col: np.ndarray) -> np.ndarray:
    """The finite values of a column, in order (the column itself when all are finite)."""
    ok = np.isfinite(col)
    return col if ok.all() else col[ok]


def _is_index(name: str, c: np.ndarray) -> bool:
    """Whether a column (``c``: its finite values) looks like a row or pixel index."""
    if _INDEX_NAME.match(name or ""):
        return True
    if c.size < 3:
        return False
    return bool(c[0] in (0.0, 1.0) and np.all(np.diff(c) == 1.0))


def _monotonic(c: np.ndarray) -> bool:
    """Whether finite values ``c`` strictly rise or strictly fall."""
    d = np.diff(c)
    return bool(c.size >= 2 and (np.all(d > 0) or np.all(d < 0)))


def _same_axis(a: np.ndarray, b: np.ndarray) -> bool:
    """Whether ``b`` (finite values) looks like a second wavelength axis beside ``a`` (the
    wavelength column's finite values): monotonic, overlapping most of its range."""
    if a.size < 5 or b.size < 5:
        return False
    d = b[1:] - b[:-1]  # numpy.diff, without its wrapper
    if not ((d > 0).all() or (d < 0).all()):
        return False
    overlap = min(a.max(), b.max()) - max(a.min(), b.min())
    return bool(overlap > 0.5 * (a.max() - a.min()) and b.min() > 0.5 * a.min())


def _to_nm(wl: np.ndarray, unit_text: str | None, how: str, where: str,
           warnings: list[str], col_place: str | None = None,
           row_place: Any = None) -> tuple[np.ndarray, str, str]:
    """Wavelengths in nm from the column as read, with the unit given, or inferred from the values.

    wl : the wavelength column as read (NaN for missing). [unit of the file]
    col_place, row_place : the place of the column, and a function giving the place of row k,
        named in errors.
    """
    col_place = col_place or where
    row_place = row_place or (lambda k: f"{where} data row {k + 1}")
    fin = wl[np.isfinite(wl)]
    if fin.size == 0:
        raise InputFormatError("the wavelength column holds no numbers", col_place,
                               "choose the wavelength column with --wavelength-column")
    lo, hi = float(fin.min()), float(fin.max())
    if unit_text is not None:
        try:
            kind, factor = parse_wavelength_unit(unit_text)
        except UnitError as exc:
            raise InputFormatError(exc.what, col_place, exc.todo) from None
        if kind == "wavenumber":
            if lo <= 0:
                k = int(np.nonzero(wl <= 0)[0][0])
                raise InputFormatError(f"wavenumber {wl[k]:g} cm⁻¹ is zero or negative", row_place(k),
                                       "wavenumbers must be positive; check --wavelength-unit")
            out = 1e7 / (wl * factor)
            warnings.append("wavenumbers (cm⁻¹) converted to wavelengths: λ[nm] = 10⁷ / ν[cm⁻¹]; "
                            "the values are converted from per cm⁻¹ to per nm only when their "
                            "unit says per cm⁻¹ (else used as they are)")
            return out, unit_text, how
        out = wl * factor
        if hi * factor < 100.0:
            raise InputFormatError(f"wavelengths {lo * factor:g}–{hi * factor:g} nm (unit "
                                   f"{unit_text!r}, {how}) lie below 100 nm: not optical radiation",
                                   col_place, "wrong wavelength unit? give --wavelength-unit "
                                   "(nm, um, m, cm-1)")
        return out, unit_text, how
    if lo >= 100 and hi <= 20000:
        if lo >= 3000:
            raise InputFormatError(
                f"the wavelength column runs {lo:g}–{hi:g} with no unit: as nm it lies wholly "
                f"beyond 3 µm (no UV, visible or near infrared); as wavenumbers in cm⁻¹ it would "
                f"be {1e7 / hi:.4g}–{1e7 / lo:.4g} nm", col_place,
                "give the unit with --wavelength-unit (cm-1 for wavenumbers, nm for wavelengths)")
        text = f"wavelength unit not stated: {lo:g}–{hi:g} read as nm"
        if lo >= 1800:
            # a lamp scan that starts beyond 1.8 µm is rarer than one in ångström (Å = 0.1 nm),
            # where 2000–8000 is 200–800 nm (our own hint; nothing is changed)
            text += (f"; if they are ångström ({lo / 10:g}–{hi / 10:g} nm), give "
                     "--wavelength-unit A")
        warnings.append(text)
        return wl, "nm", "inferred from the values (100–20 000 → nm)"
    if 0.1 <= lo and hi <= 20:
        warnings.append(f"wavelengths {lo:g}–{hi:g} read as µm (no unit given)")
        return wl * 1000.0, "um", "inferred from the values (0.1–20 → µm)"
    if 1e-7 <= lo and hi <= 2e-5:
        warnings.append(f"wavelengths {lo:g}–{hi:g} read as metres (no unit given)")
        return wl * 1e9, "m", "inferred from the values (1e-7–2e-5 → m)"
    if lo <= 0:
        k = int(np.nonzero(wl <= 0)[0][0])
        raise InputFormatError(f"wavelength {wl[k]:g} is zero or negative", row_place(k),
                               "the wavelength column must hold wavelengths; check --wavelength-column")
    as_wn = ""
    if 100.0 <= 1e7 / hi and 1e7 / lo <= 1e5:
        as_wn = f"; as wavenumbers in cm⁻¹ they would be {1e7 / hi:.4g}–{1e7 / lo:.4g} nm"
    raise InputFormatError(f"the wavelength column runs {lo:g}–{hi:g}, which is no wavelength range "
                           f"in nm, µm or m{as_wn}", col_place,
                           "give the unit with --wavelength-unit (nm, um, m, cm-1)")


def _gaps(wl: np.ndarray, steps: np.ndarray) -> list[tuple[float, float]]:
    """Steps more than 3× both neighbouring steps and > 1 nm are gaps."""
    if steps.size < 3 or not (steps > 1.0).any():
        return []
    left = np.concatenate(([steps[1]], steps[:-1]))
    right = np.concatenate((steps[1:], [steps[-2]]))
    neigh = np.maximum(left, right)
    big = (steps > 3.0 * neigh) & (steps > 1.0)
    return [(float(wl[k]), float(wl[k + 1])) for k in np.nonzero(big)[0]]


def _isolated_spikes(v: np.ndarray) -> list[int]:
    if v.size < 5:
        return []
    a = np.abs(v)
    nb = np.maximum(np.concatenate(([a[1]], a[:-1])), np.concatenate((a[1:], [a[-2]])))
    # a spike stands 1000x above its neighbours at least (the scale below only raises the
    # bar), so without such a sample there is none, and the median is not needed
    if not (a > 1000.0 * nb).any():
        return []
    scale = median(a) or float(a.max()) * 1e-12
    # and it reaches 1e-3 of the spectrum's largest value: below that, a lone sample above
    # zeros is the last written digit (a value rounded to 0.000001 between zeros), and too
    # small to move any band figure (our own rule)
    fin = a[np.isfinite(a)]
    floor = SPIKE_MIN_SHARE * float(fin.max()) if fin.size else math.inf
    spikes = np.nonzero((a > 1000.0 * np.maximum(nb, scale * 10)) & (a > floor))[0]
    return [int(k) for k in spikes]


#: The least share of the largest value a lone sample must reach to be called a spike. [-]
SPIKE_MIN_SHARE = 1e-3


def _clipped_at_zero(v: np.ndarray) -> str | None:
    """A warning when negative values look clipped to zero: no sample below zero, and at least
    a fifth of them exactly 0 while others are positive. After a dark subtraction, noise is
    negative about as often as positive where the lamp emits nothing; software that clips the
    negative half leaves zeros, so the noise floor is underestimated and the remaining positive
    noise adds up to spurious output (UV-C from nothing) in the band integrals. The thresholds
    (at least 20 samples, a fifth of them exactly 0) are our own rule."""
    n = int(v.size)
    if n < 20 or bool((v < 0).any()):
        return None
    n_zero = int(np.count_nonzero(v == 0.0))
    if n_zero * 5 < n or n_zero == n:
        return None
    return (f"{n_zero} of {n} samples are exactly 0 and none is negative: the export may clip "
            "negative values to zero after the dark subtraction. Then the noise floor is "
            "underestimated and the positive half of the noise adds up to spurious output (e.g. "
            "UV-C from nothing); export without clipping if the software allows, and treat "
            "small band values as upper bounds")


def _saturation(v: np.ndarray) -> str | None:
    vmax = float(v.max())
    if vmax <= 0:
        return None
    at = v >= vmax * (1 - 1e-9)
    best = _longest_run(at)[1]  # the longest run of samples at the maximum
    if best >= 3 and float(vmax).is_integer() and vmax in (255.0, 1023.0, 4095.0, 16383.0, 65535.0,
                                                           65536.0, 262143.0):
        return (f"{best} consecutive samples at {vmax:g} counts: the detector is probably "
                "saturated there; shorten the integration time")
    return None
