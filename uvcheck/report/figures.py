"""Figures for the note (matplotlib, Agg backend, imported lazily).

* :func:`spectrum_figure` — the spectrum on linear and logarithmic axes, bands shaded, the
  hazard and germicidal weightings overlaid (S(λ), B(λ), germicidal DNA proxy, from
  :func:`uvcheck.weighting.get_weighting`), the noise floor and the regions the germicidal
  evaluation flagged as likely stray light. The log view is where stray light shows
  (PRACTICE.md item 19).
* :func:`hazard_figure` — each hazard value against its Exempt limit (value / limit on a log
  axis) with the RG1 and RG2 boundaries, all from ``result['hazards']``.
* :func:`room_figure` — the work-plane irradiance map, when ``result['room']['plane']['grid']``
  is present (``x_m``, ``y_m`` and ``values_W_m2`` as ``len(x_m)`` rows of ``len(y_m)``).

Numbers come from the assessment dict (the single source of truth); the spectrum figure also
needs the spectrum's samples, which the dict does not carry. :func:`render` returns each figure
as inline SVG (text kept as text, ids salted per figure so several SVGs can share one page)
and as PNG bytes for the PDF.
"""

from __future__ import annotations

import io
import re
from typing import Any, Mapping

Result = Mapping[str, Any]

#: Band shading: (name, lo, hi, colour). UV edges as uvcheck.bands (UV-C from 200 nm).
BANDS = (("UV-C", 200.0, 280.0, "#b9a7e8"), ("UV-B", 280.0, 315.0, "#c9c1ee"),
         ("UV-A", 315.0, 400.0, "#dcd6f5"), ("visible", 400.0, 780.0, "#f1efe0"),
         ("IR", 780.0, 3000.0, "#f3e2dc"))
#: Weightings overlaid, with their line styles.
OVERLAYS = (("S_actinic", "S(λ) actinic UV", "#b2182b", "-"),
            ("B_blue", "B(λ) blue light", "#2166ac", "--"),
            ("germicidal_dna", "germicidal (DNA proxy)", "#1b7837", "-."))
GROUP_COLOURS = {"Exempt": "#6a9f58", "RG1": "#d6b13c", "RG2": "#e07b39", "RG3": "#c0392b"}
WIDTH_IN = 7.2


def _mpl() -> Any:
    import matplotlib

    matplotlib.use("Agg", force=True)
    import matplotlib.pyplot as plt

    return plt


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _log_axis(axis: Any) -> None:
    """Label a log axis with plain text (10⁻³) instead of mathtext: faster, and SVG text stays text."""
    import math

    from matplotlib.ticker import FuncFormatter, NullFormatter

    def fmt(x: float, _pos: Any) -> str:
        if x <= 0:
            return ""
        e = math.log10(x)
        if abs(e - round(e)) > 1e-6:
            return ""
        e = int(round(e))
        if -2 <= e <= 3:
            return f"{x:g}"
        return "10" + str(e).translate(_SUPERSCRIPT)

    axis.set_major_formatter(FuncFormatter(fmt))
    axis.set_minor_formatter(NullFormatter())


# Titles are placed at a fixed y=1.0 (set_title(..., y=1.0)): matplotlib otherwise measures
# every tick label on each draw to move the title clear of them, a large share of the drawing
# time, and nothing sits above these axes.


def _style() -> dict[str, Any]:
    return {"font.family": "DejaVu Sans", "font.size": 8.5, "axes.titlesize": 9.5,
            "axes.labelsize": 8.5, "legend.fontsize": 7.5, "xtick.labelsize": 7.5,
            "ytick.labelsize": 7.5, "svg.fonttype": "none", "axes.spines.top": False,
            "figure.dpi": 100}


# ---------------------------------------------------------------------------------------------
# Spectrum
# ---------------------------------------------------------------------------------------------

def _estimate(result: Result) -> bool:
    from uvcheck.report.terminal import is_estimate

    return is_estimate(result)


def _suspect_regions(result: Result) -> list[tuple[float, float, str]]:
    """Wavelength regions to mark, from the germicidal artefacts (UV-C 200–280 nm)."""
    g = result.get("germicidal") or {}
    out = []
    from uvcheck.germicidal import UNDECIDED_KINDS

    stray = [a for a in g.get("artefacts") or [] if a.get("kind") not in UNDECIDED_KINDS]
    if stray:
        kinds = ", ".join(sorted({a.get("kind", "") for a in stray}))
        out.append((200.0, 280.0, f"likely stray light ({kinds})"))
    elif g.get("artefacts"):  # a signal rising into the start of the data: undecided
        out.append((200.0, 280.0, "UV-C undecided (data-edge)"))
    return out


def spectrum_figure(spectrum: Any, result: Result) -> Any:
    """Two panels (linear, log) of the spectrum with bands, weightings, noise floor, suspects."""
    import numpy as np

    from uvcheck.weighting import get_weighting

    plt = _mpl()
    wl = np.asarray(spectrum.wavelength_nm, dtype=float)
    v = np.asarray(spectrum.values, dtype=float)
    lo, hi = float(wl[0]), float(wl[-1])
    unit = (result.get("input") or {}).get("unit") or getattr(spectrum, "spectral_unit", "")
    ylabel = {"W m-2 nm-1": "spectral irradiance [W/(m²·nm)]",
              "W m-2 sr-1 nm-1": "spectral radiance [W/(m²·sr·nm)]",
              "W nm-1": "spectral flux [W/nm]"}.get(unit, f"value [{unit}]")
    noise = (result.get("input") or {}).get("noise_floor")
    what = "estimated spectrum (model)" if _estimate(result) else "measured spectrum"
    with plt.rc_context(_style()):
        fig, axes = plt.subplots(2, 1, figsize=(WIDTH_IN, 5.6), sharex=True,
                                 gridspec_kw={"hspace": 0.2})
        peak = float(np.max(v)) if v.size else 1.0
        for k, ax in enumerate(axes):
            for name, a, b, col in BANDS:
                if b <= lo or a >= hi:
                    continue
                ax.axvspan(max(a, lo), min(b, hi), color=col, alpha=0.55, lw=0, zorder=0)
                if k == 0 and (min(b, hi) - max(a, lo)) > 0.04 * (hi - lo):
                    ax.text((max(a, lo) + min(b, hi)) / 2, 0.985, name,
                            transform=ax.get_xaxis_transform(), ha="center", va="top",
                            fontsize=7.5, color="#333", zorder=5)
            for a, b, label in _suspect_regions(result):
                ax.axvspan(max(a, lo), min(b, hi), facecolor="none", edgecolor="#7a1f1f",
                           hatch="////", lw=0.0, alpha=0.6, zorder=1,
                           label=label if k == 1 else None)
        ax0, ax1 = axes
        ax0.plot(wl, v, color="#111", lw=0.9, zorder=3, label=what)
        ax0.set_ylabel(ylabel)
        ax0.set_ylim(min(0.0, float(np.min(v))) if v.size else 0.0, peak * 1.15 if peak > 0 else 1.0)
        ax0.set_title("Spectrum, linear scale (weightings on the right axis)", loc="left", y=1.0)
        pos = np.where(v > 0, v, np.nan)
        ax1.plot(wl, pos, color="#111", lw=0.8, zorder=3, label=f"{what} (values > 0)")
        floor = noise if noise and noise > 0 else None
        if floor:
            ax1.axhline(floor, color="#7a1f1f", ls=":", lw=1.0, zorder=4,
                        label="noise floor (1 σ per sample)")
        bottom = max(floor / 10 if floor else 0.0, peak * 1e-8) if peak > 0 else 1e-12
        ax1.set_yscale("log")
        _log_axis(ax1.yaxis)
        ax1.set_ylim(bottom, peak * 60 if peak > 0 else 1.0)
        ax1.set_ylabel(ylabel)
        ax1.set_xlabel("wavelength [nm]")
        ax1.set_title("Spectrum, logarithmic scale (stray light and noise show here)", loc="left", y=1.0)
        ax1.set_xlim(lo, hi)
        placed: list[float] = []
        lines = sorted((ln for ln in (result.get("spectral") or {}).get("lines") or []
                        if ln.get("identified_as") and (ln.get("height") or 0) > 0),
                       key=lambda ln: -ln["height"])
        for ln in lines:  # strongest first, at least 1.5 % of the span apart (ours: legibility)
            x0 = ln["wavelength_nm"]
            if any(abs(x0 - p) < 0.015 * (hi - lo) for p in placed) or len(placed) >= 12:
                continue
            placed.append(x0)
            ax1.annotate(ln["identified_as"].replace(" nm", ""), (x0, ln["height"]),
                         xytext=(0, 4), textcoords="offset points", fontsize=6.2, color="#333",
                         ha="center", va="bottom", rotation=90, zorder=6)
        tw0, tw1 = ax0.twinx(), ax1.twinx()
        top = 1.0   # the highest weighting drawn (a germicidal proxy exceeds 1 below 240 nm)
        for wid, label, col, ls in OVERLAYS:
            try:
                w = get_weighting(wid)
            except Exception:  # noqa: BLE001 - a missing table simply is not drawn
                continue
            a, b = max(w.range_nm[0], lo), min(w.range_nm[1], hi)
            if b <= a:
                continue
            x = np.linspace(a, b, 400)
            y = w(x)
            tw0.plot(x, y, color=col, ls=ls, lw=1.1, label=label)
            tw1.plot(x, np.where(y > 0, y, np.nan), color=col, ls=ls, lw=1.1, label=label)
            top = max(top, float(np.nanmax(y)))
        tw0.set_ylim(0, 1.15 * top)   # no curve runs off the top
        tw1.set_yscale("log")
        _log_axis(tw1.yaxis)
        tw1.set_ylim(1e-5, 3)
        for t in (tw0, tw1):
            t.set_ylabel("relative weighting [-]")
            t.spines["top"].set_visible(False)
        h0, l0 = ax0.get_legend_handles_labels()
        h2, l2 = tw0.get_legend_handles_labels()
        h1, l1 = ax1.get_legend_handles_labels()
        extra = [(h, l) for h, l in zip(h1, l1) if not l.startswith(what)]
        ax0.legend(h0 + h2 + [h for h, _ in extra], l0 + l2 + [l for _, l in extra],
                   loc="upper right", bbox_to_anchor=(1.0, 0.93), frameon=True, framealpha=0.92)
        fig.subplots_adjust(left=0.1, right=0.9, top=0.94, bottom=0.09)
    return fig


# ---------------------------------------------------------------------------------------------
# Hazards against limits
# ---------------------------------------------------------------------------------------------

def hazard_points(result: Result) -> list[dict[str, Any]]:
    """What the hazard figure draws: one entry per hazard, value / Exempt limit and boundaries.

    kind : ``value`` (a bar), ``upper`` (below detection: bar to the detection limit),
    ``lower`` (partial data: the value is a lower bound) or ``none`` (not assessable).
    so_far : an ``upper`` bar of a hazard measured in part (below the limit in the measured
    part only).
    """
    hz = result.get("hazards") or {}
    pts = []
    for hid, h in hz.items():
        lim = h.get("limit")
        v, dl, st = h.get("value"), h.get("detection_limit"), h.get("status")
        label = f"{h.get('symbol', hid)}  {h.get('name', hid)}"
        if st == "not-assessable" or lim in (None, 0):
            pts.append({"id": hid, "label": label, "kind": "none", "ratio": None,
                        "group": None, "boundaries": [], "reason": h.get("reason")})
            continue
        if st == "below-detection" or v is None or (dl is not None and v < dl):
            kind, r = "upper", (dl / lim if dl else None)
        else:
            kind, r = ("lower" if st == "partial" else "value"), v / lim
        bounds = [(g["group"], g["limit"] / lim) for g in h.get("group_limits") or []
                  if g.get("group") in ("RG1", "RG2") and g.get("limit")]
        grp = h.get("risk_group")
        if grp and h.get("risk_group_is_lower_bound"):
            grp = "≥ " + grp
        # below the detection limit in the measured part of a partly measured hazard: the
        # part not measured could hold more (worded "so far", as in the tables)
        pts.append({"id": hid, "label": label, "kind": kind, "ratio": r,
                    "group": grp, "boundaries": bounds, "reason": None,
                    "so_far": kind == "upper" and st == "partial"})
    return pts


def hazard_figure(result: Result) -> Any:
    """Horizontal log bars of value / Exempt limit per hazard, with RG boundaries."""
    from uvcheck.units import sig

    plt = _mpl()
    pts = hazard_points(result)
    ev = result.get("evaluation") or {}
    d = ev.get("distance_m")
    n = len(pts)
    with plt.rc_context(_style()):
        fig, ax = plt.subplots(figsize=(WIDTH_IN, 0.5 * n + 1.2))
        ratios = [p["ratio"] for p in pts if p["ratio"]] + [b for p in pts for _, b in p["boundaries"]]
        lo = min([1e-3] + [r / 3 for r in ratios if r > 0])
        hi = max([100.0] + [r * 3 for r in ratios if r > 0])
        for i, p in enumerate(pts):
            y = n - 1 - i
            sign = {"upper": "< ", "lower": "≥ "}.get(p["kind"], "")
            if p["kind"] == "none":
                ax.text(lo * 1.3, y, "not assessable", va="center", fontsize=7.5, color="#555",
                        style="italic")
                label = "not assessable"
            else:
                col = GROUP_COLOURS.get((p["group"] or "").lstrip("≥ "), "#999")
                hatch = {"upper": "////", "lower": "\\\\\\\\"}.get(p["kind"])
                ax.barh(y, p["ratio"] - lo, left=lo, height=0.5,
                        color=col if not hatch else "white", edgecolor=col, hatch=hatch, lw=1.0)
                for g, b in p["boundaries"]:
                    ax.plot([b, b], [y - 0.3, y + 0.3], color="#333", lw=0.9, zorder=4)
                    # the label sits above the bar (bars span y ± 0.25), in the gap between
                    # rows: RG1 left of its tick, RG2 right of it, on a white ground so the
                    # Exempt line does not run through it
                    left = g == "RG1"
                    ax.annotate(g, (b, y + 0.27), xytext=(-1.5 if left else 1.5, 0),
                                textcoords="offset points", fontsize=5.8, va="bottom",
                                ha="right" if left else "left", color="#333", zorder=5,
                                bbox={"boxstyle": "square,pad=0.1", "fc": "white",
                                      "ec": "none", "alpha": 0.9})
                grp = p["group"] or "(no groups)"
                label = f"{sign}{sig(p['ratio'])}×{' so far' if p.get('so_far') else ''}   {grp}"
            ax.annotate(label, (1.01, y), xycoords=("axes fraction", "data"), va="center",
                        ha="left", fontsize=7.5, annotation_clip=False)
        ax.axvline(1.0, color="#111", lw=1.2)
        ax.text(1.0, n - 0.36, "  Exempt limit (1×)", fontsize=7, va="bottom", ha="left")
        ax.set_xscale("log")
        _log_axis(ax.xaxis)
        ax.set_xlim(lo, hi)
        ax.set_ylim(-0.8, n + 0.1)
        ax.set_yticks(range(n))
        ax.set_yticklabels([p["label"] for p in reversed(pts)])
        where = "" if d is None else (f" at {d * 100:.3g} cm" if d < 1 else f" at {d:.3g} m")
        ax.set_xlabel("hazard value / Exempt limit (log scale)")
        ax.set_title(f"Hazard values against their limits{where}", loc="left", y=1.0)
        ax.spines["right"].set_visible(False)
        fig.subplots_adjust(left=0.38, right=0.68, top=1 - 0.42 / (0.5 * n + 1.2),
                            bottom=0.6 / (0.5 * n + 1.2))  # margins in inches: title, x label
    return fig


# ---------------------------------------------------------------------------------------------
# Room
# ---------------------------------------------------------------------------------------------

def room_grid(result: Result) -> Mapping[str, Any] | None:
    g = ((result.get("room") or {}).get("plane") or {}).get("grid")
    if not g or not g.get("values_W_m2") or not g.get("x_m") or not g.get("y_m"):
        return None
    return g


def room_figure(result: Result) -> Any | None:
    """The work-plane irradiance map in µW/cm² (None without a grid)."""
    import numpy as np

    g = room_grid(result)
    if g is None:
        return None
    plt = _mpl()
    room = result["room"]
    x = np.asarray(g["x_m"], dtype=float)
    y = np.asarray(g["y_m"], dtype=float)
    z = np.asarray(g["values_W_m2"], dtype=float) * 100.0  # W/m² → µW/cm² (×100)
    lamp = (room.get("lamp") or {}).get("position_m")
    h = (room.get("plane") or {}).get("height_m")
    with plt.rc_context(_style()):
        aspect = (y[-1] - y[0]) / max(x[-1] - x[0], 1e-9)
        fig, ax = plt.subplots(figsize=(WIDTH_IN, min(6.0, max(3.0, WIDTH_IN * 0.75 * aspect))))
        # the mesh is drawn as an image inside the SVG (one picture instead of a path per cell)
        m = ax.pcolormesh(x, y, z.T, shading="nearest", cmap="magma", rasterized=True)
        cs = ax.contour(x, y, z.T, levels=6, colors="white", linewidths=0.6)
        ax.clabel(cs, fmt="%.3g", fontsize=6.5)
        if lamp:
            ax.plot(lamp[0], lamp[1], marker="*", ms=11, color="#39c", mec="white")
            ax.annotate("lamp", (lamp[0], lamp[1]), xytext=(6, 6), textcoords="offset points",
                        color="white", fontsize=7.5)
        ax.set_aspect("equal")
        ax.set_xlabel("x [m]")
        ax.set_ylabel("y [m]")
        ax.set_title("Work-plane irradiance" + (f" at {h:g} m" if h is not None else "")
                     + " (254-nm-equivalent) [µW/cm²]", loc="left", y=1.0)
        fig.colorbar(m, ax=ax, label="µW/cm²  (1 µW/cm² = 0.01 W/m²)", shrink=0.9)
        fig.tight_layout()
    return fig


# ---------------------------------------------------------------------------------------------
# Output
# ---------------------------------------------------------------------------------------------

_SVG_HEAD = re.compile(r"^.*?(<svg\b)", re.S)


def _svg(fig: Any, salt: str) -> str:
    import matplotlib

    buf = io.StringIO()
    with matplotlib.rc_context({"svg.hashsalt": salt, "svg.fonttype": "none"}):
        fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    text = _SVG_HEAD.sub(r"\1", buf.getvalue(), count=1)
    # responsive: drop the fixed size in pt, keep the viewBox
    text = re.sub(r'<svg([^>]*?)\swidth="[^"]*pt"\s+height="[^"]*pt"',
                  r'<svg\1 class="figure-svg" preserveAspectRatio="xMidYMid meet"', text, count=1)
    text = text.replace("font-family:'DejaVu Sans'", "font-family:'DejaVu Sans',Verdana,sans-serif")
    return text


def _png(fig: Any, dpi: int = 150) -> bytes:
    buf = io.BytesIO()
    # compress_level 1: faster to write; the PDF stores the image data again anyway
    fig.savefig(buf, format="png", dpi=dpi, metadata={"Software": None},
                pil_kwargs={"compress_level": 1})
    return buf.getvalue()


def render(result: Result, spectrum: Any | None = None, *, svg: bool = True, png: bool = True,
           salt: str = "uvcheck") -> list[dict[str, Any]]:
    """Every figure that applies: [{id, title, caption, svg, png}] (absent ones left out).

    result : ``Assessment.to_dict()``. spectrum : the Spectrum the result was computed from
    (the spectrum figure is drawn only with it).
    salt : makes SVG ids unique when several notes' figures share a page.
    """
    plt = _mpl()
    out: list[dict[str, Any]] = []
    specs: list[tuple[str, str, str, Any]] = []
    if spectrum is not None and getattr(spectrum, "wavelength_nm", None) is not None \
            and len(spectrum.wavelength_nm) > 2:
        noise = (result.get("input") or {}).get("noise_floor")
        cap = (("The estimated spectrum (a model of the stated data, not a measurement)"
                if _estimate(result) else "The measured spectrum")
               + "; shaded: UV-C, UV-B, UV-A, visible and IR bands; lines on the right axis: "
               "the actinic UV weighting S(λ) and the blue-light weighting B(λ) "
               "(IEC 62471:2006 Tables 4.1, 4.2) and a germicidal action proxy (DNA absorption, "
               "Kowalski 2009).")
        if noise:
            cap += " Dotted: the noise floor (1 σ per sample) estimated by the reader."
        if _suspect_regions(result):
            cap += " Hatched: where the apparent UV-C signal is likely stray light, not emission."
        specs.append(("spectrum", "Spectrum and weightings", cap,
                      lambda: spectrum_figure(spectrum, result)))
    if result.get("hazards"):
        specs.append(("hazards", "Hazard values against their limits",
                      "Each hazard value divided by its Exempt limit (IEC 62471:2006 Table 6.1), "
                      "on a log scale; ticks mark the RG1 and RG2 boundaries. Beyond 1× the lamp "
                      "leaves the Exempt group for that hazard.",
                      lambda: hazard_figure(result)))
    if room_grid(result) is not None:
        specs.append(("room", "Room: work-plane irradiance",
                      "Upward-facing irradiance on the work plane, direct plus reflected, as the "
                      "room model computed it; the star marks the lamp.",
                      lambda: room_figure(result)))
    for fid, title, cap, make in specs:
        fig = make()
        if fig is None:
            continue
        try:
            out.append({"id": fid, "title": title, "caption": cap,
                        "svg": _svg(fig, f"{salt}-{fid}") if svg else None,
                        "png": _png(fig) if png else None})
        finally:
            plt.close(fig)
    return out
