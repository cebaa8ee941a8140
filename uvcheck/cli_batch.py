"""Command function for ``uvcheck batch`` (registered in cli.py).

Thin: parse the options, hand them to :func:`uvcheck.batch.run_batch`, show progress and a
one-line summary. Only typer and the standard library are imported at module level (no
``from __future__ import annotations`` either: typer would have to evaluate every annotation
string at start-up), so ``uvcheck --help`` stays fast. Errors are
:class:`~uvcheck.errors.UvcheckError` subclasses, which the CLI prints as one line with exit
status 2.
"""

import sys
from pathlib import Path
from typing import Annotated, Any, Optional

import typer

from uvcheck.cli_options import (CalibrationUncertainty, DecisionRule, Distance,
                                 DistanceUncertainty, Draws, ElectricalPower, ExposureTime, Force,
                                 GeneralLighting, Limits, Quiet, SourceSize, StrayLight, Unit,
                                 UseDistance, WavelengthUncertainty)


def batch_command(
    source: Annotated[Path, typer.Argument(
        help="A folder of spectra and listings (paired by file stem), or a manifest (CSV).",
        show_default=False)],
    out: Annotated[Path, typer.Option(
        "--out", help="Summary table to write (CSV); the same rows go beside it as JSON lines "
                      "(summary.csv -> summary.jsonl).", show_default=False)],
    resume: Annotated[bool, typer.Option(
        "--resume", help="Keep the rows with status ok of an earlier run (finished or "
                         "interrupted) and assess the others.")] = False,
    force: Force = False,
    jobs: Annotated[Optional[int], typer.Option(
        "--jobs", help="Processes to use (default: every core).", min=1)] = None,
    notes: Annotated[Optional[Path], typer.Option(
        "--notes", help="Also write a safety note per product into this folder "
                        "(<id>.html and <id>.pdf; slow).")] = None,
    no_pdf: Annotated[bool, typer.Option("--no-pdf", help="Notes in HTML only.")] = False,
    uncertainty: Annotated[Optional[bool], typer.Option(
        "--uncertainty/--no-uncertainty", help="Run the Monte Carlo uncertainty evaluation "
        "for every measured spectrum, as 'uvcheck assess' does by default. Default: on with "
        "--notes or any uncertainty option below (the notes state the intervals, as 'uvcheck "
        "note' does), else off (it costs about 0.1 s per product).",
        rich_help_panel="Uncertainty", show_default=False)] = None,
    calibration_uncertainty: CalibrationUncertainty = None,
    wavelength_uncertainty: WavelengthUncertainty = None,
    distance_uncertainty: DistanceUncertainty = None,
    stray_light: StrayLight = None,
    decision_rule: DecisionRule = None,
    draws: Draws = None,
    limits: Limits = "iec62471_2006",
    distance: Distance = None,
    source_size: SourceSize = None,
    use_distance: UseDistance = None,
    general_lighting: GeneralLighting = False,
    exposure_time: ExposureTime = "8 h",
    electrical_power: ElectricalPower = None,
    unit: Unit = None,
    fail_on: Annotated[Optional[str], typer.Option(
        "--fail-on", help="Exit with status 1 when a product has a claim with this verdict "
                          "or a worse one (cannot-hold, unlikely, not-assessable).")] = None,
    quiet: Quiet = False,
) -> None:
    """Screen many products at once: one summary row per product (CSV, and JSON lines beside
    it), assessed on every core, in a fixed order. A product that cannot be assessed gets an
    error row and the batch goes on; cells a spreadsheet would read as formulas are
    neutralised. Each row is derived from the same result as 'uvcheck assess --json' (or
    'uvcheck screen' for a listing without a spectrum). Screening assessments, not
    certifications.

    \b
    A folder: every spectrum file (.csv .tsv .txt .dat .asc .spdx .xlsx .ods)
    and listing (.toml) in it, paired by file stem (lamp7.csv with lamp7.toml).

    \b
    A manifest: a CSV file (comma, semicolon or tab; UTF-8) with a header row.
    Columns (any order; all optional but spectrum or listing):
      id                product id (default: the spectrum's file stem)
      spectrum          spectrum file, relative to the manifest's folder
      listing           listing file (TOML) whose claims are judged
      distance          measurement distance, e.g. '20 cm'
      source_size       apparent source size; a bare number is mm
      use_distance      a distance of use, e.g. '1.5 m'
      exposure_time     e.g. '8 h'
      electrical_power  e.g. '8 W'
      general_lighting  yes or no
      emitter           point, lambertian or tube (distance model)
      tube_length       a tube's length, e.g. '1.2 m' (the tube model)
      repeats           repeat scans of the spectrum, 'b.csv|c.csv' (averaged)
      dark              a dark (background) scan, subtracted from the spectrum
      dark_column       or the spectrum file's column that holds the dark scan
      scale_band | scale_lux | scale_total   scaling of a relative spectrum
      unit | column | wavelength_unit        reading the spectrum file
      block | data_start                     the data block to read (a workbook's
                                             sheet), or the line where it starts
      wavelength_correction   added to every wavelength, e.g. '-2.2 nm'
      digitised         yes: a curve read off a graph, not a measurement
    Lines starting with # are skipped; an empty cell keeps the option given
    on the command line (--distance, --source-size, ...), which applies to
    every product.
    Example:  id,spectrum,listing,distance
              wand-A,spectra/wand.csv,listings/wand.toml,10 cm

    \b
    Summary columns: product_id, spectrum_file, listing_file, status (ok |
    error), error, peak_nm, uvc_W_m2, uvc_status, risk_group,
    risk_group_is_lower_bound, governing_hazard, risk_group_position
    (assessment-distance, or measurement-position where no measurement distance
    is known: then the group is not the lamp's classification), use_distance_m,
    risk_group_at_use
    (the group at the distance of use), claims_holds, claims_unlikely,
    claims_cannot_hold, claims_not_assessable, worst_claim_id,
    worst_claim_verdict, worst_claim_ratio, import_warnings (how many warnings
    the reader gave for the spectrum file: a normalised spectrum labelled
    absolute, converted units, dropped rows, ...), first_import_warning (the
    one that matters most to the figures),
    note_path, origin (measured, or
    nominal: a listing without a spectrum, every figure an ESTIMATE; or
    listing-only: a listing too thin to model the lamp, claims only),
    inputs_sha256 (files, options and settings: --resume keeps a row only when
    it is unchanged).
    """
    from uvcheck.batch import BatchSettings, check_outputs, defaults_from_options, run_batch
    from uvcheck.cli import _check_fail_on, uncertainty_given

    _check_fail_on(fail_on)
    check_outputs(out, force, resume)
    unc = {"calibration": calibration_uncertainty, "wavelength": wavelength_uncertainty,
           "distance": distance_uncertainty, "stray_light": stray_light,
           "decision_rule": decision_rule, "draws": draws}
    if uncertainty is None:
        uncertainty = notes is not None or bool(uncertainty_given(**unc))
    settings = BatchSettings(
        defaults=defaults_from_options(
            distance=distance, source_size=source_size, use_distance=use_distance,
            exposure_time=exposure_time, electrical_power=electrical_power, unit=unit,
            general_lighting="yes" if general_lighting else None),
        limits=limits, uncertainty=uncertainty,
        uncertainty_options={k: v for k, v in unc.items() if v is not None}, pdf=not no_pdf)
    settings.assess_options()   # a wrong text (or one with --no-uncertainty) fails before any work
    from uvcheck.limits import get_limit_set

    get_limit_set(limits)   # an unknown limit set fails before any work, listing the sets
    with _progress(quiet) as progress:
        summary = run_batch(source, out, settings, jobs=jobs, resume=resume, force=force,
                            notes=notes, progress=progress)
    if not quiet:
        kept = f", {summary.kept} kept from the earlier run" if summary.kept else ""
        typer.echo(f"{summary.products} product(s): {summary.products - summary.errors} ok, "
                   f"{summary.errors} error(s){kept}; {summary.csv_path} and "
                   f"{summary.jsonl_path}. Screening assessments, not certifications.")
    from uvcheck.batch import fails

    if fails(summary.worst_verdict, fail_on):
        raise typer.Exit(1)


class _progress:
    """A rich progress bar on a terminal (stderr); nothing when stderr is not a terminal or
    with --quiet. Used as ``with _progress(quiet) as update: update(done, total)``."""

    def __init__(self, quiet: bool) -> None:
        self.bar: Any = None
        self.task: Any = None
        if not quiet and sys.stderr.isatty():
            from rich.console import Console
            from rich.progress import (BarColumn, MofNCompleteColumn, Progress, TextColumn,
                                       TimeElapsedColumn, TimeRemainingColumn)

            self.bar = Progress(TextColumn("uvcheck batch"), BarColumn(), MofNCompleteColumn(),
                                TimeElapsedColumn(), TimeRemainingColumn(),
                                console=Console(stderr=True), transient=True,
                                auto_refresh=False)  # no refresh thread: workers are forked

    def __enter__(self) -> Any:
        if self.bar is None:
            return None
        self.bar.start()
        return self.update

    def update(self, done: int, total: int) -> None:
        if self.task is None:
            self.task = self.bar.add_task("products", total=total)
        self.bar.update(self.task, completed=done, total=total, refresh=True)

    def __exit__(self, *exc: Any) -> None:
        if self.bar is not None:
            self.bar.stop()
