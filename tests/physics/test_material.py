"""Material data that contradict each other are reported with both values."""

import pytest

from cycj.material import Material, StressStrainCurve, curve_consistency_warnings


def _mat(k, n, sy=340.0):
    return Material(205e3, 0.3, sy, 510.0, StressStrainCurve(880.0, 0.16), StressStrainCurve(k, n))


def test_proof_stress_of_the_monotonic_curve_must_match_yield():
    # 780·0.002^0.19 = 239.5 MPa (by hand: exp(ln 780 + 0.19·ln 0.002)) against σ_y = 340 MPa
    w = curve_consistency_warnings(_mat(780.0, 0.19))
    assert len(w) == 1
    assert "239.5 MPa" in w[0] and "340 MPa" in w[0] and "-30 %" in w[0]


@pytest.mark.parametrize(
    ("k", "warns"),
    [(340.0 / 0.002**0.13 * 1.099, False), (340.0 / 0.002**0.13 * 1.101, True)],
)
def test_ten_per_cent_tolerance(k, warns):
    assert bool(curve_consistency_warnings(_mat(k, 0.13))) is warns


def test_no_monotonic_curve_no_warning():
    m = Material(205e3, 0.3, 340.0, 510.0, StressStrainCurve(880.0, 0.16))
    assert curve_consistency_warnings(m) == []
