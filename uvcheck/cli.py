"""The command line: parse, call the science, render. Nothing else lives here.

Start-up budget: this module imports typer and the standard library only. Every command
imports what it needs inside its body, so ``uvcheck --help`` loads no numpy, scipy, pandas,
colour or matplotlib (a test checks ``sys.modules``).
"""

from __future__ import annotations

import functools
import sys
from pathlib import Path
from typing import Annotated, Any, Callable, Optional

import typer

from uvcheck import __version__

app = typer.Typer(
    name="uvcheck",
    help="Check lamps sold as germicidal, UV-sterilising or disinfecting: what they emit, "
         "how hazardous they are (IEC 62471), and whether their claims can hold. "
         "Screening assessments, not certifications.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
    rich_markup_mode=None,
)

_STATE = {"debug": False}


def _version(value: bool) -> None:
    if value:
        typer.echo(f"uvcheck {__version__}")
        raise typer.Exit()


@app.callback()
def _root(
    debug: Annotated[bool, typer.Option("--debug", help="Show a traceback on errors.")] = False,
    version: Annotated[Optional[bool], typer.Option("--version", callback=_version,
                                                    is_eager=True, help="Print the version.")] = None,
) -> None:
    _STATE["debug"] = debug


def guarded(fn: Callable[..., Any]) -> Callable[..., Any]:
    """Turn UvcheckError into one line on stderr and exit status 2 (traceback with --debug)."""

    @functools.wraps(fn)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
        from uvcheck.errors import UvcheckError

        try:
            return fn(*args, **kwargs)
        except UvcheckError as exc:
            if _STATE["debug"]:
                raise
            typer.echo(f"uvcheck: error: {exc.one_line()}", err=True)
            raise typer.Exit(2) from None
        except (OSError, MemoryError) as exc:
            if _STATE["debug"]:
                raise
            typer.echo(f"uvcheck: error: {exc}", err=True)
            raise typer.Exit(2) from None

    return wrapper


# ---------------------------------------------------------------------------------------------
# Shared options (defined once in uvcheck.cli_options)
# ---------------------------------------------------------------------------------------------

from uvcheck.cli_options import (  # noqa: E402  (typer only)
    Alpha, Block, CalibrationUncertainty, Column, Dark, DarkColumn, DataStart, Decimal,
    DecisionRule, Delimiter, Digitised, Distance, DistanceUncertainty, Draws, ElectricalPower,
    Emitter, Encoding, ExposureTime, Force, GeneralLighting, Limits, MeterResponse,
    NoUncertainty, Quiet, Repeat, ScaleBand, ScaleLux, ScaleTotal, SourceSize, StrayLight,
    TestInfo, TubeLength, Unit, UseDistance, WavelengthUncertainty, WlColumn, WlCorrection,
    WlUnit)


def read_options(encoding: str | None, delimiter: str | None, decimal: str | None,
                 column: str | None, wavelength_column: str | None, wavelength_unit: str | None,
                 unit: str | None, block: int | None, data_start: int | None,
                 wavelength_correction: str | None = None, digitised: bool = False) -> Any:
    from uvcheck.io.reader import ReadOptions, wavelength_correction_nm

    if wavelength_correction is not None:
        wavelength_correction_nm(wavelength_correction)  # checked before any file is read
    return ReadOptions(encoding=encoding, delimiter=delimiter, decimal=decimal, column=column,
                       wavelength_column=wavelength_column, wavelength_unit=wavelength_unit,
                       unit=unit, block=block, data_start=data_start,
                       wavelength_correction=wavelength_correction, digitised=digitised)


# ---------------------------------------------------------------------------------------------
# assess
# ---------------------------------------------------------------------------------------------

@app.command()
@guarded
def assess(
    spectrum_file: Annotated[Path, typer.Argument(
        help="Spectrum export: a text table (CSV, TSV, ...), IES TM-27-14 XML, or a workbook "
             "(.xlsx, .ods).")],
    json_out: Annotated[Optional[str], typer.Option("--json", help="Write the full result as "
                                                    "JSON to this path ('-' for stdout).")] = None,
    force: Force = False,
    distance: Distance = None,
    scale_band: ScaleBand = None,
    meter_response: MeterResponse = None,
    scale_lux: ScaleLux = None,
    scale_total: ScaleTotal = None,
    source_size: SourceSize = None,
    alpha: Alpha = None,
    use_distance: UseDistance = None,
    general_lighting: GeneralLighting = False,
    exposure_time: ExposureTime = "8 h",
    limits: Limits = "iec62471_2006",
    claims: Annotated[Optional[Path], typer.Option("--claims", help="Listing file (TOML) whose "
                                                   "claims are judged against the measurement.")] = None,
    fail_on: Annotated[Optional[str], typer.Option("--fail-on", help="Exit with status 1 when a "
                                                   "claim gets this verdict or a worse one "
                                                   "(not-assessable < unlikely < cannot-hold).")] = None,
    electrical_power: ElectricalPower = None,
    emitter: Emitter = None,
    tube_length: TubeLength = None,
    no_uncertainty: NoUncertainty = False,
    calibration_uncertainty: CalibrationUncertainty = None,
    wavelength_uncertainty: WavelengthUncertainty = None,
    distance_uncertainty: DistanceUncertainty = None,
    stray_light: StrayLight = None,
    decision_rule: DecisionRule = None,
    draws: Draws = None,
    quiet: Quiet = False,
    encoding: Encoding = None, delimiter: Delimiter = None, decimal: Decimal = None,
    column: Column = None, wavelength_column: WlColumn = None, wavelength_unit: WlUnit = None,
    wavelength_correction: WlCorrection = None,
    digitised: Digitised = False,
    unit: Unit = None, block: Block = None, data_start: DataStart = None,
    repeat: Repeat = None,
    dark: Dark = None,
    dark_column: DarkColumn = None,
    test_info: TestInfo = None,
    export_spectrum: Annotated[Optional[Path], typer.Option(
        "--export-spectrum", help="Also write the spectrum as assessed (after any repeats, "
                                  "dark scan and scaling) with its provenance: IES TM-27-14 XML "
                                  "for a .spdx or .xml name, else a CSV table.")] = None,
) -> None:
    """Assess a measured spectrum: band breakdown, peak, photometry, IEC 62471 hazards,
    germicidal output, measurement uncertainty, and the verdicts on a listing's claims
    (--claims)."""
    from uvcheck.pipeline import ProductInputs, assess_files
    from uvcheck.report.jsonout import write_json
    from uvcheck.report.terminal import render_assessment

    inputs = ProductInputs(distance=distance, scale_band=scale_band, scale_lux=scale_lux,
                           scale_total=scale_total, source_size=source_size, alpha=alpha,
                           use_distance=use_distance, general_lighting=general_lighting,
                           exposure_time=exposure_time, electrical_power=electrical_power,
                           emitter=emitter, tube_length=tube_length,
                           repeats=tuple(repeat or ()), dark=dark, dark_column=dark_column,
                           meter_response=meter_response, test_info=tuple(test_info or ()))
    inputs.check()
    check_output_file(json_out, force)
    check_output_file(export_spectrum, force, "--export-spectrum")
    _check_fail_on(fail_on)
    options = assess_options(limits, no_uncertainty, calibration_uncertainty,
                             wavelength_uncertainty, distance_uncertainty, stray_light,
                             decision_rule, draws)
    opts = read_options(encoding, delimiter, decimal, column, wavelength_column, wavelength_unit,
                        unit, block, data_start, wavelength_correction, digitised)
    # the listing file is read after the spectrum (each file's errors in that order)
    a = assess_files(spectrum_file, claims, inputs, options, opts)
    result = a.to_dict()
    if json_out:
        write_json(json_out, result, force=force)
    if export_spectrum is not None:
        from uvcheck.io.export import write_spectrum

        write_spectrum(a.spectrum, export_spectrum, result, force=force)
    if not quiet and json_out != "-":
        typer.echo(render_assessment(result), nl=False)
    _exit_for(result, fail_on)


def check_output_file(path: str | Path | None, force: bool, option: str = "--json",
                      exists_todo: str = "give --force to replace it, or choose another name"
                      ) -> None:
    """Refuse before any work: an output that is a folder, lies in a folder that does not
    exist, or exists without ``force`` ('-' is stdout, None no output); ``exists_todo`` says
    what to do about an existing one."""
    if path is None or str(path) == "-":
        return
    from uvcheck.errors import OutputExistsError, UvcheckError

    p = Path(path)
    if p.is_dir():
        raise UvcheckError("the output path is a folder", str(p), "give a file name")
    folder = p.parent if str(p.parent) else Path(".")
    if not folder.is_dir():
        raise UvcheckError("the output folder does not exist", str(folder),
                           f"create it first, or give {option} a path in an existing folder")
    if p.exists() and not force:
        raise OutputExistsError("the output file exists", str(p), exists_todo)


def uncertainty_given(no_uncertainty: bool = False, calibration: str | None = None,
                      wavelength: str | None = None, distance: str | None = None,
                      stray_light: str | None = None, decision_rule: str | None = None,
                      draws: int | None = None) -> list[str]:
    """The uncertainty options given on the command line, by option name."""
    pairs = (("--no-uncertainty", no_uncertainty or None),
             ("--calibration-uncertainty", calibration), ("--wavelength-uncertainty", wavelength),
             ("--distance-uncertainty", distance), ("--stray-light", stray_light),
             ("--decision-rule", decision_rule), ("--draws", draws))
    return [name for name, v in pairs if v is not None]


def assess_options(limits: str, no_uncertainty: bool = False, calibration: str | None = None,
                   wavelength: str | None = None, distance: str | None = None,
                   stray_light: str | None = None, decision_rule: str | None = None,
                   draws: int | None = None) -> Any:
    """AssessOptions from the command-line texts (uncertainty inputs parsed at the edge)."""
    from uvcheck.assessment import AssessOptions
    from uvcheck.errors import ConfigurationError

    if draws is not None and not 100 <= draws <= 1_000_000:
        raise ConfigurationError(f"--draws must be between 100 and 1 000 000, got {draws}")
    given = (calibration, wavelength, distance, stray_light, decision_rule)
    if no_uncertainty:
        named = uncertainty_given(False, calibration, wavelength, distance, stray_light,
                                  decision_rule, draws)
        if named:
            raise ConfigurationError("cannot be combined with --no-uncertainty", named[0],
                                     f"leave out --no-uncertainty or {', '.join(named)}")
        return AssessOptions(limit_set=limits, uncertainty=False)
    inputs = None
    if any(x is not None for x in given):
        from uvcheck.uncertainty import uncertainty_options_from_cli

        inputs = uncertainty_options_from_cli(calibration, wavelength, distance, stray_light,
                                              decision_rule)
    return AssessOptions(limit_set=limits, uncertainty=True, uncertainty_inputs=inputs,
                         draws=draws)


FAIL_ON = ("cannot-hold", "unlikely", "not-assessable")


def _check_fail_on(fail_on: str | None) -> None:
    if fail_on is not None and fail_on not in FAIL_ON:
        from uvcheck.errors import ConfigurationError

        raise ConfigurationError(f"unknown verdict {fail_on!r} for --fail-on",
                                 todo=f"use one of: {', '.join(FAIL_ON)}")


def _exit_for(result: dict, fail_on: str | None) -> None:
    """Status 1 when a claim has the --fail-on verdict (or a worse one)."""
    if fail_on is None:
        return
    from uvcheck.batch import VERDICT_ORDER, fails

    worst = max((VERDICT_ORDER.index(c["verdict"]) for c in result.get("claims", [])
                 if c.get("verdict") in VERDICT_ORDER), default=0)
    if fails(VERDICT_ORDER[worst], fail_on):
        raise typer.Exit(1)


@app.command()
@guarded
def screen(
    listing_file: Annotated[Path, typer.Argument(help="Listing file (TOML) describing the product "
                                                 "as sold (see examples/listings/README.md).")],
    json_out: Annotated[Optional[str], typer.Option("--json", help="Write the result as JSON "
                                                    "to this path ('-' for stdout).")] = None,
    force: Annotated[bool, typer.Option(help="Replace existing output files.")] = False,
    fail_on: Annotated[Optional[str], typer.Option("--fail-on", help="Exit with status 1 when a "
                                                   "claim gets this verdict or a worse one "
                                                   "(not-assessable < unlikely < cannot-hold).")] = None,
    limits: Annotated[str, typer.Option(help="Exposure-limit set.")] = "iec62471_2006",
    quiet: Annotated[bool, typer.Option(help="Print nothing but errors.")] = False,
) -> None:
    """Screen a listing's statements without a measurement: nominal spectra from the stated
    data (an ESTIMATE), the full hazard and germicidal evaluation, and a verdict per claim.
    A listing that states too little to model the lamp gets its claims listed, no figures."""
    from uvcheck.io.listing import read_listing
    from uvcheck.report.jsonout import write_json
    from uvcheck.report.terminal import render_assessment
    from uvcheck.screening import screen_listing_file

    _check_fail_on(fail_on)
    check_output_file(json_out, force)
    listing = read_listing(listing_file)
    result = screen_listing_file(listing, limit_set=limits).to_dict()
    if json_out:
        write_json(json_out, result, force=force)
    if not quiet and json_out != "-":
        typer.echo(render_assessment(result), nl=False)
    _exit_for(result, fail_on)


@app.command()
@guarded
def compare(
    sample: Annotated[Path, typer.Argument(help="The sample's spectrum export.")],
    reference: Annotated[Path, typer.Argument(help="The reference's spectrum export (the same "
                                              "kind of measurement, at the same distance).")],
    json_out: Annotated[Optional[str], typer.Option("--json", help="Write the comparison as "
                                                    "JSON to this path ('-' for stdout).")] = None,
    force: Force = False,
    distance: Distance = None,
    source_size: SourceSize = None,
    limits: Limits = "iec62471_2006",
    quiet: Quiet = False,
    encoding: Encoding = None, delimiter: Delimiter = None, decimal: Decimal = None,
    column: Column = None, wavelength_column: WlColumn = None, wavelength_unit: WlUnit = None,
    wavelength_correction: WlCorrection = None,
    digitised: Digitised = False,
    unit: Unit = None, block: Block = None, data_start: DataStart = None,
) -> None:
    """Compare a sample with a reference (two units of one product, or an offered lamp with
    an approved one): bands, hazards, UV-C, peak and risk group side by side, with ratios
    where both values are established (or, for spectra over the same wavelengths, over the part
    both measured). A screening comparison, not a certification."""
    from uvcheck.compare import compare as compare_results
    from uvcheck.compare import render_comparison
    from uvcheck.pipeline import ProductInputs, assess_files
    from uvcheck.report.jsonout import clean, write_json

    inputs = ProductInputs(distance=distance, source_size=source_size)
    inputs.check()
    check_output_file(json_out, force)
    options = assess_options(limits, True)
    opts = read_options(encoding, delimiter, decimal, column, wavelength_column, wavelength_unit,
                        unit, block, data_start, wavelength_correction, digitised)
    a = clean(assess_files(sample, None, inputs, options, opts).to_dict())
    b = clean(assess_files(reference, None, inputs, options, opts).to_dict())
    result = clean(compare_results(a, b))
    if json_out:
        write_json(json_out, result, force=force)
    if not quiet and json_out != "-":
        typer.echo(render_comparison(result), nl=False)


from uvcheck.cli_room import organisms_command, room_command  # noqa: E402  (typer only)

from uvcheck.cli_note import demo_command, note_command  # noqa: E402  (typer only)

from uvcheck.cli_batch import batch_command  # noqa: E402  (typer only)

app.command("room")(guarded(room_command))
app.command("organisms")(guarded(organisms_command))
app.command("note")(guarded(note_command))
app.command("demo")(guarded(demo_command))
app.command("batch")(guarded(batch_command))


def main() -> None:
    """Console entry point."""
    app(prog_name="uvcheck")


if __name__ == "__main__":  # pragma: no cover
    main()
