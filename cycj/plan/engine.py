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
        mat = replace(
            mat,
            J_c=mat.J_c * toughness_factor,
            resistance_curve=None if rc is None else replace(rc, C1=rc.C1 * toughness_factor),
        )
    return replace(case, material=mat, run=replace(case.run, max_cycles=1e30))


def curve_functions(case, toughness_max: float = 1.0, warnings: list | None = None):
    """``(growth_curve(a_start, load_factor) -> (a_mm, cycles, dadN), critical_size(load,
    toughness) -> a_c [mm])`` for :func:`cycj.plan.curves.build_table`.

    Below the threshold a crack does not grow: the curve then starts at the smallest growing
    size found by bisection, and smaller cracks are treated as that size (conservative; a
    line is added to ``warnings``).
    """
    import numpy as np

    from cycj import life

    pc = planning_case(case, toughness_max)

    def run(a, s):
        res = life.predict_life(pc, load_scale=s, a_start_mm=a)
        return res, res.summary["end_reason"] not in ("no-growth", "max-cycles")

    def growth(a_start, load_factor):
        res, grows = run(a_start, load_factor)
        a_g = a_start
        if not grows:
            a_c = critical(load_factor, toughness_max)
            lo, hi = a_start, None
            for a in np.geomspace(a_start, 0.999 * a_c, 25)[1:]:
                res, grows = run(a, load_factor)
                if grows:
                    hi = a
                    break
                lo = a
            if hi is None:
                raise CycjInputError(
                    f"no crack grows to failure at load factor {load_factor:.4g} (threshold "
                    "or run-out); planning needs growing cracks",
                    source=_src(case),
                    key="inspection.scatter.load_scale",
                )
            for _ in range(30):
                mid = math.sqrt(lo * hi)
                r_mid, g_mid = run(mid, load_factor)
                if g_mid:
                    hi, res = mid, r_mid
                else:
                    lo = mid
                if hi / lo < 1.001:
                    break
            a_g = hi
            if warnings is not None and not any("do not grow" in w for w in warnings):
                warnings.append(
                    f"cracks below {a_g:.4g} mm do not grow at load factor "
                    f"{load_factor:.4g} (threshold); they are treated as "
                    f"{a_g:.4g} mm (conservative)"
                )
        h = res.history
        a, n, r = (h["a_mm"].to_numpy(), h["cycle"].to_numpy(), h["dadN_mm_per_cycle"].to_numpy())
        if a_g > a_start:  # dead zone: no cycles are spent below the growing size
            a, n, r = (
                np.concatenate([[a_start], a]),
                np.concatenate([[0.0], n]),
                np.concatenate([[np.nan], r]),
            )
        return a, n, r

    def critical(load_factor, toughness_factor):
        return life.critical_crack_length(
            case, load_scale=load_factor, toughness_scale=toughness_factor
        )[0]

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
    """References of the life models the plan's growth curves use (chosen as in a run)."""
    import numpy as np

    from cycj import kernel_slots as M
    from cycj.citations import Citations
    from cycj.life.loads import cite_loads
    from cycj.life.model import choose_models

    cited = Citations()
    pc = planning_case(case)
    choose_models(pc, np.zeros(M.N_MP), cited)  # the choices only: no loads read, no search
    cite_loads(pc, cited)
    return cited.references
