"""``cycj fit``: growth constants in ΔJ from fatigue crack growth test logs."""

from __future__ import annotations

import click

from cycj.commands.options import units_option


@click.command()
@click.argument("logs", nargs=-1, required=True, type=click.Path(dir_okay=False))
@click.option(
    "--specimen",
    "specimens",
    multiple=True,
    required=True,
    type=click.Path(dir_okay=False),
    help="Specimen file (TOML); once for all logs or once per log.",
)
@click.option(
    "--out",
    "out_dir",
    default=None,
    type=click.Path(file_okay=False),
    help="Output folder (default: out/fit-<stem of the first log>).",
)
@click.option(
    "--method",
    default="auto",
    show_default=True,
    type=click.Choice(["auto", "polynomial", "secant", "direct"]),
    help="Fit reported as the recommended C, m (all are computed).",
)
@click.option(
    "--spacing",
    default="all",
    show_default=True,
    type=click.Choice(["all", "e647"]),
    help="Readings behind the rates: every reading, or thinned to the E647 minimum spacing.",
)
@click.option(
    "--outliers",
    "outlier_limit",
    type=float,
    default=None,
    help="Drop rates beyond this many robust σ from the line (default: none dropped).",
)
@click.option(
    "--resamples",
    default=1000,
    show_default=True,
    type=click.IntRange(100, 100_000),
    help="Bootstrap resamples behind the intervals.",
)
@click.option("--seed", default=0, show_default=True, type=int, help="Seed of the resampling.")
@click.option(
    "--rate-at",
    "rate_at",
    multiple=True,
    type=click.FloatRange(min=0, min_open=True),
    help="ΔJ [kJ/m²] where da/dN and its interval are reported (repeatable; default mid-range).",
)
@click.option("--sheet", default=None, help="Worksheet of .xlsx logs, by name (default: first).")
@click.option("--free-start", is_flag=True, help="Direct a(N) fit: fit each test's start too.")
@click.option("--force", is_flag=True, help="Replace an output folder cycj wrote before.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@click.option("--json", "as_json", is_flag=True, help="Print fit.json to stdout.")
@units_option
def fit(
    logs,
    specimens,
    out_dir,
    method,
    spacing,
    outlier_limit,
    resamples,
    seed,
    rate_at,
    sheet,
    free_start,
    force,
    no_plots,
    as_json,
    units_system,
):
    """Fit da/dN = C·ΔJ^m to fatigue crack growth LOGS (raw loops or crack lengths; a
    ``specimen`` column holds many tests in one file)."""
    from cycj.calibrate.fit import fit_logs
    from cycj.calibrate.write import write_outputs
    from cycj.outputs import OutputDir, default_out, dumps

    out_dir = default_out("fit", logs[0], out_dir)
    spec = specimens[0] if len(specimens) == 1 else list(specimens)
    OutputDir(out_dir, force=force, inputs=[*logs, *specimens])  # refuse early
    result = fit_logs(
        list(logs),
        spec,
        method=method,
        spacing=spacing,
        outlier_limit=outlier_limit,
        resamples=resamples,
        seed=seed,
        dJ_at=list(rate_at) or None,
        free_start=free_start,
        sheet=sheet,
    )
    from cycj.display import using

    with using(units_system or "SI"):
        write_outputs(
            result, out_dir, logs=logs, specimens=specimens, force=force, plots=not no_plots
        )
    if as_json:
        click.echo(dumps(result.summary))
        return
    s = result.summary
    click.echo(
        f"C = {s['C']:.4g} mm/cycle per (kJ/m^2)^m  "
        f"[{s['C_interval'][0]:.3g}, {s['C_interval'][1]:.3g}]"
    )
    click.echo(
        f"m = {s['m']:.4g}  [{s['m_interval'][0]:.4g}, {s['m_interval'][1]:.4g}]  "
        f"({s['recommended_fit']} fit, basis {s['basis']})"
    )
    click.echo(f"intervals: {s['interval_method']}")
    for r in s["rate_at"]:
        click.echo(
            f"da/dN at ΔJ = {r['dJ_kJm2']:.4g} kJ/m^2: {r['dadN_mm_per_cycle']:.4g} mm/cycle  "
            f"[{r['interval'][0]:.4g}, {r['interval'][1]:.4g}]"
        )
    b = s["between_specimen"]
    click.echo(
        f"between-specimen sigma_ln_C = {b['sigma_ln_C']:.3g} ({b['n_specimens']} specimens)"
        if b.get("sigma_ln_C") is not None
        else f"between-specimen scatter: {b.get('note')}"
    )
    click.echo(f"skipped readings: {len(result.skipped)}; warnings: {len(result.warnings)}")
    click.echo(result.snippet.rstrip().splitlines()[-1])
    click.echo(
        f"outputs in {out_dir}/ (fit.json, growth_snippet.toml, reduced.csv, rates.csv"
        + (", plots, report.html)" if not no_plots else ")")
    )
