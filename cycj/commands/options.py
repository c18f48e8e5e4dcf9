"""Options shared by several commands."""

from __future__ import annotations

import click

#: ``--units SI|US``: the unit system of the report and plots (files keep SI columns)
units_option = click.option(
    "--units",
    "units_system",
    type=click.Choice(["SI", "US"], case_sensitive=False),
    default=None,
    help="Units of the report and plots: SI (default; or the case's [report] units) or US "
    "customary (in, ksi, ksi√in, in·lbf/in², lbf). Files keep SI columns.",
)
