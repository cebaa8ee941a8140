"""The room model: one lamp in a box room, what it does on a work plane and in the air.

Geometry. A box ``width × length × height`` (x, y, z; the floor at z = 0) and a lamp at a
position inside it with an emission pattern, per watt of flux:

* ``isotropic``: I = Φ/(4π) in every direction;
* ``lambertian_down``: I = Φ·cos θ/π below the lamp (θ from the nadir), nothing upwards;
* ``cylinder``: a horizontal bare tube ("all-round"), axis along x or y, I = Φ·sin ψ/π²
  (ψ from the axis: the projected area of a Lambertian cylinder). With a tube length L the
  tube is split into Gauss–Legendre points along its axis; on the perpendicular bisector this
  reproduces the Keitz formula exactly [derived: ∫ sin ψ·cos/r² dl gives
  Φ(2α + sin 2α)/(2π²Ld)], which a test checks.

Direct radiation is computed exactly up to quadrature. The volume integral of a point
source's fluence rate, ∫_V I(Ω)/r² dV = ∫ I(Ω)·R(Ω) dΩ, is turned into an integral over the
room's boundary, ∫_∂V I(Ω)·(n·(x − p))/|x − p|² dA [derived: dΩ = n·(x − p) dA/|x − p|³],
which has no singularity at the lamp. Each face is split at the foot of the perpendicular
from the lamp and mapped with u = h·tan s (h the lamp–face distance), which makes every
integrand smooth and bounded, then integrated by Gauss–Legendre quadrature. The stated error
is the difference between order n and n/2 (a conservative estimate for order n). The same
boundary form gives the exact analytic case, a point source at the centre of a sphere,
3Φ/(4πR²) (NOTES.md §7, C15).

Reflections. Walls reflect diffusely with one reflectance ρ (default 0.05; ordinary paints
reflect about 5 % at 254 nm, from memory). The interreflected part is taken as uniform (the
integrating-sphere approximation, exact for a sphere): incident irradiance
E_r = ρΦ/(A(1 − ρ)) on every surface [derived: integrating-sphere theory], fluence rate
4E_r (isotropic radiance L = E_r/π, 4πL).

Honest results. The figures rest on the lamp's UV-C reading (:mod:`uvcheck.germicidal`). When
that reading is likely stray light or noise, or below the detection limit, the lamp delivers no
germicidal UV-C: the result's ``status`` says so first, every delivered figure (flux, plane,
fluence rate, eACH, times, UV-C at the eye) is None, and upper bounds appear only under their
own names (``…_upper_bound…``; times ``…_lower_bound``), as if the whole apparent signal were
real UV-C.

Outputs. The work-plane irradiance (upward-facing, on a grid: min, mean, percentiles), the
volume-average fluence rate (for airborne organisms the relevant quantity, NOTES.md §5),
equivalent air changes per hour eACH = 3600·k·E_avg, times to 90 / 99 / 99.9 % in well-mixed
air, and the occupant's exposure at eye height (worst case: eyes facing the lamp) against
the 8-h actinic limit E_S·t ≤ 30 J m⁻² (IEC 62471:2006 clause 4.3.1). A screening assessment,
not a certification: it defers to local codes and licensed practice.

Numpy only (vectorised); nothing here needs scipy.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, Iterable, Sequence

import numpy as np

from uvcheck.conditions import WORKDAY_S
from uvcheck.errors import ConfigurationError
from uvcheck.geometry import irradiance_per_watt
from uvcheck.germicidal import (SCREENING_NOTE, UVC_EMITTING, GermicidalResult,
                                evaluate_germicidal)
from uvcheck.inactivation import (GENERIC_NOTE, STANDARD_PERCENTS, Organism, each_per_h,
                                  get_organism, log_for_percent, mixed_air_time,
                                  most_susceptible, select)
from uvcheck.spectrum import Spectrum, integrate, scaled

PATTERNS = ("isotropic", "lambertian_down", "cylinder")
#: The patterns in words, for reports.
PATTERN_WORDS = {"isotropic": "isotropic (all directions alike)",
                 "lambertian_down": "downward Lambertian (a ceiling fitting)",
                 "cylinder": "cylinder (a bare tube)"}
AXES = {"x": np.array([1.0, 0.0, 0.0]), "y": np.array([0.0, 1.0, 0.0])}
DEFAULT_REFLECTANCE = 0.05          # ordinary paint at 254 nm, about 5 % (from memory)
DEFAULT_WORK_PLANE_M = 0.75         # desk height (common practice)
DEFAULT_EYE_HEIGHT_M = 1.7          # standing eye height (common practice; seated about 1.2 m)
DEFAULT_GRID_STEP_M = 0.05
MAX_GRID_NODES = 201                # per side
DEFAULT_ORDER = 24                  # Gauss-Legendre points per mapped quadrant side
DEFAULT_SEGMENTS = 16               # Gauss-Legendre points along a tube
#: A lamp closer than this to eye height is within reach of the eyes: no occupant exposure
#: figure bounds it (our own rule). [m]
EYE_CLEARANCE_M = 0.3
#: A lamp closer than this to a wall, the floor or the ceiling is taken as mounted on it (our
#: own rule): the part of its pattern that heads into that surface is reported. [m]
SURFACE_CLEARANCE_M = 0.1
#: Share of the output heading into a surface above which that is said (our own rule). [-]
SURFACE_SHARE_WARN = 0.05


# ---------------------------------------------------------------------------------------------
# Shapes and the lamp's geometry
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Box:
    """A box room, floor at z = 0. width_m (x), length_m (y), height_m (z). [m]"""

    width_m: float
    length_m: float
    height_m: float

    def __post_init__(self) -> None:
        for n in ("width_m", "length_m", "height_m"):
            v = getattr(self, n)
            if not (math.isfinite(v) and v > 0):
                raise ConfigurationError(f"the room {n[:-2]} must be positive, got {v:g} m",
                                         todo="give width x length x height, e.g. '4 x 5 x 2.7 m'")

    @property
    def extent(self) -> np.ndarray:
        return np.array([self.width_m, self.length_m, self.height_m])

    @property
    def volume_m3(self) -> float:
        return self.width_m * self.length_m * self.height_m

    @property
    def area_m2(self) -> float:
        w, l, h = self.width_m, self.length_m, self.height_m
        return 2 * (w * l + w * h + l * h)

    def contains(self, p: Sequence[float], tol: float = 1e-9) -> bool:
        return bool(np.all(np.asarray(p) >= -tol) and np.all(np.asarray(p) <= self.extent + tol))


@dataclass(frozen=True)
class Sphere:
    """A spherical volume of radius ``radius_m`` centred at the origin (for validation). [m]"""

    radius_m: float

    def __post_init__(self) -> None:
        if not (math.isfinite(self.radius_m) and self.radius_m > 0):
            raise ConfigurationError(f"sphere radius must be positive, got {self.radius_m}")

    @property
    def volume_m3(self) -> float:
        return 4.0 / 3.0 * math.pi * self.radius_m ** 3

    @property
    def area_m2(self) -> float:
        return 4.0 * math.pi * self.radius_m ** 2

    def contains(self, p: Sequence[float], tol: float = 1e-9) -> bool:
        return float(np.linalg.norm(p)) <= self.radius_m + tol


@dataclass(frozen=True)
class LampGeometry:
    """Where the lamp is and how it radiates.

    position_m : lamp centre (x, y, z). [m]
    pattern : ``isotropic`` | ``lambertian_down`` | ``cylinder``.
    tube_length_m : arc length of a ``cylinder`` lamp (0: a point with the cylinder pattern). [m]
    axis : ``x`` or ``y``, the tube axis.
    segments : Gauss–Legendre points along the tube.
    """

    position_m: tuple[float, float, float]
    pattern: str = "isotropic"
    tube_length_m: float = 0.0
    axis: str = "x"
    segments: int = DEFAULT_SEGMENTS

    def __post_init__(self) -> None:
        if self.pattern not in PATTERNS:
            raise ConfigurationError(f"unknown emission pattern {self.pattern!r}; "
                                     f"available: {', '.join(PATTERNS)}")
        if self.axis not in AXES:
            raise ConfigurationError(f"unknown tube axis {self.axis!r}; available: x, y")
        if len(self.position_m) != 3 or not all(math.isfinite(v) for v in self.position_m):
            raise ConfigurationError(f"lamp position must be three finite numbers, got {self.position_m}")
        if not (math.isfinite(self.tube_length_m) and self.tube_length_m >= 0):
            raise ConfigurationError(f"tube length must be >= 0, got {self.tube_length_m}")
        if self.tube_length_m > 0 and self.pattern != "cylinder":
            raise ConfigurationError("a tube length needs the cylinder pattern",
                                     todo="use --pattern cylinder for a bare tube")
        object.__setattr__(self, "position_m", tuple(float(v) for v in self.position_m))

    def sources(self) -> tuple[np.ndarray, np.ndarray]:
        """Point sources (S, 3) and their flux weights (S,), summing to 1. [m], [-]"""
        p = np.array(self.position_m)
        if self.tube_length_m <= 0:
            return p[None, :], np.ones(1)
        t, w = np.polynomial.legendre.leggauss(max(2, int(self.segments)))
        pts = p[None, :] + (t * self.tube_length_m / 2)[:, None] * AXES[self.axis][None, :]
        return pts, w / 2.0

    def intensity_per_W(self, dirs: np.ndarray) -> np.ndarray:
        """Radiant intensity per watt of flux in unit directions ``dirs`` (…, 3). [sr⁻¹]

        Normalised so that ∫ I dΩ = 1 over the sphere [derived]: 1/(4π); cos θ/π on the lower
        half-space (∫cos θ dΩ = π); sin ψ/π² (∫ sin ψ dΩ = π²).
        """
        if self.pattern == "isotropic":
            return np.full(dirs.shape[:-1], 1.0 / (4.0 * math.pi))
        if self.pattern == "lambertian_down":
            return np.clip(-dirs[..., 2], 0.0, None) / math.pi
        c = dirs @ AXES[self.axis]
        return np.sqrt(np.clip(1.0 - c * c, 0.0, None)) / math.pi ** 2


_FACES = (("the wall at x = 0", 0, -1.0), ("the wall at x = W", 0, 1.0),
          ("the wall at y = 0", 1, -1.0), ("the wall at y = L", 1, 1.0),
          ("the floor", 2, -1.0), ("the ceiling", 2, 1.0))


def into_near_surfaces(room: Box, lamp: LampGeometry,
                       clearance_m: float = SURFACE_CLEARANCE_M,
                       n_dirs: int = 4000) -> tuple[float, tuple[str, ...]]:
    """(share of the lamp's flux heading into the room surfaces closer than ``clearance_m``
    to it, those surfaces). A lamp on a surface sends that share straight into it, which the
    model counts only as reflected light; a fitting mounted there emits into the room instead.
    The share is Σ I(Ω) dΩ over the directions with a positive component along a near face's
    outward normal (directions on a Fibonacci sphere, equal solid angles), averaged over the
    lamp's point sources. [-]

    Examples
    --------
    >>> share, faces = into_near_surfaces(Box(4.0, 5.0, 2.7), LampGeometry((0.0, 2.5, 1.5)))
    >>> round(share, 2), faces            # an isotropic lamp on a wall: half [derived]
    (0.5, ('the wall at x = 0',))
    """
    k = np.arange(n_dirs) + 0.5
    z = 1.0 - 2.0 * k / n_dirs
    phi = math.pi * (1.0 + math.sqrt(5.0)) * k
    r = np.sqrt(1.0 - z * z)
    dirs = np.column_stack([r * np.cos(phi), r * np.sin(phi), z])
    dw = 4.0 * math.pi / n_dirs
    ext = room.extent
    pts, wts = lamp.sources()
    share, named = 0.0, []
    for p, w in zip(pts, wts):
        into = np.zeros(n_dirs, dtype=bool)
        for name, axis, sign in _FACES:
            gap = p[axis] if sign < 0 else ext[axis] - p[axis]
            if gap < clearance_m:
                into |= sign * dirs[:, axis] > 0
                if name not in named:
                    named.append(name)
        share += w * float(np.sum(lamp.intensity_per_W(dirs[into])) * dw)
    return share, tuple(named)


# ---------------------------------------------------------------------------------------------
# Quadrature on the boundary
# ---------------------------------------------------------------------------------------------

@lru_cache(maxsize=64)
def _leggauss(n: int) -> tuple[np.ndarray, np.ndarray]:
    return np.polynomial.legendre.leggauss(n)


def _gauss(n: int, a: float, b: float) -> tuple[np.ndarray, np.ndarray]:
    x, w = _leggauss(n)
    return 0.5 * (b - a) * x + 0.5 * (b + a), 0.5 * (b - a) * w


def _mapped(A: float, h: float, order: int) -> tuple[np.ndarray, np.ndarray]:
    """Gauss nodes in s on [0, atan(A/h)], graded towards π/2 when A ≫ h.

    With u = π/2 − s, the integrands behave like 1/(u² + v²) near the far corner of a
    quadrant that is large compared with h; panels in u growing geometrically by 4 from
    atan(h/A) keep the convergence exponential there.
    """
    top = math.atan(A / h)
    u_min = math.pi / 2 - top
    if u_min >= 0.25:
        return _gauss(order, 0.0, top)
    edges = [u_min]
    while edges[-1] * 4 < 0.25:
        edges.append(edges[-1] * 4)
    edges.append(0.25)
    parts = [_gauss(order, 0.0, math.pi / 2 - 0.25)]
    for a, b in zip(edges[:-1], edges[1:]):
        parts.append(_gauss(max(4, order // 2), math.pi / 2 - b, math.pi / 2 - a))
    return np.concatenate([x for x, _ in parts]), np.concatenate([w for _, w in parts])


def _rectangle_nodes(p: np.ndarray, k: int, c: float, e_i: float, e_j: float, i: int, j: int,
                     order: int) -> tuple[np.ndarray, np.ndarray, float] | None:
    """Nodes and area weights on the rectangle {x_k = c, 0 ≤ x_i ≤ e_i, 0 ≤ x_j ≤ e_j},
    split at the foot of the perpendicular from p and mapped with u = h·tan s."""
    h = abs(p[k] - c)
    if h < 1e-12:
        return None
    pts, wts = [], []
    axes_i, axes_j = [], []
    for lo_i, hi_i in ((0.0, p[i]), (p[i], e_i)):
        A = hi_i - lo_i
        if A > 0:
            s, ws = _mapped(A, h, order)
            sign = -1.0 if hi_i == p[i] else 1.0
            axes_i.append((p[i] + sign * h * np.tan(s), ws * h / np.cos(s) ** 2))
    for lo_j, hi_j in ((0.0, p[j]), (p[j], e_j)):
        B = hi_j - lo_j
        if B > 0:
            t, wt = _mapped(B, h, order)
            sign = -1.0 if hi_j == p[j] else 1.0
            axes_j.append((p[j] + sign * h * np.tan(t), wt * h / np.cos(t) ** 2))
    for xi, wi in axes_i:
        for xj, wj in axes_j:
            X = np.empty((xi.size, xj.size, 3))
            X[..., k] = c
            X[..., i] = xi[:, None]
            X[..., j] = xj[None, :]
            pts.append(X.reshape(-1, 3))
            wts.append(np.outer(wi, wj).ravel())
    if not pts:
        return None
    return np.concatenate(pts), np.concatenate(wts), h


def _boundary_nodes(shape: Box | Sphere, p: np.ndarray, order: int
                    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Boundary nodes x (M, 3), weights (M,) and n_out·(x − p) (M,) for a source at p."""
    if isinstance(shape, Sphere):
        R = shape.radius_m
        mu, wmu = _gauss(2 * order, -1.0, 1.0)
        nphi = 4 * order
        phi = (np.arange(nphi) + 0.5) * 2 * math.pi / nphi
        M, P = np.meshgrid(mu, phi, indexing="ij")
        st = np.sqrt(1 - M * M)
        n = np.stack([st * np.cos(P), st * np.sin(P), M], axis=-1).reshape(-1, 3)
        x = R * n
        w = (np.outer(wmu, np.full(nphi, 2 * math.pi / nphi)) * R * R).ravel()
        return x, w, np.einsum("ij,ij->i", n, x - p[None, :])
    ext = shape.extent
    xs, ws, hs = [], [], []
    for k in range(3):
        i, j = [a for a in range(3) if a != k]
        for c in (0.0, float(ext[k])):
            r = _rectangle_nodes(p, k, c, float(ext[i]), float(ext[j]), i, j, order)
            if r is None:
                continue
            X, W, h = r
            xs.append(X)
            ws.append(W)
            hs.append(np.full(W.shape, h))
    return np.concatenate(xs), np.concatenate(ws), np.concatenate(hs)


def _direct_volume_integral(shape: Box | Sphere, lamp: LampGeometry, order: int) -> float:
    """∫_V ψ_direct dV per watt. [W m⁻² · m³ per W] = [m]"""
    pts, wts = lamp.sources()
    total = 0.0
    for p, w in zip(pts, wts):
        x, wq, nd = _boundary_nodes(shape, p, order)
        r = x - p[None, :]
        R2 = np.einsum("ij,ij->i", r, r)
        I = lamp.intensity_per_W(r / np.sqrt(R2)[:, None])
        total += w * float(np.dot(wq, I * nd / R2))
    return total


def boundary_flux_per_W(shape: Box | Sphere, lamp: LampGeometry, order: int = DEFAULT_ORDER) -> float:
    """Direct flux reaching the whole boundary per watt emitted: 1 by energy conservation
    [derived]; the quadrature's own check. [-]"""
    pts, wts = lamp.sources()
    total = 0.0
    for p, w in zip(pts, wts):
        x, wq, nd = _boundary_nodes(shape, p, order)
        r = x - p[None, :]
        R = np.sqrt(np.einsum("ij,ij->i", r, r))
        total += w * float(np.dot(wq, lamp.intensity_per_W(r / R[:, None]) * nd / R ** 3))
    return total


@dataclass(frozen=True)
class FluenceAverage:
    """Volume-average fluence rate per watt of flux, split, with its quadrature error.

    direct_per_W, reflected_per_W, total_per_W : [W m⁻² per W] = [m⁻²]
    error_rel : |order n − order n/2| / order n, a conservative estimate. [-]
    """

    direct_per_W: float
    reflected_per_W: float
    total_per_W: float
    error_rel: float
    order: int


def _check_inside(shape: Box | Sphere, lamp: LampGeometry) -> None:
    pts, _ = lamp.sources()
    for p in pts:
        if not shape.contains(p):
            at = ", ".join(f"{float(v):.3g}" for v in p)
            raise ConfigurationError(f"the lamp (or part of the tube) at ({at}) m "
                                     "lies outside the room",
                                     todo="give a lamp position inside the room")


def volume_average_fluence_rate(shape: Box | Sphere, lamp: LampGeometry,
                                reflectance: float = 0.0,
                                order: int = DEFAULT_ORDER) -> FluenceAverage:
    """Volume-average fluence rate per watt, direct (boundary quadrature) + reflected. [m⁻²]

    shape : :class:`Box` or :class:`Sphere`.
    reflectance : diffuse reflectance of all surfaces, 0 ≤ ρ < 1. [-]

    Examples
    --------
    >>> fa = volume_average_fluence_rate(Sphere(2.0), LampGeometry((0.0, 0.0, 0.0)))
    >>> round(fa.total_per_W / (3 / (4 * math.pi * 2.0 ** 2)), 6)     # C15: 3Φ/(4πR²)
    1.0
    """
    if not 0.0 <= reflectance < 1.0:
        raise ConfigurationError(f"reflectance must be in [0, 1), got {reflectance}")
    _check_inside(shape, lamp)
    fine = _direct_volume_integral(shape, lamp, order) / shape.volume_m3
    coarse = _direct_volume_integral(shape, lamp, max(2, order // 2)) / shape.volume_m3
    refl = 4.0 * reflectance / (shape.area_m2 * (1.0 - reflectance))
    err = abs(fine - coarse) / fine if fine > 0 else 0.0
    return FluenceAverage(fine, refl, fine + refl, err, order)


def direct_fluence_rate_per_W(points: np.ndarray, lamp: LampGeometry) -> np.ndarray:
    """Direct fluence rate per watt at points (N, 3): Σ w·I(Ω)/r². [m⁻²]"""
    pts, wts = lamp.sources()
    out = np.zeros(points.shape[0])
    for p, w in zip(pts, wts):
        r = points - p[None, :]
        R2 = np.maximum(np.einsum("ij,ij->i", r, r), 1e-12)
        out += w * lamp.intensity_per_W(r / np.sqrt(R2)[:, None]) / R2
    return out


#: Full field of view of the eye-level convention for occupied rooms: a detector at eye height,
#: facing horizontally, that sees only what lies within 40° of its axis (common practice for
#: upper-room UV, from memory). [degrees]
FOV_CONVENTION_DEG = 80.0


def fov_irradiance_per_W(points: np.ndarray, lamp: LampGeometry,
                         fov_deg: float = FOV_CONVENTION_DEG) -> np.ndarray:
    """Direct irradiance per watt at points (N, 3) on a detector facing horizontally toward the
    lamp's centre and seeing only directions within fov/2 of its axis: Σ w·I·cos θ/r² over the
    point sources with θ ≤ fov/2, θ the angle between the ray and the detector's axis. A point
    straight below or above the lamp (no horizontal direction) sees it at 90°, outside any
    field narrower than 180°. [m⁻²]

    Examples
    --------
    >>> lamp = LampGeometry((0.0, 0.0, 2.0))
    >>> eye = np.array([[1.0, 0.0, 1.0], [0.2, 0.0, 1.0]])   # 45° and 79° below the lamp
    >>> [round(float(v), 5) for v in fov_irradiance_per_W(eye, lamp, 100.0)]   # 50° half-field
    [0.02813, 0.0]
    """
    half = math.radians(fov_deg) / 2.0
    pts, wts = lamp.sources()
    centre = np.array(lamp.position_m)
    h = centre[None, :2] - points[:, :2]                     # toward the lamp, horizontally
    hn = np.sqrt(np.einsum("ij,ij->i", h, h))
    axis = np.zeros_like(points)
    ok = hn > 1e-12
    axis[ok, :2] = h[ok] / hn[ok, None]
    out = np.zeros(points.shape[0])
    for p, w in zip(pts, wts):
        r = p[None, :] - points                               # eye -> source
        R2 = np.maximum(np.einsum("ij,ij->i", r, r), 1e-12)
        R = np.sqrt(R2)
        cos = np.einsum("ij,ij->i", r, axis) / R
        seen = ok & (cos >= math.cos(half))
        out += np.where(seen, w * lamp.intensity_per_W(-r / R[:, None]) * cos / R2, 0.0)
    return out


def direct_irradiance_per_W(points: np.ndarray, normal: Sequence[float],
                            lamp: LampGeometry) -> np.ndarray:
    """Direct irradiance per watt on surfaces with unit normal ``normal`` at points (N, 3). [m⁻²]"""
    n = np.asarray(normal, dtype=float)
    pts, wts = lamp.sources()
    out = np.zeros(points.shape[0])
    for p, w in zip(pts, wts):
        r = points - p[None, :]
        R2 = np.maximum(np.einsum("ij,ij->i", r, r), 1e-12)
        R = np.sqrt(R2)
        d = r / R[:, None]
        cos = np.clip(-(d @ n), 0.0, None)
        out += w * lamp.intensity_per_W(d) * cos / R2
    return out


def _plane_mean_direct_per_W(room: Box, lamp: LampGeometry, z: float, order: int) -> float:
    """Mean direct irradiance per watt on the upward-facing plane at height z (quadrature). [m⁻²]"""
    pts, wts = lamp.sources()
    total = 0.0
    for p, w in zip(pts, wts):
        if p[2] <= z:
            continue
        r = _rectangle_nodes(p, 2, z, room.width_m, room.length_m, 0, 1, order)
        if r is None:
            continue
        X, W, h = r
        d = X - p[None, :]
        R = np.sqrt(np.einsum("ij,ij->i", d, d))
        total += w * float(np.dot(W, lamp.intensity_per_W(d / R[:, None]) * h / R ** 3))
    return total / (room.width_m * room.length_m)


def _grid(room: Box, z: float, step: float) -> tuple[np.ndarray, np.ndarray, int, int]:
    def n_for(extent: float) -> int:
        n = int(math.ceil(extent / step)) + 1
        n = min(max(n, 5), MAX_GRID_NODES)
        return n if n % 2 == 1 else n + 1
    nx, ny = n_for(room.width_m), n_for(room.length_m)
    xs, ys = np.linspace(0, room.width_m, nx), np.linspace(0, room.length_m, ny)
    X, Y = np.meshgrid(xs, ys, indexing="ij")
    pts = np.stack([X.ravel(), Y.ravel(), np.full(X.size, z)], axis=-1)
    wx = np.full(nx, xs[1] - xs[0]); wx[[0, -1]] *= 0.5
    wy = np.full(ny, ys[1] - ys[0]); wy[[0, -1]] *= 0.5
    return pts, np.outer(wx, wy).ravel(), nx, ny


def weighted_percentile(values: np.ndarray, weights: np.ndarray, q: float) -> float:
    """Percentile q (0–100) of values with area weights (midpoint convention). [unit of values]

    Examples
    --------
    >>> weighted_percentile(np.array([1.0, 2.0, 3.0, 4.0]), np.ones(4), 50)
    2.5
    """
    o = np.argsort(values)
    v, w = values[o], weights[o]
    c = (np.cumsum(w) - 0.5 * w) / w.sum()
    return float(np.interp(q / 100.0, c, v))


# ---------------------------------------------------------------------------------------------
# The lamp as a source of flux
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class RoomLamp:
    """A lamp for the room model: geometry plus its spectral radiant flux.

    geometry : :class:`LampGeometry`.
    flux_spectrum : spectral flux [W nm⁻¹] (or lines in W).
    basis : how the flux was obtained, in words.
    """

    geometry: LampGeometry
    flux_spectrum: Spectrum
    basis: str

    def __post_init__(self) -> None:
        if self.flux_spectrum.quantity != "flux":
            raise ConfigurationError("the room model needs a spectral flux",
                                     todo="build the lamp with lamp_from_spectrum or lamp_from_uvc_flux")


def _peak_irradiance_per_W(geom: LampGeometry, distance_m: float) -> float:
    """On-axis irradiance per watt at the direction of maximum intensity. [m⁻²]"""
    if geom.pattern == "isotropic":
        return float(irradiance_per_watt(distance_m, "point"))
    if geom.pattern == "lambertian_down":
        return float(irradiance_per_watt(distance_m, "lambertian"))
    if geom.tube_length_m > 0:
        return float(irradiance_per_watt(distance_m, "tube", tube_length_m=geom.tube_length_m))
    return 1.0 / (math.pi ** 2 * distance_m ** 2)


def lamp_from_spectrum(spectrum: Spectrum, geometry: LampGeometry,
                       measured_at_m: float | None = None) -> RoomLamp:
    """A room lamp from a flux spectrum, or from an irradiance spectrum measured at d₀.

    The irradiance is taken as measured on the axis of maximum intensity (below a downward
    lamp, broadside to a tube), and converted with the pattern's own normalisation:
    Φ = E·4πd² (isotropic), E·πd² (Lambertian), E·2π²Ld/(2α + sin 2α) (tube, Keitz) or E·π²d²
    (short cylinder) [NOTES.md §5].

    measured_at_m : measurement distance d₀ (irradiance spectra). [m]
    """
    if spectrum.quantity == "flux":
        return RoomLamp(geometry, spectrum, "measured radiant flux")
    if spectrum.quantity != "irradiance":
        raise ConfigurationError(f"a {spectrum.quantity} spectrum cannot drive the room model",
                                 todo="scale it to absolute irradiance, or give --uvc-flux")
    if measured_at_m is None:
        raise ConfigurationError("the room model needs the distance the spectrum was measured at",
                                 todo="give --distance, e.g. '1 m'")
    g = _peak_irradiance_per_W(geometry, measured_at_m)
    flux = scaled(spectrum, 1.0 / g, quantity="flux",
                  note={"method": "irradiance to flux", "from_m": measured_at_m,
                        "pattern": geometry.pattern})
    return RoomLamp(geometry, flux, f"flux estimated from the irradiance at {measured_at_m:g} m "
                                    f"on the lamp's axis ({PATTERN_WORDS[geometry.pattern]} pattern)")


def lamp_from_uvc_flux(flux_W: float, geometry: LampGeometry,
                       wavelength_nm: float = 253.7) -> RoomLamp:
    """A room lamp from a stated UV-C flux at one wavelength (default the mercury line). [W]

    The flux spectrum covers only 200–280 nm: nothing is known of UV-B/UV-A output, so the
    occupant's actinic exposure comes out as a lower bound.

    Examples
    --------
    >>> lamp = lamp_from_uvc_flux(2.0, LampGeometry((2.0, 2.5, 2.5)))
    >>> lamp.flux_spectrum.lines[0].value
    2.0
    """
    if not (math.isfinite(flux_W) and flux_W > 0):
        raise ConfigurationError(f"the UV-C flux must be positive, got {flux_W}")
    if not 200.0 <= wavelength_nm < 280.0:
        raise ConfigurationError(f"{wavelength_nm:g} nm is not UV-C (200–280 nm)")
    s = Spectrum(np.array([200.0, 280.0]), np.zeros(2), "flux", lines=((wavelength_nm, flux_W),),
                 covered_nm=(200.0, 280.0),
                 meta={"origin": "stated UV-C flux", "wavelength_nm": wavelength_nm})
    return RoomLamp(geometry, s, f"stated UV-C flux {flux_W:g} W at {wavelength_nm:g} nm")


# ---------------------------------------------------------------------------------------------
# Result and entry point
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class RoomResult:
    """What one lamp does in one room (see :func:`evaluate_room`); ``to_dict`` is the JSON block."""

    room: Box
    reflectance: float
    lamp: dict
    plane: dict
    fluence: FluenceAverage
    fluence_rate_avg_W_m2: float | None
    fluence_rate_avg_uvc_W_m2: float | None
    air: tuple[dict, ...]
    air_most_susceptible: dict | None
    occupant: dict
    method: dict
    germicidal: GermicidalResult
    flux_eq: Any = field(repr=False, default=None)
    notes: tuple[str, ...] = ()
    figures_are: str = "estimate"
    warnings: tuple[str, ...] = ()

    def flux_eq_bound(self, per_W: float) -> float | None:
        """``per_W`` times the 254-nm-equivalent flux when that flux is only an upper bound. [W m⁻²]"""
        if self.figures_are != "upper_bound" or self.flux_eq is None:
            return None
        return self.flux_eq * per_W

    def equivalent_fluence_rate(self, wavelength_nm: float = 253.7, pathway: str = "uvc") -> float | None:
        """Volume-average fluence rate equivalent at λ (favourable reading). [W m⁻²]

        An upper bound when ``figures_are`` is ``upper_bound`` (UV-C likely stray light or
        below detection): claims use it to give the lamp the benefit of the doubt; the JSON
        never presents it as delivered."""
        phi = self.germicidal.equivalent_irradiance(wavelength_nm, pathway)
        return None if phi is None else phi * self.fluence.total_per_W

    def each_for(self, organism: Organism) -> float | None:
        """eACH for an organism row in this room. [h⁻¹]"""
        e = self.equivalent_fluence_rate(organism.wavelength_nm, organism.pathway)
        k = organism.k_e_m2_per_J
        return None if e is None or k is None else each_per_h(k, e)

    def air_time_s(self, organism: Organism | str, percent: float = 99.9) -> float | None:
        """Time to a percent reduction in well-mixed air for an organism row or id. [s]"""
        from uvcheck.inactivation import log_for_percent

        o = organism if isinstance(organism, Organism) else get_organism(organism)
        e = self.equivalent_fluence_rate(o.wavelength_nm, o.pathway)
        k = o.k_e_m2_per_J
        return None if e is None or not k else mixed_air_time(log_for_percent(percent), k, e)

    def status_dict(self) -> dict:
        """The lamp's germicidal status as the room figures rest on it (JSON ``status``)."""
        g = self.germicidal
        return {"germicidal_status": g.status, "uvc_status": g.uvc.status,
                "statement": g.statement, "figures_are": self.figures_are,
                "figures_meaning": FIGURES_ARE[self.figures_are],
                "artefacts": [a.to_dict() for a in g.artefacts]}

    def to_dict(self) -> dict:
        return {
            "status": self.status_dict(),
            "warnings": list(self.warnings),
            "dimensions_m": {"width": self.room.width_m, "length": self.room.length_m,
                             "height": self.room.height_m},
            "volume_m3": self.room.volume_m3, "surface_area_m2": self.room.area_m2,
            "reflectance": self.reflectance,
            "lamp": dict(self.lamp),
            "plane": dict(self.plane),
            "fluence_rate_avg_W_m2": self.fluence_rate_avg_W_m2,
            "fluence_rate_avg_uvc_W_m2": self.fluence_rate_avg_uvc_W_m2,
            "fluence_rate_per_W": {"direct": self.fluence.direct_per_W,
                                   "reflected": self.fluence.reflected_per_W,
                                   "total": self.fluence.total_per_W,
                                   "error_rel": self.fluence.error_rel},
            "fluence_rate_avg_upper_bound_W_m2": (self.flux_eq_bound(self.fluence.total_per_W)),
            "each_per_h": {a["organism_id"]: a["each_per_h"] for a in self.air},
            "air": [dict(a) for a in self.air],
            "air_most_susceptible": self.air_most_susceptible,
            "occupant": dict(self.occupant),
            "method": dict(self.method),
            "notes": list(self.notes),
        }


_TIME_KEYS = tuple((round(log_for_percent(p), 12), f"time_to_{p:g}_s".replace(".", "_"))
                   for p in STANDARD_PERCENTS)   # (n-log, key): 90 % -> 1 log, "time_to_90_s"


def _air_entry(o: Organism, e_eq: float | None, upper_bound: bool = False) -> dict:
    """One row of the air table. With ``upper_bound`` (the lamp's UV-C is likely stray light or
    below detection) the delivered figures are None and the bounds are given under their own
    names: eACH at most ``each_per_h_upper_bound``, times at least ``…_lower_bound``."""
    k = o.k_e_m2_per_J
    ach = each_per_h(k, e_eq) if (k and e_eq) else None
    d = {"organism_id": o.id, "organism": o.organism, "group": o.group, "medium": o.medium,
         "wavelength_nm": o.wavelength_nm, "model": o.model, "k_e_m2_per_J": k,
         "fluence_rate_W_m2": None if upper_bound else e_eq,
         "each_per_h": None if upper_bound else ach,
         "each_is_lower_bound": o.dose_bound == "at_most", "reliability": o.reliability,
         "source": o.citation, "from_memory": o.from_memory}
    for n, key in _TIME_KEYS:
        t = mixed_air_time(n, k, e_eq) if (k and e_eq) else None
        d[key] = None if upper_bound else t
        if upper_bound:
            d[key + "_lower_bound"] = t
    if upper_bound:
        d["fluence_rate_upper_bound_W_m2"] = e_eq
        d["each_per_h_upper_bound"] = ach
    return d


#: What the room figures are, from the lamp's UV-C reading (see :func:`evaluate_room`).
FIGURES_ARE = {"estimate": "what the lamp delivers (screening estimate)",
               "lower_bound": "lower bounds: part of UV-C was not measured",
               "upper_bound": "NOT delivered by the lamp: the apparent UV-C is likely stray light "
                              "or noise (or below the detection limit); only upper bounds are given",
               "none": "not available: UV-C was not measured"}


def _figures_are(g: GermicidalResult) -> str:
    if g.uvc.value is not None:
        return "lower_bound" if g.uvc.status == "partial" else "estimate"
    return "upper_bound" if g.uvc.upper_bound is not None else "none"


def evaluate_room(room: Box, lamp: RoomLamp, *, reflectance: float = DEFAULT_REFLECTANCE,
                  work_plane_m: float = DEFAULT_WORK_PLANE_M,
                  eye_height_m: float = DEFAULT_EYE_HEIGHT_M,
                  target_dose_J_m2: float | None = None,
                  organisms: Iterable[str] | None = None,
                  grid_step_m: float = DEFAULT_GRID_STEP_M,
                  order: int = DEFAULT_ORDER,
                  limit_set: str | None = None) -> RoomResult:
    """A lamp in a box room: work plane, air (fluence rate, eACH, times) and occupant exposure.

    room : :class:`Box`. lamp : :class:`RoomLamp` (see :func:`lamp_from_spectrum`,
        :func:`lamp_from_uvc_flux`).
    reflectance : diffuse reflectance of all surfaces. [-]
    work_plane_m, eye_height_m : heights of the work plane and of the occupant's eyes. [m]
    target_dose_J_m2 : a 254-nm-equivalent dose to reach on the work plane. [J m⁻²]
    organisms : organism ids for the air block; default every UV-C row relevant to air
        (phages excluded).
    grid_step_m : work-plane and eye-height grid spacing (at most 201 nodes a side). [m]
    order : Gauss–Legendre order per mapped quadrant. [-]
    limit_set : the exposure-limit set for the occupant's actinic UV (default IEC 62471:2006;
        ``acgih_2022_far_uvc`` for a far-UVC lamp): its E_S range, weighting and daily limit.

    All irradiances and fluence rates are 254-nm-equivalent (most favourable action
    spectrum) unless named ``uvc`` (unweighted UV-C 200–280 nm).

    Examples
    --------
    >>> r = evaluate_room(Box(4, 5, 2.7), lamp_from_uvc_flux(2.0, LampGeometry((2, 2.5, 2.6))))
    >>> r.fluence_rate_avg_W_m2 > 0 and r.occupant["exceeds_8h_limit"]
    True
    """
    if not 0.0 <= reflectance < 1.0:
        raise ConfigurationError(f"reflectance must be in [0, 1), got {reflectance}")
    for name, z in (("work plane", work_plane_m), ("eye height", eye_height_m)):
        if not 0.0 <= z <= room.height_m:
            raise ConfigurationError(f"the {name} ({z:g} m) must lie between the floor and the "
                                     f"ceiling ({room.height_m:g} m)")
    if not grid_step_m > 0:
        raise ConfigurationError(f"grid step must be positive, got {grid_step_m}")
    geom = lamp.geometry
    _check_inside(room, geom)
    g = evaluate_germicidal(lamp.flux_spectrum)
    phi_uvc = g.uvc.favourable()
    phi_254 = g.equivalent_irradiance(253.7)  # in W here: the spectrum is a flux
    # E_S over the range the limit set's actinic entry is stated for, as `uvcheck assess`
    # integrates it (IEC 62471:2006: 200-400 nm; ICNIRP's 180-400 nm is its own limit set)
    from uvcheck.limits import DEFAULT_LIMIT_SET, get_limit_set

    lset = get_limit_set(limit_set or DEFAULT_LIMIT_SET)
    actinic = lset.hazard("actinic_uv")
    s_act = integrate(lamp.flux_spectrum, *actinic.range_nm, actinic.weight())

    # the actinic limit is a daily dose (IEC 62471:2006 4.3.1: E_S·t ≤ 30 J m⁻²): the limit
    # for 8 h times 8 h, so that the time to it is that dose over E_S
    dose = actinic.limit_at(WORKDAY_S) * WORKDAY_S

    def to_limit(e: float) -> float | None:
        """The time an occupant reaches the set's daily actinic limit at E_S = e. [s]"""
        return dose / e if e > 0 else None
    notes: list[str] = []
    warnings: list[str] = []
    figures = _figures_are(g)
    bound = figures == "upper_bound"
    if g.status not in UVC_EMITTING:
        # said first and plainly (the same rule as ``assess``): no room figure below is
        # presented as what the lamp delivers
        notes.append(f"{g.statement} The room figures are {FIGURES_ARE[figures]}."
                     if figures != "estimate" else
                     f"{g.statement} The room figures below are what this weak UV-C gives.")
    share, faces = into_near_surfaces(room, geom)
    if share > SURFACE_SHARE_WARN:
        warnings.append(f"the lamp is within {SURFACE_CLEARANCE_M:g} m of "
                        f"{' and '.join(faces)}: {share:.0%} of its output ({PATTERN_WORDS[geom.pattern]} "
                        "pattern) heads straight into it and reaches the room only as "
                        "reflection. A fitting mounted there sends that output into the room, so "
                        f"the direct figures, the occupant's exposure among them, can be up to "
                        f"{1.0 / max(1.0 - share, 1e-9):.2g}× higher than shown; give the "
                        "fitting's own pattern (lambertian-down for a ceiling fitting) or its "
                        "real position.")
    if geom.pattern == "cylinder" and geom.tube_length_m <= 0:
        warnings.append("cylinder pattern without a tube length: the tube is modelled as one "
                        "point with the cylinder's sin ψ pattern (a short tube), and the flux "
                        "from a broadside irradiance as E·π²d²; a long tube near the lamp gives "
                        "a different flux and a different spread. Give its length "
                        "(--tube-length, e.g. '0.9 m').")
    # --- air ---------------------------------------------------------------------------------
    fa = volume_average_fluence_rate(room, geom, reflectance, order)
    e_avg = None if phi_254 is None or bound else phi_254 * fa.total_per_W
    e_avg_uvc = None if phi_uvc is None or bound else phi_uvc * fa.total_per_W
    rows = (list(select(ids=organisms)) if organisms is not None
            else list(select("air", "uvc", exclude_groups=("phage",))))
    air = tuple(_air_entry(o, None if g.equivalent_irradiance(o.wavelength_nm, o.pathway) is None
                           else g.equivalent_irradiance(o.wavelength_nm, o.pathway) * fa.total_per_W,
                           bound)
                for o in rows)
    ms = None
    best = most_susceptible(lambda o: (None if g.equivalent_irradiance(o.wavelength_nm, o.pathway) is None
                                       else g.equivalent_irradiance(o.wavelength_nm, o.pathway)
                                       * fa.total_per_W),
                            "air", "uvc")
    if best is not None:
        ms = _air_entry(best.organism, best.irradiance_W_m2, bound)
        ms["note"] = GENERIC_NOTE.format(name=best.organism.organism, medium=best.organism.medium)
        if bound:
            ms["note"] = ("an upper bound only, as if the whole apparent UV-C signal were "
                          "germicidal output; " + ms["note"])
    # --- work plane --------------------------------------------------------------------------
    e_r = reflectance / (room.area_m2 * (1.0 - reflectance))
    pts, w, nx, ny = _grid(room, work_plane_m, grid_step_m)
    plane_per_W = direct_irradiance_per_W(pts, (0.0, 0.0, 1.0), geom) + e_r
    coarse = plane_per_W.reshape(nx, ny)[::2, ::2].ravel()
    _, wc, _, _ = _grid_weights(room, nx, ny)
    p10 = weighted_percentile(plane_per_W, w, 10)
    p10_c = weighted_percentile(coarse, wc, 10)
    mean_fine = _plane_mean_direct_per_W(room, geom, work_plane_m, order) + e_r
    mean_coarse = _plane_mean_direct_per_W(room, geom, work_plane_m, max(2, order // 2)) + e_r
    f = phi_254 or 0.0

    def q(x: float) -> float | None:
        return None if phi_254 is None or bound else x * f
    plane = {
        "height_m": work_plane_m,
        "quantity": "254-nm-equivalent irradiance on an upward-facing plane (most favourable "
                    "action spectrum), direct + reflected",
        "min_W_m2": q(float(plane_per_W.min())), "mean_W_m2": q(mean_fine),
        "p10_W_m2": q(p10), "p50_W_m2": q(weighted_percentile(plane_per_W, w, 50)),
        "p90_W_m2": q(weighted_percentile(plane_per_W, w, 90)),
        "max_W_m2": q(float(plane_per_W.max())),
        "uniformity_min_mean": float(plane_per_W.min() / mean_fine) if mean_fine > 0 else None,
        "p10_per_W_m2": p10,  # geometry alone: irradiance at p10 per watt of flux [m⁻²]
        "grid": _coarse_grid(room, pts, plane_per_W, nx, ny, f if phi_254 and not bound else None),
        "max_upper_bound_W_m2": float(plane_per_W.max()) * f if bound and phi_254 else None,
        "grid_step_m": [room.width_m / (nx - 1), room.length_m / (ny - 1)],
        "percentile_error_rel": abs(p10 - p10_c) / p10 if p10 > 0 else None,
        "mean_error_rel": abs(mean_fine - mean_coarse) / mean_fine if mean_fine > 0 else None,
        "target_dose_J_m2": target_dose_J_m2,
        "time_to_target_at_p10_s": None, "time_to_target_everywhere_s": None,
        "most_susceptible": None,
    }
    if target_dose_J_m2 is not None and phi_254 and not bound:
        if not target_dose_J_m2 > 0:
            raise ConfigurationError(f"target dose must be positive, got {target_dose_J_m2}")
        plane["time_to_target_at_p10_s"] = target_dose_J_m2 / (p10 * f)
        plane["time_to_target_everywhere_s"] = target_dose_J_m2 / (float(plane_per_W.min()) * f)
    surf = most_susceptible(lambda o: (None if g.equivalent_irradiance(o.wavelength_nm, o.pathway) is None
                                       else g.equivalent_irradiance(o.wavelength_nm, o.pathway) * p10),
                            "surface", "uvc")
    if surf is not None and not bound:
        d = surf.to_dict()
        d["irradiance_basis"] = "at the worst 10 % of the work plane (p10)"
        plane["most_susceptible"] = d
    # --- occupant ----------------------------------------------------------------------------
    pts_e, _, _, _ = _grid(room, eye_height_m, grid_step_m)
    eye = direct_fluence_rate_per_W(pts_e, geom) + e_r
    i_max = int(np.argmax(eye))
    eye_max = float(eye[i_max])
    e_s = s_act.value * eye_max
    t_lim = to_limit(e_s)
    lower = s_act.coverage < 1.0 - 1e-9
    # the eye-level convention for occupied rooms: a horizontal detector with an 80° field;
    # the diffuse reflected field (fluence rate e_r, radiance e_r/4π) gives π·L·sin²(40°) on it
    fov = fov_irradiance_per_W(pts_e, geom) + e_r / 4.0 * math.sin(math.radians(FOV_CONVENTION_DEG / 2)) ** 2
    j_max = int(np.argmax(fov))
    fov_max = float(fov[j_max])
    e_s_fov = s_act.value * fov_max
    occupant = {
        "eye_height_m": eye_height_m,
        "position_m": [float(v) for v in pts_e[i_max]],
        "irradiance_W_m2": None if phi_uvc is None or bound else phi_uvc * eye_max,
        "irradiance_upper_bound_W_m2": phi_uvc * eye_max if bound and phi_uvc is not None else None,
        "irradiance_quantity": "UV-C 200–280 nm, eyes facing the lamp (worst case), direct + "
                               "reflected",
        "effective_S_W_m2": e_s,
        "effective_S_is_lower_bound": lower,
        "limit": ("IEC 62471:2006 clause 4.3.1, actinic UV: E_S·t ≤ 30 J/m² within 8 h"
                  if lset.id == DEFAULT_LIMIT_SET else
                  f"{lset.name}: {actinic.symbol}, the daily actinic UV limit"),
        "limit_set": lset.id,
        "symbol": actinic.symbol,
        "time_to_limit_s": t_lim,
        "exceeds_8h_limit": bool(t_lim is not None and t_lim < WORKDAY_S),
        "note": ("worst case with the eyes facing the lamp; the 80° field-of-view convention used "
                 "for occupied rooms gives less (shown beside it). " + SCREENING_NOTE),
        "fov_convention": {
            "fov_deg": FOV_CONVENTION_DEG,
            "position_m": [float(v) for v in pts_e[j_max]],
            "irradiance_W_m2": None if phi_uvc is None or bound else phi_uvc * fov_max,
            "effective_S_W_m2": e_s_fov,
            "time_to_limit_s": to_limit(e_s_fov),
            "exceeds_8h_limit": bool(to_limit(e_s_fov) is not None
                                     and to_limit(e_s_fov) < WORKDAY_S),  # type: ignore[operator]
            "basis": (f"a detector at eye height facing horizontally toward the lamp with an "
                      f"{FOV_CONVENTION_DEG:g}° field of view (common practice for occupied "
                      "rooms, from memory), direct + reflected; the worst case above is what "
                      "an eye looking at the lamp receives"),
        },
    }
    if lower:
        occupant["note"] += (" The actinic value is a lower bound: the lamp's output outside "
                             f"{lamp.flux_spectrum.range_nm[0]:g}–{lamp.flux_spectrum.range_nm[1]:g} nm "
                             "is not known.")
    peak = max(lamp.flux_spectrum.lines, key=lambda x: x.value).wavelength_nm \
        if lamp.flux_spectrum.lines else None
    if peak is None and lamp.flux_spectrum.wavelength_nm.size > 2:
        peak = float(lamp.flux_spectrum.wavelength_nm[int(np.argmax(lamp.flux_spectrum.values))])
    if peak is not None and peak < 235.0 and lset.id != "acgih_2022_far_uvc":
        occupant["note"] += (" For far-UVC the ACGIH 2022 threshold limit values (at 222 nm about "
                             "161 mJ/cm² for the eye and 479 mJ/cm² for the skin; from memory, via "
                             "a secondary source) are higher than this IEC/ICNIRP limit (see "
                             "--limits acgih_2022_far_uvc).")
    if lset.id != DEFAULT_LIMIT_SET:
        occupant["note"] += (f" Limit set: {lset.name} ("
                             + "; ".join(n.rstrip(".") for n in lset.notes) + ").")
    if bound and any(a.is_stray for a in g.artefacts):
        occupant["note"] += (" E_S counts the apparent UV-C signal, which is likely stray light: "
                             "that can only overstate the actinic exposure, never understate it.")
    if abs(geom.position_m[2] - eye_height_m) < EYE_CLEARANCE_M:
        notes.append(f"the lamp is within {EYE_CLEARANCE_M:g} m of eye height: next to it the exposure has no "
                     "useful bound; shield it or mount it higher")
        # the eye can come as close as it likes: the grid's nearest point (which can sit on
        # the lamp) gives a number, not a bound, so none is given (our own rule)
        occupant.update({"irradiance_W_m2": None, "irradiance_upper_bound_W_m2": None,
                         "effective_S_W_m2": None, "time_to_limit_s": None,
                         "exceeds_8h_limit": True, "unbounded": True, "fov_convention": None})
        occupant["note"] = (f"unbounded: the lamp is within {EYE_CLEARANCE_M:g} m of eye height, so an eye can "
                            "come as close to it as it likes and no exposure figure holds; the "
                            "8-h limit can be exceeded in moments. " + occupant["note"])
    lamp_d = {
        "position_m": list(geom.position_m), "pattern": geom.pattern,
        "tube_length_m": geom.tube_length_m or None, "axis": geom.axis if geom.tube_length_m else None,
        "uvc_flux_W": None if bound else phi_uvc,
        "equivalent_254_flux_W": None if bound else phi_254,
        "uvc_flux_upper_bound_W": phi_uvc if bound else None,
        "equivalent_254_flux_upper_bound_W": phi_254 if bound else None,
        "actinic_flux_W": s_act.value, "actinic_flux_is_lower_bound": lower,
        "flux_basis": lamp.basis, "germicidal_status": g.status, "uvc_status": g.uvc.status,
    }
    notes.append("reflections by the integrating-sphere approximation (uniform diffuse field); "
                 "obstacles, people and furniture are not modelled")
    notes.append("well-mixed air assumed; real rooms mix incompletely, which lowers the benefit")
    method = {"quadrature_order": order, "tube_segments": len(geom.sources()[1]),
              "volume_average": "boundary quadrature (Gauss–Legendre, tan-mapped quadrants)",
              "reflection_model": "integrating sphere (uniform diffuse interreflection)",
              "fluence_error_rel": fa.error_rel}
    return RoomResult(room=room, reflectance=reflectance, lamp=lamp_d, plane=plane, fluence=fa,
                      fluence_rate_avg_W_m2=e_avg, fluence_rate_avg_uvc_W_m2=e_avg_uvc,
                      air=air, air_most_susceptible=ms, occupant=occupant, method=method,
                      germicidal=g, flux_eq=phi_254, notes=tuple(notes), figures_are=figures,
                      warnings=tuple(warnings))


def _coarse_grid(room: Box, pts: np.ndarray, per_W: np.ndarray, nx: int, ny: int,
                 flux: float | None, max_nodes: int = 41) -> dict | None:
    """The work-plane map thinned to at most ``max_nodes`` a side, for figures. [m], [W m⁻²]"""
    if flux is None:
        return None
    grid = per_W.reshape(nx, ny) * flux
    sx = max(1, int(math.ceil(nx / max_nodes)))
    sy = max(1, int(math.ceil(ny / max_nodes)))
    xs = pts[:, 0].reshape(nx, ny)[::sx, 0]
    ys = pts[:, 1].reshape(nx, ny)[0, ::sy]
    return {"x_m": [float(v) for v in xs], "y_m": [float(v) for v in ys],
            "values_W_m2": [[float(v) for v in row] for row in grid[::sx, ::sy]]}


def _grid_weights(room: Box, nx: int, ny: int) -> tuple[None, np.ndarray, int, int]:
    """Trapezoid weights of the coarse (every second node) grid."""
    cx, cy = (nx + 1) // 2, (ny + 1) // 2
    dx, dy = room.width_m / (cx - 1), room.length_m / (cy - 1)
    wx = np.full(cx, dx); wx[[0, -1]] *= 0.5
    wy = np.full(cy, dy); wy[[0, -1]] *= 0.5
    return None, np.outer(wx, wy).ravel(), cx, cy
