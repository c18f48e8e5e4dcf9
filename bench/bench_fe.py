"""Benchmark of the finite-element J stage (a script, not a test).

One load sequence of ``--levels`` levels (L_r from 0.05 to 1.5) on a C(T), a/W = 0.5, plane
strain, hardening exponent n = 1/n' = 10, with ``--refine`` 2 (about 20,000 degrees of
freedom): prints the degrees of freedom, Newton iterations and seconds per level, the total
time, the share spent in the linear solves, and the worst spread between the domains.

With ``--table`` it times instead a J table of 8 crack sizes × 10 load levels (the C(T) case
of bench_stepper.py, default loads L_r 0.05–2, refine 1): in worker processes, then on a local
Dask cluster through its scheduler address (the two tables must agree exactly), with the
peak resident memory of this process and of its largest worker.

Run from the repository root::

    python bench/bench_fe.py [--refine 2] [--levels 12] [--linear reuse,direct,amg]
    python bench/bench_fe.py --table [--workers 2]
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import cycj.fe.solver as S  # noqa: E402
from cycj.fe.domain import j_domains  # noqa: E402
from cycj.fe.law import DeformationLaw  # noqa: E402
from cycj.fe.linear import METHODS  # noqa: E402
from cycj.fe.shapes import build  # noqa: E402
from cycj.geometry import make_geometry  # noqa: E402


def sequence(pb, loads, s_l, method, verbose):
    """Solve the load sequence with the linear solver ``method``; print and return seconds."""
    linear = S.linear_solver(pb, method)
    t1 = time.perf_counter()
    sols = S.solve_loads(pb, loads, linear=linear)
    t_solve = time.perf_counter() - t1
    worst = 0.0
    js = []
    for sol in sols:
        vals, spread = j_domains(pb, sol)
        worst = max(worst, spread)
        js.append(vals.mean())
        if verbose:
            print(
                f"  L_r {sol.load / s_l:6.3f}  J {vals.mean():12.5g} kJ/m²  spread {spread:.1e}  "
                f"{sol.iterations:3d} Newton iterations  {sol.seconds:6.2f} s"
            )
    st = linear.stats
    print(
        f"[{method}] total {t_solve:.1f} s for {len(loads)} levels "
        f"({sum(s.iterations for s in sols)} Newton iterations); linear solves "
        f"{100 * st['seconds'] / t_solve:.0f} % of it ({st['factorisations']} factorisations, "
        f"{st['amg_setups']} AMG set-ups, {st['cg_iterations']} CG iterations, "
        f"{st.get('direct_fallbacks', 0)} direct fallbacks); worst domain spread {worst:.1e}"
    )
    return t_solve, np.array(js)


def table(workers):
    """Time a J table of 8 sizes × 10 loads in processes and on Dask; compare the tables."""
    import resource

    sys.path.insert(0, str(ROOT / "bench"))
    from bench_stepper import ct_case

    from cycj.fe.table import compute

    case = ct_case()
    t = time.perf_counter()
    frame, info = compute(case, sizes=8, loads=10, workers=workers)
    t_proc = time.perf_counter() - t
    rss_children = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
    print(
        f"J table {len(frame)} rows ({frame['a_mm'].nunique()} sizes), up to "
        f"{info['dofs_max']} DOF, {info['parallel']}: {t_proc:.1f} s wall "
        f"(sum of the sequences {info['seconds']:.1f} s); worst domain spread "
        f"{info['worst_domain_spread']:.1e}"
    )
    from dask.distributed import Client, LocalCluster

    n = workers or 2
    with LocalCluster(n_workers=n, threads_per_worker=1, processes=True) as cluster:
        with Client(cluster.scheduler_address) as client:
            t = time.perf_counter()
            frame_d, _ = compute(case, sizes=8, loads=10, scheduler=cluster.scheduler_address)
            t_dask = time.perf_counter() - t
            rss = client.run(lambda: resource.getrusage(resource.RUSAGE_SELF).ru_maxrss)
    cols = ["J_kJm2", "dJ_kJm2"]
    same = float(np.max(np.abs(frame_d[cols].to_numpy() / frame[cols].to_numpy() - 1)))
    rss_self = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(
        f"on Dask ({n} workers via {cluster.scheduler_address}): {t_dask:.1f} s wall; "
        f"largest relative difference from the processes' table {same:.1e}"
    )
    print(
        f"peak resident memory: this process {rss_self:.0f} MB, largest worker process "
        f"{rss_children:.0f} MB, largest Dask worker {max(rss.values()) / 1024:.0f} MB"
    )


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--refine", type=int, default=2)
    ap.add_argument("--levels", type=int, default=12)
    ap.add_argument(
        "--linear",
        default="reuse,direct",
        help="comma-separated linear solvers, each timed in this run: " + ", ".join(METHODS),
    )
    ap.add_argument("--table", action="store_true", help="time an 8 × 10 J table instead")
    ap.add_argument("--workers", type=int, default=None)
    args = ap.parse_args(argv)
    if args.table:
        return table(args.workers)
    methods = [m.strip() for m in args.linear.split(",") if m.strip()]
    e, nu, sigma_0, n, w = 200e3, 0.3, 400.0, 10.0, 50.0
    a = 0.5 * w
    law = DeformationLaw(e, nu, sigma_0 * (sigma_0 / e) ** (-1 / n), 1 / n, True)
    t0 = time.perf_counter()
    pb = build("compact-tension", w, a, law, refine=args.refine)
    _ = pb.kin, pb.pattern()
    t_setup = time.perf_counter() - t0
    s_l = make_geometry("compact-tension", a, width=w, thickness=1.0).limit_stress(a, sigma_0)
    loads = s_l * np.geomspace(0.05, 1.5, args.levels)
    print(
        f"C(T) a/W = 0.5, n = 10, plane strain: {pb.n_dofs} degrees of freedom, "
        f"{len(pb.mesh.elements)} elements, setup {t_setup:.2f} s"
    )
    times = {}
    first = None
    for k, m in enumerate(methods):
        times[m], js = sequence(pb, loads, s_l, m, verbose=k == 0)
        if first is None:
            first = js
        else:
            print(f"  J differs from [{methods[0]}] by {np.max(np.abs(js / first - 1)):.1e}")
    for m in methods[1:]:
        print(f"time [{methods[0]}] / [{m}] = {times[methods[0]] / times[m]:.2f} (same run)")


if __name__ == "__main__":
    main()
