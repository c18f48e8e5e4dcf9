"""Rainflow count of a history file too long to hold in memory: two streaming passes.

Pass 1 reads the file in chunks for the history's mean (the irregularity factor's reference
level, :func:`cycj.spectrum.statistics.history_mean`), its extremes (the from–to bins) and the
first samples (the plotted excerpt).  Pass 2 reads it again and counts it with
:class:`cycj.spectrum.streaming.StreamingCount`, spilling the cycle table to disk part by part
(:class:`cycj.spectrum.cycle_parts.CycleParts`).  Memory is a chunk of samples, the open
rainflow stack and a part of the cycle table; the results equal the in-memory count's.

References
----------
.. [1] ASTM E1049-85 (reapproved 2017), *Standard Practices for Cycle Counting in Fatigue
   Analysis*, ASTM International, §5.4.4 (rainflow counting).
"""

from __future__ import annotations

import math
import os
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from cycj.spectrum.chunked_reading import (
    CHUNK_SAMPLES,
    history_samples,
    iter_history_chunks,
    iter_history_chunks_with_time,
)
from cycj.spectrum.cycle_parts import PREVIEW_SAMPLES, CycleParts
from cycj.spectrum.statistics import RunningMean
from cycj.spectrum.streaming import StreamingCount

#: a history with more samples than this is counted streaming by ``cycj count``
STREAM_SAMPLES = 5_000_000
#: … and so is a file larger than this [bytes]
STREAM_BYTES = 100 * 2**20
#: environment variable setting the samples per chunk (tests force small chunks with it)
CHUNK_ENV = "CYCJ_STREAM_CHUNK"


def wants_streaming(path) -> bool:
    """True when the history file is long enough to be counted streaming (more than
    :data:`STREAM_SAMPLES` samples by its header, or larger than :data:`STREAM_BYTES`)."""
    path = Path(path)
    if path.suffix.lower() in (".xlsx", ".xlsm"):
        return False  # a spreadsheet is read whole (its cells are zipped XML)
    try:
        size = path.stat().st_size
    except OSError:
        return False  # the reader reports a missing file
    n = history_samples(path)
    return size > STREAM_BYTES or (n is not None and n > STREAM_SAMPLES)


def chunk_samples(default: int = CHUNK_SAMPLES) -> int:
    """Samples per chunk: the environment variable :data:`CHUNK_ENV` when set (≥ 1), else
    ``default``."""
    raw = os.environ.get(CHUNK_ENV, "").strip()
    if not raw:
        return int(default)
    n = int(raw)
    if n < 1:
        raise ValueError(f"{CHUNK_ENV} must be a whole number >= 1, got {raw!r}")
    return n


@dataclass
class StreamedCount:
    """What the streaming count found (the inputs of the count's summary and files).

    Attributes
    ----------
    samples, reversals : int
        Samples of the history and its (gated) reversals.
    vmax, vmin : float
        The history's extremes [internal unit].
    irregularity : float
        Irregularity factor (NaN: no peak).
    parts : cycj.spectrum.cycle_parts.CycleParts
        The cycle table (spilled) with its totals.
    preview, preview_times : numpy.ndarray
        The first :data:`~cycj.spectrum.cycle_parts.PREVIEW_SAMPLES` loads [internal unit]
        and their times [s] (None without a time column).
    """

    samples: int
    reversals: int
    vmax: float
    vmin: float
    irregularity: float
    parts: CycleParts
    preview: np.ndarray
    preview_times: np.ndarray | None


def count_file_streaming(
    path,
    column=None,
    unit_factor: float = 1.0,
    scale: float = 1.0,
    gate: float = 0.0,
    folder=None,
    chunk: int | None = None,
) -> StreamedCount:
    """Rainflow-count a history file in two streaming passes (residue as half cycles).

    Parameters
    ----------
    path : str or pathlib.Path
        History file (as :func:`cycj.spectrum.reading.read_history`).
    column, unit_factor, scale
        As :func:`cycj.spectrum.chunked_reading.iter_history_chunks`.
    gate : float
        Smallest range kept [internal unit], ≥ 0.
    folder : str or pathlib.Path, optional
        Existing folder for the cycle table's spill; default in memory.
    chunk : int, optional
        Samples per chunk; default :func:`chunk_samples`.

    Returns
    -------
    StreamedCount
    """
    chunk = chunk_samples() if chunk is None else int(chunk)
    mean = RunningMean()
    vmax, vmin = -math.inf, math.inf
    pv, pt, have = [], [], 0
    for v, t in iter_history_chunks_with_time(path, column, unit_factor, scale, chunk):
        if v.shape[0] == 0:
            continue
        mean.feed(v)
        vmax, vmin = max(vmax, float(v.max())), min(vmin, float(v.min()))
        if have < PREVIEW_SAMPLES:
            take = PREVIEW_SAMPLES - have
            pv.append(v[:take].copy())
            pt.append(None if t is None else t[:take].copy())
            have += pv[-1].shape[0]
    parts = CycleParts(folder)
    sc = StreamingCount(gate, level=mean.mean(), sink=parts.add)
    for v in iter_history_chunks(path, column, unit_factor, scale, chunk):
        sc.feed(v)
    res = sc.finish()
    times = None if not pt or pt[0] is None else np.concatenate(pt)
    return StreamedCount(
        samples=sc.samples,
        reversals=int(res["n_reversals"]),
        vmax=vmax,
        vmin=vmin,
        irregularity=sc.irregularity(),
        parts=parts,
        preview=np.concatenate(pv),
        preview_times=times,
    )
