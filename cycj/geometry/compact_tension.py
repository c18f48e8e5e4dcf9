"""Compact tension specimen, C(T); W and a measured from the load line.

K = P/(√(B·B_N)·√W)·f(α), f = (2+α)(0.886 + 4.64α − 13.32α² + 14.72α³ − 5.6α⁴)/(1−α)^1.5,
written here as K/S with S = P/(B·W): K/S = √W·f(α)·√(B/B_N).
Limit load (Kumar, German & Shih 1981): P_L = k·η·b·B_N·σ_y, b = W − a,
η = √[(2a/b)² + 2(2a/b) + 2] − (2a/b + 1), k = 1.455 (plane strain) or 1.072 (plane stress).
Validity: 0.2 ≤ a/W ≤ 0.95 (ASTM E647 requires a/W ≥ 0.2).

References
----------
.. [1] Srawley, J. E., "Wide range stress intensity factor expressions for ASTM E399 standard
   fracture toughness specimens", Int. J. Fract. 12 (1976) 475–476; ASTM E399; ASTM E1820 (B_N).
.. [2] Kumar, V., German, M. D., Shih, C. F., "An engineering approach for elastic-plastic
   fracture analysis", EPRI NP-1931 (1981).
"""

import math

from cycj._jit import jit

CODE = 5


@jit
def srawley_factor(alpha):
    """f(a/W) of the ASTM E399 C(T) expression (dimensionless)."""
    poly = 0.886 + 4.64 * alpha - 13.32 * alpha**2 + 14.72 * alpha**3 - 5.6 * alpha**4
    return (2.0 + alpha) * poly / (1.0 - alpha) ** 1.5


@jit
def k_over_s(a, p):
    """K/S [√mm] with S = P/(B·W)."""
    w = p[0]
    return math.sqrt(w) * srawley_factor(a / w) * math.sqrt(p[1] / p[2])


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress P_L/(B·W) at the limit load [MPa]."""
    w = p[0]
    b = w - a
    r = 2.0 * a / b
    eta = math.sqrt(r * r + 2.0 * r + 2.0) - (r + 1.0)
    k = 1.455 if p[4] > 0.5 else 1.072
    return k * eta * b * p[2] * sigma_y / (p[1] * w)


def size_limits(p):
    return 0.2 * p[0], 0.95 * p[0]
