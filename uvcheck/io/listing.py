"""Listing files: a product as sold, with its claims, in a small TOML format of our own.

A listing file records what a seller states about a lamp — name, stated wavelength or band,
optical and electrical power, LEDs and how they are wired, cover material, distance, area or
room, and the claims ("kills 99.9 % of germs in 30 minutes", "ozone-free", "safe for pets").
The format is described for users in ``examples/listings/README.md``; this module is its one
reader. Quantities are written as text with their unit (``"30 min"``, ``"2 m"``, ``"20 m²"``,
``"8 W"``, ``"254nm"``) and converted once, here, to SI (wavelengths to nm).

Claims are given either structured (``kind`` plus fields; preferred) or as free text, which
:func:`parse_claim_text` turns into a structured claim where it recognises the pattern;
unrecognised text becomes kind ``unrecognised`` with the text kept.

Errors: every problem raises :class:`~uvcheck.errors.InputFormatError` naming the file, the
line and the key (``listing.toml line 12, key 'claims[2].time'``; claims are counted from 1).
TOML syntax errors carry tomllib's line and column. Unknown keys are errors that list the
known keys and suggest the nearest one.

Only the standard library and uvcheck's own light modules are imported here.
"""

from __future__ import annotations

import difflib
import hashlib
import math
import re
import tomllib
from dataclasses import dataclass, field, replace
from pathlib import Path
from types import MappingProxyType
from typing import Any, Mapping

from uvcheck.errors import InputFormatError, UvcheckError
from uvcheck.units import UNIT_CHARACTERS, format_duration, parse_quantity

#: The format identifier a listing may declare in its top-level ``format`` key.
FORMAT_ID = "uvcheck-listing/1"

#: The fixed set of claim kinds.
CLAIM_KINDS = ("emission", "inactivation", "coverage", "ozone-free", "safety", "optical-power",
               "irradiance", "no-emission", "efficiency", "risk-group", "approval", "unrecognised")

#: The IEC 62471 risk groups a risk-group claim can state (as uvcheck.limits.GROUPS, repeated
#: so that the listing reader stays free of numpy).
RISK_GROUPS = ("Exempt", "RG1", "RG2", "RG3")
#: Agencies an approval claim can name.
AGENCIES = ("EPA", "FDA")

#: Media an inactivation claim can be about.
MEDIA = ("surface", "air")

#: Who or what a safety claim says the lamp is safe for.
SUBJECTS = ("people", "children", "pets", "plants", "occupied-rooms", "eyes", "skin")

#: Named spectral bands a listing may state (same edges as uvcheck.bands, repeated here so the
#: listing reader stays free of numpy; tests/test_listing.py checks that they agree).
BANDS_NM: dict[str, tuple[float, float]] = {
    "UV-C": (200.0, 280.0), "far-UVC": (200.0, 235.0), "UV-B": (280.0, 315.0),
    "UV-A": (315.0, 400.0), "visible": (400.0, 780.0), "IR-A": (780.0, 1400.0),
}
#: All UV as a claim means it ("UV-free", "UV intensity 80 µW/cm²"): 200–400 nm (UV below
#: 200 nm does not travel in air).
ALL_UV_NM = (200.0, 400.0)
#: Bands a claim can say the lamp does not emit in ("no-emission": "UV-free", "no UV-C"):
#: the named bands, and all UV.
DENIABLE_BANDS_NM: dict[str, tuple[float, float]] = {**BANDS_NM, "UV": ALL_UV_NM}

#: Geometry models a listing may name (as uvcheck.geometry.EMITTER_MODELS).
EMITTERS = ("point", "lambertian", "tube")

#: Technologies a listing may name beyond the keys of data/technologies.toml.
EXTRA_TECHNOLOGIES = ("incandescent",)

# key -> type tag, per table. Types: text, bool, count, length, power, voltage, current, area,
# volume, band, power_band, technology, cover, package, emitter, temperature.
_SCHEMA: dict[str, dict[str, str]] = {
    "product": {"name": "text", "seller_note": "text", "invented": "bool",
                "listing_text": "text"},
    "lamp": {"technology": "technology", "peak_wavelength": "length", "band": "band",
             "fwhm": "length", "optical_power": "power", "optical_power_band": "power_band",
             "electrical_power": "power", "supply_voltage": "voltage", "cover": "cover",
             "filtered": "bool", "emitter": "emitter", "tube_length": "length",
             "source_size": "length", "colour_temperature": "temperature"},
    "leds": {"count": "count", "series": "count", "strings": "count",
             "string_voltage": "voltage", "forward_voltage": "voltage", "current": "current",
             "package": "package", "dies_per_package": "count"},
    "use": {"distance": "length", "area": "area", "room_volume": "volume",
            "room_height": "length"},
}
_TOP_KEYS = ("format", "product", "lamp", "leds", "use", "claims")

_CLAIM_COMMON = ("id", "text", "kind")
#: Structured fields each claim kind accepts.
KIND_FIELDS: dict[str, tuple[str, ...]] = {
    "emission": ("wavelength", "band"),
    "inactivation": ("reduction", "log_reduction", "organism", "time", "distance", "area",
                     "volume", "medium"),
    "coverage": ("area", "volume"),
    "ozone-free": (),
    "safety": ("safe_for", "distance", "time"),
    "optical-power": ("power", "band"),
    "irradiance": ("irradiance", "distance", "band"),
    "no-emission": ("band",),
    "efficiency": ("efficiency", "efficiency_of"),
    "risk-group": ("risk_group",),
    "approval": ("agency",),
    "unrecognised": (),
}
_ALL_CLAIM_KEYS = tuple(dict.fromkeys(_CLAIM_COMMON + sum(KIND_FIELDS.values(), ())))


# ---------------------------------------------------------------------------------------------
# Result types
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Claim:
    """One marketing statement, structured.

    id : unique id within the listing (``c1``, ``c2``, … unless given).
    kind : one of :data:`CLAIM_KINDS`.
    text : the wording as sold (None if only structured fields were given).
    structured : True when the fields were given as keys, False when read from ``text``.
    line : line of the claim in the listing file (None for claims made in code).
    wavelength_nm : stated peak wavelength (emission). [nm]
    band_name, band_nm : stated band (emission, optical-power): a name from :data:`BANDS_NM`
        and its edges, or edges alone. [nm]
    bands : every band an emission claim names, in the order written, when it names more
        than one ("UVA + UVC" -> ``('UV-A', 'UV-C')``); band_name is then the first. Empty
        for one band or none.
    wavelengths_nm : every wavelength an emission claim states, when it states more than one
        ("365nm & 254nm"); wavelength_nm is then the first. Empty for one or none. [nm]
    reduction_fraction : stated reduction as a fraction (0.999 for 99.9 %). [-]
    log_reduction : the same as a log10 reduction (3 for 99.9 %); None for 100 %. [-]
    reduction_stated_as : ``percent`` | ``log`` | None.
    organism : organism(s) as written ("germs", "E. coli"), None if not named.
    organism_generic : True when only generic words were used (germs, bacteria, viruses).
    time_s : stated time. [s] For a time worded without a number ("in seconds"), the longest
        time the word allows (the most favourable reading, see :data:`VAGUE_TIMES`).
    time_word : the word the time was read from when it came without a number ("seconds"),
        else None: the time is then not quantified, only bounded.
    distance_m : stated distance. [m]
    area_m2 : stated area or room floor area. [m²]
    volume_m3 : stated room volume. [m³]
    medium : ``surface`` | ``air`` | None.
    safe_for : subjects of a safety claim, from :data:`SUBJECTS`.
    power_W : stated optical power. [W]
    irradiance_W_m2 : stated irradiance (an irradiance claim, "UV-C 2.5 mW/cm² at 10 cm"),
        in ``band_nm`` (all UV when the claim names no band) at ``distance_m``. [W m⁻²]
    efficiency_fraction : stated efficiency. [-]
    efficiency_of : ``UV-C`` (UV-C watts per electrical watt) | ``optical`` (all optical
        watts per electrical watt) | None.
    note : what the free-text reader made of the wording, or why it could not.
    """

    id: str
    kind: str
    text: str | None = None
    structured: bool = True
    line: int | None = None
    wavelength_nm: float | None = None
    band_name: str | None = None
    band_nm: tuple[float, float] | None = None
    bands: tuple[str, ...] = ()
    wavelengths_nm: tuple[float, ...] = ()
    reduction_fraction: float | None = None
    log_reduction: float | None = None
    reduction_stated_as: str | None = None
    organism: str | None = None
    organism_generic: bool = False
    time_s: float | None = None
    time_word: str | None = None
    distance_m: float | None = None
    area_m2: float | None = None
    volume_m3: float | None = None
    medium: str | None = None
    safe_for: tuple[str, ...] = ()
    power_W: float | None = None
    irradiance_W_m2: float | None = None
    efficiency_fraction: float | None = None
    efficiency_of: str | None = None
    risk_group: str | None = None
    agency: str | None = None
    note: str | None = None
    also_kinds: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        if self.kind not in CLAIM_KINDS:
            raise InputFormatError(f"unknown claim kind {self.kind!r}",
                                   todo=f"use one of: {', '.join(CLAIM_KINDS)}")
        object.__setattr__(self, "safe_for", tuple(self.safe_for))
        object.__setattr__(self, "bands", tuple(self.bands))
        object.__setattr__(self, "wavelengths_nm", tuple(self.wavelengths_nm))

    def missing(self, listing: "Listing | None" = None) -> tuple[str, ...]:
        """The data this claim needs but does not state (nor the listing, where given).

        For an inactivation claim the place (distance, area or volume) may come from the
        listing's ``[use]`` table; everything else must be in the claim.

        Examples
        --------
        >>> parse_claim_text("kills 99.9 % of germs").missing()
        ('time', 'distance, area or room volume')
        """
        out: list[str] = []
        if self.kind == "inactivation":
            if self.reduction_fraction is None and self.log_reduction is None:
                out.append("reduction (a percentage or a log reduction)")
            if self.organism is None:
                out.append("organism (or 'germs')")
            if self.time_s is None:
                out.append("time")
            place = (self.distance_m, self.area_m2, self.volume_m3)
            if listing is not None:
                place += (listing.use_distance_m, listing.area_m2, listing.room_volume_m3)
            if all(p is None for p in place):
                out.append("distance, area or room volume")
        elif self.kind == "coverage":
            area = (self.area_m2, self.volume_m3)
            if all(p is None for p in area):
                out.append("area or room volume")
        elif self.kind == "emission":
            if self.wavelength_nm is None and self.band_nm is None:
                out.append("wavelength or band")
        elif self.kind == "safety":
            if not self.safe_for:
                out.append("who or what it is safe for (people, pets, occupied rooms)")
        elif self.kind == "optical-power":
            if self.power_W is None:
                out.append("power")
        elif self.kind == "no-emission":
            if self.band_nm is None:
                out.append("the band it says the lamp does not emit in")
        elif self.kind == "irradiance":
            if self.irradiance_W_m2 is None:
                out.append("irradiance")
            if self.distance_m is None and (listing is None or listing.use_distance_m is None):
                out.append("distance")
        elif self.kind == "efficiency":
            if self.efficiency_fraction is None:
                out.append("efficiency")
        elif self.kind == "risk-group":
            if self.risk_group is None:
                out.append("the risk group (Exempt, RG1, RG2 or RG3)")
        elif self.kind == "approval":
            if self.agency is None:
                out.append("the agency (EPA or FDA)")
        elif self.kind == "unrecognised":
            out.append("a statement of a kind uvcheck can check")
        return tuple(out)

    def to_dict(self) -> dict[str, Any]:
        d: dict[str, Any] = {"id": self.id, "kind": self.kind, "text": self.text,
                             "structured": self.structured, "line": self.line}
        fields_by_kind = {
            "emission": ("wavelength_nm", "band_name", "band_nm", "bands", "wavelengths_nm"),
            "inactivation": ("reduction_fraction", "log_reduction", "reduction_stated_as",
                             "organism", "organism_generic", "time_s", "time_word", "distance_m",
                             "area_m2", "volume_m3", "medium"),
            "coverage": ("area_m2", "volume_m3"),
            "ozone-free": (),
            "safety": ("safe_for", "distance_m", "time_s"),
            "optical-power": ("power_W", "band_name", "band_nm"),
            "irradiance": ("irradiance_W_m2", "distance_m", "band_name", "band_nm"),
            "no-emission": ("band_name", "band_nm", "bands"),
            "efficiency": ("efficiency_fraction", "efficiency_of"),
            "risk-group": ("risk_group",),
            "approval": ("agency",),
            "unrecognised": (),
        }
        for name in fields_by_kind[self.kind]:
            v = getattr(self, name)
            d[name] = list(v) if isinstance(v, tuple) else v
        d["missing"] = list(self.missing())
        d["note"] = self.note
        return d


@dataclass(frozen=True)
class LedArray:
    """The LEDs of a product and how they are wired.

    count : number of LED packages. series : packages in series per string.
    strings : parallel strings. dies_per_package : dies in one package (default 1).
    string_voltage_V : voltage across one string, where measured or stated. [V]
    forward_voltage_V : forward voltage of one die, where measured or stated. [V]
    current_A : current through one string. [A]
    package : package class, a key of ``data/emitters/led_packages.toml`` [packages].
    """

    count: int | None = None
    series: int | None = None
    strings: int | None = None
    dies_per_package: int = 1
    string_voltage_V: float | None = None
    forward_voltage_V: float | None = None
    current_A: float | None = None
    package: str | None = None

    def to_dict(self) -> dict[str, Any]:
        return {k: getattr(self, k) for k in ("count", "series", "strings", "dies_per_package",
                                              "string_voltage_V", "forward_voltage_V",
                                              "current_A", "package")}


@dataclass(frozen=True)
class Listing:
    """A product as sold: stated data and claims, in SI (wavelengths in nm).

    name, seller_note, listing_text : as written. invented : the file says it is invented.
    technology : a key of ``data/technologies.toml`` (or ``incandescent``), as stated.
    peak_wavelength_nm, fwhm_nm : stated peak and band width. [nm]
    band_name, band_nm : stated band. [nm]
    optical_power_W : stated optical output. [W]  optical_power_band : what it covers
        (``total`` or a band name; None = not said).
    electrical_power_W : stated electrical input. [W]  supply_voltage_V : stated supply. [V]
    cover : cover material key (``data/emitters/lamp_models.toml`` [covers]); cover_text : as
        written. filtered : a far-UVC filter is stated (True), denied (False) or not said.
    emitter : geometry model (point / lambertian / tube); tube_length_m, source_size_m. [m]
    colour_temperature_K : for white or incandescent lamps. [K]
    leds : the LED array, or None.
    use_distance_m, area_m2, room_volume_m3, room_height_m : stated use. [m], [m²], [m³], [m]
    claims : the claims, in file order.
    source, sha256 : file name and checksum (None when parsed from text).
    key_lines : dotted key path → line in the file (``claims[2].time`` counts from 1).
    """

    name: str
    seller_note: str | None = None
    invented: bool = False
    listing_text: str | None = None
    technology: str | None = None
    peak_wavelength_nm: float | None = None
    fwhm_nm: float | None = None
    band_name: str | None = None
    band_nm: tuple[float, float] | None = None
    optical_power_W: float | None = None
    optical_power_band: str | None = None
    electrical_power_W: float | None = None
    supply_voltage_V: float | None = None
    cover: str | None = None
    cover_text: str | None = None
    filtered: bool | None = None
    emitter: str | None = None
    tube_length_m: float | None = None
    source_size_m: float | None = None
    colour_temperature_K: float | None = None
    leds: LedArray | None = None
    use_distance_m: float | None = None
    area_m2: float | None = None
    room_volume_m3: float | None = None
    room_height_m: float | None = None
    claims: tuple[Claim, ...] = ()
    source: str | None = None
    sha256: str | None = None
    key_lines: Mapping[str, int] = field(default_factory=lambda: MappingProxyType({}))

    def line_of(self, key: str) -> int | None:
        """Line of a dotted key (``lamp.cover``, ``claims[2].time``), or of its table."""
        return _lookup_line(dict(self.key_lines), key)

    def claim(self, claim_id: str) -> Claim:
        for c in self.claims:
            if c.id == claim_id:
                return c
        raise InputFormatError(f"no claim with id {claim_id!r}",
                               todo=f"ids: {', '.join(c.id for c in self.claims)}")

    def to_dict(self) -> dict[str, Any]:
        d = {k: getattr(self, k) for k in (
            "name", "seller_note", "invented", "listing_text", "technology",
            "peak_wavelength_nm", "fwhm_nm", "band_name", "band_nm", "optical_power_W",
            "optical_power_band", "electrical_power_W", "supply_voltage_V", "cover",
            "cover_text", "filtered", "emitter", "tube_length_m", "source_size_m",
            "colour_temperature_K", "use_distance_m", "area_m2", "room_volume_m3",
            "room_height_m", "source", "sha256")}
        if d["band_nm"] is not None:
            d["band_nm"] = list(d["band_nm"])
        d["leds"] = None if self.leds is None else self.leds.to_dict()
        d["claims"] = [c.to_dict() for c in self.claims]
        return d


# ---------------------------------------------------------------------------------------------
# Key → line index (for semantic errors)
# ---------------------------------------------------------------------------------------------

_BARE_OR_QUOTED = r'(?:[A-Za-z0-9_-]+|"[^"]*"|\'[^\']*\')'
_KEY_RE = re.compile(rf"^\s*({_BARE_OR_QUOTED}(?:\s*\.\s*{_BARE_OR_QUOTED})*)\s*=")
_TABLE_RE = re.compile(rf"^\s*\[\s*({_BARE_OR_QUOTED}(?:\s*\.\s*{_BARE_OR_QUOTED})*)\s*\]")
_ARRAY_TABLE_RE = re.compile(rf"^\s*\[\[\s*({_BARE_OR_QUOTED}(?:\s*\.\s*{_BARE_OR_QUOTED})*)\s*\]\]")


def _split_key(text: str) -> list[str]:
    parts = re.findall(_BARE_OR_QUOTED, text)
    return [p[1:-1] if p[:1] in "\"'" else p for p in parts]


def key_lines(text: str) -> dict[str, int]:
    """Map each key of a TOML text to the line it is written on (first occurrence).

    Paths are dotted; array-of-tables entries count from 1: ``claims[2].time``. Inline tables
    and multi-line values are attributed to the line of their key. A line-based scan, good
    enough to point at a key in an error message.

    Examples
    --------
    >>> key_lines('[lamp]\\ncover = "glass"\\n[[claims]]\\ntext = "a"\\n[[claims]]\\ntime = "1 s"')
    {'lamp': 1, 'lamp.cover': 2, 'claims[1]': 3, 'claims[1].text': 4, 'claims[2]': 5, 'claims[2].time': 6}
    """
    out: dict[str, int] = {}
    table = ""
    counts: dict[str, int] = {}
    in_multiline: str | None = None
    for n, raw in enumerate(text.splitlines(), 1):
        line = raw.strip()
        if in_multiline:
            if line.count(in_multiline) % 2 == 1:
                in_multiline = None
            continue
        if not line or line.startswith("#"):
            continue
        m = _ARRAY_TABLE_RE.match(line)
        if m:
            name = ".".join(_split_key(m.group(1)))
            counts[name] = counts.get(name, 0) + 1
            table = f"{name}[{counts[name]}]"
            out.setdefault(table, n)
            continue
        m = _TABLE_RE.match(line)
        if m:
            table = ".".join(_split_key(m.group(1)))
            out.setdefault(table, n)
            continue
        m = _KEY_RE.match(line)
        if m:
            key = ".".join(_split_key(m.group(1)))
            out.setdefault(f"{table}.{key}" if table else key, n)
            rest = line[m.end():]
            for q in ('"""', "'''"):
                if rest.count(q) % 2 == 1:
                    in_multiline = q
    return out


def _lookup_line(lines: dict[str, int], key: str) -> int | None:
    k = key
    while k:
        if k in lines:
            return lines[k]
        if "." in k:
            k = k.rsplit(".", 1)[0]
        elif "[" in k:
            k = k.split("[", 1)[0]
        else:
            break
    return None


# ---------------------------------------------------------------------------------------------
# Value conversion with errors that name the key
# ---------------------------------------------------------------------------------------------

class _Ctx:
    """Where we are: file name and key lines, for error messages."""

    def __init__(self, name: str, lines: dict[str, int]):
        self.name = name
        self.lines = lines

    def where(self, key: str) -> str:
        n = _lookup_line(self.lines, key)
        return f"{self.name} line {n}, key '{key}'" if n else f"{self.name}, key '{key}'"

    def fail(self, key: str, what: str, todo: str | None = None) -> InputFormatError:
        return InputFormatError(what, self.where(key), todo)


_KIND_OF_TYPE = {"length": "length", "power": "power", "voltage": "voltage",
                 "irradiance": "irradiance",
                 "current": "current", "area": "area", "volume": "volume", "time": "time"}


def _quantity(ctx: _Ctx, key: str, value: Any, kind: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise ctx.fail(key, f"expected a quantity with a unit, got {value!r}",
                       f"write it as text, e.g. {_EXAMPLES.get(kind, '1 m')!r}")
    try:
        q = parse_quantity(value, kind, ctx.where(key))
    except UvcheckError as exc:
        raise InputFormatError(exc.what, ctx.where(key), exc.todo) from None
    v = q.value_si
    if not (math.isfinite(v) and v > 0):
        raise ctx.fail(key, f"{value!r} must be positive")
    return v


_EXAMPLES = {"length": "2 m", "power": "8 W", "irradiance": "2.5 mW/cm²", "voltage": "3.1 V", "current": "20 mA",
             "area": "20 m²", "volume": "50 m³", "time": "30 min"}


def _to_nm(length_m: float) -> float:
    """Metres to nanometres, rounded to 12 significant figures (no binary noise: 254.0, not
    254.00000000000003)."""
    return float(f"{length_m * 1e9:.12g}")


def _wavelength_nm(ctx: _Ctx, key: str, value: Any) -> float:
    nm = _to_nm(_quantity(ctx, key, value, "length"))
    if not 100.0 <= nm <= 3000.0:
        raise ctx.fail(key, f"{value!r} is not a wavelength between 100 and 3000 nm",
                       "write it like '254 nm'")
    return nm


def _text(ctx: _Ctx, key: str, value: Any) -> str:
    if not isinstance(value, str):
        raise ctx.fail(key, f"expected text, got {value!r}", "put the value in quotes")
    return value


def _bool(ctx: _Ctx, key: str, value: Any) -> bool:
    if not isinstance(value, bool):
        raise ctx.fail(key, f"expected true or false, got {value!r}")
    return value


def _count(ctx: _Ctx, key: str, value: Any) -> int:
    if isinstance(value, bool) or not isinstance(value, int) or value < 1:
        raise ctx.fail(key, f"expected a whole number of at least 1, got {value!r}")
    return value


def _choice(ctx: _Ctx, key: str, value: Any, known: dict[str, str], what: str) -> str:
    """Match a name against ``known`` (written name → canonical key), exactly after lower-casing."""
    text = _text(ctx, key, value).strip()
    k = known.get(text.lower())
    if k is None:
        names = sorted(set(known))
        near = difflib.get_close_matches(text.lower(), names, n=1)
        hint = f"did you mean {near[0]!r}? " if near else ""
        raise ctx.fail(key, f"unknown {what} {text!r}", f"{hint}known: {', '.join(names)}")
    return k


def band_from_name(text: str) -> str | None:
    """Canonical band name for a written one (``UVC``, ``uv-c``, ``far UV-C``), or None.

    Examples
    --------
    >>> band_from_name("uvc"), band_from_name("Far-UV"), band_from_name("blue")
    ('UV-C', 'far-UVC', None)
    """
    t = re.sub(r"[\s_-]", "", text).lower()
    table = {"uvc": "UV-C", "uvb": "UV-B", "uva": "UV-A", "faruvc": "far-UVC", "faruv": "far-UVC",
             "visible": "visible", "vis": "visible", "ira": "IR-A", "nearinfrared": "IR-A"}
    return table.get(t)


def _band(ctx: _Ctx, key: str, value: Any) -> tuple[str | None, tuple[float, float]]:
    if isinstance(value, str):
        name = band_from_name(value)
        if name is None:
            raise ctx.fail(key, f"unknown band {value!r}",
                           f"use one of {', '.join(BANDS_NM)}, or two wavelengths "
                           "like [\"250 nm\", \"280 nm\"]")
        return name, BANDS_NM[name]
    if isinstance(value, list) and len(value) == 2:
        lo, hi = (_wavelength_nm(ctx, key, v) for v in value)
        if not lo < hi:
            raise ctx.fail(key, f"band {value!r} is empty", "give the shorter wavelength first")
        return None, (lo, hi)
    raise ctx.fail(key, f"expected a band name or two wavelengths, got {value!r}",
                   "e.g. band = \"UV-C\" or band = [\"250 nm\", \"280 nm\"]")


def _temperature_K(ctx: _Ctx, key: str, value: Any) -> float:
    m = re.fullmatch(r"\s*(\d+(?:\.\d+)?)\s*K\s*", value) if isinstance(value, str) else None
    if not m or float(m.group(1)) <= 0:
        raise ctx.fail(key, f"expected a temperature in kelvin, got {value!r}",
                       "write it like '2800 K'")
    return float(m.group(1))


def _check_keys(ctx: _Ctx, table: Mapping[str, Any], known: tuple[str, ...], prefix: str,
                context: str) -> None:
    for k in table:
        if k not in known:
            near = difflib.get_close_matches(k, known, n=1)
            hint = f"did you mean {near[0]!r}? " if near else ""
            raise ctx.fail(f"{prefix}{k}" if prefix else k, f"unknown key {k!r} in {context}",
                           f"{hint}known keys: {', '.join(known)}")


def _technologies() -> dict[str, str]:
    from uvcheck.data_files import read_toml

    keys = list(read_toml("technologies.toml")) + list(EXTRA_TECHNOLOGIES)
    return {k.lower(): k for k in keys}


def _covers() -> dict[str, str]:
    from uvcheck.data_files import read_toml

    out: dict[str, str] = {}
    for key, entry in read_toml("emitters/lamp_models.toml")["covers"].items():
        out[key.replace("_", " ")] = key
        for n in entry["names"]:
            out[n.lower()] = key
    return out


def _packages() -> dict[str, str]:
    from uvcheck.data_files import read_toml

    return {k.lower(): k for k in read_toml("emitters/led_packages.toml")["packages"]}


# ---------------------------------------------------------------------------------------------
# Parsing
# ---------------------------------------------------------------------------------------------

def parse_listing(text: str, name: str = "<listing>") -> Listing:
    """Parse the text of a listing file into a :class:`Listing`.

    text : the TOML text.
    name : the file name to use in error messages.

    Examples
    --------
    >>> L = parse_listing('[product]\\nname = "Demo (invented)"\\n[lamp]\\npeak_wavelength = "254nm"\\n'
    ...                   '[[claims]]\\ntext = "kills 99.9 % of germs in 30 minutes"')
    >>> L.peak_wavelength_nm, L.claims[0].kind, L.claims[0].time_s
    (254.0, 'inactivation', 1800.0)
    """
    lines = key_lines(text)
    ctx = _Ctx(name, lines)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise _syntax_error(exc, name, text, lines) from None
    _check_keys(ctx, data, _TOP_KEYS, "", "the listing (top level)")
    if "format" in data and data["format"] != FORMAT_ID:
        raise ctx.fail("format", f"unknown format {data['format']!r}",
                       f"this uvcheck reads {FORMAT_ID!r}")
    tables: dict[str, dict[str, Any]] = {}
    for t in _SCHEMA:
        v = data.get(t, {})
        if not isinstance(v, dict):
            raise ctx.fail(t, f"{t!r} must be a table ([{t}])")
        _check_keys(ctx, v, tuple(_SCHEMA[t]), f"{t}.", f"[{t}]")
        tables[t] = v
    product, lamp, leds_t, use = (tables[t] for t in ("product", "lamp", "leds", "use"))
    if "name" not in product:
        raise ctx.fail("product", "the listing has no product name",
                       "add [product] with name = \"…\"")
    if not str(product["name"]).strip():
        raise ctx.fail("product.name", "the product name is empty",
                       "write the name as sold, e.g. name = \"UV-C wand (invented)\"")

    def get(t: str, k: str, conv: Any, *args: Any) -> Any:
        tab = tables[t]
        return conv(ctx, f"{t}.{k}", tab[k], *args) if k in tab else None

    fields: dict[str, Any] = {
        "name": get("product", "name", _text),
        "seller_note": get("product", "seller_note", _text),
        "invented": bool(get("product", "invented", _bool)),
        "listing_text": get("product", "listing_text", _text),
        "technology": get("lamp", "technology", _choice, _technologies(), "technology"),
        "peak_wavelength_nm": get("lamp", "peak_wavelength", _wavelength_nm),
        "fwhm_nm": None if "fwhm" not in lamp else _to_nm(
            _quantity(ctx, "lamp.fwhm", lamp["fwhm"], "length")),
        "optical_power_W": get("lamp", "optical_power", _quantity, "power"),
        "electrical_power_W": get("lamp", "electrical_power", _quantity, "power"),
        "supply_voltage_V": get("lamp", "supply_voltage", _quantity, "voltage"),
        "cover": get("lamp", "cover", _choice, _covers(), "cover material"),
        "cover_text": lamp.get("cover") if isinstance(lamp.get("cover"), str) else None,
        "filtered": get("lamp", "filtered", _bool),
        "emitter": get("lamp", "emitter", _choice, {e: e for e in EMITTERS}, "emitter model"),
        "tube_length_m": get("lamp", "tube_length", _quantity, "length"),
        "source_size_m": get("lamp", "source_size", _quantity, "length"),
        "colour_temperature_K": get("lamp", "colour_temperature", _temperature_K),
        "use_distance_m": get("use", "distance", _quantity, "length"),
        "area_m2": get("use", "area", _quantity, "area"),
        "room_volume_m3": get("use", "room_volume", _quantity, "volume"),
        "room_height_m": get("use", "room_height", _quantity, "length"),
    }
    if "band" in lamp:
        fields["band_name"], fields["band_nm"] = _band(ctx, "lamp.band", lamp["band"])
    if "optical_power_band" in lamp:
        key, v = "lamp.optical_power_band", lamp["optical_power_band"]
        pb = _text(ctx, key, v).strip()
        if pb.lower() == "total":
            fields["optical_power_band"] = "total"
        elif band_from_name(pb) is not None:
            fields["optical_power_band"] = band_from_name(pb)
        else:
            raise ctx.fail(key, f"unknown band {v!r}", f"one of: total, {', '.join(BANDS_NM)}")
        if "optical_power" not in lamp:
            raise ctx.fail(key, "optical_power_band without optical_power",
                           "add optical_power = \"…\" to [lamp]")
    if fields["emitter"] == "tube" and fields["tube_length_m"] is None:
        raise ctx.fail("lamp.emitter", "the tube model needs the tube's arc length",
                       "add tube_length = \"0.55 m\" to [lamp]")
    if leds_t:
        fields["leds"] = _leds(ctx, leds_t)
    claims_raw = data.get("claims", [])
    if not isinstance(claims_raw, list):
        raise ctx.fail("claims", "claims must be an array of tables ([[claims]])")
    claims = []
    seen: set[str] = set()
    for i, c in enumerate(claims_raw, 1):
        claim = _claim(ctx, c, i)
        if claim.id in seen:
            raise ctx.fail(f"claims[{i}].id", f"claim id {claim.id!r} is used twice",
                           "give every claim its own id")
        seen.add(claim.id)
        claims.append(claim)
    fields["claims"] = tuple(claims)
    fields["key_lines"] = MappingProxyType(dict(lines))
    return Listing(**fields)


def _leds(ctx: _Ctx, t: dict[str, Any]) -> LedArray:
    kw: dict[str, Any] = {}
    for k, conv in (("count", _count), ("series", _count), ("strings", _count),
                    ("dies_per_package", _count)):
        if k in t:
            kw[k] = conv(ctx, f"leds.{k}", t[k])
    for k, attr, kind in (("string_voltage", "string_voltage_V", "voltage"),
                          ("forward_voltage", "forward_voltage_V", "voltage"),
                          ("current", "current_A", "current")):
        if k in t:
            kw[attr] = _quantity(ctx, f"leds.{k}", t[k], kind)
    if "package" in t:
        kw["package"] = _choice(ctx, "leds.package", t["package"], _packages(), "LED package class")
    arr = LedArray(**kw)
    dies = (arr.count or 0) * arr.dies_per_package
    if arr.series and arr.strings and arr.count and arr.series * arr.strings != dies:
        raise ctx.fail("leds.strings",
                       f"{arr.strings} strings of {arr.series} make {arr.series * arr.strings} "
                       f"dies, but count × dies_per_package is {dies}",
                       "correct count, series, strings or dies_per_package")
    if arr.series and arr.count and arr.series > dies:
        raise ctx.fail("leds.series", f"{arr.series} in series but only {dies} dies")
    return arr


def _claim(ctx: _Ctx, raw: Any, i: int) -> Claim:
    base = f"claims[{i}]"
    if not isinstance(raw, dict):
        raise ctx.fail(base, "each claim must be a table ([[claims]])")
    _check_keys(ctx, raw, _ALL_CLAIM_KEYS, f"{base}.", f"claim {i}")
    cid = raw.get("id", f"c{i}")
    if not isinstance(cid, str) or not re.fullmatch(r"[A-Za-z0-9_.-]+", cid):
        raise ctx.fail(f"{base}.id", f"claim id {cid!r} must be letters, digits, '_', '.' or '-'")
    text = _text(ctx, f"{base}.text", raw["text"]) if "text" in raw else None
    line = _lookup_line(ctx.lines, base)
    if "kind" not in raw:
        extra = [k for k in raw if k not in _CLAIM_COMMON]
        if extra:
            raise ctx.fail(f"{base}.{extra[0]}", f"claim field {extra[0]!r} given without a kind",
                           f"add kind = one of {', '.join(CLAIM_KINDS[:-1])}")
        if text is None:
            raise ctx.fail(base, "a claim needs a text or a kind",
                           "add text = \"…\" (the wording as sold) or kind = \"…\" with fields")
        c = parse_claim_text(text, cid)
        return _replace(c, line=line)
    kind = _text(ctx, f"{base}.kind", raw["kind"])
    if kind not in CLAIM_KINDS:
        near = difflib.get_close_matches(kind, CLAIM_KINDS, n=1)
        hint = f"did you mean {near[0]!r}? " if near else ""
        raise ctx.fail(f"{base}.kind", f"unknown claim kind {kind!r}",
                       f"{hint}kinds: {', '.join(CLAIM_KINDS)}")
    allowed = KIND_FIELDS[kind]
    for k in raw:
        if k not in _CLAIM_COMMON and k not in allowed:
            raise ctx.fail(f"{base}.{k}", f"key {k!r} does not belong to a {kind} claim",
                           f"a {kind} claim takes: {', '.join(allowed) or 'no fields'}")
    kw: dict[str, Any] = {"id": cid, "kind": kind, "text": text, "structured": True, "line": line}
    f = lambda k: f"{base}.{k}"  # noqa: E731
    if "wavelength" in raw:
        v = raw["wavelength"]
        if isinstance(v, list) and kind == "emission":
            # several wavelengths, every one of which the claim says the lamp emits
            if not v:
                raise ctx.fail(f("wavelength"), "the list of wavelengths is empty",
                               "e.g. wavelength = [\"365 nm\", \"254 nm\"]")
            wls = list(dict.fromkeys(_wavelength_nm(ctx, f("wavelength"), x) for x in v))
            kw["wavelength_nm"] = wls[0]
            if len(wls) > 1:
                kw["wavelengths_nm"] = tuple(wls)
        else:
            kw["wavelength_nm"] = _wavelength_nm(ctx, f("wavelength"), v)
    if "band" in raw:
        v = raw["band"]
        if (kind == "emission" and isinstance(v, list) and v
                and all(isinstance(x, str) and band_from_name(x) for x in v)):
            # several band names (["UV-A", "UV-C"]): the claim says the lamp emits in each
            names = list(dict.fromkeys(band_from_name(x) for x in v))
            kw["band_name"], kw["band_nm"] = names[0], BANDS_NM[names[0]]
            if len(names) > 1:
                kw["bands"] = tuple(names)
        elif kind == "no-emission":
            names = [v] if isinstance(v, str) else v
            if (not isinstance(names, list) or not names
                    or not all(isinstance(x, str) and _deniable(x) for x in names)):
                raise ctx.fail(f("band"), f"unknown band {v!r}",
                               f"use one of {', '.join(DENIABLE_BANDS_NM)}, or a list of them")
            got = list(dict.fromkeys(_deniable(x) for x in names))
            kw["band_name"], kw["band_nm"] = got[0], DENIABLE_BANDS_NM[got[0]]
            kw["bands"] = tuple(got)
        else:
            kw["band_name"], kw["band_nm"] = _band(ctx, f("band"), v)
    if "reduction" in raw and "log_reduction" in raw:
        raise ctx.fail(f("log_reduction"), "give reduction or log_reduction, not both")
    if "reduction" in raw:
        v = raw["reduction"]
        try:
            q = parse_quantity(v, "fraction", ctx.where(f("reduction")))
        except UvcheckError as exc:
            raise InputFormatError(exc.what, ctx.where(f("reduction")), exc.todo) from None
        if not 0.0 < q.value_si <= 1.0:
            raise ctx.fail(f("reduction"), f"{v!r} is not a reduction between 0 and 100 %",
                           "write it like '99.9 %'")
        kw.update(_reduction(q.value_si, None))
    if "log_reduction" in raw:
        v = raw["log_reduction"]
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not 0 < v <= 12:
            raise ctx.fail(f("log_reduction"), f"expected a number of logs (0-12), got {v!r}",
                           "e.g. log_reduction = 3 for 99.9 %")
        kw.update(_reduction(None, float(v)))
    if "organism" in raw:
        org = _text(ctx, f("organism"), raw["organism"]).strip()
        kw["organism"] = org
        kw["organism_generic"] = bool(_GENERIC_ORG_RE.search(org)) and not _SPECIFIC_ORG_RE.search(org)
    for k, attr, kind_q in (("time", "time_s", "time"), ("distance", "distance_m", "length"),
                            ("area", "area_m2", "area"), ("volume", "volume_m3", "volume"),
                            ("power", "power_W", "power"),
                            ("irradiance", "irradiance_W_m2", "irradiance")):
        if k in raw:
            kw[attr] = _quantity(ctx, f(k), raw[k], kind_q)
    if "medium" in raw:
        kw["medium"] = _choice(ctx, f("medium"), raw["medium"], {m: m for m in MEDIA}, "medium")
    if "safe_for" in raw:
        v = raw["safe_for"]
        items = [v] if isinstance(v, str) else v
        if not isinstance(items, list) or not items:
            raise ctx.fail(f("safe_for"), f"expected a list of subjects, got {v!r}",
                           f"e.g. safe_for = [\"people\", \"pets\"]; subjects: {', '.join(SUBJECTS)}")
        kw["safe_for"] = tuple(_choice(ctx, f("safe_for"), s, {s: s for s in SUBJECTS}, "subject")
                               for s in items)
    if "efficiency" in raw:
        v = raw["efficiency"]
        try:
            q = parse_quantity(v, "fraction", ctx.where(f("efficiency")))
        except UvcheckError as exc:
            raise InputFormatError(exc.what, ctx.where(f("efficiency")), exc.todo) from None
        if not 0.0 < q.value_si <= 1.5:
            raise ctx.fail(f("efficiency"), f"{v!r} is not an efficiency", "write it like '35 %'")
        kw["efficiency_fraction"] = q.value_si
    if "efficiency_of" in raw:
        kw["efficiency_of"] = _choice(ctx, f("efficiency_of"), raw["efficiency_of"],
                                      {"uv-c": "UV-C", "uvc": "UV-C", "optical": "optical"},
                                      "efficiency basis")
    if "risk_group" in raw:
        kw["risk_group"] = _choice(ctx, f("risk_group"), str(raw["risk_group"]).replace(" ", ""),
                                   {"exempt": "Exempt", "rg0": "Exempt", "0": "Exempt",
                                    "rg1": "RG1", "1": "RG1", "rg2": "RG2", "2": "RG2",
                                    "rg3": "RG3", "3": "RG3"}, "risk group")
    if "agency" in raw:
        kw["agency"] = _choice(ctx, f("agency"), raw["agency"], {"epa": "EPA", "fda": "FDA"},
                               "agency")
    return Claim(**kw)


def _reduction(fraction: float | None, log: float | None) -> dict[str, Any]:
    if log is not None:
        return {"log_reduction": log, "reduction_fraction": 1.0 - 10.0 ** (-log),
                "reduction_stated_as": "log"}
    assert fraction is not None
    fraction = float(f"{fraction:.12g}")  # 99.9/100 -> 0.999, not 0.9990000000000001
    lg = None if fraction >= 1.0 else float(f"{-math.log10(1.0 - fraction):.12g}")
    return {"reduction_fraction": fraction, "log_reduction": lg, "reduction_stated_as": "percent"}


def _replace(c: Claim, **changes: Any) -> Claim:
    return replace(c, **changes)


def _syntax_error(exc: tomllib.TOMLDecodeError, name: str, text: str,
                  lines: dict[str, int]) -> InputFormatError:
    msg = str(exc)
    m = re.search(r"\(at line (\d+), column (\d+)\)", msg)
    what = re.sub(r"\s*\(at (line \d+, column \d+|end of document)\)", "", msg)
    if not m:
        return InputFormatError(f"not valid TOML: {what}", f"{name} (end of file)",
                                "check for an unclosed quote, bracket or table")
    ln, col = int(m.group(1)), int(m.group(2))
    where = f"{name} line {ln}, column {col}"
    keys = [k for k, n in lines.items() if n == ln]
    if keys:
        where += f", key '{keys[-1]}'"
    src = text.splitlines()[ln - 1].strip() if 0 < ln <= len(text.splitlines()) else ""
    return InputFormatError(f"not valid TOML: {what} in {src!r}", where,
                            "quantities are text in quotes, e.g. time = \"30 min\"")


def read_listing(path: str | Path) -> Listing:
    """Read a listing file (UTF-8 TOML). [-]

    path : the file.

    The file's name and sha256 are kept in the result (``source``, ``sha256``).
    """
    p = Path(path)
    if not p.is_file():
        raise InputFormatError("listing file not found" if not p.exists() else "not a file",
                               str(p), "check the path")
    raw = p.read_bytes()
    if b"\x00" in raw:
        raise InputFormatError("this is a binary file, not a TOML listing", str(p),
                               "write the listing as UTF-8 text (see examples/listings/README.md)")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputFormatError(f"not UTF-8 text (byte {exc.start})", str(p),
                               "save the listing as UTF-8") from None
    listing = parse_listing(text, str(p))
    return replace(listing, source=str(p), sha256=hashlib.sha256(raw).hexdigest())


# ---------------------------------------------------------------------------------------------
# Free-text claims
# ---------------------------------------------------------------------------------------------

_NUM = r"(\d+(?:[.,]\d+)?)"
_PERCENT_RE = re.compile(rf"{_NUM}\s*(?:%|percent\b|per\s*cent\b)", re.I)
_LOG_RE = re.compile(rf"{_NUM}\s*-?\s*logs?(?:10)?\b|\blog\s*-?\s*{_NUM}\b", re.I)
#: A count written with thousands groups ("1,000", "12 000"): areas, volumes, times, distances
#: and powers; percentages keep the decimal comma ("99,9 %").
_BIG = (r"(?<![\d.,])(?<!\d[eE])(\d{1,3}(?:[,\u00a0\u202f ]\d{3})+(?![\d,.])|"
        # a thousands dot (German, French): "1.000", "10.000", "1.000.000"; a dot before
        # exactly 000, or two or more groups, is never a decimal a listing would write
        r"[1-9]\d{0,2}(?:\.000)+(?![\d,.])|[1-9]\d{0,2}(?:\.\d{3}){2,}(?![\d,.])|"
        r"\d+(?:[.,]\d+)?(?:[eE][+-]?\d+(?![\w]))?|\d+\s*/\s*\d+)")
_TIME_RE = re.compile(rf"{_BIG}\s*(seconds?|secs?|s|minutes?|mins?|min|hours?|hrs?|h|"
                      r"sekunden|minuten|stunden?|secondes?|heures?)\b", re.I)
#: Hours and minutes written together ("1h30", "1 h 30 min"). The minutes are below 60.
_H_MIN_RE = re.compile(r"(?<![\d.,])(\d{1,2})\s*h\s*([0-5]\d)(?:\s*(?:min|mins|minutes?)\b)?(?![\d.,])",
                       re.I)
#: Half an hour, as words.
_HALF_HOUR_RE = re.compile(r"\bhalf\s+an?\s+hour\b|\bhalf[\s-]hour\b|\bhalbe[n]?\s+stunde\b|"
                           r"\bdemi[\s-]heure\b", re.I)
#: Time units of other languages, as the unit parser writes them.
_FOREIGN_TIME = {"sekunden": "s", "minuten": "min", "stunde": "h", "stunden": "h",
                 "seconde": "s", "secondes": "s", "heure": "h", "heures": "h"}
#: Words after a time that make it a lamp's life, not a treatment time ("8000 hrs life").
_LIFETIME_AFTER_RE = re.compile(r"^[^\w(\[]{0,3}(?:of\s+)?(?:\w+\s+)?(?:life(?:time|span)?|service|"
                                r"lebensdauer|durée)", re.I)
_LIFETIME_BEFORE_RE = re.compile(r"(?:life(?:time|span)?|lebensdauer|durée de vie)\W{0,3}"
                                 r"(?:of\s+|up\s+to\s+|:\s*)?$", re.I)
#: Times worded without a number -> the longest time the words allow [s]. "In seconds" means
#: less than a minute, "in minutes" less than an hour, "in hours" less than a day, "instantly"
#: within a second (uvcheck's reading of plain English, not a standard). An efficacy claim gets
#: the benefit of the doubt, so it is judged at that longest time, and the verdict says the
#: time was not quantified.
VAGUE_TIMES = {"seconds": (60.0, "less than a minute"), "minutes": (3600.0, "less than an hour"),
               "hours": (86400.0, "less than a day"), "instantly": (1.0, "within a second")}
_VAGUE_TIME_RE = re.compile(
    r"(?<![\d.,])(?<![\d.,]\s)\b(?:(?:just|only|mere|a\s+few|few|a\s+couple\s+of|several)\s+)?"
    r"(seconds|minutes|hours)\b|\b(instant(?:ly)?|immediately)\b", re.I)
_AREA_RE = re.compile(rf"{_BIG}\s*(m²|m2\b|m\^2|sq\.?\s*m\b|sqm\b|square\s+met(?:re|er)s?|"
                      r"ft²|ft2\b|sq\.?\s*ft\b|square\s+f(?:ee|oo)t)", re.I)
_VOLUME_RE = re.compile(rf"{_BIG}\s*(m³|m3\b|m\^3|cubic\s+met(?:re|er)s?|ft³|ft3\b|cu\.?\s*ft\b)",
                        re.I)
_DIST_RE = re.compile(rf"{_BIG}\s*(mm|cm|m|metres?|meters?|inch(?:es)?|ft|feet)(?![\w²³^])", re.I)
_WL_RANGE_RE = re.compile(r"(\d{3}(?:[.,]\d+)?)\s*(?:nm)?\s*(?:-|–|to)\s*(\d{3}(?:[.,]\d+)?)\s*nm\b",
                          re.I)
_WL_RE = re.compile(r"(\d{3}(?:[.,]\d+)?)\s*nm\b", re.I)
_POWER_RE = re.compile(rf"{_BIG}\s*(mW|W|watts?)\b")
#: An irradiance ("2.5 mW/cm²", "120 µW/cm2", "25 W/m²"; not a spectral one, per nm).
_IRRADIANCE_RE = re.compile(rf"{_BIG}\s*((?:[mµμu]|micro|milli)?W\s*/\s*(?:c?m)\s*(?:²|2|\^\s*2))"
                            r"(?!\s*(?:/|per\s)\s*(?:nm|µm|um))", re.I)
_KILL_RE = re.compile(r"\b(kill\w*|inactivat\w*|eliminat\w*|destroy\w*|remov\w*|disinfect\w*|"
                      r"efficacy|germicidal\s+(?:rate|effect)|"
                      r"sterili[sz]\w*|saniti[sz]\w*|neutrali[sz]\w*|reduc\w*|"
                      r"get\s+rid\s+of|wipes?\s+out|"
                      # French and German wordings of the same (our own short list)
                      r"tuent?|élimin\w*|détrui\w*|désinfect\w*|tötet|abtöt\w*|vernicht\w*|"
                      r"beseitig\w*|desinfizier\w*)\b", re.I)
#: What a lamp may claim to remove that is no organism (odours, fumes).
_ODOUR_RE = re.compile(r"\b(?:odou?rs?|smells?|stinks?|fumes?|formaldehyde|vocs?|geruch\w*|"
                       r"odeurs?)\b", re.I)
#: Generic organism words of other languages, read as their English word.
_FOREIGN_ORG = {"bactéries": "bacteria", "bacteries": "bacteria", "germes": "germs",
                "microbes": "microbes", "bakterien": "bacteria", "keime": "germs",
                "viren": "viruses", "erreger": "pathogens", "moisissures": "mold", "schimmel": "mold"}
_SPECIFIC_ORG_RE = re.compile(
    r"\b(e\.?\s*coli|s(?:taph(?:ylococcus)?)?\.\s*aureus|staphylococcus\s+aureus|mrsa|"
    r"sars[\s-]*cov[\s-]*2|covid(?:[\s-]*19)?|coronavirus(?:es)?|influenza|flu\s+virus(?:es)?|"
    r"h\d{1,2}n\d{1,2}|(?:swine\s+|bird\s+|avian\s+)?flu|"
    r"norovirus|ms2|legionella|pseudomonas|salmonella|listeria|candida|aspergillus|"
    r"c\.?\s*diff(?:icile)?|tubercul\w*|dust\s+mites?|mites?)\b", re.I)
_GENERIC_ORG_RE = re.compile(
    r"\b(germs?|bacteria|bacterium|virus(?:es)?|microbes?|micro-?organisms?|pathogens?|"
    r"(?:mou?ld|fung(?:al|us))\s+spores?|bacterial\s+spores?|mou?lds?|fungi|fungus|spores?|"
    r"bact[ée]ries|germes|bakterien|keime|viren|erreger|moisissures|schimmel)\b",
    re.I)
_AIR_RE = re.compile(r"\b(air(?:borne)?|aerosols?)\b", re.I)
_SURFACE_RE = re.compile(r"\b(surfaces?|objects?|items?|phones?|toothbrush\w*|keyboards?|masks?|"
                         r"bedding|mattress\w*|toys?|countertops?|bottles?|shoes?)\b", re.I)
#: Ozone written in the languages and misspellings listings use (ozone, ozon, ozono, O3).
_OZ = r"(?:ozon[eo]?|o3)"
#: Wordings that the lamp makes no ozone ("ozone-free", "0 ozone", "Ozonfrei", "sans ozone").
_OZONE_FREE_RE = re.compile(
    rf"\b{_OZ}[\s-]*(?:free|frei|fee)\b|\b(?:no|zero|z[ée]ro|non|sans|ohne|kein\w*|sin|"
    rf"libre\s+de)[\s-]+{_OZ}\b|\bwithout\s+(?:any\s+)?{_OZ}\b|\b0\s*(?:ppm\s+)?{_OZ}\b|"
    rf"\b{_OZ}\s*[:=]\s*(?:none|no|nil|zero|0)\b|"
    rf"(?:does\s+not|doesn'?t|won'?t|will\s+not|never)\s+(?:produce|generate|emit|create|make|"
    rf"release)\s+(?:any\s+)?{_OZ}\b|\b(?:no|without)\s+(?:the\s+)?18[45](?:\.\d)?\s*nm|"
    # "free of ozone", "ozone-less", "no harmful ozone", "ozone is not produced"
    rf"\bfree\s+(?:of|from)\s+(?:any\s+)?{_OZ}\b|\b{_OZ}[\s-]*less\b|"
    rf"\bno\s+(?:harmful|residual|toxic|dangerous|secondary)\s+{_OZ}\b|"
    rf"\b{_OZ}\s+(?:is\s+)?(?:not|never)\s+(?:produced|generated|emitted|created|released)\b",
    re.I)
#: "not ozone-free", "isn't ozone free": the negation of an ozone-free wording.
_OZONE_NOT_FREE_RE = re.compile(
    rf"\b(?:not|isn'?t|aren'?t|nicht|pas|never)\s+(?:an?\s+|100\s*%\s+|fully\s+|completely\s+|"
    rf"entirely\s+|totally\s+|really\s+)?{_OZ}[\s-]*(?:free|frei)", re.I)
#: "produces ozone", "generates ozone": the lamp makes ozone (unless negated before the verb).
_OZONE_MAKES_RE = re.compile(
    rf"\b(?:produc|generat|emit|creat|mak|releas|form|giv)\w*\s+(?:off\s+)?"
    rf"(?:some\s+|a\s+little\s+|small\s+amounts?\s+of\s+|traces?\s+of\s+)?{_OZ}\b"
    rf"(?![\s-]*(?:free|frei))", re.I)
_OZONE_VERB_NEGATED_RE = re.compile(r"(?:\bnot|n't|\bnever|\bno)\s+(?:\w+\s+)?$", re.I)
#: Any mention of ozone or of the 184.9 nm line that makes it ("UVC + ozone 185nm").
_OZONE_MENTION_RE = re.compile(rf"\b{_OZ}\b|\bozonfrei|\b18[45](?:\.\d)?\s*nm", re.I)
#: A wording that puts ozone among what the lamp gives ("UV-C + ozone", "with ozone", "ozone
#: mode", "ozone sterilisation") or names the 184.9 nm line that makes it ("254nm + 185nm").
_OZONE_GIVEN_RE = re.compile(
    rf"\+\s*{_OZ}\b|\b{_OZ}\s*\+|\b(?:with|and|plus|und|avec|et)\s+{_OZ}\b|"
    rf"\b{_OZ}\s+(?:mode|function|generat\w*|sterili[sz]\w*|disinfect\w*|lamp|"
    rf"deodori[sz]\w*|purif\w*|cleaning|output)\b|\b18[45](?:\.\d)?\s*nm", re.I)


#: How far before "produces ozone" a negation is looked for ("does not produce"): two short
#: words (our own rule). [characters]
NEGATION_REACH = 24


def _makes_ozone_wording(text: str) -> bool:
    """The text says outright that the lamp makes ozone ("produces ozone", "not ozone-free")."""
    if _OZONE_NOT_FREE_RE.search(text):
        return True
    return any(not _OZONE_VERB_NEGATED_RE.search(text[max(0, m.start() - NEGATION_REACH):m.start()])
               for m in _OZONE_MAKES_RE.finditer(text))


def says_ozone_free(text: str | None) -> bool:
    """The wording claims the lamp makes no ozone ("ozone-free", "0 ozone emission",
    "Ozonfrei", "sans ozone", "ozone: none"), and does not negate it ("not ozone-free",
    "produces ozone").

    Examples
    --------
    >>> [says_ozone_free(t) for t in ("0 ozone emission", "ozon free", "not ozone free")]
    [True, True, False]
    """
    t = text or ""
    return bool(_OZONE_FREE_RE.search(t)) and not _makes_ozone_wording(t)


def says_ozone_made(text: str | None) -> bool:
    """The wording says (or implies) that the lamp makes ozone or emits the 185 nm line that
    makes it ("produces ozone", "not ozone-free", "UV-C + ozone", "ozone mode", "254nm +
    185nm"), and is not an ozone-free wording. A bare mention of ozone ("ozone tested") is not
    such a statement.

    Examples
    --------
    >>> [says_ozone_made(t) for t in ("produces ozone", "0 ozone emission", "UV-C + ozone",
    ...                               "free of ozone", "ozone level tested")]
    [True, False, True, False, False]
    """
    t = text or ""
    if _makes_ozone_wording(t):
        return True
    return bool(_OZONE_GIVEN_RE.search(t)) and not says_ozone_free(t)


def ozone_statement(claims: Any, besides: Any = None) -> Any | None:
    """The first claim (other than ``besides``) whose text says the lamp makes ozone or emits
    185 nm (:func:`says_ozone_made`; an ozone-free claim is not one), or None."""
    for c in claims or ():
        if c is not besides and c.kind != "ozone-free" and says_ozone_made(c.text):
            return c
    return None


#: "radiation-free": a UV lamp emits radiation by its nature, so the wording is read as a
#: safety claim for people (our own reading).
_RADIATION_FREE = r"\bradiation[\s-]*free\b|\bno\s+(?:harmful\s+)?radiation\b"
_RADIATION_FREE_RE = re.compile(_RADIATION_FREE, re.I)
_SAFE_RE = re.compile(r"\bsafe\b|\bsafely\b|harmless|\bno\s+harm\b|-safe\b|\bnot\s+harmful\b|"
                      r"\bno\s+(?:danger|risk|hazard)\s+(?:to|for)\b|\bkeine\s+gefahr\b|"
                      r"\b(?:pets?|animals?|child(?:ren)?|kids?|bab(?:y|ies)|family)[\s-]*friendly\b|"
                      # German and French (a short list, as for the kill words)
                      r"\bsicher\b|\bunbedenklich|\bungefährlich|\bharmlos\b|"
                      r"\bsans\s+danger\b|\bsans\s+risque\b|\binoffensi(?:f|ve)\b|"
                      r"\bs[ûu]re?\s+pour\b|"
                      + _RADIATION_FREE, re.I)


def _unit_characters(text: str) -> str:
    """Unit characters such as '㎡' and '㎝' written out ('m²', 'cm')."""
    return text.translate(UNIT_CHARACTERS)
_NEGATION_RE = re.compile(r"\b(not\s+safe|unsafe|do\s+not|don'?t|never\s+(?:look|expose)|avoid|"
                          r"nicht\s+sicher|unsicher|gefährlich|warnung|vorsicht|niemals|"
                          r"dangereux|dangereuse|attention|avertissement|jamais|ne\s+pas|"
                          r"(?<!no\s)(?<!not\s)harmful|dangerous|warning|caution|"
                          r"keep\s+(?:\w+\s+){0,4}?(?:away|out)|out\s+of\s+(?:the\s+)?reach)\b", re.I)
#: Use while people are in the room, said as a safety claim ("can be used while people are
#: present", "no need to leave the room", "you don't have to leave the room"): our own reading
#: of plain English and German. Its "don't" is no negation of the claim.
_OCCUPIED_USE_RE = re.compile(
    r"\b(?:can|may|could)\s+(?:safely\s+)?be\s+used\s+(?:while|when|with|in\s+the\s+presence\s+of)"
    r"\s+(?:people|persons|humans|you|someone|anyone|occupants|others|family)"
    r"(?:\s+(?:are|is))?(?:\s+(?:present|around|in\s+the\s+room|inside|there|at\s+home))?|"
    r"\bno\s+need\s+to\s+(?:leave|vacate|exit)\s+the\s+room\b|"
    r"\b(?:don'?t|do\s+not|needn'?t|need\s+not|never)\s+(?:have\s+|need\s+)?to\s+(?:leave|vacate|"
    r"exit)\s+the\s+room\b|\bwithout\s+(?:having\s+to\s+)?(?:leav|vacat|exit)\w*\s+the\s+room\b|"
    r"\bwährend\s+(?:Personen|Menschen|Leute)\s+(?:im\s+Raum\s+)?anwesend\b|"
    r"\bpendant\s+que\s+(?:des\s+)?(?:personnes|gens)\s+(?:sont\s+)?présent", re.I)
#: Where a safety wording and a caution beside it part: a safety claim with a caution in the
#: same text ("safe for pets (do not look into the lamp)") is still a safety claim; only a
#: negation in its own clause ("not safe for eyes") undoes it.
_CLAUSE_SPLIT_RE = re.compile(r"[,;()\[\]!?]|\.(?:\s|$)|:\s|\s[-–—]\s")


def _unnegated_clauses(text: str) -> list[str]:
    """The clauses of ``text`` without a negation or caution of their own (use in an occupied
    room taken out first: its "don't have to leave" negates nothing)."""
    return [c for c in _CLAUSE_SPLIT_RE.split(_OCCUPIED_USE_RE.sub(" ", text))
            if c and c.strip() and not _NEGATION_RE.search(c)]


_SUBJECT_RES = (
    ("people", re.compile(r"\b(people|humans?|persons?|adults?|family|families|everyone|users?|"
                          r"menschen|personen|familie|personnes|humains?|adultes?|"
                          r"famille)\b", re.I)),
    ("children", re.compile(r"\b(child(?:ren)?|kids?|bab(?:y|ies)|infants?|kinder[n]?|babys?|"
                            r"enfants?|bébés?)\b", re.I)),
    ("pets", re.compile(r"\b(pets?|animals?|dogs?|cats?|haustiere[n]?|tiere[n]?|hunde?|katzen?|"
                        r"animaux|chiens?)\b", re.I)),
    ("plants", re.compile(r"\b(plants?|pflanzen|plantes?)\b", re.I)),
    ("occupied-rooms", re.compile(r"\b(occupied|while\s+(?:you|people)\s+are\s+(?:present|in)|"
                                  r"with\s+people\s+present|in\s+presence)\b|"
                                  + _OCCUPIED_USE_RE.pattern, re.I)),
    ("eyes", re.compile(r"\b(eyes?|augen|yeux)\b", re.I)),
    # German 'Haut' capitalised only: French 'haut' means high
    ("skin", re.compile(r"\b(?:(?i:skin|peau)|Haut)\b")),
)
_EFFICIENCY_RE = re.compile(r"efficien", re.I)
#: A stated IEC 62471 risk group: "Risk group 1", "RG0", "RG 2", "risk group: exempt", "exempt
#: group (EN 62471)"; "exempt" alone counts only beside a risk-group or photobiological wording.
_RG_RE = re.compile(r"\b(?:risk[\s-]*group|RG)\s*[:#-]?\s*(0|1|2|3|III|II|I|exempt)\b", re.I)
_RG_CONTEXT_RE = re.compile(r"risk[\s-]*group|\bRG\b|62471|photobiolog", re.I)
_EXEMPT_RE = re.compile(r"\bexempt\b", re.I)
_RG_WORDS = {"0": "Exempt", "exempt": "Exempt", "1": "RG1", "i": "RG1", "2": "RG2", "ii": "RG2",
             "3": "RG3", "iii": "RG3"}
#: A claimed approval by an agency ("EPA approved", "approved by the FDA", "FDA-certified");
#: an EPA establishment number is not a claim of approval and does not match.
_APPROVAL_RE = re.compile(r"\b(EPA|FDA)\b[\s-]*(approv\w*|certifi\w*|register\w*|clear\w*|"
                          r"authori[sz]\w*)|\b(?:approv\w*|certifi\w*|register\w*|clear\w*)\s+"
                          r"(?:by\s+)?(?:the\s+)?(?:US\s+)?(EPA|FDA)\b", re.I)


def _stated_risk_group(text: str) -> str | None:
    """The IEC 62471 risk group a text states, or None."""
    m = _RG_RE.search(text)
    if m:
        return _RG_WORDS[m.group(1).lower()]
    if _EXEMPT_RE.search(text) and _RG_CONTEXT_RE.search(text):
        return "Exempt"
    return None


def _stated_agency(text: str) -> str | None:
    """The agency a text says approved the product (EPA, FDA), or None."""
    m = _APPROVAL_RE.search(text)
    return None if m is None else (m.group(1) or m.group(3)).upper()
_OUTPUT_RE = re.compile(r"\b(output|optical|radiant|radiated|emits?|emission|uv[\s-]*c?\s+power|"
                        r"uv[\s-]*c?\s+output|irradiat\w*)\b", re.I)
_BAND_WORD_RE = re.compile(r"\b(far[\s-]?uv[\s-]?c?|uv[\s-]?[abc])\b", re.I)

def _num(s: str) -> float:
    return float(s.replace(",", "."))


def _big(s: str, found: dict[str, Any] | None = None) -> float:
    """A number as written in a count: thousands groups ("1,000" → 1000, "12 000" → 12000,
    noted in ``found['thousands']``), a fraction ("1/2" → 0.5), else :func:`_num`."""
    t = s.strip()
    if (re.fullmatch(r"\d{1,3}(?:[,\u00a0\u202f ]\d{3})+", t) and not t.startswith("0")) or \
            re.fullmatch(r"[1-9]\d{0,2}(?:\.000)+|[1-9]\d{0,2}(?:\.\d{3}){2,}", t):
        if found is not None:
            found.setdefault("thousands", t)
        return float(re.sub(r"\D", "", t))
    m = re.fullmatch(r"(\d+)\s*/\s*(\d+)", t)
    if m:
        den = int(m.group(2))
        return int(m.group(1)) / den if den else math.nan
    return _num(t)


def _find_quantities(text: str) -> dict[str, Any]:
    """Every quantity the free-text reader can find, in SI (wavelength in nm)."""
    found: dict[str, Any] = {}
    spans: list[tuple[int, int]] = []

    def free(m: re.Match) -> bool:
        return all(m.end() <= a or m.start() >= b for a, b in spans)

    for m in _AREA_RE.finditer(text):
        found.setdefault("area_m2", parse_quantity(
            f"{_big(m.group(1), found)} {m.group(2).lower()}", "area").value_si)
        spans.append(m.span())
    for m in _VOLUME_RE.finditer(text):
        found.setdefault("volume_m3", parse_quantity(
            f"{_big(m.group(1), found)} {m.group(2).lower()}", "volume").value_si)
        spans.append(m.span())
    m = _WL_RANGE_RE.search(text)
    if m:
        lo, hi = sorted((_num(m.group(1)), _num(m.group(2))))
        if lo < hi:
            found["band_nm"] = (lo, hi)
        spans.append(m.span())
    wl_matches = [m for m in _WL_RE.finditer(text) if free(m)]
    for m, neg in zip(wl_matches, _negated(text, wl_matches)):
        spans.append(m.span())
        if not neg:  # "no 185 nm" says what the lamp does not emit
            found.setdefault("wavelengths_nm", [])
            if _num(m.group(1)) not in found["wavelengths_nm"]:
                found["wavelengths_nm"].append(_num(m.group(1)))
            found.setdefault("wavelength_nm", _num(m.group(1)))
    for m in _PERCENT_RE.finditer(text):
        found.setdefault("percent", _num(m.group(1)))
        found.setdefault("percent_span", m.span())
        spans.append(m.span())
    m = _LOG_RE.search(text)
    if m:
        found["log"] = _num(m.group(1) or m.group(2))
        spans.append(m.span())
    for m in _H_MIN_RE.finditer(text):          # "1h30", "1 h 30 min"
        if free(m):
            found.setdefault("time_s", int(m.group(1)) * 3600.0 + int(m.group(2)) * 60.0)
            spans.append(m.span())
    for m in _HALF_HOUR_RE.finditer(text):       # "half an hour", "demi-heure"
        if free(m):
            found.setdefault("time_s", 1800.0)
            spans.append(m.span())
    for m in _TIME_RE.finditer(text):
        if free(m):
            spans.append(m.span())
            if (_LIFETIME_AFTER_RE.match(text[m.end():]) or _LIFETIME_BEFORE_RE.search(
                    text[:m.start()])):
                unit = m.group(2).lower()
                found.setdefault("lifetime_s", parse_quantity(
                    f"{_big(m.group(1))} {_FOREIGN_TIME.get(unit, unit)}", "time").value_si)
                continue  # the lamp's life, not how long a treatment takes
            unit = m.group(2).lower()
            found.setdefault("time_s", parse_quantity(
                f"{_big(m.group(1), found)} {_FOREIGN_TIME.get(unit, unit)}", "time").value_si)
    if "time_s" not in found:
        for m in _VAGUE_TIME_RE.finditer(text):
            if free(m):
                word = (m.group(1) or "instantly").lower()
                found["time_s"], found["time_word"] = VAGUE_TIMES[word][0], word
                spans.append(m.span())
                break
    for m in _IRRADIANCE_RE.finditer(text):
        if free(m):
            # matched in any case: prefixes and lengths lower case, W capital ("MW/CM2" is
            # milliwatts; no listing states megawatts per cm²)
            unit = (re.sub("w", "W", m.group(2).replace(" ", "").lower())
                    .replace("micro", "µ").replace("milli", "m"))
            found.setdefault("irradiance_W_m2", parse_quantity(
                f"{_big(m.group(1), found)} {unit}", "irradiance").value_si)
            spans.append(m.span())
    for m in _DIST_RE.finditer(text):
        if free(m):
            found.setdefault("distance_m", parse_quantity(
                f"{_big(m.group(1), found)} {m.group(2).lower()}", "length").value_si)
            spans.append(m.span())
    for m in _POWER_RE.finditer(text):
        if free(m):
            unit = "W" if m.group(2).lower().startswith("watt") else m.group(2)
            found.setdefault("power_W", parse_quantity(f"{_big(m.group(1), found)} {unit}",
                                                       "power").value_si)
            spans.append(m.span())
    return found


def _organism(text: str) -> tuple[str | None, bool]:
    spec = [m.group(0) for m in _SPECIFIC_ORG_RE.finditer(text)]
    gen = [_FOREIGN_ORG.get(m.group(0).lower(), m.group(0).lower())
           for m in _GENERIC_ORG_RE.finditer(text)]
    names = list(dict.fromkeys(spec + gen))
    if not names:
        return None, False
    return ", ".join(re.sub(r"\s+", " ", n) for n in names), not spec


#: Words that deny what follows ("no UV-A", "without 185 nm", "UV-B free" is handled apart).
_DENY_RE = re.compile(r"\b(?:no|not(?!\s+only)|non|without|zero|free\s+of|nor|except|excluding|"
                      r"never|ohne|kein\w*|sans|sin)\b|n't\b", re.I)
#: Between two items of one list ("no UV-A, UV-B or ozone").
_LIST_SEP_RE = re.compile(r"\s*(?:,|/|&|\+|\bor\b|\band\b|\bnor\b)\s*", re.I)


def _negated(text: str, matches: list[re.Match]) -> list[bool]:
    """For each match (in text order): is it denied ("no UV-A", "without 185 nm", "UV-B
    free")? A denial reaches to the end of its clause (a comma or a stop ends it) and over a
    list that follows it ("no UV-A, UV-B or UV-C"). Our own reading of plain wording."""
    out: list[bool] = []
    prev_end, prev_neg = 0, False
    for m in matches:
        between = text[prev_end:m.start()]
        cut = max(between.rfind(ch) for ch in ",.;:!?()[]\n")
        if prev_neg and prev_end and _LIST_SEP_RE.fullmatch(between):
            neg = True
        else:
            neg = bool(_DENY_RE.search(between[cut + 1:]))
        if re.match(r"[\s-]*free\b", text[m.end():], re.I):
            neg = True
        out.append(neg)
        prev_end, prev_neg = m.end(), neg
    return out


def _named_bands(text: str) -> list[tuple[str, bool]]:
    """Every band word of the text, in order: (canonical name, whether it is denied)."""
    found: list[tuple[re.Match, str]] = []
    for m in _BAND_WORD_RE.finditer(text):
        w = m.group(0)
        name = "far-UVC" if re.search(r"far", w, re.I) else band_from_name(w)
        if name is not None:
            found.append((m, name))
    neg = _negated(text, [m for m, _ in found])
    return [(name, n) for (_, name), n in zip(found, neg)]


def _bands_of_text(text: str) -> list[str]:
    """Every band named and not denied, in order, once each ("UVA + UVC" -> UV-A, UV-C)."""
    return list(dict.fromkeys(name for name, denied in _named_bands(text) if not denied))


#: "UV-free", "no UV", "no UV leakage", "free of UV rays", "0 UV", "ohne UV": all UV denied.
_UV_DENIED_RE = re.compile(
    r"\b(?:uv|ultra[\s-]?violet)[\s-]*(?:free|frei)\b|"
    r"\b(?:no|zero|0|without|free\s+(?:of|from)|ohne|kein\w*|sans|sin)\s+(?:harmful\s+|any\s+)?"
    r"(?:uv|ultra[\s-]?violet)(?![\s-]?[abc]\b)(?:\s+(?:light|radiation|rays?|leak\w*|emission))?\b",
    re.I)


def _stated_band(q: dict[str, Any], band_name: str | None) -> dict[str, Any]:
    """The band fields of a claim: a range written as wavelengths ("250-280 nm"), else a
    named band, else none."""
    if "band_nm" in q:
        return {"band_nm": q["band_nm"]}
    if band_name:
        return {"band_name": band_name, "band_nm": BANDS_NM[band_name]}
    return {}


def _deniable(name: str) -> str | None:
    """The canonical name of a band a no-emission claim may name ("UV", "UV-C", …), or None."""
    if re.fullmatch(r"(?i)\s*(?:uv|ultra[\s-]?violet)\s*", name):
        return "UV"
    return band_from_name(name)


def _denied_bands(text: str) -> list[str]:
    """The bands the text says the lamp does not emit in ("UV-free" -> UV; "no UV-B or UV-C"
    -> UV-B, UV-C), in order, once each (:func:`_negated`; our own reading)."""
    out = ["UV"] if _UV_DENIED_RE.search(text) else []
    out += [name for name, denied in _named_bands(text) if denied]
    return list(dict.fromkeys(out))


def _band_of_text(text: str) -> str | None:
    bands = _bands_of_text(text)
    return bands[0] if bands else None


def vague_time_text(word: str) -> str:
    """What a time worded without a number was read as (for notes and verdicts).

    Examples
    --------
    >>> vague_time_text("seconds")
    "the time is not quantified ('seconds' without a number): judged at 1 min, the longest time the word allows (less than a minute; the most favourable reading)"
    """
    from uvcheck.units import format_duration

    t, meaning = VAGUE_TIMES[word]
    return (f"the time is not quantified ('{word}' without a number): judged at "
            f"{format_duration(t)}, the longest time the word allows ({meaning}; the most "
            "favourable reading)")


def _article(word: str) -> str:
    return "an" if word[:1] in "aeiou" else "a"


def parse_claim_text(text: str, claim_id: str = "c1", kind: str | None = None) -> Claim:
    """Turn a claim as worded in a listing into a structured :class:`Claim`.

    Recognised patterns (case-insensitive; one claim per text, the first kind in this order):
    inactivation ("kills 99.9 % of germs in 30 minutes", "3-log reduction of E. coli at
    10 cm"), efficiency ("40 % UV-C efficiency"), coverage ("for rooms up to 20 m²",
    "covers 50 m³"), ozone-free ("ozone-free", "no ozone"), safety ("safe for people and
    pets"), optical power ("UV-C output 2.5 W"), emission ("UV-C 254nm", "222 nm far-UVC").
    Other statements found in the same text are named in ``note`` (give them as separate
    claims to have them checked). Text with none of these becomes kind ``unrecognised``.

    Examples
    --------
    >>> c = parse_claim_text("Kills 99.9% of germs in 30 minutes")
    >>> (c.kind, c.reduction_fraction, round(c.log_reduction, 3), c.organism, c.time_s)
    ('inactivation', 0.999, 3.0, 'germs', 1800.0)
    >>> parse_claim_text("for rooms up to 20 m²").area_m2
    20.0
    >>> parse_claim_text("Sterilizes up to 40 square meters").kind
    'coverage'
    >>> parse_claim_text("safe for pets").safe_for
    ('pets',)
    >>> parse_claim_text("UV-C 254nm").wavelength_nm
    254.0
    """
    if not isinstance(text, str) or not text.strip():
        return Claim(id=claim_id, kind="unrecognised", text=text, structured=False,
                     note="empty text")
    original, text = text, _unit_characters(text)
    q = _find_quantities(text)
    kinds: list[str] = []
    org, generic = _organism(text)
    has_reduction = "percent" in q or "log" in q
    efficiency = bool(_EFFICIENCY_RE.search(text)) and "percent" in q
    # "sterilises up to 40 m²": a kill word with only a room size (no reduction, organism or
    # time) is a coverage statement
    size_only = (not has_reduction and not org and "time_s" not in q and "time_word" not in q
                 and ("area_m2" in q or "volume_m3" in q))
    # "removes odours": a kill word about smells, with no organism or reduction, is no
    # germicidal claim
    odour_only = bool(_ODOUR_RE.search(text)) and not org and not has_reduction
    if ((_KILL_RE.search(text) and not size_only and not odour_only)
            or (has_reduction and org and not efficiency)):
        kinds.append("inactivation")
    if efficiency:
        kinds.append("efficiency")
    if ("area_m2" in q or "volume_m3" in q) and "inactivation" not in kinds:
        kinds.append("coverage")
    ozone_free = says_ozone_free(text)
    if ozone_free:
        kinds.append("ozone-free")
    plain_clauses = _unnegated_clauses(text)
    if any(_SAFE_RE.search(c) for c in plain_clauses) or _OCCUPIED_USE_RE.search(text):
        kinds.append("safety")
    if "irradiance_W_m2" in q:
        kinds.append("irradiance")
    if "power_W" in q and _OUTPUT_RE.search(text):
        kinds.append("optical-power")
    band_name = _band_of_text(text)
    if "wavelength_nm" in q or "band_nm" in q or band_name:
        kinds.append("emission")
    denied = _denied_bands(text)
    if denied:
        kinds.append("no-emission")
    stated_rg = _stated_risk_group(text)
    if stated_rg is not None:
        kinds.append("risk-group")
    agency = _stated_agency(text)
    if agency is not None:
        kinds.append("approval")
    if not kinds:
        note = "no pattern recognised"
        if "power_W" in q:
            note = ("a wattage without 'output', 'optical' or 'UV power' is usually the "
                    "electrical input: give it as lamp.electrical_power")
        elif _makes_ozone_wording(text):
            note = "says the lamp makes ozone, so it is not an ozone-free claim"
        elif _OZONE_MENTION_RE.search(text):
            note = "mentions ozone but does not say 'ozone-free'"
        elif _SAFE_RE.search(text):
            note = "reads as a warning or a negation, not a safety claim"
        elif _ODOUR_RE.search(text) and _KILL_RE.search(text):
            note = "about odours or fumes, not germs: not a germicidal claim"
        return Claim(id=claim_id, kind="unrecognised", text=original, structured=False, note=note)
    # ``kind``: read the text as that one of the kinds it makes (each part of a text that
    # makes several claims is judged; claims.evaluate_claims)
    first = kind if kind in kinds else kinds[0]
    kinds = [first] + [k for k in kinds if k != first]
    kind = first
    kw: dict[str, Any] = {"id": claim_id, "kind": kind, "text": original, "structured": False}
    if kind == "inactivation":
        if "log" in q:
            kw.update(_reduction(None, q["log"]))
        elif "percent" in q and 0 < q["percent"] <= 100:
            kw.update(_reduction(q["percent"] / 100.0, None))
        kw["organism"], kw["organism_generic"] = org, generic
        for k in ("time_s", "time_word", "distance_m", "area_m2", "volume_m3"):
            kw[k] = q.get(k)
        air, surf = bool(_AIR_RE.search(text)), bool(_SURFACE_RE.search(text))
        kw["medium"] = "air" if air and not surf else "surface" if surf and not air else None
    elif kind == "efficiency":
        kw["efficiency_fraction"] = q["percent"] / 100.0
        kw["efficiency_of"] = "UV-C" if band_name == "UV-C" else ("optical" if re.search(
            r"wall[\s-]*plug|optical|radiant", text, re.I) else None)
    elif kind == "coverage":
        kw["area_m2"], kw["volume_m3"] = q.get("area_m2"), q.get("volume_m3")
    elif kind == "safety":
        # the subjects outside the clauses that caution or negate ("safe for plants, keep
        # pets away"); use in an occupied room from the whole text
        said = " , ".join(plain_clauses)
        kw["safe_for"] = tuple(s for s, rx in _SUBJECT_RES
                               if rx.search(text if s == "occupied-rooms" else said))
        if not kw["safe_for"] and _RADIATION_FREE_RE.search(text):
            kw["safe_for"] = ("people",)
        kw["distance_m"] = q.get("distance_m")
        # a worded time ("in seconds") bounds nothing useful for exposure: only numbers count
        kw["time_s"] = None if q.get("time_word") else q.get("time_s")
    elif kind == "risk-group":
        kw["risk_group"] = stated_rg
    elif kind == "approval":
        kw["agency"] = agency
    elif kind == "optical-power":
        kw["power_W"] = q["power_W"]
        if band_name:
            kw["band_name"], kw["band_nm"] = band_name, BANDS_NM[band_name]
    elif kind == "no-emission":
        kw["band_name"], kw["band_nm"] = denied[0], DENIABLE_BANDS_NM[denied[0]]
        kw["bands"] = tuple(denied)
    elif kind == "irradiance":
        kw["irradiance_W_m2"], kw["distance_m"] = q["irradiance_W_m2"], q.get("distance_m")
        kw.update(_stated_band(q, band_name))
    elif kind == "emission":
        kw["wavelength_nm"] = q.get("wavelength_nm")
        kw.update(_stated_band(q, band_name))
        # "UVA + UVC", "365nm & 254nm": the claim says the lamp emits in every one
        bands = _bands_of_text(text)
        if len(bands) > 1:
            kw["bands"] = tuple(bands)
        if len(q.get("wavelengths_nm", ())) > 1:
            kw["wavelengths_nm"] = tuple(q["wavelengths_nm"])
    others = [k for k in kinds[1:] if not (k == "emission" and kind in ("optical-power",
                                                                         "irradiance",
                                                                         "efficiency"))]
    notes = [f"read from the wording as {_article(kind)} {kind} claim"]
    if q.get("thousands"):
        notes.append(f"{q['thousands']!r} read as {_big(q['thousands']):g} (the comma, dot or "
                     "space taken as a thousands separator)")
    if q.get("lifetime_s") and kind == "inactivation":
        notes.append(f"{format_duration(q['lifetime_s'])} read as the lamp's life, not as the "
                     "time of a treatment")
    if kind == "emission" and (kw.get("bands") or kw.get("wavelengths_nm")):
        named = list(kw.get("bands", ())) + [f"{w:g} nm" for w in kw.get("wavelengths_nm", ())]
        notes.append(f"names {', '.join(named)}: the lamp must emit at each")
    if kind == "inactivation" and q.get("time_word"):
        word = q["time_word"]
        notes.append(vague_time_text(word))
    if kind == "inactivation" and "percent" in q and q["percent"] >= 100:
        notes.append("100 % is not a finite reduction: no first-order process reaches it")
        kw.update({"reduction_fraction": 1.0, "log_reduction": None,
                   "reduction_stated_as": "percent"})
    if others:
        notes.append(f"the text also makes {_article(others[0])} " + ", ".join(others)
                     + " claim: each is judged, and the worst decides")
        kw["also_kinds"] = tuple(others)
    kw["note"] = "; ".join(notes)
    return Claim(**kw)
