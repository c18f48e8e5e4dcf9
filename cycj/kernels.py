"""The compiled cycle stepper and block-growth kernels: numbers only.

Kernels take plain arrays and scalars (no files, no objects).  The model parameters travel in
one float64 array whose slots are named below; :mod:`cycj.life` fills it from a case.

Per cycle (S_max, S_min nominal stresses, crack size a):
  K/S and the limit nominal stress S_L(a) from the geometry kernels;
  x = (S_op − S_min)/ΔS from the closure model, U = 1 − x;
  ΔJ_eff by the chosen j_method (elastic, reference stress on the Masing branch, small crack);
  J_max at S_max by the reference stress method on the peak curve; L_r = S_max/S_L(a);
  end criteria checked at the start of the cycle; then a += C·ΔJ_eff^m (above threshold),
  optionally accelerated by 1/(1 − J_max/J_c)^q.
"""

from __future__ import annotations

from cycj._jit import jit
from cycj.geometry.dispatch import k_over_s, limit_stress
from cycj.growth import opening_fraction, paris_rate
from cycj.instability import (
    END_MAX_CYCLES,
    END_NO_GROWTH,
    RUNNING,
    end_check,
)
from cycj.jintegral import (
    j_peak_scalar,
    reference_stress_delta_j_scalar,
    small_crack_delta_j_scalar,
)
from cycj.model_params import (
    ALPHA_NEWMAN,
    C_LAW,
    CLOSURE,
    DJ_TH,
    E_MOD,
    E_PRIME,
    FLOW_RATIO,
    INCLUDE_COMP,
    J_C,
    J_METHOD,
    K_CYC,
    K_PEAK,
    M_LAW,
    N_CYC,
    N_PEAK,
    Q_TOUGH,
    SIGMA_Y,
    U_CONST,
)

# record columns
REC_CYCLE, REC_BLOCK, REC_A, REC_DJ, REC_DJ_EQ, REC_JMAX, REC_LR, REC_DADN = range(8)
N_REC = 8


@jit
def cycle_driving_force(smax, smin, a, code, gp, mp):
    """ΔJ_eff [kJ/m²], J_max [kJ/m²], L_r (monotonic), J_el at S_max [kJ/m²] and the clip flag
    for one cycle at crack size ``a`` [mm]."""
    kos = k_over_s(code, a, gp)
    sl = limit_stress(code, a, gp, mp[SIGMA_Y])
    ds = smax - smin
    if smax <= 0.0 or ds <= 0.0:
        return 0.0, 0.0, 0.0, 0.0, 0
    x, clipped = opening_fraction(int(mp[CLOSURE]), smax, smin, smax / (sl * mp[FLOW_RATIO]),
                                  mp[U_CONST], mp[ALPHA_NEWMAN], mp[INCLUDE_COMP])
    u = 1.0 - x
    dk = ds * kos
    dj_el = dk * dk / mp[E_PRIME]
    jm = int(mp[J_METHOD])
    if jm == 1:
        dj = reference_stress_delta_j_scalar(dj_el, ds * mp[SIGMA_Y] / sl, mp[E_MOD], mp[K_CYC],
                                             mp[N_CYC], u)
    elif jm == 2:
        dj = small_crack_delta_j_scalar(a, ds, mp[E_MOD], mp[K_CYC], mp[N_CYC], u)
    else:
        dj = u * u * dj_el
    kmax = smax * kos
    j_el_max = kmax * kmax / mp[E_PRIME]
    lr = smax / sl
    jmax = j_peak_scalar(j_el_max, lr, mp[SIGMA_Y], mp[E_MOD], mp[K_PEAK], mp[N_PEAK])
    return dj, jmax, lr, j_el_max, clipped


@jit
def cycle_rate(dj, jmax, mp):
    """da/dN [mm/cycle] for ΔJ_eff and J_max, with the optional toughness acceleration."""
    da = paris_rate(dj, mp[C_LAW], mp[M_LAW], mp[DJ_TH])
    q = mp[Q_TOUGH]
    if q > 0.0 and da > 0.0:
        ratio = jmax / mp[J_C]
        if ratio < 1.0:
            da = da / (1.0 - ratio) ** q
    return da


@jit
def run_cycles(smax, smin, a0, cycles0, block0, n_blocks, max_cycles, code, gp, mp,
               rec_da, rec, rec_n, acc):
    """Step cycle by cycle through ``n_blocks`` repetitions of the block (smax, smin).

    Parameters
    ----------
    smax, smin : float64 arrays, the block's cycles in the order they act [MPa]
    a0 : crack size at the start [mm]; cycles0, block0 : counters at the start
    max_cycles : stop with END_MAX_CYCLES when the total reaches it
    rec_da : record a row each time the crack has grown by this much [mm]
    rec : float64 array (rows × N_REC) receiving records; rec_n : rows already used
    acc : float64 work array (8) carried between calls: [a at last record, cycle at last record,
          Σ ΔJ^m since record, n since record, max ΔJ, max J_max, max L_r, clipped count]

    Returns
    -------
    end code, end value, a, cycles, blocks completed, rows used
    """
    n = smax.shape[0]
    a = a0
    cyc = cycles0
    blk = block0
    m = mp[M_LAW]
    for _b in range(n_blocks):
        grew = False
        for i in range(n):
            dj, jmax, lr, jel, clipped = cycle_driving_force(smax[i], smin[i], a, code, gp, mp)
            acc[7] += clipped
            if smax[i] > 0.0:
                end, val = end_check(a, jmax, lr, jel, mp)
                if end != RUNNING:
                    return end, val, a, cyc, blk, rec_n
            da = cycle_rate(dj, jmax, mp)
            if da > 0.0:
                grew = True
            a += da
            cyc += 1.0
            acc[2] += dj**m
            acc[3] += 1.0
            acc[4] = max(acc[4], dj)
            acc[5] = max(acc[5], jmax)
            acc[6] = max(acc[6], lr)
            if a - acc[0] >= rec_da and rec_n < rec.shape[0]:
                rec_n = _record(rec, rec_n, cyc, blk, a, m, acc)
            if cyc >= max_cycles:
                return END_MAX_CYCLES, cyc, a, cyc, blk, rec_n
        blk += 1.0
        if not grew:
            return END_NO_GROWTH, a, a, cyc, blk, rec_n
    return RUNNING, 0.0, a, cyc, blk, rec_n


@jit
def _record(rec, k, cyc, blk, a, m, acc):
    rec[k, REC_CYCLE] = cyc
    rec[k, REC_BLOCK] = blk
    rec[k, REC_A] = a
    rec[k, REC_DJ] = acc[4]
    rec[k, REC_DJ_EQ] = (acc[2] / acc[3]) ** (1.0 / m) if acc[3] > 0 else 0.0
    rec[k, REC_JMAX] = acc[5]
    rec[k, REC_LR] = acc[6]
    dn = cyc - acc[1]
    rec[k, REC_DADN] = (a - acc[0]) / dn if dn > 0 else 0.0
    acc[0] = a
    acc[1] = cyc
    for j in range(2, 7):
        acc[j] = 0.0
    return k + 1


@jit
def block_growth(smax, smin, a, code, gp, mp):
    """Growth over one block with the crack frozen at ``a`` [mm], and the block's ΔJ_eq
    (Σ ΔJ^m / n)^(1/m), max J_max and max L_r."""
    n = smax.shape[0]
    g = 0.0
    s = 0.0
    jmx = 0.0
    lrmx = 0.0
    m = mp[M_LAW]
    for i in range(n):
        dj, jmax, lr, jel, clipped = cycle_driving_force(smax[i], smin[i], a, code, gp, mp)
        g += cycle_rate(dj, jmax, mp)
        s += dj**m
        jmx = max(jmx, jmax)
        lrmx = max(lrmx, lr)
    return g, (s / n) ** (1.0 / m), jmx, lrmx


@jit
def block_growth_table(smax, smin, a_grid, code, gp, mp, out):
    """Fill ``out[k, 0:4]`` with :func:`block_growth` at every crack size of ``a_grid``."""
    for k in range(a_grid.shape[0]):
        g, djeq, jmx, lrmx = block_growth(smax, smin, a_grid[k], code, gp, mp)
        out[k, 0] = g
        out[k, 1] = djeq
        out[k, 2] = jmx
        out[k, 3] = lrmx


@jit
def first_end(smax_peak, a_grid, code, gp, mp):
    """Index of the first crack size in ``a_grid`` at which an end criterion trips under the
    peak nominal stress ``smax_peak`` (−1 if none), and its end code."""
    for k in range(a_grid.shape[0]):
        dj, jmax, lr, jel, clipped = cycle_driving_force(smax_peak, 0.0, a_grid[k], code, gp,
                                                         mp)
        end, val = end_check(a_grid[k], jmax, lr, jel, mp)
        if end != RUNNING:
            return k, end
    return -1, RUNNING
