"""Benchmark (issue 8): ``uvcheck batch`` on 2 000 generated spectra against a bare numpy loop.

Generates N spectrum files (invented data: 2 000 points, 200–1100 nm, one to three emission
bands at random places on a small noisy floor, W/m²/nm) in a temporary folder, then measures,
in the same run and alternating, the wall time of

* the bare script: one Python process that loads every file with ``np.loadtxt`` and integrates
  it once with ``np.trapezoid`` (one core), and
* ``uvcheck batch FOLDER --out SUMMARY.csv`` (every core),

and prints the per-file cost of each (wall time of the whole process / N, medians of RUNS
runs), their ratio, and the peak resident memory of ``uvcheck batch`` (the batch process and
its workers together, sampled from /proc every 20 ms) for 200 and for N files, to show that it
does not grow with the number of files. Bytecode is cached for both sides, as for an installed
tool (see _timing.py).

Goal (issue 8): per-file cost ratio ≤ 2 using both cores; peak memory flat in N.
Usage: python tests/benchmarks/bench_batch.py [N] [RUNS]
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from _timing import bench_env, uvcheck_cmd

BARE = """
import sys, glob
import numpy as np
for f in sorted(glob.glob(sys.argv[1] + "/*.csv")):
    d = np.loadtxt(f, delimiter=",", skiprows=1)
    np.trapezoid(d[:, 1], d[:, 0])
"""


def write_spectra(folder: Path, n: int, seed: int = 8) -> None:
    """n invented spectra (2 000 points each) as CSV files with a header row."""
    rng = np.random.default_rng(seed)
    wl = np.linspace(200.0, 1100.0, 2000)
    for k in range(n):
        v = np.full(wl.size, 2e-6)
        for _ in range(int(rng.integers(1, 4))):
            c, w, a = rng.uniform(220, 900), rng.uniform(0.5, 40), 10 ** rng.uniform(-4, -1)
            v += a * np.exp(-0.5 * ((wl - c) / w) ** 2)
        v += rng.normal(0, 1e-6, wl.size)
        with open(folder / f"lamp{k:05d}.csv", "w", encoding="utf-8", newline="\n") as fh:
            fh.write("Wavelength (nm),Irradiance (W/m2/nm)\n")
            np.savetxt(fh, np.column_stack([wl, v]), fmt=["%.3f", "%.6e"], delimiter=",")


def _tree_rss_kib(pid: int) -> int:
    """Resident memory of a process and its children [KiB] (Linux /proc)."""
    total = 0
    pids = [pid]
    try:
        with open(f"/proc/{pid}/task/{pid}/children") as fh:
            pids += [int(x) for x in fh.read().split()]
    except OSError:
        pass
    for p in pids:
        try:
            with open(f"/proc/{p}/status") as fh:
                for line in fh:
                    if line.startswith("VmRSS:"):
                        total += int(line.split()[1])
        except OSError:
            pass
    return total


def run(cmd: list[str]) -> tuple[float, float]:
    """Wall time [s] and peak RSS of the process tree [MB] of one command."""
    t0 = time.perf_counter()
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                            env=bench_env())
    peak = 0
    while proc.poll() is None:
        peak = max(peak, _tree_rss_kib(proc.pid))
        time.sleep(0.02)
    wall = time.perf_counter() - t0
    err = proc.stderr.read().decode(errors="replace") if proc.stderr else ""
    if proc.returncode != 0:
        raise SystemExit(f"{' '.join(cmd)} failed ({proc.returncode}):\n{err}")
    return wall, peak / 1024.0


def main() -> int:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 2000
    runs = int(sys.argv[2]) if len(sys.argv) > 2 else 5
    with tempfile.TemporaryDirectory(prefix="uvcheck-bench-batch-") as tmp:
        base = Path(tmp)
        small, big = base / "small", base / "big"
        small.mkdir()
        big.mkdir()
        write_spectra(big, n)
        write_spectra(small, min(200, n))
        out = base / "summary.csv"
        batch = uvcheck_cmd() + ["batch", str(big), "--out", str(out), "--force", "--quiet"]
        bare = [sys.executable, "-c", BARE, str(big)]
        run(bare)  # warm the file cache and the bytecode caches
        run(batch)
        t_bare, t_batch, rss_big = [], [], []
        for _ in range(runs):
            t_bare.append(run(bare)[0])
            w, r = run(batch)
            t_batch.append(w)
            rss_big.append(r)
        rss_small = [run(uvcheck_cmd() + ["batch", str(small), "--out", str(base / "s.csv"),
                                          "--force", "--quiet"])[1] for _ in range(3)]
        rows = sum(1 for _ in open(out, encoding="utf-8")) - 1
    mb, mu = statistics.median(t_bare) / n, statistics.median(t_batch) / n
    print(f"{n} files of 2 000 points, {runs} runs each, cores: {os.cpu_count()}")
    print(f"bare numpy loop (loadtxt + trapezoid), 1 process : {mb * 1e3:6.2f} ms per file")
    print(f"uvcheck batch (every core)                       : {mu * 1e3:6.2f} ms per file "
          f"({rows} rows)")
    print(f"ratio                                            : {mu / mb:.2f}  (goal <= 2)")
    print(f"peak RSS, batch process and workers: {statistics.median(rss_small):.0f} MB for "
          f"{min(200, n)} files, {statistics.median(rss_big):.0f} MB for {n} files")
    return 0


if __name__ == "__main__":
    sys.exit(main())
