"""Long lives at speed: the curved block integration on short geometric grids, the whole-block
pass with the frozen crack's geometry hoisted, the stepper specialised on its models, and the
run's progress bar.  Check values are closed forms worked by hand (quoted beside them)."""

import math

import numpy as np
import pytest

from cycj import kernel_slots as M
from cycj.life import blockmode as B
from cycj.life import model_array
from cycj.life import stepper as K
from tests.helpers import make_case


def _exp_law(a, g0=1e-3, k=0.4, a0=2.0):
    """G(a) = g0·e^{k(a − a0)} [mm/block]: not a power law, so both rules are approximate."""
    return g0 * np.exp(k * (np.asarray(a, float) - a0))


def _exp_blocks(a, g0=1e-3, k=0.4, a0=2.0):
    """∫_{a0}^{a} da/G = (1 − e^{−k(a − a0)})/(g0·k), by hand."""
    return (1.0 - math.exp(-k * (a - a0))) / (g0 * k)


def test_curved_rule_on_ten_geometric_points_beats_power_law_segments():
    grid = np.geomspace(2.0, 20.0, 10)
    exact = _exp_blocks(20.0)
    curved = B.blocks_to_grow_curved(grid, _exp_law(grid))
    power = B.blocks_to_grow(grid, _exp_law(grid))
    assert curved[0] == 0.0
    assert curved[-1] == pytest.approx(exact, rel=3e-4)
    assert abs(power[-1] / exact - 1) > 10 * abs(curved[-1] / exact - 1)
    # every grid point, not only the last
    for a, b in zip(grid, curved, strict=True):
        assert b == pytest.approx(_exp_blocks(a), rel=1e-3, abs=1e-9)


def test_curved_rule_exact_for_a_power_law():
    # G = g0 (a/a0)^2: ∫ da/G = a0/g0·(1 − a0/a) (by hand), log G linear in log a
    grid = np.geomspace(1.0, 2.0, 6)
    b = B.blocks_to_grow_curved(grid, 1e-3 * grid**2)
    assert b[-1] == pytest.approx(500.0, rel=1e-12)


def test_curved_inverse_is_the_closed_form_inverse():
    grid = np.geomspace(2.0, 20.0, 10)
    g = _exp_law(grid)
    b = B.blocks_to_grow_curved(grid, g)
    for blocks in (0.0, 100.0, 0.5 * b[-1]):
        a = B.crack_after_blocks_curved(grid, b, g, blocks)
        # a(B) = a0 − ln(1 − g0·k·B)/k, by hand
        exact = 2.0 - math.log(1.0 - 1e-3 * 0.4 * blocks) / 0.4
        assert a == pytest.approx(exact, rel=3e-4, abs=1e-12)
    # near the end a(B) is steep: there the error in blocks (what a life sees) stays within
    # the integration error of the table
    for blocks in (b[-1] - 30.0, b[-1] - 3.0):
        a = B.crack_after_blocks_curved(grid, b, g, blocks)
        assert abs(_exp_blocks(a) - blocks) <= 1.2 * abs(b[-1] - _exp_blocks(20.0))
    assert B.crack_after_blocks_curved(grid, b, g, 2 * b[-1]) == 20.0


def test_curved_rule_keeps_the_arrest():
    grid = np.geomspace(2.0, 20.0, 10)
    g = _exp_law(grid)
    g[6:] = 0.0
    b = B.blocks_to_grow_curved(grid, g)
    assert np.all(np.isfinite(b[:6])) and np.all(np.isinf(b[6:]))


def _block_of(case, n=400, seed=3):
    rng = np.random.default_rng(seed)
    smax = rng.uniform(40.0, 100.0, n)
    smin = smax * rng.uniform(-0.4, 0.6, n)
    return smax[:, None].copy(), smin[:, None].copy()


@pytest.mark.parametrize(
    "j_method, closure",
    [("reference-stress", "newman"), ("elastic", "elber"), ("reference-stress", "none")],
)
def test_hoisted_block_pass_equals_the_cycle_by_cycle_sum(j_method, closure):
    case = make_case(
        geometry={"shape": "edge-crack-plate", "width": "40 mm", "thickness": "10 mm"},
        analysis={"j_method": j_method},
        loading={"constant": {"max": "100 MPa", "min": "0 MPa"}, "closure": closure},
        material={"growth": {"C": 1e-6, "m": 1.6, "basis": "effective"}},
    )
    mp = model_array(case)
    geo, ct = case.geometry, np.zeros((1, 2, 1))
    lmax, lmin = _block_of(case)
    got = K.block_growth(lmax, lmin, 3.0, geo.code, geo.params, ct, mp)
    g = s = 0.0
    jmx = lrmx = djmx = 0.0
    m = mp[M.M_LAW]
    for i in range(lmax.shape[0]):
        dj, jmax, lr, *_ = K.cycle_driving_force(lmax, lmin, i, 3.0, geo.code, geo.params, ct, mp)
        djm = dj**m if dj > 0 else 0.0
        g += K.cycle_rate(dj, jmax, mp)
        s += djm
        jmx, lrmx, djmx = max(jmx, jmax), max(lrmx, lr), max(djmx, dj)
    assert got[0] == pytest.approx(g, rel=1e-13)
    assert got[1] == pytest.approx((s / lmax.shape[0]) ** (1 / m), rel=1e-13)
    assert got[2:] == (jmx, lrmx, djmx)


@pytest.mark.parametrize("closure", ["newman", "elber", "constant", "none"])
def test_specialised_stepper_steps_like_the_generic_one(closure):
    loading = {"constant": {"max": "100 MPa", "min": "0 MPa"}, "closure": closure}
    if closure == "constant":
        loading["closure"] = {"model": "constant", "U": 0.8}
    case = make_case(
        geometry={"shape": "edge-crack-plate", "width": "40 mm", "thickness": "10 mm"},
        analysis={"j_method": "reference-stress"},
        loading=loading,
        material={"growth": {"C": 1e-6, "m": 1.6, "basis": "effective"}},
    )
    mp = model_array(case)
    geo, ct = case.geometry, np.zeros((1, 2, 1))
    lmax, lmin = _block_of(case)
    out = []
    for stepper in (
        K.stepper_for(False, False, False),
        K.stepper_for(False, False, False, int(mp[M.CLOSURE]), int(mp[M.J_METHOD])),
    ):
        st = np.zeros(M.N_STATE)
        st[M.ST_A] = 3.0
        rec, acc = np.zeros((50, K.N_REC)), np.zeros(8)
        res = stepper(
            lmax, lmin, st, 20, 1e18, geo.code, geo.params.copy(), ct, mp, 1e-3, rec, 0, acc
        )
        out.append((res, st.copy(), rec.copy(), acc.copy()))
    (r0, s0, rec0, acc0), (r1, s1, rec1, acc1) = out
    assert s0[M.ST_A] > 3.0
    assert r0 == r1
    assert np.array_equal(s0, s1) and np.array_equal(rec0, rec1) and np.array_equal(acc0, acc1)


def test_progress_bar_shows_the_share_of_the_way(capsys):
    from cycj.commands.run import _Progress

    p = _Progress(True)
    p.t0 -= 10.0  # a run that has gone on for a while
    p.span = (2.0, 12.0)
    p(1.5e6, 7.0)
    p.close()
    err = capsys.readouterr().err
    assert "[" + "#" * 12 + "." * 12 + "]" in err and "50 %" in err and "1.5e+06 cycles" in err
    quiet = _Progress(False)
    quiet.t0 -= 10.0
    quiet(1.0, 3.0)
    quiet.close()
    assert capsys.readouterr().err == ""
