"""Reading measured load histories: CSV/TSV (any delimiter), Parquet, ``.npy`` and .xlsx.

Bad data is reported as :class:`cycj.errors.CycjInputError` naming the file and the line (for
text files the physical line number, 1-based; for Parquet and ``.npy`` the 1-based row).
The fast path uses pandas' C parser or numpy; Python only walks the file line by line to
locate an error once one is known to exist.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError
from cycj.spectrum.csv_reading import (  # noqa: F401 - re-exported
    DELIMITERS,
    TIME_NAMES,
    _pick,
    _split,
    check_values,
    choose_columns,
    is_time_name,
    read_text,
    refuse_decimal_commas,
    sniff_delimiter,
)

_TEXT_SUFFIXES = {".csv", ".tsv", ".txt", ".dat", ".asc", ""}


def read_history(
    path, column=None, unit_factor: float = 1.0, scale: float = 1.0, sheet=None
) -> np.ndarray:
    """Read one channel of a load history into a float64 array.

    Parameters
    ----------
    path : str or pathlib.Path
        A text table (``.csv``, ``.tsv``, ``.txt``, ``.dat``: delimiter sniffed among
        ``, ; tab |`` or whitespace; an optional header row; lines starting with ``#`` are
        comments), a Parquet file (``.parquet``, ``.pq``) or a numpy ``.npy`` array (1-D, 2-D
        or structured), or a spreadsheet (``.xlsx``, ``.xlsm``: the first row names the
        columns; see :mod:`cycj.spectrum.xlsx_reading`).
    column : str or int, optional
        Channel to read: a column name (exact, then case-insensitive) or a 0-based position.
        Default: the only numeric column, else the first numeric column that is not time.
    unit_factor : float, optional
        Factor from the file's unit to the internal unit (e.g. 1000 for kN → N).
    scale : float, optional
        Further factor applied to the loads (e.g. to scale a spectrum onto a part).
    sheet : str, optional
        Worksheet of a spreadsheet, by name (default: the first sheet).

    Returns
    -------
    numpy.ndarray of float64, shape (n,)
        The loads times ``unit_factor * scale``, ``n >= 2``.  A constant history is returned
        as it is (it has no cycles; counting it gives an empty table).

    Raises
    ------
    cycj.errors.CycjInputError
        Missing or empty file, header only, a single sample, an unknown column (the message
        lists the available ones), text in the number column, or NaN/inf, each naming the file
        and the line.
    """
    return read_history_with_time(path, column, unit_factor, scale, sheet=sheet)[0]


#: largest load magnitude accepted after unit and scale [N or MPa] (beyond it range and mean
#: arithmetic loses meaning, and the matrices' bin edges overflow)
MAX_LOAD = 1e100


def read_history_with_time(
    path, column=None, unit_factor: float = 1.0, scale: float = 1.0, time_column=None, sheet=None
) -> tuple[np.ndarray, np.ndarray | None]:
    """As :func:`read_history`, also returning the time channel if there is one.

    Parameters
    ----------
    time_column : str or int, optional
        Time channel [s]; by default a column named ``time``, ``time_s``, ``t`` … if present.

    Returns
    -------
    values : numpy.ndarray of float64, shape (n,)
        Loads [internal unit after ``unit_factor * scale``].
    times : numpy.ndarray of float64, shape (n,), or None
        Times [unit of the file] when a time column exists, else None.
    """
    path, kind = open_history(path, unit_factor, scale)
    src = str(path)
    if sheet is not None and kind != "xlsx":
        raise CycjInputError(
            "a sheet is chosen only in a spreadsheet", source=src, key="sheet", found=sheet
        )
    if kind == "npy":
        values, times = _read_npy(path, column, time_column)
    elif kind == "parquet":
        values, times = _read_parquet(path, column, time_column)
    elif kind == "xlsx":
        from cycj.spectrum.xlsx_reading import read_xlsx_history

        values, times = read_xlsx_history(path, column, time_column, sheet)
    else:
        try:
            values, times = read_text(path, column, time_column)
        except UnicodeDecodeError as exc:
            raise not_utf8(src, exc) from None
    return scale_loads(values, unit_factor, scale, src), times


def not_utf8(src: str, exc: UnicodeDecodeError) -> CycjInputError:
    """The error for a text history that does not decode as UTF-8."""
    return CycjInputError(
        "not a UTF-8 text file (binary data or another encoding)", source=src, found=exc.reason
    )


def open_history(path, unit_factor: float = 1.0, scale: float = 1.0) -> tuple[Path, str]:
    """Check the factors and the file, note it as an input; return the path and its format
    (``"npy"``, ``"parquet"``, ``"xlsx"`` or ``"text"``)."""
    path = Path(path)
    src = str(path)
    for name, f in (("unit_factor", unit_factor), ("scale", scale)):
        if not (isinstance(f, (int, float)) and math.isfinite(f) and f != 0):
            raise CycjInputError(f"{name} must be a finite non-zero number", source=src, found=f)
    if not path.is_file():
        raise CycjInputError("history file not found", source=src)
    from cycj.inputs_read import note_input

    note_input(path, "history")
    suffix = path.suffix.lower()
    if suffix == ".npy":
        return path, "npy"
    if suffix in (".parquet", ".pq"):
        return path, "parquet"
    if suffix in _TEXT_SUFFIXES:
        return path, "text"
    if suffix in (".xlsx", ".xlsm"):
        return path, "xlsx"
    raise CycjInputError(
        "unknown history format",
        source=src,
        expected=".csv, .tsv, .txt, .dat, .parquet, .npy or .xlsx",
        found=suffix,
    )


def scale_loads(values, unit_factor: float, scale: float, src: str, row0: int = 0):
    """``values`` times ``unit_factor * scale`` (in place when writeable), refusing overflow
    and loads beyond :data:`MAX_LOAD`; ``row0`` is the sample number of ``values[0]``."""
    factor = float(unit_factor) * float(scale)
    if factor != 1.0:
        with np.errstate(over="ignore"):
            if values.flags.writeable:
                values *= factor  # in place: no second copy of a long history
            else:  # pragma: no cover - e.g. a read-only memory map
                values = values * factor
        if not (math.isfinite(factor) and np.all(np.isfinite(values))):
            raise CycjInputError(
                "the loads overflow once the unit and scale are applied",
                source=src,
                key="scale",
                expected="a smaller scale",
                found=float(scale),
            )
    too_big = values > MAX_LOAD  # two comparisons, not np.abs: no float copy of the history
    too_big |= values < -MAX_LOAD
    big = np.flatnonzero(too_big)
    if big.size:
        raise CycjInputError(
            f"sample {row0 + big[0]} is not a plausible load",
            source=src,
            expected=f"loads below {MAX_LOAD:g} in magnitude (N or MPa)",
            found=float(values[big[0]]),
        )
    return values


# ---------------------------------------------------------------- binary formats


def row_lines(row: int) -> tuple[int, str]:
    """Line (1-based row) of a binary format's row (0-based)."""
    return row + 1, ""


def load_npy(path: Path, mmap: bool = False):
    """The array of a ``.npy`` file (memory-mapped read-only with ``mmap``)."""
    try:
        return np.load(path, allow_pickle=False, mmap_mode="r" if mmap else None)
    except (ValueError, OSError) as exc:
        raise CycjInputError(f"not a readable .npy array ({exc})", source=str(path)) from None


def npy_channels(arr, column, time_column, src):
    """Name of the load channel and the (lazy) load and time views of a ``.npy`` array."""
    if arr.dtype.names:  # structured array: fields are the columns
        names = list(arr.dtype.names)
        numeric = [np.issubdtype(arr.dtype[n], np.number) for n in names]
        pos, t_pos = choose_columns(names, numeric, column, time_column, src)
        cols = [arr[names[pos]], None if t_pos is None else arr[names[t_pos]]]
    elif arr.ndim == 1:
        if column not in (None, 0, "0"):
            _pick(["0"], column, src)
        names, cols = ["0"], [arr, None]
        pos = 0
    elif arr.ndim == 2:
        names = [str(i) for i in range(arr.shape[1])]
        pos, t_pos = choose_columns(names, [True] * len(names), column, time_column, src)
        cols = [arr[:, pos], None if t_pos is None else arr[:, t_pos]]
    else:
        raise CycjInputError(
            "a .npy history must be 1-D, 2-D or structured", source=src, found=f"shape {arr.shape}"
        )
    for c in cols:
        if c is not None and (
            not np.issubdtype(c.dtype, np.number) or np.issubdtype(c.dtype, np.complexfloating)
        ):
            raise CycjInputError(
                "the channel is not real numbers",
                source=src,
                line=1,
                expected="a real numeric array",
                found=str(c.dtype),
            )
    return names[pos], cols[0], cols[1]


def _read_npy(path: Path, column, time_column):
    src = str(path)
    arr = load_npy(path)
    name, *cols = npy_channels(arr, column, time_column, src)
    # float64 arrays are used in place (no copy)
    out = [None if c is None else np.ascontiguousarray(c, dtype=np.float64) for c in cols]
    del arr, cols
    check_values(out[0], name, src, row_lines)
    return out[0], out[1]


def parquet_channels(path: Path, column, time_column, src):
    """Names of the load and time columns (or None) of a Parquet file, from its schema."""
    import pandas as pd

    try:
        import pyarrow.parquet as pq

        schema = pq.ParquetFile(path).schema_arrow
    except Exception as exc:  # noqa: BLE001 - any corrupt-file error is reported the same way
        raise CycjInputError(f"not a readable Parquet file ({exc})", source=src) from None
    names = list(schema.names)
    if not names:
        raise CycjInputError("the Parquet file has no columns", source=src, line=1)
    try:
        empty = schema.empty_table().to_pandas()
    except Exception as exc:  # noqa: BLE001 - column types pandas cannot hold
        raise CycjInputError(f"not a readable Parquet file ({exc})", source=src) from None
    numeric = [
        pd.api.types.is_numeric_dtype(empty[n]) and not pd.api.types.is_bool_dtype(empty[n])
        for n in names
    ]
    pos, t_pos = choose_columns(names, numeric, column, time_column, src)
    for p in (pos, t_pos):
        if p is not None and not numeric[p]:
            col = pd.read_parquet(path, columns=[names[p]])[names[p]]
            num = pd.to_numeric(col, errors="coerce")
            bad = np.flatnonzero(num.isna().to_numpy() & col.notna().to_numpy())
            row = int(bad[0]) if bad.size else 0
            raise CycjInputError(
                f"not a number in column {names[p]!r} at row {row + 1}",
                source=src,
                line=row + 1,
                expected="a number",
                found=col.iloc[row] if len(col) else str(col.dtype),
            )
    return names[pos], (None if t_pos is None else names[t_pos])


def parquet_to_float(col) -> np.ndarray:
    """A numeric pandas or arrow column as float64 (nulls → NaN)."""
    if hasattr(col, "to_numpy") and not hasattr(col, "iloc"):  # a pyarrow array
        col = col.to_pandas()
    return col.to_numpy(dtype=np.float64, na_value=np.nan, copy=True)


def _read_parquet(path: Path, column, time_column):
    import pandas as pd

    src = str(path)
    name, t_name = parquet_channels(path, column, time_column, src)
    df = pd.read_parquet(path, columns=[name] if t_name is None else [name, t_name])
    values = parquet_to_float(df[name])
    times = None if t_name is None else parquet_to_float(df[t_name])
    del df
    check_values(values, name, src, row_lines)
    if times is not None:
        check_values(times, t_name, src, row_lines)
    return values, times


# ---------------------------------------------------------------- units


def history_unit(unit: str | None, key: str = "unit") -> tuple[float, str, str | None]:
    """Factor from a history's unit to cycj's internal unit, that unit, and its kind.

    Parameters
    ----------
    unit : str or None
        A force unit (``"kN"``, ``"lbf"`` → N) or a stress unit (``"MPa"``, ``"ksi"`` → MPa);
        None means the values are taken as they are.

    Returns
    -------
    factor : float
        Multiply the file's values by this.
    internal : str
        ``"N"``, ``"MPa"`` or ``""`` (no unit given).
    kind : str or None
        ``"force"``, ``"stress"`` or None.
    """
    from cycj.units import unit_factor, unit_kind

    if unit is None or not str(unit).strip():
        return 1.0, "", None
    kind = unit_kind(str(unit), ("force", "stress"))
    if kind == "force":
        return unit_factor(str(unit), "force", key=key), "N", "force"
    if kind == "stress":
        return unit_factor(str(unit), "stress", key=key), "MPa", "stress"
    raise CycjInputError(
        "not a unit of force or stress",
        key=key,
        expected="e.g. 'kN', 'N', 'MPa' or 'ksi'",
        found=unit,
    )
