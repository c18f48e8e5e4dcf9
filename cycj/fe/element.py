"""The eight-node serendipity quadrilateral with 2×2 (reduced) Gauss integration.

Reduced integration keeps the quadratic element free of volumetric locking when the plastic
strains are nearly incompressible (plane strain at high hardening exponent); full 3×3
integration is available for comparison (it locks).  All functions are vectorised over the
elements; strains are Voigt vectors (ε_xx, ε_yy, γ_xy).

References
----------
.. [1] Zienkiewicz, O. C., Taylor, R. L., *The Finite Element Method*, vol. 1, 5th ed. (2000),
   ch. 8 (serendipity shape functions) and ch. 12 (reduced integration, locking).
.. [2] Nagtegaal, J. C., Parks, D. M., Rice, J. R., "On numerically accurate finite element
   solutions in the fully plastic range", Comput. Methods Appl. Mech. Eng. 4 (1974) 153–177.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

_XI = np.array([-1, 1, 1, -1, 0, 1, 0, -1], float)
_ETA = np.array([-1, -1, 1, 1, -1, 0, 1, 0], float)


def shape(xi, eta):
    """Shape functions N (8,) and their derivatives dN/dξ, dN/dη at one point."""
    n = np.empty(8)
    dxi = np.empty(8)
    deta = np.empty(8)
    for i in range(4):
        a, b = _XI[i], _ETA[i]
        n[i] = 0.25 * (1 + a * xi) * (1 + b * eta) * (a * xi + b * eta - 1)
        dxi[i] = 0.25 * a * (1 + b * eta) * (2 * a * xi + b * eta)
        deta[i] = 0.25 * b * (1 + a * xi) * (a * xi + 2 * b * eta)
    for i in (4, 6):
        b = _ETA[i]
        n[i] = 0.5 * (1 - xi * xi) * (1 + b * eta)
        dxi[i] = -xi * (1 + b * eta)
        deta[i] = 0.5 * b * (1 - xi * xi)
    for i in (5, 7):
        a = _XI[i]
        n[i] = 0.5 * (1 + a * xi) * (1 - eta * eta)
        dxi[i] = 0.5 * a * (1 - eta * eta)
        deta[i] = -eta * (1 + a * xi)
    return n, dxi, deta


def gauss(order: int):
    """Gauss points (ξ, η) and weights of the order × order rule."""
    g, w = np.polynomial.legendre.leggauss(order)
    xi, eta = np.meshgrid(g, g, indexing="ij")
    return np.stack([xi.ravel(), eta.ravel()], axis=1), np.outer(w, w).ravel()


@dataclass(frozen=True)
class Kinematics:
    """Per element and Gauss point: shape values, B matrices, weights × det J, positions.

    Attributes
    ----------
    N : (n_gp, 8) shape function values
    dN : (n_el, n_gp, 8, 2) derivatives dN/dx, dN/dy [1/mm]
    B : (n_el, n_gp, 3, 16) strain–displacement matrices [1/mm]
    wdet : (n_el, n_gp) integration weights × det J [mm²]
    dofs : (n_el, 16) global degrees of freedom (2·node, 2·node + 1)
    """

    N: np.ndarray
    dN: np.ndarray
    B: np.ndarray
    wdet: np.ndarray
    dofs: np.ndarray


def kinematics(nodes, elements, order: int = 2) -> Kinematics:
    """B matrices and weights of every element (``order`` = 2 reduced, 3 full)."""
    pts, wts = gauss(order)
    ng = len(wts)
    N = np.empty((ng, 8))
    dref = np.empty((ng, 8, 2))
    for g, (xi, eta) in enumerate(pts):
        N[g], dref[g, :, 0], dref[g, :, 1] = shape(xi, eta)
    xe = nodes[elements]  # (ne, 8, 2)
    jac = np.einsum("gni,enj->egij", dref, xe)  # dx_j/dξ_i
    det = jac[..., 0, 0] * jac[..., 1, 1] - jac[..., 0, 1] * jac[..., 1, 0]
    if np.any(det <= 0):
        raise ValueError("mesh has an inverted or degenerate element")
    inv = np.empty_like(jac)
    inv[..., 0, 0] = jac[..., 1, 1] / det
    inv[..., 1, 1] = jac[..., 0, 0] / det
    inv[..., 0, 1] = -jac[..., 0, 1] / det
    inv[..., 1, 0] = -jac[..., 1, 0] / det
    dN = np.einsum("gni,egji->egnj", dref, inv)  # dN/dx_j = dN/dξ_i · dξ_i/dx_j
    ne = len(elements)
    B = np.zeros((ne, ng, 3, 16))
    B[:, :, 0, 0::2] = dN[..., 0]
    B[:, :, 1, 1::2] = dN[..., 1]
    B[:, :, 2, 0::2] = dN[..., 1]
    B[:, :, 2, 1::2] = dN[..., 0]
    dofs = np.empty((ne, 16), np.int64)
    dofs[:, 0::2] = 2 * elements
    dofs[:, 1::2] = 2 * elements + 1
    return Kinematics(N, dN, B, det * wts, dofs)


def edge_loads(nodes, edge_nodes, traction) -> np.ndarray:
    """Consistent nodal forces (1/6, 4/6, 1/6 of the edge's load) of a uniform traction
    ``traction`` (t_x, t_y) [MPa] on straight quadratic edges ``(end, mid, end)``; returns
    (n_nodes, 2) [N per mm of thickness]."""
    f = np.zeros((len(nodes), 2))
    t = np.asarray(traction, float)
    for i, mid, j in edge_nodes:
        length = float(np.hypot(*(nodes[j] - nodes[i])))
        f[i] += t * length / 6
        f[j] += t * length / 6
        f[mid] += t * 4 * length / 6
    return f
