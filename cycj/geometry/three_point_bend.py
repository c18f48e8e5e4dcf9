"""Single-edge-notched bend specimen in three-point bending, SE(B), span S = 4W.

K = P·S/(√(B·B_N)·W^1.5)·f(α),
f = 3√α[1.99 − α(1−α)(2.15 − 3.93α + 2.7α²)] / [2(1+2α)(1−α)^1.5]  (S/W = 4),
written here as K/S_nom with S_nom = P/(B·W): K/S_nom = (S/√W)·f(α)·√(B/B_N).
Limit load (Kumar, German & Shih 1981): P_L = k·σ_y·b²·B_N/L, L = S/2, k = 0.728 (plane strain)
or 0.536 (plane stress).  Validity used here: 0.1 ≤ a/W ≤ 0.9, span within 1 % of 4W (the
expression is published for S/W = 4 only).

References
----------
.. [1] Srawley, J. E., Int. J. Fract. 12 (1976) 475–476; ASTM E399; Anderson, *Fracture
   Mechanics*, 3rd ed. (2005), Table 2.4.
.. [2] Kumar, V., German, M. D., Shih, C. F., EPRI NP-1931 (1981).
"""

import math

from cycj._jit import jit

CODE = 6


@jit
def srawley_factor(alpha):
    """f(a/W) of the ASTM E399 SE(B) expression for S/W = 4 (dimensionless)."""
    num = (
        3.0
        * math.sqrt(alpha)
        * (1.99 - alpha * (1.0 - alpha) * (2.15 - 3.93 * alpha + 2.7 * alpha**2))
    )
    return num / (2.0 * (1.0 + 2.0 * alpha) * (1.0 - alpha) ** 1.5)


@jit
def k_over_s(a, p):
    """K/S_nom [√mm] with S_nom = P/(B·W)."""
    w = p[0]
    return p[3] / math.sqrt(w) * srawley_factor(a / w) * math.sqrt(p[1] / p[2])


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress P_L/(B·W) at the limit load [MPa]."""
    w = p[0]
    b = w - a
    k = 0.728 if p[4] > 0.5 else 0.536
    return k * sigma_y * b * b * p[2] / (0.5 * p[3] * p[1] * w)


def size_limits(p):
    return 0.1 * p[0], 0.9 * p[0]
