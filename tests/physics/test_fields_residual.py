"""Residual stress: K_s by weight functions, relaxation, R shift, R6 plasticity interaction ρ."""

import numpy as np
import pytest

from cycj.errors import ValidityRangeError
from cycj.fields.profiles import StressProfile
from cycj.fields.residual import (
    bs7910_residual_relaxation,
    kr_with_secondary,
    r6_plasticity_interaction,
    residual_k_shift,
    residual_stress_k,
)
from cycj.geometry import edge_crack_plate, surface_crack_plate


def test_uniform_residual_reproduces_the_shapes_uniform_solution():
    a = np.array([1.0, 5.0, 20.0])
    k = residual_stress_k(a, 250.0, "edge-crack-plate", width=50.0)
    ref = 250.0 * np.array([edge_crack_plate.k_over_s(x, np.array([50.0])) for x in a])
    np.testing.assert_allclose(k, ref, rtol=1e-12)
    np.testing.assert_allclose(
        residual_stress_k(a, 100.0, "edge-crack-semi-infinite"),
        100.0 * 1.1215 * np.sqrt(np.pi * a),
        rtol=1e-12,
    )
    p = np.zeros(8)
    p[1], p[5] = 30.0, 10.0
    ks = residual_stress_k(
        np.array([4.0]), 300.0, "surface-crack-plate", c=10.0, thickness=30.0, relaxation=0.5
    )
    assert ks[0] == pytest.approx(150.0 * surface_crack_plate.k_over_s(4.0, p), rel=1e-12)


def test_through_thickness_profile_and_relaxation_scale_linearly():
    prof = StressProfile("polynomial", coefficients=(300.0, -900.0, 600.0))
    a = np.array([2.0, 6.0])
    full = residual_stress_k(a, prof, "edge-crack-plate", width=40.0)
    half = residual_stress_k(a, prof, "edge-crack-plate", relaxation=0.5, width=40.0)
    np.testing.assert_allclose(half, 0.5 * full, rtol=1e-15)
    with pytest.raises(ValueError, match="edge-crack-plate"):
        residual_stress_k(a, 100.0, "compact-tension")
    with pytest.raises(ValidityRangeError):
        residual_stress_k(a, 100.0, "edge-crack-plate", relaxation=1.5, width=40.0)


# BS 7910 §7.3.4.2 (from memory): σ_R = min[σ_y, (1.4 − σ_ref/σ_f)σ_y].
def test_bs7910_relaxation_limits():
    sf = 435.0
    f = bs7910_residual_relaxation(np.array([0.0, 0.4 * sf, 0.9 * sf, 1.4 * sf, 2.0 * sf]), sf)
    np.testing.assert_allclose(f, [1.0, 1.0, 0.5, 0.0, 0.0], atol=1e-15)


# A residual stress shifts K_max and K_min (so R), never ΔK (BS 7910 §8, from memory).
def test_residual_shifts_r_not_delta_k():
    kmax, kmin, r = residual_k_shift(
        np.array([600.0, 600.0]), np.array([60.0, 60.0]), np.array([0.0, 300.0])
    )
    np.testing.assert_allclose(kmax - kmin, 540.0)
    np.testing.assert_allclose(r, [0.1, 360.0 / 900.0])
    _, _, r_closed = residual_k_shift(100.0, 10.0, -200.0)
    assert np.isnan(r_closed)


# R6 / BS 7910 ρ (from memory): zero without secondary stress.
def test_rho_is_zero_without_secondary_stress():
    lr = np.linspace(0.0, 1.2, 13)
    np.testing.assert_array_equal(r6_plasticity_interaction(0.0, 500.0, lr), 0.0)
    np.testing.assert_array_equal(r6_plasticity_interaction(-100.0, 500.0, lr), 0.0)
    np.testing.assert_allclose(kr_with_secondary(500.0, 0.0, 2000.0, 0.5), 0.25)


# ρ1 = 0.1χ^0.714 − 0.007χ² + 0.00003χ⁵ (from memory): χ = 1 → 0.09303.
def test_rho1_value_and_regions():
    # K_s·L_r/K_p = 1 at L_r = 0.5 with K_s = 1000, K_p = 500
    assert r6_plasticity_interaction(1000.0, 500.0, 0.5) == pytest.approx(0.09303, rel=1e-12)
    assert r6_plasticity_interaction(1e6, 500.0, 0.5) == pytest.approx(0.25)  # χ > 4
    assert r6_plasticity_interaction(1000.0, 500.0, 1.05) == 0.0
    assert r6_plasticity_interaction(1000.0, 500.0, 1.3) == 0.0


# Continuity of ρ in L_r at 0.8 and 1.05 (R6 form: 4ρ1(1.05 − L_r) meets ρ1 and 0).
def test_rho_continuity_at_region_boundaries():
    eps = 1e-10
    for ks, kp in ((200.0, 800.0), (1500.0, 400.0)):
        lo, hi = r6_plasticity_interaction(ks, kp, np.array([0.8 - eps, 0.8 + eps]))
        assert lo == pytest.approx(hi, abs=1e-8)
        lo, hi = r6_plasticity_interaction(ks, kp, np.array([1.05 - eps, 1.05 + eps]))
        assert lo == pytest.approx(hi, abs=1e-8)


def test_kr_adds_primary_secondary_and_rho():
    kp, ks, kmat, lr = 600.0, 300.0, 3000.0, 0.6
    rho = r6_plasticity_interaction(ks, kp, lr)
    assert kr_with_secondary(kp, ks, kmat, lr) == pytest.approx(0.2 + 0.1 + rho, rel=1e-14)
    with pytest.raises(ValidityRangeError):
        r6_plasticity_interaction(100.0, 0.0, 0.5)
