"""Fitting POD curves to inspection data by maximum likelihood (MIL-HDBK-1823A).

* hit/miss: a GLM, POD = F(β0 + β1·ln a), F the logistic (logit) or normal (probit) CDF;
* signal response: ln â = β0 + β1·ln a + ε, ε ~ N(0, τ²), censored below a recording floor
  and above a saturation level (Tobit regression).

a90/95 is the 95 % one-sided upper confidence bound on a90: for hit/miss by the profile
likelihood ratio (default) or the delta method; for â vs a by the delta method (Wald) on ln a90
with the covariance from the observed information (inverse Hessian of −ln L).

Units: crack sizes in mm; â in the instrument's own unit.

References
----------
.. [1] MIL-HDBK-1823A, *Nondestructive Evaluation System Reliability Assessment*, US DoD (2009),
   §§ on hit/miss and â vs a analyses.
.. [2] Berens, A. P., "NDE reliability data analysis", *ASM Handbook* Vol. 17 (1989) 689–701.
.. [3] Cheng, R. C. H., Iles, T. C., "Confidence bands for cumulative distribution functions of
   continuous random variables", *Technometrics* 25 (1983) 77–86 (Wald bound on a quantile).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from cycj.plan.pod import Z90, Z95, PodCurve, pod_from_glm, pod_from_signal_response


@dataclass(frozen=True)
class PodFit:
    """A fitted POD curve with its parameters, covariance and a90/95 [mm]."""

    curve: PodCurve
    method: str  # "hit-miss" or "signal-response"
    link: str  # "logit" or "probit"
    params: dict  # β0, β1 (and τ, â_dec)
    covariance: np.ndarray
    n: int
    a90_95: float
    extra: dict = field(default_factory=dict)

    def summary(self) -> dict:
        c = self.curve
        return {
            "method": self.method,
            "link": self.link,
            "n": self.n,
            "model": c.model,
            "mu": c.mu,
            "sigma": c.sigma,
            "a50_mm": c.a50,
            "a90_mm": c.a90,
            "a90_95_mm": self.a90_95,
            "params": self.params,
            "covariance": self.covariance.tolist(),
            "pod_toml": c.to_toml(),
            **self.extra,
        }


def _hessian(fun, x, h=1e-4):
    """Central-difference Hessian of a scalar function (small problems only)."""
    x = np.asarray(x, float)
    n = x.size
    hess = np.empty((n, n))
    step = h * np.maximum(1.0, np.abs(x))
    for i in range(n):
        for j in range(i, n):
            ei = np.zeros(n)
            ej = np.zeros(n)
            ei[i] = step[i]
            ej[j] = step[j]
            v = fun(x + ei + ej) - fun(x + ei - ej) - fun(x - ei + ej) + fun(x - ei - ej)
            hess[i, j] = hess[j, i] = v / (4 * step[i] * step[j])
    return hess


def _lr_upper_ln_a90(nll, z90: float, b_hat, ln_a90: float, se: float) -> float:
    """Upper end of the one-sided 95 % likelihood-ratio bound on ln a90 (hit/miss).

    The GLM is re-parameterised by (ln a90, β1): β0 = z90 − β1·ln a90; the profile deviance
    2(ℓ̂ − ℓ_p) reaches χ²₁(0.90) = 2.7055 at the bound.
    """
    from scipy.optimize import brentq, minimize_scalar

    l_hat = nll(b_hat)
    crit = 2.705543454095404

    def dev(x90):
        f = lambda lb: nll([z90 - math.exp(lb) * x90, math.exp(lb)])  # noqa: E731
        lb0 = math.log(b_hat[1])
        r = minimize_scalar(f, bracket=(lb0 - 0.5, lb0 + 0.5))
        return 2 * (r.fun - l_hat) - crit

    step = max(se, 1e-3)
    hi = ln_a90 + 2 * step
    for _ in range(40):
        if dev(hi) > 0:
            break
        hi += 2 * step
    else:
        return math.inf
    return brentq(dev, ln_a90, hi, xtol=1e-8)


def fit_hit_miss(a, hit, link: str = "logit", bound: str = "likelihood-ratio") -> PodFit:
    """Maximum-likelihood hit/miss POD, POD = F(β0 + β1·ln a).

    Parameters
    ----------
    a : array_like
        Crack sizes [mm], > 0.
    hit : array_like of {0, 1}
        1 = found, 0 = missed.
    link : {"logit", "probit"}
    bound : {"likelihood-ratio", "delta"}
        How a90/95 is found: the profile likelihood-ratio bound (the handbook's choice for
        hit/miss) or the delta method, exp(ln a90 + z95·se(ln a90)).  Both are reported.

    Returns
    -------
    PodFit

    Notes
    -----
    Needs both hits and misses overlapping in size (otherwise the likelihood has no maximum).

    References
    ----------
    MIL-HDBK-1823A (2009); Berens (1989).
    """
    from scipy.optimize import minimize
    from scipy.special import log_ndtr, ndtri

    a = np.asarray(a, float)
    y = np.asarray(hit, float)
    if a.size < 3 or np.any(a <= 0) or not np.all((y == 0) | (y == 1)):
        raise ValueError("hit/miss data need ≥ 3 rows, sizes > 0 and hits of 0 or 1")
    if y.min() == y.max():
        raise ValueError("hit/miss data need both hits and misses")
    x = np.log(a)
    if link not in ("logit", "probit"):
        raise ValueError("link must be 'logit' or 'probit'")

    def nll(b):
        eta = b[0] + b[1] * x
        if link == "logit":
            lp, lq = -np.logaddexp(0, -eta), -np.logaddexp(0, eta)
        else:
            lp, lq = log_ndtr(eta), log_ndtr(-eta)
        return -float(np.sum(y * lp + (1 - y) * lq))

    # start: a50 at the mean log size, a moderate slope
    b1 = 2.0 / max(np.std(x), 1e-3)
    res = minimize(
        nll,
        [-b1 * x.mean(), b1],
        method="Nelder-Mead",
        options={"xatol": 1e-10, "fatol": 1e-12, "maxiter": 20000},
    )
    res = minimize(nll, res.x, method="BFGS", options={"gtol": 1e-9})
    b0, b1 = res.x
    if not b1 > 0:
        raise ValueError("the fitted POD does not rise with crack size (β1 ≤ 0)")
    cov = np.linalg.inv(_hessian(nll, res.x))
    z = math.log(9.0) if link == "logit" else float(ndtri(0.9))
    ln_a90 = (z - b0) / b1
    grad = np.array([-1.0 / b1, -(z - b0) / b1**2])
    se = math.sqrt(max(float(grad @ cov @ grad), 0.0))
    a_delta = math.exp(ln_a90 + Z95 * se)
    a_lr = math.exp(_lr_upper_ln_a90(nll, z, res.x, ln_a90, se))
    if bound not in ("likelihood-ratio", "delta"):
        raise ValueError("bound must be 'likelihood-ratio' or 'delta'")
    a9095 = a_lr if bound == "likelihood-ratio" and math.isfinite(a_lr) else a_delta
    base = pod_from_glm(link, b0, b1)
    curve = PodCurve(base.model, base.mu, base.sigma, 1.0, a9095)
    return PodFit(
        curve,
        "hit-miss",
        link,
        {"beta0": b0, "beta1": b1},
        cov,
        int(a.size),
        a9095,
        {
            "se_ln_a90": se,
            "log_likelihood": -float(res.fun),
            "a90_95_bound": bound if a9095 == a_lr else "delta",
            "a90_95_delta_mm": a_delta,
            "a90_95_likelihood_ratio_mm": a_lr,
        },
    )


def fit_signal_response(
    a, ahat, decision: float, floor: float | None = None, saturation: float | None = None
) -> PodFit:
    """Censored maximum-likelihood â-vs-a fit and its POD (MIL-HDBK-1823A).

    Parameters
    ----------
    a : array_like
        Crack sizes [mm], > 0.
    ahat : array_like
        Signal responses (> 0), same unit as ``decision``.
    decision : float
        Decision threshold â_dec (> 0): a call is â > â_dec.
    floor, saturation : float, optional
        Recording floor and saturation: responses ≤ floor are left-censored, ≥ saturation
        right-censored.

    Returns
    -------
    PodFit
        Log-normal POD, μ = (ln â_dec − β0)/β1, σ = τ/β1; a90/95 by the delta method on
        ln a90 = (ln â_dec − β0 + z90·τ)/β1.

    References
    ----------
    MIL-HDBK-1823A (2009), â vs a; Cheng & Iles (1983).
    """
    from scipy.optimize import minimize
    from scipy.special import log_ndtr

    a = np.asarray(a, float)
    s = np.asarray(ahat, float)
    if a.size < 4 or np.any(a <= 0) or np.any(s <= 0) or a.size != s.size:
        raise ValueError("â-vs-a data need ≥ 4 rows with sizes and responses > 0")
    if not (decision > 0 and math.isfinite(decision)):
        raise ValueError("the decision threshold must be a finite number > 0")
    if not s.min() <= decision <= s.max():
        raise ValueError(
            f"the decision threshold {decision:g} lies outside the recorded "
            f"responses ({s.min():g} to {s.max():g}): the POD curve would be an "
            "extrapolation"
        )
    for name, v in (("floor", floor), ("saturation", saturation)):
        if v is not None and not (v > 0 and math.isfinite(v)):
            raise ValueError(f"the {name} must be a finite number > 0")
    x, yv = np.log(a), np.log(s)
    left = np.zeros(a.size, bool) if floor is None else s <= floor
    right = np.zeros(a.size, bool) if saturation is None else s >= saturation
    mid = ~(left | right)
    if mid.sum() < 3:
        raise ValueError("fewer than 3 uncensored responses")
    lf = math.log(floor) if floor is not None else 0.0
    ls = math.log(saturation) if saturation is not None else 0.0

    def nll(p):
        b0, b1, lt = p
        tau = math.exp(lt)
        m = b0 + b1 * x
        ll = np.sum(-0.5 * ((yv[mid] - m[mid]) / tau) ** 2 - lt - 0.5 * math.log(2 * math.pi))
        if left.any():
            ll += np.sum(log_ndtr((lf - m[left]) / tau))
        if right.any():
            ll += np.sum(log_ndtr((m[right] - ls) / tau))
        return -float(ll)

    coef = np.polyfit(x[mid], yv[mid], 1)
    resid = yv[mid] - np.polyval(coef, x[mid])
    p0 = [coef[1], coef[0], math.log(max(resid.std(), 1e-3))]
    res = minimize(
        nll, p0, method="Nelder-Mead", options={"xatol": 1e-10, "fatol": 1e-12, "maxiter": 20000}
    )
    res = minimize(nll, res.x, method="BFGS", options={"gtol": 1e-9})
    b0, b1, lt = res.x
    tau = math.exp(lt)
    if not b1 > 0:
        raise ValueError("the response does not rise with crack size (β1 ≤ 0)")
    cov_l = np.linalg.inv(_hessian(nll, res.x))
    jac = np.diag([1.0, 1.0, tau])  # (β0, β1, ln τ) → (β0, β1, τ)
    cov = jac @ cov_l @ jac.T
    ld = math.log(decision)
    ln_a90 = (ld - b0 + Z90 * tau) / b1
    grad = np.array([-1.0 / b1, -ln_a90 / b1, Z90 / b1])
    se = math.sqrt(max(float(grad @ cov @ grad), 0.0))
    a9095 = math.exp(ln_a90 + Z95 * se)
    base = pod_from_signal_response(b0, b1, tau, decision)
    curve = PodCurve("lognormal", base.mu, base.sigma, 1.0, a9095)
    return PodFit(
        curve,
        "signal-response",
        "probit",
        {
            "beta0": b0,
            "beta1": b1,
            "tau": tau,
            "decision": decision,
            "floor": floor,
            "saturation": saturation,
        },
        cov,
        int(a.size),
        a9095,
        {
            "se_ln_a90": se,
            "censored_low": int(left.sum()),
            "censored_high": int(right.sum()),
            "log_likelihood": -float(res.fun),
        },
    )
