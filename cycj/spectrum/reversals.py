"""Turning points (reversals) of a load history, with a gate (hysteresis filter).

The kernels are compiled with :func:`cycj._jit.jit`, take plain float64 arrays and return sample
indices; they know nothing of files or units.
"""

from __future__ import annotations

import functools

import numpy as np

from cycj._jit import jit


@functools.cache
def _turning_point_kernel_for(values):
    """The turning-point kernel writing sample indices (``values`` False) or values (True); the
    choice is fixed when the kernel is compiled, so the loop carries no test of it."""

    @jit
    def turning_point_kernel(x, gate, out, out_v):
        """Write the sample indices of the gated turning points of ``x`` into ``out`` (int64), or
        with ``values`` their values into ``out_v`` (float64; ``out`` is then unused).

        Returns how many were written; the output must hold ``len(x)`` entries.  With ``values``
        ``out_v`` may be ``x`` itself (the filter in place): the k-th point is written only once
        sample k has been read, from the values the filter holds.
        """
        n = x.shape[0]
        if n == 0:
            return 0
        # leading phase: find the first excursion of at least ``gate`` (and > 0)
        hi = x[0]
        lo = x[0]
        ihi = 0
        ilo = 0
        direction = 0
        i = 1
        while i < n:
            v = x[i]
            if v > hi:
                hi = v
                ihi = i
            elif v < lo:
                lo = v
                ilo = i
            span = hi - lo
            if span > 0.0 and span >= gate:
                if ihi > ilo:
                    direction = 1
                else:
                    direction = -1
                break
            i += 1
        if direction == 0:  # constant, or every change smaller than the gate
            _emit(out, out_v, values, 0, 0, x[0])
            return 1
        # the history starts at the extreme opposite the first excursion: with gate = 0 that is
        # x[0]; with a gate, a lead-in smaller than the gate is skipped and the deeper point kept
        if direction == 1:
            _emit(out, out_v, values, 0, ilo, lo)
            cand = hi
            icand = ihi
        else:
            _emit(out, out_v, values, 0, ihi, hi)
            cand = lo
            icand = ilo
        k = 1
        for j in range(i + 1, n):
            v = x[j]
            if direction == 1:
                if v > cand:
                    cand = v
                    icand = j
                elif cand - v > 0.0 and cand - v >= gate:
                    _emit(out, out_v, values, k, icand, cand)
                    k += 1
                    direction = -1
                    cand = v
                    icand = j
            else:
                if v < cand:
                    cand = v
                    icand = j
                elif v - cand > 0.0 and v - cand >= gate:
                    _emit(out, out_v, values, k, icand, cand)
                    k += 1
                    direction = 1
                    cand = v
                    icand = j
        _emit(out, out_v, values, k, icand, cand)
        return k + 1

    return turning_point_kernel


_turning_point_kernel = _turning_point_kernel_for(False)
_turning_point_values = _turning_point_kernel_for(True)


@jit(inline="always")
def _emit(out, out_v, values, k, index, value):
    """The k-th turning point: its sample index into ``out``, or its value into ``out_v``."""
    if values:
        out_v[k] = value
    else:
        out[k] = index


@jit
def _rotate_left(a, m, k):
    """Rotate ``a[:m]`` left by ``k`` in place (three reversals; no second array)."""
    _reverse(a, 0, k)
    _reverse(a, k, m)
    _reverse(a, 0, m)


@jit(inline="always")
def _reverse(a, i, j):
    j -= 1
    while i < j:
        a[i], a[j] = a[j], a[i]
        i += 1
        j -= 1


_NO_INDEX = np.empty(0, dtype=np.int64)
_NO_VALUE = np.empty(0)


def _as_history(values) -> np.ndarray:
    """``values`` as a contiguous 1-D float64 array (no copy when it already is one)."""
    x = np.ascontiguousarray(values, dtype=np.float64)
    if x.ndim != 1:
        raise ValueError(f"a load history must be one-dimensional, got shape {x.shape}")
    if x.size and not np.isfinite(x).all():
        bad = int(np.flatnonzero(~np.isfinite(x))[0])
        raise ValueError(f"the load history has a non-finite value at sample {bad}: {x[bad]}")
    return x


def _check_gate(gate: float) -> float:
    gate = float(gate)
    if not (gate >= 0.0 and np.isfinite(gate)):
        raise ValueError(f"the gate must be a finite number >= 0, got {gate}")
    return gate


def turning_point_indices(x: np.ndarray, gate: float) -> np.ndarray:
    """Sample indices (int64) of the gated turning points of a float64 array (no checks)."""
    out = np.empty(max(x.shape[0], 1), dtype=np.int64)
    k = _turning_point_kernel(x, gate, out, _NO_VALUE)
    return out[:k]  # a view: the untouched tail of ``out`` is never paged in


def reversals(values, gate: float = 0.0) -> tuple[np.ndarray, np.ndarray]:
    """Turning points (peaks and valleys) of a load history, with a gate.

    The first and the last retained points are always kept as reversals, as ASTM E1049-85
    treats the ends of a history.  A run of equal samples (a plateau) is one point, at its first
    sample.  A sample that lies on a monotonic stretch is not a reversal.

    The gate is a hysteresis filter: a turning point is only confirmed once the history has
    moved away from it by at least ``gate``, so every excursion (a pair of reversals) whose
    range is below the gate disappears, while the remaining peaks and valleys keep their values
    and sample indices (nothing is shifted, smoothed or averaged).  A lead-in at the start that
    stays within the gate is skipped and the count starts at its deeper end.  With
    ``gate = 0`` every change of direction counts.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        The load history [any unit; N or MPa inside cycj].  Must be finite.
    gate : float, optional
        Smallest range kept [same unit as ``values``], ``>= 0``.  Default 0.

    Returns
    -------
    peaks_and_valleys : numpy.ndarray of float64, shape (m,)
        Values of the reversals, alternating peak and valley.
    indices : numpy.ndarray of int64, shape (m,)
        Their sample indices in ``values``.  A constant history (or one whose every change is
        smaller than the gate) gives one reversal and hence no cycles; an empty history gives
        none.

    Notes
    -----
    Compiled with numba: one pass over the samples, no Python objects per sample; memory is the
    input plus one int64 array of its length while running.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
       Analysis*, ASTM International, §3.2.7 (reversal) and §5.4.1 (peak-valley counting).
    """
    x = _as_history(values)
    gate = _check_gate(gate)
    if x.shape[0] == 0:
        return np.empty(0), np.empty(0, dtype=np.int64)
    idx = turning_point_indices(x, gate)
    return x[idx], idx


def block_reversals(values, gate: float = 0.0) -> tuple[np.ndarray, np.ndarray]:
    """Reversals of a history that repeats as a block, closed on its largest absolute extreme.

    The gated reversals are rotated to start at the peak or valley of largest magnitude,
    the block's own start point is appended at the end (so the sequence closes on itself), and
    the junction where the end of one pass meets the start of the next is cleaned with the same
    gate (points that are no longer turning points there are dropped).

    Parameters
    ----------
    values : array_like of float, shape (n,)
        One pass of the load history [any unit].
    gate : float, optional
        Smallest range kept [same unit as ``values``].

    Returns
    -------
    peaks_and_valleys : numpy.ndarray of float64, shape (m,)
        Closed reversal sequence: first and last values are the same extreme.
    indices : numpy.ndarray of int64, shape (m,)
        Sample indices; an index ``>= n`` is sample ``index - n`` of the next pass.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), §5.4.5 (repeating histories: start at the
       largest peak or valley).
    """
    x = _as_history(values)
    gate = _check_gate(gate)
    n = x.shape[0]
    v, idx = reversals(x, gate) if n else (np.empty(0), np.empty(0, dtype=np.int64))
    if v.shape[0] < 2:
        return v, idx
    k = int(np.argmax(np.abs(v)))
    seq_v = np.concatenate((v[k:], v[: k + 1]))
    seq_i = np.concatenate((idx[k:], idx[: k + 1] + n))
    keep = turning_point_indices(seq_v, gate)
    return seq_v[keep], seq_i[keep]


def block_reversal_values(values, gate: float = 0.0) -> np.ndarray:
    """The values of :func:`block_reversals` (``block_reversals(values, gate)[0]``), built in
    one array of the history's length: the gated reversals, rotated in place to start at the
    largest absolute extreme, closed, and cleaned at the junction in place.

    Parameters, units and references as :func:`block_reversals`.  Returns the closed reversal
    sequence (float64, shape (m,)): a view of a buffer of n + 1 values of which only the first
    m are ever written, so memory is the history plus its reversals.
    """
    x = _as_history(values)
    gate = _check_gate(gate)
    n = x.shape[0]
    if n == 0:
        return np.empty(0)
    v = np.empty(n + 1)
    m = _turning_point_values(x, gate, _NO_INDEX, v)
    if m < 2:
        return v[:m]
    i_hi, i_lo = int(np.argmax(v[:m])), int(np.argmin(v[:m]))
    hi, lo = v[i_hi], -v[i_lo]  # first of the largest |v|, as np.argmax(np.abs(v))
    k = i_hi if hi > lo else (i_lo if lo > hi else min(i_hi, i_lo))
    _rotate_left(v, m, k)
    v[m] = v[0]
    seq = v[: m + 1]
    return v[: _turning_point_values(seq, gate, _NO_INDEX, v)]
