"""The ``[loading]`` table of a case file → :class:`Loading` (history or constant amplitude,
closure, compressive part, sequence model) in internal units, with one-line errors.

The closure and sequence names allowed come from the models' records (:mod:`cycj.models`).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from cycj import models
from cycj.geometry import Geometry
from cycj.tables import Table
from cycj.units import to_internal
from cycj.units import unit_factor as _unit_factor

CLOSURE_MODELS = models.names("closure")
SEQUENCE_MODELS = models.names("retardation")


@dataclass(frozen=True)
class Closure:
    """Crack closure model: ``none``, ``elber``, ``newman`` or ``constant`` (with ``U``)."""

    model: str = "none"
    U: float = 1.0
    constraint_factor: float | None = None  # Newman's α; default from the constraint


@dataclass(frozen=True)
class Loading:
    history: Path | None = None
    column: str | None = None
    unit: str | None = None
    quantity: str = "force"
    scale: float = 1.0
    gate: float = 0.0  # in the load's internal unit (N or MPa)
    duration_h: float | None = None  # one pass of the history
    constant: tuple[float, float] | None = None  # (max, min) in the load's internal unit
    closure: Closure = field(default_factory=Closure)
    compressive_part: str = "ignore"
    sequence: str = "none"
    sequence_options: dict = field(default_factory=dict)
    sheet: str | None = None  # worksheet of an .xlsx history


def _quantity_kind(unit: str | None) -> str | None:
    if unit is None:
        return None
    from cycj.units import FAST_UNITS

    if unit.strip() in FAST_UNITS:
        kind = FAST_UNITS[unit.strip()][0]
        return kind if kind in ("force", "stress") else None
    from cycj.units import unit_kind

    return unit_kind(unit, ("force", "stress"))


def read_loading(t: Table, geometry: Geometry, base: Path) -> Loading:
    hist = t.string("history")
    const = t.table("constant")
    if hist is None and const is None:  # a misspelt one is named before the general rule
        for name in ("history", "constant"):
            err = t.missing(name, expected='history = "FILE" or constant = { max, min }')
            if "did you mean" in str(err):
                raise err
    if (hist is None) == (const is None):
        raise t.error("history", "give either a history file or constant = { max, min }")
    unit = t.string("unit")
    kind_from_unit = _quantity_kind(unit)
    if unit is not None and kind_from_unit is None:
        raise t.error(
            "unit", "not a unit of force or stress", expected="e.g. 'kN' or 'MPa'", found=unit
        )
    default_q = kind_from_unit or geometry.shape.loading[0]
    if const is not None and unit is None:
        s = str(const.get("max", ""))
        default_q = _quantity_kind(s.split(" ", 1)[1]) if " " in s.strip() else default_q
        default_q = default_q or "stress"
    if default_q == "stress" and "pressure" in geometry.shape.loading:
        default_q = "pressure"
    if t.raw.get("channels"):  # load channels carry stresses
        default_q = "stress"
    quantity = t.choice("quantity", ("force", "stress", "pressure"), default=default_q)
    if quantity not in geometry.shape.loading:
        takes = " or ".join(geometry.shape.loading)
        raise t.error(
            "quantity",
            f"{geometry.shape.name} takes {takes}",
            expected=" or ".join(repr(x) for x in geometry.shape.loading),
            found=quantity,
        )
    kind = "force" if quantity == "force" else "stress"
    if unit is not None and kind_from_unit != kind:
        raise t.error("unit", f"a {quantity} history needs a {kind} unit", found=unit)
    unit_factor = (
        1.0 if unit is None else _unit_factor(unit, kind, key=t.key("unit"), source=t.source)
    )
    scale = t.number("scale", default=1.0, positive=True)
    gate_raw = t.get("gate", 0.0)
    gate = (
        gate_raw * unit_factor * scale
        if isinstance(gate_raw, (int, float)) and not isinstance(gate_raw, bool)
        else t.quantity("gate", kind, nonnegative=True) * scale
    )
    if not gate >= 0:
        raise t.error("gate", "out of range", expected="≥ 0", found=gate_raw)
    duration = t.quantity("duration", "time", positive=True)
    column = t.string("column")
    sheet = t.string("sheet")
    if sheet is not None and (hist is None or not hist.lower().endswith((".xlsx", ".xlsm"))):
        raise t.error("sheet", "a sheet is chosen only in an .xlsx history", found=sheet)
    constant = None
    if const is not None:
        vals = []
        for k in ("max", "min"):
            raw = const.get(k, required=True)
            v = (
                raw * unit_factor
                if isinstance(raw, (int, float)) and not isinstance(raw, bool)
                else to_internal(raw, kind, key=const.key(k), source=const.source)
            )
            vals.append(v * scale)
        const.finish()
        if not vals[0] > vals[1]:
            raise const.error(
                "max", "max must exceed min", expected=f"> {vals[1]:g}", found=vals[0]
            )
        if not vals[0] > 0:
            raise const.error(
                "max", "no tensile load: the crack cannot grow", expected="> 0", found=vals[0]
            )
        constant = (vals[0], vals[1])
    history = None
    if hist is not None:
        history = base / hist
        if not history.is_file():
            raise t.error("history", "history file not found", found=str(history))
        from cycj.inputs_read import note_input

        note_input(history, "history")
    closure = _closure(t)
    comp = t.choice("compressive_part", ("ignore", "include"), default="ignore")
    t.known.add("channels")  # read by cycj.fields.inputs
    seq_raw = t.get("sequence", "none")
    seq_opts: dict = {}
    if isinstance(seq_raw, dict):
        st = Table(seq_raw, t.key("sequence"), t.source)
        seq = st.choice("model", SEQUENCE_MODELS, required=True)
        for key, lo, hi in (
            ("shaping_exponent", 0.0, 10.0),
            ("shut_off_ratio", 1.01, 10.0),
            ("zone_factor", 1.0, 10.0),
        ):
            v = st.number(key, lo=(lo, f"{lo:g}"), hi=(hi, f"{hi:g}"))
            if v is not None:
                seq_opts[key] = v
        st.finish()
    else:
        seq = t.choice("sequence", SEQUENCE_MODELS, default="none")
    t.finish()
    return Loading(
        history,
        column,
        unit,
        quantity,
        scale,
        gate,
        duration,
        constant,
        closure,
        comp,
        seq,
        seq_opts,
        sheet,
    )


def _closure(t: Table) -> Closure:
    raw = t.get("closure", "none")
    if isinstance(raw, dict):
        ct = Table(raw, t.key("closure"), t.source)
        model = ct.choice("model", CLOSURE_MODELS, required=True)
        u = ct.number(
            "U", default=1.0, lo=(0.0, "> 0"), hi=(1.0, "1"), required=model == "constant"
        )
        if model == "constant" and not u > 0:
            raise ct.error("U", "out of range", expected="0 < U ≤ 1", found=u)
        alpha = ct.number("constraint_factor", lo=(1.0, "1"), hi=(3.0, "3"))
        ct.finish()
        return Closure(model, u, alpha)
    model = t.choice("closure", CLOSURE_MODELS, default="none")
    if model == "constant":
        raise t.error(
            "closure",
            "constant closure needs U",
            expected='closure = { model = "constant", U = 0.8 }',
            found=raw,
        )
    return Closure(model)
