"""Compiled kernels of the inspection Monte Carlo: numbers only (numpy arrays and scalars).

A sample's crack follows a *life coordinate* φ(a): the cycles to grow from the table's smallest
size to ``a`` at the case's C.  For a sample with C-factor x, initial size a0 and start time t0,
the crack at time t is a = φ⁻¹(φ(a0) + x·(t − t0)) (Paris law: life ∝ 1/C) and it fails when
φ reaches φ(a_c).  φ is tabulated on a uniform grid in ln a for a few load scales; a sample's
own φ is the geometric interpolation between the two neighbouring load scales (exact when
ΔJ is a power of the load, as in the elastic limit), and linear in (ln a, ln φ) between grid
points.

References
----------
.. [1] Paris, P. C., Erdogan, F., J. Basic Eng. 85 (1963) 528 (life scales as 1/C).
.. [2] MIL-HDBK-1823A (2009): POD(a) forms (inverted at the detection uniform,
   :meth:`cycj.plan.pod.PodCurve.log_threshold`).
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit


@jit
def phi_at(la, k, w, la0, dla, logphi):
    """φ [cycles at C-factor 1] at ln a = ``la`` on the curve mixed from rows k, k+1 by w."""
    na = logphi.shape[1]
    x = (la - la0) / dla
    if x <= 0.0:
        return 0.0
    j = int(x)
    if j >= na - 1:
        j = na - 2
    f = x - j
    if f > 1.0:
        f = 1.0
    lp0 = logphi[k, j]
    lp1 = logphi[k, j + 1]
    if w > 0.0:
        lp0 = (1.0 - w) * lp0 + w * logphi[k + 1, j]
        lp1 = (1.0 - w) * lp1 + w * logphi[k + 1, j + 1]
    if j == 0:  # φ = 0 at the first grid point: linear in φ
        return f * math.exp(lp1)
    return math.exp(lp0 + f * (lp1 - lp0))


@jit
def _phi_grid(j, k, w, logphi):
    lp = logphi[k, j]
    if w > 0.0:
        lp = (1.0 - w) * lp + w * logphi[k + 1, j]
    return math.exp(lp)


@jit
def size_at(phi, k, w, la0, dla, logphi):
    """ln a at life coordinate ``phi`` (inverse of :func:`phi_at`, by bisection on the grid)."""
    na = logphi.shape[1]
    if phi <= 0.0:
        return la0
    lo, hi = 0, na - 1
    if _phi_grid(hi, k, w, logphi) <= phi:
        return la0 + dla * hi
    while hi - lo > 1:
        mid = (lo + hi) // 2
        if _phi_grid(mid, k, w, logphi) <= phi:
            lo = mid
        else:
            hi = mid
    p1 = _phi_grid(hi, k, w, logphi)
    if lo == 0:
        return la0 + dla * (phi / p1)
    p0 = _phi_grid(lo, k, w, logphi)
    f = (math.log(phi) - math.log(p0)) / (math.log(p1) - math.log(p0))
    return la0 + dla * (lo + f)


@jit
def _thresholds(i, la_thr, k, w, la_grid0, dla, logphi, phi_thr):
    """Life coordinate above which each inspection j detects sample i (+inf: never)."""
    for j in range(phi_thr.shape[0]):
        lt = la_thr[j, i]
        phi_thr[j] = math.inf if lt == math.inf else phi_at(lt, k, w, la_grid0, dla, logphi)


@jit
def _one_schedule(
    i,
    s,
    phi_first,
    x,
    pc,
    k,
    w,
    phi_thr,
    la_repl,
    times,
    n_insp,
    horizon,
    repair,
    la_grid0,
    dla,
    logphi,
):
    """Sample i under schedule s: (failure time or inf, inspection interval, detections)."""
    phi0 = phi_first
    t0 = 0.0
    nd = 0
    for j in range(n_insp[s]):
        tj = times[s, j]
        tf = t0 + max(pc - phi0, 0.0) / x
        if tf <= tj:
            return max(tf, 0.0), j, nd
        if phi0 + x * (tj - t0) > phi_thr[j]:
            nd += 1
            if repair == 1:
                return math.inf, -1, nd
            phi0 = phi_at(la_repl[j, i], k, w, la_grid0, dla, logphi)
            t0 = tj
    tf = t0 + max(pc - phi0, 0.0) / x
    if tf <= horizon:
        return max(tf, 0.0), n_insp[s], nd
    return math.inf, -1, nd


@jit
def _max_inspections(n_insp):
    n_max = 0
    for s in range(n_insp.shape[0]):
        n_max = max(n_max, n_insp[s])
    return n_max


@jit
def simulate(
    la0_s,
    xc,
    k_s,
    w_s,
    phic,
    la_repl,
    la_thr,
    times,
    n_insp,
    horizon,
    repair,
    la_grid0,
    dla,
    logphi,
    fail_time,
    fail_bin,
    n_det,
):
    """Run every sample through every inspection schedule.

    Parameters
    ----------
    la0_s, xc, k_s, w_s, phic : (n,) arrays
        ln initial size, C-factor, load-scale row and weight, life coordinate at failure.
    la_repl, la_thr : (m, n) arrays, m ≥ max(n_insp) (one row per inspection)
        ln size of the crack that replaces a detected one at inspection j; ln of the size above
        which inspection j detects the crack (the POD inverted at the sample's detection
        uniform u: POD(a) > u ⇔ a > POD⁻¹(u); +inf when u ≥ the POD's ceiling), common to all
        schedules, so one threshold in φ per inspection serves every schedule.
    times : (n_sched, n_max) inspection times [cycles], ascending; n_insp : (n_sched,) counts.
    horizon : float, cycles simulated (design life).
    repair : 0 renew (a new initial crack), 1 remove (no further crack).
    fail_time, fail_bin, n_det : (n_sched, n) outputs: failure time (inf if none within the
        horizon), index of the inspection interval it fell in, number of detections.
    """
    phi_thr = np.empty(max(_max_inspections(n_insp), 1))
    for i in range(la0_s.shape[0]):
        k = k_s[i]
        w = w_s[i]
        phi_first = phi_at(la0_s[i], k, w, la_grid0, dla, logphi)
        _thresholds(i, la_thr, k, w, la_grid0, dla, logphi, phi_thr)
        for s in range(times.shape[0]):
            ft, fb, nd = _one_schedule(
                i,
                s,
                phi_first,
                xc[i],
                phic[i],
                k,
                w,
                phi_thr,
                la_repl,
                times,
                n_insp,
                horizon,
                repair,
                la_grid0,
                dla,
                logphi,
            )
            fail_time[s, i] = ft
            fail_bin[s, i] = fb
            n_det[s, i] = nd


@jit
def _bin_index(edges, x):
    """numpy.searchsorted(edges, x, "right") − 1, clipped to the bins 0 … len(edges) − 2."""
    lo, hi = 0, edges.shape[0]
    while lo < hi:
        mid = (lo + hi) // 2
        if edges[mid] <= x:
            lo = mid + 1
        else:
            hi = mid
    return min(max(lo - 1, 0), edges.shape[0] - 2)


@jit
def simulate_sums(
    la0_s,
    xc,
    k_s,
    w_s,
    phic,
    la_repl,
    la_thr,
    times,
    n_insp,
    horizon,
    repair,
    la_grid0,
    dla,
    logphi,
    weights,
    edges,
    period_edges,
    sums,
    hist,
    bins,
    hist_period,
):
    """:func:`simulate` reduced to weighted sums as it goes (no per-sample outputs, so a
    chunk's memory does not grow with the number of schedules, and one call holds no lock).

    ``weights`` (n,) sample weights; ``edges`` the time bins of ``hist`` over the horizon,
    ``period_edges`` those of ``hist_period`` (ignored with fewer than 2 edges).  Adds per
    schedule s: ``sums[s]`` = (failing samples, Σw·I, Σw²·I, Σw·detections), ``hist[s, b]``
    and ``hist_period[s, b]`` Σw·I by failure time bin, ``bins[s, j]`` Σw·I by inspection
    interval.
    """
    phi_thr = np.empty(max(_max_inspections(n_insp), 1))
    periods = period_edges.shape[0] > 1
    for i in range(la0_s.shape[0]):
        k = k_s[i]
        w = w_s[i]
        wi = weights[i]
        phi_first = phi_at(la0_s[i], k, w, la_grid0, dla, logphi)
        _thresholds(i, la_thr, k, w, la_grid0, dla, logphi, phi_thr)
        for s in range(times.shape[0]):
            ft, fb, nd = _one_schedule(
                i,
                s,
                phi_first,
                xc[i],
                phic[i],
                k,
                w,
                phi_thr,
                la_repl,
                times,
                n_insp,
                horizon,
                repair,
                la_grid0,
                dla,
                logphi,
            )
            sums[s, 3] += wi * nd
            if ft <= horizon:
                sums[s, 0] += 1.0
                sums[s, 1] += wi
                sums[s, 2] += wi * wi
                hist[s, _bin_index(edges, ft)] += wi
                bins[s, fb] += wi
                if periods:
                    hist_period[s, _bin_index(period_edges, ft)] += wi


@jit
def phi_many(la, k_s, w_s, la_grid0, dla, logphi, out):
    """:func:`phi_at` for arrays of samples."""
    for i in range(la.shape[0]):
        out[i] = phi_at(la[i], k_s[i], w_s[i], la_grid0, dla, logphi)


@jit
def size_many(phi, k_s, w_s, la_grid0, dla, logphi, out):
    """:func:`size_at` for arrays of samples (returns ln a)."""
    for i in range(phi.shape[0]):
        out[i] = size_at(phi[i], k_s[i], w_s[i], la_grid0, dla, logphi)


def empty_outputs(n_sched: int, n: int):
    return (
        np.empty((n_sched, n)),
        np.empty((n_sched, n), np.int64),
        np.empty((n_sched, n), np.int64),
    )
