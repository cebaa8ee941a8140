"""A longer fuzzing run of the spectrum reader (issue 7): the properties of
tests/test_fuzz_reader.py with many more examples.

Usage: python tests/benchmarks/fuzz_long.py [EXAMPLES] [--seed N]

EXAMPLES (default 50 000) is the total, shared among the properties in the proportions of the
default test run. Prints the number of cases and the time per property; exits 1 with the
falsifying example on the first failure. Not a test: run it by hand or in a nightly job.
"""

from __future__ import annotations

import argparse
import sys
import time
import traceback
from pathlib import Path

from hypothesis import given, seed, settings
from hypothesis import strategies as st

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # tests/, for test_fuzz_reader

import test_fuzz_reader as fz  # noqa: E402

PROPERTIES = [
    # (name, default-run share, strategies, check)
    ("tables", fz.N_TABLES, (fz.table_file(),), lambda d: fz.check_read(d)),
    ("number text", fz.N_TEXT, (fz.number_text,), lambda t: fz.check_read(t.encode("utf-8"))),
    ("bytes", fz.N_BYTES, (st.binary(max_size=3000),), lambda d: fz.check_read(d, "fuzz.dat")),
    ("mutated file", fz.N_MUTATED, (fz.mutated_file(),), lambda d: fz.check_read(d)),
    ("options", fz.N_OPTIONS, (st.one_of(st.just(fz.BASE), fz.table_file()), fz.reader_options),
     lambda d, o: fz.check_read(d, **o)),
    ("fast = slow", fz.N_FAST_SLOW, (fz.clean_table(),), fz.check_fast_equals_slow),
]


def _counting(check, count: dict, arity: int):
    """A plain function of ``arity`` arguments for @given, counting its calls."""
    if arity == 1:
        def run(a):
            count["n"] += 1
            check(a)
    else:
        def run(a, b):
            count["n"] += 1
            check(a, b)
    return run


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("examples", nargs="?", type=int, default=50_000)
    ap.add_argument("--seed", type=int, default=None)
    args = ap.parse_args()
    total_share = sum(share for _, share, _, _ in PROPERTIES)
    grand = 0
    t_all = time.perf_counter()
    for name, share, strategies, check in PROPERTIES:
        n = max(1, round(args.examples * share / total_share))
        count = {"n": 0}
        test = settings(max_examples=n, database=None, **fz.COMMON)(
            given(*strategies)(_counting(check, count, len(strategies))))
        if args.seed is not None:
            test = seed(args.seed)(test)
        t0 = time.perf_counter()
        try:
            test()
        except Exception as exc:
            traceback.print_exception(exc)  # with hypothesis' falsifying example(s) in the notes
            print(f"{name}: FAILED after {count['n']} cases: {type(exc).__name__}: {exc}")
            return 1
        dt = time.perf_counter() - t0
        grand += count["n"]
        print(f"{name:14s} {count['n']:7d} cases  {dt:7.1f} s")
    print(f"{'total':14s} {grand:7d} cases  {time.perf_counter() - t_all:7.1f} s, "
          "no unhandled exception")
    return 0


if __name__ == "__main__":
    sys.exit(main())
