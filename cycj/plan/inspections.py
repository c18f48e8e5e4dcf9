"""Inspection planning: deterministic interval and Monte Carlo probability of failure.

Python API
----------
``plan_inspections(case, scheduler=None)`` → :class:`PlanResult` with ``.summary`` (the
``plan.json`` dict), ``.what_if`` (DataFrame) and the data behind the plots.

Modules: :mod:`~cycj.plan.pod` (POD curves), :mod:`~cycj.plan.pod_fit` (POD from data),
:mod:`~cycj.plan.scatter` (distributions), :mod:`~cycj.plan.curves` (growth-curve tables),
:mod:`~cycj.plan.simulation_kernels` and :mod:`~cycj.plan.montecarlo` (simulation),
:mod:`~cycj.plan.findings` (Bayes update), :mod:`~cycj.plan.deterministic`,
:mod:`~cycj.plan.probabilistic`, :mod:`~cycj.plan.search` (converged interval search),
:mod:`~cycj.plan.reliability` (FORM), :mod:`~cycj.plan.cross_entropy` (importance-sampling
centre), :mod:`~cycj.plan.inputs` (``[inspection]`` keys),
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


#: hours in a year of continuous operation (365.25 days, common practice)
HOURS_PER_YEAR = 8766.0


def plan_inspections(case, scheduler=None, workers=None) -> PlanResult:
    """Deterministic and probabilistic inspection plan for a case with ``[inspection]``.

    Parameters
    ----------
    case : cycj.case.Case
    scheduler : str or distributed.Client, optional
        Dask scheduler address (``tcp://host:port``) or client; chunks of samples then run
        on the cluster (same seed → same result as in-process).
    workers : int, optional
        Threads for in-process chunks (default all cores; same result for any number).

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
        a_det_c, n_det_c, det_run = engine.deterministic_curve(case, inp.detectable_size)
        # the growth law's valid_dJ (from cycj fit): the run's one warning, with its range
        # and share of cycles outside it
        warnings += [w for w in det_run.get("warnings", []) if "valid_dJ" in w]
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
    per_cycles, per_unit = _period(inp, cpb, hpc)
    prob = probabilistic_plan(table, inp, scheduler, workers, per_cycles)
    rec = prob["recommendation"]
    if rec["budget_reached"]:
        warnings.append(
            f"sample budget reached ({prob['samples_used']} samples, max_samples = "
            f"{inp.max_samples}): the probability of failure at the recommended interval is "
            f"± {rec['half_width']:.2g}, above the aim of ± {rec['half_width_limit']:.2g} "
            f"({inp.pof_tolerance:g} × target); raise max_samples"
        )
    if rec["failures"] < 10 and prob["inspection_needed"]:
        warnings.append(
            f"only {rec['failures']} failing samples at the recommended interval: the "
            f"target {inp.target_pof:g} is not resolved by these samples"
        )
    sus = prob.get("subset")
    if sus and sus.get("available") and not sus["agrees"]:
        warnings.append(
            f"subset simulation gives {sus['pof']:.3g} ± {sus['std_error']:.2g} for the "
            f"probability of failure without inspection, importance sampling "
            f"{sus['compared_with']:.3g}: the two methods disagree (beyond 3 standard errors)"
        )
    form = prob["form"]
    if form and form.get("available") and not form.get("converged"):
        warnings.append("the FORM design point did not converge: its estimate is unreliable")
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
        "recommended_interval_hours": _times(prob["recommended_interval_cycles"], hpc),
        "recommended_interval_years": _times(prob["recommended_interval_cycles"], hpc, inp),
        "recommendation": _with_times(rec, hpc, inp),
        "method": prob["method"],
        "form": form,
        "subset": sus,
        "importance_centre": prob["importance_centre"],
        "cross_entropy": prob["cross_entropy"],
        "samples_used": prob["samples_used"],
        "max_samples": inp.max_samples,
        "pof_per_period": _per_period_rows(prob, per_unit, per_cycles, hpc, inp),
        "period": per_unit,
        "hours_per_year": inp.hours_per_year,
        "inspection_needed": prob["inspection_needed"],
        "target_pof": inp.target_pof,
        "design_life_cycles": inp.design_life,
        "design_life_hours": _times(inp.design_life, hpc),
        "design_life_years": _times(inp.design_life, hpc, inp),
        "schedule": prob["schedule"],
        "search": prob["search"],
        "cumulative_pof": prob["cumulative"],
        "pod": inp.pod.as_dict(),
        "repair": inp.repair,
        "samples": inp.samples,
        "seed": inp.seed,
        "chunk_size": prob["chunk_size"],
        "chunks": prob["chunks"],
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
        "references": _plan_references(inp, prob["method"], bool(form and form.get("available")))
        + engine.references(case),
    }
    for w in summary["what_if"]:
        w["interval_hours"] = _times(w["interval_cycles"], hpc)
        w["interval_years"] = _times(w["interval_cycles"], hpc, inp)
    if hpc:
        det["life_years"] = _times(det.get("life_cycles"), hpc, inp)
        det["interval_years"] = _times(det.get("interval_cycles"), hpc, inp)
    keys = ("interval_cycles", "pof", "std_error", "detections_mean", "inspections")
    keys += ("interval_hours", "interval_years") if hpc else ()
    what_if = pd.DataFrame([{k: w[k] for k in keys} for w in summary["what_if"]])
    curves = {
        "deterministic": {"a_mm": list(map(float, a_det_c)), "cycles": list(map(float, n_det_c))},
        "envelope": env,
    }
    return PlanResult(summary, what_if, curves, inp)


__all__ = ["PlanResult", "plan_inspections"]


def _plan_references(inp, method="monte-carlo", with_form=False, with_ce=False) -> list[str]:
    """References of the planning models and methods used: the POD model, life scaling with C,
    the Monte Carlo with common random numbers and the monotone fit, importance sampling and
    FORM when used (from their records)."""
    from cycj.citations import Citations

    cited = Citations()
    cited.choose("pod", inp.pod.model)
    cited.cite("life-scaling")
    cited.cite("monte-carlo")
    cited.cite("common-random-numbers")
    cited.cite("isotonic-regression")
    if method == "importance-sampling":
        cited.cite("importance-sampling")
    if with_ce:
        cited.cite("cross-entropy")
    if with_form:
        cited.cite("form")
    if method == "importance-sampling":
        cited.cite("subset-simulation")
    return cited.references


#: reporting periods [hours]: the largest giving at least MIN_PERIODS over the design life
PERIODS = (("year", None), ("month", None), ("week", 168.0), ("day", 24.0), ("hour", 1.0))
MIN_PERIODS = 10


def _period(inp, cpb, hpc):
    """Cycles per reporting period and its name: a year (``hours_per_year``), or a month
    (a twelfth of it), week, day or hour when the design life is shorter than ten years;
    a block of the history when the hours per cycle are unknown."""
    if hpc:
        life_h = inp.design_life * hpc
        for name, hours in PERIODS:
            h = hours or (inp.hours_per_year if name == "year" else inp.hours_per_year / 12)
            if life_h / h >= MIN_PERIODS or name == "hour":
                return h / hpc, name
    if cpb:
        return float(cpb), "block"
    return None, None


def _times(cycles, hpc, inp=None):
    """Cycles → hours (or years with ``inp``: its hours_per_year); None when unknown."""
    if cycles is None or not hpc:
        return None
    hours = float(cycles) * hpc
    return hours if inp is None else hours / inp.hours_per_year


def _with_times(rec: dict, hpc, inp) -> dict:
    out = dict(rec)
    out["interval_hours"] = _times(rec["interval_cycles"], hpc)
    out["interval_years"] = _times(rec["interval_cycles"], hpc, inp)
    return out


def _per_period_rows(prob, unit, per_cycles, hpc, inp):
    """Rows per period: its end (cycles, hours, years), the probability of failure in it and
    cumulative, without inspection and at the recommended interval."""
    pp = prob["per_period"]
    if not pp:
        return []
    rows, cum = [], {}
    for i, end in enumerate(pp["end_cycles"]):
        row = {
            "period": i + 1,
            "unit": unit,
            "end_cycles": end,
            "end_hours": _times(end, hpc),
            "end_years": _times(end, hpc, inp),
        }
        for name in ("no_inspection", "recommended"):
            if name in pp:
                cum[name] = cum.get(name, 0.0) + pp[name][i]
                row[f"pof_in_period_{name}"] = pp[name][i]
                row[f"cumulative_pof_{name}"] = cum[name]
        rows.append(row)
    return rows
