"""Writing an inspection plan (plan.json, what_if.csv, schedule.csv, plots, report.html) and a
POD fit (pod.json, pod.toml, pod.png, report.html)."""

from __future__ import annotations

from pathlib import Path

from cycj.display import count, hours, num, text, units, using


def answer_sentence(s: dict) -> str:
    """One sentence: the deterministic interval and the recommended probabilistic one."""
    u = units()
    d = s["deterministic"]
    parts = [
        f"Inspect every {count(d['interval_cycles'])} cycles by the deterministic rule "
        f"(life {count(d['life_cycles'])} cycles from {u.q(d['detectable_size_mm'], 'length', 3)}"
        f" to {u.q(d['critical_crack_length_mm'], 'length', 3)} ÷ {num(d['safety_factor'])})"
    ]
    rec = s["recommended_interval_cycles"]
    if not s["inspection_needed"]:
        parts.append(
            f"; without inspection the probability of failure "
            f"{num(s['no_inspection']['pof'], 3)} already meets the target "
            f"{num(s['target_pof'], 3)}."
        )
    elif rec is None:
        parts.append(
            "; no interval searched meets the target probability of failure "
            f"{num(s['target_pof'], 3)}."
        )
    else:
        r = s.get("recommendation") or {}
        when = f"{count(rec)} cycles"
        if s.get("recommended_interval_hours") is not None:
            when += f" ({hours(s['recommended_interval_hours'])})"
        parts.append(
            f"; to keep the probability of failure over {count(s['design_life_cycles'])} "
            f"cycles within {num(s['target_pof'], 3)}, inspect at most every {when} "
            f"(no inspection: {num(s['no_inspection']['pof'], 3)})"
        )
        if r:
            lo, hi = r["pof_ci"]
            parts.append(
                f"; there the probability of failure is {num(r['pof_estimate'], 3)} "
                f"({round(100 * r['confidence'])} % interval {num(lo, 3)} to {num(hi, 3)}, "
                f"{count(r['samples'])} samples, {r['method']})"
            )
            if r.get("budget_reached"):
                parts.append(
                    f" — the sample budget ({count(r['budget_samples'])}) was reached before "
                    f"the interval narrowed to ± {num(r['half_width_limit'], 2)}"
                )
        parts.append(".")
    return "".join(parts)


def dist_words(dist) -> str:
    """A scatter distribution as an engineer states it: median, σ (of ln x or of x) and the
    coefficient of variation CoV."""
    import math

    if not dist.scatters:
        return "fixed (no scatter)"
    if dist.kind == "lognormal":
        sigma = dist.p2
        cov = math.sqrt(math.expm1(sigma * sigma))
        return (
            f"lognormal: median factor {num(dist.median)}, σ of ln x = {num(sigma, 3)}, "
            f"CoV = {num(100 * cov, 3)} %"
        )
    if dist.kind == "weibull":
        k = dist.p1
        g1, g2 = math.gamma(1 + 1 / k), math.gamma(1 + 2 / k)
        cov = math.sqrt(max(g2 / (g1 * g1) - 1.0, 0.0))
        return (
            f"Weibull: shape k = {num(k, 3)}, median factor {num(dist.median)}, "
            f"CoV = {num(100 * cov, 3)} %"
        )
    if dist.kind == "normal":
        cov = dist.p2 / dist.p1 if dist.p1 else float("nan")
        return (
            f"normal: mean factor {num(dist.p1)}, σ = {num(dist.p2, 3)}, "
            f"CoV = {num(100 * cov, 3)} %"
        )
    return f"{dist.kind} ({num(dist.p1)}, {num(dist.p2)})"


def pod_words(pod) -> str:
    """The POD curve in words: model, a50, spread, ceiling, a90/95."""
    u = units()
    text = f"{pod.model}: a50 = {u.q(pod.a50, 'length', 3)}, a90 = {u.q(pod.a90, 'length', 3)}"
    text += f", σ = {num(pod.sigma, 3)}"
    if pod.ceiling < 1:
        text += f", ceiling {num(pod.ceiling, 3)}"
    if pod.a90_95 is not None:
        text += f", a90/95 = {u.q(pod.a90_95, 'length', 3)}"
    return text


def write_plan(result, case, out, *, force=False, plots=True, units_system=None) -> dict:
    """Write the plan's outputs atomically into ``out``; return the plan.json dict.

    ``units_system``: "SI" or "US" for the report and plots (default: the case's
    ``[report] units``, else SI)."""
    import pandas as pd

    from cycj.outputs import OutputDir, record_provenance

    summary = dict(result.summary)
    inputs = {"case": case.path, "history": case.loading.history}
    files = case.files or tuple((k, p) for k, p in inputs.items() if p)
    record_provenance(
        summary,
        inputs,
        files=files,
        method="deterministic interval and Monte Carlo",
        seed=summary.get("seed"),
    )
    system = units_system or getattr(case, "report_units", None) or "SI"
    with OutputDir(out, force=force, inputs=[p for _, p in files]) as od, using(system):
        od.write_csv("what_if.csv", result.what_if)
        sched = pd.DataFrame(summary["deterministic"]["schedule"])
        od.write_csv("schedule.csv", sched)
        if summary.get("pof_per_period"):
            od.write_csv("pof_per_period.csv", pd.DataFrame(summary["pof_per_period"]))
        figures = []
        if plots:
            from cycj.plan import plots as P

            for name, caption, fig in (
                (
                    "pof_vs_interval.png",
                    "Probability of failure over the design life vs "
                    "inspection interval (Monte Carlo, ± one standard error)",
                    P.pof_vs_interval(summary),
                ),
                (
                    "cumulative_pof.png",
                    "Cumulative probability of failure vs cycles",
                    P.cumulative_pof(summary),
                ),
                (
                    "pof_per_period.png",
                    f"Probability of failure per {summary.get('period') or 'period'} and "
                    "cumulative, without inspection and at the recommended interval",
                    P.pof_per_period(summary),
                ),
                (
                    "pod_used.png",
                    "The POD curve used"
                    + (
                        " and its lower confidence bound through a90/95"
                        + (" (the curve planned with)" if result.inputs.pod_lower_bound else "")
                        if summary["pod"].get("a90_95_mm")
                        else ""
                    ),
                    P.pod_used(summary, result.inputs.pod_lower_bound),
                ),
                (
                    "crack_envelope.png",
                    "Crack size vs cycles: sample quantiles without "
                    "inspection and the deterministic curve with its inspections",
                    P.envelope(result.curves, summary),
                ),
            ):
                figures.append((caption, od.savefig(name, fig)))
            summary["plots"] = [p.name for _, p in figures]
            _report(od, case, summary, result, figures, sched)
        od.write_json("plan.json", summary)
    return summary


def _report(od, case, s, result, figures, sched):
    from cycj.report import write_report
    from cycj.report_inputs import case_rows

    u = units()
    inp = result.inputs
    d = s["deterministic"]
    sc = inp.scatter
    inputs = case_rows(case)
    inputs += [
        (
            "detectable size",
            f"{u.q(d['detectable_size_mm'], 'length')} ({d['detectable_size_source']})",
        ),
        ("safety factor on the life", num(d["safety_factor"])),
        ("design life", f"{count(s['design_life_cycles'])} cycles"),
        ("probability of detection (POD)", pod_words(inp.pod)),
        ("after a detection", text(s["repair"])),
        ("Monte Carlo samples, seed", f"{count(s['samples'])}, {text(s['seed'])}"),
        (
            "samples used (budget)",
            f"{count(s.get('samples_used'))} ({count(s.get('max_samples'))})",
        ),
        ("sampling method", text(s.get("method"))),
        ("target probability of failure", num(s["target_pof"], 3)),
    ]
    names = {
        "growth_C": "scatter of the growth constant C",
        "initial_crack": "scatter of the initial crack size",
        "toughness": "scatter of the toughness",
        "load_scale": "scatter of the loads",
    }
    for name, words in names.items():
        inputs.append((words, dist_words(getattr(sc, name))))
    for f in s["findings"]:
        inputs.append(
            (
                "finding",
                f"{f['result']} at {count(f['cycles'])} cycles"
                + (
                    f", {u.q(f['size_mm'], 'length', 3)} ± {u.q(f['sizing_sd_mm'], 'length', 3)}"
                    if f["size_mm"]
                    else ""
                ),
            )
        )
    import pandas as pd

    wi = result.what_if
    tables = [("What-if intervals", wi), ("Deterministic inspection schedule", sched)]
    r = s.get("recommendation")
    if r and r.get("interval_cycles") is not None:
        row = {
            k: r.get(k)
            for k in ("interval_cycles", "interval_hours", "interval_years", "pof_estimate")
        }
        row |= {
            "ci_low": r["pof_ci"][0],
            "ci_high": r["pof_ci"][1],
            "samples": r["samples"],
            "failing_samples": r["failures"],
            "method": r["method"],
            "converged": r["converged"],
            "budget_reached": r["budget_reached"],
        }
        tables.insert(0, ("Recommended interval", pd.DataFrame([row])))
    f = s.get("form")
    if f and f.get("available"):
        tables.append(
            (
                "No inspection: sampling estimate and FORM cross-check",
                pd.DataFrame(
                    [
                        {
                            "pof_sampling": s["no_inspection"]["pof"],
                            "std_error": s["no_inspection"]["std_error"],
                            "pof_form": f["pof"],
                            "beta": f["beta"],
                            "form_converged": f["converged"],
                        }
                    ]
                ),
            )
        )
    if s.get("pof_per_period"):
        tables.append(
            (f"Probability of failure per {s['period']}", pd.DataFrame(s["pof_per_period"]))
        )
    if s["schedule"]:
        tables.append(
            (
                "Fixed schedule",
                pd.DataFrame(
                    [
                        {
                            "inspections": len(s["schedule"]["cycles"]),
                            "pof": s["schedule"]["pof"],
                            "std_error": s["schedule"]["std_error"],
                            "detections_mean": s["schedule"]["detections_mean"],
                        }
                    ]
                ),
            )
        )
    write_report(
        od.path("report.html"),
        title=f"Inspection plan: {case.title}",
        question="How often must this part be inspected so that a crack is found "
        "before it becomes critical, and what probability of failure over "
        "the design life does each interval leave?",
        answer=answer_sentence(s),
        inputs=inputs,
        figures=figures,
        tables=tables,
        validity=_plan_validity(s),
        warnings=s["warnings"],
        references=s["references"],
    )


def _plan_validity(s) -> list:
    """The plan's statistical and deterministic ranges."""
    d = s["deterministic"]
    u = units()
    rows = [
        (
            "deterministic life",
            f"{count(d['life_cycles'])} cycles from {u.q(d['detectable_size_mm'], 'length')} "
            f"to the critical size {u.q(d['critical_crack_length_mm'], 'length')}",
        ),
        (
            "no inspection: probability of failure",
            f"{num(s['no_inspection']['pof'], 3)} ± {num(s['no_inspection']['std_error'], 2)} "
            "(one standard error)",
        ),
    ]
    r = s.get("recommendation") or {}
    if r.get("pof_ci"):
        rows.append(
            (
                "recommended interval converged",
                text(r.get("converged"))
                + ("; the sample budget was reached" if r.get("budget_reached") else ""),
            )
        )
    return rows


def write_pod(fit, a, y, out, *, source: str, force=False, plots=True, options=None) -> dict:
    """Write a POD fit: pod.json, pod.toml (the line for [inspection]), pod.png, report."""
    from cycj.outputs import OutputDir, record_provenance

    summary = fit.summary()
    summary["parameters"] = dict(options or {})
    record_provenance(summary, {"data": source}, method=fit.method, seed=None)
    with OutputDir(out, force=force, inputs=[source]) as od:
        od.write_text("pod.toml", summary["pod_toml"] + "\n")
        if plots:
            _pod_report(od, fit, a, y, source)
        od.write_json("pod.json", summary)
    return summary


def _pod_report(od, fit, a, y, source):
    from cycj.display import num
    from cycj.plan import plots as P
    from cycj.report import write_report

    u = units()
    png = od.savefig("pod.png", P.pod_plot(fit, a, y, fit.method))
    c = fit.curve
    write_report(
        od.path("report.html"),
        title=f"POD from {Path(source).name}",
        question="How reliably does this inspection find cracks, by size?",
        answer=(
            f"a50 = {u.q(c.a50, 'length', 3)}, a90 = {u.q(c.a90, 'length', 3)}, a90/95 = "
            f"{u.q(fit.a90_95, 'length', 3)} ({fit.method}, {fit.link} link, n = {fit.n:,})."
        ),
        inputs=[
            ("data", source),
            ("method", fit.method),
            ("link", fit.link),
            *[(k, num(v) if isinstance(v, (int, float)) else v) for k, v in fit.params.items()],
        ],
        figures=[("POD fit with its lower confidence bound through a90/95", png)],
        tables=[],
        validity=[
            ("observations", f"{fit.n:,}"),
            (
                "crack sizes of the data",
                f"{u.q(float(min(a)), 'length', 3)} to {u.q(float(max(a)), 'length', 3)}",
            ),
        ],
        warnings=[]
        if fit.n >= 60
        else ["fewer than 60 observations: MIL-HDBK-1823A asks for more"],
        references=[
            "MIL-HDBK-1823A (2009)",
            "Berens, A. P. (1989), ASM Handbook Vol. 17, 689–701",
            "Cheng, R. C. H., Iles, T. C. (1983), Technometrics 25, 77",
        ],
    )
