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

from cycj.life import stepper as K


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
            b[k + 1 :] = math.inf
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


#: lives (in blocks) shorter than this are stepped cycle by cycle: a table would cost more
#: whole-block passes than the stepper
FEW_BLOCKS = 8


#: fewest table points for the longest blocks (geometrically spaced)
LONG_BLOCK_POINTS = 32


def _grid(a0, a_end, n_cycles, life_blocks=math.inf):
    """Crack sizes for the block-growth table: fewer points for long blocks, and no more than
    a quarter of the (estimated) life in blocks, so that the table never costs much more
    whole-block passes than stepping the life would (at least FEW_BLOCKS points).

    Up to 2.5·10⁵ cycles per block and a long life: 80–600 evenly spaced sizes.  Longer blocks
    or a short life: fewer sizes, spaced geometrically (denser where the crack is small and
    most blocks are spent; with 32 of them the life of ``examples/crane_edge_crack.toml``
    differs from 600 evenly spaced ones by 4·10⁻⁴)."""
    n = int(np.clip(2.0e7 / max(n_cycles, 1), LONG_BLOCK_POINTS, 600))
    if n >= 80 and life_blocks >= 4 * n:
        return np.linspace(a0, a_end, n)
    n = min(n, 80)
    if life_blocks < 4 * n:
        n = max(FEW_BLOCKS, int(life_blocks / 4))
    return np.geomspace(a0, a_end, n)


def estimated_life_blocks(a0, a_crit, g0, g1):
    """Blocks from a0 to a_crit [mm] with G(a) a power law between the end growths g0, g1
    [mm/block] (``inf`` if either is zero)."""
    if not (g0 > 0.0 and g1 > 0.0) or not a_crit > a0:
        return math.inf
    return _segment(a0, a_crit, g0, g1)


def block_phase(case, loads, mp, a0, a_crit, max_cycles, first=None):
    """Integrate whole blocks up to two blocks before the end; returns (a, blocks, rows).

    ``first``: :func:`stepper.block_growth` at ``a0`` if already computed.  The table is sized
    by the life in blocks estimated from its two end rows (each whole-block quantity is
    computed once); a life of fewer than FEW_BLOCKS blocks is left to the stepper."""
    geo = case.geometry
    if first is None:
        first = K.block_growth(loads.lmax, loads.lmin, a0, geo.code, geo.params, loads.ct, mp)
    last = K.block_growth(loads.lmax, loads.lmin, a_crit, geo.code, geo.params, loads.ct, mp)
    if not (math.isfinite(first[0]) and math.isfinite(last[0])):
        return a0, 0.0, []  # no closed form here: the stepper goes all the way
    life = estimated_life_blocks(a0, a_crit, first[0], last[0])
    if life < FEW_BLOCKS:
        return a0, 0.0, []
    grid = _grid(a0, a_crit, loads.n, life)
    table = np.zeros((grid.size, 5))
    table[0], table[-1] = first, last
    inner = np.zeros((grid.size - 2, 5))
    K.block_growth_table(
        loads.lmax, loads.lmin, grid[1:-1], geo.code, geo.params, loads.ct, mp, inner
    )
    table[1:-1] = inner
    if not np.all(np.isfinite(table[:, 0])):  # no closed form here: the stepper goes all the way
        return a0, 0.0, []
    b = blocks_to_grow(grid, table[:, 0])
    finite = np.isfinite(b)
    b_end = b[finite][-1] if finite.any() else 0.0
    b_end = min(b_end, max_cycles / loads.n)
    k0 = max(math.floor(b_end) - 2, 0)
    a_start = crack_after_blocks(grid, b, k0)
    rows = [
        (
            b[k] * loads.n,
            b[k],
            grid[k],
            table[k, 4],
            table[k, 1],
            table[k, 2],
            table[k, 3],
            table[k, 0] / loads.n,
        )
        for k in np.nonzero(finite & (b <= k0))[0]
    ]
    return a_start, float(k0), rows
