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


def _newman_by_hand(r, s, alpha):
    """Newman (1984) opening function as published (from memory): A0 = (0.825 − 0.34α +
    0.05α²)[cos(πS_max/2σ0)]^(1/α), A1 = (0.415 − 0.071α)S_max/σ0, A3 = 2A0 + A1 − 1,
    A2 = 1 − A0 − A1 − A3; S_o/S_max = A0 + A1R + A2R² + A3R³ (R ≥ 0), A0 + A1R (R < 0),
    and never below R."""
    import math

    a0 = (0.825 - 0.34 * alpha + 0.05 * alpha**2) * math.cos(math.pi * s / 2) ** (1 / alpha)
    a1 = (0.415 - 0.071 * alpha) * s
    a3 = 2 * a0 + a1 - 1
    a2 = 1 - a0 - a1 - a3
    so = a0 + a1 * r + a2 * r**2 + a3 * r**3 if r >= 0 else a0 + a1 * r
    return max(so, r)


@pytest.mark.parametrize("alpha", [1.0, 1.7, 3.0])
@pytest.mark.parametrize("r", [-1.0, -0.4, 0.0, 0.3, 0.7, 0.95])
@pytest.mark.parametrize("s", [0.05, 0.4, 0.8])
def test_newman_opening_function_by_hand(alpha, r, s):
    assert G.newman_closure(r, s, alpha) == pytest.approx(_newman_by_hand(r, s, alpha), rel=1e-13)
    u = (1 - _newman_by_hand(r, s, alpha)) / (1 - r)
    assert G.newman_u(r, s, alpha) == pytest.approx(u, rel=1e-12)


def test_opening_fraction_every_model_by_hand():
    of = getattr(G.opening_fraction, "py_func", G.opening_fraction)
    for f in (G.opening_fraction, of):
        # constant U: x = 1 − U
        assert f(G.CONSTANT, 100.0, 20.0, 0.3, 0.65, 2.0, 0.0) == (pytest.approx(0.35), 0)
        # Elber U = 0.5 + 0.4R inside its range, R clipped (and counted) outside
        assert f(G.ELBER, 100.0, 30.0, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(1 - 0.62), 0)
        assert f(G.ELBER, 100.0, -0.1 * 100, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(0.54), 0)
        assert f(G.ELBER, 100.0, 70.0, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(1 - 0.78), 0)
        assert f(G.ELBER, 100.0, -50.0, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(0.54), 1)
        assert f(G.ELBER, 100.0, 80.0, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(1 - 0.78), 1)
        # Newman: R ≥ −1 and S_max/σ0 ≤ 0.8, clipped and counted
        x, c = f(G.NEWMAN, 100.0, 10.0, 0.3, 1.0, 2.0, 0.0)
        assert (x, c) == (pytest.approx(1 - (1 - _newman_by_hand(0.1, 0.3, 2.0)) / 0.9), 0)
        x, c = f(G.NEWMAN, 100.0, -100.0, 0.8, 1.0, 2.0, 0.0)
        assert (x, c) == (pytest.approx(1 - (1 - _newman_by_hand(-1.0, 0.8, 2.0)) / 2.0), 0)
        x, c = f(G.NEWMAN, 100.0, -200.0, 0.3, 1.0, 2.0, 0.0)
        assert (x, c) == (pytest.approx(1 - (1 - _newman_by_hand(-1.0, 0.3, 2.0)) / 2.0), 1)
        x, c = f(G.NEWMAN, 100.0, 10.0, 0.9, 1.0, 2.0, 0.0)
        assert (x, c) == (pytest.approx(1 - (1 - _newman_by_hand(0.1, 0.8, 2.0)) / 0.9), 1)
        # no load range, or no tension: no opening part
        assert f(G.NEWMAN, 100.0, 100.0, 0.3, 1.0, 2.0, 0.0) == (1.0, 0)
        assert f(G.NONE, -10.0, -50.0, 0.3, 1.0, 2.0, 0.0) == (1.0, 0)
        assert f(G.NONE, 100.0, 0.0, 0.3, 1.0, 2.0, 0.0) == (0.0, 0)


def test_paris_rate_threshold_is_exclusive():
    # da/dN = C·ΔJ^m above ΔJ_th, 0 at and below it (common practice)
    pr = getattr(G.paris_rate, "py_func", G.paris_rate)
    for f in (G.paris_rate, pr):
        assert f(2.0, 1e-4, 1.6, 0.5) == pytest.approx(1e-4 * 2.0**1.6, rel=1e-14)
        assert f(0.5, 1e-4, 1.6, 0.5) == 0.0
        assert f(0.5000001, 1e-4, 1.6, 0.5) > 0.0
        assert f(0.0, 1e-4, 1.6, 0.0) == 0.0
    law = G.GrowthLaw(C=2e-4, m=1.5, threshold=0.1)
    assert law.rate([0.05, 0.1, 1.0]) == pytest.approx([0.0, 0.0, 2e-4], rel=1e-14)


def test_opening_fraction_small_ranges_and_small_minimum():
    of = getattr(G.opening_fraction, "py_func", G.opening_fraction)
    for f in (G.opening_fraction, of):
        # a tiny but positive range still has its U (constant-U model)
        assert f(G.CONSTANT, 100.0, 100.0 - 1e-6, 0.3, 0.65, 2.0, 0.0) == (pytest.approx(0.35), 0)
        # a small positive peak still opens (nothing to exclude)
        assert f(G.CONSTANT, 5e-4, 0.0, 0.3, 0.65, 2.0, 0.0) == (pytest.approx(0.35), 0)
        # a small positive minimum is not a compressive part (S_op = S_min, x = 0)
        assert f(G.NONE, 100.0, 5e-4, 0.3, 1.0, 2.0, 0.0) == (0.0, 0)
        assert f(G.NONE, 100.0, -5e-4, 0.3, 1.0, 2.0, 0.0) == (pytest.approx(5e-4 / 100.0005), 0)
