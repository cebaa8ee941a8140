"""Batch screening: a folder of spectra and listings, or a manifest, in one run.

``run_batch(source, out, settings) -> BatchSummary`` assesses every product of a folder or a
manifest and writes one summary row per product to a CSV file (cells a spreadsheet would read
as formulas neutralised, :mod:`uvcheck.report.csvout`) and the same rows as JSON lines beside
it (``summary.csv`` -> ``summary.jsonl``).

How a product is assessed: exactly as ``uvcheck assess SPECTRUM --claims LISTING`` does
(:func:`assess_product`: the same reader, scaling, conditions and :func:`uvcheck.assessment.assess`
calls), or, for a listing without a spectrum, as ``uvcheck screen LISTING`` does. The summary
row is read from the parts of ``Assessment.to_dict()`` it needs (``Assessment.summary_parts()``;
the organism tables are not computed for it), made strict JSON
(:func:`uvcheck.report.jsonout.clean`), so its numbers are the numbers ``assess --json``
writes (:func:`summary_row`). The Monte Carlo
uncertainty evaluation is off unless asked for (``BatchSettings.uncertainty``, with the inputs
and decision rule of ``BatchSettings.uncertainty_options``; the command turns it on for
notes); a listing screening runs as ``uvcheck screen`` runs it.

Products
--------
A *folder*: every spectrum file in it (``.csv``, ``.tsv``, ``.txt``, ``.dat``, ``.asc``; not
in subfolders; hidden files and the batch's own outputs left out) and every listing
(``.toml``), paired by file stem: ``lamp7.csv`` with ``lamp7.toml``. A stem with a listing
only is a listing screening; two spectrum files with one stem make an error row. Products
are taken in the order of their stems (sorted by code point, so on every system alike).

A *manifest*: a CSV file (comma, semicolon or tab; UTF-8, with or without byte-order mark)
with a header row naming its columns (:data:`MANIFEST_COLUMNS`); ``#`` lines and blank lines
are skipped; paths are relative to the manifest's folder; an empty cell leaves the batch
option in force. Products are taken in the manifest's order. An unknown column or a repeated
product id is an error for the whole manifest (exit status 2, nothing written); a missing or
unreadable file is an error row for that product only.

Running
-------
Products are assessed on every core (a process pool; ``BatchSettings.jobs``), in chunks,
with at most a few chunks in flight, and the rows are written in product order as they
arrive: the output does not depend on the number of processes, and memory does not grow
with the number of products. A product that cannot be assessed gets an error row (what is
wrong, where, what to do) and the batch goes on. Rows are written to ``<summary>.part`` and
``<jsonl>.part`` as they come and renamed over the targets at the end; ``resume`` keeps the
rows with status ``ok`` of an earlier run (finished or interrupted) whose product id, file
names and inputs are unchanged (``inputs_sha256``: the files' bytes, the product's options,
the limit set and uncertainty settings, the tool version; :func:`inputs_fingerprint`), and
assesses the others again.

A screening assessment, not a certification: each row is what the tool's screening of that
product found; exposure decisions defer to local codes and licensed practice.
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
from collections import deque
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any, Callable, Iterable, Iterator, Mapping, Sequence

from uvcheck.errors import ConfigurationError, InputFormatError, UvcheckError

#: Summary columns, in this order (our own names). ``uvc_W_m2`` is the UV-C (200–280 nm)
#: irradiance where the spectrum is an irradiance and the value is established; its status
#: says why it is empty otherwise (``below-detection``, ``likely-stray-light``, ``not-covered``,
#: ``shape-only``, ``not-irradiance (W m-2 sr-1)`` for a radiance or flux spectrum, …;
#: ``partial-below-detection`` and ``partial-likely-stray-light`` where the
#: data cover UV-C in part, so that holds in the measured part only and UV-C is not ruled
#: out): an empty cell is never a zero. ``origin`` is
#: ``measured``, or ``nominal`` for a listing screened without a spectrum (every figure of
#: such a row is an ESTIMATE from the stated data), or ``listing-only`` for a listing that
#: states too little to model the lamp (claims counted, no figures). ``risk_group`` is at the IEC 62471
#: assessment distance where the measurement distance is known (``risk_group_position``
#: ``assessment-distance``), else at the unknown measurement position
#: (``measurement-position``: not the lamp's classification; give a distance);
#: ``risk_group_at_use`` at the distance of use (``use_distance_m``: the manifest's, the
#: command line's or the listing's), where one is known. ``import_warnings`` counts what the
#: reader (and a scaling) warned of for the spectrum file (a normalised spectrum labelled
#: absolute, photon units converted, thousands separators, dropped rows, gaps, spikes, …) and
#: ``first_import_warning`` gives the one that matters most (:func:`first_warning`): a row
#: whose figures may not mean what they seem is not silent; ``uvcheck assess`` on that file
#: shows them all.
SUMMARY_COLUMNS = (
    "product_id", "spectrum_file", "listing_file", "status", "error",
    "peak_nm", "uvc_W_m2", "uvc_status",
    "risk_group", "risk_group_is_lower_bound", "governing_hazard", "risk_group_position",
    "use_distance_m", "risk_group_at_use",
    "claims_holds", "claims_unlikely", "claims_cannot_hold", "claims_not_assessable",
    "worst_claim_id", "worst_claim_verdict", "worst_claim_ratio",
    "import_warnings", "first_import_warning",
    "note_path", "origin", "inputs_sha256",
)

#: Manifest columns: ``spectrum`` and/or ``listing`` name the files; ``id`` the product (default:
#: the spectrum's file stem, else the listing's); the others are per-product options with the
#: meaning of the ``uvcheck assess`` options of the same name.
MANIFEST_COLUMNS = ("id", "spectrum", "listing", "distance", "source_size", "use_distance",
                    "exposure_time", "electrical_power", "general_lighting", "scale_band",
                    "scale_lux", "scale_total", "unit", "column", "wavelength_unit", "emitter",
                    "tube_length", "repeats", "dark", "dark_column", "block", "data_start",
                    "wavelength_correction", "digitised")
#: How a manifest cell lists several repeat scans.
REPEATS_SEPARATOR = "|"

#: The per-product options (manifest columns that are not files or ids).
OPTION_KEYS = MANIFEST_COLUMNS[3:]

#: .spdx: IES TM-27-14; .xlsx and .ods: workbooks (uvcheck.io.workbook)
SPECTRUM_SUFFIXES = (".csv", ".tsv", ".txt", ".dat", ".asc", ".spdx", ".xlsx", ".ods")
LISTING_SUFFIXES = (".toml",)

#: Verdicts from best to worst (the order ``--fail-on`` uses): the claims module's one order.
from uvcheck.claims import VERDICT_ORDER, worst_first  # noqa: E402


def fails(worst_verdict: str | None, fail_on: str | None) -> bool:
    """Whether ``--fail-on fail_on`` fails for this worst verdict: the verdict is ``fail_on``
    or worse in :data:`VERDICT_ORDER`.

    Examples
    --------
    >>> fails("cannot-hold", "unlikely"), fails("unlikely", "cannot-hold"), fails(None, "unlikely")
    (True, False, False)
    """
    if fail_on is None or worst_verdict not in VERDICT_ORDER:
        return False
    return VERDICT_ORDER.index(worst_verdict) >= VERDICT_ORDER.index(fail_on)
_COUNT_COLUMNS = {"holds": "claims_holds", "unlikely": "claims_unlikely",
                  "cannot-hold": "claims_cannot_hold", "not-assessable": "claims_not_assessable"}

_TRUE = {"yes", "true", "1", "y", "on"}
_FALSE = {"no", "false", "0", "n", "off", ""}


# ---------------------------------------------------------------------------------------------
# Products
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Product:
    """One row of the batch: a spectrum, a listing, or both, with per-product options.

    product_id : the id in the summary (file stem or manifest ``id``).
    spectrum, listing : the files (absolute or relative to the working folder), or None.
    spectrum_label, listing_label : the files as the summary shows them (relative to the
        folder or manifest, so the summary does not depend on where it was run).
    options : per-product options (keys of :data:`OPTION_KEYS`), as text.
    problem : set when the product cannot be assessed as it stands (e.g. two spectrum files
        for one stem); it becomes an error row.
    note : the note to write for this product (HTML), or None.
    repeats : repeat scans of the spectrum (a manifest's ``repeats`` cell, files separated by
        :data:`REPEATS_SEPARATOR`, relative to the manifest), averaged with it.
    dark : a dark (background) scan subtracted from the spectrum (a manifest's ``dark``
        cell, relative to the manifest), or None.
    """

    product_id: str
    spectrum: Path | None
    listing: Path | None
    spectrum_label: str = ""
    listing_label: str = ""
    options: Mapping[str, str] = field(default_factory=dict)
    problem: str | None = None
    note: Path | None = None
    repeats: tuple[Path, ...] = ()
    dark: Path | None = None


def scan_folder(folder: Path, exclude: Iterable[Path] = ()) -> list[Product]:
    """Products of a folder: spectra and listings paired by file stem (see the module notes).

    exclude : files to leave out (the batch's own outputs).
    """
    folder = Path(folder)
    exclude = list(exclude)
    skip = {_same(p) for p in exclude}
    skip_names = {Path(p).name for p in exclude}
    spectra: dict[str, list[Path]] = {}
    listings: dict[str, list[Path]] = {}
    with os.scandir(folder) as it:   # (the entries know their type: no stat per file)
        entries = sorted(it, key=lambda e: e.name)
    for e in entries:
        if e.name.startswith(".") or not e.is_file():
            continue
        p = folder / e.name
        # an excluded file is found under its own name, or through a link
        if (e.name in skip_names or e.is_symlink()) and _same(p) in skip:
            continue
        suffix = p.suffix.lower()
        if suffix in SPECTRUM_SUFFIXES:
            spectra.setdefault(p.stem, []).append(p)
        elif suffix in LISTING_SUFFIXES:
            listings.setdefault(p.stem, []).append(p)
    out = []
    for stem in sorted(set(spectra) | set(listings)):
        sp, ls = spectra.get(stem, []), listings.get(stem, [])
        problem = None
        if len(sp) > 1:
            problem = (f"{len(sp)} spectrum files share the name {stem!r} "
                       f"({', '.join(q.name for q in sp)}): rename one, or give a manifest")
        out.append(Product(product_id=stem, spectrum=sp[0] if sp else None,
                           listing=ls[0] if ls else None,
                           spectrum_label=", ".join(q.name for q in sp),
                           listing_label=ls[0].name if ls else "", problem=problem))
    return out


def read_manifest(path: Path) -> list[Product]:
    """Products of a manifest file (the format is in the module notes and ``uvcheck batch
    --help``). Raises :class:`InputFormatError` naming the line for a manifest that cannot be
    read as a whole (no header, an unknown column, a repeated id)."""
    path = Path(path)
    where = str(path)
    try:
        text = path.read_bytes().decode("utf-8-sig")
    except FileNotFoundError:
        raise InputFormatError("manifest not found", where, "check the path") from None
    except UnicodeDecodeError as exc:
        raise InputFormatError(f"the manifest is not UTF-8 text ({exc.reason})", where,
                               "save it as UTF-8 CSV") from None
    lines = [(k + 1, ln) for k, ln in enumerate(text.splitlines())
             if ln.strip() and not ln.lstrip().startswith("#")]
    if not lines:
        raise InputFormatError("the manifest is empty", where,
                               "write a header row, e.g. 'spectrum,listing,distance'")
    head_no, head = lines[0]
    delim = max((",", ";", "\t"), key=head.count)
    rows = list(csv.reader([ln for _, ln in lines], delimiter=delim))
    names = [c.strip().lower().replace(" ", "_").replace("-", "_") for c in rows[0]]
    unknown = [n for n in names if n not in MANIFEST_COLUMNS]
    if unknown:
        raise InputFormatError(f"unknown manifest column {unknown[0]!r}", f"{where} line {head_no}",
                               f"the columns are: {', '.join(MANIFEST_COLUMNS)}")
    if "spectrum" not in names and "listing" not in names:
        raise InputFormatError("the manifest has neither a 'spectrum' nor a 'listing' column",
                               f"{where} line {head_no}", "name the files in those columns")
    if len(set(names)) != len(names):
        dup = next(n for n in names if names.count(n) > 1)
        raise InputFormatError(f"the manifest names the column {dup!r} twice",
                               f"{where} line {head_no}")
    base = path.parent
    out: list[Product] = []
    seen: dict[str, int] = {}
    for (line_no, _), cells in zip(lines[1:], rows[1:]):
        if len(cells) > len(names) and any(c.strip() for c in cells[len(names):]):
            raise InputFormatError(f"{len(cells)} cells but {len(names)} columns",
                                   f"{where} line {line_no}", "check the delimiters in this row")
        row = {n: (cells[k].strip() if k < len(cells) else "") for k, n in enumerate(names)}
        sp, ls = row.get("spectrum", ""), row.get("listing", "")
        pid = row.get("id", "") or (Path(sp).stem if sp else Path(ls).stem if ls else "")
        problem = None
        if not sp and not ls:
            problem = "the row names neither a spectrum nor a listing"
            pid = pid or f"line {line_no}"
        if pid in seen:
            raise InputFormatError(f"product id {pid!r} appears twice (lines {seen[pid]} and "
                                   f"{line_no})", f"{where} line {line_no}",
                                   "give each row its own 'id'")
        seen[pid] = line_no
        for flag in ("general_lighting", "digitised"):
            if row.get(flag, "").lower() not in _TRUE | _FALSE:
                problem = problem or (f"{flag} {row[flag]!r} (line {line_no}) is not yes or no")
        opts = {k: row[k] for k in OPTION_KEYS if row.get(k)}
        reps = tuple(base / f.strip() for f in row.get("repeats", "").split(REPEATS_SEPARATOR)
                     if f.strip())
        if reps and not sp:
            problem = problem or f"repeat scans (line {line_no}) without a spectrum"
        dark = row.get("dark", "").strip()
        if dark and not sp:
            problem = problem or f"a dark scan (line {line_no}) without a spectrum"
        out.append(Product(product_id=pid, spectrum=(base / sp) if sp else None,
                           listing=(base / ls) if ls else None, spectrum_label=sp,
                           listing_label=ls, options=opts, problem=problem, repeats=reps,
                           dark=(base / dark) if dark else None))
    return out


def looks_like_manifest(path: Path) -> bool:
    """Whether a file's first row (after ``#`` and blank lines) is a manifest header: only
    :data:`MANIFEST_COLUMNS`, among them ``spectrum`` or ``listing``. Asked of a file in a
    scanned folder that could not be read as a spectrum, to say what it is."""
    try:
        with open(path, "rb") as fh:
            head = fh.read(4096).decode("utf-8-sig", errors="replace")
    except OSError:
        return False
    first = next((ln for ln in head.splitlines()
                  if ln.strip() and not ln.lstrip().startswith("#")), "")
    if not first:
        return False
    delim = max((",", ";", "\t"), key=first.count)
    names = [c.strip().lower().replace(" ", "_").replace("-", "_")
             for c in next(csv.reader([first], delimiter=delim))]
    return (bool(names) and all(n in MANIFEST_COLUMNS for n in names)
            and ("spectrum" in names or "listing" in names))


def products_from(source: Path, exclude: Iterable[Path] = ()) -> list[Product]:
    """The products of a folder or of a manifest file."""
    source = Path(source)
    if source.is_dir():
        return scan_folder(source, exclude)
    if not source.exists():
        raise InputFormatError("no such folder or manifest", str(source), "check the path")
    return read_manifest(source)


def assign_notes(products: list[Product], folder: Path) -> list[Product]:
    """Give each product a note file ``<folder>/<id>.html`` (file-name-safe and unique)."""
    used: set[str] = set()
    out = []
    for p in products:
        base = _safe_name(p.product_id) or "product"
        name, k = base, 1
        while name.lower() in used:
            k += 1
            name = f"{base}-{k}"
        used.add(name.lower())
        out.append(replace(p, note=Path(folder) / f"{name}.html"))
    return out


def _safe_name(text: str) -> str:
    """A file name from a product id: path separators, characters Windows forbids and
    control characters become '_'."""
    s = re.sub(r'[\x00-\x1f<>:"/\\|?*]', "_", text).strip().strip(".")
    return s[:120]


def _same(p: Path) -> str:
    try:
        return str(Path(p).resolve())
    except OSError:
        return str(Path(p).absolute())


# ---------------------------------------------------------------------------------------------
# One product
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class BatchSettings:
    """Options that hold for every product (a manifest cell overrides the per-product ones).

    defaults : per-product options (keys of :data:`OPTION_KEYS`) from the command line.
    limits : exposure-limit set id.
    uncertainty : run the Monte Carlo uncertainty evaluation (slow; off by default).
    uncertainty_options : the uncertainty inputs and decision rule as ``uvcheck assess``
        takes them, as texts (keys ``calibration``, ``wavelength``, ``distance``,
        ``stray_light``, ``decision_rule``, ``draws`` of :func:`uvcheck.cli.assess_options`);
        texts, so the settings pickle for the worker processes. For measured spectra only
        (a listing alone is screened as ``uvcheck screen`` does).
    pdf : write a PDF beside each HTML note.
    force_notes : replace existing notes.
    """

    defaults: Mapping[str, str] = field(default_factory=dict)
    limits: str = "iec62471_2006"
    uncertainty: bool = False
    uncertainty_options: Mapping[str, Any] = field(default_factory=dict)
    pdf: bool = True
    force_notes: bool = False

    def assess_options(self) -> Any:
        """The :class:`uvcheck.assessment.AssessOptions` of a measured product."""
        from uvcheck.cli import assess_options

        return assess_options(self.limits, not self.uncertainty,
                              **{k: v for k, v in self.uncertainty_options.items()
                                 if v is not None})


def assess_product(product: Product, settings: BatchSettings) -> Any:
    """The :class:`uvcheck.assessment.Assessment` of one product, by the calls ``uvcheck
    assess`` makes (``uvcheck screen`` for a listing without a spectrum). Its ``to_dict()``
    made strict JSON by :func:`uvcheck.report.jsonout.clean` is what ``assess --json``
    writes; :func:`summary_row` reads ``summary_parts()`` of it and cleans the values it
    takes."""
    return prepare_product(product, settings).assess()


def prepare_product(product: Product, settings: BatchSettings) -> Any:
    """One product read and its conditions built (:class:`uvcheck.pipeline.Prepared`), the
    first part of :func:`assess_product`."""
    from uvcheck.cli import read_options
    from uvcheck.pipeline import ProductInputs, prepare_files

    if product.problem:
        raise ConfigurationError(product.problem)
    o = {**settings.defaults, **product.options}
    given = {k: o.get(k) or None for k in OPTION_KEYS}   # an empty cell is not given
    inputs = ProductInputs(distance=given["distance"], scale_band=given["scale_band"],
                           scale_lux=given["scale_lux"], scale_total=given["scale_total"],
                           source_size=given["source_size"], use_distance=given["use_distance"],
                           general_lighting=str(o.get("general_lighting", "")).lower() in _TRUE,
                           exposure_time=given["exposure_time"] or "8 h",
                           electrical_power=given["electrical_power"],
                           emitter=given["emitter"], tube_length=given["tube_length"],
                           repeats=product.repeats, dark=product.dark,
                           dark_column=given["dark_column"])
    inputs.check(MANIFEST_NAMES)
    listing = None
    if product.listing is not None:
        from uvcheck.io.listing import read_listing

        listing = read_listing(product.listing)
    opts = (read_options(None, None, None, o.get("column"), None, o.get("wavelength_unit"),
                         o.get("unit"), _line_number(o, "block"), _line_number(o, "data_start"),
                         o.get("wavelength_correction") or None,
                         str(o.get("digitised", "")).lower() in _TRUE)
            if product.spectrum is not None else None)
    return prepare_files(product.spectrum, listing, inputs, settings.assess_options(), opts,
                         names=MANIFEST_NAMES)


def _line_number(o: Mapping[str, Any], key: str) -> int | None:
    """A manifest cell that gives a whole number (``block``: which data block of a file with
    several, e.g. which sheet of a workbook; ``data_start``: the line where the data start),
    or None when empty."""
    text = str(o.get(key) or "").strip()
    if not text:
        return None
    if not text.isdigit() or int(text) < 1:
        raise ConfigurationError(f"manifest column '{key}': {text!r} is not a whole number of "
                                 "1 or more", todo=f"give the {key.replace('_', ' ')} as 1, 2, …")
    return int(text)


#: Where a per-product input error points: the manifest's column (or the batch option of the
#: same meaning); the keys of :data:`uvcheck.pipeline.CLI_NAMES`.
MANIFEST_NAMES = {k: k for k in ("distance", "scale_band", "scale_lux", "scale_total",
                                 "source_size", "alpha", "use_distance", "exposure_time",
                                 "electrical_power", "emitter", "tube_length", "dark",
                                 "dark_column")}


def summary_row(product: Product, result: Mapping[str, Any] | None, error: str | None = None,
                note: str | None = None) -> dict[str, Any]:
    """The summary row of one product, from its ``Assessment.to_dict()`` (None for an error
    row). Keys: :data:`SUMMARY_COLUMNS`. Every value goes through
    :func:`uvcheck.report.jsonout.clean`, so a number in the row is the number ``uvcheck
    assess --json`` writes (rounded the same way), whether or not the dict was cleaned first.

    Examples
    --------
    >>> p = Product("lamp 1", None, None, "lamp 1.csv")
    >>> r = summary_row(p, None, error="lamp 1.csv: file not found. Check the path.")
    >>> r["status"], r["error"][:10], r["peak_nm"]
    ('error', 'lamp 1.csv', None)
    """
    from uvcheck.report.jsonout import clean

    row: dict[str, Any] = dict.fromkeys(SUMMARY_COLUMNS)
    row.update(product_id=product.product_id, spectrum_file=product.spectrum_label or None,
               listing_file=product.listing_label or None, note_path=note)
    if result is None:
        row.update(status="error", error=error or "unknown error")
        return row
    _fill(row, result)
    return {k: clean(v) for k, v in row.items()}


def _fill(row: dict[str, Any], result: Mapping[str, Any]) -> None:
    from uvcheck.spectrum import partly_measured

    row["status"] = "ok"
    inp = result.get("input") or {}
    row["origin"] = inp.get("origin")
    if inp.get("warnings") is not None:
        row["import_warnings"] = len(inp["warnings"])
        row["first_import_warning"] = first_warning(inp["warnings"])
    spectral = result.get("spectral") or {}
    row["peak_nm"] = spectral.get("peak_nm")
    uvc = (result.get("germicidal") or {}).get("uvc") or {}
    row["uvc_W_m2"] = uvc.get("value") if uvc.get("unit") == "W m-2" else None
    row["uvc_status"] = uvc.get("status")
    if uvc.get("value") is not None and uvc.get("unit") != "W m-2":
        # a radiance or flux spectrum: its UV-C is not an irradiance (see the JSON), so the
        # empty cell says why rather than read as missing
        row["uvc_status"] = f"not-irradiance ({uvc.get('unit')})"
    if row["uvc_status"] in ("below-detection", "likely-stray-light") and partly_measured(uvc):
        # so in the part measured only: UV-C is not ruled out
        row["uvc_status"] = "partial-" + row["uvc_status"]
    rg = result.get("risk_group") or {}
    row["risk_group"] = rg.get("group")
    row["risk_group_is_lower_bound"] = rg.get("is_lower_bound")
    row["governing_hazard"] = rg.get("governing")
    if rg.get("group") is not None:
        # without a measurement distance the values, and so the group, hold at the
        # measurement position, not at the IEC 62471 assessment distance
        known = (result.get("conditions") or {}).get("measurement_distance_m") is not None
        row["risk_group_position"] = "assessment-distance" if known else "measurement-position"
    use = result.get("use_distance") or {}
    if use:
        row["use_distance_m"] = (result.get("conditions") or {}).get("use_distance_m")
        row["risk_group_at_use"] = (use.get("risk_group") or {}).get("group")
    claims = result.get("claims")
    if claims is not None:
        counts = (result.get("claims_summary") or {}).get("counts") or {}
        for verdict, col in _COUNT_COLUMNS.items():
            row[col] = int(counts.get(verdict, sum(c.get("verdict") == verdict for c in claims)))
        worst = worst_claim(claims)
        if worst is not None:
            row["worst_claim_id"] = worst.get("id")
            row["worst_claim_verdict"] = worst.get("verdict")
            row["worst_claim_ratio"] = worst.get("ratio")


#: How much an import warning matters to a row's figures, by a phrase it holds (our own
#: ranking; the first phrase found decides, unmatched warnings rank 1): 0, the figures may not
#: mean what they seem (a relative or normalised spectrum, a baseline offset, clipping,
#: saturation, a swapped dark, read against the file's conventions, unstable repeat scans,
#: conflicting distances); 2, what was done as asked or as usual (a workbook or TM-27-14 file
#: made into a table, photon units converted, an index column ignored, a mean or a dark
#: subtraction done, a noise floor set for smooth data).
WARNING_RANKS: tuple[tuple[str, int], ...] = (
    ("the mean of ", 2), ("subtracted, over", 2), ("read as a table of its", 2),
    ("IES TM-27-14 file", 2), ("photon units converted", 2), ("was ignored", 2),
    ("was used: of the", 2), ("almost no noise", 2), ("every wavelength corrected by", 2),
    ("DIGITISED", 0), ("RELATIVE", 0), ("normalised", 0), ("swapped", 0), ("below zero", 0), ("negative", 0),
    ("dark (background)", 0), ("clip", 0), ("saturat", 0), ("all values are zero", 0),
    ("pedestal", 0), ("stray light", 0), ("mixes encodings", 0), ("thousands separator", 0),
    ("mixed decimal", 0), ("no unit was found", 0), ("check which is right", 0),
    ("repeat scans differ", 0), ("but they disagree", 0), ("not yet stable", 0), ("do not combine", 0))


def warning_rank(text: str) -> int:
    """How much an import warning matters (:data:`WARNING_RANKS`; 0 most)."""
    return next((r for phrase, r in WARNING_RANKS if phrase in text), 1)


def first_warning(warnings: Sequence[str]) -> str | None:
    """The import warning that matters most (:func:`warning_rank`), the first in reading
    order among equals; None for none.

    >>> first_warning(["column 1 ('Pixel') looks like a row or pixel index and was ignored",
    ...                "the spectrum sits on a flat level ...: a dark (background) level not "
    ...                "subtracted, or a stray-light pedestal?"])[:30]
    'the spectrum sits on a flat le'
    """
    if not warnings:
        return None
    return min(warnings, key=warning_rank)


def worst_claim(claims: Sequence[Mapping[str, Any]]) -> Mapping[str, Any] | None:
    """The claim with the worst verdict (cannot-hold, then unlikely, not-assessable, holds);
    among those, the smallest ratio of available to needed (a claim without a ratio after
    those with one), then the first listed.

    Examples
    --------
    >>> worst_claim([{"id": "a", "verdict": "unlikely", "ratio": 0.6},
    ...              {"id": "b", "verdict": "cannot-hold", "ratio": None},
    ...              {"id": "c", "verdict": "cannot-hold", "ratio": 0.01}])["id"]
    'c'
    """
    if not claims:
        return None
    # min keeps the first listed among equals
    return min(claims, key=lambda c: worst_first(c.get("verdict"), c.get("ratio")))


def inputs_fingerprint(product: Product, settings: BatchSettings,
                       spectrum_sha256: str | None = None) -> str:
    """SHA-256 of what a product's row depends on: the bytes of its files (the spectrum, the
    listing, any repeat scans and dark scan), its options and the batch settings that change
    figures (limit set, uncertainty inputs), and the tool version. ``--resume`` keeps a row
    only when this is unchanged.

    spectrum_sha256 : the SHA-256 of the spectrum file's bytes where the reader has it
        already (the bytes it assessed); else the file is hashed here."""
    import hashlib

    from uvcheck import __version__

    def file_hash(p: Path | None) -> str | None:
        if p is None:
            return None
        try:
            return hashlib.sha256(Path(p).read_bytes()).hexdigest()
        except OSError:
            return "unreadable"

    sp = (spectrum_sha256 if spectrum_sha256 is not None and product.spectrum is not None
          else file_hash(product.spectrum))
    if product.repeats:
        what_more = {"repeats": [file_hash(f) for f in product.repeats]}
    else:
        what_more = {}
    if product.dark is not None:
        what_more["dark"] = file_hash(product.dark)
    what = {"spectrum": sp, "listing": file_hash(product.listing), **what_more,
            "options": {**settings.defaults, **product.options}, "limits": settings.limits,
            "uncertainty": settings.uncertainty,
            "uncertainty_options": dict(settings.uncertainty_options), "version": __version__}
    return hashlib.sha256(json.dumps(what, sort_keys=True, default=str).encode()).hexdigest()


def run_product(product: Product, settings: BatchSettings,
                prepared: Any = None) -> dict[str, Any]:
    """Assess one product and return its summary row; any failure becomes an error row.

    prepared : what :func:`prepare_product` gave for it, or the exception it raised (the
        first stage of :func:`_run_chunk`); None: prepared here."""
    row, spectrum_sha = _run_product(product, settings, prepared)
    row["inputs_sha256"] = inputs_fingerprint(product, settings, spectrum_sha)
    return row


def _run_product(product: Product, settings: BatchSettings,
                 prepared: Any = None) -> tuple[dict[str, Any], str | None]:
    """(the summary row, the SHA-256 of the spectrum bytes read, or None)."""
    try:
        if isinstance(prepared, BaseException):
            raise prepared
        a = (prepared if prepared is not None else prepare_product(product, settings)).assess()
        # the reader's hash of the spectrum file's bytes; a mean of repeat scans or a
        # dark-subtracted scan carries a digest of several files instead, so the files are
        # hashed by inputs_fingerprint (each of them)
        sha = (a.spectrum.meta.get("sha256") if product.spectrum is not None
               and not product.repeats and product.dark is None else None)
        if product.note is None:
            return summary_row(product, a.summary_parts()), sha
        from uvcheck.cli_note import write_note
        from uvcheck.report.jsonout import clean

        result = clean(a.to_dict())  # the notes are rendered from strict JSON (as note_result's)
        html_path, _, _ = write_note(result, a.spectrum, product.note, pdf=settings.pdf,
                                     force=settings.force_notes, salt=product.product_id)
        return summary_row(product, result, note=str(html_path)), sha
    except UvcheckError as exc:
        if product.spectrum is not None and looks_like_manifest(product.spectrum):
            exc = InputFormatError("this looks like a batch manifest, not a spectrum",
                                   product.spectrum_label or str(product.spectrum),
                                   f"give it as the batch's source (uvcheck batch "
                                   f"{Path(product.spectrum).name} --out …), or move it out "
                                   "of the folder")
        return summary_row(product, None, error=exc.one_line()), None
    except (OSError, MemoryError, RecursionError) as exc:
        return summary_row(product, None, error=f"{type(exc).__name__}: {exc}"), None
    except Exception as exc:  # a bug must not stop a batch of thousands; the row says so
        return summary_row(product, None, error=f"internal error ({type(exc).__name__}: "
                           f"{exc}); please report it with the file"), None


#: A chunk is run stage by stage over groups of products holding at most this many spectral
#: samples between them: every file of the group read, then each assessed (so memory stays
#: bounded however large the files are).
STAGE_SAMPLES = 1 << 18


def _run_chunk(job: tuple[list[Product], BatchSettings]) -> list[dict[str, Any]]:
    """The rows of a chunk of products. The same calls as :func:`run_product` one product at
    a time, in another order: the files of a group are read first, then the group is
    assessed, which keeps each stage's code and tables in the processor's caches (about 15 %
    less time per product than reading and assessing each in turn, measured with
    tests/benchmarks/bench_batch.py). An error while reading becomes that product's error row
    as before (tests/test_batch.py compares the two orders)."""
    products, settings = job
    rows: list[dict[str, Any]] = []
    group: list[tuple[Product, Any]] = []
    held = 0
    for p in products:
        try:
            x: Any = prepare_product(p, settings)
            held += x.samples
        except Exception as exc:  # noqa: BLE001  (reported in its row, as run_product does)
            x = exc
        group.append((p, x))
        if held >= STAGE_SAMPLES:
            rows += [run_product(q, settings, y) for q, y in group]
            group, held = [], 0
    rows += [run_product(q, settings, y) for q, y in group]
    return rows


# ---------------------------------------------------------------------------------------------
# Running many: processes, order, memory
# ---------------------------------------------------------------------------------------------

def default_jobs() -> int:
    """The number of cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return max(1, os.cpu_count() or 1)


def warm_up(settings: BatchSettings, products: Sequence[Product] = ()) -> None:
    """Import the science modules and load the reference tables (once per process); with
    the fork start method the workers inherit them. The listing reader and the screening of
    listings are imported only when a product has a listing (a folder of spectra alone does
    not wait for them); what a rare file needs (numpy.unique for unsorted rows imports
    numpy.ma) is left to the worker that meets it."""
    from uvcheck import assessment, claims  # noqa: F401
    from uvcheck.germicidal import ACTION_SPECTRA, VIOLET_BLUE_ID, action_spectrum, technologies
    from uvcheck.features import known_lines
    from uvcheck.inactivation import organisms
    from uvcheck.io import reader  # noqa: F401
    from uvcheck.limits import get_limit_set
    from uvcheck.photometry import _locus, cmfs, v_lambda
    from uvcheck.report import jsonout  # noqa: F401

    if any(p.listing is not None for p in products):
        from uvcheck import screening  # noqa: F401
        from uvcheck.io import listing  # noqa: F401

    lset = get_limit_set(settings.limits)
    for e in lset.entries.values():
        e.weight()
    for a in ACTION_SPECTRA + (VIOLET_BLUE_ID,):
        action_spectrum(a)
    technologies(), known_lines(), organisms(), v_lambda(), cmfs(), _locus()


def _worker_start() -> None:
    """In each worker: what it inherited lives as long as the process, so keep it out of the
    cyclic collector's scans (``gc.freeze`` moves it aside at once, touching no object)."""
    import gc

    gc.freeze()


def ordered_map(fn: Callable[[Any], list[Any]], jobs: Iterable[Any], workers: int,
                window: int = 4) -> Iterator[list[Any]]:
    """``fn`` over ``jobs`` on ``workers`` processes, results in job order, with at most
    ``window × workers`` jobs in flight (so memory stays flat however many jobs there are).
    One process: in this process, no pool. The pool is shut down (its workers joined) before
    the last result is handed over, so a caller that takes exactly as many results as it gave
    jobs leaves no worker behind; otherwise the shutdown would wait for the generator to be
    collected, at the interpreter's exit, where Python 3.11's own exit hook races with it and
    can print "OSError: Bad file descriptor"."""
    if workers <= 1:
        for j in jobs:
            yield fn(j)
        return
    import concurrent.futures as cf
    import multiprocessing as mp

    # fork: the workers start with the modules and tables this process has loaded
    ctx = mp.get_context("fork") if "fork" in mp.get_all_start_methods() else None
    it = iter(jobs)
    ex = cf.ProcessPoolExecutor(max_workers=workers, mp_context=ctx, initializer=_worker_start)
    finished = False
    try:
        pending: deque[cf.Future] = deque()
        for j in it:
            pending.append(ex.submit(fn, j))
            if len(pending) >= window * workers:
                break
        while pending:
            done = pending.popleft().result()
            nxt = next(it, None)
            if nxt is not None:
                pending.append(ex.submit(fn, nxt))
            if not pending:
                finished = True
                ex.shutdown(wait=True)
            yield done
    finally:
        if not finished:
            # on an interruption or an error, do not wait for the chunks still in flight
            ex.shutdown(wait=False, cancel_futures=True)


def _chunks(items: Sequence[Any], size: int) -> Iterator[list[Any]]:
    for k in range(0, len(items), size):
        yield list(items[k:k + size])


# ---------------------------------------------------------------------------------------------
# Output: CSV and JSON lines, streamed, resumable
# ---------------------------------------------------------------------------------------------

def jsonl_path(out_csv: Path) -> Path:
    """The JSON-lines file beside the summary: ``summary.csv`` -> ``summary.jsonl``."""
    return Path(out_csv).with_suffix(".jsonl")


def part_path(path: Path) -> Path:
    """Where rows go while the batch runs (renamed over ``path`` at the end)."""
    return Path(path).with_name(Path(path).name + ".part")


def row_cells(row: Mapping[str, Any]) -> list[Any]:
    return [row.get(c) for c in SUMMARY_COLUMNS]


def json_line(row: Mapping[str, Any]) -> str:
    """One JSON line (strict JSON, keys in :data:`SUMMARY_COLUMNS` order)."""
    return json.dumps({c: row.get(c) for c in SUMMARY_COLUMNS}, ensure_ascii=False,
                      allow_nan=False, separators=(",", ":")) + "\n"


@dataclass
class _Previous:
    """Rows of an earlier run that ``resume`` may keep: CSV cells (text as written) and the
    JSON line, by product id."""

    csv: dict[str, list[str]] = field(default_factory=dict)
    jsonl: dict[str, str] = field(default_factory=dict)

    def keep(self, p: Product, settings: BatchSettings) -> tuple[list[str], str] | None:
        cells = self.csv.get(p.product_id)
        line = self.jsonl.get(p.product_id)
        if cells is None or line is None:
            return None
        d = dict(zip(SUMMARY_COLUMNS, cells))
        if (d.get("status") != "ok" or d.get("spectrum_file", "") != p.spectrum_label
                or d.get("listing_file", "") != p.listing_label):
            return None
        if d.get("inputs_sha256") != inputs_fingerprint(p, settings):
            return None  # a file, an option, a setting or the tool changed since
        if p.note is not None and not d.get("note_path"):
            return None  # notes are asked for now, and that row has none
        return cells, line


def read_previous(out_csv: Path) -> _Previous:
    """The rows of an earlier run: the finished summary and any rows of an interrupted one
    (``.part``); a row cut short by the interruption is left out."""
    prev = _Previous()
    for path in (Path(out_csv), part_path(out_csv)):
        if not path.is_file():
            continue
        text = path.read_bytes().decode("utf-8-sig", errors="replace")
        complete = text if text.endswith("\n") else text[:text.rfind("\n") + 1]
        rows = list(csv.reader(io.StringIO(complete, newline="")))
        if rows and tuple(rows[0]) != SUMMARY_COLUMNS and {"product_id", "inputs_sha256"} <= set(rows[0]):
            raise InputFormatError("this summary was written by another uvcheck version (its "
                                   "columns differ), so its rows cannot be kept", str(path),
                                   "start again with --force, or give another --out")
        if not rows or tuple(rows[0]) != SUMMARY_COLUMNS:
            raise InputFormatError("this is not a uvcheck batch summary (unexpected header)",
                                   str(path), "give another --out, or leave out --resume")
        for cells in rows[1:]:
            if len(cells) == len(SUMMARY_COLUMNS):
                prev.csv[_unneutralised(cells[0])] = cells
    for path in (jsonl_path(out_csv), part_path(jsonl_path(out_csv))):
        if not path.is_file():
            continue
        for line in path.read_text(encoding="utf-8", errors="replace").splitlines(True):
            if not line.endswith("\n"):
                continue  # cut short
            try:
                rec = json.loads(line)
            except ValueError:
                continue
            if isinstance(rec, dict) and isinstance(rec.get("product_id"), str):
                prev.jsonl[rec["product_id"]] = line
    return prev


def _unneutralised(cell: str) -> str:
    """The text of a summary cell before formula neutralisation (the product id)."""
    from uvcheck.report.csvout import neutralise

    if cell.startswith("'") and neutralise(cell[1:]) == cell:
        return cell[1:]
    return cell


@dataclass(frozen=True)
class BatchSummary:
    """What a batch did: rows written, how many were kept from an earlier run, errors, and
    the files."""

    products: int
    kept: int
    errors: int
    worst_verdict: str | None
    csv_path: Path
    jsonl_path: Path


def check_outputs(out_csv: Path, force: bool, resume: bool) -> None:
    """Refuse before any work: an existing summary without --force or --resume, a folder, a
    name not ending in .csv, a missing output folder, or --force with --resume."""
    out_csv = Path(out_csv)
    if force and resume:
        raise ConfigurationError("give --force (start again) or --resume (keep finished rows), "
                                 "not both")
    if out_csv.suffix.lower() != ".csv":
        raise ConfigurationError(f"the summary is written as CSV: {out_csv.name!r} does not "
                                 "end in .csv", "--out", "give a name like 'summary.csv'")
    from uvcheck.cli import check_output_file

    for p in (out_csv, jsonl_path(out_csv)):
        check_output_file(p, force or resume, "--out",
                          exists_todo="give --resume to keep its finished rows, --force to "
                                      "start again, or choose another name")


def run_batch(source: Path, out_csv: Path, settings: BatchSettings, *, jobs: int | None = None,
              resume: bool = False, force: bool = False, notes: Path | None = None,
              progress: Callable[[int, int], None] | None = None,
              products: list[Product] | None = None) -> BatchSummary:
    """Assess every product of ``source`` (a folder or a manifest) and write the summary.

    out_csv : the summary (CSV); the JSON lines go to :func:`jsonl_path` of it.
    jobs : processes (default: every core this process may use).
    resume : keep the finished rows of an earlier run (see the module notes).
    notes : a folder for one note per product (HTML, and PDF unless ``settings.pdf`` is off).
    progress : called with (rows done, rows in all) after each chunk.

    Raises :class:`UvcheckError` (nothing written) for a manifest that cannot be read or an
    output that exists without ``force``/``resume``; a product that fails is an error row.
    """
    from uvcheck.report.csvout import csv_text

    out_csv = Path(out_csv)
    out_jsonl = jsonl_path(out_csv)
    check_outputs(out_csv, force, resume)
    if products is None:
        products = products_from(source, exclude=[out_csv, out_jsonl, part_path(out_csv),
                                                  part_path(out_jsonl)])
    if notes is not None:
        notes = Path(notes)
        if notes.exists() and not notes.is_dir():
            raise UvcheckError("the notes path is not a folder", str(notes), "give a folder")
        notes.mkdir(parents=True, exist_ok=True)
        products = assign_notes(products, notes)
        settings = replace(settings, force_notes=settings.force_notes or force or resume)
    prev = read_previous(out_csv) if resume else _Previous()
    kept = {p.product_id: prev.keep(p, settings) for p in products}
    todo = [p for p in products if kept[p.product_id] is None]
    workers = min(jobs or default_jobs(), max(1, len(todo)))
    size = max(1, min(32, len(todo) // (workers * 8) or 1))
    if todo:
        warm_up(settings, todo)
    part_csv, part_jsonl = part_path(out_csv), part_path(out_jsonl)
    n_err = 0
    worst = -1
    done = 0
    total = len(products)
    results = ordered_map(_run_chunk, ((c, settings) for c in _chunks(todo, size)), workers)
    with open(part_csv, "w", encoding="utf-8", newline="") as fc, \
            open(part_jsonl, "w", encoding="utf-8", newline="\n") as fj:
        fc.write(csv_text([], header=SUMMARY_COLUMNS))
        pending_rows: deque[dict[str, Any]] = deque()
        for p in products:
            k = kept[p.product_id]
            if k is not None:
                fc.write(csv_text([k[0]]))
                fj.write(k[1])
                cells = dict(zip(SUMMARY_COLUMNS, k[0]))
                worst = max(worst, _severity(cells.get("worst_claim_verdict")))
            else:
                if not pending_rows:
                    pending_rows.extend(next(results))
                row = pending_rows.popleft()
                fc.write(csv_text([row_cells(row)]))
                fj.write(json_line(row))
                n_err += row["status"] == "error"
                worst = max(worst, _severity(row.get("worst_claim_verdict")))
            done += 1
            if not pending_rows:  # a chunk is written (or a kept row): make it visible
                fc.flush()
                fj.flush()
                if progress is not None:
                    progress(done, total)
        fc.flush()
        fj.flush()
        os.fsync(fc.fileno())
        os.fsync(fj.fileno())
    os.replace(part_csv, out_csv)
    os.replace(part_jsonl, out_jsonl)
    return BatchSummary(products=total, kept=sum(v is not None for v in kept.values()),
                        errors=n_err, worst_verdict=VERDICT_ORDER[worst] if worst >= 0 else None,
                        csv_path=out_csv, jsonl_path=out_jsonl)


def _severity(verdict: Any) -> int:
    return VERDICT_ORDER.index(verdict) if verdict in VERDICT_ORDER else -1


def defaults_from_options(**options: str | None) -> dict[str, str]:
    """The per-product defaults from command-line option texts (None: not given)."""
    unknown = set(options) - set(OPTION_KEYS)
    if unknown:  # pragma: no cover - a programming error in the command layer
        raise ConfigurationError(f"unknown batch option {sorted(unknown)[0]!r}")
    return {k: str(v) for k, v in options.items() if v not in (None, "")}

