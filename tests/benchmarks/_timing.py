"""Shared helpers for the benchmark scripts (not tests): wall-clock medians of subprocesses.

Children run with Python's bytecode cache on, in a folder of its own
(``PYTHONPYCACHEPREFIX``, under the system's temporary folder), as an installed tool runs
(pip compiles a wheel's modules at install time). With ``PYTHONDONTWRITEBYTECODE`` set, as in
some development shells, every run would compile uvcheck's own modules again (about 0.3 s for
``uvcheck assess``) while numpy and typer load their installed bytecode, which measures the
shell rather than the program. The warm-up runs fill the cache for both sides of a ratio.
"""

from __future__ import annotations

import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path


def uvcheck_cmd() -> list[str]:
    exe = shutil.which("uvcheck")
    return [exe] if exe else [sys.executable, "-m", "uvcheck"]


def bench_env(extra: dict | None = None) -> dict:
    """The environment for measured children: bytecode cached in a folder of its own."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPYCACHEPREFIX"] = str(Path(tempfile.gettempdir()) / "uvcheck-bench-pycache")
    env.update(extra or {})
    return env


def median_wall(cmd: list[str], runs: int = 5, warmup: int = 1, env: dict | None = None) -> float:
    """Median wall time [s] of ``runs`` runs of a command (after ``warmup`` unmeasured runs)."""
    return statistics.median(walls(cmd, runs, warmup, env))


def walls(cmd: list[str], runs: int = 5, warmup: int = 1, env: dict | None = None) -> list[float]:
    """Wall times [s] of ``runs`` runs of a command (after ``warmup`` unmeasured runs)."""
    e = bench_env(env)
    for _ in range(warmup):
        subprocess.run(cmd, check=True, capture_output=True, env=e)
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        subprocess.run(cmd, check=True, capture_output=True, env=e)
        times.append(time.perf_counter() - t0)
    return times


def interleaved_medians(cmds: list[list[str]], runs: int = 7, warmup: int = 1
                        ) -> list[float]:
    """Median wall times [s] of several commands run in turn (a, b, a, b, …), so that a
    change in the machine's load affects each of them alike."""
    e = bench_env()
    for cmd in cmds:
        for _ in range(warmup):
            subprocess.run(cmd, check=True, capture_output=True, env=e)
    times: list[list[float]] = [[] for _ in cmds]
    for _ in range(runs):
        for k, cmd in enumerate(cmds):
            t0 = time.perf_counter()
            subprocess.run(cmd, check=True, capture_output=True, env=e)
            times[k].append(time.perf_counter() - t0)
    return [statistics.median(t) for t in times]
