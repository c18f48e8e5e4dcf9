"""Through-wall axial crack of length 2a in a thin-walled cylinder under internal pressure.

K = σ_h·√(πa)·M(λ), λ = a/√(R_m·t), with the Folias bulging factor in Kiefner's two-term form
M = √(1 + 1.255λ² − 0.0135λ⁴) (valid λ² ≤ 50) and σ_h = p·R_i/t, the wall-averaged hoop stress
(exact by equilibrium).  The nominal stress S is σ_h.  Limit: the hoop stress at collapse of
the bulging crack, S_L = σ_y/M (with L_r,max = σ_flow/σ_y this is the flow-stress criterion
σ_h = σ_flow/M).

References
----------
.. [1] Folias, E. S., "An axial crack in a pressurized cylindrical shell", Int. J. Fract. Mech.
   1 (1965) 104–113 (M ≈ √(1 + 1.61λ²) for small λ).
.. [2] Kiefner, J. F., Maxey, W. A., Eiber, R. J., Duffy, A. R., "Failure stress levels of
   flaws in pressurized cylinders", ASTM STP 536 (1973) 461–481 (two-term form; from memory).
"""

import math

from cycj._jit import jit

CODE = 8


@jit
def folias_factor(lam):
    """Folias bulging factor M(λ), Kiefner's form (λ² ≤ 50)."""
    l2 = lam * lam
    return math.sqrt(1.0 + 1.255 * l2 - 0.0135 * l2 * l2)


@jit
def k_over_s(a, p):
    """K/σ_h [√mm]; p[1] = wall thickness t, p[7] = inner radius R_i, a = half-length [mm]."""
    rm = p[7] + 0.5 * p[1]
    return math.sqrt(math.pi * a) * folias_factor(a / math.sqrt(rm * p[1]))


@jit
def limit_stress(a, p, sigma_y):
    """Hoop stress at the limit load [MPa]: σ_y/M."""
    rm = p[7] + 0.5 * p[1]
    return sigma_y / folias_factor(a / math.sqrt(rm * p[1]))


def size_limits(p):
    rm = p[7] + 0.5 * p[1]
    return 0.0, math.sqrt(50.0) * math.sqrt(rm * p[1])
