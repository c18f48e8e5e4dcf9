"""Probabilistic plan: probability of failure per inspection interval, and the largest interval
that meets the target, on one common random-number sample.

References
----------
.. [1] MIL-HDBK-1823A (2009); Berens, A. P., ASM Handbook Vol. 17 (1989) 689–701.
.. [2] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016), §5.2 (common random numbers).
"""

from __future__ import annotations

import math

import numpy as np

from cycj.plan.montecarlo import (
    McSpec,
    Runner,
    draw_chunk,
    pack_schedules,
    summarise,
    uniform_schedule,
)

#: intervals on the first search grid, and per refinement pass (two passes)
SEARCH_POINTS = 16
REFINE_POINTS = 8


def make_spec(table, inp) -> McSpec:
    """The Monte Carlo specification for validated inputs ``inp`` (PlanInputs)."""
    start = max((f.cycles for f in inp.findings), default=0.0)
    counts = [inp.max_inspections]
    counts += [uniform_schedule(i, inp.design_life, start).size for i in inp.intervals]
    if inp.schedule:
        counts.append(len(inp.schedule))
    return McSpec(
        table,
        inp.scatter,
        inp.pod,
        inp.design_life,
        inp.samples,
        inp.seed,
        inp.repair,
        max(max(counts), 1),
        inp.chunk_size,
        tuple(inp.findings),
    )


def _evaluate(runner, spec, schedules):
    arr, n = pack_schedules(schedules, spec.n_max)
    return summarise(runner.run(spec, arr, n))


def _first_failing(pof, target):
    """Index of the first entry above the target (len if none)."""
    bad = np.nonzero(np.asarray(pof) > target)[0]
    return int(bad[0]) if bad.size else len(pof)


def probabilistic_plan(table, inp, scheduler=None) -> dict:
    """Probability of failure with no inspection, per what-if interval and for the fixed
    schedule, and the largest uniform interval with probability of failure ≤ ``target_pof``.

    The search evaluates a geometric grid of intervals from design life / max_inspections to
    the design life and refines twice inside the bracket, every pass on the same samples
    (same seed), keeping the largest interval below which every evaluated interval meets the
    target.

    Returns
    -------
    dict with ``no_inspection``, ``what_if`` (list), ``schedule`` (or None), ``search``
    (list of interval, pof, std_error), ``recommended_interval_cycles``,
    ``inspection_needed``, ``cumulative`` (cycles and curves), ``effective_samples``.
    """
    spec = make_spec(table, inp)
    start, life = spec.start, inp.design_life
    sched = lambda i: uniform_schedule(i, life, start)  # noqa: E731
    grid = np.geomspace(life / inp.max_inspections, life, SEARCH_POINTS)
    fixed = [] if not inp.schedule else [np.array([t for t in inp.schedule if t > start])]
    with Runner(scheduler) as runner:
        first = [np.empty(0)] + [sched(i) for i in inp.intervals] + fixed + [sched(i) for i in grid]
        r1 = _evaluate(runner, spec, first)
        nw = len(inp.intervals)
        g0 = 1 + nw + len(fixed)
        search_i, search_p, search_se = list(grid), list(r1["pof"][g0:]), list(r1["std_error"][g0:])
        p_none = float(r1["pof"][0])
        inspection_needed = p_none > inp.target_pof
        recommended = life if not inspection_needed else None
        if inspection_needed:
            k = _first_failing(search_p, inp.target_pof)
            if k > 0:
                lo, hi = grid[k - 1], grid[k] if k < len(grid) else None
                recommended = lo
                for _ in range(2):
                    if hi is None:
                        break
                    pts = np.geomspace(lo, hi, REFINE_POINTS + 2)[1:-1]
                    rr = _evaluate(runner, spec, [sched(i) for i in pts])
                    search_i += list(pts)
                    search_p += list(rr["pof"])
                    search_se += list(rr["std_error"])
                    j = _first_failing(rr["pof"], inp.target_pof)
                    if j > 0:
                        lo = pts[j - 1]
                    if j < len(pts):
                        hi = pts[j]
                    recommended = lo
    what_if = []
    for j, itv in enumerate(inp.intervals):
        s = 1 + j
        n_insp = sched(itv).size
        per = r1["per_interval"][s][: n_insp + 1]
        surv = 1.0 - np.concatenate([[0.0], np.cumsum(per)[:-1]])
        what_if.append(
            {
                "interval_cycles": float(itv),
                "pof": float(r1["pof"][s]),
                "std_error": float(r1["std_error"][s]),
                "detections_mean": float(r1["detections_mean"][s]),
                "inspections": int(n_insp),
                "pof_per_interval": per.tolist(),
                "hazard_per_interval": np.divide(
                    per, surv, out=np.zeros_like(per), where=surv > 0
                ).tolist(),
            }
        )
    out_sched = None
    if fixed:
        s = 1 + nw
        out_sched = {
            "cycles": fixed[0].tolist(),
            "pof": float(r1["pof"][s]),
            "std_error": float(r1["std_error"][s]),
            "detections_mean": float(r1["detections_mean"][s]),
            "pof_per_interval": r1["per_interval"][s][: fixed[0].size + 1].tolist(),
        }
    order = np.argsort(search_i)
    edges = np.linspace(start, life, spec.n_bins + 1)[1:]
    cum = {"cycles": edges.tolist(), "no_inspection": r1["cumulative"][0].tolist()}
    for j, itv in enumerate(inp.intervals):
        cum[f"interval_{itv:g}"] = r1["cumulative"][1 + j].tolist()
    if fixed:
        cum["schedule"] = r1["cumulative"][1 + nw].tolist()
    return {
        "no_inspection": {"pof": p_none, "std_error": float(r1["std_error"][0])},
        "what_if": what_if,
        "schedule": out_sched,
        "search": [
            {
                "interval_cycles": float(search_i[i]),
                "pof": float(search_p[i]),
                "std_error": float(search_se[i]),
            }
            for i in order
        ],
        "recommended_interval_cycles": None if recommended is None else float(recommended),
        "inspection_needed": bool(inspection_needed),
        "cumulative": cum,
        "effective_samples": float(r1["effective_samples"]),
        "start_cycles": start,
        "chunks": spec.n_chunks,
        "chunk_size": spec.chunk_size,
    }


def envelope(
    table, inp, n_samples: int = 2000, n_points: int = 80, quantiles=(0.05, 0.5, 0.95)
) -> dict:
    """Crack size quantiles vs cycles with no inspection, from the first samples of the first
    chunk (a failed sample stays at its critical size).  Weighted by findings if any."""
    spec = make_spec(table, inp)
    dr = draw_chunk(spec, 0, spec.seeds()[0])
    m = min(n_samples, dr["la0"].size)
    dr = {k: v[:m] for k, v in dr.items()}
    weights = np.ones(m)
    la_start = dr["la0"]
    if spec.findings:
        from cycj.plan.findings import apply_findings

        weights, la_start = apply_findings(dr, table, spec.findings)
    t = np.linspace(0.0, inp.design_life - spec.start, n_points)
    phi0 = table.phi(la_start, dr["k"], dr["w"])
    out = {"cycles": (spec.start + t).tolist()}
    sizes = np.empty((n_points, m))
    for i, ti in enumerate(t):
        phi = np.minimum(phi0 + dr["xc"] * ti, dr["phic"])
        sizes[i] = np.exp(np.minimum(table.log_size(phi, dr["k"], dr["w"]), dr["lac"]))
    for q in quantiles:
        out[f"a_p{round(q * 100):02d}_mm"] = [_wquantile(row, weights, q) for row in sizes]
    return out


def _wquantile(x, w, q):
    if w.sum() <= 0:
        return math.nan
    o = np.argsort(x)
    c = np.cumsum(w[o])
    return float(x[o][min(np.searchsorted(c, q * c[-1]), x.size - 1)])
