"""Inspection planning end to end: life engine, deterministic interval, Dask path, CLI."""

import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
import plan_closed_form as cf
import pytest

from cycj.case import load_case
from cycj.plan import plan_inspections
from cycj.plan import scatter as sc
from cycj.plan.deterministic import deterministic_interval
from cycj.plan.inputs import PlanInputs
from cycj.plan.pod import pod_from_a50
from cycj.plan.probabilistic import probabilistic_plan

ROOT = Path(__file__).resolve().parents[2]

# BS 7910:2013+A1:2015 §8, docs/references.md R13 (from memory): centre crack in an infinite
# plate, Δσ = 100 MPa, Paris law C = 1.648e-8 mm/cycle per (MPa√m)^3, m = 3: a = 1 → 10 mm
# takes N = 4.714e5 cycles.
CASE_13 = """
title = "docs/references.md R13 plate"
[material]
elastic_modulus = "200 GPa"
poisson_ratio = 0.3
yield_strength = "355 MPa"
toughness = { J_c = "12 kJ/m^2" }
growth.law = "paris"
growth.from_delta_K = { C = 1.648e-8, m = 3.0, rate_unit = "mm", driving_unit = "MPa*m**0.5" }
[geometry]
shape = "center-crack-infinite-plate"
crack_length = "1 mm"
constraint = "plane-stress"
[loading]
constant = { max = "100 MPa", min = "0 MPa" }
duration = "10 s"
[analysis]
j_method = "elastic"
[run]
criteria = ["size-limit"]
crack_length_limit = "10 mm"
[inspection]
detectable_size = "1 mm"
safety_factor = 2
design_life = 1.0e6
intervals = [1.0e5, 2.0e5]
pod = { model = "lognormal", a50 = "2 mm", sigma = 0.4 }
samples = 2000
seed = 7
target_pof = 1.0e-2
[inspection.scatter]
growth_C = { distribution = "lognormal", sigma = 0.3 }
"""


@pytest.fixture(scope="module")
def case13(tmp_path_factory):
    p = tmp_path_factory.mktemp("plan") / "ref13.toml"
    p.write_text(CASE_13)
    return load_case(p)


def test_deterministic_interval_closed_form():
    # interval = closed-form life ÷ safety factor (docs/references.md R13, from memory; common
    # practice SF = 2)
    a, n = cf.growth_curve(1.0, 1.0)
    d = deterministic_interval(a, n, 1.0, 10.0, 2.0, 1e6, 1, 10 / 3600)
    assert d["life_cycles"] == pytest.approx(4.714e5, rel=1e-3)
    assert d["interval_cycles"] == pytest.approx(4.714e5 / 2, rel=1e-3)
    assert d["interval_hours"] == pytest.approx(d["interval_cycles"] * 10 / 3600)
    assert [r["inspection"] for r in d["schedule"]] == [1, 2, 3, 4]
    assert d["schedule"][0]["a_mm"] == pytest.approx(
        cf.size_after(1.0, d["interval_cycles"]), rel=1e-3
    )


def test_plan_inspections_with_life_engine(case13):
    r = plan_inspections(case13)
    s = r.summary
    d = s["deterministic"]
    # docs/references.md R13 (from memory) through the life engine: 4.714e5 cycles, ÷ 2
    assert d["critical_crack_length_mm"] == pytest.approx(10.0, rel=1e-6)
    assert d["life_cycles"] == pytest.approx(4.714e5, rel=2e-3)
    assert d["interval_cycles"] == pytest.approx(4.714e5 / 2, rel=2e-3)
    assert d["interval_hours"] == pytest.approx(d["interval_cycles"] * 10 / 3600, rel=1e-9)
    # no inspection, fixed a0 = 1 mm, log-normal C: P(C > C*) closed form
    from scipy.special import ndtr

    p = 1 - ndtr(math.log(4.714e5 / 1e6) / 0.3)
    assert s["no_inspection"]["pof"] == pytest.approx(
        p, abs=4 * s["no_inspection"]["std_error"] + 2e-3
    )
    assert set(s) >= {"deterministic", "no_inspection", "what_if", "recommended_interval_cycles"}
    # times: 10 s per cycle (the case's duration), a year of 8766 h (365.25 days)
    hpc = 10 / 3600
    rec = s["recommendation"]
    assert s["recommended_interval_hours"] == pytest.approx(rec["interval_cycles"] * hpc)
    assert s["recommended_interval_years"] == pytest.approx(rec["interval_cycles"] * hpc / 8766)
    assert s["design_life_years"] == pytest.approx(1e6 * hpc / 8766)
    for w in s["what_if"]:
        assert w["interval_hours"] == pytest.approx(w["interval_cycles"] * hpc)
    # 2778 h = 16.5 weeks: weeks are the largest period with ten in the design life; the
    # per-period probabilities add up to the cumulative one over the design life
    rows = s["pof_per_period"]
    assert s["period"] == "week" and rows[-1]["end_cycles"] == pytest.approx(1e6)
    assert sum(r["pof_in_period_no_inspection"] for r in rows) == pytest.approx(
        s["no_inspection"]["pof"], abs=1e-12
    )
    assert rows[-1]["cumulative_pof_no_inspection"] == pytest.approx(s["no_inspection"]["pof"])
    assert list(r.what_if.columns[:4]) == ["interval_cycles", "pof", "std_error", "detections_mean"]


def test_dask_path_equals_in_process():
    distributed = pytest.importorskip("dask.distributed")
    s = sc.Scatter(growth_C=sc.lognormal(1.0, 0.3), initial_crack=sc.lognormal(0.8, 0.5))
    from test_plan_montecarlo import closed_table

    tab = closed_table(s)
    inp = PlanInputs(
        pod=pod_from_a50("lognormal", 2.0, 0.4),
        design_life=1e6,
        detectable_size=3.0,
        detectable_source="test",
        intervals=(1e5, 2e5),
        samples=3000,
        seed=11,
        target_pof=1e-2,
        max_inspections=20,
        chunk_size=1000,
        scatter=s,
    )
    local = probabilistic_plan(tab, inp)
    with distributed.LocalCluster(
        n_workers=1, threads_per_worker=1, processes=False, dashboard_address=":0"
    ) as cluster:
        remote = probabilistic_plan(tab, inp, scheduler=cluster.scheduler_address)
    assert remote["what_if"] == local["what_if"]
    assert remote["no_inspection"] == local["no_inspection"]
    assert remote["recommended_interval_cycles"] == local["recommended_interval_cycles"]
    assert np.array_equal(
        remote["cumulative"]["no_inspection"], local["cumulative"]["no_inspection"]
    )


def _cli(*args):
    return subprocess.run(
        [sys.executable, "-m", "cycj", *args], capture_output=True, text=True, cwd=ROOT, timeout=300
    )


def test_cli_plan_writes_outputs(case13, tmp_path):
    out = tmp_path / "out"
    r = _cli("plan", str(case13.path), "--out", str(out), "--json")
    assert r.returncode == 0, r.stderr
    plan = json.loads((out / "plan.json").read_text())
    assert plan["deterministic"]["interval_cycles"] == pytest.approx(4.714e5 / 2, rel=2e-3)
    for w in plan["what_if"]:
        assert set(w) >= {"interval_cycles", "pof", "std_error", "detections_mean"}
    for f in (
        "what_if.csv",
        "schedule.csv",
        "pof_vs_interval.png",
        "cumulative_pof.png",
        "crack_envelope.png",
        "pof_per_period.csv",
        "pof_per_period.png",
        "pod_used.png",
        "report.html",
    ):
        assert (out / f).is_file()
    report = (out / "report.html").read_text()
    assert "not replace" in report
    # the per-period table people plan with: the CSV holds plan.json's rows, the report a
    # table of them, and the periods add up to the cumulative probability of failure
    import pandas as pd

    per = pd.read_csv(out / "pof_per_period.csv")
    assert len(per) == len(plan["pof_per_period"]) > 1
    assert plan["period"] == "week" and f"Probability of failure per {plan['period']}" in report
    for col in ("no_inspection", "recommended"):
        np.testing.assert_allclose(
            np.cumsum(per[f"pof_in_period_{col}"]), per[f"cumulative_pof_{col}"], atol=1e-12
        )
    assert per["cumulative_pof_no_inspection"].iloc[-1] == pytest.approx(
        plan["no_inspection"]["pof"]
    )
    assert per["end_hours"].iloc[-1] == pytest.approx(1e6 * 10 / 3600)
    again = _cli("plan", str(case13.path), "--out", str(out))
    assert again.returncode == 2 and "not empty" in again.stderr


def test_cli_plan_bad_key_is_one_line(tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text(CASE_13.replace("safety_factor = 2", "safety_facter = 2"))
    r = _cli("plan", str(p), "--out", str(tmp_path / "o"))
    assert r.returncode == 2
    assert r.stderr.strip().count("\n") == 0 and "did you mean 'safety_factor'" in r.stderr


def test_cli_pod_examples(tmp_path):
    # both shipped data sets fit; the printed line drops into [inspection]
    r = _cli("pod", "examples/pod_hit_miss.csv", "--json")
    assert r.returncode == 0, r.stderr
    s = json.loads(r.stdout)
    assert s["a90_95_mm"] > s["a90_mm"] > s["a50_mm"] > 0
    assert s["pod_toml"].startswith('pod = { model = "loglogistic"')
    out = tmp_path / "pod"
    r = _cli("pod", "examples/pod_signal_response.csv", "--out", str(out))
    assert r.returncode == 0, r.stderr
    assert "pod = {" in r.stdout and (out / "pod.png").is_file()
    import tomllib

    line = (out / "pod.toml").read_text()
    assert tomllib.loads(line)["pod"]["model"] == "lognormal"
    bad = tmp_path / "bad.csv"
    bad.write_text("a_mm,ahat\n1.0,0.5\n2.0,x\n")
    r = _cli("pod", str(bad))
    assert r.returncode == 2 and ":3" in r.stderr


def test_cracks_below_threshold_are_raised_to_the_growing_size(tmp_path):
    # ΔK_th = 3 MPa√m: a_th = (3/100)²·1000/π = 0.2865 mm at Δσ = 100 MPa (K = S√(πa),
    # Tada–Paris–Irwin); smaller initial cracks are treated as a_th (conservative)
    text = CASE_13.replace(
        'driving_unit = "MPa*m**0.5" }', 'driving_unit = "MPa*m**0.5", threshold = "3 MPa*m**0.5" }'
    )
    text = text.replace(
        'growth_C = { distribution = "lognormal", sigma = 0.3 }',
        'initial_crack = { distribution = "lognormal", median = "0.4 mm", sigma = 0.5 }',
    )
    p = tmp_path / "thr.toml"
    p.write_text(text)
    s = plan_inspections(load_case(p)).summary
    assert any("do not grow" in w for w in s["warnings"])
    grow = [w for w in s["warnings"] if "do not grow" in w][0]
    a_g = float(grow.split("below ")[1].split(" mm")[0])
    assert a_g == pytest.approx(0.2865, rel=5e-3)
    # fixed C: failure within 1e6 cycles iff a0 ≥ a*, with N(a* → 10 mm) = 1e6 (closed
    # form, docs/references.md R13, from memory) and a* above a_th; a0 log-normal (median 0.4,
    # σ 0.5)
    from scipy.optimize import brentq
    from scipy.special import ndtr

    a_star = brentq(lambda a: cf.cycles(a, 10.0) - 1e6, a_g, 5.0)
    p_fail = 1 - ndtr(math.log(a_star / 0.4) / 0.5)
    no = s["no_inspection"]
    assert no["pof"] == pytest.approx(p_fail, abs=4 * no["std_error"] + 2e-3)


def test_budget_reached_is_said_in_headline_json_and_report(tmp_path):
    # a target far below what 4000 samples resolve (96/p samples for ±20 % at 95 %): the
    # headline, plan.json (flag and warning) and the report all say the budget ran out
    from cycj.plan.write import answer_sentence, write_plan

    text = CASE_13.replace("target_pof = 1.0e-2", "target_pof = 1.0e-3").replace(
        "samples = 2000", 'samples = 2000\nmax_samples = 4000\nmethod = "monte-carlo"'
    )
    p = tmp_path / "budget.toml"
    p.write_text(text)
    case = load_case(p)
    r = plan_inspections(case, workers=1)
    s = r.summary
    assert s["recommendation"]["budget_reached"] and not s["recommendation"]["converged"]
    assert s["samples_used"] == 4000
    assert "sample budget (4,000) was reached" in answer_sentence(s)
    assert any(w.startswith("sample budget reached") for w in s["warnings"])
    write_plan(r, case, tmp_path / "out")
    plan = json.loads((tmp_path / "out" / "plan.json").read_text())
    assert plan["recommendation"]["budget_reached"] is True
    assert "sample budget reached" in (tmp_path / "out" / "report.html").read_text()


def test_plan_warns_once_outside_valid_dJ(tmp_path):
    # the growth law's valid_dJ (written by cycj fit) travels into cycj plan as into cycj run:
    # one warning with the law's range and the share of cycles outside it.  ΔJ = K²/E' with
    # K = S√(πa) (Tada–Paris–Irwin): 0.157 kJ/m² at a = 1 mm, 1.57 kJ/m² at 10 mm (plane
    # stress, E = 200 GPa), so a range of 0.1–0.5 kJ/m² is left late in the life
    text = CASE_13.replace(
        'growth.law = "paris"', 'growth.law = "paris"\ngrowth.valid_dJ = ["0.1 kJ/m^2", 0.5]'
    )
    p = tmp_path / "valid.toml"
    p.write_text(text)
    s = plan_inspections(load_case(p)).summary
    warn = [w for w in s["warnings"] if "valid_dJ" in w]
    assert len(warn) == 1, s["warnings"]
    assert "0.1–0.5 kJ/m²" in warn[0] and "% of the cycles" in warn[0]
    # inside the range: no warning
    p.write_text(text.replace('["0.1 kJ/m^2", 0.5]', '["0.1 kJ/m^2", 2]'))
    assert not any("valid_dJ" in w for w in plan_inspections(load_case(p)).summary["warnings"])
