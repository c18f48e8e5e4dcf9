"""Load channels and stress fields: K of several superposed channels (each with its own
through-section stress profile) plus a residual stress, and the primary reference stress.

Kernels read tabulated K per unit channel value on a uniform crack-size grid (built once per
run from weight functions, :mod:`cycj.fields`) and the membrane/bending parts of each channel's
profile; per cycle they superpose the channels at the cycle's peak and valley samples.

The residual stress shifts K_max and K_min (and so R and closure) but never enters L_r.

References
----------
.. [1] Glinka, G., Shen, G., Eng. Fract. Mech. 40 (1991) 1135 (weight functions; K of an
   arbitrary profile), via :mod:`cycj.fields.weight_functions`.
.. [2] BS 7910:2013+A1:2015, Annex P: reference stress of an extended surface flaw in a plate
   under membrane P_m and bending P_b: σ_ref = [P_b + √(P_b² + 9P_m²(1−α)²)] / [3(1−α)²],
   α = a/t (from memory).
.. [3] R6 Rev. 4, Section II.2 and BS 7910 §7.3: secondary (residual) stresses in K_r only.
"""

from __future__ import annotations

import math

from cycj._jit import jit
from cycj.model_params import CH_A_HI, CH_A_LO, CH_N, CH_PB, CH_PM, CH_THICKNESS, SIGMA_Y


@jit
def plate_reference_stress(pm, pb, alpha):
    """σ_ref [MPa] of an extended surface flaw of relative depth α = a/t in a plate under
    membrane ``pm`` and bending ``pb`` stress [MPa] (BS 7910 Annex P form)."""
    one = (1.0 - alpha) ** 2
    return (abs(pb) + math.sqrt(pb * pb + 9.0 * pm * pm * one)) / (3.0 * one)


@jit
def table_value(ct, row, a, mp):
    """Linear interpolation of row ``row`` of the K table at crack size ``a`` [mm]."""
    lo = mp[CH_A_LO]
    hi = mp[CH_A_HI]
    n = ct.shape[1]
    x = (a - lo) / (hi - lo) * (n - 1)
    if x <= 0.0:
        return ct[row, 0]
    if x >= n - 1:
        return ct[row, n - 1]
    i = int(x)
    f = x - i
    return ct[row, i] * (1.0 - f) + ct[row, i + 1] * f


@jit
def channel_k(lmax, lmin, i, a, ct, mp):
    """K_max, K_min [MPa√mm] (residual included), primary L_r at the peak and over the range,
    and the membrane stress range [MPa] of cycle ``i`` at crack size ``a``."""
    nch = int(mp[CH_N])
    kres = table_value(ct, nch, a, mp)
    kmax = kres
    kmin = kres
    pm1 = pb1 = pm0 = pb0 = 0.0
    for j in range(nch):
        kj = table_value(ct, j, a, mp)
        v1 = lmax[i, j]
        v0 = lmin[i, j]
        kmax += v1 * kj
        kmin += v0 * kj
        pm1 += v1 * mp[CH_PM + j]
        pb1 += v1 * mp[CH_PB + j]
        pm0 += v0 * mp[CH_PM + j]
        pb0 += v0 * mp[CH_PB + j]
    if kmin > kmax:  # the channels' mix can turn the cycle round at a larger crack
        kmax, kmin = kmin, kmax
        pm1, pm0 = pm0, pm1
        pb1, pb0 = pb0, pb1
    alpha = a / mp[CH_THICKNESS]
    sy = mp[SIGMA_Y]
    lr_max = plate_reference_stress(pm1, pb1, alpha) / sy
    lr_range = plate_reference_stress(pm1 - pm0, pb1 - pb0, alpha) / sy
    return kmax, kmin, lr_max, lr_range, abs(pm1 - pm0)
