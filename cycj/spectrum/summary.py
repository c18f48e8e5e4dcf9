"""Summary and output files of a cycle count (what ``cycj count`` prints and writes)."""

from __future__ import annotations

import os
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError
from cycj.spectrum.rainflow import CYCLE_COLUMNS
from cycj.spectrum.statistics import (
    from_to_matrix,
    irregularity_factor,
    matrix_frame,
    range_exceedance,
    range_mean_matrix,
)

#: files written by :func:`write_count_outputs`
OUTPUT_FILES = ("cycles.csv", "range_mean_matrix.csv", "from_to_matrix.csv", "exceedance.csv",
                "history.png", "exceedance.png", "rainflow_matrix.png")


def count_summary(values: np.ndarray, cycles: dict, gate: float, repeat: bool,
                  unit: str = "") -> dict:
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


def prepare_output_dir(out_dir, force: bool = False, inputs=()) -> Path:
    """Create ``out_dir`` or check it may be written: a non-empty folder is refused unless
    ``force``; an output file that is one of ``inputs`` is always refused."""
    out = Path(out_dir)
    if out.exists() and not out.is_dir():
        raise CycjInputError("the output path exists and is not a folder", source=str(out))
    if out.is_dir() and any(out.iterdir()) and not force:
        raise CycjInputError("the output folder is not empty; give --force to overwrite its "
                             "files", source=str(out))
    resolved = {Path(p).resolve() for p in inputs}
    for name in OUTPUT_FILES:
        if (out / name).resolve() in resolved:
            raise CycjInputError("an output would overwrite the input history",
                                 source=str(out / name))
    out.mkdir(parents=True, exist_ok=True)
    return out


def _atomic(path: Path, write):
    tmp = path.with_name(f".{path.name}.tmp-{os.getpid()}")
    try:
        write(tmp)
        os.replace(tmp, path)
    finally:
        if tmp.exists():
            tmp.unlink()
    return path


def write_count_outputs(out_dir, values: np.ndarray, cycles: dict, unit: str = "",
                        times=None, bins: int = 32) -> list[Path]:
    """Write the cycle table, the rainflow matrices, the exceedance table and three PNGs.

    Every file is written under a temporary name in ``out_dir`` and then renamed, so a reader
    never sees half a file.  Call :func:`prepare_output_dir` first.

    Parameters
    ----------
    out_dir : str or pathlib.Path
        Output folder (must exist).
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

    Returns
    -------
    list of pathlib.Path
        The files written.
    """
    import pandas as pd

    from cycj.spectrum import plots

    out = Path(out_dir)
    suffix = f"_{unit}" if unit else ""
    table = pd.DataFrame({k: cycles[k] for k in CYCLE_COLUMNS})
    rm, r_edges, m_edges = range_mean_matrix(cycles["range"], cycles["mean"], cycles["count"],
                                             bins, bins)
    ft, edges = from_to_matrix(values, cycles["start"], cycles["end"], cycles["count"], bins)
    levels, cum = range_exceedance(cycles["range"], cycles["count"])
    written = [
        _atomic(out / "cycles.csv",
                lambda p: table.to_csv(p, index=False, float_format="%.10g")),
        _atomic(out / "range_mean_matrix.csv",
                lambda p: matrix_frame(rm, r_edges, m_edges, f"range{suffix}",
                                       f"mean{suffix}").to_csv(p, float_format="%.10g")),
        _atomic(out / "from_to_matrix.csv",
                lambda p: matrix_frame(ft, edges, edges, f"from{suffix}",
                                       f"to{suffix}").to_csv(p, float_format="%.10g")),
        _atomic(out / "exceedance.csv",
                lambda p: pd.DataFrame({f"range{suffix}": levels, "cycles_exceeding": cum})
                .to_csv(p, index=False, float_format="%.10g")),
    ]
    rev_idx = np.unique(np.concatenate((cycles["start"], cycles["end"])) % max(len(values), 1))
    written += [
        _atomic(out / "history.png",
                lambda p: plots.plot_history(values, p, times=times, unit=unit,
                                             reversal_indices=rev_idx)),
        _atomic(out / "exceedance.png",
                lambda p: plots.plot_exceedance(levels, cum, p, unit=unit, kind="range")),
        _atomic(out / "rainflow_matrix.png",
                lambda p: plots.plot_rainflow_matrix(rm, r_edges, m_edges, p, unit=unit)),
    ]
    return written
