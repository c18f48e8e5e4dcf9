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
