"""Subset simulation of the probability of failure without inspection: a second method for
small probabilities, run beside importance sampling as a cross-check.

The scattered inputs are independent standard normals u (mapped as in
:mod:`cycj.plan.reliability`) and the response is Y(u) = ln H − ln t_f(u), the log of the
horizon H over the sample's life to the critical size; failure is Y ≥ 0.  With nested events
F_i = {Y ≥ b_i}, P_f = P(F_1)·Π P(F_{i+1} | F_i), each threshold b_i chosen so that its
conditional probability is p0: level 0 is plain Monte Carlo of N samples; each further level
starts N·p0 Markov chains of 1/p0 states at the samples above the threshold and moves them by
the component-wise (modified) Metropolis algorithm (a normal proposal of unit spread per
component, accepted with min(1, φ(ξ)/φ(u)); the candidate kept only if it stays above the
threshold), until at least a fraction p0 of a level fails.

Coefficient of variation (Au & Beck 2001, eqs. 27–29): per level δ_i² = (1 − p_i)/(N p_i)
(1 + γ_i), γ_i = 2 Σ_k (1 − k/N_s) ρ_i(k) from the correlation of the failure indicator along
the chains (γ_0 = 0).  The levels are correlated (each starts from the last), so the total lies
between √Σδ_i² (uncorrelated levels) and Σδ_i (fully correlated; the bounds from memory of
Au & Beck 2001 §6); the standard error reported is the upper one, p·Σδ_i.

References
----------
.. [1] Au, S.-K., Beck, J. L., Probabilistic Engineering Mechanics 16 (2001) 263–277
   (subset simulation, modified Metropolis algorithm, c.o.v.).
"""

from __future__ import annotations

import math

import numpy as np

from cycj.plan.reliability import life_at
from cycj.plan.scatter import Scatter

#: conditional probability of each level, samples per level, most levels (p0^12 = 1e-12)
P0, SAMPLES, MAX_LEVELS = 0.1, 2000, 12
#: spawn key of the subset-simulation stream (apart from the chunks and the pilots)
SUBSET_KEY = 2**41


def _gamma(ind: np.ndarray, p: float) -> float:
    """γ of Au & Beck (2001) eq. 29 for the indicator ``ind`` (chains × states)."""
    nc, ns = ind.shape
    r0 = p * (1.0 - p)
    if ns < 2 or r0 <= 0:
        return 0.0
    x = ind.astype(float)
    g = 0.0
    for k in range(1, ns):
        rk = (x[:, : ns - k] * x[:, k:]).sum() / (nc * (ns - k)) - p * p
        g += (1.0 - k / ns) * rk / r0
    return 2.0 * g


def subset_pof(
    table,
    scatter: Scatter,
    horizon: float,
    seed: int,
    n: int = SAMPLES,
    p0: float = P0,
    max_levels: int = MAX_LEVELS,
) -> dict:
    """Subset-simulation estimate of P(life ≤ ``horizon``) without inspection.

    Parameters
    ----------
    table : cycj.plan.curves.CurveTable
    scatter : Scatter
    horizon : float
        Cycles [> 0].
    seed : int
        The plan's seed (the stream is its own child, apart from the Monte Carlo chunks).
    n : int
        Samples per level (rounded down to a multiple of 1/p0).
    p0 : float
        Conditional probability of a level, 0 < p0 ≤ 0.5.

    Returns
    -------
    dict
        ``pof``, ``std_error`` (p·``cov``), ``cov`` (upper bound), ``cov_uncorrelated_levels``
        (lower bound), ``levels`` (threshold, conditional probability, γ),
        ``evaluations`` (lives computed), ``samples_per_level``; or ``available`` False with a
        ``reason`` when no input scatters.
    """
    if not 0 < p0 <= 0.5:
        raise ValueError(f"p0 must be in (0, 0.5], got {p0}")
    mask = scatter.scattering
    m = int(mask.sum())
    if m == 0:
        return {"available": False, "reason": "no input scatters"}
    nc = max(int(n * p0), 1)
    ns = max(n // nc, 2)
    n = nc * ns
    rng = np.random.default_rng(np.random.SeedSequence(seed, spawn_key=(SUBSET_KEY,)))
    log_h, floor = math.log(horizon), horizon * 1e-12

    def response(v):
        x = np.zeros((4, v.shape[1]))
        x[mask] = v
        return log_h - np.log(np.maximum(life_at(table, scatter, x), floor))

    u = rng.standard_normal((m, n))
    y = response(u)
    evals, chains, p, d2, d1, levels = n, None, 1.0, 0.0, 0.0, []
    for lev in range(max_levels):
        order = np.argsort(-y, kind="stable")
        pf = float(np.mean(y >= 0.0))
        final = pf >= p0 or lev == max_levels - 1
        b = 0.0 if final else 0.5 * (y[order[nc - 1]] + y[order[nc]])
        pi = pf if final else p0
        gam = 0.0 if chains is None else _gamma(chains >= b, pi)
        di2 = (1.0 - pi) / (n * pi) * (1.0 + max(gam, 0.0)) if pi > 0 else math.inf
        d2, d1 = d2 + di2, d1 + math.sqrt(di2)
        p *= pi
        levels.append({"threshold": float(b), "probability": pi, "gamma": gam})
        if final:
            break
        cur_u, cur_y = u[:, order[:nc]].copy(), y[order[:nc]].copy()
        su, sy = np.empty((m, nc, ns)), np.empty((nc, ns))
        su[:, :, 0], sy[:, 0] = cur_u, cur_y
        for k in range(1, ns):
            xi = cur_u + rng.standard_normal(cur_u.shape)
            keep = rng.random(cur_u.shape) >= np.exp(np.minimum(0.5 * (cur_u**2 - xi**2), 0.0))
            xi[keep] = cur_u[keep]
            y_xi = response(xi)
            evals += nc
            ok = y_xi >= b
            cur_u[:, ok], cur_y[ok] = xi[:, ok], y_xi[ok]
            su[:, :, k], sy[:, k] = cur_u, cur_y
        u, y, chains = su.reshape(m, n), sy.reshape(n), sy
    cov = d1 if p > 0 else math.inf
    return {
        "available": True,
        "pof": p,
        "std_error": p * cov if p > 0 else math.inf,
        "cov": cov,
        "cov_uncorrelated_levels": math.sqrt(d2) if p > 0 else math.inf,
        "levels": levels,
        "evaluations": evals,
        "samples_per_level": n,
    }


def cross_check(sampled: dict, sus: dict, k: float = 3.0) -> dict:
    """Subset-simulation result with ``agrees``: the two estimates of the no-inspection
    probability of failure within ``k`` combined standard errors."""
    if not sus.get("available"):
        return sus
    se = math.hypot(sampled["std_error"], sus["std_error"])
    agrees = abs(sampled["pof"] - sus["pof"]) <= k * se
    return sus | {"agrees": bool(agrees), "compared_with": float(sampled["pof"])}
