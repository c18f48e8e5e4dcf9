"""Rainflow counting of a history that arrives in chunks (streaming), identical to the count of
the whole history in memory.

Two compiled state machines carry their state from chunk to chunk: the gated turning-point
filter (lead-in phase, direction, current candidate extreme) and the three-point rainflow stack
(the open reversals).  Memory is bounded by the open stack and the cycle table, not by the
number of samples, so histories of 10⁸–10⁹ samples can be counted from a file read in chunks.

The kernels take plain arrays; :class:`StreamingCount` is the thin Python holder that feeds
them and gathers the cycle table (``range, mean, count, start, end``, counting order, as
:func:`cycj.spectrum.rainflow.rainflow_cycles`).

References
----------
.. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
   Analysis*, ASTM International, §3.2.7 (reversal) and §5.4.4 (rainflow counting).
"""

from __future__ import annotations

import numpy as np

from cycj._jit import jit
from cycj.spectrum.rainflow import range_closes

# slots of the turning-point state (float64 array)
(TP_PHASE, TP_HI, TP_LO, TP_IHI, TP_ILO, TP_DIR, TP_CAND, TP_ICAND, TP_OFFSET) = range(9)
N_TP_STATE = 9
#: phase of the turning-point filter: no sample yet, lead-in (no excursion ≥ gate yet), active
PHASE_EMPTY, PHASE_LEAD, PHASE_ACTIVE, PHASE_FINISHED = 0.0, 1.0, 2.0, 3.0


@jit
def turning_points_chunk(x, gate, st, out_v, out_i):
    """Confirmed gated turning points of the chunk ``x`` given the filter state ``st``
    (updated in place); writes values and global sample indices into ``out_v``, ``out_i``
    (length ≥ len(x) + 1) and returns how many.  The same rules as
    :func:`cycj.spectrum.reversals.reversals`: the last candidate is emitted by
    :func:`turning_points_finish`."""
    n = x.shape[0]
    k = 0
    off = st[TP_OFFSET]
    j0 = 0
    if n == 0:
        return 0
    if st[TP_PHASE] == PHASE_EMPTY:
        st[TP_HI] = st[TP_LO] = x[0]
        st[TP_IHI] = st[TP_ILO] = off
        st[TP_PHASE] = PHASE_LEAD
        j0 = 1
    j = j0
    while j < n and st[TP_PHASE] == PHASE_LEAD:
        v = x[j]
        gi = off + j
        if v > st[TP_HI]:
            st[TP_HI] = v
            st[TP_IHI] = gi
        elif v < st[TP_LO]:
            st[TP_LO] = v
            st[TP_ILO] = gi
        span = st[TP_HI] - st[TP_LO]
        if span > 0.0 and span >= gate:
            st[TP_PHASE] = PHASE_ACTIVE
            if st[TP_IHI] > st[TP_ILO]:
                st[TP_DIR] = 1.0
                out_v[k] = st[TP_LO]
                out_i[k] = st[TP_ILO]
                st[TP_CAND] = st[TP_HI]
                st[TP_ICAND] = st[TP_IHI]
            else:
                st[TP_DIR] = -1.0
                out_v[k] = st[TP_HI]
                out_i[k] = st[TP_IHI]
                st[TP_CAND] = st[TP_LO]
                st[TP_ICAND] = st[TP_ILO]
            k += 1
        j += 1
    if st[TP_PHASE] != PHASE_ACTIVE:
        st[TP_OFFSET] = off + n
        return k
    # the active phase with its state in locals (one pass, nothing stored per sample)
    cand = st[TP_CAND]
    icand = int(st[TP_ICAND])
    up = st[TP_DIR] > 0.0
    base = int(off)
    for jj in range(j, n):
        v = x[jj]
        if up:
            if v > cand:
                cand = v
                icand = base + jj
            elif cand - v > 0.0 and cand - v >= gate:
                out_v[k] = cand
                out_i[k] = icand
                k += 1
                up = False
                cand = v
                icand = base + jj
        else:
            if v < cand:
                cand = v
                icand = base + jj
            elif v - cand > 0.0 and v - cand >= gate:
                out_v[k] = cand
                out_i[k] = icand
                k += 1
                up = True
                cand = v
                icand = base + jj
    st[TP_CAND] = cand
    st[TP_ICAND] = icand
    st[TP_DIR] = 1.0 if up else -1.0
    st[TP_OFFSET] = off + n
    return k


@jit
def rainflow_chunk(rv, ri, stack_v, stack_i, sp_arr, frm, to, cnt, start, end):
    """Push the reversals (values ``rv``, sample indices ``ri``) onto the open rainflow stack
    (``stack_v``, ``stack_i`` with ``sp_arr[0]`` points, updated in place) and write the cycles
    that close (the loads of their first and second point, count, sample indices) into the
    output arrays (length ≥ len(rv) + the stack's size); returns how many.
    Three-point rule of ASTM E1049-85 §5.4.4 with the start point kept until it is counted as
    a half cycle."""
    sp = int(sp_arr[0])
    nc = 0
    for j in range(rv.shape[0]):
        stack_v[sp] = rv[j]
        stack_i[sp] = ri[j]
        sp += 1
        while sp >= 3 and range_closes(stack_v, sp):
            if sp == 3:  # Y contains the starting point: one-half cycle
                a, b = 0, 1
                c = 0.5
            else:
                a, b = sp - 3, sp - 2
                c = 1.0
            frm[nc] = stack_v[a]
            to[nc] = stack_v[b]
            cnt[nc] = c
            start[nc] = stack_i[a]
            end[nc] = stack_i[b]
            nc += 1
            if sp == 3:
                stack_v[0], stack_i[0] = stack_v[1], stack_i[1]
                stack_v[1], stack_i[1] = stack_v[2], stack_i[2]
                sp = 2
            else:
                stack_v[sp - 3], stack_i[sp - 3] = stack_v[sp - 1], stack_i[sp - 1]
                sp -= 2
    sp_arr[0] = sp
    return nc


#: columns of a part of the cycle table handed to a sink: the table's columns, then the loads of
#: each cycle's first and second point (the from–to matrix)
PART_COLUMNS = ("range", "mean", "count", "start", "end", "from", "to")


def _part(frm, to, cnt, start, end) -> dict:
    """A part of the cycle table; range and mean as :func:`~cycj.spectrum.rainflow.
    rainflow_cycles` computes them (|to − from| and (from + to)/2)."""
    return {
        "range": np.abs(to - frm),
        "mean": 0.5 * (frm + to),
        "count": cnt,
        "start": start,
        "end": end,
        "from": frm,
        "to": to,
    }


class StreamingCount:
    """Rainflow count of a history fed in chunks (open cycles carried between chunks).

    Parameters
    ----------
    gate : float
        Smallest range kept [unit of the values], ≥ 0 (as in
        :func:`cycj.spectrum.reversals.reversals`).
    level : float, optional
        Reference level for the irregularity factor [unit of the values] (the history's mean,
        :func:`cycj.spectrum.statistics.history_mean`); when given, mean up-crossings and
        peaks of the reversals are tallied (:meth:`irregularity`).
    sink : callable, optional
        Called with each part of the cycle table as it closes (a dict of arrays,
        :data:`PART_COLUMNS`) instead of keeping the table; :meth:`finish` then returns only
        ``n_reversals``.

    Examples
    --------
    >>> sc = StreamingCount()
    >>> for chunk in ([-2.0, 1, -3], [5.0, -1, 3, -4], [4.0, -2]):
    ...     sc.feed(chunk)
    >>> float(sc.finish()["count"].sum())
    4.0
    """

    def __init__(self, gate: float = 0.0, level: float | None = None, sink=None):
        gate = float(gate)
        if not (gate >= 0.0 and np.isfinite(gate)):
            raise ValueError(f"the gate must be a finite number >= 0, got {gate}")
        self.gate = gate
        self._tp = np.zeros(N_TP_STATE)
        self._stack_v = np.empty(64)
        self._stack_i = np.empty(64, dtype=np.int64)
        self._sp = np.zeros(1, dtype=np.int64)
        self._parts: list[dict] = []
        self._keep = sink is None
        self._sink = self._parts.append if sink is None else sink
        self.samples = 0
        self.n_reversals = 0
        self._first_value = 0.0
        self.level = None if level is None else float(level)
        self._prev = None  # last reversal seen (irregularity tally)
        self.ups = 0
        self.rising = 0
        self._last_rising = False

    def _tally(self, rv):
        seq = rv if self._prev is None else np.concatenate(([self._prev], rv))
        if seq.shape[0] >= 2:
            a, b = seq[:-1], seq[1:]
            self.ups += int(np.count_nonzero((a < self.level) & (b >= self.level)))
            self.rising += int(np.count_nonzero(b > a))
            self._last_rising = bool(b[-1] > a[-1])
        self._prev = float(seq[-1])

    def _push(self, rv, ri):
        need = int(self._sp[0]) + rv.shape[0] + 1
        if need > self._stack_v.shape[0]:
            size = max(need, 2 * self._stack_v.shape[0])
            self._stack_v = np.resize(self._stack_v, size)
            self._stack_i = np.resize(self._stack_i, size)
        m = rv.shape[0] + int(self._sp[0]) + 1  # each push may close cycles of the stack
        out = (np.empty(m), np.empty(m), np.empty(m), np.empty(m, np.int64), np.empty(m, np.int64))
        nc = rainflow_chunk(rv, ri, self._stack_v, self._stack_i, self._sp, *out)
        if nc:
            self._sink(_part(*(a[:nc].copy() for a in out)))
        self.n_reversals += rv.shape[0]
        if self.level is not None:
            self._tally(rv)

    def feed(self, chunk) -> None:
        """Count the next chunk of samples (finite values, in time order)."""
        x = np.ascontiguousarray(chunk, dtype=np.float64)
        if x.ndim != 1:
            raise ValueError(f"a chunk must be one-dimensional, got shape {x.shape}")
        if x.size and not np.isfinite(x).all():
            bad = int(np.flatnonzero(~np.isfinite(x))[0])
            raise ValueError(f"non-finite value at sample {self.samples + bad}: {x[bad]}")
        out_v = np.empty(x.shape[0] + 1)
        out_i = np.empty(x.shape[0] + 1, dtype=np.int64)
        if self._tp[TP_PHASE] == PHASE_FINISHED:
            raise ValueError("the count is finished; start a new StreamingCount")
        if self._tp[TP_PHASE] == PHASE_EMPTY and x.size:
            self._first_value = float(x[0])
        k = turning_points_chunk(x, self.gate, self._tp, out_v, out_i)
        self.samples += x.shape[0]
        if k:
            self._push(out_v[:k], out_i[:k])

    def finish(self) -> dict:
        """The cycle table of everything fed (dict of arrays ``range, mean, count, start,
        end``, ``from, to``, and ``n_reversals``), the residue counted as half cycles; with a
        sink only ``n_reversals``."""
        st = self._tp
        if st[TP_PHASE] == PHASE_ACTIVE:  # the last candidate extreme is the last reversal
            self._push(np.array([st[TP_CAND]]), np.array([int(st[TP_ICAND])], dtype=np.int64))
        elif st[TP_PHASE] == PHASE_LEAD:  # constant, or every change below the gate
            self._push(np.array([self._first_value]), np.zeros(1, dtype=np.int64))
        st[TP_PHASE] = PHASE_FINISHED
        sp = int(self._sp[0])
        sv, si = self._stack_v[:sp], self._stack_i[:sp]
        if sp > 1:
            self._sink(
                _part(
                    sv[:-1].copy(),
                    sv[1:].copy(),
                    np.full(sp - 1, 0.5),
                    si[:-1].copy(),
                    si[1:].copy(),
                )
            )
        self._sp[0] = 0
        out = {"n_reversals": self.n_reversals}
        if not self._keep:
            return out
        dtypes = (float, float, float, np.int64, np.int64, float, float)
        for c, dt in zip(PART_COLUMNS, dtypes, strict=True):
            out[c] = np.concatenate([p[c] for p in self._parts]) if self._parts else np.empty(0, dt)
        return out

    def irregularity(self) -> float:
        """Irregularity factor of everything fed (after :meth:`finish`): mean up-crossings of
        the reversals over their peaks, the two ends excluded, as
        :func:`cycj.spectrum.statistics.irregularity_factor`; NaN without a peak."""
        if self.level is None:
            raise ValueError("no level was given")
        if self.n_reversals < 3:
            return float("nan")
        peaks = self.rising - int(self._last_rising)
        return self.ups / peaks if peaks else float("nan")
