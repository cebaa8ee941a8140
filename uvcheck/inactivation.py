"""Microbial inactivation: kinetic models, the organism table, and times at an irradiance.

Kinetics (NOTES.md §4):

* first order: S = exp(−k·H), log reduction LR = k·H/ln 10, D90 = ln 10/k. Some papers
  use a base-10 constant (S = 10^(−k·H), D90 = 1/k); every stored constant keeps its base
  and is converted once, here (``k_e = k₁₀·ln 10``);
* two populations (a resistant fraction f): S = (1−f)·exp(−k₁H) + f·exp(−k₂H). First-order
  extrapolation to 3–6 log is optimistic when a resistant fraction exists;
* a dose table (several (n-log, dose) pairs from one source): the log reduction is read off
  the straight lines through the origin and the pairs, and never extrapolated beyond the
  last pair (tailing curves would make that optimistic).

Reciprocity (dose = irradiance × time) is assumed throughout; it fails at very low dose rates
for some organisms (NOTES.md §4).

The organism table ``data/organisms/organisms.csv`` keeps each source's numbers as published
(mJ/cm², cm²/mJ with their base); :func:`organisms` converts them to SI once per process:
1 mJ/cm² = 10 J/m², 1 cm²/mJ = 0.1 m²/J (unit definitions).

A claim about "germs" in general is judged with the most susceptible relevant organism in
the table (:func:`most_susceptible`), and the result says so.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, Callable, Iterable, Sequence

import numpy as np

from uvcheck.data_files import read_table, read_toml
from uvcheck.errors import ConfigurationError

LN10 = math.log(10.0)
#: 1 mJ/cm² = 1e-3 J / 1e-4 m² = 10 J/m² (unit definition).
J_M2_PER_MJ_CM2 = 10.0
#: 1 cm²/mJ = 1e-4 m² / 1e-3 J = 0.1 m²/J (unit definition).
M2_J_PER_CM2_MJ = 0.1
KINETIC_BASES = ("e", "10")
MODELS = ("first_order", "dose_table", "two_population")
MEDIA = ("air", "surface", "water", "mixed", "unspecified")
#: Which table media count for a question about a medium. Reviews that pool media ("mixed")
#: and legacy charts ("unspecified") are relevant to every medium (benefit of the doubt).
RELEVANT_MEDIA = {
    "air": ("air", "mixed", "unspecified"),
    "surface": ("surface", "mixed", "unspecified"),
    "water": ("water", "mixed", "unspecified"),
    "any": MEDIA,
}
#: Pathways and the wavelength span of table rows that belong to them. [nm]
PATHWAYS = {"uvc": (200.0, 280.0), "violet_blue": (380.0, 500.0)}
RELIABILITY_ORDER = ("primary", "review", "secondary", "legacy")
RECIPROCITY_NOTE = ("reciprocity (dose = irradiance × time) is assumed; it fails at very low "
                    "dose rates for some organisms")
GENERIC_NOTE = ("a claim about germs in general is judged with the most susceptible relevant "
                "organism in uvcheck's table ({name}, {medium}); most real pathogens need more")
#: Percent reductions reported everywhere, with their log reductions.
STANDARD_PERCENTS = (90.0, 99.0, 99.9)


# ---------------------------------------------------------------------------------------------
# Kinetics
# ---------------------------------------------------------------------------------------------

def log_for_percent(percent: float) -> float:
    """Log reduction for a percent reduction: 90 % → 1, 99.9 % → 3. [-]

    Examples
    --------
    >>> round(log_for_percent(99.9), 6)
    3.0
    """
    p = float(percent)
    if not 0.0 < p < 100.0:
        raise ConfigurationError(f"a percent reduction must be between 0 and 100, got {p:g}")
    return -math.log10(1.0 - p / 100.0)


def percent_for_log(n_log: float) -> float:
    """Percent reduction for a log reduction: 3 → 99.9 %. [%]"""
    return 100.0 * (1.0 - 10.0 ** (-float(n_log)))


def _base(base: str) -> str:
    b = str(base)
    if b not in KINETIC_BASES:
        raise ConfigurationError(f"unknown log base {base!r} of a rate constant; "
                                 f"available: {', '.join(KINETIC_BASES)}")
    return b


def k_to_base_e(k: float, base: str) -> float:
    """A rate constant in natural-log form: k_e = k (base e) or k₁₀·ln 10 (base 10). [same unit]

    Examples
    --------
    >>> round(k_to_base_e(0.64, "10"), 3)      # Robinson et al. 2021: base-10 k
    1.474
    """
    return float(k) * (LN10 if _base(base) == "10" else 1.0)


def d90_from_k(k: float, base: str = "e") -> float:
    """D90 = ln 10/k (base e) or 1/k (base 10). [unit of 1/k]

    Examples
    --------
    >>> round(d90_from_k(0.1, "e"), 2)         # NOTES.md §7, C9 (mJ/cm²)
    23.03
    >>> d90_from_k(0.64, "10")                 # C10
    1.5625
    """
    if not k > 0:
        raise ConfigurationError(f"a rate constant must be positive, got {k}")
    return LN10 / k_to_base_e(k, base)


def first_order_survival(dose_J_m2: Any, k_m2_per_J: float, base: str = "e") -> Any:
    """Surviving fraction S = exp(−k·H). [-]"""
    return np.exp(-k_to_base_e(k_m2_per_J, base) * np.asarray(dose_J_m2, dtype=float))


def first_order_log_reduction(dose_J_m2: Any, k_m2_per_J: float, base: str = "e") -> Any:
    """LR = k·H/ln 10 (k in base e). [-]"""
    return k_to_base_e(k_m2_per_J, base) * np.asarray(dose_J_m2, dtype=float) / LN10


def first_order_dose(n_log: Any, k_m2_per_J: float, base: str = "e") -> Any:
    """Dose for an n-log reduction, H = n·ln 10/k. [J m⁻²]

    Examples
    --------
    >>> round(float(first_order_dose(3, 0.1 * 0.1)), 1)   # k = 0.1 cm²/mJ = 0.01 m²/J: 3 × 230.3 J/m²
    690.8
    """
    return np.asarray(n_log, dtype=float) * LN10 / k_to_base_e(k_m2_per_J, base)


def two_population_survival(dose_J_m2: Any, k1_m2_per_J: float, k2_m2_per_J: float,
                            resistant_fraction: float, base: str = "e") -> Any:
    """S = (1−f)·exp(−k₁H) + f·exp(−k₂H) (NOTES.md §4). [-]

    k1_m2_per_J, k2_m2_per_J : rate constants of the sensitive and resistant populations. [m² J⁻¹]
    resistant_fraction : f, 0 ≤ f < 1. [-]
    """
    f = float(resistant_fraction)
    if not 0.0 <= f < 1.0:
        raise ConfigurationError(f"the resistant fraction must be in [0, 1), got {f}")
    h = np.asarray(dose_J_m2, dtype=float)
    k1, k2 = k_to_base_e(k1_m2_per_J, base), k_to_base_e(k2_m2_per_J, base)
    return (1.0 - f) * np.exp(-k1 * h) + f * np.exp(-k2 * h)


def two_population_log_reduction(dose_J_m2: Any, k1_m2_per_J: float, k2_m2_per_J: float,
                                 resistant_fraction: float, base: str = "e") -> Any:
    """LR = −log₁₀ S for the two-population model. [-]"""
    return -np.log10(two_population_survival(dose_J_m2, k1_m2_per_J, k2_m2_per_J,
                                             resistant_fraction, base))


def two_population_dose(n_log: float, k1_m2_per_J: float, k2_m2_per_J: float,
                        resistant_fraction: float, base: str = "e") -> float | None:
    """Dose for an n-log reduction under the two-population model. [J m⁻²]

    Solved by bisection on the monotone survival curve (100 halvings: exact to machine
    precision). The bracket [0, n·ln10/min(k₁, k₂)] holds because S ≤ exp(−min(k)·H).
    None when the reduction cannot be reached (k₂ = 0 and f ≥ 10⁻ⁿ).

    Examples
    --------
    >>> round(two_population_dose(3, 0.01, 0.01, 0.5), 1)   # k1 = k2: first order
    690.8
    """
    n = float(n_log)
    f = float(resistant_fraction)
    if not 0.0 <= f < 1.0:
        raise ConfigurationError(f"the resistant fraction must be in [0, 1), got {f}")
    k1, k2 = k_to_base_e(k1_m2_per_J, base), k_to_base_e(k2_m2_per_J, base)
    if not k1 > 0 or k2 < 0:
        raise ConfigurationError(f"rate constants must be k1 > 0, k2 >= 0, got {k1}, {k2}")
    target = 10.0 ** (-n)
    if f > 0 and k2 == 0:
        # S -> f as H -> infinity; below that, S = target has the closed form below
        if f >= target:
            return None
        return -math.log((target - f) / (1.0 - f)) / k1
    lo, hi = 0.0, n * LN10 / (min(k1, k2) if f > 0 else k1)
    for _ in range(100):
        mid = 0.5 * (lo + hi)
        if float(two_population_survival(mid, k1, k2, f)) > target:
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def time_for_dose(dose_J_m2: float | None, irradiance_W_m2: float | None) -> float | None:
    """t = H/E; None when either is missing or the irradiance is not positive. [s]

    Examples
    --------
    >>> round(time_for_dose(100.0, 0.0796))          # 10 mJ/cm² at 7.96 µW/cm² (C12)
    1256
    """
    if dose_J_m2 is None or irradiance_W_m2 is None or not irradiance_W_m2 > 0:
        return None
    t = float(dose_J_m2) / float(irradiance_W_m2)
    return t if math.isfinite(t) else None


def each_per_h(k_m2_per_J: float, fluence_rate_W_m2: float, irradiated_fraction: float = 1.0) -> float:
    """Equivalent air changes per hour, eACH = 3600·k·E_avg·f_rad (NOTES.md §5). [h⁻¹]

    k_m2_per_J : natural-log (base e) rate constant. [m² J⁻¹]
    fluence_rate_W_m2 : average fluence rate in the irradiated zone (or, with f_rad = 1, the
        whole-room volume average). [W m⁻²]
    irradiated_fraction : f_rad, the irradiated share of the room volume. [-]

    Examples
    --------
    >>> round(each_per_h(0.28, 0.5, 0.2), 1)         # NOTES.md §7, C14
    100.8
    """
    return 3600.0 * float(k_m2_per_J) * float(fluence_rate_W_m2) * float(irradiated_fraction)


def mixed_air_time(n_log: float, k_m2_per_J: float, fluence_rate_W_m2: float) -> float | None:
    """Time to an n-log reduction in well-mixed air, t = n·ln 10/(k·E_avg). [s]

    k_m2_per_J : natural-log rate constant. [m² J⁻¹]; fluence_rate_W_m2 : room average. [W m⁻²]
    """
    if not (k_m2_per_J > 0 and fluence_rate_W_m2 > 0):
        return None
    return float(n_log) * LN10 / (k_m2_per_J * fluence_rate_W_m2)


# ---------------------------------------------------------------------------------------------
# The organism table
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True, eq=False)
class Organism:
    """One row of the organism table, in SI.

    id : exact key, e.g. ``hcov_oc43_air_222_buonanno2020``.
    organism, group : name; virus | phage | bacterium | bacterial_spore | fungal_spore |
        protozoan | mixed.
    medium, substrate : see :data:`MEDIA`; the surface material, if any.
    wavelength_nm : wavelength of the data. [nm]
    pathway : ``uvc`` or ``violet_blue``.
    model : ``first_order`` | ``dose_table`` | ``two_population``.
    k_published, k_base, k_range_published : the rate constant as published [cm² mJ⁻¹]
        with its log base, and its range across studies.
    log_doses_J_m2 : the source's (n-log, dose) pairs. [-], [J m⁻²]
    resistant_fraction, k2_published : two-population parameters (k₂ in cm² mJ⁻¹, same base).
    dose_bound : ``at_most`` when the source gives "at least n log at H".
    source, citation, reliability, from_memory, notes : provenance.
    """

    id: str
    organism: str
    group: str
    medium: str
    substrate: str
    wavelength_nm: float
    pathway: str
    model: str
    k_published: float | None
    k_base: str | None
    k_range_published: tuple[float, float] | None
    log_doses_J_m2: tuple[tuple[float, float], ...]
    resistant_fraction: float | None
    k2_published: float | None
    dose_bound: str
    source: str
    citation: str
    reliability: str
    from_memory: str
    notes: str

    # --- rate constants in SI --------------------------------------------------------------
    @property
    def k_e_m2_per_J(self) -> float | None:
        """Natural-log first-order constant (for eACH and air models). [m² J⁻¹]

        From the published k; else n·ln10/H through a single pair; else ln10/D90 of the
        dose table (its initial slope if it never reaches 1 log). For two populations: k₁.
        """
        if self.k_published is not None:
            return k_to_base_e(self.k_published, self.k_base or "e") * M2_J_PER_CM2_MJ
        pairs = self.log_doses_J_m2
        if not pairs:
            return None
        if len(pairs) == 1:
            n, h = pairs[0]
            return n * LN10 / h
        d90 = self.dose_for_log(1.0)
        if d90 is None:
            n, h = pairs[0]
            return n * LN10 / h
        return LN10 / d90

    @property
    def max_log(self) -> float | None:
        """Highest log reduction the data reach (None for a rate constant). [-]"""
        return max(n for n, _ in self.log_doses_J_m2) if self.log_doses_J_m2 else None

    # --- doses -------------------------------------------------------------------------------
    def _remembered(self, what: str, n_log: float, compute: Callable[[float], Any]) -> Any:
        """``compute(n)`` remembered per row (the row is immutable and its answers depend on
        the table alone; estimates ask for the same few reductions for every lamp)."""
        from uvcheck.spectrum import remembered

        n = float(n_log)
        return remembered(self, (what, n), lambda: compute(n))

    def dose_for_log(self, n_log: float) -> float | None:
        """Dose for an n-log reduction. [J m⁻²]

        None where the model cannot say: a dose table beyond its last pair, or a two-population
        curve that never gets there.

        Examples
        --------
        >>> oc43 = get_organism("hcov_oc43_air_222_buonanno2020")
        >>> round(oc43.dose_for_log(1.0), 1)           # 1.2 mJ/cm² for 3 log -> 4 J/m² per log
        4.0
        """
        n = float(n_log)
        if not n > 0:
            raise ConfigurationError(f"a log reduction must be positive, got {n}")
        return self._remembered("dose", n, self._dose_for_log)

    def _dose_for_log(self, n: float) -> float | None:
        if self.model == "two_population":
            k1 = (self.k_published or 0.0) * M2_J_PER_CM2_MJ
            k2 = (self.k2_published or 0.0) * M2_J_PER_CM2_MJ
            return two_population_dose(n, k1, k2, self.resistant_fraction or 0.0, self.k_base or "e")
        if self.model == "dose_table" and len(self.log_doses_J_m2) > 1:
            logs = np.array([0.0] + [p[0] for p in self.log_doses_J_m2])
            doses = np.array([0.0] + [p[1] for p in self.log_doses_J_m2])
            if n > logs[-1] + 1e-12:
                return None
            return float(np.interp(n, logs, doses))
        k = self.k_e_m2_per_J
        return None if not k else n * LN10 / k

    def log_reduction(self, dose_J_m2: float) -> float | None:
        """Log reduction for a dose; None beyond the last pair of a dose table. [-]"""
        h = float(dose_J_m2)
        if h < 0:
            raise ConfigurationError(f"a dose must not be negative, got {h}")
        if self.model == "two_population":
            k1 = (self.k_published or 0.0) * M2_J_PER_CM2_MJ
            k2 = (self.k2_published or 0.0) * M2_J_PER_CM2_MJ
            return float(two_population_log_reduction(h, k1, k2, self.resistant_fraction or 0.0,
                                                      self.k_base or "e"))
        if self.model == "dose_table" and len(self.log_doses_J_m2) > 1:
            logs = np.array([0.0] + [p[0] for p in self.log_doses_J_m2])
            doses = np.array([0.0] + [p[1] for p in self.log_doses_J_m2])
            if h > doses[-1] * (1 + 1e-12):
                return None
            return float(np.interp(h, doses, logs))
        k = self.k_e_m2_per_J
        return None if not k else k * h / LN10

    @property
    def d90_J_m2(self) -> float | None:
        """Dose for 90 % (1 log). [J m⁻²]"""
        return self.dose_for_log(1.0)

    def dose_range_for_log(self, n_log: float) -> tuple[float, float] | None:
        """Range of the n-log dose across the studies behind this row and its sibling rows
        (same organism, pathway and wavelength). [J m⁻²]"""
        return self._remembered("range", n_log, self._dose_range_for_log)

    def _dose_range_for_log(self, n_log: float) -> tuple[float, float] | None:
        vals: list[float] = []
        for o in siblings(self):
            d = o.dose_for_log(n_log)
            if d is not None:
                vals.append(d)
            if o.k_range_published is not None and o.model == "first_order":
                base = o.k_base or "e"
                for k in o.k_range_published:
                    vals.append(n_log * LN10 / (k_to_base_e(k, base) * M2_J_PER_CM2_MJ))
        return (min(vals), max(vals)) if len(vals) > 1 else None

    def is_extrapolated(self, n_log: float) -> bool:
        """True when a first-order row built on one (n, H) pair is used beyond n."""
        return (self.model == "first_order" and self.k_published is None
                and len(self.log_doses_J_m2) == 1 and n_log > self.log_doses_J_m2[0][0] + 1e-9)

    def to_dict(self) -> dict:
        return {
            "id": self.id, "organism": self.organism, "group": self.group,
            "medium": self.medium, "substrate": self.substrate or None,
            "wavelength_nm": self.wavelength_nm, "pathway": self.pathway, "model": self.model,
            "k_published": None if self.k_published is None else {
                "value": self.k_published, "unit": "cm2/mJ", "base": self.k_base,
                "range": None if self.k_range_published is None else list(self.k_range_published)},
            "k_e_m2_per_J": self.k_e_m2_per_J,
            "log_doses_J_m2": [list(p) for p in self.log_doses_J_m2],
            "resistant_fraction": self.resistant_fraction,
            "d90_J_m2": self.d90_J_m2,
            "dose_bound": self.dose_bound or None,
            "source": self.source, "citation": self.citation,
            "reliability": self.reliability, "from_memory": self.from_memory,
            "notes": self.notes or None,
        }


def _pairs(text: str, where: str) -> tuple[tuple[float, float], ...]:
    if not text.strip():
        return ()
    out = []
    for part in text.split(";"):
        try:
            n, h = part.split(":")
            out.append((float(n), float(h) * J_M2_PER_MJ_CM2))
        except ValueError:
            raise ConfigurationError(f"cannot read the dose pair {part!r}", where,
                                     "write pairs as 'n:dose;n:dose' in mJ/cm2") from None
    logs = [p[0] for p in out]
    doses = [p[1] for p in out]
    if any(b <= a for a, b in zip(logs, logs[1:])) or any(b <= a for a, b in zip(doses, doses[1:])):
        raise ConfigurationError("dose pairs must increase in both log and dose", where)
    if any(n <= 0 or h <= 0 for n, h in out):
        raise ConfigurationError("dose pairs must be positive", where)
    return tuple(out)


def _pathway(wavelength_nm: float) -> str:
    for name, (lo, hi) in PATHWAYS.items():
        if lo <= wavelength_nm <= hi:
            return name
    raise ConfigurationError(f"no inactivation pathway covers {wavelength_nm:g} nm")


@lru_cache(maxsize=1)
def organisms() -> tuple[Organism, ...]:
    """The organism table, parsed and converted to SI once per process.

    Examples
    --------
    >>> any(o.id == "ms2_water_254_rockey2021" for o in organisms())
    True
    """
    table = read_table("organisms/organisms.csv")
    sources = read_toml("organisms/organisms.toml").get("sources", {})
    out = []
    seen = set()
    for i, r in enumerate(table.records()):
        where = f"data/organisms/organisms.csv row {i + 1} ({r.get('id', '?')})"
        oid = r["id"]
        if oid in seen:
            raise ConfigurationError("duplicate organism id", where)
        seen.add(oid)
        if r["medium"] not in MEDIA:
            raise ConfigurationError(f"unknown medium {r['medium']!r}", where)
        if r["source"] not in sources:
            raise ConfigurationError(f"source key {r['source']!r} missing from organisms.toml", where)
        k = float(r["k_cm2_per_mJ"]) if r["k_cm2_per_mJ"] else None
        base = r["k_base"] or None
        if k is not None:
            _base(base or "")
        rng = None
        if r["k_range_cm2_per_mJ"]:
            lo, hi = (float(x) for x in r["k_range_cm2_per_mJ"].split(";"))
            rng = (lo, hi)
        pairs = _pairs(r["log_doses_mJ_cm2"], where)
        f = float(r["resistant_fraction"]) if r["resistant_fraction"] else None
        k2 = float(r["k2_cm2_per_mJ"]) if r["k2_cm2_per_mJ"] else None
        if f is not None:
            model = "two_population"
            if k is None or k2 is None:
                raise ConfigurationError("a resistant fraction needs k and k2", where)
        elif k is not None or len(pairs) == 1:
            model = "first_order"
        elif len(pairs) > 1:
            model = "dose_table"
        else:
            raise ConfigurationError("a row needs a rate constant or a dose", where)
        wl = float(r["wavelength_nm"])
        out.append(Organism(
            id=oid, organism=r["organism"], group=r["group"], medium=r["medium"],
            substrate=r["substrate"], wavelength_nm=wl, pathway=_pathway(wl), model=model,
            k_published=k, k_base=base, k_range_published=rng, log_doses_J_m2=pairs,
            resistant_fraction=f, k2_published=k2, dose_bound=r["dose_bound"],
            source=r["source"], citation=sources[r["source"]]["citation"],
            reliability=r["reliability"], from_memory=r["from_memory"], notes=r["notes"]))
    return tuple(out)


def get_organism(organism_id: str) -> Organism:
    """One organism row by its exact id; an unknown id names the available ones."""
    for o in organisms():
        if o.id == organism_id:
            return o
    raise ConfigurationError(f"unknown organism {organism_id!r}; available: "
                             f"{', '.join(o.id for o in organisms())}",
                             todo="list them with 'uvcheck organisms'")


def siblings(organism: Organism) -> tuple[Organism, ...]:
    """Rows for the same organism, pathway and wavelength (studies to take a range over)."""
    return tuple(o for o in organisms() if o.organism == organism.organism
                 and o.pathway == organism.pathway and o.wavelength_nm == organism.wavelength_nm)


def select(medium: str | None = None, pathway: str | None = None,
           ids: Iterable[str] | None = None,
           exclude_groups: Sequence[str] = ()) -> tuple[Organism, ...]:
    """Rows relevant to a medium (see :data:`RELEVANT_MEDIA`) and pathway, or the given ids.

    Examples
    --------
    >>> {o.medium for o in select("air", "uvc")} <= {"air", "mixed", "unspecified"}
    True
    """
    if ids is not None:
        return tuple(get_organism(i) for i in ids)
    return _select(medium, pathway, tuple(exclude_groups))


@lru_cache(maxsize=256)
def _select(medium: str | None, pathway: str | None,
            exclude_groups: tuple[str, ...]) -> tuple[Organism, ...]:
    """:func:`select` without ids (the table is loaded once, so the answer never changes)."""
    if medium is not None and medium not in RELEVANT_MEDIA:
        raise ConfigurationError(f"unknown medium {medium!r}; available: "
                                 f"{', '.join(RELEVANT_MEDIA)}")
    if pathway is not None and pathway not in PATHWAYS:
        raise ConfigurationError(f"unknown pathway {pathway!r}; available: {', '.join(PATHWAYS)}")
    media = RELEVANT_MEDIA[medium] if medium else MEDIA
    return tuple(o for o in organisms() if o.medium in media
                 and (pathway is None or o.pathway == pathway)
                 and o.group not in exclude_groups)


# ---------------------------------------------------------------------------------------------
# Times at an irradiance
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class InactivationEstimate:
    """Doses and times for 90 / 99 / 99.9 % for one organism at one irradiance.

    organism : the table row.
    irradiance_W_m2 : irradiance (or fluence rate) equivalent at the organism's wavelength. [W m⁻²]
    irradiance_basis : how that figure was obtained (action spectrum, position, bound).
    times_are : ``estimate``; ``at_least`` when the irradiance is an upper bound (below
        detection, likely stray light); ``at_most`` when it is a lower bound (partly measured).
    doses_J_m2, times_s : keyed by percent (90.0, 99.0, 99.9); None where the model cannot
        say or there is no irradiance. [J m⁻²], [s]
    time_ranges_s : range across studies, keyed by percent, or None. [s]
    notes : caveats (extrapolation, bounds, reciprocity).
    """

    organism: Organism
    irradiance_W_m2: float | None
    irradiance_basis: str
    times_are: str
    doses_J_m2: dict
    times_s: dict
    time_ranges_s: dict
    notes: tuple[str, ...] = field(default_factory=tuple)

    def time_s(self, percent: float) -> float | None:
        return self.times_s.get(float(percent))

    def missing_reason(self, percent: float) -> str | None:
        """Why there is no time for ``percent`` (None when there is one).

        Examples
        --------
        >>> e = estimate(get_organism("listeria_surface_pvc_405_murdoch2012"), 1.0)
        >>> e.missing_reason(90)                  # Murdoch 2012 Table 3: 0.93 log at most
        'not reached in the study: its data end at 0.93 log (88.3 %)'
        """
        p = float(percent)
        if self.times_s.get(p) is not None:
            return None
        o = self.organism
        if self.doses_J_m2.get(p) is None:
            if o.model == "dose_table" and o.max_log is not None:
                return (f"not reached in the study: its data end at {o.max_log:g} log "
                        f"({percent_for_log(o.max_log):.3g} %)")
            if o.model == "two_population":
                return "never reached: the resistant fraction survives"
            return "no dose in the table"
        return "no irradiance at this organism's wavelength"

    def to_dict(self) -> dict:
        o = self.organism

        def rng(p: float) -> list | None:
            r = self.time_ranges_s.get(p)
            return None if r is None else [r[0], r[1]]
        return {
            "organism_id": o.id, "organism": o.organism, "group": o.group, "medium": o.medium,
            "substrate": o.substrate or None, "wavelength_nm": o.wavelength_nm,
            "pathway": o.pathway, "model": o.model,
            "k_e_m2_per_J": o.k_e_m2_per_J,
            "k_published": None if o.k_published is None else
            {"value": o.k_published, "unit": "cm2/mJ", "base": o.k_base},
            "irradiance_W_m2": self.irradiance_W_m2, "irradiance_basis": self.irradiance_basis,
            "times_are": self.times_are,
            "dose_90_J_m2": self.doses_J_m2.get(90.0), "dose_99_J_m2": self.doses_J_m2.get(99.0),
            "dose_99_9_J_m2": self.doses_J_m2.get(99.9),
            "time_to_90_s": self.times_s.get(90.0), "time_to_99_s": self.times_s.get(99.0),
            "time_to_99_9_s": self.times_s.get(99.9),
            "time_to_90_s_range": rng(90.0), "time_to_99_9_s_range": rng(99.9),
            "time_missing_reason": {f"{p:g}": self.missing_reason(p) for p in self.times_s},
            "max_log_reduction": o.max_log,
            "dose_bound": o.dose_bound or None, "reliability": o.reliability,
            "source": o.citation, "source_key": o.source, "from_memory": o.from_memory,
            "notes": list(self.notes),
        }


def estimate(organism: Organism, irradiance_W_m2: float | None, *, basis: str = "",
             times_are: str = "estimate",
             percents: Sequence[float] = STANDARD_PERCENTS) -> InactivationEstimate:
    """Doses and times to 90 / 99 / 99.9 % for an organism at an irradiance.

    organism : a table row (:func:`get_organism`).
    irradiance_W_m2 : the irradiance (surface) or fluence rate (air) equivalent at the
        organism's wavelength. [W m⁻²]

    Examples
    --------
    >>> e = estimate(get_organism("hcov_oc43_air_222_buonanno2020"), 3 * 10 / 3600)
    >>> round(e.time_s(90) / 60, 1), round(e.time_s(99.9) / 60, 1)   # C11: 3 mJ/cm² per hour
    (8.0, 24.0)
    """
    doses: dict[float, float | None] = {}
    times: dict[float, float | None] = {}
    ranges: dict[float, tuple[float, float] | None] = {}
    notes: list[str] = []
    for p in percents:
        p = float(p)
        n = log_for_percent(p)
        d = organism.dose_for_log(n)
        doses[p] = d
        times[p] = time_for_dose(d, irradiance_W_m2)
        r = organism.dose_range_for_log(n)
        if r is not None and irradiance_W_m2 and irradiance_W_m2 > 0:
            ranges[p] = (r[0] / irradiance_W_m2, r[1] / irradiance_W_m2)
        else:
            ranges[p] = None
        if d is None and organism.model == "dose_table":
            notes.append(f"{p:g} % is beyond the study's data (at most {organism.max_log:g} log): "
                         "not extrapolated")
    top = log_for_percent(max(percents))
    if organism.is_extrapolated(top):
        notes.append(f"first-order extrapolation beyond the measured "
                     f"{organism.log_doses_J_m2[0][0]:g} log: optimistic if the curve tails")
    if organism.dose_bound == "at_most":
        notes.append("the source gives at least this reduction at its dose: the doses are upper "
                     "bounds, so the times are too")
    if organism.reliability == "legacy":
        notes.append("legacy chart of unclear origin: order of magnitude only")
    if irradiance_W_m2 is None or not irradiance_W_m2 > 0:
        notes.append("no irradiance at this organism's wavelength: no time")
    notes.append(RECIPROCITY_NOTE)
    return InactivationEstimate(organism=organism, irradiance_W_m2=irradiance_W_m2,
                                irradiance_basis=basis, times_are=times_are, doses_J_m2=doses,
                                times_s=times, time_ranges_s=ranges, notes=tuple(notes))


def time_to_reduction(organism: Organism, irradiance_W_m2: float, percent: float = 99.9) -> float | None:
    """Time to a percent reduction at an irradiance. [s]"""
    return time_for_dose(organism.dose_for_log(log_for_percent(percent)), irradiance_W_m2)


def required_irradiance(organism: Organism, percent: float, time_s: float) -> float | None:
    """Irradiance needed for a percent reduction within a time, E = H/t. [W m⁻²]

    Examples
    --------
    >>> o = get_organism("coronaviruses_mixed_254_hessling2020_best")
    >>> round(required_irradiance(o, 99.9, 1800) * 100, 2)   # C16: µW/cm² for 99.9 % in 30 min
    6.17
    """
    d = organism.dose_for_log(log_for_percent(percent))
    if d is None or not time_s > 0:
        return None
    return d / time_s


def most_susceptible(irradiance_for: Callable[[Organism], float | None], medium: str = "any",
                     pathway: str | None = None, percent: float = 99.9,
                     candidates: Iterable[Organism] | None = None,
                     exclude_groups: Sequence[str] = ("phage",)) -> InactivationEstimate | None:
    """The relevant organism reaching ``percent`` soonest at this lamp's irradiance.

    irradiance_for : the lamp's equivalent irradiance for a row (it depends on the row's
        wavelength and pathway), or None where the lamp gives nothing usable. [W m⁻²]
    medium : ``air`` | ``surface`` | ``water`` | ``any`` (see :data:`RELEVANT_MEDIA`).
    exclude_groups : phages are laboratory surrogates, not germs, and are left out by default.

    Ties go to the more reliable row. The estimate's notes say that a generic claim was
    judged with this organism. None when no row gives a time.

    Examples
    --------
    >>> best = most_susceptible(lambda o: 1.0 if o.pathway == "uvc" else None, "air")
    >>> best.organism.medium in ("air", "mixed", "unspecified")
    True
    """
    pool = list(candidates) if candidates is not None else list(select(medium, pathway,
                                                                       exclude_groups=exclude_groups))
    ranked = []
    for o in pool:
        e = irradiance_for(o)
        t = time_to_reduction(o, e, percent) if e else None
        if t is not None:
            rel = RELIABILITY_ORDER.index(o.reliability) if o.reliability in RELIABILITY_ORDER else 9
            ranked.append((t, rel, o, e))
    if not ranked:
        return None
    ranked.sort(key=lambda x: (x[0], x[1]))
    t, _, o, e = ranked[0]
    est = estimate(o, e, basis="most susceptible relevant organism")
    note = GENERIC_NOTE.format(name=o.organism, medium=o.medium)
    return InactivationEstimate(organism=est.organism, irradiance_W_m2=est.irradiance_W_m2,
                                irradiance_basis=est.irradiance_basis, times_are=est.times_are,
                                doses_J_m2=est.doses_J_m2, times_s=est.times_s,
                                time_ranges_s=est.time_ranges_s, notes=(note,) + est.notes)
