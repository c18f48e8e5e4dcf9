"""Short cracks at notches: Neuber's rule on the Masing branch, ΔJ at the notch root with the
transition to the long crack, and K of cracks at a circular hole.

Units: stresses and moduli in MPa, lengths in mm, K in MPa√mm, ΔJ in kJ/m².

* Neuber's rule for the stable loop at the notch root: Δσ·Δε = (K_t·ΔS)²/E with Δε on the
  Masing branch Δε = Δσ/E + 2(Δσ/2K')^(1/n') (compiled scalar root finder; vectorised twin).
* ΔJ of a short crack of depth a at the notch root: Dowling's small-crack form
  a(3.2ΔW_e + 5.0ΔW_p) with the local Δσ (``cycj.jintegral``).
* Transition to the long crack (Dowling 1979): the crack sees the smaller of the notch-root
  estimate and the long-crack estimate in which the notch depth D adds to the crack length,
  ΔJ = min[ΔJ_root(a), ΔJ_long(a + D)].  The Smith–Miller extent of the notch field,
  0.13√(Dρ), is given for information.
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
from cycj.jintegral import small_crack_delta_j, small_crack_delta_j_scalar
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
def notch_delta_j_scalar(a, ds, kt, notch_depth, e_mod, k_prime, n_prime, u):
    """Dowling's (1979) ΔJ [kJ/m²] of a crack of depth ``a`` at a notch of depth D:
    min[ΔJ_small(a, Δσ_Neuber), ΔJ_small(a + D, ΔS)]."""
    dsig = neuber_masing_stress_range_scalar(kt, ds, e_mod, k_prime, n_prime)
    root = small_crack_delta_j_scalar(a, dsig, e_mod, k_prime, n_prime, u)
    far = small_crack_delta_j_scalar(a + notch_depth, ds, e_mod, k_prime, n_prime, u)
    return min(root, far)


@jit
def crack_at_hole_factor_scalar(a, radius, n_cracks):
    """F(s) = K/(S√(πa)) of one or two through cracks at a circular hole, s = a/(a + R)."""
    s = a / (a + radius)
    f2 = 0.5 * (3.0 - s) * (1.0 + 1.243 * (1.0 - s) ** 3)
    if n_cracks < 1.5:
        return f2 * math.sqrt(0.5 * (2.0 - s))
    return f2


_neuber = ufunc(neuber_masing_stress_range_scalar)
_notch_dj = ufunc(notch_delta_j_scalar)
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


def notch_root_delta_j(a, delta_s, kt, material, u=1.0):
    """ΔJ [kJ/m²] of a short crack of depth ``a`` inside the notch-root field.

    Dowling's small-crack form a(3.2ΔW_e + 5.0ΔW_p) with the local Δσ from
    :func:`neuber_masing` (the plastic strain range follows from the same Masing branch).

    Parameters
    ----------
    a : array_like
        Crack depth from the notch root [mm] > 0.
    delta_s, kt, material
        As in :func:`neuber_masing`.
    u : array_like
        Effective range ratio in [0, 1] (closure), passed to ``small_crack_delta_j``.

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 637 (1977) 97–121.
    .. [2] Topper, Wetzel & Morrow, J. Materials 4 (1969) 200.
    """
    dsig, _ = neuber_masing(kt, delta_s, material)
    return small_crack_delta_j(_finite("a", a, strict=True), dsig, material, _u(u))


def notch_delta_j(a, delta_s, kt, material, notch_depth, u=1.0, long_crack=None):
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
        ΔJ_long(a_eff) [kJ/m²] for the effective length a_eff = a + D [mm].  Default: Dowling's
        small-crack form with the nominal ΔS, a_eff·(3.2ΔW_e + 5.0ΔW_p) — the same crack shape
        as the notch-root term, so the two meet without a jump in shape factor.

    Notes
    -----
    Limits: a → 0 gives the notch-root value; a ≫ D gives the plain long-crack value
    ΔJ_long(a).  The default path is the compiled ``notch_delta_j_scalar``.

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 677 (1979) 247–273 (from memory).
    .. [2] Dowling, N. E., ASTM STP 637 (1977) 97–121.
    """
    c = _cyclic(material)
    a = _finite("a", a, strict=True)
    ds = _finite("ΔS", delta_s)
    kt = _finite("K_t", kt, 1.0)
    d = float(_finite("notch depth", notch_depth))
    u = _u(u)
    if long_crack is None:
        return _notch_dj(
            a, ds, kt, d, material.elastic_modulus, c.strength_coefficient, c.hardening_exponent, u
        )
    root = notch_root_delta_j(a, ds, kt, material, u)
    return np.minimum(root, np.asarray(long_crack(a + d), float))


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
