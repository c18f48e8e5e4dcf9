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

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.fields.profiles import StressProfile
from cycj.geometry.edge_crack_plate import tada_factor
from cycj.geometry.edge_crack_semi_infinite import FREE_SURFACE
from cycj.geometry.surface_crack_plate import bending_factor, newman_raju_factor

__all__ = [
    "DEEPEST",
    "HALF_PLANE_LINEAR",
    "SURFACE",
    "edge_crack_plate_k",
    "edge_crack_plate_references",
    "edge_crack_semi_infinite_k",
    "glinka_shen_coefficients",
    "glinka_shen_influence",
    "glinka_shen_k",
    "glinka_shen_weight",
    "surface_crack_influence_coefficients",
    "surface_crack_k",
    "surface_crack_polynomial_k",
    "surface_crack_references",
    "tada_pure_bending_factor",
]

DEEPEST = "deepest"   # tip at depth a: edge-crack tip or deepest point A
SURFACE = "surface"   # surface point B of a semi-elliptical crack
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
        rhs = np.stack(np.broadcast_arrays(c * y0 - 2.0, c * y1 - 2.0 / 3.0,
                                           np.full_like(y0 + y1, 3.0)), axis=-1)
    else:
        c = 0.5 * math.pi
        rhs = np.stack(np.broadcast_arrays(c * y0 - 2.0, c * y1 - 4.0 / 3.0,
                                           np.full_like(y0 + y1, -1.0)), axis=-1)
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
    poly = (1.0 + m[..., 0] * s + m[..., 1] * s**2 + m[..., 2] * s**3)
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
    mk = np.concatenate([np.ones(m.shape[:-1] + (1,)), m], axis=-1)     # (..., 4)
    i = np.arange(order + 1)[:, None]
    k = np.arange(4)[None, :]
    if point == DEEPEST:
        table = math.sqrt(2.0) / math.pi * beta_fn(0.5 * (k + 1), i + 1.0)
    else:
        table = 4.0 / math.pi / (2.0 * i + k + 1.0)
    return mk @ table.T


# --------------------------------------------------------------------------- reference solutions
@jit
def tada_pure_bending_factor(alpha):
    """F_b(α) of the edge-cracked strip in pure bending, K = σ_b√(πa)F_b, σ_b = 6M/(BW²).

    F_b = √[(2W/πa)·tan(πa/2W)]·[0.923 + 0.199(1 − sin(πa/2W))⁴]/cos(πa/2W), 0 < α < 1,
    within 0.5 % (Tada's handbook; from memory).
    """
    x = 0.5 * math.pi * alpha
    return math.sqrt(math.tan(x) / x) * (0.923 + 0.199 * (1.0 - math.sin(x)) ** 4) / math.cos(x)


_tada_tension = ufunc(tada_factor)
_tada_bending = ufunc(tada_pure_bending_factor)


def _linear_from_bending(y0, y_bend, depth_ratio):
    """Y1 of σ0(1 − x/a) from uniform Y0 and bending Y_b of σ_b(1 − 2x/t), a/t = depth_ratio."""
    return (y_bend - (1.0 - 2.0 * depth_ratio) * y0) / (2.0 * depth_ratio)


def edge_crack_plate_references(a, width):
    """Reference factors (Y0, Y1) of an edge crack in a finite plate (SE(T) section).

    Parameters
    ----------
    a : array_like
        Crack depth [mm], 0 < a/W ≤ 0.9.
    width : float
        Plate width W [mm] (the section depth over which the profile is given).

    Returns
    -------
    tuple of numpy.ndarray
        Y0 = Tada SE(T) F(a/W); Y1 for σ0(1 − x/a) from Tada's SE(B) pure bending fit
        (interpolated to the half-plane value below a/W = 0.2, see the module notes).

    References
    ----------
    .. [1] Tada, Paris & Irwin (1973), SE(T) tension and pure bending fits (from memory for
       bending).
    """
    w = float(_positive("width", width))
    alpha = _positive("a", a) / w
    if np.any(alpha > _ALPHA_MAX_EDGE):
        raise ValidityRangeError(f"a/W must lie in (0, {_ALPHA_MAX_EDGE}]")
    y0 = _tada_tension(alpha)
    ab = np.maximum(alpha, _ALPHA_BLEND)
    y1 = _linear_from_bending(_tada_tension(ab), _tada_bending(ab), ab)
    y1_blend = _linear_from_bending(_tada_tension(_ALPHA_BLEND), _tada_bending(_ALPHA_BLEND),
                                    _ALPHA_BLEND)
    low = HALF_PLANE_LINEAR + (y1_blend - HALF_PLANE_LINEAR) * alpha / _ALPHA_BLEND
    return y0, np.where(alpha < _ALPHA_BLEND, low, y1)


def _newman_raju_pair(a, c, t, b, phi):
    f, q = np.vectorize(newman_raju_factor, otypes=[float, float])(a, c, t, b, phi)
    h = np.vectorize(bending_factor, otypes=[float])(a, c, t, phi)
    return f, q, h


def surface_crack_references(a, c, thickness, width=0.0, point=DEEPEST):
    """Reference factors (Y0, Y1) and Q of a semi-elliptical surface crack (Newman–Raju).

    Parameters
    ----------
    a : array_like
        Crack depth [mm]; 0 < a/c ≤ 1 and a/t ≤ 0.8.
    c : array_like
        Half surface length [mm].
    thickness : float
        Plate thickness t [mm].
    width : float
        Full plate width 2b [mm]; 0 for a wide plate (f_w = 1); else c/b < 0.5.
    point : {"deepest", "surface"}

    Returns
    -------
    tuple of numpy.ndarray
        (Y0, Y1, Q): Y = K/(σ0√(πa)) = F/√Q for uniform and σ0(1 − x/a) profiles.

    Notes
    -----
    Y1 = Y0·[H − (1 − 2a/t)]/(2a/t), from Newman–Raju bending σ_b(1 − 2x/t) (multiplier H).

    References
    ----------
    .. [1] Newman & Raju, Eng. Fract. Mech. 15 (1981) 185 (coefficients from memory).
    .. [2] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237 (Newman–Raju tension and
       bending as the two reference solutions).
    """
    point = _point(point)
    t = float(_positive("thickness", thickness))
    a, c = np.broadcast_arrays(_positive("a", a), _positive("c", c))
    if np.any(a / c > 1.0 + 1e-12):
        raise ValidityRangeError("a/c must be ≤ 1 (Newman–Raju bending is given for a/c ≤ 1)")
    if np.any(a / t > 0.8 + 1e-12):
        raise ValidityRangeError("a/t must be ≤ 0.8 (Newman–Raju)")
    b = 0.5 * float(width)
    if b < 0.0 or (b > 0.0 and np.any(c / b >= 0.5)):
        raise ValidityRangeError("width must be 0 (wide plate) or give c/b < 0.5 (Newman–Raju)")
    phi = 0.5 * math.pi if point == DEEPEST else 0.0
    f, q, h = _newman_raju_pair(a, c, t, b, phi)
    y0 = f / np.sqrt(q)
    return y0, _linear_from_bending(y0, h * y0, a / t), q


# --------------------------------------------------------------------------- geometry wrappers
def _stress_of_x(stress, depth):
    """σ(x [mm]) and the depths of its kinks [mm] (table points)."""
    if isinstance(stress, StressProfile):
        if depth is None:
            raise ValidityRangeError("a StressProfile in x/t needs a section depth")
        kinks = np.asarray(stress.x_over_t, float) * depth if stress.kind == "table" else ()
        return stress.along(depth), kinks
    if not callable(stress):
        raise TypeError("stress must be a StressProfile or a callable σ(x [mm]) → MPa")
    return stress, ()


def edge_crack_plate_k(a, width, stress, n_points=64):
    """K [MPa√mm] of an edge crack in a finite plate under a stress profile over the width.

    Parameters
    ----------
    a : array_like
        Crack depths [mm], 0 < a/W ≤ 0.9.
    width : float
        W [mm]; a :class:`StressProfile` is read over x/W.
    stress : StressProfile or callable
        Profile over the crack plane (σ(x), x [mm] from the cracked edge, if callable).
    n_points : int
        Gauss–Legendre points.

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135, with Tada's SE(T) and SE(B) fits.
    """
    y0, y1 = edge_crack_plate_references(a, width)
    m = glinka_shen_coefficients(y0, y1, DEEPEST)
    fn, kinks = _stress_of_x(stress, float(width))
    return glinka_shen_k(a, fn, m, DEEPEST, n_points, kinks)


def edge_crack_semi_infinite_k(a, stress, n_points=64):
    """K [MPa√mm] of an edge crack in a semi-infinite plate under a stress profile σ(x).

    Parameters
    ----------
    a : array_like
        Crack depths [mm] > 0.
    stress : callable
        σ(x) [MPa], x [mm] from the free surface.

    Notes
    -----
    References Y0 = 1.1215 and Y1 = 0.4385 (σ0(1 − x/a)); exact for those two profiles.

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135.
    .. [2] Tada, Paris & Irwin (1973), half-plane edge crack (1.1215; 0.683 for σ0·x/a, from
       memory).
    """
    a = _positive("a", a)
    m = glinka_shen_coefficients(FREE_SURFACE, HALF_PLANE_LINEAR, DEEPEST)
    fn, kinks = _stress_of_x(stress, None)
    return glinka_shen_k(a, fn, m, DEEPEST, n_points, kinks)


def surface_crack_k(a, c, thickness, stress, width=0.0, point=DEEPEST, n_points=64):
    """K [MPa√mm] at the deepest or surface point of a semi-elliptical surface crack.

    Parameters
    ----------
    a, c : array_like
        Depth and half-length [mm] (0 < a/c ≤ 1, a/t ≤ 0.8).
    thickness : float
        t [mm]; a :class:`StressProfile` is read over x/t.
    stress : StressProfile or callable
        Through-thickness profile (x [mm] from the cracked surface, if callable).
    width : float
        Full width 2b [mm] (0: wide plate).
    point : {"deepest", "surface"}

    References
    ----------
    .. [1] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237.
    .. [2] Newman & Raju, Eng. Fract. Mech. 15 (1981) 185.
    """
    y0, y1, _ = surface_crack_references(a, c, thickness, width, point)
    m = glinka_shen_coefficients(y0, y1, point)
    a = np.broadcast_to(np.asarray(a, float), y0.shape)
    fn, kinks = _stress_of_x(stress, float(thickness))
    return glinka_shen_k(a, fn, m, point, n_points, kinks)


def surface_crack_influence_coefficients(a, c, thickness, width=0.0, point=DEEPEST, order=3):
    """Influence coefficients G_i and Q: K = √(πa/Q)·Σ σ_i (a/t)^i G_i for σ = Σ σ_i (x/t)^i.

    Parameters
    ----------
    a, c, thickness, width, point
        As in :func:`surface_crack_k`.
    order : int
        Highest power in the polynomial (3 for the standards' four-term form).

    Returns
    -------
    tuple
        (G, Q): G of shape ``a.shape + (order + 1,)`` normalised by √(πa/Q); G_0 and the
        linear combination for bending reproduce Newman–Raju exactly.

    References
    ----------
    .. [1] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237.
    """
    y0, y1, q = surface_crack_references(a, c, thickness, width, point)
    m = glinka_shen_coefficients(y0, y1, point)
    return glinka_shen_influence(m, order, point) * np.sqrt(q)[..., None], q


def surface_crack_polynomial_k(a, c, thickness, coefficients, width=0.0, point=DEEPEST):
    """K [MPa√mm] of a polynomial profile σ = Σ σ_i (x/t)^i, exactly, by influence coefficients.

    References
    ----------
    .. [1] Shen & Glinka, Theor. Appl. Fract. Mech. 15 (1991) 237.
    """
    coeff = np.atleast_1d(np.asarray(coefficients, float))
    g, q = surface_crack_influence_coefficients(a, c, thickness, width, point, coeff.size - 1)
    a = np.broadcast_to(np.asarray(a, float), q.shape)
    powers = (a[..., None] / float(thickness)) ** np.arange(coeff.size)
    return np.sqrt(math.pi * a / q) * np.sum(coeff * powers * g, axis=-1)
