"""``cycj run``: remaining life of one case (or a fleet of cases)."""

from __future__ import annotations

import sys
import time

import click

from cycj.commands.options import units_option


class _Progress:
    """A one-line progress bar on stderr (share of the way from the initial to the critical
    crack size, cycles, crack size) for runs longer than a second; only on a terminal, and
    never with --json.  ``predict_life`` sets ``span`` (a_initial, a_critical)."""

    WIDTH = 24

    def __init__(self, enabled: bool):
        self.enabled = enabled
        self.t0 = time.monotonic()
        self.shown = False
        self.span = None

    def __call__(self, cycles, a):
        if not self.enabled or time.monotonic() - self.t0 < 1.0:
            return
        self.shown = True
        bar = ""
        if self.span is not None and self.span[1] > self.span[0]:
            f = min(max((a - self.span[0]) / (self.span[1] - self.span[0]), 0.0), 1.0)
            done = int(round(f * self.WIDTH))
            bar = f"[{'#' * done}{'.' * (self.WIDTH - done)}] {100 * f:3.0f} %  "
        click.echo(f"\r  {bar}{cycles:12.6g} cycles   a = {a:9.4f} mm", nl=False, err=True)

    def close(self):
        if self.shown:
            click.echo("", err=True)


@click.command()
@click.argument("case_files", nargs=-1, required=True, type=click.Path(dir_okay=False))
@click.option(
    "--out",
    "out_dir",
    type=click.Path(file_okay=False),
    help="Output folder (default: out/run-<case stem>; several cases: out/run-fleet).",
)
@click.option(
    "--method",
    type=click.Choice(["auto", "cycle", "block"]),
    default=None,
    help="Override the case's run.method.",
)
@click.option("--force", is_flag=True, help="Replace an output folder cycj wrote before.")
@click.option("--json", "as_json", is_flag=True, help="Print the summary as JSON.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@click.option(
    "--scheduler",
    default=None,
    help="Dask scheduler address (tcp://HOST:PORT) to run a fleet of cases.",
)
@units_option
def run(case_files, out_dir, method, force, as_json, no_plots, scheduler, units_system):
    """Predict the remaining life of CASE_FILES (cycles to a J-based instability).

    Writes summary.json, history.csv, plots and report.html to the output folder.
    """
    from cycj import _ahead
    from cycj.case import load_case
    from cycj.outputs import default_out, dumps

    _ahead.save_after_command()  # a warm run after this one needs no numba

    if len(case_files) > 1 or scheduler:
        from cycj.display import using
        from cycj.life.fleet import run_fleet

        out = default_out("run", None, out_dir)
        with using(units_system or "SI"):
            table = run_fleet(case_files, out, method=method, force=force, scheduler=scheduler)
        click.echo(table.to_string(index=False))
        return
    case_file = case_files[0]
    case = load_case(case_file)
    out = default_out("run", case_file, out_dir)
    progress = _Progress(sys.stderr.isatty() and not as_json)
    from cycj.life.write import run_and_write

    try:
        summary = run_and_write(
            case,
            out,
            method=method,
            force=force,
            plots=not no_plots,
            progress=progress,
            units_system=units_system,
        )
    finally:
        progress.close()
    if as_json:
        click.echo(dumps(summary))
        return
    from cycj.display import using

    with using(units_system or getattr(case, "report_units", None) or "SI"):
        click.echo(answer_sentence(summary))
    click.echo(
        f"outputs: {out}/ (summary.json, history.csv"
        + (", plots, report.html)" if not no_plots else ")")
    )
    for w in summary["warnings"]:
        click.echo(f"warning: {w}")


def answer_sentence(s: dict) -> str:
    from cycj.life.write import answer_sentence as _a

    return _a(s)
