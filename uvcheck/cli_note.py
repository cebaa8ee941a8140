"""Command functions for ``uvcheck note`` and ``uvcheck demo`` (registered in cli.py).

Thin: read the inputs, build the assessment exactly as ``uvcheck assess --claims`` (or
``uvcheck screen`` for a listing alone) does, then hand ``Assessment.to_dict()`` to the note's
renderers (:mod:`uvcheck.report.note`, :mod:`uvcheck.report.html`, :mod:`uvcheck.report.pdf`,
:mod:`uvcheck.report.figures`). Only typer and the standard library are imported at module
level, so ``uvcheck --help`` stays fast. Errors are :class:`~uvcheck.errors.UvcheckError`
subclasses, which the CLI prints as one line with exit status 2. Nothing is overwritten
without ``--force``; files are written atomically and only after everything was rendered.
"""

from __future__ import annotations

import time
from pathlib import Path
from typing import Annotated, Any, Optional

import typer

from uvcheck.cli_options import (Alpha, Block, CalibrationUncertainty, Column, Dark, DarkColumn,
                                 DataStart, Decimal, DecisionRule, Delimiter, Digitised, Distance,
                                 DistanceUncertainty, Draws, ElectricalPower, Encoding,
                                 ExposureTime, EyeHeight, Force, GeneralLighting, LampAt, Limits,
                                 MeterResponse, NoUncertainty, Quiet, Reflectance, Repeat,
                                 RoomPattern, ScaleBand, ScaleLux, ScaleTotal, SourceSize,
                                 StrayLight, TestInfo, TubeAxis, TubeLength, Unit, UseDistance,
                                 WavelengthUncertainty, WlColumn, WlCorrection, WlUnit, WorkPlane)

#: The demo scenario, relative to a source checkout (next to the package, or the current folder).
SCENARIO_RELPATH = Path("examples") / "demo" / "scenario.toml"


def find_scenario() -> Path:
    """The demo scenario: shipped in the wheel as ``uvcheck/examples/demo/scenario.toml``, or
    ``examples/demo/scenario.toml`` beside the package in a source checkout."""
    pkg = Path(__file__).resolve().parent
    for cand in (pkg / "examples" / "demo" / "scenario.toml", pkg.parent / SCENARIO_RELPATH):
        if cand.exists():
            return cand
    return Path.cwd() / SCENARIO_RELPATH


# ---------------------------------------------------------------------------------------------
# Building the result (the same calls as `uvcheck assess --claims` and `uvcheck screen`)
# ---------------------------------------------------------------------------------------------

def note_result(spectrum_file: Path | None, listing_file: Path | None, *, read_opts: Any = None,
                distance: str | None = None, scale_band: str | None = None,
                scale_lux: str | None = None, scale_total: str | None = None,
                source_size: str | None = None, alpha: float | None = None,
                use_distance: str | None = None, general_lighting: bool = False,
                exposure_time: str = "8 h", limits: str = "iec62471_2006",
                electrical_power: str | None = None,
                room: dict[str, Any] | None = None,
                room_where: dict[str, str] | None = None,
                uncertainty: dict[str, Any] | None = None,
                repeats: tuple[Path, ...] = (),
                dark: Path | None = None, dark_column: str | None = None,
                meter_response: Path | None = None,
                test_info: tuple[str, ...] = ()) -> tuple[dict[str, Any], Any]:
    """(``Assessment.to_dict()`` made strict-JSON, the spectrum it was computed from).

    With a spectrum: the measured assessment, with the listing's claims judged against it.
    With a listing only: the listing screening (nominal spectra, an ESTIMATE).
    room : ``{"size": "4 x 5 x 2.7 m", "lamp_at": ..., "pattern": ..., "tube_length": ...,
        "axis": ..., "reflectance": ..., "work_plane": ..., "eye_height": ...}`` (texts, as
        ``uvcheck room`` takes them) to add the room model's result as the ``room`` section;
        checked before anything is computed (:func:`room_spec`). room_where : where an error
        in each key points (default: the ``note`` options, :data:`ROOM_OPTIONS`).
    uncertainty : the uncertainty option texts, keys of :data:`UNCERTAINTY_KEYS`
        (``no_uncertainty``, ``calibration``, ``wavelength``, ``distance``, ``stray_light``,
        ``decision_rule``, ``draws``), as ``uvcheck assess`` takes them; they apply to a
        measured spectrum (a listing alone is screened as ``uvcheck screen`` does).
    """
    from uvcheck.cli import assess_options
    from uvcheck.errors import ConfigurationError
    from uvcheck.pipeline import ProductInputs, assess_files
    from uvcheck.report.jsonout import clean

    if spectrum_file is None and listing_file is None:
        raise ConfigurationError("give a spectrum file, a --listing file, or both",
                                 todo="e.g. 'uvcheck note lamp.csv --listing lamp.toml --out note.html'")
    inputs = ProductInputs(distance=distance, scale_band=scale_band, scale_lux=scale_lux,
                           scale_total=scale_total, source_size=source_size, alpha=alpha,
                           use_distance=use_distance, general_lighting=general_lighting,
                           exposure_time=exposure_time, electrical_power=electrical_power,
                           repeats=tuple(repeats), dark=dark, dark_column=dark_column,
                           meter_response=meter_response,
                           test_info=tuple(test_info))
    inputs.check()
    options = assess_options(limits, **(uncertainty or {}))
    listing = None
    if listing_file is not None:
        from uvcheck.io.listing import read_listing

        listing = read_listing(listing_file)
    rs = None
    if room:
        tube = listing.tube_length_m if listing is not None and listing.emitter == "tube" else None
        rs = room_spec(room, room_where, tube)
        rs["limit_set"] = limits   # the occupant's exposure under the note's limit set
    a = assess_files(spectrum_file, listing, inputs, options, read_opts,
                     extra=(lambda spec, cond: {"room": room_result(spec, cond, rs)}) if rs
                     else None)
    return clean(a.to_dict()), a.spectrum


#: The uncertainty options of ``note``, ``demo`` and ``batch`` (the ``assess`` options of the
#: same meaning), as keyword names of :func:`uvcheck.cli.assess_options`.
UNCERTAINTY_KEYS = ("no_uncertainty", "calibration", "wavelength", "distance", "stray_light",
                    "decision_rule", "draws")

# the room texts, checked (room_spec lives beside the room command; the note uses it too)
from uvcheck.cli_room import ROOM_DEFAULTS, ROOM_OPTIONS, room_spec  # noqa: E402


def room_result(spec: Any, cond: Any, rs: dict[str, Any]) -> dict[str, Any]:
    """The room model's dict for a spectrum measured at ``cond.measurement_distance_m``
    (``rs`` from :func:`room_spec`)."""
    from uvcheck.cli_room import _placed
    from uvcheck.room import evaluate_room, lamp_from_spectrum

    geom = rs["geometry"]
    if spec.quantity == "flux":
        lamp = _placed("--distance", lamp_from_spectrum, spec, geom)
    else:
        lamp = _placed("--distance", lamp_from_spectrum, spec, geom, cond.measurement_distance_m)
    d = _placed(rs["where"]["lamp_at"], evaluate_room, rs["box"], lamp,
                **rs["settings"], limit_set=rs.get("limit_set")).to_dict()
    if rs["notes"]:
        d["notes"] = list(d.get("notes") or []) + list(rs["notes"])
    return d


# ---------------------------------------------------------------------------------------------
# Rendering and writing
# ---------------------------------------------------------------------------------------------

def output_paths(out_html: Path, pdf: bool) -> tuple[Path, Path | None]:
    out_html = Path(out_html)
    if out_html.suffix.lower() not in (".html", ".htm"):
        from uvcheck.errors import ConfigurationError

        raise ConfigurationError(f"the note is written as HTML: {out_html.name!r} does not end "
                                 "in .html", "--out", "give a name like 'note.html'")
    return out_html, (out_html.with_suffix(".pdf") if pdf else None)


def check_free(paths: list[Path | None], force: bool) -> None:
    """Refuse before any work is done if an output exists and --force was not given."""
    from uvcheck.errors import OutputExistsError

    for p in paths:
        if p is not None and p.exists() and not force:
            raise OutputExistsError("the output file exists", str(p),
                                    "give --force to replace it, or choose another name")


def check_writable(paths: list[Path | None], force: bool, option: str = "--out") -> None:
    """Refuse before any work: an output that is a folder, in a folder that does not exist,
    or existing without --force (:func:`uvcheck.cli.check_output_file` for each)."""
    from uvcheck.cli import check_output_file

    for p in paths:
        if p is not None:
            check_output_file(p, force, option)


def render_note(result: dict[str, Any], spectrum: Any, *, pdf: bool = True,
                invented: bool | None = None, salt: str = "note",
                date: str | None = None) -> tuple[str, bytes | None, dict[str, Any]]:
    """(HTML text, PDF bytes or None, view model) for one assessment dict."""
    from uvcheck.report import figures, html
    from uvcheck.report.note import build_note

    view = build_note(result, invented=invented, date=date)
    from uvcheck.report.terminal import is_estimate

    from uvcheck.report.terminal import listing_only

    if listing_only(result):
        view["title"] = view["title"] + " — screening of the listing alone (no lamp data)"
    elif is_estimate(result):
        view["title"] = view["title"] + " — screening of the stated data (ESTIMATE)"
    figs = figures.render(result, spectrum, svg=True, png=pdf, salt=salt)
    text = html.render_note_html(view, result, figs)
    data = None
    if pdf:
        from uvcheck.report.pdf import render_note_pdf

        data = render_note_pdf(view, figs)
    return text, data, view


def write_note(result: dict[str, Any], spectrum: Any, out_html: Path, *, pdf: bool = True,
               force: bool = False, invented: bool | None = None, salt: str = "note"
               ) -> tuple[Path, Path | None, dict[str, Any]]:
    """Render and write the note (HTML, and PDF beside it); returns the paths and view."""
    from uvcheck.report.jsonout import write_text_atomic

    html_path, pdf_path = output_paths(out_html, pdf)
    check_free([html_path, pdf_path], force)
    text, data, view = render_note(result, spectrum, pdf=pdf, invented=invented, salt=salt)
    write_text_atomic(html_path, text, force=force)
    if pdf_path is not None and data is not None:
        write_text_atomic(pdf_path, data, force=force)
    return html_path, pdf_path, view


# ---------------------------------------------------------------------------------------------
# uvcheck note
# ---------------------------------------------------------------------------------------------

def note_command(
    spectrum_file: Annotated[Optional[Path], typer.Argument(
        help="Spectrum export (a text table, TM-27-14 XML, .xlsx or .ods); optional when --listing is given.")] = None,
    listing: Annotated[Optional[Path], typer.Option(
        "--listing", help="Listing file (TOML): the product as sold and its claims "
                          "(see examples/listings/README.md).")] = None,
    out: Annotated[Optional[Path], typer.Option(
        "--out", help="Note to write, e.g. 'note.html' (the PDF goes beside it as 'note.pdf'; "
                      "default: <input name>.note.html in the current folder).")] = None,
    no_pdf: Annotated[bool, typer.Option("--no-pdf", help="Write the HTML note only.")] = False,
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
    electrical_power: ElectricalPower = None,
    room: Annotated[Optional[str], typer.Option("--room", help="Also model the lamp in a room "
                                                "'W x L x H m' (uvcheck room's model).",
                                                rich_help_panel="Room")] = None,
    lamp_at: LampAt = None,
    pattern: RoomPattern = "isotropic",
    tube_length: TubeLength = None,
    axis: TubeAxis = "x",
    reflectance: Reflectance = "5 %",
    work_plane: WorkPlane = "0.75 m",
    eye_height: EyeHeight = "1.7 m",
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
) -> None:
    """Write the consumer-safety note (self-contained HTML and PDF) for a spectrum and/or a
    listing: the product as sold, a plain-language finding, the claims with verdicts, the
    hazards, germicidal output, cautions and provenance. A screening assessment, not a
    certification."""
    from uvcheck.cli import assess_options, read_options, uncertainty_given
    from uvcheck.errors import ConfigurationError

    if spectrum_file is None and listing is None:
        raise ConfigurationError("give a spectrum file, a --listing file, or both",
                                 todo="e.g. 'uvcheck note lamp.csv --listing lamp.toml --out note.html'")
    # everything that can be checked is checked before any work: outputs, options, the room
    stem = (spectrum_file or listing).stem  # type: ignore[union-attr]
    html_path, pdf_path = output_paths(out or Path(f"{stem}.note.html"), not no_pdf)
    check_writable([html_path, pdf_path], force)
    unc = dict(zip(UNCERTAINTY_KEYS, (no_uncertainty, calibration_uncertainty,
                                      wavelength_uncertainty, distance_uncertainty, stray_light,
                                      decision_rule, draws)))
    given = uncertainty_given(**unc)
    if spectrum_file is None and given:
        raise ConfigurationError("the uncertainty options apply to a measured spectrum only",
                                 given[0],
                                 "give the spectrum file too, or leave the uncertainty options "
                                 "out (a listing alone is screened as an estimate)")
    assess_options(limits, **unc)   # parsed here, so a wrong text fails before any work
    room_options = {"lamp_at": lamp_at, "tube_length": tube_length}
    if room is None:
        named = [ROOM_OPTIONS[k] for k, v in room_options.items() if v is not None]
        named += [ROOM_OPTIONS[k] for k, v in (("pattern", pattern), ("axis", axis),
                                               ("reflectance", reflectance),
                                               ("work_plane", work_plane),
                                               ("eye_height", eye_height))
                  if v != ROOM_DEFAULTS[k]]
        if named:
            raise ConfigurationError("the room options need --room", named[0],
                                     "give the room too, e.g. --room '4 x 5 x 2.7 m'")
        room_d = None
    else:
        room_d = {"size": room, **room_options, "pattern": pattern, "axis": axis,
                  "reflectance": reflectance, "work_plane": work_plane, "eye_height": eye_height}
        room_spec(room_d)   # the lamp inside the room, before any work (the listing's tube
        #                     length, if any, is checked again once the listing is read)
    opts = read_options(encoding, delimiter, decimal, column, wavelength_column, wavelength_unit,
                        unit, block, data_start, wavelength_correction, digitised)
    result, spec = note_result(spectrum_file, listing, read_opts=opts, distance=distance,
                               scale_band=scale_band, scale_lux=scale_lux, scale_total=scale_total,
                               source_size=source_size, alpha=alpha, use_distance=use_distance,
                               general_lighting=general_lighting, exposure_time=exposure_time,
                               limits=limits, electrical_power=electrical_power, room=room_d,
                               uncertainty=unc, repeats=tuple(repeat or ()), dark=dark,
                               dark_column=dark_column,
                               meter_response=meter_response,
                               test_info=tuple(test_info or ()))
    h, p, _ = write_note(result, spec, html_path, pdf=not no_pdf, force=force, salt=stem)
    if not quiet:
        typer.echo(f"wrote {h}" + (f"\nwrote {p}" if p else ""))


# ---------------------------------------------------------------------------------------------
# uvcheck demo
# ---------------------------------------------------------------------------------------------

def load_scenario(path: Path | None = None) -> dict[str, Any]:
    """The demo scenario (TOML), with file names resolved against its folder."""
    import tomllib

    from uvcheck.errors import InputFormatError

    path = path or find_scenario()
    if not path.exists():
        raise InputFormatError("the demo scenario is not installed", str(path),
                               "run the demo from a source checkout (examples/demo/scenario.toml)")
    with open(path, "rb") as fh:
        try:
            sc = tomllib.load(fh)
        except tomllib.TOMLDecodeError as exc:
            raise InputFormatError(f"not valid TOML: {exc}", str(path)) from None
    import os

    base = path.parent
    for p in sc.get("products", []):
        for k in ("spectrum", "listing"):
            if p.get(k):
                full = (base / p[k]).resolve()
                try:  # keep the recorded path short and free of the user's folders
                    p[k] = Path(os.path.relpath(full))
                except ValueError:
                    p[k] = full
    return sc


def _demo_product(job: tuple[dict[str, Any], bool, str, dict[str, Any]]
                  ) -> tuple[str, bytes | None, dict, dict]:
    """One demo product: (HTML, PDF bytes, result dict, view model). Runs in a worker.

    The job holds plain texts only (the uncertainty options as given), so it pickles."""
    p, pdf, date, unc = job
    where = {k: f"demo scenario, product {p.get('id')!r}, room.{k}" for k in ROOM_OPTIONS}
    result, spec = note_result(p.get("spectrum"), p.get("listing"), distance=p.get("distance"),
                               use_distance=p.get("use_distance"), room=p.get("room"),
                               room_where=where,
                               uncertainty=unc if p.get("spectrum") else None)
    text, data, view = render_note(result, spec, pdf=pdf, invented=True, salt=p["id"], date=date)
    return text, data, result, view


def _map(fn: Any, jobs: list[Any]) -> list[Any]:
    """Map over the jobs on every core (processes); serially where processes are not available."""
    import os

    workers = min(len(jobs), os.cpu_count() or 1)
    if workers > 1:
        # load the heavy modules once, before forking, so the workers share them
        import matplotlib.pyplot  # noqa: F401
        import fpdf  # noqa: F401

        from uvcheck.report import figures, html, pdf  # noqa: F401
        try:
            import concurrent.futures as cf
            import multiprocessing as mp

            ctx = mp.get_context("fork") if "fork" in mp.get_all_start_methods() else None
            with cf.ProcessPoolExecutor(max_workers=workers, mp_context=ctx) as ex:
                return list(ex.map(fn, jobs))
        except (OSError, ImportError, cf.process.BrokenProcessPool):  # type: ignore[attr-defined]
            pass
    return [fn(j) for j in jobs]


def demo_command(
    out: Annotated[Path, typer.Option("--out", help="Folder for the demo notes (created if "
                                                    "missing).")] = Path("uvcheck-demo"),
    force: Annotated[bool, typer.Option(help="Replace existing demo files.")] = False,
    no_pdf: Annotated[bool, typer.Option("--no-pdf", help="Write the HTML notes only.")] = False,
    no_uncertainty: NoUncertainty = False,
    calibration_uncertainty: CalibrationUncertainty = None,
    wavelength_uncertainty: WavelengthUncertainty = None,
    distance_uncertainty: DistanceUncertainty = None,
    stray_light: StrayLight = None,
    decision_rule: DecisionRule = None,
    draws: Draws = None,
) -> None:
    """Run the whole tool on the bundled, INVENTED scenario (a veterinary clinic checks three
    lamps before buying): one note per product plus an overview. Products and data are
    invented. The uncertainty options apply to every product, as in 'uvcheck note'."""
    from uvcheck.cli import assess_options
    from uvcheck.report.html import render_overview_html
    from uvcheck.report.jsonout import dumps, write_text_atomic
    from uvcheck.report.note import generated_date

    t0 = time.perf_counter()
    unc = dict(zip(UNCERTAINTY_KEYS, (no_uncertainty, calibration_uncertainty,
                                      wavelength_uncertainty, distance_uncertainty, stray_light,
                                      decision_rule, draws)))
    assess_options("iec62471_2006", **unc)   # a wrong text fails before any work
    sc = load_scenario()
    out = Path(out)
    products = sc.get("products", [])
    planned: list[Path | None] = [out / "index.html", None if no_pdf else out / "index.pdf"]
    for p in products:
        planned += [out / f"{p['id']}.html", None if no_pdf else out / f"{p['id']}.pdf",
                    out / f"{p['id']}.json"]
    check_free(planned, force)
    out.mkdir(parents=True, exist_ok=True)
    date = generated_date()
    jobs = [(p, not no_pdf, date, unc) for p in products]
    rendered = _map(_demo_product, jobs)
    items = []
    tool = ""
    for p, (text, data, result, view) in zip(products, rendered):
        write_text_atomic(out / f"{p['id']}.html", text, force=force)
        if data is not None:
            write_text_atomic(out / f"{p['id']}.pdf", data, force=force)
        write_text_atomic(out / f"{p['id']}.json", dumps(result), force=force)
        tool = view["provenance"]["tool"]
        items.append({"id": p["id"], "title": view["title"], "finding": view["finding"],
                      "risk": (view["risk"] or {}).get("overview") or (view["risk"] or {}).get("headline", "—"),
                      "claims_summary": view["claims_summary"],
                      "verdicts": [{"text": c["text"], "verdict": c["verdict"],
                                    "verdict_text": c["verdict_text"]} for c in view["claims"] or []],
                      "html": f"{p['id']}.html", "pdf": None if no_pdf else f"{p['id']}.pdf"})
    title = sc.get("title", "uvcheck demonstration")
    intro = sc.get("intro", "")
    write_text_atomic(out / "index.html", render_overview_html(title, items, invented=True,
                                                                intro=intro, date=date, tool=tool),
                      force=force)
    if not no_pdf:
        from uvcheck.report.pdf import render_overview_pdf

        write_text_atomic(out / "index.pdf", render_overview_pdf(title, items, invented=True,
                                                                 intro=intro, date=date, tool=tool),
                          force=force)
    typer.echo("INVENTED DEMONSTRATION: the products and data are made up.")
    for it in items:
        cs = it["claims_summary"] or "no claims"
        typer.echo(f"  {it['title']}: {it['risk']}. {cs}")
        typer.echo(f"    {out / it['html']}" + (f"\n    {out / it['pdf']}" if it["pdf"] else ""))
    typer.echo(f"overview: {out / 'index.html'}" + ("" if no_pdf else f" and {out / 'index.pdf'}"))
    typer.echo(f"done in {time.perf_counter() - t0:.1f} s. Screening assessments, not "
               "certifications; local codes and licensed practice take precedence.")
