"""Command-line options shared by several commands (assess, note, demo, batch, room), defined
once.

Typer only: importing this module loads nothing heavy.
"""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

_READ = "Reading the file"
_GEO = "Geometry"
_UNC = "Uncertainty"

# --- reading a spectrum file ------------------------------------------------------------------
Encoding = Annotated[Optional[str], typer.Option(help="Text encoding (default: detected).",
                                                 rich_help_panel=_READ)]
Delimiter = Annotated[Optional[str], typer.Option(help="Field delimiter: tab, semicolon, comma, "
                                                  "pipe or space (default: detected).",
                                                  rich_help_panel=_READ)]
Decimal = Annotated[Optional[str], typer.Option(help="Decimal mark: '.' or ',' (default: detected).",
                                                rich_help_panel=_READ)]
Column = Annotated[Optional[str], typer.Option(help="Value column: name or number (from 1).",
                                               rich_help_panel=_READ)]
WlColumn = Annotated[Optional[str], typer.Option("--wavelength-column",
                                                 help="Wavelength column: name or number.",
                                                 rich_help_panel=_READ)]
WlUnit = Annotated[Optional[str], typer.Option("--wavelength-unit",
                                               help="Wavelength unit: nm, um, A (ångström), m or cm-1.",
                                               rich_help_panel=_READ)]
WlCorrection = Annotated[Optional[str], typer.Option(
    "--wavelength-correction", help="Add this to every wavelength, e.g. '-2.2 nm' for a scale "
                                    "that reads 2.2 nm high (as the mercury lines can show).",
    rich_help_panel=_READ)]
Digitised = Annotated[bool, typer.Option(
    "--digitised", help="The file is a curve read off a graph (a datasheet, a listing's "
                        "picture), not a measurement: every figure is indicative, and values "
                        "under 1 % of the peak count as below detection.", rich_help_panel=_READ)]
Unit = Annotated[Optional[str], typer.Option(help="Unit of the values, e.g. 'uW/cm2/nm', "
                                             "'W/m2/sr/nm', 'W/nm' or 'relative'.",
                                             rich_help_panel=_READ)]
Block = Annotated[Optional[int], typer.Option(help="Data block to read when a file holds several "
                                              "(from 1).", rich_help_panel=_READ)]
DataStart = Annotated[Optional[int], typer.Option("--data-start", help="Line where the data rows "
                                                  "start (from 1).", rich_help_panel=_READ)]
MeterResponse = Annotated[Optional[Path], typer.Option(
    "--meter-response", help="The relative spectral response of the meter that gave "
                             "--scale-band (a table of wavelength and response): the reading "
                             "is then taken as the response-weighted integral.")]
TestInfo = Annotated[Optional[list[str]], typer.Option(
    "--test-info", help="A fact of the test for the record, as KEY=VALUE (repeatable), e.g. "
                        "'warm-up=15 min', 'cosine corrector=yes', 'calibration date=2026-05-01', "
                        "'supply=230 V'; shown in the note and the JSON, used in no computation.")]
Repeat = Annotated[Optional[list[Path]], typer.Option(
    "--repeat", help="A repeat scan of the same lamp in the same position (repeatable): the "
                     "mean of all scans is assessed, and their spread reported.",
    rich_help_panel=_READ)]

Dark = Annotated[Optional[Path], typer.Option(
    "--dark", help="A dark (background) scan, taken as the lamp scan was with the lamp off or "
                   "shuttered: subtracted from it (after averaging any --repeat scans).",
    rich_help_panel=_READ)]

DarkColumn = Annotated[Optional[str], typer.Option(
    "--dark-column", help="The column of the spectrum file that holds a dark (background) "
                          "scan (name or number): subtracted from the value column.",
    rich_help_panel=_READ)]

# --- scaling and geometry -----------------------------------------------------------------------
Distance = Annotated[Optional[str], typer.Option(help="Measurement distance, e.g. '20 cm' "
                                                 "(default: from the file, else none).")]
ScaleBand = Annotated[Optional[str], typer.Option("--scale-band", help="Scale a relative spectrum "
                                                  "by a radiometer reading, e.g. "
                                                  "'UV-C=120 uW/cm2'.")]
ScaleLux = Annotated[Optional[str], typer.Option("--scale-lux", help="Scale by a lux-meter reading "
                                                 "(says nothing about UV).")]
ScaleTotal = Annotated[Optional[str], typer.Option("--scale-total", help="Scale so the measured "
                                                   "range integrates to this, e.g. '12 W/m2'.")]
SourceSize = Annotated[Optional[str], typer.Option("--source-size", help="Apparent source size "
                                                   "(largest luminous dimension); a bare number "
                                                   "is mm, e.g. '30' or '3 cm'.",
                                                   rich_help_panel=_GEO)]
Alpha = Annotated[Optional[float], typer.Option(help="Angular subtense α of the source at the "
                                                "measurement position [rad] (instead of "
                                                "--source-size).", rich_help_panel=_GEO)]
UseDistance = Annotated[Optional[str], typer.Option("--use-distance", help="Also evaluate at a "
                                                    "realistic distance of use, e.g. '1.5 m'.",
                                                    rich_help_panel=_GEO)]
GeneralLighting = Annotated[bool, typer.Option("--general-lighting", help="Lamp for general "
                                               "lighting service: assessed at the 500 lx "
                                               "distance (never under 200 mm).",
                                               rich_help_panel=_GEO)]
ExposureTime = Annotated[str, typer.Option("--exposure-time", help="Exposure duration for hazard "
                                           "distances.", rich_help_panel=_GEO)]
Limits = Annotated[str, typer.Option(help="Exposure-limit set: iec62471_2006 (default), "
                                     "icnirp_2013 or acgih_2022_far_uvc.")]
ElectricalPower = Annotated[Optional[str], typer.Option("--electrical-power", help="Electrical "
                                                        "input power, e.g. '8 W' (for the UV-C "
                                                        "conversion efficiency).")]
Force = Annotated[bool, typer.Option(help="Replace existing output files.")]
Quiet = Annotated[bool, typer.Option(help="Print nothing but errors.")]

# --- measurement uncertainty (assess, note, demo, batch) ---------------------------------------
NoUncertainty = Annotated[bool, typer.Option("--no-uncertainty", help="Skip the Monte Carlo "
                                             "uncertainty evaluation.", rich_help_panel=_UNC)]
CalibrationUncertainty = Annotated[Optional[str], typer.Option(
    "--calibration-uncertainty", help="Standard uncertainty of the spectral calibration, e.g. "
    "'7 %' or 'UV=10 %,visible=3 %' (default by band, common practice).", rich_help_panel=_UNC)]
WavelengthUncertainty = Annotated[Optional[str], typer.Option(
    "--wavelength-uncertainty", help="Wavelength-scale uncertainty, e.g. '±0.5 nm'.",
    rich_help_panel=_UNC)]
DistanceUncertainty = Annotated[Optional[str], typer.Option(
    "--distance-uncertainty", help="Uncertainty of the measurement distance, e.g. '5 mm'.",
    rich_help_panel=_UNC)]
StrayLight = Annotated[Optional[str], typer.Option(
    "--stray-light", help="UV stray-light allowance, e.g. '0.01 %' of the spectral peak.",
    rich_help_panel=_UNC)]
DecisionRule = Annotated[Optional[str], typer.Option(
    "--decision-rule", help="How verdicts and the risk group use the 95 % intervals: simple or "
    "guarded acceptance (ILAC-G8).", rich_help_panel=_UNC)]
Draws = Annotated[Optional[int], typer.Option("--draws", help="Monte Carlo draws (default 4000).",
                                              rich_help_panel=_UNC)]

# --- a lamp in a room (room, note) --------------------------------------------------------------
_ROOM = "Room"
LampAt = Annotated[Optional[str], typer.Option(
    "--lamp-at", help="Lamp position x, y, z from a floor corner, e.g. '2, 2.5, 2.4 m' "
                      "(default: room centre, 0.3 m below the ceiling).", rich_help_panel=_ROOM)]
RoomPattern = Annotated[str, typer.Option(
    "--pattern", help="Emission pattern: isotropic, lambertian-down or cylinder (a bare "
                      "horizontal tube).", rich_help_panel=_ROOM)]
Emitter = Annotated[Optional[str], typer.Option(
    "--emitter", help="How the output falls with distance when it is moved from the "
    "measurement distance to another (--use-distance, germicidal figures): point (inverse "
    "square), lambertian (on the axis of a flat emitter) or tube (a linear tube, Keitz "
    "formula; give --tube-length). Default: the listing's, else point.", show_default=False)]
TubeLength = Annotated[Optional[str], typer.Option(
    "--tube-length", help="Arc length of a cylinder lamp, e.g. '0.9 m'.", rich_help_panel=_ROOM)]
TubeAxis = Annotated[str, typer.Option("--axis", help="Tube axis: x (width) or y (length).",
                                       rich_help_panel=_ROOM)]
Reflectance = Annotated[str, typer.Option("--reflectance", help="Diffuse UV reflectance of "
                                          "walls, floor and ceiling.", rich_help_panel=_ROOM)]
WorkPlane = Annotated[str, typer.Option("--work-plane", help="Height of the work plane.",
                                        rich_help_panel=_ROOM)]
EyeHeight = Annotated[str, typer.Option("--eye-height", help="Occupant eye height (standing "
                                        "about 1.7 m, seated 1.2 m).", rich_help_panel=_ROOM)]
