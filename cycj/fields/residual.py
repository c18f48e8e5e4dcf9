"""Residual and other secondary stresses: K from a residual profile, relaxation, the shift of
K_max, K_min and R in the growth calculation, and the plasticity interaction ρ of the FAD.

Units: stresses in MPa, K in MPa√mm, lengths in mm.

Rules kept here (R6, BS 7910):

* a residual (secondary) stress adds K_s to both K_max and K_min: ΔK is unchanged, R changes;
* it never adds to L_r (L_r is built from primary loads only);
* in the FAD, K_r = K_p/K_mat + K_s/K_mat + ρ, with the plasticity interaction ρ(χ, L_r),
  χ = K_s·L_r/K_p.

References
----------
.. [1] R6 Revision 4, *Assessment of the integrity of structures containing defects*, EDF
   Energy, Section II.6 (secondary stresses, ρ; from memory).
.. [2] BS 7910:2013+A1:2015, §7.3.4 and Annex R (residual stress, its relaxation under load
   and the plasticity interaction factor; from memory).
.. [3] Glinka, G., Shen, G., Eng. Fract. Mech. 40 (1991) 1135 (weight functions, for K_s of a
   through-thickness profile).
"""

from __future__ import annotations

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError

__all__ = [
    "RESIDUAL_SHAPES",
    "bs7910_residual_relaxation",
    "kr_with_secondary",
    "r6_plasticity_interaction",
    "residual_k_shift",
    "residual_stress_k",
]

RESIDUAL_SHAPES = ("edge-crack-plate", "edge-crack-semi-infinite", "surface-crack-plate")


def _finite(name, x, nonneg=False):
    x = np.asarray(x, float)
    if np.any(~np.isfinite(x)) or (nonneg and np.any(x < 0.0)):
        raise ValidityRangeError(f"{name} must be finite{' and ≥ 0' if nonneg else ''}")
    return x


def residual_stress_k(a, residual, shape, relaxation=1.0, **dimensions):
    """K_s [MPa√mm] of a residual stress over the crack plane, by the Glinka–Shen weight function.

    Parameters
    ----------
    a : array_like
        Crack depths [mm] (a grid for tabulation).
    residual : float, StressProfile or callable
        A uniform residual stress [MPa], a profile in x/t, or σ_R(x [mm]).
    shape : {"edge-crack-plate", "edge-crack-semi-infinite", "surface-crack-plate"}
        Crack configuration.
    relaxation : float
        Factor in [0, 1] multiplying the residual stress (e.g. from
        :func:`bs7910_residual_relaxation`, or post-weld heat treatment).
    **dimensions
        ``width`` [mm] for the edge crack in a plate; ``c``, ``thickness``, optional ``width``
        (2b) and ``point`` for the surface crack.

    Returns
    -------
    numpy.ndarray
        K_s [MPa√mm]; a uniform residual stress reproduces the shape's own uniform solution.

    Raises
    ------
    ValueError
        Unknown shape (the message lists the known ones).
    ValidityRangeError
        Relaxation outside [0, 1] or dimensions outside the weight function's range.

    References
    ----------
    .. [1] Glinka & Shen, Eng. Fract. Mech. 40 (1991) 1135; Shen & Glinka, Theor. Appl. Fract.
       Mech. 15 (1991) 237.
    .. [2] BS 7910:2013+A1:2015, §7.3.4 (residual stress as a secondary stress; from memory).
    """
    from cycj.fields import shape_weight_functions as SWF
    from cycj.fields import weight_functions as wf

    rel = float(relaxation)
    if not 0.0 <= rel <= 1.0:
        raise ValidityRangeError("relaxation factor must lie in [0, 1]")
    if isinstance(residual, (int, float, np.number)):
        value = float(_finite("residual stress", residual))

        def stress(x):
            return np.full(np.shape(x), value)
    else:
        stress = residual
    if shape == "edge-crack-plate":
        k = SWF.edge_crack_plate_k(a, dimensions["width"], stress)
    elif shape == "edge-crack-semi-infinite":
        if hasattr(stress, "along"):
            raise ValidityRangeError("a profile in x/t needs a section depth; give σ(x) instead")
        k = SWF.edge_crack_semi_infinite_k(a, stress)
    elif shape == "surface-crack-plate":
        k = SWF.surface_crack_k(
            a,
            dimensions["c"],
            dimensions["thickness"],
            stress,
            dimensions.get("width", 0.0),
            dimensions.get("point", wf.DEEPEST),
        )
    else:
        raise ValueError(
            f"unknown shape {shape!r} for residual stress; expected one of "
            f"{', '.join(RESIDUAL_SHAPES)}"
        )
    return rel * k


def bs7910_residual_relaxation(sigma_ref, sigma_flow):
    """Relaxation factor of a yield-magnitude residual stress under primary load.

    σ_R = min[σ_y, (1.4 − σ_ref/σ_f)·σ_y], returned as the factor min[1, 1.4 − σ_ref/σ_f],
    and 0 where the primary reference stress exceeds 1.4σ_f (fully relaxed).

    Parameters
    ----------
    sigma_ref : array_like
        Primary reference stress σ_ref = L_r·σ_y ≥ 0 [MPa].
    sigma_flow : float
        Flow strength σ_f = (σ_y + σ_u)/2 > 0 [MPa].

    Returns
    -------
    numpy.ndarray
        Factor in [0, 1] that multiplies the residual stress profile.

    Notes
    -----
    Limits: no primary load keeps the full residual stress (factor 1); the factor starts to
    fall at σ_ref = 0.4σ_f and reaches 0 at 1.4σ_f.

    References
    ----------
    .. [1] BS 7910:2013+A1:2015, §7.3.4.2 (relaxation of as-welded residual stress by load;
       from memory).
    """
    s = _finite("σ_ref", sigma_ref, nonneg=True)
    sf = float(sigma_flow)
    if not sf > 0.0:
        raise ValidityRangeError("flow strength must be > 0 MPa")
    return np.clip(1.4 - s / sf, 0.0, 1.0)


def r6_plasticity_interaction(k_s, k_p, lr):
    """Plasticity interaction ρ of primary and secondary stresses (R6 / BS 7910).

    χ = K_s·L_r/K_p;  ρ1 = 0.1χ^0.714 − 0.007χ² + 0.00003χ⁵ for 0 < χ ≤ 4, 0.25 for χ > 4;
    ρ = ρ1 for L_r ≤ 0.8, 4ρ1(1.05 − L_r) for 0.8 < L_r < 1.05, 0 for L_r ≥ 1.05;
    ρ = 0 when K_s ≤ 0 (no secondary stress, or a compressive one, which is not credited).

    Parameters
    ----------
    k_s : array_like
        K of the secondary (residual) stresses [MPa√mm].
    k_p : array_like
        K of the primary stresses > 0 [MPa√mm].
    lr : array_like
        Primary L_r ≥ 0 (secondary stresses never add to it).

    Returns
    -------
    numpy.ndarray
        ρ (dimensionless), added to K_r.

    Notes
    -----
    Continuous in L_r at 0.8 and 1.05 by construction.  The χ⁵ coefficient is 0.00003 (with
    0.003 ρ1 would exceed 3 at χ = 4); the recalled cap ρ1 = 0.25 beyond χ = 4 is not
    continuous with the polynomial (0.188 at χ = 4).  Both from memory.

    References
    ----------
    .. [1] R6 Revision 4, Section II.6, ρ for the simplified procedure (from memory).
    .. [2] BS 7910:2013+A1:2015, Annex R (from memory).
    """
    ks = _finite("K_s", k_s)
    kp = _finite("K_p", k_p)
    lr = _finite("L_r", lr, nonneg=True)
    if np.any(kp <= 0.0):
        raise ValidityRangeError("K_p must be > 0 MPa√mm to form χ = K_s·L_r/K_p")
    return _rho(ks, kp, lr)


@jit
def r6_rho_scalar(k_s, k_p, lr):
    """Compiled scalar source of :func:`r6_plasticity_interaction` (used by the stepper)."""
    if k_s <= 0.0 or k_p <= 0.0:
        return 0.0
    chi = k_s * lr / k_p
    if chi <= 0.0:
        return 0.0
    if chi > 4.0:
        rho1 = 0.25
    else:
        rho1 = 0.1 * chi**0.714 - 0.007 * chi * chi + 0.00003 * chi**5
    if lr <= 0.8:
        return rho1
    if lr < 1.05:
        return 4.0 * rho1 * (1.05 - lr)
    return 0.0


_rho = ufunc(r6_rho_scalar)


def kr_with_secondary(k_p, k_s, k_mat, lr):
    """FAD ordinate with secondary stresses, K_r = K_p/K_mat + K_s/K_mat + ρ.

    Parameters
    ----------
    k_p, k_s : array_like
        Primary and secondary K [MPa√mm] (K_p > 0).
    k_mat : float
        Fracture toughness K_mat > 0 [MPa√mm].
    lr : array_like
        Primary L_r.

    References
    ----------
    .. [1] R6 Revision 4, Section II.6; BS 7910:2013+A1:2015, §7.3.4 (from memory).
    """
    km = float(k_mat)
    if not km > 0.0:
        raise ValidityRangeError("K_mat must be > 0 MPa√mm")
    rho = r6_plasticity_interaction(k_s, k_p, lr)
    return np.asarray(k_p, float) / km + np.asarray(k_s, float) / km + rho


def residual_k_shift(k_max, k_min, k_residual):
    """K_max, K_min and R with a residual stress: both K's shift by K_res, ΔK does not.

    Parameters
    ----------
    k_max, k_min : array_like
        K at the peak and valley of the applied cycle [MPa√mm].
    k_residual : array_like
        K of the residual stress (after relaxation) [MPa√mm].

    Returns
    -------
    tuple of numpy.ndarray
        (K_max + K_res, K_min + K_res, R); R = K_min'/K_max' where K_max' > 0, else NaN (the
        crack stays closed at the peak: no growth in a closure model).

    Notes
    -----
    The residual stress never enters L_r (R6, BS 7910): use the primary L_r unchanged.

    References
    ----------
    .. [1] BS 7910:2013+A1:2015, §8 (residual stress in fatigue through the R ratio; from
       memory).
    """
    kres = _finite("K_res", k_residual)
    kmax = _finite("K_max", k_max) + kres
    kmin = _finite("K_min", k_min) + kres
    if np.any(kmin > kmax):
        raise ValidityRangeError("K_min must not exceed K_max")
    r = np.divide(kmin, kmax, out=np.full(np.broadcast(kmin, kmax).shape, np.nan), where=kmax > 0.0)
    return kmax, kmin, r
