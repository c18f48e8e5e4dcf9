"""First-order reliability (FORM) of the life without inspection, and the design point that
centres importance sampling.

The scattered inputs are mapped from independent standard normal variables u (one per input
that scatters, :meth:`cycj.plan.scatter.Dist.from_normal`: x = F⁻¹(Φ(u))), and the limit state
is g(u) = ln t_f(u) − ln H: the log of the sample's life to the critical size (from the
growth-curve table, life ∝ 1/C) against the horizon H.  The design point u* is the point of
g = 0 nearest the origin, found by the Hasofer–Lind–Rackwitz–Fiessler iteration with
central-difference gradients; β = ±|u*| (negative when the median sample already fails) and
the first-order estimate is P_f ≈ Φ(−β).

References
----------
.. [1] Hasofer, A. M., Lind, N. C., J. Eng. Mech. Div. ASCE 100 (1974) 111–121 (reliability
   index).
.. [2] Rackwitz, R., Fiessler, B., Comput. Struct. 9 (1978) 489–494 (the iteration).
.. [3] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016), §5.7 (importance sampling, centred at the design point here).
"""

from __future__ import annotations

import math

import numpy as np

from cycj.plan.scatter import Scatter

#: relative step of the central differences and convergence tolerance on u
STEP, TOL = 1e-3, 1e-5


def life_at(table, scatter: Scatter, x: np.ndarray, a_floor: float | None = None) -> np.ndarray:
    """Life to the critical size [cycles] without inspection at standard normal points
    ``x`` (4, m) (the rows of inputs that do not scatter are ignored)."""
    d = scatter.from_normal(x)
    la0 = np.maximum(np.log(d["a0_mm"]), table.la0 if a_floor is None else math.log(a_floor))
    k, w = table.load_position(d["load_factor"])
    lac = table.critical_log_size(k, w, d["toughness_factor"])
    span = table.phi(lac, k, w) - table.phi(la0, k, w)
    return np.maximum(span, 0.0) / d["c_factor"]


def form(table, scatter: Scatter, horizon: float, max_iter: int = 60) -> dict:
    """FORM estimate of P(life ≤ ``horizon``) and its design point.

    Parameters
    ----------
    table : cycj.plan.curves.CurveTable
    scatter : Scatter
    horizon : float
        Cycles [> 0].
    max_iter : int
        Iterations of the HL-RF scheme.

    Returns
    -------
    dict
        ``beta``, ``pof`` (Φ(−β)), ``design_point`` (4 values in standard normal space, 0 for
        inputs that do not scatter), ``evaluations`` (life evaluations used), ``converged``,
        or ``available`` False with a ``reason`` when no input scatters.
    """
    from scipy.special import ndtr

    mask = scatter.scattering
    m = int(mask.sum())
    if m == 0:
        return {"available": False, "reason": "no input scatters"}
    floor = horizon * 1e-12
    evals = 0

    def g_grad(v):
        nonlocal evals
        pts = np.zeros((4, 2 * m + 1))
        pts[mask, :] = v[:, None]
        for j, r in enumerate(np.nonzero(mask)[0]):
            pts[r, 1 + 2 * j] += STEP
            pts[r, 2 + 2 * j] -= STEP
        g = np.log(np.maximum(life_at(table, scatter, pts), floor)) - math.log(horizon)
        evals += pts.shape[1]
        return g[0], (g[1::2] - g[2::2]) / (2 * STEP)

    u = np.zeros(m)
    g0, _ = g_grad(u)
    converged = False
    for _ in range(max_iter):
        g, grad = g_grad(u)
        nrm2 = float(grad @ grad)
        if not nrm2 > 0:
            break
        new = (float(grad @ u) - g) / nrm2 * grad
        step = new - u
        if float(np.sqrt(step @ step)) > 3.0:  # damped far from the surface
            new = u + 3.0 * step / float(np.sqrt(step @ step))
        u = new
        if float(np.sqrt(step @ step)) < TOL * max(1.0, float(np.sqrt(u @ u))):
            converged = True
            break
    g_end, _ = g_grad(u)
    converged = converged and abs(g_end) < 1e-4
    beta = math.copysign(float(np.sqrt(u @ u)), g0)
    full = np.zeros(4)
    full[mask] = u
    return {
        "available": True,
        "beta": beta,
        "pof": float(ndtr(-beta)),
        "design_point": full.tolist(),
        "evaluations": evals,
        "converged": bool(converged),
    }
