"""Semi-elliptical surface crack (depth a, half-length c) in a finite plate under membrane
stress S and bending stress β·S (Newman–Raju 1981).

K(φ) = (S + H(φ)·βS)·√(πa/Q)·F(φ), F = [M1 + M2(a/t)² + M3(a/t)⁴]·g·f_φ·f_w, with the
deepest point at φ = 90° (``k_over_s``) and the surface point at φ = 0 (``k_over_s_surface``).
Validity: 0 < a/c ≤ 2 (≤ 1 with bending), a/t < 0.8, c/b < 0.5 (b = W/2).
Limit load: the reference stress of a plate with a surface flaw under membrane and bending
stress, σ_ref = [P_b + √(P_b² + 9P_m²(1 − α″)²)] / [3(1 − α″)²], with α″ = (a/t)/(1 + t/c) for
W ≥ 2(c + t), else α″ = (2a/t)(c/W).  Here S_L = σ_y·P_m/σ_ref.

References
----------
.. [1] Newman, J. C., Jr., Raju, I. S., "An empirical stress-intensity factor equation for the
   surface crack", Eng. Fract. Mech. 15 (1981) 185–192; NASA TM-83200 (1981) (coefficients
   from memory).
.. [2] BS 7910:2013+A1:2015, Annex P: reference stress for surface flaws in plates (from
   memory).
"""

import math

from cycj._jit import jit

CODE = 7


@jit
def newman_raju_factor(a, c, t, b, phi):
    """Boundary-correction factor F(φ) and the shape factor Q (dimensionless)."""
    ac = a / c
    at = a / t
    sp = math.sin(phi)
    cp = math.cos(phi)
    if ac <= 1.0:
        m1 = 1.13 - 0.09 * ac
        m2 = -0.54 + 0.89 / (0.2 + ac)
        m3 = 0.5 - 1.0 / (0.65 + ac) + 14.0 * (1.0 - ac) ** 24
        g = 1.0 + (0.1 + 0.35 * at * at) * (1.0 - sp) ** 2
        fphi = (ac * ac * cp * cp + sp * sp) ** 0.25
        q = 1.0 + 1.464 * ac**1.65
    else:
        ca = c / a
        m1 = math.sqrt(ca) * (1.0 + 0.04 * ca)
        m2 = 0.2 * ca**4
        m3 = -0.11 * ca**4
        g = 1.0 + (0.1 + 0.35 * ca * at * at) * (1.0 - sp) ** 2
        fphi = (ca * ca * sp * sp + cp * cp) ** 0.25
        q = 1.0 + 1.464 * ca**1.65
    fw = 1.0
    if b > 0.0:
        fw = math.sqrt(1.0 / math.cos(0.5 * math.pi * c / b * math.sqrt(at)))
    return (m1 + m2 * at * at + m3 * at**4) * g * fphi * fw, q


@jit
def bending_factor(a, c, t, phi):
    """Newman–Raju bending multiplier H(φ) (a/c ≤ 1)."""
    ac = a / c
    at = a / t
    p = 0.2 + ac + 0.6 * at
    h1 = 1.0 - 0.34 * at - 0.11 * ac * at
    g1 = -1.22 - 0.12 * ac
    g2 = 0.55 - 1.05 * ac**0.75 + 0.47 * ac**1.5
    h2 = 1.0 + g1 * at + g2 * at * at
    return h1 + (h2 - h1) * math.sin(phi) ** p


@jit
def _k_over_s(a, p, phi):
    t = p[1]
    c = p[5]
    beta = p[6]
    f, q = newman_raju_factor(a, c, t, 0.5 * p[0], phi)
    mult = 1.0
    if beta != 0.0:
        mult = 1.0 + beta * bending_factor(a, c, t, phi)
    return mult * math.sqrt(math.pi * a / q) * f


@jit
def k_over_s(a, p):
    """K/S [√mm] at the deepest point (φ = 90°); S = membrane stress."""
    return _k_over_s(a, p, 0.5 * math.pi)


@jit
def k_over_s_surface(a, p):
    """K/S [√mm] at the surface point (φ = 0)."""
    return _k_over_s(a, p, 0.0)


@jit
def limit_stress(a, p, sigma_y):
    """Membrane stress at the limit load [MPa] for the plate's bending ratio β = P_b/P_m."""
    w, t, c, beta = p[0], p[1], p[5], p[6]
    if w <= 0.0 or w >= 2.0 * (c + t):
        alpha = (a / t) / (1.0 + t / c)
    else:
        alpha = (2.0 * a / t) * (c / w)
    one = (1.0 - alpha) ** 2
    return sigma_y * 3.0 * one / (beta + math.sqrt(beta * beta + 9.0 * one))


def size_limits(p):
    return 0.0, 0.8 * p[1]
