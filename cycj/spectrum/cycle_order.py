"""The load history as an ordered sequence of (max, min) cycles for the life stepper."""

from __future__ import annotations

import numpy as np

from cycj.spectrum.rainflow import rainflow_extremes, rainflow_pairs
from cycj.spectrum.reversals import block_reversal_values, block_reversals

#: the orders :func:`cycles_in_sequence` knows
ORDERS = ("closing", "reversal")


def cycles_in_sequence(
    values, gate: float = 0.0, order: str = "closing"
) -> tuple[np.ndarray, np.ndarray]:
    """One pass of a repeating load history as ordered (max, min) load pairs, one per cycle.

    The history is treated as a block that repeats (ASTM E1049-85 §5.4.5): its gated reversals
    are closed on the peak or valley of largest magnitude, so every reversal is used and the
    block consists of full cycles only (no half cycles).  Both orders give the same number of
    cycles, ``(closed reversals) / 2``.

    ``order="closing"`` (the stepper's order **without** a sequence model)
        The rainflow cycles of the repeating block, in the order they close during counting.
        Ranges and means are exactly those of ``count_cycles(values, gate, repeat=True)``.
        Rainflow pairs each small excursion with its own reversals, so the big cycles are not
        broken up by the small ones riding on them; the growth per block is then correct for a
        growth law that depends on the range of each cycle alone.  The largest cycle closes
        last in the block.
    ``order="reversal"`` (the stepper's order **with** a sequence model, e.g. Wheeler or
    Willenborg)
        Each rising reversal (a valley and the next peak) is one cycle, in the time order of
        its peak within the block (the first peak's valley may be the end of the previous
        pass).  Retardation depends on when an overload happens;
        rainflow order would move the largest cycle (often the overload) to the end of the
        block and so misplace it, while time order keeps each peak where it occurred.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        One pass of the load history [N or MPa inside cycj; the output has the same unit].
    gate : float, optional
        Reversal pairs with a range below ``gate`` are dropped [unit of ``values``].
    order : {"closing", "reversal"}
        Order of the cycles, see above.

    Returns
    -------
    peak : numpy.ndarray of float64, shape (k,)
        Maximum load of each cycle.
    valley : numpy.ndarray of float64, shape (k,)
        Minimum load of each cycle; ``peak >= valley`` element-wise.  Each pair counts one
        cycle.  A constant history gives two empty arrays.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
       Analysis*, ASTM International, §5.4.4 and §5.4.5.
    .. [2] Wheeler, O. E. (1972), "Spectrum loading and crack growth", *J. Basic Eng.* 94,
       181–186 (why load order matters with a sequence model).
    """
    if order == "closing":
        return closing_cycles(block_reversal_values(values, gate))
    x = np.asarray(values, dtype=float)
    peak_idx, valley_idx = cycle_indices_in_sequence(x, gate, order)
    return x[peak_idx], x[valley_idx]


def closing_cycles(closed_reversals: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(max, min) of every cycle of a closed reversal sequence
    (:func:`~cycj.spectrum.reversals.block_reversal_values`) in the order they close: the
    ``"closing"`` order of :func:`cycles_in_sequence`, with memory for the cycles only.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), §5.4.4 and §5.4.5.
    """
    if closed_reversals.shape[0] < 3:
        return np.empty(0), np.empty(0)
    return rainflow_extremes(closed_reversals, closed=True)


def cycle_indices_in_sequence(
    values, gate: float = 0.0, order: str = "closing"
) -> tuple[np.ndarray, np.ndarray]:
    """Sample indices (within one pass) of the peak and the valley of every cycle, in the
    order of :func:`cycles_in_sequence`.

    Used when several load channels are combined: cycles are identified on the combined
    signal and each channel's values are taken at the cycle's peak and valley samples.

    Returns
    -------
    peak_index, valley_index : numpy.ndarray of int64, shape (k,), each in [0, n)
    """
    if order not in ORDERS:
        raise ValueError(f"unknown cycle order {order!r}; known: {', '.join(ORDERS)}")
    n = np.asarray(values).shape[0]
    v, idx = block_reversals(values, gate)
    if v.shape[0] < 3:
        return np.empty(0, dtype=np.int64), np.empty(0, dtype=np.int64)
    if order == "closing":
        a, b, _ = rainflow_pairs(v, closed=True)
        a_is_peak = v[a] >= v[b]
        peak = np.where(a_is_peak, idx[a], idx[b]) % n
        valley = np.where(a_is_peak, idx[b], idx[a]) % n
        return peak.astype(np.int64), valley.astype(np.int64)
    # reversal order: drop the closing duplicate, roll back into time order, pair valley → peak
    ring, ring_idx = v[:-1], idx[:-1] % n
    shift = -int(np.argmin(ring_idx))
    ring, ring_idx = np.roll(ring, shift), np.roll(ring_idx, shift)
    if ring[0] > ring[1]:  # the first reversal in time is a peak: its valley came before it
        ring, ring_idx = np.roll(ring, 1), np.roll(ring_idx, 1)
    return ring_idx[1::2].astype(np.int64), ring_idx[0::2].astype(np.int64)
