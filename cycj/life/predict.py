"""Job 1, remaining life: case → cycles to a J-based instability, with the growth curve.

Orchestrates the stages: block of cycles (from the load history) → model parameters → the
compiled stepper (cycle by cycle) or block integration (crack frozen within a block, hand-over
to the stepper for the last blocks) → end criterion, summary and sparse history.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from cycj import kernel_slots as M
from cycj.case import Case
from cycj.citations import Citations
from cycj.end_criteria import END_NAMES, RUNNING
from cycj.errors import CycjInputError
from cycj.life import end_state as ES
from cycj.life import history as H
from cycj.life import stepper as K
from cycj.life.blockmode import block_phase
from cycj.life.critical_size import critical_crack_length
from cycj.life.loads import BlockLoads, block_loads, cite_loads
from cycj.life.model import model_array
from cycj.life.split import add_split
from cycj.life.validity import valid_range_warning

END_CODES = {name: code for code, name in END_NAMES.items()}

#: rows of history aimed at between the initial and the critical crack size
HISTORY_ROWS = 400
#: history.csv columns (c_mm only for two-dimensional cracks)
HISTORY_COLUMNS = [
    "cycle",
    "block",
    "a_mm",
    "dJ_kJm2",
    "dJ_eq_kJm2",
    "Jmax_kJm2",
    "Lr",
    "dadN_mm_per_cycle",
    "c_mm",
]
#: cycles handed to one compiled call (progress and Ctrl-C between calls)
CHUNK_CYCLES = 4_000_000


class LifeInterrupted(KeyboardInterrupt):
    """Ctrl-C between chunks: carries where the run got to."""

    def __init__(self, cycles: float, a_mm: float):
        super().__init__(f"stopped by the user after {cycles:.6g} cycles at a = {a_mm:.4g} mm")
        self.cycles, self.a_mm = cycles, a_mm


@dataclass
class LifeResult:
    """Result of :func:`predict_life`: ``summary`` (dict) and ``history`` (DataFrame, built on
    first access from ``columns``, the history as ``{name: float64 array}``,
    :mod:`cycj.life.history`)."""

    summary: dict
    columns: dict
    case: Case
    loads: BlockLoads
    warnings: list = field(default_factory=list)
    references: list = field(default_factory=list)
    model: np.ndarray | None = None  # the kernels' model-parameter array of the run

    @cached_property
    def history(self):
        """The sparse history as a pandas DataFrame (one per result, built once)."""
        return H.to_frame(self.columns)

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
            _, _, l_r, jel, _, rho = K.peak_state(
                loads.lmax, loads.i_peak, a, geo.code, gp, loads.ct, self.model
            )
            lr.append(l_r)
            kr.append(math.sqrt(jel / self.model[M.J_C]) + rho)
        return np.array(lr), np.array(kr)


# ------------------------------------------------------------------------------- loads


# ------------------------------------------------------------------------- parameters


# ------------------------------------------------------------------------------ running
def _choose_method(case: Case, loads: BlockLoads, mp, a0, a_crit, first=None) -> tuple[str, str]:
    """'cycle' or 'block' and why.  ``first``: :func:`stepper.block_growth` at ``a0`` (the
    block's first history row), computed once by the caller."""
    requested = case.run.method
    if case.geometry.two_d:
        if requested == "block":
            raise CycjInputError(
                "block mode integrates one crack dimension; a surface crack "
                "grows in depth and length",
                key="run.method",
                found="block",
                expected="'cycle' or 'auto'",
            )
        return "cycle", "a two-dimensional crack needs the cycle stepper"
    if case.loading.sequence != "none":
        if requested == "block":
            raise CycjInputError(
                "block mode freezes the crack within a block and cannot carry "
                "a load-sequence model",
                key="run.method",
                found="block",
                expected="'cycle' or 'auto' with a sequence model",
            )
        return "cycle", "a sequence model needs the cycle stepper"
    if requested != "auto":
        return requested, "requested"
    g0 = first[0]
    if g0 <= 0:
        return "cycle", "no growth in the first block"
    if g0 < 0.002 * (a_crit - a0) and g0 < 1e-3 * a0:
        return "block", "each block grows the crack by less than 0.1 % of its size"
    return "cycle", "a block grows the crack noticeably"


def _block_possible(case: Case) -> bool:
    """Whether block mode may be used (else the first block pass is needed only for the
    history's first row, computed then)."""
    return not case.geometry.two_d and case.loading.sequence == "none"


def _stepper(case, loads, mp, state, max_cycles, rec_da, progress):
    """Run the compiled stepper in chunks from ``state`` until an end criterion."""
    geo = case.geometry
    gp = geo.params.copy()
    rec = np.zeros((HISTORY_ROWS * 3 + 10, K.N_REC))
    acc = np.zeros(8)
    acc[0], acc[1] = state[M.ST_A], state[M.ST_CYCLES]
    chunk = max(1, int(CHUNK_CYCLES // loads.n))
    stepper = K.stepper_for(
        bool(loads.channel_slots),
        geo.two_d,
        case.loading.sequence != "none",
        int(mp[M.CLOSURE]),
        int(mp[M.J_METHOD]),
    )
    rec_n = 0
    rows = []
    try:
        while True:
            end, val, rec_n = stepper(
                loads.lmax,
                loads.lmin,
                state,
                chunk,
                max_cycles,
                geo.code,
                gp,
                loads.ct,
                mp,
                rec_da,
                rec,
                rec_n,
                acc,
            )
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


def predict_life(
    case: Case,
    method: str | None = None,
    progress=None,
    load_scale: float = 1.0,
    a_start_mm: float | None = None,
    history_rows: int = HISTORY_ROWS,
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
    LifeResult with ``summary`` (dict, the output keys of README.md) and ``history`` (DataFrame with
    ``cycle, block, a_mm, dJ_kJm2, dJ_eq_kJm2, Jmax_kJm2, Lr, dadN_mm_per_cycle`` (``c_mm``
    for a two-dimensional crack) and ``dK_MPa_sqrt_m, dJ_el_kJm2, dJ_pl_kJm2`` of the block's
    largest cycle, :mod:`cycj.life.split`).
    """
    from cycj._version import __version__

    if method is not None:
        from dataclasses import replace

        case = replace(case, run=replace(case.run, method=method))
    loads = block_loads(case, load_scale)
    cited = Citations()
    mp = model_array(case, loads=loads, cited=cited)
    cite_loads(case, cited)
    geo = case.geometry
    a0 = geo.crack_length if a_start_mm is None else float(a_start_mm)
    geo.check_crack(a0, "initial crack")
    a_crit, crit_reason = critical_crack_length(case, loads=loads, mp=mp)
    if crit_reason not in ("size-limit", "leak"):  # those sizes are slots of their own
        mp[M.A_CRIT] = a_crit
        mp[M.CRIT_CODE] = END_CODES[crit_reason]
    warnings = ES.input_warnings(case, loads, mp, a0, a_crit)
    if hasattr(progress, "span"):  # a progress display that shows the share of the way
        progress.span = (a0, a_crit)
    # the whole block at a0, passed over once: method choice, block table and first row
    first_pass = ES.block_pass(case, loads, mp, a0) if _block_possible(case) else None
    used, why = _choose_method(case, loads, mp, a0, max(a_crit, a0 * 1.0001), first_pass)
    max_cycles = float(case.run.max_cycles)
    rec_da = max((a_crit - a0) / history_rows, 1e-9)
    rows = []
    passes = {a0: first_pass}  # whole-block passes already made, by crack size
    state = np.zeros(M.N_STATE)
    state[M.ST_A] = a0
    state[M.ST_C] = geo.dims.get("half_length", 0.0)
    if used == "block" and a_crit > a0:
        cited.cite("block-integration")
        state[M.ST_A], state[M.ST_BLOCKS], rows = block_phase(
            case, loads, mp, a0, a_crit, max_cycles, first_pass, passes
        )
        state[M.ST_CYCLES] = state[M.ST_BLOCKS] * loads.n
        rows = [(*r, state[M.ST_C]) for r in rows]
    end, val, step_rows, clipped = _stepper(case, loads, mp, state, max_cycles, rec_da, progress)
    a_end, cycles, blocks = state[M.ST_A], state[M.ST_CYCLES], state[M.ST_BLOCKS]
    if math.isnan(val):  # the last cycle reached the end size: the criterion's value there
        val = ES.criterion_value(case, loads, mp, end, a_end)
    if clipped:
        warnings.append(
            f"closure model range: R or S_max/σ_flow was clipped in {clipped:.3g} "
            "cycles (Elber −0.1 ≤ R ≤ 0.7; Newman R ≥ −1, S_max/σ_0 ≤ 0.8)"
        )
    if first_pass is None:
        first_pass = ES.block_pass(case, loads, mp, a0)
    last_pass = first_pass if a_end == a0 else passes.get(a_end)
    if last_pass is None:
        last_pass = ES.block_pass(case, loads, mp, a_end)
    first = (0.0, 0.0, a0, *ES.row_of(first_pass, loads), geo.dims.get("half_length", 0.0))
    last = (cycles, blocks, a_end, *ES.row_of(last_pass, loads), state[M.ST_C])
    hist = H.from_rows([first, *rows, *step_rows, last], HISTORY_COLUMNS)
    if not mp[M.TWO_D]:
        del hist["c_mm"]
    hist = add_split(H.drop_repeats_sorted(hist), case, loads, mp)
    outside = valid_range_warning(case, loads, mp, hist)
    if outside:
        warnings.append(outside)
    reason = END_NAMES[end]
    tripped = ES.tripped(case, loads, mp, reason, val, a_end)
    a_crit_first = ES.tripped(case, loads, mp, None, 0.0, a0) if a_crit <= a0 else []
    summary = {
        "title": case.title,
        "cycles_to_end": float(cycles),
        "end_reason": reason,
        "end_values": ES.end_values(case, loads, mp, reason, val, a_end, cycles, last_pass),
        "end_criteria_tripped": tripped,
        "initially_critical": bool(a_crit <= a0),
        "initial_criteria_tripped": a_crit_first,
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
        "peak_nominal_stress_MPa": loads.peak
        if loads.peak_equivalent is None
        else loads.peak_equivalent,
        "load_scale": load_scale,
        "version": __version__,
        "warnings": warnings,
    }
    if loads.hours_per_block is not None:
        summary["hours_to_end"] = float(cycles / loads.n * loads.hours_per_block)
    refs = cited.references
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

    from cycj.geometry import make_geometry

    case, s1 = leaked.case, leaked.summary
    dims = case.geometry.dims
    c_end = float(leaked.columns["c_mm"][-1])
    warnings = list(leaked.warnings)
    if dims.get("bending_ratio"):
        warnings.append(
            "through-crack phase: the bending part of the load is not carried "
            "(membrane stress only)"
        )
    limit = 0.95 * dims["width"] / 2
    if not c_end < limit:
        s1 = dict(
            s1,
            warnings=warnings
            + ["the leaked crack is already wider than the plate's through-crack solution allows"],
        )
        return replace(leaked, summary=s1, warnings=s1["warnings"])
    geo = make_geometry(
        "center-crack-plate",
        c_end,
        width=dims["width"],
        thickness=dims["thickness"],
        constraint="plane-strain" if case.geometry.plane_strain else "plane-stress",
    )
    run = replace(
        case.run,
        max_cycles=max(case.run.max_cycles - s1["cycles_to_end"], 1.0),
        crack_length_limit=None,
        after_leak="stop",
    )
    through = predict_life(replace(case, geometry=geo, run=run, fields=None), progress=progress)
    h2 = H.take(through.columns, slice(1, None))
    h2["cycle"] = h2["cycle"] + s1["cycles_to_end"]
    h2["block"] = h2["block"] + s1["blocks_to_end"]
    h2["c_mm"] = h2["a_mm"]
    hist = H.concat(leaked.columns, h2)
    s2 = dict(through.summary)
    s2.update(
        cycles_to_end=float(hist["cycle"][-1]),
        blocks_to_end=float(hist["block"][-1]),
        a_initial_mm=s1["a_initial_mm"],
        leak_cycles=s1["cycles_to_end"],
        leak_half_length_mm=c_end,
        through_crack_end_half_length_mm=s2["a_end_mm"],
        phases=["surface crack to leak", "through crack"],
        warnings=_once(warnings, through.warnings, "valid_dJ"),
        inputs=s1["inputs"],
        references=_union(s1["references"], _step_references(), through.references),
    )
    if "hours_to_end" in s1:
        s2["hours_to_end"] = s1["hours_to_end"] + through.summary.get("hours_to_end", 0.0)
    return LifeResult(s2, hist, case, leaked.loads, s2["warnings"], s2["references"], leaked.model)


def _once(first, second, marker):
    """Warnings of both phases, those with ``marker`` only once."""
    seen = any(marker in w for w in first)
    return first + [w for w in second if not (seen and marker in w)]


def _step_references() -> list[str]:
    """References of the surface-to-through step (its own method records)."""
    step = Citations()
    step.cite("surface-to-through")
    return step.references


def _union(*lists) -> list[str]:
    out: list[str] = []
    for refs in lists:
        out.extend(r for r in refs if r not in out)
    return out


def growth_curve(case: Case, a_start_mm: float | None = None, load_scale: float = 1.0):
    """Crack size [mm] vs cycles from ``a_start_mm`` (default: the case's crack) to the end.

    Uses the block method when the case allows it (fast, smooth), else the cycle stepper's
    sparse history.  cycles[0] = 0.
    """
    h = predict_life(case, load_scale=load_scale, a_start_mm=a_start_mm).columns
    return h["a_mm"].copy(), h["cycle"].copy()
