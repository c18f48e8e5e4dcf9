"""``cycj demo``: write an invented scenario and run fit → run → plan on it."""

from __future__ import annotations

import click


@click.command()
@click.argument("folder", default="out/demo", type=click.Path(file_okay=False))
@click.option("--force", is_flag=True, help="Replace a FOLDER cycj wrote before.")
def demo(folder, force):
    """Write an invented scenario (a crane lug with a crack, its load history, two lab logs
    and a specimen file) into FOLDER and run fit, run and plan on it end to end."""
    from cycj.demo import run_demo

    run_demo(folder, force=force, echo=click.echo)
