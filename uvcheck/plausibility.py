"""Plausibility of a listing's stated data: physics checks that need no spectrum.

Each check is a pure function returning a :class:`Finding` with a verdict-like ``status``:

* ``holds`` — consistent with physics and the technology data;
* ``unlikely`` — possible only outside what the technology normally does, or contradicted
  by a rule of thumb (a rule of thumb never gives more than ``unlikely``);
* ``cannot-hold`` — impossible even on the most favourable reading, by the stated margin;
* ``not-assessable`` — a datum is missing (named in ``missing``);
* ``info`` — a derived quantity, not a verdict (e.g. the voltage per die).

``needed`` and ``available`` are :class:`Amount` objects in SI units; ``ratio`` is
available / needed (below 1: short by 1/ratio). ``basis`` names the source of every number.

Checks
------
* photon energy against forward voltage per die (E = hc/λ; an LED's forward voltage is at
  least about its photon energy divided by e, NOTES.md §6): :func:`check_die_voltage`;
* a "254 nm LED" (253.7 nm is the mercury line; LEDs sit at about 255–285 nm):
  :func:`check_led_wavelength`;
* wall-plug efficiency bound WPE ≤ EQE·(hc/λ)/(e·V_f) (NOTES.md §6): :func:`wpe_upper_bound`;
* stated efficiency, and optical power against electrical power × the best efficiency of the
  technology: :func:`check_efficiency`, :func:`check_optical_vs_electrical`;
* electrical and optical watts per LED package (common practice): :func:`check_power_per_led`;
* cover material against UV-C (ordinary glass and plastic block it): :func:`check_cover`;
* voltage per die from a string voltage and the series count: :func:`per_die_voltage`.

:func:`screen_listing` runs the ones a listing has data for. Screening only: these checks
test statements, not lamps.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from uvcheck.data_files import read_toml
from uvcheck.errors import ConfigurationError

STATUSES = ("holds", "unlikely", "cannot-hold", "not-assessable", "info")
#: The UV-C band edges used here (as uvcheck.bands: from 200 nm, the practical edge in air). [nm]
UVC_NM = (200.0, 280.0)


def _tech() -> dict[str, Any]:
    return read_toml("technologies.toml")


def _led() -> dict[str, Any]:
    return read_toml("emitters/led_packages.toml")


def _lamp() -> dict[str, Any]:
    return read_toml("emitters/lamp_models.toml")


def photon_energy_eV(wavelength_nm: float) -> float:
    """E = hc/λ. [eV] (uvcheck.constants, from scipy.constants)

    Examples
    --------
    >>> round(photon_energy_eV(405.0), 3)      # NOTES.md §7, C6
    3.061
    """
    from uvcheck.constants import photon_energy_eV as e

    return e(wavelength_nm)


@dataclass(frozen=True)
class Amount:
    """A number with its SI unit and what it is.

    value : the number (None when unknown). unit : SI unit text (``V``, ``W``, ``nm``, ``-``).
    what : what the number is, in words.
    """

    value: float | None
    unit: str
    what: str

    def text(self) -> str:
        if self.value is None:
            return f"{self.what}: unknown"
        if self.unit == "-":
            return f"{_g(self.value * 100)} %"
        return f"{_g(self.value)} {self.unit}"

    def to_dict(self) -> dict[str, Any]:
        return {"value": self.value, "unit": self.unit, "what": self.what, "text": self.text()}


@dataclass(frozen=True)
class Finding:
    """The result of one plausibility check.

    id : check id (``die-voltage``, ``led-wavelength``, …; a claim's id is appended after a
        colon where the check is about one claim).
    status : one of :data:`STATUSES`.
    subject : what was checked, in words ("stated wavelength 254 nm").
    needed, available : the quantity the statement needs and the one the evidence allows.
    ratio : available / needed; None where not a ratio. [-]
    message : one line with the numbers.
    basis : the physics or data behind it, with sources.
    assumptions : choices made on the listing's behalf.
    missing : data that would make a ``not-assessable`` finding assessable (listing keys).
    rule : the rule that decided the status, in words (a hard bound, technology data, a rule
        of thumb); claim verdicts built on the finding name it in their basis.
    """

    id: str
    status: str
    subject: str
    needed: Amount | None
    available: Amount | None
    ratio: float | None
    message: str
    basis: str
    assumptions: tuple[str, ...] = ()
    missing: tuple[str, ...] = ()
    rule: str | None = None

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ConfigurationError(f"unknown status {self.status!r}; "
                                     f"available: {', '.join(STATUSES)}")

    def to_dict(self) -> dict[str, Any]:
        return {"id": self.id, "status": self.status, "subject": self.subject,
                "needed": None if self.needed is None else self.needed.to_dict(),
                "available": None if self.available is None else self.available.to_dict(),
                "ratio": self.ratio, "message": self.message, "basis": self.basis,
                "assumptions": list(self.assumptions), "missing": list(self.missing),
                "rule": self.rule}


#: Rules a finding can be decided by (see uvcheck.claims.decision_rule_text).
RULE_TECH_DATA = ("the technology's known range (data/technologies.toml): outside it is "
                  "unlikely, not impossible")
RULE_OF_THUMB = "a rule of thumb (common practice): at most unlikely"


def _hard(what: str) -> str:
    return f"a hard bound, {what}: cannot-hold at any shortfall, no margin"


def _g(x: float, digits: int = 3) -> str:
    """A number to ``digits`` significant figures without trailing zeros ('3.1', '90')."""
    return f"{x:.{digits}g}"


def _nm(x: float) -> str:
    return f"{x:.4g}"


def _short(ratio: float) -> str:
    return f"short by {_g(1.0 / ratio, 3)}×" if ratio > 0 else "none at all"


def _exceeds(ratio: float) -> str:
    """For a stated amount above a ceiling (ratio = ceiling / stated < 1)."""
    return f"exceeds it by {_g(1.0 / ratio, 3)}×"


# ---------------------------------------------------------------------------------------------
# Voltage per die and photon energy
# ---------------------------------------------------------------------------------------------

def per_die_voltage(leds: Any) -> Finding:
    """The forward voltage of one die, from the listing's LED data. [V]

    leds : a :class:`~uvcheck.io.listing.LedArray` (or None).

    A stated (measured) forward voltage per die is used as it is; otherwise the string
    voltage divided by the number of dies in series. Status ``info`` with the value in
    ``available``, or ``not-assessable`` naming the missing keys.

    Examples
    --------
    >>> from uvcheck.io.listing import LedArray
    >>> per_die_voltage(LedArray(count=48, series=4, string_voltage_V=12.4)).available.value
    3.1
    """
    missing = ("leds.forward_voltage", "or leds.string_voltage with leds.series")
    if leds is None:
        return Finding("die-voltage", "not-assessable", "voltage per LED die", None, None, None,
                       "no LED data in the listing", "—", missing=missing)
    if leds.forward_voltage_V is not None:
        notes: tuple[str, ...] = ()
        v = float(leds.forward_voltage_V)
        if leds.string_voltage_V is not None and leds.series:
            v2 = leds.string_voltage_V / leds.series
            if abs(v2 - v) > 0.15 * v:
                notes = (f"string voltage / series gives {_g(v2)} V per die, which differs "
                         f"from the stated {_g(v)} V; the stated per-die value is used",)
        return Finding("die-voltage", "info", "voltage per LED die", None,
                       Amount(v, "V", "forward voltage per die (stated)"), None,
                       f"{_g(v)} V per die, as stated", "the listing (leds.forward_voltage)",
                       assumptions=notes)
    if leds.string_voltage_V is not None and leds.series:
        dies_in_series = leds.series * (leds.dies_per_package or 1)
        v = float(f"{leds.string_voltage_V / dies_in_series:.12g}")
        basis = (f"string voltage {_g(leds.string_voltage_V)} V / {dies_in_series} dies in "
                 "series (the listing: leds.string_voltage, leds.series"
                 + (", leds.dies_per_package" if (leds.dies_per_package or 1) > 1 else "") + ")")
        return Finding("die-voltage", "info", "voltage per LED die", None,
                       Amount(v, "V", "forward voltage per die (string voltage / series)"),
                       None, f"{_g(v)} V per die", basis,
                       assumptions=("dies in a string share the voltage equally; any series "
                                    "resistor would make the true die voltage lower still",))
    return Finding("die-voltage", "not-assessable", "voltage per LED die", None, None, None,
                   "the listing gives no forward voltage and no string voltage with a series "
                   "count", "—", missing=missing)


def check_die_voltage(wavelength_nm: float, die_voltage_V: float) -> Finding:
    """Can an LED die at this voltage emit photons of this wavelength?

    wavelength_nm : the stated wavelength. [nm]
    die_voltage_V : forward voltage of one die. [V]

    Needed: the photon energy over e, E/e = hc/(eλ) (uvcheck.constants, scipy.constants).
    ``cannot-hold`` when the die voltage falls short of it by more than the margin in
    ``data/emitters/led_packages.toml`` [die_voltage] (10 %, ours: LEDs can emit slightly
    above e·V_f, and sellers round); a shortfall within the margin ``holds`` with a note;
    ``unlikely`` when a UV-C die runs below the technology's practical range (5–8 V,
    data/technologies.toml [uvc_led]) although above the photon energy.

    Examples
    --------
    >>> f = check_die_voltage(253.7, 3.2)          # NOTES.md §7, C7
    >>> f.status, round(f.needed.value, 2)
    ('cannot-hold', 4.89)
    """
    if not (wavelength_nm > 0 and die_voltage_V > 0):
        raise ConfigurationError("wavelength and die voltage must be positive")
    from uvcheck.constants import shortest_wavelength_nm

    d = _led()["die_voltage"]
    margin = float(d["margin"])
    e_ph = photon_energy_eV(wavelength_nm)
    ratio = die_voltage_V / e_ph
    lam_min = shortest_wavelength_nm(die_voltage_V)
    lam_min_margin = shortest_wavelength_nm(die_voltage_V * (1.0 + margin))
    needed = Amount(e_ph, "V", f"photon energy / e at {_nm(wavelength_nm)} nm")
    available = Amount(die_voltage_V, "V", "forward voltage per die")
    basis = ("E = hc/λ (h, c, e from scipy.constants); an LED's forward voltage is at least "
             "about its photon energy divided by e (NOTES.md §6 [doc]); margin "
             f"{margin:.0%} ({d['margin_source']})")
    subject = f"{_nm(wavelength_nm)} nm from LEDs at {_g(die_voltage_V)} V per die"
    msg = (f"a {_nm(wavelength_nm)} nm photon carries {e_ph:.3f} eV, so each die needs at "
           f"least about {e_ph:.2f} V; the listing gives {_g(die_voltage_V)} V per die, which "
           f"makes photons no shorter than about {lam_min:.0f} nm ({lam_min_margin:.0f} nm "
           f"allowing {_g(margin * 100)} %)")
    if ratio < 1.0 - margin:
        return Finding("die-voltage-vs-photon-energy", "cannot-hold", subject, needed, available,
                       ratio, f"{msg}: {_short(ratio)}", basis,
                       rule=_hard(f"physics: the photon energy E = hc/λ against the die "
                                  f"voltage, with a {_g(margin * 100)} % allowance"))
    notes: tuple[str, ...] = ()
    if ratio < 1.0:
        notes = (f"the die voltage is {_g((1 - ratio) * 100, 2)} % below the photon energy, "
                 f"within the {margin:.0%} margin: taken as possible",)
    uvc = _tech()["uvc_led"]
    vmin = float(uvc["forward_voltage_V"]["min"])
    if wavelength_nm < UVC_NM[1] and die_voltage_V < vmin:
        return Finding("die-voltage-vs-photon-energy", "unlikely", subject,
                       Amount(vmin, "V", "lowest forward voltage of real UV-C LEDs"),
                       available, die_voltage_V / vmin,
                       f"{_g(die_voltage_V)} V per die is above the photon energy "
                       f"({e_ph:.2f} eV) but below the {vmin:g}–"
                       f"{uvc['forward_voltage_V']['max']:g} V at which real UV-C LEDs run",
                       f"{uvc['forward_voltage_source']} (data/technologies.toml [uvc_led])",
                       assumptions=notes, rule=RULE_TECH_DATA)
    return Finding("die-voltage-vs-photon-energy", "holds", subject, needed, available, ratio,
                   f"{_g(die_voltage_V)} V per die can make {_nm(wavelength_nm)} nm "
                   f"photons ({e_ph:.2f} eV)", basis, assumptions=notes,
                   rule="physics: photon energy E = hc/λ against the die voltage")


#: Below this stated wavelength an LED's wavelength is checked against what LEDs reach (UV-C
#: LEDs sit at about 255–285 nm, NOTES.md §6 [doc]); the 300 nm edge is our own rule. [nm]
LED_UV_CHECK_BELOW_NM = 300.0


def check_led_wavelength(wavelength_nm: float) -> Finding:
    """Is this a wavelength an LED product plausibly has? Flags the "254 nm LED".

    253.7 nm is the low-pressure mercury line; commercial UV-C LEDs sit at about 255–285 nm,
    254 nm LEDs exist only as research devices of a few mW, and the shortest datasheet seen
    is 230 nm (NOTES.md §6 [doc]). A stated 253–254.9 nm on an LED product is ``unlikely``
    (a figure copied from mercury lamps); below 230 nm ``unlikely``; otherwise ``holds``.

    Examples
    --------
    >>> check_led_wavelength(254.0).status, check_led_wavelength(275.0).status
    ('unlikely', 'holds')
    """
    d = _led()["uvc_led_wavelength"]
    lo, hi = d["mercury_copy_nm"]
    c_lo, c_hi = d["commercial_nm"]
    subject = f"an LED product stating {_nm(wavelength_nm)} nm"
    if lo <= wavelength_nm <= hi:
        return Finding("led-wavelength", "unlikely", subject,
                       Amount(c_lo, "nm", "shortest wavelength of commercial UV-C LEDs"),
                       Amount(wavelength_nm, "nm", "stated wavelength"), None,
                       f"{_nm(wavelength_nm)} nm is the mercury line (253.7 nm), not an LED "
                       f"wavelength: commercial UV-C LEDs emit at about {c_lo:g}–{c_hi:g} nm and "
                       "254 nm LEDs exist only as research devices of a few mW",
                       f"{d['mercury_copy_source']}; {d['commercial_source']}", rule=RULE_TECH_DATA)
    if wavelength_nm < d["shortest_practical_nm"]:
        return Finding("led-wavelength", "unlikely", subject,
                       Amount(float(d["shortest_practical_nm"]), "nm",
                              "shortest LED wavelength on a datasheet"),
                       Amount(wavelength_nm, "nm", "stated wavelength"), None,
                       f"LEDs below {d['shortest_practical_nm']:g} nm are not sold as products",
                       d["shortest_practical_source"], rule=RULE_TECH_DATA)
    return Finding("led-wavelength", "holds", subject, None,
                   Amount(wavelength_nm, "nm", "stated wavelength"), None,
                   f"{_nm(wavelength_nm)} nm is a wavelength LEDs are made for",
                   d["commercial_source"])


def evidence_led(die_voltage_V: float) -> tuple[str, float]:
    """The LED technology and peak the die voltage points to (most favourable for efficacy).

    Among the LED technologies of data/technologies.toml whose forward-voltage range holds
    the voltage (or, if none does, the nearest range), the one with the shortest peak window;
    its peak is the shortest wavelength of that window that the voltage allows (hc/(e·V·(1 +
    margin))). Returns (technology key, peak nm).

    Examples
    --------
    >>> evidence_led(3.1)
    ('violet_led', 392.0)
    """
    from uvcheck.constants import shortest_wavelength_nm

    margin = float(_led()["die_voltage"]["margin"])
    techs = {k: t for k, t in _tech().items()
             if t.get("family") == "led" and "forward_voltage_V" in t and k != "white_led"}

    def gap(t: dict[str, Any]) -> float:
        lo, hi = t["forward_voltage_V"]["min"], t["forward_voltage_V"]["max"]
        return 0.0 if lo <= die_voltage_V <= hi else min(abs(die_voltage_V - lo),
                                                         abs(die_voltage_V - hi))

    best_gap = min(gap(t) for t in techs.values())
    cands = [k for k, t in techs.items() if abs(gap(t) - best_gap) < 1e-9]
    key = min(cands, key=lambda k: techs[k]["peak_window_nm"][0])
    lo, hi = techs[key]["peak_window_nm"]
    floor = shortest_wavelength_nm(die_voltage_V * (1.0 + margin))
    return key, float(min(hi, max(lo, round(floor, 1))))


def technologies_for_die_voltage(die_voltage_V: float) -> tuple[str, ...]:
    """LED technologies (data/technologies.toml) whose forward-voltage range holds the voltage.

    Examples
    --------
    >>> technologies_for_die_voltage(6.0)
    ('uvc_led',)
    """
    return tuple(k for k, t in _tech().items() if t.get("family") == "led"
                 and "forward_voltage_V" in t
                 and t["forward_voltage_V"]["min"] <= die_voltage_V <= t["forward_voltage_V"]["max"])


# ---------------------------------------------------------------------------------------------
# Efficiency and power
# ---------------------------------------------------------------------------------------------

def wpe_upper_bound(eqe: float, wavelength_nm: float, forward_voltage_V: float) -> float:
    """Upper bound of an LED's wall-plug efficiency, WPE ≤ EQE·(hc/λ)/(e·V_f). [-]

    eqe : external quantum efficiency (photons out per electron in). [-]
    wavelength_nm : emission wavelength. [nm]
    forward_voltage_V : forward voltage. [V]

    Each electron delivers e·V_f of energy and yields at most EQE photons of hc/λ
    (NOTES.md §6 [derived]).

    Examples
    --------
    >>> round(wpe_upper_bound(0.05, 275.0, 6.5) * 100, 2)     # NOTES.md §7, C8
    3.47
    """
    if not (0 < eqe <= 1 and wavelength_nm > 0 and forward_voltage_V > 0):
        raise ConfigurationError("EQE must be in (0, 1]; wavelength and voltage positive")
    return eqe * photon_energy_eV(wavelength_nm) / forward_voltage_V


def best_efficiency(technology: str, band: str = "total", wavelength_nm: float | None = None,
                    die_voltage_V: float | None = None) -> tuple[float, float | None, str]:
    """The best efficiency a technology allows: (max, hard limit, basis). [-]

    technology : key of data/technologies.toml.
    band : ``total`` (all optical output per electrical watt) or ``UV-C``.
    wavelength_nm, die_voltage_V : for LEDs, the photon-energy bound EQE_max·E/(e·V) with
        the generous EQE ceiling of data/emitters/led_packages.toml [eqe_max].

    ``max`` is the top of the technology's range; the hard limit is the smallest of: 1
    (energy conservation), the technology's flag value (``uvc_efficiency_flag_above``), and
    the photon-energy bound. Exceeding ``max`` is ``unlikely``; exceeding the hard limit
    ``cannot-hold``.
    """
    emax, hard, basis, _ = _efficiency_bounds(technology, band, wavelength_nm, die_voltage_V)
    return emax, hard, basis


def _efficiency_bounds(technology: str, band: str = "total", wavelength_nm: float | None = None,
                       die_voltage_V: float | None = None) -> tuple[float, float, str, str]:
    """:func:`best_efficiency` and, fourth, which bound set the hard limit (in words)."""
    techs = _tech()
    if technology not in techs:
        raise ConfigurationError(f"unknown technology {technology!r}; "
                                 f"available: {', '.join(techs)}")
    t = techs[technology]
    parts = []
    if band == "UV-C" or "wall_plug_efficiency" not in t:
        emax = float(t["uvc_efficiency"]["max"])
        parts.append(f"UV-C efficiency up to {emax:.0%}: {t['uvc_efficiency_source']}")
        flag = t.get("uvc_efficiency_flag_above")
    else:
        emax = float(t["wall_plug_efficiency"]["max"])
        parts.append(f"wall-plug efficiency up to {emax:.0%}: {t['wall_plug_efficiency_source']}")
        flag = t.get("uvc_efficiency_flag_above") if technology == "uvc_led" else None
    hard = 1.0
    what = "physics: no more optical than electrical power"
    parts.append("no more optical than electrical power (energy conservation)")
    if flag is not None:
        if float(flag) < hard:
            hard = float(flag)
            what = (f"the best the technology has reached ({_g(hard * 100)} %, "
                    "data/technologies.toml; not a law of physics)")
        parts.append(f"flagged above {float(flag):.0%} (data/technologies.toml)")
    if t.get("family") == "led" and wavelength_nm and die_voltage_V:
        eqe_tab = _led()["eqe_max"]
        eqe = float(eqe_tab.get(technology, eqe_tab["other"]))
        bound = wpe_upper_bound(eqe, wavelength_nm, die_voltage_V)
        if bound < hard:
            hard = bound
            what = f"physics: the wall-plug limit EQE·(hc/λ)/(e·V_f) = {_g(bound * 100)} %"
        parts.append(f"WPE ≤ EQE·(hc/λ)/(e·V_f) = {bound:.1%} with EQE ≤ {eqe:g} "
                     "(NOTES.md §6; data/emitters/led_packages.toml [eqe_max])")
    if band == "UV-C" and emax == 0.0:
        hard = 0.0
        what = "the technology emits no UV-C (data/technologies.toml)"
    return emax, hard, "; ".join(parts), what


def check_efficiency(efficiency: float, technology: str, band: str = "total",
                     wavelength_nm: float | None = None, die_voltage_V: float | None = None,
                     finding_id: str = "efficiency") -> Finding:
    """A stated efficiency (optical or UV-C watts per electrical watt) against the technology.

    Examples
    --------
    >>> check_efficiency(0.40, "uvc_led").status
    'cannot-hold'
    >>> check_efficiency(0.35, "lp_mercury", "UV-C").status
    'holds'
    """
    emax, hard, basis, hard_what = _efficiency_bounds(technology, band, wavelength_nm,
                                                      die_voltage_V)
    label = "UV-C" if band == "UV-C" or "wall_plug_efficiency" not in _tech()[technology] \
        else "wall-plug"
    subject = f"stated {label} efficiency {_g(efficiency * 100)} % ({technology})"
    needed = Amount(efficiency, "-", f"stated {label} efficiency")
    if efficiency > hard:
        avail = Amount(hard, "-", f"highest {label} efficiency physically allowed")
        ratio = hard / efficiency
        return Finding(finding_id, "cannot-hold", subject, needed, avail, ratio,
                       f"a stated {label} efficiency of {_g(efficiency * 100)} % ({technology}); "
                       f"at most {_g(hard * 100)} % is possible: {_short(ratio)}", basis,
                       rule=_hard(hard_what))
    avail = Amount(emax, "-", f"highest {label} efficiency of the technology")
    ratio = emax / efficiency if efficiency > 0 else None
    if efficiency > emax:
        return Finding(finding_id, "unlikely", subject, needed, avail, ratio,
                       f"{_g(efficiency * 100)} % is above the {_g(emax * 100)} % the "
                       "technology reaches", basis, rule=RULE_TECH_DATA)
    return Finding(finding_id, "holds", subject, needed, avail, ratio,
                   f"{_g(efficiency * 100)} % is within the technology's range "
                   f"(up to {_g(emax * 100)} %)", basis, rule=RULE_TECH_DATA)


def check_optical_vs_electrical(optical_W: float, electrical_W: float, technology: str,
                                band: str = "total", wavelength_nm: float | None = None,
                                die_voltage_V: float | None = None,
                                finding_id: str = "optical-vs-electrical") -> Finding:
    """Stated optical power against electrical power × the best efficiency of the technology.

    optical_W : stated optical power (in ``band``). [W]
    electrical_W : stated electrical power. [W]
    band : ``total`` or ``UV-C``.

    Examples
    --------
    >>> f = check_optical_vs_electrical(2.0, 8.0, "uvc_led")
    >>> f.status, round(f.ratio, 2)
    ('cannot-hold', 0.4)
    """
    if not (optical_W > 0 and electrical_W > 0):
        raise ConfigurationError("optical and electrical power must be positive")
    emax, hard, basis, hard_what = _efficiency_bounds(technology, band, wavelength_nm,
                                                      die_voltage_V)
    eta = optical_W / electrical_W
    what_out = "UV-C output" if band == "UV-C" else "optical output"
    subject = (f"{_g(optical_W)} W {'UV-C' if band == 'UV-C' else 'optical'} output from "
               f"{_g(electrical_W)} W electrical ({technology})")
    needed = Amount(optical_W, "W", "stated optical power")
    if eta > hard:
        avail = Amount(electrical_W * hard, "W", "most the electrical power can give")
        ratio = hard / eta
        return Finding(finding_id, "cannot-hold", subject, needed, avail, ratio,
                       f"a stated {_g(optical_W)} W {what_out} from {_g(electrical_W)} W "
                       f"electrical ({technology}); {_g(electrical_W)} W gives at most "
                       f"{_g(electrical_W * hard)} W: {_short(ratio)}", basis,
                       rule=_hard(hard_what))
    avail = Amount(electrical_W * emax, "W", "electrical power × the technology's best efficiency")
    ratio = emax / eta
    if eta > emax:
        return Finding(finding_id, "unlikely", subject, needed, avail, ratio,
                       f"a stated {_g(optical_W)} W {what_out} needs an efficiency of "
                       f"{_g(eta * 100)} %; the technology reaches {_g(emax * 100)} % "
                       f"({_g(electrical_W * emax)} W)", basis, rule=RULE_TECH_DATA)
    return Finding(finding_id, "holds", subject, needed, avail, ratio,
                   f"{_g(optical_W)} W is an efficiency of {_g(eta * 100)} %, within the "
                   f"technology's range (up to {_g(emax * 100)} %)", basis, rule=RULE_TECH_DATA)


def _package(technology: str | None, package: str | None) -> tuple[str, dict[str, Any], str]:
    d = _led()
    if package is None:
        default = d["packages_default"]
        package = default.get(technology or "", default["other"])
        how = f"package class not stated: {package} assumed ({default['source']})"
    else:
        how = ""
    if package not in d["packages"]:
        raise ConfigurationError(f"unknown LED package class {package!r}; "
                                 f"available: {', '.join(d['packages'])}")
    return package, d["packages"][package], how


def check_power_per_led(power_W: float, led_count: int, technology: str | None = None,
                        package: str | None = None, optical: bool = False,
                        finding_id: str | None = None) -> Finding:
    """Watts per LED package against what such a package dissipates or emits (common practice).

    power_W : electrical input (``optical=False``) or optical output (``optical=True``). [W]
    led_count : number of LED packages.
    package : package class (data/emitters/led_packages.toml [packages]); None = the most
        generous single-die class for the technology.

    A rule of thumb: at most ``unlikely``.

    Examples
    --------
    >>> check_power_per_led(8.0, 48, "uvc_led").status
    'holds'
    >>> check_power_per_led(60.0, 4, "uvc_led").status
    'unlikely'
    """
    if not (power_W > 0 and led_count >= 1):
        raise ConfigurationError("power must be positive and the LED count at least 1")
    key, pkg, how = _package(technology, package)
    per = power_W / led_count
    kind = "optical" if optical else "electrical"
    cap = float(pkg["max_optical_W" if optical else "max_electrical_W"])
    fid = finding_id or ("optical-per-led" if optical else "power-per-led")
    subject = f"{_g(per)} W {kind} per LED ({led_count} LEDs, {pkg['name']})"
    needed = Amount(per, "W", f"{kind} power per LED")
    avail = Amount(cap, "W", f"largest {kind} power of one {pkg['name']}")
    ratio = cap / per
    notes = (how,) if how else ()
    verb = "emit" if optical else "dissipate"
    if per > cap:
        return Finding(fid, "unlikely", subject, needed, avail, ratio,
                       f"{_g(per)} W {kind} per LED ({_g(power_W)} W over {led_count} LEDs); one "
                       f"{pkg['name']} can {verb} about {_g(cap)} W at most: the stated power "
                       f"{_exceeds(ratio)}", f"{pkg['source']} (common practice)",
                       assumptions=notes, rule=RULE_OF_THUMB)
    return Finding(fid, "holds", subject, needed, avail, ratio,
                   f"{_g(per)} W per LED is within what one {pkg['name']} can {verb} "
                   f"(about {_g(cap)} W)", f"{pkg['source']} (common practice)",
                   assumptions=notes, rule=RULE_OF_THUMB)


# ---------------------------------------------------------------------------------------------
# Cover
# ---------------------------------------------------------------------------------------------

def check_cover(cover: str, wavelength_nm: float = 254.0, cover_text: str | None = None) -> Finding:
    """Does radiation of this wavelength leave the product through its cover?

    cover : key of data/emitters/lamp_models.toml [covers].
    wavelength_nm : the wavelength that must pass (default 254 nm, for UV-C). [nm]

    ``cannot-hold`` when even the largest transmittance of the material at this wavelength
    is below 1 %; ``unlikely`` when its typical transmittance is below 10 % (ours); else
    ``holds``. Transmittances: step model of the material, from memory / common practice.

    Examples
    --------
    >>> check_cover("polycarbonate").status, check_cover("fused_silica").status
    ('cannot-hold', 'holds')
    """
    covers = _lamp()["covers"]
    if cover not in covers:
        raise ConfigurationError(f"unknown cover material {cover!r}; "
                                 f"available: {', '.join(covers)}")
    c = covers[cover]
    side = "t_below" if wavelength_nm < c["cut_on_nm"] else "t_above"
    t = {k: float(v) for k, v in c[side].items()}
    name = cover_text or cover.replace("_", " ")
    subject = f"{_nm(wavelength_nm)} nm through a {name} cover"
    avail = Amount(t["max"], "-", f"largest transmittance of {name} at {_nm(wavelength_nm)} nm")
    basis = c["source"]
    if t["max"] < 0.01:
        return Finding("cover-transmission", "cannot-hold", subject, None, avail, t["max"],
                       f"{name} passes at most {_g(t['max'] * 100)} % at "
                       f"{_nm(wavelength_nm)} nm: the radiation does not leave the product",
                       basis, rule=_hard(f"the cover material passes under 1 % at "
                                         f"{_nm(wavelength_nm)} nm"))
    if t["typical"] < 0.10:
        return Finding("cover-transmission", "unlikely", subject, None, avail, t["max"],
                       f"{name} typically passes {_g(t['typical'] * 100)} % at "
                       f"{_nm(wavelength_nm)} nm (at most {_g(t['max'] * 100)} %); only "
                       "quartz (fused silica), sapphire or thin fluoropolymer pass UV-C well",
                       basis, rule="the cover material's typical transmittance (common practice): "
                                   "under 10 % is unlikely, not impossible")
    return Finding("cover-transmission", "holds", subject, None, avail, t["max"],
                   f"{name} passes about {_g(t['typical'] * 100)} % at {_nm(wavelength_nm)} nm",
                   basis)


# ---------------------------------------------------------------------------------------------
# A whole listing
# ---------------------------------------------------------------------------------------------

def _led_family(technology: str | None) -> bool:
    return technology is not None and _tech().get(technology, {}).get("family") == "led"


def infer_technology(listing: Any) -> tuple[str | None, str]:
    """The technology a listing describes: stated, else inferred. Returns (key, why).

    Inference (ours): LEDs listed → the LED technology whose peak window holds the stated
    wavelength (UV-C LED for a UV-C band or a wavelength below 300 nm); no LEDs → low-pressure
    mercury for a stated 253–255 nm, KrCl* excimer for 219–225 nm (peak windows of
    data/technologies.toml).

    Examples
    --------
    >>> from uvcheck.io.listing import Listing, LedArray
    >>> infer_technology(Listing(name="x", peak_wavelength_nm=254.0, leds=LedArray(count=3)))
    ('uvc_led', 'LEDs stating 254 nm: uvc_led (peak window 230–290 nm)')
    """
    if listing.technology:
        return listing.technology, "stated (lamp.technology)"
    techs = _tech()
    lam = listing.peak_wavelength_nm
    if lam is None and listing.band_nm is not None:
        lam = (listing.band_nm[0] + listing.band_nm[1]) / 2.0
    if listing.leds is not None:
        if lam is None:
            return None, "LEDs without a stated wavelength or band"
        for k, t in techs.items():
            if t.get("family") == "led" and k != "white_led":
                lo, hi = t["peak_window_nm"]
                if lo <= lam <= hi:
                    return k, f"LEDs stating {_nm(lam)} nm: {k} (peak window {lo:g}–{hi:g} nm)"
        if lam < LED_UV_CHECK_BELOW_NM:
            return "uvc_led", f"LEDs stating {_nm(lam)} nm (UV): uvc_led"
        return None, f"no LED technology in data/technologies.toml covers {_nm(lam)} nm"
    if lam is None:
        return None, "no technology, wavelength or band stated"
    for k in ("lp_mercury", "krcl_excimer"):
        lo, hi = techs[k]["peak_window_nm"]
        if lo - 1.0 <= lam <= hi + 1.0:
            return k, (f"no LEDs listed and {_nm(lam)} nm stated: {k} (peak window "
                       f"{lo:g}–{hi:g} nm ± 1 nm)")
    return None, f"no LEDs listed and no lamp technology matches {_nm(lam)} nm"


@dataclass(frozen=True)
class PlausibilityReport:
    """Every plausibility finding for one listing.

    technology : the technology the checks assumed (stated or inferred), or None.
    technology_basis : why.
    die_voltage_V : voltage per die used, or None. [V]
    findings : the findings, listing-level first, then per claim.
    """

    technology: str | None
    technology_basis: str
    die_voltage_V: float | None
    findings: tuple[Finding, ...]

    def by_id(self, finding_id: str) -> Finding | None:
        for f in self.findings:
            if f.id == finding_id:
                return f
        return None

    def to_dict(self) -> dict[str, Any]:
        return {"technology": self.technology, "technology_basis": self.technology_basis,
                "die_voltage_V": self.die_voltage_V,
                "findings": [f.to_dict() for f in self.findings]}


def _claims_uvc(listing: Any) -> bool:
    if listing.band_name in ("UV-C", "far-UVC"):
        return True
    if listing.peak_wavelength_nm is not None and listing.peak_wavelength_nm < UVC_NM[1]:
        return True
    for c in listing.claims:
        if c.kind == "emission" and ((c.wavelength_nm or 999.0) < UVC_NM[1]
                                     or c.band_name in ("UV-C", "far-UVC")):
            return True
    return False


def screen_listing(listing: Any) -> PlausibilityReport:
    """Run every plausibility check the listing has data for.

    listing : a :class:`~uvcheck.io.listing.Listing`.

    Listing-level checks use the stated wavelength (else the stated emission claim's
    wavelength; else, for a UV-C claim, 280 nm, the most favourable UV-C wavelength for the
    voltage check). Claims of kind ``optical-power`` and ``efficiency`` are checked too (ids
    ``optical-vs-electrical:<claim id>``, ``efficiency:<claim id>``).
    """
    tech, why = infer_technology(listing)
    findings: list[Finding] = []
    lam = listing.peak_wavelength_nm
    lam_note = "stated peak wavelength (lamp.peak_wavelength)"
    if lam is None:
        for c in listing.claims:
            if c.kind == "emission" and c.wavelength_nm is not None:
                lam, lam_note = c.wavelength_nm, f"wavelength of claim {c.id}"
                break
    uvc = _claims_uvc(listing)
    if lam is None and uvc:
        lam, lam_note = UVC_NM[1], "280 nm, the longest UV-C wavelength (most favourable)"
    is_led = listing.leds is not None or _led_family(tech)
    dv: float | None = None
    if listing.leds is not None:
        fv = per_die_voltage(listing.leds)
        findings.append(fv)
        dv = fv.available.value if fv.available is not None else None
    if is_led and lam is not None:
        if lam < LED_UV_CHECK_BELOW_NM:
            findings.append(check_led_wavelength(lam))
        if dv is not None:
            f = check_die_voltage(lam, dv)
            findings.append(_with_note(f, f"wavelength: {lam_note}"))
        else:
            findings.append(Finding("die-voltage-vs-photon-energy", "not-assessable",
                                    f"{_nm(lam)} nm from LEDs", None, None, None,
                                    "no voltage per die: cannot check the photon energy",
                                    "E = hc/λ; NOTES.md §6",
                                    missing=("leds.forward_voltage",
                                             "or leds.string_voltage with leds.series")))
    uvc_led_ok = tech is not None and tech in _tech()
    if listing.optical_power_W is not None and listing.electrical_power_W is not None and uvc_led_ok:
        band = "UV-C" if listing.optical_power_band in ("UV-C", "far-UVC") else "total"
        findings.append(check_optical_vs_electrical(
            listing.optical_power_W, listing.electrical_power_W, tech, band,  # type: ignore[arg-type]
            lam if _led_family(tech) else None, dv if _led_family(tech) else None))
    if listing.leds is not None and listing.leds.count:
        if listing.electrical_power_W is not None:
            findings.append(check_power_per_led(listing.electrical_power_W, listing.leds.count,
                                                tech, listing.leds.package))
        if listing.optical_power_W is not None:
            findings.append(check_power_per_led(listing.optical_power_W, listing.leds.count,
                                                tech, listing.leds.package, optical=True))
    if listing.cover is not None and listing.cover != "none" and (uvc or (
            tech is not None and _tech().get(tech, {}).get("emits_uvc"))):
        findings.append(check_cover(listing.cover, lam if lam is not None and lam < UVC_NM[1]
                                    else 254.0, listing.cover_text))
    for c in listing.claims:
        if c.kind == "optical-power" and c.power_W is not None and \
                listing.electrical_power_W is not None and uvc_led_ok:
            band = "UV-C" if c.band_name in ("UV-C", "far-UVC") else "total"
            findings.append(check_optical_vs_electrical(
                c.power_W, listing.electrical_power_W, tech, band,  # type: ignore[arg-type]
                lam if _led_family(tech) else None, dv if _led_family(tech) else None,
                finding_id=f"optical-vs-electrical:{c.id}"))
        if c.kind == "efficiency" and c.efficiency_fraction is not None and uvc_led_ok:
            band = "UV-C" if c.efficiency_of == "UV-C" else "total"
            findings.append(check_efficiency(
                c.efficiency_fraction, tech, band,  # type: ignore[arg-type]
                lam if _led_family(tech) else None, dv if _led_family(tech) else None,
                finding_id=f"efficiency:{c.id}"))
    return PlausibilityReport(tech, why, dv, tuple(findings))


def _with_note(f: Finding, note: str) -> Finding:
    from dataclasses import replace

    return replace(f, assumptions=f.assumptions + (note,))
