"""cycj: fatigue crack growth life driven by the cyclic J-integral (ΔJ).

Python API (the command line calls the same functions):

* ``cycj.load_case(path)`` → :class:`cycj.case.Case`
* ``cycj.predict_life(case)`` → result with ``.summary`` (dict) and ``.history`` (DataFrame)
* ``cycj.count_cycles(values, gate=0.0)`` → DataFrame ``range, mean, count, start, end``
* ``cycj.j_table(case, sizes=None, loads=None)`` → DataFrame of J and ΔJ by finite elements
* ``cycj.fit_logs(...)`` (calibration) and ``cycj.plan_inspections(...)`` (inspection planning)

Estimates for engineering judgement; they do not replace the applicable design code,
fitness-for-service standard or a qualified engineer's review.
"""

from cycj._version import __version__

_LAZY = {
    "load_case": "cycj.case:load_case",
    "predict_life": "cycj.life.predict:predict_life",
    "count_cycles": "cycj.spectrum:count_cycles",
    "fit_logs": "cycj.calibrate.fit:fit_logs",
    "plan_inspections": "cycj.plan.inspections:plan_inspections",
    "j_table": "cycj.fe.table:j_table",
}

__all__ = ["__version__", *_LAZY]


def __getattr__(name):
    if name in _LAZY:
        import importlib

        module, attr = _LAZY[name].split(":")
        return getattr(importlib.import_module(module), attr)
    raise AttributeError(f"module 'cycj' has no attribute {name!r}")
