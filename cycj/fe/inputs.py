"""The ``[fe]`` table of a case: crack sizes, loads and mesh options of a J table.

Keys (all optional)::

    [fe]
    crack_lengths = ["20 mm", "25 mm", "30 mm"]   # a (half length for centre cracks)
    nominal_stresses = ["20 MPa", "60 MPa"]       # or loads = ["10 kN", "40 kN"] (not both)
    refine = 1                                    # elements per ring = 16·refine
    domains = 4                                   # domains of the J integral (≥ 3)

Without crack sizes the table spans the case's crack range (initial size to the size limit);
without loads each crack size gets levels from L_r = 0.05 to L_r = 2 (geometric), L_r = S/S_L(a)
with the shape's limit load (beyond the limit load, so ranges on the Masing curve are covered).
"""

from __future__ import annotations

from dataclasses import dataclass

from cycj.errors import CycjInputError
from cycj.tables import Table


@dataclass(frozen=True)
class FeOptions:
    """Resolved ``[fe]`` options: sizes [mm], nominal stresses [MPa] or loads [N]."""

    crack_lengths: tuple[float, ...] | None = None
    nominal_stresses: tuple[float, ...] | None = None
    loads: tuple[float, ...] | None = None
    refine: int = 1
    domains: int = 4


def _list(t: Table, name: str, kind: str):
    raw = t.get(name)
    if raw is None:
        return None
    if not isinstance(raw, list) or not raw:
        raise t.error(name, "must be a non-empty list", expected='["25 mm", ...]', found=raw)
    sub = Table({str(i): v for i, v in enumerate(raw)}, t.key(name), t.source)
    vals = tuple(sub.quantity(str(i), kind, positive=True) for i in range(len(raw)))
    return vals


def read_fe(raw, source=None) -> FeOptions:
    """Validate the ``[fe]`` table (``raw`` may be None)."""
    if raw is None:
        return FeOptions()
    t = Table(raw, "fe", source)
    sizes = _list(t, "crack_lengths", "length")
    stresses = _list(t, "nominal_stresses", "stress")
    loads = _list(t, "loads", "force")
    if stresses is not None and loads is not None:
        raise CycjInputError(
            "give nominal_stresses or loads, not both", source=source, key="fe.loads"
        )
    refine = t.number("refine", default=1, integer=True, lo=(1, "1"), hi=(4, "4"))
    domains = t.number("domains", default=4, integer=True, lo=(3, "3"), hi=(8, "8"))
    t.finish()
    return FeOptions(sizes, stresses, loads, refine, domains)
