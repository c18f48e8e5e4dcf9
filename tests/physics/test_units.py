"""Unit conversion at the boundary: the fast table agrees with pint; errors name the key."""

import pytest

from cycj.errors import CycjInputError
from cycj.units import FAST_UNITS, INTERNAL, registry, to_internal


@pytest.mark.parametrize("unit", sorted(FAST_UNITS))
def test_fast_table_agrees_with_pint(unit):
    kind, factor = FAST_UNITS[unit]
    q = registry().Quantity(
        1.0, unit.replace("^", "**").replace("√m", "*m**0.5").replace("sqrt(m)", "m**0.5")
    )
    assert q.to(INTERNAL[kind][0]).magnitude == pytest.approx(factor, rel=1e-12)


def test_pint_fallback_and_errors():
    assert to_internal("1.5 kip", "force") == pytest.approx(1.5 * 4448.2216152605, rel=1e-9)
    assert to_internal("2 ft", "length") == pytest.approx(609.6)
    with pytest.raises(CycjInputError, match=r"\[geometry.width\].*wrong dimension"):
        to_internal("3 MPa", "length", key="geometry.width")
    with pytest.raises(CycjInputError, match="cannot read"):
        to_internal("12 blorbs", "force", key="x")


@pytest.mark.parametrize(
    "text",
    [
        "10**10**10 mm",  # once hung: no expression is evaluated
        "1 m**4**4**4**4",  # a tower of powers would hang pint: one power per unit
        "1 m^2^2",
        "1 m²²",
        "10**400 mm",
        "(",
        "1.5.3 mm",
        "25 mm # c",
        "25 mm mm2",
        "2 m**5",
        "1e400 mm",
        "5 (mm",
        "5 mm*",
        "x" * 500,
    ],
)
def test_quantity_is_one_number_and_one_unit(text):
    with pytest.raises(CycjInputError, match=r"\[geometry.width\]") as exc:
        to_internal(text, "length", key="geometry.width")
    assert len(str(exc.value)) < 300  # the bad value is quoted short


@pytest.mark.parametrize(
    ("text", "kind", "value"),
    [
        ("25 mm", "length", 25.0),
        ("25mm", "length", 25.0),
        ("2 ft", "length", 609.6),
        ("60 MPa √m", "stress_intensity", 60 * 1000**0.5),
        ("60 MPa*sqrt(m)", "stress_intensity", 60 * 1000**0.5),
        ("60 MPa m^0.5", "stress_intensity", 60 * 1000**0.5),
        ("150 kJ/m²", "energy_per_area", 150.0),
        ("150 kJ m**-2", "energy_per_area", 150.0),
        ("3 N/mm^2", "stress", 3.0),
        ("25", "length", 25.0),
    ],
)
def test_quantities_read(text, kind, value):
    assert to_internal(text, kind) == pytest.approx(value, rel=1e-12)


def test_unit_strings_are_one_unit():
    from cycj.units import unit_factor

    assert unit_factor("m", "length") == 1000.0
    for bad in ("1.5.3 mm", "2 mm", "mm # c", "m**9", ""):
        with pytest.raises(CycjInputError, match="rate_unit"):
            unit_factor(bad, "length", key="growth.rate_unit")
