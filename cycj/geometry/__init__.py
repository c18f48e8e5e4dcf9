"""Crack configurations: stress intensity solution, limit load, validity range, kernel code.

Each shape has a module with compiled scalar kernels (``k_over_s``, ``limit_stress``) and an
entry in :data:`SHAPES` describing its dimensions, nominal stress S(P), validity and sources.
The nominal stress definition makes every shape look alike to the rest of cycj:
K = S·k_over_s(a) and the plastic limit load corresponds to the nominal stress
S_L(a) = limit_stress(a, σ_y), so L_r = S/S_L and σ_ref = S·σ_y/S_L.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from cycj.errors import CycjInputError
from cycj.geometry import (
    _params as P,
)
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


@dataclass(frozen=True)
class Geometry:
    """A crack configuration with its dimensions [mm] resolved.

    ``params`` is the plain float64 array handed to the compiled kernels.
    """

    shape: Shape
    crack_length: float
    params: np.ndarray
    plane_strain: bool
    dims: dict
    notch: dict | None = None  # {kt, depth [mm], root_radius [mm]} for j_method "notch"

    @property
    def code(self) -> int:
        return self.shape.code

    @property
    def two_d(self) -> bool:
        """True for cracks with two growing dimensions (depth a and half-length c)."""
        return self.shape.two_d

    def k_over_s_surface(self, a):
        """K/S at the surface point of a two-dimensional crack [√mm] (vectorised)."""
        self.check_crack(a)
        return _vectorised("k_over_s_surface")(self.code, np.asarray(a, float), self.params)

    @property
    def size_limits(self) -> tuple[float, float]:
        """Smallest and largest crack size [mm] inside the solution's validity range."""
        return self.shape.module.size_limits(self.params)

    def check_crack(self, a, what: str = "crack length") -> None:
        """Raise ValidityRangeError if any crack size in ``a`` is outside the validity range."""
        from cycj.errors import ValidityRangeError

        lo, hi = self.size_limits
        arr = np.atleast_1d(np.asarray(a, dtype=float))
        bad = arr[~((arr > 0) & (arr >= lo * (1 - 1e-12)) & (arr <= hi * (1 + 1e-12)))]
        if bad.size:
            raise ValidityRangeError(
                f"{what} {bad[0]:.6g} mm is outside the validity range of {self.shape.name} "
                f"({self.shape.validity}: {lo:.6g} to {hi:.6g} mm)"
            )

    def k_over_s(self, a):
        """K per unit nominal stress [√mm] (vectorised, range-checked)."""
        self.check_crack(a)
        return _vectorised("k_over_s")(self.code, np.asarray(a, float), self.params)

    def limit_stress(self, a, sigma_y: float):
        """Nominal stress at the limit load [MPa] (vectorised, range-checked)."""
        self.check_crack(a)
        return _vectorised("limit_stress")(
            self.code, np.asarray(a, float), self.params, float(sigma_y)
        )

    def stress_intensity(self, a, nominal_stress):
        """K [MPa√mm] for crack ``a`` [mm] and nominal stress [MPa]."""
        return np.asarray(nominal_stress, float) * self.k_over_s(a)

    def nominal_stress_per_pressure(self) -> float:
        """Hoop stress per unit pressure, R_i/t (pressurised shapes only)."""
        if "pressure" not in self.shape.loading:
            raise CycjInputError(
                f"shape {self.shape.name} takes no pressure loading",
                key="loading.quantity",
                expected="'force' or 'stress'",
                found="pressure",
            )
        return self.params[P.EXTRA] / self.params[P.THICKNESS]

    def nominal_stress_per_force(self) -> float:
        """S per unit force [MPa/N] (1/(B·W)); raises for the infinite bodies."""
        w, b = self.params[P.WIDTH], self.params[P.THICKNESS]
        if w <= 0 or b <= 0 or "force" not in self.shape.loading:
            raise CycjInputError(
                f"shape {self.shape.name} takes a stress history only",
                key="loading.quantity",
                expected="'stress'",
                found="force",
            )
        return 1.0 / (w * b)


def _vectorised(name):
    from cycj.geometry import dispatch

    fn = getattr(dispatch, name)

    def call(code, a, params, *extra):
        a = np.atleast_1d(a)
        out = np.empty(a.shape, float)
        for i, ai in enumerate(a.flat):
            out.flat[i] = fn(code, float(ai), params, *extra)
        return out if out.size > 1 else float(out[0])

    return call


def make_geometry(
    shape: str,
    crack_length: float,
    *,
    width: float = 0.0,
    thickness: float = 0.0,
    net_thickness: float | None = None,
    span: float | None = None,
    constraint: str = "plane-strain",
    half_length: float = 0.0,
    bending_ratio: float = 0.0,
    inner_radius: float = 0.0,
    table=None,
    hole_radius: float = 0.0,
    cracks: int = 2,
    source: str | None = None,
    prefix: str = "geometry",
) -> Geometry:
    """Build a :class:`Geometry` from dimensions in mm, checking them (errors name the key)."""
    if shape not in SHAPES:
        import difflib

        near = difflib.get_close_matches(shape, SHAPE_NAMES, n=1)
        hint = f" (did you mean '{near[0]}'?)" if near else ""
        raise CycjInputError(
            f"unknown shape{hint}",
            source=source,
            key=f"{prefix}.shape",
            expected="one of " + ", ".join(SHAPE_NAMES),
            found=shape,
        )
    s = SHAPES[shape]
    if constraint not in ("plane-strain", "plane-stress"):
        raise CycjInputError(
            "unknown constraint",
            source=source,
            key=f"{prefix}.constraint",
            expected="'plane-strain' or 'plane-stress'",
            found=constraint,
        )
    vals = {
        "width": width,
        "thickness": thickness,
        "half_length": half_length,
        "inner_radius": inner_radius,
        "table": 1.0 if table is not None else 0.0,
        "hole_radius": hole_radius,
    }
    for k in s.required:
        if not (vals[k] > 0 and math.isfinite(vals[k])):
            raise CycjInputError(
                "must be a positive size",
                source=source,
                key=f"{prefix}.{k}",
                expected=f"a length > 0 for {shape}",
                found=vals[k],
            )
    bn = thickness if net_thickness is None else net_thickness
    if "thickness" in s.required and not (0 < bn <= thickness):
        raise CycjInputError(
            "net thickness must be positive and not above the thickness",
            source=source,
            key=f"{prefix}.net_thickness",
            expected=f"0 < B_N ≤ {thickness:g} mm",
            found=bn,
        )
    sp = 4.0 * width if span is None else span
    if shape == "three-point-bend" and abs(sp / width - 4.0) > 0.04:
        raise CycjInputError(
            "the SE(B) solution is published for span = 4·width only",
            source=source,
            key=f"{prefix}.span",
            expected=f"{4 * width:g} mm",
            found=sp,
        )
    p = np.zeros(P.N_PARAMS)
    p[P.WIDTH], p[P.THICKNESS], p[P.NET_THICKNESS] = width, thickness, bn
    p[P.SPAN] = sp
    p[P.PLANE_STRAIN] = 1.0 if constraint == "plane-strain" else 0.0
    p[P.HALF_LENGTH], p[P.BENDING_RATIO] = half_length, bending_ratio
    p[P.EXTRA] = inner_radius
    p[P.HOLE_RADIUS], p[P.CRACKS] = hole_radius, cracks
    if cracks not in (1, 2):
        raise CycjInputError(
            "a crack at a hole has 1 or 2 cracks",
            source=source,
            key=f"{prefix}.cracks",
            expected="1 or 2",
            found=cracks,
        )
    if table is not None:
        p = np.concatenate([p, tabulated.table_params(*table)])
    if s.two_d:
        _check_surface_crack(
            crack_length, half_length, width, thickness, bending_ratio, source, prefix
        )
    geo = Geometry(
        s,
        float(crack_length),
        p,
        constraint == "plane-strain",
        {
            "width": width,
            "thickness": thickness,
            "net_thickness": bn,
            "span": sp,
            "half_length": half_length,
            "bending_ratio": bending_ratio,
            "inner_radius": inner_radius,
            "hole_radius": hole_radius,
            "cracks": cracks,
        },
    )
    lo, hi = geo.size_limits
    if not (crack_length > 0 and lo * (1 - 1e-12) <= crack_length <= hi * (1 + 1e-12)):
        raise CycjInputError(
            "crack outside the body or the solution's validity range",
            source=source,
            key=f"{prefix}.crack_length",
            expected=f"{lo:g} < a ≤ {hi:g} mm ({s.validity})",
            found=crack_length,
        )
    return geo


def _check_surface_crack(a, c, w, t, beta, source, prefix):
    """Newman–Raju validity at the start: 0 < a/c ≤ 2 (≤ 1 with bending), c/b < 0.5."""
    aspect_max = 1.0 if beta else 2.0
    if not c > 0 or not 0 < a / c <= aspect_max:
        raise CycjInputError(
            "aspect ratio a/c outside the Newman–Raju range",
            source=source,
            key=f"{prefix}.half_length",
            expected=f"0 < a/c ≤ {aspect_max:g}",
            found=c,
        )
    if not c < 0.25 * w:
        raise CycjInputError(
            "half-length too large for the plate width (c/b < 0.5)",
            source=source,
            key=f"{prefix}.half_length",
            expected=f"c < {0.25 * w:g} mm (W/4)",
            found=c,
        )
