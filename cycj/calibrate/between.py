"""Scatter between specimens: per-specimen fits with m fixed, the scatter of ln C between
specimens, and each specimen's life predicted from its own fit.

The scatter that matters for planning is that of whole specimens (their lives), not that of
single rates about the line: rate scatter within a test is mostly measurement noise, which
averages out over a life.  With m fixed at the pooled (within-specimen) value, each specimen's
ln C_i = mean(ln da/dN − m·ln ΔJ) over its rates, and σ_ln C is their sample standard
deviation, with a χ² interval (normal ln C_i).

References
----------
.. [1] Laird, N. M., Ware, J. H., Biometrics 38 (1982) 963–974: random-effects model, one
   random intercept per unit (here per specimen), from memory.
.. [2] Dowling & Begley, ASTM STP 590 (1976): da/dN = C·ΔJ^m; life N = ∫ da/(C·ΔJ^m).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = [
    "between_specimen",
    "specimen_life",
    "scatter_of_lnc",
    "direct_rows",
    "random_intercept",
]


def specimen_life(a_hat, dj, lnc, m):
    """Cycles to grow from the first to the last rate point of a test: the trapezoidal
    integral of da/(C·ΔJ^m) over the fitted crack lengths ``a_hat`` [mm] (in cycle order,
    with ΔJ [kJ/m²] at each) for ln C ``lnc`` and exponent ``m``."""
    a = np.maximum.accumulate(np.asarray(a_hat, float))
    inv = np.exp(-lnc - m * np.log(np.asarray(dj, float)))
    return float(np.sum(0.5 * (inv[1:] + inv[:-1]) * np.diff(a)))


def between_specimen(tests, m, confidence=0.95):
    """Per-specimen constants with m fixed and the between-specimen scatter of ln C.

    Parameters
    ----------
    tests : list of dicts (one per test) with ``test``, ``specimen``, ``dJ`` [kJ/m²],
        ``dadN`` [mm/cycle], ``a_mm`` (fitted crack length at each rate) and ``cycle``, in
        cycle order
    m : the pooled exponent
    confidence : level of the interval of σ_ln C

    Returns
    -------
    (rows, summary): ``rows`` one dict per test (``C`` with m fixed, ``m_fixed``, ``C_free``
    and ``m_free`` of its own two-parameter fit, ``life_predicted``, ``life_observed`` over
    its own crack range and cycles, ``life_ratio``); ``summary`` the ``between_specimen``
    block of fit.json (``sigma_ln_C``, its interval, ``n_specimens``, ``m_fixed``, ``note``).
    """
    rows, lnc = [], []
    for t in tests:
        x, y = np.log(t["dJ"]), np.log(t["dadN"])
        li = float(np.mean(y - m * x))
        lnc.append(li)
        free = np.polyfit(x, y, 1) if np.ptp(x) > 0 and x.size >= 3 else [np.nan, np.nan]
        pred = specimen_life(t["a_mm"], t["dJ"], li, m)
        obs = float(t["cycle"][-1] - t["cycle"][0])
        rows.append(
            {
                "test": t["test"],
                "specimen": t["specimen"],
                "C": math.exp(li),
                "m": m,
                "m_fixed": True,
                "C_free": float(math.exp(free[1])),
                "m_free": float(free[0]),
                "n_rates": int(x.size),
                "a_range_mm": [float(t["a_mm"][0]), float(t["a_mm"][-1])],
                "dJ_range_kJm2": [float(np.min(t["dJ"])), float(np.max(t["dJ"]))],
                "life_predicted": pred,
                "life_observed": obs,
                "life_ratio": pred / obs if obs > 0 else None,
            }
        )
    return rows, scatter_of_lnc(lnc, m, confidence)


def scatter_of_lnc(lnc, m, confidence=0.95):
    """The ``between_specimen`` block: σ_ln C, the sample standard deviation of the tests'
    ln C_i (m fixed at ``m``), with its χ² interval (normal ln C_i); unknown for one test."""
    from scipy import stats

    g = len(lnc)
    out = {"n_specimens": g, "m_fixed": m, "confidence": confidence}
    if g < 2:
        out.update(
            sigma_ln_C=None,
            sigma_ln_C_interval=None,
            note="one specimen: the between-specimen scatter is unknown; test more "
            "specimens before planning with scatter in C",
        )
        return out
    s = float(np.std(lnc, ddof=1))
    lo_q, hi_q = stats.chi2.ppf([0.5 + confidence / 2, 0.5 - confidence / 2], g - 1)
    out.update(
        sigma_ln_C=s,
        sigma_ln_C_interval=[s * math.sqrt((g - 1) / lo_q), s * math.sqrt((g - 1) / hi_q)],
        note=f"standard deviation of ln C between {g} specimens, each fitted with m fixed at "
        f"{m:.4g}; interval from the χ² distribution of the sample variance (normal ln C); "
        "use it for probabilistic planning ([inspection.scatter] growth_C)",
    )
    if g < 5:
        out["note"] += f"; from {g} specimens only: a rough figure"
    return out


def direct_rows(fit, iv, series, labels):
    """Per-specimen rows of a direct a(N) fit (its own ln C_i with the common m; its one-step
    own exponent ``m_free`` from ``iv``; the cycles its own law takes over its first to last
    reading against those observed)."""
    rows = []
    for s, lnc, m_own, lnc_own, (pred, obs) in zip(
        series, fit["lnC_per_test"], iv["m_i"], iv["lnC_own"], fit["life_per_test"], strict=True
    ):
        rows.append(
            {
                "test": s["log"],
                "specimen": labels.get(s["log"], s["log"]),
                "C": math.exp(lnc),
                "m": fit["m"],
                "m_fixed": True,
                "C_free": math.exp(lnc_own),
                "m_free": m_own,
                "n_readings": int(s["cycle"].size),
                "a_range_mm": [float(s["a_mm"][0]), float(s["a_mm"][-1])],
                "dJ_range_kJm2": [float(np.min(s["dj_tab"])), float(np.max(s["dj_tab"]))],
                "life_predicted": pred,
                "life_observed": obs,
                "life_ratio": pred / obs if obs > 0 else None,
            }
        )
    return rows


def random_intercept(y, se, *, confidence=0.95):
    """Mixed-effects estimate of a mean across tests: y_i = μ + b_i + e_i with a random
    intercept b_i ~ N(0, τ²) between tests and a known within-test error e_i ~ N(0, se_i²).

    τ² by restricted maximum likelihood (REML, a bounded one-dimensional search), μ the
    weighted mean with weights 1/(τ² + se_i²), its interval μ ± t(G−1)·√(1/Σw).

    Parameters
    ----------
    y : per-test values (e.g. ln C_i with m fixed, or each test's ln da/dN at one ΔJ)
    se : their within-test standard errors (e.g. from resampling each test's residuals)
    confidence : two-sided level

    Returns
    -------
    dict: ``mean``, ``se``, ``interval``, ``tau`` (between-test standard deviation),
    ``n_tests``; None for fewer than two tests.

    References
    ----------
    .. [1] Laird & Ware (1982); Harville, D. A., J. Amer. Statist. Assoc. 72 (1977) 320–340
       (REML); from memory.
    """
    from scipy import optimize, stats

    y, v = np.asarray(y, float), np.asarray(se, float) ** 2
    g = y.size
    if g < 2:
        return None

    def nll(log_tau2):
        w = 1.0 / (math.exp(log_tau2) + v)
        mu = np.sum(w * y) / np.sum(w)
        return 0.5 * (np.sum(np.log(1 / w)) + math.log(np.sum(w)) + np.sum(w * (y - mu) ** 2))

    scale = max(float(np.var(y, ddof=1)), float(np.mean(v)), 1e-12)
    res = optimize.minimize_scalar(
        nll, bounds=(math.log(scale) - 30, math.log(scale) + 5), method="bounded"
    )
    tau2 = math.exp(res.x)
    if nll(math.log(scale) - 30) <= res.fun:  # the likelihood is flat at τ = 0
        tau2 = 0.0
    w = 1.0 / (tau2 + v)
    mu = float(np.sum(w * y) / np.sum(w))
    se_mu = math.sqrt(1.0 / float(np.sum(w)))
    t = float(stats.t.ppf(0.5 + confidence / 2, g - 1))
    return {
        "mean": mu,
        "se": se_mu,
        "interval": [mu - t * se_mu, mu + t * se_mu],
        "tau": math.sqrt(tau2),
        "n_tests": g,
    }
