"""Crack configurations: stress intensity solution, limit load, validity range, kernel code.

Each shape has a module with compiled scalar kernels (``k_over_s``, ``limit_stress``) and an
entry in :data:`SHAPES` describing its dimensions, nominal stress S(P), validity and sources.
The nominal stress definition makes every shape look alike to the rest of cycj:
K = S·k_over_s(a) and the plastic limit load corresponds to the nominal stress
S_L(a) = limit_stress(a, σ_y), so L_r = S/S_L and σ_ref = S·σ_y/S_L.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj.errors import CycjInputError
from cycj.geometry import (
    _params as P,
)
from cycj.geometry import tabulated
from cycj.geometry.shapes import BASES, SHAPE_NAMES, SHAPES, Shape  # noqa: E402,F401 - re-exported


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
