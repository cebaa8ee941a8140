"""Spreadsheet workbooks: Excel ``.xlsx`` and OpenDocument ``.ods``, read without a spreadsheet.

Laboratories often send a spectrum as a workbook. Both formats are ZIP archives of XML:

* ``.xlsx`` is Office Open XML SpreadsheetML (ECMA-376 Part 1, also ISO/IEC 29500): the sheets
  are listed in ``xl/workbook.xml``, located through ``xl/_rels/workbook.xml.rels``, and hold
  ``<row>`` elements of ``<c>`` cells; a text cell points into ``xl/sharedStrings.xml``.
* ``.ods`` is OpenDocument (OASIS ODF 1.2, ISO/IEC 26300): ``content.xml`` holds
  ``<table:table>`` elements of ``<table:table-row>`` of ``<table:table-cell>``, with
  ``number-rows-repeated`` and ``number-columns-repeated`` for runs of equal rows and cells.

Every sheet is written out as a tab-separated table, one line per sheet row, each sheet after a
``sheet: NAME`` line, and the table goes to uvcheck's own reader, so a workbook gets every check
a text export gets (header and units, noise, spikes, gaps, duplicates) and the same import report.
Numbers are written as the workbook stores them (full precision, '.' decimal mark), not as the
spreadsheet displays them. A formula cell gives the result the workbook stored; a workbook saved
without results (some programs write only formulas) is reported, since those cells are empty.
The import report names the workbook and its sha256, and lists where each sheet starts in the
table, since the report's line numbers count the table.

Legacy binary workbooks (``.xls``) and other ZIP archives are refused with what to do.
Element names are matched without their namespace, so the Strict variant of the .xlsx format
(another namespace, same names) reads the same way.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import IO, TYPE_CHECKING, Any, Iterator

from uvcheck.errors import InputFormatError

if TYPE_CHECKING:
    import zipfile

# zipfile and the XML parser are imported when a workbook is read (the text reader, which
# imports this module for its magic numbers, does not wait for them)

ZIP_MAGIC = b"PK\x03\x04"
#: The first bytes of an OLE2 compound file: a legacy Excel 97–2003 workbook (.xls), or
#: another legacy Office document.
OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
ODS_MIMETYPE = "application/vnd.oasis.opendocument.spreadsheet"
#: A sheet's XML larger than this (uncompressed) is refused: a spectrum of a million rows is
#: well under it, and a ZIP archive can claim any size (our own bound).
MAX_PART_BYTES = 1 << 30
#: Said with every workbook import.
LINES_NOTE = ("; the line numbers in this report count the table made of the workbook (a "
              "'sheet:' line, then one line per row, for each sheet in turn)")


def kind(head: bytes, path: str | Path) -> str | None:
    """What a file whose first bytes are ``head`` is: ``"xlsx"``, ``"ods"``, ``"xls"`` (a
    legacy binary Office file), ``"zip"`` (another ZIP archive), ``"damaged-zip"`` (a ZIP
    archive that cannot be opened), or None (not an archive: read it as text).

    >>> kind(b"Wavelength,Irradiance", "lamp.csv") is None
    True
    >>> kind(OLE2_MAGIC + bytes(8), "lamp.xls")
    'xls'
    """
    if head.startswith(OLE2_MAGIC):
        return "xls"
    if not head.startswith(ZIP_MAGIC):
        return None
    import zipfile

    try:
        with zipfile.ZipFile(path) as z:
            names = set(z.namelist())
            if "xl/workbook.xml" in names:
                return "xlsx"
            if "mimetype" in names and z.read("mimetype")[:80].strip() == ODS_MIMETYPE.encode():
                return "ods"
            if "content.xml" in names and any("opendocument.spreadsheet" in n for n in names):
                return "ods"
    except (zipfile.BadZipFile, OSError, KeyError):
        return "damaged-zip"
    return "zip"


def refusal(k: str, where: str) -> InputFormatError:
    """The error for a file this reader cannot take (:func:`kind` ``"xls"``, ``"zip"`` or
    ``"damaged-zip"``)."""
    if k == "damaged-zip":
        return InputFormatError("this is a damaged or incomplete ZIP archive (an .xlsx or .ods "
                                "workbook cut short in copying?)", where,
                                "copy or download the file again")
    if k == "xls":
        return InputFormatError("this is a legacy binary Office file (an Excel 97–2003 .xls "
                                "workbook?), which uvcheck does not read", where,
                                "save the sheet as .xlsx, .ods or CSV and give that file")
    return InputFormatError("this is a ZIP archive, not a spectrum (and not an .xlsx or .ods "
                            "workbook)", where, "unpack it and give the spectrum file inside")


@dataclass
class _Sheet:
    name: str
    hidden: bool = False
    rows: list[str] = field(default_factory=list)
    no_result: int = 0       # formula cells without a stored result
    notes_left_out: int = 0  # text cells beside a data row's numbers (see _line)
    first_note: tuple[int, str] | None = None   # (sheet row, text) of the first


@dataclass(frozen=True)
class Table:
    """A workbook made into one table.

    text : the table, UTF-8, tab-separated.
    warning : for the import report (the sheets, where each is, formulas without results).
    format : the format's name.
    placed : where each sheet is in the table, as text ("'Info' lines 1–3; ...").
    sheets : (name, first line, last line) of each sheet, 1-based lines of the table.
    """

    text: bytes
    warning: str
    format: str
    placed: str
    sheets: tuple[tuple[str, int, int], ...]

    def sheet_at(self, line: int) -> str | None:
        """The name of the sheet holding a (1-based) line of the table."""
        return next((n for n, a, b in self.sheets if a <= line <= b), None)


def as_table(path: str | Path, k: str) -> Table:
    """The :class:`Table` of an ``.xlsx`` (``k="xlsx"``) or ``.ods`` (``k="ods"``) file."""
    import zipfile
    from xml.etree.ElementTree import ParseError

    where = str(path)
    try:
        with zipfile.ZipFile(path) as z:
            sheets = list(_xlsx_sheets(z, where) if k == "xlsx" else _ods_sheets(z, where))
    except InputFormatError:
        raise
    except (zipfile.BadZipFile, ParseError, KeyError, OSError, ValueError, EOFError) as exc:
        raise InputFormatError(f"not a readable {'.xlsx' if k == 'xlsx' else '.ods'} workbook "
                               f"({type(exc).__name__}: {exc})", where,
                               "open it in a spreadsheet and save it again, or save the sheet "
                               "as CSV") from None
    if not sheets:
        raise InputFormatError("the workbook holds no worksheet", where,
                               "save the sheet that holds the spectrum as CSV")
    lines: list[str] = []
    placed = []
    spans = []
    for s in sheets:
        first = len(lines) + 1
        lines.append(f"sheet: {s.name}")
        lines.extend(s.rows)
        placed.append(f"'{s.name}'{' (hidden)' if s.hidden else ''} lines {first}–{len(lines)}")
        spans.append((s.name, first, len(lines)))
    what = "Excel workbook (.xlsx)" if k == "xlsx" else "OpenDocument spreadsheet (.ods)"
    warning = (f"{what} read as a table of its {len(sheets)} sheet(s): "
               f"{'; '.join(placed)}{LINES_NOTE}")
    left = [(s, s.notes_left_out) for s in sheets if s.notes_left_out]
    if left:
        s0 = left[0][0]
        row, text = s0.first_note  # type: ignore[misc]
        warning += (f". {sum(n for _, n in left)} text cell(s) beside the numbers of data rows "
                    f"were left out (the first: {text[:60]!r}, sheet '{s0.name}' row {row}), so "
                    "that those rows read as data")
    no_result = sum(s.no_result for s in sheets)
    if no_result:
        warning += (f". {no_result} formula cell(s) hold no stored result (the workbook was "
                    "saved without calculating) and read as empty: open it in a spreadsheet, "
                    "let it calculate and save it again, or save the sheet as CSV")
    return Table(("\n".join(lines) + "\n").encode("utf-8"), warning, what, "; ".join(placed),
                 tuple(spans))


# ---------------------------------------------------------------------------------------------
# Cells to text
# ---------------------------------------------------------------------------------------------

def _cell_text(text: str) -> str:
    """A cell as one token of a tab-separated line (tabs and line breaks become spaces)."""
    return " ".join(text.replace("\t", " ").splitlines()).strip() if text else ""


def _number_text(v: str) -> str:
    """A stored number as the shortest text that reads back as the same double."""
    try:
        x = float(v)
    except ValueError:
        return _cell_text(v)
    if not math.isfinite(x):
        return _cell_text(v)
    return repr(x) if x != int(x) or abs(x) >= 1e16 else str(int(x))


def _is_number(text: str) -> bool:
    """A cell that is a plain number in either decimal convention (the reader's patterns)."""
    from uvcheck.io.reader import _NUM_COMMA, _NUM_DOT  # (the reader imports this module)

    return bool(_NUM_DOT.match(text) or _NUM_COMMA.match(text))


def _line(cells: dict[int, str], sheet: "_Sheet | None" = None, row: int = 0) -> str:
    """A row's cells (column index → text) as a tab-separated line. A note typed beside the
    numbers of a data row ("240 | 0.010 | | calibrated 2026-05") would make the whole row
    unreadable as data, and hide the heading above it: text cells to the right of a row's
    numbers (two or more, nothing but empty cells between them) are left out, and counted on
    the sheet (our own rule)."""
    if not cells:
        return ""
    cols = sorted(cells)
    nums = 0
    for k in cols:
        if not _is_number(cells[k]):
            break
        nums += 1
    if 2 <= nums < len(cols):
        notes = [cells[k] for k in cols[nums:]]
        if sheet is not None:
            sheet.notes_left_out += len(notes)
            if sheet.first_note is None:
                sheet.first_note = (row, notes[0])
        cells = {k: cells[k] for k in cols[:nums]}
    out = [""] * (max(cells) + 1)
    for c, t in cells.items():
        out[c] = t
    return "\t".join(out).rstrip("\t")


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def _parts(z: zipfile.ZipFile, name: str, where: str) -> IO[bytes]:
    info = z.getinfo(name)
    if info.file_size > MAX_PART_BYTES:
        raise InputFormatError(f"the workbook part {name} is {info.file_size / 1e6:.0f} MB "
                               f"unpacked, more than uvcheck reads ({MAX_PART_BYTES / 1e6:.0f} MB)",
                               where, "save the sheet that holds the spectrum as CSV")
    return z.open(name)


# ---------------------------------------------------------------------------------------------
# .xlsx (ECMA-376 SpreadsheetML)
# ---------------------------------------------------------------------------------------------

_REL = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"
_REL_STRICT = "{http://purl.oclc.org/ooxml/officeDocument/relationships}id"


def _column_index(ref: str) -> int:
    """0-based column of a cell reference ("A1" → 0, "AB12" → 27)."""
    n = 0
    for ch in ref:
        if "A" <= ch <= "Z":
            n = n * 26 + ord(ch) - 64
        elif "a" <= ch <= "z":
            n = n * 26 + ord(ch) - 96
        else:
            break
    return n - 1


def _xlsx_sheets(z: zipfile.ZipFile, where: str) -> Iterator[_Sheet]:
    import posixpath
    from xml.etree.ElementTree import iterparse

    rels: dict[str, str] = {}
    if "xl/_rels/workbook.xml.rels" in z.namelist():
        for _, el in iterparse(_parts(z, "xl/_rels/workbook.xml.rels", where)):
            if _local(el.tag) == "Relationship":
                target = el.get("Target", "")
                target = (target.lstrip("/") if target.startswith("/")
                          else posixpath.normpath(posixpath.join("xl", target)))
                rels[el.get("Id", "")] = target
    listed = []
    for _, el in iterparse(_parts(z, "xl/workbook.xml", where)):
        if _local(el.tag) == "sheet":
            rid = el.get(_REL) or el.get(_REL_STRICT) or ""
            listed.append((el.get("name", "?"), el.get("state", "visible") != "visible",
                           rels.get(rid)))
    strings = (_shared_strings(_parts(z, "xl/sharedStrings.xml", where))
               if "xl/sharedStrings.xml" in z.namelist() else [])
    names = set(z.namelist())
    for name, hidden, target in listed:
        if target is None or target not in names or "worksheets/" not in target:
            continue  # a chart sheet or a dialog sheet: no cells
        sheet = _Sheet(name, hidden)
        _xlsx_rows(_parts(z, target, where), strings, sheet)
        yield sheet


def _shared_strings(fh: IO[bytes]) -> list[str]:
    """The shared-string table: each ``<si>``'s text (its ``<t>`` and rich-text runs; not the
    phonetic guides, ``<rPh>``)."""
    from xml.etree.ElementTree import iterparse

    out: list[str] = []
    parts: list[str] = []
    skip = 0
    for ev, el in iterparse(fh, events=("start", "end")):
        tag = _local(el.tag)
        if ev == "start":
            if tag == "rPh":
                skip += 1
            continue
        if tag == "t" and not skip:
            parts.append(el.text or "")
        elif tag == "rPh":
            skip -= 1
        elif tag == "si":
            out.append("".join(parts))
            parts = []
            el.clear()
    return out


def _xlsx_rows(fh: IO[bytes], strings: list[str], sheet: _Sheet) -> None:
    from xml.etree.ElementTree import iterparse

    cells: dict[int, str] = {}
    row_no = 0          # the sheet row the next line is for (1-based)
    col = -1
    value: str | None = None
    inline: list[str] = []
    has_formula = False
    stack: list[Any] = []          # the open elements: a finished row is removed from its parent
    for ev, el in iterparse(fh, events=("start", "end")):
        tag = _local(el.tag)
        if ev == "start":
            stack.append(el)
            if tag == "row":
                r = el.get("r")
                want = int(r) if r and r.isdigit() else row_no + 1
                row_no = max(row_no, want - 1)  # rows the sheet leaves out are empty lines
                cells, col = {}, -1
            elif tag == "c":
                ref = el.get("r")
                col = _column_index(ref) if ref else col + 1
                value, inline, has_formula = None, [], False
            continue
        stack.pop()
        if tag == "v":
            value = el.text or ""
        elif tag == "f":
            has_formula = True
        elif tag == "t":
            inline.append(el.text or "")
        elif tag == "c":
            t = el.get("t", "n")
            if t == "inlineStr":
                text = "".join(inline)
            elif value is None:
                text = ""
                sheet.no_result += has_formula
            elif t == "s":
                k = int(value)
                text = strings[k] if 0 <= k < len(strings) else ""
            elif t == "b":
                text = "TRUE" if value.strip() == "1" else "FALSE"
            elif t == "n":
                text = _number_text(value)
            else:  # "str" (a formula's text), "e" (an error such as #N/A), "d" (a date)
                text = value
            text = _cell_text(text)
            if text:
                cells[col] = text
            el.clear()
        elif tag == "row":
            row_no += 1
            line = _line(cells, sheet, row_no)
            if line:  # empty rows are written only when a row with cells follows them
                sheet.rows.extend([""] * (row_no - 1 - len(sheet.rows)))
                sheet.rows.append(line)
            if stack:
                stack[-1].remove(el)  # so a sheet of a million rows is not held as a tree


# ---------------------------------------------------------------------------------------------
# .ods (OpenDocument)
# ---------------------------------------------------------------------------------------------

_TABLE = "urn:oasis:names:tc:opendocument:xmlns:table:1.0"
_OFFICE = "urn:oasis:names:tc:opendocument:xmlns:office:1.0"
#: Repeats past this are trailing padding (a spreadsheet pads a sheet to its last column and
#: row with one repeated empty cell or row), never data (our own bound).
_MAX_REPEAT = 100_000


def _ods_sheets(z: zipfile.ZipFile, where: str) -> Iterator[_Sheet]:
    from xml.etree.ElementTree import iterparse

    fh = _parts(z, "content.xml", where)
    sheet: _Sheet | None = None
    row: list[str] = []
    row_repeat = 1
    cell_text: list[str] = []
    cell_value: str | None = None
    cell_repeat = 1
    in_note = 0          # inside a cell's comment (office:annotation): not the cell's text
    blank_run = 0        # empty rows not yet written (written only if a row follows)
    stack: list[Any] = []
    for ev, el in iterparse(fh, events=("start", "end")):
        tag = _local(el.tag)
        if ev == "start":
            stack.append(el)
            if tag == "table":
                sheet = _Sheet(el.get(f"{{{_TABLE}}}name", "?"))
                blank_run = 0
            elif tag == "table-row":
                row = []
                row_repeat = int(el.get(f"{{{_TABLE}}}number-rows-repeated", "1") or 1)
            elif tag in ("table-cell", "covered-table-cell"):
                cell_text, cell_value = [], None
                cell_repeat = int(el.get(f"{{{_TABLE}}}number-columns-repeated", "1") or 1)
                vt = el.get(f"{{{_OFFICE}}}value-type")
                if vt in ("float", "percentage", "currency"):
                    cell_value = el.get(f"{{{_OFFICE}}}value")
            elif tag == "annotation":
                in_note += 1
            continue
        stack.pop()
        if tag == "annotation":
            in_note -= 1
        elif tag == "p" and not in_note:
            cell_text.append("".join(el.itertext()))
        elif tag in ("table-cell", "covered-table-cell"):
            text = (_number_text(cell_value) if cell_value is not None
                    else _cell_text(" ".join(cell_text)))
            if text or len(row) + cell_repeat < _MAX_REPEAT:
                row.extend([text] * min(cell_repeat, _MAX_REPEAT))
            el.clear()
        elif tag == "table-row":
            line = _line({k: t for k, t in enumerate(row) if t}, sheet,
                         len(sheet.rows) + blank_run + 1 if sheet is not None else 0)
            if sheet is not None:
                if not line:
                    blank_run += min(row_repeat, _MAX_REPEAT)
                else:
                    sheet.rows.extend([""] * blank_run)
                    blank_run = 0
                    sheet.rows.extend([line] * min(row_repeat, _MAX_REPEAT))
            if stack:
                stack[-1].remove(el)
        elif tag == "table":
            if sheet is not None:
                yield sheet
            sheet = None
            if stack:
                stack[-1].remove(el)
