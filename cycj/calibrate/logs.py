"""Reading fatigue crack growth test logs (CSV) into plain arrays in internal units.

Two layouts (README.md, "Calibration from replicate tests"):

* raw loops: ``cycle, load, displacement`` — every recorded cycle a run of samples round its
  loop (rows of one cycle are contiguous);
* crack length: ``cycle, crack_length, load_max, load_min`` — crack length measured otherwise.

Column names are matched case-insensitively; units come from the specimen's ``log_units``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError
from cycj.spectrum.reading import MAX_LOAD

RAW_COLUMNS = ("cycle", "load", "displacement")
CRACK_COLUMNS = ("cycle", "crack_length", "load_max", "load_min")


@dataclass
class RawLog:
    """Concatenated loop samples; loop i is ``load[starts[i]:ends[i]]`` at ``cycles[i]``."""

    name: str
    cycles: np.ndarray
    starts: np.ndarray
    ends: np.ndarray
    load: np.ndarray
    displacement: np.ndarray
    skipped: list = field(default_factory=list)


@dataclass
class CrackLog:
    """Crack length readings with the cycle's load extremes."""

    name: str
    cycles: np.ndarray
    crack_length: np.ndarray
    load_max: np.ndarray
    load_min: np.ndarray
    skipped: list = field(default_factory=list)


def read_log(path, *, load_factor=1.0, displacement_factor=1.0, crack_factor=1.0):
    """Read one log file and convert it to N and mm.

    Returns :class:`RawLog` or :class:`CrackLog`.  A missing file, a missing column or a
    non-numeric value is one :class:`CycjInputError` naming the file (and line).  Loops whose
    cycle count does not increase are skipped with a reason (listed in ``.skipped``).
    """
    path = Path(path)
    df = read_frame(path)
    return frame_log(df, str(path), path.name, load_factor, displacement_factor, crack_factor)


def read_frame(path, sheet=None):
    """The CSV (or .xlsx sheet, chosen by name) of a log as a DataFrame (one
    :class:`CycjInputError` naming the file)."""
    import pandas as pd

    path = Path(path)
    src = str(path)
    if not path.is_file():
        raise CycjInputError("log file not found", source=src)
    from cycj.inputs_read import note_input

    note_input(path, "log")
    from cycj.spectrum.xlsx_reading import is_xlsx, read_xlsx_frame

    if is_xlsx(path):
        return read_xlsx_frame(path, sheet)
    if sheet is not None:
        raise CycjInputError("a sheet is chosen only in a spreadsheet", source=src, key="--sheet")
    from cycj.spectrum.reading import sniff_delimiter

    try:
        sep = sniff_delimiter(path, src)  # , ; tab | or whitespace, as histories
        df = pd.read_csv(
            path,
            sep=sep if sep else r"\s+",
            skipinitialspace=True,
            comment="#",
            encoding="utf-8-sig",
        )
    except (pd.errors.ParserError, pd.errors.EmptyDataError, UnicodeDecodeError) as exc:
        raise CycjInputError(f"cannot read the CSV ({type(exc).__name__})", source=src) from None
    return df


def frame_log(df, src, name, load_factor=1.0, displacement_factor=1.0, crack_factor=1.0):
    """Check the columns of a log read into a DataFrame ``df`` and convert it to N and mm
    (``src`` names the file in errors, ``name`` the log).  Used by :func:`read_log` and for
    the tests of a long-format file (:mod:`cycj.calibrate.replicates`)."""

    df.columns = [str(c).strip().lower() for c in df.columns]
    cols = set(df.columns)
    if set(RAW_COLUMNS) <= cols:
        kind, want = "raw", RAW_COLUMNS
    elif set(CRACK_COLUMNS) <= cols:
        kind, want = "crack", CRACK_COLUMNS
    else:
        raise CycjInputError(
            "unknown log layout",
            source=src,
            expected="columns " + ", ".join(RAW_COLUMNS) + " or " + ", ".join(CRACK_COLUMNS),
            found=", ".join(df.columns),
        )
    data = {}
    for c in want:
        vals = _numeric(df[c])
        bad = np.flatnonzero(~np.isfinite(vals))
        if bad.size and (c == "cycle" or kind == "crack"):
            raise CycjInputError(
                f"column '{c}' holds a value that is not a finite number",
                source=src,
                line=int(df.index[bad[0]]) + 2,
                found=str(df[c].iloc[bad[0]]),
            )
        big = np.flatnonzero(np.abs(vals) > MAX_LOAD)
        if big.size:
            raise CycjInputError(
                f"column '{c}' holds an implausible value",
                source=src,
                line=int(df.index[big[0]]) + 2,
                expected=f"magnitude below {MAX_LOAD:g}",
                found=str(df[c].iloc[big[0]]),
            )
        data[c] = vals
    _check_cycles(data["cycle"], src, df.index.to_numpy())
    if kind == "crack":
        return _crack_log(name, data, crack_factor, load_factor)
    return _raw_log(name, data, load_factor, displacement_factor)


def _numeric(col) -> np.ndarray:
    """A column as floats: text is NaN, an integer beyond the float range ±inf."""
    import pandas as pd

    try:
        return pd.to_numeric(col, errors="coerce").to_numpy(float)
    except OverflowError:
        return np.array([_float(v) for v in col], dtype=float)


def _float(v) -> float:
    try:
        return float(v)
    except OverflowError:  # an int of more than ~309 digits
        return math.inf if v > 0 else -math.inf
    except (TypeError, ValueError):
        return math.nan


def _check_cycles(cyc, src, rows=None):
    """Cycle counts are ≥ 0 and, once they change, span at least one cycle (``rows``: the
    frame's row labels, for the line numbers of a part of a file)."""
    neg = np.flatnonzero(cyc < 0)
    if neg.size:
        raise CycjInputError(
            "negative cycle count",
            source=src,
            line=int(neg[0] if rows is None else rows[neg[0]]) + 2,
            expected="a count ≥ 0",
            found=float(cyc[neg[0]]),
        )
    if cyc.size and 0 < cyc.max() - cyc.min() < 1.0:
        raise CycjInputError(
            "the cycle counts of the whole log span less than one cycle",
            source=src,
            key="cycle",
            expected="counts in cycles",
            found=float(cyc.max() - cyc.min()),
        )


def _increasing(name, cycles):
    """Mask of readings whose cycle count increases, and the skip reasons of the others."""
    keep = np.ones(cycles.size, bool)
    skipped = []
    last = -np.inf
    for i, c in enumerate(cycles):
        if c <= last:
            keep[i] = False
            skipped.append(
                {"log": name, "cycle": float(c), "reason": "cycle count does not increase"}
            )
        else:
            last = c
    return keep, skipped


def _crack_log(name, data, crack_factor, load_factor):
    n = data["cycle"]
    keep, skipped = _increasing(name, n)
    return CrackLog(
        name,
        n[keep],
        data["crack_length"][keep] * crack_factor,
        data["load_max"][keep] * load_factor,
        data["load_min"][keep] * load_factor,
        skipped,
    )


def _raw_log(name, data, load_factor, displacement_factor):
    cyc = data["cycle"]
    if cyc.size == 0:
        raise CycjInputError("the log has no rows", source=name)
    change = np.flatnonzero(np.diff(cyc) != 0) + 1
    starts = np.concatenate([[0], change])
    ends = np.concatenate([change, [cyc.size]])
    run_cycles = cyc[starts]
    keep, skipped = _increasing(name, run_cycles)
    return RawLog(
        name,
        run_cycles[keep],
        starts[keep],
        ends[keep],
        data["load"] * load_factor,
        data["displacement"] * displacement_factor,
        skipped,
    )
