"""``cycj new``: a commented starting case (or specimen file) for a shape and a job, written
from the declarations of :mod:`cycj.schema`.

Required keys are filled with invented example values chosen so that the case is valid and
runs as written (constant amplitude, a modest plastic part); every optional key of the section
follows commented out with its meaning and default, so the file documents itself.
"""

from __future__ import annotations

import os
from pathlib import Path

from cycj import schema
from cycj.errors import CycjInputError

#: first line of every file ``cycj new`` writes (``--force`` replaces only such a file)
MARK = "# Starting case written by `cycj new`"

#: geometry keys that belong to some shapes only
DIMENSIONS = (
    "width",
    "thickness",
    "net_thickness",
    "span",
    "half_length",
    "bending_ratio",
    "inner_radius",
    "hole_radius",
    "cracks",
    "table",
)

MATERIAL = {  # an invented ductile steel
    "elastic_modulus": '"205 GPa"',
    "poisson_ratio": "0.3",
    "yield_strength": '"340 MPa"',
    "tensile_strength": '"510 MPa"',
    "cyclic_curve": '{ strength_coefficient = "880 MPa", hardening_exponent = 0.16 }',
    "monotonic_curve": '{ strength_coefficient = "753 MPa", hardening_exponent = 0.128 }',
    "toughness": '{ J_c = "150 kJ/m^2" }',
    "growth": '{ law = "paris", C = 2.0e-4, m = 1.5, rate_unit = "mm", driving_unit = "kJ/m^2" }',
}

# per shape: geometry values, constant loads, and a crack size limit where the body sets none
SHAPE_VALUES = {
    "center-crack-infinite-plate": (
        {"crack_length": '"5 mm"'}, ('"150 MPa"', '"15 MPa"'), '"50 mm"'),
    "edge-crack-semi-infinite": ({"crack_length": '"2 mm"'}, ('"150 MPa"', '"15 MPa"'), '"30 mm"'),
    "center-crack-plate": (
        {"width": '"200 mm"', "thickness": '"10 mm"', "crack_length": '"10 mm"'},
        ('"120 MPa"', '"12 MPa"'), None),
    "edge-crack-plate": (
        {"width": '"40 mm"', "thickness": '"100 mm"', "crack_length": '"4 mm"'},
        ('"100 MPa"', '"10 MPa"'), None),
    "compact-tension": (
        {"width": '"50 mm"', "thickness": '"12.5 mm"', "crack_length": '"15 mm"'},
        ('"10 kN"', '"1 kN"'), None),
    "three-point-bend": (
        {"width": '"40 mm"', "thickness": '"20 mm"', "crack_length": '"10 mm"'},
        ('"20 kN"', '"2 kN"'), None),
    "surface-crack-plate": (
        {"width": '"200 mm"', "thickness": '"20 mm"', "half_length": '"8 mm"',
         "crack_length": '"3 mm"'},
        ('"120 MPa"', '"12 MPa"'), None),
    "axial-crack-cylinder": (
        {"inner_radius": '"300 mm"', "thickness": '"20 mm"', "crack_length": '"10 mm"'},
        ('"6 MPa"', '"0.6 MPa"'), None),
    "tabulated": (
        {"width": '"60 mm"', "thickness": '"20 mm"', "crack_length": '"6 mm"'},
        ('"40 kN"', '"4 kN"'), None),
    "crack-at-hole": (
        {"hole_radius": '"10 mm"', "crack_length": '"2 mm"'}, ('"120 MPa"', '"12 MPa"'), '"40 mm"'),
}  # fmt: skip

#: an invented K table for the tabulated shape (not a published solution)
TABLE_ROWS = [
    (x / 100, 1.12 + 0.8 * (x / 100) ** 2 + 6.0 * (x / 100) ** 4) for x in range(5, 85, 5)
]


def _line(key: schema.Key, value: str | None) -> list[str]:
    """The comment lines (meaning, unit, allowed values, default) and the key's line: filled
    in with ``value``, else commented out with its example or default."""
    import textwrap

    parts = [key.meaning + (f" [bare number: {key.unit}]" if key.unit else "")]
    if key.values:
        parts.append("one of " + ", ".join(f'"{v}"' for v in key.values))
    if key.default:
        parts.append(f"default {key.default}")
    shown = key.example if value is None else value
    if shown is None and key.default and _is_toml_value(key.default):
        shown = key.default
    text = "; ".join(parts) if shown else f"{key.name}: " + "; ".join(parts)
    lines = ["# " + c for c in textwrap.wrap(text, 96, break_on_hyphens=False)]
    if value is not None:
        return lines + [f"{key.name} = {value}"]
    return lines + ([f"# {key.name} = {shown}"] if shown else [])


def _is_toml_value(text: str) -> bool:
    import tomllib

    try:
        tomllib.loads(f"x = {text}")
    except tomllib.TOMLDecodeError:
        return False
    return True


def _section(path: str, values: dict, keep=None) -> list[str]:
    sec = schema.section(
        "case" if path != "specimen" else "specimen", "" if path == "specimen" else path
    )
    head = [] if path == "specimen" else ["", f"[{path}]"]
    lines = []
    for k in sec.keys:
        if keep is not None and k.name not in keep and k.name not in values:
            continue
        lines += _line(k, values.get(k.name))
    return head + lines


def template(shape: str, job: str = "run", table_name: str = "table.csv") -> str:
    """The text of the starting file for ``shape`` and ``job`` (run, plan or fit)."""
    from cycj.geometry import SHAPES

    if shape not in SHAPES:
        import difflib

        near = difflib.get_close_matches(shape, list(SHAPES), n=1)
        raise CycjInputError(
            "unknown shape" + (f" (did you mean '{near[0]}'?)" if near else ""),
            key="SHAPE",
            expected="one of " + ", ".join(SHAPES),
            found=shape,
        )
    geo, (pmax, pmin), limit = SHAPE_VALUES[shape]
    s = SHAPES[shape]
    if job == "fit":
        return _specimen(shape, geo)
    out = [
        MARK + f" for {shape} ({job}): replace the invented values with yours.",
        "# Keys: docs/keys.md (or `cycj keys`).  Quantities may carry units; bare numbers are",
        "# internal units (N, mm, MPa, kJ/m^2, h).  Commented lines show optional keys.",
        f'title = "New {shape} case"',
    ]
    out += _section("material", MATERIAL)
    dims = {"shape": f'"{shape}"', **geo}
    if shape == "tabulated":
        dims["table"] = f'"{table_name}"'
    keep = {"shape", "crack_length", "constraint", "notch", *s.required, *s.optional}
    out += _section("geometry", dims, keep=keep)
    load = {"constant": f"{{ max = {pmax}, min = {pmin} }}", "duration": '"10 s"'}
    if "pressure" in s.loading:
        load["quantity"] = '"pressure"'
    out += _section("loading", load)
    out += _section("analysis", {"j_method": '"reference-stress"'})
    out += _section("run", {} if limit is None else {"crack_length_limit": limit})
    if job == "plan":
        a0 = geo["crack_length"]
        out += _section(
            "inspection",
            {
                "pod": f'{{ model = "lognormal", a50 = {a0}, sigma = 0.4 }}',
                "design_life": "1.0e6",
                "samples": "2000",
            },
        )
    out += _section("report", {})
    return "\n".join(out) + "\n"


def _specimen(shape: str, geo: dict) -> str:
    from cycj.calibrate.specimen import DISPLACEMENT_POINTS

    if shape not in DISPLACEMENT_POINTS:
        raise CycjInputError(
            "a test specimen has one of the specimen shapes",
            key="SHAPE",
            expected="one of " + ", ".join(DISPLACEMENT_POINTS),
            found=shape,
        )
    values = {
        "shape": f'"{shape}"',
        **{k: v for k, v in geo.items() if k in ("width", "thickness", "crack_length")},
        **{k: MATERIAL[k] for k in ("elastic_modulus", "yield_strength", "cyclic_curve")},
        "displacement_at": f'"{DISPLACEMENT_POINTS[shape][0]}"',
    }
    head = [
        MARK + f" for a {shape} test specimen (fit): replace the invented values.",
        "# Keys: docs/keys.md (or `cycj keys`).  Use with: cycj fit LOG --specimen THIS_FILE",
    ]
    return "\n".join(head + _section("specimen", values)) + "\n"


def _refuse_existing(path: Path, force: bool) -> None:
    if not path.exists():
        return
    if not force:
        raise CycjInputError(
            "file exists (give --force to replace a file cycj new wrote)", source=str(path)
        )
    try:
        first = path.read_text(encoding="utf-8").splitlines()[:1]
    except (OSError, UnicodeDecodeError):
        first = []
    if not path.is_file() or not first or not first[0].startswith(MARK):
        raise CycjInputError("not a file cycj new wrote: it is never replaced", source=str(path))


def write_template(shape: str, job: str = "run", out=None, *, force: bool = False) -> list[Path]:
    """Write the starting file (and, for the tabulated shape, its K table); return the paths."""
    default = f"{shape}_specimen.toml" if job == "fit" else f"{shape}.toml"
    path = Path(out) if out else Path(default)
    table = path.with_name(path.stem + "_table.csv")
    text = template(shape, job, table_name=table.name)
    files = [(path, text)]
    if shape == "tabulated" and job != "fit":
        rows = [
            MARK + ": an invented K table (not a published solution)",
            "a_over_W,F,limit_load_factor",
        ]
        rows += [f"{x:.2f},{f:.5f},{(1 - x) ** 2:.5f}" for x, f in TABLE_ROWS]
        files.append((table, "\n".join(rows) + "\n"))
    for p, _ in files:
        _refuse_existing(p, force)
    for p, body in files:
        p.parent.mkdir(parents=True, exist_ok=True)
        tmp = p.with_name(f".{p.name}.cycj-tmp-{os.getpid()}")
        tmp.write_text(body, encoding="utf-8")
        os.replace(tmp, p)
    return [p for p, _ in files]
