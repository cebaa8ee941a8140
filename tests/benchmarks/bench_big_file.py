"""Benchmark (issue 7): a 1 000 000-row spectrum is processed with bounded memory.

Generates spectrum files of 10 000 and 1 000 000 rows (invented data: a Gaussian on a small
floor, 200–1100 nm) in a temporary folder, runs ``uvcheck assess FILE --json OUT --quiet`` on
each in a subprocess, and prints the wall time and the child's peak resident set size
(ru_maxrss). A third file of 1 000 000 rows in a messier dialect (semicolons, decimal commas,
one unreadable cell near the top) exercises the tolerant row-by-row parser instead of the
numpy fast path.

Budget (issue 7 brief, common practice for this project): peak RSS ≤ 300 MB and ≤ 20 s for the
million-row file. Exit status 1 when over budget.

ru_maxrss is read per child with os.wait4, the same ``struct rusage`` that
resource.getrusage(RUSAGE_CHILDREN) sums up; RUSAGE_CHILDREN alone would report the largest
child so far, hiding the smaller file's figure behind the larger one. On Linux ru_maxrss is in
KiB (getrusage(2)).

Usage: python tests/benchmarks/bench_big_file.py
"""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from _timing import uvcheck_cmd

BUDGET_RSS_MB = 300.0
BUDGET_WALL_S = 20.0


def write_clean(path: Path, n: int) -> None:
    wl = np.linspace(200.0, 1100.0, n)
    v = 1e-3 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + 1e-6
    with open(path, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("Wavelength (nm),Irradiance (W/m2/nm)\n")
        np.savetxt(fh, np.column_stack([wl, v]), fmt=["%.6f", "%.6e"], delimiter=",")


def write_messy(path: Path, n: int) -> None:
    wl = np.linspace(200.0, 1100.0, n)
    v = 1e-3 * np.exp(-0.5 * ((wl - 395.0) / 6.0) ** 2) + 1e-6
    with open(path, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("Wellenlänge [nm];E [W/m2/nm]\n")
        for k in range(0, n, 50_000):
            chunk = np.column_stack([wl[k:k + 50_000], v[k:k + 50_000]])
            lines = [f"{a:.6f};{b:.6e}".replace(".", ",") for a, b in chunk]
            if k == 0:
                lines[10] = lines[10].split(";")[0] + ";n.d."
            fh.write("\n".join(lines) + "\n")


def run(cmd: list[str]) -> tuple[float, float, int]:
    """Wall time [s], peak RSS [MB] and exit status of one child process."""
    t0 = time.perf_counter()
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    _, status, usage = os.wait4(proc.pid, 0)
    wall = time.perf_counter() - t0
    proc.returncode = os.waitstatus_to_exitcode(status)
    err = proc.stderr.read().decode(errors="replace") if proc.stderr else ""
    if proc.returncode != 0:
        print(err, file=sys.stderr)
    kib = usage.ru_maxrss if sys.platform != "darwin" else usage.ru_maxrss / 1024  # macOS: bytes
    return wall, kib / 1024.0, proc.returncode


def main() -> int:
    over = False
    with tempfile.TemporaryDirectory(prefix="uvcheck-bench-") as tmp:
        folder = Path(tmp)
        cases = [("10 000 rows, clean CSV", 10_000, write_clean),
                 ("1 000 000 rows, clean CSV", 1_000_000, write_clean),
                 ("1 000 000 rows, tolerant parser", 1_000_000, write_messy)]
        print(f"{'file':34s} {'size':>8s} {'wall':>8s} {'peak RSS':>9s}")
        for label, n, writer in cases:
            src = folder / f"spectrum {n}.csv"
            writer(src, n)
            out = folder / f"out {n}.json"
            if out.exists():
                out.unlink()
            wall, rss, rc = run(uvcheck_cmd() + ["assess", str(src), "--json", str(out), "--quiet"])
            size_mb = src.stat().st_size / 1e6
            flag = ""
            if rc != 0:
                flag, over = f"  FAILED (exit {rc})", True
            elif n >= 1_000_000 and (rss > BUDGET_RSS_MB or wall > BUDGET_WALL_S):
                flag, over = "  OVER BUDGET", True
            print(f"{label:34s} {size_mb:6.1f}MB {wall:7.2f}s {rss:7.1f}MB{flag}")
            src.unlink()
    print(f"budget for 1 000 000 rows: {BUDGET_RSS_MB:.0f} MB peak RSS, {BUDGET_WALL_S:.0f} s")
    return 1 if over else 0


if __name__ == "__main__":
    sys.exit(main())
