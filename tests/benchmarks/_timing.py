"""Shared helpers for the benchmark scripts (not tests): wall-clock medians of subprocesses."""

from __future__ import annotations

import os
import shutil
import statistics
import subprocess
import sys
import time


def uvcheck_cmd() -> list[str]:
    exe = shutil.which("uvcheck")
    return [exe] if exe else [sys.executable, "-m", "uvcheck"]


def median_wall(cmd: list[str], runs: int = 5, warmup: int = 1, env: dict | None = None) -> float:
    """Median wall time [s] of ``runs`` runs of a command (after ``warmup`` unmeasured runs)."""
    e = {**os.environ, **(env or {})}
    for _ in range(warmup):
        subprocess.run(cmd, check=True, capture_output=True, env=e)
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        subprocess.run(cmd, check=True, capture_output=True, env=e)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)
