"""Stress profiles over the crack plane and their membrane/bending linearisation."""

import numpy as np
import pytest

from cycj.errors import ValidityRangeError
from cycj.fields.profiles import (
    StressProfile,
    linearise_polynomial,
    linearise_table,
    peak_stress,
    polynomial_stress,
    tabulated_stress,
)


def test_polynomial_stress_values():
    # σ = 100 − 50ξ + 30ξ² + 10ξ³ at ξ = 0, 0.5, 1 (arithmetic)
    s = polynomial_stress([0.0, 0.5, 1.0], [100.0, -50.0, 30.0, 10.0])
    np.testing.assert_allclose(s, [100.0, 83.75, 90.0], rtol=1e-15)


def test_tabulated_stress_interpolates_linearly_and_refuses_extrapolation():
    xt, st = [0.0, 0.5, 1.0], [200.0, -100.0, 50.0]
    np.testing.assert_allclose(tabulated_stress([0.25, 0.75], xt, st), [50.0, -25.0])
    with pytest.raises(ValidityRangeError):
        tabulated_stress(0.9, [0.0, 0.5], [1.0, 2.0])
    with pytest.raises(ValidityRangeError):
        tabulated_stress(0.2, [0.0, 0.5, 0.4], [1.0, 2.0, 3.0])  # not increasing


def test_depth_ratio_outside_section_is_refused():
    with pytest.raises(ValidityRangeError):
        polynomial_stress(1.2, [1.0])
    with pytest.raises(ValidityRangeError):
        polynomial_stress(-0.1, [1.0])


# Exact limits of the linearisation (BS 7910 §6.4 / R6 II.3 definitions, from memory):
# a uniform stress is pure membrane, σ_b(1 − 2x/t) is pure bending.
def test_linearisation_exact_limits_uniform_and_bending():
    assert linearise_polynomial([120.0]) == pytest.approx((120.0, 0.0), abs=1e-12)
    assert linearise_polynomial([80.0, -160.0]) == pytest.approx((0.0, 80.0), abs=1e-12)
    assert linearise_table([0.0, 1.0], [80.0, -80.0]) == pytest.approx((0.0, 80.0), abs=1e-12)


def test_linearisation_of_cubic_closed_form_and_table_agree():
    coeff = [100.0, -50.0, 30.0, 10.0]
    pm, pb = linearise_polynomial(coeff)
    # P_m = Σσ_i/(i+1), P_b = 6Σσ_i[1/(2(i+1)) − 1/(i+2)] (arithmetic)
    assert pm == pytest.approx(100 - 25 + 10 + 2.5, rel=1e-14)
    assert pb == pytest.approx(
        6 * (0 - 50 * (0.25 - 1 / 3) + 30 * (1 / 6 - 0.25) + 10 * (0.125 - 0.2)), rel=1e-14
    )
    x = np.linspace(0.0, 1.0, 4001)
    pm_t, pb_t = linearise_table(x, polynomial_stress(x, coeff))
    assert pm_t == pytest.approx(pm, rel=1e-6)
    assert pb_t == pytest.approx(pb, rel=1e-5)


def test_peak_part_vanishes_for_a_linear_profile_and_integrates_to_zero():
    x = np.linspace(0.0, 1.0, 11)
    lin = 30.0 + 70.0 * (1 - 2 * x)
    np.testing.assert_allclose(peak_stress(x, lin, 30.0, 70.0), 0.0, atol=1e-12)
    coeff = [0.0, 0.0, 300.0]
    pm, pb = linearise_polynomial(coeff)
    xf = np.linspace(0.0, 1.0, 20001)
    peak = peak_stress(xf, polynomial_stress(xf, coeff), pm, pb)
    assert np.trapezoid(peak, xf) == pytest.approx(0.0, abs=1e-5)
    assert np.trapezoid(peak * (0.5 - xf), xf) == pytest.approx(0.0, abs=1e-5)


def test_profile_holder_along_scaled_and_linearise():
    p = StressProfile("polynomial", coefficients=(100.0, -200.0))
    f = p.along(20.0)
    assert f(10.0) == pytest.approx(0.0)
    assert p.scaled(0.5)(0.0) == pytest.approx(50.0)
    assert p.scaled(0.5).linearise() == pytest.approx((0.0, 50.0), abs=1e-12)
    t = StressProfile("table", x_over_t=(0.0, 1.0), stress=(100.0, -100.0))
    assert t.linearise() == pytest.approx((0.0, 100.0), abs=1e-12)
    with pytest.raises(ValueError, match="polynomial"):
        StressProfile("spline")
