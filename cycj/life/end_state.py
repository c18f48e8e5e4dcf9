"""The values a life run reports at its end and about its inputs: every criterion tripped with
its value and limit, the end values of the criterion that stopped the run, and the warnings on
the inputs (near the K solution's range, near collapse, residual stress dominating, curves).

Pure functions of the case, the block of loads and the kernels' model array; the peak state
comes from the compiled kernels of :mod:`cycj.life.stepper`.
"""

from __future__ import annotations

import math

import numpy as np

from cycj import kernel_slots as M
from cycj.end_criteria import END_NAMES
from cycj.life import stepper as K
from cycj.life.model import size_limit
from cycj.material import curve_consistency_warnings


def block_pass(case, loads, mp, a):
    """:func:`stepper.block_growth` at crack size ``a``: one pass over the whole block."""
    geo = case.geometry
    return K.block_growth(loads.lmax, loads.lmin, a, geo.code, geo.params, loads.ct, mp)


def row_of(res, loads):
    """(largest ΔJ_eff, ΔJ_eq, J_max, L_r, mean da/dN) from a :func:`block_pass` result."""
    g, djeq, jmx, lrmx, djmax = res
    return djmax, djeq, jmx, lrmx, g / loads.n


def peak_row(case, loads, mp, a):
    """(largest ΔJ_eff, ΔJ_eq, J_max, L_r, mean da/dN) of the block at crack size a, frozen."""
    return row_of(block_pass(case, loads, mp, a), loads)


def peak(case, loads, mp, a):
    """(J_max, L_r, J_el, ρ) under the history's peak load (loaded from zero) at size ``a``."""
    geo = case.geometry
    dj, jmax, lr, jel, _, rho = K.peak_state(
        loads.lmax, loads.i_peak, a, geo.code, geo.params, loads.ct, mp
    )
    return jmax, lr, jel, rho


def criterion_value(case, loads, mp, end, a):
    """Value of end criterion ``end`` under the history's peak load at crack size ``a``:
    J_max (toughness), L_r (collapse), K_r (FAD), else the crack size."""
    jmax, lr, jel, rho = peak(case, loads, mp, a)
    name = END_NAMES[end]
    if name == "toughness":
        return float(jmax)
    if name == "collapse":
        return float(lr)
    if name == "fad":
        return float(math.sqrt(jel / mp[M.J_C]) + rho)
    return float(a)


def tripped(case, loads, mp, reason, val, a):
    """Every criterion tripped at crack size ``a`` under the history's peak load (loaded from
    zero), in priority order; the criterion that stopped the stepper (``reason``, ``val``)
    first if the peak state does not name it."""
    from cycj.end_criteria import PRIORITY, tripped_criteria

    jmax, lr, jel, rho = peak(case, loads, mp, a)
    rows = tripped_criteria(a, jmax, lr, jel, rho, mp)
    if reason in PRIORITY and reason not in [r["criterion"] for r in rows]:
        rows.insert(0, {"criterion": reason, "quantity": "value", "value": float(val)})
    return rows


def end_values(case, loads, mp, reason, val, a_end, cycles, last_pass=None):
    """End values of the run; ``last_pass``: :func:`block_pass` at ``a_end`` if already
    computed (the history's last row)."""
    geo = case.geometry
    dj, jmax, lr, jel, _, _ = K.peak_state(
        loads.lmax, loads.i_peak, a_end, geo.code, geo.params, loads.ct, mp
    )
    out = {
        "a_mm": float(a_end),
        "cycles": float(cycles),
        "Jmax_at_peak_kJm2": float(jmax),
        "Lr_at_peak": float(lr),
    }
    if reason == "toughness":
        out.update(
            J_max_kJm2=float(val),
            J_c_kJm2=float(mp[M.J_C]),
            curve="monotonic" if case.material.monotonic_curve else "cyclic",
        )
    elif reason == "collapse":
        out.update(L_r=float(val), L_r_max=float(mp[M.LR_MAX]))
    elif reason == "fad":
        out.update(K_r=float(val), L_r=float(lr), curve=case.analysis.fad)
    elif reason == "tearing":
        out.update(
            a_tearing_mm=float(mp[M.A_TEAR]),
            J_R_curve=dict(
                C1=case.material.resistance_curve.C1, C2=case.material.resistance_curve.C2
            ),
        )
    elif reason == "size-limit" and mp[M.TWO_D] and not math.isfinite(mp[M.A_LIMIT]):
        c = float(val)  # a surface crack: its half-length or aspect ratio left the range
        if c >= mp[M.C_LIMIT]:
            out.update(c_mm=c, limit_mm=float(mp[M.C_LIMIT]), limit="half-length c ≤ W/4")
        else:
            out.update(c_mm=c, a_over_c=float(a_end) / c, limit=f"a/c ≤ {mp[M.ASPECT_MAX]:g}")
    elif reason == "size-limit":
        out.update(limit_mm=float(mp[M.A_LIMIT]), limit=size_limit(case)[1])
    elif reason == "max-cycles":
        out.update(max_cycles=float(case.run.max_cycles))
    elif reason == "no-growth":
        out.update(
            dJ_eff_max_kJm2=float(
                (row_of(last_pass, loads) if last_pass else peak_row(case, loads, mp, a_end))[0]
            ),
            threshold_kJm2=float(mp[M.DJ_TH]),
        )
    return out


def input_warnings(case, loads, mp, a0, a_crit):
    geo, mat = case.geometry, case.material
    w = []
    lo, hi = geo.size_limits
    if hi < math.inf and a0 > lo + 0.95 * (hi - lo):
        w.append(f"initial crack {a0:g} mm is near the upper end of the K solution's range")
    dj, jmax, lr, jel, _, _ = K.peak_state(
        loads.lmax, loads.i_peak, a0, geo.code, geo.params, loads.ct, mp
    )
    if lr > 0.8 * mat.lr_max:
        w.append(
            f"L_r = {lr:.3g} at the first peak: close to plastic collapse "
            f"(L_r,max = {mat.lr_max:.3g})"
        )
    if a_crit <= a0:
        w.append("the initial crack is already critical under the history's peak load")
    if case.analysis.j_method == "reference-stress" and jel > 0:
        if jmax > 3 * jel:
            w.append(
                "the plastic part of J at peak load is large (J_max > 3·J_el): check "
                "the cyclic and monotonic curves"
            )
    if loads.channel_slots and case.fields.residual is not None:
        from cycj.fields.channels import table_value

        nch = int(mp[M.CH_N])
        kres = table_value(loads.ct, nch, a0, geo.dims.get("half_length", 0.0), mp)
        kp = np.sqrt(jel * mp[M.E_PRIME]) - kres
        if abs(kres) > abs(kp):
            w.append(
                f"the residual stress dominates: K_res = {kres / 31.6228:.3g} MPa√m vs "
                f"K_primary = {kp / 31.6228:.3g} MPa√m at the first peak (R and closure "
                "are then set by the residual stress; check its magnitude and relaxation)"
            )
    if mat.monotonic_curve is None:
        w.append("J_max at peak load uses the cyclic curve (no monotonic_curve given)")
    w.extend(curve_consistency_warnings(mat))
    return w
