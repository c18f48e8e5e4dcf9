"""The link to the life engine (:mod:`cycj.life`): growth curves and critical sizes of a case.

Growth curves run once per load factor (a handful), with the toughness raised to the largest
toughness factor sampled, so that every sample's end point lies on a computed curve, and with
no cycle limit.  Everything else in planning works on the tables built from them.
"""

from __future__ import annotations

import math
from dataclasses import replace

from cycj.errors import CycjInputError


def planning_case(case, toughness_factor: float = 1.0):
    """The case with no cycle limit and its toughness (J_c, J–R curve) scaled."""
    mat = case.material
    if toughness_factor != 1.0 and mat.J_c is not None:
        rc = mat.resistance_curve
        mat = replace(mat, J_c=mat.J_c * toughness_factor,
                      resistance_curve=None if rc is None else replace(
                          rc, C1=rc.C1 * toughness_factor))
    return replace(case, material=mat, run=replace(case.run, max_cycles=1e30))


def curve_functions(case, toughness_max: float = 1.0):
    """``(growth_curve(a_start, load_factor) -> (a_mm, cycles, dadN), critical_size(load,
    toughness) -> a_c [mm])`` for :func:`cycj.plan.curves.build_table`."""
    from cycj import life

    pc = planning_case(case, toughness_max)

    def growth(a_start, load_factor):
        res = life.predict_life(pc, load_scale=load_factor, a_start_mm=a_start)
        reason = res.summary["end_reason"]
        if reason in ("no-growth", "max-cycles"):
            raise CycjInputError(
                f"a crack of {a_start:.4g} mm does not grow to failure at load factor "
                f"{load_factor:.4g} (end: {reason}); planning needs growing cracks: raise the "
                "smallest initial crack or check the threshold", source=_src(case),
                key="inspection.scatter.initial_crack")
        h = res.history
        return (h["a_mm"].to_numpy(), h["cycle"].to_numpy(),
                h["dadN_mm_per_cycle"].to_numpy())

    def critical(load_factor, toughness_factor):
        return life.critical_crack_length(case, load_scale=load_factor,
                                          toughness_scale=toughness_factor)[0]

    return growth, critical


def _src(case):
    return None if case.path is None else str(case.path)


def deterministic_curve(case, a_start: float):
    """(a_mm, cycles) at the case's values from ``a_start`` to the end, and the summary."""
    from cycj import life

    res = life.predict_life(planning_case(case), a_start_mm=a_start)
    h = res.history
    return h["a_mm"].to_numpy(), h["cycle"].to_numpy(), res.summary


def rates(case):
    """(cycles per block, hours per cycle or None)."""
    from cycj import life

    n, hpc = life.block_info(case)
    return float(n), (None if hpc is None or not math.isfinite(hpc) else float(hpc))


def critical_size(case):
    """(a_c [mm], criterion) at the case's values."""
    from cycj import life

    return life.critical_crack_length(case)


def references(case) -> list:
    from cycj import life

    return life.references_for(case)
