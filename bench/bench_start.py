"""Benchmark of start-up costs, each in fresh interpreters (ratios measured in one run; not a test).

1. Fast start: a warm ``cycj run examples/lab_compact_tension.toml`` with plots (kernels in the
   cache: numba's, and the start-up copies a first ``cycj run`` saves, see cycj/_ahead.py)
   against the bare import of numpy, pandas, matplotlib and numba together, the two
   alternating, ``--repeats`` times each; prints the ratio of the best times (target ≤ 1.5).
2. First calls: ``cycj.count_cycles`` on a 2·10⁶-sample history in a fresh interpreter (after
   a ``cycj count`` of the same history has saved its start-up copies) after a small warm-up
   call (imports and cached kernels loaded), its first call on the large input against its
   later calls (target ≤ 1.5); and, for the record, the whole first call of a fresh
   interpreter with ``import cycj`` included.

CPU times (user + system) are the figures: on a shared machine the wall time counts waits.

Run from the repository root: python bench/bench_start.py [--repeats 5]
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
# a warm run has every cache a user's machine has: numba's, the start-up copies, and Python's
# bytecode of cycj (an environment that forbids writing it would compile ~70 modules from
# source on every run, while the bare import reads site-packages' compiled files)
ENV = {
    **{k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"},
    "PYTHONPATH": str(ROOT),
    "MPLBACKEND": "Agg",
}
CASE = ROOT / "examples" / "lab_compact_tension.toml"


def cpu(cmd) -> tuple[float, float]:
    """(CPU seconds, user + system, wall seconds) of one run of ``cmd`` in a fresh process.
    CPU time is the figure quoted: on a shared machine the wall time also counts the waits."""
    r0 = resource.getrusage(resource.RUSAGE_CHILDREN)
    t = time.perf_counter()
    subprocess.run(cmd, check=True, env=ENV, cwd=ROOT, capture_output=True)
    t = time.perf_counter() - t
    r1 = resource.getrusage(resource.RUSAGE_CHILDREN)
    return r1.ru_utime - r0.ru_utime + r1.ru_stime - r0.ru_stime, t


def fast_start(repeats: int) -> None:
    bare = [sys.executable, "-c", "import numpy, pandas, matplotlib, numba"]
    with tempfile.TemporaryDirectory() as tmp:
        run = [sys.executable, "-m", "cycj", "run", str(CASE), "--out", tmp + "/ct", "--force"]
        cpu(run)  # fills the kernel cache if it is cold
        t_bare, t_run = [], []
        for _ in range(repeats):
            t_bare.append(cpu(bare))
            t_run.append(cpu(run))
    (b, bw), (r, rw) = min(t_bare), min(t_run)
    print(
        f"bare import of numpy, pandas, matplotlib, numba: best {b:.2f} s CPU ({bw:.2f} s wall) "
        f"of {repeats}"
    )
    print(f"warm `cycj run {CASE.name}` with plots: best {r:.2f} s CPU ({rw:.2f} s wall)")
    print(f"ratio run/imports = {r / b:.2f} CPU, {rw / bw:.2f} wall (target ≤ 1.5)")
    probe = subprocess.run(
        [sys.executable, "-X", "importtime", "-m", "cycj", "run", str(CASE), "--out", tmp]
        + ["--force"],
        env=ENV,
        cwd=ROOT,
        capture_output=True,
        text=True,
    )
    imported = {line.rsplit("|", 1)[-1].strip() for line in probe.stderr.splitlines()}
    print(f"numba imported in the warm run: {'numba' in imported}")


_FIRST = """
import sys, time
import numpy as np
rng = np.random.default_rng(1)
n = 2_000_000
x = np.cumsum(rng.normal(size=n)) * 0.01 + rng.normal(size=n)
clock = time.process_time  # CPU time of this process: the waits of a shared machine left out
t0 = clock()
import cycj
if sys.argv[1] == "warmed":
    cycj.count_cycles(np.arange(10.0) % 3)
t1 = clock()
cycj.count_cycles(x)
t2 = clock()
warm = []
for _ in range(3):
    t = clock()
    cycj.count_cycles(x)
    warm.append(clock() - t)
print(t1 - t0, t2 - t1, min(warm), "numba" in sys.modules)
"""


def _fill_count_copies() -> None:
    """A ``cycj count`` of the benchmark's history: saves the start-up copies of its kernels."""
    import numpy as np

    rng = np.random.default_rng(1)
    n = 2_000_000
    x = np.cumsum(rng.normal(size=n)) * 0.01 + rng.normal(size=n)
    with tempfile.TemporaryDirectory() as tmp:
        np.save(tmp + "/walk.npy", x)
        cmd = [sys.executable, "-m", "cycj", "count", tmp + "/walk.npy", "--no-plots"]
        subprocess.run(cmd + ["--out", tmp + "/c"], check=True, env=ENV, cwd=ROOT)


def first_calls() -> None:
    _fill_count_copies()
    for mode in ("warmed", "cold"):
        res = subprocess.run(
            [sys.executable, "-c", _FIRST, mode],
            check=True,
            env=ENV,
            capture_output=True,
            text=True,
        )
        *times, nb = res.stdout.split()
        before, first, warm = map(float, times)
        if mode == "warmed":
            print(
                f"count_cycles, 2e6 samples, fresh interpreter after a small warm-up call "
                f"({before:.2f} s: imports and cached kernels): first {first:.3f} s, warm "
                f"{warm:.3f} s, ratio {first / warm:.2f} (target ≤ 1.5); numba imported: {nb}"
            )
        else:
            print(
                f"count_cycles, 2e6 samples, fresh interpreter, no warm-up: import cycj "
                f"{before:.2f} s + first call {first:.3f} s (imports pandas, loads "
                f"the kernels) vs warm {warm:.3f} s, ratio {(before + first) / warm:.1f}"
            )


def main(argv=None) -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeats", type=int, default=5)
    args = ap.parse_args(argv)
    fast_start(args.repeats)
    first_calls()


if __name__ == "__main__":
    main()
