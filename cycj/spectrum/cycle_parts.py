"""A cycle table held in parts — in memory or spilled to disk — with the running totals the
count's summary and output files need (cycles, extremes of range and mean, the reversals of
the plotted excerpt), and the statistics accumulated part by part: the range–mean and
from–to matrices and the range exceedance table.

The in-memory count and the streaming count (:mod:`cycj.spectrum.streaming`) write their
outputs through the same :class:`CycleParts`, so the files agree exactly: bin edges come from
the same extremes, every cycle falls in the same bin, and the sums of 1 and ½ cycles are exact
in floating point whatever the order of the parts.

References
----------
.. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
   Analysis*, ASTM International, §5.4 (rainflow counting; range–mean and from–to forms).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from cycj._jit import jit
from cycj.spectrum.streaming import PART_COLUMNS

#: dtypes of the part columns
PART_DTYPES = dict(zip(PART_COLUMNS, ("f8", "f8", "f8", "i8", "i8", "f8", "f8"), strict=True))
#: rows read back from a spill at a time
READ_ROWS = 1 << 20
#: samples of the history shown in history.png (:func:`cycj.spectrum.plots.plot_history`)
PREVIEW_SAMPLES = 5000
#: points of the exceedance curve kept for its plot (the table keeps them all)
EXCEEDANCE_PLOT_POINTS = 20_000


def part_from_cycles(values, cycles: dict) -> dict:
    """The whole cycle table of :func:`cycj.spectrum.rainflow.rainflow_cycles` as one part
    (the from and to loads taken from the history at each cycle's sample indices, modulo
    its length for a repeating count)."""
    x = np.asarray(values, dtype=np.float64)
    n = max(x.shape[0], 1)
    part = {c: cycles[c] for c in ("range", "mean", "count", "start", "end")}
    if x.shape[0]:
        part["from"] = x[np.asarray(cycles["start"], dtype=np.int64) % n]
        part["to"] = x[np.asarray(cycles["end"], dtype=np.int64) % n]
    else:
        part["from"] = part["to"] = np.empty(0)
    return part


class CycleParts:
    """Parts of a cycle table with running totals.

    Parameters
    ----------
    folder : str or pathlib.Path, optional
        Folder for the spill (one raw file a column, appended part by part); default: the
        parts are kept in memory.
    preview : int
        Sample indices below this are kept as the plotted excerpt's reversals.

    Attributes
    ----------
    n, full, half : int
        Cycles in all, full cycles, half cycles.
    range_max, range_min, mean_max, mean_min : float
        Extremes of the cycles' ranges and means [unit of the history] (±inf while empty).
    """

    def __init__(self, folder=None, preview: int = PREVIEW_SAMPLES):
        self.folder = None if folder is None else Path(folder)
        self._mem: list[dict] = []
        self.preview = int(preview)
        self._marks: list[np.ndarray] = []
        self.n = self.full = self.half = 0
        self.range_max = self.mean_max = -math.inf
        self.range_min = self.mean_min = math.inf

    def add(self, part: dict) -> None:
        """Append a part (dict of arrays with :data:`PART_COLUMNS`)."""
        m = int(part["count"].shape[0])
        if m == 0:
            return
        self.n += m
        self.full += int(np.count_nonzero(part["count"] == 1.0))
        self.half += int(np.count_nonzero(part["count"] == 0.5))
        self.range_max = max(self.range_max, float(part["range"].max()))
        self.range_min = min(self.range_min, float(part["range"].min()))
        self.mean_max = max(self.mean_max, float(part["mean"].max()))
        self.mean_min = min(self.mean_min, float(part["mean"].min()))
        for c in ("start", "end"):
            idx = part[c]
            self._marks.append(idx[idx < self.preview])
        if self.folder is None:
            self._mem.append(part)
            return
        for c in PART_COLUMNS:
            with open(self.folder / f"{c}.bin", "ab") as fh:
                np.ascontiguousarray(part[c], dtype=PART_DTYPES[c]).tofile(fh)

    __call__ = add

    def parts(self, columns=PART_COLUMNS):
        """Yield the parts in order (from a spill: :data:`READ_ROWS` rows at a time)."""
        if self.folder is None:
            for p in self._mem:
                yield {c: p[c] for c in columns}
            return
        for i in range(0, self.n, READ_ROWS):
            m = min(READ_ROWS, self.n - i)
            out = {}
            for c in columns:
                dt = np.dtype(PART_DTYPES[c])
                out[c] = np.fromfile(
                    self.folder / f"{c}.bin", dtype=dt, count=m, offset=i * dt.itemsize
                )
            yield out

    def reversal_marks(self) -> np.ndarray:
        """Sample indices (< ``preview``) of the cycles' points, sorted, unique."""
        if not self._marks:
            return np.empty(0, dtype=np.int64)
        return np.unique(np.concatenate(self._marks))

    # ------------------------------------------------------------ statistics

    def range_mean_matrix(self, bins: int):
        """Range–mean matrix (``bins`` × ``bins``) and its edges, as
        :func:`cycj.spectrum.statistics.range_mean_matrix` of the whole table."""
        from cycj.spectrum.statistics import range_mean_matrix

        rl = None if self.n == 0 else (self.range_min, self.range_max)
        ml = None if self.n == 0 else (self.mean_min, self.mean_max)
        total, r_edges, m_edges = range_mean_matrix([], [], [], bins, bins, rl, ml)
        for p in self.parts(("range", "mean", "count")):
            histogram2d_add(p["range"], p["mean"], p["count"], r_edges, m_edges, total)
        return total, r_edges, m_edges

    def from_to_matrix(self, bins: int, limits):
        """From–to matrix and edges over ``limits`` (the history's min and max), as
        :func:`cycj.spectrum.statistics.from_to_matrix` of the whole table."""
        from cycj.spectrum.statistics import _edges

        edges = _edges(np.asarray(limits, dtype=np.float64), bins, limits)
        total = np.zeros((int(bins), int(bins)))
        for p in self.parts(("from", "to", "count")):
            histogram2d_add(p["from"], p["to"], p["count"], edges, edges, total)
        return total, edges

    def exceedance_blocks(self, rows: int = READ_ROWS):
        """The range exceedance table in blocks of ``rows``: distinct ranges, largest first,
        and the cycles with a range ≥ each (as :func:`cycj.spectrum.statistics.
        range_exceedance`); memory one float64 a cycle while it runs."""
        a = np.empty(self.full)  # ranges of full cycles, filled in place (no second copy)
        b = np.empty(self.n - self.full)  # of half cycles
        i = j = 0
        for p in self.parts(("range", "count")):
            one = p["count"] == 1.0
            r = p["range"]
            k = int(np.count_nonzero(one))
            a[i : i + k] = r[one]
            b[j : j + r.shape[0] - k] = r[~one]
            i, j = i + k, j + r.shape[0] - k
        a.sort()
        b.sort()
        state = np.array([a.shape[0], b.shape[0], 0.0])
        lv, cum = np.empty(rows), np.empty(rows)
        while True:
            k = _exceedance_block(a, b, state, lv, cum)
            if k == 0:
                return
            yield lv[:k].copy(), cum[:k].copy()


@jit
def _bin_right(edges, v):
    """Edges ≤ ``v`` (``numpy.searchsorted(edges, v, side="right")``; 0 for NaN)."""
    lo = 0
    hi = edges.shape[0]
    while lo < hi:
        mid = (lo + hi) // 2
        if edges[mid] <= v:
            lo = mid + 1
        else:
            hi = mid
    return lo


@jit
def histogram2d_add(x, y, w, ex, ey, out):
    """Add the weights ``w`` of the points (``x``, ``y``) to their bins of ``out`` (shape
    ``len(ex) - 1`` × ``len(ey) - 1``), with the bins of :func:`numpy.histogram2d`: half-open
    ``[e_i, e_i+1)``, the last closed; points outside (or NaN) are left out."""
    nx = ex.shape[0] - 1
    ny = ey.shape[0] - 1
    for k in range(x.shape[0]):
        i = _bin_right(ex, x[k])
        if x[k] == ex[nx]:
            i -= 1
        j = _bin_right(ey, y[k])
        if y[k] == ey[ny]:
            j -= 1
        if 1 <= i <= nx and 1 <= j <= ny:
            out[i - 1, j - 1] += w[k]


@jit
def _exceedance_block(a, b, state, lv, cum):
    """Next rows of the exceedance table from ``a`` (ranges of full cycles) and ``b`` (of half
    cycles), both sorted ascending, walked from the top; ``state`` = (unread in a, unread in
    b, cycles so far), updated.  Returns the rows written into ``lv`` and ``cum``."""
    i = int(state[0])
    j = int(state[1])
    c = state[2]
    k = 0
    while k < lv.shape[0] and (i > 0 or j > 0):
        if i > 0 and (j == 0 or a[i - 1] >= b[j - 1]):
            top = a[i - 1]
        else:
            top = b[j - 1]
        while i > 0 and a[i - 1] == top:
            c += 1.0
            i -= 1
        while j > 0 and b[j - 1] == top:
            c += 0.5
            j -= 1
        lv[k] = top
        cum[k] = c
        k += 1
    state[0] = i
    state[1] = j
    state[2] = c
    return k
