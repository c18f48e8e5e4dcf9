"""The references of a run, collected as its models are chosen.

A job creates one :class:`Citations`, passes it to the stages that choose models
(``cited.choose("closure", "newman")`` returns the kernel code and records the model), and
prints ``cited.references``: exactly the sources of the models the run used, in the order they
were chosen, each once.
"""

from __future__ import annotations

from cycj import models


class Citations:
    """Models chosen by one run and their references."""

    def __init__(self):
        self._chosen: list[tuple[str, str]] = []

    def choose(self, kind: str, name: str) -> int:
        """Record that the run uses model ``name`` of ``kind``; returns its kernel code."""
        rec = models.record(kind, name)
        if (kind, name) not in self._chosen:
            self._chosen.append((kind, name))
        return rec.code

    def cite(self, name: str) -> None:
        """Record a method the run used without choosing it by name (kind ``method``)."""
        self.choose("method", name)

    @property
    def chosen(self) -> list[tuple[str, str]]:
        """(kind, name) of every model used, in the order chosen."""
        return list(self._chosen)

    @property
    def references(self) -> list[str]:
        """The published sources of the models used, each once."""
        out: list[str] = []
        for kind, name in self._chosen:
            for ref in models.record(kind, name).citation:
                if ref not in out:
                    out.append(ref)
        return out
