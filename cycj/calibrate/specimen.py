"""The specimen file of a fatigue crack growth test (TOML) → :class:`Specimen`.

Keys (README.md, "Calibration from replicate tests"): shape, width, thickness, net_thickness,
crack_length (initial), constraint, elastic_modulus, poisson_ratio, yield_strength, optional
tensile_strength and cyclic_curve {strength_coefficient, hardening_exponent}, span (SE(B)),
displacement_at, log_units {load, displacement, crack_length}.  Added here: final_crack_length
(optical reading after the test), crack_correction ("none" | "first" | "first-last"),
opening_offset (compliance-offset criterion, default 0.02 = 2 %), opening_segment_point
("midpoint", the ASTM E647 X2 practice, or "lower-end": the force each offset segment stands
for), label.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from cycj.errors import CycjInputError, ValidityRangeError
from cycj.geometry import Geometry, make_geometry
from cycj.material import Material, StressStrainCurve
from cycj.tables import Table, read_toml
from cycj.units import unit_factor

#: measuring points accepted per shape
DISPLACEMENT_POINTS = {
    "compact-tension": ("front-face", "load-line", "crack-mouth"),
    "three-point-bend": ("load-line",),
    "center-crack-plate": ("load-line",),
    "edge-crack-plate": ("load-line",),
}
#: shapes a specimen may have
SPECIMEN_SHAPES = tuple(DISPLACEMENT_POINTS)


@dataclass(frozen=True)
class Specimen:
    """A test specimen in internal units (mm, MPa) with its log units as factors to N and mm."""

    label: str
    geometry: Geometry
    material: Material
    displacement_at: str
    load_factor: float
    displacement_factor: float
    crack_factor: float
    initial_crack: float
    final_crack: float | None
    crack_correction: str
    opening_offset: float
    source: str
    #: the force each compliance-offset segment stands for: "midpoint" (ASTM E647 X2) or
    #: "lower-end"
    opening_segment_point: str = "midpoint"

    @property
    def shape(self) -> str:
        return self.geometry.shape.name

    @property
    def width(self) -> float:
        return self.geometry.dims["width"]

    @property
    def e_prime(self) -> float:
        return self.material.effective_modulus(self.geometry.plane_strain)

    @property
    def compliance_point(self) -> str:
        """E647 row used: the C(T) crack mouth is the front face (X/W = −0.25)."""
        return "front-face" if self.displacement_at == "crack-mouth" else self.displacement_at


def read_specimen(path) -> Specimen:
    """Read and check a specimen file; errors are one line naming the file and key."""
    src = str(path)
    t = Table(read_toml(path, role="specimen"), "", src, doc="specimen")
    shape = t.choice("shape", SPECIMEN_SHAPES, required=True)
    width = t.quantity("width", "length", required=True, positive=True)
    thick = t.quantity("thickness", "length", required=True, positive=True)
    net = t.quantity("net_thickness", "length", positive=True)
    a0 = t.quantity("crack_length", "length", required=True, positive=True)
    span = t.quantity("span", "length", positive=True)
    constraint = t.choice("constraint", ("plane-strain", "plane-stress"), default="plane-strain")
    geo = make_geometry(
        shape,
        a0,
        width=width,
        thickness=thick,
        net_thickness=net,
        span=span,
        constraint=constraint,
        source=src,
        prefix="specimen",
    )
    e = t.quantity("elastic_modulus", "stress", required=True, positive=True)
    nu = t.number("poisson_ratio", default=0.3, lo=(0.0, "0"), hi=(0.4999, "0.5"))
    sy = t.quantity(
        "yield_strength", "stress", required=True, lo=(1e-3, "0.001 MPa"), hi=(1e5, "100 GPa")
    )
    su = t.quantity("tensile_strength", "stress", positive=True)
    cyc = None
    ct = t.table("cyclic_curve")
    if ct is not None:
        k = ct.quantity("strength_coefficient", "stress", required=True, positive=True)
        n = ct.number("hardening_exponent", required=True, lo=(1e-6, "0"), hi=(0.999, "1"))
        ct.finish()
        cyc = StressStrainCurve(k, n)
    try:
        mat = Material(e, nu, sy, su, cyc)
    except ValidityRangeError as exc:
        raise CycjInputError(str(exc), source=src, key="tensile_strength") from None
    points = DISPLACEMENT_POINTS[shape]
    # the compliance solution depends on where the gauge sits: no default is safe
    disp_at = t.choice("displacement_at", points, required=True)
    units = t.table("log_units")
    factors = {"load": 1.0, "displacement": 1.0, "crack_length": 1.0}
    if units is not None:
        for key, kind in (
            ("load", "force"),
            ("displacement", "length"),
            ("crack_length", "length"),
        ):
            u = units.string(key)
            if u is not None:
                factors[key] = unit_factor(u, kind, key=units.key(key), source=src)
        units.finish()
    a1 = t.quantity("final_crack_length", "length", positive=True)
    if a1 is not None and not a0 < a1 < geo.size_limits[1] * (1 + 1e-9):
        raise CycjInputError(
            "final crack must exceed the initial one and lie in the range",
            source=src,
            key="final_crack_length",
            expected=f"{a0:g} < a ≤ {geo.size_limits[1]:g} mm",
            found=a1,
        )
    corr = t.choice("crack_correction", ("none", "first", "first-last"), default="none")
    if corr == "first-last" and a1 is None:
        raise CycjInputError(
            "'first-last' needs final_crack_length",
            source=src,
            key="crack_correction",
            expected="'none' or 'first'",
            found=corr,
        )
    off = t.number("opening_offset", default=0.02, lo=(0.001, "0.001"), hi=(0.2, "0.2"))
    seg_point = t.choice("opening_segment_point", ("midpoint", "lower-end"), default="midpoint")
    label = t.string("label", default=Path(src).stem)
    t.finish()
    return Specimen(
        label,
        geo,
        mat,
        disp_at,
        factors["load"],
        factors["displacement"],
        factors["crack_length"],
        a0,
        a1,
        corr,
        off,
        src,
        seg_point,
    )
