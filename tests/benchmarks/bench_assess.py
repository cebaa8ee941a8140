"""Benchmark: `uvcheck assess FILE --json OUT` on a 2 000-point spectrum against a bare numpy
script that loads the same file and integrates it once.

Goal (issue 2, issue 8): ratio ≤ 3, medians of at least 5 runs measured in the same run (the
commands alternate, so a change in the machine's load affects each alike; bytecode cached as
for an installed tool, see _timing.py). ``assess`` runs its Monte Carlo uncertainty
evaluation by default; the same command with ``--no-uncertainty`` is timed beside it, to show
what the evaluation itself costs.
Usage: python tests/benchmarks/bench_assess.py [RUNS]
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

import numpy as np
from _timing import interleaved_medians, uvcheck_cmd

runs = int(sys.argv[1]) if len(sys.argv) > 1 else 7
with tempfile.TemporaryDirectory() as tmp:
    f = Path(tmp) / "lamp.csv"
    wl = np.linspace(200.0, 1100.0, 2000)
    rng = np.random.default_rng(0)
    # a white-LED-like spectrum with a noisy UV floor (invented test data)
    v = 0.01 * np.exp(-0.5 * ((wl - 450) / 10) ** 2) + 0.006 * np.exp(-0.5 * ((wl - 580) / 60) ** 2)
    v += rng.normal(0, 1e-6, wl.size)
    f.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:.3f},{b:.6e}" for a, b in zip(wl, v)) + "\n")
    out = Path(tmp) / "out.json"
    bare = ("import numpy as np, sys; d = np.loadtxt(sys.argv[1], delimiter=',', skiprows=1); "
            "print(np.trapezoid(d[:, 1], d[:, 0]))")
    assess = uvcheck_cmd() + ["assess", str(f), "--json", str(out), "--force", "--quiet"]
    t_bare, t_uv, t_nou = interleaved_medians(
        [[sys.executable, "-c", bare, str(f)], assess, assess + ["--no-uncertainty"]], runs)
print(f"bare numpy load + integrate          : {t_bare * 1000:7.1f} ms (median of {runs})")
print(f"uvcheck assess --json                : {t_uv * 1000:7.1f} ms (median of {runs})")
print(f"uvcheck assess --json --no-uncertainty: {t_nou * 1000:6.1f} ms (median of {runs})")
print(f"ratio                                : {t_uv / t_bare:.2f}  (goal <= 3)")
print(f"ratio without the uncertainty        : {t_nou / t_bare:.2f}")
