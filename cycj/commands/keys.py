"""``cycj keys`` and ``cycj new``: the key reference and a commented starting case."""

from __future__ import annotations

from pathlib import Path

import click


@click.command()
@click.option(
    "--write",
    "target",
    type=click.Path(dir_okay=False),
    default=None,
    help="Write the reference to this file (docs/keys.md) instead of printing it.",
)
def keys(target):
    """Print the reference of every key of case and specimen files (meaning, unit, default,
    allowed values, example), generated from cycj's one schema."""
    from cycj.schema.docs import markdown

    text = markdown()
    if target is None:
        click.echo(text, nl=False)
        return
    Path(target).write_text(text, encoding="utf-8")
    click.echo(f"wrote {target}")


@click.command()
@click.argument("shape")
@click.option(
    "--job",
    type=click.Choice(["run", "plan", "fit"]),
    default="run",
    show_default=True,
    help="run: a case for remaining life; plan: the case with an [inspection] table; "
    "fit: a specimen file for `cycj fit`.",
)
@click.option(
    "--out",
    "out_file",
    type=click.Path(dir_okay=False),
    default=None,
    help="File to write (default: <shape>.toml, or <shape>_specimen.toml for fit).",
)
@click.option("--force", is_flag=True, help="Replace an existing file cycj new wrote.")
def new(shape, job, out_file, force):
    """Write a commented starting case for SHAPE (`cycj geometries` lists them): required
    keys filled with invented example values to replace, optional keys commented out."""
    from cycj.schema.template import write_template

    written = write_template(shape, job, out_file, force=force)
    for p in written:
        click.echo(f"wrote {p}")
    if job == "fit":
        click.echo(f"edit the values, then: cycj fit LOG --specimen {written[0]}")
    else:
        click.echo(f"edit the values, then: cycj check {written[0]} and cycj {job} {written[0]}")
