"""Benchmark of the spectrum stage (a script, not a test).

1. ``cycj.count_cycles`` against the PyPI ``rainflow`` package on the same 2·10⁶-sample history,
   in one run: prints the ratio and samples per second.
2. Reading a 10⁷-sample ``.npy`` and counting it (target < 3 s).
3. Peak memory of ``cycj count`` on that file, via ``/usr/bin/time -v`` (target < 1 GB).
4. First against warm call of ``cycj.count_cycles`` in a fresh interpreter on a large history
   (target: first within 1.5 x of warm; the first call imports numba and pandas and loads the
   cached kernels, about 1 s on the reference machine).
5. ``cycj count`` of a 10⁸-sample ``.npy`` random walk (streaming: two passes over the file,
   cycle table spilled to disk and written as Parquet): wall time and peak RSS via
   ``/usr/bin/time -v`` (targets < 30 s and < 1 GB; the file is 800 MB and needs as much free
   disk again for the spill and the outputs).

Run from the repository root::

    python bench/bench_count.py [--samples 2000000] [--big 10000000] [--skip-memory]
        [--first 50000000] [--stream-samples 100000000] [--skip-stream]
"""

from __future__ import annotations

import argparse
import os
import re
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import cycj  # noqa: E402
from cycj.spectrum import read_history  # noqa: E402
from cycj.spectrum.generators import gaussian_from_irregularity  # noqa: E402


def best_of(fn, repeats):
    best = float("inf")
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def main(argv=None):
    ap = argparse.ArgumentParser()
    ap.add_argument("--samples", type=int, default=2_000_000)
    ap.add_argument("--big", type=int, default=10_000_000)
    ap.add_argument("--skip-memory", action="store_true")
    ap.add_argument("--first", type=int, default=50_000_000)
    ap.add_argument("--stream-samples", type=int, default=100_000_000)
    ap.add_argument("--skip-stream", action="store_true")
    args = ap.parse_args(argv)

    import rainflow

    n = args.samples
    rng = np.random.default_rng(1)
    histories = {
        "Gaussian, irregularity 0.7 (smooth, 80 samples a period)": gaussian_from_irregularity(
            n, 0.7, rms=20.0, mean=50.0, seed=1
        )[0],
        "random walk + white noise (about 2 reversals in 3 samples)": np.cumsum(rng.normal(size=n))
        * 0.01
        + rng.normal(size=n),
    }
    cycj.count_cycles(np.arange(10.0) % 3)  # compile (or load the numba cache) before timing
    for label, x in histories.items():
        t_cycj, df = best_of(lambda x=x: cycj.count_cycles(x), 3)
        t_ref, ref = best_of(lambda x=x: list(rainflow.extract_cycles(x)), 1)
        assert abs(df["count"].sum() - sum(c[2] for c in ref)) < 1e-6, "counts differ"
        print(f"count_cycles on {n:.3g} samples, {label}: {len(df)} cycles")
        print(f"  cycj     {t_cycj:8.3f} s  ({n / t_cycj:.3g} samples/s)")
        print(f"  rainflow {t_ref:8.3f} s  ({n / t_ref:.3g} samples/s)")
        print(f"  ratio    {t_ref / t_cycj:8.1f} x   (target >= 30 x)")

    with tempfile.TemporaryDirectory() as tmp:
        big = Path(tmp) / "big.npy"
        rng = np.random.default_rng(2)
        y = np.cumsum(rng.normal(size=args.big)) * 0.01 + rng.normal(size=args.big)
        np.save(big, y)
        del y

        def read_and_count():
            v = read_history(big)
            return cycj.count_cycles(v)

        t_big, df_big = best_of(read_and_count, 2)
        print(f"read .npy + count, {args.big:.3g} samples ({len(df_big)} cycles):")
        print(f"  {t_big:.3f} s  ({args.big / t_big:.3g} samples/s; target < 3 s)")
        del df_big

        if not args.skip_memory and Path("/usr/bin/time").exists():
            cmd = ["/usr/bin/time", "-v", sys.executable, "-m", "cycj", "count", str(big)]
            env = {**os.environ, "PYTHONPATH": str(ROOT)}
            t0 = time.perf_counter()
            res = subprocess.run(cmd, capture_output=True, text=True, env=env, cwd=ROOT)
            wall = time.perf_counter() - t0
            m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", res.stderr)
            rss = int(m.group(1)) / 1024 if m else float("nan")
            print(f"cycj count {args.big:.3g}-sample .npy (whole command, incl. start-up):")
            print(f"  wall {wall:.2f} s, peak RSS {rss:.0f} MiB (target < 1024 MiB)")
            if res.returncode:
                print(res.stderr[-2000:])

        first_call(args.first, Path(tmp))
        if not args.skip_stream:
            stream_count(args.stream_samples, Path(tmp))


def random_walk_npy(path: Path, n: int, seed: int = 3, step: int = 10_000_000) -> Path:
    """Write an ``n``-sample Gaussian random walk (float64) to ``path`` in pieces (the
    generator never holds more than ``step`` samples)."""
    rng = np.random.default_rng(seed)
    mm = np.lib.format.open_memmap(path, mode="w+", dtype=np.float64, shape=(n,))
    last = 0.0
    for i in range(0, n, step):
        y = np.cumsum(rng.normal(size=min(step, n - i))) + last
        mm[i : i + y.size] = y
        last = float(y[-1])
    mm.flush()
    del mm
    return path


_FIRST = """
import sys, time
import numpy as np
x = np.load(sys.argv[1])
t0 = time.perf_counter()
import cycj
cycj.count_cycles(x)
t1 = time.perf_counter()
warm = []
for _ in range(2):
    t = time.perf_counter()
    cycj.count_cycles(x)
    warm.append(time.perf_counter() - t)
print(t1 - t0, min(warm))
"""


def first_call(n: int, tmp: Path) -> None:
    """First against warm ``cycj.count_cycles`` in a fresh interpreter (numba cache warm)."""
    path = random_walk_npy(tmp / "first.npy", n)
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    res = subprocess.run(
        [sys.executable, "-c", _FIRST, str(path)], capture_output=True, text=True, env=env
    )
    if res.returncode:
        print(res.stderr[-2000:])
        return
    first, warm = map(float, res.stdout.split())
    print(f"count_cycles on {n:.3g} samples in a fresh interpreter:")
    print(f"  first {first:.3f} s, warm {warm:.3f} s, ratio {first / warm:.2f} (target <= 1.5)")
    path.unlink()


def stream_count(n: int, tmp: Path) -> None:
    """Wall time and peak RSS of ``cycj count`` (streaming) on an ``n``-sample random walk."""
    if not Path("/usr/bin/time").exists():
        print("no /usr/bin/time: streaming measurement skipped")
        return
    path = random_walk_npy(tmp / "walk.npy", n)
    out = tmp / "walk_out"
    cmd = ["/usr/bin/time", "-v", sys.executable, "-m", "cycj", "count", str(path)]
    cmd += ["--out", str(out)]
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    t0 = time.perf_counter()
    res = subprocess.run(cmd, capture_output=True, text=True, env=env, cwd=ROOT)
    wall = time.perf_counter() - t0
    m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", res.stderr)
    rss = int(m.group(1)) / 1024 if m else float("nan")
    print(f"cycj count {n:.3g}-sample .npy random walk (streaming, with plots and report):")
    print(f"  wall {wall:.2f} s (target < 30 s), peak RSS {rss:.0f} MiB (target < 1024 MiB)")
    print("  " + res.stdout.strip().replace("\n", "\n  "))
    if res.returncode:
        print(res.stderr[-2000:])


if __name__ == "__main__":
    main()
