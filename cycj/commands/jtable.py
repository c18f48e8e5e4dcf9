"""``cycj j-table``: J and ΔJ by finite elements for a case's crack sizes and loads."""

from __future__ import annotations

import click

from cycj.commands.options import units_option


@click.command("j-table")
@click.argument("case_file", type=click.Path(dir_okay=False))
@click.option(
    "--sizes",
    type=click.IntRange(1, 50),
    default=None,
    help="Number of crack sizes over the case's crack range (default: [fe] crack_lengths, else 5).",
)
@click.option(
    "--loads",
    type=click.IntRange(1, 60),
    default=None,
    help="Load levels per crack size, L_r from 0.05 to 2 (default: [fe] loads or "
    "nominal_stresses, else 10).",
)
@click.option(
    "--out",
    "out_dir",
    type=click.Path(file_okay=False),
    help="Output folder (default: out/j-table-<case stem>).",
)
@click.option(
    "--scheduler",
    default=None,
    help="Dask scheduler address (tcp://HOST:PORT): run the load sequences on a cluster.",
)
@click.option(
    "--workers",
    type=click.IntRange(1, 1024),
    default=None,
    help="Processes for the load sequences (default: all cores; the table does not change).",
)
@click.option("--force", is_flag=True, help="Replace a non-empty output folder.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@click.option("--json", "as_json", is_flag=True, help="Print the summary as JSON.")
@units_option
def j_table(
    case_file, sizes, loads, out_dir, scheduler, workers, force, no_plots, as_json, units_system
):
    """Tabulate J at peak load and ΔJ for a load range by 2-D finite elements for CASE_FILE.

    Writes jtable.csv, jtable.json, plots and report.html to the output folder.
    """
    from cycj.case import load_case
    from cycj.fe.table import compute
    from cycj.fe.write import answer, write_outputs
    from cycj.outputs import OutputDir, default_out, dumps

    case = load_case(case_file)
    out = default_out("j-table", case_file, out_dir)
    od = OutputDir(out, force=force, inputs=[case_file])

    def progress(a):
        if not as_json:
            click.echo(f"  a = {a:.4g} mm done", err=True)

    frame, info = compute(
        case, sizes, loads, progress, workers=workers or None, scheduler=scheduler
    )
    from cycj.display import using

    with od, using(units_system or getattr(case, "report_units", None) or "SI"):
        data = write_outputs(od, case, frame, info, plots=not no_plots)
    if as_json:
        click.echo(dumps(data))
        return
    click.echo(answer(info, frame))
    click.echo(f"wrote {len(data['outputs'])} files to {out}/")
