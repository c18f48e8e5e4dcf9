"""Benchmark of start-up costs, each in fresh interpreters (ratios measured in one run; not a test).

1. Fast start: a warm ``cycj run examples/lab_compact_tension.toml`` with plots (kernels in the
   cache) against the bare import of numpy, pandas, matplotlib and numba together, the two
   alternating, ``--repeats`` times each; prints the ratio of the best times (target ≤ 1.5).
2. First calls: ``cycj.count_cycles`` on a 2·10⁶-sample history in a fresh interpreter after a
   small warm-up call (imports and cached kernels loaded), its first call on the large input
   against its later calls (target ≤ 1.5); and, for the record, the whole first call of a fresh
   interpreter with ``import cycj`` included.

Run from the repository root: python bench/bench_start.py [--repeats 5]
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
ENV = {**os.environ, "PYTHONPATH": str(ROOT), "MPLBACKEND": "Agg"}
CASE = ROOT / "examples" / "lab_compact_tension.toml"


def wall(cmd) -> float:
    t = time.perf_counter()
    subprocess.run(cmd, check=True, env=ENV, cwd=ROOT, capture_output=True)
    return time.perf_counter() - t


def fast_start(repeats: int) -> None:
    bare = [sys.executable, "-c", "import numpy, pandas, matplotlib, numba"]
    with tempfile.TemporaryDirectory() as tmp:
        run = [sys.executable, "-m", "cycj", "run", str(CASE), "--out", tmp + "/ct", "--force"]
        wall(run)  # fills the kernel cache if it is cold
        t_bare, t_run = [], []
        for _ in range(repeats):
            t_bare.append(wall(bare))
            t_run.append(wall(run))
    b, r = min(t_bare), min(t_run)
    print(f"bare import of numpy, pandas, matplotlib, numba: best {b:.2f} s of {repeats}")
    print(f"warm `cycj run {CASE.name}` with plots: best {r:.2f} s of {repeats}")
    print(f"ratio run/imports = {r / b:.2f} (target ≤ 1.5)")


_FIRST = """
import sys, time
import numpy as np
rng = np.random.default_rng(1)
n = 2_000_000
x = np.cumsum(rng.normal(size=n)) * 0.01 + rng.normal(size=n)
t0 = time.perf_counter()
import cycj
if sys.argv[1] == "warmed":
    cycj.count_cycles(np.arange(10.0) % 3)
t1 = time.perf_counter()
cycj.count_cycles(x)
t2 = time.perf_counter()
warm = []
for _ in range(3):
    t = time.perf_counter()
    cycj.count_cycles(x)
    warm.append(time.perf_counter() - t)
print(t1 - t0, t2 - t1, min(warm))
"""


def first_calls() -> None:
    for mode in ("warmed", "cold"):
        res = subprocess.run(
            [sys.executable, "-c", _FIRST, mode],
            check=True,
            env=ENV,
            capture_output=True,
            text=True,
        )
        before, first, warm = map(float, res.stdout.split())
        if mode == "warmed":
            print(
                f"count_cycles, 2e6 samples, fresh interpreter after a small warm-up call "
                f"({before:.2f} s: imports and cached kernels): first {first:.3f} s, warm "
                f"{warm:.3f} s, ratio {first / warm:.2f} (target ≤ 1.5)"
            )
        else:
            print(
                f"count_cycles, 2e6 samples, fresh interpreter, no warm-up: import cycj "
                f"{before:.2f} s + first call {first:.3f} s (imports pandas and numba, loads "
                f"the cached kernels) vs warm {warm:.3f} s, ratio {(before + first) / warm:.1f}"
            )


def main(argv=None) -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeats", type=int, default=5)
    args = ap.parse_args(argv)
    fast_start(args.repeats)
    first_calls()


if __name__ == "__main__":
    main()
