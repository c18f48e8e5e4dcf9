"""One record per selectable model: its name, kernel code, parameter slots, validity, citation.

Every model a user can choose by name (closure, retardation, j_method, growth law, end
criterion, geometry, FAD option, POD model) and every method a run may use without being named
(rainflow counting, block integration, weight functions, …) is declared once, beside its code,
with :func:`register`.  Case validation takes the allowed names from here (:func:`names`), the
kernels compare against the codes the records hold (named constants, never bare numbers), and
a run's references are collected from the records of the models it chose
(:class:`cycj.citations.Citations`).

Records are registered when their stage module is imported; :func:`record` imports the
providing module of a kind on first use, so asking for a kind's names needs no other import.

Adding a model: write its compiled function in its stage module, register it there with a new
code, and compare against that code in the kernel that dispatches the kind (see DEVELOPERS.md).
"""

from __future__ import annotations

import difflib
import importlib
import os
from dataclasses import dataclass, field

#: the kinds of model, the module that declares each kind's records, and what selects it
KINDS = {
    "closure": ("cycj.growth", "[loading] closure"),
    "growth_law": ("cycj.growth", "[material] growth.law"),
    "retardation": ("cycj.retardation", "[loading] sequence"),
    "j_method": ("cycj.jintegral", "[analysis] j_method"),
    "fad": ("cycj.fad", "[analysis] fad"),
    "end_criterion": ("cycj.end_criteria", "[run] criteria"),
    "geometry": ("cycj.geometry", "[geometry] shape"),
    "pod": ("cycj.plan.pod", "[inspection] pod model"),
    "method": ("cycj.methods", "used by a run when it applies (not chosen by name)"),
}


@dataclass(frozen=True)
class ModelRecord:
    """A selectable model.

    Attributes
    ----------
    kind : one of :data:`KINDS`
    name : the name a case file or an option uses
    code : integer the compiled kernels dispatch on (unique within the kind)
    slots : names of the model-parameter slots (:mod:`cycj.kernel_slots`) the model reads
    validity : the published range of the model, in words
    citation : the published sources, one string each (``from memory`` where unconfirmed)
    kernel : optional compiled scalar of a model added from outside the built-in ones (for a
        closure model: ``opening(r, smax_flow, u_const, alpha)`` → x = (S_op − S_min)/ΔS);
        the kind's dispatcher calls it for the record's code
    """

    kind: str
    name: str
    code: int
    slots: tuple[str, ...] = ()
    validity: str = ""
    citation: tuple[str, ...] = ()
    kernel: object = field(default=None, compare=False, repr=False)


_RECORDS: dict[str, dict[str, ModelRecord]] = {kind: {} for kind in KINDS}


def register(
    kind: str, name: str, code: int, *, slots=(), validity: str = "", citation=(), kernel=None
) -> ModelRecord:
    """Declare a model; returns its record.  Raises ValueError on an unknown kind or a name or
    code already taken by another model of the kind."""
    if kind not in KINDS:
        raise ValueError(f"unknown model kind {kind!r}; expected one of {', '.join(KINDS)}")
    if isinstance(citation, str):
        citation = (citation,)
    rec = ModelRecord(kind, name, int(code), tuple(slots), validity, tuple(citation), kernel)
    table = _RECORDS[kind]
    old = table.get(name)
    if old is not None and old != rec:
        raise ValueError(f"{kind} model {name!r} is already declared")
    for other in table.values():
        if other.code == rec.code and other.name != name:
            raise ValueError(f"{kind} code {code} is already taken by {other.name!r}")
    table[name] = rec
    return rec


#: environment variable listing extension modules (comma-separated) that register models
EXTENSIONS_VARIABLE = "CYCJ_EXTENSIONS"


def extension_modules() -> tuple[str, ...]:
    """Modules named in ``CYCJ_EXTENSIONS``; they are imported before any built-in record, so
    the kernels are compiled with their models (the kernel cache is keyed on them too)."""
    raw = os.environ.get(EXTENSIONS_VARIABLE, "")
    return tuple(m.strip() for m in raw.split(",") if m.strip())


_EXTENSIONS_LOADED = False


def load_extensions() -> None:
    """Import the extension modules once (each registers its records)."""
    global _EXTENSIONS_LOADED
    if not _EXTENSIONS_LOADED:
        _EXTENSIONS_LOADED = True
        for module in extension_modules():
            importlib.import_module(module)


def _load(kind: str) -> dict[str, ModelRecord]:
    if kind not in KINDS:
        raise ValueError(f"unknown model kind {kind!r}; expected one of {', '.join(KINDS)}")
    load_extensions()
    importlib.import_module(KINDS[kind][0])
    return _RECORDS[kind]


def records(kind: str) -> tuple[ModelRecord, ...]:
    """The kind's records in code order."""
    return tuple(sorted(_load(kind).values(), key=lambda r: r.code))


def names(kind: str) -> tuple[str, ...]:
    """The names a user may choose for the kind, in code order."""
    return tuple(r.name for r in records(kind))


def record(kind: str, name: str) -> ModelRecord:
    """The record of a model; ValueError naming the known ones (and the nearest) otherwise."""
    table = _load(kind)
    if name not in table:
        known = names(kind)
        near = difflib.get_close_matches(str(name), known, n=1)
        hint = f" (did you mean {near[0]!r}?)" if near else ""
        raise ValueError(f"unknown {kind} model {name!r}{hint}; expected one of {', '.join(known)}")
    return table[name]


def code(kind: str, name: str) -> int:
    """The kernel code of a model."""
    return record(kind, name).code


def by_code(kind: str, code_: int) -> ModelRecord:
    """The record with the given kernel code; ValueError for an unknown code (never a
    silent fall-back to another model)."""
    for rec in _load(kind).values():
        if rec.code == int(code_):
            return rec
    raise ValueError(f"unknown {kind} code {code_!r}")
