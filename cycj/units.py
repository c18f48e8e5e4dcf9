"""Quantities at the boundary: unit strings (parsed by pint) to cycj's internal units.

Internal units: force N, length mm, stress MPa, J (and ΔJ) kJ/m² (numerically N/mm), stress
intensity MPa·√mm, crack growth rate mm/cycle, time h.  A bare number is taken to be in the
internal unit already.  Conversion happens once, where a case file or log is read.
"""

from __future__ import annotations

import math
from functools import lru_cache

from cycj.errors import CycjInputError

#: internal unit of each kind of quantity (pint spelling) and a human name of its dimension
INTERNAL = {
    "force": ("newton", "a force (e.g. '12 kN')"),
    "length": ("millimeter", "a length (e.g. '25 mm')"),
    "stress": ("megapascal", "a stress (e.g. '350 MPa')"),
    "energy_per_area": ("kilojoule / meter ** 2", "energy per area (e.g. '150 kJ/m^2')"),
    "stress_intensity": (
        "megapascal * millimeter ** 0.5",
        "a stress intensity (e.g. '60 MPa*m**0.5')",
    ),
    "time": ("hour", "a time (e.g. '8 h')"),
    "dimensionless": ("dimensionless", "a plain number"),
}

#: 1 MPa√m in MPa√mm
MPA_SQRT_M = math.sqrt(1000.0)


@lru_cache(maxsize=1)
def registry():
    """The shared pint unit registry (imported lazily: pint is slow to import)."""
    import pint

    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("cycle = [] = cycles")
    return ureg


def _clean(text: str) -> str:
    return (
        text.replace("√", "sqrt")
        .replace("²", "**2")
        .replace("³", "**3")
        .replace("^", "**")
        .replace("·", "*")
        .strip()
    )


def to_internal(value, kind: str, *, key: str = "", source: str | None = None) -> float:
    """Convert ``value`` (a number, or a string such as ``"25 mm"``) to the internal unit of
    ``kind`` (a key of :data:`INTERNAL`).  Raises :class:`CycjInputError` naming ``key``."""
    human = INTERNAL[kind][1]
    if isinstance(value, bool):
        raise CycjInputError("not a quantity", source=source, key=key, expected=human, found=value)
    if isinstance(value, (int, float)):
        out = float(value)
    elif isinstance(value, str):
        out = _parse(value, kind, key, source)
    else:
        raise CycjInputError("not a quantity", source=source, key=key, expected=human, found=value)
    if not math.isfinite(out):
        raise CycjInputError(
            "not a finite number", source=source, key=key, expected=human, found=value
        )
    return out


#: common units → (kind, factor to the internal unit); anything else goes through pint.
#: tests/physics/test_units.py checks every entry against pint.
FAST_UNITS = {
    "N": ("force", 1.0),
    "kN": ("force", 1e3),
    "MN": ("force", 1e6),
    "mm": ("length", 1.0),
    "m": ("length", 1e3),
    "cm": ("length", 10.0),
    "in": ("length", 25.4),
    "um": ("length", 1e-3),
    "MPa": ("stress", 1.0),
    "GPa": ("stress", 1e3),
    "kPa": ("stress", 1e-3),
    "Pa": ("stress", 1e-6),
    "bar": ("stress", 0.1),
    "ksi": ("stress", 6.894757293168361),
    "kJ/m^2": ("energy_per_area", 1.0),
    "kJ/m**2": ("energy_per_area", 1.0),
    "J/m^2": ("energy_per_area", 1e-3),
    "J/m**2": ("energy_per_area", 1e-3),
    "N/mm": ("energy_per_area", 1.0),
    "MPa*m**0.5": ("stress_intensity", MPA_SQRT_M),
    "MPa*m^0.5": ("stress_intensity", MPA_SQRT_M),
    "MPa*sqrt(m)": ("stress_intensity", MPA_SQRT_M),
    "MPa√m": ("stress_intensity", MPA_SQRT_M),
    "MPa*mm**0.5": ("stress_intensity", 1.0),
    "MPa*mm^0.5": ("stress_intensity", 1.0),
    "h": ("time", 1.0),
    "s": ("time", 1 / 3600),
    "min": ("time", 1 / 60),
    "d": ("time", 24.0),
    "day": ("time", 24.0),
    "days": ("time", 24.0),
}


def _fast(text: str, kind: str):
    parts = text.strip().split(None, 1)
    if len(parts) != 2 or parts[1] not in FAST_UNITS:
        return None
    try:
        number = float(parts[0])
    except ValueError:
        return None
    k, factor = FAST_UNITS[parts[1]]
    return number * factor if k == kind else None


def _parse(text: str, kind: str, key: str, source: str | None) -> float:
    unit, human = INTERNAL[kind]
    fast = _fast(text, kind)
    if fast is not None:
        return fast
    import pint

    ureg = registry()
    try:
        q = ureg.Quantity(_clean(text))
    except (
        pint.errors.PintError,
        ValueError,
        SyntaxError,
        TypeError,
        AttributeError,
        KeyError,
        ZeroDivisionError,
        OverflowError,
    ) as exc:
        raise CycjInputError(
            f"cannot read the quantity ({type(exc).__name__})",
            source=source,
            key=key,
            expected=human,
            found=text,
        ) from None
    if not isinstance(q, ureg.Quantity):  # a bare number written as a string
        return float(q)
    try:
        return float(q.to(unit).magnitude)
    except pint.errors.DimensionalityError:
        raise CycjInputError(
            "wrong dimension", source=source, key=key, expected=human, found=text
        ) from None


def rate_factor(
    rate_unit: str,
    driving_unit: str,
    driving_kind: str,
    m: float,
    *,
    key: str = "growth",
    source: str | None = None,
) -> float:
    """Factor that turns C of a law da/dN = C·X^m printed in ``rate_unit`` per cycle and X in
    ``driving_unit`` into internal units (mm/cycle, X in kJ/m² or MPa√mm).

    da/dN[mm] = f_r·C·(X_int/f_x)^m with f_r = mm per rate unit, f_x = internal per driving unit,
    so C_int = C·f_r/f_x^m.
    """
    f_r = to_internal(f"1 {rate_unit}", "length", key=f"{key}.rate_unit", source=source)
    f_x = to_internal(f"1 {driving_unit}", driving_kind, key=f"{key}.driving_unit", source=source)
    return f_r / f_x**m
