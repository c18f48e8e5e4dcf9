"""Benchmark of the set-up of a life run on a long measured history (ratios measured in one
run; not a test).

A random history of 10⁷ cycles per block (stored as ``.npy`` in a temporary folder) on an edge
crack: the wall time of ``predict_life`` with ``auto`` and with ``block`` against ``cycle`` on a
life of a few blocks, and the wall time of ``auto`` on a life of about 10¹⁰ cycles (block mode).

Run: python bench/bench_setup.py [cycles_per_block] [--long-only]
"""

import os
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
        import resource

        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024  # bytes (Linux: KiB)
        hist = 2 * n_cycles * 8
        print(
            f"peak RSS of this process so far (interpreter, kernels, three runs) "
            f"{peak / 2**20:.0f} MiB = {peak / hist:.2f} × the history array "
            f"({hist / 2**20:.0f} MiB; target ≤ 3)"
        )
        long_life(folder, n_cycles)


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
    main(int(float(args[0])) if args else 10_000_000, "--long-only" in sys.argv)
