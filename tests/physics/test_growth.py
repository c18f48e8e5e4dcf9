"""Closure models and growth-law conversion against published values."""

from pathlib import Path

import pytest

from cycj import growth as G
from cycj.errors import ValidityRangeError
from cycj.growth import from_delta_k
from tests.helpers import read_check_csv

# Newman (1984) S_o/S_max check values (docs/references.md R12, from memory), all at S_max/σ0 = 0.3
NEWMAN_1984 = read_check_csv(Path(__file__).parents[1] / "data" / "newman_1984_opening_checks.csv")


@pytest.mark.parametrize(
    "smax,alpha,r,so",
    [
        (float(x["smax_over_flow"]), float(x["alpha"]), float(x["r"]), float(x["so_over_smax"]))
        for x in NEWMAN_1984
    ],
)
def test_newman_1984_opening_ratio(smax, alpha, r, so):
    # Newman, Int. J. Fract. 24 (1984) R131, S_max/σ0 = 0.3 (docs/references.md R12, from memory)
    assert G.newman_closure(r, smax, alpha) == pytest.approx(so, abs=1e-4)


def test_newman_u_value():
    # docs/references.md R12: α = 2, R = 0.1 → U = 0.7309 (from memory)
    assert G.newman_u(0.1, 0.3, 2.0) == pytest.approx(0.7309, abs=1e-4)


def test_elber_1971():
    # Elber, ASTM STP 486 (1971): U = 0.5 + 0.4R; U(0) = 0.5, U(0.5) = 0.7 (from memory)
    assert G.elber_closure([0.0, 0.5]) == pytest.approx([0.5, 0.7])
    with pytest.raises(ValidityRangeError):
        G.elber_closure(0.8)


def test_newman_outside_range_raises():
    with pytest.raises(ValidityRangeError):
        G.newman_closure(0.1, 0.85, 2.0)


def test_opening_fraction_conventions():
    # ASTM E647: compressive part excluded → S_op = 0 for S_min < 0 with no closure model
    x, _ = G.opening_fraction(0, 100.0, -50.0, 0.2, 1.0, 1.0, 0.0)
    assert x == pytest.approx(50.0 / 150.0)
    x, _ = G.opening_fraction(0, 100.0, -50.0, 0.2, 1.0, 1.0, 1.0)
    assert x == 0.0
    x, clipped = G.opening_fraction(3, 100.0, 10.0, 0.95, 1.0, 2.0, 0.0)
    assert clipped == 1


def test_delta_k_law_conversion_exact():
    # ΔJ = ΔK²/E' (Rice 1968): the converted law gives the same rate at the matching ΔK
    e_prime = 219780.0
    law = from_delta_k(5.21e-13, 3.0, e_prime, 63.0)  # BS 7910 simplified law, N·mm^-3/2
    dk = 600.0
    dj = dk**2 / e_prime
    assert law.rate(dj) == pytest.approx(5.21e-13 * dk**3, rel=1e-12)
    assert law.m == 1.5
    assert law.threshold == pytest.approx(63.0**2 / e_prime)
