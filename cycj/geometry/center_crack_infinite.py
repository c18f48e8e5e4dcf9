"""Centre crack of length 2a in an infinite plate under remote stress (Griffith–Irwin).

K = S·√(πa), exact.  The reference stress is the remote stress itself (infinite body), so the
limit nominal stress is σ_y.

References
----------
.. [1] Tada, H., Paris, P. C., Irwin, G. R., *The Stress Analysis of Cracks Handbook*, 3rd ed.,
   ASME (2000), p. 5.1.
.. [2] Anderson, T. L., *Fracture Mechanics*, 3rd ed., CRC (2005), Eq. 2.44.
"""

import math

from cycj._jit import jit

CODE = 1


@jit
def k_over_s(a, p):
    """K/S [√mm] for half crack length ``a`` [mm]."""
    return math.sqrt(math.pi * a)


@jit
def limit_stress(a, p, sigma_y):
    """Nominal stress at plastic collapse [MPa]: the remote stress reaches σ_y."""
    return sigma_y


def size_limits(p):
    return 0.0, math.inf
