"""Model parameters of job 1: the kernels' float array filled from a case.

The slots are named in :mod:`cycj.kernel_slots`; each selectable model is chosen here through
its record (:mod:`cycj.models`), which also registers the model's citation for the run.
"""

from __future__ import annotations

import math

import numpy as np

from cycj import kernel_slots as M
from cycj import models
from cycj.case import Case
from cycj.citations import Citations
from cycj.end_criteria import END_SIZE
from cycj.growth import newman_terms
from cycj.life.loads import BlockLoads


def size_limit(case: Case) -> tuple[float, str]:
    """Largest crack size the run may reach [mm] and why (user limit or validity range)."""
    geo = case.geometry
    hi = geo.size_limits[1]
    why = f"validity range of {geo.shape.name} ({geo.shape.validity})"
    if notch_adds_depth(case):  # the long crack a + D must stay inside the K solution's range
        hi = hi - geo.notch["depth"]
        why += f", less the notch depth {geo.notch['depth']:g} mm"
    lim = case.run.crack_length_limit
    if lim is not None and lim < hi:
        return lim, "crack_length_limit"
    return hi, why


def notch_adds_depth(case: Case) -> bool:
    """True when j_method "notch" adds the notch depth to the crack for the long-crack
    estimate (a notch given on a shape whose K does not hold it)."""
    geo = case.geometry
    return (
        case.analysis.j_method == "notch"
        and geo.notch is not None
        and geo.shape.name != "crack-at-hole"
    )


def choose_models(case: Case, mp: np.ndarray, cited: Citations) -> None:
    """Put the kernel code of every model the case chooses into ``mp`` and cite each model
    as it is chosen (the run's references come from these records only)."""
    geo, ld, crit = case.geometry, case.loading, case.run.criteria
    cited.choose("geometry", geo.shape.name)
    mp[M.J_METHOD] = cited.choose("j_method", case.analysis.j_method)
    cited.choose("growth_law", case.growth.law)
    if case.growth.converted_from:
        cited.cite("delta-k-conversion")
    mp[M.CLOSURE] = cited.choose("closure", ld.closure.model)
    if ld.compressive_part == "ignore":
        cited.cite("compressive-part-excluded")
    mp[M.SEQ_MODEL] = cited.choose("retardation", ld.sequence)
    for name in crit:
        cited.choose("end_criterion", name)
    fad = case.analysis.fad
    if fad == "option-2" and not case.material.peak_curve:
        fad = "option-1"  # Option 2 needs a curve; without one the Option 1 curve is used
    mp[M.FAD_CURVE] = cited.choose("fad", fad) if "fad" in crit else models.code("fad", fad)


#: Newman's α terms computed in Python (the same expressions as the kernels')
_newman_terms = getattr(newman_terms, "py_func", newman_terms)


def model_array(
    case: Case,
    toughness_scale: float = 1.0,
    loads: BlockLoads | None = None,
    cited: Citations | None = None,
) -> np.ndarray:
    """Fill the compiled kernels' model-parameter array from a case (see cycj.kernel_slots);
    the models chosen are cited in ``cited`` (a new, discarded collection when None)."""
    mat, geo, law, ld = case.material, case.geometry, case.growth, case.loading
    mp = np.zeros(M.N_MP)
    choose_models(case, mp, Citations() if cited is None else cited)
    mp[M.E_MOD] = mat.elastic_modulus
    mp[M.E_PRIME] = mat.effective_modulus(geo.plane_strain)
    mp[M.SIGMA_Y] = mat.yield_strength
    cyc = mat.cyclic_curve
    mp[M.K_CYC], mp[M.N_CYC] = (
        (cyc.strength_coefficient, cyc.hardening_exponent) if cyc else (1.0, 0.5)
    )
    mp[M.SY_CYC] = mp[M.K_CYC] * 0.002 ** mp[M.N_CYC]  # hoisted out of the stepper's loop
    mp[M.INV_N_CYC] = 1.0 / mp[M.N_CYC]
    mp[M.PF_EXP] = 1.0 + 1.0 / mp[M.N_CYC]
    peak = mat.peak_curve
    # without any curve J_max is taken elastic: an enormous K makes the plastic term vanish
    mp[M.K_PEAK], mp[M.N_PEAK] = (
        (peak.strength_coefficient, peak.hardening_exponent) if peak else (1e30, 0.5)
    )
    mp[M.INV_N_PEAK] = 1.0 / mp[M.N_PEAK]
    mp[M.FLOW_RATIO] = mat.flow_stress / mat.yield_strength
    mp[M.LR_MAX] = mat.lr_max
    mp[M.J_C] = (mat.J_c or math.inf) * toughness_scale
    mp[M.C_LAW], mp[M.M_LAW], mp[M.DJ_TH] = law.C, law.m, law.threshold
    mp[M.Q_TOUGH] = law.toughness_exponent if mat.J_c else 0.0
    mp[M.U_CONST] = ld.closure.U
    mp[M.ALPHA_NEWMAN] = case.newman_constraint_factor()[0]
    mp[M.NEWMAN_C0], mp[M.NEWMAN_C1], mp[M.INV_ALPHA] = _newman_terms(mp[M.ALPHA_NEWMAN])
    mp[M.INCLUDE_COMP] = 1.0 if ld.compressive_part == "include" else 0.0
    crit = case.run.criteria
    mp[M.CHECK_TOUGH] = 1.0 if "toughness" in crit else 0.0
    mp[M.CHECK_FAD] = 1.0 if "fad" in crit else 0.0
    mp[M.CHECK_COLLAPSE] = 1.0 if "collapse" in crit else 0.0
    mp[M.A_LIMIT] = size_limit(case)[0]
    mp[M.A_TEAR] = math.inf
    mp[M.A_CRIT] = math.inf
    mp[M.CRIT_CODE] = END_SIZE
    opts = ld.sequence_options
    mp[M.SEQ_EXPONENT] = float(opts.get("shaping_exponent", 1.0))
    mp[M.SEQ_SHUT_OFF] = float(opts.get("shut_off_ratio", 3.0))
    mp[M.ZONE_BETA] = float(opts.get("zone_factor", 6.0 if geo.plane_strain else 2.0))
    if geo.notch is not None:
        mp[M.NOTCH_KT], mp[M.NOTCH_DEPTH] = geo.notch["kt"], geo.notch["depth"]
        mp[M.NOTCH_OWN_LONG] = 1.0 if geo.shape.name == "crack-at-hole" else 0.0
    mp[M.TWO_D] = 0.0
    mp[M.LEAK_SIZE] = mp[M.ASPECT_MAX] = mp[M.C_LIMIT] = math.inf
    if geo.two_d:
        from cycj.geometry import _params as GP

        mp[M.TWO_D] = 1.0
        mp[M.LEAK_SIZE] = geo.size_limits[1]  # a/t = 0.8: end of the K solution → leak
        mp[M.ASPECT_MAX] = 1.0 if geo.params[GP.BENDING_RATIO] else 2.0
        mp[M.C_LIMIT] = 0.25 * geo.params[GP.WIDTH]
        lim = case.run.crack_length_limit
        mp[M.A_LIMIT] = lim if lim is not None and lim < mp[M.LEAK_SIZE] else math.inf
    if loads is not None and loads.channel_slots:
        _channel_params(case, loads, mp)
        if geo.two_d:
            mp[M.ASPECT_MAX] = 1.0  # the surface-crack weight functions hold for a/c ≤ 1
    if case.analysis.j_method == "finite-element":
        mp = np.concatenate([mp, fe_table_tail(case, loads)])
    if "tearing" in crit and loads is not None:
        from cycj.life.critical_size import tearing_instability_size

        rc = mat.resistance_curve
        a_from = geo.size_limits[0] if geo.size_limits[0] > 0 else 1e-6
        mp[M.A_TEAR] = tearing_instability_size(
            geo, loads, a_from, mp[M.A_LIMIT], rc.C1 * toughness_scale, rc.C2, mp
        )
    return mp


_FE_TABLES: dict = {}


def fe_table_tail(case: Case, loads: BlockLoads | None) -> np.ndarray:
    """The J table of j_method "finite-element" packed for the kernels: read from
    ``[analysis] j_table`` or computed by finite elements (:func:`cycj.fe.table.compute`);
    refuses a table that does not span the run's crack sizes or its loads' L_r."""
    from cycj.errors import CycjInputError
    from cycj.fe.lookup import pack_table, read_table

    geo, sy = case.geometry, case.material.yield_strength
    if case.analysis.j_table is not None:
        frame = read_table(case.analysis.j_table)
    else:
        from cycj.fe.table import compute

        if id(case) not in _FE_TABLES:  # model_array runs several times a run: solve once
            _FE_TABLES.clear()
            _FE_TABLES[id(case)] = (case, compute(case)[0])
        frame = _FE_TABLES[id(case)][1]
    tail, sizes, lr_top = pack_table(frame, geo, sy, case.analysis.j_table)
    a0, a_end = geo.crack_length, size_limit(case)[0]
    if a0 < sizes[0] * (1 - 1e-9) or a_end > sizes[-1] * (1 + 1e-9):
        raise CycjInputError(
            f"the J table spans a = {sizes[0]:.6g} to {sizes[-1]:.6g} mm; the run needs "
            f"{a0:.6g} to {a_end:.6g} mm (no extrapolation)",
            key="analysis.j_table" if case.analysis.j_table else "fe.crack_lengths",
        )
    if loads is not None and loads.lmax.shape[1] == 1:
        smax = float(np.max(loads.smax))
        srange = float(np.max(loads.smax - loads.smin))
        lr_stop = case.material.lr_max if "collapse" in case.run.criteria else np.inf
        for a, top in zip(sizes, lr_top, strict=True):
            s_l = float(geo.limit_stress(a, sy))
            if smax / s_l >= lr_stop:
                break
            if max(smax, srange) / s_l > top * (1 + 1e-9):
                raise CycjInputError(
                    f"the J table reaches L_r = {top:.4g} at a = {a:.6g} mm; the loads need "
                    f"{max(smax, srange) / s_l:.4g} (no extrapolation)",
                    key="analysis.j_table" if case.analysis.j_table else "fe.loads",
                )
    return tail


def _channel_params(case, loads, mp):
    """Channel slots of the model array (filled in with load channels)."""
    for key, val in loads.channel_slots.items():
        mp[key] = val
