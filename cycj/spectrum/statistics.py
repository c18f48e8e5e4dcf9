"""Spectrum statistics: exceedance curves, rainflow matrices, irregularity factor.

Vectorised numpy on reversals (never one Python object a sample); pandas only in
:func:`matrix_frame`.
"""

from __future__ import annotations

import numpy as np

from cycj.spectrum.reversals import reversals


def level_crossings(values, levels, gate: float = 0.0) -> np.ndarray:
    """Number of up-crossings of each level (the level-crossing exceedance curve).

    A level L is crossed upwards on a rising stretch from valley v to peak p when
    v < L ≤ p.  Counting on the (gated) reversals gives the same numbers as counting sample by
    sample, since the history is monotonic between reversals.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        Load history [any unit].
    levels : array_like of float, shape (k,)
        Load levels [unit of ``values``], any order.
    gate : float, optional
        Gate applied to the reversals first [unit of ``values``].

    Returns
    -------
    numpy.ndarray of int64, shape (k,)
        Up-crossings of each level, in the order of ``levels``.

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), §5.1 (level-crossing counting).
    """
    lv = np.asarray(levels, dtype=np.float64)
    order = np.argsort(lv, kind="stable")
    srt = lv[order]
    v, _ = reversals(values, gate)
    rising = np.flatnonzero(np.diff(v) > 0)
    lo = np.searchsorted(srt, v[rising], side="right")
    hi = np.searchsorted(srt, v[rising + 1], side="right")
    diff = np.zeros(srt.shape[0] + 1, dtype=np.int64)
    np.add.at(diff, lo, 1)
    np.add.at(diff, hi, -1)
    counts = np.cumsum(diff[:-1])
    out = np.empty_like(counts)
    out[order] = counts
    return out


def range_exceedance(ranges, counts) -> tuple[np.ndarray, np.ndarray]:
    """Cumulative exceedance of cycle ranges: how many cycles have a range ≥ each range.

    Parameters
    ----------
    ranges : array_like of float
        Cycle ranges [any unit], e.g. the ``range`` column of
        :func:`~cycj.spectrum.rainflow.count_cycles`.
    counts : array_like of float
        Their counts (1 or 0.5).

    Returns
    -------
    range_levels : numpy.ndarray of float64
        Distinct ranges, largest first [unit of ``ranges``].
    cumulative : numpy.ndarray of float64
        Cycles with a range ≥ each level (non-decreasing).
    """
    r = np.asarray(ranges, dtype=np.float64)
    c = np.asarray(counts, dtype=np.float64)
    if r.size == 0:
        return np.empty(0), np.empty(0)
    uniq, inv = np.unique(r, return_inverse=True)
    per = np.bincount(inv, weights=c, minlength=uniq.size)
    return uniq[::-1].copy(), np.cumsum(per[::-1])


def _edges(data, bins, limits):
    data = np.asarray(data, dtype=np.float64)
    if limits is None:
        lo, hi = (float(data.min()), float(data.max())) if data.size else (0.0, 1.0)
    else:
        lo, hi = map(float, limits)
    if hi <= lo:
        lo, hi = lo - 0.5, hi + 0.5
    return np.linspace(lo, hi, int(bins) + 1)


def range_mean_matrix(
    ranges,
    means,
    counts,
    range_bins: int = 32,
    mean_bins: int = 32,
    range_limits=None,
    mean_limits=None,
):
    """Rainflow matrix in range–mean form.

    Parameters
    ----------
    ranges, means, counts : array_like of float
        Cycle ranges and means [unit of the history] and counts (1 or 0.5).
    range_bins, mean_bins : int
        Number of equal bins (edges span the data unless limits are given).
    range_limits, mean_limits : (float, float), optional
        Lower and upper edge of the bins.

    Returns
    -------
    matrix : numpy.ndarray of float64, shape (range_bins, mean_bins)
        Cycles per bin (rows: range, columns: mean).
    range_edges, mean_edges : numpy.ndarray of float64
        Bin edges [unit of the history].

    References
    ----------
    .. [1] ASTM E1049-85 (reapproved 2017), §5.4 (rainflow counting) and its range–mean
       presentation.
    """
    r_edges = _edges(ranges, range_bins, range_limits)
    m_edges = _edges(means, mean_bins, mean_limits)
    mat, _, _ = np.histogram2d(
        np.asarray(ranges, float),
        np.asarray(means, float),
        bins=(r_edges, m_edges),
        weights=np.asarray(counts, float),
    )
    return mat, r_edges, m_edges


def from_to_matrix(values, starts, ends, counts, bins: int = 32, limits=None):
    """Rainflow matrix in from–to form: each cycle goes from the load at its first point to the
    load at its second point.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        The load history the cycles were counted on [any unit].
    starts, ends : array_like of int
        Sample indices of each cycle's points (``start``, ``end`` of the cycle table; indices
        ``>= n`` from a repeating count are taken modulo n).
    counts : array_like of float
        Cycle counts.
    bins : int
        Number of equal load bins on each axis.
    limits : (float, float), optional
        Load range of the bins; default the history's minimum and maximum.

    Returns
    -------
    matrix : numpy.ndarray of float64, shape (bins, bins)
        Cycles per bin (rows: from, columns: to).
    edges : numpy.ndarray of float64
        Bin edges [unit of the history].
    """
    x = np.asarray(values, dtype=np.float64)
    n = x.shape[0]
    frm = x[np.asarray(starts, dtype=np.int64) % n] if n else np.empty(0)
    to = x[np.asarray(ends, dtype=np.int64) % n] if n else np.empty(0)
    edges = _edges(x if limits is None else np.asarray(limits, float), bins, limits)
    mat, _, _ = np.histogram2d(frm, to, bins=(edges, edges), weights=np.asarray(counts, float))
    return mat, edges


#: samples per block of the blocked sum behind :func:`history_mean`
MEAN_BLOCK = 1 << 16


def _block_sums(x: np.ndarray):
    """Sums of the full blocks of :data:`MEAN_BLOCK` samples, and the samples left over."""
    k = x.shape[0] // MEAN_BLOCK
    return x[: k * MEAN_BLOCK].reshape(k, MEAN_BLOCK).sum(axis=1), x[k * MEAN_BLOCK :]


def history_mean(values) -> float:
    """Mean of a load history, summed in blocks of :data:`MEAN_BLOCK` samples so that
    :class:`RunningMean` fed the same samples in any chunks gives the same float.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        Load history [any unit].

    Returns
    -------
    float
        The mean [unit of ``values``]; NaN for an empty history.
    """
    x = np.asarray(values, dtype=np.float64)
    if x.shape[0] == 0:
        return float("nan")
    sums, tail = _block_sums(x)
    return float(np.concatenate((sums, [tail.sum()])).sum() / x.shape[0])


class RunningMean:
    """:func:`history_mean` of a history fed in chunks (:meth:`feed`, then :meth:`mean`)."""

    def __init__(self):
        self._sums: list[np.ndarray] = []
        self._pending = np.empty(0)
        self.n = 0

    def feed(self, chunk) -> None:
        """Add the next samples [unit of the history]."""
        x = np.asarray(chunk, dtype=np.float64)
        self.n += x.shape[0]
        buf = np.concatenate((self._pending, x)) if self._pending.size else x
        sums, tail = _block_sums(buf)
        if sums.size:
            self._sums.append(sums)
        self._pending = tail.copy()

    def mean(self) -> float:
        """The mean of everything fed [unit of the history]; NaN when nothing was."""
        if self.n == 0:
            return float("nan")
        return float(np.concatenate((*self._sums, [self._pending.sum()])).sum() / self.n)


def irregularity_factor(values, gate: float = 0.0) -> float:
    """Irregularity factor: mean up-crossings over peaks (1 for a narrow-band history).

    The reference level is the mean of the history (:func:`history_mean`); peaks are the
    local maxima among the (gated) reversals, the two ends excluded.

    Parameters
    ----------
    values : array_like of float, shape (n,)
        Load history [any unit].
    gate : float, optional
        Gate applied to the reversals first [unit of ``values``].

    Returns
    -------
    float
        Irregularity factor in (0, 1]; NaN when the history has no peak.

    Notes
    -----
    For a stationary Gaussian process with one-sided PSD moments m_k this tends to
    :math:`m_2 / \\sqrt{m_0 m_4}` (Rice).

    References
    ----------
    .. [1] Rice, S. O. (1944, 1945), "Mathematical analysis of random noise", *Bell System
       Technical Journal* 23, 282–332 and 24, 46–156.
    """
    x = np.asarray(values, dtype=np.float64)
    v, _ = reversals(x, gate)
    if v.shape[0] < 3:
        return float("nan")
    inner = v[1:-1]
    peaks = int(np.count_nonzero(inner > v[:-2]))
    level = history_mean(x)
    ups = int(np.count_nonzero((v[:-1] < level) & (v[1:] >= level)))
    return ups / peaks if peaks else float("nan")


def spectral_moments(frequency, psd, orders=(0, 2, 4)) -> tuple[float, ...]:
    """Moments m_k = ∫ f^k S(f) df of a one-sided PSD (trapezoidal rule).

    Parameters
    ----------
    frequency : array_like of float
        Frequencies [Hz], increasing.
    psd : array_like of float
        One-sided power spectral density [unit²/Hz].
    orders : tuple of int
        The k wanted.

    Returns
    -------
    tuple of float
        The moments [unit²·Hz^k].

    References
    ----------
    .. [1] Rice, S. O. (1944, 1945), "Mathematical analysis of random noise", *Bell System
       Technical Journal* 23, 282–332 and 24, 46–156.
    """
    f = np.asarray(frequency, dtype=np.float64)
    s = np.asarray(psd, dtype=np.float64)
    return tuple(float(np.trapezoid(f**k * s, f)) for k in orders)


def matrix_frame(matrix, row_edges, col_edges, row_name: str, col_name: str):
    """A rainflow matrix as a pandas DataFrame labelled with bin centres (for CSV output).

    The index is named ``row_name`` and the columns carry ``col_name`` bin centres; names
    should carry units (e.g. ``range_kN``).
    """
    import pandas as pd

    rc = 0.5 * (np.asarray(row_edges)[:-1] + np.asarray(row_edges)[1:])
    cc = 0.5 * (np.asarray(col_edges)[:-1] + np.asarray(col_edges)[1:])
    df = pd.DataFrame(
        np.asarray(matrix),
        index=pd.Index(np.round(rc, 10), name=row_name),
        columns=[f"{col_name}={c:.6g}" for c in cc],
    )
    return df
