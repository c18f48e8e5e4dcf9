"""Writing a life prediction: summary.json, history.csv, plots and the HTML report."""

from __future__ import annotations

from pathlib import Path

END_WORDS = {
    "toughness": "J_max reaching the toughness J_c",
    "tearing": "tearing instability on the J–R curve",
    "fad": "the failure assessment diagram",
    "collapse": "plastic collapse (L_r,max)",
    "size-limit": "the crack size limit",
    "leak": "leak (crack through the wall)",
    "max-cycles": "the cycle limit (run-out to max_cycles)",
    "no-growth": "no growth (ΔJ below threshold: run-out)",
}


def answer_sentence(s: dict) -> str:
    """One sentence: the end, after how many cycles (blocks, hours), at what crack size; led
    by a warning when the initial crack is already critical under the history's peak load, and
    naming every criterion tripped together (with its value and limit)."""
    parts = []
    if s.get("initially_critical"):
        first = s.get("initial_criteria_tripped") or []
        why = "; ".join(_tripped_words(r) for r in first)
        parts.append(
            f"The initial crack ({s['a_initial_mm']:.4g} mm) is already critical under the "
            f"history's peak load" + (f" ({why})" if why else "") + ". "
        )
    parts.append(
        f"End by {END_WORDS.get(s['end_reason'], s['end_reason'])} after "
        f"{s['cycles_to_end']:.4g} cycles"
    )
    extra = []
    if s.get("cycles_per_block", 1) > 1:
        extra.append(f"{s['blocks_to_end']:.4g} blocks")
    if "hours_to_end" in s:
        extra.append(f"{s['hours_to_end']:.4g} h")
    if extra:
        parts.append(" (" + ", ".join(extra) + ")")
    parts.append(
        f" at a = {s['a_end_mm']:.4g} mm (from {s['a_initial_mm']:.4g} mm; critical "
        f"size at peak load {s['critical_crack_length_mm']:.4g} mm)"
    )
    tripped = s.get("end_criteria_tripped") or []
    others = [r for r in tripped if r["criterion"] != s["end_reason"]]
    at_start = s.get("initially_critical") and s["cycles_to_end"] == 0
    if len(tripped) > 1 and others and not at_start:
        parts.append(
            "; tripped in the same cycle: " + "; ".join(_tripped_words(r) for r in tripped)
        )
    parts.append(".")
    return "".join(parts)


_QUANTITY_WORDS = {"L_r": "L_r", "a_mm": "a", "J_max_kJm2": "J_max", "K_r": "K_r"}
_UNITS = {"a_mm": " mm", "J_max_kJm2": " kJ/m²"}


def _tripped_words(r: dict) -> str:
    """'collapse: L_r = 91.6 ≥ 1.25' for one row of ``end_criteria_tripped``."""
    q = r.get("quantity", "value")
    unit = _UNITS.get(q, "")
    text = f"{r['criterion']}: {_QUANTITY_WORDS.get(q, q)} = {r['value']:.4g}{unit}"
    if "limit" in r:
        text += f" ≥ {r['limit']:.4g}{unit}"
    return text


def run_and_write(case, out: Path, *, method=None, force=False, plots=True, progress=None):
    """Run :func:`cycj.life.predict_life` and write every output atomically; return summary."""
    from cycj.life.predict import predict_life
    from cycj.outputs import OutputDir, record_provenance

    inputs = {"case": case.path}
    if case.loading.history is not None:
        inputs["history"] = case.loading.history
    files = case.files or tuple((k, p) for k, p in inputs.items() if p)
    od = OutputDir(out, force=force, inputs=[p for _, p in files])
    result = predict_life(case, method=method, progress=progress)
    summary = dict(result.summary)
    record_provenance(summary, inputs, files=files, method=summary["method"], seed=None)
    with od:
        od.write_csv("history.csv", result.history)
        figures = []
        if plots:
            from cycj.life import plots as P

            for name, caption, fn in (
                ("crack_growth.png", "Crack size vs cycles", P.crack_growth_figure),
                ("driving_force.png", "ΔJ and da/dN vs crack size", P.driving_force_figure),
                (
                    "criterion.png",
                    "Peak-load trajectory against the end criterion",
                    P.criterion_figure,
                ),
            ):
                figures.append((caption, od.savefig(name, fn(result), tight=False)))
            summary["plots"] = [p.name for _, p in figures]
            _report(od, result, summary, figures)
        od.write_json("summary.json", summary)
    return summary


def _report(od, result, summary, figures):
    from cycj.report import write_report

    case = result.case
    inputs = [
        ("case", str(case.path)),
        ("shape", case.geometry.shape.name),
        ("initial crack [mm]", f"{summary['a_initial_mm']:.4g}"),
        ("ΔJ method", case.analysis.j_method),
        (
            "growth law",
            f"da/dN = {case.growth.C:.4g}·ΔJ^{case.growth.m:.4g} mm/cycle "
            f"(ΔJ in kJ/m², threshold {case.growth.threshold:g}, basis "
            f"{case.growth.basis})",
        ),
        ("closure", case.loading.closure.model),
        ("cycles per block", summary["cycles_per_block"]),
        ("peak nominal stress [MPa]", f"{summary['peak_nominal_stress_MPa']:.4g}"),
        ("end criteria", ", ".join(case.run.criteria)),
        ("method", f"{summary['method']} ({summary['method_reason']})"),
    ]
    write_report(
        od.path("report.html"),
        title=f"Remaining life: {case.title}",
        question="How many load cycles until this crack becomes unstable under the "
        "given load history, and why does it end there?",
        answer=answer_sentence(summary),
        inputs=inputs,
        figures=figures,
        tables=[("End values", [summary["end_values"]])],
        warnings=summary["warnings"],
        references=summary["references"],
    )
