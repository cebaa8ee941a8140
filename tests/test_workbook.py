"""Spreadsheet workbooks (.xlsx, .ods) as spectrum files (uvcheck.io.workbook).

Cross-checks: workbooks written by openpyxl (.xlsx) and by pandas with odfpy (.ods), general-
purpose open-source libraries, are read by uvcheck and compared with what pandas.read_excel
reads from the same files. Hand-built packages test the cases those writers do not produce,
following the formats' specifications: ECMA-376 Part 1 (SpreadsheetML: shared strings with rich
text runs and phonetic guides, inline strings, rows and cells without references, formulas with
and without a stored result, booleans, errors; the Strict namespace) and OASIS ODF 1.2
(number-columns-repeated / number-rows-repeated padding, comments, covered cells). Every
spectrum here is invented for the test.
"""

from __future__ import annotations

import hashlib
import zipfile
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.errors import InputFormatError
from uvcheck.io import workbook
from uvcheck.io.reader import read_spectrum

WL = np.arange(240.0, 420.0, 0.5)
#: invented: a low-pressure mercury line on a small floor, in µW cm⁻² nm⁻¹
E_UW = 40.0 * np.exp(-0.5 * ((WL - 253.7) / 1.1) ** 2) + 0.02 + 0.001 * np.sin(WL)
UW_TO_SI = 1e-2  # 1 µW cm⁻² = 1e-2 W m⁻² (SI prefixes, ISO 80000-1)


def _frame():
    import pandas as pd

    return pd.DataFrame({"Wavelength (nm)": WL, "Irradiance (µW/cm²/nm)": E_UW})


# ---------------------------------------------------------------------------------------------
# Written by general-purpose libraries, compared with pandas.read_excel
# ---------------------------------------------------------------------------------------------

def test_xlsx_written_by_openpyxl_reads_as_pandas_reads_it(tmp_path):
    import openpyxl
    import pandas as pd

    wb = openpyxl.Workbook()
    info = wb.active
    info.title = "Info"
    info.append(["Invented test unit"])
    info.append(["Distance", "50 cm"])
    data = wb.create_sheet("Spectrum")
    data.append(list(_frame().columns))
    for a, b in zip(WL, E_UW):
        data.append([float(a), float(b)])
    p = tmp_path / "lamp.xlsx"
    wb.save(p)

    spec, rep = read_spectrum(p)
    ref = pd.read_excel(p, sheet_name="Spectrum", engine="openpyxl")
    np.testing.assert_array_equal(spec.wavelength_nm, ref["Wavelength (nm)"].to_numpy())
    np.testing.assert_allclose(spec.values, ref["Irradiance (µW/cm²/nm)"].to_numpy() * UW_TO_SI,
                               rtol=1e-15)
    assert spec.quantity == "irradiance"
    assert rep.value_column == "Irradiance (µW/cm²/nm)"
    assert rep.sha256 == hashlib.sha256(p.read_bytes()).hexdigest()
    assert spec.meta["format"] == "Excel workbook (.xlsx)"
    said = " ".join(rep.warnings)
    assert "'Info' lines 1–3; 'Spectrum' lines 4–" in said and "count the table" in said
    assert rep.measurement_distance_m == pytest.approx(0.5)  # from the Info sheet's row
    assert rep.metadata["sheet"] == "Spectrum"  # the sheet the data come from, not the first


def test_ods_written_by_pandas_reads_as_pandas_reads_it(tmp_path):
    import pandas as pd  # with odfpy as its .ods engine

    p = tmp_path / "lamp.ods"
    _frame().to_excel(p, sheet_name="Messung", index=False, engine="odf")
    spec, rep = read_spectrum(p)
    ref = pd.read_excel(p, engine="odf")
    np.testing.assert_allclose(spec.wavelength_nm, ref["Wavelength (nm)"].to_numpy(), rtol=1e-15)
    np.testing.assert_allclose(spec.values, ref["Irradiance (µW/cm²/nm)"].to_numpy() * UW_TO_SI,
                               rtol=1e-15)
    assert spec.meta["format"] == "OpenDocument spreadsheet (.ods)"
    assert "'Messung' lines 1–" in " ".join(rep.warnings)


def test_assess_and_batch_take_a_workbook(tmp_path):
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["nm", "W/m2/nm"])
    for a, b in zip(WL, E_UW * UW_TO_SI):
        ws.append([float(a), float(b)])
    folder = tmp_path / "in"
    folder.mkdir()
    wb.save(folder / "tube.xlsx")
    r = CliRunner().invoke(app, ["assess", str(folder / "tube.xlsx")])
    assert r.exit_code == 0, r.output
    assert "Excel workbook (.xlsx)" in r.output and "253.7 nm" in r.output
    out = tmp_path / "summary.csv"
    r = CliRunner().invoke(app, ["batch", str(folder), "--out", str(out)])
    assert r.exit_code == 0, r.output
    text = out.read_text(encoding="utf-8")
    assert "tube.xlsx" in text and ",ok," in text


# ---------------------------------------------------------------------------------------------
# Hand-built packages (ECMA-376 Part 1; OASIS ODF 1.2)
# ---------------------------------------------------------------------------------------------

MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
RELS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
STRICT_MAIN = "http://purl.oclc.org/ooxml/spreadsheetml/main"
STRICT_RELS = "http://purl.oclc.org/ooxml/officeDocument/relationships"


def _xlsx(path: Path, sheets: list[tuple[str, str]], strings: list[str] | None = None,
          strict: bool = False, states: dict[str, str] | None = None) -> Path:
    """A minimal SpreadsheetML package: sheets as (name, sheetData inner XML)."""
    main, rels = (STRICT_MAIN, STRICT_RELS) if strict else (MAIN, RELS)
    states = states or {}
    with zipfile.ZipFile(path, "w") as z:
        z.writestr("[Content_Types].xml", '<?xml version="1.0"?><Types xmlns="http://schemas.'
                   'openxmlformats.org/package/2006/content-types"/>')
        z.writestr("xl/workbook.xml", f'<workbook xmlns="{main}" xmlns:r="{rels}"><sheets>' + "".join(
            f'<sheet name="{n}" sheetId="{k}" r:id="rId{k}"'
            + (f' state="{states[n]}"' if n in states else "") + "/>"
            for k, (n, _) in enumerate(sheets, 1)) + "</sheets></workbook>")
        z.writestr("xl/_rels/workbook.xml.rels",
                   '<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/'
                   'relationships">' + "".join(
                       f'<Relationship Id="rId{k}" Type="x" Target="worksheets/sheet{k}.xml"/>'
                       for k in range(1, len(sheets) + 1)) + "</Relationships>")
        for k, (_, body) in enumerate(sheets, 1):
            z.writestr(f"xl/worksheets/sheet{k}.xml",
                       f'<worksheet xmlns="{main}"><sheetData>{body}</sheetData></worksheet>')
        if strings is not None:
            z.writestr("xl/sharedStrings.xml",
                       f'<sst xmlns="{main}">' + "".join(strings) + "</sst>")
    return path


def _rows(wl, e, first_row=2) -> str:
    return "".join(f'<row r="{first_row + i}"><c r="A{first_row + i}"><v>{a!r}</v></c>'
                   f'<c r="B{first_row + i}"><v>{b!r}</v></c></row>'
                   for i, (a, b) in enumerate(zip(wl, e)))


def test_xlsx_cells_of_every_kind(tmp_path):
    strings = ['<si><t>Wavelength</t></si>',
               '<si><r><t>Irradiance </t></r><r><rPr/><t>(W/m2/nm)</t></r>'
               '<rPh sb="0" eb="1"><t>PHONETIC</t></rPh></si>',
               '<si><t>a\ttab and\na break</t></si>']
    body = ('<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c>'
            '<c r="D1" t="inlineStr"><is><t>note</t></is></c></row>'
            # row 2 is left out (empty), row 3 has cells without references
            '<row r="3"><c><v>240</v></c><c><f>1+1</f><v>2.5E-3</v></c></row>'
            '<row><c r="A4"><v>241</v></c><c r="B4"><f>X1</f></c></row>'       # no result
            '<row r="5"><c r="A5"><v>242</v></c><c r="B5" t="e"><v>#N/A</v></c></row>'
            '<row r="6"><c r="A6"><v>243</v></c><c r="B6" t="str"><f>T()</f><v>3e-3</v></c>'
            '<c r="C6" t="b"><v>1</v></c><c r="E6" t="s"><v>2</v></c></row>'
            # formatted but empty cells at the sheet's last row: padding, no lines
            '<row r="1048576"><c r="A1048576" s="1"/></row>')
    p = _xlsx(tmp_path / "cells.xlsx", [("Data", body)], strings)
    t = workbook.as_table(p, "xlsx")
    table, warning, what, placed = t.text, t.warning, t.format, t.placed
    assert table.decode("utf-8").split("\n") == [
        "sheet: Data",
        "Wavelength\tIrradiance (W/m2/nm)\t\tnote",
        "",
        "240\t0.0025",
        "241",
        "242\t#N/A",
        "243\t3e-3",   # the text cells beside the row's numbers are left out, and said so
        ""]
    assert "1 formula cell(s) hold no stored result" in warning
    assert "2 text cell(s) beside the numbers of data rows were left out (the first: 'TRUE', " \
        "sheet 'Data' row 6)" in warning
    assert placed == "'Data' lines 1–7" and what == "Excel workbook (.xlsx)"


def test_a_note_beside_the_numbers_and_offset_columns(tmp_path):
    # A workbook laid out by hand: the table starts in column C, row 5, and a note sits in
    # column F of the first data row. The note used to make that row unreadable as data,
    # which lost the first sample and hid the heading above it (the spectrum was read as
    # relative, its columns unnamed). Invented data.
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Messung"
    ws["C3"], ws["D3"] = "Abstand", "30 cm"
    ws["C5"], ws["D5"] = "Wellenlänge / nm", "E / (µW/cm²/nm)"
    for i, (a, b) in enumerate(zip(WL, E_UW)):
        ws.cell(row=6 + i, column=3, value=float(a))
        ws.cell(row=6 + i, column=4, value=float(b))
    ws["F6"] = "note: calibrated 2026-05"
    p = tmp_path / "by_hand.xlsx"
    wb.save(p)
    spec, rep = read_spectrum(p)
    np.testing.assert_array_equal(spec.wavelength_nm, WL)           # the first row is kept
    np.testing.assert_allclose(spec.values, E_UW * UW_TO_SI, rtol=1e-15)
    assert rep.value_column == "E / (µW/cm²/nm)" and spec.quantity == "irradiance"
    assert rep.measurement_distance_m == pytest.approx(0.3)
    assert "(the first: 'note: calibrated 2026-05', sheet 'Messung' row 6)" in " ".join(rep.warnings)


def test_xlsx_strict_namespace_hidden_sheet_and_two_spectra(tmp_path):
    e = 1e-3 * np.exp(-0.5 * ((WL - 300.0) / 5.0) ** 2) + 1e-6
    head = '<row r="1"><c r="A1" t="inlineStr"><is><t>nm</t></is></c>' \
           '<c r="B1" t="inlineStr"><is><t>W/m2/nm</t></is></c></row>'
    p = _xlsx(tmp_path / "strict.xlsx", [("Notes", '<row r="1"><c r="A1" t="inlineStr"><is>'
                                                   '<t>invented</t></is></c></row>'),
                                         ("Scan 1", head + _rows(WL, e)),
                                         ("Scan 2", head + _rows(WL, 2 * e))],
              strict=True, states={"Notes": "hidden"})
    with pytest.raises(InputFormatError) as exc:
        read_spectrum(p)
    said = exc.value.one_line()
    # the blocks' line numbers, and where each sheet is in the table they count
    assert "data blocks" in said and "'Notes' (hidden) lines 1–2" in said
    assert f"'Scan 2' lines {3 + 1 + WL.size + 1}–" in said  # after 'Scan 1': label, heading, rows
    spec, _ = read_spectrum(p, block=1)
    np.testing.assert_allclose(spec.values, e, rtol=1e-15)
    start = 3 + 1 + WL.size + 1 + 2  # 'sheet: Scan 2' line, its heading, then the first row
    # both blocks are listed, numbered as --block counts them (the second lies beyond the
    # sample the format is chosen on)
    assert f"2: lines {start}–" in said and "--block N" in said
    for spec2, rep2 in (read_spectrum(p, block=2), read_spectrum(p, data_start=start)):
        np.testing.assert_allclose(spec2.values, 2 * e, rtol=1e-15)
        assert rep2.metadata["sheet"] == "Scan 2"


ODS_NS = ('xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" '
          'xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" '
          'xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0"')


def _ods(path: Path, tables: str) -> Path:
    with zipfile.ZipFile(path, "w") as z:
        z.writestr("mimetype", workbook.ODS_MIMETYPE)  # first and stored, as ODF 1.2 asks
        z.writestr("content.xml", f'<office:document-content {ODS_NS}><office:body>'
                   f'<office:spreadsheet>{tables}</office:spreadsheet></office:body>'
                   '</office:document-content>')
    return path


def _cell(v: float | None = None, text: str | None = None, extra: str = "") -> str:
    if v is not None:
        return (f'<table:table-cell office:value-type="float" office:value="{v!r}"{extra}>'
                f"<text:p>{v:.2f}</text:p></table:table-cell>")  # displayed rounded
    return f'<table:table-cell{extra}><text:p>{text}</text:p></table:table-cell>'


def test_ods_repeats_comments_and_stored_precision(tmp_path):
    rows = ('<table:table-row>' + _cell(text="nm") + _cell(
                text="E", extra="") .replace("<text:p>E</text:p>",
                                             "<office:annotation><text:p>a comment</text:p>"
                                             "</office:annotation><text:p>E (W/m2/nm)</text:p>")
            + '<table:table-cell table:number-columns-repeated="16382"/></table:table-row>'
            '<table:table-row table:number-rows-repeated="2"><table:table-cell/></table:table-row>'
            + "".join(f'<table:table-row>{_cell(float(a))}{_cell(float(b))}'
                      '<table:covered-table-cell/></table:table-row>'
                      for a, b in zip(WL[:3], [1.23456e-3, 2.5e-3, 3.75e-3]))
            + '<table:table-row table:number-rows-repeated="1048000">'
              '<table:table-cell table:number-columns-repeated="1024"/></table:table-row>')
    p = _ods(tmp_path / "pad.ods", f'<table:table table:name="Blatt 1">{rows}</table:table>')
    t = workbook.as_table(p, "ods")
    table, warning, what, placed = t.text, t.warning, t.format, t.placed
    assert table.decode("utf-8").split("\n") == [
        "sheet: Blatt 1", "nm\tE (W/m2/nm)", "", "",
        "240\t0.00123456", "240.5\t0.0025", "241\t0.00375", ""]  # stored, not displayed
    assert placed == "'Blatt 1' lines 1–7" and what == "OpenDocument spreadsheet (.ods)"


# ---------------------------------------------------------------------------------------------
# Refused, with what to do
# ---------------------------------------------------------------------------------------------

def test_legacy_xls_other_zip_and_damaged_zip_are_refused(tmp_path):
    xls = tmp_path / "old.xls"
    xls.write_bytes(workbook.OLE2_MAGIC + bytes(600))
    with pytest.raises(InputFormatError, match=r"Excel 97–2003 \.xls") as exc:
        read_spectrum(xls)
    assert "CSV" in exc.value.todo
    z = tmp_path / "photos.zip"
    with zipfile.ZipFile(z, "w") as f:
        f.writestr("spectrum.csv", "nm,W/m2/nm\n250,1\n")
    with pytest.raises(InputFormatError, match="ZIP archive, not a spectrum"):
        read_spectrum(z)
    cut = tmp_path / "cut.xlsx"
    cut.write_bytes(workbook.ZIP_MAGIC + b"\x14\x00" + bytes(40))
    with pytest.raises(InputFormatError, match="damaged or incomplete ZIP"):
        read_spectrum(cut)


def test_a_workbook_without_numbers_says_so(tmp_path):
    p = _xlsx(tmp_path / "words.xlsx", [("Only", '<row r="1"><c r="A1" t="inlineStr"><is>'
                                                  '<t>no data here</t></is></c></row>')])
    with pytest.raises(InputFormatError, match="in the table made of the workbook: 'Only'"):
        read_spectrum(p)


def test_damaged_workbook_parts_give_a_reading_error_not_a_crash(tmp_path):
    # every XML part of a small valid workbook damaged in turn (bytes cut, flipped or made
    # nonsense, seeded): the reader either reads it or raises InputFormatError naming the
    # file, never another exception (a batch turns that into an 'internal error' row)
    import random

    e = 1e-3 * np.exp(-0.5 * ((WL - 300.0) / 5.0) ** 2) + 1e-6
    strings = ['<si><t>nm</t></si>', '<si><t>W/m2/nm</t></si>']
    head = '<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c></row>'
    good = _xlsx(tmp_path / "good.xlsx", [("Data", head + _rows(WL, e))], strings)
    read_spectrum(good)
    with zipfile.ZipFile(good) as z:
        parts = {n: z.read(n) for n in z.namelist()}
    rng = random.Random(62471)
    for k in range(60):
        name = rng.choice([n for n in parts if n.endswith((".xml", ".rels"))])
        data = bytearray(parts[name])
        how = k % 3
        if how == 0:
            data = data[:rng.randrange(len(data))]
        elif how == 1:
            for _ in range(5):
                data[rng.randrange(len(data))] = rng.randrange(256)
        else:
            data = data.replace(b'"1"', b'"x"').replace(b"<v>0</v>", b"<v>99</v>")
        p = tmp_path / f"bad{k}.xlsx"
        with zipfile.ZipFile(p, "w") as z:
            for n, b in parts.items():
                z.writestr(n, bytes(data) if n == name else b)
        try:
            read_spectrum(p)
        except InputFormatError as exc:
            assert str(p) in exc.one_line()
