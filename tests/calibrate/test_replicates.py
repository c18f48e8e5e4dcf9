"""Replicate programmes, intervals that cover and the scatter between specimens (``cycj fit``).

Data are invented: simulated by the repository's virtual test frame
(cycj/calibrate/simulate.py, ``simulate_programme``) with a known truth.  Sources: Davison &
Hinkley, *Bootstrap Methods and their Application* (1997) §3.8 (cluster bootstrap) and §8.2
(moving-block bootstrap), section numbers from memory; Laird & Ware, Biometrics 38 (1982)
(random intercept per specimen); ASTM E647 X1 (seven-point incremental polynomial).  The
full 200-programme coverage figure is printed by ``bench/bench_fit.py``.
"""

from __future__ import annotations

import json
import math
import tomllib
from pathlib import Path

import numpy as np
import pytest

from cycj.calibrate import fit_logs
from cycj.calibrate.coverage import coverage_study, programme_fit
from cycj.calibrate.simulate import simulate_programme
from cycj.calibrate.specimen import read_specimen
from cycj.errors import CycjInputError

EXAMPLES = Path(__file__).resolve().parents[2] / "examples"
SPEC = """
shape = "compact-tension"
width = "50 mm"
thickness = "12.5 mm"
crack_length = "15 mm"
elastic_modulus = "205 GPa"
poisson_ratio = 0.3
yield_strength = "450 MPa"
displacement_at = "front-face"
label = "{label}"
"""
TRUE_C, TRUE_M = 6e-5, 1.5


@pytest.fixture(scope="module")
def spec_path(tmp_path_factory):
    p = tmp_path_factory.mktemp("rep") / "ct.toml"
    p.write_text(SPEC.format(label="ct"))
    return p


@pytest.fixture(scope="module")
def spec(spec_path):
    return read_specimen(spec_path)


@pytest.mark.parametrize("spacing", ["crack", "cycles"])
def test_coverage_on_the_virtual_frame(spec, spacing):
    # cluster bootstrap (Davison & Hinkley 1997 §3.8) about the recommended direct a(N) fit:
    # nominal 95 % intervals of m and of da/dN at mid-range hold the truth in 90–98 % of
    # simulated programmes (known C, m; noise on a; between-specimen scatter σ_ln C = 0.15;
    # fixed seed), with readings at equal crack extension and at equal cycles (as the
    # example logs).  CI runs 100 programmes; bench/bench_fit.py runs the full 200.
    cov = coverage_study(
        spec, programmes=100, n_specimens=8, crack_end=30, resamples=500, spacing=spacing
    )
    assert cov["method"] == "cluster-bootstrap" and cov["estimate"] == "direct"
    assert 0.90 <= cov["m"] <= 0.98, cov
    assert 0.90 <= cov["rate_mid"] <= 0.98, cov
    # χ² interval of σ_ln C (normal ln C_i): near its nominal level too
    assert cov["sigma_ln_C"] >= 0.85, cov
    # lives predicted per specimen from its own fit (m fixed) within 5 % (median)
    assert cov["life_error"] < 0.05, cov


@pytest.mark.parametrize("n_specimens", [1, 3])
def test_coverage_few_specimens(spec, n_specimens):
    # fewer than five specimens: moving blocks of each test's residuals of a (Künsch 1989)
    # with the error of its first reading (a fixed start carries it into every residual);
    # with 2–4 specimens the between-specimen part of ln C and da/dN takes t(G−1).  Readings
    # at equal cycles, 40 programmes (bench/bench_fit.py runs 200 single-specimen ones)
    cov = coverage_study(
        spec,
        programmes=40,
        n_specimens=n_specimens,
        crack_end=30,
        resamples=300,
        spacing="cycles",
    )
    assert cov["method"] == "moving-block-bootstrap"
    assert cov["m"] >= 0.9 and cov["rate_mid"] >= 0.9, cov


def test_coverage_check_can_fail(spec):
    # the same check on the regression of seven-point incremental polynomial rates (ASTM
    # E647 X1) with readings at equal cycles: the rates overshoot where growth accelerates
    # between readings, a bias every specimen shares, and the intervals of m miss the truth
    cov = coverage_study(
        spec,
        programmes=40,
        n_specimens=8,
        crack_end=30,
        resamples=300,
        spacing="cycles",
        estimate="polynomial",
    )
    assert cov["m"] < 0.5, cov


def test_between_specimen_sigma_within_its_interval(spec):
    # σ_ln C between 30 specimens (simulated 0.2) lies in its own 95 % interval
    prog = simulate_programme(
        spec, TRUE_C, TRUE_M, n_specimens=30, sigma_ln_C=0.2, crack_end=30, readings=120, seed=7
    )
    res = programme_fit(prog, spec, resamples=300)
    lo, hi = res["between"]["sigma_ln_C_interval"]
    assert lo <= 0.2 <= hi
    assert res["between"]["n_specimens"] == 30
    # each specimen's own C (m fixed) follows its simulated C within 2 %
    c_fit = np.array([r["C"] for r in res["per_specimen"]])
    assert np.median(np.abs(c_fit / prog.C_specimens - 1)) < 0.02


def test_long_format_file_one_specimen_file(spec_path, tmp_path):
    # one long-format log of six tests, one specimen file for all
    prog = simulate_programme(
        read_specimen(spec_path),
        TRUE_C,
        TRUE_M,
        n_specimens=6,
        sigma_ln_C=0.1,
        crack_end=28,
        readings=80,
        seed=3,
    )
    log = tmp_path / "programme.csv"
    prog.crack.to_csv(log, index=False)
    res = fit_logs(log, spec_path, resamples=300)
    s = res.summary
    assert s["interval_method"] == "cluster-bootstrap"
    assert [r["specimen"] for r in s["per_specimen"]] == [f"S{i:03d}" for i in range(1, 7)]
    b = s["between_specimen"]
    assert b["n_specimens"] == 6 and b["m_fixed"] == pytest.approx(s["m"])
    assert b["sigma_ln_C_interval"][0] <= 0.1 <= b["sigma_ln_C_interval"][1]
    assert s["m"] == pytest.approx(TRUE_M, abs=0.01)  # coverage: test_coverage_on_the_…
    ratios = [r["life_ratio"] for r in s["per_specimen"]]
    assert np.median(np.abs(np.subtract(ratios, 1))) < 0.05
    # every reading used, none dropped without a reason (outlier rejection off)
    assert s["outliers"].startswith("off") and res.skipped == []
    assert all(v["kept"] == v["readings"] for v in s["spacing"].values())
    # the snippet: valid ΔJ range of the recommended fit and a ready scatter line
    snippet = tomllib.loads(res.snippet)["growth"]
    lo, hi = s["dJ_range_kJm2"]
    assert snippet["valid_dJ"] == [f"{lo:.4g} kJ/m^2", f"{hi:.4g} kJ/m^2"]
    line = [ln for ln in res.snippet.splitlines() if "growth_C" in ln][0]
    scatter = tomllib.loads(line.lstrip("# "))["growth_C"]
    assert scatter == {"distribution": "lognormal", "sigma": float(f"{b['sigma_ln_C']:.3g}")}
    # six specimen files, matched by label
    files = []
    for i in range(6):
        p = tmp_path / f"spec{i}.toml"
        p.write_text(SPEC.format(label=f"S{6 - i:03d}"))
        files.append(p)
    res2 = fit_logs(log, files, resamples=300)
    assert res2.summary["C"] == pytest.approx(s["C"])
    with pytest.raises(CycjInputError, match="one specimen file for all tests"):
        fit_logs(log, files[:4])


def test_single_specimen_moving_block_bootstrap(spec_path, tmp_path):
    # one test: intervals from moving blocks of rates (Künsch 1989; Davison & Hinkley §8.2),
    # labelled as such; the between-specimen scatter is unknown
    prog = simulate_programme(
        read_specimen(spec_path), TRUE_C, TRUE_M, n_specimens=1, crack_end=30, seed=5
    )
    log = tmp_path / "one.csv"
    prog.crack.drop(columns="specimen").to_csv(log, index=False)
    res = fit_logs(log, spec_path, resamples=400)
    s = res.summary
    assert s["interval_method"] == "moving-block-bootstrap"
    assert "one specimen" in s["interval_note"]
    assert s["between_specimen"]["sigma_ln_C"] is None
    assert "unknown" in s["between_specimen"]["note"]
    assert "unknown (one specimen)" in res.snippet and "growth_C" not in res.snippet
    assert any("moving-block" in r for r in s["references"])
    # the specimen's own C lies in its interval
    c_own = prog.C_specimens[0]
    assert s["C_interval"][0] <= c_own <= s["C_interval"][1]
    assert s["m_interval"][0] <= TRUE_M <= s["m_interval"][1]


def test_outlier_option_lists_every_dropped_point(spec_path, tmp_path):
    prog = simulate_programme(
        read_specimen(spec_path), TRUE_C, TRUE_M, n_specimens=1, crack_end=30, seed=6
    )
    frame = prog.crack.drop(columns="specimen")
    frame.loc[100, "crack_length"] += 1.0  # one bad reading
    log = tmp_path / "bad.csv"
    frame.to_csv(log, index=False)
    assert fit_logs(log, spec_path, resamples=200).summary["outliers"].startswith("off")
    res = fit_logs(log, spec_path, outlier_limit=3.5, resamples=200)
    assert any("robust σ" in r["reason"] for r in res.skipped)
    assert all(r["reason"] and r["log"] == "bad.csv" for r in res.skipped)


def test_direct_fit_unbiased_at_equal_cycles(spec):
    # noise-free readings at equal cycles (few readings late in the test, where growth
    # accelerates): integrating the law over each test recovers m and C of the virtual frame
    # (its own a(N), simulate.py) to 0.2 %, where the seven-point incremental polynomial
    # (ASTM E647 X1) overshoots; the ΔJ(a) table must not overstate ΔJ between readings
    from cycj.calibrate import fits as ft
    from cycj.calibrate import reduction as rd
    from cycj.calibrate.logs import CrackLog

    prog = simulate_programme(
        spec,
        TRUE_C,
        TRUE_M,
        n_specimens=2,
        sigma_ln_C=0.0,
        readings=40,
        crack_noise=0.0,
        spacing="cycles",
        crack_end=30,
        seed=1,
    )
    series, slopes = [], []
    for lab, df in prog.crack.groupby("specimen", sort=False):
        cols = [df[k].to_numpy(float) for k in ("cycle", "crack_length", "load_max", "load_min")]
        rows, _, _ = rd.reduce_crack_log(CrackLog(str(lab), *cols), spec)
        series.append(ft.direct_series(rows, str(lab)))
        p = rd.rates_for_rows(rows, spec)[0]["polynomial"]
        slopes.append(np.polyfit(np.log(p["dJ_eff_kJm2"]), np.log(p["dadN_mm_per_cycle"]), 1)[0])
    d = ft.direct_fit(series, TRUE_C, TRUE_M)
    assert d["m"] == pytest.approx(TRUE_M, abs=0.003)
    assert d["C"] == pytest.approx(TRUE_C, rel=0.01)
    assert min(slopes) > TRUE_M + 0.01  # the rates' bias that the direct fit avoids


def test_direct_fit_start_fixed_at_first_reading(spec_path, tmp_path):
    prog = simulate_programme(
        read_specimen(spec_path), TRUE_C, TRUE_M, n_specimens=2, sigma_ln_C=0.0, seed=8
    )
    log = tmp_path / "two.csv"
    prog.crack.to_csv(log, index=False)
    d = fit_logs(log, spec_path, method="direct", resamples=200).summary["fits"]["direct"]
    first = prog.crack.groupby("specimen", sort=False)["crack_length"].first().to_list()
    assert d["start"].startswith("fixed") and d["a0_mm"] == pytest.approx(first)
    assert d["m"] == pytest.approx(TRUE_M, abs=0.03)


def test_run_warns_outside_valid_dJ(tmp_path):
    # the growth law's valid_dJ travels into cycj run: one warning with the range and share
    from cycj.case import load_case
    from cycj.life.predict import predict_life

    text = (EXAMPLES / "lab_compact_tension.toml").read_text()
    old = [ln for ln in text.splitlines() if ln.startswith("growth =")][0]
    new = old.replace(' basis = "applied" }', ' basis = "applied", valid_dJ = ["1 kJ/m^2", 2] }')
    p = tmp_path / "case.toml"
    p.write_text(text.replace(old, new))
    case = load_case(p)
    assert case.growth.valid_dJ == (1.0, 2.0)
    warn = [w for w in predict_life(case).warnings if "valid_dJ" in w]
    assert len(warn) == 1 and "1–2 kJ/m²" in warn[0] and "% of the cycles" in warn[0]
    p.write_text(text.replace(old, old.replace(" }", ', valid_dJ = ["3 kJ/m^2", 1] }')))
    with pytest.raises(CycjInputError, match="valid_dJ"):
        load_case(p)


def test_fit_json_contract_keys(spec_path, tmp_path):
    from cycj.calibrate.write import write_outputs

    prog = simulate_programme(read_specimen(spec_path), TRUE_C, TRUE_M, n_specimens=3, seed=9)
    log = tmp_path / "three.csv"
    prog.crack.to_csv(log, index=False)
    res = fit_logs(log, spec_path, resamples=200, dJ_at=[2.0, 4.0])
    out = tmp_path / "out"
    write_outputs(res, out, logs=[log], specimens=[spec_path], plots=False)
    s = json.loads((out / "fit.json").read_text())
    for key in ("C", "m", "C_interval", "m_interval", "sigma_ln", "dJ_range_kJm2"):
        assert key in s
    assert len(s["per_specimen"]) == 3
    row = s["per_specimen"][0]
    assert {"C", "m", "life_predicted", "life_observed"} <= set(row)
    assert {"sigma_ln_C", "n_specimens", "m_fixed"} <= set(s["between_specimen"])
    assert "not a scatter for planning" in s["sigma_ln_note"]
    assert [r["dJ_kJm2"] for r in s["rate_at"]] == pytest.approx([2.0, 4.0])
    assert all(r["interval"][0] < r["dadN_mm_per_cycle"] < r["interval"][1] for r in s["rate_at"])
    assert (out / "per_specimen.csv").is_file()
    assert math.isfinite(s["C"])


def test_long_format_raw_loops(tmp_path):
    # raw loops of two tests in one file (specimen, cycle, load, displacement)
    import pandas as pd

    from cycj.calibrate.simulate import simulate_test

    p = tmp_path / "ct.toml"
    p.write_text(SPEC.format(label="ct"))
    spec = read_specimen(p)
    frames = []
    for i, (pmax, seed) in enumerate(((14000, 1), (16000, 2))):
        sim = simulate_test(
            spec, TRUE_C, TRUE_M, p_max=pmax, record_every=400, crack_end=24, samples=60, seed=seed
        )
        frames.append(
            sim.raw.assign(specimen=f"R{i}")[["specimen", "cycle", "load", "displacement"]]
        )
    log = tmp_path / "raw.csv"
    pd.concat(frames).to_csv(log, index=False)
    res = fit_logs(log, p, resamples=200)
    s = res.summary
    assert s["basis"] == "effective" and s["n_tests"] == 2
    assert [r["test"] for r in s["per_specimen"]] == ["raw.csv:R0", "raw.csv:R1"]
    assert s["m"] == pytest.approx(TRUE_M, abs=0.1)


def test_random_intercept_balanced_closed_form():
    # balanced one-way random effects (equal within-test errors): the REML estimate of τ²
    # equals the ANOVA moment estimate s² − se² when positive, μ is the plain mean and
    # se(μ) = √((τ² + se²)/G) (Searle, Casella & McCulloch, *Variance Components* (1992)
    # ch. 3–4, from memory).  y = 0, 1, 2, 3 with se = 0.5: s² = 5/3, τ² = 5/3 − 1/4
    from cycj.calibrate.between import random_intercept

    r = random_intercept([0.0, 1.0, 2.0, 3.0], [0.5] * 4)
    assert r["tau"] ** 2 == pytest.approx(5 / 3 - 0.25, rel=1e-4)
    assert r["mean"] == pytest.approx(1.5)
    assert r["se"] == pytest.approx(math.sqrt((5 / 3) / 4), rel=1e-4)
    # t(3) = 3.182446 (two-sided 95 %)
    assert r["interval"][1] - r["mean"] == pytest.approx(3.182446 * r["se"], rel=1e-5)
    # within-test errors larger than the spread: τ = 0, inverse-variance mean
    r0 = random_intercept([0.0, 0.1], [1.0, 2.0])
    assert r0["tau"] == 0.0
    assert r0["mean"] == pytest.approx((0.0 / 1 + 0.1 / 4) / (1 + 1 / 4))
    assert random_intercept([1.0], [0.1]) is None
