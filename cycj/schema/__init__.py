"""One declaration of every key of the input files: case, specimen and inspection tables.

Each :class:`Key` gives the meaning, the dimension (and the internal unit a bare number is
read in), the default, the allowed values and an example.  The declarations are *used*:

* :class:`cycj.tables.Table` reports a key that is not declared as unknown, with a "did you
  mean" from the declared keys of its table, and a misspelt required key as
  "missing X; did you mean X for Y?";
* ``docs/keys.md`` is generated from them (``cycj keys --write docs/keys.md``; a test checks
  the committed file equals the generated one);
* ``cycj new`` writes its commented starting case from them.

Sections are named by their path in the file (``material.growth``; ``[]`` for an element of
an array of tables such as ``loading.channels[]``) within a document (``case`` or
``specimen``).  The keys themselves live in :mod:`cycj.schema.case_keys` and
:mod:`cycj.schema.other_keys`.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

#: internal unit of a bare number, by dimension
INTERNAL_UNITS = {
    "length": "mm",
    "stress": "MPa",
    "force": "N",
    "energy_per_area": "kJ/m²",
    "stress_intensity": "MPa√mm",
    "time": "h",
    "cycles": "cycles",
}


@dataclass(frozen=True)
class Key:
    """One key: ``kind`` is a dimension of :data:`INTERNAL_UNITS` (a quantity that may carry
    a unit) or one of number, integer, text, choice, bool, list, table, file."""

    name: str
    kind: str
    meaning: str
    default: str | None = None
    required: bool | str = False  # True, or the condition under which it is required
    allowed: tuple | str | None = None  # values, or "model:<kind>" / "shapes" (resolved late)
    example: str | None = None  # a TOML value as it would be written

    @property
    def values(self) -> tuple:
        """The allowed values, with the model names resolved from :mod:`cycj.models`."""
        a = self.allowed
        if a is None:
            return ()
        if isinstance(a, tuple):
            return a
        if a == "shapes":
            from cycj.geometry import SHAPE_NAMES

            return tuple(SHAPE_NAMES)
        if a.startswith("model:"):
            from cycj import models

            return tuple(models.names(a.split(":", 1)[1]))
        raise ValueError(f"unknown allowed-values reference {a!r}")

    @property
    def unit(self) -> str | None:
        """Internal unit of a bare number (None when the key is not a quantity)."""
        return INTERNAL_UNITS.get(self.kind)


@dataclass(frozen=True)
class Section:
    doc: str
    path: str
    title: str
    keys: tuple[Key, ...]
    note: str = ""

    def key(self, name: str) -> Key | None:
        return next((k for k in self.keys if k.name == name), None)

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(k.name for k in self.keys)


_SECTIONS: dict[tuple[str, str], Section] = {}


def declare(doc: str, path: str, title: str, keys, note: str = "") -> Section:
    """Declare a section (once; a second declaration of the same path is a bug)."""
    if (doc, path) in _SECTIONS:
        raise ValueError(f"section {doc}:{path} declared twice")
    names = [k.name for k in keys]
    if len(names) != len(set(names)):
        raise ValueError(f"a key declared twice in {doc}:{path}")
    sec = Section(doc, path, title, tuple(keys), note)
    _SECTIONS[(doc, path)] = sec
    return sec


def normal_path(path: str) -> str:
    """``loading.channels[2].stress_profile`` → ``loading.channels[].stress_profile``."""
    return re.sub(r"\[\d+\]", "[]", path)


def section(doc: str, path: str) -> Section | None:
    """The declared section at ``path`` of document ``doc``, or None."""
    _load()
    return _SECTIONS.get((doc, normal_path(path)))


def sections(doc: str | None = None) -> list[Section]:
    """Every declared section (of one document), in declaration order."""
    _load()
    return [s for s in _SECTIONS.values() if doc is None or s.doc == doc]


def lookup(doc: str, dotted: str) -> Key | None:
    """The key at a dotted path (``material.growth.C``), or None."""
    path, _, name = dotted.rpartition(".")
    sec = section(doc, path)
    return None if sec is None else sec.key(name)


_LOADED = False


def _load() -> None:
    global _LOADED
    if not _LOADED:
        _LOADED = True
        from cycj.schema import case_keys, other_keys  # noqa: F401 - they declare


#: keys read by the code that no section declares: (doc, section path, key); the tests
#: assert it stays empty after reading every example (no undeclared key is ever read)
UNDECLARED: set[tuple[str, str, str]] = set()
