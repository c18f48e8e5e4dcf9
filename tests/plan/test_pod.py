"""POD curves and fits (MIL-HDBK-1823A forms)."""

import math

import numpy as np
import pytest

from cycj.plan.pod import (
    PodCurve,
    pod_from_a50,
    pod_from_a90,
    pod_from_glm,
    pod_from_signal_response,
)
from cycj.plan.pod_fit import fit_hit_miss, fit_signal_response


def test_signal_response_check_values_mil_hdbk_1823a():
    # MIL-HDBK-1823A (2009), docs/references.md R16, from memory: β0=−1, β1=1.2, τ=0.3, â_dec=1
    c = pod_from_signal_response(-1.0, 1.2, 0.3, 1.0)
    assert c.mu == pytest.approx(0.8333, abs=1e-4)
    assert c.sigma == pytest.approx(0.25, abs=1e-12)
    assert c.a50 == pytest.approx(2.3010, abs=5e-4)
    assert c.a90 == pytest.approx(3.1700, abs=5e-4)


def test_logit_check_values_mil_hdbk_1823a():
    # MIL-HDBK-1823A (2009), docs/references.md R16, from memory: logit β0=−3, β1=4
    c = pod_from_glm("logit", -3.0, 4.0)
    assert c.a50 == pytest.approx(2.1170, abs=5e-4)
    assert c.a90 == pytest.approx(3.6668, abs=5e-4)
    assert float(c(c.a90)) == pytest.approx(0.9, abs=1e-12)


def test_a90_constructor_and_ceiling():
    c = pod_from_a90("lognormal", 3.0, 0.4, ceiling=0.95)
    assert c.a90 == pytest.approx(3.0, rel=1e-12)
    assert float(c(3.0)) == pytest.approx(0.9 * 0.95, rel=1e-12)
    assert float(c(1e6)) == pytest.approx(0.95, rel=1e-9)
    assert float(c(0.0)) == 0.0
    assert 'model = "lognormal"' in c.to_toml() and "ceiling = 0.95" in c.to_toml()


def test_bad_pod_parameters():
    with pytest.raises(ValueError):
        PodCurve("weibull", 0.0, 1.0)
    with pytest.raises(ValueError):
        pod_from_a50("lognormal", 2.0, -0.1)


@pytest.mark.parametrize("link", ["logit", "probit"])
def test_hit_miss_fit_recovers_parameters(link):
    # synthetic data from a known GLM (MIL-HDBK-1823A form); tolerance ~3 standard errors
    rng = np.random.default_rng(11)
    b0, b1 = -3.0, 4.0
    a = np.exp(rng.uniform(math.log(0.5), math.log(8.0), 3000))
    eta = b0 + b1 * np.log(a)
    from scipy.special import expit, ndtr

    p = expit(eta) if link == "logit" else ndtr(eta)
    hit = (rng.random(a.size) < p).astype(int)
    fit = fit_hit_miss(a, hit, link)
    se = np.sqrt(np.diag(fit.covariance))
    assert abs(fit.params["beta0"] - b0) < 3.5 * se[0]
    assert abs(fit.params["beta1"] - b1) < 3.5 * se[1]
    true = pod_from_glm(link, b0, b1)
    assert fit.curve.a90 == pytest.approx(true.a90, rel=0.05)
    assert fit.a90_95 > fit.curve.a90
    assert fit.curve.a90_95 == fit.a90_95


def test_signal_response_fit_recovers_parameters_with_censoring():
    rng = np.random.default_rng(5)
    b0, b1, tau = -1.0, 1.2, 0.3
    a = np.exp(rng.uniform(math.log(0.3), math.log(10.0), 400))
    ahat = np.exp(b0 + b1 * np.log(a) + tau * rng.standard_normal(a.size))
    floor, sat = 0.3, 8.0
    ahat = np.clip(ahat, floor, sat)
    fit = fit_signal_response(a, ahat, decision=1.0, floor=floor, saturation=sat)
    assert fit.params["beta1"] == pytest.approx(b1, rel=0.08)
    assert fit.params["tau"] == pytest.approx(tau, rel=0.12)
    true = pod_from_signal_response(b0, b1, tau, 1.0)
    assert fit.curve.a90 == pytest.approx(true.a90, rel=0.06)
    assert fit.extra["censored_low"] > 0 and fit.extra["censored_high"] > 0
    assert fit.a90_95 > fit.curve.a90


def test_hit_miss_needs_hits_and_misses():
    with pytest.raises(ValueError, match="both"):
        fit_hit_miss([1, 2, 3, 4], [1, 1, 1, 1])


def test_hit_miss_a90_95_likelihood_ratio_and_delta_agree_for_large_samples():
    # MIL-HDBK-1823A (2009): LR and Wald bounds converge as n grows; both above a90
    rng = np.random.default_rng(3)
    a = np.exp(rng.uniform(math.log(0.5), math.log(8.0), 2000))
    from scipy.special import expit

    hit = (rng.random(a.size) < expit(-3.0 + 4.0 * np.log(a))).astype(int)
    fit = fit_hit_miss(a, hit, "logit")
    lr, dm = fit.extra["a90_95_likelihood_ratio_mm"], fit.extra["a90_95_delta_mm"]
    assert fit.a90_95 == lr and fit.extra["a90_95_bound"] == "likelihood-ratio"
    assert lr > fit.curve.a90 and dm > fit.curve.a90
    assert lr == pytest.approx(dm, rel=0.02)
    assert fit_hit_miss(a, hit, "logit", bound="delta").a90_95 == dm
