"""Spreadsheets (.xlsx, .xlsm) as people keep load histories and test logs, read through
openpyxl (optional extra ``xlsx``): one sheet chosen by name, its first row the column names.

Errors are one line naming the file, the sheet (and the row, as the spreadsheet numbers it)
and what was expected.  Cells are read as values (formulas give their last computed value).
"""

from __future__ import annotations

import difflib
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError

#: spreadsheet suffixes read here
XLSX_SUFFIXES = (".xlsx", ".xlsm")


def is_xlsx(path) -> bool:
    return Path(path).suffix.lower() in XLSX_SUFFIXES


def read_sheet(path, sheet: str | None = None):
    """The column names (first row), the data rows, the sheet's name and the spreadsheet row
    number of each data row (the header is row 1).

    ``sheet`` is a worksheet name (exact, then case-insensitive); None takes the first sheet.
    Empty rows are skipped; a sheet with no data row is an error.
    """
    src = str(path)
    try:
        import openpyxl
    except ImportError:  # pragma: no cover - optional dependency
        raise CycjInputError(
            "reading .xlsx needs openpyxl: pip install 'cycj[xlsx]'", source=src
        ) from None
    try:
        book = openpyxl.load_workbook(path, read_only=True, data_only=True)
    except Exception as exc:  # noqa: BLE001 - zip, XML or format errors of a damaged file
        raise CycjInputError(
            f"not a readable .xlsx workbook ({type(exc).__name__})", source=src
        ) from None
    try:
        names = list(book.sheetnames)
        ws = book[_sheet_name(names, sheet, src)]
        numbered = [
            (no, r)
            for no, r in enumerate(ws.iter_rows(values_only=True), start=1)
            if any(v is not None for v in r)
        ]
    finally:
        book.close()
    title = ws.title
    where = f"{src} [sheet {title!r}]"
    rows = [r for _, r in numbered]
    if not rows:
        raise CycjInputError("the sheet is empty", source=where, expected="a header row and data")
    header = [("" if v is None else str(v).strip()) for v in rows[0]]
    if all(_number(v) is not None for v in rows[0] if v is not None):
        raise CycjInputError(
            "the first row holds numbers, not column names",
            source=f"{src} [sheet {title!r}, row {numbered[0][0]}]",
            expected="a header row naming the columns",
        )
    if len(rows) < 2:
        raise CycjInputError("the sheet has a header but no data", source=where)
    width = len(header)
    data = [tuple(r[:width]) + (None,) * (width - len(r)) for r in rows[1:]]
    return header, data, title, [no for no, _ in numbered[1:]]


def _sheet_name(names: list[str], sheet, src: str) -> str:
    if sheet is None:
        return names[0]
    if sheet in names:
        return sheet
    low = {n.lower(): n for n in names}
    if str(sheet).lower() in low:
        return low[str(sheet).lower()]
    near = difflib.get_close_matches(str(sheet), names, n=1)
    hint = f" (did you mean {near[0]!r}?)" if near else ""
    raise CycjInputError(
        f"no sheet {sheet!r} in the workbook{hint}",
        source=src,
        key="sheet",
        expected="one of: " + ", ".join(repr(n) for n in names),
        found=sheet,
    )


def _number(v):
    if isinstance(v, bool):
        return None
    if isinstance(v, (int, float)):
        return float(v)
    if isinstance(v, str):
        try:
            return float(v.strip())
        except ValueError:
            return None
    return None


def column_values(rows, pos: int, name: str, where: str, row_numbers) -> np.ndarray:
    """One column as float64; a cell that is not a finite number names its row (as the
    spreadsheet numbers it: the header is row 1; ``where`` is ``file [sheet 'name']``)."""
    out = np.empty(len(rows))
    for i, r in enumerate(rows):
        v = _number(r[pos])
        if v is None or not np.isfinite(v):
            raise CycjInputError(
                f"not a number in column {name!r}",
                source=f"{where[:-1]}, row {row_numbers[i]}]",
                expected="a finite number",
                found="an empty cell" if r[pos] is None else r[pos],
            )
        out[i] = v
    return out


def read_xlsx_history(path, column=None, time_column=None, sheet=None):
    """The load (and time, or None) columns of a history sheet, as float64 arrays."""
    from cycj.spectrum.csv_reading import check_length, choose_columns

    header, rows, title, nos = read_sheet(path, sheet)
    where = f"{path} [sheet {title!r}]"
    numeric = [all(_number(r[i]) is not None for r in rows[:20]) for i in range(len(header))]
    pos, t_pos = choose_columns(header, numeric, column, time_column, where)
    values = column_values(rows, pos, header[pos], where, nos)
    check_length(values.shape[0], where, lambda row: (nos[min(row, len(nos) - 1)], ""))
    times = None if t_pos is None else column_values(rows, t_pos, header[t_pos], where, nos)
    return values, times


def read_xlsx_frame(path, sheet=None):
    """A sheet as a pandas DataFrame of its columns (for test logs), indexed so that index + 2
    is the spreadsheet row (the convention of the CSV logs' line numbers)."""
    import pandas as pd

    header, rows, _, nos = read_sheet(path, sheet)
    return pd.DataFrame.from_records(rows, columns=header, index=[n - 2 for n in nos])
