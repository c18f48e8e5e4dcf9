"""The ``[material]`` table of a case file → :class:`~cycj.material.Material` and the growth law,
in internal units, with one-line errors (keys in README.md, "Case files")."""

from __future__ import annotations

import math

from cycj import models
from cycj.errors import CycjInputError, ValidityRangeError
from cycj.geometry import Geometry
from cycj.growth import GrowthLaw, from_delta_k
from cycj.material import Material, ResistanceCurve, StressStrainCurve
from cycj.tables import Table
from cycj.units import rate_factor, to_internal, unit_factor

#: largest growth exponent accepted (ΔK exponents of metals and polymers stay well below)
M_MAX = 20.0


def _curve(t: Table | None) -> StressStrainCurve | None:
    if t is None:
        return None
    k = t.quantity("strength_coefficient", "stress", required=True, positive=True)
    n = t.number("hardening_exponent", required=True, lo=(0.0, "> 0"), hi=(1.0, "< 1"))
    if not 0 < n < 1:
        raise t.error("hardening_exponent", "out of range", expected="0 < n' < 1", found=n)
    t.finish()
    return StressStrainCurve(k, n)


def read_material(t: Table, geometry: Geometry) -> tuple[Material, str]:
    e = t.quantity("elastic_modulus", "stress", required=True, positive=True)
    nu = t.number("poisson_ratio", default=0.3)
    if not 0 <= nu < 0.5:
        raise t.error("poisson_ratio", "out of range", expected="0 ≤ ν < 0.5", found=nu)
    sy = t.quantity("yield_strength", "stress", required=True, positive=True)
    su = t.quantity("tensile_strength", "stress", positive=True)
    if su is not None and su < sy:
        raise t.error(
            "tensile_strength", "below the yield strength", expected=f"≥ {sy:g} MPa", found=su
        )
    cyc = _curve(t.table("cyclic_curve"))
    mono = _curve(t.table("monotonic_curve"))
    jc, rcurve, note = None, None, "none"
    tough = t.table("toughness")
    if tough is not None:
        jc = tough.quantity("J_c", "energy_per_area", positive=True)
        kc = tough.quantity("K_c", "stress_intensity", positive=True)
        if jc is not None and kc is not None:
            raise tough.error("K_c", "give J_c or K_c, not both")
        e_prime = e / (1 - nu**2) if geometry.plane_strain else e
        note = "J_c"
        if kc is not None:
            jc, note = kc**2 / e_prime, "K_c converted with J_c = K_c²/E'"
        rc = tough.table("resistance_curve")
        if rc is not None:
            c1 = rc.quantity("C1", "energy_per_area", required=True, positive=True)
            c2 = rc.number("C2", required=True, positive=True)
            rc.finish()
            try:
                rcurve = ResistanceCurve(c1, c2)
            except ValidityRangeError as exc:
                raise rc.error("C2", str(exc), found=c2) from None
        tough.finish()
    mat = Material(e, nu, sy, su, cyc, mono, jc, rcurve)
    return mat, note


def read_growth(t: Table, material: Material, geometry: Geometry) -> GrowthLaw:
    from dataclasses import replace

    valid = _valid_dj(t)
    return replace(_read_growth(t, material, geometry), valid_dJ=valid)


def _valid_dj(t: Table):
    """``valid_dJ = ["1.46 kJ/m^2", "3.89 kJ/m^2"]``: the ΔJ range of the data behind the
    constants (written by ``cycj fit``), as (low, high) [kJ/m²], or None."""
    raw = t.get("valid_dJ")
    if raw is None:
        return None
    if not isinstance(raw, list) or len(raw) != 2:
        raise t.error(
            "valid_dJ", "must be a list of two ΔJ values", expected='["1 kJ/m^2", "4 kJ/m^2"]'
        )
    lo, hi = (
        to_internal(v, "energy_per_area", key=t.key("valid_dJ"), source=t.source) for v in raw
    )
    if not 0 <= lo < hi:
        raise t.error("valid_dJ", "out of range", expected="0 ≤ low < high", found=raw)
    return (lo, hi)


def _read_growth(t: Table, material: Material, geometry: Geometry) -> GrowthLaw:
    law = t.choice("law", models.names("growth_law"), default="paris")
    basis = t.choice("basis", ("applied", "effective"), default="applied")
    q = t.number("toughness_exponent", default=0.0, nonnegative=True)
    e_prime = material.effective_modulus(geometry.plane_strain)
    dk = t.table("from_delta_K")
    if dk is not None:
        if t.has("C") or t.has("m"):
            raise t.error("from_delta_K", "give C and m either here or in from_delta_K")
        out = _delta_k_law(dk, e_prime, basis=basis, law=law, toughness_exponent=q)
        t.finish()
        return _finite_law(out, dk)
    c = t.number("C", required=True, positive=True)
    m = t.number("m", required=True, lo=(1e-3, "0.001"), hi=(M_MAX, str(M_MAX)))
    rate_unit = t.string("rate_unit", default="mm")
    driving_unit = t.string("driving_unit", default="kJ/m^2")
    thr_raw = t.get("threshold")
    t.finish()
    kind = _driving_kind(driving_unit, t, "driving_unit")
    if kind == "stress_intensity":  # a ΔK law entered directly: convert exactly
        c_k = c * rate_factor(rate_unit, driving_unit, kind, m, key=t.path, source=t.source)
        thr = (
            0.0
            if thr_raw is None
            else to_internal(thr_raw, kind, key=t.key("threshold"), source=t.source)
        )
        return _finite_law(
            from_delta_k(
                c_k,
                m,
                e_prime,
                thr,
                basis=basis,
                law=law,
                toughness_exponent=q,
                converted_from={
                    "C": c,
                    "m": m,
                    "rate_unit": rate_unit,
                    "driving_unit": driving_unit,
                },
            ),
            t,
        )
    c_int = c * rate_factor(rate_unit, driving_unit, kind, m, key=t.path, source=t.source)
    thr = (
        0.0
        if thr_raw is None
        else to_internal(thr_raw, "energy_per_area", key=t.key("threshold"), source=t.source)
    )
    if thr < 0:
        raise t.error("threshold", "out of range", expected="≥ 0", found=thr_raw)
    return _finite_law(GrowthLaw(c_int, m, thr, basis, law, q), t)


def _finite_law(law: GrowthLaw, t: Table) -> GrowthLaw:
    """The law in internal units must have a finite C > 0 (units or m can push it out)."""
    if not (math.isfinite(law.C) and law.C > 0 and math.isfinite(law.threshold)):
        raise t.error(
            "C",
            "the coefficient in internal units (mm/cycle, kJ/m²) is not a finite number > 0",
            expected="C, m and units that give a finite law",
            found=law.C,
        )
    return law


def _driving_kind(unit: str, t: Table, key: str) -> str:
    for kind in ("energy_per_area", "stress_intensity"):
        try:
            unit_factor(unit, kind)
            return kind
        except CycjInputError:
            continue
    raise t.error(
        key, "not a unit of ΔJ or ΔK", expected="e.g. 'kJ/m^2' or 'MPa*m**0.5'", found=unit
    )


def _delta_k_law(t: Table, e_prime: float, **kw) -> GrowthLaw:
    c = t.number("C", required=True, positive=True)
    m = t.number("m", required=True, lo=(1e-3, "0.001"), hi=(M_MAX, str(M_MAX)))
    # a printed ΔK law means nothing without its units: both are required
    for name in ("rate_unit", "driving_unit"):
        if not t.has(name):
            raise t.error(
                name,
                "missing: a law from ΔK needs the units it was printed in",
                expected='e.g. { C = 1.648e-11, m = 3.0, rate_unit = "m", '
                'driving_unit = "MPa*m**0.5" }',
            )
    rate_unit = t.string("rate_unit", required=True)
    driving_unit = t.string("driving_unit", required=True)
    thr = t.quantity("threshold", "stress_intensity", nonnegative=True, default=0.0)
    t.finish()
    c_k = c * rate_factor(
        rate_unit, driving_unit, "stress_intensity", m, key=t.path, source=t.source
    )
    return from_delta_k(
        c_k,
        m,
        e_prime,
        thr,
        converted_from={"C": c, "m": m, "rate_unit": rate_unit, "driving_unit": driving_unit},
        **kw,
    )
