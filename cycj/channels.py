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
    the membrane stress range [MPa] and the residual K_s of cycle ``i`` at crack size ``a``."""
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
    return kmax, kmin, lr_max, lr_range, abs(pm1 - pm0), kres


# ------------------------------------------------------------------ building the tables
N_GRID = 400


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
    from cycj.fields.residual import residual_stress_k
    from cycj.fields.weight_functions import edge_crack_plate_k

    geo, ld, spec = case.geometry, case.loading, case.fields
    width = geo.dims["width"]
    a0 = geo.crack_length
    hi = geo.size_limits[1]
    grid = np.linspace(a0, hi, N_GRID)
    channels = spec.channels or (Channel("load", ld.column, 1.0, 1.0,
                                         spec.profile or StressProfile(**UNIFORM)),)
    ct = np.zeros((len(channels) + 1, N_GRID))
    for j, ch in enumerate(channels):
        ct[j] = edge_crack_plate_k(grid, width, ch.profile)
    if spec.residual is not None:
        ct[-1] = residual_stress_k(grid, spec.residual, "edge-crack-plate",
                                   _relaxation(case), width=width)
    k_unit = edge_crack_plate_k(np.array([a0]), width, StressProfile(**UNIFORM))[0]
    values, samples = _channel_values(case, channels)
    values = values * load_scale
    combined = values @ ct[:-1, 0] / k_unit          # equivalent membrane stress at a0 [MPa]
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
    slots = {M.CH_MODE: 1.0, M.CH_N: float(len(channels)), M.CH_A_LO: grid[0],
             M.CH_A_HI: grid[-1], M.CH_THICKNESS: width}
    for j, ch in enumerate(channels):
        pm, pb = ch.profile.linearise()
        slots[M.CH_PM + j], slots[M.CH_PB + j] = pm, pb
    return lmax, lmin, ct, i_peak, slots, samples, float(combined[peak_idx[i_peak]])


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
    alpha = case.geometry.crack_length / case.geometry.dims["width"]
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
