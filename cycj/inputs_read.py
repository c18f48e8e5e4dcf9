"""The files a command has read (or is about to read), so that no output ever replaces one.

Every reader of a user's file calls :func:`note_input`; :class:`cycj.outputs.OutputDir` refuses
an output folder holding any of them and provenance hashes them all.  Plain bookkeeping with no
imports of the edges, so the stage modules that read files may use it.
"""

from __future__ import annotations

from pathlib import Path

# every file read (or about to be read) by this process's command: (role, path)
_NOTED: list[tuple[str, Path]] = []


def note_input(path, role: str = "input") -> None:
    """Remember that the command reads ``path`` (an output folder may never hold it)."""
    if path is not None:
        _NOTED.append((role, Path(path)))


def noted_mark() -> int:
    """Position in the list of inputs read (for :func:`noted_since`)."""
    return len(_NOTED)


def noted_since(mark: int) -> tuple[tuple[str, Path], ...]:
    """The (role, path) pairs noted since ``mark``, each path once."""
    seen, out = set(), []
    for role, p in _NOTED[mark:]:
        key = str(p.resolve())
        if key not in seen:
            seen.add(key)
            out.append((role, p))
    return tuple(out)


def inputs_read() -> list[Path]:
    """Every file noted by :func:`note_input` since the command started."""
    return [p for _, p in noted_since(0)]


def forget_inputs() -> None:
    """Start a new command: forget the inputs noted so far."""
    _NOTED.clear()
