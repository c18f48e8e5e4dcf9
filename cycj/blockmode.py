"""Block integration: the repeated history with the crack frozen within each block.

With the per-block growth G(a) [mm/block] tabulated on a grid, the number of blocks to grow
from a_0 to a is B(a) = ∫ da/G(a).  Between grid points G is taken as a power law in a (exact
for a Paris law on a self-similar crack, e.g. a centre crack in an infinite plate), so each
segment integrates in closed form.  Where G drops to zero (threshold) the crack arrests.

References
----------
.. [1] Anderson, T. L., *Fracture Mechanics*, 3rd ed. (2005) §10.2: life by integrating
   dN = da/(da/dN) over the crack size; block (equivalent-range) integration for repeated
   spectra is common practice.
"""

from __future__ import annotations

import math

import numpy as np


def blocks_to_grow(a_grid, growth_per_block):
    """Cumulative blocks B(a_k) from a_grid[0] to each grid point.

    Parameters
    ----------
    a_grid : increasing crack sizes [mm]
    growth_per_block : G(a_k) ≥ 0 [mm/block]

    Returns
    -------
    B : ndarray, B[0] = 0; ``inf`` from the first point where G = 0 (arrest) onwards.
    """
    a = np.asarray(a_grid, float)
    g = np.asarray(growth_per_block, float)
    if a.ndim != 1 or a.size < 2 or np.any(np.diff(a) <= 0):
        raise ValueError("the crack-size grid must be increasing with at least two points")
    if np.any(g < 0) or np.any(~np.isfinite(g)):
        raise ValueError("growth per block must be finite and ≥ 0")
    b = np.zeros_like(a)
    for k in range(a.size - 1):
        g0, g1 = g[k], g[k + 1]
        if g0 <= 0.0 or g1 <= 0.0:
            b[k + 1:] = math.inf
            break
        b[k + 1] = b[k] + _segment(a[k], a[k + 1], g0, g1)
    return b


def _segment(a0, a1, g0, g1):
    """∫_{a0}^{a1} da / (g0·(a/a0)^p), p = ln(g1/g0)/ln(a1/a0)."""
    p = math.log(g1 / g0) / math.log(a1 / a0)
    if abs(p - 1.0) < 1e-9:
        return a0 / g0 * math.log(a1 / a0)
    return a0 / (g0 * (1.0 - p)) * ((a1 / a0) ** (1.0 - p) - 1.0)


def crack_after_blocks(a_grid, b_grid, blocks):
    """Crack size after ``blocks`` blocks, inverting B(a) (power-law-consistent, log space)."""
    b = np.asarray(b_grid, float)
    a = np.asarray(a_grid, float)
    ok = np.isfinite(b)
    if blocks >= b[ok][-1]:
        return float(a[ok][-1])
    return float(np.interp(blocks, b[ok], a[ok]))
