"""Edge crack of depth a in a semi-infinite plate under remote stress.

K = 1.1215·S·√(πa) (free-surface factor).  The reference stress is the remote stress.

References
----------
.. [1] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook*, 3rd ed.,
   ASME (2000), p. 8.1 (1.1215).
.. [2] Anderson, T. L., *Fracture Mechanics*, 3rd ed., CRC (2005), Table 2.4 limit a/W → 0.
"""

import math

from cycj._jit import jit

CODE = 2
FREE_SURFACE = 1.1215


@jit
def k_over_s(a, p):
    """K/S [√mm] for crack depth ``a`` [mm]."""
    return 1.1215 * math.sqrt(math.pi * a)


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress at plastic collapse [MPa]: the remote stress reaches σ_y."""
    return sigma_y


def size_limits(p):
    return 0.0, math.inf
