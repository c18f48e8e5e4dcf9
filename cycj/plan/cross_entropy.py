"""Centre of the importance-sampling density for the inspected probability of failure, by the
cross-entropy method over decreasing intervals.

Without inspection the failure region's nearest point (the FORM design point,
:mod:`cycj.plan.reliability`) is a good centre; with inspections a sample fails only if its
crack also slips through them, which takes faster growth or a larger initial crack, further
out.  Starting from the no-inspection design point, each level draws a pilot around the
current centre, simulates it under the coarse grid of intervals, estimates the crossing of the
target, and moves the centre to the likelihood-weighted mean (in standard normal space) of
the samples that fail at the smallest interval that still has :data:`ELITE` failures — the
multi-level cross-entropy update for a shifted normal density — until that interval is the
one at the crossing.  The pilots use their own random streams, so the search's samples do not
depend on them except through the centre.

References
----------
.. [1] Rubinstein, R. Y., Kroese, D. P., *The Cross-Entropy Method*, Springer (2004), ch. 3
   (rare-event estimation, the multi-level algorithm).
.. [2] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016), §5.7 (importance sampling).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from cycj.plan.montecarlo import pack_schedules, simulate_samples
from cycj.plan.search import crossing, isotonic

#: failing pilot samples that define a level; pilot size; most levels
ELITE, PILOT, LEVELS = 40, 4000, 8
#: spawn keys of the pilots (far from the search's chunk indices)
PILOT_KEY = 2**40


def ce_centre(spec, grid, sched, target) -> dict:
    """Cross-entropy centre for the search on ``grid`` (ascending intervals) with
    ``sched(interval)`` → inspection times, starting at ``spec.shift``.

    Returns
    -------
    dict with ``shift`` (4 values), ``levels`` (list of interval, failures), ``evaluations``
    (pilot samples simulated).
    """
    v = np.asarray(spec.shift, float)
    mask = spec.scatter.scattering
    arr, n = pack_schedules([sched(t) for t in grid], spec.n_max)
    levels, evals = [], 0
    for lev in range(LEVELS):
        sp = replace(spec, shift=tuple(v), samples=PILOT, chunk_size=PILOT)
        seed = np.random.SeedSequence(spec.seed, spawn_key=(PILOT_KEY + lev,))
        dr, w, ft, _, _, horizon = simulate_samples(sp, arr, n, 0, seed)
        evals += PILOT
        fail = ft <= horizon
        p = (fail * w).mean(axis=1)
        k_c = int(np.searchsorted(grid, crossing(grid, isotonic(p, np.ones(len(grid))), target)))
        k_c = min(k_c, len(grid) - 1)
        counts = fail.sum(axis=1)
        ok = np.nonzero(counts >= ELITE)[0]
        above = ok[ok >= k_c]
        k = int(above[0]) if above.size else int(np.argmax(counts))
        f = fail[k]
        if not f.any():
            break
        u = dr["u_normal"][:, f]
        wf = w[f]
        v = np.where(mask, (u * wf).sum(axis=1) / wf.sum(), 0.0)
        levels.append({"interval_cycles": float(grid[k]), "failures": int(counts[k])})
        if k <= k_c:
            break
    return {"shift": v.tolist(), "levels": levels, "evaluations": evals}
