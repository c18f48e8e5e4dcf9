"""``cycj check`` and ``cycj geometries``."""

from __future__ import annotations

import json

import click


@click.command()
@click.argument("case_file", type=click.Path(dir_okay=False))
@click.option("--json", "as_json", is_flag=True, help="Print the resolved case as JSON.")
def check(case_file, as_json):
    """Validate CASE_FILE and print the resolved case in internal units."""
    from cycj.case import load_case

    case = load_case(case_file)
    inspection = None
    if case.inspection is not None:  # validated here too, not first by `cycj plan`
        from cycj.plan.inputs import read_inspection

        inspection = read_inspection(case)
    data = case.resolved()
    if as_json:
        click.echo(json.dumps(data, indent=2, default=str))
        return
    click.echo(f"case: {case.title}  ({case_file})")
    click.echo("internal units: N, mm, MPa, kJ/m^2, MPa*mm^0.5, mm/cycle, h")
    for section in (
        "material",
        "geometry",
        "growth",
        "loading",
        "fields",
        "analysis",
        "run",
        "report",
    ):
        if section not in data:
            continue
        click.echo(f"[{section}]")
        for k, v in data[section].items():
            click.echo(f"  {k} = {_fmt(v)}")
    if inspection is not None:
        click.echo("[inspection]")
        click.echo(f"  design_life = {_fmt(float(inspection.design_life))} cycles")
        click.echo(f"  detectable_size = {_fmt(float(inspection.detectable_size))} mm")
        click.echo(f"  intervals = {', '.join(_fmt(float(x)) for x in inspection.intervals)}")
    click.echo("ok: the case is valid")


def _fmt(v):
    if isinstance(v, float):
        return f"{v:.6g}"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{k} = {_fmt(x)}" for k, x in v.items()) + " }"
    return repr(v) if isinstance(v, str) else str(v)


@click.command()
@click.option("--json", "as_json", is_flag=True, help="Print the list as JSON.")
def geometries(as_json):
    """List the crack configurations with their dimensions, nominal stress and validity."""
    from cycj.geometry import SHAPES

    rows = [
        {
            "shape": s.name,
            "title": s.title,
            "dimensions": ["crack_length", *s.required, *s.optional],
            "loading": list(s.loading),
            "nominal_stress": s.nominal_stress,
            "crack": s.crack,
            "validity": s.validity,
            "references": list(s.references),
            "k_basis": s.k_basis,
            "limit_load_basis": s.limit_basis,
        }
        for s in SHAPES.values()
    ]
    if as_json:
        click.echo(json.dumps(rows, indent=2))
        return
    for r in rows:
        click.echo(f"{r['shape']}: {r['title']}")
        click.echo(f"  dimensions: {', '.join(r['dimensions'])}")
        click.echo(f"  loading: {' or '.join(r['loading'])};  {r['nominal_stress']}")
        click.echo(f"  crack: {r['crack']};  valid for {r['validity']}")
        click.echo(f"  K basis: {r['k_basis']}")
        click.echo(f"  limit load basis: {r['limit_load_basis']}")
        for ref in r["references"]:
            click.echo(f"  source: {ref}")
