"""``cycj plan``: inspection intervals, deterministic and by Monte Carlo."""

from __future__ import annotations

import click

from cycj.commands.options import units_option


@click.command()
@click.argument("case_file", type=click.Path(dir_okay=False))
@click.option(
    "--out",
    "out_dir",
    type=click.Path(file_okay=False),
    help="Output folder (default: out/plan-<case stem>).",
)
@click.option(
    "--scheduler",
    default=None,
    help="Dask scheduler address (tcp://HOST:PORT): run sample chunks on a cluster.",
)
@click.option(
    "--workers",
    type=click.IntRange(1, 1024),
    default=None,
    help="Threads for the sample chunks (default: all cores; the answer does not change).",
)
@click.option("--force", is_flag=True, help="Replace an output folder cycj wrote before.")
@click.option("--json", "as_json", is_flag=True, help="Print plan.json to stdout.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@units_option
def plan(case_file, out_dir, scheduler, workers, force, as_json, no_plots, units_system):
    """Plan inspections for CASE_FILE (its [inspection] table): the interval from detectable
    to critical size, and the probability of failure for each inspection interval.

    Writes plan.json, what_if.csv, schedule.csv, plots and report.html.
    """
    from cycj.case import load_case
    from cycj.outputs import OutputDir, default_out, dumps
    from cycj.plan.inspections import plan_inspections
    from cycj.plan.write import answer_sentence, write_plan

    case = load_case(case_file)
    out = default_out("plan", case_file, out_dir)
    OutputDir(out, force=force, inputs=[case.path])  # refuse early, before the long run
    result = plan_inspections(case, scheduler=scheduler, workers=workers)
    summary = write_plan(
        result, case, out, force=force, plots=not no_plots, units_system=units_system
    )
    if as_json:
        click.echo(dumps(summary))
        return
    from cycj.display import using

    with using(units_system or getattr(case, "report_units", None) or "SI"):
        click.echo(answer_sentence(summary))
    click.echo(result.what_if.to_string(index=False))
    click.echo(
        f"outputs: {out}/ (plan.json, what_if.csv, schedule.csv"
        + (", plots, report.html)" if not no_plots else ")")
    )
    for w in summary["warnings"]:
        click.echo(f"warning: {w}")
