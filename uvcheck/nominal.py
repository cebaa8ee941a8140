"""Nominal spectra: what a lamp would emit according to its stated data. ESTIMATES, not measurements.

When there is no measured spectrum, uvcheck builds one from the listing: a model shape for the
stated technology (an LED band, the low-pressure mercury lines, a KrCl* excimer band, a white
LED, a blackbody) scaled to an optical power that is either stated or derived from the
electrical power times the technology's efficiency range (min / typical / max, from
``data/technologies.toml``). The full hazard and germicidal evaluation then runs on it, so its
results are ranges and every one of them is labelled an estimate.

Every nominal spectrum:

* has ``meta['origin'] == 'nominal'``, ``meta['estimate'] is True`` and the label
  :data:`ESTIMATE_LABEL`, with the model, its parameters and their sources in ``meta``;
* declares ``covered_nm`` = :data:`NOMINAL_RANGE_NM` (180–3000 nm): a model is complete by
  construction, so evaluators may read "no emission outside the model's samples" as zero.
  That is the one place where absence means zero, and it is why the label matters;
* is a spectral radiant flux (``quantity='flux'``, W nm⁻¹) when a power is known, else a
  relative shape (``quantity='relative'``, integrating to 1). :func:`irradiance_at` turns a
  flux into an irradiance at a distance with the geometry models of :mod:`uvcheck.geometry`.

Model shapes (parameters in ``data/emitters/led_packages.toml`` and
``data/emitters/lamp_models.toml``, each labelled with its source):

* single LED: colour-science's ``sd_single_led_Ohno2005`` (Ohno 2005), whose shape
  S = (g + 2g⁵)/3 with g = exp(−((λ−λ₀)/Δ)²) has FWHM = 0.92182·Δ [derived: g + 2g⁵ = 3/2
  at half maximum]; the stated (or typical) FWHM is converted to Δ so that the model's FWHM
  is the stated one;
* low-pressure mercury: discrete :class:`~uvcheck.spectrum.Line` objects, strengths relative
  to 253.7 nm (from memory);
* KrCl* excimer: a 222 nm band with a long-wavelength skirt, plus (unfiltered) a Cl₂* band
  near 258 nm and a weak continuum (from memory);
* white LED: blue pump and phosphor bands, colour-science's ``sd_multi_leds_Ohno2005``;
* blackbody: Planck's law with h, c, k from scipy.constants (CODATA, exact since 2019).

Only numpy is imported at module level; colour-science and scipy load inside the functions.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Any, Mapping

import numpy as np

from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError
from uvcheck.spectrum import Line, Spectrum, integrate, scaled, total_integral

#: The range a nominal model represents. [nm]
NOMINAL_RANGE_NM = (180.0, 3000.0)
#: The label every nominal spectrum carries.
ESTIMATE_LABEL = ("ESTIMATE from the listing's stated data (nominal model), not a measurement; "
                  "screening only")
#: UV-C band used to normalise lamps whose efficiency is given as UV-C per electrical watt. [nm]
UVC_NM = (200.0, 280.0)  # uvcheck.bands: UV-C from 200 nm, the practical edge in air
#: Cases of an estimate, in order.
CASES = ("min", "typical", "max")

#: FWHM of the Ohno (2005) shape in units of its half spectral width Δ. [-]
#: Derived: at half maximum (g + 2g⁵)/3 = 1/2, g = 0.808609…, FWHM = 2Δ·√(−ln g).
OHNO_FWHM_PER_WIDTH = 0.9218231196498202


def _led_data() -> dict[str, Any]:
    return read_toml("emitters/led_packages.toml")


def _lamp_data() -> dict[str, Any]:
    return read_toml("emitters/lamp_models.toml")


def _tech_data() -> dict[str, Any]:
    return read_toml("technologies.toml")


def _meta(model: str, params: dict[str, Any], sources: list[str]) -> dict[str, Any]:
    return {"origin": "nominal", "estimate": True, "label": ESTIMATE_LABEL, "model": model,
            "parameters": params, "sources": list(sources)}


def _shape(wl: np.ndarray, v: np.ndarray, meta: dict[str, Any],
           lines: tuple[Line, ...] = ()) -> Spectrum:
    """A relative spectrum over the nominal range, normalised to a total of 1."""
    s = Spectrum(wl, v, "relative", lines=lines, covered_nm=NOMINAL_RANGE_NM, meta=meta)
    tot = total_integral(s)
    if not tot > 0:
        raise ConfigurationError("the model spectrum has no output")  # pragma: no cover
    return scaled(s, 1.0 / tot)


def _grid(lo: float, hi: float, step: float) -> np.ndarray:
    lo = max(NOMINAL_RANGE_NM[0], math.floor(lo / step) * step)
    hi = min(NOMINAL_RANGE_NM[1], math.ceil(hi / step) * step)
    n = int(round((hi - lo) / step)) + 1
    return np.round(lo + step * np.arange(n), 9)


# ---------------------------------------------------------------------------------------------
# Model shapes
# ---------------------------------------------------------------------------------------------

def typical_led_fwhm_nm(peak_nm: float) -> tuple[float, str]:
    """Typical FWHM of a single-die LED peaking at ``peak_nm``, and its source. [nm]

    Examples
    --------
    >>> typical_led_fwhm_nm(275.0)[0]
    11.0
    """
    d = _led_data()["fwhm"]
    for b in d["bands"]:
        if b["lo_nm"] <= peak_nm < b["hi_nm"]:
            return float(b["fwhm_nm"]), f"{d['source']} ({b['what']})"
    raise ConfigurationError(f"no typical LED width for a peak at {peak_nm:g} nm",
                             todo="state the band width in the listing (lamp.fwhm)")


def ohno_width_for_fwhm(fwhm_nm: float) -> float:
    """The half spectral width Δ of colour-science's Ohno (2005) LED model for a FWHM. [nm]

    Examples
    --------
    >>> round(ohno_width_for_fwhm(11.0), 3)
    11.933
    """
    return fwhm_nm / OHNO_FWHM_PER_WIDTH


def _colour_led() -> tuple[Any, Any]:
    """colour-science's SpectralShape and sd_single_led_Ohno2005, imported with numpy's print
    options kept: importing colour sets them to numpy 1.13's (``legacy="1.13"``) for the
    whole process, which changes every repr of a numpy number after it (matplotlib hashes
    such reprs into the SVG ids of the notes' figures, so a note would depend on what the
    process had done before)."""
    opts = np.get_printoptions()
    try:
        from colour import SpectralShape
        from colour.colorimetry import sd_single_led_Ohno2005
    finally:
        np.set_printoptions(**opts)
    return SpectralShape, sd_single_led_Ohno2005


def led_shape(peak_nm: float, fwhm_nm: float | None = None) -> Spectrum:
    """Relative spectrum of a single-colour LED (Ohno 2005 model), total 1. [relative]

    peak_nm : peak wavelength. [nm]
    fwhm_nm : full width at half maximum; None = typical for the band
        (``data/emitters/led_packages.toml``). [nm]

    Examples
    --------
    >>> s = led_shape(395.0, 12.0)
    >>> float(s.wavelength_nm[np.argmax(s.values)])
    395.0
    """
    SpectralShape, sd_single_led_Ohno2005 = _colour_led()

    sources = ["colour-science sd_single_led_Ohno2005 (Ohno 2005)"]
    if fwhm_nm is None:
        fwhm_nm, src = typical_led_fwhm_nm(peak_nm)
        sources.append(f"typical FWHM: {src}")
    else:
        sources.append("FWHM as stated")
    if not (fwhm_nm > 0 and NOMINAL_RANGE_NM[0] < peak_nm < NOMINAL_RANGE_NM[1]):
        raise ConfigurationError(f"cannot model an LED at {peak_nm:g} nm, FWHM {fwhm_nm:g} nm")
    width = ohno_width_for_fwhm(fwhm_nm)
    step = min(0.5, fwhm_nm / 20.0)
    # a grid symmetric about the peak (the peak is a sample), ±6 FWHM, inside the model range
    n_lo = min(int(math.ceil(6 * fwhm_nm / step)),
               int(math.floor((peak_nm - NOMINAL_RANGE_NM[0]) / step)))
    n_hi = min(int(math.ceil(6 * fwhm_nm / step)),
               int(math.floor((NOMINAL_RANGE_NM[1] - peak_nm) / step)))
    sd = sd_single_led_Ohno2005(peak_nm, width, shape=SpectralShape(
        peak_nm - n_lo * step, peak_nm + n_hi * step, step))
    wl, v = np.asarray(sd.wavelengths, dtype=float), np.asarray(sd.values, dtype=float)
    meta = _meta("single LED (Ohno 2005)", {"peak_nm": peak_nm, "fwhm_nm": fwhm_nm,
                                             "half_spectral_width_nm": width}, sources)
    return _shape(wl, v, meta)


def mercury_lp_shape(envelope: str = "ozone-free") -> Spectrum:
    """Relative line spectrum of a low-pressure mercury lamp, total 1. [relative]

    envelope : ``ozone-free`` (the 184.9 nm line is absorbed by the envelope) or
        ``ozone-producing`` (clear fused silica: the 184.9 nm line leaves the lamp).

    Line wavelengths and relative strengths: ``data/emitters/lamp_models.toml`` [lp_mercury]
    (strengths from memory).

    Examples
    --------
    >>> s = mercury_lp_shape()
    >>> max(s.lines, key=lambda ln: ln.value).wavelength_nm
    253.7
    """
    if envelope not in ("ozone-free", "ozone-producing"):
        raise ConfigurationError(f"unknown envelope {envelope!r}; "
                                 "available: ozone-free, ozone-producing")
    d = _lamp_data()["lp_mercury"]
    lines = tuple(Line(float(x["nm"]), float(x["relative"])) for x in d["lines"]
                  if x.get("envelope", envelope) == envelope)
    meta = _meta("low-pressure mercury lines", {"envelope": envelope},
                 [d["source"]])
    wl = np.array(NOMINAL_RANGE_NM)
    return _shape(wl, np.zeros(2), meta, lines)


def krcl_excimer_shape(filtered: bool = False) -> Spectrum:
    """Relative spectrum of a KrCl* excimer lamp (222 nm), total 1. [relative]

    filtered : True for a lamp with a far-UVC filter (emission above the filter edge
        suppressed), False for the bare lamp with its long-wavelength side bands.

    Shape parameters: ``data/emitters/lamp_models.toml`` [krcl_excimer] (from memory, except
    the 222 nm centre).

    Examples
    --------
    >>> from uvcheck.spectrum import integrate
    >>> bare, filt = krcl_excimer_shape(False), krcl_excimer_shape(True)
    >>> integrate(bare, 240, 300).value > 10 * integrate(filt, 240, 300).value
    True
    """
    d = _lamp_data()["krcl_excimer"]
    wl = _grid(200.0, 330.0, 0.1)
    sig = d["main_fwhm_nm"] / (2 * math.sqrt(2 * math.log(2)))
    main = np.exp(-0.5 * ((wl - d["main_nm"]) / sig) ** 2)
    main /= np.trapezoid(main, wl)
    skirt = np.where(wl > d["main_nm"], np.exp(-(wl - d["main_nm"]) / d["skirt_decay_nm"]), 0.0)
    skirt *= np.clip((wl - d["main_nm"]) / 2.0, 0.0, 1.0)  # rises over 2 nm: no step at the peak
    skirt /= np.trapezoid(skirt, wl)
    sig2 = d["cl2_fwhm_nm"] / (2 * math.sqrt(2 * math.log(2)))
    cl2 = np.exp(-0.5 * ((wl - d["cl2_nm"]) / sig2) ** 2)
    cl2 /= np.trapezoid(cl2, wl)
    c_lo, c_hi = d["continuum_nm"]
    cont = np.where((wl >= c_lo) & (wl <= c_hi), 1.0, 0.0)
    cont /= np.trapezoid(cont, wl)
    s_cl2, s_cont, s_skirt = (d["cl2_share_unfiltered"], d["continuum_share_unfiltered"],
                              d["skirt_share"])
    v = ((1 - s_cl2 - s_cont - s_skirt) * main + s_skirt * skirt + s_cl2 * cl2
         + s_cont * cont)
    params: dict[str, Any] = {"main_nm": d["main_nm"], "main_fwhm_nm": d["main_fwhm_nm"],
                              "filtered": filtered}
    sources = [d["source"]]
    if filtered:
        v = np.where(wl > d["filter_edge_nm"], v * d["filter_suppression"], v)
        params.update(filter_edge_nm=d["filter_edge_nm"],
                      filter_suppression=d["filter_suppression"])
        sources.append(d["filter_source"])
    return _shape(wl, v, _meta("KrCl* excimer " + ("filtered" if filtered else "unfiltered"),
                               params, sources))


def white_led_shape(tone: str = "cool") -> Spectrum:
    """Relative spectrum of a phosphor-converted white LED, total 1. [relative]

    tone : ``cool`` or ``warm`` (parameters in ``data/emitters/lamp_models.toml``
        [white_led.*], from memory).

    Blue pump and phosphor bands each take the Ohno (2005) LED shape (colour-science's
    ``sd_single_led_Ohno2005``), summed with peak-power ratios equal to the power shares
    divided by each band's width Δ (the area of an Ohno band is proportional to Δ). This is
    the sum ``sd_multi_leds_Ohno2005`` forms; it is done here because colour-science 0.4.7
    builds the components of ``sd_multi_leds_Ohno2005`` on its default 360–780 nm shape
    whatever ``shape`` is given (observed), which leaves the far phosphor tail undefined.

    Examples
    --------
    >>> from uvcheck.spectrum import integrate
    >>> integrate(white_led_shape("cool"), 180, 400).value < 0.02   # share below 400 nm
    True
    """
    SpectralShape, sd_single_led_Ohno2005 = _colour_led()

    presets = _lamp_data()["white_led"]
    if tone not in presets:
        raise ConfigurationError(f"unknown white LED tone {tone!r}; "
                                 f"available: {', '.join(presets)}")
    d = presets[tone]
    w_b = ohno_width_for_fwhm(d["blue_fwhm_nm"])
    w_p = ohno_width_for_fwhm(d["phosphor_fwhm_nm"])
    shares = (d["blue_share"], 1.0 - d["blue_share"])
    wl = _grid(d["blue_nm"] - 6 * d["blue_fwhm_nm"], d["phosphor_nm"] + 6 * d["phosphor_fwhm_nm"],
               1.0)
    shape = SpectralShape(float(wl[0]), float(wl[-1]), 1.0)
    v = np.zeros_like(wl)
    for peak, width, share in ((d["blue_nm"], w_b, shares[0]), (d["phosphor_nm"], w_p, shares[1])):
        sd = sd_single_led_Ohno2005(peak, width, shape=shape)
        v += np.interp(wl, sd.wavelengths, sd.values) * share / width
    meta = _meta(f"white LED ({tone})", {k: d[k] for k in d if k != "source"},
                 ["colour-science sd_single_led_Ohno2005 (Ohno 2005), two bands", d["source"]])
    return _shape(wl, v, meta)


def planck_exitance(wavelength_nm: np.ndarray, temperature_K: float) -> np.ndarray:
    """Spectral radiant exitance of a blackbody, M(λ, T) = 2πhc²/λ⁵ / (e^(hc/λkT) − 1). [W m⁻² nm⁻¹]

    wavelength_nm : wavelengths. [nm]
    temperature_K : temperature. [K]

    h, c, k from scipy.constants (CODATA; exact since the 2019 SI).

    Examples
    --------
    >>> lam = np.linspace(100.0, 1e6, 2_000_001)        # Stefan–Boltzmann check at 3000 K
    >>> from scipy.constants import sigma
    >>> round(float(np.trapezoid(planck_exitance(lam, 3000.0), lam) / (sigma * 3000.0**4)), 3)
    1.0
    """
    from scipy import constants as sc

    lam = np.asarray(wavelength_nm, dtype=float) * 1e-9
    x = sc.h * sc.c / (lam * sc.k * temperature_K)
    with np.errstate(over="ignore"):
        m = 2 * math.pi * sc.h * sc.c ** 2 / lam ** 5 / np.expm1(x)
    return m * 1e-9


def blackbody_shape(temperature_K: float) -> Spectrum:
    """Relative blackbody spectrum over 180–3000 nm, total 1. [relative]

    temperature_K : temperature. [K]

    Examples
    --------
    >>> s = blackbody_shape(5000.0)
    >>> 570 < float(s.wavelength_nm[np.argmax(s.values)]) < 590   # Wien: 2.898e6 nm K / 5000 K
    True
    """
    if not temperature_K > 0:
        raise ConfigurationError(f"temperature must be positive, got {temperature_K}")
    wl = _grid(*NOMINAL_RANGE_NM, 1.0)
    meta = _meta("blackbody (Planck)", {"temperature_K": temperature_K},
                 ["Planck's law; h, c, k from scipy.constants"])
    return _shape(wl, planck_exitance(wl, temperature_K), meta)


def blackbody_share_in_range(temperature_K: float) -> float:
    """Share of a blackbody's total exitance σT⁴ that falls in 180–3000 nm. [-]

    Examples
    --------
    >>> 0.3 < blackbody_share_in_range(2800.0) < 0.9
    True
    """
    from scipy import constants as sc

    wl = _grid(*NOMINAL_RANGE_NM, 0.5)
    return float(np.trapezoid(planck_exitance(wl, temperature_K), wl)
                 / (sc.sigma * temperature_K ** 4))


# ---------------------------------------------------------------------------------------------
# Power and cover
# ---------------------------------------------------------------------------------------------

def with_power(shape: Spectrum, power_W: float, band_nm: tuple[float, float] | None = None,
               note: str | None = None) -> Spectrum:
    """A nominal shape scaled to a radiant flux: ∫ over ``band_nm`` (or the total) = power. [W nm⁻¹]

    shape : a relative nominal spectrum.
    power_W : the optical power in the band. [W]
    band_nm : band the power refers to (e.g. UV-C 200–280 nm); None = the whole output. [nm]

    Examples
    --------
    >>> s = with_power(led_shape(275.0), 0.05)
    >>> round(total_integral(s), 12)
    0.05
    """
    if not (math.isfinite(power_W) and power_W > 0):
        raise ConfigurationError(f"optical power must be positive, got {power_W}")
    ref = total_integral(shape) if band_nm is None else integrate(shape, *band_nm).value
    if not ref > 0:
        raise ConfigurationError(
            f"the model emits nothing in {band_nm[0]:g}–{band_nm[1]:g} nm"  # type: ignore[index]
            " to scale to")
    return scaled(shape, power_W / ref, "flux",
                  note={"method": "nominal power", "power_W": power_W,
                        "band_nm": None if band_nm is None else list(band_nm),
                        "note": note or ESTIMATE_LABEL})


def _cover_entry(cover: str) -> dict[str, Any]:
    covers = _lamp_data()["covers"]
    if cover not in covers:
        raise ConfigurationError(f"unknown cover material {cover!r}; available: "
                                 f"{', '.join(covers)}")
    return covers[cover]


def cover_transmittance(cover: str, wavelength_nm: Any, case: str = "typical") -> Any:
    """Transmittance of a cover material (step model at its cut-on wavelength). [-]

    cover : key of ``data/emitters/lamp_models.toml`` [covers].
    wavelength_nm : wavelength(s). [nm]
    case : ``min`` | ``typical`` | ``max``.

    Examples
    --------
    >>> cover_transmittance("soda_lime", 254.0, "max") < 0.01
    True
    """
    if case not in CASES:
        raise ConfigurationError(f"unknown case {case!r}; available: {', '.join(CASES)}")
    c = _cover_entry(cover)
    lam = np.asarray(wavelength_nm, dtype=float)
    t = np.where(lam < c["cut_on_nm"], c["t_below"][case], c["t_above"][case])
    return float(t) if np.ndim(t) == 0 else t


def through_cover(spectrum: Spectrum, cover: str, case: str = "typical") -> Spectrum:
    """The spectrum after a cover of the given material (lines and samples). [same unit]"""
    wl = spectrum.wavelength_nm
    v = spectrum.values * cover_transmittance(cover, wl, case) if wl.size else spectrum.values
    lines = tuple(Line(ln.wavelength_nm, ln.value * cover_transmittance(cover, ln.wavelength_nm,
                                                                         case))
                  for ln in spectrum.lines)
    meta = dict(spectrum.meta)
    meta["cover"] = {"material": cover, "case": case, "source": _cover_entry(cover)["source"]}
    return spectrum.derive(values=v, lines=lines, meta=MappingProxyType(meta))


# ---------------------------------------------------------------------------------------------
# From a listing
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class PowerRange:
    """Optical power of a nominal estimate: min / typical / max.

    min_W, typical_W, max_W : optical power in ``band``. [W]
    band : ``total`` (the whole output) or a band name (``UV-C``).
    band_nm : edges of ``band``, None for ``total``. [nm]
    basis : ``stated optical power`` | ``electrical power × efficiency``.
    efficiency : the efficiency range used (fractions), None for a stated power. [-]
    source : where the efficiency (or the power) came from.
    """

    min_W: float
    typical_W: float
    max_W: float
    band: str
    band_nm: tuple[float, float] | None
    basis: str
    efficiency: Mapping[str, float] | None
    source: str

    def value(self, case: str) -> float:
        return {"min": self.min_W, "typical": self.typical_W, "max": self.max_W}[case]

    def to_dict(self) -> dict[str, Any]:
        return {"min_W": self.min_W, "typical_W": self.typical_W, "max_W": self.max_W,
                "band": self.band, "band_nm": None if self.band_nm is None else list(self.band_nm),
                "basis": self.basis,
                "efficiency": None if self.efficiency is None else dict(self.efficiency),
                "source": self.source}


@dataclass(frozen=True)
class NominalEstimate:
    """Nominal spectra for one reading of a listing (an ESTIMATE).

    reading : ``as-stated`` (the seller's technology and wavelength) or
        ``electrical-evidence`` (what the stated LED voltages allow), or a caller's name.
    technology : key of ``data/technologies.toml`` (or ``incandescent``).
    model : the model shape used.
    peak_nm, fwhm_nm : peak and width of the model (None for line and thermal sources). [nm]
    power : the optical power range, None when neither an optical nor an electrical power
        is stated (then only the relative ``shape`` exists).
    cover : cover material applied (None = none applied).
    spectra : ``min`` / ``typical`` / ``max`` flux spectra [W nm⁻¹], or ``shape`` (relative).
    assumptions : every choice made on the listing's behalf, in words.
    """

    reading: str
    technology: str
    model: str
    peak_nm: float | None
    fwhm_nm: float | None
    power: PowerRange | None
    cover: str | None
    spectra: Mapping[str, Spectrum]
    assumptions: tuple[str, ...]
    sources: tuple[str, ...]
    label: str = ESTIMATE_LABEL
    emitter: str = "point"
    tube_length_m: float | None = None
    source_size_m: float | None = None
    notes: tuple[str, ...] = field(default=())

    @property
    def is_absolute(self) -> bool:
        return self.power is not None

    def spectrum(self, case: str = "typical") -> Spectrum:
        """The nominal flux spectrum for ``case`` (or the relative shape if no power is known)."""
        if self.power is None:
            return self.spectra["shape"]
        if case not in self.spectra:
            raise ConfigurationError(f"unknown case {case!r}; available: {', '.join(self.spectra)}")
        return self.spectra[case]

    def to_dict(self) -> dict[str, Any]:
        out: dict[str, Any] = {}
        for case, s in self.spectra.items():
            out[case] = {
                "quantity": s.quantity,
                "total": total_integral(s),
                "uvc": integrate(s, *UVC_NM).value,
                "far_uvc": integrate(s, 200.0, 235.0).value,
                "uvb": integrate(s, 280.0, 315.0).value,
                "uva": integrate(s, 315.0, 400.0).value,
                "unit": "W" if s.quantity == "flux" else "relative",
            }
        return {"reading": self.reading, "technology": self.technology, "model": self.model,
                "label": self.label, "peak_nm": self.peak_nm, "fwhm_nm": self.fwhm_nm,
                "power": None if self.power is None else self.power.to_dict(),
                "cover": self.cover, "covered_nm": list(NOMINAL_RANGE_NM),
                "emitter": self.emitter, "tube_length_m": self.tube_length_m,
                "source_size_m": self.source_size_m, "cases": out,
                "assumptions": list(self.assumptions), "sources": list(self.sources)}


def default_emitter(technology: str, tube_length_m: float | None = None) -> str:
    """Geometry model for a technology when the listing names none.

    LEDs and excimer panels radiate into a half-space (``lambertian``); a mercury tube with a
    known length is a ``tube``; everything else a ``point``. Common practice.
    """
    fam = _tech_data().get(technology, {}).get("family")
    if fam == "led" or technology == "krcl_excimer":
        return "lambertian"
    if technology in ("lp_mercury", "medium_pressure_mercury") and tube_length_m is not None:
        return "tube"
    return "point"


    from uvcheck.io.listing import ozone_statement

    return ozone_statement(ev.listing.claims, besides=c)
def _shape_for(technology: str, peak_nm: float | None, fwhm_nm: float | None,
               listing: Any, assumptions: list[str]) -> tuple[Spectrum, float | None, float | None]:
    tech = _tech_data().get(technology)
    if technology == "incandescent":
        t = listing.colour_temperature_K
        if t is None:
            t = float(_lamp_data()["incandescent"]["temperature_K"])
            assumptions.append(f"filament temperature not stated: {t:g} K assumed "
                               f"({_lamp_data()['incandescent']['temperature_source']})")
        assumptions.append("filament taken as a blackbody (tungsten is a selective grey body)")
        return blackbody_shape(t), None, None
    if tech is None:
        raise ConfigurationError(f"no nominal model for technology {technology!r}",
                                 todo="name a technology of data/technologies.toml")
    if technology == "lp_mercury":
        from uvcheck.io.listing import ozone_statement

        own = ozone_statement(getattr(listing, "claims", None))
        said = own.text if own is not None else None
        if said is not None:
            assumptions.append(f"the listing says the lamp makes ozone or emits 185 nm "
                               f"({said!r}): modelled with an ozone-producing (clear "
                               "fused-silica) envelope, which lets the 184.9 nm line out")
            shape = mercury_lp_shape("ozone-producing")
            meta = dict(shape.meta)
            meta["parameters"] = {**meta.get("parameters", {}),
                                  "envelope_from_listing": said}
            return shape.derive(meta=meta), 253.7, None
        assumptions.append("mercury lamp with an ozone-free envelope assumed: the 184.9 nm line "
                           "is not modelled (ozone cannot be judged from this estimate)")
        return mercury_lp_shape("ozone-free"), 253.7, None
    if technology == "krcl_excimer":
        filtered = bool(listing.filtered) if listing.filtered is not None else False
        if listing.filtered is None:
            assumptions.append("far-UVC filter not stated: the bare (unfiltered) lamp is "
                               "modelled, with its side bands above 235 nm")
        return krcl_excimer_shape(filtered), 222.0, None
    if technology == "white_led":
        tone = "warm" if (listing.colour_temperature_K or 6000.0) < 4500.0 else "cool"
        if listing.colour_temperature_K is None:
            assumptions.append("white LED colour temperature not stated: cool white assumed")
        return white_led_shape(tone), None, None
    if tech.get("family") != "led":
        raise ConfigurationError(f"no nominal model for technology {technology!r}",
                                 todo="give a measured spectrum for this lamp")
    lo, hi = tech["peak_window_nm"]
    if peak_nm is None or not lo <= peak_nm <= hi:
        if technology == "uvc_led":
            d = _led_data()["uvc_led_wavelength"]
            new_peak, why = float(d["typical_peak_nm"]), d["typical_peak_source"]
        else:
            new_peak, why = (lo + hi) / 2.0, "middle of the technology's peak window (ours)"
        if peak_nm is None:
            assumptions.append(f"no wavelength stated: {new_peak:g} nm assumed ({why})")
        else:
            assumptions.append(f"stated {peak_nm:g} nm is outside the {tech['name']} window "
                               f"{lo:g}–{hi:g} nm: {new_peak:g} nm used ({why})")
        peak_nm = new_peak
    if fwhm_nm is None:
        fwhm_nm, src = typical_led_fwhm_nm(peak_nm)
        assumptions.append(f"band width not stated: typical FWHM {fwhm_nm:g} nm ({src})")
    return led_shape(peak_nm, fwhm_nm), peak_nm, fwhm_nm


def optical_power_range(listing: Any, technology: str, basis: str = "auto",
                        assumptions: list[str] | None = None) -> PowerRange | None:
    """The optical power a listing supports for a technology: min / typical / max. [W]

    listing : a :class:`~uvcheck.io.listing.Listing`.
    technology : key of ``data/technologies.toml`` (or ``incandescent``).
    basis : ``auto`` (the stated optical power if there is one, else the electrical power ×
        efficiency), ``stated`` or ``electrical``.

    Returns None when the basis has no data (no stated optical and no electrical power).
    Efficiency ranges: ``wall_plug_efficiency`` (all optical output) where the technology has
    one, else ``uvc_efficiency`` (UV-C output, 200–280 nm), from data/technologies.toml.
    """
    notes = assumptions if assumptions is not None else []
    if basis not in ("auto", "stated", "electrical"):
        raise ConfigurationError(f"unknown power basis {basis!r}; "
                                 "available: auto, stated, electrical")
    if basis in ("auto", "stated") and listing.optical_power_W is not None:
        band = listing.optical_power_band or "total"
        if listing.optical_power_band is None:
            notes.append("the stated optical power is taken as the whole optical output "
                         "(the listing does not say which band)")
        from uvcheck.io.listing import BANDS_NM

        p = float(listing.optical_power_W)
        return PowerRange(p, p, p, band, None if band == "total" else BANDS_NM[band],
                          "stated optical power", None, "the listing (lamp.optical_power)")
    if basis == "stated":
        return None
    if listing.electrical_power_W is None:
        return None
    pel = float(listing.electrical_power_W)
    if technology == "incandescent":
        d = _lamp_data()["incandescent"]
        t = listing.colour_temperature_K or float(d["temperature_K"])
        share = blackbody_share_in_range(t)
        eff = {k: float(v) * share for k, v in d["radiant_efficiency"].items()}
        notes.append(f"radiant efficiency × the blackbody share in 180–3000 nm at {t:g} K "
                     f"({share:.2f}, Planck)")
        return PowerRange(pel * eff["min"], pel * eff["typical"], pel * eff["max"], "total", None,
                          "electrical power × efficiency", MappingProxyType(eff),
                          d["radiant_efficiency_source"])
    tech = _tech_data()[technology]
    if "wall_plug_efficiency" in tech:
        eff = {k: float(v) for k, v in tech["wall_plug_efficiency"].items()}
        band, band_nm, src = "total", None, tech["wall_plug_efficiency_source"]
    else:
        eff = {k: float(v) for k, v in tech["uvc_efficiency"].items()}
        band, band_nm, src = "UV-C", UVC_NM, tech["uvc_efficiency_source"]
    return PowerRange(pel * eff["min"], pel * eff["typical"], pel * eff["max"], band, band_nm,
                      "electrical power × efficiency", MappingProxyType(eff),
                      f"data/technologies.toml [{technology}]: {src}")


def claim_wavelength_hint(listing: Any) -> str | None:
    """Where a listing with no lamp wavelength names one in a claim, that hint, else None:
    the wavelength of a claim is the claim under test, not lamp data, so the tester decides
    whether the listing states it as the lamp's data."""
    said = [c for c in listing.claims if getattr(c, "wavelength_nm", None)]
    if not said:
        return None
    return (f"claim {said[0].id} names {said[0].wavelength_nm:g} nm: if the listing states it "
            "as the lamp's data, put it in lamp.peak_wavelength")


def nominal_from_listing(listing: Any, *, technology: str | None = None,
                         peak_nm: float | None = None, reading: str = "as-stated",
                         power_basis: str = "auto") -> NominalEstimate:
    """Nominal spectra (min / typical / max) for a listing: an ESTIMATE.

    listing : a :class:`~uvcheck.io.listing.Listing`.
    technology : override the technology (default: stated, else inferred from the listing
        by :func:`uvcheck.plausibility.infer_technology`).
    peak_nm : override the peak wavelength (default: stated, else typical). [nm]
    reading : name of this reading, kept in the result and the spectra's meta.
    power_basis : see :func:`optical_power_range`.

    A cover material is applied (min / typical / max transmittance) when the power comes from
    electrical power × efficiency, i.e. at the emitter. A stated optical power is taken as
    what leaves the product, without the cover (the benefit of the doubt for efficacy); the
    cover check in :mod:`uvcheck.plausibility` reports the cover separately.
    """
    from uvcheck.plausibility import infer_technology

    assumptions: list[str] = []
    if technology is None:
        technology, why = infer_technology(listing)
        if technology is None:
            from uvcheck.errors import UnmodelledListingError

            hint = claim_wavelength_hint(listing)
            raise UnmodelledListingError("the listing says too little to model the lamp",
                                         todo="state lamp.technology or lamp.peak_wavelength"
                                         + (f" ({hint})" if hint else ""))
        if listing.technology is None:
            assumptions.append(f"technology inferred: {why}")
    if peak_nm is None:
        peak_nm = listing.peak_wavelength_nm
    shape, peak, fwhm = _shape_for(technology, peak_nm, listing.fwhm_nm, listing, assumptions)
    power = optical_power_range(listing, technology, power_basis, assumptions)
    sources = list(shape.meta.get("sources", []))
    if power is not None:
        sources.append(power.source)
    cover = listing.cover if listing.cover not in (None, "none") else None
    apply_cover = cover is not None and power is not None and power.basis != "stated optical power"
    if cover is not None and not apply_cover:
        assumptions.append(f"cover ({listing.cover_text or cover}) not applied to a stated "
                           "optical power: it is taken as what leaves the product")
    spectra: dict[str, Spectrum] = {}

    def tag(s: Spectrum, case: str) -> Spectrum:
        meta = dict(s.meta)
        meta.update(reading=reading, case=case, technology=technology,
                    listing=listing.name, assumptions=list(assumptions))
        return s.derive(meta=MappingProxyType(meta))

    if power is None:
        assumptions.append("no optical or electrical power stated: shape only (relative)")
        spectra["shape"] = tag(shape, "shape")
    else:
        for case in CASES:
            s = with_power(shape, power.value(case), power.band_nm)
            if apply_cover:
                s = through_cover(s, cover, case)  # type: ignore[arg-type]
            spectra[case] = tag(s, case)
        if apply_cover:
            sources.append(_cover_entry(cover)["source"])  # type: ignore[arg-type]
    emitter = listing.emitter or default_emitter(technology, listing.tube_length_m)
    if listing.emitter is None:
        assumptions.append(f"emission pattern not stated: {emitter} model assumed "
                           "(common practice for this technology)")
    return NominalEstimate(reading=reading, technology=technology,
                           model=str(shape.meta.get("model")), peak_nm=peak, fwhm_nm=fwhm,
                           power=power, cover=cover if apply_cover else None,
                           spectra=MappingProxyType(spectra), assumptions=tuple(assumptions),
                           sources=tuple(dict.fromkeys(sources)), emitter=emitter,
                           tube_length_m=listing.tube_length_m,
                           source_size_m=listing.source_size_m)


def listing_readings(listing: Any) -> tuple[NominalEstimate, ...]:
    """The readings of a listing worth evaluating: as stated, and what the LED voltages allow.

    The first is always ``as-stated``. When the listing gives a per-die LED voltage that
    cannot make the stated wavelength (:func:`uvcheck.plausibility.check_die_voltage` says
    ``cannot-hold``), a second ``electrical-evidence`` reading models the shortest-wavelength
    LED technology whose forward-voltage range holds that voltage, at the shortest wavelength
    of its window that the voltage allows (the most favourable reading for efficacy).
    """
    from uvcheck import plausibility as pl

    stated = nominal_from_listing(listing, reading="as-stated")
    out = [stated]
    v = pl.per_die_voltage(listing.leds)
    lam = listing.peak_wavelength_nm or (listing.band_nm[1] if listing.band_nm else None)
    if v.available is not None and lam is not None:
        f = pl.check_die_voltage(lam, v.available.value)
        if f.status == "cannot-hold":
            tech, peak = pl.evidence_led(v.available.value)
            out.append(nominal_from_listing(listing, technology=tech, peak_nm=peak,
                                            reading="electrical-evidence"))
    return tuple(out)


def irradiance_at(spectrum: Spectrum, distance_m: float, emitter: str = "point",
                  tube_length_m: float | None = None,
                  source_size_m: float | None = None) -> Spectrum:
    """The irradiance spectrum at ``distance_m`` from a nominal flux spectrum. [W m⁻² nm⁻¹]

    spectrum : a flux spectrum (``quantity='flux'``). [W nm⁻¹]
    distance_m : distance on the axis (for a tube: on its perpendicular bisector). [m]
    emitter : ``point`` | ``lambertian`` | ``tube`` (see :mod:`uvcheck.geometry`).

    Examples
    --------
    >>> s = irradiance_at(with_power(led_shape(275.0), 0.010), 0.1, "point")
    >>> round(total_integral(s) * 100, 2)      # 10 mW at 10 cm, in µW/cm² (NOTES.md C12)
    7.96
    """
    from uvcheck.geometry import irradiance_per_watt

    if spectrum.quantity != "flux":
        raise ConfigurationError(f"irradiance needs a flux spectrum, got {spectrum.quantity}",
                                 todo="scale the nominal shape to a power first")
    k = float(irradiance_per_watt(distance_m, emitter, tube_length_m, source_size_m))
    return scaled(spectrum, k, "irradiance",
                  note={"method": "geometry", "emitter": emitter, "distance_m": distance_m,
                        "tube_length_m": tube_length_m, "source_size_m": source_size_m,
                        "note": f"nominal flux moved to {distance_m:g} m with the {emitter} "
                                "model (uvcheck.geometry); an estimate"})
