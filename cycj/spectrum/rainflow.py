"""Rainflow cycle counting to ASTM E1049-85 §5.4.4 (three-point algorithm), numba-compiled."""

from __future__ import annotations

import functools

import numpy as np

from cycj._jit import jit
from cycj.spectrum.reversals import block_reversals, reversals

#: columns of the cycle table returned by :func:`count_cycles`
CYCLE_COLUMNS = ("range", "mean", "count", "start", "end")


@functools.cache
def _rainflow_kernel_for(extremes):
    """The rainflow kernel writing positions and counts (``extremes`` False) or the cycles'
    extremes (True); the choice is fixed when the kernel is compiled."""

    @jit
    def rainflow_kernel(r, closed, first, second, count):
        """Three-point rainflow count of the reversal values ``r``.

        Writes, per cycle, the positions in ``r`` of its first and second point and its count
        (1.0 or 0.5) into the preallocated arrays (length ``len(r)``), or with ``extremes`` its
        larger and smaller value into ``first``, ``second`` (float64; ``count`` unused); returns
        the number of cycles, in the order they were counted.  With ``closed`` the sequence starts
        and ends on its largest extreme (a repeating block): no point is a start point and every
        range that closes is a full cycle.
        """
        n = r.shape[0]
        stack = np.empty(n, dtype=np.int64)
        sv = np.empty(n)  # the stacked points' values (saves an indirect load per test)
        sp = 0
        nc = 0
        for j in range(n):
            stack[sp] = j
            sv[sp] = r[j]
            sp += 1
            while sp >= 3 and range_closes(sv, sp):
                if sp == 3 and not closed:
                    # Y contains the starting point: one-half cycle, discard the first point
                    _record(first, second, count, extremes, nc, stack, sv, 0, 1, 0.5)
                    nc += 1
                    stack[0] = stack[1]
                    sv[0] = sv[1]
                    stack[1] = stack[2]
                    sv[1] = sv[2]
                    sp = 2
                else:
                    # one cycle: discard the peak and the valley of Y
                    _record(first, second, count, extremes, nc, stack, sv, sp - 3, sp - 2, 1.0)
                    nc += 1
                    stack[sp - 3] = stack[sp - 1]
                    sv[sp - 3] = sv[sp - 1]
                    sp -= 2
        # residue: each remaining range counts one-half cycle
        for m in range(sp - 1):
            _record(first, second, count, extremes, nc, stack, sv, m, m + 1, 0.5)
            nc += 1
        return nc

    return rainflow_kernel


_rainflow_kernel = _rainflow_kernel_for(False)
_rainflow_extremes = _rainflow_kernel_for(True)


@jit(inline="always")
def range_closes(v, sp):
    """The three-point test of ASTM E1049-85 §5.4.4 on the stacked values ``v[:sp]``: the
    latest range X (last two points) is at least the range Y before it (Y then counts)."""
    return abs(v[sp - 1] - v[sp - 2]) >= abs(v[sp - 2] - v[sp - 3])


@jit(inline="always")
def _record(first, second, count, extremes, nc, stack, sv, p, q, c):
    """Cycle ``nc`` from the stacked points ``p``, ``q``: their positions and count, or with
    ``extremes`` their larger and smaller value."""
    if extremes:
        first[nc] = max(sv[p], sv[q])
        second[nc] = min(sv[p], sv[q])
    else:
        first[nc] = stack[p]
        second[nc] = stack[q]
        count[nc] = c


def rainflow_pairs(peaks_and_valleys: np.ndarray, closed: bool = False):
    """Positions (first, second) in the reversal array and counts of every rainflow cycle.

    Parameters
    ----------
    peaks_and_valleys : numpy.ndarray of float64, shape (m,)
        Reversals as given by :func:`~cycj.spectrum.reversals.reversals` (or
        :func:`~cycj.spectrum.reversals.block_reversals` with ``closed=True``).
    closed : bool
        The sequence is a closed repeating block starting and ending on its largest extreme.

    Returns
    -------
    first, second : numpy.ndarray of int64
        Positions of the two points of each cycle's range, ``first < second``.
    count : numpy.ndarray of float64
        1.0 for a full cycle, 0.5 for a half cycle; the arrays are in counting (closing) order.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
       Analysis*, ASTM International, §5.4.4 (rainflow counting) and §5.4.5 (repeating
       histories).
    """
    r = np.ascontiguousarray(peaks_and_valleys, dtype=np.float64)
    m = max(r.shape[0], 1)
    first = np.empty(m, dtype=np.int64)
    second = np.empty(m, dtype=np.int64)
    count = np.empty(m, dtype=np.float64)
    nc = _rainflow_kernel(r, bool(closed), first, second, count)
    # views, not copies: the untouched tail is never paged in, and a first call on a long
    # history does not fault in fresh pages for the copies
    return first[:nc], second[:nc], count[:nc]


def rainflow_extremes(peaks_and_valleys: np.ndarray, closed: bool = False):
    """Larger and smaller value of every rainflow cycle, in counting order: the values of
    :func:`rainflow_pairs`' two points, larger first (half cycles included), without the
    position arrays.

    Returns
    -------
    peak, valley : numpy.ndarray of float64, shape (k,)
        Views of buffers of the input's length (only their first k values are written).

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), §5.4.4 and §5.4.5.
    """
    r = np.ascontiguousarray(peaks_and_valleys, dtype=np.float64)
    m = max(r.shape[0], 1)
    peak, valley = np.empty(m), np.empty(m)
    nc = _rainflow_extremes(r, bool(closed), peak, valley, peak)
    return peak[:nc], valley[:nc]


def rainflow_cycles(values, gate: float = 0.0, repeat: bool = False) -> dict:
    """Rainflow cycles of a load history as plain arrays (the engine of :func:`count_cycles`).

    Returns a dict of numpy arrays ``range, mean, count, start, end`` (in counting order) and
    ``n_reversals`` (int).  Parameters as in :func:`count_cycles`.
    """
    if repeat:
        v, idx = block_reversals(values, gate)
    else:
        v, idx = reversals(values, gate)
    a, b, c = rainflow_pairs(v, closed=repeat)
    rng, mean, start, end = _cycle_table(v, np.asarray(idx, dtype=np.int64), a, b)
    n_rev = v.shape[0] - 1 if (repeat and v.shape[0] > 1) else v.shape[0]
    return {
        "range": rng,
        "mean": mean,
        "count": c,
        "start": start,
        "end": end,
        "n_reversals": n_rev,
    }


@jit
def _cycle_table(v, idx, first, second):
    """Range, mean and sample indices of each counted cycle, in one pass."""
    n = first.shape[0]
    rng = np.empty(n)
    mean = np.empty(n)
    start = np.empty(n, dtype=np.int64)
    end = np.empty(n, dtype=np.int64)
    for k in range(n):
        x = v[first[k]]
        y = v[second[k]]
        rng[k] = abs(y - x)
        mean[k] = 0.5 * (x + y)
        start[k] = idx[first[k]]
        end[k] = idx[second[k]]
    return rng, mean, start, end


def count_cycles(values, gate: float = 0.0, repeat: bool = False):
    """Count the cycles of a load history by rainflow counting (ASTM E1049-85 §5.4.4).

    The history is reduced to its reversals (with an optional gate, see
    :func:`~cycj.spectrum.reversals.reversals`) and counted with the three-point algorithm:
    with X the newest range and Y the one before, while X ≥ Y, Y is one cycle (its two points
    discarded), or one-half cycle if it contains the starting point (the first point
    discarded).  The ranges left at the end (the residue) count one-half cycle each.

    With ``repeat=True`` the history is one block of a history that repeats: the count starts
    at the peak or valley of largest magnitude and the block is closed on it (§5.4.5), so the
    residue closes into full cycles and every cycle counts 1.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        Load history [N, MPa or any unit; the output carries the same unit].  Must be finite.
    gate : float, optional
        Reversal pairs with a range below ``gate`` are dropped first [unit of ``values``].
    repeat : bool, optional
        Count the history as a repeating block (full cycles only).  Default False.

    Returns
    -------
    pandas.DataFrame
        One row per cycle, in the order the cycles were counted, with columns

        - ``range`` [unit of values]: max − min of the cycle, ≥ 0;
        - ``mean`` [unit of values]: (max + min)/2;
        - ``count``: 1.0 (full cycle) or 0.5 (half cycle);
        - ``start``, ``end`` (int64): sample indices of the cycle's first and second point
          (with ``repeat``, an index ``>= n`` means sample ``index - n`` of the next pass).

        A constant history gives an empty table (no cycles).

    Notes
    -----
    Every reversal is used exactly once: 2·(full cycles) + (half cycles) = reversals − 1.
    Compiled with numba; 2·10⁶ samples count in a fraction of a second.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
       Analysis*, ASTM International, §5.4.4 and §5.4.5.
    .. [2] Matsuishi, M. and Endo, T. (1968), "Fatigue of metals subjected to varying stress",
       Japan Society of Mechanical Engineers, Fukuoka.

    Examples
    --------
    >>> from cycj.spectrum import count_cycles
    >>> count_cycles([-2, 1, -3, 5, -1, 3, -4, 4, -2])["count"].sum()
    4.0
    """
    import pandas as pd

    res = rainflow_cycles(values, gate, repeat)
    return pd.DataFrame({k: res[k] for k in CYCLE_COLUMNS}, copy=False)
