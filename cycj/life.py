"""Job 1, remaining life: case → cycles to a J-based instability, with the growth curve.

Orchestrates the stages: block of cycles (from the load history) → model parameters → the
compiled stepper (cycle by cycle) or block integration (crack frozen within a block, hand-over
to the stepper for the last blocks) → end criterion, summary and sparse history.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from cycj import kernels as K
from cycj import model_params as M
from cycj.case import Case
from cycj.errors import CycjInputError
from cycj.growth import CLOSURE_CODES
from cycj.instability import END_NAMES, RUNNING, tearing_instability_size
from cycj.jintegral import J_METHODS
from cycj.sequence import SEQUENCE_CODES

#: rows of history aimed at between the initial and the critical crack size
HISTORY_ROWS = 400
#: history.csv columns (c_mm only for two-dimensional cracks)
HISTORY_COLUMNS = ["cycle", "block", "a_mm", "dJ_kJm2", "dJ_eq_kJm2", "Jmax_kJm2", "Lr",
                   "dadN_mm_per_cycle", "c_mm"]
#: cycles handed to one compiled call (progress and Ctrl-C between calls)
CHUNK_CYCLES = 4_000_000


class LifeInterrupted(KeyboardInterrupt):
    """Ctrl-C between chunks: carries where the run got to."""

    def __init__(self, cycles: float, a_mm: float):
        super().__init__(f"stopped by the user after {cycles:.6g} cycles at a = {a_mm:.4g} mm")
        self.cycles, self.a_mm = cycles, a_mm


@dataclass
class BlockLoads:
    """One block of the repeated history as cycles in stepper order.

    ``lmax``, ``lmin``: arrays (cycles × channels): nominal stresses [MPa] for one channel, or
    the channels' values at each cycle's peak and valley; ``ct``: the channels' K tables (a
    dummy for one channel); ``i_peak``: the cycle carrying the history's peak load.
    """

    lmax: np.ndarray
    lmin: np.ndarray
    order: str
    hours_per_block: float | None = None
    samples: int = 0
    ct: np.ndarray = field(default_factory=lambda: np.zeros((1, 2, 1)))
    i_peak: int = 0
    channel_slots: dict = field(default_factory=dict)
    peak_equivalent: float | None = None   # with load channels: combined peak as membrane MPa

    @property
    def n(self) -> int:
        return int(self.lmax.shape[0])

    @property
    def smax(self) -> np.ndarray:
        return self.lmax[:, 0]

    @property
    def smin(self) -> np.ndarray:
        return self.lmin[:, 0]

    @property
    def peak(self) -> float:
        """Peak nominal stress [MPa] (first channel's value at the peak cycle)."""
        return float(self.lmax[self.i_peak, 0])


@dataclass
class LifeResult:
    """Result of :func:`predict_life`: ``summary`` (dict) and ``history`` (DataFrame)."""

    summary: dict
    history: object
    case: Case
    loads: BlockLoads
    warnings: list = field(default_factory=list)
    references: list = field(default_factory=list)
    model: np.ndarray | None = None     # the kernels' model-parameter array of the run

    def peak_points(self, a_mm, c_mm=None):
        """(L_r, K_r) under the history's peak load at crack sizes ``a_mm`` (half-lengths
        ``c_mm`` for a surface crack), as the end criteria see them: K_r = √(J_el/J_c) + ρ
        (secondary stresses included), L_r primary."""
        geo, loads = self.case.geometry, self.loads
        a_mm = np.asarray(a_mm, float)
        c_mm = np.full(a_mm.shape, geo.params[5]) if c_mm is None else np.asarray(c_mm, float)
        gp = geo.params.copy()
        lr, kr = [], []
        for a, c in zip(a_mm, c_mm, strict=True):
            gp[5] = c
            _, _, l_r, jel, _, rho = K.peak_state(loads.lmax, loads.i_peak, a, geo.code, gp,
                                                  loads.ct, self.model)
            lr.append(l_r)
            kr.append(math.sqrt(jel / self.model[M.J_C]) + rho)
        return np.array(lr), np.array(kr)


# ------------------------------------------------------------------------------- loads
def block_loads(case: Case, load_scale: float = 1.0) -> BlockLoads:
    """The case's repeated block as (S_max, S_min) nominal-stress arrays [MPa].

    Without a sequence model the cycles come in the order they close in a rainflow count of the
    repeated history (ASTM E1049-85); with one, each rising reversal is a cycle in time order,
    so overloads stay where they happened.
    """
    ld = case.loading
    per_force = {"force": case.geometry.nominal_stress_per_force,
                 "pressure": case.geometry.nominal_stress_per_pressure}.get(
        ld.quantity, lambda: 1.0)()
    order = "closing" if ld.sequence == "none" else "reversal"
    if case.fields is not None:
        from cycj.channels import channel_block

        lmax, lmin, ct, i_peak, slots, samples, peak = channel_block(case, load_scale, order)
        return BlockLoads(lmax, lmin, order, ld.duration_h, samples, ct, i_peak, slots, peak)
    if ld.constant is not None:
        smax = np.array([ld.constant[0] * per_force])
        smin = np.array([ld.constant[1] * per_force])
        samples = 2
    else:
        from cycj.spectrum import cycles_in_sequence, read_history
        from cycj.units import to_internal

        kind = "force" if ld.quantity == "force" else "stress"
        unit_factor = 1.0 if ld.unit is None else to_internal(f"1 {ld.unit}", kind)
        values = read_history(ld.history, column=ld.column, unit_factor=unit_factor,
                              scale=ld.scale)
        samples = int(values.size)
        peaks, valleys = cycles_in_sequence(values, gate=ld.gate, order=order)
        if peaks.size == 0:
            raise CycjInputError("the history has no cycles above the gate", source=str(
                ld.history), key="loading.gate", found=ld.gate)
        smax, smin = peaks * per_force, valleys * per_force
    smax, smin = smax * load_scale, smin * load_scale
    if not np.any(smax > 0):
        raise CycjInputError("no cycle reaches a tensile load: the crack cannot grow",
                             source=str(case.path), key="loading")
    return BlockLoads(np.ascontiguousarray(smax[:, None], float),
                      np.ascontiguousarray(smin[:, None], float), order, ld.duration_h,
                      samples, i_peak=int(np.argmax(smax)))


def block_info(case: Case) -> tuple[int, float | None]:
    """Cycles per block and hours per cycle (None when the case gives no duration)."""
    loads = block_loads(case)
    hpc = None if loads.hours_per_block is None else loads.hours_per_block / loads.n
    return loads.n, hpc


# ------------------------------------------------------------------------- parameters
def size_limit(case: Case) -> tuple[float, str]:
    """Largest crack size the run may reach [mm] and why (user limit or validity range)."""
    hi = case.geometry.size_limits[1]
    why = f"validity range of {case.geometry.shape.name} ({case.geometry.shape.validity})"
    lim = case.run.crack_length_limit
    if lim is not None and lim < hi:
        return lim, "crack_length_limit"
    return hi, why


def model_array(case: Case, toughness_scale: float = 1.0,
                loads: BlockLoads | None = None) -> np.ndarray:
    """Fill the compiled kernels' model-parameter array from a case (see cycj.model_params)."""
    mat, geo, law, ld = case.material, case.geometry, case.growth, case.loading
    mp = np.zeros(M.N_MP)
    mp[M.E_MOD] = mat.elastic_modulus
    mp[M.E_PRIME] = mat.effective_modulus(geo.plane_strain)
    mp[M.SIGMA_Y] = mat.yield_strength
    cyc = mat.cyclic_curve
    mp[M.K_CYC], mp[M.N_CYC] = (cyc.strength_coefficient, cyc.hardening_exponent) if cyc else (
        1.0, 0.5)
    peak = mat.peak_curve
    # without any curve J_max is taken elastic: an enormous K makes the plastic term vanish
    mp[M.K_PEAK], mp[M.N_PEAK] = (peak.strength_coefficient, peak.hardening_exponent) if peak \
        else (1e30, 0.5)
    mp[M.FLOW_RATIO] = mat.flow_stress / mat.yield_strength
    mp[M.LR_MAX] = mat.lr_max
    mp[M.J_C] = (mat.J_c or math.inf) * toughness_scale
    mp[M.C_LAW], mp[M.M_LAW], mp[M.DJ_TH] = law.C, law.m, law.threshold
    mp[M.Q_TOUGH] = law.toughness_exponent if mat.J_c else 0.0
    mp[M.J_METHOD] = J_METHODS[case.analysis.j_method]
    mp[M.CLOSURE] = CLOSURE_CODES[ld.closure.model]
    mp[M.U_CONST] = ld.closure.U
    alpha = ld.closure.constraint_factor
    mp[M.ALPHA_NEWMAN] = alpha if alpha is not None else (3.0 if geo.plane_strain else 1.0)
    mp[M.INCLUDE_COMP] = 1.0 if ld.compressive_part == "include" else 0.0
    mp[M.FAD_CURVE] = 2.0 if case.analysis.fad == "option-2" and peak else 1.0
    crit = case.run.criteria
    mp[M.CHECK_TOUGH] = 1.0 if "toughness" in crit else 0.0
    mp[M.CHECK_FAD] = 1.0 if "fad" in crit else 0.0
    mp[M.CHECK_COLLAPSE] = 1.0 if "collapse" in crit else 0.0
    mp[M.A_LIMIT] = size_limit(case)[0]
    mp[M.A_TEAR] = math.inf
    seq = SEQUENCE_CODES[ld.sequence]
    mp[M.SEQ_MODEL] = seq
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
        mp[M.LEAK_SIZE] = geo.size_limits[1]      # a/t = 0.8: end of the K solution → leak
        mp[M.ASPECT_MAX] = 1.0 if geo.params[GP.BENDING_RATIO] else 2.0
        mp[M.C_LIMIT] = 0.25 * geo.params[GP.WIDTH]
        lim = case.run.crack_length_limit
        mp[M.A_LIMIT] = lim if lim is not None and lim < mp[M.LEAK_SIZE] else math.inf
    if loads is not None and loads.channel_slots:
        _channel_params(case, loads, mp)
        if geo.two_d:
            mp[M.ASPECT_MAX] = 1.0   # the surface-crack weight functions hold for a/c ≤ 1
    if "tearing" in crit and loads is not None:
        rc = mat.resistance_curve
        a_from = geo.size_limits[0] if geo.size_limits[0] > 0 else 1e-6
        mp[M.A_TEAR] = tearing_instability_size(geo, loads, a_from, mp[M.A_LIMIT],
                                                rc.C1 * toughness_scale, rc.C2, mp)
    return mp


def _channel_params(case, loads, mp):
    """Channel slots of the model array (filled in with load channels)."""
    for key, val in loads.channel_slots.items():
        mp[key] = val


def critical_crack_length(case: Case, load_scale: float = 1.0, toughness_scale: float = 1.0,
                          loads: BlockLoads | None = None, mp: np.ndarray | None = None):
    """Smallest crack size [mm] at which an end criterion trips under the history's peak load,
    and the criterion's name."""
    loads = loads or block_loads(case, load_scale)
    if mp is None:
        mp = model_array(case, toughness_scale, loads=loads)
    geo = case.geometry
    lo = geo.size_limits[0] if geo.size_limits[0] > 0 else min(geo.crack_length, 1e-3)
    top = min(mp[M.A_LIMIT], mp[M.LEAK_SIZE])
    grid = np.linspace(lo, top, 2001)
    k, code = K.first_end(loads.lmax, loads.i_peak, grid, geo.code, geo.params, loads.ct, mp)
    if k < 0:
        return float(top), "leak" if top == mp[M.LEAK_SIZE] else "size-limit"
    if k == 0:
        return float(grid[0]), END_NAMES[code]
    a_lo, a_hi = grid[k - 1], grid[k]
    for _ in range(60):
        mid = 0.5 * (a_lo + a_hi)
        kk, c = K.first_end(loads.lmax, loads.i_peak, np.array([mid]), geo.code, geo.params,
                            loads.ct, mp)
        if kk == 0:
            a_hi, code = mid, c
        else:
            a_lo = mid
    return float(a_hi), END_NAMES[code]


# ------------------------------------------------------------------------------ running
def _choose_method(case: Case, loads: BlockLoads, mp, a0, a_crit) -> tuple[str, str]:
    """'cycle' or 'block' and why."""
    requested = case.run.method
    if case.geometry.two_d:
        if requested == "block":
            raise CycjInputError("block mode integrates one crack dimension; a surface crack "
                                 "grows in depth and length", key="run.method", found="block",
                                 expected="'cycle' or 'auto'")
        return "cycle", "a two-dimensional crack needs the cycle stepper"
    if case.loading.sequence != "none":
        if requested == "block":
            raise CycjInputError("block mode freezes the crack within a block and cannot carry "
                                 "a load-sequence model", key="run.method", found="block",
                                 expected="'cycle' or 'auto' with a sequence model")
        return "cycle", "a sequence model needs the cycle stepper"
    if requested != "auto":
        return requested, "requested"
    g0 = K.block_growth(loads.lmax, loads.lmin, a0, case.geometry.code,
                        case.geometry.params, loads.ct, mp)[0]
    if g0 <= 0:
        return "cycle", "no growth in the first block"
    if g0 < 0.002 * (a_crit - a0) and g0 < 1e-3 * a0:
        return "block", "each block grows the crack by less than 0.1 % of its size"
    return "cycle", "a block grows the crack noticeably"


def _grid(a0, a_end, n_cycles):
    """Crack sizes for the block-growth table: fewer points for long blocks."""
    n = int(np.clip(2.0e7 / max(n_cycles, 1), 80, 600))
    return np.linspace(a0, a_end, n)


def _block_phase(case, loads, mp, a0, a_crit, max_cycles):
    """Integrate whole blocks up to two blocks before the end; returns (a, blocks, rows)."""
    from cycj.blockmode import blocks_to_grow, crack_after_blocks

    geo = case.geometry
    grid = _grid(a0, a_crit, loads.n)
    table = np.zeros((grid.size, 5))
    K.block_growth_table(loads.lmax, loads.lmin, grid, geo.code, geo.params, loads.ct, mp,
                         table)
    b = blocks_to_grow(grid, table[:, 0])
    finite = np.isfinite(b)
    b_end = b[finite][-1] if finite.any() else 0.0
    b_end = min(b_end, max_cycles / loads.n)
    k0 = max(math.floor(b_end) - 2, 0)
    a_start = crack_after_blocks(grid, b, k0)
    rows = [(b[k] * loads.n, b[k], grid[k], table[k, 4], table[k, 1], table[k, 2],
             table[k, 3], table[k, 0] / loads.n)
            for k in np.nonzero(finite & (b <= k0))[0]]
    return a_start, float(k0), rows


def _stepper(case, loads, mp, state, max_cycles, rec_da, progress):
    """Run the compiled stepper in chunks from ``state`` until an end criterion."""
    geo = case.geometry
    gp = geo.params.copy()
    rec = np.zeros((HISTORY_ROWS * 3 + 10, K.N_REC))
    acc = np.zeros(8)
    acc[0], acc[1] = state[M.ST_A], state[M.ST_CYCLES]
    chunk = max(1, int(CHUNK_CYCLES // loads.n))
    stepper = K.stepper_for(bool(loads.channel_slots), geo.two_d,
                            case.loading.sequence != "none")
    rec_n = 0
    rows = []
    try:
        while True:
            end, val, rec_n = stepper(loads.lmax, loads.lmin, state, chunk, max_cycles,
                                      geo.code, gp, loads.ct, mp, rec_da, rec, rec_n, acc)
            if rec_n > rec.shape[0] - 5:  # flush and keep recording
                rows.extend(map(tuple, rec[:rec_n]))
                rec_n = 0
            if progress is not None:
                progress(state[M.ST_CYCLES], state[M.ST_A])
            if end != RUNNING:
                break
    except KeyboardInterrupt:
        raise LifeInterrupted(state[M.ST_CYCLES], state[M.ST_A]) from None
    rows.extend(map(tuple, rec[:rec_n]))
    return end, val, rows, acc[7]


def predict_life(case: Case, method: str | None = None, progress=None, load_scale: float = 1.0,
                 a_start_mm: float | None = None, history_rows: int = HISTORY_ROWS
                 ) -> LifeResult:
    """Cycles until the first end criterion, with the sparse growth history.

    Parameters
    ----------
    case : Case (from :func:`cycj.load_case`)
    method : "auto" | "cycle" | "block" (default: the case's ``run.method``)
    progress : optional callable(cycles, a_mm) called between compiled chunks
    load_scale : factor on every load of the history (for what-if and planning)
    a_start_mm : initial crack size (default: the case's crack)

    Returns
    -------
    LifeResult with ``summary`` (dict, DESIGN.md contract) and ``history`` (DataFrame with
    ``cycle, block, a_mm, dJ_kJm2, dJ_eq_kJm2, Jmax_kJm2, Lr, dadN_mm_per_cycle``).
    """
    import pandas as pd

    from cycj._version import __version__

    if method is not None:
        from dataclasses import replace

        case = replace(case, run=replace(case.run, method=method))
    loads = block_loads(case, load_scale)
    mp = model_array(case, loads=loads)
    geo = case.geometry
    a0 = geo.crack_length if a_start_mm is None else float(a_start_mm)
    geo.check_crack(a0, "initial crack")
    a_crit, crit_reason = critical_crack_length(case, loads=loads, mp=mp)
    warnings = _input_warnings(case, loads, mp, a0, a_crit)
    used, why = _choose_method(case, loads, mp, a0, max(a_crit, a0 * 1.0001))
    max_cycles = float(case.run.max_cycles)
    rec_da = max((a_crit - a0) / history_rows, 1e-9)
    rows = []
    state = np.zeros(M.N_STATE)
    state[M.ST_A] = a0
    state[M.ST_C] = geo.dims.get("half_length", 0.0)
    if used == "block" and a_crit > a0:
        state[M.ST_A], state[M.ST_BLOCKS], rows = _block_phase(case, loads, mp, a0, a_crit,
                                                               max_cycles)
        state[M.ST_CYCLES] = state[M.ST_BLOCKS] * loads.n
        rows = [(*r, state[M.ST_C]) for r in rows]
    end, val, step_rows, clipped = _stepper(case, loads, mp, state, max_cycles, rec_da,
                                            progress)
    a_end, cycles, blocks = state[M.ST_A], state[M.ST_CYCLES], state[M.ST_BLOCKS]
    if clipped:
        warnings.append(f"closure model range: R or S_max/σ_flow was clipped in {clipped:.3g} "
                        "cycles (Elber −0.1 ≤ R ≤ 0.7; Newman R ≥ −1, S_max/σ_0 ≤ 0.8)")
    first = (0.0, 0.0, a0, *_peak_row(case, loads, mp, a0), geo.dims.get("half_length", 0.0))
    last = (cycles, blocks, a_end, *_peak_row(case, loads, mp, a_end), state[M.ST_C])
    hist = pd.DataFrame([first, *rows, *step_rows, last], columns=HISTORY_COLUMNS)
    if not mp[M.TWO_D]:
        hist = hist.drop(columns="c_mm")
    hist = hist.drop_duplicates(subset=["cycle", "a_mm"]).sort_values("cycle",
                                                                       kind="stable")
    hist = hist.reset_index(drop=True)
    reason = END_NAMES[end]
    summary = {
        "title": case.title,
        "cycles_to_end": float(cycles),
        "end_reason": reason,
        "end_values": _end_values(case, loads, mp, reason, val, a_end, cycles),
        "a_initial_mm": a0,
        "a_end_mm": float(a_end),
        "critical_crack_length_mm": a_crit,
        "critical_crack_criterion": crit_reason,
        "cycles_per_block": loads.n,
        "blocks_to_end": float(cycles / loads.n),
        "method": used,
        "method_reason": why,
        "j_method": case.analysis.j_method,
        "cycle_order": loads.order,
        "peak_nominal_stress_MPa": loads.peak if loads.peak_equivalent is None
        else loads.peak_equivalent,
        "load_scale": load_scale,
        "version": __version__,
        "warnings": warnings,
    }
    if loads.hours_per_block is not None:
        summary["hours_to_end"] = float(cycles / loads.n * loads.hours_per_block)
    refs = references_for(case)
    summary["references"] = refs
    summary["inputs"] = case.resolved()
    result = LifeResult(summary, hist, case, loads, warnings, refs, mp)
    if reason == "leak" and case.run.after_leak == "through-crack":
        return continue_as_through_crack(result, progress)
    return result


def continue_as_through_crack(leaked: LifeResult, progress=None) -> LifeResult:
    """After a surface crack leaks, go on with a through crack of the same surface length 2c in
    the plate (a middle-cracked plate of the same width and thickness; membrane load only, the
    bending part is dropped with a warning), until the first end criterion.

    The history continues: cycles and blocks add up, ``a_mm`` of the through phase is the
    half-length and ``c_mm`` equals it.

    References
    ----------
    .. [1] BS 7910:2013+A1:2015 §8 (re-characterising a surface flaw that breaks through as a
       through-thickness flaw of the same length; from memory).
    """
    from dataclasses import replace

    import pandas as pd

    from cycj.geometry import make_geometry

    case, s1 = leaked.case, leaked.summary
    dims = case.geometry.dims
    c_end = float(leaked.history["c_mm"].iloc[-1])
    warnings = list(leaked.warnings)
    if dims.get("bending_ratio"):
        warnings.append("through-crack phase: the bending part of the load is not carried "
                        "(membrane stress only)")
    limit = 0.95 * dims["width"] / 2
    if not c_end < limit:
        s1 = dict(s1, warnings=warnings + ["the leaked crack is already wider than the plate's "
                                           "through-crack solution allows"])
        return replace(leaked, summary=s1, warnings=s1["warnings"])
    geo = make_geometry("center-crack-plate", c_end, width=dims["width"],
                        thickness=dims["thickness"],
                        constraint="plane-strain" if case.geometry.plane_strain else
                        "plane-stress")
    run = replace(case.run, max_cycles=max(case.run.max_cycles - s1["cycles_to_end"], 1.0),
                  crack_length_limit=None, after_leak="stop")
    through = predict_life(replace(case, geometry=geo, run=run, fields=None),
                           progress=progress)
    h2 = through.history.copy()
    h2["cycle"] += s1["cycles_to_end"]
    h2["block"] += s1["blocks_to_end"]
    h2["c_mm"] = h2["a_mm"]
    hist = pd.concat([leaked.history, h2.iloc[1:]], ignore_index=True)
    s2 = dict(through.summary)
    s2.update(cycles_to_end=float(hist["cycle"].iloc[-1]),
              blocks_to_end=float(hist["block"].iloc[-1]),
              a_initial_mm=s1["a_initial_mm"], leak_cycles=s1["cycles_to_end"],
              leak_half_length_mm=c_end, through_crack_end_half_length_mm=s2["a_end_mm"],
              phases=["surface crack to leak", "through crack"],
              warnings=warnings + through.warnings, inputs=s1["inputs"],
              references=s1["references"] + [r for r in through.references
                                             if r not in s1["references"]])
    if "hours_to_end" in s1:
        s2["hours_to_end"] = s1["hours_to_end"] + through.summary.get("hours_to_end", 0.0)
    return LifeResult(s2, hist, case, leaked.loads, s2["warnings"], s2["references"],
                      leaked.model)


def _peak_row(case, loads, mp, a):
    """(largest ΔJ_eff, ΔJ_eq, J_max, L_r, mean da/dN) of the block at crack size a, frozen."""
    g, djeq, jmx, lrmx, djmax = K.block_growth(loads.lmax, loads.lmin, a, case.geometry.code,
                                               case.geometry.params, loads.ct, mp)
    return djmax, djeq, jmx, lrmx, g / loads.n


def _end_values(case, loads, mp, reason, val, a_end, cycles):
    geo = case.geometry
    dj, jmax, lr, jel, _, _ = K.peak_state(loads.lmax, loads.i_peak, a_end, geo.code, geo.params,
                                        loads.ct, mp)
    out = {"a_mm": float(a_end), "cycles": float(cycles),
           "Jmax_at_peak_kJm2": float(jmax), "Lr_at_peak": float(lr)}
    if reason == "toughness":
        out.update(J_max_kJm2=float(val), J_c_kJm2=float(mp[M.J_C]),
                   curve="monotonic" if case.material.monotonic_curve else "cyclic")
    elif reason == "collapse":
        out.update(L_r=float(val), L_r_max=float(mp[M.LR_MAX]))
    elif reason == "fad":
        out.update(K_r=float(val), L_r=float(lr), curve=case.analysis.fad)
    elif reason == "tearing":
        out.update(a_tearing_mm=float(mp[M.A_TEAR]), J_R_curve=dict(
            C1=case.material.resistance_curve.C1, C2=case.material.resistance_curve.C2))
    elif reason == "size-limit":
        out.update(limit_mm=float(mp[M.A_LIMIT]), limit=size_limit(case)[1])
    elif reason == "max-cycles":
        out.update(max_cycles=float(case.run.max_cycles))
    elif reason == "no-growth":
        out.update(dJ_eff_max_kJm2=float(_peak_row(case, loads, mp, a_end)[0]),
                   threshold_kJm2=float(mp[M.DJ_TH]))
    return out


def _input_warnings(case, loads, mp, a0, a_crit):
    geo, mat = case.geometry, case.material
    w = []
    lo, hi = geo.size_limits
    if hi < math.inf and a0 > lo + 0.95 * (hi - lo):
        w.append(f"initial crack {a0:g} mm is near the upper end of the K solution's range")
    dj, jmax, lr, jel, _, _ = K.peak_state(loads.lmax, loads.i_peak, a0, geo.code, geo.params,
                                        loads.ct, mp)
    if lr > 0.8 * mat.lr_max:
        w.append(f"L_r = {lr:.3g} at the first peak: close to plastic collapse "
                 f"(L_r,max = {mat.lr_max:.3g})")
    if a_crit <= a0:
        w.append("the initial crack is already critical under the history's peak load")
    if case.analysis.j_method == "reference-stress" and jel > 0:
        if jmax > 3 * jel:
            w.append("the plastic part of J at peak load is large (J_max > 3·J_el): check "
                     "the cyclic and monotonic curves")
    if loads.channel_slots and case.fields.residual is not None:
        from cycj.channels import table_value

        nch = int(mp[M.CH_N])
        kres = table_value(loads.ct, nch, a0, geo.dims.get("half_length", 0.0), mp)
        kp = np.sqrt(jel * mp[M.E_PRIME]) - kres
        if abs(kres) > abs(kp):
            w.append(f"the residual stress dominates: K_res = {kres / 31.6228:.3g} MPa√m vs "
                     f"K_primary = {kp / 31.6228:.3g} MPa√m at the first peak (R and closure "
                     "are then set by the residual stress; check its magnitude and relaxation)")
    if mat.monotonic_curve is None:
        w.append("J_max at peak load uses the cyclic curve (no monotonic_curve given)")
    return w


def references_for(case: Case) -> list[str]:
    """The published methods a run of this case uses (citation registry)."""
    refs = list(case.geometry.shape.references)
    jm = case.analysis.j_method
    refs.append("Rice, J. Appl. Mech. 35 (1968) 379: J = K²/E'")
    if jm == "reference-stress":
        refs.append("Ainsworth, Eng. Fract. Mech. 19 (1984) 633: reference stress J estimate")
        refs.append("Masing (1926); Morrow, ASTM STP 378 (1965): cyclic (Masing) branch")
    elif jm == "small-crack":
        refs.append("Dowling, ASTM STP 637 (1977) 97: ΔJ for small cracks")
    elif jm == "notch":
        refs.append("Neuber, J. Appl. Mech. 28 (1961) 544; Topper, Wetzel & Morrow, J. "
                    "Materials 4 (1969) 200: notch-root loop on the Masing branch")
        refs.append("Dowling, ASTM STP 677 (1979) 247: crack at a notch (from memory)")
    refs.append("Dowling & Begley, ASTM STP 590 (1976) 82: da/dN = C·ΔJ^m")
    if case.growth.converted_from:
        refs.append("Paris & Erdogan, J. Basic Eng. 85 (1963) 528; ΔJ = ΔK²/E' conversion")
    cl = case.loading.closure.model
    if cl == "elber":
        refs.append("Elber, ASTM STP 486 (1971) 230: U = 0.5 + 0.4R")
    elif cl == "newman":
        refs.append("Newman, Int. J. Fract. 24 (1984) R131: crack-opening function")
    if case.loading.compressive_part == "ignore":
        refs.append("ASTM E647: compressive part of the cycle excluded")
    if case.loading.history is not None:
        refs.append("ASTM E1049-85 (2017): rainflow counting")
    crit = case.run.criteria
    if "fad" in crit or "collapse" in crit:
        refs.append("R6 Rev. 4 / BS 7910:2013+A1:2015: FAD and L_r,max")
    if "tearing" in crit:
        refs.append("Paris, Tada, Zahoor & Ernst, ASTM STP 668 (1979): tearing instability; "
                    "ASTM E1820 J–R curve")
    return refs


def growth_curve(case: Case, a_start_mm: float | None = None, load_scale: float = 1.0):
    """Crack size [mm] vs cycles from ``a_start_mm`` (default: the case's crack) to the end.

    Uses the block method when the case allows it (fast, smooth), else the cycle stepper's
    sparse history.  cycles[0] = 0.
    """
    res = predict_life(case, load_scale=load_scale, a_start_mm=a_start_mm)
    h = res.history
    return h["a_mm"].to_numpy(), h["cycle"].to_numpy()
