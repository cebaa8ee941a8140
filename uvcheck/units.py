"""Units at the edge: parse what users and instruments write, convert once to SI.

Inside uvcheck everything is SI with wavelength in nm: W, m, s, J m⁻², W m⁻² nm⁻¹.
This module turns texts such as ``"30 min"``, ``"5 µW/cm²"``, ``"uW/cm^2/nm"``,
``"W m-2 nm-1"``, ``"W/(m²·nm)"`` or ``"irradiance_W_m2_nm"`` into a scale factor and a
dimension, and formats SI values in the trade units (µW/cm², mJ/cm²).

The parser is dimensional, not a list of spellings: a unit text is split into factors
(prefix + symbol, optional exponent), ``/`` and parenthesised denominators flip the sign of
the exponent, and the result is a dimension vector over a few base symbols plus a scale to
SI. A spectral irradiance is anything that reduces to W m⁻³ (power per area per wavelength);
its factor to W m⁻² nm⁻¹ is the SI factor × 1e-9.

Only the standard library is used here, so the command line can import it cheaply.
"""

from __future__ import annotations

import functools
import math
import re
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any

from uvcheck.errors import UnitError


def _remembered(default_place: str) -> Any:
    """Remember a unit parser's answer per text, as it depends on the text alone: the parsed
    unit (immutable), or the error's what and todo, raised again with the caller's place
    (``where``, else ``default_place``, as the parser itself names it). Readers ask for the
    same few unit texts for every file of a batch."""

    def decorate(fn: Any) -> Any:
        memo: dict[str, tuple[bool, Any]] = {}

        @functools.wraps(fn)
        def parse(text: str, where: str | None = None) -> Any:
            hit = memo.get(text) if type(text) is str else None
            if hit is None:
                try:
                    hit = (True, fn(text, where))
                except UnitError as exc:
                    if exc.where != (where or default_place) or len(memo) >= 4096:
                        raise
                    memo[text] = (False, (exc.what, exc.todo))
                    raise
                if len(memo) < 4096 and type(text) is str:
                    memo[text] = hit
                return hit[1]
            if hit[0]:
                return hit[1]
            what, todo = hit[1]
            raise UnitError(what, where or default_place, todo)

        return parse

    return decorate

# ---------------------------------------------------------------------------------------------
# Text normalisation
# ---------------------------------------------------------------------------------------------

_SUPERSCRIPTS = str.maketrans({"⁰": "0", "¹": "1", "²": "2", "³": "3", "⁴": "4", "⁵": "5",
                               "⁶": "6", "⁷": "7", "⁸": "8", "⁹": "9", "⁻": "-", "⁺": "+"})


#: Unit characters of CJK fonts (the U+3380 block) as listings and exports use them, with
#: their spelling.
UNIT_CHARACTERS = str.maketrans({"\u33a1": "m²", "\u33a5": "m³", "\u339d": "cm", "\u339c": "mm",
                                 "\u339a": "nm", "\u33a0": "cm²", "\u33a4": "cm³",
                                 "\u33bd": "mW", "\u33be": "kW", "\u33b3": "ms"})


def normalise_unit_text(text: str) -> str:
    """Fold the usual spellings of a unit text to plain ASCII.

    ``µ`` (micro sign) and ``μ`` (Greek mu) become ``u``; superscripts become digits;
    ``^``, ``**`` vanish; ``·``, ``⋅``, ``*``, ``×`` become spaces; ``per`` becomes ``/``.

    Examples
    --------
    >>> normalise_unit_text("µW·cm⁻²·nm⁻¹")
    'uW cm-2 nm-1'
    >>> normalise_unit_text("W/(m^2*nm)")
    'W/(m2 nm)'
    """
    s = text.strip().translate(UNIT_CHARACTERS).translate(_SUPERSCRIPTS)
    s = s.replace("\u00b5", "u").replace("\u03bc", "u").replace("\u00c2", "")
    s = s.replace("**", "").replace("^", "")
    for ch in ("\u00b7", "\u22c5", "*", "\u00d7", "\u2219", "\u2022"):
        s = s.replace(ch, " ")
    s = s.replace("\u2212", "-").replace("\u2013", "-")
    s = re.sub(r"(?i)\bper\b", "/", s)
    s = re.sub(r"(?<=[A-Za-z0-9])\.(?=[A-Za-z])", " ", s)  # "W.m-2.nm-1"
    s = re.sub(r"(?<=[A-Za-z])\.$", "", s)                  # "sq. ft."
    # areas and volumes as listings write them: "sq ft", "square metres", "sqm", "cu ft"
    s = _SQUARE_RE.sub(lambda m: _LENGTH_WORD.get(m.group(2).lower(), m.group(2)) + "2", s)
    s = _CUBIC_RE.sub(lambda m: _LENGTH_WORD.get(m.group(2).lower(), m.group(2)) + "3", s)
    s = re.sub(r"(?i)\bsqm\b", "m2", s)
    s = re.sub(r"(?<=[A-Za-z]\d)(?=[A-Za-z])", " ", s)     # "W/m2nm" -> "W/m2 nm"
    s = re.sub(r"\s+", " ", s)
    return s.strip()


#: Length words as listings write them, to their symbols (for "square feet" and the like).
_LENGTH_WORD = {"feet": "ft", "foot": "ft", "ft": "ft", "inch": "in", "inches": "in", "in": "in",
                "yard": "yd", "yards": "yd", "yd": "yd", "m": "m", "metre": "m", "metres": "m",
                "meter": "m", "meters": "m", "cm": "cm", "mm": "mm"}
_LENGTH_ALT = "|".join(sorted(_LENGTH_WORD, key=len, reverse=True))
_SQUARE_RE = re.compile(rf"(?i)\b(sq|square)\.?\s*({_LENGTH_ALT})\b")
_CUBIC_RE = re.compile(rf"(?i)\b(cu|cubic)\.?\s*({_LENGTH_ALT})\b")


# ---------------------------------------------------------------------------------------------
# Dimensional parser
# ---------------------------------------------------------------------------------------------

# Base symbols: W (power), m (length), sr (solid angle), s (time), J (energy), V (voltage),
# A (current), mol (amount), ph (photon count), lx (illuminance), lm (luminous flux), K, %.
# Every unit symbol maps to (scale to SI, {base: exponent}).
_SYMBOLS: dict[str, tuple[float, dict[str, int]]] = {
    "W": (1.0, {"W": 1}),
    "J": (1.0, {"W": 1, "s": 1}),
    "m": (1.0, {"m": 1}),
    "sr": (1.0, {"sr": 1}),
    "s": (1.0, {"s": 1}),
    "sec": (1.0, {"s": 1}),
    "min": (60.0, {"s": 1}),
    "h": (3600.0, {"s": 1}),
    "hr": (3600.0, {"s": 1}),
    "hrs": (3600.0, {"s": 1}),
    "hour": (3600.0, {"s": 1}),
    "hours": (3600.0, {"s": 1}),
    "d": (86400.0, {"s": 1}),
    "day": (86400.0, {"s": 1}),
    "days": (86400.0, {"s": 1}),
    "mins": (60.0, {"s": 1}),
    "minute": (60.0, {"s": 1}),
    "minutes": (60.0, {"s": 1}),
    "second": (1.0, {"s": 1}),
    "seconds": (1.0, {"s": 1}),
    "secs": (1.0, {"s": 1}),
    "V": (1.0, {"V": 1}),
    "A": (1.0, {"A": 1}),
    "mol": (1.0, {"mol": 1}),
    "photon": (1.0, {"ph": 1}),
    "photons": (1.0, {"ph": 1}),
    "ph": (1.0, {"ph": 1}),
    "lx": (1.0, {"lx": 1}),
    "lux": (1.0, {"lx": 1}),
    "lm": (1.0, {"lm": 1}),
    "K": (1.0, {"K": 1}),
    "g": (1e-3, {"kg": 1}),  # mass: never valid for uvcheck, but named in errors ("30 kg")
    "Hz": (1.0, {"s": -1}),
    "eV": (1.602176634e-19, {"W": 1, "s": 1}),  # SI exact (2019): 1 eV = e × 1 V
    "in": (0.0254, {"m": 1}),  # international inch, exact
    "inch": (0.0254, {"m": 1}),
    "inches": (0.0254, {"m": 1}),
    "ft": (0.3048, {"m": 1}),  # international foot, exact
    "feet": (0.3048, {"m": 1}),
    "foot": (0.3048, {"m": 1}),
    "yd": (0.9144, {"m": 1}),  # international yard, exact
    "yard": (0.9144, {"m": 1}),
    "yards": (0.9144, {"m": 1}),
    "L": (1e-3, {"m": 3}),
    "l": (1e-3, {"m": 3}),
}
# Symbols that take SI prefixes.
_PREFIXABLE = {"W", "J", "m", "s", "V", "A", "mol", "lx", "lm", "eV", "L", "sr", "g", "Hz"}
_PREFIXES = {"y": 1e-24, "z": 1e-21, "a": 1e-18, "f": 1e-15, "p": 1e-12, "n": 1e-9, "u": 1e-6,
             "m": 1e-3, "c": 1e-2, "d": 1e-1, "k": 1e3, "M": 1e6, "G": 1e9}
# Whole words accepted as a unit symbol.
_WORDS = {"metre": "m", "meter": "m", "metres": "m", "meters": "m", "watt": "W", "watts": "W",
          "joule": "J", "joules": "J", "nanometre": "nm", "nanometer": "nm",
          "nanometres": "nm", "nanometers": "nm", "micron": "um", "microns": "um",
          "steradian": "sr", "volt": "V", "volts": "V"}


@dataclass(frozen=True)
class ParsedUnit:
    """A unit text reduced to a scale to SI and a dimension vector.

    scale : multiply a number in this unit by ``scale`` to get it in SI base symbols. [-]
    dims : exponents of the base symbols (W, m, sr, s, ...). [-]
    text : the text as given.
    """

    scale: float
    dims: MappingProxyType
    text: str

    def dims_key(self) -> tuple[tuple[str, int], ...]:
        return tuple(sorted((k, v) for k, v in self.dims.items() if v))


def _factor(token: str, where: str) -> tuple[float, dict[str, int]]:
    """One factor such as ``cm2``, ``nm-1``, ``uW``, ``m^-2`` (already normalised)."""
    m = re.fullmatch(r"([A-Za-z%]+)(-?\+?\d+)?", token)
    if not m:
        raise UnitError(f"cannot read the unit factor {token!r}", where,
                        "write units like 'W/m2/nm', 'uW/cm^2/nm' or 'W m-2 nm-1'")
    sym, exp = m.group(1), int(m.group(2) or 1)
    sym = _WORDS.get(sym.lower(), sym) if sym.lower() in _WORDS else sym
    if sym in _SYMBOLS:
        scale, dims = _SYMBOLS[sym]
    elif len(sym) > 1 and sym[0] in _PREFIXES and sym[1:] in _SYMBOLS and sym[1:] in _PREFIXABLE:
        base_scale, dims = _SYMBOLS[sym[1:]]
        # A prefix on a unit with a built-in exponent (litre) scales the unit, not the base.
        scale = _PREFIXES[sym[0]] * base_scale
    elif len(sym) > 2 and sym[:2] == "da" and sym[2:] in _PREFIXABLE:
        scale, dims = 10 * _SYMBOLS[sym[2:]][0], _SYMBOLS[sym[2:]][1]
    else:
        raise UnitError(f"unknown unit symbol {sym!r}", where,
                        "use SI symbols with prefixes (nm, um, m, cm, W, mW, uW, J, mJ, s, min, h)")
    return scale ** exp, {k: v * exp for k, v in dims.items()}


def _tokens_to_unit(text: str, where: str) -> tuple[float, dict[str, int]]:
    """Parse a normalised unit text with '/', parentheses and spaces."""
    scale = 1.0
    dims: dict[str, int] = {}

    def add(s: float, d: dict[str, int], sign: int) -> None:
        nonlocal scale
        scale *= s ** sign
        for k, v in d.items():
            dims[k] = dims.get(k, 0) + sign * v

    # Split into top-level pieces separated by '/', keeping parenthesised groups intact.
    pieces: list[str] = []
    depth = 0
    cur = ""
    for ch in text:
        if ch == "(":
            depth += 1
        elif ch == ")":
            depth -= 1
            if depth < 0:
                raise UnitError(f"unbalanced parentheses in unit {text!r}", where)
        if ch == "/" and depth == 0:
            pieces.append(cur)
            cur = ""
        else:
            cur += ch
    pieces.append(cur)
    if depth != 0:
        raise UnitError(f"unbalanced parentheses in unit {text!r}", where)
    for i, piece in enumerate(pieces):
        sign = 1 if i == 0 else -1
        piece = piece.strip()
        if not piece:
            if i == 0:
                continue  # "/nm" style: nothing in the numerator
            raise UnitError(f"empty denominator in unit {text!r}", where)
        if piece.startswith("(") and piece.endswith(")") and piece.count("(") == 1:
            piece = piece[1:-1]
            if "/" in piece:
                # a quotient in parentheses: "(W/m2)/nm", "nm/(W/m2)"
                add(*_tokens_to_unit(piece, where), sign)
                continue
        if "(" in piece:
            raise UnitError(f"cannot read nested parentheses in unit {text!r}", where)
        for tok in piece.split():
            if tok in ("1", "+1"):
                continue
            # exponent written separately: "m -2" -> attach to the previous token
            if re.fullmatch(r"[-+]?\d+", tok):
                raise UnitError(f"stray number {tok!r} in unit {text!r}", where)
            add(*_factor(tok, where), sign)
    return scale, dims


def parse_unit(text: str, where: str | None = None) -> ParsedUnit:
    """Parse a unit text into a scale to SI and a dimension vector.

    text : e.g. ``"uW/cm^2/nm"``, ``"W m-2 nm-1"``, ``"W/(m²·nm)"``, ``"mJ/cm2"``, ``"min"``.
    where : the place to name in an error message.

    A text read once is not parsed again (the result is immutable and does not depend on
    ``where``; a batch parses the same few units for every product). A text that cannot be
    read is parsed again each time, so its error names this call's place.

    Examples
    --------
    >>> u = parse_unit("uW/cm2/nm"); round(u.scale * 1e-9, 12)   # in W m^-2 nm^-1
    0.01
    >>> parse_unit("W m-2 nm-1").dims_key()
    (('W', 1), ('m', -3))
    """
    if isinstance(text, str):
        try:
            return _parsed_unit(text)
        except UnitError:
            pass
    return _parse_unit(text, where)


@functools.lru_cache(maxsize=1024)
def _parsed_unit(text: str) -> ParsedUnit:
    return _parse_unit(text, None)


def _parse_unit(text: str, where: str | None = None) -> ParsedUnit:
    """:func:`parse_unit` without the cache."""
    place = where or "unit"
    norm = normalise_unit_text(text)
    # "m-2" is an exponent; "W m -2" is not supported. Join "m -2" written with a space.
    norm = re.sub(r"([A-Za-z])\s+(-\d)", r"\1\2", norm)
    # exponents written as "m2" must stay attached; split "-" only before exponents.
    norm = re.sub(r"([A-Za-z])-(\d)", r"\1~\2", norm)
    if "-" in norm.replace("~", ""):
        raise UnitError(f"cannot read the unit {text!r}", place)
    norm = norm.replace("~", "-")
    if not norm:
        raise UnitError("empty unit", place)
    scale, dims = _tokens_to_unit(norm, place)
    return ParsedUnit(scale=scale, dims=MappingProxyType({k: v for k, v in dims.items() if v}),
                      text=text)


# ---------------------------------------------------------------------------------------------
# Quantity kinds
# ---------------------------------------------------------------------------------------------

#: Dimension signatures (sorted tuples) for each kind of quantity uvcheck accepts.
KINDS: dict[str, tuple[tuple[str, int], ...]] = {
    "length": (("m", 1),),
    "area": (("m", 2),),
    "volume": (("m", 3),),
    "time": (("s", 1),),
    "power": (("W", 1),),
    "voltage": (("V", 1),),
    "current": (("A", 1),),
    "irradiance": (("W", 1), ("m", -2)),
    "dose": (("W", 1), ("m", -2), ("s", 1)),
    "radiance": (("W", 1), ("m", -2), ("sr", -1)),
    "illuminance": (("lx", 1),),
    "luminous_flux": (("lm", 1),),
    "energy": (("W", 1), ("s", 1)),
    "spectral_irradiance": (("W", 1), ("m", -3)),
    "spectral_radiance": (("W", 1), ("m", -3), ("sr", -1)),
    "spectral_flux": (("W", 1), ("m", -1)),
    "rate_constant": (("W", -1), ("m", 2), ("s", -1)),  # m^2/J
    "angle": (),
}

#: SI unit text printed for each kind.
SI_UNIT_TEXT = {"length": "m", "area": "m²", "volume": "m³", "time": "s", "power": "W",
                "voltage": "V", "current": "A", "irradiance": "W m⁻²", "dose": "J m⁻²",
                "radiance": "W m⁻² sr⁻¹", "illuminance": "lx", "luminous_flux": "lm",
                "energy": "J", "spectral_irradiance": "W m⁻³", "rate_constant": "m² J⁻¹"}

_NUMBER_RE = re.compile(r"^\s*([-+]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


@dataclass(frozen=True)
class Quantity:
    """A number converted to SI, with what was written.

    value_si : the value in the SI unit of its kind (m, s, W, W m⁻², J m⁻², ...).
    kind : one of :data:`KINDS`.
    text : the text as written.
    """

    value_si: float
    kind: str
    text: str


def parse_quantity(text: str | float | int, kind: str | tuple[str, ...], where: str | None = None,
                   default_unit: str | None = None) -> Quantity:
    """Parse ``"30 min"``, ``"2 m"``, ``"5 µW/cm²"``, ``"254nm"``, ``"20 m²"`` into SI.

    text : number followed by a unit; a bare number takes ``default_unit`` or fails.
    kind : the kind (or kinds) of quantity expected; a unit of another kind is an error
        ("30 kg" as a time).
    where : the place to name in an error message.
    default_unit : unit for a bare number; without it, a bare number is an error for every
        kind but ``angle`` and percentages.

    Wavelengths are a length: ``parse_quantity("254nm", "length").value_si`` is 2.54e-7 m.
    Percentages: kind ``"fraction"`` accepts ``"99.9 %"`` or ``"0.999"`` and returns the fraction.

    Examples
    --------
    >>> parse_quantity("30 min", "time").value_si
    1800.0
    >>> parse_quantity("5 µW/cm²", "irradiance").value_si
    0.05
    >>> parse_quantity("10 mJ/cm^2", "dose").value_si
    100.0
    """
    place = where or "quantity"
    kinds = (kind,) if isinstance(kind, str) else tuple(kind)
    if isinstance(text, bool):
        raise UnitError(f"expected a quantity with a unit, got {text!r}", place)
    if isinstance(text, (int, float)):
        raw_text = str(text)
        number, unit_text = float(text), ""
    else:
        raw_text = str(text)
        m = _NUMBER_RE.match(raw_text)
        if not m:
            raise UnitError(f"cannot read {raw_text!r} as a number with a unit", place,
                            "write it like '30 min', '2 m', '5 uW/cm2'")
        number = float(m.group(1).replace(",", "."))
        unit_text = m.group(2)
    if not math.isfinite(number):
        raise UnitError(f"{raw_text!r} is not a finite number", place)
    if "fraction" in kinds:
        if unit_text in ("%", "percent", "per cent"):
            return Quantity(number / 100.0, "fraction", raw_text)
        if unit_text == "":
            return Quantity(number, "fraction", raw_text)
    if unit_text == "":
        if default_unit is None:
            if "angle" in kinds:
                return Quantity(number, "angle", raw_text)
            raise UnitError(f"{raw_text!r} has no unit", place,
                            f"add one, for example {_example_for(kinds[0])!r}")
        unit_text = default_unit
    if "angle" in kinds and unit_text in ("rad", "mrad", "deg", "°"):
        factor = {"rad": 1.0, "mrad": 1e-3, "deg": math.pi / 180, "°": math.pi / 180}[unit_text]
        return Quantity(number * factor, "angle", raw_text)
    parsed = parse_unit(unit_text, place)
    key = parsed.dims_key()
    for k in kinds:
        if k in KINDS and KINDS[k] == key:
            return Quantity(number * parsed.scale, k, raw_text)
    wanted = " or ".join(k.replace("_", " ") for k in kinds)
    article = "an" if wanted[:1] in "aeiou" else "a"
    raise UnitError(f"{raw_text!r} is not {article} {wanted}", place,
                    f"give {article} {wanted} such as {_example_for(kinds[0])!r}")


def _example_for(kind: str) -> str:
    return {"length": "2 m", "time": "30 min", "power": "8 W", "irradiance": "5 uW/cm2",
            "dose": "10 mJ/cm2", "area": "20 m2", "volume": "50 m3", "voltage": "3.1 V",
            "radiance": "1 W/m2/sr", "illuminance": "500 lx", "fraction": "99.9 %",
            "angle": "0.01 rad", "rate_constant": "0.1 cm2/mJ", "current": "20 mA"}.get(kind, "1 m")


# ---------------------------------------------------------------------------------------------
# Spectral value units (for readers)
# ---------------------------------------------------------------------------------------------

_RELATIVE_WORDS = re.compile(
    r"(?i)^(counts?|cts|cnt|adc|digits?|dn|a\.?\s?u\.?|arb\.?(itrary)?(\s*units?)?|relative|rel\.?|"
    r"normali[sz]ed|norm\.?|intensity|signal|%|percent|scope|raw|au|arbitrary units|"
    r"counts?\s*/\s*s|cps|counts per second)$")


@dataclass(frozen=True)
class SpectralUnit:
    """What a column of spectral values is, and the factor to uvcheck's SI spectral units.

    quantity : ``irradiance`` | ``radiance`` | ``flux`` | ``relative``.
    factor : multiply a value to get W m⁻² nm⁻¹ (irradiance), W m⁻² sr⁻¹ nm⁻¹ (radiance),
        W nm⁻¹ (flux) or leave as is (relative).
    photon : True when the values count photons (mol or photons per s); the reader then
        converts each sample with E = hc/λ.
    text : the unit as written (or a description when inferred).
    """

    quantity: str
    factor: float
    photon: bool
    text: str
    #: how the unit's letter case was read, when it was not taken as written (an all-capitals
    #: unit, or "MW" read as milliwatts); None otherwise
    note: str | None = None
    #: True when the values are per wavenumber (W m⁻² per cm⁻¹); the reader then converts
    #: each sample to per nm with E_λ = E_ν̃ · 10⁷ / λ² (λ in nm), and ``factor`` is to W m⁻²
    #: (W m⁻² sr⁻¹, W) per cm⁻¹
    per_wavenumber: bool = False


#: A unit that ends "per wavenumber": "/cm-1", "/cm^-1", "/(cm-1)", "(cm-1)-1", " per cm-1".
_PER_WAVENUMBER = re.compile(
    r"(?:\s*/\s*\(?\s*cm\s*(?:\^?\s*-\s*1|⁻¹)\s*\)?|\s*\(\s*cm\s*(?:\^?\s*-\s*1|⁻¹)\s*\)\s*"
    r"(?:\^?\s*-\s*1|⁻¹)|\s+per\s+(?:cm\s*-\s*1|cm⁻¹|wave\s*number))\s*$", re.I)
#: "W/(m2 cm-1)": the wavenumber inside the bracket of the denominator.
_PER_WAVENUMBER_BRACKET = re.compile(
    r"/\s*\(\s*(.+?)\s*[\s·*.]\s*cm\s*(?:\^?\s*-\s*1|⁻¹)\s*\)\s*$", re.I)


#: What a unit that is not per wavelength measures (the quantity of its spectral density).
_DENSITY_OF = {KINDS["irradiance"]: "irradiance", KINDS["radiance"]: "radiance",
               KINDS["power"]: "flux"}


def _per_wavenumber(raw: str, text: str, place: str, note: str | None) -> SpectralUnit | None:
    """The spectral unit of values per wavenumber ("W/m2/cm-1", "W/(m2 cm-1)",
    "W m-2 (cm-1)-1"), or None when the unit is not per wavenumber. ``note``: as
    :attr:`SpectralUnit.note`."""
    m = _PER_WAVENUMBER.search(raw)
    if m:
        base = raw[:m.start()]
    else:
        b = _PER_WAVENUMBER_BRACKET.search(raw)
        if not b:
            return None
        base = raw[:b.start()] + "/" + b.group(1)
    try:
        parsed = parse_unit(base, place)
    except UnitError:
        return None
    q = _DENSITY_OF.get(parsed.dims_key())
    if q is None:
        return None
    return SpectralUnit(q, float(f"{parsed.scale:.12g}"), False, text, note, True)


#: "MW/CM2/NM", "UW/CM^2/NM": a unit written in capitals, letters only upper case.
_ALL_CAPS = re.compile(r"^[^a-z]*[A-Z][^a-z]*$")
#: A megawatt at the head of a spectral unit ("MW/cm2/nm"): no lamp's output, always a
#: capitalised milliwatt (our own reading).
_MEGAWATT_HEAD = re.compile(r"^\s*MW(?=\s*(?:/|·|\*|\s|$|\())")


def _case_read(raw: str) -> tuple[str, str | None]:
    """The unit text with its letter case read as a lamp export means it, and a note when
    that is not as written: an all-capitals unit is read in lower case with W (watt) and J
    (joule) capital ("MW/CM2/NM" -> "mW/cm2/nm", "UW/CM2/NM" -> "uW/cm2/nm"); a leading "MW"
    is milliwatts. Relative words and photon units are left as they are."""
    if _ALL_CAPS.match(raw) and re.search(r"W|J", raw) and not re.search(r"MOL|PHOTON", raw):
        fixed = re.sub(r"w", "W", re.sub(r"j", "J", raw.lower()))
        fixed = re.sub(r"\bsr\b|SR", "sr", fixed)
        if fixed != raw:
            return fixed, (f"the unit {raw!r} is written in capitals: read as {fixed!r}"
                           + (" (M read as milli, not mega: a megawatt is no lamp's output; "
                              "check which is right and give --unit if not)"
                              if fixed.startswith("mW") else ""))
    if _MEGAWATT_HEAD.match(raw):
        fixed = _MEGAWATT_HEAD.sub("mW", raw, count=1)
        return fixed, (f"the unit {raw!r} reads as megawatts, which no lamp emits: read as "
                       f"{fixed!r} (milliwatts); check which is right and give --unit if not")
    return raw, None


#: Prefixes written as words before a unit symbol ("microW/cm2/nm", "milliW").
_WORD_PREFIXES = (("micro", "µ"), ("milli", "m"), ("nano", "n"))


def _unit_after_name(text: str, place: str) -> Any | None:
    """A unit written after a name and an underscore ("irradiance_uW/cm2/nm"), or with its
    prefix as a word ("microW/cm2/nm"): the parsed unit, else None."""
    tries = [text]
    if "_" in text:
        tries += [text[i + 1:] for i, ch in enumerate(text) if ch == "_"]
    for t in list(tries):
        for word, sym in _WORD_PREFIXES:
            if re.match(rf"(?i){word}(?=W)", t):
                tries.append(sym + t[len(word):])
    for t in tries[1:]:
        try:
            return parse_unit(t, place)
        except UnitError:
            continue
    return None


@_remembered("unit")
def parse_spectral_unit(text: str, where: str | None = None) -> SpectralUnit:
    """Read a spectral unit as written in a header, a units row or a column name.

    Accepts W/m²/nm, W m-2 nm-1, W/(m²·nm), mW/m2/nm, µW/cm²/nm, uW/cm^2/nm, mW/cm2/nm,
    radiance with sr, flux in W/nm or mW/nm, photon units (mol or photons per s), and the
    relative spellings (counts, a.u., relative, %). Column names with underscores such as
    ``irradiance_W_m2_nm`` are read with the first unit as numerator and the rest as
    denominators (their usual meaning).

    Examples
    --------
    >>> parse_spectral_unit("mW/cm2/nm").factor
    10.0
    >>> parse_spectral_unit("irradiance_W_m2_nm").quantity
    'irradiance'
    >>> parse_spectral_unit("a.u.").quantity
    'relative'
    """
    place = where or "unit"
    raw = text.strip()
    while len(raw) > 1 and raw[0] + raw[-1] in ("()", "[]", "{}") and _balanced(raw[1:-1]):
        raw = raw[1:-1].strip()
    if _RELATIVE_WORDS.match(raw.strip()):
        return SpectralUnit("relative", 1.0, False, text)
    raw, case_note = _case_read(raw)
    wn = _per_wavenumber(raw, text, place, case_note)
    if wn is not None:
        return wn
    candidate = raw
    if "_" in raw and "/" not in raw:
        # name_W_m2_nm -> W/m2/nm ; name_W_per_m2_per_nm -> W/m2/nm
        parts = [p for p in raw.split("_") if p]
        unit_parts = []
        for p in parts:
            try:
                _factor(normalise_unit_text(p), place)
                unit_parts.append(p)
            except UnitError:
                if p.lower() == "per":
                    continue
                if unit_parts:  # a word after the unit ends it
                    break
        if unit_parts:
            candidate = unit_parts[0] + "".join("/" + p for p in unit_parts[1:])
    try:
        parsed = parse_unit(candidate, place)
    except UnitError:
        parsed = _unit_after_name(candidate, place)
        if parsed is None:
            raise UnitError(f"cannot read the spectral unit {text!r}", place,
                            "give it with --unit, e.g. --unit 'uW/cm2/nm' or --unit relative")
    key = parsed.dims_key()
    d = dict(parsed.dims)
    photon = False
    if d.get("mol") or d.get("ph"):
        # photon flux: mol or photons per second -> convert each sample by hc/λ later
        n = d.pop("mol", 0) + d.pop("ph", 0)
        if n != 1 or d.get("s") != -1:
            raise UnitError(f"cannot read the photon unit {text!r}", place,
                            "photon units must be per second, e.g. 'umol/m2/s/nm'")
        d.pop("s")
        d["W"] = 1
        photon = True
        key = tuple(sorted((k, v) for k, v in d.items() if v))
    table = {KINDS["spectral_irradiance"]: "irradiance",
             KINDS["spectral_radiance"]: "radiance",
             KINDS["spectral_flux"]: "flux"}
    if key not in table:
        if key in _DENSITY_OF:
            raise UnitError(f"the unit {text!r} is not per wavelength (no '/nm')", place,
                            "if the values are per nm, say so with --unit, e.g. --unit 'W/m2/nm'")
        raise UnitError(f"the unit {text!r} is not a spectral irradiance, radiance or flux",
                        place, "give it with --unit, e.g. --unit 'W/m2/nm' or --unit relative")
    scale = float(f"{parsed.scale * 1e-9:.12g}")  # per m -> per nm; round off binary noise
    # for photon units the scale is in mol (or photons) s^-1; the reader multiplies by N_A·hc/λ
    return SpectralUnit(table[key], scale, photon, text, case_note)


def _balanced(text: str) -> bool:
    depth = 0
    for ch in text:
        depth += {"(": 1, "[": 1, ")": -1, "]": -1}.get(ch, 0)
        if depth < 0:
            return False
    return depth == 0


@_remembered("wavelength unit")
def parse_wavelength_unit(text: str, where: str | None = None) -> tuple[str, float]:
    """Read a wavelength-axis unit: returns ``("length", factor_to_nm)`` or ``("wavenumber", factor_to_per_cm)``.

    Examples
    --------
    >>> parse_wavelength_unit("µm")
    ('length', 1000.0)
    >>> parse_wavelength_unit("cm-1")
    ('wavenumber', 1.0)
    """
    place = where or "wavelength unit"
    norm = normalise_unit_text(text).strip("[]() ")
    low = norm.lower()
    if low in ("a", "angstrom", "å", "\u00e5"):
        return "length", 0.1
    if low in ("1/cm", "cm-1", "/cm", "wavenumber", "wavenumbers"):
        return "wavenumber", 1.0
    try:
        parsed = parse_unit(norm, place)
    except UnitError:
        raise UnitError(f"cannot read the wavelength unit {text!r}", place,
                        "give it with --wavelength-unit (nm, um, m or cm-1)")
    key = parsed.dims_key()
    if key == (("m", 1),):
        return "length", parsed.scale * 1e9
    if key == (("m", -1),):
        return "wavenumber", parsed.scale / 100.0
    raise UnitError(f"{text!r} is not a wavelength unit", place,
                    "give it with --wavelength-unit (nm, um, m or cm-1)")


# ---------------------------------------------------------------------------------------------
# Display in trade units
# ---------------------------------------------------------------------------------------------

def sig(x: float | None, digits: int = 3) -> str:
    """Format a number to ``digits`` significant figures; None -> '—'.

    Examples
    --------
    >>> sig(0.000123456)
    '0.000123'
    >>> sig(1234567.0)
    '1.23e+06'
    """
    if x is None or (isinstance(x, float) and math.isnan(x)):
        return "—"
    if x == 0:
        return "0"
    if math.isinf(x):
        return "∞" if x > 0 else "-∞"
    a = abs(x)
    if 1e-4 <= a < 1e5:
        decimals = max(0, digits - 1 - int(math.floor(math.log10(a))))
        return f"{x:.{decimals}f}"
    return f"{x:.{digits - 1}e}"


#: Trade unit for each SI quantity unit, as (label, factor from SI).
TRADE_UNITS = {
    "W m-2": ("µW/cm²", 100.0),      # 1 W/m² = 100 µW/cm²
    "J m-2": ("mJ/cm²", 0.1),        # 1 J/m² = 0.1 mJ/cm²
    "W m-2 sr-1": ("µW/cm²/sr", 100.0),
    "W": ("mW", 1000.0),
}


def to_trade(value_si: float | None, si_unit: str) -> tuple[float | None, str]:
    """Convert an SI value to the unit the trade prints next to it.

    Examples
    --------
    >>> to_trade(0.05, "W m-2")
    (5.0, 'µW/cm²')
    """
    label, f = TRADE_UNITS.get(si_unit, (si_unit, 1.0))
    return (None if value_si is None else value_si * f), label


#: The sign a time carries when it is a bound (``germicidal.times_are``: at_least / at_most).
BOUND_SIGN = {"at_least": "≥ ", "at_most": "≤ "}


def bounded_duration(seconds: float | None, bound: str | None = None) -> str:
    """:func:`format_duration` with the sign of its bound ('≤ 5.9 min' for ``at_most``); no
    time, no sign.

    >>> bounded_duration(354.0, "at_most")
    '≤ 5.9 min'
    """
    if seconds is None:
        return format_duration(None)
    return BOUND_SIGN.get(bound or "", "") + format_duration(seconds)


def format_duration(seconds: float | None) -> str:
    """Human-readable duration: '45 s', '12 min', '3.2 h', '5.1 days', '> 1 year'.

    Examples
    --------
    >>> format_duration(90)
    '1.5 min'
    """
    if seconds is None:
        return "—"
    if math.isinf(seconds):
        return "unlimited"
    if seconds < 0.001:
        return f"{seconds * 1e6:.3g} µs"
    if seconds < 1:
        return f"{seconds * 1e3:.3g} ms"
    if seconds < 60:
        return f"{seconds:.3g} s"
    if seconds < 3600:
        return f"{seconds / 60:.3g} min"
    if seconds < 86400 * 2:
        return f"{seconds / 3600:.3g} h"
    if seconds < 86400 * 365:
        return f"{seconds / 86400:.3g} days"
    return f"{seconds / (86400 * 365.25):.3g} years"
