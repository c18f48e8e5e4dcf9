"""Benchmark of inspection planning (prints figures; not a timed test).

    /work/venv/bin/python bench/bench_plan.py                      # 1e6 samples, 1 and all cores
    /work/venv/bin/python bench/bench_plan.py --samples 100000 --core-only

Times (1) the Monte Carlo core alone: every sample through a 20-inspection schedule and the
no-inspection case, on one thread and on all cores (the parallel speed-up; the answers must be
identical), and (2) the whole ``plan_inspections`` of examples/plate_inspection.toml with
``samples = max_samples`` = the sample count (curve tables from the life engine, what-if
intervals, the coarse and fine interval search, the envelope), and (3) the example as written
(the converged search).  Peak memory is the process's maximum resident set size.  On a shared
machine the figures depend on what else runs: the load average is printed beside them.
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import time
import tomllib
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--samples", type=int, default=1_000_000)
    ap.add_argument("--inspections", type=int, default=20)
    ap.add_argument("--core-only", action="store_true")
    args = ap.parse_args()

    from cycj.case import load_case
    from cycj.plan import engine, plan_inspections
    from cycj.plan.curves import build_table, factor_grid
    from cycj.plan.inputs import read_inspection
    from cycj.plan.montecarlo import (
        McSpec,
        Runner,
        default_workers,
        pack_schedules,
        summarise,
        uniform_schedule,
    )

    case = load_case(ROOT / "examples" / "plate_inspection.toml")
    inp = read_inspection(case)
    life = inp.design_life
    interval = life / (args.inspections + 1)
    sc = inp.scatter
    t0 = time.perf_counter()
    loads, tough = factor_grid(sc.load_scale, 7), factor_grid(sc.toughness, 9)
    growth, critical = engine.curve_functions(case, float(tough.max()))
    table = build_table(growth, critical, sc.initial_crack.quantile(1e-7), loads, tough)
    t_table = time.perf_counter() - t0
    spec = McSpec(
        table, sc, inp.pod, life, args.samples, inp.seed, inp.repair, n_max=args.inspections
    )
    sched, n = pack_schedules([[], uniform_schedule(interval, life)], args.inspections)
    # compile once on a small spec, then time
    Runner(workers=1).run(replace(spec, samples=200, chunk_size=200), sched, n)
    cores = default_workers()
    print(f"load average before: {os.getloadavg()[0]:.2f} on {os.cpu_count()} cores")
    print(f"curve table (7 load × 9 toughness factors, life engine): {t_table:.2f} s")
    times, results = {}, {}
    for w in sorted({1, cores}):
        t0 = time.perf_counter()
        results[w] = summarise(Runner(workers=w).run(spec, sched, n))
        times[w] = time.perf_counter() - t0
        print(
            f"Monte Carlo core, {w} thread(s): {args.samples:.3g} samples × {int(n[1])} "
            f"inspections (+ no inspection): {times[w]:.2f} s "
            f"({times[w] / args.samples / (int(n[1]) + 1) * 1e9:.0f} ns per sample-inspection)"
        )
    same = all(np.array_equal(results[w]["pof"], results[1]["pof"]) for w in results)
    print(f"  speed-up {times[1] / times[cores]:.2f} on {cores} threads; identical: {same}")
    res = results[1]
    print(
        f"  pof no inspection {res['pof'][0]:.4g} ± {res['std_error'][0]:.2g}; "
        f"every {interval:.4g} cycles {res['pof'][1]:.4g} ± {res['std_error'][1]:.2g}"
    )
    if not args.core_only:
        raw = tomllib.loads((ROOT / "examples" / "plate_inspection.toml").read_text())
        raw_i = dict(raw["inspection"], samples=args.samples, max_samples=args.samples)
        for label, c2 in (
            (f"{args.samples:.3g} samples fixed", replace(case, inspection=raw_i)),
            ("as written (converged search)", case),
        ):
            t0 = time.perf_counter()
            r = plan_inspections(c2)
            t_plan = time.perf_counter() - t0
            rec = r.summary["recommendation"]
            print(
                f"whole plan_inspections, {label}, {cores} threads: {t_plan:.2f} s; "
                f"recommended {r.summary['recommended_interval_cycles']:.5g} cycles, PoF "
                f"{rec['pof_estimate']:.3g} ({rec['pof_ci'][0]:.3g} to {rec['pof_ci'][1]:.3g}), "
                f"{r.summary['samples_used']} samples"
            )
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"peak resident memory: {peak:.0f} MB; load average after: {os.getloadavg()[0]:.2f}")


if __name__ == "__main__":
    main()
