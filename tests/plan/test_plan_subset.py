"""Subset simulation (Au & Beck, Probabilistic Engineering Mechanics 16 (2001) 263–277) of the
no-inspection probability of failure against the log-normal closed form of
tests/plan/test_plan_converged.py: with a log-normal growth constant (σ of ln C) and a fixed
initial crack, P(fail by N) = 1 − Φ(ln(N_med/N)/σ) (Johnson, Kotz & Balakrishnan, Continuous
Univariate Distributions Vol. 1, 2nd ed., Wiley 1994, ch. 14)."""

import math

import numpy as np
import pytest
from test_plan_converged import _life_for, _lognormal_case
from test_plan_montecarlo import inputs

from cycj.plan.probabilistic import pof_without_inspection
from cycj.plan.subset import _gamma, cross_check, subset_pof


@pytest.mark.parametrize("p", [1e-2, 1e-4, 1e-6])
def test_subset_simulation_matches_lognormal_closed_form(p):
    s, tab = _lognormal_case()
    z = []
    for seed in range(4):
        r = subset_pof(tab, s, _life_for(p), seed)
        assert r["cov_uncorrelated_levels"] <= r["cov"]
        assert r["evaluations"] <= 2000 + 1800 * (len(r["levels"]) - 1)
        # levels: one per decade below p0 = 0.1, the last one failing by itself
        assert len(r["levels"]) == pytest.approx(-math.log10(p), abs=1)
        assert abs(r["pof"] - p) <= 3 * r["std_error"], (seed, r["pof"])
        z.append(math.log(r["pof"] / p))
    # the mean of four seeds: unbiased to within its own spread
    assert abs(np.mean(z)) <= 3 * r["cov"] / 2


def test_gamma_of_independent_and_of_repeated_states():
    # Au & Beck eq. 29: γ = 0 for independent states; a chain that never moves has ρ(k) = 1,
    # so γ = 2 Σ_{k=1}^{Ns−1} (1 − k/Ns) = Ns − 1
    rng = np.random.default_rng(1)
    ind = rng.random((4000, 10)) < 0.1
    assert abs(_gamma(ind, ind.mean())) < 0.1
    frozen = np.repeat(rng.random((4000, 1)) < 0.1, 10, axis=1)
    assert _gamma(frozen, frozen.mean()) == pytest.approx(9.0, rel=1e-9)


def test_importance_sampling_is_cross_checked_by_subset_simulation():
    s, tab = _lognormal_case()
    p = 1e-4
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
    assert r["method"] == "importance-sampling"
    assert r["subset"]["agrees"] and r["subset"]["compared_with"] == r["pof"]
    far = {"pof": r["subset"]["pof"] + 10 * r["subset"]["std_error"], "std_error": 0.0}
    assert not cross_check(far, r["subset"])["agrees"]
