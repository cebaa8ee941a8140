"""Benchmark: `uvcheck --help` wall time against `python -c "import typer"`.

Goal (issue 2 / issue 8): ratio ≤ 1.5, medians of at least 5 runs measured in the same run
(the two commands alternate, so a change in the machine's load affects both alike; bytecode
cached as for an installed tool, see _timing.py).
Usage: python tests/benchmarks/bench_startup.py [RUNS]
"""

from __future__ import annotations

import sys

from _timing import interleaved_medians, uvcheck_cmd

runs = int(sys.argv[1]) if len(sys.argv) > 1 else 9
base, help_t = interleaved_medians([[sys.executable, "-c", "import typer"],
                                    uvcheck_cmd() + ["--help"]], runs)
print(f"python -c 'import typer' : {base * 1000:7.1f} ms (median of {runs})")
print(f"uvcheck --help           : {help_t * 1000:7.1f} ms (median of {runs})")
print(f"ratio                    : {help_t / base:.2f}  (goal <= 1.5)")
