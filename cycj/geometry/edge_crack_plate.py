"""Single-edge-cracked tension plate, SE(T), free to rotate (pin loaded), width W.

K = S·√(πa)·F(α), α = a/W, S = P/(B·W), with Tada's form (0.5 % for any α)
F = √[(2W/πa)·tan(πa/2W)]·[0.752 + 2.02α + 0.37(1 − sin(πa/2W))³] / cos(πa/2W).
Limit load on the same EPRI basis as C(T) and SE(B) (pin loaded, free to rotate):
P_L = k·η·c·B_N·σ_y, c = W − a, η = √(1 + (a/c)²) − a/c, k = 1.455 (plane strain) or 1.072
(plane stress).  η·c = W[√(α² + (1−α)²) − α] is the net section's tension–bending
interaction.  Validity used here: 0 < α ≤ 0.9.

References
----------
.. [1] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook* (1973);
   Anderson, *Fracture Mechanics*, 3rd ed. (2005), Table 2.4.
.. [2] Kumar, V., German, M. D., Shih, C. F., "An engineering approach for elastic-plastic
   fracture analysis", EPRI NP-1931 (1981): single-edge-cracked plate in tension,
   P_0 = 1.455·η·c·σ_0 (plane strain), 1.072·η·c·σ_0 (plane stress) (from memory).
"""

import math

from cycj._jit import jit

CODE = 4


@jit
def tada_factor(alpha):
    """F(α) of Tada's SE(T) solution (dimensionless)."""
    x = 0.5 * math.pi * alpha
    lead = math.sqrt(math.tan(x) / x)
    return lead * (0.752 + 2.02 * alpha + 0.37 * (1.0 - math.sin(x)) ** 3) / math.cos(x)


@jit
def k_over_s(a, p):
    """K/S [√mm]; ``p[0]`` width W [mm], ``a`` crack depth [mm]."""
    return math.sqrt(math.pi * a) * tada_factor(a / p[0])


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress P_L/(B·W) at the limit load [MPa]."""
    c = p[0] - a
    r = a / c
    eta = math.sqrt(1.0 + r * r) - r
    k = 1.455 if p[4] > 0.5 else 1.072
    return k * eta * c * sigma_y * p[2] / (p[1] * p[0])


def size_limits(p):
    return 0.0, 0.9 * p[0]
