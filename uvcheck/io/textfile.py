"""Decoding text files of unknown encoding, and streaming their lines.

Instruments and spreadsheets write UTF-8 (with or without BOM), UTF-16 ("Unicode text" from
spreadsheets, usually with a BOM) and Latin-1 / Windows-1252 (µ, ², ° as single bytes).
"""

from __future__ import annotations

import codecs
import hashlib
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator

from uvcheck.errors import InputFormatError

HEAD_BYTES = 256 * 1024
#: Every byte value that is not a control byte (below 9, or 14-31), for counting those.
_NOT_CONTROL = bytes(b for b in range(256) if not (b < 9 or 13 < b < 32))
#: Codecs whose one-shot decoding of a whole file gives the same text as reading the file
#: line by line in text mode (incremental decoding). "utf-16" only with its byte-order mark:
#: without one, bytes.decode assumes the machine's byte order where a text file refuses.
_WHOLE_FILE_CODECS = {"utf-8", "utf-8-sig", "cp1252", "latin-1", "iso8859-1", "ascii",
                      "utf-16-le", "utf-16-be"}


@dataclass(frozen=True)
class Decoded:
    encoding: str          # codec name used
    how: str               # how it was decided
    bom: bool
    guess: str | None = None  # a warning for the import report when the encoding was guessed


def sniff_encoding(head: bytes, forced: str | None = None, where: str = "file") -> Decoded:
    """Decide the text encoding from the first bytes of a file.

    head : the first bytes (up to :data:`HEAD_BYTES`).
    forced : an encoding given by the user (``--encoding``), used as is.
    """
    if forced:
        try:
            info = codecs.lookup(forced)
        except LookupError:
            raise InputFormatError(f"unknown encoding {forced!r} (--encoding)", where,
                                   "use utf-8, utf-16, latin-1 or cp1252") from None
        if not getattr(info, "_is_text_encoding", True):  # rot13, base64, zlib …
            raise InputFormatError(f"{forced!r} is not a text encoding (--encoding)", where,
                                   "use utf-8, utf-16, latin-1 or cp1252")
        return Decoded(forced, "given with --encoding", False)
    if not head:
        raise InputFormatError("the file is empty", where, "export the spectrum again")
    if head.startswith(codecs.BOM_UTF8):
        return Decoded("utf-8-sig", "UTF-8 byte-order mark", True)
    if head.startswith(codecs.BOM_UTF16_LE) or head.startswith(codecs.BOM_UTF16_BE):
        return Decoded("utf-16", "UTF-16 byte-order mark", True)
    sample = head[:4096]
    nul = sample.count(b"\x00")
    if nul:
        even = sample[0::2].count(b"\x00")
        odd = sample[1::2].count(b"\x00")
        guess = ("text encoding guessed as UTF-16 from the NUL bytes (no byte-order mark); "
                 "give --encoding if the text looks wrong")
        if odd > 0.4 * len(sample) / 2 and even < 0.05 * len(sample) / 2:
            return Decoded("utf-16-le", "NUL bytes in every second position (UTF-16 LE, no BOM)",
                           False, guess)
        if even > 0.4 * len(sample) / 2 and odd < 0.05 * len(sample) / 2:
            return Decoded("utf-16-be", "NUL bytes in every second position (UTF-16 BE, no BOM)",
                           False, guess)
        first_nul = sample.find(b"\x00")
        raise InputFormatError(f"this is a binary file, not a text export (NUL byte at byte "
                               f"{first_nul})", where,
                               "export the spectrum from the instrument software as text "
                               "(CSV or tab-separated)")
    # count the control bytes in C (bytes.translate), and list them only for the message
    if len(sample.translate(None, _NOT_CONTROL)) > 0.01 * len(sample) + 2:
        control = [k for k, b in enumerate(sample) if b < 9 or 13 < b < 32]
        raise InputFormatError(f"this is a binary file, not a text export ({len(control)} control "
                               f"bytes in the first {len(sample)}, the first at byte {control[0]})",
                               where, "export the spectrum as text (CSV or tab-separated)")
    try:
        head.decode("utf-8")
        return Decoded("utf-8", "valid UTF-8", False)
    except UnicodeDecodeError as exc:
        if exc.start >= len(head) - 4:  # a multi-byte character cut by the head boundary
            return Decoded("utf-8", "valid UTF-8", False)
    return Decoded("cp1252", "not valid UTF-8: read as Latin-1 / Windows-1252", False,
                   "text encoding guessed: not valid UTF-8, read as Latin-1 / Windows-1252; "
                   "check µ, ² and ° in the units, or give --encoding")


def file_sha256(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def iter_lines(path: Path, decoded: Decoded) -> Iterator[str]:
    """Stream the decoded lines (without line endings) of a file.

    A decoding error names the line it happened in (the line after the last one yielded).
    """
    errors = "replace" if decoded.encoding == "cp1252" else "strict"
    n = 0
    with open(path, "r", encoding=decoded.encoding, errors=errors, newline=None) as fh:
        try:
            for line in fh:
                n += 1
                yield line.rstrip("\r\n")
        except UnicodeError as exc:  # also "UTF-16 stream does not start with BOM"
            reason = exc.reason if isinstance(exc, UnicodeDecodeError) else str(exc)
            raise InputFormatError(f"the file is not valid {decoded.encoding} text "
                                   f"({reason})", f"{path} line {n + 1}",
                                   "give the encoding with --encoding (e.g. latin-1)") from None


def decode_lines(data: bytes, decoded: Decoded) -> list[str] | None:
    """The lines :func:`iter_lines` would yield for a file holding ``data``, decoded at once.

    For a file read whole (smaller than :data:`HEAD_BYTES`) this avoids reading it again line
    by line. Universal newlines as in text mode: ``\\r\\n`` and ``\\r`` end a line like ``\\n``.
    Returns None where the result could differ from :func:`iter_lines` (a decoding error,
    which the streaming reader reports with its line number, or a codec not known to decode
    the same way at once); the caller then streams the file.

    Examples
    --------
    >>> decode_lines(b"a,1\\r\\nb,2\\rc,3\\n", Decoded("utf-8", "valid UTF-8", False))
    ['a,1', 'b,2', 'c,3']
    """
    try:
        name = codecs.lookup(decoded.encoding).name
    except LookupError:
        return None
    if name == "utf-16" and data.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        pass
    elif name not in _WHOLE_FILE_CODECS:
        return None
    errors = "replace" if decoded.encoding == "cp1252" else "strict"
    try:
        text = data.decode(decoded.encoding, errors)
    except (UnicodeError, LookupError):
        return None
    if "\r" in text:
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    lines = text.split("\n")
    if lines[-1] == "":
        lines.pop()
    return lines
