"""One or two through cracks of length a growing from a circular hole of radius R in a wide
plate under remote stress S.

K = S·√(πa)·F(s), s = a/(a + R), with Tada's fit of Bowie's solution for two symmetric cracks,
F2 = ½(3 − s)[1 + 1.243(1 − s)³], and F1 = F2·√((2 − s)/2) for one crack (ratio of the two
long-crack limits).  Limits: F → 3·1.1215 as a → 0 (edge crack in the K_t = 3 field); a ≫ R
tends to a centre crack of half-length a + R (two cracks).  Wide plate: the reference stress is
the remote stress (S_L = σ_y).  With ``j_method = "notch"`` the short crack's ΔJ comes from the
notch-root loop (K_t = 3, notch depth R) by Dowling's (1979) method.

References
----------
.. [1] Bowie, O. L., J. Math. Phys. 35 (1956) 60; Tada, Paris & Irwin, *The Stress Analysis
   of Cracks Handbook* (2000), p. 19.1 (fit; from memory).
.. [2] Dowling, N. E., ASTM STP 677 (1979) 247 (crack at a notch; from memory).
"""

import math

from cycj._jit import jit
from cycj.fields.notch import crack_at_hole_factor_scalar

CODE = 10


@jit
def k_over_s(a, p):
    """K/S [√mm]; p[8] = hole radius R [mm], p[9] = number of cracks."""
    return math.sqrt(math.pi * a) * crack_at_hole_factor_scalar(a, p[8], p[9])


@jit
def limit_stress(a, p, sigma_y):
    """Wide plate: the remote stress reaches σ_y."""
    return sigma_y


def size_limits(p):
    return 0.0, math.inf
