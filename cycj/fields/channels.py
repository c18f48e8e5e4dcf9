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
from cycj.kernel_slots import (
    CH_A_HI,
    CH_A_LO,
    CH_C_HI,
    CH_C_LO,
    CH_N,
    CH_PB,
    CH_PM,
    CH_SECONDARY,
    CH_SURFACE,
    CH_THICKNESS,
    CH_WIDTH,
    SIGMA_Y,
)


@jit
def plate_reference_stress(pm, pb, alpha):
    """σ_ref [MPa] of an extended surface flaw of relative depth α = a/t in a plate under
    membrane ``pm`` and bending ``pb`` stress [MPa] (BS 7910 Annex P form)."""
    one = (1.0 - alpha) ** 2
    return (abs(pb) + math.sqrt(pb * pb + 9.0 * pm * pm * one)) / (3.0 * one)


@jit
def _axis(x, lo, hi, n):
    """Cell index and fraction of ``x`` on a uniform grid of ``n`` points (clamped)."""
    if n < 2:
        return 0, 0.0
    t = (x - lo) / (hi - lo) * (n - 1)
    if t <= 0.0:
        return 0, 0.0
    if t >= n - 1:
        return n - 2, 1.0
    i = int(t)
    return i, t - i


@jit
def table_cell(a, c, ct, mp):
    """Grid cell and fractions of crack size a (and half-length c) in the K tables."""
    i, f = _axis(a, mp[CH_A_LO], mp[CH_A_HI], ct.shape[1])
    j, g = _axis(c, mp[CH_C_LO], mp[CH_C_HI], ct.shape[2])
    return i, f, j, g


@jit
def table_at(ct, row, i, f, j, g):
    """Row ``row`` of the K tables interpolated in a given cell (bilinear; linear in a when
    the table has one column in c)."""
    if ct.shape[2] < 2:
        if ct.shape[1] < 2:
            return ct[row, 0, 0]
        return ct[row, i, 0] * (1.0 - f) + ct[row, i + 1, 0] * f
    return (ct[row, i, j] * (1.0 - g) + ct[row, i, j + 1] * g) * (1.0 - f) + (
        ct[row, i + 1, j] * (1.0 - g) + ct[row, i + 1, j + 1] * g
    ) * f


@jit
def table_value(ct, row, a, c, mp):
    """K table ``row`` at crack size a (and half-length c for surface cracks)."""
    i, f, j, g = table_cell(a, c, ct, mp)
    return table_at(ct, row, i, f, j, g)


@jit
def channel_k(lmax, lmin, i, a, c, ct, mp, point):
    """K_max, K_min [MPa√mm] (residual included), primary L_r at the peak and over the range,
    the membrane stress range [MPa] and the secondary K_s at the peak (residual stress and
    secondary channels) of cycle ``i`` at crack size ``a``
    (half-length ``c`` for a surface crack) at crack-front ``point`` (0 deepest, 1 surface)."""
    nch = int(mp[CH_N])
    base = point * (nch + 1)
    ia, fa, jc, gc = table_cell(a, c, ct, mp)
    kres = table_at(ct, base + nch, ia, fa, jc, gc)
    kmax = kres
    kmin = kres
    ks1 = kres  # secondary part of K at the peak (residual and secondary channels)
    ks0 = kres
    pm1 = pb1 = pm0 = pb0 = 0.0
    for j in range(nch):
        kj = table_at(ct, base + j, ia, fa, jc, gc)
        v1 = lmax[i, j]
        v0 = lmin[i, j]
        kmax += v1 * kj
        kmin += v0 * kj
        if mp[CH_SECONDARY + j] > 0.5:
            ks1 += v1 * kj
            ks0 += v0 * kj
        else:
            pm1 += v1 * mp[CH_PM + j]
            pb1 += v1 * mp[CH_PB + j]
            pm0 += v0 * mp[CH_PM + j]
            pb0 += v0 * mp[CH_PB + j]
    if kmin > kmax:  # the channels' mix can turn the cycle round at a larger crack
        kmax, kmin = kmin, kmax
        pm1, pm0 = pm0, pm1
        pb1, pb0 = pb0, pb1
        ks1 = ks0
    t = mp[CH_THICKNESS]
    alpha = a / t
    if mp[CH_SURFACE] > 0.5:  # BS 7910 Annex P: α″ of a surface flaw of length 2c
        w = mp[CH_WIDTH]
        alpha = alpha / (1.0 + t / c) if (w <= 0.0 or w >= 2.0 * (c + t)) else 2.0 * a * c / (t * w)
    sy = mp[SIGMA_Y]
    lr_max = plate_reference_stress(pm1, pb1, alpha) / sy
    lr_range = plate_reference_stress(pm1 - pm0, pb1 - pb0, alpha) / sy
    return kmax, kmin, lr_max, lr_range, abs(pm1 - pm0), ks1
