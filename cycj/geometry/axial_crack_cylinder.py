"""Through-wall axial crack of length 2a in a thin-walled cylinder under internal pressure.

K = σ_h·√(πa)·M(λ), λ = a/√(R_m·t), with the Folias bulging factor in its two-term form
M = √(1 + 1.255λ² − 0.0135λ⁴), which holds to λ² = 25 (z = (2a)²/(2R_m·t) = 2λ² ≤ 50), and the
long-flaw form M = 0.064λ² + 3.3 (z > 50) beyond; σ_h = p·R_i/t, the wall-averaged hoop stress
(exact by equilibrium).  The two forms meet within 0.2 % at λ² = 25 (4.893 and 4.900).
The nominal stress S is σ_h.  Limit: the hoop stress at collapse of the bulging crack,
S_L = σ_y/M (with L_r,max = σ_flow/σ_y this is the flow-stress criterion σ_h = σ_flow/M).

References
----------
.. [1] Folias, E. S., "An axial crack in a pressurized cylindrical shell", Int. J. Fract. Mech.
   1 (1965) 104–113 (M ≈ √(1 + 1.61λ²) for small λ).
.. [2] Kiefner, J. F., Maxey, W. A., Eiber, R. J., Duffy, A. R., "Failure stress levels of
   flaws in pressurized cylinders", ASTM STP 536 (1973) 461–481 (from memory).
.. [3] Kiefner, J. F., Vieth, P. H., "A modified criterion for evaluating the remaining
   strength of corroded pipe", AGA/PRCI PR-3-805 (1989): M = √(1 + 0.6275z − 0.003375z²) for
   z ≤ 50 and M = 0.032z + 3.3 for z > 50, z = L²/(D·t) (from memory).
"""

import math

from cycj._jit import jit

CODE = 8


#: λ² up to which the two-term form holds (z = 2λ² = 50, from memory)
TWO_TERM_LAMBDA2_MAX = 25.0


@jit
def folias_factor(lam):
    """Folias bulging factor M(λ): the two-term form √(1 + 1.255λ² − 0.0135λ⁴) for λ² ≤ 25,
    the long-flaw form 0.064λ² + 3.3 beyond (Kiefner & Vieth 1989, z = 2λ²)."""
    l2 = lam * lam
    if l2 > TWO_TERM_LAMBDA2_MAX:
        return 0.064 * l2 + 3.3
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
