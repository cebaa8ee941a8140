"""Photometry and colorimetry: illuminance (or luminance, luminous flux), chromaticity, CCT.

V(λ) is the CIE 1924 photopic luminous efficiency function and the colour-matching functions
are the CIE 1931 2° observer, both as tabulated by colour-science and cached in ``data/cie/``
by :mod:`uvcheck.cie_cache` (a test checks the cache against colour-science). K_m = 683 lm/W.

CCT is found on colour-science's Planckian locus (CIE 1960 UCS) by the nearest-point search
with parabolic refinement of Ohno (2013), and reported only where it is meaningful:
|Duv| ≤ 0.05 (the usual CCT validity band, ANSI C78.377 and CIE 015 use this limit) and a
source that is mainly visible.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from functools import lru_cache

import numpy as np

from uvcheck.constants import K_M_LM_PER_W
from uvcheck.data_files import read_table
from uvcheck.spectrum import Integral, Spectrum, integrate
from uvcheck.weighting import Weighting

#: luminous quantity for each radiometric one
LUMINOUS = {"irradiance": ("illuminance", "lx"), "radiance": ("luminance", "cd m-2"),
            "flux": ("luminous_flux", "lm")}


@lru_cache(maxsize=1)
def v_lambda() -> Weighting:
    """CIE 1924 photopic V(λ), 360–830 nm, from the colour-science cache. [-]"""
    t = read_table("cie/V_photopic_1924.csv")
    return Weighting(id="V_photopic_1924", name="CIE 1924 photopic V(λ)",
                     wavelength_nm=np.array(t.floats("wavelength_nm")),
                     value=np.array(t.floats("value")), range_nm=(360.0, 830.0),
                     interpolation="linear",
                     provenance={"source": "CIE 1924 photopic observer via colour-science "
                                           "(SDS_LEFS_PHOTOPIC), cached in data/cie",
                                 "file": "cie/V_photopic_1924.csv"})


@lru_cache(maxsize=1)
def cmfs() -> tuple[Weighting, Weighting, Weighting]:
    """CIE 1931 2° colour-matching functions x̄, ȳ, z̄ (360–830 nm) from the cache."""
    t = read_table("cie/cmf_1931_2deg.csv")
    wl = np.array(t.floats("wavelength_nm"))
    out = []
    for col in ("x_bar", "y_bar", "z_bar"):
        out.append(Weighting(id=f"cie1931_{col}", name=f"CIE 1931 2° {col}", wavelength_nm=wl,
                             value=np.array(t.floats(col)), range_nm=(360.0, 830.0),
                             interpolation="linear",
                             provenance={"source": "CIE 1931 2° observer via colour-science",
                                         "file": "cie/cmf_1931_2deg.csv"}))
    return tuple(out)  # type: ignore[return-value]


@lru_cache(maxsize=1)
def _locus() -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    t = read_table("cie/planckian_locus_uv1960.csv")
    return np.array(t.floats("T_K")), np.array(t.floats("u")), np.array(t.floats("v"))


@dataclass(frozen=True)
class Photometry:
    """Luminous quantity and chromaticity of a spectrum.

    quantity : ``illuminance`` [lx] | ``luminance`` [cd m⁻²] | ``luminous_flux`` [lm].
    value : the luminous quantity (None for a relative spectrum).
    coverage : share of the V(λ) area measured. [-]
    x, y : CIE 1931 chromaticity (None if no visible output or not covered).
    cct_K, duv : correlated colour temperature and distance from the locus, where meaningful.
    cct_note : why CCT is absent, if it is.
    status : ``complete`` | ``partial`` (V(λ) partly covered: a lower bound) |
        ``below-detection`` (under 3 σ of the V(λ)-weighted integral) | ``not-meaningful``
        (the integral is negative beyond its noise: the spectrum sits below zero) |
        ``not-covered`` | ``relative``. ``value`` is None unless complete or partial.
    detection_limit : 3 σ of the luminous quantity from the noise floor (None if unknown).
    value_note : why ``value`` is None, if it is.
    """

    quantity: str
    unit: str
    value: float | None
    coverage: float
    x: float | None
    y: float | None
    cct_K: float | None
    duv: float | None
    cct_note: str | None
    status: str = "complete"
    detection_limit: float | None = None
    value_note: str | None = None

    def to_dict(self) -> dict:
        return {f.name: getattr(self, f.name) for f in fields(self)}  # flat: as asdict


def luminous_value(spectrum: Spectrum) -> tuple[float, float]:
    """K_m ∫ X(λ) V(λ) dλ and the V(λ) coverage. [lx, cd m⁻² or lm], [-]

    Examples
    --------
    >>> s = Spectrum([554.0, 556.0], [1.0, 1.0], "irradiance")   # 2 W/m² at 555 nm
    >>> round(luminous_value(s)[0])
    1366
    """
    r = _luminous_integral(spectrum)
    return K_M_LM_PER_W * r.value, r.coverage


def _luminous_integral(spectrum: Spectrum) -> Integral:
    """∫ X(λ) V(λ) dλ over 360–830 nm, with coverage and noise (times K_m: the luminous
    quantity)."""
    return integrate(spectrum, 360.0, 830.0, v_lambda())


def cct_ohno2013(u: float, v: float) -> tuple[float, float]:
    """CCT [K] and Duv of a CIE 1960 (u, v) point, nearest point on the cached locus.

    The nearest tabulated locus point and its two neighbours give a parabola of the squared
    distance against T (exact where the locus is locally straight, as in the parabolic
    step of Ohno 2013), whose vertex is the CCT; Duv is the distance there, positive above
    the locus (towards green). Valid within the cached 1000–100 000 K.
    """
    T, lu, lv = _locus()
    d2 = (lu - u) ** 2 + (lv - v) ** 2
    i = int(np.argmin(d2))
    i = min(max(i, 1), len(T) - 2)
    t = T[i - 1:i + 2]
    y = d2[i - 1:i + 2]
    # the parabola through the three points (x = T − T_i), in closed form
    x0, x2 = float(t[0] - t[1]), float(t[2] - t[1])
    y0, y1, y2 = float(y[0]), float(y[1]), float(y[2])
    s0, s2 = (y0 - y1) / x0, (y2 - y1) / x2
    a = (s2 - s0) / (x2 - x0)
    b = s2 - a * x2
    c = y1
    if a > 0:
        x = -b / (2 * a)
        cct = float(t[1] + x)
        dmin2 = max(0.0, a * x * x + b * x + c)
    else:
        cct, dmin2 = float(t[1]), float(y[1])
    ui = float(np.interp(cct, T, lu))
    vi = float(np.interp(cct, T, lv))
    sign = 1.0 if v - vi >= 0 else -1.0
    return cct, float(sign * np.sqrt(dmin2))


def visible_share(spectrum: Spectrum) -> float | None:
    """The share of 380–780 nm in the measured ultraviolet and visible output (from the
    start of the data to 780 nm), or None when there is none. Infrared is left out: it does
    not change a source's colour, so a 2800 K filament, mostly infrared, is a white source,
    while a UV lamp whose visible lines are a small part of its output is not (our own rule
    for when a CCT means anything).

    >>> round(visible_share(Spectrum([300.0, 380.0, 780.0, 2000.0], [0.0, 1.0, 1.0, 1.0],
    ...                             "irradiance")), 3)
    0.909
    """
    lo = spectrum.range_nm[0]
    if lo >= 780.0:
        return None
    uv_vis = integrate(spectrum, lo, 780.0).value
    vis = integrate(spectrum, max(lo, 380.0), 780.0).value
    return None if uv_vis <= 0.0 else max(vis, 0.0) / uv_vis


def photometry(spectrum: Spectrum, visible_fraction: float | None = None) -> Photometry:
    """Luminous quantity, chromaticity and (where meaningful) CCT of a spectrum.

    spectrum : any spectrum; relative spectra give chromaticity only.
    visible_fraction : share of 380–780 nm in the ultraviolet and visible output
        (:func:`visible_share`), used to decide whether CCT means anything (it must be
        ≥ 0.5). [-]
    """
    qty, unit = LUMINOUS.get(spectrum.quantity, ("illuminance", "lx"))
    r = _luminous_integral(spectrum)
    val, cov = K_M_LM_PER_W * r.value, r.coverage
    dl = None if r.detection_limit is None else K_M_LM_PER_W * r.detection_limit
    xb, yb, zb = cmfs()
    X = integrate(spectrum, 360.0, 830.0, xb).value
    Y = integrate(spectrum, 360.0, 830.0, yb).value
    Z = integrate(spectrum, 360.0, 830.0, zb).value
    S = X + Y + Z
    x = y = cct = duv = None
    note = None
    status, value, why = _luminous_status(spectrum, qty, unit, val, cov, dl)
    if status in ("below-detection", "not-meaningful"):
        # a colour of the noise is no colour: no chromaticity where the visible output itself
        # is not established (a UV-C lamp's visible band below its detection limit)
        note = "no visible output above the detection limit"
    elif cov < 0.99:
        note = f"V(λ) only {cov:.0%} covered by the measured range"
    elif not (S > 0 and X >= 0 and Y > 0 and Z >= 0):
        note = "no measurable visible output"
    else:
        x, y = X / S, Y / S
        u = 4 * X / (X + 15 * Y + 3 * Z)
        v = 6 * Y / (X + 15 * Y + 3 * Z)
        t, dv = cct_ohno2013(u, v)
        if visible_fraction is not None and visible_fraction < 0.5:
            note = ("not a white source: most of the ultraviolet and visible output is "
                    "outside 380–780 nm")
        elif abs(dv) > 0.05 or not (1000 <= t <= 100000):
            note = f"chromaticity too far from the Planckian locus (Duv {dv:+.3f}) for a CCT"
        else:
            cct, duv = t, dv
    return Photometry(quantity=qty, unit=unit if spectrum.is_absolute else "relative",
                      value=value, coverage=cov, x=x, y=y, cct_K=cct, duv=duv, cct_note=note,
                      status=status, detection_limit=dl if spectrum.is_absolute else None,
                      value_note=why)


def _luminous_status(spectrum: Spectrum, qty: str, unit: str, val: float, cov: float,
                     dl: float | None) -> tuple[str, float | None, str | None]:
    """(status, value or None, why None): a luminous value is given only where it is
    established; a negative one is never printed."""
    name = qty.replace("_", " ")
    if not spectrum.is_absolute:
        return "relative", None, "relative spectrum: no absolute value until it is scaled"
    if cov < 0.01:
        return "not-covered", None, "V(λ) is not covered by the measured range"
    if val < 0 and (dl is None or -val >= dl):
        return ("not-meaningful", None,
                f"not meaningful: the V(λ)-weighted integral is negative ({val:.3g} {unit}, "
                f"beyond its noise), so the spectrum sits below zero and no {name} can be "
                f"given; check the dark (background) subtraction")
    if dl is not None and val < dl:
        return ("below-detection", None,
                f"below the detection limit of {dl:.3g} {unit}, 3 σ of the noise floor")
    if cov < 0.99:
        return "partial", val, None
    return "complete", val, None


def _finite(x: float | None) -> float | None:
    return None if x is None or not math.isfinite(x) else x
