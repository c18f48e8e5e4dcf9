"""K of an arbitrary stress profile for each crack shape: the shapes' reference solutions
(Y0 uniform, Y1 linear) that calibrate the Glinka–Shen weight function of
:mod:`cycj.fields.weight_functions`, and the per-shape wrappers the life engine tabulates.

Units: lengths mm, stresses MPa, K MPa√mm.  The reference solutions and their validity are
described in :mod:`cycj.fields.weight_functions`.

References
----------
.. [1] Glinka, G., Shen, G., Eng. Fract. Mech. 40 (1991) 1135–1146.
.. [2] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook* (1973).
.. [3] Newman, J. C., Jr., Raju, I. S., Eng. Fract. Mech. 15 (1981) 185–192.
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.fields.profiles import StressProfile
from cycj.fields.weight_functions import (
    _ALPHA_BLEND,
    _ALPHA_MAX_EDGE,
    DEEPEST,
    FREE_SURFACE,
    HALF_PLANE_LINEAR,
    _point,
    _positive,
    glinka_shen_coefficients,
    glinka_shen_influence,
    glinka_shen_k,
)
from cycj.geometry.edge_crack_plate import tada_factor
from cycj.geometry.surface_crack_plate import bending_factor, newman_raju_factor


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
    y1_blend = _linear_from_bending(
        _tada_tension(_ALPHA_BLEND), _tada_bending(_ALPHA_BLEND), _ALPHA_BLEND
    )
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
