"""Single-edge-cracked tension plate, SE(T), free to rotate (pin loaded), width W.

K = S·√(πa)·F(α), α = a/W, S = P/(B·W), with Tada's form (0.5 % for any α)
F = √[(2W/πa)·tan(πa/2W)]·[0.752 + 2.02α + 0.37(1 − sin(πa/2W))³] / cos(πa/2W).
Limit load with the tension–bending interaction of the net section (load on the plate's centre
line, eccentricity a/2): P_L = σ_y·B_N·W·[√(α² + (1−α)²) − α] (plane stress), ×2/√3 (plane strain).
Validity used here: 0 < α ≤ 0.9.

References
----------
.. [1] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook* (1973);
   Anderson, *Fracture Mechanics*, 3rd ed. (2005), Table 2.4.
.. [2] Miller, A. G., "Review of limit loads of structures containing defects", Int. J. Pres.
   Ves. & Piping 32 (1988) 197–327 (net-section tension and bending of a rectangular section;
   from memory).
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
    alpha = a / p[0]
    factor = 1.1547005383792517 if p[4] > 0.5 else 1.0
    return factor * sigma_y * (math.sqrt(alpha**2 + (1.0 - alpha) ** 2) - alpha) * p[2] / p[1]


def size_limits(p):
    return 0.0, 0.9 * p[0]
