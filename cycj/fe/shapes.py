"""Finite-element models of the crack shapes: half (or quarter) models with the supports and
loads of the K solution each shape uses in :mod:`cycj.geometry`.

Coordinates: x along the crack (the crack grows in +x), y normal to the crack plane; the model
is the half y ≥ 0 and the ligament y = 0, x > a is a symmetry line (u_y = 0).  Loads are per unit
nominal stress S = P/(B·W) and per mm of thickness, so a load level is S [MPa]:

* ``compact-tension`` — C(T) of the ASTM E399 proportions: x from the load line, front face at
  −0.25W, back face at W, half height 0.6W, pin hole of diameter 0.25W centred at (0, 0.275W)
  (stepped on a local uniform grid); the pin force S·W is spread over the hole's upper half;
  x fixed at one point of the back face.
* ``three-point-bend`` — SE(B), span 4W: x is the depth from the cracked face, y along the beam
  from the crack plane; half the load, S·W/2, acts at (W, 0), the support at (0, S/2) holds
  u_x; the beam ends 0.25W beyond the support.
* ``center-crack-plate`` — M(T): quarter model, x from the centre (u_x = 0 on x = 0), plate
  half width W/2, half height 1.5W; remote stress S on the far edge.
* ``edge-crack-plate`` — SE(T) free to rotate (pin loaded, as Tada's solution): uniform stress
  S on the far edge, half height 2.5W; x fixed at one point of the back face.

Point loads and supports sit in a small elastic patch (radius 0.04W; 0.2W round the C(T) pin
hole) so the material round them does not yield (they are far from the crack tip and do not
change J).  Side grooves are not modelled.  Validity: the crack tip must leave room for the
rings (0 < a < W; C(T) a > 0); the shapes' own K ranges apply to the comparison columns.

References
----------
.. [1] ASTM E399 and E1820: C(T) and SE(B) proportions.
.. [2] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook* (1973):
   M(T) and SE(T) loaded by uniform remote stress.
"""

from __future__ import annotations

import numpy as np

from cycj.fe.element import edge_loads
from cycj.fe.mesh import focused_mesh, without
from cycj.fe.solver import Problem

#: shapes with a finite-element model here
FE_SHAPES = ("compact-tension", "three-point-bend", "center-crack-plate", "edge-crack-plate")


def _edge(mesh, coord: int, value: float, tol: float):
    """Quadratic edges (end, mid, end) of elements lying on the line x_coord = value."""
    on = np.abs(mesh.nodes[:, coord] - value) <= tol
    out = []
    for el in mesh.elements:
        for i, (p, q) in enumerate(((0, 1), (1, 2), (2, 3), (3, 0))):
            a, b, mid = el[p], el[q], el[4 + i]
            if on[a] and on[b] and on[mid]:
                out.append((a, mid, b))
    return out


def build(shape: str, width: float, a: float, law, *, refine: int = 1, order: int = 2, span=None):
    """Problem for ``shape`` of width W [mm] with crack size ``a`` [mm] (half length for M(T)),
    loaded per unit nominal stress S [MPa]; ``refine`` multiplies the elements per ring."""
    w = float(width)
    per_ring = 16 * refine
    tol = 1e-9 * w
    point_loads = []  # (x, y, fx, fy)
    points = []  # elastic patches
    if shape == "compact-tension":
        x0, x1, h = -0.25 * w, w, 0.6 * w
        outer = 0.7 * min(a - x0, x1 - a, 0.15 * w)
        mesh = focused_mesh(
            x0,
            x1,
            h,
            a,
            outer=outer,
            per_ring=per_ring,
            hmax=w / 8 / refine,
            x_lines=tuple(np.linspace(-0.175, 0.175, 15) * w),
            y_lines=tuple(np.linspace(0.1, 0.45, 15) * w),
        )
        mesh, pin_force = _pin_hole(mesh, w)
        points.append((0.0, 0.275 * w))
        fix_x = [mesh.nearest_node(x1, 0.0)]
    elif shape == "three-point-bend":
        s = 4 * w if span is None else float(span)
        x0, x1, h = 0.0, w, 0.5 * s + 0.25 * w
        outer = 0.7 * min(a, x1 - a)
        mesh = focused_mesh(x0, x1, h, a, outer=outer, per_ring=per_ring, y_lines=(0.5 * s,))
        point_loads.append((w, 0.0, -0.5 * w, 0.0))
        points += [(w, 0.0), (0.0, 0.5 * s)]
        fix_x = [mesh.nearest_node(0.0, 0.5 * s)]
    elif shape in ("center-crack-plate", "edge-crack-plate"):
        mt = shape == "center-crack-plate"
        x0, x1 = 0.0, (0.5 * w if mt else w)
        h = 1.5 * w if mt else 2.5 * w
        outer = 0.7 * min(a, x1 - a)
        mesh = focused_mesh(x0, x1, h, a, outer=outer, per_ring=per_ring)
        fix_x = (
            np.flatnonzero(np.abs(mesh.nodes[:, 0]) <= tol) if mt else [mesh.nearest_node(x1, 0.0)]
        )
    else:
        raise ValueError(f"no finite-element model of shape {shape!r}")
    nodes = mesh.nodes
    force = np.zeros((len(nodes), 2))
    if shape == "compact-tension":
        force += pin_force
    for x, y, fx, fy in point_loads:
        force[mesh.nearest_node(x, y)] += (fx, fy)
    if shape in ("center-crack-plate", "edge-crack-plate"):
        force += edge_loads(nodes, _edge(mesh, 1, h, tol), (0.0, 1.0))
    lig = np.flatnonzero((np.abs(nodes[:, 1]) <= tol) & (nodes[:, 0] >= a - tol))
    fixed = np.unique(np.concatenate([2 * lig + 1, 2 * np.asarray(fix_x, np.int64)]))
    elastic = None
    radius = 0.2 if shape == "compact-tension" else 0.04
    if points:
        c = mesh.centroids()
        elastic = np.zeros(len(c), bool)
        for x, y in points:
            elastic |= np.hypot(c[:, 0] - x, c[:, 1] - y) <= radius * w
    return Problem(mesh, law, fixed, force.ravel(), elastic, order)


def _pin_hole(mesh, w):
    """Cut the C(T) pin hole (diameter 0.25W, centre (0, 0.275W)) out of the grid (stepped at
    the grid lines) and spread the pin force S·W over the nodes of its upper half, weighted
    by cos θ from the vertical and corrected so the resultant acts on the load line."""
    xc, yc, r = 0.0, 0.275 * w, 0.125 * w
    c = mesh.centroids()
    inside = np.hypot(c[:, 0] - xc, c[:, 1] - yc) < r
    hole_nodes = np.unique(mesh.elements[inside])
    out = without(mesh, inside)
    old = np.unique(mesh.elements[~inside])
    edge = np.flatnonzero(np.isin(old, hole_nodes))
    x, y = out.nodes[edge, 0] - xc, out.nodes[edge, 1] - yc
    top = y > 0
    edge, x, y = edge[top], x[top], y[top]
    wt = y / np.hypot(x, y)
    wt = wt * (1 - x * np.sum(wt * x) / np.sum(wt * x * x))
    force = np.zeros((len(out.nodes), 2))
    force[edge, 1] = w * wt / wt.sum()
    return out, force
