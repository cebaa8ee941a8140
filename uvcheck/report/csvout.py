"""CSV output: stdlib csv, written atomically, with spreadsheet formulas neutralised.

A CSV file from uvcheck is opened in spreadsheets by people who did not write it, and its
cells carry text that came from elsewhere (product names, claims, file names). A cell that a
spreadsheet would read as a formula gets a leading apostrophe, which spreadsheets take as
"this is text" (the mitigation OWASP describes for CSV injection).

Formula prefixes: ``=``, ``+``, ``-``, ``@``, tab (0x09) and carriage return (0x0D) from the
OWASP community page "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection; the list
as given in issue 7, page not re-read here: from memory), and NUL (0x00), which OWASP ASVS
requirement 1.2.10 ("CSV and Formula Injection") adds. Plain numbers such as ``-0.5`` or
``+3e-4`` stay numbers: they cannot run anything, and the apostrophe would turn them into text.

Rows are written by :mod:`csv` (quoting per RFC 4180 §2.6–2.7, lines ended by CRLF as §2.1
says), then to the target through :func:`uvcheck.report.jsonout.write_text_atomic`: a
temporary file and a rename, and never over an existing file without ``force``.
"""

from __future__ import annotations

import csv
import io
import math
import re
from pathlib import Path
from typing import Any, Iterable, Sequence

from uvcheck.report.jsonout import write_text_atomic

#: First characters that make a spreadsheet read a cell as a formula (sources above).
FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r", "\x00")
_PLAIN_NUMBER = re.compile(r"[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?")


def cell_text(value: Any) -> str:
    """The text of one cell: None and non-finite floats are empty, booleans are true/false,
    floats use the shortest text that reads back to the same number.

    Examples
    --------
    >>> [cell_text(v) for v in (None, True, 3, 0.1, float("nan"), "UV-C")]
    ['', 'true', '3', '0.1', '', 'UV-C']
    """
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    if hasattr(value, "item") and not isinstance(value, (str, bytes)):
        try:
            return cell_text(value.item())  # numpy scalar
        except (TypeError, ValueError):
            pass
    return str(value)


def neutralise(text: str) -> str:
    """Prefix an apostrophe to a cell a spreadsheet would read as a formula.

    Examples
    --------
    >>> neutralise("=HYPERLINK(\\"http://example.invalid\\")")
    '\\'=HYPERLINK("http://example.invalid")'
    >>> neutralise("-0.5"), neutralise("-1+2"), neutralise("UV-C")
    ('-0.5', "'-1+2", 'UV-C')
    """
    if text.startswith(FORMULA_PREFIXES) and not _PLAIN_NUMBER.fullmatch(text):
        return "'" + text
    return text


def csv_text(rows: Iterable[Sequence[Any]], header: Sequence[str] | None = None) -> str:
    """The CSV text of ``rows`` (after an optional header), every cell neutralised."""
    buf = io.StringIO(newline="")
    w = csv.writer(buf, lineterminator="\r\n")
    if header is not None:
        w.writerow([neutralise(cell_text(h)) for h in header])
    for row in rows:
        w.writerow([neutralise(cell_text(v)) for v in row])
    return buf.getvalue()


def write_csv(path: str | Path, rows: Iterable[Sequence[Any]], header: Sequence[str] | None = None,
              force: bool = False, bom: bool = False) -> Path:
    """Write a CSV file atomically; an existing file is replaced only with ``force``.

    path : the target file.
    rows : the data rows (cells of any type; see :func:`cell_text`).
    header : column names, written first.
    force : replace an existing file.
    bom : start with a UTF-8 byte-order mark, which some spreadsheets need to read µ and ²
        as UTF-8 rather than as a legacy code page.

    Raises :class:`uvcheck.errors.OutputExistsError` if the file exists and ``force`` is False.
    """
    text = csv_text(rows, header)
    data = ("\ufeff" + text if bom else text).encode("utf-8")
    return write_text_atomic(Path(path), data, force=force)
