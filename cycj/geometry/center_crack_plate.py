"""Middle-cracked tension plate, M(T): centre crack 2a in a plate of full width W.

K = S·√(πa)·[1 − 0.025λ² + 0.06λ⁴]·√sec(πλ/2), λ = 2a/W, S = P/(B·W)  (Tada 1973, 0.1 % for
any λ).  Limit load: net section, P_L = (W − 2a)·B_N·σ_y (plane stress), ×2/√3 (plane strain).
Validity used here: 0 < 2a/W ≤ 0.95 (ASTM E647 range for M(T)).

References
----------
.. [1] Tada, H. (1973) in Tada, Paris, Irwin, *The Stress Analysis of Cracks Handbook*;
   Anderson, *Fracture Mechanics*, 3rd ed. (2005), Table 2.4.
.. [2] Kumar, V., German, M. D., Shih, C. F. (1981), EPRI NP-1931: M(T) limit loads.
"""

import math

from cycj._jit import jit

CODE = 3


@jit
def k_over_s(a, p):
    """K/S [√mm]; ``p[0]`` full width W [mm], ``a`` half crack length [mm]."""
    lam = 2.0 * a / p[0]
    corr = 1.0 - 0.025 * lam**2 + 0.06 * lam**4
    return math.sqrt(math.pi * a) * corr * math.sqrt(1.0 / math.cos(0.5 * math.pi * lam))


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress P_L/(B·W) at the net-section limit load [MPa]."""
    factor = 1.1547005383792517 if p[4] > 0.5 else 1.0
    return factor * sigma_y * (1.0 - 2.0 * a / p[0]) * p[2] / p[1]


def size_limits(p):
    return 0.0, 0.95 * p[0] / 2.0
