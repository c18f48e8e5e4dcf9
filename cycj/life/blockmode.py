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


#: Gauss–Legendre nodes and weights on [0, 1] for the curved segments
_GL_X, _GL_W = np.polynomial.legendre.leggauss(8)
_GL_X, _GL_W = 0.5 * (_GL_X + 1.0), 0.5 * _GL_W


def _log_model(u, lg, k):
    """Coefficients of log G as a polynomial in u = log a on segment k: through the segment's
    four nearest grid points (three, or two, at the ends of a short grid)."""
    idx = np.arange(max(k - 1, 0), min(k + 3, u.size))
    return np.polyfit(u[idx] - u[k], lg[idx], idx.size - 1)


def _curved_part(u, lg, k, du):
    """∫ da/G from a_k to a_k·e^du on segment k (0 ≤ du ≤ u[k+1] − u[k]) [blocks]."""
    x = _GL_X * du
    return float(du * np.sum(_GL_W * np.exp(u[k] + x - np.polyval(_log_model(u, lg, k), x))))


def blocks_to_grow_curved(a_grid, growth_per_block):
    """:func:`blocks_to_grow` with log G a cubic in log a between the grid points (through the
    four nearest points) instead of a power law between two: fourth order in the spacing, so
    a dozen geometric points give the life of a few hundred.  Used on the short geometric
    grids of long blocks (each point costs a pass over the block); ``inf`` after an arrest."""
    b = blocks_to_grow(a_grid, growth_per_block)  # checks, and the arrest
    u = np.log(np.asarray(a_grid, float))
    ok = np.isfinite(b)
    last = int(np.nonzero(ok)[0][-1])
    lg = np.log(np.asarray(growth_per_block, float)[: last + 1])
    for k in range(last):
        b[k + 1] = b[k] + _curved_part(u[: last + 1], lg, k, u[k + 1] - u[k])
    return b


def crack_after_blocks_curved(a_grid, b_grid, growth_per_block, blocks):
    """Crack size after ``blocks`` blocks, inverting :func:`blocks_to_grow_curved` within its
    segment (bisection in log a)."""
    b = np.asarray(b_grid, float)
    ok = np.isfinite(b)
    a = np.asarray(a_grid, float)[ok]
    if blocks >= b[ok][-1]:
        return float(a[-1])
    k = int(np.searchsorted(b[ok], blocks, side="right") - 1)
    u, lg = np.log(a), np.log(np.asarray(growth_per_block, float)[ok])
    lo, hi = 0.0, u[k + 1] - u[k]
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if b[k] + _curved_part(u, lg, k, mid) > blocks:
            hi = mid
        else:
            lo = mid
    return float(math.exp(u[k] + lo))


#: lives (in blocks) shorter than this are stepped cycle by cycle: a table would cost more
#: whole-block passes than the stepper
FEW_BLOCKS = 8


#: fewest table points for the longest blocks (geometrically spaced, curved segments)
LONG_BLOCK_POINTS = 10
#: fewest evenly spaced table points
EVEN_POINTS = 80


def _points(n_cycles, life_blocks=math.inf):
    """(number of table points, evenly spaced?) for blocks of ``n_cycles`` and a life of
    ``life_blocks`` (see :func:`_grid`)."""
    n = int(np.clip(2.0e7 / max(n_cycles, 1), LONG_BLOCK_POINTS, 600))
    if n >= EVEN_POINTS and life_blocks >= 4 * n:
        return n, True
    n = min(n, EVEN_POINTS)
    if life_blocks < 4 * n:
        n = max(FEW_BLOCKS, int(life_blocks / 4))
    return n, False


def _grid(a0, a_end, n_cycles, life_blocks=math.inf):
    """Crack sizes for the block-growth table: fewer points for long blocks, and no more than
    a quarter of the (estimated) life in blocks, so that the table never costs much more
    whole-block passes than stepping the life would (at least FEW_BLOCKS points).

    Up to 2.5·10⁵ cycles per block and a long life: 80–600 evenly spaced sizes, power law
    between them.  Longer blocks or a short life: fewer sizes, spaced geometrically (denser
    where the crack is small and most blocks are spent), log G cubic between them
    (:func:`blocks_to_grow_curved`; with 10 of them the life of
    ``examples/crane_edge_crack.toml`` differs from 2000 evenly spaced ones by 2·10⁻⁴, with 32
    power-law segments by 4·10⁻⁴)."""
    n, even = _points(n_cycles, life_blocks)
    return np.linspace(a0, a_end, n) if even else np.geomspace(a0, a_end, n)


def estimated_life_blocks(a0, a_crit, g0, g1):
    """Blocks from a0 to a_crit [mm] with G(a) a power law between the end growths g0, g1
    [mm/block] (``inf`` if either is zero)."""
    if not (g0 > 0.0 and g1 > 0.0) or not a_crit > a0:
        return math.inf
    return _segment(a0, a_crit, g0, g1)


def block_phase(case, loads, mp, a0, a_crit, max_cycles, first=None, passes=None):
    """Integrate whole blocks up to two blocks before the end; returns (a, blocks, rows).

    ``first``: :func:`stepper.block_growth` at ``a0`` if already computed; ``passes``: a dict
    that receives the pass at ``a_crit`` (the history's last row when the run ends there).
    The table is sized by the life in blocks estimated from its two end rows (each whole-block
    quantity is computed once); a life of fewer than FEW_BLOCKS blocks is left to the stepper."""
    geo = case.geometry
    if first is None:
        first = K.block_growth(loads.lmax, loads.lmin, a0, geo.code, geo.params, loads.ct, mp)
    last = K.block_growth(loads.lmax, loads.lmin, a_crit, geo.code, geo.params, loads.ct, mp)
    if passes is not None:
        passes[a_crit] = last
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
    curved = not _points(loads.n, life)[1]
    b = (blocks_to_grow_curved if curved else blocks_to_grow)(grid, table[:, 0])
    finite = np.isfinite(b)
    b_end = b[finite][-1] if finite.any() else 0.0
    b_end = min(b_end, max_cycles / loads.n)
    k0 = max(math.floor(b_end) - 2, 0)
    if curved:
        a_start = crack_after_blocks_curved(grid, b, table[:, 0], k0)
    else:
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
