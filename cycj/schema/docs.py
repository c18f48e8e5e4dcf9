"""The key reference (docs/keys.md) written from the declarations of :mod:`cycj.schema`.

``cycj keys`` prints it; ``cycj keys --write docs/keys.md`` writes the committed copy (a test
asserts the two are equal, so the reference cannot drift from the keys the code reads).
"""

from __future__ import annotations

from cycj import schema

INTRO = """\
# Keys of the input files

Generated from `cycj/schema/` by `cycj keys --write docs/keys.md`; do not edit by hand (a test
checks this file equals the generated one).  `cycj new SHAPE` writes a commented starting case.

Any quantity may carry a unit in quotes (`"200 GPa"`, `"12 kN"`, `"60 MPa*m**0.5"`, `"8 h"`);
a bare number is in the internal unit of the column *bare number* (N, mm, MPa, kJ/m² = N/mm,
MPa√mm, hours, cycles).  Paths inside a file are relative to that file.  A key that is not
listed for its table is refused with a "did you mean", and so is a required key spelt wrongly.

Read this first:

- **An edge crack in a wall** (`edge-crack-plate`): `width` is the wall thickness, the
  dimension the crack grows across; `thickness` is the length along the crack front.
- **`duration`** is the time of one pass of the load history (or of one cycle of a constant
  load); lives are then also given in hours.  Without it lives are in cycles only.
- **`driving_unit`** names the unit of the driving force the growth law was printed in: a ΔJ
  unit (`"kJ/m^2"`, `"N/mm"`) or a ΔK unit with `**` for powers (`"MPa*m**0.5"`,
  `"ksi*in**0.5"`); with a ΔK unit C and m are a ΔK law, converted exactly.
  `rate_unit` is the length unit of da/dN per cycle (`"mm"`, `"m"`, `"in"`).
- **A notch's `depth`** is the depth D from the surface to the notch root along the crack
  line; the crack length is measured from the root, and the long crack it becomes has length
  a + D.
"""


def _cell(text) -> str:
    return "" if text is None else str(text).replace("|", "\\|").replace("\n", " ")


def _required(k: schema.Key) -> str:
    if k.required is True:
        return "**required**"
    if k.required:
        return f"required {k.required}"
    return ""


def _row(k: schema.Key) -> str:
    allowed = ", ".join(f"`{v}`" for v in k.values)
    default = _required(k) or _cell(k.default)
    if k.required and k.required is not True and k.default:
        default += f"; else {_cell(k.default)}"
    example = f"`{_cell(k.example)}`" if k.example else ""
    return (
        f"| `{k.name}` | {_cell(k.meaning)} | {k.unit or k.kind} | {default} | {allowed} "
        f"| {example} |"
    )


def markdown() -> str:
    """The whole key reference as Markdown."""
    out = [INTRO]
    for doc, title in (("case", "Case file"), ("specimen", "Specimen file")):
        out.append(f"## {title}\n")
        for sec in schema.sections(doc):
            out.append(f"### {sec.title}\n")
            if sec.note:
                out.append(sec.note + "\n")
            out.append("| key | meaning | bare number / kind | default | allowed | example |")
            out.append("|---|---|---|---|---|---|")
            out.extend(_row(k) for k in sec.keys)
            out.append("")
    return "\n".join(out).rstrip() + "\n"
