"""Command functions for ``uvcheck room`` and ``uvcheck organisms`` (registered in cli.py).

Thin: parse the options (units at the edge), call :mod:`uvcheck.room` or
:mod:`uvcheck.inactivation`, print plain text and write JSON. Only typer and the standard
library are imported at module level, so ``uvcheck --help`` stays fast; numpy and the
science modules load inside the functions. Errors are :class:`~uvcheck.errors.UvcheckError`
subclasses, which the CLI prints as one line with exit status 2.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any, Annotated, Optional

import typer

from uvcheck.cli_options import (EyeHeight, LampAt, Limits, Reflectance, RoomPattern,
                                 TubeAxis, TubeLength, WorkPlane)

PATTERN_NAMES = {"isotropic": "isotropic", "lambertian-down": "lambertian_down",
                 "lambertian_down": "lambertian_down", "cylinder": "cylinder"}


def _triple(text: str, where: str) -> tuple[float, float, float]:
    """Three lengths such as '4 x 5 x 2.7 m', '4m x 5m x 2.7m' or '2, 2.5, 2.4 m'. [m]"""
    from uvcheck.errors import UnitError
    from uvcheck.units import parse_quantity

    parts = [p.strip() for p in re.split(r"\s*[x×,;]\s*(?=[-+.\d])", text.strip()) if p.strip()]
    if len(parts) != 3:
        raise UnitError(f"expected three lengths, got {text!r}", where,
                        "write them like '4 x 5 x 2.7 m' or '2, 2.5, 2.4 m'")
    m = re.match(r"^[-+]?[\d.,]+(?:[eE][-+]?\d+)?\s*(.*)$", parts[-1])
    unit = m.group(1).strip() if m and m.group(1).strip() else None
    vals = tuple(parse_quantity(p, "length", where, default_unit=unit).value_si for p in parts)
    return vals  # type: ignore[return-value]


def _fov_lines(occ: dict) -> list[str]:
    """The occupant's figure under the eye-level field-of-view convention, in one line."""
    from uvcheck.units import format_duration

    fv = occ.get("fov_convention")
    if not fv:
        return []
    return [f"  {fv['fov_deg']:g}° field-of-view convention (horizontal detector at eye height): "
            f"{occ.get('symbol', 'E_S')} {_fmt(fv['effective_S_W_m2'], 'W m-2')}; 8-h limit reached in "
            f"{format_duration(fv['time_to_limit_s'])}"
            + ("  — EXCEEDS the 8-h limit" if fv["exceeds_8h_limit"] else "")]


def _unbounded_lines(occ: dict) -> list[str]:
    """The occupant block when the lamp is within reach of the eyes: no figure, a warning."""
    return ["  UV-C and E_S: no bound — the 8-h actinic limit CAN BE EXCEEDED IN MOMENTS",
            f"  {occ['note']}"]   # the note says why (the lamp within reach of the eyes)


def _fmt(value: float | None, si: str) -> str:
    from uvcheck.units import sig, to_trade

    if value is None:
        return "—"
    t, label = to_trade(value, si)
    si_txt = {"W m-2": "W/m²", "J m-2": "J/m²", "W": "W"}.get(si, si)
    if label == si:
        return f"{sig(value)} {si_txt}"
    return f"{sig(value)} {si_txt} ({sig(t)} {label})"


def render_room(d: dict) -> str:
    """Plain-text summary of a room result dict (SI and trade units)."""
    from uvcheck.units import format_duration, sig

    dim = d["dimensions_m"]
    lamp = d["lamp"]
    pl = d["plane"]
    occ = d["occupant"]
    st = d.get("status") or {}
    lines: list[str] = [f"Warning: {w}" for w in d.get("warnings") or []]
    if st.get("figures_are") in ("upper_bound", "none"):
        # not germicidal output: said first and plainly, and no delivered figure is shown
        head = ("NO GERMICIDAL UV-C OUTPUT" if st.get("figures_are") == "upper_bound"
                else "UV-C NOT ASSESSED")
        lines += [f"{head}: {st.get('statement')}"]
        lines += [f"  ! {a['kind']}: {a['detail']}" for a in st.get("artefacts") or []]
        lines += ["  No eACH, inactivation time or work-plane dose is given: this lamp is not "
                  "shown to deliver any.", ""]
        lines += _room_bounds(d)
        return "\n".join(lines) + "\n"
    notes = list(d["notes"])
    from uvcheck.germicidal import UVC_EMITTING
    from uvcheck.room import PATTERN_WORDS

    if st.get("germicidal_status") not in (None, *UVC_EMITTING):
        lines += [f"Note first: {notes.pop(0) if notes else st.get('statement')}", ""]
    lines += [
        f"Room {sig(dim['width'])} × {sig(dim['length'])} × {sig(dim['height'])} m "
        f"({sig(d['volume_m3'])} m³), wall reflectance {sig(d['reflectance'] * 100)} %",
        f"Lamp at ({', '.join(sig(v) for v in lamp['position_m'])}) m, "
        f"{PATTERN_WORDS.get(lamp['pattern'], lamp['pattern'])}"
        + (f", tube {sig(lamp['tube_length_m'])} m along {lamp['axis']}" if lamp["tube_length_m"] else ""),
        f"  UV-C flux {_fmt(lamp['uvc_flux_W'], 'W')}; 254-nm-equivalent "
        f"{_fmt(lamp['equivalent_254_flux_W'], 'W')}  [{lamp['flux_basis']}]",
        "",
        f"Work plane at {sig(pl['height_m'])} m (254-nm-equivalent irradiance):",
        f"  min   {_fmt(pl['min_W_m2'], 'W m-2')}",
        f"  p10   {_fmt(pl['p10_W_m2'], 'W m-2')}   (90 % of the plane gets at least this)",
        f"  mean  {_fmt(pl['mean_W_m2'], 'W m-2')}",
        f"  max   {_fmt(pl['max_W_m2'], 'W m-2')}",
    ]
    if pl.get("target_dose_J_m2") is not None:
        lines.append(f"  {_fmt(pl['target_dose_J_m2'], 'J m-2')} reached on 90 % of the plane in "
                     f"{format_duration(pl['time_to_target_at_p10_s'])}, everywhere in "
                     f"{format_duration(pl['time_to_target_everywhere_s'])}")
    ms = pl.get("most_susceptible")
    if ms:
        lines.append(f"  most susceptible surface organism ({ms['organism']}): 99.9 % at p10 in "
                     f"{format_duration(ms['time_to_99_9_s'])}")
    lines += ["", f"Air: volume-average fluence rate {_fmt(d['fluence_rate_avg_W_m2'], 'W m-2')} "
                  f"(254-nm-equivalent; quadrature error {sig(d['fluence_rate_per_W']['error_rel'])})"]
    lines.append("  organism                                   eACH /h   90 %        99.9 %"
                 "   ('bound': the source gives at least this reduction, so eACH is at least this)")
    for a in d["air"]:
        name = a["organism"] + (" (bound)" if a.get("each_is_lower_bound") else "")
        lines.append(f"  {name[:40]:<40}  {sig(a['each_per_h']):>8}   "
                     f"{format_duration(a['time_to_90_s']):<10}  {format_duration(a['time_to_99_9_s'])}")
    ams = d.get("air_most_susceptible")
    if ams:
        lines.append(f"  ({ams['note']})")
    lines += ["", f"Occupant at eye height {sig(occ['eye_height_m'])} m (worst point, eyes facing the lamp):"]
    lines += (_unbounded_lines(occ) if occ.get("unbounded") else [
              f"  UV-C {_fmt(occ['irradiance_W_m2'], 'W m-2')}, {occ.get('symbol', 'E_S')} "
              f"{_fmt(occ['effective_S_W_m2'], 'W m-2')}"
              + (" (lower bound)" if occ["effective_S_is_lower_bound"] else ""),
              f"  8-h actinic limit reached in {format_duration(occ['time_to_limit_s'])}"
              + ("  — EXCEEDS the 8-h limit" if occ["exceeds_8h_limit"] else ""),
              *_fov_lines(occ),
              f"  {occ['note']}"])
    if notes:
        lines += [""] + [f"Note: {n}" for n in notes]
    return "\n".join(lines) + "\n"


def _room_bounds(d: dict) -> list[str]:
    """The room, the labelled upper bounds and the occupant block for a lamp whose UV-C is
    likely stray light or below detection (nothing here is presented as delivered)."""
    from uvcheck.room import PATTERN_WORDS
    from uvcheck.units import format_duration, sig

    dim = d["dimensions_m"]
    lamp = d["lamp"]
    occ = d["occupant"]
    lines = [f"Room {sig(dim['width'])} × {sig(dim['length'])} × {sig(dim['height'])} m "
             f"({sig(d['volume_m3'])} m³); lamp at ({', '.join(sig(v) for v in lamp['position_m'])}) m, "
             f"{PATTERN_WORDS.get(lamp['pattern'], lamp['pattern'])}"]
    ub = lamp.get("uvc_flux_upper_bound_W")
    if ub is not None:
        lines.append("Upper bound only, as if the whole apparent UV-C signal were real output "
                     "(it is not shown to be):")
        lines.append(f"  UV-C flux at most {_fmt(ub, 'W')}  [{lamp['flux_basis']}]")
        ams = d.get("air_most_susceptible")
        if ams and ams.get("each_per_h_upper_bound") is not None:
            lines.append(f"  air, most susceptible organism in the table ({ams['organism']}): eACH "
                         f"at most {sig(ams['each_per_h_upper_bound'])} /h; 99.9 % not before "
                         f"{format_duration(ams.get('time_to_99_9_s_lower_bound'))}")
        if d.get("fluence_rate_avg_upper_bound_W_m2") is not None:
            lines.append(f"  volume-average fluence rate at most "
                         f"{_fmt(d['fluence_rate_avg_upper_bound_W_m2'], 'W m-2')} (254-nm-equivalent)")
    lines += ["", f"Occupant at eye height {sig(occ['eye_height_m'])} m (worst point, eyes facing the lamp):"]
    lines += (_unbounded_lines(occ) if occ.get("unbounded") else [
              f"  {occ.get('symbol', 'E_S')} {_fmt(occ['effective_S_W_m2'], 'W m-2')}"
              + (" (lower bound)" if occ["effective_S_is_lower_bound"] else "")
              + f"; 8-h actinic limit reached in {format_duration(occ['time_to_limit_s'])}"
              + ("  — EXCEEDS the 8-h limit" if occ["exceeds_8h_limit"] else ""),
              *_fov_lines(occ),
              f"  {occ['note']}"])
    lines.append("  UV-A and blue-light hazards of this lamp: see 'uvcheck assess'.")
    rest = [n for n in d["notes"][1:]] if d["notes"] else []
    if rest:
        lines += [""] + [f"Note: {n}" for n in rest]
    return lines


#: Room keys (as ``uvcheck room`` names its options) and the ``note`` option each comes from
#: (``uvcheck room`` names ``size`` ``--size``).
ROOM_OPTIONS = {"size": "--room", "lamp_at": "--lamp-at", "pattern": "--pattern",
                "tube_length": "--tube-length", "axis": "--axis", "reflectance": "--reflectance",
                "work_plane": "--work-plane", "eye_height": "--eye-height"}
#: Defaults of the room options (those of ``uvcheck room``).
ROOM_DEFAULTS = {"pattern": "isotropic", "axis": "x", "reflectance": "5 %",
                 "work_plane": "0.75 m", "eye_height": "1.7 m"}


def room_spec(room: dict[str, Any], where: dict[str, str] | None = None,
              tube_from_listing_m: float | None = None) -> dict[str, Any]:
    """The room, the lamp's geometry and the model's settings from the room texts, checked
    (the lamp, and every part of a tube, inside the room) before anything is computed.

    room : texts by key of :data:`ROOM_OPTIONS` (missing keys take :data:`ROOM_DEFAULTS`).
    where : the place an error names, by key (default :data:`ROOM_OPTIONS`).
    tube_from_listing_m : a listing's tube length: for a cylinder without ``tube_length``
        the room's notes say how to use it (it is not used silently). [m]
    Returns ``{"box", "geometry", "settings", "notes"}``.
    """
    from uvcheck.errors import ConfigurationError
    from uvcheck.room import Box, LampGeometry, _check_inside
    from uvcheck.units import parse_quantity

    at = {**ROOM_OPTIONS, **(where or {})}
    r = {**ROOM_DEFAULTS, **{k: v for k, v in room.items() if v not in (None, "")}}
    unknown = sorted(set(r) - set(ROOM_OPTIONS))
    if unknown:
        raise ConfigurationError(f"unknown room key {unknown[0]!r}", at["size"],
                                 f"the keys are: {', '.join(ROOM_OPTIONS)}")

    def length(key: str) -> float:
        v = parse_quantity(str(r[key]), "length", at[key]).value_si
        if not (v >= 0 and v == v and v != float("inf")):
            raise ConfigurationError(f"{r[key]!r} must be a length of 0 or more", at[key])
        return v

    w, l, h = _triple(str(r["size"]), at["size"])
    box = _placed(at["size"], Box, w, l, h)
    pos = _triple(str(r["lamp_at"]), at["lamp_at"]) if r.get("lamp_at") else (
        w / 2, l / 2, max(h - 0.3, h / 2))
    pattern = str(r["pattern"])
    if pattern not in PATTERN_NAMES:
        raise ConfigurationError(f"unknown pattern {pattern!r}", at["pattern"],
                                 "use isotropic, lambertian-down or cylinder")
    axis = str(r["axis"])
    if axis not in ("x", "y"):
        raise ConfigurationError(f"unknown tube axis {axis!r}", at["axis"],
                                 "use x (along the width) or y (along the length)")
    notes = []
    tl = length("tube_length") if r.get("tube_length") else 0.0
    if not r.get("tube_length") and PATTERN_NAMES[pattern] == "cylinder" and tube_from_listing_m:
        # said, not silently used: the tube's direction is not in the listing, and a tube
        # that does not fit the room as placed would turn a warning into an error
        notes.append(f"the listing states a tube length of {float(tube_from_listing_m):g} m; "
                     f"give {at['tube_length']} (and {at['axis']} for its direction) to model "
                     "the tube with it")
    geom = _placed(at["lamp_at"], LampGeometry, pos, PATTERN_NAMES[pattern], tl, axis)
    _placed(at["lamp_at"], _check_inside, box, geom)
    rho = parse_quantity(str(r["reflectance"]), "fraction", at["reflectance"]).value_si
    if not 0.0 <= rho < 1.0:
        raise ConfigurationError(f"reflectance {r['reflectance']!r} must be from 0 to under "
                                 "100 %", at["reflectance"])
    settings = {"reflectance": rho, "work_plane_m": length("work_plane"),
                "eye_height_m": length("eye_height")}
    for key, v in (("work_plane", settings["work_plane_m"]), ("eye_height", settings["eye_height_m"])):
        if not v <= h:
            raise ConfigurationError(f"{r[key]!r} is above the ceiling ({h:g} m)", at[key])
    return {"box": box, "geometry": geom, "settings": settings, "notes": notes,
            "where": at}


def room_command(
    spectrum_file: Annotated[Optional[Path], typer.Argument(
        help="Spectrum export of the lamp (irradiance at --distance, or a spectral flux).")] = None,
    uvc_flux: Annotated[Optional[str], typer.Option(
        "--uvc-flux", help="Stated UV-C flux instead of a spectrum, e.g. '2 W'.")] = None,
    wavelength: Annotated[str, typer.Option(
        help="Wavelength of a stated UV-C flux.")] = "253.7 nm",
    distance: Annotated[Optional[str], typer.Option(
        help="Distance at which the spectrum was measured, on the lamp's axis "
             "(default: from the file).")] = None,
    size: Annotated[str, typer.Option(
        help="Room width x length x height, e.g. '4 x 5 x 2.7 m'.")] = "4 x 5 x 2.7 m",
    lamp_at: LampAt = None,          # room options shared with 'note' (uvcheck.cli_options)
    pattern: RoomPattern = "isotropic",
    tube_length: TubeLength = None,
    axis: TubeAxis = "x",
    reflectance: Reflectance = "5 %",
    work_plane: WorkPlane = "0.75 m",
    eye_height: EyeHeight = "1.7 m",
    target_dose: Annotated[Optional[str], typer.Option(
        "--target-dose", help="254-nm-equivalent dose to reach on the work plane, "
                              "e.g. '10 mJ/cm2'.")] = None,
    organism: Annotated[Optional[list[str]], typer.Option(
        help="Organism id for the air table (repeatable; see 'uvcheck organisms').")] = None,
    json_out: Annotated[Optional[str], typer.Option(
        "--json", help="Write the result as JSON to this path ('-' for stdout).")] = None,
    force: Annotated[bool, typer.Option(help="Replace an existing output file.")] = False,
    quiet: Annotated[bool, typer.Option(help="Print nothing but errors.")] = False,
    unit: Annotated[Optional[str], typer.Option(
        help="Unit of the spectrum's values, e.g. 'uW/cm2/nm' or 'W/nm'.")] = None,
    column: Annotated[Optional[str], typer.Option(
        help="Value column of the spectrum file: name or number.")] = None,
    limits: Limits = "iec62471_2006",
) -> None:
    """What one lamp does in a room: work-plane irradiance, air disinfection (eACH, times in
    well-mixed air) and the occupant's exposure against the 8-h limit. A screening
    assessment, not a certification."""
    from uvcheck.errors import ConfigurationError, OutputExistsError
    from uvcheck.room import evaluate_room, lamp_from_spectrum, lamp_from_uvc_flux
    from uvcheck.units import parse_quantity

    if (spectrum_file is None) == (uvc_flux is None):
        raise ConfigurationError("give either a spectrum file or --uvc-flux (not both)",
                                 todo="e.g. 'uvcheck room lamp.csv --distance \"1 m\"' or "
                                      "'uvcheck room --uvc-flux \"2 W\"'")
    if json_out and json_out != "-" and Path(json_out).exists() and not force:
        raise OutputExistsError("the output file exists", json_out,
                                "give --force to replace it, or choose another name")
    from uvcheck.limits import get_limit_set

    get_limit_set(limits)   # an unknown set fails before any work, listing the sets
    rs = room_spec({"size": size, "lamp_at": lamp_at, "pattern": pattern,
                    "tube_length": tube_length, "axis": axis, "reflectance": reflectance,
                    "work_plane": work_plane, "eye_height": eye_height},
                   where={"size": "--size"})
    room, geom = rs["box"], rs["geometry"]
    if uvc_flux is not None:
        flux = parse_quantity(uvc_flux, "power", "--uvc-flux").value_si
        wl_nm = parse_quantity(wavelength, "length", "--wavelength", default_unit="nm").value_si * 1e9
        lamp = _placed("--uvc-flux", lamp_from_uvc_flux, flux, geom, wl_nm)
    else:
        from uvcheck.io.reader import ReadOptions, read_spectrum

        spec, report = read_spectrum(spectrum_file, ReadOptions(unit=unit, column=column))
        # the room model checks the distance itself (positive and finite)
        d0 = (parse_quantity(distance, "length", "--distance").value_si if distance
              else report.measurement_distance_m)
        lamp = _placed("--distance", lamp_from_spectrum, spec, geom, d0)
    dose = parse_quantity(target_dose, "dose", "--target-dose").value_si if target_dose else None
    result = _placed("--lamp-at", evaluate_room, room, lamp, **rs["settings"],
                     target_dose_J_m2=dose, organisms=organism or None, limit_set=limits)
    d = result.to_dict()
    if json_out:
        from uvcheck.report.jsonout import write_json

        write_json(json_out, {"room": d}, force=force)
    if not quiet and json_out != "-":
        typer.echo(render_room(d), nl=False)
    else:
        for w in d.get("warnings") or []:
            typer.echo(f"warning: {w}", err=True)


def _placed(option: str, fn: Any, *args: Any, **kwargs: Any) -> Any:
    """Call ``fn``; an error without a place is reported at the option it came from."""
    from uvcheck.errors import UvcheckError

    try:
        return fn(*args, **kwargs)
    except UvcheckError as exc:
        if exc.where is None:
            raise type(exc)(exc.what, option, exc.todo) from None
        raise


def render_organisms(rows: list[dict]) -> str:
    """Plain-text table of organism rows (doses in J/m² and mJ/cm²)."""
    from uvcheck.units import sig

    w_src = max([len("source")] + [len(r.get("source") or "") for r in rows])
    out = [f"{'id':<48} {'medium':<11} {'nm':>5}  {'model':<11} {'D90':>30}  {'k (published)':<20} "
           f"{'reliability':<11} {'source':<{w_src}} from memory"]
    for r in rows:
        k = r["k_published"]
        ktxt = "—" if k is None else f"{sig(k['value'])} cm²/mJ base {k['base']}"
        d90 = r["d90_J_m2"]
        dtxt = "not reached" if d90 is None else _fmt(d90, "J m-2")
        if r["dose_bound"] == "at_most" and d90 is not None:
            dtxt = "≤ " + dtxt
        out.append(f"{r['id']:<48} {r['medium']:<11} {sig(r['wavelength_nm']):>5}  "
                   f"{r['model']:<11} {dtxt:>30}  {ktxt:<20} {r['reliability']:<11} "
                   f"{r.get('source') or '—':<{w_src}} {_memory_word(r.get('from_memory'))}")
    out.append("")
    out.append("Doses as published (mJ/cm², cm²/mJ with their log base) are in "
               "data/organisms/organisms.csv; 'source' is the key of the full citation in "
               "data/organisms/organisms.toml (also in the JSON, with what is from memory).")
    return "\n".join(out) + "\n"


def _memory_word(text: str | None) -> str:
    """'no', 'partly', 'yes' … : the first word of the table's from-memory entry."""
    t = (text or "").strip()
    if not t:
        return "—"
    return t.split(":")[0].split(";")[0].strip()


def organisms_command(
    medium: Annotated[Optional[str], typer.Option(
        help="Only rows relevant to this medium: air, surface, water or any.")] = None,
    pathway: Annotated[Optional[str], typer.Option(
        help="Only this pathway: uvc or violet_blue.")] = None,
    json_out: Annotated[Optional[str], typer.Option(
        "--json", help="Write the table as JSON to this path ('-' for stdout).")] = None,
    force: Annotated[bool, typer.Option(help="Replace an existing output file.")] = False,
) -> None:
    """List the organism table: inactivation doses and rate constants (with their log base),
    medium, wavelength and source."""
    from uvcheck.inactivation import select

    rows = [o.to_dict() for o in select(medium, pathway)]
    if json_out:
        from uvcheck.report.jsonout import write_json

        write_json(json_out, {"organisms": rows}, force=force)
    if json_out != "-":
        typer.echo(render_organisms(rows), nl=False)
