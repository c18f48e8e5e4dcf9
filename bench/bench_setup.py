"""Benchmark of the set-up of a life run on a long measured history (ratios measured in one
run; not a test).

A random history of 10⁷ cycles per block (stored as ``.npy`` in a temporary folder) on an edge
crack: the wall time of ``predict_life`` with ``auto`` and with ``block`` against ``cycle`` on a
life of a few blocks; the peak memory one forced ``block`` run adds (in a child process)
against the history array; and the wall time of ``auto`` on a life of about 10¹⁰ cycles
(block mode).

Run: python bench/bench_setup.py [cycles_per_block] [--long-only]
(``--memory-child METHOD`` is the child process of the memory figure.)
"""

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))

from cycj.case import case_from_dict  # noqa: E402
from cycj.life import predict_life  # noqa: E402


def make_case(folder: Path, n_cycles: int, growth_c: float):
    """Edge-crack plate under a random history of ``n_cycles`` cycles (peaks 60–100 MPa,
    valleys 0–30 MPa, alternating, so every cycle is a reversal pair)."""
    rng = np.random.default_rng(7)
    hist = np.empty(2 * n_cycles)
    hist[0::2] = rng.uniform(60.0, 100.0, n_cycles)
    hist[1::2] = rng.uniform(0.0, 30.0, n_cycles)
    np.save(folder / "history.npy", hist)
    return case_from_dict(
        {
            "material": {
                "elastic_modulus": "200 GPa",
                "yield_strength": "350 MPa",
                "tensile_strength": "500 MPa",
                "cyclic_curve": {"strength_coefficient": "900 MPa", "hardening_exponent": 0.15},
                "growth": {"C": growth_c, "m": 1.6},
            },
            "geometry": {
                "shape": "edge-crack-plate",
                "width": "40 mm",
                "thickness": "10 mm",
                "crack_length": "2 mm",
            },
            "loading": {"history": "history.npy", "unit": "MPa"},
            "run": {"criteria": ["collapse", "size-limit"], "max_cycles": 1e15},
        },
        base=folder,
    )


def timed(case, method, cpu=False):
    """Wall time of ``predict_life`` (and its CPU time with ``cpu``: on a shared machine the
    wall time also counts the waits for a core)."""
    t, c = time.perf_counter(), time.process_time()
    res = predict_life(case, method=method)
    t, c = time.perf_counter() - t, time.process_time() - c
    return ((t, c) if cpu else t), res.summary


def main(n_cycles=10_000_000, long_only=False):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        if long_only:
            return long_life(folder, n_cycles)
        # C = 2e-5 gives a life of about 1.37e6 cycles: scale it to ~5 blocks and ~1e10 cycles
        short = make_case(folder, n_cycles, 2e-5 * 1.37e6 / (5.0 * n_cycles))
        predict_life(short, method="cycle")  # compile / load kernels, warm the file cache
        t_cycle, s_cycle = timed(short, "cycle")
        t_auto, s_auto = timed(short, "auto")
        t_block, s_block = timed(short, "block")
        print(
            f"{n_cycles:.3g} cycles per block, life {s_cycle['blocks_to_end']:.3g} blocks "
            f"({s_cycle['end_reason']}): cycle {t_cycle:.2f} s; auto ({s_auto['method']}) "
            f"{t_auto:.2f} s; block {t_block:.2f} s"
        )
        print(
            f"ratio auto/cycle = {t_auto / t_cycle:.2f} (target ≤ 1.2); "
            f"block/cycle = {t_block / t_cycle:.2f} (target ≤ 2)"
        )
        print(
            f"  a_end: cycle {s_cycle['a_end_mm']:.6g} mm, block {s_block['a_end_mm']:.6g} mm; "
            f"cycles: cycle {s_cycle['cycles_to_end']:.6g}, block {s_block['cycles_to_end']:.6g}"
        )
        peak_of_one_run("block", n_cycles)
        long_life(folder, n_cycles)


def peak_of_one_run(method, n_cycles):
    """Peak memory one ``predict_life`` run adds, measured in a fresh child process (kernels
    loaded and the case written first; then the peak resident set is reset and the run's
    peak read back), against the history array (the block's samples as float64)."""
    out = subprocess.run(
        [sys.executable, __file__, str(n_cycles), "--memory-child", method],
        check=True,
        capture_output=True,
        text=True,
        env={**os.environ, "PYTHONPATH": str(HERE.parent)},
    ).stdout.split()
    if not out:
        print("peak memory: not measured (needs Linux /proc/self/clear_refs)")
        return
    added, total = float(out[0]), float(out[1])
    hist = 2 * n_cycles * 8
    print(
        f"peak memory of one {method} run: {added / 2**20:.0f} MiB added = "
        f"{added / hist:.2f} × the history array ({hist / 2**20:.0f} MiB; target ≤ 3); "
        f"whole process {total / 2**20:.0f} MiB = {total / hist:.2f} ×"
    )


def _proc_status(key):
    with open("/proc/self/status") as f:
        return next(int(line.split()[1]) * 1024 for line in f if line.startswith(key))


def memory_child(method, n_cycles):
    """The child of :func:`peak_of_one_run`: prints the added and the whole peak [bytes]."""
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "warm").mkdir()
        predict_life(make_case(folder / "warm", 10, 1e-3), method=method)  # load the kernels
        case = make_case(folder, n_cycles, 2e-5 * 1.37e6 / (5.0 * n_cycles))
        try:
            with open("/proc/self/clear_refs", "w") as f:
                f.write("5")  # reset the peak resident set (VmHWM) to the current one
        except OSError:
            return
        before = _proc_status("VmRSS")
        predict_life(case, method=method)
        peak = _proc_status("VmHWM")
    print(peak - before, peak)


def long_life(folder, n_cycles):
    """``auto`` on a life of about 10¹⁰ cycles (a warm run: kernels loaded first)."""
    warm = folder / "warm"
    warm.mkdir(exist_ok=True)
    predict_life(make_case(warm, 10, 1e-3), method="auto")  # load the kernels
    long = make_case(folder, n_cycles, 2e-5 * 1.37e6 / 1e10)
    (t_long, c_long), s_long = timed(long, "auto", cpu=True)
    print(
        f"auto on {s_long['cycles_to_end']:.4g} cycles ({s_long['blocks_to_end']:.4g} "
        f"blocks, {s_long['method']}: {s_long['method_reason']}) in {t_long:.1f} s wall, "
        f"{c_long:.1f} s CPU (target < 60 s)"
    )


if __name__ == "__main__":
    os.environ.setdefault("MPLBACKEND", "Agg")
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    n = int(float(args[0])) if args else 10_000_000
    if "--memory-child" in sys.argv:
        memory_child(args[1], n)
    else:
        main(n, "--long-only" in sys.argv)
