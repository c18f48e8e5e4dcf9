"""Probabilistic plan: probability of failure per inspection interval, and the largest interval
that meets the target, on one common random-number sample, resolved to a stated precision
(:mod:`cycj.plan.search`); importance sampling around the FORM design point for small targets
(:mod:`cycj.plan.reliability`), cross-checked on the no-inspection probability by subset
simulation (:mod:`cycj.plan.subset`).

References
----------
.. [1] MIL-HDBK-1823A (2009); Berens, A. P., ASM Handbook Vol. 17 (1989) 689–701.
.. [2] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016), §5.2 (common random numbers).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from cycj.plan.montecarlo import McSpec, Runner, draw_chunk, summarise, take, uniform_schedule
from cycj.plan.search import isotonic

#: target probabilities of failure below this use importance sampling when ``method`` is auto
IS_BELOW = 1e-3


def choose_method(inp) -> str:
    """``monte-carlo`` or ``importance-sampling`` (auto: the latter for a target below
    :data:`IS_BELOW` when some input scatters and there are no findings to weight by)."""
    m = getattr(inp, "method", "auto")
    if m != "auto":
        return m
    if inp.target_pof < IS_BELOW and not inp.findings and inp.scatter.scattering.any():
        return "importance-sampling"
    return "monte-carlo"


def make_spec(table, inp, shift=None, samples=None, period_edges=()) -> McSpec:
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
        inp.samples if samples is None else samples,
        inp.seed,
        inp.repair,
        max(max(counts), 1),
        inp.chunk_size,
        tuple(inp.findings),
        shift=None if shift is None else tuple(float(v) for v in shift),
        period_edges=tuple(period_edges),
    )


def period_edges(horizon: float, cycles_per_period: float | None, most: int = 400):
    """Period ends [cycles from the start] for per-period probabilities of failure."""
    if not cycles_per_period or not cycles_per_period > 0:
        return ()
    n = math.ceil(horizon / cycles_per_period - 1e-9)
    if n > most:
        return ()
    return tuple(min(cycles_per_period * (i + 1), horizon) for i in range(n))


def _entry(itv, r, i, mono=None, z=1.96):
    p, se = float(r["pof"][i]), float(r["std_error"][i])
    out = {
        "interval_cycles": float(itv),
        "pof": float(p if mono is None else mono[i]),
        "std_error": se,
        "pof_estimate": p,
        "pof_ci": [max(p - z * se, 0.0), p + z * se],
        "samples": int(r["samples"]),
        "failures": int(r["failures"][i]),
    }
    return out


def probabilistic_plan(table, inp, scheduler=None, workers=None, periods=None) -> dict:
    """Probability of failure with no inspection, per what-if interval and for the fixed
    schedule, and the largest uniform interval with probability of failure ≤ ``target_pof``,
    resolved to ``pof_tolerance`` (see :mod:`cycj.plan.search`).

    Parameters
    ----------
    table : CurveTable
    inp : PlanInputs
    scheduler : str or distributed.Client, optional
    workers : int, optional
        Threads for in-process chunks (default all cores); the result does not depend on it.
    periods : float, optional
        Cycles per reporting period (a year or a block) for ``per_period``.

    Returns
    -------
    dict with ``no_inspection``, ``what_if`` (list), ``schedule`` (or None), ``search``
    (list of interval, pof (monotone), std_error, pof_estimate, pof_ci, samples),
    ``recommended_interval_cycles``, ``recommendation`` (its PoF, CI, samples, convergence),
    ``inspection_needed``, ``cumulative``, ``per_period``, ``effective_samples``, ``method``,
    ``form``.
    """
    from scipy.special import ndtri

    from cycj.plan.reliability import form
    from cycj.plan.search import FINE_POINTS, SEARCH_POINTS, Search, crossing

    start, life = max((f.cycles for f in inp.findings), default=0.0), inp.design_life
    horizon = life - start
    method = choose_method(inp)
    z = float(ndtri(0.5 + getattr(inp, "confidence", 0.95) / 2))
    tol = getattr(inp, "pof_tolerance", 0.2)
    budget = max(getattr(inp, "max_samples", inp.samples) or inp.samples, inp.samples)
    fr = form(table, inp.scatter, horizon) if not inp.findings else None
    shift = None
    if method == "importance-sampling":
        if fr is None or not fr.get("available"):
            method = "monte-carlo"
        else:
            shift = fr["design_point"]
    pedges = period_edges(horizon, periods)
    spec = make_spec(table, inp, shift, budget, pedges)
    importance = shift is not None
    sched = lambda i: uniform_schedule(i, life, start)  # noqa: E731
    grid = np.geomspace(life / inp.max_inspections, life, SEARCH_POINTS)
    ratio = (life / (life / inp.max_inspections)) ** (1 / (SEARCH_POINTS - 1))
    fixed = [] if not inp.schedule else [np.array([t for t in inp.schedule if t > start])]
    nw = len(inp.intervals)
    g0 = 1 + nw + len(fixed)
    base = [np.empty(0)] + [sched(i) for i in inp.intervals] + fixed + [sched(i) for i in grid]
    ce = None
    if importance and (inp.intervals or inp.target_pof < fr["pof"]):
        from cycj.plan.cross_entropy import ce_centre

        ce = ce_centre(spec, grid, sched, inp.target_pof)
        spec = replace(spec, shift=tuple(ce["shift"]))
    with Runner(scheduler, workers) as runner:
        srch = Search(runner, spec, base, grid, slice(g0, None), sched, importance)
        srch.first(math.ceil(inp.samples / spec.chunk_size))
        c = srch.coarse()
        p_none0 = float(summarise(take(srch.base_total, [0]), importance)["pof"][0])
        inspection_needed = p_none0 > inp.target_pof
        if inspection_needed:
            srch.set_fine(crossing(grid, c["mono"], inp.target_pof), ratio)
        else:
            srch.set_points([life])
        conv = srch.converge(inp.target_pof, tol, z, ratio)
    r1 = summarise(srch.base_total, importance)
    fine, fr_res, j = srch.fine, conv["result"], conv["index"]
    p_none = float(r1["pof"][0])
    subset = _subset_check(table, inp, horizon, p_none, r1["std_error"][0]) if importance else None
    recommended = None if j < 0 else float(fine[j])
    if not inspection_needed:  # the converged no-inspection estimate decides
        inspection_needed = p_none > inp.target_pof
        recommended = None if inspection_needed else life
    what_if = []
    for k, itv in enumerate(inp.intervals):
        s = 1 + k
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
    # the curve shown: coarse points outside the fine grid and the fine grid, made monotone
    cg = summarise(take(srch.base_total, slice(g0, None)), importance)
    rows = [(float(grid[i]), cg, i) for i in range(len(grid)) if not fine[0] <= grid[i] <= fine[-1]]
    rows += [(float(fine[i]), fr_res, i) for i in range(len(fine))]
    rows.sort(key=lambda t: t[0])
    mono = isotonic([r["pof"][i] for _, r, i in rows], [r["samples"] for _, r, i in rows])
    search = [
        _entry(t, r, i, z=z) | {"pof": float(m)} for (t, r, i), m in zip(rows, mono, strict=True)
    ]
    jj = max(j, 0)
    rec = _entry(fine[jj], fr_res, jj, fr_res["mono"], z) | {
        "interval_cycles": recommended,
        "converged": conv["converged"],
        "half_width": float(conv["half_width"]),
        "half_width_limit": tol * inp.target_pof,
        "confidence": getattr(inp, "confidence", 0.95),
        "budget_samples": int(budget),
        "budget_reached": bool(not conv["converged"] and srch.done >= spec.n_chunks),
        "method": method,
    }
    edges = np.linspace(start, life, spec.n_bins + 1)[1:]
    cum = {"cycles": edges.tolist(), "no_inspection": r1["cumulative"][0].tolist()}
    for k, itv in enumerate(inp.intervals):
        cum[f"interval_{itv:g}"] = r1["cumulative"][1 + k].tolist()
    if fixed:
        cum["schedule"] = r1["cumulative"][1 + nw].tolist()
    if inspection_needed and j >= 0:
        cum["recommended"] = fr_res["cumulative"][j].tolist()
    per_period = None
    if pedges:
        per_period = {
            "end_cycles": [start + e for e in pedges],
            "no_inspection": r1["per_period"][0].tolist(),
        }
        if inspection_needed and j >= 0:
            per_period["recommended"] = fr_res["per_period"][j].tolist()
    return {
        "no_inspection": {"pof": p_none, "std_error": float(r1["std_error"][0])},
        "what_if": what_if,
        "schedule": out_sched,
        "search": search,
        "recommended_interval_cycles": recommended,
        "recommendation": rec,
        "inspection_needed": bool(inspection_needed),
        "cumulative": cum,
        "per_period": per_period,
        "effective_samples": float(r1["effective_samples"]),
        "samples_used": int(r1["samples"]),
        "start_cycles": start,
        "chunks": srch.done,
        "chunk_size": spec.chunk_size,
        "method": method,
        "form": fr,
        "subset": subset,
        "importance_centre": None if spec.shift is None else list(spec.shift),
        "cross_entropy": ce,
        "fine_points": FINE_POINTS,
    }


def pof_without_inspection(table, inp, scheduler=None, workers=None) -> dict:
    """Probability of failure over the design life without inspection, by the method
    :func:`choose_method` picks, with samples added until its confidence half-width is at most
    ``pof_tolerance`` × ``target_pof`` (or ``max_samples`` is reached), and FORM beside it.

    Returns
    -------
    dict with ``pof``, ``std_error``, ``pof_ci``, ``samples``, ``failures``, ``converged``,
    ``method``, ``form`` and ``life_evaluations`` (samples plus the FORM evaluations).
    """
    from scipy.special import ndtri

    from cycj.plan.reliability import form
    from cycj.plan.search import Search

    method = choose_method(inp)
    start = max((f.cycles for f in inp.findings), default=0.0)
    fr = form(table, inp.scatter, inp.design_life - start) if not inp.findings else None
    usable = bool(fr and fr.get("available"))
    shift = fr["design_point"] if method == "importance-sampling" and usable else None
    budget = max(inp.max_samples, inp.samples)
    spec = make_spec(table, inp, shift, budget)
    z = float(ndtri(0.5 + inp.confidence / 2))
    life = inp.design_life
    with Runner(scheduler, workers) as runner:
        srch = Search(
            runner,
            spec,
            [np.empty(0)],
            [life],
            slice(0, 1),
            lambda t: np.empty(0),
            shift is not None,
        )
        srch.first(math.ceil(inp.samples / spec.chunk_size))
        srch.set_points([life])
        conv = srch.converge(inp.target_pof, inp.pof_tolerance, z, 2.0)
    r = conv["result"]
    p, se = float(r["pof"][0]), float(r["std_error"][0])
    evals = int(r["samples"]) + (fr["evaluations"] if fr and fr.get("available") else 0)
    horizon = inp.design_life - start
    subset = _subset_check(table, inp, horizon, p, se) if shift is not None else None
    return {
        "pof": p,
        "std_error": se,
        "pof_ci": [max(p - z * se, 0.0), p + z * se],
        "samples": int(r["samples"]),
        "failures": int(r["failures"][0]),
        "converged": conv["converged"],
        "method": "importance-sampling" if shift is not None else "monte-carlo",
        "form": fr,
        "subset": subset,
        "life_evaluations": evals,
    }


def _subset_check(table, inp, horizon, pof, std_error) -> dict:
    """Subset simulation of the no-inspection probability beside the sampling estimate, with
    ``agrees`` (within 3 combined standard errors)."""
    from cycj.plan.subset import cross_check, subset_pof

    sus = subset_pof(table, inp.scatter, horizon, inp.seed)
    return cross_check({"pof": float(pof), "std_error": float(std_error)}, sus)


def envelope(
    table, inp, n_samples: int = 2000, n_points: int = 80, quantiles=(0.05, 0.5, 0.95)
) -> dict:
    """Crack size quantiles vs cycles with no inspection, from the first samples of the first
    chunk (a failed sample stays at its critical size).  Weighted by findings if any."""
    spec = make_spec(table, inp)
    dr = draw_chunk(spec, 0, spec.chunk_seed(0))
    m = min(n_samples, dr["la0"].size)
    dr = {k: v[:m] for k, v in dr.items() if v is not None and np.ndim(v) == 1}
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
