"""Access to the reference tables shipped in ``data/`` (installed as ``uvcheck/data``).

Tables are CSV files whose leading ``#`` lines are their provenance header; each table is
parsed once per process. The project never reads anything outside its own data folder.
"""

from __future__ import annotations

import csv
import hashlib
import io
import tomllib
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

from uvcheck.errors import ConfigurationError


@lru_cache(maxsize=1)
def data_root() -> Path:
    """The data folder: ``uvcheck/data`` in an installed wheel, ``data/`` in a checkout."""
    here = Path(__file__).resolve().parent
    for cand in (here / "data", here.parent / "data"):
        if (cand / "README.md").is_file():
            return cand
    raise ConfigurationError("uvcheck's reference data folder is missing",
                             str(here), "reinstall uvcheck (pip install .)")


def data_path(*parts: str) -> Path:
    return data_root().joinpath(*parts)


@dataclass(frozen=True)
class Table:
    """A CSV reference table: provenance header, column names, rows of text cells."""

    path: str
    header: tuple[str, ...]
    columns: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]

    def column(self, name: str) -> list[str]:
        try:
            i = self.columns.index(name)
        except ValueError:
            raise ConfigurationError(f"table {self.path} has no column {name!r}; "
                                     f"columns: {', '.join(self.columns)}") from None
        return [r[i] if i < len(r) else "" for r in self.rows]

    def floats(self, name: str) -> list[float]:
        return [float(x) for x in self.column(name)]

    def records(self) -> list[dict[str, str]]:
        return [dict(zip(self.columns, r)) for r in self.rows]


@lru_cache(maxsize=None)
def read_table(relpath: str) -> Table:
    """Parse ``data/<relpath>`` once: '#' header lines, then a CSV with a header row."""
    p = data_path(*relpath.split("/"))
    text = p.read_text(encoding="utf-8")
    header, body = [], []
    for line in text.splitlines():
        if not body and line.startswith("#"):
            header.append(line[1:].strip())
        elif line.strip():
            body.append(line)
    if any('"' in line for line in body):
        reader = csv.reader(io.StringIO("\n".join(body)))
        rows = [tuple(c.strip() for c in r) for r in reader]
    else:  # no quoting: a plain split gives the same cells, several times faster
        rows = [tuple(c.strip() for c in line.split(",")) for line in body]
    return Table(path=relpath, header=tuple(header), columns=rows[0], rows=tuple(rows[1:]))


@lru_cache(maxsize=None)
def read_toml(relpath: str) -> dict[str, Any]:
    with open(data_path(*relpath.split("/")), "rb") as fh:
        return tomllib.load(fh)


def sha256_of(relpath: str) -> str:
    return hashlib.sha256(data_path(*relpath.split("/")).read_bytes()).hexdigest()
