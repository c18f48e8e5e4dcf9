"""``cycj fit``: growth constants in ΔJ from fatigue crack growth test logs."""

from __future__ import annotations

import click


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
    default="fit-out",
    show_default=True,
    type=click.Path(file_okay=False),
    help="Output folder.",
)
@click.option(
    "--method",
    default="auto",
    show_default=True,
    type=click.Choice(["auto", "polynomial", "secant", "direct"]),
    help="Fit reported as the recommended C, m (all are computed).",
)
@click.option("--force", is_flag=True, help="Replace an output folder cycj wrote before.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@click.option("--json", "as_json", is_flag=True, help="Print fit.json to stdout.")
def fit(logs, specimens, out_dir, method, force, no_plots, as_json):
    """Fit da/dN = C·ΔJ^m to fatigue crack growth LOGS (raw loops or crack lengths)."""
    from cycj.calibrate.fit import fit_logs
    from cycj.calibrate.write import write_outputs
    from cycj.outputs import OutputDir, dumps

    spec = specimens[0] if len(specimens) == 1 else list(specimens)
    OutputDir(out_dir, force=force, inputs=[*logs, *specimens])  # refuse early
    result = fit_logs(list(logs), spec, method=method)
    write_outputs(result, out_dir, logs=logs, specimens=specimens, force=force, plots=not no_plots)
    if as_json:
        click.echo(dumps(result.summary))
        return
    s = result.summary
    click.echo(
        f"C = {s['C']:.4g} mm/cycle per (kJ/m^2)^m  "
        f"[{s['C_interval'][0]:.3g}, {s['C_interval'][1]:.3g}]"
    )
    click.echo(
        f"m = {s['m']:.4g}  [{s['m_interval'][0]:.3g}, {s['m_interval'][1]:.3g}]  "
        f"({s['recommended_fit']} fit, basis {s['basis']})"
    )
    click.echo(f"skipped readings: {len(result.skipped)}; warnings: {len(result.warnings)}")
    click.echo(result.snippet.rstrip().splitlines()[-1])
    click.echo(
        f"outputs in {out_dir}/ (fit.json, growth_snippet.toml, reduced.csv, rates.csv"
        + (", plots, report.html)" if not no_plots else ")")
    )
