"""Writing a life prediction: summary.json, history.csv, plots and the HTML report."""

from __future__ import annotations

from pathlib import Path

from cycj.display import count, hours, num, units, using

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
    """One sentence: the end, after how many cycles (blocks, hours and years), at what crack
    size; led by a warning when the initial crack is already critical under the history's
    peak load, and naming every criterion tripped together (with its value and limit)."""
    u = units()
    parts = []
    if s.get("initially_critical"):
        first = s.get("initial_criteria_tripped") or []
        why = "; ".join(_tripped_words(r) for r in first)
        parts.append(
            f"The initial crack ({u.q(s['a_initial_mm'], 'length')}) is already critical under "
            f"the history's peak load" + (f" ({why})" if why else "") + ". "
        )
    parts.append(
        f"End by {END_WORDS.get(s['end_reason'], s['end_reason'])} after "
        f"{count(s['cycles_to_end'])} cycles"
    )
    extra = []
    if s.get("cycles_per_block", 1) > 1:
        extra.append(f"{count(s['blocks_to_end'])} blocks")
    if "hours_to_end" in s:
        extra.append(hours(s["hours_to_end"]))
    if extra:
        parts.append(" (" + ", ".join(extra) + ")")
    crit = s.get("critical_crack_criterion")
    where = "leak size" if crit == "leak" else "critical size at peak load"
    parts.append(
        f" at a = {u.q(s['a_end_mm'], 'length')} (from {u.q(s['a_initial_mm'], 'length')}; "
        f"{where} {u.q(s['critical_crack_length_mm'], 'length')})"
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
_KINDS = {"a_mm": "length", "J_max_kJm2": "energy_per_area"}


def _tripped_words(r: dict) -> str:
    """'collapse: L_r = 91.6 ≥ 1.25' for one row of ``end_criteria_tripped``."""
    q = r.get("quantity", "value")
    kind = _KINDS.get(q)

    def v(x):
        return units().q(x, kind) if kind else num(x)

    text = f"{r['criterion']}: {_QUANTITY_WORDS.get(q, q)} = {v(r['value'])}"
    if "limit" in r:
        text += f" ≥ {v(r['limit'])}"
    return text


def run_and_write(
    case, out: Path, *, method=None, force=False, plots=True, progress=None, units_system=None
):
    """Run :func:`cycj.life.predict_life` and write every output atomically; return summary.

    ``units_system`` ("SI" or "US"; default the case's ``[report] units``, else SI) sets the
    units of the report and plots; the files keep SI columns."""
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
    system = units_system or getattr(case, "report_units", None) or "SI"
    with od, using(system):
        od.write_csv("history.csv", result.columns)
        figures = []
        if plots:
            for name, caption, fn in _figures(result):
                figures.append((caption, od.savefig(name, fn(result), tight=False)))
            summary["plots"] = [p.name for _, p in figures]
            _report(od, result, summary, figures)
        od.write_json("summary.json", summary)
    return summary


def _figures(result):
    """(file, caption, function) of the run's plots: the J–R picture only when tearing ends
    the run."""
    from cycj.life import plots as P

    out = [
        ("crack_growth.png", "Crack size vs cycles", P.crack_growth_figure),
        ("driving_force.png", "ΔJ and da/dN vs crack size", P.driving_force_figure),
        (
            "dj_split.png",
            "ΔJ of the block's largest cycle split into its elastic part U²·ΔK²/E' and its "
            "plastic part, against crack size, with the linear-elastic ΔK²/E' for comparison",
            P.split_figure,
        ),
        (
            "criterion.png",
            "Peak-load trajectory against the end criterion",
            P.criterion_figure,
        ),
    ]
    if result.summary["end_reason"] == "tearing" and result.case.material.resistance_curve:
        out.append(
            (
                "tearing.png",
                "The J–R curve from the final crack size and the driving force J_max under the "
                "history's peak load: no stable crossing, so the crack tears",
                P.tearing_figure,
            )
        )
    return out


def _end_rows(summary) -> list:
    """The end values as (quantity, value with unit) rows."""
    u = units()
    words = {
        "a_mm": ("crack size at the end", "length"),
        "cycles": ("cycles to the end", None),
        "Jmax_at_peak_kJm2": ("J_max under the peak load", "energy_per_area"),
        "Lr_at_peak": ("L_r under the peak load", None),
        "J_max_kJm2": ("J_max at the end criterion", "energy_per_area"),
        "J_c_kJm2": ("toughness J_c", "energy_per_area"),
        "L_r": ("L_r", None),
        "L_r_max": ("L_r,max", None),
        "K_r": ("K_r", None),
        "a_tearing_mm": ("tearing instability size", "length"),
        "c_mm": ("half-length c", "length"),
        "limit_mm": ("size limit", "length"),
        "a_over_c": ("aspect ratio a/c", None),
        "max_cycles": ("cycle limit", None),
    }
    rows = []
    for k, v in summary["end_values"].items():
        what, kind = words.get(k, (k.replace("_", " "), None))
        if k == "curve":
            rows.append(("curve used", v))
        elif k == "J_R_curve" and isinstance(v, dict):
            rows.append(
                (
                    "J–R curve",
                    f"C1 = {u.q(v.get('C1'), 'energy_per_area')}, C2 = {num(v.get('C2'), 3)}",
                )
            )
        elif k in ("cycles", "max_cycles"):
            rows.append((what, count(v)))
        elif kind and isinstance(v, (int, float)):
            rows.append((what, u.q(v, kind)))
        else:
            rows.append((what, v))
    return rows


def _validity_rows(result, summary) -> list:
    """Ranges the run used against the ranges its solutions hold for."""
    import numpy as np

    u = units()
    case, h = result.case, result.columns
    geo = case.geometry
    lo, hi = geo.size_limits
    rows = [
        (
            "crack sizes of the run",
            f"{u.q(summary['a_initial_mm'], 'length')} to {u.q(summary['a_end_mm'], 'length')}"
            f" (the K solution holds for {u.q(lo, 'length')} to {u.q(hi, 'length')})",
        ),
        ("K solution and limit load", geo.shape.validity),
    ]
    dj = np.asarray(h["dJ_kJm2"], float)
    dj = dj[np.isfinite(dj) & (dj > 0)]
    if dj.size:
        span = f"{u.q(dj.min(), 'energy_per_area')} to {u.q(dj.max(), 'energy_per_area')}"
        valid = case.growth.valid_dJ
        if valid:
            inside = valid[0] <= dj.min() and dj.max() <= valid[1]
            span += (
                f"; the growth law's data cover {u.q(valid[0], 'energy_per_area')} to "
                f"{u.q(valid[1], 'energy_per_area')}: "
                + ("inside" if inside else "extrapolated beyond it")
            )
        else:
            span += "; the growth law gives no data range (valid_dJ), so extrapolation is unknown"
        rows.append(("ΔJ_eff of the largest cycle", span))
    if "dJ_pl_kJm2" in h and len(h["dJ_pl_kJm2"]):
        tot = np.asarray(h["dJ_el_kJm2"] + h["dJ_pl_kJm2"], float)
        share = np.divide(
            np.asarray(h["dJ_pl_kJm2"], float), tot, where=tot > 0, out=np.zeros_like(tot)
        )
        rows.append(("largest plastic share of ΔJ", f"{num(100 * share.max(), 3)} %"))
    lr = np.asarray(h["Lr"], float)
    if lr.size:
        rows.append(("largest L_r of a cycle", num(np.nanmax(lr), 3)))
    from cycj import models

    try:
        rec = models.record("j_method", case.analysis.j_method)
        if rec.validity:
            rows.append((f"ΔJ estimate {case.analysis.j_method}", rec.validity))
    except ValueError:  # an estimate without a record: nothing to add
        pass
    return rows


def _report(od, result, summary, figures):
    from cycj.report import write_report
    from cycj.report_inputs import case_rows

    case = result.case
    inputs = case_rows(case, result.loads)
    inputs.append(("peak nominal stress", units().q(summary["peak_nominal_stress_MPa"], "stress")))
    inputs.append(("integration method", f"{summary['method']} ({summary['method_reason']})"))
    write_report(
        od.path("report.html"),
        title=f"Remaining life: {case.title}",
        question="How many load cycles until this crack becomes unstable under the "
        "given load history, and why does it end there?",
        answer=answer_sentence(summary),
        inputs=inputs,
        figures=figures,
        tables=[("End values", _end_table(_end_rows(summary)))],
        validity=_validity_rows(result, summary),
        warnings=summary["warnings"],
        references=summary["references"],
    )


def _end_table(rows):
    from cycj.report import Rows

    return Rows(("quantity", "value"), rows)
