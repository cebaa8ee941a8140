"""Irradiance versus distance for simple emitter models, with their near-field limits.

Three models, each usable from a radiant flux Φ or from an irradiance E₀ measured at d₀
(all wavelengths scale alike, so one factor moves a whole spectrum):

``point``
    isotropic point source, E = Φ/(4πd²) (NOTES.md §5). Exact outside a uniformly emitting
    sphere of any radius; for other shapes the inverse-square law is within about 1 % from
    five times the largest source dimension onwards (the "five-times rule", common practice;
    for a disc of radius a the error is a²/d², which is 1 % at d = 10a [derived]).
``lambertian``
    on-axis Lambertian emitter (a flat source radiating with a cosine law into a half-space),
    E = Φ/(πd²) (NOTES.md §5). With the source diameter D given, the exact on-axis value for
    a uniform Lambertian disc of radius a = D/2, E = Φ/(π(a² + d²)), is used [derived: the
    standard disc-to-point configuration factor]; the far-field deviation a²/d² is reported.
``tube``
    linear tube of arc length L, receiver on the perpendicular bisector at distance d facing
    the tube (Keitz): E = Φ(2α + sin 2α)/(2π²Ld), α = arctan(L/2d); far field
    E → Φ/(π²d²) (NOTES.md §5). The formula treats the tube as a uniform Lambertian cylinder
    along its arc and ignores its diameter, the electrodes and any reflector: it is
    inaccurate within a few tube diameters and does not apply off the bisector.

The measured spectrum is taken to be on the axis of maximum intensity (straight in front of
a flat emitter, broadside to a tube). Numpy only; every function accepts scalars or arrays.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import Any

import numpy as np

from uvcheck.errors import ConfigurationError

EMITTER_MODELS = ("point", "lambertian", "tube")
#: Deviation from the far-field (point-like) form above which a distance is "near field". [-]
NEAR_FIELD_WARN = 0.01   # 1 %: the five-times-rule accuracy (common practice)
NEAR_FIELD_INVALID = 0.10  # 10 %: ours


def _out(x: np.ndarray) -> Any:
    return float(x) if np.ndim(x) == 0 else x


def _positive(name: str, x: Any) -> np.ndarray:
    a = np.asarray(x, dtype=float)
    if not np.all(np.isfinite(a)) or np.any(a <= 0):
        raise ConfigurationError(f"{name} must be positive and finite, got {x!r}",
                                 todo="give a positive value with its unit, e.g. '1 m'")
    return a


def _check_model(emitter: str, tube_length_m: float | None) -> None:
    if emitter not in EMITTER_MODELS:
        raise ConfigurationError(f"unknown emitter model {emitter!r}; "
                                 f"available: {', '.join(EMITTER_MODELS)}")
    if emitter == "tube" and tube_length_m is None:
        raise ConfigurationError("the tube model needs the tube's arc length",
                                 todo="give the tube length, e.g. '0.8 m'")


def keitz_irradiance(flux_W: Any, distance_m: Any, tube_length_m: float) -> Any:
    """Irradiance on the perpendicular bisector of a linear tube (Keitz formula). [W m⁻²]

    flux_W : radiant flux of the tube (in the band of interest). [W]
    distance_m : perpendicular distance from the tube axis. [m]
    tube_length_m : arc length L. [m]

    E = Φ(2α + sin 2α)/(2π²Ld), α = arctan(L/2d) (NOTES.md §5).

    Examples
    --------
    >>> round(keitz_irradiance(10.0, 1.0, 0.8), 4)      # NOTES.md §7, C13
    0.9186
    """
    d = _positive("distance", distance_m)
    L = float(_positive("tube length", tube_length_m))
    a = np.arctan(L / (2.0 * d))
    return _out(np.asarray(flux_W, dtype=float) * (2.0 * a + np.sin(2.0 * a))
                / (2.0 * math.pi ** 2 * L * d))


def irradiance_per_watt(distance_m: Any, emitter: str = "point", tube_length_m: float | None = None,
                        source_size_m: float | None = None) -> Any:
    """Irradiance per watt of flux at ``distance_m`` for an emitter model. [W m⁻² W⁻¹] = [m⁻²]

    distance_m : distance from the source (for a tube: from its axis, on the bisector). [m]
    emitter : ``point`` | ``lambertian`` | ``tube``.
    tube_length_m : arc length for ``tube``. [m]
    source_size_m : diameter of a Lambertian disc (used by ``lambertian`` only). [m]

    Examples
    --------
    >>> round(irradiance_per_watt(0.1) * 0.010 * 100, 2)   # 10 mW at 10 cm in µW/cm² (C12)
    7.96
    """
    _check_model(emitter, tube_length_m)
    d = _positive("distance", distance_m)
    if emitter == "point":
        return _out(1.0 / (4.0 * math.pi * d ** 2))
    if emitter == "lambertian":
        a2 = 0.0 if source_size_m is None else (float(_positive("source size", source_size_m)) / 2) ** 2
        return _out(1.0 / (math.pi * (a2 + d ** 2)))
    return keitz_irradiance(1.0, d, float(tube_length_m))  # type: ignore[arg-type]


def irradiance_from_flux(flux_W: Any, distance_m: Any, emitter: str = "point",
                         tube_length_m: float | None = None,
                         source_size_m: float | None = None) -> Any:
    """Irradiance at ``distance_m`` from a radiant flux, for an emitter model. [W m⁻²]

    flux_W : radiant flux (any band; the result is in the same band). [W]

    Examples
    --------
    >>> round(irradiance_from_flux(10.0, 10.0, "tube", tube_length_m=0.8), 5)   # C13
    0.01012
    """
    return _out(np.asarray(flux_W, dtype=float)
                * irradiance_per_watt(distance_m, emitter, tube_length_m, source_size_m))


def flux_from_irradiance(irradiance_W_m2: Any, distance_m: Any, emitter: str = "point",
                         tube_length_m: float | None = None,
                         source_size_m: float | None = None) -> Any:
    """The radiant flux that gives ``irradiance_W_m2`` at ``distance_m`` on axis. [W]

    An estimate: it assumes the emission pattern of the model (isotropic for ``point``,
    cosine for ``lambertian``, a Lambertian cylinder for ``tube``).

    Examples
    --------
    >>> round(flux_from_irradiance(0.0796, 0.1), 4)   # 7.96 µW/cm² at 10 cm -> 10 mW
    0.01
    """
    return _out(np.asarray(irradiance_W_m2, dtype=float)
                / irradiance_per_watt(distance_m, emitter, tube_length_m, source_size_m))


def scale_factor(from_distance_m: Any, to_distance_m: Any, emitter: str = "point",
                 tube_length_m: float | None = None, source_size_m: float | None = None) -> Any:
    """E(to)/E(from) for an emitter model: multiply a spectrum measured at ``from`` by it. [-]

    Examples
    --------
    >>> scale_factor(0.2, 0.4)          # inverse square
    0.25
    """
    return _out(irradiance_per_watt(to_distance_m, emitter, tube_length_m, source_size_m)
                / irradiance_per_watt(from_distance_m, emitter, tube_length_m, source_size_m))


def irradiance_at(distance_m: Any, *, emitter: str = "point", irradiance_W_m2: float | None = None,
                  measured_at_m: float | None = None, flux_W: float | None = None,
                  tube_length_m: float | None = None, source_size_m: float | None = None) -> Any:
    """Irradiance at ``distance_m``, from a measurement (E₀ at d₀) or from a flux. [W m⁻²]

    Give either ``irradiance_W_m2`` with ``measured_at_m`` or ``flux_W``.

    Examples
    --------
    >>> irradiance_at(2.0, irradiance_W_m2=1.0, measured_at_m=1.0)
    0.25
    """
    if flux_W is not None:
        if irradiance_W_m2 is not None:
            raise ConfigurationError("give either a flux or a measured irradiance, not both")
        return irradiance_from_flux(flux_W, distance_m, emitter, tube_length_m, source_size_m)
    if irradiance_W_m2 is None or measured_at_m is None:
        raise ConfigurationError("an irradiance needs the distance it was measured at",
                                 todo="give the measurement distance, e.g. '20 cm'")
    return _out(np.asarray(irradiance_W_m2, dtype=float)
                * scale_factor(measured_at_m, distance_m, emitter, tube_length_m, source_size_m))


def distance_for_irradiance(target_W_m2: Any, *, flux_W: Any, emitter: str = "point",
                            tube_length_m: float | None = None,
                            source_size_m: float | None = None) -> Any:
    """The distance at which the irradiance falls to ``target_W_m2``. [m]

    Closed form for ``point`` and ``lambertian``; bisection (60 halvings of a log bracket,
    relative precision below 1e-12) for ``tube``, whose irradiance falls monotonically with
    distance. None when even the source itself (d → 0) stays below the target (a Lambertian
    disc of known size has a finite on-axis maximum). Scalars or arrays (element by element;
    NaN for None).

    Examples
    --------
    >>> round(distance_for_irradiance(0.0796, flux_W=0.010), 3)
    0.1
    """
    target = _positive("target irradiance", target_W_m2)
    flux = _positive("flux", flux_W)
    _check_model(emitter, tube_length_m)
    scalar = target.ndim == 0 and flux.ndim == 0
    if emitter == "point":
        return _out(np.sqrt(flux / (4 * math.pi * target)))
    if emitter == "lambertian":
        a2 = 0.0 if source_size_m is None else (source_size_m / 2) ** 2
        d2 = flux / (math.pi * target) - a2
        if scalar:
            return math.sqrt(float(d2)) if d2 > 0 else None
        return np.where(d2 > 0, np.sqrt(np.maximum(d2, 0.0)), np.nan)
    L = float(tube_length_m)  # type: ignore[arg-type]
    target, flux = np.broadcast_arrays(target, flux)
    lo, hi = np.full(target.shape, 1e-9), np.ones(target.shape)
    while True:
        short = keitz_irradiance(flux, hi, L) > target
        if not np.any(short):
            break
        hi = np.where(short, hi * 10.0, hi)
    for _ in range(60):
        mid = np.sqrt(lo * hi)
        above = keitz_irradiance(flux, mid, L) > target
        lo, hi = np.where(above, mid, lo), np.where(above, hi, mid)
    return _out(np.sqrt(lo * hi))


def far_field_deviation(distance_m: float, emitter: str = "point",
                        tube_length_m: float | None = None,
                        source_size_m: float | None = None) -> float | None:
    """How far the model departs from its point-like far-field form at ``distance_m``. [-]

    ``tube``: Keitz / (Φ/π²d²) − 1 (negative close in); ``lambertian`` with a size:
    −a²/(a² + d²); ``point`` with a size: the disc estimate a²/d² as a guide; None when the
    source size is unknown (point and Lambertian).

    Examples
    --------
    >>> round(far_field_deviation(10.0, "tube", tube_length_m=0.8), 4)
    -0.0011
    """
    d = float(_positive("distance", distance_m))
    _check_model(emitter, tube_length_m)
    if emitter == "tube":
        far = 1.0 / (math.pi ** 2 * d ** 2)
        return float(keitz_irradiance(1.0, d, float(tube_length_m)) / far - 1.0)  # type: ignore[arg-type]
    if source_size_m is None:
        return None
    a2 = (source_size_m / 2) ** 2
    return -a2 / (a2 + d * d) if emitter == "lambertian" else a2 / (d * d)


@dataclass(frozen=True)
class DistanceScaling:
    """A move of a measurement from one distance to another, with its validity.

    emitter : model used. from_distance_m, to_distance_m : [m]. factor : E(to)/E(from). [-]
    far_field_deviation : at the target distance (None if the size is unknown). [-]
    regime : ``far-field`` (< 1 %), ``approximate`` (1–10 %), ``near-field`` (> 10 %) or
        ``unknown`` (source size not given).
    note : the model's assumptions and limits, in words.
    """

    emitter: str
    from_distance_m: float
    to_distance_m: float
    factor: float
    tube_length_m: float | None
    source_size_m: float | None
    far_field_deviation: float | None
    regime: str
    note: str

    def to_dict(self) -> dict:
        return asdict(self)


_NOTES = {
    "point": ("isotropic point source, inverse square; within about 1 % from five times the "
              "largest source dimension (common practice); not valid closer"),
    "lambertian": ("on-axis Lambertian emitter, E = Φ/(π(a² + d²)) for a disc of radius a "
                   "(a = 0 if the size is unknown); on axis only"),
    "tube": ("Keitz formula for a linear tube, on the perpendicular bisector facing the tube; "
             "ignores the tube diameter, electrodes and reflectors: inaccurate within a few "
             "tube diameters and off the bisector"),
}


def distance_scaling(from_distance_m: float, to_distance_m: float, emitter: str = "point",
                     tube_length_m: float | None = None,
                     source_size_m: float | None = None) -> DistanceScaling:
    """The factor that moves a spectrum from one distance to another, and how far to trust it.

    Examples
    --------
    >>> s = distance_scaling(0.2, 1.0, "tube", tube_length_m=0.8)
    >>> (round(s.factor, 3), s.regime)
    (0.096, 'near-field')
    """
    f = float(scale_factor(from_distance_m, to_distance_m, emitter, tube_length_m, source_size_m))
    dev = far_field_deviation(min(from_distance_m, to_distance_m), emitter, tube_length_m,
                              source_size_m)
    if dev is None:
        regime = "unknown"
    elif abs(dev) < NEAR_FIELD_WARN:
        regime = "far-field"
    elif abs(dev) <= NEAR_FIELD_INVALID:
        regime = "approximate"
    else:
        regime = "near-field"
    note = _NOTES[emitter]
    if emitter == "tube" and regime != "far-field":
        note += "; here the Keitz formula itself is used, the far-field form would be off by " \
                f"{abs(dev) * 100:.0f} %"  # type: ignore[arg-type]
    return DistanceScaling(emitter, float(from_distance_m), float(to_distance_m), f,
                           tube_length_m, source_size_m, dev, regime, note)
