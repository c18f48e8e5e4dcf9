"""How many workers (threads or processes) cycj uses by default on this machine."""

from __future__ import annotations

import os


def usable_cores() -> int:
    """Usable cores: ``CYCJ_WORKERS`` if set to a positive whole number, else the cores this
    process may run on (its CPU affinity), at least 1."""
    raw = os.environ.get("CYCJ_WORKERS", "").strip()
    if raw.isdigit() and int(raw) > 0:
        return int(raw)
    try:
        return max(len(os.sched_getaffinity(0)), 1)
    except AttributeError:  # pragma: no cover - not on Linux
        return max(os.cpu_count() or 1, 1)
