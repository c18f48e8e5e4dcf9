"""Job 2, calibration of da/dN = C·ΔJ^m from test logs (``cycj fit``).

Rooms: fit (orchestrator), logs, replicates, specimen, loops, compliance, reduction, rates,
fits, intervals, resampling, between, summary, simulate (virtual test frame), coverage, plots
and write (output files).  The public names are re-exported here."""

import importlib

_LAZY = {
    "fit_logs": "cycj.calibrate.fit",
    "FitResult": "cycj.calibrate.fit",
    "METHODS": "cycj.calibrate.fit",
    "growth_snippet": "cycj.calibrate.fit",
}

__all__ = list(_LAZY)


def __getattr__(name):
    if name in _LAZY:
        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
