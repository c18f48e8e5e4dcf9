"""Critical crack sizes of job 1: the smallest crack at which an end criterion trips under the
history's peak load, and the tearing-instability search on the J–R curve.

References
----------
.. [1] Paris, P. C., Tada, H., Zahoor, A., Ernst, H., ASTM STP 668 (1979) 5–36: tearing
   instability when the applied J cannot be matched by the J–R curve (dJ/da ≥ dJ_R/da).
.. [2] ASTM E1820: J–R curve J_R = C1·(Δa/1 mm)^C2.
"""

from __future__ import annotations

import math

import numpy as np

from cycj import kernel_slots as M
from cycj._jit import jit
from cycj.case import Case
from cycj.end_criteria import END_NAMES, RUNNING, end_check
from cycj.life.loads import BlockLoads, block_loads
from cycj.life.stepper import cycle_driving_force


@jit
def first_end(lmax, i_peak, a_grid, code, gp, ct, mp):
    """Index of the first crack size in ``a_grid`` at which an end criterion trips under the
    history's peak load (−1 if none), and its end code."""
    row = lmax[i_peak : i_peak + 1]
    zeros = 0.0 * row
    for k in range(a_grid.shape[0]):
        dj, jmax, lr, jel, clipped, rho = cycle_driving_force(
            row, zeros, 0, a_grid[k], code, gp, ct, mp
        )
        end, val = end_check(a_grid[k], jmax, lr, jel, rho, mp)
        if end != RUNNING:
            return k, end
    return -1, RUNNING


def critical_crack_length(
    case: Case,
    load_scale: float = 1.0,
    toughness_scale: float = 1.0,
    loads: BlockLoads | None = None,
    mp: np.ndarray | None = None,
):
    """Smallest crack size [mm] at which an end criterion trips under the history's peak load,
    and the criterion's name."""
    loads = loads or block_loads(case, load_scale)
    if mp is None:
        from cycj.life.model import model_array

        mp = model_array(case, toughness_scale, loads=loads)
    geo = case.geometry
    lo = geo.size_limits[0] if geo.size_limits[0] > 0 else min(geo.crack_length, 1e-3)
    top = min(mp[M.A_LIMIT], mp[M.LEAK_SIZE])
    grid = np.linspace(lo, top, 2001)
    k, code = first_end(loads.lmax, loads.i_peak, grid, geo.code, geo.params, loads.ct, mp)
    if k < 0:
        return float(top), "leak" if top == mp[M.LEAK_SIZE] else "size-limit"
    if k == 0:
        return float(grid[0]), END_NAMES[code]
    a_lo, a_hi = grid[k - 1], grid[k]
    for _ in range(60):
        mid = 0.5 * (a_lo + a_hi)
        kk, c = first_end(
            loads.lmax, loads.i_peak, np.array([mid]), geo.code, geo.params, loads.ct, mp
        )
        if kk == 0:
            a_hi, code = mid, c
        else:
            a_lo = mid
    return float(a_hi), END_NAMES[code]


@jit
def tearing_margin_kernel(lmax, i_peak, a, a_hi, c1, c2, code, gp, ct, mp, n_points):
    """max over Δa ∈ [1e-4 mm, a_hi − a] (geometric grid) of J_R(Δa) − J_max(a + Δa) under the
    history's peak load [kJ/m²]; J_R = C1·(Δa/1 mm)^C2.  Negative: unstable tearing."""
    span = a_hi - a
    if span <= 0.0:
        return -np.inf
    row = lmax[i_peak : i_peak + 1]  # the peak cycle only, loaded from zero
    zeros = 0.0 * row
    best = -np.inf
    lo = np.log(1e-4)
    step = (np.log(span) - lo) / (n_points - 1) if span > 1e-4 else 0.0
    for k in range(n_points):
        da = np.exp(lo + step * k) if step > 0.0 else span
        jmax = cycle_driving_force(row, zeros, 0, min(a + da, a_hi), code, gp, ct, mp)[1]
        best = max(best, c1 * da**c2 - jmax)
    return best


def tearing_margin(geometry, loads, a, c1, c2, mp, n_points=400):
    """max over Δa of [J_R(Δa) − J(a + Δa)] under the history's peak load [kJ/m²].

    Positive: a stable equilibrium exists on the J–R curve J_R = C1·(Δa/1 mm)^C2 (tearing
    arrests); negative: the crack of size ``a`` [mm] tears unstably.  ``loads`` is the block
    (:class:`cycj.life.BlockLoads`), ``mp`` the model-parameter array (J_max by the reference
    stress method).
    """

    hi = geometry.size_limits[1]
    return float(
        tearing_margin_kernel(
            loads.lmax,
            loads.i_peak,
            a,
            hi,
            c1,
            c2,
            geometry.code,
            geometry.params,
            loads.ct,
            mp,
            n_points,
        )
    )


def tearing_instability_size(geometry, loads, a_from, a_to, c1, c2, mp, tol=1e-4):
    """Smallest crack size in [a_from, a_to] [mm] that is unstable on the J–R curve under the
    history's peak load (bisection; ``inf`` if the whole range is stable)."""

    def margin(a):
        return tearing_margin(geometry, loads, a, c1, c2, mp)

    if margin(a_to) >= 0:
        return math.inf
    if margin(a_from) < 0:
        return a_from
    lo, hi = a_from, a_to
    while hi - lo > tol * max(hi, 1.0):
        mid = 0.5 * (lo + hi)
        if margin(mid) < 0:
            hi = mid
        else:
            lo = mid
    return hi
