"""Crack length from elastic compliance, and compliance from crack length.

C(T): the ASTM E647 polynomial in u = [(E·B_e·V/P)^½ + 1]⁻¹ for the front face (X/W = −0.25)
and the load line (X/W = 0), with the Saxena–Hudak load-line expression for the inverse and a
numerical inverse of the front-face polynomial.  Other shapes and measuring points: the
load-point compliance from the stress intensity solution by Castigliano's theorem (energy
release rate G = K²/E' = (P²/2B_N)·dC/da per crack tip), anchored at the first reading.

Units: P [N], V [mm], compliance [mm/N], E [MPa], B [mm], a [mm].

References
----------
.. [1] ASTM E647, Standard Test Method for Measurement of Fatigue Crack Growth Rates, §A1
   (C(T) compliance coefficients; from memory, docs/references.md R5).
.. [2] Saxena, A., Hudak, S. J., "Review and extension of compliance information for common
   crack growth specimens", Int. J. Fract. 14 (1978) 453–468.
.. [3] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook*, 3rd ed.
   (2000), Part I: compliance from K by Castigliano's theorem, dC/da = 2·B_N·(K/P)²/E' per tip.
.. [4] ASTM E1820, Annex A2: effective thickness B_e = B − (B − B_N)²/B for side grooves.
"""

from __future__ import annotations

import numpy as np

from cycj.errors import ValidityRangeError

#: E647 C(T) coefficients C0..C5 of a/W = Σ C_i u^i, by measuring point (X/W from the load line)
E647_CT_COEFFICIENTS = {
    "front-face": (1.0010, -4.6695, 18.460, -236.82, 1214.9, -2143.6),  # V_0, X/W = −0.25
    "load-line": (1.000196, -4.06319, 11.242, -106.043, 464.335, -650.677),  # V_LL (E1820)
}
#: a/W range of the E647 C(T) compliance expressions
E647_CT_RANGE = (0.2, 0.975)


def effective_thickness(thickness, net_thickness):
    """Effective thickness for compliance, B_e = B − (B − B_N)²/B [mm] (ASTM E1820 A2)."""
    b, bn = float(thickness), float(net_thickness)
    if not (b > 0 and 0 < bn <= b):
        raise ValidityRangeError("need B > 0 and 0 < B_N ≤ B")
    return b - (b - bn) ** 2 / b


def e647_ct_crack_ratio(normalised_compliance, location="load-line"):
    """a/W of a C(T) specimen from E·B_e·V/P (ASTM E647).

    Parameters
    ----------
    normalised_compliance : array_like, E·B_e·V/P (dimensionless), > 0
    location : ``"front-face"`` (X/W = −0.25) or ``"load-line"`` (X/W = 0)

    Returns
    -------
    ndarray, a/W; valid for 0.2 ≤ a/W ≤ 0.975 (values outside are returned; callers check).

    Notes
    -----
    u = [(E·B_e·V/P)^½ + 1]⁻¹,  a/W = C0 + C1u + C2u² + C3u³ + C4u⁴ + C5u⁵.

    References
    ----------
    .. [1] ASTM E647, Annex A1 (coefficients from memory, docs/references.md R5).
    """
    if location not in E647_CT_COEFFICIENTS:
        raise ValueError(
            f"unknown measuring point {location!r}; expected one of "
            + ", ".join(E647_CT_COEFFICIENTS)
        )
    x = np.asarray(normalised_compliance, float)
    with np.errstate(invalid="ignore"):
        u = 1.0 / (np.sqrt(np.where(x > 0, x, np.nan)) + 1.0)
    c = E647_CT_COEFFICIENTS[location]
    return ((((c[5] * u + c[4]) * u + c[3]) * u + c[2]) * u + c[1]) * u + c[0]


def saxena_hudak_load_line(alpha):
    """E·B_e·V_LL/P of a C(T) specimen at a/W = ``alpha`` (0.2 ≤ α ≤ 0.975).

    Notes
    -----
    E·B·V_LL/P = [(1+α)/(1−α)]²·(2.1630 + 12.219α − 20.065α² − 0.9925α³ + 20.609α⁴ − 9.9314α⁵).

    References
    ----------
    .. [1] Saxena & Hudak, Int. J. Fract. 14 (1978) 453 (docs/references.md R5).
    """
    a = _ct_alpha(alpha)
    poly = 2.1630 + a * (12.219 + a * (-20.065 + a * (-0.9925 + a * (20.609 - 9.9314 * a))))
    return ((1 + a) / (1 - a)) ** 2 * poly


def e647_ct_normalised_compliance(alpha, location="load-line"):
    """E·B_e·V/P of a C(T) specimen at a/W = ``alpha``: the inverse of
    :func:`e647_ct_crack_ratio` (Saxena–Hudak for the load line; for the front face, the E647
    polynomial inverted in u by bisection, monotone on 0.2 ≤ α ≤ 0.975).

    References
    ----------
    .. [1] ASTM E647 Annex A1; Saxena & Hudak (1978).
    """
    a = _ct_alpha(alpha)
    if location == "load-line":
        return saxena_hudak_load_line(a)
    if location not in E647_CT_COEFFICIENTS:
        raise ValueError(f"unknown measuring point {location!r}")
    c = E647_CT_COEFFICIENTS[location]
    lo = np.full(np.shape(a), 0.005)  # u small ⇒ a/W near 1
    hi = np.full(np.shape(a), 0.5)  # u large ⇒ a/W small
    for _ in range(60):  # a/W decreases with u on this interval
        mid = 0.5 * (lo + hi)
        f = ((((c[5] * mid + c[4]) * mid + c[3]) * mid + c[2]) * mid + c[1]) * mid + c[0]
        lo = np.where(f > a, mid, lo)
        hi = np.where(f > a, hi, mid)
    u = 0.5 * (lo + hi)
    return (1.0 / u - 1.0) ** 2


def _ct_alpha(alpha):
    a = np.asarray(alpha, float)
    lo, hi = E647_CT_RANGE
    if np.any(~((a >= lo - 1e-9) & (a <= hi + 1e-9))):
        raise ValidityRangeError(f"a/W outside the E647 C(T) compliance range {lo}–{hi}")
    return a


def castigliano_compliance_table(geometry, e_prime, n_points=400, tips=1):
    """Crack-dependent part of the load-point compliance, ΔC(a) = C(a) − C(a_lo) [mm/N].

    Parameters
    ----------
    geometry : cycj.geometry.Geometry with a force-based nominal stress
    e_prime : float [MPa], E (plane stress) or E/(1−ν²)
    n_points : grid size over the geometry's validity range
    tips : crack tips that grow (2 for a centre crack of half-length a)

    Returns
    -------
    (a_grid [mm], dC [mm/N]), increasing.

    Notes
    -----
    G·B_N·da·tips = ½P²·dC  with G = K²/E'  ⇒  dC/da = 2·tips·B_N·(K/P)²/E', integrated by the
    trapezoidal rule.  The uncracked-body and gauge part C(a_lo) is not known from K; callers
    anchor it at a reading of known crack length.

    References
    ----------
    .. [1] Tada, Paris & Irwin, *The Stress Analysis of Cracks Handbook* (2000), Part I
       (compliance from the stress intensity factor, Castigliano's theorem).
    """
    lo, hi = geometry.size_limits
    lo = max(lo, 1e-3 * hi)
    a = np.linspace(lo, hi, n_points)
    k_per_p = geometry.k_over_s(a) * geometry.nominal_stress_per_force()  # [mm^-1.5]
    bn = geometry.dims["net_thickness"]
    slope = 2.0 * tips * bn * k_per_p**2 / e_prime
    dc = np.concatenate([[0.0], np.cumsum(0.5 * (slope[1:] + slope[:-1]) * np.diff(a))])
    return a, dc


def crack_from_table(compliance, a_grid, c_grid):
    """Invert a monotone compliance table: crack length [mm] (NaN outside the table)."""
    c = np.asarray(compliance, float)
    out = np.interp(c, c_grid, a_grid, left=np.nan, right=np.nan)
    return out


#: X/W of each C(T) measuring point from the load line (negative: behind it, away from the
#: crack)
CT_POINT_X_OVER_W = {"front-face": -0.25, "load-line": 0.0}
#: plastic rotational factor of a C(T) specimen: the arms turn as rigid bodies about a point
#: r_p·(W − a) ahead of the crack tip (BS 7448-1 / ISO 12135 C(T) CTOD expression, from memory)
CT_PLASTIC_ROTATION = 0.46


def ct_plastic_displacement_ratio(alpha, location="front-face"):
    """Plastic load-line displacement per unit plastic displacement at ``location`` of a C(T)
    specimen, for a/W = ``alpha`` (dimensionless).

    The plastic part of the displacement comes from the arms turning about a hinge
    r_p·(W − a) ahead of the crack tip, so it scales with the distance from the hinge:
    V_pl,LL / V_pl,X = (a/W + r_p·(1 − a/W)) / (a/W + r_p·(1 − a/W) − X/W), r_p = 0.46.
    The elastic ratio (the E647 compliances) differs: at a/W = 0.5 it is 0.675 against 0.745
    for the plastic one, so scaling a front-face plastic area by the elastic ratio reads ΔJ_pl
    about 9 % low.  Valid for deep cracks, 0.45 ≤ a/W ≤ 0.7 per the CTOD expression (used
    from 0.2 here with that caution).

    References
    ----------
    .. [1] BS 7448-1:1991 and ISO 12135:2002, C(T) CTOD: δ_pl = r_p·(W − a)·V_p /
       (r_p·(W − a) + a + z) with r_p = 0.46 (from memory, docs/references.md R35).
    """
    if location not in CT_POINT_X_OVER_W:
        raise ValueError(
            f"unknown measuring point {location!r}; expected one of " + ", ".join(CT_POINT_X_OVER_W)
        )
    alpha = np.asarray(alpha, float)
    hinge = alpha + CT_PLASTIC_ROTATION * (1.0 - alpha)
    return hinge / (hinge - CT_POINT_X_OVER_W[location])
