"""Reading a load history in chunks: the same files, columns, units and checks as
:func:`cycj.spectrum.reading.read_history`, without holding the whole history in memory.

CSV/TSV tables go through pandas' C parser ``chunksize`` rows at a time with the parse plan of
the whole-file reader (:class:`cycj.spectrum.csv_reading.TextPlan`); Parquet files through
pyarrow's ``iter_batches``; ``.npy`` arrays through a memory map of one window of rows at a time
(mapped and released per chunk, so the resident memory stays one window).  The values of the
chunks, concatenated, equal :func:`~cycj.spectrum.reading.read_history`'s exactly; a bad value is
reported with the line (text) or the 1-based row (Parquet, ``.npy``) of the whole file.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError
from cycj.spectrum.csv_reading import (
    check_finite,
    check_length,
    iter_text_frames,
    text_columns,
    text_plan,
)
from cycj.spectrum.reading import (
    load_npy,
    not_utf8,
    npy_channels,
    open_history,
    parquet_channels,
    parquet_to_float,
    row_lines,
    scale_loads,
)

#: samples per chunk by default (8 MB of float64)
CHUNK_SAMPLES = 1 << 20


def iter_history_chunks(
    path,
    column=None,
    unit_factor: float = 1.0,
    scale: float = 1.0,
    chunk_samples: int = CHUNK_SAMPLES,
):
    """Yield one channel of a load history in chunks of float64 samples.

    Parameters
    ----------
    path : str or pathlib.Path
        A text table, Parquet file or ``.npy`` array, as for
        :func:`cycj.spectrum.reading.read_history`.
    column : str or int, optional
        Channel to read (name or 0-based position); default as for ``read_history``.
    unit_factor : float, optional
        Factor from the file's unit to the internal unit (e.g. 1000 for kN → N).
    scale : float, optional
        Further factor applied to the loads.
    chunk_samples : int, optional
        Samples per chunk (≥ 1; the last chunk may be shorter).

    Yields
    ------
    numpy.ndarray of float64, shape (m,)
        The next ``m`` loads [internal unit after ``unit_factor * scale``]; together exactly
        the array ``read_history`` returns.

    Raises
    ------
    cycj.errors.CycjInputError
        As ``read_history``, raised when the chunk holding the bad value is read (a history of
        fewer than two samples: when the file is exhausted).
    """
    for values, _ in iter_history_chunks_with_time(path, column, unit_factor, scale, chunk_samples):
        yield values


def iter_history_chunks_with_time(
    path,
    column=None,
    unit_factor: float = 1.0,
    scale: float = 1.0,
    chunk_samples: int = CHUNK_SAMPLES,
    time_column=None,
):
    """As :func:`iter_history_chunks`, yielding ``(loads, times)`` pairs; ``times`` [unit of the
    file] is None when the history has no time column (as
    :func:`cycj.spectrum.reading.read_history_with_time`)."""
    chunk = int(chunk_samples)
    if chunk < 1:
        raise ValueError(f"chunk_samples must be >= 1, got {chunk_samples}")
    path, kind = open_history(path, unit_factor, scale)
    src = str(path)
    if kind == "npy":
        parts = _npy_chunks(path, column, time_column, chunk, src)
    elif kind == "parquet":
        parts = _parquet_chunks(path, column, time_column, chunk, src)
    elif kind == "xlsx":
        raise CycjInputError(
            "a spreadsheet is read whole, not in chunks: drop --stream (or save it as CSV)",
            source=src,
            key="--stream",
        )
    else:
        parts = _text_chunks(path, column, time_column, chunk, src)
    n = 0
    first_line = None
    for values, times, line_of in parts:
        if first_line is None:
            first_line = line_of
        yield scale_loads(values, unit_factor, scale, src, row0=n), times
        n += values.shape[0]
    check_length(n, src, first_line or row_lines)


def history_samples(path) -> int | None:
    """Number of rows of a ``.npy`` or Parquet history from its header (None for text tables or
    an unreadable file: they are counted while read)."""
    path = Path(path)
    suffix = path.suffix.lower()
    try:
        if suffix == ".npy":
            arr = np.load(path, allow_pickle=False, mmap_mode="r")
            return int(arr.shape[0]) if arr.ndim else None
        if suffix in (".parquet", ".pq"):
            import pyarrow.parquet as pq

            return int(pq.ParquetFile(path).metadata.num_rows)
    except Exception:  # noqa: BLE001 - the reader reports a bad file properly
        return None
    return None


def _offset_lines(row0: int):
    return lambda row: row_lines(row + row0)


def _npy_chunks(path: Path, column, time_column, chunk: int, src: str):
    try:
        arr = np.load(path, allow_pickle=False, mmap_mode="r")
    except (ValueError, OSError):  # e.g. an empty array: the whole-file reader says why
        arr = load_npy(path)
    name, col, tcol = npy_channels(arr, column, time_column, src)
    n = arr.shape[0]
    windowed = isinstance(arr, np.memmap) and arr.flags.c_contiguous and arr.ndim >= 1
    for i in range(0, n, chunk):
        m = min(chunk, n - i)
        if windowed:  # map just these rows, released when the chunk is done
            win = np.memmap(
                path,
                dtype=arr.dtype,
                mode="r",
                offset=arr.offset + i * arr.strides[0],
                shape=(m, *arr.shape[1:]),
            )
            _, c, t = npy_channels(win, column, time_column, src)
        else:
            c, t = col[i : i + m], None if tcol is None else tcol[i : i + m]
        values = np.array(c, dtype=np.float64)
        times = None if t is None else np.array(t, dtype=np.float64)
        del c, t
        if windowed:
            del win
        check_finite(values, name, src, _offset_lines(i))
        yield values, times, row_lines
    del arr, col, tcol


def _parquet_chunks(path: Path, column, time_column, chunk: int, src: str):
    import pyarrow.parquet as pq

    name, t_name = parquet_channels(path, column, time_column, src)
    cols = [name] if t_name is None else [name, t_name]
    row0 = 0
    try:
        batches = pq.ParquetFile(path).iter_batches(batch_size=chunk, columns=cols)
        first = next(batches, None)
    except Exception as exc:  # noqa: BLE001 - any corrupt-file error is reported the same way
        raise CycjInputError(f"not a readable Parquet file ({exc})", source=src) from None
    for batch in _with_first(first, batches, src):
        values = parquet_to_float(batch.column(0))
        times = None if t_name is None else parquet_to_float(batch.column(1))
        check_finite(values, name, src, _offset_lines(row0))
        if times is not None:
            check_finite(times, t_name, src, _offset_lines(row0))
        row0 += values.shape[0]
        yield values, times, row_lines


def _with_first(first, batches, src):
    """The batches of a Parquet file, a corrupt later batch reported as an input error."""
    import pyarrow as pa

    if first is None:
        return
    yield first
    try:
        yield from batches
    except (pa.ArrowException, OSError) as exc:
        raise CycjInputError(f"not a readable Parquet file ({exc})", source=src) from None


def _text_chunks(path: Path, column, time_column, chunk: int, src: str):
    from cycj.spectrum.csv_reading import _TextLines

    try:
        plan = text_plan(path, column, time_column)
        row0 = 0
        for df in iter_text_frames(plan, chunk):
            values, times = text_columns(plan, df, row0)
            row0 += values.shape[0]
            del df
            yield values, times, _TextLines(path, plan.skip)
    except UnicodeDecodeError as exc:
        raise not_utf8(src, exc) from None
