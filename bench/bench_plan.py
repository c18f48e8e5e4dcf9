"""Benchmark of inspection planning (prints figures; not a timed test).

    /work/venv/bin/python bench/bench_plan.py            # 1e5 samples × 20 inspections
    /work/venv/bin/python bench/bench_plan.py --samples 1000000 --core-only   # memory check

Times (1) the Monte Carlo core alone: every sample through a 20-inspection schedule and the
no-inspection case, and (2) the whole ``plan_inspections`` on the demo case (curve tables from
the life engine, what-if intervals, the interval search, the envelope).  Peak memory is the
process's maximum resident set size.
"""

from __future__ import annotations

import argparse
import resource
import sys
import time
import tomllib
from dataclasses import replace
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--samples", type=int, default=100_000)
    ap.add_argument("--inspections", type=int, default=20)
    ap.add_argument("--core-only", action="store_true")
    args = ap.parse_args()

    from cycj.case import load_case
    from cycj.plan import engine, plan_inspections
    from cycj.plan.curves import build_table, factor_grid
    from cycj.plan.inputs import read_inspection
    from cycj.plan.montecarlo import McSpec, Runner, pack_schedules, summarise, uniform_schedule

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
    Runner().run(replace(spec, samples=200, chunk_size=200), sched, n)
    t0 = time.perf_counter()
    res = summarise(Runner().run(spec, sched, n))
    t_core = time.perf_counter() - t0
    print(f"curve table (7 load × 9 toughness factors, life engine): {t_table:.2f} s")
    print(
        f"Monte Carlo core: {args.samples:.3g} samples × {int(n[1])} inspections "
        f"(+ no inspection): {t_core:.2f} s  "
        f"({t_core / args.samples / (int(n[1]) + 1) * 1e9:.0f} ns per sample-inspection)"
    )
    print(
        f"  pof no inspection {res['pof'][0]:.4g} ± {res['std_error'][0]:.2g}; "
        f"every {interval:.4g} cycles {res['pof'][1]:.4g} ± {res['std_error'][1]:.2g}"
    )
    if not args.core_only:
        raw = tomllib.loads((ROOT / "examples" / "plate_inspection.toml").read_text())
        raw_i = dict(
            raw["inspection"],
            samples=args.samples,
            intervals=[interval, 2 * interval],
            max_inspections=args.inspections,
        )
        c2 = replace(case, inspection=raw_i)
        t0 = time.perf_counter()
        r = plan_inspections(c2)
        t_plan = time.perf_counter() - t0
        n_sched = 1 + 2 + 1 + 16 + 16
        print(
            f"whole plan_inspections, {args.samples:.3g} samples, up to "
            f"{args.inspections} inspections, ~{n_sched} schedules incl. the search: "
            f"{t_plan:.2f} s; recommended interval "
            f"{r.summary['recommended_interval_cycles']:.4g} cycles"
        )
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"peak resident memory: {peak:.0f} MB")


if __name__ == "__main__":
    main()
