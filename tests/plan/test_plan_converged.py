"""Converged recommendation, small probabilities and worker-independent answers.

Closed forms: with a log-normal growth constant (σ of ln C) and a fixed initial crack, the life
is N_med/x with x the C-factor (Paris law, life ∝ 1/C), so
P(fail by N) = 1 − Φ(ln(N_med/N)/σ) exactly (log-normal distribution function, Johnson, Kotz
& Balakrishnan, Continuous Univariate Distributions Vol. 1, 2nd ed., Wiley 1994, ch. 14).
Growth curves are the closed-form Paris law for a centre crack in an infinite plate
(tests/plan/plan_closed_form.py).
"""

import json
import math

import numpy as np
import plan_closed_form as cf
import pytest
from scipy.special import ndtri
from test_plan_montecarlo import closed_table, inputs

from cycj.plan import scatter as sc
from cycj.plan.probabilistic import choose_method, pof_without_inspection, probabilistic_plan
from cycj.plan.reliability import form
from cycj.plan.search import isotonic

SIGMA = 0.3


def _lognormal_case():
    s = sc.Scatter(growth_C=sc.lognormal(1.0, SIGMA), initial_crack=sc.fixed(1.0))
    return s, closed_table(s)


def _life_for(p):
    """Design life whose no-inspection probability of failure is p (closed form above)."""
    n_med = cf.cycles(1.0, cf.critical_size())
    return n_med / math.exp(SIGMA * ndtri(1 - p))


@pytest.mark.parametrize("p", [1e-2, 1e-4, 1e-6])
def test_small_pof_lognormal_closed_form(p):
    s, tab = _lognormal_case()
    inp = inputs(
        s,
        design_life=_life_for(p),
        target_pof=p,
        samples=2000,
        chunk_size=1000,
        max_samples=200_000,
        intervals=(),
    )
    r = pof_without_inspection(tab, inp)
    assert r["method"] == ("monte-carlo" if p >= 1e-3 else "importance-sampling")
    assert abs(r["pof"] - p) <= 3 * r["std_error"]
    assert r["std_error"] <= 0.2 * r["pof"]
    assert r["life_evaluations"] <= 200_000
    # FORM is exact for this linear limit state in ln C
    assert r["form"]["pof"] == pytest.approx(p, rel=2e-3)


def test_form_design_point_two_variables():
    # C-factor and load scale log-normal: the closed-form life N(s, x) = N(a0 → a_c(s), s)/x
    # (plan_closed_form.py); at the design point the life equals the horizon and the gradient
    # of ln N in u is parallel to u (Hasofer & Lind 1974: the nearest point of g = 0)
    s1, s2 = 0.3, 0.05
    s = sc.Scatter(
        growth_C=sc.lognormal(1.0, s1),
        initial_crack=sc.fixed(1.0),
        load_scale=sc.lognormal(1.0, s2),
    )
    r = form(closed_table(s), s, 2e5)
    assert r["converged"]

    def ln_life(u1, u2):
        load = math.exp(s2 * u2)
        return math.log(cf.cycles(1.0, cf.critical_size(load), load) / math.exp(s1 * u1))

    u = np.array(r["design_point"])[[0, 3]]
    assert ln_life(*u) == pytest.approx(math.log(2e5), abs=2e-3)
    h = 1e-4
    grad = np.array(
        [
            (ln_life(u[0] + h, u[1]) - ln_life(u[0] - h, u[1])) / (2 * h),
            (ln_life(u[0], u[1] + h) - ln_life(u[0], u[1] - h)) / (2 * h),
        ]
    )
    cos = abs(grad @ u) / (np.linalg.norm(grad) * np.linalg.norm(u))
    assert cos == pytest.approx(1.0, abs=1e-3)


def test_method_chosen_by_target():
    s, _ = _lognormal_case()
    assert choose_method(inputs(s, target_pof=1e-2)) == "monte-carlo"
    assert choose_method(inputs(s, target_pof=1e-5)) == "importance-sampling"
    assert choose_method(inputs(s, target_pof=1e-5, method="monte-carlo")) == "monte-carlo"


def test_isotonic_pool_adjacent_violators():
    # worked by hand: [1, 3, 2, 4] → [1, 2.5, 2.5, 4]; weights pool as a weighted mean
    np.testing.assert_allclose(isotonic([1, 3, 2, 4], [1, 1, 1, 1]), [1, 2.5, 2.5, 4])
    np.testing.assert_allclose(isotonic([3, 1], [3, 1]), [2.5, 2.5])


CASE = sc.Scatter(
    growth_C=sc.lognormal(1.0, 0.3),
    initial_crack=sc.lognormal(0.5, 0.5),
    toughness=sc.lognormal(1.0, 0.1),
)


def _plan(seed, **kw):
    base = dict(samples=4000, seed=seed, target_pof=1e-2, chunk_size=2000, max_samples=400_000)
    base.update(kw)
    return probabilistic_plan(closed_table(CASE), inputs(CASE, **base))


def test_recommendation_converged_monotone_and_stable_over_seeds():
    recs = []
    for seed in range(5):
        r = _plan(seed)
        rec = r["recommendation"]
        assert rec["converged"] and not rec["budget_reached"]
        assert rec["half_width"] <= 0.2 * 1e-2
        lo, hi = rec["pof_ci"]
        assert lo <= rec["pof_estimate"] <= hi
        p = [x["pof"] for x in r["search"]]
        assert all(b >= a for a, b in zip(p, p[1:], strict=False))  # monotone
        recs.append(r["recommended_interval_cycles"])
    recs = np.array(recs)
    assert np.all(np.abs(recs / np.median(recs) - 1) <= 0.05), recs  # each within 5 %


def test_budget_reached_is_said():
    r = _plan(1, target_pof=1e-3, max_samples=6000)
    assert r["recommendation"]["budget_reached"]
    assert not r["recommendation"]["converged"]
    assert r["samples_used"] == 6000


def test_one_two_workers_and_dask_give_identical_plans(tmp_path):
    # plan.json results (the summary without provenance) for one seed
    distributed = pytest.importorskip("dask.distributed")
    from test_plan_end_to_end import CASE_13

    from cycj.case import load_case
    from cycj.plan import plan_inspections

    text = CASE_13.replace("samples = 2000", "samples = 2000\nchunk_size = 500\nmax_samples = 8000")
    path = tmp_path / "c.toml"
    path.write_text(text)
    case = load_case(path)
    dump = lambda r: json.dumps(r.summary, sort_keys=True, default=float)  # noqa: E731
    one = dump(plan_inspections(case, workers=1))
    two = dump(plan_inspections(case, workers=2))
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address=":0"
    ) as cluster:
        remote = dump(plan_inspections(case, scheduler=cluster.scheduler_address))
    assert one == two == remote
    assert json.loads(one)["chunks"] > 1


def test_importance_sampling_with_inspections_agrees_with_plain_monte_carlo():
    # the same what-if intervals by both methods: unbiased estimates agree within 3 combined
    # standard errors; and a target of 1e-5 is resolved with far fewer samples than the
    # ≈ 1e7 plain Monte Carlo would need for a ±20 % interval at 95 % (96/p samples)
    kw = dict(target_pof=1e-3, intervals=(1.2e5, 1.6e5), samples=20000, chunk_size=10000)
    mc = _plan(2, method="monte-carlo", max_samples=20000, **kw)
    imp = _plan(2, method="importance-sampling", max_samples=20000, **kw)
    assert imp["method"] == "importance-sampling" and imp["cross_entropy"]["levels"]
    for a, b in zip(mc["what_if"], imp["what_if"], strict=True):
        assert abs(a["pof"] - b["pof"]) <= 3 * math.hypot(a["std_error"], b["std_error"])
    small = _plan(0, target_pof=1e-5, samples=20000, chunk_size=10000, max_samples=200_000)
    rec = small["recommendation"]
    assert rec["method"] == "importance-sampling"
    assert rec["converged"] and rec["samples"] <= 200_000
