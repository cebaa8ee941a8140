"""Measurement and use conditions: distances, source size, emitter model, exposure time."""

from __future__ import annotations

import math
from dataclasses import dataclass, fields

from uvcheck.errors import ConfigurationError

EMITTERS = ("point", "lambertian", "tube")

#: IEC 62471:2006 4.3 / clause 5.2: non-GLS lamps are assessed at 200 mm.
DEFAULT_ASSESSMENT_DISTANCE_M = 0.2
#: Default exposure duration for hazard distances: one 8-hour working day. [s]
WORKDAY_S = 8 * 3600.0


@dataclass(frozen=True)
class Conditions:
    """How the spectrum was measured and how the lamp is used.

    measurement_distance_m : distance from the lamp at which the spectrum was measured;
        None = results apply at the measurement position. [m]
    use_distance_m : a realistic distance of use to evaluate as well. [m]
    source_size_m : apparent source diameter (largest luminous dimension). [m]
    alpha_rad : angular subtense given directly (overrides the size). [rad]
    emitter : ``point`` | ``lambertian`` | ``tube`` (for distance scaling).
    tube_length_m : arc length of a linear tube. [m]
    exposure_time_s : exposure duration for hazard distances (default 8 h). [s]
    general_lighting : lamp for general lighting service (assessed at 500 lx, ≥ 200 mm).
    electrical_power_W : electrical input power, where known. [W]
    """

    measurement_distance_m: float | None = None
    use_distance_m: float | None = None
    source_size_m: float | None = None
    alpha_rad: float | None = None
    emitter: str = "point"
    tube_length_m: float | None = None
    exposure_time_s: float = WORKDAY_S
    general_lighting: bool = False
    electrical_power_W: float | None = None

    def __post_init__(self) -> None:
        for name in ("measurement_distance_m", "use_distance_m", "source_size_m", "alpha_rad",
                     "tube_length_m", "electrical_power_W"):
            v = getattr(self, name)
            if v is not None and not (math.isfinite(v) and v > 0):
                raise ConfigurationError(f"{name.replace('_', ' ')} must be positive, got {v}",
                                         todo="give a positive value with its unit, e.g. '20 cm'")
        if not (math.isfinite(self.exposure_time_s) and self.exposure_time_s > 0):
            raise ConfigurationError(f"exposure time must be positive, got {self.exposure_time_s}")
        if self.emitter not in EMITTERS:
            raise ConfigurationError(f"unknown emitter model {self.emitter!r}; "
                                     f"available: {', '.join(EMITTERS)}")
        if self.emitter == "tube" and self.tube_length_m is None:
            raise ConfigurationError("the tube emitter model needs the tube length",
                                     todo="give --tube-length, e.g. '0.8 m'")

    def alpha_at(self, distance_m: float) -> float | None:
        """Angular subtense α = 2·atan(size / 2d) at ``distance_m``, or the given α. [rad]"""
        if self.alpha_rad is not None:
            return self.alpha_rad
        if self.source_size_m is None:
            return None
        return 2.0 * math.atan(self.source_size_m / (2.0 * distance_m))

    def to_dict(self) -> dict:
        # every field is a scalar: what dataclasses.asdict gives, without its deep copy
        return {f.name: getattr(self, f.name) for f in fields(self)}
