"""Timing of the room model (a script, not a test): ``python tests/benchmarks/bench_room.py``.

Issue 8 asks for the volume-average fluence rate within 0.5 % of the analytic sphere value
(point source at the centre: 3Φ/(4πR²), NOTES.md §7 C15) in at most 0.2 s. Prints the median of
several runs and the relative error, and the same for full room evaluations.
"""

from __future__ import annotations

import math
import statistics
import time

from uvcheck.room import (Box, LampGeometry, Sphere, evaluate_room, lamp_from_uvc_flux,
                          volume_average_fluence_rate)


def best_of(fn, n: int = 5) -> tuple[float, object]:
    """Median wall time [s] of n runs (the goal asks for medians of at least 5), and the result."""
    times, out = [], None
    for _ in range(n):
        t0 = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), out


def main() -> None:
    R = 2.0
    t, fa = best_of(lambda: volume_average_fluence_rate(Sphere(R), LampGeometry((0.0, 0.0, 0.0))))
    exact = 3 / (4 * math.pi * R * R)
    print(f"sphere R = {R} m, centred point source: {t * 1e3:.2f} ms, "
          f"error {abs(fa.total_per_W / exact - 1):.2e} (budget 0.2 s, 0.5 %)")
    box = Box(4.0, 5.0, 2.7)
    cases = {
        "box, isotropic point": LampGeometry((2.0, 2.5, 2.4)),
        "box, downward Lambertian on the ceiling": LampGeometry((2.0, 2.5, 2.7), "lambertian_down"),
        "box, 1.2 m tube (16 segments)": LampGeometry((2.0, 2.5, 2.4), "cylinder", 1.2),
    }
    for name, geom in cases.items():
        t, fa = best_of(lambda: volume_average_fluence_rate(box, geom))
        t2, _ = best_of(lambda: evaluate_room(box, lamp_from_uvc_flux(2.0, geom)), 3)
        print(f"{name}: fluence average {t * 1e3:.1f} ms (stated error {fa.error_rel:.1e}); "
              f"full evaluate_room {t2 * 1e3:.0f} ms")


if __name__ == "__main__":
    main()
