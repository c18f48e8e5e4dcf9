"""Monte Carlo core of inspection planning, checked against closed forms.

Growth curves come from the closed-form Paris law for a centre crack in an infinite plate
(tests/plan/plan_closed_form.py; docs/references.md R13, from memory), so these tests do not
need the life engine.
"""

import math

import numpy as np
import plan_closed_form as cf
import pytest
from scipy.special import ndtr

from cycj.plan import scatter as sc
from cycj.plan.curves import build_table, factor_grid
from cycj.plan.findings import Finding
from cycj.plan.inputs import PlanInputs
from cycj.plan.montecarlo import McSpec, Runner, pack_schedules, summarise, uniform_schedule
from cycj.plan.pod import pod_from_a50
from cycj.plan.probabilistic import probabilistic_plan


def closed_table(scatter: sc.Scatter, a_min=0.05):
    loads = factor_grid(scatter.load_scale, 7)
    tough = factor_grid(scatter.toughness, 5)
    t_max = float(tough.max())
    return build_table(
        lambda a, s: cf.growth_curve(a, s, t_max),
        lambda s, t: cf.critical_size(s, t),
        a_min,
        loads,
        tough,
    )


def inputs(scatter, pod=None, **kw):
    base = dict(
        pod=pod or pod_from_a50("lognormal", 2.0, 0.4),
        design_life=1.0e6,
        detectable_size=3.0,
        detectable_source="test",
        intervals=(5e4, 1e5),
        samples=20000,
        seed=3,
        target_pof=1e-2,
        max_inspections=40,
        chunk_size=5000,
        scatter=scatter,
    )
    base.update(kw)
    base.setdefault("max_samples", base["samples"])  # no samples added unless asked
    return PlanInputs(**base)


def test_life_coordinate_table_matches_closed_form():
    # Paris law, centre crack, infinite plate: N(a0 → a) closed form (docs/references.md R13,
    # from memory)
    s = sc.Scatter(load_scale=sc.lognormal(1.0, 0.1), initial_crack=sc.fixed(1.0))
    tab = closed_table(s)
    load = np.array([0.83, 1.0, 1.17])  # off the grid points
    k, w = tab.load_position(load)
    la = np.log(np.array([1.0, 4.0, 20.0]))
    got = tab.phi(la, k, w)
    exact = cf.cycles(0.05, np.exp(la), load)
    np.testing.assert_allclose(got, exact, rtol=2e-4)
    back = np.exp(tab.log_size(got, k, w))
    np.testing.assert_allclose(back, np.exp(la), rtol=1e-6)
    lac = tab.critical_log_size(k, w, np.array([1.0, 1.0, 1.0]))
    np.testing.assert_allclose(np.exp(lac), cf.critical_size(load), rtol=1e-3)


def test_reference_13_life_from_table():
    # docs/references.md R13 (from memory): Δσ = 100 MPa, a = 1 → 10 mm, N = 4.714e5 cycles
    tab = closed_table(sc.Scatter(initial_crack=sc.fixed(1.0)))
    k, w = np.zeros(2, np.int64), np.zeros(2)
    phi = tab.phi(np.log([1.0, 10.0]), k, w)
    assert phi[1] - phi[0] == pytest.approx(4.714e5, rel=1e-3)


def test_no_inspection_pof_equals_lognormal_closed_form():
    # P(fail by N) = P(C > C*(N)) = 1 − Φ(ln(N_life/N)/σ) for a fixed initial crack and
    # log-normal C (life ∝ 1/C, Paris law); tolerance 4 Monte Carlo standard errors
    sigma = 0.3
    s = sc.Scatter(growth_C=sc.lognormal(1.0, sigma), initial_crack=sc.fixed(1.0))
    inp = inputs(s)
    tab = closed_table(s)
    spec = McSpec(
        tab, s, inp.pod, inp.design_life, inp.samples, inp.seed, n_max=1, chunk_size=inp.chunk_size
    )
    arr, n = pack_schedules([[]], 1)
    res = summarise(Runner().run(spec, arr, n))
    life = cf.cycles(1.0, cf.critical_size())
    edges = np.linspace(0, inp.design_life, spec.n_bins + 1)[1:]
    for j in (20, 40, 59):
        p = 1 - ndtr(math.log(life / edges[j]) / sigma)
        se = math.sqrt(p * (1 - p) / inp.samples)
        assert abs(res["cumulative"][0][j] - p) < 4 * se + 1e-4
    p_end = 1 - ndtr(math.log(life / inp.design_life) / sigma)
    assert res["pof"][0] == pytest.approx(p_end, abs=4 * res["std_error"][0])


def test_perfect_detection_gives_zero_and_no_detection_gives_no_inspection_value():
    s = sc.Scatter(growth_C=sc.lognormal(1.0, 0.3), initial_crack=sc.lognormal(1.0, 0.3))
    tab = closed_table(s)
    sure = pod_from_a50("lognormal", 0.01, 0.01)  # POD = 1 above 0.05 mm
    never = pod_from_a50("lognormal", 1e6, 0.1)  # POD = 0 at any real size
    for pod, expect_zero in ((sure, True), (never, False)):
        spec = McSpec(tab, s, pod, 1e6, 5000, 1, n_max=100, chunk_size=2500)
        arr, n = pack_schedules([[], uniform_schedule(1e4, 1e6)], 100)
        res = summarise(Runner().run(spec, arr, n))
        assert res["pof"][0] > 0.05  # the no-inspection value is not small
        if expect_zero:  # interval 1e4 ≪ shortest life (> 1e5 cycles here)
            assert res["pof"][1] == 0.0
            assert res["detections_mean"][1] > 90
        else:
            assert res["pof"][1] == res["pof"][0]
            assert res["detections_mean"][1] == 0.0


def test_remove_repair_and_seed_reproducibility():
    s = sc.Scatter(growth_C=sc.lognormal(1.0, 0.3), initial_crack=sc.lognormal(1.0, 0.5))
    tab = closed_table(s)
    pod = pod_from_a50("lognormal", 3.0, 0.4)
    out = []
    for repair, seed in (("renew", 4), ("renew", 4), ("remove", 4), ("renew", 5)):
        spec = McSpec(tab, s, pod, 1e6, 4000, seed, repair, n_max=10, chunk_size=1000)
        arr, n = pack_schedules([uniform_schedule(1e5, 1e6)], 10)
        out.append(summarise(Runner().run(spec, arr, n))["pof"][0])
    assert out[0] == out[1]  # same seed → same answer
    assert out[2] <= out[0]  # a removed crack cannot fail later
    assert out[3] != out[0]


def test_probabilistic_plan_search_and_hazard():
    s = sc.Scatter(
        growth_C=sc.lognormal(1.0, 0.3),
        initial_crack=sc.lognormal(0.5, 0.5),
        toughness=sc.lognormal(1.0, 0.1),
    )
    inp = inputs(s, samples=6000, target_pof=5e-3, schedule=(3e5, 6e5))
    r = probabilistic_plan(closed_table(s), inp)
    rec = r["recommended_interval_cycles"]
    assert r["inspection_needed"] and rec is not None
    ok = [x for x in r["search"] if x["interval_cycles"] <= rec]
    assert all(x["pof"] <= inp.target_pof for x in ok)
    assert any(x["pof"] > inp.target_pof for x in r["search"] if x["interval_cycles"] > rec)
    for w in r["what_if"]:
        assert sum(w["pof_per_interval"]) == pytest.approx(w["pof"], abs=1e-12)
        assert len(w["pof_per_interval"]) == w["inspections"] + 1
    assert r["what_if"][0]["pof"] <= r["what_if"][1]["pof"] <= r["no_inspection"]["pof"]
    assert r["schedule"]["pof"] <= r["no_inspection"]["pof"]
    assert r["cumulative"]["no_inspection"][-1] == pytest.approx(r["no_inspection"]["pof"])


def test_finding_of_a_sized_crack_fixes_the_remaining_life():
    # crack found at 2e5 cycles, 5 mm ± 0.02 mm, C fixed: the remaining life is the closed
    # form from 5 mm; a horizon 10 % shorter gives no failure, 10 % longer gives failure
    s = sc.Scatter(initial_crack=sc.lognormal(1.0, 0.6))
    tab = closed_table(s)
    pod = pod_from_a50("lognormal", 2.0, 0.4)
    rest = cf.cycles(5.0, cf.critical_size())
    found = Finding(2e5, True, pod, 5.0, 0.02)
    for frac, expect in ((0.9, 0.0), (1.1, 1.0)):
        inp = inputs(
            s,
            pod=pod,
            design_life=2e5 + frac * rest,
            intervals=(5e4,),
            findings=(found,),
            samples=4000,
            chunk_size=2000,
        )
        r = probabilistic_plan(tab, inp)
        assert r["no_inspection"]["pof"] == pytest.approx(expect, abs=1e-3)
        assert r["start_cycles"] == 2e5


def test_not_found_lowers_the_probability_of_failure():
    s = sc.Scatter(growth_C=sc.lognormal(1.0, 0.3), initial_crack=sc.lognormal(1.0, 0.5))
    tab = closed_table(s)
    pod = pod_from_a50("lognormal", 2.0, 0.3)
    base = probabilistic_plan(tab, inputs(s, pod=pod, intervals=(1e5,), samples=4000))
    miss = Finding(1e5, False, pod)
    upd = probabilistic_plan(
        tab, inputs(s, pod=pod, intervals=(1e5,), samples=4000, findings=(miss,))
    )
    # the prior probability of failing after 1e5 cycles, with nothing found at 1e5, is lower
    assert upd["no_inspection"]["pof"] < base["no_inspection"]["pof"]
    assert upd["effective_samples"] < 4000


def test_one_inspection_detects_with_the_pod_at_the_crack_size_and_bins_the_failures():
    # nothing scatters: every sample's crack is a(t) of the closed-form Paris law
    # (plan_closed_form.py), so one inspection at t1 finds it with probability POD(a(t1))
    # (MIL-HDBK-1823A: POD as a function of size; a50 = a(t1) gives 1/2); a found crack is
    # removed, the others fail at N_f, after the inspection (interval 1 of the schedule)
    s = sc.Scatter(growth_C=sc.fixed(1.0), initial_crack=sc.fixed(1.0))
    tab = closed_table(s)
    n_f = cf.cycles(1.0, cf.critical_size())
    t1 = 0.5 * n_f
    for a50, expect in ((cf.size_after(1.0, t1), 0.5), (cf.size_after(1.0, t1) / 1.3, None)):
        pod = pod_from_a50("lognormal", a50, 0.4)
        p_det = float(pod(cf.size_after(1.0, t1))) if expect is None else expect
        spec = McSpec(tab, s, pod, 2 * n_f, 20000, 2, "remove", n_max=1, chunk_size=5000)
        arr, n = pack_schedules([[], [t1]], 1)
        res = summarise(Runner().run(spec, arr, n))
        se = math.sqrt(p_det * (1 - p_det) / 20000)
        assert res["detections_mean"][1] == pytest.approx(p_det, abs=3.5 * se)
        assert res["pof"][0] == 1.0
        assert res["pof"][1] == pytest.approx(1.0 - res["detections_mean"][1], abs=1e-12)
        np.testing.assert_allclose(res["per_interval"][1][:2], [0.0, res["pof"][1]], atol=1e-12)
