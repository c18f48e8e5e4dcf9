"""The registry of crack shapes: one :class:`Shape` entry each (dimensions, nominal stress
S(P), validity, K and limit-load bases, references), which also registers the shape's model
record (:mod:`cycj.models`, kind ``geometry``).  The physics of each shape is in its module."""

from __future__ import annotations

from dataclasses import dataclass, field

from cycj.geometry import (
    axial_crack_cylinder,
    center_crack_infinite,
    center_crack_plate,
    compact_tension,
    crack_at_hole,
    edge_crack_plate,
    edge_crack_semi_infinite,
    surface_crack_plate,
    tabulated,
    three_point_bend,
)


@dataclass(frozen=True)
class Shape:
    """Description of one crack configuration (data only; the physics is in its module)."""

    name: str
    code: int
    title: str
    module: object
    required: tuple[str, ...]
    loading: tuple[str, ...]
    nominal_stress: str
    crack: str
    validity: str
    references: tuple[str, ...]
    optional: dict = field(default_factory=dict)
    two_d: bool = False
    k_basis: str = ""
    limit_basis: str = ""


SHAPES: dict[str, Shape] = {}

#: the published basis of each shape's K solution and limit load (docs/physics_bases.md)
BASES = {
    "center-crack-infinite-plate": (
        "K = S√(πa), exact (Irwin; Tada, Paris & Irwin)",
        "S_L = σ_y: the remote stress reaches yield (infinite body)",
    ),
    "edge-crack-semi-infinite": (
        "K = 1.1215·S√(πa) (Tada, Paris & Irwin)",
        "S_L = σ_y: the remote stress reaches yield (semi-infinite body)",
    ),
    "center-crack-plate": (
        "Tada's secant form (Anderson, Fracture Mechanics, Table 2.4)",
        "EPRI NP-1931 (Kumar, German & Shih 1981): P_0 = 2cBσ_0 plane stress, ×2/√3 plane "
        "strain, c = W/2 − a (from memory)",
    ),
    "edge-crack-plate": (
        "Tada's SE(T) form, pin loaded (Anderson, Fracture Mechanics, Table 2.4)",
        "EPRI NP-1931 (Kumar, German & Shih 1981): P_0 = 1.455·η·c·B·σ_0 plane strain, "
        "1.072·η·c·B·σ_0 plane stress, η = √(1 + (a/c)²) − a/c, c = W − a (from memory)",
    ),
    "compact-tension": (
        "Srawley (1976), ASTM E399/E647",
        "EPRI NP-1931 (Kumar, German & Shih 1981): P_0 = 1.455·η·b·B·σ_0 plane strain, "
        "1.072·η·b·B·σ_0 plane stress, η = √((2a/b)² + 2(2a/b) + 2) − (2a/b + 1), b = W − a "
        "(from memory)",
    ),
    "three-point-bend": (
        "Srawley (1976), ASTM E399, span 4W",
        "EPRI NP-1931 (Kumar, German & Shih 1981): P_0 = 0.728·B·b²σ_0/(S/2) plane strain, "
        "0.536·B·b²σ_0/(S/2) plane stress, b = W − a (from memory)",
    ),
    "surface-crack-plate": (
        "Newman & Raju (1981), deepest and surface points (from memory)",
        "BS 7910:2013+A1:2015 Annex P reference stress of a surface flaw in a plate, "
        "membrane and bending (from memory)",
    ),
    "axial-crack-cylinder": (
        "Folias bulging factor: two-term form √(1 + 1.255λ² − 0.0135λ⁴) to λ² = 25, long-flaw "
        "form 0.064λ² + 3.3 beyond (Kiefner & Vieth 1989, z = 2λ²; from memory)",
        "flow-stress collapse of the bulging crack, σ_h = σ_flow/M (Kiefner et al. 1973, from "
        "memory); S_L = σ_y/M with L_r,max = σ_flow/σ_y",
    ),
    "tabulated": (
        "the user's table of F(a/W), monotone cubic interpolation (Fritsch & Carlson 1980)",
        "the user's table: P_L = factor·σ_y·W·B",
    ),
    "crack-at-hole": (
        "Bowie (1956), Tada's fit F2 = ½(3 − s)[1 + 1.243(1 − s)³], F1 = F2·√((2 − s)/2) "
        "(from memory)",
        "S_L = σ_y: the remote stress reaches yield (wide plate)",
    ),
}


def _register(shape: Shape) -> None:
    from dataclasses import replace

    from cycj.models import register

    k_basis, limit_basis = BASES[shape.name]
    shape = replace(shape, k_basis=k_basis, limit_basis=limit_basis)

    register(
        "geometry",
        shape.name,
        shape.code,
        slots=shape.required,
        validity=shape.validity,
        citation=shape.references,
    )
    SHAPES[shape.name] = shape


_register(
    Shape(
        "center-crack-infinite-plate",
        center_crack_infinite.CODE,
        "centre crack in an infinite plate",
        center_crack_infinite,
        (),
        ("stress",),
        "S = remote stress",
        "a = half crack length",
        "a > 0",
        ("Tada, Paris & Irwin, Stress Analysis of Cracks Handbook (2000)",),
    )
)
_register(
    Shape(
        "edge-crack-semi-infinite",
        edge_crack_semi_infinite.CODE,
        "edge crack in a semi-infinite plate",
        edge_crack_semi_infinite,
        (),
        ("stress",),
        "S = remote stress",
        "a = crack depth",
        "a > 0",
        ("Tada, Paris & Irwin, Stress Analysis of Cracks Handbook (2000): 1.1215",),
    )
)
_register(
    Shape(
        "center-crack-plate",
        center_crack_plate.CODE,
        "middle-cracked tension plate, M(T)",
        center_crack_plate,
        ("width", "thickness"),
        ("force", "stress"),
        "S = P/(B·W), W = full width",
        "a = half crack length",
        "0 < 2a/W ≤ 0.95",
        (
            "Tada (1973) secant form, in Anderson, Fracture Mechanics 3rd ed. Table 2.4",
            "Kumar, German & Shih, EPRI NP-1931 (1981): net-section limit load",
        ),
        {"net_thickness": "= thickness"},
    )
)
_register(
    Shape(
        "edge-crack-plate",
        edge_crack_plate.CODE,
        "single-edge-cracked tension plate, SE(T), pin loaded",
        edge_crack_plate,
        ("width", "thickness"),
        ("force", "stress"),
        "S = P/(B·W)",
        "a = crack depth",
        "0 < a/W ≤ 0.9",
        (
            "Tada (1973), in Anderson, Fracture Mechanics 3rd ed. Table 2.4",
            "Kumar, German & Shih, EPRI NP-1931 (1981): limit load 1.455·η·c·σ_0 (plane "
            "strain), 1.072·η·c·σ_0 (plane stress) (from memory)",
        ),
        {"net_thickness": "= thickness"},
    )
)
_register(
    Shape(
        "compact-tension",
        compact_tension.CODE,
        "compact tension specimen, C(T)",
        compact_tension,
        ("width", "thickness"),
        ("force", "stress"),
        "S = P/(B·W); W and a from the load line",
        "a = crack length from the load line",
        "0.2 ≤ a/W ≤ 0.95",
        (
            "Srawley, Int. J. Fract. 12 (1976) 475; ASTM E399/E647/E1820",
            "Kumar, German & Shih, EPRI NP-1931 (1981): limit load",
        ),
        {"net_thickness": "= thickness"},
    )
)
_register(
    Shape(
        "three-point-bend",
        three_point_bend.CODE,
        "single-edge-notched bend, SE(B), S = 4W",
        three_point_bend,
        ("width", "thickness"),
        ("force", "stress"),
        "S = P/(B·W)",
        "a = crack depth",
        "0.1 ≤ a/W ≤ 0.9, span = 4·W",
        (
            "Srawley, Int. J. Fract. 12 (1976) 475; ASTM E399",
            "Kumar, German & Shih, EPRI NP-1931 (1981): limit load",
        ),
        {"net_thickness": "= thickness", "span": "= 4·width"},
    )
)

_register(
    Shape(
        "surface-crack-plate",
        surface_crack_plate.CODE,
        "semi-elliptical surface crack in a plate, tension and bending",
        surface_crack_plate,
        ("width", "thickness", "half_length"),
        ("force", "stress"),
        "S = membrane stress P/(B·W); bending stress = bending_ratio·S",
        "a = depth, c = half_length (both grow)",
        "0 < a/c ≤ 2 (≤ 1 with bending), a/t < 0.8, c/b < 0.5 (b = W/2)",
        (
            "Newman & Raju, Eng. Fract. Mech. 15 (1981) 185 (from memory)",
            "BS 7910:2013+A1:2015 Annex P: reference stress of a surface flaw (from memory)",
        ),
        {"bending_ratio": "= 0"},
        two_d=True,
    )
)

_register(
    Shape(
        "axial-crack-cylinder",
        axial_crack_cylinder.CODE,
        "through-wall axial crack in a pressurised cylinder",
        axial_crack_cylinder,
        ("inner_radius", "thickness"),
        ("pressure", "stress"),
        "S = hoop stress p·R_i/t (wall average)",
        "a = half crack length",
        "λ = a/√(R_m·t) ≤ √50 (two-term bulging factor to λ² = 25, long-flaw form beyond)",
        (
            "Folias, Int. J. Fract. Mech. 1 (1965) 104",
            "Kiefner, Maxey, Eiber & Duffy, ASTM STP 536 (1973): bulging factor, flow-stress "
            "collapse (from memory)",
            "Kiefner & Vieth, AGA/PRCI PR-3-805 (1989): two-term bulging factor for z = 2λ² ≤ 50, "
            "long-flaw form 0.032z + 3.3 beyond (from memory)",
        ),
    )
)
_register(
    Shape(
        "tabulated",
        tabulated.CODE,
        "user geometry from a table of a/W, F, limit-load factor",
        tabulated,
        ("width", "thickness", "table"),
        ("force", "stress"),
        "S = P/(B·W); K = S·√(πa)·F(a/W); P_L = factor·σ_y·W·B",
        "a as defined by the table",
        "inside the table's a/W range",
        ("Fritsch & Carlson, SIAM J. Numer. Anal. 17 (1980) 238: monotone interpolation",),
    )
)

_register(
    Shape(
        "crack-at-hole",
        crack_at_hole.CODE,
        "one or two through cracks at a circular hole in a wide plate",
        crack_at_hole,
        ("hole_radius",),
        ("stress",),
        "S = remote stress",
        "a = crack length from the hole's edge",
        "a > 0; hole radius R > 0",
        (
            "Bowie, J. Math. Phys. 35 (1956) 60; Tada, Paris & Irwin (2000) p. 19.1 (fit, from "
            "memory)",
        ),
        {"cracks": "= 2 (or 1)"},
    )
)

#: shapes accepted in ``geometry.shape``
SHAPE_NAMES = tuple(SHAPES)
