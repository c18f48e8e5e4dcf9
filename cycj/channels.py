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
from cycj.model_params import (
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
    return ((ct[row, i, j] * (1.0 - g) + ct[row, i, j + 1] * g) * (1.0 - f)
            + (ct[row, i + 1, j] * (1.0 - g) + ct[row, i + 1, j + 1] * g) * f)


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
    ks1 = kres          # secondary part of K at the peak (residual and secondary channels)
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
    if mp[CH_SURFACE] > 0.5:   # BS 7910 Annex P: α″ of a surface flaw of length 2c
        w = mp[CH_WIDTH]
        alpha = alpha / (1.0 + t / c) if (w <= 0.0 or w >= 2.0 * (c + t)) else 2.0 * a * c / (
            t * w)
    sy = mp[SIGMA_Y]
    lr_max = plate_reference_stress(pm1, pb1, alpha) / sy
    lr_range = plate_reference_stress(pm1 - pm0, pb1 - pb0, alpha) / sy
    return kmax, kmin, lr_max, lr_range, abs(pm1 - pm0), ks1


# ------------------------------------------------------------------ building the tables
N_GRID = 400
N_GRID_2D = 60


def channel_block(case, load_scale: float, order: str):
    """Cycles of the block for a case with stress fields: (lmax, lmin, ct, i_peak, slots,
    samples, combined peak [MPa]).

    Each channel's K per unit value is tabulated once on a crack-size grid by the weight
    function (the residual stress in the last row); cycles are identified on the combined
    driving force at the initial crack size (as an equivalent membrane stress), and each
    channel's values are taken at every cycle's peak and valley samples.
    """
    import numpy as np

    from cycj import model_params as M
    from cycj.fields.inputs import UNIFORM, Channel
    from cycj.fields.profiles import StressProfile

    ld, spec = case.loading, case.fields
    channels = spec.channels or (Channel("load", ld.column, 1.0, 1.0,
                                         spec.profile or StressProfile(**UNIFORM)),)
    _, ct, slots, k_of = _tables(case, channels)
    k_unit = k_of(StressProfile(**UNIFORM))[0]
    values, samples = _channel_values(case, channels)
    values = values * load_scale
    k0 = np.array([k_of(ch.profile)[0] for ch in channels])
    combined = values @ k0 / k_unit          # equivalent membrane stress at a0 [MPa]
    if ld.constant is not None:
        peak_idx, valley_idx = np.array([0]), np.array([1])
    else:
        from cycj.spectrum import cycle_indices_in_sequence

        peak_idx, valley_idx = cycle_indices_in_sequence(combined, gate=ld.gate, order=order)
        if peak_idx.size == 0:
            from cycj.errors import CycjInputError

            raise CycjInputError("the combined load history has no cycles above the gate",
                                 source=str(ld.history), key="loading.gate", found=ld.gate)
    lmax = np.ascontiguousarray(values[peak_idx])
    lmin = np.ascontiguousarray(values[valley_idx])
    i_peak = int(np.argmax(combined[peak_idx]))
    for j, ch in enumerate(channels):
        pm, pb = ch.profile.linearise()
        slots[M.CH_PM + j], slots[M.CH_PB + j] = pm, pb
        slots[M.CH_SECONDARY + j] = 1.0 if ch.secondary else 0.0
    return lmax, lmin, ct, i_peak, slots, samples, float(combined[peak_idx[i_peak]])


def _tables(case, channels):
    """K per unit channel value (and the residual K) on the crack-size grid: rows × a × c
    (c only for the surface crack, deepest point rows first, then surface point rows)."""
    import numpy as np

    from cycj import model_params as M
    from cycj.fields.residual import residual_stress_k
    from cycj.fields.weight_functions import edge_crack_plate_k, surface_crack_k

    geo, spec = case.geometry, case.fields
    nch = len(channels)
    a0 = geo.crack_length
    if geo.two_d:
        t, w, c0 = geo.dims["thickness"], geo.dims["width"], geo.dims["half_length"]
        ga = np.linspace(a0, 0.8 * t, N_GRID_2D)
        gc = np.linspace(min(c0, a0), 0.25 * w - 1e-9, N_GRID_2D)
        aa, cc = np.meshgrid(ga, gc, indexing="ij")
        cc = np.maximum(cc, aa)                     # a/c ≤ 1: the weight functions' range
        ct = np.zeros((2 * (nch + 1), ga.size, gc.size))
        for p, point in enumerate(("deepest", "surface")):
            base = p * (nch + 1)
            for j, ch in enumerate(channels):
                ct[base + j] = surface_crack_k(aa, cc, t, ch.profile, width=w, point=point)
            if spec.residual is not None:
                ct[base + nch] = residual_stress_k(
                    aa, spec.residual, "surface-crack-plate", _relaxation(case), c=cc,
                    thickness=t, width=w, point=point)
        slots = {M.CH_C_LO: gc[0], M.CH_C_HI: gc[-1], M.CH_SURFACE: 1.0, M.CH_WIDTH: w,
                 M.CH_THICKNESS: t}

        def k_of(profile):
            return surface_crack_k(np.array([a0]), np.array([c0]), t, profile, width=w)
    else:
        w = geo.dims["width"]
        ga = np.linspace(a0, geo.size_limits[1], N_GRID)
        ct = np.zeros((nch + 1, ga.size, 1))
        for j, ch in enumerate(channels):
            ct[j, :, 0] = edge_crack_plate_k(ga, w, ch.profile)
        if spec.residual is not None:
            ct[nch, :, 0] = residual_stress_k(ga, spec.residual, "edge-crack-plate",
                                              _relaxation(case), width=w)
        slots = {M.CH_THICKNESS: w, M.CH_SURFACE: 0.0}

        def k_of(profile):
            return edge_crack_plate_k(np.array([a0]), w, profile)
    slots.update({M.CH_MODE: 1.0, M.CH_N: float(nch), M.CH_A_LO: ga[0], M.CH_A_HI: ga[-1]})
    return ga, np.ascontiguousarray(ct), slots, k_of


def _relaxation(case):
    """Residual-stress relaxation factor: the case's number, or BS 7910's
    min[1, 1.4 − σ_ref/σ_flow] at the initial crack under the first channel's peak."""
    spec = case.fields
    if spec.relaxation != "bs7910":
        return spec.relaxation
    from cycj.fields.residual import bs7910_residual_relaxation

    peak = case.loading.constant[0] if case.loading.constant is not None else None
    if peak is None:
        return 1.0
    geo = case.geometry
    alpha = geo.crack_length / (geo.dims["thickness"] if geo.two_d else geo.dims["width"])
    pm, pb = (spec.profile.linearise() if spec.profile is not None else (1.0, 0.0))
    s_ref = plate_reference_stress(peak * pm, peak * pb, alpha)
    return float(bs7910_residual_relaxation(s_ref, case.material.flow_stress))


def _channel_values(case, channels):
    """Samples × channels array of channel values [MPa] (constant amplitude: 2 samples)."""
    import numpy as np

    ld = case.loading
    if ld.constant is not None:
        return np.array([[ld.constant[0]], [ld.constant[1]]]), 2
    from cycj.spectrum import read_history
    from cycj.units import to_internal

    cols = []
    for ch in channels:
        if case.fields.channels:
            factor, scale = ch.unit_factor, ch.scale
        else:
            factor = 1.0 if ld.unit is None else to_internal(f"1 {ld.unit}", "stress")
            scale = ld.scale
        cols.append(read_history(ld.history, column=ch.column, unit_factor=factor,
                                 scale=scale))
    n = min(c.size for c in cols)
    return np.column_stack([c[:n] for c in cols]), n
