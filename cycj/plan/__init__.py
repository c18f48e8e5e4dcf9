"""Job 3, inspection planning (``cycj plan``, ``cycj pod``).

Rooms: inspections (orchestrator), inputs, pod, pod_fit, pod_data, scatter, curves (growth-curve
tables), simulation_kernels and montecarlo, findings, deterministic, probabilistic, engine (link
to job 1), plots and write (output files).  The public names are re-exported here."""

import importlib

_LAZY = {
    "plan_inspections": "cycj.plan.inspections",
    "PlanResult": "cycj.plan.inspections",
}

__all__ = list(_LAZY)


def __getattr__(name):
    if name in _LAZY:
        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
