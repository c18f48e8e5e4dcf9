"""The BS 7910:2013 / R6 Rev. 4 Option 1 curve (docs/references.md R20, from memory), checked
against the printed formula evaluated by hand, at its limit cases and through the kernels."""

import math

import numpy as np
import pytest

from cycj import fad as F
from cycj import kernel_slots as M
from cycj.end_criteria import fad_value
from cycj.material import Material

E, SY, SU = 200_000.0, 300.0, 450.0  # MPa: μ = min(0.001·E/σ_y, 0.6) = 0.6, N = 0.1


def _hand(lr, mu=0.6, n=0.1, lr_max=1.25):
    """BS 7910:2013 §7.3.2 Option 1, typed from the standard's form."""
    if lr > lr_max:
        return 0.0
    f1 = (1 + 0.5) ** -0.5 * (0.3 + 0.7 * math.exp(-mu))
    if lr <= 1:
        return (1 + 0.5 * lr * lr) ** -0.5 * (0.3 + 0.7 * math.exp(-mu * lr**6))
    return f1 * lr ** ((n - 1) / (2 * n))


def _material():
    return Material(E, 0.3, SY, SU)


@pytest.mark.parametrize("lr", [0.0, 0.2, 0.5, 0.8, 1.0, 1.05, 1.1, 1.2, 1.25])
def test_2013_curve_equals_the_printed_formula(lr):
    assert F.fad_option1_2013(lr, _material()) == pytest.approx(_hand(lr), rel=1e-13)


def test_2013_curve_values_and_limits():
    m = _material()
    assert m.lr_max == pytest.approx(1.25)
    # values worked by hand: f(0.5) = 0.993468/1.06066, f(1) = 0.684168/1.224745
    assert F.fad_option1_2013(0.0, m) == 1.0
    assert F.fad_option1_2013(0.5, m) == pytest.approx(0.936651, abs=2e-6)
    assert F.fad_option1_2013(1.0, m) == pytest.approx(0.558620, abs=2e-6)
    assert F.fad_option1_2013(1.1, m) == pytest.approx(0.363789, abs=2e-6)  # 0.558621/1.1^4.5
    # continuous at L_r = 1, zero beyond L_r,max, and μ capped at 0.6
    assert F.fad_option1_2013(1.0 + 1e-12, m) == pytest.approx(F.fad_option1_2013(1.0, m))
    assert F.fad_option1_2013(1.2501, m) == 0.0
    assert F.bs7910_2013_parameters(E, 500.0, 600.0) == pytest.approx((0.4, 0.05))
    with pytest.raises(Exception, match="σ_y < σ_u"):
        F.bs7910_2013_parameters(E, 300.0, 300.0)


def test_2013_curve_differs_from_the_1999_curve():
    """The two editions' Option 1 curves are different curves (the 2013 one lies below at
    L_r = 1): choosing one must not silently give the other."""
    m = _material()
    assert F.fad_option1(1.0, m.lr_max) == pytest.approx(0.57227, abs=1e-5)
    assert F.fad_option1_2013(1.0, m) < F.fad_option1(1.0, m.lr_max) - 0.01


def test_kernel_dispatch_by_record_code():
    mp = np.zeros(M.N_MP)
    mp[M.SIGMA_Y], mp[M.E_MOD], mp[M.LR_MAX] = SY, E, 1.25
    mp[M.FLOW_RATIO] = 0.5 * (SY + SU) / SY
    for code, hand in ((F.FAD_OPTION_1_2013, _hand(1.1)), (F.FAD_OPTION_1, None)):
        mp[M.FAD_CURVE] = code
        got = fad_value(1.1, mp)
        want = hand if hand is not None else F.fad_option1(1.1, 1.25)
        assert got == pytest.approx(want, rel=1e-12)
    mp[M.FAD_CURVE] = 99
    with pytest.raises(ValueError, match="unknown FAD"):
        fad_value(0.5, mp)


def test_case_refuses_2013_curve_without_tensile_strength(tmp_path):
    from cycj.case import case_from_dict
    from cycj.errors import CycjInputError
    from tests.helpers import case_dict

    d = case_dict(analysis={"fad": "option-1-2013"}, run={"criteria": ["fad", "size-limit"]})
    d["material"].pop("tensile_strength")
    with pytest.raises(CycjInputError, match="analysis.fad"):
        case_from_dict(d, source="t.toml")
    d = case_dict(analysis={"fad": "option-1-2013"}, run={"criteria": ["fad", "size-limit"]})
    case = case_from_dict(d, source="t.toml")
    assert case.analysis.fad == "option-1-2013"
