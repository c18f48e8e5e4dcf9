"""Neuber's rule on the Masing branch, notch-root ΔJ with Dowling's transition, cracks at holes."""

import math

import numpy as np
import pytest

from cycj.errors import ValidityRangeError
from cycj.fields.notch import (
    crack_at_hole_factor_scalar,
    k_over_s_crack_at_hole,
    neuber_masing,
    neuber_masing_stress_range_scalar,
    notch_delta_j,
    notch_delta_j_scalar,
    notch_root_delta_j,
    smith_miller_notch_field_depth,
)
from cycj.jintegral import small_crack_delta_j
from cycj.material import Material, StressStrainCurve

E = 200_000.0


def _py(f):
    """The plain-Python source of a compiled kernel (itself when JIT is disabled)."""
    return getattr(f, "py_func", f)


@pytest.fixture
def steel():
    return Material(E, 0.3, 350.0, 520.0, cyclic_curve=StressStrainCurve(900.0, 0.15))


# Neuber (1961), Topper–Wetzel–Morrow (1969): Δσ·Δε = (K_t·ΔS)²/E on the Masing branch.
def test_neuber_product_holds_to_1e_10(steel):
    ds = np.array([1.0, 50.0, 120.0, 200.0, 300.0, 450.0])
    for kt in (1.0, 2.2, 3.0, 5.0):
        dsig, deps = neuber_masing(kt, ds, steel)
        np.testing.assert_allclose(dsig * deps, (kt * ds) ** 2 / E, rtol=1e-10)
        np.testing.assert_allclose(deps, dsig / E + 2 * (dsig / 1800.0) ** (1 / 0.15), rtol=1e-13)
        assert np.all(dsig <= kt * ds * (1 + 1e-15))


# Masing branch, docs/references.md R18 (from memory): E = 200 GPa, K' = 1000 MPa, n' = 0.15,
# Δσ = 800 MPa → Δε = 0.0084473; so K_t·ΔS = √(800·0.0084473·E) must return Δσ = 800 MPa.
def test_neuber_inverse_of_reference_item_18():
    m = Material(E, 0.3, 400.0, cyclic_curve=StressStrainCurve(1000.0, 0.15))
    deps = 800.0 / E + 2 * (400.0 / 1000.0) ** (1 / 0.15)
    assert deps == pytest.approx(0.0084473, abs=1e-7)
    kt_ds = math.sqrt(800.0 * deps * E)
    dsig, de = neuber_masing(2.0, kt_ds / 2.0, m)
    assert dsig == pytest.approx(800.0, rel=1e-12)
    assert de == pytest.approx(deps, rel=1e-12)


# Exact limits: an elastic material (huge K') gives Δσ = K_t·ΔS; ΔS = 0 gives 0.
def test_neuber_elastic_and_zero_limits():
    m = Material(E, 0.3, 350.0, cyclic_curve=StressStrainCurve(1e12, 0.15))
    dsig, deps = neuber_masing(3.0, np.array([0.0, 100.0, 400.0]), m)
    np.testing.assert_allclose(dsig, [0.0, 300.0, 1200.0], rtol=1e-12)
    np.testing.assert_allclose(deps, [0.0, 300.0 / E, 1200.0 / E], rtol=1e-12)


# One scalar source: compiled, plain Python and the vectorised twin agree.
def test_compiled_scalar_python_and_vectorised_agree(steel):
    ds = np.array([10.0, 150.0, 260.0, 390.0])
    vec, _ = neuber_masing(2.7, ds, steel)
    comp = [neuber_masing_stress_range_scalar(2.7, d, E, 900.0, 0.15) for d in ds]
    pure = [_py(neuber_masing_stress_range_scalar)(2.7, d, E, 900.0, 0.15) for d in ds]
    np.testing.assert_allclose(vec, comp, rtol=1e-14)
    np.testing.assert_allclose(vec, pure, rtol=1e-14)
    # the notch kernel, compiled and plain Python
    args = (30.0, 200.0, 1.4, 1.2, 0.5, 2.7, 0.0, E, E / 0.91, 350.0, 900.0, 0.15, 0.8)
    np.testing.assert_allclose(notch_delta_j_scalar(*args), _py(notch_delta_j_scalar)(*args))


# Dowling (1977), docs/references.md R9 (from memory): the notch-root ΔJ is the small-crack form
# with the local range; in the elastic limit its value is 1.6·(K_t·ΔS)²·a/E.
def test_notch_root_delta_j_uses_local_range(steel):
    a = np.array([0.02, 0.2])
    dsig, _ = neuber_masing(3.0, 180.0, steel)
    np.testing.assert_allclose(
        notch_root_delta_j(a, 180.0, 3.0, steel), small_crack_delta_j(a, dsig, steel), rtol=1e-14
    )
    el = Material(E, 0.3, 350.0, cyclic_curve=StressStrainCurve(1e12, 0.15))
    np.testing.assert_allclose(
        notch_root_delta_j(a, 50.0, 3.0, el), 1.6 * 150.0**2 * a / E, rtol=1e-12
    )


# Dowling (1979, from memory): ΔJ = min[ΔJ_root(a), ΔJ_long(a + D)]: the notch-root value for
# a → 0, and far from the notch the plain long-crack value.  Default crack: the semicircular
# surface crack √(1.6a) at both ends; the long crack by the reference stress method in a wide
# body (Δσ_ref = ΔS, Ainsworth 1984), evaluated here by hand.
def test_notch_transition_limits(steel):
    d, ds = 5.0, 200.0
    a_short = np.array([1e-4, 1e-3])
    np.testing.assert_allclose(
        notch_delta_j(a_short, ds, 3.0, steel, d),
        notch_root_delta_j(a_short, ds, 3.0, steel),
        rtol=1e-14,
    )
    a_far = np.array([1e3, 1e5])
    dep = 2 * (ds / 1800.0) ** (1 / 0.15)
    de_ref = ds / E + dep
    lr_cyc = ds / (2 * 900.0 * 0.002**0.15)
    bracket = 1 + 0.5 * lr_cyc**2 * ds / (E * de_ref) + E * dep / ds
    far = 1.6 * (a_far + d) * ds**2 / E * bracket
    np.testing.assert_allclose(notch_delta_j(a_far, ds, 3.0, steel, d), far, rtol=1e-12)
    # continuous and never above either estimate
    a = np.geomspace(1e-3, 50.0, 400)
    dj = notch_delta_j(a, ds, 3.0, steel, d)
    assert np.all(dj <= notch_root_delta_j(a, ds, 3.0, steel) * (1 + 1e-14))
    assert np.all(dj <= 1.6 * (a + d) * ds**2 / E * bracket * (1 + 1e-12))
    assert np.max(np.abs(np.diff(np.log(dj)))) < 0.05


def test_notch_transition_with_a_supplied_long_crack_solution(steel):
    a = np.geomspace(0.01, 30.0, 50)
    dep = 2 * (200.0 / 1800.0) ** (1 / 0.15)
    lr_cyc = 200.0 / (2 * 900.0 * 0.002**0.15)
    bracket = 1 + 0.5 * lr_cyc**2 * 200.0 / (E * (200.0 / E + dep)) + E * dep / 200.0

    def long_crack(a_eff):
        return 1.6 * a_eff * 200.0**2 / E * bracket

    np.testing.assert_allclose(
        notch_delta_j(a, 200.0, 3.0, steel, 2.0, long_crack=long_crack),
        notch_delta_j(a, 200.0, 3.0, steel, 2.0),
        rtol=1e-12,
    )


def _neuber_by_hand(kt, ds, e, kp, n):
    """Neuber's Δσ solved by bisection in the test (independent of the compiled root finder)."""
    from scipy.optimize import brentq

    def f(x):
        return x * (x / e + 2 * (x / (2 * kp)) ** (1 / n)) - (kt * ds) ** 2 / e

    return brentq(f, 1e-9, kt * ds, xtol=1e-13, rtol=1e-15)


# Dowling (1979, from memory): a short edge crack at a notch root sees 1.12·K_t·ΔS√(πa); the
# plastic part follows the notch-root loop as in Dowling's (1977) form, 5.0/1.6 of the elastic
# coefficient per unit (K/S)²:
# ΔJ_root = (F·Δσ_N)²πa/E' + (5.0/1.6)·F²πa·Δσ_N·Δε_p/(1+n'), F = 1.1215 (edge crack).
def test_notch_on_an_edge_crack_uses_the_shapes_factor_times_kt(steel):
    from dataclasses import replace

    from cycj.geometry import make_geometry
    from cycj.jintegral import delta_j

    kt, d, ds = 2.2, 10.0, 180.0
    g = replace(
        make_geometry("edge-crack-semi-infinite", 0.1),
        notch={"kt": kt, "depth": d, "root_radius": 20.0},
    )
    ep = E / (1 - 0.3**2)
    # elastic material: exactly (1.1215·K_t·ΔS)²πa/E'
    el = Material(E, 0.3, 350.0, cyclic_curve=StressStrainCurve(1e12, 0.15))
    a = np.array([0.01, 0.1])
    np.testing.assert_allclose(
        delta_j(g, el, a, ds, method="notch"), (1.1215 * kt * ds) ** 2 * np.pi * a / ep, rtol=1e-9
    )
    # the Dowling (1977) semicircle would give only 1.6(K_t·ΔS)²a/E: about half
    assert delta_j(g, el, 0.1, ds, method="notch") > 2.2 * 1.6 * (kt * ds) ** 2 * 0.1 / E
    # cyclic plasticity at the root
    dsig = _neuber_by_hand(kt, ds, E, 900.0, 0.15)
    dep = 2 * (dsig / 1800.0) ** (1 / 0.15)
    f2pa = 1.1215**2 * np.pi * a
    hand = f2pa * dsig**2 / ep + 5.0 / 1.6 * f2pa * dsig * dep / 1.15
    np.testing.assert_allclose(delta_j(g, steel, a, ds, method="notch"), hand, rtol=1e-9)
    # far from the notch: the long crack a + D with the shape's own factor (reference stress
    # in a wide body, Δσ_ref = ΔS), elastic material
    a_far = np.array([200.0, 400.0])
    np.testing.assert_allclose(
        delta_j(g, el, a_far, ds, method="notch"),
        (1.1215 * ds) ** 2 * np.pi * (a_far + d) / ep,
        rtol=1e-6,
    )


# Smith & Miller (1977, from memory): notch field depth 0.13√(Dρ).
def test_smith_miller_notch_field_depth():
    assert smith_miller_notch_field_depth(4.0, 1.0) == pytest.approx(0.26, rel=1e-14)
    with pytest.raises(ValidityRangeError):
        smith_miller_notch_field_depth(0.0, 1.0)


# Crack(s) at a circular hole (Tada's fit of Bowie's solution, from memory).
def test_crack_at_hole_short_crack_limit_is_kt_3_edge_crack():
    r = 5.0
    a = np.array([1e-9, 1e-7]) * r
    for n in (1, 2):
        f = k_over_s_crack_at_hole(a, r, n) / np.sqrt(np.pi * a)
        # F(0) = 1.5 × 2.243 = 3.3645 = 3 × 1.1215 (exact at s = 0)
        np.testing.assert_allclose(f, 3.0 * 1.1215, rtol=1e-6)


def test_crack_at_hole_long_crack_limits_are_centre_cracks():
    r = 1.0
    a = np.array([1e4, 1e6])
    two = k_over_s_crack_at_hole(a, r, 2)
    np.testing.assert_allclose(two, np.sqrt(np.pi * (a + r)), rtol=1e-12 + 1e-3 * r / a[0])
    one = k_over_s_crack_at_hole(a, r, 1)
    np.testing.assert_allclose(one, np.sqrt(np.pi * (a + 2 * r) / 2), rtol=1e-12 + 1e-3 * r / a[0])
    assert one[-1] / np.sqrt(np.pi * (a[-1] + 2 * r) / 2) == pytest.approx(1.0, rel=1e-6)


def test_crack_at_hole_monotone_and_scalar_agrees():
    a = np.geomspace(1e-3, 1e3, 200)
    f = k_over_s_crack_at_hole(a, 1.0, 2) / np.sqrt(np.pi * a)
    assert np.all(np.diff(f) < 0)
    assert _py(crack_at_hole_factor_scalar)(2.0, 1.0, 1.0) == pytest.approx(
        k_over_s_crack_at_hole(2.0, 1.0, 1) / math.sqrt(2 * math.pi), rel=1e-14
    )
    with pytest.raises(ValidityRangeError):
        k_over_s_crack_at_hole(1.0, 1.0, 3)


def test_notch_validity(steel):
    with pytest.raises(ValidityRangeError):
        neuber_masing(0.9, 100.0, steel)  # K_t < 1
    with pytest.raises(ValidityRangeError):
        neuber_masing(2.0, -1.0, steel)  # ΔS < 0
    with pytest.raises(ValidityRangeError):
        notch_delta_j(0.0, 100.0, 2.0, steel, 1.0)  # a ≤ 0
    with pytest.raises(ValidityRangeError):
        neuber_masing(2.0, 100.0, Material(E, 0.3, 350.0))  # no cyclic curve


def test_notch_never_below_the_plain_crack(steel):
    # K_t = 1 and a shallow notch: the root estimate (no ½L_r² bracket) falls below the plain
    # reference stress estimate of the same crack (Ainsworth 1984, by hand), which then holds
    from dataclasses import replace

    from cycj.geometry import make_geometry
    from cycj.jintegral import delta_j

    g = replace(
        make_geometry("edge-crack-semi-infinite", 0.5),
        notch={"kt": 1.0, "depth": 1e-6, "root_radius": 1.0},
    )
    ep, a, ds = E / 0.91, 0.5, 300.0
    dj_el = (1.1215 * ds) ** 2 * math.pi * a / ep
    dep = 2 * (ds / 1800.0) ** (1 / 0.15)
    lr = ds / (2 * 900.0 * 0.002**0.15)
    plain = dj_el * (1 + 0.5 * lr**2 * ds / (E * (ds / E + dep))) + dj_el * E * dep / ds
    assert delta_j(g, steel, a, ds, method="notch") == pytest.approx(plain, rel=1e-9)
    assert delta_j(g, steel, a, ds) == pytest.approx(plain, rel=1e-9)


def test_notch_delta_j_scales_with_the_load_squared_down_to_tiny_loads():
    # elastic limit (Rice 1968): ΔJ = (1.1215·K_t·ΔS)²πa/E' for any ΔS > 0, however small
    from dataclasses import replace

    from cycj.geometry import make_geometry
    from cycj.jintegral import delta_j

    el = Material(E, 0.3, 350.0, cyclic_curve=StressStrainCurve(1e12, 0.15))
    g = replace(
        make_geometry("edge-crack-semi-infinite", 0.1),
        notch={"kt": 2.5, "depth": 3.0, "root_radius": 1.0},
    )
    for ds in (1e-5, 1e-2, 10.0):
        hand = (1.1215 * 2.5 * ds) ** 2 * math.pi * 0.1 / (E / 0.91)
        assert delta_j(g, el, 0.1, ds, method="notch") == pytest.approx(hand, rel=1e-9)
    assert delta_j(g, el, 0.1, 0.0, method="notch") == 0.0


def test_notch_inputs_at_their_ends(steel):
    # K_t = 1 (no concentration) is a valid notch; two cracks are the default at a hole
    # (Tada's fit F2 = ½(3 − s)[1 + 1.243(1 − s)³], s = a/(a + R), from memory)
    a = np.array([0.5, 2.0])
    assert np.all(np.isfinite(notch_delta_j(a, 100.0, 1.0, steel, 1.0)))
    assert np.all(np.isfinite(notch_root_delta_j(a, 100.0, 1.0, steel)))
    s = a / (a + 3.0)
    f2 = 0.5 * (3 - s) * (1 + 1.243 * (1 - s) ** 3)
    np.testing.assert_allclose(k_over_s_crack_at_hole(a, 3.0), np.sqrt(np.pi * a) * f2, rtol=1e-14)
