"""Short cracks at notches: Neuber's rule on the Masing branch, ΔJ at the notch root with the
transition to the long crack, and K of cracks at a circular hole.

Units: stresses and moduli in MPa, lengths in mm, K in MPa√mm, ΔJ in kJ/m².

* Neuber's rule for the stable loop at the notch root: Δσ·Δε = (K_t·ΔS)²/E with Δε on the
  Masing branch Δε = Δσ/E + 2(Δσ/2K')^(1/n') (compiled scalar root finder; vectorised twin).
* ΔJ of a short crack of depth a at the notch root: the crack's own K factor with the local
  Neuber range, ΔK_root = (K/S)(a)·Δσ_N (→ 1.12·K_t·ΔS√(πa) for an edge crack), elastic part
  ΔK_root²/E' plus the plastic part of the notch-root loop scaled as in Dowling's small-crack
  form (which is recovered for a small semicircular surface crack, (K/S)² = 1.6a).
* Transition to the long crack (Dowling 1979): the crack sees the smaller of the notch-root
  estimate and the long-crack estimate in which the notch depth D adds to the crack length,
  ΔJ = min[ΔJ_root(a), ΔJ_long(a + D)], the long crack with the shape's own K and limit load.
  The Smith–Miller extent of the notch field, 0.13√(Dρ), is given for information.
* Through cracks at a circular hole of radius R in a wide plate under remote tension S:
  K = S√(πa)·F(s), s = a/(a + R); two symmetric cracks F2 = ½(3 − s)[1 + 1.243(1 − s)³]
  (Tada's fit of Bowie's solution); one crack F1 = F2·√((2 − s)/2).

References
----------
.. [1] Neuber, H., "Theory of stress concentration for shear-strained prismatical bodies with
   arbitrary nonlinear stress-strain law", J. Appl. Mech. 28 (1961) 544–550.
.. [2] Topper, T. H., Wetzel, R. M., Morrow, J. D., "Neuber's rule applied to fatigue of notched
   specimens", J. Materials 4 (1969) 200–209 (K_t·ΔS with the cyclic curve).
.. [3] Dowling, N. E., "Fatigue at notches and the local strain and fracture mechanics
   approaches", ASTM STP 677 (1979) 247–273 (crack at a notch: smaller of the short-crack and
   the long-crack estimates, notch depth added; from memory).
.. [4] Smith, R. A., Miller, K. J., "Fatigue cracks at notches", Int. J. Mech. Sci. 19 (1977)
   11–22 (notch field depth 0.13√(Dρ); from memory).
.. [5] Bowie, O. L., J. Math. Phys. 35 (1956) 60–71; Tada, Paris & Irwin (1973), crack(s) at a
   circular hole, fit F(s) (from memory).
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.jintegral import (
    reference_stress_delta_j,
    reference_stress_delta_j_scalar,
    shape_small_crack_delta_j_scalar,
)
from cycj.material import masing_plastic_strain_range

__all__ = [
    "crack_at_hole_factor_scalar",
    "k_over_s_crack_at_hole",
    "neuber_masing",
    "neuber_masing_stress_range_scalar",
    "notch_delta_j",
    "notch_delta_j_scalar",
    "notch_root_delta_j",
    "smith_miller_notch_field_depth",
]


# --------------------------------------------------------------------------- compiled scalars
@jit
def neuber_masing_stress_range_scalar(kt, ds, e_mod, k_prime, n_prime):
    """Local stress range Δσ [MPa] of Neuber's rule on the Masing branch.

    Solves Δσ·(Δσ/E + 2(Δσ/2K')^(1/n')) = (K_t·ΔS)²/E.  The left side is convex and increasing,
    and Δσ ≤ K_t·ΔS, so Newton's method from the elastic value converges from above; a
    bisection guard keeps every step inside the bracket.
    """
    hi = kt * ds
    if hi <= 0.0:
        return 0.0
    target = hi * hi / e_mod
    lo = 0.0
    x = hi
    for _ in range(200):
        dep = masing_plastic_strain_range(x, k_prime, n_prime)
        f = x * (x / e_mod + dep) - target
        if f > 0.0:
            hi = x
        else:
            lo = x
        df = 2.0 * x / e_mod + dep * (1.0 + 1.0 / n_prime)
        step = f / df
        x_new = x - step
        if not (lo < x_new < hi):
            x_new = 0.5 * (lo + hi)
        if abs(x_new - x) <= 1e-15 * x:
            return x_new
        x = x_new
    return x


@jit
def notch_delta_j_scalar(
    dk, ds, g_long, l_long, lr_range, kt, own, e_mod, e_prime, sigma_y, k_prime, n_prime, u
):
    """ΔJ_eff [kJ/m²] of a crack at a notch root (Dowling 1979) from the shape's own K, and the
    factor r on the shape's K that the chosen estimate used (J_max takes the same K).

    ``dk`` [MPa√mm] is the shape's ΔK at the crack size a, ``ds`` [MPa] the nominal range,
    ``g_long`` = (K/S)(a + D)/(K/S)(a) and ``l_long`` = S_L(a)/S_L(a + D) (1 when the shape
    holds the notch, ``own`` = 1), ``lr_range`` = ΔS/S_L(a).

    * short crack: ΔK_root = ΔK·Δσ_N/ΔS (the shape's factor times the Neuber notch-root range,
      K_t·ΔS when elastic; ÷ K_t when the shape's K already holds the notch), elastic part
      ΔK_root²/E' plus the plastic part of the notch-root loop
      (:func:`cycj.jintegral.shape_small_crack_delta_j_scalar`);
    * long crack: the shape's own K and limit load at a + D by the reference stress method;
    * ΔJ = min(short, long), and never below the same crack without the notch (own = 0).
    """
    if dk <= 0.0 or ds <= 0.0:
        return 0.0, 1.0
    dsig = neuber_masing_stress_range_scalar(kt, ds, e_mod, k_prime, n_prime)
    scale = dsig / ds
    if own > 0.5:
        scale = scale / kt
    dk_root = dk * scale
    root = shape_small_crack_delta_j_scalar(dk_root, dsig, e_prime, k_prime, n_prime, u)
    dk_long = dk * g_long
    far = reference_stress_delta_j_scalar(
        dk_long * dk_long / e_prime, lr_range * l_long * sigma_y, e_mod, k_prime, n_prime, u
    )
    dj, r = root, scale
    if far < root:
        dj, r = far, g_long
    if own < 0.5:
        plain = reference_stress_delta_j_scalar(
            dk * dk / e_prime, lr_range * sigma_y, e_mod, k_prime, n_prime, u
        )
        if plain > dj:
            dj, r = plain, 1.0
    return dj, r


@jit
def crack_at_hole_factor_scalar(a, radius, n_cracks):
    """F(s) = K/(S√(πa)) of one or two through cracks at a circular hole, s = a/(a + R)."""
    s = a / (a + radius)
    f2 = 0.5 * (3.0 - s) * (1.0 + 1.243 * (1.0 - s) ** 3)
    if n_cracks < 1.5:
        return f2 * math.sqrt(0.5 * (2.0 - s))
    return f2


_neuber = ufunc(neuber_masing_stress_range_scalar)
_shape_small = ufunc(shape_small_crack_delta_j_scalar)
_hole = ufunc(crack_at_hole_factor_scalar)


# --------------------------------------------------------------------------- checks
def _cyclic(material):
    c = material.cyclic_curve
    if c is None:
        raise ValidityRangeError("notch analysis needs the material's cyclic curve (K', n')")
    return c


def _finite(name, x, minimum=0.0, strict=False):
    x = np.asarray(x, float)
    bad = (x <= minimum) if strict else (x < minimum)
    if np.any(~np.isfinite(x)) or np.any(bad):
        raise ValidityRangeError(f"{name} must be finite and {'>' if strict else '≥'} {minimum:g}")
    return x


def _u(u):
    u = np.asarray(u, float)
    if np.any(~((u >= 0.0) & (u <= 1.0))):
        raise ValidityRangeError("U (effective range ratio) must lie in [0, 1]")
    return u


# --------------------------------------------------------------------------- public API
def neuber_masing(kt, delta_s, material):
    """Local stress and strain ranges at a notch root by Neuber's rule on the Masing branch.

    Parameters
    ----------
    kt : array_like
        Elastic stress concentration factor K_t ≥ 1 (net or gross, consistent with ΔS).
    delta_s : array_like
        Nominal stress range ΔS ≥ 0 [MPa], elastic nominal section.
    material : cycj.material.Material
        With a cyclic curve (K' [MPa], n') and E [MPa].

    Returns
    -------
    tuple of numpy.ndarray
        (Δσ [MPa], Δε [-]) with Δσ·Δε = (K_t·ΔS)²/E and Δε = Δσ/E + 2(Δσ/2K')^(1/n').

    Notes
    -----
    Limits: an elastic material (K' → ∞) gives Δσ = K_t·ΔS; ΔS → 0 gives Δσ → K_t·ΔS.
    Valid while the nominal section stays elastic (ΔS well below 2σ'_y).

    References
    ----------
    .. [1] Neuber, J. Appl. Mech. 28 (1961) 544.
    .. [2] Topper, Wetzel & Morrow, J. Materials 4 (1969) 200.
    """
    c = _cyclic(material)
    kt = _finite("K_t", kt, 1.0)
    ds = _finite("ΔS", delta_s)
    e_mod = material.elastic_modulus
    dsig = _neuber(kt, ds, e_mod, c.strength_coefficient, c.hardening_exponent)
    return dsig, c.masing_strain_range(dsig, e_mod)


def _semicircle(a):
    """K/S of a small semicircular surface crack in Dowling's (1977) form, √(1.6a) [√mm]."""
    return np.sqrt(1.6 * np.asarray(a, float))


def notch_root_delta_j(a, delta_s, kt, material, u=1.0, k_over_s=None, e_prime=None):
    """ΔJ [kJ/m²] of a short crack of depth ``a`` inside the notch-root field.

    ΔJ = U²·ΔK_root²/E' + f_pl·(5.0/1.6)·(K/S)²·Δσ_NΔε_p/(1+n'), ΔK_root = (K/S)(a)·Δσ_N, with
    the local range Δσ_N of :func:`neuber_masing` (K_t·ΔS when elastic) and Δε_p on the same
    Masing branch.

    Parameters
    ----------
    a : array_like
        Crack depth from the notch root [mm] > 0.
    delta_s, kt, material
        As in :func:`neuber_masing`.
    u : array_like
        Effective range ratio in [0, 1] (closure).
    k_over_s : callable, optional
        K/S [√mm] of the crack in the body without the notch, as a function of ``a``: the
        crack's own factor (1.1215√(πa) for a shallow edge or through crack).  Default: a small
        semicircular surface crack in Dowling's (1977) form, √(1.6a) (Y ≈ 0.714) — only for
        that crack shape.
    e_prime : float, optional
        E' [MPa] of the elastic part; default E (as Dowling's form).

    Notes
    -----
    With the default factor this is Dowling's a(3.2ΔW_e + 5.0ΔW_p) with the local Δσ.
    Valid while the crack is inside the notch field (about 0.13√(Dρ), Smith & Miller 1977).

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 637 (1977) 97–121 (small semicircular surface crack).
    .. [2] Dowling, N. E., ASTM STP 677 (1979) 247–273 (edge crack at a notch, 1.12·K_t;
       from memory).
    .. [3] Topper, Wetzel & Morrow, J. Materials 4 (1969) 200.
    """
    c = _cyclic(material)
    a = _finite("a", a, strict=True)
    dsig, _ = neuber_masing(kt, delta_s, material)
    kos = _semicircle(a) if k_over_s is None else np.asarray(k_over_s(a), float)
    ep = material.elastic_modulus if e_prime is None else float(e_prime)
    return _shape_small(kos * dsig, dsig, ep, c.strength_coefficient, c.hardening_exponent, _u(u))


def notch_delta_j(
    a, delta_s, kt, material, notch_depth, u=1.0, long_crack=None, k_over_s=None, e_prime=None
):
    """ΔJ [kJ/m²] of a crack growing from a notch root, with the transition to the long crack.

    ΔJ = min[ΔJ_root(a), ΔJ_long(a + D)] (Dowling 1979): the notch-root estimate for short
    cracks, the long-crack estimate with the notch depth D added to the crack length once the
    crack has left the notch field.

    Parameters
    ----------
    a : array_like
        Crack depth from the notch root [mm] > 0 (tabulate over a grid of crack sizes).
    delta_s : array_like
        Nominal stress range ΔS [MPa].
    kt : float
        Elastic stress concentration factor K_t ≥ 1.
    material : cycj.material.Material
        With a cyclic curve.
    notch_depth : float
        D [mm] ≥ 0 (for a hole in a wide plate: its radius).
    u : array_like
        Effective range ratio in [0, 1].
    long_crack : callable, optional
        ΔJ_long(a_eff) [kJ/m²] for the effective length a_eff = a + D [mm].  Default: the
        reference stress estimate in a wide body (Δσ_ref = ΔS) with the same K factor as the
        short crack, ``k_over_s(a + D)``.
    k_over_s, e_prime
        As in :func:`notch_root_delta_j`.  For a shape of :mod:`cycj.geometry` use
        ``cycj.jintegral.delta_j(..., method="notch")``, which takes the shape's K and limit
        load at a + D.

    Notes
    -----
    Limits: a → 0 gives the notch-root value; a ≫ D gives the plain long-crack value
    ΔJ_long(a).

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 677 (1979) 247–273 (from memory).
    .. [2] Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642 (reference stress).
    """
    a = _finite("a", a, strict=True)
    ds = _finite("ΔS", delta_s)
    kt = _finite("K_t", kt, 1.0)
    d = float(_finite("notch depth", notch_depth))
    u = _u(u)
    root = notch_root_delta_j(a, ds, kt, material, u, k_over_s, e_prime)
    if long_crack is None:
        kos_fn = _semicircle if k_over_s is None else k_over_s
        ep = material.elastic_modulus if e_prime is None else float(e_prime)
        kos_far = np.asarray(kos_fn(a + d), float)
        far = reference_stress_delta_j((ds * kos_far) ** 2 / ep, ds, material, u)
    else:
        far = np.asarray(long_crack(a + d), float)
    return np.minimum(root, far)


def smith_miller_notch_field_depth(notch_depth, root_radius):
    """Depth of the notch-root field, 0.13√(Dρ) [mm] (Smith & Miller 1977).

    Beyond this depth a crack behaves as a long crack of length a + D.

    Parameters
    ----------
    notch_depth : array_like
        D [mm] > 0.
    root_radius : array_like
        ρ [mm] > 0.

    References
    ----------
    .. [1] Smith, R. A., Miller, K. J., Int. J. Mech. Sci. 19 (1977) 11–22 (from memory).
    """
    d = _finite("notch depth", notch_depth, strict=True)
    r = _finite("root radius", root_radius, strict=True)
    return 0.13 * np.sqrt(d * r)


def k_over_s_crack_at_hole(a, radius, n_cracks=2):
    """K/S [√mm] of through crack(s) of length ``a`` at a circular hole in a wide plate.

    K = S√(πa)·F(s), s = a/(a + R), remote uniaxial tension S normal to the cracks.

    Parameters
    ----------
    a : array_like
        Crack length from the hole edge [mm] > 0.
    radius : array_like
        Hole radius R [mm] > 0.
    n_cracks : {1, 2}
        One crack, or two symmetric (diametrically opposite) cracks.

    Returns
    -------
    numpy.ndarray
        K/S [√mm].

    Notes
    -----
    Two cracks: F2(s) = ½(3 − s)[1 + 1.243(1 − s)³], Tada's fit of Bowie's solution, within
    about 1 % for all s (from memory).  One crack: F1 = F2·√((2 − s)/2), the ratio of the two
    long-crack asymptotes (common practice; exact at both limits).
    Limits: a ≪ R gives F = 3·1.1215 (an edge crack in the K_t = 3 field); a ≫ R gives a centre
    crack of half-length a + R (two cracks) or a + 2R over 2 (one crack).
    Validity: wide plate (hole diameter and crack well inside the width), 0 < s < 1.

    References
    ----------
    .. [1] Bowie, O. L., J. Math. Phys. 35 (1956) 60–71.
    .. [2] Tada, Paris & Irwin (1973), crack(s) emanating from a circular hole (from memory).
    """
    a = _finite("a", a, strict=True)
    r = _finite("hole radius", radius, strict=True)
    if n_cracks not in (1, 2):
        raise ValidityRangeError("n_cracks must be 1 or 2")
    return np.sqrt(math.pi * a) * _hole(a, r, float(n_cracks))
