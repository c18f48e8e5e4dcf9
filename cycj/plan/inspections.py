"""Inspection planning: deterministic interval and Monte Carlo probability of failure.

Python API
----------
``plan_inspections(case, scheduler=None)`` → :class:`PlanResult` with ``.summary`` (the
``plan.json`` dict), ``.what_if`` (DataFrame) and the data behind the plots.

Modules: :mod:`~cycj.plan.pod` (POD curves), :mod:`~cycj.plan.pod_fit` (POD from data),
:mod:`~cycj.plan.scatter` (distributions), :mod:`~cycj.plan.curves` (growth-curve tables),
:mod:`~cycj.plan.simulation_kernels` and :mod:`~cycj.plan.montecarlo` (simulation),
:mod:`~cycj.plan.findings` (Bayes update), :mod:`~cycj.plan.deterministic`,
:mod:`~cycj.plan.probabilistic`, :mod:`~cycj.plan.inputs` (``[inspection]`` keys),
:mod:`~cycj.plan.engine` (link to :mod:`cycj.life`).

Estimates for engineering judgement; they do not replace the applicable design code,
fitness-for-service standard or a qualified engineer's review.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from cycj.errors import CycjInputError


@dataclass
class PlanResult:
    """Result of :func:`plan_inspections`: ``summary`` (plan.json), ``what_if`` (DataFrame),
    ``curves`` (data for plots) and ``inputs`` (validated [inspection])."""

    summary: dict
    what_if: object
    curves: dict = field(default_factory=dict)
    inputs: object = None


def plan_inspections(case, scheduler=None) -> PlanResult:
    """Deterministic and probabilistic inspection plan for a case with ``[inspection]``.

    Parameters
    ----------
    case : cycj.case.Case
    scheduler : str or distributed.Client, optional
        Dask scheduler address (``tcp://host:port``) or client; chunks of samples then run
        on the cluster (same seed → same result as in-process).

    Returns
    -------
    PlanResult
    """
    import pandas as pd

    from cycj.plan import engine
    from cycj.plan.curves import build_table, factor_grid
    from cycj.plan.deterministic import deterministic_interval
    from cycj.plan.inputs import read_inspection
    from cycj.plan.probabilistic import envelope, probabilistic_plan

    inp = read_inspection(case)
    warnings = []
    if case.loading.sequence != "none":
        warnings.append(
            f"sequence model '{case.loading.sequence}': sample lives are scaled "
            "as 1/C from curves at the case's C, which is approximate with "
            "retardation"
        )
    if case.growth.toughness_exponent > 0 and inp.scatter.toughness.scatters:
        warnings.append(
            "toughness_exponent > 0: growth curves are computed at the largest "
            "toughness sampled, so the acceleration near J_c is understated"
        )
    a_crit, criterion = engine.critical_size(case)
    cpb, hpc = engine.rates(case)
    if inp.detectable_size >= a_crit:
        warnings.append(
            f"the detectable size {inp.detectable_size:.4g} mm is not below the "
            f"critical size {a_crit:.4g} mm: no deterministic interval"
        )
        a_det_c, n_det_c = [inp.detectable_size], [0.0]
    else:
        a_det_c, n_det_c, _ = engine.deterministic_curve(case, inp.detectable_size)
    det = deterministic_interval(
        a_det_c, n_det_c, inp.detectable_size, a_crit, inp.safety_factor, inp.design_life, cpb, hpc
    )
    det["critical_criterion"] = criterion
    det["detectable_size_source"] = inp.detectable_source

    sc = inp.scatter
    loads = factor_grid(sc.load_scale, 7)
    tough = factor_grid(sc.toughness, 9)
    a_min = sc.initial_crack.quantile(1e-7)
    growth, critical = engine.curve_functions(case, float(tough.max()), warnings)
    try:
        table = build_table(growth, critical, a_min, loads, tough)
    except ValueError as exc:
        raise CycjInputError(
            f"{exc}: the smallest initial crack is already critical or "
            "does not grow under these loads, so there is nothing to plan",
            source=str(case.path),
            key="inspection.scatter.initial_crack",
            found=f"{a_min:.4g} mm",
        ) from None
    prob = probabilistic_plan(table, inp, scheduler)
    if prob["recommended_interval_cycles"] is None:
        warnings.append(
            f"no interval down to design life / {inp.max_inspections} meets "
            f"target_pof = {inp.target_pof:g}; raise max_inspections or improve "
            "the inspection"
        )
    for w in prob["what_if"]:
        if w["pof"] > 0 and w["std_error"] > 0.3 * w["pof"]:
            warnings.append(
                f"interval {w['interval_cycles']:g}: Monte Carlo error above 30 % "
                "of the probability of failure; raise samples"
            )
            break
    env = envelope(table, inp)
    summary = {
        "title": case.title,
        "deterministic": det,
        "no_inspection": prob["no_inspection"],
        "what_if": prob["what_if"],
        "recommended_interval_cycles": prob["recommended_interval_cycles"],
        "inspection_needed": prob["inspection_needed"],
        "target_pof": inp.target_pof,
        "design_life_cycles": inp.design_life,
        "schedule": prob["schedule"],
        "search": prob["search"],
        "cumulative_pof": prob["cumulative"],
        "pod": inp.pod.as_dict(),
        "repair": inp.repair,
        "samples": inp.samples,
        "seed": inp.seed,
        "chunk_size": prob["chunk_size"],
        "effective_samples": prob["effective_samples"],
        "findings": [
            {
                "cycles": f.cycles,
                "result": "found" if f.found else "not-found",
                "size_mm": f.size_mm,
                "sizing_sd_mm": f.sizing_sd_mm,
            }
            for f in inp.findings
        ],
        "replanned_from_cycles": prob["start_cycles"],
        "scatter": {
            k: {"distribution": d.kind, "p1": d.p1, "p2": d.p2} for k, d in vars(sc).items()
        },
        "curve_table": {
            "load_factors": loads.tolist(),
            "toughness_factors": tough.tolist(),
            "a_min_mm": a_min,
        },
        "cycles_per_block": cpb,
        "hours_per_cycle": hpc,
        "warnings": warnings,
        "references": _plan_references(inp) + engine.references(case),
    }
    what_if = pd.DataFrame(
        [
            {
                k: w[k]
                for k in ("interval_cycles", "pof", "std_error", "detections_mean", "inspections")
            }
            for w in prob["what_if"]
        ]
    )
    curves = {
        "deterministic": {"a_mm": list(map(float, a_det_c)), "cycles": list(map(float, n_det_c))},
        "envelope": env,
    }
    return PlanResult(summary, what_if, curves, inp)


__all__ = ["PlanResult", "plan_inspections"]


def _plan_references(inp) -> list[str]:
    """References of the planning models used: the POD model, life scaling with C and the
    Monte Carlo (from their records)."""
    from cycj.citations import Citations

    cited = Citations()
    cited.choose("pod", inp.pod.model)
    cited.cite("life-scaling")
    cited.cite("monte-carlo")
    return cited.references
