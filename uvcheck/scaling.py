"""Scaling a relative spectrum to absolute units, with the scaling recorded.

A relative spectrum gives shape results only. It becomes absolute with an anchor:

* a radiometer reading in a band (``"UV-C=120 µW/cm²"``, or a range ``"250-260nm=5 uW/cm2"``);
  the reading is taken as the unweighted band irradiance, i.e. a meter with a flat response
  over the band — real meters are not flat, so the result is indicative unless the meter's
  response is known. With the meter's relative spectral response (:func:`read_meter_response`)
  the reading is taken as ∫ s(λ)·E(λ) dλ, s normalised to 1 at its peak (where such meters
  are calibrated, as a rule; our assumption), and the record gives the spectral mismatch: how
  far the flat-response reading would have been off;
* a lux-meter reading: the spectrum is scaled so that 683·∫E·V dλ equals the reading. Lux
  carries no information about UV, and lux meters misread narrow-band LEDs: the output says
  so loudly;
* a known total over the measured range (``"12 W/m2"``).

The anchor, its value, its source and the factor applied are appended to
``spectrum.meta['scaling']`` and shown in every output. Scaling a spectrum that is already
absolute replaces its own calibration: that is allowed (a file whose unit is wrong) and
warned about, with the factor.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from uvcheck.bands import BAND_RANGES
from uvcheck.errors import ConfigurationError
from uvcheck.photometry import luminous_value
from uvcheck.spectrum import Spectrum, integrate, scaled, total_integral
from uvcheck.units import parse_quantity

LUX_WARNING = ("SCALED BY A LUX READING: lux says nothing about UV. The UV figures rest "
               "entirely on the spectrum's shape below 400 nm, and lux meters misread "
               "narrow-band and violet sources. Treat every UV figure as indicative only.")
BAND_METER_NOTE = ("scaled by a band reading, taken as the unweighted band irradiance (a meter "
                   "with a flat response over the band); a real meter's spectral response "
                   "changes this, so the scaling is indicative unless that response is known")


_PLUS_MINUS = re.compile(r"\s*(?:±|\+/-|\+-)\s*")


def split_uncertainty(text: str) -> tuple[str, str | None]:
    """``"120 µW/cm² ± 10 %"`` → (``"120 µW/cm²"``, ``"10 %"``); no ± → (text, None).

    >>> split_uncertainty("350 lx +/- 5 %")
    ('350 lx', '5 %')
    """
    parts = _PLUS_MINUS.split(text.strip(), maxsplit=1)
    return (parts[0].strip(), parts[1].strip() or None) if len(parts) == 2 else (text.strip(), None)


def reading_u_rel(text: str, value: float, kind: str, where: str,
                  default_unit: str | None = None) -> float | None:
    """The relative standard uncertainty a reading's text gives after ``±`` (``"± 10 %"``, or
    in the reading's unit, ``"± 12 µW/cm²"``), taken as k = 1; None when none is given.

    >>> reading_u_rel("120 µW/cm² ± 12 µW/cm²", 1.2, "irradiance", "--scale-band")
    0.1
    """
    _, u_text = split_uncertainty(text)
    if u_text is None:
        return None
    if u_text.endswith("%"):
        try:
            u = float(u_text[:-1].strip().replace(",", ".")) / 100.0
        except ValueError:
            raise ConfigurationError(f"cannot read the uncertainty {u_text!r}", where,
                                     "write it as '± 10 %' or '± 12 uW/cm2'") from None
    else:
        u = parse_quantity(u_text, kind, where, default_unit=default_unit).value_si / value
    if not (math.isfinite(u) and 0.0 <= u < 1.0):
        raise ConfigurationError(f"the uncertainty {u_text!r} must be under 100 % of the reading",
                                 where)
    return round(u, 12)


def _scaled(spectrum: Spectrum, factor: float, record: dict) -> Spectrum:
    """The spectrum scaled to irradiance by ``factor``, the factor recorded with the anchor.
    A spectrum that is already absolute (its file gave a unit) keeps its shape but loses its
    own calibration: the record says so, with the factor, as a warning."""
    record = {**record, "factor": factor}
    if spectrum.is_absolute:
        record["replaced_calibration"] = True
        record["warning"] = (f"the file is already calibrated ({spectrum.quantity} in "
                             f"{spectrum.spectral_unit}); the scaling replaces that calibration, "
                             f"multiplying every value by {factor:.3g}. Scale only a relative "
                             "spectrum, or check the file's unit")
    return scaled(spectrum, factor, "irradiance", record)


def _quantity_kind(spectrum: Spectrum) -> tuple[str, str]:
    return ("irradiance", "irradiance") if spectrum.quantity in ("relative", "irradiance") else (
        spectrum.quantity, spectrum.quantity)


def parse_band_reading(text: str) -> tuple[str, float, float, float]:
    """``"UV-C=120 µW/cm²"`` → (label, lo_nm, hi_nm, value in W m⁻²).

    Examples
    --------
    >>> parse_band_reading("UV-C=120 µW/cm²")
    ('UV-C', 200.0, 280.0, 1.2)
    >>> parse_band_reading("250-260nm=5 uW/cm2")[1:3]
    (250.0, 260.0)
    """
    if "=" not in text:
        raise ConfigurationError(f"cannot read the band reading {text!r}", "--scale-band",
                                 "write it as BAND=VALUE UNIT, e.g. 'UV-C=120 uW/cm2' or "
                                 "'250-260nm=5 uW/cm2'")
    band, reading = (t.strip() for t in text.split("=", 1))
    if band in BAND_RANGES:
        lo, hi = BAND_RANGES[band]
    else:
        m = re.fullmatch(r"(\d+(?:\.\d+)?)\s*[-–]\s*(\d+(?:\.\d+)?)\s*(nm)?", band)
        if not m:
            raise ConfigurationError(f"unknown band {band!r}", "--scale-band",
                                     f"use one of {', '.join(BAND_RANGES)} or a range like "
                                     "'250-260nm'")
        lo, hi = float(m.group(1)), float(m.group(2))
        if not hi > lo:
            raise ConfigurationError(f"band {band!r} is empty", "--scale-band")
    reading, _ = split_uncertainty(reading)
    value = parse_quantity(reading, "irradiance", "--scale-band").value_si
    if not value > 0:
        raise ConfigurationError("the band reading must be positive", "--scale-band")
    return band, lo, hi, value


@dataclass(frozen=True)
class MeterResponse:
    """A radiometer's relative spectral response, s(λ) ≥ 0 normalised to 1 at its peak, linear
    between the tabulated points and 0 outside them (the meter is taken to see nothing the
    table does not list). source : the file. [-]"""

    wavelength_nm: tuple[float, ...]
    response: tuple[float, ...]
    source: str

    @property
    def range_nm(self) -> tuple[float, float]:
        return self.wavelength_nm[0], self.wavelength_nm[-1]

    def __call__(self, wl: Any) -> Any:
        import numpy as np

        return np.interp(np.asarray(wl, dtype=float), self.wavelength_nm, self.response,
                         left=0.0, right=0.0)


def read_meter_response(path: str | Path) -> MeterResponse:
    """A meter's relative spectral response from a table file (wavelength and response, any
    text format the spectrum reader reads), normalised to its peak. Raises
    :class:`ConfigurationError` for negative or all-zero responses."""
    import numpy as np

    from uvcheck.io.reader import read_spectrum

    spec, _ = read_spectrum(path, unit="relative")
    v = np.asarray(spec.values, dtype=float)
    where = str(path)
    if (v < -1e-6 * max(float(np.max(np.abs(v))), 1e-300)).any():
        raise ConfigurationError("the meter response has negative values", where,
                                 "give the meter's relative spectral response (0 to 1)")
    v = np.clip(v, 0.0, None)
    if not v.max() > 0:
        raise ConfigurationError("the meter response is zero everywhere", where)
    return MeterResponse(tuple(float(x) for x in spec.wavelength_nm),
                         tuple(float(x) for x in v / v.max()), where)


def scale_by_band(spectrum: Spectrum, text: str, response: MeterResponse | None = None
                  ) -> Spectrum:
    """Scale so the band integral equals a radiometer reading (see :func:`parse_band_reading`);
    with the meter's ``response``, so that ∫ s·E dλ equals it (the module notes)."""
    band, lo, hi, value = parse_band_reading(text)
    u_rel = reading_u_rel(text.split("=", 1)[1], value, "irradiance", "--scale-band")
    if response is not None:
        return _scale_by_meter(spectrum, text, band, lo, hi, value, u_rel, response)
    r = _anchor(spectrum, lo, hi, None, f"the band {band} ({lo:g}–{hi:g} nm)", f"in {band}",
                "--scale-band", "scale with a band the spectrum covers",
                "scale with a band where the lamp emits")
    return _scaled(spectrum, value / r.value,
                  {"method": "band reading", "band": band, "range_nm": [lo, hi],
                   "reading_W_m2": value, "reading_u_rel": u_rel, "text": text,
                   "note": BAND_METER_NOTE})


def _anchor(spectrum: Spectrum, lo: float, hi: float, weight: Any, covered: str, signal: str,
            where: str, cover_todo: str, signal_todo: str | None) -> Any:
    """The integral a reading is matched to, refused when the spectrum does not cover its
    range ("covers only X % of <covered>") or has no signal above its noise there ("… <signal>")."""
    r = integrate(spectrum, lo, hi, weight)
    if r.coverage < 0.999:
        raise ConfigurationError(f"the spectrum covers only {r.coverage:.0%} of {covered}", where,
                                 cover_todo)
    if not r.value > (r.detection_limit or 0.0):
        neg = _negative_text(spectrum)
        raise ConfigurationError(f"the spectrum has no signal above its noise {signal}"
                                 + (f"; {neg}" if neg else ""), where,
                                 NEGATIVE_TODO if neg else signal_todo)
    return r


#: What to do with a spectrum that is mostly below zero.
NEGATIVE_TODO = ("check the dark subtraction (--dark, --dark-column: a dark and a lamp scan "
                 "swapped, or subtracted the wrong way round) and the value column")


def _negative_text(spectrum: Spectrum) -> str | None:
    """Why a spectrum cannot be scaled when it is mostly below zero (as a swapped dark and
    lamp scan leave it), in words, else None (:func:`uvcheck.features.negative_dominated`)."""
    from uvcheck.features import negative_dominated

    nd = negative_dominated(spectrum.values)
    if nd is None:
        return None
    return (f"{nd[0]} of its {nd[1]} values are below zero, and deeply: a dark and a lamp scan "
            "swapped, or a dark subtracted the wrong way round, leave it so")


def _scale_by_meter(spectrum: Spectrum, text: str, band: str, lo: float, hi: float,
                    value: float, u_rel: float | None, response: MeterResponse) -> Spectrum:
    r_lo, r_hi = response.range_nm
    seen = _anchor(spectrum, r_lo, r_hi, response,
                   f"the meter's response ({r_lo:g}–{r_hi:g} nm)", "where the meter responds",
                   "--meter-response", "a meter reading needs the spectrum over the whole range "
                   "the meter responds to", None)
    flat = integrate(spectrum, lo, hi)
    mismatch = flat.value / seen.value if flat.coverage >= 0.999 else None
    note = (f"scaled by a meter reading ({band}) with the meter's spectral response "
            f"({Path(response.source).name}, {r_lo:g}–{r_hi:g} nm, normalised to 1 at its peak: "
            "our assumption of where it was calibrated): the reading is taken as ∫ s(λ)E(λ) dλ"
            + (f"; a flat response over {band} would have read the {band} irradiance "
               f"{mismatch:.3g} times the meter's reading (the spectral mismatch)"
               if mismatch is not None else ""))
    return _scaled(spectrum, value / seen.value,
                  {"method": "band reading with the meter's response", "band": band,
                   "range_nm": [r_lo, r_hi], "reading_W_m2": value, "reading_u_rel": u_rel,
                   "text": text, "meter_response": response.source,
                   "spectral_mismatch": mismatch, "note": note})


def scale_by_lux(spectrum: Spectrum, lux_text: str) -> Spectrum:
    """Scale so that K_m ∫E·V dλ equals a lux reading; always flagged as UV-blind."""
    reading, _ = split_uncertainty(lux_text)
    value = parse_quantity(reading, "illuminance", "--scale-lux", default_unit="lx").value_si
    if not value > 0:
        raise ConfigurationError("the lux reading must be positive", "--scale-lux")
    u_rel = reading_u_rel(lux_text, value, "illuminance", "--scale-lux", default_unit="lx")
    lum, cov = luminous_value(spectrum)
    if cov < 0.99:
        raise ConfigurationError(f"the spectrum covers only {cov:.0%} of V(λ) (360–830 nm)",
                                 "--scale-lux", "a lux scaling needs the whole visible range")
    if not lum > 0:
        raise ConfigurationError("the spectrum has no visible output to scale by lux",
                                 "--scale-lux", "use --scale-band with a UV radiometer reading")
    return _scaled(spectrum, value / lum,
                  {"method": "lux reading", "reading_lx": value, "reading_u_rel": u_rel,
                   "text": lux_text, "note": LUX_WARNING})


def scale_by_total(spectrum: Spectrum, text: str) -> Spectrum:
    """Scale so that the integral over the measured range equals a known total."""
    reading, _ = split_uncertainty(text)
    value = parse_quantity(reading, "irradiance", "--scale-total").value_si
    u_rel = reading_u_rel(text, value, "irradiance", "--scale-total") if value > 0 else None
    tot = total_integral(spectrum)
    if not value > 0:
        raise ConfigurationError("the total must be positive", "--scale-total")
    if not tot > 0:
        neg = _negative_text(spectrum)
        raise ConfigurationError(f"the spectrum's integral is {tot:.3g}, not positive"
                                 + (f": {neg}" if neg else ""), "--scale-total",
                                 NEGATIVE_TODO if neg else "check the value column")
    lo, hi = spectrum.range_nm
    return _scaled(spectrum, value / tot,
                  {"method": "known total", "range_nm": [lo, hi], "total_W_m2": value,
                   "reading_u_rel": u_rel, "text": text})
