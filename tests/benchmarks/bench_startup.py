"""Benchmark: `uvcheck --help` wall time against `python -c "import typer"`.

Goal (issue 2 / issue 8): ratio ≤ 1.5, medians of at least 5 runs measured in the same run.
Usage: python tests/benchmarks/bench_startup.py [RUNS]
"""

from __future__ import annotations

import sys

from _timing import median_wall, uvcheck_cmd

runs = int(sys.argv[1]) if len(sys.argv) > 1 else 7
base = median_wall([sys.executable, "-c", "import typer"], runs)
help_t = median_wall(uvcheck_cmd() + ["--help"], runs)
print(f"python -c 'import typer' : {base * 1000:7.1f} ms (median of {runs})")
print(f"uvcheck --help           : {help_t * 1000:7.1f} ms (median of {runs})")
print(f"ratio                    : {help_t / base:.2f}  (goal <= 1.5)")
