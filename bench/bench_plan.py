"""Benchmark of inspection planning (prints figures; not a timed test).

    /work/venv/bin/python bench/bench_plan.py                  # 1e5 and 1e6 samples + whole plan
    /work/venv/bin/python bench/bench_plan.py --core-only      # the Monte Carlo core only
    /work/venv/bin/python bench/bench_plan.py --samples 2e5 --workers 2 --repeat 3

(1) The Monte Carlo core: every sample through a 20-inspection schedule and the no-inspection
case, for each sample count on one thread and on ``--workers`` threads (default all cores),
``--repeat`` times alternately (the best time of each is kept, which damps the noise of a
shared machine).  For each run it prints the wall time, the CPU time of the process, the mean
number of worker threads running or runnable (read from ``/proc/self/task/*/stat`` every
2 ms: a thread waiting for the GIL sleeps, so this is ≈ 1 if the chunks were serialised by the
GIL and ≈ the number of workers if not, whatever else the machine runs), the CPU-time ratio of
the parallel and serial runs (> 1 would mean the threads slow each other: memory bandwidth,
caches), the speed-up, an idle-machine estimate of it (runnable threads ÷ the CPU ratio,
taken as at least 1: CPU time measured on a busy machine varies by some 10 %), and the peak
resident memory above the start of the run (flat in the number of
samples: chunks are reduced to sums as they finish).  It asserts that every run gives
bit-identical probabilities of failure.

(2) The whole ``plan_inspections`` of examples/plate_inspection.toml with ``samples =
max_samples`` = the largest sample count, and (3) the example as written (converged search).

The load average (``os.getloadavg``) is printed before and after: on a shared machine the
speed-up is depressed by whatever else runs; re-run on a quiet machine for the real figure.
With the kernel's autogroup scheduling (``/proc/sys/kernel/sched_autogroup_enabled`` = 1) the
CPU is shared between sessions, not threads: while other sessions keep both cores busy, a
session gets its share whatever its number of threads, so the wall-time speed-up tends to 1
however parallel the code is; the CPU share (CPU ÷ wall) of each run shows this, and the
runnable-thread count and the CPU ratio show what the code itself does.
"""

from __future__ import annotations

import argparse
import os
import sys
import threading
import time
import tomllib
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
PAGE_MB = os.sysconf("SC_PAGE_SIZE") / 2**20


class Probe(threading.Thread):
    """Samples, every ``dt`` seconds, how many threads of this process (the probe excepted) are
    running or runnable (state R) and the resident memory [MB]."""

    def __init__(self, dt: float = 0.002):
        super().__init__(daemon=True)
        self.dt = dt
        self.skip: set[int] = set()
        self.stop = threading.Event()
        self.runnable: list[int] = []
        self.rss_mb: list[float] = []

    def run(self):
        self.skip.add(threading.get_native_id())
        while not self.stop.is_set():
            count = 0
            for tid in os.listdir("/proc/self/task"):
                if int(tid) in self.skip:
                    continue
                try:
                    stat = Path(f"/proc/self/task/{tid}/stat").read_text()
                except OSError:
                    continue
                count += stat.rsplit(")", 1)[1].split()[0] == "R"
            self.runnable.append(count)
            pages = int(Path("/proc/self/statm").read_text().split()[1])
            self.rss_mb.append(pages * PAGE_MB)
            time.sleep(self.dt)

    def __enter__(self):
        self.start()
        return self

    def __exit__(self, *exc):
        self.stop.set()
        self.join()


def rss_mb() -> float:
    return int(Path("/proc/self/statm").read_text().split()[1]) * PAGE_MB


def timed_run(runner, spec, sched, n, summarise) -> dict:
    base = rss_mb()
    with Probe() as probe:
        c0, t0 = time.process_time(), time.perf_counter()
        res = summarise(runner.run(spec, sched, n))
        wall, cpu = time.perf_counter() - t0, time.process_time() - c0
    return {
        "wall": wall,
        "cpu": cpu,
        "runnable": float(np.mean(probe.runnable)) if probe.runnable else float("nan"),
        "mem": max(probe.rss_mb, default=base) - base,
        "pof": res["pof"],
        "se": res["std_error"],
    }


def core_bench(args, spec, sched, n, interval):
    from cycj.plan.montecarlo import Runner, summarise

    workers = sorted({1, args.workers})
    for samples in args.samples:
        sp = replace(spec, samples=int(samples))
        best: dict[int, dict] = {}
        cpu: dict[int, float] = {}
        with Runner(workers=1) as r1, Runner(workers=args.workers) as rw:
            runners = {1: r1, args.workers: rw}
            for _ in range(args.repeat):
                for w in workers:
                    out = timed_run(runners[w], sp, sched, n, summarise)
                    if w not in best or out["wall"] < best[w]["wall"]:
                        best[w] = out
                    cpu[w] = min(cpu.get(w, np.inf), out["cpu"])
        for w in workers:
            b = best[w]
            print(
                f"  {samples:.0e} samples, {w} thread(s): {b['wall']:.2f} s wall, "
                f"{b['cpu']:.2f} s CPU (share {b['cpu'] / b['wall']:.2f} core), "
                f"{b['runnable']:.2f} threads runnable, "
                f"peak memory +{b['mem']:.0f} MB, "
                f"{b['wall'] / samples / (int(n[1]) + 1) * 1e9:.0f} ns per sample-inspection"
            )
        one, par = best[1], best[args.workers]
        same = all(np.array_equal(best[w]["pof"], one["pof"]) for w in workers)
        assert same, "the parallel run gave a different answer"
        print(
            f"  {samples:.0e} samples: speed-up {one['wall'] / par['wall']:.2f} on "
            f"{args.workers} threads (idle-machine estimate "
            f"{par['runnable'] / max(cpu[args.workers] / cpu[1], 1.0):.2f}; least CPU ratio "
            f"{cpu[args.workers] / cpu[1]:.2f}); identical answers: {same}; "
            f"PoF no inspection {one['pof'][0]:.4g} ± {one['se'][0]:.2g}, every "
            f"{interval:.4g} cycles {one['pof'][1]:.4g} ± {one['se'][1]:.2g}"
        )


def plan_bench(case, samples: int, workers: int):
    from cycj.plan import plan_inspections

    raw = tomllib.loads((ROOT / "examples" / "plate_inspection.toml").read_text())
    raw_i = dict(raw["inspection"], samples=samples, max_samples=samples)
    for label, c2 in (
        (f"{samples:.0e} samples fixed", replace(case, inspection=raw_i)),
        ("as written (converged search)", case),
    ):
        c0, t0 = time.process_time(), time.perf_counter()
        r = plan_inspections(c2, workers=workers)
        t_plan, cpu = time.perf_counter() - t0, time.process_time() - c0
        rec = r.summary["recommendation"]
        print(
            f"whole plan_inspections, {label}, {workers} threads: {t_plan:.2f} s "
            f"({cpu:.2f} s CPU, share {cpu / t_plan:.2f} core); "
            f"recommended {r.summary['recommended_interval_cycles']:.5g} cycles, PoF "
            f"{rec['pof_estimate']:.3g} ({rec['pof_ci'][0]:.3g} to {rec['pof_ci'][1]:.3g}), "
            f"{r.summary['samples_used']} samples"
        )


def main():
    from cycj.plan.montecarlo import default_workers

    ap = argparse.ArgumentParser()
    ap.add_argument("--samples", type=float, nargs="+", default=[1e5, 1e6])
    ap.add_argument("--inspections", type=int, default=20)
    ap.add_argument("--workers", type=int, default=default_workers())
    ap.add_argument("--repeat", type=int, default=2)
    ap.add_argument("--core-only", action="store_true")
    args = ap.parse_args()

    from cycj.case import load_case
    from cycj.plan import engine
    from cycj.plan.curves import build_table, factor_grid
    from cycj.plan.inputs import read_inspection
    from cycj.plan.montecarlo import McSpec, Runner, pack_schedules, uniform_schedule

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
    spec = McSpec(table, sc, inp.pod, life, 1, inp.seed, inp.repair, n_max=args.inspections)
    sched, n = pack_schedules([[], uniform_schedule(interval, life)], args.inspections)
    Runner(workers=1).run(replace(spec, samples=200, chunk_size=200), sched, n)  # compile
    print(f"load average before: {os.getloadavg()} on {os.cpu_count()} cores")
    auto = Path("/proc/sys/kernel/sched_autogroup_enabled")
    if auto.exists():
        print(f"autogroup scheduling (CPU shared per session): {auto.read_text().strip()}")
    print(f"curve table (7 load × 9 toughness factors, life engine): {t_table:.2f} s")
    print(f"Monte Carlo core, {int(n[1])} inspections (+ no inspection), best of {args.repeat}:")
    core_bench(args, spec, sched, n, interval)
    if not args.core_only:
        plan_bench(case, int(max(args.samples)), args.workers)
    print(f"load average after: {os.getloadavg()}")


if __name__ == "__main__":
    main()
