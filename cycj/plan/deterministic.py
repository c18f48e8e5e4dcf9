"""Deterministic inspection interval: life from the detectable to the critical crack ÷ a factor.

The interval is N(a_det → a_c)/SF, with N from the growth curve at the case's values and a_c the
critical size at the history's peak load.  Common practice takes SF = 2, so that a crack missed
at one inspection is found at the next before it becomes critical.

References
----------
.. [1] BS 7910:2013+A1:2015, §8 and Annex on inspection intervals (detectable size, critical
   size, growth life between them).
.. [2] Common practice: half the life from detectable to critical.
"""

from __future__ import annotations

import math

import numpy as np


def deterministic_interval(
    a_mm,
    cycles,
    a_det: float,
    a_crit: float,
    safety_factor: float,
    design_life: float,
    cycles_per_block: float | None = None,
    hours_per_cycle: float | None = None,
) -> dict:
    """Interval and inspection schedule from a growth curve that starts at ``a_det``.

    Parameters
    ----------
    a_mm, cycles : array_like
        Crack size [mm] vs cycles from the detectable size (cycles[0] = 0) to the critical
        size.
    a_det, a_crit : float
        Detectable and critical sizes [mm].
    safety_factor : float
        ≥ 1.
    design_life : float
        Cycles; the schedule runs until it.
    cycles_per_block, hours_per_cycle : float, optional
        To give the interval in blocks and hours.

    Returns
    -------
    dict
        ``life_cycles``, ``interval_cycles`` (and ``_blocks``, ``_hours`` where a rate is
        given), ``critical_crack_length_mm``, ``detectable_size_mm``, ``safety_factor`` and
        ``schedule`` (a list of rows: ``inspection``, ``cycle``, ``block``, ``hours``,
        ``a_mm`` on the curve from the detectable size).
    """
    a = np.asarray(a_mm, float)
    n = np.asarray(cycles, float)
    if a_det >= a_crit:
        life = 0.0
    else:
        life = float(np.interp(a_crit, a, n)) if a_crit <= a[-1] else float(n[-1])
    interval = life / safety_factor
    out = {
        "life_cycles": life,
        "interval_cycles": interval,
        "critical_crack_length_mm": a_crit,
        "detectable_size_mm": a_det,
        "safety_factor": safety_factor,
    }
    if cycles_per_block:
        out["life_blocks"] = life / cycles_per_block
        out["interval_blocks"] = interval / cycles_per_block
    if hours_per_cycle:
        out["life_hours"] = life * hours_per_cycle
        out["interval_hours"] = interval * hours_per_cycle
    rows = []
    if interval > 0:
        k_max = min(math.floor(design_life / interval), 10_000)
        for k in range(1, k_max + 1):
            t = k * interval
            rows.append(
                {
                    "inspection": k,
                    "cycle": t,
                    "block": t / cycles_per_block if cycles_per_block else None,
                    "hours": t * hours_per_cycle if hours_per_cycle else None,
                    "a_mm": float(np.interp(t, n, a)) if t <= n[-1] else None,
                }
            )
    out["schedule"] = rows
    return out
