"""Writing a calibration's outputs: fit.json, growth_snippet.toml, reduced.csv, rates.csv,
skipped.csv, per_specimen.csv, plots and report.html (through :mod:`cycj.outputs` and
:mod:`cycj.report`)."""

from __future__ import annotations


def write_outputs(result, out_dir, *, logs=(), specimens=(), force=False, plots=True):
    """Write every output of a :class:`~cycj.calibrate.FitResult` into ``out_dir``."""
    import pandas as pd

    from cycj.outputs import OutputDir, record_provenance, sha256_of

    inputs = {f"log{i + 1}": p for i, p in enumerate(logs)}
    inputs.update({f"specimen{i + 1}": p for i, p in enumerate(specimens)})
    s = result.summary
    record_provenance(s, inputs, method=s.get("recommended_fit"))
    s["log_sha256"] = [sha256_of(p) for p in logs]
    s["specimen_sha256"] = [sha256_of(p) for p in specimens]
    with OutputDir(out_dir, force=force, inputs=[*logs, *specimens]) as od:
        od.write_text("growth_snippet.toml", result.snippet)
        od.write_csv("reduced.csv", result.reduced)
        od.write_csv("rates.csv", result.rates)
        od.write_csv(
            "skipped.csv", pd.DataFrame(result.skipped, columns=["log", "cycle", "reason"])
        )
        od.write_csv("per_specimen.csv", _per_specimen_frame(s))
        if plots:
            _plots_and_report(od, result, s, logs, specimens)
        od.write_json("fit.json", s)
    return out_dir


def _plots_and_report(od, result, s, logs, specimens):
    import html

    import pandas as pd

    from cycj.calibrate import plots
    from cycj.calibrate.fit import CAUTION
    from cycj.report import write_report

    figs = [
        (
            "da/dN against ΔJ_eff with the recommended fit and prediction band",
            od.savefig("dadn.png", plots.rate_plot(result)),
        )
    ]
    if result.curves:
        figs.append(
            (
                "crack length against cycles: measured and integrated fit",
                od.savefig("crack_growth.png", plots.crack_plot(result)),
            )
        )
    if result.typical_loop is not None:
        figs.append(
            (
                "a typical recorded loop with its compliance line and opening load",
                od.savefig("loop.png", plots.loop_plot(result.typical_loop)),
            )
        )
    fits = pd.DataFrame(
        [
            {
                "fit": k,
                "C": v["C"],
                "m": v["m"],
                "C low": v["C_interval"][0],
                "C high": v["C_interval"][1],
                "m low": v["m_interval"][0],
                "m high": v["m_interval"][1],
                "points": v["n"],
            }
            for k, v in result.fits.items()
        ]
    )
    skipped = pd.DataFrame(result.skipped, columns=["log", "cycle", "reason"])
    from cycj.display import num, units

    u = units()
    lo_dj, hi_dj = s["dJ_range_kJm2"]
    answer = (
        f"da/dN = {num(s['C'])}·ΔJ^{num(s['m'])} mm/cycle (ΔJ in kJ/m², on the "
        f"{s['basis']} range, {s['recommended_fit']} fit), valid for ΔJ "
        f"{u.q(lo_dj, 'energy_per_area', 3)} to {u.q(hi_dj, 'energy_per_area', 3)}."
    )
    b = s["between_specimen"]
    thr = s["threshold_kJm2"]
    collapse = s["r_ratio_collapse"].get("collapses")
    write_report(
        od.path("report.html"),
        title="Growth constants in ΔJ from test logs",
        question="Which constants C, m (and threshold) of da/dN = C·ΔJ^m describe these "
        "fatigue crack growth tests, and with what scatter?",
        answer=answer,
        inputs=[
            ("logs", ", ".join(map(str, logs))),
            ("specimen files", ", ".join(map(str, specimens))),
            ("recommended fit", f"{s['recommended_fit']}: {s['recommended_reason']}"),
            ("closure", s["closure"]),
            ("intervals", f"{s['interval_method']}: {s['interval_note']}"),
            ("within-test rate scatter σ of ln(da/dN) (not for planning)", num(s["sigma_ln"], 3)),
            (
                "between-specimen scatter σ of ln C (for planning)",
                num(b.get("sigma_ln_C"), 3) if b.get("sigma_ln_C") is not None else b.get("note"),
            ),
            (
                "threshold ΔJ_th (ASTM E647 operational)",
                u.q(thr, "energy_per_area", 3) if thr else "not reached by these data",
            ),
            (
                "R ratios collapse in ΔJ_eff",
                "not tested (one R ratio)" if collapse is None else collapse,
            ),
        ],
        figures=figs,
        tables=[
            ("Fits", fits),
            ("Per specimen (m fixed)", _per_specimen_frame(s)),
            ("Skipped readings", skipped.head(200)),
        ],
        validity=[
            (
                "ΔJ range of the data behind the fit",
                f"{u.q(lo_dj, 'energy_per_area', 3)} to {u.q(hi_dj, 'energy_per_area', 3)} "
                "(a run outside it is warned as extrapolated)",
            ),
            ("readings skipped", f"{len(result.skipped):,}"),
        ],
        warnings=[w for w in result.warnings if w != CAUTION],
        references=s["references"],
        extra_html=(
            "<h2>Growth law for a case file</h2><p>The line to paste into a case's "
            "<code>[material]</code> table (growth_snippet.toml):</p><pre><code>"
            + html.escape(result.snippet.rstrip().splitlines()[-1], quote=False)
            + "</code></pre>"
        ),
    )


def _per_specimen_frame(s):
    """fit.json's per_specimen rows as a table (ranges as two columns each)."""
    import pandas as pd

    rows = []
    for r in s.get("per_specimen", []):
        row = {k: v for k, v in r.items() if not isinstance(v, list)}
        for k in ("a_range_mm", "dJ_range_kJm2"):
            row[f"{k}_low"], row[f"{k}_high"] = r[k]
        rows.append(row)
    return pd.DataFrame(rows)
