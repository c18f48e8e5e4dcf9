"""The converged interval search: common random numbers, a monotone probability of failure and
samples added until the recommendation is resolved.

Every candidate interval is simulated on the same samples (chunk k always draws the same
numbers, :mod:`cycj.plan.montecarlo`), so the differences between neighbouring intervals carry
little sampling noise.  Per sample the failure is still not nested in the interval (a uniform
schedule of interval T is not a subset of that of T' > T: a crack missed by the inspections
at 0.7, 1.4, 2.1 may be caught at 1, 2), so the curve reported and searched is the isotonic
(pool-adjacent-violators) fit of the common-random-number estimates: non-decreasing in the
interval by construction, weighted by each estimate's samples.

The search runs a geometric grid from design life / ``max_inspections`` to the design life on
the first ``samples``, then a fine grid (step ≈ 2.6 %) around the crossing of the target, and
adds chunks of samples until the half-width of the confidence interval of the probability of
failure at the recommended interval is at most ``pof_tolerance`` × target (and at least
:data:`MIN_FAILURES` failing samples are seen there), or ``max_samples`` is reached.

References
----------
.. [1] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016), §5.2 (common random numbers).
.. [2] Barlow, R. E., Bartholomew, D. J., Bremner, J. M., Brunk, H. D., *Statistical Inference
   under Order Restrictions*, Wiley (1972): the pool-adjacent-violators algorithm.
"""

from __future__ import annotations

import math

import numpy as np

from cycj.plan.montecarlo import merge, pack_schedules, summarise, take

#: intervals on the first grid and on the fine grid around the crossing
SEARCH_POINTS = 16
FINE_POINTS = 25
#: failing samples needed at the recommended interval before its error is trusted
MIN_FAILURES = 10
#: times the fine grid may be moved when the crossing falls at its edge
MAX_MOVES = 4


def isotonic(y, w) -> np.ndarray:
    """Non-decreasing least-squares fit to ``y`` with weights ``w`` (pool adjacent
    violators)."""
    y = np.asarray(y, float)
    w = np.maximum(np.asarray(w, float), 1e-300)
    vals, wts, cnt = [], [], []
    for yi, wi in zip(y, w, strict=True):
        vals.append(yi)
        wts.append(wi)
        cnt.append(1)
        while len(vals) > 1 and vals[-2] > vals[-1]:
            wsum = wts[-2] + wts[-1]
            v = (vals[-2] * wts[-2] + vals[-1] * wts[-1]) / wsum
            c = cnt[-2] + cnt[-1]
            del vals[-1], wts[-1], cnt[-1]
            vals[-1], wts[-1], cnt[-1] = v, wsum, c
    return np.repeat(vals, cnt)


def last_meeting(pof_mono, target) -> int:
    """Index of the largest interval whose monotone probability of failure ≤ target (−1)."""
    ok = np.nonzero(np.asarray(pof_mono) <= target)[0]
    return int(ok[-1]) if ok.size else -1


def crossing(grid, pof_mono, target) -> float:
    """Interval where the monotone curve crosses the target (log-log interpolation)."""
    k = last_meeting(pof_mono, target)
    if k < 0:
        return float(grid[0])
    if k >= len(grid) - 1:
        return float(grid[-1])
    p0, p1 = max(pof_mono[k], 1e-300), max(pof_mono[k + 1], 1e-300)
    if p1 <= p0:
        return float(grid[k])
    f = (math.log(target) - math.log(p0)) / (math.log(p1) - math.log(p0))
    f = min(max(f, 0.0), 1.0)
    return float(math.exp(math.log(grid[k]) + f * (math.log(grid[k + 1]) - math.log(grid[k]))))


class Search:
    """State of the converged search for one Monte Carlo specification.

    Parameters
    ----------
    runner : cycj.plan.montecarlo.Runner
    spec : McSpec
        ``samples`` is the budget (``max_samples``).
    base : list of arrays
        Schedules evaluated on every chunk (no inspection, what-ifs, fixed schedule, grid).
    grid_rows : slice
        Rows of ``base`` that hold the coarse grid (ascending intervals ``grid``).
    sched : callable
        interval → inspection times.
    """

    def __init__(self, runner, spec, base, grid, grid_rows, sched, importance):
        self.runner, self.spec, self.base = runner, spec, base
        self.grid, self.rows, self.sched = np.asarray(grid, float), grid_rows, sched
        self.importance = importance
        self.done = 0  # chunks run
        self.base_total = None
        self.fine = None
        self.fine_total = None
        self.moves = 0

    def _run(self, schedules, chunks):
        arr, n = pack_schedules(schedules, self.spec.n_max)
        return self.runner.run(self.spec, arr, n, chunks)

    def first(self, chunks: int):
        """Run the base schedules on the first ``chunks`` chunks."""
        chunks = min(max(chunks, 1), self.spec.n_chunks)
        self.base_total = self._run(self.base, range(chunks))
        self.done = chunks

    def coarse(self) -> dict:
        r = summarise(take(self.base_total, self.rows), self.importance)
        r["mono"] = isotonic(r["pof"], np.full(len(self.grid), r["samples"]))
        return r

    def set_fine(self, centre: float, ratio: float):
        """Fine grid centre·ratio^(±1), clipped to the coarse grid's span; run on all chunks
        done so far."""
        lo = max(centre / ratio, self.grid[0])
        hi = min(centre * ratio, self.grid[-1])
        if hi <= lo * 1.0001:
            lo, hi = lo / ratio, lo * ratio
        self.fine = np.geomspace(lo, hi, FINE_POINTS)
        self.fine_total = self._run([self.sched(t) for t in self.fine], range(self.done))

    def set_points(self, points):
        """Fine grid given as points (e.g. the design life alone); run on all chunks done."""
        self.fine = np.asarray(points, float)
        self.fine_total = self._run([self.sched(t) for t in self.fine], range(self.done))

    def add(self, chunks: int):
        """Run base and fine schedules on ``chunks`` more chunks."""
        new = range(self.done, min(self.done + chunks, self.spec.n_chunks))
        if not len(new):
            return
        nb = len(self.base)
        tot = self._run(self.base + [self.sched(t) for t in self.fine], new)
        self.base_total = merge(self.base_total, take(tot, slice(0, nb)))
        self.fine_total = merge(self.fine_total, take(tot, slice(nb, None)))
        self.done = new.stop

    def fine_result(self) -> dict:
        r = summarise(self.fine_total, self.importance)
        r["mono"] = isotonic(r["pof"], np.full(len(self.fine), r["samples"]))
        return r

    def converge(self, target, tol, z, ratio) -> dict:
        """Add samples until the half-width at the recommended interval ≤ tol·target or the
        budget is used; move the fine grid when the crossing falls at its edge."""
        while True:
            r = self.fine_result()
            j = last_meeting(r["mono"], target)
            at_edge = (j < 0 and self.fine[0] > self.grid[0] * 1.0001) or (
                j == len(self.fine) - 1 and self.fine[-1] < self.grid[-1] / 1.0001
            )
            if at_edge and self.moves < MAX_MOVES:
                self.moves += 1
                c = self.fine[0] / ratio**0.5 if j < 0 else self.fine[-1] * ratio**0.5
                self.set_fine(c, ratio)
                continue
            jj = max(j, 0)
            hw = z * r["std_error"][jj]
            nf = r["failures"][jj]
            ok = hw <= tol * target and nf >= MIN_FAILURES
            if j < 0:  # nothing meets the target: resolve the smallest interval's estimate
                ok = hw <= tol * max(r["pof"][0], target) and nf >= MIN_FAILURES
            if ok or self.done >= self.spec.n_chunks:
                return {"index": j, "result": r, "converged": bool(ok), "half_width": hw}
            n = r["samples"]
            need = n * (hw / (tol * target)) ** 2 if hw > 0 else 2 * n
            if nf < MIN_FAILURES:
                need = max(need, n * MIN_FAILURES / max(nf, 1.0))
            need = min(max(1.2 * need, n * 1.25), 4 * n)
            self.add(max(math.ceil((need - n) / self.spec.chunk_size), 1))
