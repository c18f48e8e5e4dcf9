"""Summary and output files of a cycle count (what ``cycj count`` prints and writes)."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from cycj.spectrum.rainflow import CYCLE_COLUMNS
from cycj.spectrum.statistics import (
    from_to_matrix,
    irregularity_factor,
    matrix_frame,
    range_exceedance,
    range_mean_matrix,
)

#: files written by :func:`write_count_outputs`
OUTPUT_FILES = (
    "cycles.csv",
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
    full = int(np.count_nonzero(count == 1.0))
    half = int(np.count_nonzero(count == 0.5))
    n = int(values.shape[0])
    irr = irregularity_factor(values, gate) if n else float("nan")
    return {
        "samples": n,
        "reversals": int(cycles["n_reversals"]),
        "full_cycles": full,
        "half_cycles": half,
        "cycles": full + 0.5 * half,
        "largest_range": float(cycles["range"].max()) if count.size else 0.0,
        "max": float(values.max()) if n else None,
        "min": float(values.min()) if n else None,
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

    Returns
    -------
    list of pathlib.Path
        The files written (temporary paths; same names in the final folder).
    """
    import pandas as pd

    from cycj.spectrum import plots as P

    suffix = f"_{unit}" if unit else ""
    table = pd.DataFrame({k: cycles[k] for k in CYCLE_COLUMNS})
    rm, r_edges, m_edges = range_mean_matrix(
        cycles["range"], cycles["mean"], cycles["count"], bins, bins
    )
    ft, edges = from_to_matrix(values, cycles["start"], cycles["end"], cycles["count"], bins)
    levels, cum = range_exceedance(cycles["range"], cycles["count"])
    fmt = "%.10g"
    written = [od.write_csv("cycles.csv", table, float_format=fmt)]
    for name, frame in (
        (
            "range_mean_matrix.csv",
            matrix_frame(rm, r_edges, m_edges, f"range{suffix}", f"mean{suffix}"),
        ),
        ("from_to_matrix.csv", matrix_frame(ft, edges, edges, f"from{suffix}", f"to{suffix}")),
    ):
        frame.to_csv(od.path(name), float_format=fmt)
        written.append(od.path(name))
    written.append(
        od.write_csv(
            "exceedance.csv",
            pd.DataFrame({f"range{suffix}": levels, "cycles_exceeding": cum}),
            float_format=fmt,
        )
    )
    if plots:
        rev_idx = np.unique(np.concatenate((cycles["start"], cycles["end"])) % max(len(values), 1))
        P.plot_history(
            values, od.path("history.png"), times=times, unit=unit, reversal_indices=rev_idx
        )
        P.plot_exceedance(levels, cum, od.path("exceedance.png"), unit=unit, kind="range")
        P.plot_rainflow_matrix(rm, r_edges, m_edges, od.path("rainflow_matrix.png"), unit=unit)
        written += [od.path(n) for n in ("history.png", "exceedance.png", "rainflow_matrix.png")]
    return written


def count_answer(summary: dict) -> str:
    """One sentence: how many cycles, and the largest range."""
    u = f" {summary['unit']}" if summary.get("unit") else ""
    if summary["full_cycles"] + summary["half_cycles"] == 0:
        return (
            "No cycles: the history is constant or every change is below the gate "
            f"({summary['gate']:g}{u})."
        )
    return (
        f"{summary['cycles']:g} cycles ({summary['full_cycles']} full + "
        f"{summary['half_cycles']} half) from {summary['reversals']} reversals; the largest "
        f"range is {summary['largest_range']:.4g}{u}."
    )


def write_count_report(od, summary: dict, figures) -> Path:
    """The count's self-contained HTML report (``report.html`` in ``od``)."""
    from cycj.report import write_report

    p = summary["parameters"]
    u = summary.get("unit") or "as in the file"
    inputs = [
        ("history", summary["history"]),
        ("column", p["column"]),
        ("load unit", u),
        ("scale", p["scale"]),
        ("gate", p["gate"]),
        ("repeating block", p["repeat"]),
        ("samples", summary["samples"]),
        ("max, min", f"{summary['max']}, {summary['min']}"),
        ("irregularity factor", summary["irregularity_factor"]),
    ]
    warnings = []
    if summary["full_cycles"] + summary["half_cycles"] == 0:
        warnings.append("no cycles were counted (constant history or every change below the gate)")
    if summary["samples"] < 3:
        warnings.append("fewer than three samples: the count is trivial")
    return write_report(
        od.path("report.html"),
        title=f"Rainflow count: {summary['history']}",
        question="Which load cycles does this history contain (rainflow "
        "count), and how are they distributed over range and mean?",
        answer=count_answer(summary),
        inputs=inputs,
        figures=figures,
        warnings=warnings,
        references=count_references(),
    )
