"""read_table's plain split (tables without quotes) gives exactly what the csv module gives."""

from __future__ import annotations

import csv
import io

import pytest

from uvcheck import data_files as D

TABLES = sorted(str(p.relative_to(D.data_root())) for p in D.data_root().rglob("*.csv"))


@pytest.mark.parametrize("rel", TABLES)
def test_every_table_reads_as_the_csv_module_reads_it(rel):
    text = D.data_path(*rel.split("/")).read_text(encoding="utf-8")
    lines = text.splitlines()
    k = 0
    while k < len(lines) and lines[k].startswith("#"):
        k += 1
    body = [ln for ln in lines[k:] if ln.strip()]
    ref = [tuple(c.strip() for c in r) for r in csv.reader(io.StringIO("\n".join(body)))]
    t = D.read_table(rel)
    assert (t.columns,) + t.rows == tuple(ref)


def test_quoted_cells_take_the_csv_module(tmp_path, monkeypatch):
    (tmp_path / "README.md").write_text("x")
    (tmp_path / "q.csv").write_text('# provenance\na,b\n"1,5", x\n2,y\n', encoding="utf-8")
    monkeypatch.setattr(D, "data_root", lambda: tmp_path)
    t = D.read_table.__wrapped__("q.csv")
    assert t.rows == (("1,5", "x"), ("2", "y"))
