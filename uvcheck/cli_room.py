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


def _length(text: str, where: str) -> float:
    from uvcheck.units import parse_quantity

    return parse_quantity(text, "length", where).value_si


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
    lines = [
        f"Room {sig(dim['width'])} × {sig(dim['length'])} × {sig(dim['height'])} m "
        f"({sig(d['volume_m3'])} m³), wall reflectance {sig(d['reflectance'] * 100)} %",
        f"Lamp at ({', '.join(sig(v) for v in lamp['position_m'])}) m, {lamp['pattern']}"
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
    lines += ["", f"Occupant at eye height {sig(occ['eye_height_m'])} m (worst point, eyes facing the lamp):",
              f"  UV-C {_fmt(occ['irradiance_W_m2'], 'W m-2')}, E_S {_fmt(occ['effective_S_W_m2'], 'W m-2')}"
              + (" (lower bound)" if occ["effective_S_is_lower_bound"] else ""),
              f"  8-h actinic limit reached in {format_duration(occ['time_to_limit_s'])}"
              + ("  — EXCEEDS the 8-h limit" if occ["exceeds_8h_limit"] else ""),
              f"  {occ['note']}"]
    if d["notes"]:
        lines += [""] + [f"Note: {n}" for n in d["notes"]]
    return "\n".join(lines) + "\n"


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
    lamp_at: Annotated[Optional[str], typer.Option(
        "--lamp-at", help="Lamp position x, y, z from a floor corner, e.g. '2, 2.5, 2.4 m' "
                          "(default: room centre, 0.3 m below the ceiling).")] = None,
    pattern: Annotated[str, typer.Option(
        help="Emission pattern: isotropic, lambertian-down or cylinder (a bare horizontal "
             "tube).")] = "isotropic",
    tube_length: Annotated[Optional[str], typer.Option(
        "--tube-length", help="Arc length of a cylinder lamp, e.g. '0.9 m'.")] = None,
    axis: Annotated[str, typer.Option(help="Tube axis: x (width) or y (length).")] = "x",
    reflectance: Annotated[str, typer.Option(
        help="Diffuse UV reflectance of walls, floor and ceiling.")] = "5 %",
    work_plane: Annotated[str, typer.Option(
        "--work-plane", help="Height of the work plane.")] = "0.75 m",
    eye_height: Annotated[str, typer.Option(
        "--eye-height", help="Occupant eye height (standing about 1.7 m, seated 1.2 m).")] = "1.7 m",
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
) -> None:
    """What one lamp does in a room: work-plane irradiance, air disinfection (eACH, times in
    well-mixed air) and the occupant's exposure against the 8-h limit. A screening
    assessment, not a certification."""
    from uvcheck.errors import ConfigurationError, OutputExistsError
    from uvcheck.room import Box, LampGeometry, evaluate_room, lamp_from_spectrum, lamp_from_uvc_flux
    from uvcheck.units import parse_quantity

    if (spectrum_file is None) == (uvc_flux is None):
        raise ConfigurationError("give either a spectrum file or --uvc-flux (not both)",
                                 todo="e.g. 'uvcheck room lamp.csv --distance \"1 m\"' or "
                                      "'uvcheck room --uvc-flux \"2 W\"'")
    if json_out and json_out != "-" and Path(json_out).exists() and not force:
        raise OutputExistsError("the output file exists", json_out,
                                "give --force to replace it, or choose another name")
    w, l, h = _triple(size, "--size")
    room = _placed("--size", Box, w, l, h)
    pos = _triple(lamp_at, "--lamp-at") if lamp_at else (w / 2, l / 2, max(h - 0.3, h / 2))
    if pattern not in PATTERN_NAMES:
        raise ConfigurationError(f"unknown pattern {pattern!r}", "--pattern",
                                 "use isotropic, lambertian-down or cylinder")
    tl = _length(tube_length, "--tube-length") if tube_length else 0.0
    geom = _placed("--lamp-at", LampGeometry, pos, PATTERN_NAMES[pattern], tl, axis)
    rho = parse_quantity(reflectance, "fraction", "--reflectance").value_si
    if uvc_flux is not None:
        flux = parse_quantity(uvc_flux, "power", "--uvc-flux").value_si
        wl_nm = parse_quantity(wavelength, "length", "--wavelength", default_unit="nm").value_si * 1e9
        lamp = _placed("--uvc-flux", lamp_from_uvc_flux, flux, geom, wl_nm)
    else:
        from uvcheck.io.reader import ReadOptions, read_spectrum

        spec, report = read_spectrum(spectrum_file, ReadOptions(unit=unit, column=column))
        d0 = _length(distance, "--distance") if distance else report.measurement_distance_m
        lamp = _placed("--distance", lamp_from_spectrum, spec, geom, d0)
    dose = parse_quantity(target_dose, "dose", "--target-dose").value_si if target_dose else None
    result = _placed("--lamp-at", evaluate_room, room, lamp, reflectance=rho,
                     work_plane_m=_length(work_plane, "--work-plane"),
                     eye_height_m=_length(eye_height, "--eye-height"),
                     target_dose_J_m2=dose, organisms=organism or None)
    d = result.to_dict()
    if json_out:
        from uvcheck.report.jsonout import write_json

        write_json(json_out, {"room": d}, force=force)
    if not quiet and json_out != "-":
        typer.echo(render_room(d), nl=False)


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

    out = [f"{'id':<48} {'medium':<11} {'nm':>5}  {'model':<11} {'D90':>30}  {'k (published)':<18} reliability"]
    for r in rows:
        k = r["k_published"]
        ktxt = "—" if k is None else f"{sig(k['value'])} cm²/mJ base {k['base']}"
        d90 = r["d90_J_m2"]
        dtxt = "not reached" if d90 is None else _fmt(d90, "J m-2")
        if r["dose_bound"] == "at_most" and d90 is not None:
            dtxt = "≤ " + dtxt
        out.append(f"{r['id']:<48} {r['medium']:<11} {sig(r['wavelength_nm']):>5}  "
                   f"{r['model']:<11} {dtxt:>30}  {ktxt:<18} {r['reliability']}")
    out.append("")
    out.append("Doses as published (mJ/cm², cm²/mJ with their log base) are in "
               "data/organisms/organisms.csv; sources in data/organisms/organisms.toml.")
    return "\n".join(out) + "\n"


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
