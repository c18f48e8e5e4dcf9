"""Quantities at the boundary: unit strings to cycj's internal units.

A quantity is one number and one unit (``"25 mm"``, ``"60 MPa*m**0.5"``): the number is read
by a regular expression, the unit is checked token by token (names, ``*``, ``/``, powers of
magnitude ≤ 4, ``√``, parentheses) and only then looked up in pint; nothing is evaluated, the
text is at most :data:`MAX_TEXT` characters and anything after the unit is an error.

Internal units: force N, length mm, stress MPa, J (and ΔJ) kJ/m² (numerically N/mm), stress
intensity MPa·√mm, crack growth rate mm/cycle, time h.  A bare number is taken to be in the
internal unit already.  Conversion happens once, where a case file or log is read.
"""

from __future__ import annotations

import math
import re
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
    if len(parts) != 2 or parts[1] not in FAST_UNITS or not _NUMBER.fullmatch(parts[0]):
        return None
    try:
        number = float(parts[0])
    except ValueError:
        return None
    k, factor = FAST_UNITS[parts[1]]
    return number * factor if k == kind else None


#: longest unit string read [characters]
MAX_TEXT = 100
#: largest exponent magnitude of a unit (m**0.5, m**-2 …)
MAX_EXPONENT = 4.0

_NUMBER = re.compile(r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?")
_TOKEN = re.compile(
    r"\s*(?:(?P<name>[A-Za-zµμΩ°_]+)|(?P<pow>\*\*|\^)|(?P<op>[*/·])|(?P<sup>[²³])"
    r"|(?P<root>√)|(?P<open>\()|(?P<close>\)))"
)
_EXPONENT = re.compile(r"\s*(?:\((?P<p>[+-]?\d+(?:\.\d+)?)\)|(?P<n>[+-]?\d+(?:\.\d+)?))")


class _UnitSyntax(ValueError):
    """A unit string that is not one unit (names, *, /, ** with a small number, √, parentheses)."""


def split_quantity(text: str) -> tuple[float, str]:
    """``"25 mm"`` → (25.0, "mm"): one number and one unit (possibly empty), nothing else.

    Raises ``ValueError`` for anything else (two numbers, an expression, trailing text)."""
    s = text.strip()
    m = _NUMBER.match(s)
    if m is None:
        raise _UnitSyntax("the value must start with a number")
    rest = s[m.end() :]
    if rest and not rest[0].isspace() and rest[0] not in "µμ°Ω√" and not rest[0].isalpha():
        raise _UnitSyntax("the number must be followed by a space and a unit")
    return float(m.group()), rest.strip()


def normalize_unit(unit: str) -> str:
    """A unit string in pint's spelling after checking that it is only a unit: names joined by
    ``*``, ``/`` or spaces, ``**``/``^`` with a number of magnitude ≤ 4, ``²``, ``³``, ``√``,
    ``sqrt(…)`` and parentheses.  Raises ``ValueError`` otherwise (no numbers, no ``#``,
    nothing evaluated)."""
    out: list[str] = []
    pos, depth, need_operand = 0, 0, True
    powered = False  # the last operand already has a power: m**2**2 is refused
    while pos < len(unit):
        if unit[pos:].isspace():
            break
        m = _TOKEN.match(unit, pos)
        if m is None:
            bad = unit[pos:].strip()[:1]
            raise _UnitSyntax(f"unexpected {bad!r} in the unit")
        pos = m.end()
        if m.group("name"):
            name = m.group("name")
            if not need_operand:
                out.append("*")  # "N m": a product
            if name == "sqrt":
                m2 = _TOKEN.match(unit, pos)
                if m2 is None or not m2.group("open"):
                    raise _UnitSyntax("sqrt needs parentheses: sqrt(m)")
                out.append("sqrt")
                continue
            out.append(name)
            need_operand = powered = False
        elif m.group("pow"):
            if need_operand or powered:
                raise _UnitSyntax("a power needs a unit before it (one power per unit)")
            e = _EXPONENT.match(unit, pos)
            if e is None:
                raise _UnitSyntax("a power needs a number: m**0.5, m**-2")
            value = float(e.group("p") or e.group("n"))
            if abs(value) > MAX_EXPONENT:
                raise _UnitSyntax(f"unit powers are at most {MAX_EXPONENT:g} in magnitude")
            pos = e.end()
            out.append(f"**{value:g}" if value >= 0 else f"**({value:g})")
            powered = True
        elif m.group("sup"):
            if need_operand or powered:
                raise _UnitSyntax("a power needs a unit before it (one power per unit)")
            out.append("**2" if m.group("sup") == "²" else "**3")
            powered = True
        elif m.group("op"):
            if need_operand:
                raise _UnitSyntax("an operator needs a unit before it")
            out.append("/" if m.group("op") == "/" else "*")
            need_operand = True
        elif m.group("root"):
            if not need_operand:
                out.append("*")
            out.append("sqrt")
            m2 = _TOKEN.match(unit, pos)
            if m2 is not None and m2.group("name") and m2.group("name") != "sqrt":
                out.append(f"({m2.group('name')})")
                pos = m2.end()
                need_operand = powered = False
            elif m2 is None or not m2.group("open"):
                raise _UnitSyntax("√ needs a unit after it")
        elif m.group("open"):
            if not need_operand and out and out[-1] != "sqrt":
                out.append("*")
            out.append("(")
            depth += 1
            need_operand = True
        else:  # close
            if need_operand or depth == 0:
                raise _UnitSyntax("unbalanced parentheses")
            out.append(")")
            depth -= 1
            powered = False
    if depth:
        raise _UnitSyntax("unbalanced parentheses")
    if need_operand and out:
        raise _UnitSyntax("the unit ends with an operator")
    return _sqrt("".join(out))


def _sqrt(expr: str) -> str:
    """Rewrite ``sqrt(X)`` as ``(X)**0.5`` (pint parses powers, not functions)."""
    while "sqrt(" in expr:
        i = expr.index("sqrt(")
        depth, j = 0, i + 4
        for j in range(i + 4, len(expr)):
            depth += {"(": 1, ")": -1}.get(expr[j], 0)
            if depth == 0:
                break
        expr = expr[:i] + expr[i + 4 : j + 1] + "**0.5" + expr[j + 1 :]
    return expr


def unit_factor(unit: str, kind: str, *, key: str = "", source: str | None = None) -> float:
    """Factor from one ``unit`` (no number) to the internal unit of ``kind``."""
    human = INTERNAL[kind][1]
    if not isinstance(unit, str) or not unit.strip():
        raise CycjInputError("not a unit", source=source, key=key, expected=human, found=unit)
    if len(unit) > MAX_TEXT:
        raise CycjInputError(
            f"too long for a unit (at most {MAX_TEXT} characters)",
            source=source,
            key=key,
            expected=human,
            found=unit,
        )
    if unit.strip() in FAST_UNITS:
        k, factor = FAST_UNITS[unit.strip()]
        if k == kind:
            return factor
    try:
        spelled = normalize_unit(unit)
    except _UnitSyntax as exc:
        raise CycjInputError(
            f"not a unit ({exc})", source=source, key=key, expected=human, found=unit
        ) from None
    return _pint_factor(spelled, kind, key, source, unit)


def unit_kind(unit, kinds=("force", "stress")) -> str | None:
    """The first of ``kinds`` whose dimension ``unit`` has (None if none, or not a unit)."""
    for kind in kinds:
        try:
            unit_factor(unit, kind)
            return kind
        except CycjInputError:
            continue
    return None


@lru_cache(maxsize=512)
def _pint_units(spelled: str):
    return registry().parse_units(spelled)


def _pint_factor(spelled: str, kind: str, key, source, shown) -> float:
    import pint

    unit, human = INTERNAL[kind]
    try:
        u = _pint_units(spelled)
        factor = float(registry().Quantity(1.0, u).to(unit).magnitude)
    except pint.errors.DimensionalityError:
        raise CycjInputError(
            "wrong dimension", source=source, key=key, expected=human, found=shown
        ) from None
    except (pint.errors.PintError, ValueError, SyntaxError, TypeError, AttributeError, KeyError):
        raise CycjInputError(
            "cannot read the quantity (unknown unit)",
            source=source,
            key=key,
            expected=human,
            found=shown,
        ) from None
    if not (math.isfinite(factor) and factor > 0.0):
        raise CycjInputError(
            "cannot read the quantity", source=source, key=key, expected=human, found=shown
        )
    return factor


def _parse(text: str, kind: str, key: str, source: str | None) -> float:
    """One number and one unit (``"25 mm"``); a bare number is in the internal unit."""
    human = INTERNAL[kind][1]
    if len(text) > MAX_TEXT:
        raise CycjInputError(
            f"too long for a quantity (at most {MAX_TEXT} characters)",
            source=source,
            key=key,
            expected=human,
            found=text,
        )
    fast = _fast(text, kind)
    if fast is not None:
        return fast
    try:
        number, unit = split_quantity(text)
        spelled = normalize_unit(unit) if unit else ""
    except _UnitSyntax as exc:
        raise CycjInputError(
            f"cannot read the quantity ({exc}): give one number and one unit",
            source=source,
            key=key,
            expected=human,
            found=text,
        ) from None
    if not math.isfinite(number):
        raise CycjInputError(
            "not a finite number", source=source, key=key, expected=human, found=text
        )
    if not unit:
        return number
    return number * _pint_factor(spelled, kind, key, source, text)


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
    f_r = unit_factor(rate_unit, "length", key=f"{key}.rate_unit", source=source)
    f_x = unit_factor(driving_unit, driving_kind, key=f"{key}.driving_unit", source=source)
    return f_r / f_x**m
