"""End criteria at their thresholds (R6 / BS 7910, ASTM E1820), and their order when several
trip in the same cycle; check values from the published formulas evaluated by hand."""

import math

import numpy as np
import pytest

from cycj import kernel_slots as M
from cycj.end_criteria import (
    END_COLLAPSE,
    END_FAD,
    END_SIZE,
    END_TEARING,
    END_TOUGHNESS,
    RUNNING,
    end_check,
    tripped_criteria,
)
from cycj.fad import FAD_OPTION_1, FAD_OPTION_2


def _py(f):
    return getattr(f, "py_func", f)


def _mp(**on):
    mp = np.zeros(M.N_MP)
    mp[M.J_C] = 100.0
    mp[M.LR_MAX] = 1.2
    mp[M.A_LIMIT] = 50.0
    mp[M.A_TEAR] = math.inf
    mp[M.SIGMA_Y], mp[M.E_MOD] = 350.0, 200e3
    mp[M.K_PEAK], mp[M.N_PEAK] = 350.0 / 0.002**0.1, 0.1
    mp[M.FAD_CURVE] = FAD_OPTION_1
    for k, v in on.items():
        mp[getattr(M, k)] = v
    return mp


def _f1(lr):
    return (1 - 0.14 * lr**2) * (0.3 + 0.7 * math.exp(-0.65 * lr**6))


def _f2(lr, sy=350.0, e=200e3, k=350.0 / 0.002**0.1, n=0.1):
    s = lr * sy
    er = s / e + (s / k) ** (1 / n)
    return (e * er / (lr * sy) + lr**3 * sy / (2 * e * er)) ** -0.5


_CODES = {"collapse": END_COLLAPSE, "tearing": END_TEARING, "toughness": END_TOUGHNESS}
_CODES.update({"fad": END_FAD, "size-limit": END_SIZE})


def _first_tripped(a, jmax, lr, jel, rho, mp):
    """end_check's answer rebuilt from the list of every criterion tripped."""
    rows = tripped_criteria(a, jmax, lr, jel, rho, mp)
    return (_CODES[rows[0]["criterion"]], rows[0]["value"]) if rows else (RUNNING, 0.0)


@pytest.mark.parametrize("check", [end_check, _py(end_check), _first_tripped])
def test_each_criterion_at_its_threshold(check):
    # nothing trips inside every limit
    assert check(10.0, 50.0, 0.5, 10.0, 0.0, _mp(CHECK_TOUGH=1, CHECK_COLLAPSE=1))[0] == RUNNING
    # toughness: J_max ≥ J_c (ASTM E1820)
    mp = _mp(CHECK_TOUGH=1)
    assert check(10.0, 100.0, 0.5, 10.0, 0.0, mp) == (END_TOUGHNESS, 100.0)
    assert check(10.0, 99.999, 0.5, 10.0, 0.0, mp)[0] == RUNNING
    assert check(10.0, 150.0, 0.5, 10.0, 0.0, _mp())[0] == RUNNING  # not selected
    # collapse: L_r ≥ L_r,max
    mp = _mp(CHECK_COLLAPSE=1)
    assert check(10.0, 1.0, 1.2, 1.0, 0.0, mp) == (END_COLLAPSE, 1.2)
    assert check(10.0, 1.0, 1.1999, 1.0, 0.0, mp)[0] == RUNNING
    assert check(10.0, 1.0, 5.0, 1.0, 0.0, _mp())[0] == RUNNING
    # tearing: a ≥ a_tear (always checked; a_tear = ∞ when not selected)
    mp = _mp(A_TEAR=20.0)
    assert check(20.0, 1.0, 0.1, 1.0, 0.0, mp) == (END_TEARING, 20.0)
    assert check(19.999, 1.0, 0.1, 1.0, 0.0, mp)[0] == RUNNING
    # size limit: a ≥ a_limit
    assert check(50.0, 1.0, 0.1, 1.0, 0.0, _mp()) == (END_SIZE, 50.0)
    assert check(49.999, 1.0, 0.1, 1.0, 0.0, _mp())[0] == RUNNING


@pytest.mark.parametrize("check", [end_check, _py(end_check), _first_tripped])
@pytest.mark.parametrize("lr", [0.3, 0.9, 1.15])
def test_fad_option_1_and_2_by_hand(check, lr):
    # K_r = √(J_el/J_c) + ρ on or outside f(L_r) (R6 / BS 7910); J_c = 100 kJ/m²
    for curve, f in ((FAD_OPTION_1, _f1(lr)), (FAD_OPTION_2, _f2(lr))):
        mp = _mp(CHECK_FAD=1, FAD_CURVE=curve)
        rho = 0.05
        j_on = 100.0 * (f - rho) ** 2
        end, val = check(10.0, 1.0, lr, j_on * (1 + 1e-9), rho, mp)
        assert end == END_FAD
        assert val == pytest.approx(f, rel=1e-8)
        assert check(10.0, 1.0, lr, j_on * (1 - 1e-6), rho, mp)[0] == RUNNING
    # Option 2 lies below Option 1 here (a flat-topped curve with n = 0.1): they differ
    assert abs(_f2(0.9) - _f1(0.9)) > 0.01
    # beyond L_r,max the curve is 0: any K_r trips, even 0 (on the curve is failure)
    mp = _mp(CHECK_FAD=1)
    assert check(10.0, 1.0, 1.21, 1e-12, 0.0, mp)[0] == END_FAD
    assert check(10.0, 1.0, 1.21, 0.0, 0.0, mp) == (END_FAD, 0.0)
    assert check(10.0, 1.0, 1.2, 0.0, 0.0, mp)[0] == RUNNING  # f(L_r,max) > 0


@pytest.mark.parametrize("check", [end_check, _py(end_check)])
def test_collapse_leads_when_several_trip(check):
    mp = _mp(CHECK_TOUGH=1, CHECK_COLLAPSE=1, CHECK_FAD=1, A_TEAR=5.0, A_LIMIT=8.0)
    state = (10.0, 500.0, 91.6, 400.0, 0.0, mp)
    assert check(*state) == (END_COLLAPSE, 91.6)
    rows = tripped_criteria(*state)
    assert [r["criterion"] for r in rows] == [
        "collapse",
        "tearing",
        "toughness",
        "fad",
        "size-limit",
    ]
    assert [r["value"] for r in rows[:3]] == [91.6, 10.0, 500.0]
    assert [r["limit"] for r in rows] == [1.2, 5.0, 100.0, 0.0, 8.0]
    assert rows[3]["value"] == pytest.approx(2.0)  # √(400/100)
    # without collapse selected, tearing leads, then toughness
    mp[M.CHECK_COLLAPSE] = 0.0
    assert check(*state) == (END_TEARING, 10.0)
    mp[M.A_TEAR] = math.inf
    assert check(*state) == (END_TOUGHNESS, 500.0)
    mp[M.CHECK_TOUGH] = 0.0
    assert check(*state) == (END_FAD, pytest.approx(2.0))


def test_tripped_criteria_agree_with_end_check():
    rng = np.random.default_rng(3)
    for _ in range(300):
        mp = _mp(
            CHECK_TOUGH=float(rng.integers(2)),
            CHECK_COLLAPSE=float(rng.integers(2)),
            CHECK_FAD=float(rng.integers(2)),
            FAD_CURVE=float(rng.choice([FAD_OPTION_1, FAD_OPTION_2])),
            A_TEAR=float(rng.choice([math.inf, rng.uniform(5, 60)])),
        )
        state = (
            rng.uniform(1, 60),
            rng.uniform(0, 200),
            rng.uniform(0, 1.5),
            rng.uniform(0, 150),
            rng.uniform(0, 0.2),
            mp,
        )
        end, val = end_check(*state)
        rows = tripped_criteria(*state)
        if end == RUNNING:
            assert rows == []
        else:
            names = {END_COLLAPSE: "collapse", END_TEARING: "tearing", END_FAD: "fad"}
            names.update({END_TOUGHNESS: "toughness", END_SIZE: "size-limit"})
            assert rows[0]["criterion"] == names[end]
            assert rows[0]["value"] == pytest.approx(val, rel=1e-12)
