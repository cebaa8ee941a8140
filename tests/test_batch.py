"""Batch screening (issue 8): products from folders and manifests, rows derived from the same
result as ``uvcheck assess --json``, error rows, order, resume, neutralised CSV; and the speed
paths of issue 8 (each must give exactly what the plain path gives).

Every spectrum here is invented test data, written by the tests. Expected numbers are either
analytic (a flat spectrum integrates exactly under the trapezoid rule) or the numbers the
``assess`` command itself writes for the same file (the point of those tests is that batch and
assess agree, not the values).
"""

from __future__ import annotations

import csv
import io
import json
import math
import threading
from dataclasses import replace
from pathlib import Path
from unittest import mock

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck import batch as B
from uvcheck.cli import app
from uvcheck.errors import InputFormatError, OutputExistsError, UnitError, UvcheckError

runner = CliRunner()
EXAMPLES = Path(__file__).resolve().parents[1] / "examples"


def write_spectrum(path: Path, wl: np.ndarray, v: np.ndarray,
                   unit: str = "W/m2/nm") -> Path:
    path.write_text(f"Wavelength (nm),Irradiance ({unit})\n"
                    + "\n".join(f"{a:.3f},{b:.9e}" for a, b in zip(wl, v)) + "\n",
                    encoding="utf-8")
    return path


def flat_uvc(path: Path, level: float = 1e-3) -> Path:
    """1e-3 W m⁻² nm⁻¹ from 200 to 300 nm, zero up to 800 nm (invented)."""
    wl = np.arange(200.0, 801.0, 1.0)
    return write_spectrum(path, wl, np.where(wl <= 300.0, level, 0.0))


def blue_led(path: Path, seed: int = 0) -> Path:
    """A blue LED on a small noisy floor, 200-1100 nm (invented)."""
    wl = np.linspace(200.0, 1100.0, 1800)
    rng = np.random.default_rng(seed)
    v = gaussian(wl, 450.0 + seed, 10.0, 0.5) + 1e-6 + rng.normal(0, 2e-7, wl.size)
    return write_spectrum(path, wl, v)


def read_rows(path: Path) -> list[dict[str, str]]:
    text = path.read_bytes().decode("utf-8")
    return list(csv.DictReader(io.StringIO(text, newline="")))


def read_jsonl(path: Path) -> list[dict]:
    return [json.loads(x) for x in path.read_text(encoding="utf-8").splitlines()]


def settings(**kw) -> B.BatchSettings:
    return B.BatchSettings(**kw)


# ---------------------------------------------------------------------------------------------
# Products: folders and manifests
# ---------------------------------------------------------------------------------------------

def test_folder_pairs_spectra_and_listings_by_stem(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "b.csv")
    blue_led(d / "a.txt")
    (d / "a.toml").write_text((EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml").read_text(
        encoding="utf-8"), encoding="utf-8")
    (d / "c.toml").write_text("", encoding="utf-8")
    (d / ".hidden.csv").write_text("x", encoding="utf-8")
    (d / "notes.md").write_text("not a spectrum", encoding="utf-8")
    blue_led(d / "dup.csv")
    blue_led(d / "dup.tsv")
    ps = B.scan_folder(d, exclude=[d / "b.csv"])
    assert [p.product_id for p in ps] == ["a", "c", "dup"]      # sorted stems; b.csv excluded
    a, c, dup = ps
    assert (a.spectrum.name, a.listing.name) == ("a.txt", "a.toml")
    assert c.spectrum is None and c.listing.name == "c.toml"  # a listing screening
    assert dup.problem and "dup.csv, dup.tsv" in dup.problem
    # an excluded file is also left out when it is reached through a link of another name
    (d / "z.csv").symlink_to(d / "b.csv")
    assert [p.product_id for p in B.scan_folder(d, exclude=[d / "b.csv"])] == ["a", "c", "dup"]
    assert "z" in [p.product_id for p in B.scan_folder(d)]


def test_manifest_columns_comments_and_paths(tmp_path):
    (tmp_path / "sp").mkdir()
    m = tmp_path / "m.csv"
    m.write_text("\ufeff# products of the invented shop\n"
                 "Spectrum;Listing;Distance;id\n"
                 "sp/one.csv;;20 cm;first\n"
                 "\n"
                 ";lst/two.toml;;\n"
                 "sp/three.csv;;;\n", encoding="utf-8")
    ps = B.read_manifest(m)
    assert [p.product_id for p in ps] == ["first", "two", "three"]
    assert ps[0].spectrum == tmp_path / "sp" / "one.csv" and ps[0].options == {"distance": "20 cm"}
    assert ps[1].spectrum is None and ps[1].listing == tmp_path / "lst" / "two.toml"
    assert ps[0].spectrum_label == "sp/one.csv"


@pytest.mark.parametrize("text, message", [
    ("spectrum,colour\na.csv,red\n", "line 1: unknown manifest column 'colour'. The columns are"),
    ("spectrum\na.csv\na.csv\n", "product id 'a' appears twice .lines 2 and 3."),
    ("id,distance\nx,1 m\n", "neither a 'spectrum' nor a 'listing' column"),
    ("# only a comment\n", "the manifest is empty"),
    ("spectrum,id\na.csv,x,extra\n", "line 2: 3 cells but 2 columns"),
])
def test_manifest_errors_name_the_line(tmp_path, text, message):
    m = tmp_path / "m.csv"
    m.write_text(text, encoding="utf-8")
    with pytest.raises(InputFormatError, match=message):
        B.read_manifest(m)


def test_note_names_are_safe_and_unique(tmp_path):
    ps = [B.Product("a/b", None, None), B.Product("a_b", None, None), B.Product('x:"y"', None, None)]
    names = [p.note.name for p in B.assign_notes(ps, tmp_path)]
    assert names == ["a_b.html", "a_b-2.html", "x__y_.html"]


# ---------------------------------------------------------------------------------------------
# Rows
# ---------------------------------------------------------------------------------------------

def test_flat_uvc_row_is_the_analytic_integral(tmp_path):
    # analytic: 1e-3 W m^-2 nm^-1 over 200-280 nm is 0.08 W m^-2 (trapezoid exact on a flat
    # spectrum); the peak is the first sample of the flat top (numpy.argmax takes the first)
    p = B.Product("flat", flat_uvc(tmp_path / "flat.csv"), None, "flat.csv",
                  options={"distance": "1 m"})
    row = B.run_product(p, settings())
    assert row["status"] == "ok" and row["error"] is None
    assert row["uvc_W_m2"] == pytest.approx(0.08, rel=1e-6)
    assert row["uvc_status"] == "complete" and row["peak_nm"] == 200.0
    assert row["origin"] == "measured"
    assert row["claims_holds"] is None  # no listing: no counts (not zeros)


def test_row_equals_what_assess_json_writes(tmp_path):
    # the row must carry the numbers `uvcheck assess --json` writes for the same inputs
    spec = EXAMPLES / "spectra" / "wand_395nm_led.csv"
    lst = EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml"
    out = tmp_path / "a.json"
    r = runner.invoke(app, ["assess", str(spec), "--claims", str(lst), "--json", str(out),
                            "--distance", "10 cm", "--no-uncertainty", "--quiet"])
    assert r.exit_code == 0, r.output
    d = json.loads(out.read_text(encoding="utf-8"))
    row = B.run_product(B.Product("wand", spec, lst, "w.csv", "w.toml", {"distance": "10 cm"}),
                        settings())
    assert row["peak_nm"] == d["spectral"]["peak_nm"]
    assert row["uvc_status"] == d["germicidal"]["uvc"]["status"]
    assert row["uvc_W_m2"] == d["germicidal"]["uvc"]["value"]
    assert row["risk_group"] == d["risk_group"]["group"]
    assert row["risk_group_is_lower_bound"] == d["risk_group"]["is_lower_bound"]
    assert row["governing_hazard"] == d["risk_group"]["governing"]
    counts = d["claims_summary"]["counts"]
    assert (row["claims_holds"], row["claims_unlikely"], row["claims_cannot_hold"],
            row["claims_not_assessable"]) == (counts["holds"], counts["unlikely"],
                                              counts["cannot-hold"], counts["not-assessable"])
    worst = B.worst_claim(d["claims"])
    assert (row["worst_claim_id"], row["worst_claim_verdict"], row["worst_claim_ratio"]) == (
        worst["id"], worst["verdict"], worst["ratio"])
    assert row["worst_claim_verdict"] == "cannot-hold"  # the listing's "254 nm" cannot hold


def test_manifest_block_and_data_start_pick_a_sheet_of_a_workbook(tmp_path):
    # an invented workbook with one flat-UV-C scan per sheet (1e-3 and 2e-3 W m⁻² nm⁻¹ over
    # 200–300 nm): without a block the file is ambiguous (an error row naming the sheets);
    # `block` reads the first scan, `data_start` the second (analytic UV-C 0.08 and 0.16 W m⁻²
    # over 200–280 nm, trapezoid exact on a flat spectrum). A cell that is no whole number is
    # the product's error row.
    import openpyxl

    wl = np.arange(200.0, 801.0, 1.0)
    wb = openpyxl.Workbook()
    for k, level in enumerate((1e-3, 2e-3)):
        ws = wb.active if k == 0 else wb.create_sheet()
        ws.title = f"Scan {k + 1}"
        ws.append(["Wavelength (nm)", "Irradiance (W/m2/nm)"])
        for a in wl:
            ws.append([float(a), level if a <= 300.0 else 0.0])
    wb.save(tmp_path / "two.xlsx")
    start = 1 + 1 + wl.size + 1 + 2   # sheet line, heading, rows; then sheet line, heading
    m = tmp_path / "manifest.csv"
    m.write_text("id,spectrum,distance,block,data_start\n"
                 "none,two.xlsx,1 m,,\n"
                 f"first,two.xlsx,1 m,1,\nsecond,two.xlsx,1 m,,{start}\n"
                 "bad,two.xlsx,1 m,first,\n", encoding="utf-8")
    rows = {r["product_id"]: r for r in (B.run_product(p, settings())
                                         for p in B.read_manifest(m))}
    assert rows["none"]["status"] == "error" and "'Scan 2' lines" in rows["none"]["error"]
    assert rows["first"]["uvc_W_m2"] == pytest.approx(0.08, rel=1e-6)
    assert rows["second"]["uvc_W_m2"] == pytest.approx(0.16, rel=1e-6)
    assert rows["bad"]["status"] == "error" and "'block'" in rows["bad"]["error"]
    assert "not a whole number" in rows["bad"]["error"]


def test_listing_only_row_is_marked_nominal(tmp_path):
    lst = EXAMPLES / "listings" / "uvc_box_48_leds_8w.toml"
    row = B.run_product(B.Product("box", None, lst, "", "box.toml"), settings())
    assert row["status"] == "ok" and row["origin"] == "nominal"
    assert row["worst_claim_verdict"] in B.VERDICT_ORDER


def test_worst_claim_order():
    claims = [{"id": "h", "verdict": "holds", "ratio": 0.9},
              {"id": "n", "verdict": "not-assessable", "ratio": None},
              {"id": "u1", "verdict": "unlikely", "ratio": 0.7},
              {"id": "u2", "verdict": "unlikely", "ratio": 0.6},
              {"id": "u3", "verdict": "unlikely", "ratio": 0.6}]
    assert B.worst_claim(claims)["id"] == "u2"   # worst verdict, smallest ratio, first listed
    assert B.worst_claim(claims[:2])["id"] == "n"
    assert B.worst_claim([]) is None


def test_a_bad_file_is_an_error_row_and_the_batch_goes_on(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "good.csv")
    (d / "bad.csv").write_text("this is no spectrum\n", encoding="utf-8")
    (d / "binary.dat").write_bytes(bytes(range(256)) * 4)
    s = B.run_batch(d, tmp_path / "s.csv", settings(), jobs=1)
    rows = {r["product_id"]: r for r in read_rows(tmp_path / "s.csv")}
    assert (s.products, s.errors) == (3, 2)
    assert rows["good"]["status"] == "ok" and rows["good"]["error"] == ""
    assert rows["bad"]["status"] == "error" and "no rows of numbers found" in rows["bad"]["error"]
    assert "binary file" in rows["binary"]["error"]


def test_import_warnings_reach_the_row(tmp_path):
    # a spectrum normalised to a peak of 1 but labelled W/m2/nm (invented): the reader warns
    # that every figure may be meaningless; the summary row says so instead of staying silent
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "clean.csv")
    wl = np.linspace(300.0, 800.0, 1001)
    v = gaussian(wl, 450.0, 10.0, 1.0) + np.random.default_rng(2).normal(0, 1e-4, wl.size)
    v = np.minimum(v, 1.0)
    v[np.argmin(np.abs(wl - 450.0))] = 1.0            # the peak written as exactly 1
    write_spectrum(d / "normalised.csv", wl, v)
    B.run_batch(d, tmp_path / "s.csv", settings(), jobs=1)
    rows = {r["product_id"]: r for r in read_rows(tmp_path / "s.csv")}
    assert rows["clean"]["import_warnings"] == "0" and rows["clean"]["first_import_warning"] == ""
    warned = _all_import_warnings(d / "normalised.csv")
    assert any("normalised to a peak of 1" in w for w in warned)
    assert rows["normalised"]["import_warnings"] == str(len(warned))
    assert rows["normalised"]["first_import_warning"] == B.first_warning(warned)
    assert "normalised to a peak of 1" in rows["normalised"]["first_import_warning"]
    # the JSON lines carry the same count
    recs = [json.loads(ln) for ln in (tmp_path / "s.jsonl").read_text(encoding="utf-8").splitlines()]
    assert {r["product_id"]: r["import_warnings"] for r in recs} == {
        "clean": 0, "normalised": int(rows["normalised"]["import_warnings"])}


def test_the_rows_warning_is_the_one_that_matters_most(tmp_path):
    # An export with a pixel-index column and a dark level left in (invented): the reader
    # warns of the ignored index column first, in reading order, and of the offset later;
    # the offset changes every figure, so the row shows it (our own ranking, WARNING_RANKS).
    wl = np.linspace(250.0, 800.0, 1200)
    v = 1e-3 + gaussian(wl, 450.0, 10.0, 0.05) + np.random.default_rng(4).normal(0, 2e-6, wl.size)
    p = tmp_path / "offset.csv"
    p.write_text("Pixel,Wavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
        f"{k},{a:.3f},{b:.6e}" for k, (a, b) in enumerate(zip(wl, v))) + "\n", encoding="utf-8")
    warned = _all_import_warnings(p)
    assert "was ignored" in warned[0]
    offset = next(w for w in warned if "dark (background)" in w)
    row = B.run_product(B.Product("offset", p, None, "offset.csv"), settings())
    assert row["first_import_warning"] == offset
    assert B.first_warning([]) is None
    assert B.warning_rank("the mean of 3 scans (a, b, c) is assessed; their totals differ by "
                          "1%") == 2
    assert B.warning_rank("the 3 repeat scans differ by 7.0% in total (more than 5%): a lamp "
                          "not yet stable") == 0


def _all_import_warnings(path):
    from uvcheck.io.reader import read_spectrum

    return read_spectrum(path)[1].warnings


def test_unexpected_exception_becomes_an_error_row(tmp_path):
    p = B.Product("x", blue_led(tmp_path / "x.csv"), None, "x.csv")
    with mock.patch.object(B, "prepare_product", side_effect=ZeroDivisionError("boom")):
        row = B.run_product(p, settings())
        # the same in a chunk, whose first stage reads every file before any is assessed
        (chunk_row,) = B._run_chunk(([p], settings()))
    assert row["status"] == "error" and "internal error (ZeroDivisionError: boom)" in row["error"]
    assert chunk_row == row
    # and where the assessment itself fails
    from uvcheck.pipeline import Prepared

    with mock.patch.object(Prepared, "assess", side_effect=ZeroDivisionError("late")):
        (late,) = B._run_chunk(([p], settings()))
    assert late["status"] == "error" and "ZeroDivisionError: late" in late["error"]


def leds_and_a_bad_file(folder: Path, n: int, bad_name: str, bad: str) -> Path:
    """A folder of n invented blue-LED spectra and one file that is no spectrum."""
    folder.mkdir()
    for k in range(n):
        blue_led(folder / f"lamp{k}.csv", seed=k)
    (folder / bad_name).write_text(bad, encoding="utf-8")
    return folder


def test_a_chunk_gives_the_rows_of_one_product_at_a_time(tmp_path):
    # _run_chunk reads the files of a group, then assesses them: the same rows, in the same
    # order, as run_product product by product; with a group limit of one sample too
    d = leds_and_a_bad_file(tmp_path / "in", 4, "bad.csv", "no numbers here\n")
    (d / "q.toml").write_text((EXAMPLES / "listings" / "uvc_box_48_leds_8w.toml").read_text(
        encoding="utf-8"), encoding="utf-8")
    products = B.scan_folder(d)
    one_by_one = [B.run_product(p, settings()) for p in products]
    assert B._run_chunk((products, settings())) == one_by_one
    with mock.patch.object(B, "STAGE_SAMPLES", 1):
        assert B._run_chunk((products, settings())) == one_by_one
    assert [r["status"] for r in one_by_one].count("error") == 1


# ---------------------------------------------------------------------------------------------
# Output: neutralised CSV, JSON lines, order, resume, no overwriting
# ---------------------------------------------------------------------------------------------

def test_formulas_are_neutralised_in_csv_not_in_json(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "=HYPERLINK(1).csv")
    blue_led(d / "@SUM.csv")
    B.run_batch(d, tmp_path / "s.csv", settings(), jobs=1)
    raw = (tmp_path / "s.csv").read_bytes().decode("utf-8")
    cells = list(csv.reader(io.StringIO(raw, newline="")))
    ids = [c[0] for c in cells[1:]]
    assert ids == ["'=HYPERLINK(1)", "'@SUM"]   # OWASP CSV injection: leading apostrophe
    assert cells[0] == list(B.SUMMARY_COLUMNS) and raw.count("\r\n") == 3   # RFC 4180 CRLF
    assert [r["product_id"] for r in read_jsonl(tmp_path / "s.jsonl")] == ["=HYPERLINK(1)", "@SUM"]


def test_output_does_not_depend_on_the_number_of_processes(tmp_path):
    d = leds_and_a_bad_file(tmp_path / "in", 7, "broken.csv", "1,2\n")
    B.run_batch(d, tmp_path / "one.csv", settings(), jobs=1)
    B.run_batch(d, tmp_path / "two.csv", settings(), jobs=2)
    assert (tmp_path / "one.csv").read_bytes() == (tmp_path / "two.csv").read_bytes()
    assert (tmp_path / "one.jsonl").read_bytes() == (tmp_path / "two.jsonl").read_bytes()
    assert [r["product_id"] for r in read_jsonl(tmp_path / "one.jsonl")] == [
        "broken"] + [f"lamp{k}" for k in range(7)]
    assert not list(tmp_path.glob("*.part"))


def test_existing_summary_is_not_replaced_without_force(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "a.csv")
    out = tmp_path / "s.csv"
    out.write_text("precious", encoding="utf-8")
    with pytest.raises(OutputExistsError, match="exists.*--resume.*--force"):
        B.run_batch(d, out, settings(), jobs=1)
    assert out.read_text(encoding="utf-8") == "precious"
    with pytest.raises(UvcheckError, match="not both"):
        B.run_batch(d, out, settings(), jobs=1, force=True, resume=True)
    with pytest.raises(UvcheckError, match="does not end in .csv"):
        B.run_batch(d, tmp_path / "s.txt", settings(), jobs=1)


def test_resume_keeps_finished_rows_and_redoes_the_rest(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    for k in range(4):
        blue_led(d / f"l{k}.csv", seed=k)
    (d / "l4.csv").write_text("broken\n", encoding="utf-8")
    fresh = tmp_path / "fresh.csv"
    B.run_batch(d, fresh, settings(), jobs=1)
    # an interrupted run: two rows finished, the third cut short, nothing renamed yet
    out = tmp_path / "s.csv"
    lines = fresh.read_bytes().split(b"\r\n")
    B.part_path(out).write_bytes(b"\r\n".join(lines[:3]) + b"\r\n" + lines[3][:20])
    jl = (tmp_path / "fresh.jsonl").read_text(encoding="utf-8").splitlines(True)
    B.part_path(B.jsonl_path(out)).write_text("".join(jl[:2]) + jl[2][:30], encoding="utf-8")
    calls = []
    real = B.run_product

    def counting(p, s, *prepared):
        calls.append(p.product_id)
        return real(p, s, *prepared)

    with mock.patch.object(B, "run_product", counting):
        s = B.run_batch(d, out, settings(), jobs=1, resume=True)
    assert calls == ["l2", "l3", "l4"] and s.kept == 2
    assert out.read_bytes() == fresh.read_bytes()
    assert B.jsonl_path(out).read_bytes() == (tmp_path / "fresh.jsonl").read_bytes()
    # again: every ok row is kept, the error row is tried again (the file may be fixed now)
    calls.clear()
    with mock.patch.object(B, "run_product", counting):
        B.run_batch(d, out, settings(), jobs=1, resume=True)
    assert calls == ["l4"]


def test_resume_redoes_a_row_whose_files_changed(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "a.csv")
    out = tmp_path / "s.csv"
    B.run_batch(d, out, settings(), jobs=1)
    (d / "a.toml").write_text((EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml").read_text(
        encoding="utf-8"), encoding="utf-8")
    s = B.run_batch(d, out, settings(), jobs=1, resume=True)
    assert s.kept == 0 and read_rows(out)[0]["listing_file"] == "a.toml"


def test_resume_redoes_a_row_whose_contents_or_settings_changed(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "a.csv", seed=1)
    blue_led(d / "b.csv", seed=2)
    out = tmp_path / "s.csv"
    B.run_batch(d, out, settings(), jobs=1)
    assert B.run_batch(d, out, settings(), jobs=1, resume=True).kept == 2   # nothing changed
    blue_led(d / "a.csv", seed=7)            # same name, new measurement
    s = B.run_batch(d, out, settings(), jobs=1, resume=True)
    assert s.kept == 1
    other = replace(settings(), limits="icnirp_2013")   # another limit set: every row again
    assert B.run_batch(d, out, other, jobs=1, resume=True).kept == 0


def test_resume_refuses_a_file_that_is_not_a_summary(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    blue_led(d / "a.csv")
    out = tmp_path / "s.csv"
    out.write_text("name,value\nx,1\n", encoding="utf-8")
    with pytest.raises(InputFormatError, match="not a uvcheck batch summary"):
        B.run_batch(d, out, settings(), jobs=1, resume=True)
    assert out.read_text(encoding="utf-8") == "name,value\nx,1\n"


def test_ordered_map_keeps_order_and_bounds_work_in_flight():
    consumed = []
    lock = threading.Lock()

    def jobs():
        for k in range(40):
            with lock:
                consumed.append(k)
            yield [k]

    it = B.ordered_map(_square, jobs(), workers=2, window=3)
    first = next(it)
    # at most window x workers jobs were taken before the first result, plus its successor
    assert first == [0] and len(consumed) <= 3 * 2 + 1
    assert [r[0] for r in it] == [k * k for k in range(1, 40)]


def test_ordered_map_joins_its_workers_when_the_last_result_is_taken():
    # run_batch takes exactly one result per chunk and never asks for more: the workers must
    # be gone by then, not left to the interpreter's exit (where Python 3.11's exit hook
    # races with the pool's shutdown and can print "OSError: Bad file descriptor")
    import multiprocessing as mp

    it = B.ordered_map(_square, ([k] for k in range(6)), workers=2, window=2)
    got = [next(it) for _ in range(6)]
    assert got == [[k * k] for k in range(6)]
    assert mp.active_children() == []


def test_batch_command_exits_without_noise_on_stderr(tmp_path):
    # the exit-time race above showed as a traceback on stderr in about one run in three
    import subprocess
    import sys

    d = tmp_path / "in"
    d.mkdir()
    for k in range(4):
        blue_led(d / f"l{k}.csv")
    for k in range(3):
        r = subprocess.run([sys.executable, "-m", "uvcheck", "batch", str(d), "--out",
                            str(tmp_path / "s.csv"), "--force", "--quiet", "--jobs", "2"],
                           capture_output=True, text=True, timeout=120)
        assert r.returncode == 0, r.stderr
        assert r.stderr == ""


def _square(job):
    return [job[0] * job[0]]


# ---------------------------------------------------------------------------------------------
# The command
# ---------------------------------------------------------------------------------------------

def test_command_with_manifest_notes_and_fail_on(tmp_path):
    sp = tmp_path / "sp"
    sp.mkdir()
    flat_uvc(sp / "flat.csv")
    m = tmp_path / "manifest.csv"
    m.write_text("id,spectrum,listing,distance\n"
                 f"wand,{EXAMPLES / 'spectra' / 'wand_395nm_led.csv'},"
                 f"{EXAMPLES / 'listings' / 'wand_395nm_sold_as_uvc.toml'},10 cm\n"
                 "flat,sp/flat.csv,,1 m\n", encoding="utf-8")
    out = tmp_path / "summary.csv"
    notes = tmp_path / "notes"
    r = runner.invoke(app, ["batch", str(m), "--out", str(out), "--notes", str(notes),
                            "--no-pdf", "--fail-on", "cannot-hold", "--jobs", "1"])
    assert r.exit_code == 1, r.output          # the wand's claims cannot hold
    assert "2 product(s): 2 ok, 0 error(s)" in r.output and "not certifications" in r.output
    assert "\x1b[" not in r.output              # no progress bar when not on a terminal
    rows = read_rows(out)
    assert [x["product_id"] for x in rows] == ["wand", "flat"]
    assert float(rows[1]["uvc_W_m2"]) == pytest.approx(0.08, rel=1e-6)  # analytic, see above
    html = Path(rows[0]["note_path"])
    assert html.parent == notes and html.name == "wand.html" and html.exists()
    assert "<html" in html.read_text(encoding="utf-8").lower()
    # a second run refuses to overwrite, and --resume keeps both rows
    r = runner.invoke(app, ["batch", str(m), "--out", str(out), "--jobs", "1"])
    assert r.exit_code == 2 and "--resume" in r.output
    r = runner.invoke(app, ["batch", str(m), "--out", str(out), "--resume", "--notes",
                            str(notes), "--no-pdf", "--jobs", "1"])
    assert r.exit_code == 0 and "2 kept from the earlier run" in r.output


def test_command_help_describes_the_manifest():
    r = runner.invoke(app, ["batch", "--help"])
    assert r.exit_code == 0
    for word in ("manifest", "spectrum", "listing", "distance", "source_size", "--resume",
                 "product_id", "worst_claim_ratio", "uncertainty"):
        assert word in r.output


def test_command_rejects_an_unknown_limit_set(tmp_path):
    d = tmp_path / "in"
    d.mkdir()
    r = runner.invoke(app, ["batch", str(d), "--out", str(tmp_path / "s.csv"),
                            "--limits", "nonsense"])
    assert r.exit_code == 2 and "unknown limit set 'nonsense'" in r.output


# ---------------------------------------------------------------------------------------------
# Speed paths give exactly what the plain paths give
# ---------------------------------------------------------------------------------------------

DIALECTS = [
    "Wavelength (nm),Irradiance (W/m2/nm)\n{rows}",
    "# exported\nInstrument: invented\n\nnm;W/m2/nm\n{rows_semicolon_comma}",
    "wl\tE (uW/cm2/nm)\r\n{rows_tab_crlf}",
    "{rows}\nend of data\ntotal: 3\n",
    "{rows}\n\n\n",
    "Wavelength (nm),Irradiance (W/m2/nm)\n{rows_blank_inside}",
    "Wavelength (nm),Irradiance (W/m2/nm)\n{rows_dot_in_comma}",
]


def _dialect_files(tmp_path: Path) -> list[Path]:
    wl = np.arange(250.0, 300.0, 0.5)
    v = gaussian(wl, 270.0, 3.0, 1e-2) + 1e-6
    rows = [f"{a:.1f},{b:.6e}" for a, b in zip(wl, v)]
    fill = {"rows": "\n".join(rows),
            "rows_semicolon_comma": "\n".join(r.replace(",", ";").replace(".", ",") for r in rows),
            "rows_tab_crlf": "\r\n".join(r.replace(",", "\t") for r in rows),
            "rows_blank_inside": "\n".join(rows[:40] + ["", "   "] + rows[40:]),
            "rows_dot_in_comma": "\n".join(rows[:30] + ["  -1.5e-3,2"] + rows[30:])}
    out = []
    for k, t in enumerate(DIALECTS):
        p = tmp_path / f"d{k}.txt"
        p.write_bytes(t.format(**fill).encode("utf-8"))
        out.append(p)
    p = tmp_path / "latin1.csv"
    p.write_bytes(("Wavelength (nm);E (µW/cm²/nm)\n" + "\n".join(
        r.replace(",", ";").replace(".", ",") for r in rows)).encode("cp1252"))
    out.append(p)
    p = tmp_path / "utf16.csv"
    p.write_bytes(("Wavelength (nm)\tIrradiance (W/m2/nm)\n" + "\n".join(
        r.replace(",", "\t") for r in rows)).encode("utf-16"))
    out.append(p)
    return out


def test_reading_a_file_whole_equals_streaming_it(tmp_path):
    from uvcheck.io import reader

    def read(p):
        try:
            s, r = reader.read_spectrum(p)
        except UvcheckError as exc:
            return str(exc)
        return s.wavelength_nm.tolist(), s.values.tolist(), r

    outcomes = set()
    for p in _dialect_files(tmp_path):
        fast = read(p)
        with mock.patch.object(reader, "decode_lines", lambda *a, **k: None):
            slow = read(p)
        assert fast == slow, p.name
        outcomes.add(type(fast))
    assert outcomes == {str, tuple}  # both read spectra and errors were compared


def test_decode_lines_matches_text_mode_reading(tmp_path):
    from uvcheck.io.textfile import Decoded, decode_lines, iter_lines

    samples = [b"a\r\nb\rc\n\nd", b"", b"x\n", b"\xef\xbb\xbfbom\r\n", "µ²\n".encode("cp1252"),
               "utf16\r\nz".encode("utf-16")]
    encs = ["utf-8", "utf-8", "utf-8", "utf-8-sig", "cp1252", "utf-16"]
    for k, (data, enc) in enumerate(zip(samples, encs)):
        p = tmp_path / f"s{k}"
        p.write_bytes(data)
        dec = Decoded(enc, "test", False)
        assert decode_lines(data, dec) == list(iter_lines(p, dec))
    # undecodable text and a BOM-less "utf-16" are left to the streaming reader
    assert decode_lines(b"\xff\xfe\x00", Decoded("utf-8", "t", False)) is None
    assert decode_lines(b"a\x00b\x00", Decoded("utf-16", "t", False)) is None


def test_median_is_numpys():
    from uvcheck.spectrum import median

    rng = np.random.default_rng(3)
    for n in range(1, 60):
        for a in (rng.normal(size=n), rng.choice([-0.0, 0.0, 2.0], size=n)):
            m, r = median(a), float(np.median(a))
            assert m == r and math.copysign(1, m) == math.copysign(1, r)
    assert math.isnan(median([1.0, float("nan"), 2.0]))


def test_quantile_is_numpys():
    from uvcheck.spectrum import quantile

    rng = np.random.default_rng(4)
    for n in range(1, 50):
        for a in (rng.normal(size=n), rng.choice([-0.0, 0.0, 1.5, np.inf], size=n)):
            for q in (0.1, 0.25, 0.5, 0.75, 1.0):
                with np.errstate(all="ignore"):  # inf - inf: both warn alike
                    m, r = quantile(a, q), float(np.quantile(a, q))
                assert (m == r and math.copysign(1, m) == math.copysign(1, r)) or (
                    math.isnan(m) and math.isnan(r)), (n, q)
    assert math.isnan(quantile([1.0, float("nan")], 0.25))


@pytest.mark.parametrize("uncertainty", [False, True])
def test_assessing_does_not_import_numpy_ma(uncertainty):
    # numpy.median, numpy.quantile and numpy.unique import numpy.ma (about 20 ms) on first use
    import subprocess
    import sys

    code = ("import sys; from uvcheck.io.reader import read_spectrum; "
            "from uvcheck.assessment import assess, AssessOptions; "
            "from uvcheck.conditions import Conditions; "
            "s, r = read_spectrum(sys.argv[1]); "
            f"assess(s, Conditions(measurement_distance_m=0.2), r, "
            f"AssessOptions(uncertainty={uncertainty})).to_dict(); "
            "print('numpy.ma' in sys.modules)")
    for name in ("wand_395nm_led.csv", "mercury_tube_254nm.txt"):
        out = subprocess.run([sys.executable, "-c", code, str(EXAMPLES / "spectra" / name)],
                             capture_output=True, text=True, check=True).stdout
        assert out.strip() == "False", name


def _find_lines_loop(spectrum, min_snr=5.0, min_relative=0.01, max_lines=20):
    """The candidate loop find_lines had before it was vectorised (issue 8), kept here as
    the reference the vectorised version must reproduce exactly; its prominence is the
    topographic one, walked out sample by sample as scipy.signal.peak_prominences does."""
    from uvcheck.features import DetectedLine, _identify, line_like

    wl, v = spectrum.wavelength_nm, spectrum.values
    if wl.size < 5 or not np.any(v > 0):
        return []
    vmax = float(v.max())
    sigma = spectrum.noise_floor or 0.0
    thr = max(min_snr * sigma, min_relative * vmax)
    cand = np.where((v[1:-1] >= v[:-2]) & (v[1:-1] > v[2:]))[0] + 1
    cand = cand[v[cand] - float(v.min()) >= thr]
    found = []
    for i in cand:
        lo = int(np.searchsorted(wl, wl[i] - 20.0))
        hi = int(np.searchsorted(wl, wl[i] + 20.0, side="right"))
        left = right = float(v[i])
        j = i
        while j >= lo and v[j] <= v[i]:      # out to the first higher sample or the window
            left = min(left, float(v[j]))
            j -= 1
        j = i + 1
        while j < hi and v[j] < v[i]:        # on the right an equal sample ends it too
            right = min(right, float(v[j]))
            j += 1
        prom = float(v[i] - max(left, right))
        if prom < thr:
            continue
        y0, y1, y2 = v[i - 1], v[i], v[i + 1]
        den = y0 - 2 * y1 + y2
        shift = 0.5 * (y0 - y2) / den if den != 0 else 0.0
        pos = float(wl[i] + shift * (wl[i + 1] - wl[i - 1]) / 2)
        step = float(wl[min(i + 1, wl.size - 1)] - wl[i - 1]) / 2
        width = _fwhm_loop(wl, v, int(i))
        # named only when as narrow as a line (features.line_like; tests/test_line_identification.py)
        found.append(DetectedLine(pos, prom, width,
                                  prom / sigma if sigma > 0 else None,
                                  _identify(pos, max(1.0, 1.5 * step))
                                  if line_like(width, step) else None))
    found.sort(key=lambda d: -d.height)
    return sorted(found[:max_lines], key=lambda d: d.wavelength_nm)


def _fwhm_loop(wl, v, i):
    half = v[i] / 2.0
    if not half > 0:
        return None
    j = i
    while j > 0 and v[j] > half:
        j -= 1
    if v[j] > half:
        return None
    k = i
    while k < v.size - 1 and v[k] > half:
        k += 1
    if v[k] > half:
        return None
    left = wl[j] + (half - v[j]) * (wl[j + 1] - wl[j]) / (v[j + 1] - v[j]) if v[j + 1] != v[j] else wl[j]
    right = wl[k - 1] + (v[k - 1] - half) * (wl[k] - wl[k - 1]) / (v[k - 1] - v[k]) if v[k - 1] != v[k] else wl[k]
    return float(right - left)


def test_vectorised_find_lines_equals_the_loop():
    from uvcheck.features import _fwhm, find_lines
    from uvcheck.spectrum import Spectrum

    rng = np.random.default_rng(8)
    for t in range(300):
        n = int(rng.integers(5, 600))
        wl = np.unique(np.sort(rng.uniform(200, 1100, n)) if t % 2 else
                       np.linspace(200, 200 + rng.uniform(10, 900), n))
        if wl.size < 5:
            continue
        v = np.zeros(wl.size)
        for _ in range(int(rng.integers(0, 4))):
            v += gaussian(wl, rng.uniform(200, 1100), rng.uniform(0.2, 50), 10 ** rng.uniform(-3, 0))
        v += rng.normal(0, 10 ** rng.uniform(-7, -3), wl.size) * (t % 5 != 0)
        if t % 7 == 0:
            v = np.round(v, 3)  # plateaus and ties
        s = Spectrum(wl, v, "irradiance", noise_floor=None if t % 3 else 1e-5)
        assert find_lines(s) == _find_lines_loop(s), t
        i = int(np.argmax(v))
        assert _fwhm(wl, v, i) == _fwhm_loop(wl, v, i), t


def test_integrals_are_the_same_from_the_caches():
    from uvcheck import spectrum as S
    from uvcheck.weighting import get_weighting

    wl = np.arange(200.0, 500.0, 0.7)
    a = S.Spectrum(wl, gaussian(wl, 300.0, 20.0, 1.0), "irradiance", noise_floor=1e-4)
    b = S.Spectrum(wl, gaussian(wl, 310.0, 5.0, 2.0), "irradiance", noise_floor=1e-4)
    w = get_weighting("S_actinic")
    S._PLAN_CACHE.clear()
    cold = [S.integrate(x, 200.0, 400.0, w) for x in (a, b)]
    S._PLAN_CACHE.clear()
    for x in (a, b):
        x.__dict__.pop("_integrals", None)
    S.integrate(a, 200.0, 400.0, w)                  # fills the grid cache
    warm = [S.integrate(x, 200.0, 400.0, w) for x in (a, b)]   # b: grid cache; a: its own
    assert warm == cold
    # a weight that is not a tabulated Weighting is never cached
    f = lambda x: np.ones_like(x)  # noqa: E731
    assert S.integrate(a, 250.0, 260.0, f).value == S.integrate(a, 250.0, 260.0).value
    assert all(k[5] is not f for k in S._PLAN_CACHE)


def test_interpolation_at_the_limits_is_numpys():
    # integrate() interpolates the spectrum at the integration limits itself, with the
    # operations np.interp uses; the reference is numpy's np.interp
    from uvcheck import spectrum as S

    rng = np.random.default_rng(11)
    for _ in range(200):
        n = int(rng.integers(2, 40))
        wl = np.cumsum(rng.uniform(0.01, 3.0, n)) + 200.0
        y = rng.normal(0, 1, n) * 10.0 ** rng.uniform(-9, 3)
        xs = list(rng.uniform(wl[0], wl[-1], 5)) + [float(wl[0]), float(wl[-1]),
                                                    float(wl[n // 2])]
        for x in xs:
            j = int(np.searchsorted(wl, x, side="right")) - 1
            assert S._interp_at(wl, y, j, float(x)) == float(np.interp(x, wl, y))


def test_weighting_at_equals_calling_it():
    from uvcheck.weighting import get_weighting

    for wid in ("S_actinic", "B_blue", "R_thermal"):
        w = get_weighting(wid)
        for x in (180.0, 253.7, 270.0, 299.99, 405.0, 1e4):
            assert w.at(x) == float(w(np.array([x]))[0]) == w.at(x)


def test_remembered_unit_errors_name_the_callers_place():
    from uvcheck.units import parse_spectral_unit

    for where in ("a.csv line 1", "b.csv line 9", None):
        with pytest.raises(UnitError) as e:
            parse_spectral_unit("furlongs per fortnight", where)
        assert e.value.where == (where or "unit")
    assert parse_spectral_unit("uW/cm2/nm") is parse_spectral_unit("uW/cm2/nm")


def _read_both(tmp: Path, data: bytes) -> None:
    """Read ``data`` held whole and streamed; both must give the same spectrum, report and
    error (the same message)."""
    from uvcheck.io import reader

    p = tmp / "case.csv"
    p.write_bytes(data)

    def read():
        try:
            s, r = reader.read_spectrum(p)
        except UvcheckError as exc:
            return str(exc)
        return s.wavelength_nm.tobytes(), s.values.tobytes(), s.noise_floor, r

    fast = read()
    with mock.patch.object(reader, "decode_lines", lambda *a, **k: None):
        assert read() == fast


def test_whole_file_reading_equals_streaming_on_generated_files(tmp_path_factory):
    # the generated tables and damaged files of the reader's fuzz tests (tests/test_fuzz_reader.py)
    from hypothesis import given, settings as hsettings
    from hypothesis import strategies as st

    import test_fuzz_reader as fz

    tmp = tmp_path_factory.mktemp("whole")

    @hsettings(max_examples=150, database=None, **fz.COMMON)
    @given(st.one_of(fz.table_file(), fz.mutated_file()))
    def check(data):
        _read_both(tmp, data)

    check()


def test_row_gives_the_group_at_the_listings_distance_of_use(tmp_path):
    # the bundled wand (invented data) is Exempt for what could be assessed at 20 cm, but its
    # listing says it is used at 2 cm, where the blue-light limit is reached in seconds
    import shutil

    shutil.copy(EXAMPLES / "spectra" / "wand_395nm_led.csv", tmp_path / "wand.csv")
    shutil.copy(EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml", tmp_path / "wand.toml")
    out = tmp_path / "out" / "s.csv"
    out.parent.mkdir()
    B.run_batch(tmp_path, out, B.BatchSettings(), jobs=1)
    row = json.loads(B.jsonl_path(out).read_text(encoding="utf-8").splitlines()[0])
    assert row["use_distance_m"] == pytest.approx(0.02)
    assert row["risk_group_at_use"] == "RG3"
    assert row["risk_group"] != "RG3"


@pytest.mark.parametrize("fail_on, status", [("not-assessable", 1), ("unlikely", 1),
                                             ("cannot-hold", 1)])
def test_batch_fail_on_is_a_threshold_as_in_screen(tmp_path, fail_on, status):
    # the bundled wand listing (invented) has 'cannot-hold' claims: every threshold at or
    # below it fails, as 'uvcheck screen --fail-on' does on the same listing
    import shutil

    shutil.copy(EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml", tmp_path / "wand.toml")
    out = tmp_path / "o" / "s.csv"
    out.parent.mkdir()
    r = CliRunner().invoke(app, ["batch", str(tmp_path), "--out", str(out), "--jobs", "1",
                                 "--quiet", "--fail-on", fail_on])
    assert r.exit_code == status, r.output
    s = CliRunner().invoke(app, ["screen", str(tmp_path / "wand.toml"), "--quiet",
                                 "--fail-on", fail_on])
    assert s.exit_code == status


def test_fail_on_threshold_order():
    assert B.fails("cannot-hold", "not-assessable") and B.fails("unlikely", "unlikely")
    assert not B.fails("unlikely", "cannot-hold") and not B.fails("holds", "not-assessable")


def _summary_cases(tmp_path: Path) -> list[tuple[B.Product, B.BatchSettings]]:
    """Products of every kind a batch meets: the bundled examples (invented) with and without
    their listings, at several distances, a listing alone, and generated lamps (invented)."""
    sp, ls = EXAMPLES / "spectra", EXAMPLES / "listings"
    pairs = [("faruv_222nm_unit.csv", "faruv_222nm_ceiling_unit.toml"),
             ("mercury_tube_254nm.txt", "mercury_tube_sold_pet_safe.toml"),
             ("wand_395nm_led.csv", "wand_395nm_sold_as_uvc.toml")]
    opts = [{}, {"distance": "0.2 m", "use_distance": "5 cm"},
            {"distance": "1 m", "source_size": "2 cm", "exposure_time": "30 min"}]
    cases = []
    for s, lst in pairs:
        for listing in (None, ls / lst):
            for o in opts:
                cases.append((B.Product(s, sp / s, listing, options=o), settings()))
        cases.append((B.Product(lst, None, ls / lst), settings()))
    rng = np.random.default_rng(5)
    wl = np.linspace(200.0, 1100.0, 900)
    for k in range(12):
        v = np.full(wl.size, 2e-6) + rng.normal(0, 1e-6, wl.size)
        for _ in range(int(rng.integers(1, 4))):
            v += 10 ** rng.uniform(-4, -1) * np.exp(
                -0.5 * ((wl - rng.uniform(220, 900)) / rng.uniform(0.5, 40)) ** 2)
        f = write_spectrum(tmp_path / f"g{k}.csv", wl, v)
        cases.append((B.Product(f.stem, f, None, options=opts[k % 3]), settings()))
    return cases


def test_summary_parts_give_the_row_that_to_dict_gives(tmp_path):
    # the batch row is read from Assessment.summary_parts() (no organism tables); it must be
    # the row that the whole to_dict() -- what `assess --json` writes -- gives
    from uvcheck.report.jsonout import clean

    for product, s in _summary_cases(tmp_path):
        a = B.assess_product(product, s)
        fast = B.summary_row(product, a.summary_parts())
        full = B.summary_row(product, clean(a.to_dict()))
        assert fast == full, product.product_id
        assert fast["status"] == "ok"


def test_organism_tables_are_computed_on_first_use_only(tmp_path):
    # a batch row needs no doses or times, lines or photometry: they wait until asked for,
    # and are then the same as those of a fresh evaluation
    from uvcheck.germicidal import evaluate_germicidal

    product = B.Product("hg", EXAMPLES / "spectra" / "mercury_tube_254nm.txt", None,
                        options={"distance": "1 m"})
    a = B.assess_product(product, settings())
    g = a.sections["germicidal"]
    B.summary_row(product, a.summary_parts())
    assert "_organism_results" not in g.__dict__
    assert not {"lines", "photometry", "line_warnings", "input"} & set(a.__dict__)
    d = a.to_dict()
    assert d["spectral"]["lines"] and d["photometry"]["status"]
    assert {"lines", "photometry", "line_warnings"} <= set(a.__dict__)
    assert g.status == "germicidal-uvc" and len(g.inactivation) > 10
    assert "_organism_results" in g.__dict__
    again = evaluate_germicidal(a.spectrum, a.conditions)
    assert [e.to_dict() for e in g.inactivation] == [e.to_dict() for e in again.inactivation]
    assert {p: {m: (e.to_dict() if e else None) for m, e in v.items()}
            for p, v in g.most_susceptible.items()} == \
        {p: {m: (e.to_dict() if e else None) for m, e in v.items()}
         for p, v in again.most_susceptible.items()}


def test_the_fingerprint_from_the_readers_hash_equals_hashing_the_file(tmp_path):
    # run_product passes the reader's SHA-256 of the bytes it read instead of reading the file
    # a second time; --resume compares fingerprints, so both must agree
    f = blue_led(tmp_path / "b.csv")
    p = B.Product("b", f, EXAMPLES / "listings" / "wand_395nm_sold_as_uvc.toml")
    a = B.assess_product(p, settings())
    assert B.inputs_fingerprint(p, settings(), a.input["sha256"]) == \
        B.inputs_fingerprint(p, settings())
    assert B.run_product(p, settings())["inputs_sha256"] == B.inputs_fingerprint(p, settings())


def test_cct_parabola_in_closed_form_equals_polyfit():
    # cct_ohno2013 fits the parabola through three locus points in closed form; numpy's
    # polyfit through the same three points is the reference
    from uvcheck.photometry import _locus, cct_ohno2013

    T, lu, lv = _locus()
    rng = np.random.default_rng(3)
    for k in rng.integers(5, len(T) - 5, 60):
        u = float(lu[k]) + float(rng.normal(0, 2e-3))
        v = float(lv[k]) + float(rng.normal(0, 2e-3))
        d2 = (lu - u) ** 2 + (lv - v) ** 2
        i = min(max(int(np.argmin(d2)), 1), len(T) - 2)
        t, y = T[i - 1:i + 2], d2[i - 1:i + 2]
        a, b, c = np.polyfit(t - t[1], y, 2)
        x = -b / (2 * a)
        cct, _ = cct_ohno2013(u, v)
        assert cct == pytest.approx(float(t[1] + x), rel=1e-9)


def test_windowed_half_maximum_search_equals_the_whole_array_search():
    # _fwhm looks for the half-maximum crossings in growing windows; the reference is the
    # search over the whole array with np.flatnonzero
    from uvcheck.features import _first_not_above, _last_not_above

    rng = np.random.default_rng(4)
    for _ in range(300):
        n = int(rng.integers(1, 3000))
        v = rng.normal(0, 1, n).cumsum() if rng.random() < 0.5 else rng.normal(0, 1, n)
        i = int(rng.integers(0, n))
        level = float(rng.normal(v[i] - 1.0, 2.0))
        left = np.flatnonzero(v[:i + 1] <= level)
        right = np.flatnonzero(v[i:] <= level)
        assert _last_not_above(v, i, level) == (int(left[-1]) if left.size else None)
        assert _first_not_above(v, i, level) == (i + int(right[0]) if right.size else None)


def test_restricted_without_revalidation_equals_the_validated_spectrum():
    # restricted() builds the cut without running Spectrum's checks again; the reference is
    # the same cut made through the validating constructor (dataclasses.replace)
    from dataclasses import fields as dc_fields
    from dataclasses import replace as dc_replace

    from uvcheck import spectrum as S

    rng = np.random.default_rng(9)
    for k in range(60):
        wl = np.cumsum(rng.uniform(0.1, 2.0, 400)) + 190.0
        v = rng.normal(0, 1, wl.size)
        gaps = ((float(wl[100]), float(wl[110])),) if k % 3 == 0 else ()
        sp = S.Spectrum(wl, v, "irradiance", gaps_nm=gaps, noise_floor=0.1,
                        meta={"source": "invented"})
        lo, hi = sorted(rng.uniform(wl[0] - 5, wl[-1] + 5, 2))
        if not (hi > max(lo, wl[0]) and min(hi, wl[-1]) > max(lo, wl[0])):
            continue
        got = S._restricted(sp, lo, hi)
        ref = dc_replace(got, wavelength_nm=got.wavelength_nm.copy(), values=got.values.copy())
        for f in dc_fields(S.Spectrum):
            a, b = getattr(got, f.name), getattr(ref, f.name)
            if isinstance(a, np.ndarray):
                assert a.dtype == b.dtype and np.array_equal(a, b) and not a.flags.writeable
            else:
                assert a == b, f.name
        assert np.all(np.diff(got.wavelength_nm) > 0) and got.range_nm[0] < got.range_nm[1]


def test_grid_weights_give_numpys_trapezoid():
    # peak_info's area and centroid use the trapezoid coefficients of the grid in one dot
    # product; the reference is numpy's np.trapezoid on the same samples
    from uvcheck import spectrum as S

    rng = np.random.default_rng(12)
    for _ in range(50):
        wl = np.cumsum(rng.uniform(0.05, 3.0, int(rng.integers(2, 3000)))) + 200.0
        y = np.clip(rng.normal(0, 1, wl.size), 0, None)
        sp = S.Spectrum(wl, y, "irradiance")
        assert float(np.dot(S.grid_weights(sp), y)) == pytest.approx(
            float(np.trapezoid(y, wl)), rel=1e-12, abs=1e-300)


def test_the_nominal_model_leaves_numpys_print_options_alone():
    # importing colour-science sets numpy's print options to numpy 1.13's for the whole
    # process; matplotlib hashes reprs of numpy numbers into SVG ids, so a note drawn after a
    # listing screening came out different. Run in a fresh process (colour not yet imported).
    import subprocess
    import sys

    code = ("import numpy as np; before = repr(np.float64(51.84)); "
            "from uvcheck.nominal import led_shape; led_shape(395.0, 12.0); "
            "import sys; assert 'colour' in sys.modules; "
            "print(before == repr(np.float64(51.84)))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "True"


def test_batch_notes_do_not_depend_on_the_number_of_processes(tmp_path):
    # a listing screened alone (which loads colour-science) before measured products: the
    # notes must be byte-identical whether one process or two wrote them
    m = tmp_path / "m.csv"
    m.write_text("id,spectrum,listing,distance\n"
                 f"a,,{EXAMPLES / 'listings' / 'uvc_box_48_leds_8w.toml'},\n"
                 f"b,{EXAMPLES / 'spectra' / 'wand_395nm_led.csv'},,10 cm\n"
                 f"c,{EXAMPLES / 'spectra' / 'mercury_tube_254nm.txt'},,1 m\n", encoding="utf-8")
    import subprocess
    import sys

    for jobs in (1, 2):
        r = subprocess.run([sys.executable, "-m", "uvcheck", "batch", str(m), "--out",
                            str(tmp_path / f"s{jobs}.csv"), "--notes", str(tmp_path / f"n{jobs}"),
                            "--no-pdf", "--jobs", str(jobs), "--quiet"],
                           capture_output=True, text=True, timeout=300)
        assert r.returncode == 0, r.stderr
    for name in ("a.html", "b.html", "c.html"):
        assert (tmp_path / "n1" / name).read_bytes() == (tmp_path / "n2" / name).read_bytes(), name


def test_the_plan_cache_keeps_recent_grids_within_its_memory_budget():
    # a batch mixing many instruments: the integration plans stay within their byte budget,
    # the newest grid's plans are kept, and every integral is the one a fresh plan gives
    from uvcheck import spectrum as S
    from uvcheck.weighting import get_weighting

    w = get_weighting("S_actinic")
    cache = S._PLAN_CACHE
    old_budget = cache.max_bytes
    cache.clear()
    cache.max_bytes = 200_000
    try:
        rng = np.random.default_rng(2)
        last = None
        for k in range(60):
            wl = np.sort(rng.uniform(200.0, 800.0, 1500 + k))
            sp = S.Spectrum(wl, np.ones_like(wl), "irradiance")
            got = S.integrate(sp, 200.0, 400.0, w)
            assert cache.nbytes <= cache.max_bytes
            last = (sp, got)
        keys = list(cache)
        assert keys and keys[-1][0] == S._grid_key(last[0])
        fresh = S.Spectrum(last[0].wavelength_nm, last[0].values, "irradiance")
        cache.clear()
        assert S.integrate(fresh, 200.0, 400.0, w) == last[1]
    finally:
        cache.clear()
        cache.max_bytes = old_budget


def test_a_manifest_left_in_a_scanned_folder_is_named_as_such(tmp_path):
    """A folder batch reads every CSV as a spectrum; a manifest left among them gets an error
    row that says what it is and what to do, not only "no rows of numbers" (our own rule:
    an error says what is wrong, where, and what to do)."""
    folder = tmp_path / "shop"
    folder.mkdir()
    blue_led(folder / "lamp1.csv")
    (folder / "products.csv").write_text("# invented manifest\nSpectrum;Distance\n"
                                         "lamp1.csv;20 cm\n", encoding="utf-8")
    (folder / "junk.csv").write_text("name,colour\nlamp,red\n", encoding="utf-8")
    assert B.looks_like_manifest(folder / "products.csv")
    assert not B.looks_like_manifest(folder / "junk.csv")
    assert not B.looks_like_manifest(folder / "lamp1.csv")
    B.run_batch(folder, tmp_path / "s.csv", B.BatchSettings(), jobs=1)
    rows = {r["product_id"]: r for r in read_rows(tmp_path / "s.csv")}
    assert rows["lamp1"]["status"] == "ok"
    assert rows["products"]["status"] == "error"
    assert "looks like a batch manifest" in rows["products"]["error"]
    assert "uvcheck batch products.csv" in rows["products"]["error"]
    assert rows["junk"]["status"] == "error"
    assert "looks like a batch manifest" not in rows["junk"]["error"]


def test_row_says_where_its_risk_group_holds(tmp_path):
    """IEC 62471 classifies at the assessment distance (200 mm for a lamp not for general
    lighting, IEC 62471:2006 clause 4.3 / 5.2, from memory); a spectrum with no measurement
    distance can only be assessed where it was measured, and the row says so rather than
    present that group as the lamp's classification."""
    (tmp_path / "sp").mkdir()
    blue_led(tmp_path / "sp" / "a.csv")
    blue_led(tmp_path / "sp" / "b.csv", seed=1)
    m = tmp_path / "m.csv"
    m.write_text("spectrum,distance\nsp/a.csv,\nsp/b.csv,30 cm\n", encoding="utf-8")
    B.run_batch(m, tmp_path / "s.csv", B.BatchSettings(), jobs=1)
    rows = {r["product_id"]: r for r in read_rows(tmp_path / "s.csv")}
    assert rows["a"]["risk_group_position"] == "measurement-position"
    assert rows["b"]["risk_group_position"] == "assessment-distance"
    assert rows["a"]["risk_group"] and rows["b"]["risk_group"]
    # a summary of another version (other columns) is refused for --resume, saying why
    old = tmp_path / "old.csv"
    cols = [c for c in B.SUMMARY_COLUMNS if c != "risk_group_position"]
    old.write_text(",".join(cols) + "\n", encoding="utf-8")
    with pytest.raises(InputFormatError, match="another uvcheck version"):
        B.read_previous(old)
