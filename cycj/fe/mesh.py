"""A structured mesh of eight-node quadrilaterals focused on a crack tip.

The body is a rectangle ``[x0, x1] × [0, h]`` with the crack on ``y = 0`` from ``x0`` to the tip
at ``(a, 0)`` (a half model: ``y = 0`` beyond the tip is a symmetry line).  Around the tip sit
concentric half-squares ``[a − r, a + r] × [0, r]`` with sizes ``r_0 < r_1 < … < r_N = R``
growing geometrically; each ring between two of them holds ``m`` elements (``m/4`` up each side,
``m/2`` across the top), so the elements stay nearly square, and the rings' edges are where the
domain integral's ramp function starts and ends.  The core ``r < r_0`` is a small uniform grid
(the tip elements, left out of every domain).  Outside ``R``, three blocks fill the rectangle
with spacings growing away from the rings; lines the loads or supports need are kept as grid
lines (``x_lines``, ``y_lines``).

Nodes: corners first (merged by coordinate), then one mid-side node per edge (straight edges).
Element node order: corners 0–3 anticlockwise, mid-sides 4 = (0,1), 5 = (1,2), 6 = (2,3),
7 = (3,0).

References
----------
.. [1] Zienkiewicz, O. C., Taylor, R. L., *The Finite Element Method*, vol. 1, 5th ed. (2000),
   ch. 8: the eight-node serendipity element.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class Mesh:
    """Nodes [mm], Q8 connectivity, and the tip's ring structure.

    Attributes
    ----------
    nodes : (n_nodes, 2) coordinates [mm]
    elements : (n_elements, 8) node numbers
    tip : (x, y) of the crack tip [mm]
    ring_sizes : r_0 … r_N [mm] (half-square sizes around the tip)
    """

    nodes: np.ndarray
    elements: np.ndarray
    tip: tuple[float, float]
    ring_sizes: np.ndarray

    @property
    def rho(self) -> np.ndarray:
        """Square distance max(|x − a|, y) of each node from the tip [mm]."""
        return np.maximum(np.abs(self.nodes[:, 0] - self.tip[0]), self.nodes[:, 1] - self.tip[1])

    def nearest_node(self, x: float, y: float) -> int:
        d = np.hypot(self.nodes[:, 0] - x, self.nodes[:, 1] - y)
        return int(np.argmin(d))

    def centroids(self) -> np.ndarray:
        return self.nodes[self.elements[:, :4]].mean(axis=1)


def _graded(start: float, end: float, h0: float, growth: float, hmax: float, required=()):
    """Points from ``start`` to ``end`` with steps starting at ``h0`` growing by ``growth``
    (capped at ``hmax``); the ``required`` coordinates are kept as points."""
    sign = 1.0 if end >= start else -1.0
    length = abs(end - start)
    cuts = sorted(sign * (r - start) for r in required)
    cuts = [c for c in cuts if 1e-6 * length < c < length * (1 - 1e-6)] + [length]
    pts = [0.0]
    h = h0
    for c in cuts:
        seg = c - pts[-1]
        steps = []
        total = 0.0
        while total < seg * (1 - 1e-9):
            steps.append(h)
            total += h
            h = min(h * growth, hmax)
        if len(steps) > 1 and total - seg > 0.5 * steps[-1]:
            total -= steps.pop()
        steps = np.array(steps) * (seg / total)
        pts.extend(pts[-1] + np.cumsum(steps))
        pts[-1] = c
        h = min(steps[-1] * growth, hmax)
    return start + sign * np.array(pts)


def _grid_quads(xs, ys):
    """Corner coordinates (n, 4, 2) of the quads of a tensor grid (anticlockwise)."""
    X, Y = np.meshgrid(xs, ys, indexing="ij")
    c = np.stack([X, Y], axis=-1)
    q = np.stack([c[:-1, :-1], c[1:, :-1], c[1:, 1:], c[:-1, 1:]], axis=2)
    return q.reshape(-1, 4, 2)


def _perimeter(a: float, r: float, m: int):
    """m + 1 points on the half-square of size r round (a, 0): up, across, down."""
    k = m // 4
    up = [(a - r, r * i / k) for i in range(k)]
    across = [(a - r + 2 * r * i / (2 * k), r) for i in range(2 * k)]
    down = [(a + r, r - r * i / k) for i in range(k + 1)]
    return np.array(up + across + down)


def focused_mesh(
    x0: float,
    x1: float,
    h: float,
    a: float,
    *,
    outer: float,
    per_ring: int = 16,
    core_ratio: float = 1e-3,
    hmax: float | None = None,
    x_lines=(),
    y_lines=(),
) -> Mesh:
    """Build the crack-tip-focused Q8 mesh of the rectangle ``[x0, x1] × [0, h]``.

    Parameters
    ----------
    x0, x1, h : body extent [mm]; the crack runs along ``y = 0`` from ``x0`` to ``a``
    a : tip position [mm], ``x0 < a < x1``
    outer : size R of the largest ring [mm]; must be below ``a − x0``, ``x1 − a`` and ``h``
    per_ring : elements per ring (a multiple of 4, ≥ 8); refinement doubles it
    core_ratio : r_0/R, the size of the tip core relative to the largest ring
    hmax : largest element size in the outer blocks [mm] (default (x1 − x0)/8)
    x_lines, y_lines : coordinates [mm] kept as grid lines of the outer blocks
    """
    m = int(per_ring)
    if m < 8 or m % 4:
        raise ValueError("per_ring must be a multiple of 4, at least 8")
    R = float(outer)
    if not (0 < R < a - x0 and R < x1 - a and R < h):
        raise ValueError("the largest ring must fit inside the body")
    growth = 1.0 + 4.0 / m
    n_rings = max(2, math.ceil(math.log(1.0 / core_ratio) / math.log(growth)))
    sizes = R * core_ratio ** (1.0 - np.arange(n_rings + 1) / n_rings)
    hmax = (x1 - x0) / 8 if hmax is None else hmax
    quads = []
    r0 = sizes[0]
    quads.append(
        _grid_quads(np.linspace(a - r0, a + r0, m // 2 + 1), np.linspace(0.0, r0, m // 4 + 1))
    )
    for k in range(n_rings):
        p, q = _perimeter(a, sizes[k], m), _perimeter(a, sizes[k + 1], m)
        quads.append(np.stack([q[:-1], q[1:], p[1:], p[:-1]], axis=1))
    step = 4.0 * R / m
    ys_low = np.linspace(0.0, R, m // 4 + 1)
    xl = _graded(a - R, x0, step, growth, hmax, x_lines)[::-1]
    xr = _graded(a + R, x1, step, growth, hmax, x_lines)
    quads.append(_grid_quads(xl, ys_low))
    quads.append(_grid_quads(xr, ys_low))
    xtop = np.concatenate([xl[:-1], np.linspace(a - R, a + R, m // 2 + 1), xr[1:]])
    ytop = _graded(R, h, step, growth, hmax, y_lines)
    quads.append(_grid_quads(xtop, ytop))
    corners = np.concatenate(quads)
    return _with_midsides(corners, (a, 0.0), sizes, scale=x1 - x0)


def _with_midsides(corners, tip, sizes, scale):
    """Merge the corner points, orient every element anticlockwise, add mid-side nodes."""
    signed = 0.5 * np.sum(
        corners[:, :, 0] * np.roll(corners[:, :, 1], -1, axis=1)
        - np.roll(corners[:, :, 0], -1, axis=1) * corners[:, :, 1],
        axis=1,
    )
    corners = np.where((signed < 0)[:, None, None], corners[:, ::-1], corners)
    pts = corners.reshape(-1, 2)
    key = np.round(pts / (scale * 1e-9)).astype(np.int64)
    _, first, inv = np.unique(key, axis=0, return_index=True, return_inverse=True)
    nodes = pts[first]
    conn = inv.reshape(-1, 4)
    edges = np.stack([conn, np.roll(conn, -1, axis=1)], axis=-1).reshape(-1, 2)
    ekey = np.sort(edges, axis=1)
    uniq, einv = np.unique(ekey, axis=0, return_inverse=True)
    mids = 0.5 * (nodes[uniq[:, 0]] + nodes[uniq[:, 1]])
    mid_ids = len(nodes) + einv.reshape(-1, 4)
    elements = np.concatenate([conn, mid_ids], axis=1)
    return Mesh(np.concatenate([nodes, mids]), elements, tip, np.asarray(sizes))


def without(mesh: Mesh, drop) -> Mesh:
    """The mesh with the elements in the boolean mask ``drop`` removed (nodes renumbered)."""
    kept = mesh.elements[~np.asarray(drop, bool)]
    used = np.unique(kept)
    renum = -np.ones(len(mesh.nodes), np.int64)
    renum[used] = np.arange(len(used))
    return Mesh(mesh.nodes[used], renum[kept], mesh.tip, mesh.ring_sizes)
