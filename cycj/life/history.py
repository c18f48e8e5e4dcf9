"""The sparse history of a run as named columns: one float64 numpy array per column, in the
order of history.csv.

A single run (``cycj run``) reads, plots and writes its history from these columns without
importing pandas; :attr:`cycj.life.predict.LifeResult.history` builds the DataFrame from them
on first access (:func:`to_frame`).  Units are those of the column names (``a_mm`` [mm],
``dJ_kJm2`` [kJ/m²], ``dadN_mm_per_cycle`` [mm/cycle] …).

References
----------
None: bookkeeping of the run's records, no physics.
"""

from __future__ import annotations

import math

import numpy as np


def from_rows(rows, names) -> dict:
    """Columns ``{name: float64 array}`` of the record tuples ``rows`` (one value per name)."""
    table = np.array(rows, dtype=float).reshape(len(rows), len(names))
    return {name: table[:, k].copy() for k, name in enumerate(names)}


def n_rows(cols: dict) -> int:
    """Number of rows of the columns (0 without any column)."""
    return len(next(iter(cols.values()))) if cols else 0


def take(cols: dict, index) -> dict:
    """The rows ``index`` (an index array or a slice) of every column."""
    return {name: v[index] for name, v in cols.items()}


def drop_repeats_sorted(cols: dict, keys=("cycle", "a_mm"), by: str = "cycle") -> dict:
    """The rows whose ``keys`` values repeat none before them (the first kept; NaN equals NaN),
    in the stable order of ``by`` (NaN last): as ``drop_duplicates(subset=keys)`` then
    ``sort_values(by, kind="stable")`` would order them."""
    seen, keep = set(), []
    for i, key in enumerate(zip(*(cols[k].tolist() for k in keys), strict=True)):
        key = tuple("nan" if math.isnan(v) else v for v in key)
        if key not in seen:
            seen.add(key)
            keep.append(i)
    kept = take(cols, np.array(keep, dtype=np.intp))
    return take(kept, np.argsort(kept[by], kind="stable"))


def concat(first: dict, second: dict) -> dict:
    """The rows of ``first`` followed by those of ``second`` (same column names; the order of
    ``first``)."""
    return {name: np.concatenate([v, second[name]]) for name, v in first.items()}


def to_frame(cols: dict):
    """The columns as a pandas DataFrame (float64 columns, a fresh RangeIndex)."""
    import pandas as pd

    return pd.DataFrame({name: np.asarray(v, dtype=float) for name, v in cols.items()})
