"""Stress intensity factors for arbitrary stress profiles by the Glinka–Shen weight function.

K(a) = ∫₀ᵃ σ(x)·m(x, a) dx [MPa√mm], x from the cracked surface [mm].  The universal form for
a point whose crack tip lies at depth a (edge-crack tip, deepest point A of a surface crack):

    m_A(x, a) = 2/√(2π(a − x))·[1 + M1(1 − x/a)^½ + M2(1 − x/a) + M3(1 − x/a)^{3/2}],

and for the surface point B of a semi-elliptical surface crack (the front meets the free
surface at x = 0):

    m_B(x, a) = 2/√(πx)·[1 + M1(x/a)^½ + M2(x/a) + M3(x/a)^{3/2}].

M1, M2, M3 follow from two reference solutions of the geometry, written Y = K/(σ0√(πa)):
Y0 for uniform stress σ0 and Y1 for the linear profile σ0(1 − x/a), plus one condition of the
form itself: ∂²m_A/∂x² = 0 at the crack mouth x = 0, which gives M2 = 3, and m_B(a, a) = 0 at
the far end of the front for the surface point.  (For a surface crack Y = F/√Q of the
Newman–Raju form.)

Quadrature: the substitution x = a(1 − s²) (point A) or x = a·s² (point B) removes the
1/√ singularity exactly, K = 2√(2a/π)∫₀¹σ(a(1−s²))P(s) ds or 4√(a/π)∫₀¹σ(as²)P(s) ds with
P(s) = 1 + M1 s + M2 s² + M3 s³, evaluated by Gauss–Legendre in s (exact for a polynomial
profile of degree d when n_points ≥ d + 2).  Everything is vectorised over crack sizes, so a run
tabulates K(a) once on a grid.

Reference solutions used (Y0, Y1):

* edge crack in a finite plate of width W: Y0 = Tada's SE(T) F(a/W) (``tada_factor``);
  Y1 from Tada's SE(B) pure-bending F_b(a/W) through σ_b(1 − 2x/W) = σ_b[(1 − 2α) + 2α(1 − x/a)],
  Y1 = [F_b − (1 − 2α)F_T]/(2α).  Both fits are within 0.5 %, but their difference divided by
  2α loses that accuracy at small α (it tends to 0.359 instead of the half-plane 0.4385), so
  for α < 0.2 Y1 is interpolated linearly between the half-plane value at α = 0 and the fit
  value at α = 0.2 (our choice, continuous; no published source);
* edge crack in a semi-infinite plate: Y0 = 1.1215, Y1 = 1.1215 − 0.683 = 0.4385, with 0.683
  the published factor for the linearly increasing profile σ0·x/a (Tada's handbook, from
  memory; it agrees within 0.2 % with the integral of Tada's point-force Green's function);
* semi-elliptical surface crack, deepest and surface points: Newman–Raju tension F and
  bending H·F through σ_b(1 − 2x/t) as above, Y = F/√Q (the Shen–Glinka approach).

References
----------
.. [1] Glinka, G., Shen, G., "Universal features of weight functions for cracks in mode I",
   Eng. Fract. Mech. 40 (1991) 1135–1146.
.. [2] Shen, G., Glinka, G., "Determination of weight functions from reference stress intensity
   factors", Theor. Appl. Fract. Mech. 15 (1991) 237–245 (surface crack, points A and B).
.. [3] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook* (1973):
   SE(T) tension and SE(B) pure bending fits, half-plane edge crack (from memory).
.. [4] Newman, J. C., Jr., Raju, I. S., Eng. Fract. Mech. 15 (1981) 185–192.
"""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
from scipy.special import beta as beta_fn

from cycj.errors import ValidityRangeError
from cycj.geometry.edge_crack_semi_infinite import FREE_SURFACE

__all__ = [
    "DEEPEST",
    "HALF_PLANE_LINEAR",
    "SURFACE",
    "glinka_shen_coefficients",
    "glinka_shen_influence",
    "glinka_shen_k",
    "glinka_shen_weight",
]

DEEPEST = "deepest"  # tip at depth a: edge-crack tip or deepest point A
SURFACE = "surface"  # surface point B of a semi-elliptical crack
_POINTS = (DEEPEST, SURFACE)

#: Y1 of the half-plane edge crack for σ0(1 − x/a): 1.1215 − 0.683 (Tada; from memory)
HALF_PLANE_LINEAR = FREE_SURFACE - 0.683
#: below this a/W the finite-plate Y1 is interpolated towards the half-plane value
_ALPHA_BLEND = 0.2
_ALPHA_MAX_EDGE = 0.9

# Rows: moments ∫ P(s)·(profile) ds of the two reference profiles and the form's own condition,
# as linear equations in (M1, M2, M3); right-hand sides in glinka_shen_coefficients.
_SYSTEM = {
    DEEPEST: np.array([[1.0, 2.0 / 3.0, 0.5], [0.5, 0.4, 1.0 / 3.0], [0.0, 1.0, 0.0]]),
    SURFACE: np.array([[1.0, 2.0 / 3.0, 0.5], [0.5, 4.0 / 15.0, 1.0 / 6.0], [1.0, 1.0, 1.0]]),
}
_INVERSE = {k: np.linalg.inv(v) for k, v in _SYSTEM.items()}


def _point(point):
    if point not in _POINTS:
        raise ValueError(f"unknown crack-front point {point!r}; expected one of {_POINTS}")
    return point


def _positive(name, x):
    x = np.asarray(x, float)
    if np.any(~np.isfinite(x)) or np.any(x <= 0.0):
        raise ValidityRangeError(f"{name} must be finite and > 0")
    return x


def glinka_shen_coefficients(y0, y1, point=DEEPEST):
    """M1, M2, M3 of the Glinka–Shen weight function from two reference solutions.

    Parameters
    ----------
    y0 : array_like
        K/(σ0√(πa)) for uniform stress σ0 on the crack faces (dimensionless).
    y1 : array_like
        K/(σ0√(πa)) for the linear profile σ0(1 − x/a), x from the cracked surface.
    point : {"deepest", "surface"}
        ``"deepest"``: tip at depth a (edge crack, deepest point A); condition M2 = 3.
        ``"surface"``: surface point B; condition 1 + M1 + M2 + M3 = 0.

    Returns
    -------
    numpy.ndarray
        Shape ``(..., 3)``: M1, M2, M3.

    Notes
    -----
    Point A: M1 = (π/√2)(4Y0 − 6Y1) − 24/5, M2 = 3, M3 = (π/√2)(12Y1 − 6Y0) + 8/5 (Eq. for
    point A in [2], with Y normalised by √(πa) instead of √(πa/Q)).  Point B: the 3×3 system
    M1 + 2M2/3 + M3/2 = πY0/2 − 2, M1/2 + 4M2/15 + M3/6 = πY1/2 − 4/3, M1 + M2 + M3 = −1.

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135 (crack-mouth condition, M2 = 3).
    .. [2] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237 (point B condition
       m_B(a, a) = 0, from memory).
    """
    point = _point(point)
    y0 = np.asarray(y0, float)
    y1 = np.asarray(y1, float)
    if point == DEEPEST:
        c = math.pi / math.sqrt(2.0)
        rhs = np.stack(
            np.broadcast_arrays(c * y0 - 2.0, c * y1 - 2.0 / 3.0, np.full_like(y0 + y1, 3.0)),
            axis=-1,
        )
    else:
        c = 0.5 * math.pi
        rhs = np.stack(
            np.broadcast_arrays(c * y0 - 2.0, c * y1 - 4.0 / 3.0, np.full_like(y0 + y1, -1.0)),
            axis=-1,
        )
    return rhs @ _INVERSE[point].T


def glinka_shen_weight(x, a, m, point=DEEPEST):
    """Weight function m(x, a) [1/√mm] of the Glinka–Shen universal form.

    Parameters
    ----------
    x : array_like
        Depth from the cracked surface [mm], 0 ≤ x < a (0 < x ≤ a for the surface point).
    a : array_like
        Crack depth [mm] > 0.
    m : array_like, shape (..., 3)
        M1, M2, M3 from :func:`glinka_shen_coefficients`.
    point : {"deepest", "surface"}

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135; Shen & Glinka, Theor. Appl. Fract.
       Mech. 15 (1991) 237.
    """
    point = _point(point)
    a = _positive("a", a)
    x = np.asarray(x, float)
    m = np.asarray(m, float)
    if np.any(x < 0.0) or np.any(x > a):
        raise ValidityRangeError("x must lie in [0, a]")
    r = np.sqrt(1.0 - x / a) if point == DEEPEST else np.sqrt(x / a)
    poly = 1.0 + m[..., 0] * r + m[..., 1] * r * r + m[..., 2] * r**3
    with np.errstate(divide="ignore"):
        if point == DEEPEST:
            return 2.0 / np.sqrt(2.0 * math.pi * (a - x)) * poly
        return 2.0 / np.sqrt(math.pi * x) * poly


@lru_cache(maxsize=16)
def _gauss(n_points):
    s, w = np.polynomial.legendre.leggauss(n_points)
    return 0.5 * (s + 1.0), 0.5 * w


def glinka_shen_k(a, stress, m, point=DEEPEST, n_points=64, breakpoints=()):
    """K [MPa√mm] of a stress profile by the Glinka–Shen weight function, for many a at once.

    Parameters
    ----------
    a : array_like
        Crack depths [mm] > 0, shape ``(n,)`` or scalar.
    stress : callable
        σ(x) [MPa] for x [mm] from the cracked surface, vectorised over arrays of x.
    m : array_like, shape (..., 3)
        M1, M2, M3 at each a (broadcast against ``a``).
    point : {"deepest", "surface"}
    n_points : int
        Gauss–Legendre points in s (exact for polynomial profiles of degree ≤ n_points − 2).
    breakpoints : sequence of float
        Depths x [mm] where σ has a kink (table points); the s-range is split there and each
        piece gets ``n_points`` points, so piecewise-polynomial profiles integrate exactly.

    Returns
    -------
    numpy.ndarray
        K [MPa√mm] with the shape of ``a``.

    Notes
    -----
    K = 2√(2a/π)∫₀¹σ(a(1 − s²))P(s) ds (point A) or 4√(a/π)∫₀¹σ(as²)P(s) ds (point B),
    P(s) = 1 + M1 s + M2 s² + M3 s³: the substitution removes the inverse square-root
    singularity exactly.  Linear in σ (superposition holds to round-off).

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135.
    """
    point = _point(point)
    a = _positive("a", a)
    m = np.broadcast_to(np.asarray(m, float), a.shape + (3,))
    s, w = _gauss(int(n_points))
    s, w = _split(a, np.asarray(breakpoints, float), s, w, point)
    m = m[..., None, :]
    poly = 1.0 + m[..., 0] * s + m[..., 1] * s**2 + m[..., 2] * s**3
    if point == DEEPEST:
        x = a[..., None] * (1.0 - s * s)
        lead = 2.0 * np.sqrt(2.0 * a / math.pi)
    else:
        x = a[..., None] * s * s
        lead = 4.0 * np.sqrt(a / math.pi)
    sig = np.broadcast_to(np.asarray(stress(x), float), x.shape)
    return lead * np.sum(sig * poly * w, axis=-1)


def _split(a, breakpoints, s, w, point):
    """Gauss nodes and weights in s, shape ``a.shape + (n,)``, split at the kinks of σ."""
    if breakpoints.size == 0:
        shape = a.shape + s.shape
        return np.broadcast_to(s, shape), np.broadcast_to(w, shape)
    r = np.clip(breakpoints / a[..., None], 0.0, 1.0)
    sk = np.sqrt(1.0 - r) if point == DEEPEST else np.sqrt(r)
    ends = np.broadcast_to([0.0, 1.0], a.shape + (2,))
    edges = np.sort(np.concatenate([ends, sk], axis=-1), axis=-1)
    lo, width = edges[..., :-1, None], np.diff(edges, axis=-1)[..., None]
    nodes = (lo + width * s).reshape(a.shape + (-1,))
    return nodes, (width * w).reshape(a.shape + (-1,))


def glinka_shen_influence(m, order=3, point=DEEPEST):
    """Influence coefficients G_i = K_i/(σ√(πa)) for the profiles σ·(x/a)^i, i = 0…order.

    Parameters
    ----------
    m : array_like, shape (..., 3)
        M1, M2, M3.
    order : int
        Highest power of x/a.
    point : {"deepest", "surface"}

    Returns
    -------
    numpy.ndarray
        Shape ``(..., order + 1)``; K of Σ σ_i(x/a)^i is σ√(πa)·Σ σ_i G_i.

    Notes
    -----
    Exact integrals of the weight function: point A,
    G_i = (√2/π)Σ_k M_k·B((k+1)/2, i+1) (M_0 = 1, Beta function B); point B,
    G_i = (4/π)Σ_k M_k/(2i + k + 1).

    References
    ----------
    .. [1] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237.
    """
    point = _point(point)
    m = np.asarray(m, float)
    mk = np.concatenate([np.ones(m.shape[:-1] + (1,)), m], axis=-1)  # (..., 4)
    i = np.arange(order + 1)[:, None]
    k = np.arange(4)[None, :]
    if point == DEEPEST:
        table = math.sqrt(2.0) / math.pi * beta_fn(0.5 * (k + 1), i + 1.0)
    else:
        table = 4.0 / math.pi / (2.0 * i + k + 1.0)
    return mk @ table.T
