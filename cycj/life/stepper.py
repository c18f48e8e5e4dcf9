"""The compiled cycle stepper and block-growth kernels: numbers only.

Kernels take plain arrays and scalars.  The model parameters travel in one float64 array and
the crack state in another (slots named in :mod:`cycj.kernel_slots`, filled by cycj.life).

Per cycle (S_max, S_min nominal stresses, crack size a, and c for two-dimensional cracks): K/S
  and S_L(a) from the geometry kernels; x = (S_op − S_min)/ΔS from the closure model, U = 1 − x;
  ΔJ_eff by the chosen j_method (elastic, reference stress on the Masing branch, small crack);
  J_max at S_max by the reference stress method on the peak curve; L_r = S_max/S_L(a);
  end criteria checked at the start of the cycle; the sequence model (Wheeler factor on the
  rate, or Willenborg's reduced effective stresses) from the plastic zone of K_eq = √(E'J_max);
  then a += C·ΔJ_eff^m (above threshold), optionally accelerated by 1/(1 − J_max/J_c)^q.
"""

from __future__ import annotations

import functools
import math

from cycj._jit import jit
from cycj.end_criteria import (
    END_LEAK,
    END_MAX_CYCLES,
    END_NO_GROWTH,
    END_SIZE,
    END_TEARING,
    RUNNING,
    end_check_given,
    end_terms,
)
from cycj.fe.lookup import fe_ratio
from cycj.fields.channels import channel_k
from cycj.fields.notch import notch_delta_j_scalar
from cycj.fields.residual import r6_rho_scalar
from cycj.geometry.dispatch import k_over_s, k_over_s_surface, limit_stress
from cycj.growth import opening_fraction_hoisted, paris_rate_from_power
from cycj.jintegral import (
    ELASTIC,
    FINITE_ELEMENT,
    NOTCH,
    REFERENCE_STRESS,
    SMALL_CRACK,
    j_peak_hoisted,
    plastic_fraction_hoisted,
    reference_stress_delta_j_hoisted,
    shape_small_crack_delta_j_scalar,
)
from cycj.kernel_slots import (
    A_CRIT,
    A_LIMIT,
    A_TEAR,
    ALPHA_NEWMAN,
    ASPECT_MAX,
    C_LAW,
    C_LIMIT,
    CH_MODE,
    CLOSURE,
    CRIT_CODE,
    DJ_TH,
    E_MOD,
    E_PRIME,
    FLOW_RATIO,
    INCLUDE_COMP,
    INV_ALPHA,
    INV_N_CYC,
    INV_N_PEAK,
    J_C,
    J_METHOD,
    K_CYC,
    K_PEAK,
    LEAK_SIZE,
    M_LAW,
    N_CYC,
    NEWMAN_C0,
    NEWMAN_C1,
    NOTCH_DEPTH,
    NOTCH_KT,
    NOTCH_OWN_LONG,
    PF_EXP,
    Q_TOUGH,
    SEQ_EXPONENT,
    SEQ_MODEL,
    SEQ_SHUT_OFF,
    SIGMA_Y,
    ST_A,
    ST_A_OL,
    ST_BLOCKS,
    ST_C,
    ST_CYCLES,
    ST_K_OL,
    ST_Z_OL,
    SY_CYC,
    U_CONST,
    ZONE_BETA,
)
from cycj.retardation import WHEELER, plastic_zone_size, wheeler_factor, willenborg_reduction

# record columns
REC_CYCLE, REC_BLOCK, REC_A, REC_DJ, REC_DJ_EQ, REC_JMAX, REC_LR, REC_DADN, REC_C = range(9)
N_REC = 9


@jit(inline="always")
def k_driving_force(
    kmax, kmin, lr_max, lr_range, ds, a, mp, g_long=1.0, l_long=1.0, closure=-1, j_method=-1
):
    """ΔJ_eff, J_max, L_r, J_el at peak [kJ/m²] and the clip flag for one cycle from the
    crack-front point's K_max, K_min [MPa√mm] (secondary stresses included), the primary
    L_r at the peak and over the range, and the nominal stress range ``ds`` [MPa] (the loop of
    the small-crack and notch estimates).

    ``g_long`` = (K/S)(a + D)/(K/S)(a) and ``l_long`` = S_L(a)/S_L(a + D) carry the long crack
    of a notch of depth D (:func:`notch_long_factors`; 1 otherwise).  With j_method "notch",
    J_max, J_el and L_r use the K of the estimate that sets ΔJ and the notched section's L_r.
    ``closure``, ``j_method``: the models' codes fixed by the caller (inlined, the other models'
    branches fold away), or −1: read from ``mp``."""
    dk = kmax - kmin
    if kmax <= 0.0 or dk <= 0.0:
        return 0.0, 0.0, 0.0, 0.0, 0
    x, clipped = opening_fraction_hoisted(
        closure if closure >= 0 else int(mp[CLOSURE]),
        kmax,
        kmin,
        lr_max / mp[FLOW_RATIO],
        mp[U_CONST],
        mp[ALPHA_NEWMAN],
        mp[INCLUDE_COMP],
        mp[NEWMAN_C0],
        mp[NEWMAN_C1],
        mp[INV_ALPHA],
    )
    u = 1.0 - x
    dj_el = dk * dk / mp[E_PRIME]
    jm = j_method if j_method >= 0 else int(mp[J_METHOD])
    k_used = kmax
    lr = lr_max
    if jm == REFERENCE_STRESS:
        dj = reference_stress_delta_j_hoisted(
            dj_el,
            lr_range * mp[SIGMA_Y],
            mp[E_MOD],
            mp[K_CYC],
            mp[N_CYC],
            u,
            mp[SY_CYC],
            mp[INV_N_CYC],
            mp[PF_EXP],
        )
    elif jm == SMALL_CRACK:
        dj = shape_small_crack_delta_j_scalar(dk, ds, mp[E_PRIME], mp[K_CYC], mp[N_CYC], u)
    elif jm == NOTCH:
        dj, r = notch_delta_j_scalar(
            dk,
            ds,
            g_long,
            l_long,
            lr_range,
            mp[NOTCH_KT],
            mp[NOTCH_OWN_LONG],
            mp[E_MOD],
            mp[E_PRIME],
            mp[SIGMA_Y],
            mp[K_CYC],
            mp[N_CYC],
            u,
        )
        k_used = kmax * r
        lr = lr_max * l_long
    elif jm == FINITE_ELEMENT:  # the J table's ΔJ/ΔJ_el; closure as for the reference stress
        g = fe_ratio(mp, a, lr_range, 0)
        dj = dj_el * (u * u + plastic_fraction_hoisted(u, mp[N_CYC], mp[PF_EXP]) * (g - 1.0))
    else:
        dj = u * u * dj_el
    j_el_max = k_used * k_used / mp[E_PRIME]
    if jm == ELASTIC:  # the LEFM comparison: J_max = K_max²/E'
        jmax = j_el_max
    elif jm == FINITE_ELEMENT:
        jmax = j_el_max * fe_ratio(mp, a, lr_max, 1)
    else:
        jmax = j_peak_hoisted(j_el_max, lr, mp[SIGMA_Y], mp[E_MOD], mp[K_PEAK], mp[INV_N_PEAK])
    return dj, jmax, lr, j_el_max, clipped


@jit
def notch_long_factors(code, a, gp, mp):
    """(K/S)(a + D)/(K/S)(a) and S_L(a)/S_L(a + D) of the long crack at a notch of depth D
    (j_method "notch" on a shape that does not hold the notch itself); (1, 1) otherwise."""
    if int(mp[J_METHOD]) != NOTCH or mp[NOTCH_OWN_LONG] > 0.5 or mp[NOTCH_DEPTH] <= 0.0:
        return 1.0, 1.0
    a2 = a + mp[NOTCH_DEPTH]
    g = k_over_s(code, a2, gp) / k_over_s(code, a, gp)
    sy = mp[SIGMA_Y]
    return g, limit_stress(code, a, gp, sy) / limit_stress(code, a2, gp, sy)


@jit
def cycle_k(lmax, lmin, i, a, c, code, gp, ct, mp):
    """K_max, K_min [MPa√mm], primary L_r at the peak and over the range, the nominal stress
    range [MPa] and the secondary (residual) K_s of cycle ``i`` at crack size ``a`` [mm]
    (deepest point).

    One channel (``lmax[:, 0]`` nominal stresses) with the shape's own K solution, or several
    channels (and a residual stress) from the tables ``ct`` (:mod:`cycj.fields.channels`)."""
    if mp[CH_MODE] > 0.5:
        return channel_k(lmax, lmin, i, a, c, ct, mp, 0)
    kos = k_over_s(code, a, gp)
    sl = limit_stress(code, a, gp, mp[SIGMA_Y])
    s1 = lmax[i, 0]
    s0 = lmin[i, 0]
    return s1 * kos, s0 * kos, s1 / sl, (s1 - s0) / sl, s1 - s0, 0.0


@jit
def cycle_driving_force(lmax, lmin, i, a, code, gp, ct, mp):
    """:func:`k_driving_force` of cycle ``i`` at crack size ``a`` [mm], and the plasticity
    interaction ρ of a secondary stress for the FAD."""
    kmax, kmin, lr_max, lr_range, ds, kres = cycle_k(lmax, lmin, i, a, gp[5], code, gp, ct, mp)
    gl, ll = notch_long_factors(code, a, gp, mp)
    dj, jmax, lr, jel, clipped = k_driving_force(kmax, kmin, lr_max, lr_range, ds, a, mp, gl, ll)
    return dj, jmax, lr, jel, clipped, r6_rho_scalar(kres, kmax - kres, lr)


@jit
def cycle_rate(dj, jmax, mp):
    """da/dN [mm/cycle] for ΔJ_eff and J_max, with the optional toughness acceleration."""
    return rate_from_power(dj, dj ** mp[M_LAW] if dj > 0.0 else 0.0, jmax, mp)


@jit(inline="always")
def rate_from_power(dj, djm, jmax, mp):
    """:func:`cycle_rate` given ΔJ^m already computed (the stepper needs it for ΔJ_eq too)."""
    return rate_given(dj, djm, jmax, mp[C_LAW], mp[DJ_TH], mp[Q_TOUGH], mp[J_C])


@jit(inline="always")
def rate_given(dj, djm, jmax, c, threshold, q, j_c):
    """:func:`rate_from_power` given the law's C, ΔJ_th, q and J_c (the stepper reads them
    once: no model array in its inner loop)."""
    da = paris_rate_from_power(dj, djm, c, threshold)
    if q > 0.0 and da > 0.0:
        ratio = jmax / j_c
        if ratio < 1.0:
            da = da / (1.0 - ratio) ** q
    return da


@jit
def sequence_step(kmax, kmin, lr_max, lr_range, ds, a, dj, jmax, mp, st, gl=1.0, ll=1.0):
    """Apply the sequence model to one cycle; returns (rate factor, ΔJ_eff) and updates the
    overload state in ``st`` (a_OL, zone size, K_OL)."""
    if kmax <= 0.0:
        return 1.0, dj
    k_eq = math.sqrt(mp[E_PRIME] * jmax)
    r = plastic_zone_size(k_eq, mp[SIGMA_Y], mp[ZONE_BETA])
    factor = 1.0
    if int(mp[SEQ_MODEL]) == WHEELER:
        factor = wheeler_factor(r, a, st[ST_A_OL], st[ST_Z_OL], mp[SEQ_EXPONENT])
    elif st[ST_K_OL] >= mp[SEQ_SHUT_OFF] * k_eq and a < st[ST_A_OL] + st[ST_Z_OL]:
        factor = 0.0
    else:
        k_red = willenborg_reduction(st[ST_K_OL], st[ST_A_OL], st[ST_Z_OL], a, k_eq)
        if k_red > 0.0:
            kmax_e = kmax - k_red
            kmin_e = max(kmin - k_red, 0.0)
            dj = 0.0
            if kmax_e > kmin_e:
                dk = kmax - kmin
                scale = (kmax_e - kmin_e) / dk
                dj = k_driving_force(
                    kmax_e,
                    kmin_e,
                    lr_max * kmax_e / kmax,
                    lr_range * scale,
                    ds * scale,
                    a,
                    mp,
                    gl,
                    ll,
                )[0]
    if a + r >= st[ST_A_OL] + st[ST_Z_OL]:
        st[ST_A_OL] = a
        st[ST_Z_OL] = r
        st[ST_K_OL] = k_eq
    return factor, dj


@functools.cache
def stepper_for(channel_mode=False, two_d=False, sequence=False, closure=-1, j_method=-1):
    """The cycle stepper, specialised at compile time (dead branches removed) for: one load
    channel with the shape's own K solution or load channels with K tables
    (``channel_mode``); a two-dimensional crack (``two_d``); a load-sequence model
    (``sequence``); the closure and j_method codes (−1: read from ``mp``).  Each variant is
    compiled (or loaded from the cache) on first use."""

    @jit
    def run_cycles(lmax, lmin, st, n_blocks, max_cycles, code, gp, ct, mp, rec_da, rec, rec_n, acc):
        """Step cycle by cycle through ``n_blocks`` repetitions of the block (smax, smin).

        Parameters
        ----------
        lmax, lmin : float64 arrays (cycles × channels), the block's cycles in the order they
            act (nominal stress [MPa] for one channel; channel values with load channels)
        st : crack state (a, c, cycles, blocks, overload a_OL, zone, K_OL), updated in place
        max_cycles : stop with END_MAX_CYCLES when the total reaches it
        gp : geometry parameters (a private copy: its half-length slot follows c)
        ct : K tables of the load channels (:mod:`cycj.fields.channels`); unused with one channel
        rec_da : record a row each time the crack has grown by this much [mm]
        rec : float64 array (rows × N_REC) receiving records; rec_n : rows already used
        acc : float64 work array (8) carried between calls: [a, cycle at last record, Σ ΔJ^m
              and n since record, max ΔJ, max J_max, max L_r, clipped count]

        Returns (end code, end value, rows used).  A cycle whose growth would carry the crack
        to or past the first of the tearing size, the critical size (``A_CRIT``), the size
        limit or the leak size ends the run there, on that criterion, with the crack at that
        size (end value NaN: the caller evaluates it there); the crack stays in the K solution.
        """
        n = lmax.shape[0]
        a = st[ST_A]
        c = st[ST_C]
        cyc = st[ST_CYCLES]
        blk = st[ST_BLOCKS]
        m = mp[M_LAW]
        # accumulators kept in registers, written back to ``acc`` at records and at the end
        a_rec, cyc_rec, sum_djm, n_acc = acc[0], acc[1], acc[2], acc[3]
        max_dj, max_jmax, max_lr, n_clipped = acc[4], acc[5], acc[6], acc[7]
        end = RUNNING
        val = 0.0
        # the first size the crack may not pass, and the criterion that ends the run there
        a_stop, stop_code = mp[A_LIMIT], END_SIZE
        if mp[A_CRIT] < a_stop:
            a_stop, stop_code = mp[A_CRIT], int(mp[CRIT_CODE])
        if mp[A_TEAR] <= a_stop:
            a_stop, stop_code = mp[A_TEAR], END_TEARING
        if two_d and mp[LEAK_SIZE] < a_stop:
            a_stop, stop_code = mp[LEAK_SIZE], END_LEAK
        c_stop, c_law, dj_th, q_tough, j_c = mp[C_LIMIT], mp[C_LAW], mp[DJ_TH], mp[Q_TOUGH], mp[J_C]
        notch = int(mp[J_METHOD]) == NOTCH  # else the long-crack factors are 1 (hoisted)
        terms = end_terms(mp)
        for _b in range(n_blocks):
            grew = False
            for i in range(n):
                if two_d:
                    gp[5] = c
                if channel_mode:
                    kmax, kmin, lr_max, lr_range, ds, kres = channel_k(
                        lmax, lmin, i, a, c, ct, mp, 0
                    )
                else:  # cycle_k's shape branch, written out: a shared call costs 3–8 %
                    kos = k_over_s(code, a, gp)
                    sl = limit_stress(code, a, gp, mp[SIGMA_Y])
                    s1 = lmax[i, 0]
                    s0 = lmin[i, 0]
                    kmax, kmin, kres = s1 * kos, s0 * kos, 0.0
                    lr_max, lr_range, ds = s1 / sl, (s1 - s0) / sl, s1 - s0
                gl, ll = notch_long_factors(code, a, gp, mp) if notch else (1.0, 1.0)
                dj, jmax, lr, jel, clipped = k_driving_force(
                    kmax, kmin, lr_max, lr_range, ds, a, mp, gl, ll, closure, j_method
                )
                n_clipped += clipped
                if kmax > 0.0:
                    rho = r6_rho_scalar(kres, kmax - kres, lr) if kres > 0.0 else 0.0
                    end, val = end_check_given(a, jmax, lr, jel, rho, terms)
                    if end == RUNNING and two_d:
                        end, val = _two_d_check(a, c, mp)
                    if end != RUNNING:
                        break
                factor = 1.0
                if sequence:
                    factor, dj = sequence_step(
                        kmax, kmin, lr_max, lr_range, ds, a, dj, jmax, mp, st, gl, ll
                    )
                djm = dj**m if dj > 0.0 else 0.0
                da = rate_given(dj, djm, jmax, c_law, dj_th, q_tough, j_c) * factor
                if two_d:
                    if channel_mode:
                        k1, k0 = channel_k(lmax, lmin, i, a, c, ct, mp, 1)[:2]
                    else:
                        kos_c = k_over_s_surface(code, a, gp)
                        k1, k0 = lmax[i, 0] * kos_c, lmin[i, 0] * kos_c
                    dj_c = k_driving_force(
                        k1, k0, lr_max, lr_range, ds, a, mp, gl, ll, closure, j_method
                    )[0]
                    c += cycle_rate(dj_c, jmax, mp) * factor
                if da > 0.0:
                    grew = True
                if a + da >= a_stop:  # this cycle reaches the end size: end there, on it
                    a = max(a, a_stop)
                    if two_d:
                        c = min(c, c_stop)
                    cyc += 1.0
                    end, val = stop_code, math.nan
                    break
                if two_d and c >= c_stop:
                    c = c_stop
                    a += da
                    cyc += 1.0
                    end, val = END_SIZE, c
                    break
                a += da
                cyc += 1.0
                sum_djm += djm
                n_acc += 1.0
                max_dj = max(max_dj, dj)
                max_jmax = max(max_jmax, jmax)
                max_lr = max(max_lr, lr)
                if a - a_rec >= rec_da and rec_n < rec.shape[0]:
                    rec[rec_n, REC_CYCLE] = cyc
                    rec[rec_n, REC_BLOCK] = blk
                    rec[rec_n, REC_A] = a
                    rec[rec_n, REC_C] = c
                    rec[rec_n, REC_DJ] = max_dj
                    rec[rec_n, REC_DJ_EQ] = (sum_djm / n_acc) ** (1.0 / m)
                    rec[rec_n, REC_JMAX] = max_jmax
                    rec[rec_n, REC_LR] = max_lr
                    rec[rec_n, REC_DADN] = (a - a_rec) / (cyc - cyc_rec)
                    rec_n += 1
                    a_rec, cyc_rec = a, cyc
                    sum_djm = n_acc = max_dj = max_jmax = max_lr = 0.0
                if cyc >= max_cycles:
                    end, val = END_MAX_CYCLES, cyc
                    break
            if end != RUNNING:
                break
            blk += 1.0
            if not grew:
                end, val = END_NO_GROWTH, a
                break
        st[ST_A] = a
        st[ST_C] = c
        st[ST_CYCLES] = cyc
        st[ST_BLOCKS] = blk
        acc[0], acc[1], acc[2], acc[3] = a_rec, cyc_rec, sum_djm, n_acc
        acc[4], acc[5], acc[6], acc[7] = max_dj, max_jmax, max_lr, n_clipped
        return end, val, rec_n

    return run_cycles


#: the stepper for one load channel (nominal stresses, the shape's own K solution), a crack
#: with one dimension and no sequence model
run_cycles = stepper_for(False, False, False)


@jit
def _two_d_check(a, c, mp):
    """Leak when the depth reaches the leak size; size limit when the half-length or the aspect
    ratio leaves the surface-crack solution's range."""
    if a >= mp[LEAK_SIZE]:
        return END_LEAK, a
    if c >= mp[C_LIMIT] or a / c > mp[ASPECT_MAX]:
        return END_SIZE, c
    return RUNNING, 0.0


@jit
def block_growth(lmax, lmin, a, code, gp, ct, mp):
    """Growth over one block with the crack frozen at ``a`` [mm], and the block's ΔJ_eq
    (Σ ΔJ^m / n)^(1/m), max J_max, max L_r and largest ΔJ_eff.  With one channel K/S, S_L and
    the notch factors are evaluated once (same expressions as :func:`cycle_k`, same bits)."""
    n = lmax.shape[0]
    g = s = jmx = lrmx = djmx = 0.0
    m = mp[M_LAW]
    one = mp[CH_MODE] <= 0.5
    kos = k_over_s(code, a, gp) if one else 1.0
    sl = limit_stress(code, a, gp, mp[SIGMA_Y]) if one else 1.0
    gl, ll = notch_long_factors(code, a, gp, mp)
    for i in range(n):
        if one:
            s1 = lmax[i, 0]
            s0 = lmin[i, 0]
            kmax, kmin, lr_max, lr_range, ds = s1 * kos, s0 * kos, s1 / sl, (s1 - s0) / sl, s1 - s0
        else:
            kmax, kmin, lr_max, lr_range, ds = channel_k(lmax, lmin, i, a, gp[5], ct, mp, 0)[:5]
        dj, jmax, lr, jel, clipped = k_driving_force(
            kmax, kmin, lr_max, lr_range, ds, a, mp, gl, ll
        )
        djm = dj**m if dj > 0.0 else 0.0
        g += rate_from_power(dj, djm, jmax, mp)
        s += djm
        jmx = max(jmx, jmax)
        lrmx = max(lrmx, lr)
        djmx = max(djmx, dj)
    return g, (s / n) ** (1.0 / m), jmx, lrmx, djmx


@jit
def block_growth_table(lmax, lmin, a_grid, code, gp, ct, mp, out):
    """Fill ``out[k, 0:5]`` with :func:`block_growth` at every crack size of ``a_grid``."""
    for k in range(a_grid.shape[0]):
        res = block_growth(lmax, lmin, a_grid[k], code, gp, ct, mp)
        for j in range(5):
            out[k, j] = res[j]


@jit
def peak_state(lmax, i_peak, a, code, gp, ct, mp):
    """ΔJ, J_max, L_r, J_el at peak and clip flag under the block's peak cycle ``i_peak``
    loaded from zero (the history's peak load) at crack size ``a`` (the peak row only)."""
    row = lmax[i_peak : i_peak + 1]
    return cycle_driving_force(row, 0.0 * row, 0, a, code, gp, ct, mp)
