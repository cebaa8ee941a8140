"""Benchmark: `evaluate_uncertainty` (hazards + germicidal) on a 2 000-point spectrum.

Goal (issue 9): a few thousand draws in well under a second. Prints the median wall time of
the uncertainty step alone (the hazard and germicidal evaluations it reads are computed once
beforehand) for several numbers of draws, after one warm-up run that loads the tables.
Usage: python tests/benchmarks/bench_uncertainty.py [RUNS] [DRAWS ...]
"""

from __future__ import annotations

import statistics
import sys
import time

import numpy as np

from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.hazards import evaluate_hazards
from uvcheck.spectrum import Spectrum
from uvcheck.uncertainty import default_inputs, evaluate_uncertainty

runs = int(sys.argv[1]) if len(sys.argv) > 1 else 5
draw_counts = [int(x) for x in sys.argv[2:]] or [1000, 4000, 10000]

# an invented mercury-tube-like spectrum with a white phosphor and a noisy floor, 2000 points
wl = np.linspace(200.0, 1100.0, 2000)
rng = np.random.default_rng(0)
v = sum(h * np.exp(-0.5 * ((wl - c) / 0.7) ** 2)
        for c, h in ((253.7, 0.3), (313.0, 0.01), (365.0, 0.01), (435.8, 0.02), (546.1, 0.03)))
v = v + 0.004 * np.exp(-0.5 * ((wl - 580.0) / 60.0) ** 2) + rng.normal(0.0, 2e-6, wl.size)
spec = Spectrum(wl, v, "irradiance", noise_floor=2e-6)
cond = Conditions(measurement_distance_m=1.0, source_size_m=0.03)
hz = evaluate_hazards(spec, cond)
gr = evaluate_germicidal(spec, cond)
inputs = default_inputs()
evaluate_uncertainty(spec, cond, hz, gr, inputs, draws=1000)      # warm-up: tables, caches

print(f"spectrum: {wl.size} points, {wl[0]:g}-{wl[-1]:g} nm; all default inputs on")
for m in draw_counts:
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        evaluate_uncertainty(spec, cond, hz, gr, inputs, draws=m)
        times.append(time.perf_counter() - t0)
    print(f"evaluate_uncertainty, {m:6d} draws : {statistics.median(times) * 1000:7.1f} ms "
          f"(median of {runs})")
print("goal: a few thousand draws well under 1 s")
