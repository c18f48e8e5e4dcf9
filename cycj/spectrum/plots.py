"""PNG pictures of a load spectrum (matplotlib, Agg backend, imported inside each function)."""

from __future__ import annotations

from pathlib import Path

import numpy as np


def _figure():
    import matplotlib

    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt

    return plt


def _unit(unit: str) -> str:
    return f" [{unit}]" if unit else " [unit of the file]"


def _save(fig, plt, path):
    path = Path(path)
    fig.tight_layout()
    from cycj.display import tidy

    tidy(fig)
    fig.savefig(path, dpi=110, format="png")
    plt.close(fig)
    return path


def plot_history(
    values,
    path,
    times=None,
    unit: str = "",
    start: int = 0,
    max_samples: int = 5000,
    reversal_indices=None,
    total: int | None = None,
):
    """Plot an excerpt of the history (``max_samples`` from ``start``) to a PNG file.

    Parameters
    ----------
    values : array_like of float
        Load history [``unit``].
    path : str or pathlib.Path
        PNG file to write.
    times : array_like of float, optional
        Time of each sample [s]; else the sample number is the x axis.
    unit : str
        Load unit for the axis label.
    start, max_samples : int
        The excerpt.
    reversal_indices : array_like of int, optional
        Sample indices of reversals to mark.
    total : int, optional
        Samples in the whole history when ``values`` is only its beginning (the title says
        "of ``total``"); default ``len(values)``.

    Returns
    -------
    pathlib.Path
    """
    plt = _figure()
    x = np.asarray(values, dtype=np.float64)
    stop = min(x.shape[0], start + int(max_samples))
    xs = np.arange(start, stop) if times is None else np.asarray(times)[start:stop]
    fig, ax = plt.subplots(figsize=(8, 3.2))
    ax.plot(xs, x[start:stop], lw=0.8, color="C0", label="load")
    if reversal_indices is not None:
        ri = np.asarray(reversal_indices)
        ri = ri[(ri >= start) & (ri < stop)]
        rx = ri if times is None else np.asarray(times)[ri]
        ax.plot(rx, x[ri], ".", ms=3, color="C3", label="reversals")
        ax.legend(loc="upper right", fontsize=8)
    ax.set_xlabel("time [s]" if times is not None else "sample")
    ax.set_ylabel("load" + _unit(unit))
    shown = f"samples {start}–{stop - 1} of {x.shape[0] if total is None else int(total)}"
    ax.set_title(f"Load history ({shown})", fontsize=10)
    ax.grid(True, alpha=0.3)
    return _save(fig, plt, path)


def plot_exceedance(levels, counts, path, unit: str = "", kind: str = "range"):
    """Plot a cumulative exceedance curve (log count axis) to a PNG file.

    Parameters
    ----------
    levels : array_like of float
        Cycle ranges (``kind="range"``) or load levels (``kind="level"``) [``unit``].
    counts : array_like of float
        Cumulative cycles with range ≥ level, or up-crossings of each level.
    path : str or pathlib.Path
        PNG file to write.
    unit : str
        Load unit for the axis label.
    kind : {"range", "level"}
        What the curve shows.

    Returns
    -------
    pathlib.Path
    """
    plt = _figure()
    fig, ax = plt.subplots(figsize=(6, 4))
    c = np.asarray(counts, dtype=np.float64)
    lv = np.asarray(levels, dtype=np.float64)
    keep = c > 0
    if kind == "range":
        ax.step(c[keep], lv[keep], where="post", color="C0")
        ax.set_ylabel("cycle range" + _unit(unit))
        ax.set_xlabel("cycles with range ≥ level (cumulative)")
        ax.set_title("Cumulative exceedance of rainflow ranges", fontsize=10)
    else:
        ax.plot(c[keep], lv[keep], color="C0")
        ax.set_ylabel("load level" + _unit(unit))
        ax.set_xlabel("up-crossings of the level")
        ax.set_title("Level-crossing exceedance", fontsize=10)
    if keep.any():
        ax.set_xscale("log")
    ax.grid(True, which="both", alpha=0.3)
    return _save(fig, plt, path)


def plot_rainflow_matrix(
    matrix, row_edges, col_edges, path, unit: str = "", form: str = "range-mean"
):
    """Heat map of a rainflow matrix (log colour scale, empty bins blank) to a PNG file.

    Parameters
    ----------
    matrix : array_like of float, shape (rows, cols)
        Cycles per bin (rows: range or from; columns: mean or to).
    row_edges, col_edges : array_like of float
        Bin edges [``unit``].
    path : str or pathlib.Path
        PNG file to write.
    unit : str
        Load unit for the axis labels.
    form : {"range-mean", "from-to"}
        Which matrix it is (sets the labels).

    Returns
    -------
    pathlib.Path
    """
    plt = _figure()
    from matplotlib.colors import LogNorm

    m = np.asarray(matrix, dtype=np.float64)
    fig, ax = plt.subplots(figsize=(6, 5))
    shown = np.ma.masked_less_equal(m, 0.0)
    norm = (
        LogNorm(vmin=max(shown.min(), 0.5), vmax=max(shown.max(), 1.0)) if shown.count() else None
    )
    mesh = ax.pcolormesh(
        np.asarray(col_edges),
        np.asarray(row_edges),
        shown,
        norm=norm,
        cmap="viridis",
        shading="flat",
    )
    fig.colorbar(mesh, ax=ax, label="cycles")
    if form == "range-mean":
        ax.set_xlabel("cycle mean" + _unit(unit))
        ax.set_ylabel("cycle range" + _unit(unit))
        ax.set_title("Rainflow matrix (range–mean)", fontsize=10)
    else:
        ax.set_xlabel("to" + _unit(unit))
        ax.set_ylabel("from" + _unit(unit))
        ax.set_title("Rainflow matrix (from–to)", fontsize=10)
    return _save(fig, plt, path)
