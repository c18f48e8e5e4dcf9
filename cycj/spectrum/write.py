"""Summary and output files of a cycle count (what ``cycj count`` prints and writes)."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from cycj.spectrum.rainflow import CYCLE_COLUMNS
from cycj.spectrum.statistics import irregularity_factor, matrix_frame

#: files written by :func:`write_count_outputs`
OUTPUT_FILES = (
    "cycles.csv",
    "cycles.parquet",
    "exceedance.parquet",
    "range_mean_matrix.csv",
    "from_to_matrix.csv",
    "exceedance.csv",
    "history.png",
    "exceedance.png",
    "rainflow_matrix.png",
    "report.html",
    "count.json",
)


def count_summary(
    values: np.ndarray, cycles: dict, gate: float, repeat: bool, unit: str = ""
) -> dict:
    """Plain summary of a count (JSON-ready).

    Parameters
    ----------
    values : numpy.ndarray of float64
        The history as counted [``unit``].
    cycles : dict
        Output of :func:`cycj.spectrum.rainflow.rainflow_cycles`.
    gate : float
        Gate used [``unit``].
    repeat : bool
        Whether the history was counted as a repeating block.
    unit : str
        Load unit ("" when the values were taken as they are).

    Returns
    -------
    dict
        ``samples, reversals, full_cycles, half_cycles, cycles, largest_range, max, min,
        irregularity_factor, gate, repeat, unit``.
    """
    count = cycles["count"]
    n = int(values.shape[0])
    return summary_of_totals(
        samples=n,
        reversals=int(cycles["n_reversals"]),
        full=int(np.count_nonzero(count == 1.0)),
        half=int(np.count_nonzero(count == 0.5)),
        largest_range=float(cycles["range"].max()) if count.size else 0.0,
        vmax=float(values.max()) if n else None,
        vmin=float(values.min()) if n else None,
        irregularity=irregularity_factor(values, gate) if n else float("nan"),
        gate=gate,
        repeat=repeat,
        unit=unit,
    )


def summary_of_totals(
    samples, reversals, full, half, largest_range, vmax, vmin, irregularity, gate, repeat, unit
) -> dict:
    """The summary of :func:`count_summary` from running totals (the streaming count's):
    sample and reversal numbers, full and half cycles, the largest range, the history's max and
    min [``unit``] and its irregularity factor (NaN: none)."""
    irr = irregularity
    return {
        "samples": int(samples),
        "reversals": int(reversals),
        "full_cycles": int(full),
        "half_cycles": int(half),
        "cycles": full + 0.5 * half,
        "largest_range": float(largest_range),
        "max": vmax,
        "min": vmin,
        "irregularity_factor": None if np.isnan(irr) else round(float(irr), 6),
        "gate": float(gate),
        "repeat": bool(repeat),
        "unit": unit,
    }


#: captions of the count's plots in the report
CAPTIONS = {
    "history.png": "The load history with the counted reversals",
    "exceedance.png": "Cycles exceeding each range (cumulative spectrum)",
    "rainflow_matrix.png": "Rainflow matrix: cycles by range and mean",
}


def count_references() -> list[str]:
    """References of a count: the rainflow method's record (cycj.methods)."""
    from cycj.citations import Citations

    cited = Citations()
    cited.cite("rainflow")
    cited.cite("range-mean-matrices")
    return cited.references


def write_count_outputs(
    od,
    values: np.ndarray,
    cycles: dict,
    unit: str = "",
    times=None,
    bins: int = 32,
    plots: bool = True,
    cycles_format: str = "auto",
) -> list[Path]:
    """Write the cycle table, the rainflow matrices, the exceedance table and three PNGs.

    Every file goes into the temporary folder of ``od`` (a :class:`cycj.outputs.OutputDir`),
    which is renamed into place only when all outputs are complete.

    Parameters
    ----------
    od : cycj.outputs.OutputDir
        Output folder being written (inside its ``with`` block).
    values : numpy.ndarray of float64
        The history as counted [``unit``].
    cycles : dict
        Output of :func:`cycj.spectrum.rainflow.rainflow_cycles`.
    unit : str
        Load unit for column names and axis labels.
    times : numpy.ndarray, optional
        Time of each sample [s] for the history plot.
    bins : int
        Bins on each axis of the matrices.
    plots : bool
        Write the three PNG plots.
    cycles_format : {"auto", "csv", "parquet"}
        Format of the cycle and exceedance tables; ``"auto"``: Parquet beyond
        :data:`CYCLES_PARQUET_ROWS` cycles.

    Returns
    -------
    list of pathlib.Path
        The files written (temporary paths; same names in the final folder).
    """
    from cycj.spectrum.cycle_parts import PREVIEW_SAMPLES, CycleParts, part_from_cycles

    parts = CycleParts()
    parts.add(part_from_cycles(values, cycles))
    n = int(values.shape[0])
    limits = (float(values.min()), float(values.max())) if n else (0.0, 1.0)
    preview_t = None if times is None else np.asarray(times)[:PREVIEW_SAMPLES]
    return write_count_files(
        od,
        parts,
        n,
        limits,
        values[:PREVIEW_SAMPLES],
        preview_t,
        unit,
        bins,
        plots,
        cycles_format,
    )


#: cycles beyond which ``cycles_format="auto"`` writes the per-cycle tables as Parquet
CYCLES_PARQUET_ROWS = 10_000_000


def write_count_files(
    od, parts, samples, limits, preview, preview_times, unit, bins, plots, cycles_format="auto"
) -> list[Path]:
    """The count's files from a :class:`cycj.spectrum.cycle_parts.CycleParts` (in memory or
    spilled), part by part: what :func:`write_count_outputs` writes, for the in-memory and the
    streaming count alike.

    Parameters
    ----------
    samples : int
        Samples in the history.
    limits : (float, float)
        The history's minimum and maximum [``unit``] (the from–to bins).
    preview, preview_times : numpy.ndarray
        The first samples of the history [``unit``] and their times [s] (or None) for the plot.
    Other parameters as :func:`write_count_outputs`.
    """

    from cycj.spectrum import plots as P

    if cycles_format not in ("auto", "csv", "parquet"):
        raise ValueError(f"unknown cycles format {cycles_format!r}")
    fmt_out = cycles_format
    if fmt_out == "auto":
        fmt_out = "parquet" if parts.n > CYCLES_PARQUET_ROWS else "csv"
    suffix = f"_{unit}" if unit else ""
    ext = "." + fmt_out
    fmt = "%.10g"
    with _TableWriter(od.path("cycles" + ext), fmt_out, fmt) as tw:
        for p in parts.parts(CYCLE_COLUMNS):
            tw.write(p)
        if tw.empty:
            tw.write({c: cycles_dtype(c) for c in CYCLE_COLUMNS})
    written = [od.path("cycles" + ext)]
    rm, r_edges, m_edges = parts.range_mean_matrix(bins)
    ft, edges = parts.from_to_matrix(bins, limits)
    for name, frame in (
        (
            "range_mean_matrix.csv",
            matrix_frame(rm, r_edges, m_edges, f"range{suffix}", f"mean{suffix}"),
        ),
        ("from_to_matrix.csv", matrix_frame(ft, edges, edges, f"from{suffix}", f"to{suffix}")),
    ):
        frame.to_csv(od.path(name), float_format=fmt)
        written.append(od.path(name))
    stride = max(1, -(-parts.n // EXCEEDANCE_PLOT_POINTS))
    shown_lv, shown_cum, row = [], [], 0
    cols = (f"range{suffix}", "cycles_exceeding")
    with _TableWriter(od.path("exceedance" + ext), fmt_out, fmt) as tw:
        for lv, cum in parts.exceedance_blocks():
            tw.write({cols[0]: lv, cols[1]: cum})
            keep = (np.arange(row, row + lv.shape[0]) % stride) == 0
            keep[-1] = True
            shown_lv.append(lv[keep])
            shown_cum.append(cum[keep])
            row += lv.shape[0]
        if tw.empty:
            tw.write({cols[0]: np.empty(0), cols[1]: np.empty(0)})
    written.append(od.path("exceedance" + ext))
    if plots:
        f, shown = shown_unit(unit)
        P.plot_history(
            np.asarray(preview) * f,
            od.path("history.png"),
            times=preview_times,
            unit=shown,
            reversal_indices=parts.reversal_marks(),
            total=samples,
        )
        levels = np.concatenate(shown_lv) if shown_lv else np.empty(0)
        cum = np.concatenate(shown_cum) if shown_cum else np.empty(0)
        P.plot_exceedance(levels * f, cum, od.path("exceedance.png"), unit=shown, kind="range")
        P.plot_rainflow_matrix(
            rm, r_edges * f, m_edges * f, od.path("rainflow_matrix.png"), unit=shown
        )
        written += [od.path(n) for n in ("history.png", "exceedance.png", "rainflow_matrix.png")]
    return written


def shown_unit(unit: str) -> tuple[float, str]:
    """(factor, unit) of the count's loads in the report's unit system: N and MPa become lbf
    and ksi in US units; any other unit is shown as it is."""
    from cycj.display import units

    u = units()
    kind = {"N": "force", "MPa": "stress"}.get(unit)
    if kind is None or not u.us:
        return 1.0, unit
    return u.factor(kind), u.unit(kind)


#: exceedance points kept for the plot (every k-th row, and each block's last)
EXCEEDANCE_PLOT_POINTS = 20_000


def cycles_dtype(column: str) -> np.ndarray:
    """An empty column of the cycle table with its dtype."""
    return np.empty(0, dtype=np.int64 if column in ("start", "end") else np.float64)


class _TableWriter:
    """A table written part by part (dicts of equal-length arrays) as CSV (header once) or
    Parquet (one row group a part, no dictionary encoding)."""

    def __init__(self, path, fmt: str, float_format: str):
        self.path, self.fmt, self.float_format = Path(path), fmt, float_format
        self.empty = True
        self._pq = None

    def __enter__(self):
        return self

    def write(self, columns: dict) -> None:
        if self.fmt == "csv":
            import pandas as pd

            pd.DataFrame(columns, copy=False).to_csv(
                self.path,
                index=False,
                float_format=self.float_format,
                mode="w" if self.empty else "a",
                header=self.empty,
            )
        else:
            import pyarrow as pa
            import pyarrow.parquet as pq

            table = pa.table(columns)
            if self._pq is None:
                self._pq = pq.ParquetWriter(self.path, table.schema, use_dictionary=False)
            self._pq.write_table(table)
        self.empty = False

    def __exit__(self, *exc):
        if self._pq is not None:
            self._pq.close()
        return False


def _load(x, unit: str) -> str:
    """A load of the count with its unit, in the report's unit system."""
    from cycj.display import MISSING, num

    if x is None:
        return MISSING
    f, shown = shown_unit(unit)
    return f"{num(float(x) * f)} {shown}".rstrip() if shown else num(float(x) * f)


def count_answer(summary: dict) -> str:
    """One sentence: how many cycles, and the largest range."""
    from cycj.display import count, num

    unit = summary.get("unit") or ""
    if summary["full_cycles"] + summary["half_cycles"] == 0:
        return (
            "No cycles: the history is constant or every change is below the gate "
            f"({_load(summary['gate'], unit)})."
        )
    return (
        f"{num(summary['cycles'], 12)} cycles ({count(summary['full_cycles'])} full + "
        f"{count(summary['half_cycles'])} half) from {count(summary['reversals'])} reversals; "
        f"the largest range is {_load(summary['largest_range'], unit)}."
    )


def write_count_report(od, summary: dict, figures) -> Path:
    """The count's self-contained HTML report (``report.html`` in ``od``)."""
    from cycj.display import count, num
    from cycj.report import write_report

    p = summary["parameters"]
    unit = summary.get("unit") or ""
    irr = summary["irregularity_factor"]
    inputs = [
        ("history", summary["history"]),
        ("column", p["column"] or "the file's load column (first numeric column)"),
        ("load unit in the file", p.get("unit") or "none given (values taken as they are)"),
        ("scale on the loads", num(p["scale"])),
        ("gate (smallest range kept)", _load(p["gate"], unit) if p["gate"] else "none"),
        (
            "history counted as",
            "a repeating block (closed cycles)"
            if p["repeat"]
            else "one pass (residue as half cycles)",
        ),
        ("samples", count(summary["samples"])),
        (
            "largest and smallest load",
            f"{_load(summary['max'], unit)}, {_load(summary['min'], unit)}",
        ),
        (
            "irregularity factor (mean up-crossings per peak)",
            num(irr, 3) if irr is not None else "not defined (no peak)",
        ),
    ]
    warnings = []
    if summary["full_cycles"] + summary["half_cycles"] == 0:
        warnings.append("no cycles were counted (constant history or every change below the gate)")
    if summary["samples"] < 3:
        warnings.append("fewer than three samples: the count is trivial")
    validity = [
        ("method", summary.get("method", "rainflow")),
        ("reversals kept", f"{count(summary['reversals'])} of {count(summary['samples'])} samples"),
    ]
    return write_report(
        od.path("report.html"),
        title=f"Rainflow count: {summary['history']}",
        question="Which load cycles does this history contain (rainflow "
        "count), and how are they distributed over range and mean?",
        answer=count_answer(summary),
        inputs=inputs,
        figures=figures,
        validity=validity,
        warnings=warnings,
        references=count_references(),
    )
