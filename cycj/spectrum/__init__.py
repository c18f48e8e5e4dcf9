"""Load histories: reading, reversals, rainflow counting, cycles in sequence, statistics,
generators and plots (issue #3).

Public API::

    read_history(path, column=None, unit_factor=1.0, scale=1.0) -> ndarray
    read_history_with_time(path, column=None, unit_factor=1.0, scale=1.0, time_column=None)
    iter_history_chunks(path, column=None, unit_factor=1.0, scale=1.0, chunk_samples=2**20)
    reversals(values, gate=0.0) -> (values, indices)
    count_cycles(values, gate=0.0, repeat=False) -> DataFrame(range, mean, count, start, end)
    cycles_in_sequence(values, gate=0.0, order="closing") -> (peak, valley)
"""

from cycj.spectrum.chunked_reading import iter_history_chunks
from cycj.spectrum.cycle_order import cycle_indices_in_sequence, cycles_in_sequence
from cycj.spectrum.rainflow import CYCLE_COLUMNS, count_cycles, rainflow_cycles
from cycj.spectrum.reading import read_history, read_history_with_time
from cycj.spectrum.reversals import block_reversals, reversals

__all__ = [
    "CYCLE_COLUMNS",
    "block_reversals",
    "count_cycles",
    "cycle_indices_in_sequence",
    "cycles_in_sequence",
    "iter_history_chunks",
    "rainflow_cycles",
    "read_history",
    "read_history_with_time",
    "reversals",
]
