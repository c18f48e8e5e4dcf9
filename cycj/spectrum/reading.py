"""Reading measured load histories: CSV/TSV (any delimiter), Parquet and ``.npy``.

Bad data is reported as :class:`cycj.errors.CycjInputError` naming the file and the line (for
text files the physical line number, 1-based; for Parquet and ``.npy`` the 1-based row).
The fast path uses pandas' C parser or numpy; Python only walks the file line by line to
locate an error once one is known to exist.
"""

from __future__ import annotations

import csv
import math
import re
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError

#: column names taken to hold time (compared in lower case)
TIME_NAMES = ("t", "t_s", "time", "time_s", "times", "seconds", "sec", "s")
#: delimiters tried by the sniffer; none of them → whitespace
DELIMITERS = ",;\t|"
_TEXT_SUFFIXES = {".csv", ".tsv", ".txt", ".dat", ".asc", ""}


def read_history(path, column=None, unit_factor: float = 1.0, scale: float = 1.0) -> np.ndarray:
    """Read one channel of a load history into a float64 array.

    Parameters
    ----------
    path : str or pathlib.Path
        A text table (``.csv``, ``.tsv``, ``.txt``, ``.dat``: delimiter sniffed among
        ``, ; tab |`` or whitespace; an optional header row; lines starting with ``#`` are
        comments), a Parquet file (``.parquet``, ``.pq``) or a numpy ``.npy`` array (1-D, 2-D
        or structured).
    column : str or int, optional
        Channel to read: a column name (exact, then case-insensitive) or a 0-based position.
        Default: the only numeric column, else the first numeric column that is not time.
    unit_factor : float, optional
        Factor from the file's unit to the internal unit (e.g. 1000 for kN → N).
    scale : float, optional
        Further factor applied to the loads (e.g. to scale a spectrum onto a part).

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
    return read_history_with_time(path, column, unit_factor, scale)[0]


#: largest load magnitude accepted after unit and scale [N or MPa] (beyond it range and mean
#: arithmetic loses meaning, and the matrices' bin edges overflow)
MAX_LOAD = 1e100


def read_history_with_time(
    path, column=None, unit_factor: float = 1.0, scale: float = 1.0, time_column=None
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
        values, times = _read_npy(path, column, time_column)
    elif suffix in (".parquet", ".pq"):
        values, times = _read_parquet(path, column, time_column)
    elif suffix in _TEXT_SUFFIXES:
        try:
            values, times = _read_text(path, column, time_column)
        except UnicodeDecodeError as exc:
            raise CycjInputError(
                "not a UTF-8 text file (binary data or another encoding)",
                source=src,
                found=exc.reason,
            ) from None
    else:
        raise CycjInputError(
            "unknown history format",
            source=src,
            expected=".csv, .tsv, .txt, .dat, .parquet or .npy",
            found=suffix,
        )
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
    big = np.flatnonzero(np.abs(values) > MAX_LOAD)
    if big.size:
        raise CycjInputError(
            f"sample {big[0]} is not a plausible load",
            source=src,
            expected=f"loads below {MAX_LOAD:g} in magnitude (N or MPa)",
            found=float(values[big[0]]),
        )
    return values, times


# ---------------------------------------------------------------- choosing columns


def is_time_name(name: str) -> bool:
    """True when a column name says it holds time (``time``, ``time_s``, ``t`` …)."""
    low = str(name).strip().lower()
    return low in TIME_NAMES or low.startswith("time")


def _pick(names, wanted, src, what="column"):
    """Position of ``wanted`` (name or 0-based position) in ``names``, or a clear error."""
    names = [str(n) for n in names]
    if isinstance(wanted, (int, np.integer)) and not isinstance(wanted, bool):
        pos = int(wanted)
    else:
        w = str(wanted)
        if w in names:
            return names.index(w)
        low = [n.lower() for n in names]
        if w.lower() in low:
            return low.index(w.lower())
        pos = int(w) if w.lstrip("-").isdigit() else None
    if pos is not None and 0 <= pos < len(names):
        return pos
    raise CycjInputError(
        f"no {what} {wanted!r} in the history",
        source=src,
        expected="one of: " + ", ".join(repr(n) for n in names),
        found=wanted,
    )


def _choose(names, numeric, column, time_column, src):
    """Positions of the load column and the time column (or None)."""
    if time_column is not None:
        t_pos = _pick(names, time_column, src, "time column")
    else:
        t_pos = next((i for i, n in enumerate(names) if is_time_name(n)), None)
        if t_pos is not None and len(names) == 1:
            t_pos = None
    if column is not None:
        pos = _pick(names, column, src)
        return pos, (None if t_pos == pos else t_pos)
    candidates = [i for i in range(len(names)) if i != t_pos]
    num = [i for i in candidates if numeric[i]]
    pos = (num or candidates or [0])[0]
    return pos, t_pos


# ---------------------------------------------------------------- text tables


def _split(line: str, sep: str | None) -> list[str]:
    line = line.split("#", 1)[0]
    parts = line.split(sep) if sep else line.split()
    return [p.strip().strip('"').strip("'") for p in parts]


def _is_number(tok: str) -> bool:
    try:
        float(tok)
    except ValueError:
        return False
    return True


def _scan_head(path: Path):
    """First content line number (1-based), its text, and up to 50 further content lines."""
    first_no, first, more = None, None, []
    with path.open("r", encoding="utf-8-sig", errors="strict") as fh:
        for no, line in enumerate(fh, start=1):
            s = line.strip()
            if not s or s.startswith("#"):
                continue
            if first is None:
                first_no, first = no, line
            else:
                more.append(line)
                if len(more) >= 50:
                    break
    return first_no, first, more


def _sniff(lines: list[str]) -> str | None:
    sample = "".join(s.split("#", 1)[0].rstrip() + "\n" for s in lines)
    try:
        return csv.Sniffer().sniff(sample, delimiters=DELIMITERS).delimiter
    except csv.Error:
        first = lines[0]
        for d in DELIMITERS:  # a single line: the first delimiter present
            if d in first:
                return d
        return None


_DECIMAL_COMMA = re.compile(r"^[+-]?\d+,\d+(?:[eE][+-]?\d+)?$")


def refuse_decimal_commas(lines: list[str], sep: str | None, src: str) -> None:
    """Raise when the table's first content lines write numbers with a decimal comma (read as
    two fields, or as text): cycj reads a decimal point only."""
    if sep != ",":
        for line in lines:
            for tok in _split(line, sep):
                if _DECIMAL_COMMA.match(tok):
                    raise CycjInputError(
                        "a number with a decimal comma: write numbers with a decimal point",
                        source=src,
                        found=tok,
                    )
        return
    header = [t for t in _split(lines[0], sep) if t]
    data = lines[1:]
    if header and not all(_is_number(t) for t in header) and data:
        if all(len(_split(ln, sep)) > len(header) for ln in data):
            raise CycjInputError(
                "every row has more fields than the header (decimal commas?): write numbers "
                "with a decimal point",
                source=src,
                found=data[0].strip(),
            )


def sniff_delimiter(path, src: str | None = None) -> str | None:
    """Delimiter of a text table from its first content lines: ``,`` ``;`` tab ``|``, or None
    for whitespace; refuses decimal commas (:func:`refuse_decimal_commas`).  A UTF-8 byte-order
    mark is skipped."""
    path = Path(path)
    src = src or str(path)
    _, first, more = _scan_head(path)
    if first is None:
        return ","
    sep = _sniff([first, *more])
    refuse_decimal_commas([first, *more], sep, src)
    return sep


def _read_text(path: Path, column, time_column):
    import pandas as pd

    src = str(path)
    if path.stat().st_size == 0:
        raise CycjInputError("the history file is empty", source=src, line=1)
    first_no, first, more = _scan_head(path)
    if first is None:
        raise CycjInputError(
            "the history file has no data (only comments or blank lines)", source=src, line=1
        )
    sep = _sniff([first, *more])
    refuse_decimal_commas([first, *more], sep, src)
    tokens = _split(first, sep)
    header = not all(_is_number(t) for t in tokens if t)
    names = tokens if header else [str(i) for i in range(len(tokens))]
    data_sample = more if header else [first, *more]
    if not data_sample:
        raise CycjInputError("the history has a header but no data", source=src, line=first_no + 1)
    sample_tokens = _split(data_sample[0], sep)
    numeric = [i < len(sample_tokens) and _is_number(sample_tokens[i]) for i in range(len(names))]
    pos, t_pos = _choose(names, numeric, column, time_column, src)
    use = [pos] if t_pos is None else [pos, t_pos]
    skip = first_no if header else first_no - 1
    try:
        df = pd.read_csv(
            path,
            sep=sep if sep else r"\s+",
            header=None,
            skiprows=skip,
            usecols=use,
            comment="#",
            dtype=np.float64,
            engine="c",
            skip_blank_lines=True,
            quotechar='"',
            encoding="utf-8-sig",
        )
    except (ValueError, pd.errors.ParserError) as exc:
        _locate_text_error(path, sep, skip, use, names, src, exc)
        raise  # pragma: no cover - _locate_text_error always raises
    values = df[pos].to_numpy(dtype=np.float64, copy=True)
    times = None if t_pos is None else df[t_pos].to_numpy(dtype=np.float64, copy=True)
    del df
    line_of = _TextLines(path, skip)
    _check_values(values, names[pos], src, line_of)
    if times is not None:
        _check_values(times, names[t_pos], src, line_of)
    return values, times


class _TextLines:
    """Maps a data row (0-based) to its physical line and text (walks the file; error path)."""

    def __init__(self, path: Path, skip: int):
        self.path, self.skip = path, skip

    def __call__(self, row: int) -> tuple[int, str]:
        r = -1
        with self.path.open("r", encoding="utf-8-sig") as fh:
            for no, line in enumerate(fh, start=1):
                if no <= self.skip:
                    continue
                s = line.strip()
                if not s or s.startswith("#"):
                    continue
                r += 1
                if r == row:
                    return no, line.rstrip("\n")
        return no + 1, ""  # pragma: no cover


def _locate_text_error(path, sep, skip, use, names, src, exc):
    """Find the first line whose wanted fields are not numbers; raise for it."""
    with path.open("r", encoding="utf-8-sig") as fh:
        for no, line in enumerate(fh, start=1):
            if no <= skip:
                continue
            s = line.strip()
            if not s or s.startswith("#"):
                continue
            toks = _split(line, sep)
            for i in use:
                if i >= len(toks):
                    raise CycjInputError(
                        f"missing field for column {names[i]!r}",
                        source=src,
                        line=no,
                        expected=f"{len(names)} fields",
                        found=line.rstrip("\n"),
                    )
                tok = toks[i]
                if tok and not _is_number(tok):
                    raise CycjInputError(
                        f"not a number in column {names[i]!r}",
                        source=src,
                        line=no,
                        expected="a number",
                        found=tok,
                    )
    raise CycjInputError(f"cannot read the table ({str(exc).splitlines()[0]})", source=src)


def _check_values(values, name, src, line_of):
    """Enough samples, all finite; errors name the line via ``line_of(row) -> (line, text)``."""
    n = values.shape[0]
    if n == 0:
        raise CycjInputError("the history has no samples", source=src, line=line_of(0)[0])
    bad = ~np.isfinite(values)
    if bad.any():
        row = int(np.flatnonzero(bad)[0])
        line, text = line_of(row)
        raise CycjInputError(
            f"not a finite number in column {name!r} (NaN, inf or empty)",
            source=src,
            line=line,
            expected="a finite number",
            found=text if text else values[row],
        )
    if n == 1:
        raise CycjInputError(
            "only one sample: a load history needs at least two", source=src, line=line_of(0)[0]
        )


# ---------------------------------------------------------------- binary formats


def _row_lines(row: int) -> tuple[int, str]:
    return row + 1, ""


def _read_npy(path: Path, column, time_column):
    src = str(path)
    try:
        arr = np.load(path, allow_pickle=False)
    except (ValueError, OSError) as exc:
        raise CycjInputError(f"not a readable .npy array ({exc})", source=src) from None
    if arr.dtype.names:  # structured array: fields are the columns
        names = list(arr.dtype.names)
        numeric = [np.issubdtype(arr.dtype[n], np.number) for n in names]
        pos, t_pos = _choose(names, numeric, column, time_column, src)
        cols = [arr[names[pos]], None if t_pos is None else arr[names[t_pos]]]
    elif arr.ndim == 1:
        if column not in (None, 0, "0"):
            _pick(["0"], column, src)
        names, cols = ["0"], [arr, None]
        pos = 0
    elif arr.ndim == 2:
        names = [str(i) for i in range(arr.shape[1])]
        pos, t_pos = _choose(names, [True] * len(names), column, time_column, src)
        cols = [arr[:, pos], None if t_pos is None else arr[:, t_pos]]
    else:
        raise CycjInputError(
            "a .npy history must be 1-D, 2-D or structured", source=src, found=f"shape {arr.shape}"
        )
    out = []
    for c in cols:
        if c is None:
            out.append(None)
            continue
        if not np.issubdtype(c.dtype, np.number) or np.issubdtype(c.dtype, np.complexfloating):
            raise CycjInputError(
                "the channel is not real numbers",
                source=src,
                line=1,
                expected="a real numeric array",
                found=str(c.dtype),
            )
        # float64 arrays are used in place (no copy)
        out.append(np.ascontiguousarray(c, dtype=np.float64))
    del arr
    _check_values(out[0], names[pos], src, _row_lines)
    return out[0], out[1]


def _read_parquet(path: Path, column, time_column):
    import pandas as pd

    src = str(path)
    try:
        import pyarrow.parquet as pq

        names = list(pq.ParquetFile(path).schema_arrow.names)
    except ImportError:  # pragma: no cover - pyarrow is the usual engine
        names = list(pd.read_parquet(path).columns)
    except Exception as exc:  # noqa: BLE001 - any corrupt-file error is reported the same way
        raise CycjInputError(f"not a readable Parquet file ({exc})", source=src) from None
    if not names:
        raise CycjInputError("the Parquet file has no columns", source=src, line=1)
    df = pd.read_parquet(path)
    numeric = [
        pd.api.types.is_numeric_dtype(df[n]) and not pd.api.types.is_bool_dtype(df[n])
        for n in names
    ]
    pos, t_pos = _choose(names, numeric, column, time_column, src)
    out = []
    for p in (pos, t_pos):
        if p is None:
            out.append(None)
            continue
        col = df[names[p]]
        if not numeric[p]:
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
        out.append(col.to_numpy(dtype=np.float64, na_value=np.nan, copy=True))
    del df
    _check_values(out[0], names[pos], src, _row_lines)
    if out[1] is not None:
        _check_values(out[1], names[t_pos], src, _row_lines)
    return out[0], out[1]


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
