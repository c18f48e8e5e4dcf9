"""Writing an inspection plan (plan.json, what_if.csv, schedule.csv, plots, report.html) and a
POD fit (pod.json, pod.toml, pod.png, report.html)."""

from __future__ import annotations

from pathlib import Path


def answer_sentence(s: dict) -> str:
    """One sentence: the deterministic interval and the recommended probabilistic one."""
    d = s["deterministic"]
    parts = [
        f"Inspect every {d['interval_cycles']:.4g} cycles by the deterministic rule "
        f"(life {d['life_cycles']:.4g} cycles from {d['detectable_size_mm']:.3g} mm to "
        f"{d['critical_crack_length_mm']:.3g} mm ÷ {d['safety_factor']:g})"
    ]
    rec = s["recommended_interval_cycles"]
    if not s["inspection_needed"]:
        parts.append(
            f"; without inspection the probability of failure "
            f"{s['no_inspection']['pof']:.3g} already meets the target "
            f"{s['target_pof']:.3g}."
        )
    elif rec is None:
        parts.append(
            f"; no interval searched meets the target probability of failure {s['target_pof']:.3g}."
        )
    else:
        r = s.get("recommendation") or {}
        when = f"{rec:.4g} cycles"
        if s.get("recommended_interval_years") is not None:
            when += (
                f" ({s['recommended_interval_hours']:.4g} h, "
                f"{s['recommended_interval_years']:.3g} years)"
            )
        parts.append(
            f"; to keep the probability of failure over {s['design_life_cycles']:.4g} "
            f"cycles within {s['target_pof']:.3g}, inspect at most every {when} "
            f"(no inspection: {s['no_inspection']['pof']:.3g})"
        )
        if r:
            lo, hi = r["pof_ci"]
            parts.append(
                f"; there the probability of failure is {r['pof_estimate']:.3g} "
                f"({round(100 * r['confidence'])} % interval {lo:.3g} to {hi:.3g}, "
                f"{r['samples']} samples, {r['method']})"
            )
            if r.get("budget_reached"):
                parts.append(
                    f" — the sample budget ({r['budget_samples']}) was reached before the "
                    f"interval narrowed to ± {r['half_width_limit']:.2g}"
                )
        parts.append(".")
    return "".join(parts)


def write_plan(result, case, out, *, force=False, plots=True) -> dict:
    """Write the plan's outputs atomically into ``out``; return the plan.json dict."""
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
    with OutputDir(out, force=force, inputs=[p for _, p in files]) as od:
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
                        " and its lower bound through a90/95"
                        if result.inputs.pod_lower_bound
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

    inp = result.inputs
    d = s["deterministic"]
    sc = inp.scatter
    inputs = [
        ("case", str(case.path)),
        ("shape", case.geometry.shape.name),
        ("detectable size [mm]", f"{d['detectable_size_mm']:.4g} ({d['detectable_size_source']})"),
        ("safety factor", f"{d['safety_factor']:g}"),
        ("design life [cycles]", f"{s['design_life_cycles']:.4g}"),
        ("POD", inp.pod.to_toml()),
        ("repair", s["repair"]),
        ("samples, seed", f"{s['samples']}, {s['seed']}"),
        ("samples used (budget)", f"{s.get('samples_used')} ({s.get('max_samples')})"),
        ("sampling method", str(s.get("method"))),
        ("target probability of failure", f"{s['target_pof']:g}"),
    ]
    for name in ("growth_C", "initial_crack", "toughness", "load_scale"):
        dist = getattr(sc, name)
        inputs.append(
            (
                f"scatter: {name}",
                "fixed" if not dist.scatters else f"{dist.kind} (median {dist.median:.4g})",
            )
        )
    for f in s["findings"]:
        inputs.append(
            (
                "finding",
                f"{f['result']} at {f['cycles']:.4g} cycles"
                + (f", {f['size_mm']:.3g} ± {f['sizing_sd_mm']:.3g} mm" if f["size_mm"] else ""),
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
        warnings=s["warnings"],
        references=s["references"],
    )


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
    from cycj.plan import plots as P
    from cycj.report import write_report

    png = od.savefig("pod.png", P.pod_plot(fit, a, y, fit.method))
    c = fit.curve
    write_report(
        od.path("report.html"),
        title=f"POD from {Path(source).name}",
        question="How reliably does this inspection find cracks, by size?",
        answer=(
            f"a50 = {c.a50:.3g} mm, a90 = {c.a90:.3g} mm, a90/95 = "
            f"{fit.a90_95:.3g} mm ({fit.method}, {fit.link}, n = {fit.n})."
        ),
        inputs=[
            ("data", source),
            ("method", fit.method),
            ("link", fit.link),
            *[(k, v) for k, v in fit.params.items()],
        ],
        figures=[("POD fit", png)],
        tables=[],
        warnings=[]
        if fit.n >= 60
        else ["fewer than 60 observations: MIL-HDBK-1823A asks for more"],
        references=[
            "MIL-HDBK-1823A (2009)",
            "Berens, A. P. (1989), ASM Handbook Vol. 17, 689–701",
            "Cheng, R. C. H., Iles, T. C. (1983), Technometrics 25, 77",
        ],
    )
