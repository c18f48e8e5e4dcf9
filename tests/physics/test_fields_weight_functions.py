"""Glinka–Shen weight-function K: reference reproduction, independent checks, linearity."""

import math

import numpy as np
import pytest
from scipy import integrate

from cycj.errors import ValidityRangeError
from cycj.fields.profiles import StressProfile
from cycj.fields.shape_weight_functions import (
    edge_crack_plate_k,
    edge_crack_plate_references,
    edge_crack_semi_infinite_k,
    surface_crack_influence_coefficients,
    surface_crack_k,
    surface_crack_polynomial_k,
    surface_crack_references,
    tada_pure_bending_factor,
)
from cycj.fields.weight_functions import (
    DEEPEST,
    HALF_PLANE_LINEAR,
    SURFACE,
    glinka_shen_coefficients,
    glinka_shen_influence,
    glinka_shen_k,
    glinka_shen_weight,
)
from cycj.geometry import edge_crack_plate, surface_crack_plate

W = 50.0
A_EDGE = np.array([0.05, 1.0, 5.0, 10.0, 15.0, 25.0, 35.0, 45.0])


def uniform(x):
    return np.ones_like(x)


def _p_surface(c, t, width=0.0, beta=0.0):
    p = np.zeros(8)
    p[0], p[1], p[5], p[6] = width, t, c, beta
    return p


# Tada's SE(T) tension fit (docs/references.md R4, confirmed): uniform crack-face stress must
# give it.
def test_edge_crack_plate_uniform_reproduces_tada_set():
    k = edge_crack_plate_k(A_EDGE, W, uniform)
    ref = np.array([edge_crack_plate.k_over_s(a, np.array([W])) for a in A_EDGE])
    np.testing.assert_allclose(k, ref, rtol=5e-3)  # brief: < 0.5 %
    np.testing.assert_allclose(k, ref, rtol=1e-12)  # by construction: to round-off


# Anderson (2005) Table 2.4, docs/references.md R4 (confirmed): Tada F(0.2) = 1.3667,
# F(0.5) = 2.8266.
def test_edge_crack_plate_uniform_reference_check_values():
    k = edge_crack_plate_k(np.array([10.0, 25.0]), W, uniform)
    np.testing.assert_allclose(
        k / np.sqrt(np.pi * np.array([10.0, 25.0])), [1.3667, 2.8266], atol=1e-4
    )


# Tada pure-bending fit (from memory): σ_b(1 − 2x/W) reproduces F_b for a/W ≥ 0.2 by
# construction of the M's.
def test_edge_crack_plate_bending_reproduces_tada_pure_bending():
    a = np.array([10.0, 15.0, 25.0, 35.0, 45.0])
    k = edge_crack_plate_k(a, W, StressProfile("polynomial", coefficients=(1.0, -2.0)))
    fb = np.array([tada_pure_bending_factor(x / W) for x in a])
    np.testing.assert_allclose(k / np.sqrt(np.pi * a), fb, rtol=1e-12)


# Tada F_b (from memory) against the Brown–Srawley pure-bending polynomial (from memory),
# 1.122 − 1.40α + 7.33α² − 13.08α³ + 14.0α⁴ for α ≤ 0.6: two recalled fits, 2.5 % apart at most.
def test_tada_pure_bending_against_brown_srawley_from_memory():
    for alpha in (0.1, 0.2, 0.3, 0.4, 0.5, 0.6):
        bs = 1.122 - 1.40 * alpha + 7.33 * alpha**2 - 13.08 * alpha**3 + 14.0 * alpha**4
        assert tada_pure_bending_factor(alpha) == pytest.approx(bs, rel=0.025)


def test_edge_crack_plate_linear_reference_is_continuous_and_tends_to_half_plane():
    y0, y1 = edge_crack_plate_references(
        np.array([1e-6 * W, 0.2 * W * (1 - 1e-9), 0.2 * W * (1 + 1e-9)]), W
    )
    assert y1[0] == pytest.approx(HALF_PLANE_LINEAR, rel=1e-5)
    assert y1[1] == pytest.approx(y1[2], rel=1e-7)
    assert y0[0] == pytest.approx(1.1215, abs=1e-3)  # Tada F(0) = 0.752 + 0.37 = 1.122


# Small cracks in a finite plate see the half-plane weight function (exact limit a/W → 0).
def test_edge_crack_plate_small_crack_limit_is_half_plane():
    a = np.array([1e-4, 1e-3])

    def prof(x):
        return np.exp(-x / a[:, None])

    k_plate = edge_crack_plate_k(a, W, prof)
    k_half = edge_crack_semi_infinite_k(a, prof)
    # Tada's SE(T) fit gives F(0) = 0.752 + 0.37 = 1.122 against 1.1215: 0.05 %
    np.testing.assert_allclose(k_plate, k_half, rtol=1e-3)


# Half-plane edge crack: 1.1215 (Tada 2000, via the geometry module; docs/references.md R21)
# and, by construction, 0.683 for σ0·x/a (Tada's handbook, from memory).
def test_semi_infinite_uniform_and_linear_references():
    a = np.array([0.1, 3.0, 100.0])
    k = edge_crack_semi_infinite_k(a, uniform) / np.sqrt(np.pi * a)
    np.testing.assert_allclose(k, 1.1215, rtol=1e-13)
    k_inc = edge_crack_semi_infinite_k(a, lambda x: x / a[:, None]) / np.sqrt(np.pi * a)
    np.testing.assert_allclose(k_inc, 0.683, rtol=1e-12)


def _tada_green_k(profile):
    """K/(σ√(πa)) of an edge crack in a half-plane from Tada's point-force Green's function
    K = 2P/√(πa)·F(b/a)/√(1 − (b/a)²), F = 1.3 − 0.3(b/a)^{5/4} (fit of the Hartranft–Sih
    solution, 1 %; from memory), with b/a = sin θ."""
    val, _ = integrate.quad(
        lambda th: profile(math.sin(th)) * (1.3 - 0.3 * math.sin(th) ** 1.25),
        0.0,
        0.5 * math.pi,
        epsabs=1e-13,
    )
    return 2.0 / math.pi * val


# Independent check (Tada's Green's function, from memory, itself within 1 %): the recalled fit
# gives back 1.1215 and 0.683 to 0.2 %, and other profiles agree with the Glinka–Shen
# half-plane weight function to 2 %.
def test_semi_infinite_against_tada_point_force_green_function():
    assert _tada_green_k(lambda s: 1.0) == pytest.approx(1.1215, rel=2e-3)
    assert _tada_green_k(lambda s: s) == pytest.approx(0.683, rel=3e-3)
    a = np.array([2.0])
    for prof in (
        lambda s: s**2,
        lambda s: s**3,
        lambda s: math.exp(-3 * s),
        lambda s: math.cos(math.pi * s),
        lambda s: (1 - s) ** 2,
    ):
        k = edge_crack_semi_infinite_k(a, np.vectorize(lambda x, p=prof: p(x / a[0])))
        assert k[0] / math.sqrt(math.pi * a[0]) == pytest.approx(
            _tada_green_k(prof), rel=0.02, abs=2e-3
        )


# Glinka & Shen (1991) / Shen & Glinka (1991) closed forms for point A (from memory), with Y
# normalised by √(πa): M1 = (π/√2)(4Y0 − 6Y1) − 24/5, M2 = 3, M3 = (π/√2)(12Y1 − 6Y0) + 8/5.
def test_point_a_coefficients_closed_form():
    y0, y1 = 1.3, 0.55
    m = glinka_shen_coefficients(y0, y1, DEEPEST)
    c = math.pi / math.sqrt(2)
    np.testing.assert_allclose(
        m, [c * (4 * y0 - 6 * y1) - 4.8, 3.0, c * (12 * y1 - 6 * y0) + 1.6], rtol=1e-13
    )


def test_point_b_weight_function_vanishes_at_the_far_end():
    m = glinka_shen_coefficients(0.8, 0.6, SURFACE)
    assert glinka_shen_weight(3.0, 3.0, m, SURFACE) == pytest.approx(0.0, abs=1e-13)
    # the crack-mouth condition of point A: ∂²m/∂x² = 0 at x = 0 (finite differences)
    ma = glinka_shen_coefficients(1.2, 0.5, DEEPEST)
    h = 1e-3
    w = glinka_shen_weight(np.array([0.0, h, 2 * h]), 1.0, ma, DEEPEST)
    assert (w[0] - 2 * w[1] + w[2]) / h**2 == pytest.approx(0.0, abs=1e-3)


# Newman–Raju (docs/references.md R14, coefficients from memory) uniform tension and bending at the
# deepest (φ = 90°) and surface (φ = 0) points are reproduced by construction.
@pytest.mark.parametrize("point", [DEEPEST, SURFACE])
@pytest.mark.parametrize("ac", [0.2, 0.5, 1.0])
def test_surface_crack_reproduces_newman_raju_tension_and_bending(point, ac):
    t, width = 20.0, 400.0
    a = np.array([0.5, 4.0, 10.0, 16.0])
    c = a / ac
    kfun = (
        surface_crack_plate.k_over_s if point == DEEPEST else surface_crack_plate.k_over_s_surface
    )
    k_t = surface_crack_k(a, c, t, uniform, width=width, point=point)
    ref_t = np.array([kfun(ai, _p_surface(ci, t, width)) for ai, ci in zip(a, c, strict=True)])
    np.testing.assert_allclose(k_t, ref_t, rtol=5e-3)
    np.testing.assert_allclose(k_t, ref_t, rtol=1e-12)
    # pure bending σ_b(1 − 2x/t): Newman–Raju K = (S + HβS)√(πa/Q)F with S → 0 via β-split
    k_b = surface_crack_k(
        a, c, t, StressProfile("polynomial", coefficients=(1.0, -2.0)), width=width, point=point
    )
    ref_tb = np.array(
        [kfun(ai, _p_surface(ci, t, width, 1.0)) for ai, ci in zip(a, c, strict=True)]
    )
    np.testing.assert_allclose(k_b, ref_tb - ref_t, rtol=1e-11)


# Newman & Raju (1981), docs/references.md R14 check values (from memory): a/c = 1, a/t = 0.2,
# φ = 90°: K/(S√πa) = 0.66757; φ = 0: 0.74368 (wide plate).
def test_surface_crack_reference_check_values():
    a = np.array([4.0])
    kd = surface_crack_k(a, a, 20.0, uniform, point=DEEPEST) / np.sqrt(np.pi * a)
    ks = surface_crack_k(a, a, 20.0, uniform, point=SURFACE) / np.sqrt(np.pi * a)
    assert kd[0] == pytest.approx(0.66757, abs=1e-5)
    assert ks[0] == pytest.approx(0.74368, abs=1e-5)


# Influence coefficients (exact Beta-function integrals of the weight function) agree with the
# quadrature, and G_0 equals the Newman–Raju F.
@pytest.mark.parametrize("point", [DEEPEST, SURFACE])
def test_influence_coefficients_match_quadrature(point):
    t = 25.0
    a = np.linspace(0.5, 19.0, 7)
    c = 2.0 * a
    coeff = [150.0, -300.0, 120.0, 40.0]
    k_exact = surface_crack_polynomial_k(a, c, t, coeff, point=point)
    prof = StressProfile("polynomial", coefficients=tuple(coeff))
    k_quad = surface_crack_k(a, c, t, prof, point=point, n_points=8)
    np.testing.assert_allclose(k_exact, k_quad, rtol=1e-12)
    g, q = surface_crack_influence_coefficients(a, c, t, point=point)
    y0, _, _ = surface_crack_references(a, c, t, point=point)
    np.testing.assert_allclose(g[:, 0], y0 * np.sqrt(q), rtol=1e-12)


def test_half_plane_influence_coefficients():
    m = glinka_shen_coefficients(1.1215, HALF_PLANE_LINEAR, DEEPEST)
    g = glinka_shen_influence(m, 1, DEEPEST)
    np.testing.assert_allclose(g, [1.1215, 0.683], rtol=1e-12)


# Linearity (superposition) to round-off, for every configuration.
def test_superposition_is_exact():
    a = np.linspace(0.3, 12.0, 9)

    def s1(x):
        return 200.0 * np.exp(-x / 3.0)

    def s2(x):
        return -80.0 + 5.0 * x**1.5

    def both(x):
        return s1(x) + s2(x)

    for fn in (
        lambda s: edge_crack_plate_k(a, 40.0, s),
        lambda s: edge_crack_semi_infinite_k(a, s),
        lambda s: surface_crack_k(a, 1.5 * a, 16.0, s, point=DEEPEST),
        lambda s: surface_crack_k(a, 1.5 * a, 16.0, s, point=SURFACE),
    ):
        np.testing.assert_allclose(fn(both), fn(s1) + fn(s2), rtol=1e-12, atol=1e-10)


# A table is integrated piecewise between its points, so it is exact for the piecewise-linear
# interpolant: 3 points a piece agree with 64, and with the same table given as a callable
# (no kinks known) at 4000 points to 1e-6.
@pytest.mark.parametrize("point", [DEEPEST, SURFACE])
def test_table_profile_integrates_exactly_between_kinks(point):
    xt, st = (0.0, 0.1, 0.3, 1.0), (300.0, 100.0, -50.0, 0.0)
    prof = StressProfile("table", x_over_t=xt, stress=st)
    a = np.array([1.0, 3.0, 7.0, 12.0])
    t = 20.0
    k3 = surface_crack_k(a, 1.2 * a, t, prof, point=point, n_points=3)
    k64 = surface_crack_k(a, 1.2 * a, t, prof, point=point)
    np.testing.assert_allclose(k3, k64, rtol=1e-12)
    k_blind = surface_crack_k(
        a, 1.2 * a, t, lambda x: np.interp(x / t, xt, st), point=point, n_points=4000
    )
    np.testing.assert_allclose(k64, k_blind, rtol=1e-6, atol=1e-3)
    ke = edge_crack_plate_k(a, W, prof, n_points=3)
    np.testing.assert_allclose(ke, edge_crack_plate_k(a, W, prof), rtol=1e-12)


def test_vectorised_grid_of_crack_sizes():
    a = np.linspace(0.1, 40.0, 300)
    k = edge_crack_plate_k(a, W, StressProfile("polynomial", coefficients=(100.0, -50.0)))
    assert k.shape == (300,) and np.all(np.isfinite(k))
    one = glinka_shen_k(a[:5], uniform, glinka_shen_coefficients(1.1215, HALF_PLANE_LINEAR))
    np.testing.assert_allclose(one, 1.1215 * np.sqrt(np.pi * a[:5]), rtol=1e-13)


def test_validity_ranges_are_enforced():
    with pytest.raises(ValidityRangeError):
        edge_crack_plate_k(np.array([46.0]), W, uniform)  # a/W > 0.9
    with pytest.raises(ValidityRangeError):
        edge_crack_semi_infinite_k(np.array([0.0]), uniform)  # a ≤ 0
    with pytest.raises(ValidityRangeError):
        surface_crack_k(np.array([3.0]), np.array([2.0]), 20.0, uniform)  # a/c > 1
    with pytest.raises(ValidityRangeError):
        surface_crack_k(np.array([17.0]), np.array([30.0]), 20.0, uniform)  # a/t > 0.8
    with pytest.raises(ValidityRangeError):
        surface_crack_k(np.array([3.0]), np.array([30.0]), 20.0, uniform, width=100.0)  # c/b
    with pytest.raises(ValueError, match="deepest"):
        glinka_shen_coefficients(1.0, 0.5, "middle")
    with pytest.raises(ValidityRangeError):
        edge_crack_semi_infinite_k(
            np.array([1.0]), StressProfile("polynomial", coefficients=(1.0,))
        )
