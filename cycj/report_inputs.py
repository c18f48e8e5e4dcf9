"""The rows of a report's Inputs table a case gives: material, geometry (the shape's own
dimensions only), loads and the models chosen — every quantity with its unit, in the output
unit system in force (:func:`cycj.display.units`)."""

from __future__ import annotations

from cycj.display import count, hours, num, units

#: dimensions that are counts or ratios, not lengths
_PLAIN_DIMS = {"cracks": "number of cracks", "bending_ratio": "bending ratio (bending/total)"}
_DIM_WORDS = {
    "width": "width W",
    "thickness": "thickness B",
    "net_thickness": "net thickness B_N",
    "span": "span",
    "half_length": "surface half-length c",
    "inner_radius": "inner radius",
    "hole_radius": "hole radius",
}


def material_rows(material, plane_strain: bool) -> list[tuple[str, str]]:
    """E, ν, σ_y, σ_u, the cyclic (and monotonic) curve K', n', J_c and the J–R curve."""
    u = units()
    m = material
    rows = [
        ("elastic modulus E", u.q(m.elastic_modulus, "stress")),
        ("Poisson's ratio ν", num(m.poisson_ratio, 3)),
        ("yield strength σ_y", u.q(m.yield_strength, "stress")),
    ]
    if m.tensile_strength:
        rows.append(("tensile strength σ_u", u.q(m.tensile_strength, "stress")))
    for name, curve in (("cyclic", m.cyclic_curve), ("monotonic", m.monotonic_curve)):
        if curve is not None:
            rows.append(
                (
                    f"{name} stress–strain curve (Ramberg–Osgood)",
                    f"K' = {u.q(curve.strength_coefficient, 'stress')}, "
                    f"n' = {num(curve.hardening_exponent, 3)}",
                )
            )
    rows.append(
        (
            "toughness J_c",
            u.q(m.J_c, "energy_per_area") if m.J_c else "not given",
        )
    )
    if m.resistance_curve is not None:
        r = m.resistance_curve
        rows.append(
            (
                "J–R curve J_R = C1·(Δa / 1 mm)^C2",
                f"C1 = {u.q(r.C1, 'energy_per_area')}, C2 = {num(r.C2, 3)}",
            )
        )
    rows.append(("constraint", "plane strain" if plane_strain else "plane stress"))
    return rows


def geometry_rows(geometry) -> list[tuple[str, str]]:
    """The shape and its own dimensions (required and optional ones only)."""
    u = units()
    shape = geometry.shape
    rows = [("shape", f"{shape.name} ({shape.title})")]
    own = (*shape.required, *shape.optional)
    for key in own:
        if key not in geometry.dims:
            continue
        v = geometry.dims[key]
        if key in _PLAIN_DIMS:
            rows.append((_PLAIN_DIMS[key], num(v, 4)))
        elif isinstance(v, (int, float)):
            rows.append((_DIM_WORDS.get(key, key.replace("_", " ")), u.q(v, "length")))
    rows.append(("initial crack size a", u.q(geometry.crack_length, "length")))
    if geometry.notch:
        n = geometry.notch
        rows.append(
            (
                "notch",
                f"K_t = {num(n.get('kt'), 3)}, depth {u.q(n.get('depth'), 'length')}, "
                f"root radius {u.q(n.get('root_radius'), 'length')}",
            )
        )
    return rows


def loading_rows(case, loads=None) -> list[tuple[str, str]]:
    """The load (history file or constant amplitude), its range, duration and closure."""
    u = units()
    ld = case.loading
    kind = "force" if ld.quantity == "force" else "stress"
    rows = []
    if ld.constant is not None:
        hi, lo = ld.constant
        rows.append(
            (
                "constant-amplitude load",
                f"max {u.q(hi, kind)}, min {u.q(lo, kind)}, range {u.q(hi - lo, kind)}",
            )
        )
    elif ld.history is not None:
        rows.append(("load history", str(ld.history)))
        if ld.column:
            rows.append(("history column", ld.column))
        if ld.scale != 1.0:
            rows.append(("scale on the history", num(ld.scale)))
    if loads is not None:
        rows.append(("cycles per block (one pass)", count(loads.n)))
        if getattr(loads, "hours_per_block", None):
            rows.append(("duration of one pass", hours(loads.hours_per_block)))
    elif ld.duration_h:
        rows.append(("duration of one pass", hours(ld.duration_h)))
    cl = ld.closure
    closure = cl.model
    if cl.model == "constant":
        closure += f" (U = {num(cl.U, 3)})"
    elif cl.model == "newman":
        alpha, why = case.newman_constraint_factor()
        closure += f" (constraint factor α = {num(alpha, 3)}, {why})"
    rows.append(("crack closure", closure))
    rows.append(("compressive part of a cycle", ld.compressive_part))
    if ld.sequence != "none":
        opts = ", ".join(f"{k} = {num(v, 3)}" for k, v in ld.sequence_options.items())
        rows.append(("load sequence model", ld.sequence + (f" ({opts})" if opts else "")))
    return rows


def growth_rows(growth) -> list[tuple[str, str]]:
    """The growth law C, m, threshold and basis (ΔJ in kJ/m², da/dN in mm/cycle)."""
    u = units()
    g = growth
    rows = [
        (
            "growth law",
            f"da/dN = C·ΔJ^m with C = {num(g.C)}, m = {num(g.m)} (ΔJ in kJ/m², da/dN in "
            f"mm/cycle), on the {g.basis} range",
        ),
        (
            "growth threshold ΔJ_th",
            u.q(g.threshold, "energy_per_area") if g.threshold else "none (zero)",
        ),
    ]
    if g.toughness_exponent:
        rows.append(("acceleration near J_c, exponent q", num(g.toughness_exponent, 3)))
    if g.valid_dJ:
        lo, hi = g.valid_dJ
        rows.append(
            (
                "ΔJ range of the data behind the law",
                f"{u.q(lo, 'energy_per_area')} to {u.q(hi, 'energy_per_area')}",
            )
        )
    return rows


def case_rows(case, loads=None) -> list[tuple[str, str]]:
    """Every input row of a case: file, material, geometry, loads, growth law, models."""
    rows = [("case file", str(case.path) if case.path else "built in Python")]
    rows += material_rows(case.material, case.geometry.plane_strain)
    rows += geometry_rows(case.geometry)
    rows += loading_rows(case, loads)
    rows += growth_rows(case.growth)
    rows.append(("ΔJ estimate (j_method)", case.analysis.j_method))
    if "fad" in case.run.criteria:
        rows.append(("failure assessment diagram", case.analysis.fad))
    rows.append(("end criteria", ", ".join(case.run.criteria)))
    rows.append(("cycle limit", count(case.run.max_cycles)))
    if case.run.crack_length_limit:
        rows.append(("crack size limit", units().q(case.run.crack_length_limit, "length")))
    return rows
