"""Text tables (CSV/TSV, any delimiter) and the column rules every history format shares.

One :class:`TextPlan` (delimiter, header, columns, rows to skip) serves the whole-file reader
and the chunked reader (:mod:`cycj.spectrum.chunked_reading`), so both parse alike.  Errors
are :class:`cycj.errors.CycjInputError` naming the file and the physical line (1-based).
"""

from __future__ import annotations

import csv
import re
from pathlib import Path
from typing import NamedTuple

import numpy as np

from cycj.errors import CycjInputError

#: column names taken to hold time (compared in lower case)
TIME_NAMES = ("t", "t_s", "time", "time_s", "times", "seconds", "sec", "s")
#: delimiters tried by the sniffer; none of them → whitespace
DELIMITERS = ",;\t|"


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


def choose_columns(names, numeric, column, time_column, src):
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


class TextPlan(NamedTuple):
    """How a text table is parsed: one plan for the whole-file and the chunked readers."""

    path: Path
    sep: str | None
    skip: int
    names: list
    pos: int
    t_pos: int | None

    @property
    def use(self) -> list[int]:
        """Positions of the fields read (the load column, then time if any)."""
        return [self.pos] if self.t_pos is None else [self.pos, self.t_pos]

    def read_csv_kwargs(self) -> dict:
        """Arguments of :func:`pandas.read_csv` for this table (pandas' C parser)."""
        return {
            "sep": self.sep if self.sep else r"\s+",
            "header": None,
            "skiprows": self.skip,
            "usecols": self.use,
            "comment": "#",
            "dtype": np.float64,
            "engine": "c",
            "skip_blank_lines": True,
            "quotechar": '"',
            "encoding": "utf-8-sig",
        }


def text_plan(path: Path, column, time_column) -> TextPlan:
    """Delimiter, header, columns and rows to skip of a text table (reads its first lines).

    Raises :class:`cycj.errors.CycjInputError` for an empty file, a file of comments only, a
    header without data, decimal commas and unknown columns.
    """
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
    pos, t_pos = choose_columns(names, numeric, column, time_column, src)
    skip = first_no if header else first_no - 1
    return TextPlan(path, sep, skip, names, pos, t_pos)


def iter_text_frames(plan: TextPlan, chunksize: int | None = None):
    """DataFrames of the plan's columns (the whole table, or ``chunksize`` rows at a time);
    a field that is not a number is reported with its line."""
    import pandas as pd

    src = str(plan.path)
    try:
        if chunksize is None:
            yield pd.read_csv(plan.path, **plan.read_csv_kwargs())
            return
        with pd.read_csv(plan.path, chunksize=int(chunksize), **plan.read_csv_kwargs()) as rd:
            yield from rd
    except (ValueError, pd.errors.ParserError) as exc:
        _locate_text_error(plan.path, plan.sep, plan.skip, plan.use, plan.names, src, exc)
        raise  # pragma: no cover - _locate_text_error always raises


def text_columns(plan: TextPlan, df, row0: int = 0):
    """Load and time arrays (float64, checked finite) of a frame whose first row is data row
    ``row0`` of the table."""
    src = str(plan.path)
    line_of = _TextLines(plan.path, plan.skip, row0)
    values = df[plan.pos].to_numpy(dtype=np.float64, copy=True)
    times = None if plan.t_pos is None else df[plan.t_pos].to_numpy(dtype=np.float64, copy=True)
    check_finite(values, plan.names[plan.pos], src, line_of)
    if times is not None:
        check_finite(times, plan.names[plan.t_pos], src, line_of)
    return values, times


def read_text(path: Path, column, time_column):
    """The load and time columns of a whole text table (see :func:`text_plan`)."""
    plan = text_plan(path, column, time_column)
    df = next(iter_text_frames(plan))
    values, times = text_columns(plan, df)
    del df
    check_length(values.shape[0], str(path), _TextLines(path, plan.skip))
    return values, times


class _TextLines:
    """Maps a data row (0-based) to its physical line and text (walks the file; error path)."""

    def __init__(self, path: Path, skip: int, row0: int = 0):
        self.path, self.skip, self.row0 = path, skip, row0

    def __call__(self, row: int) -> tuple[int, str]:
        row += self.row0
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


def check_finite(values, name, src, line_of):
    """All samples finite; an error names the line via ``line_of(row) -> (line, text)``."""
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


def check_length(n: int, src, line_of):
    """At least two samples (``n`` in all); errors name the line via ``line_of``."""
    if n == 0:
        raise CycjInputError("the history has no samples", source=src, line=line_of(0)[0])
    if n == 1:
        raise CycjInputError(
            "only one sample: a load history needs at least two", source=src, line=line_of(0)[0]
        )


def check_values(values, name, src, line_of):
    """Enough samples, all finite (:func:`check_finite`, :func:`check_length`)."""
    if values.shape[0] == 0:
        check_length(0, src, line_of)
    check_finite(values, name, src, line_of)
    check_length(values.shape[0], src, line_of)
