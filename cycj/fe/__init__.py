"""Stage: 2-D finite-element J (deformation plasticity, equivalent domain integral), J tables.

Rooms: mesh (crack-tip-focused Q8 mesh), element (shape functions, B matrices), law
(Ramberg–Osgood J2 deformation plasticity), solver (assembly, Newton with line search and load
continuation), domain (equivalent domain integral), shapes (models of the crack shapes),
inputs (the case's ``[fe]`` table), table (J and ΔJ tables), plots, write (output files).
The public names are re-exported here (lazily).
"""

import importlib

_LAZY = {
    "j_table": "cycj.fe.table",
    "compute": "cycj.fe.table",
    "solve_series": "cycj.fe.table",
    "masing_coefficient": "cycj.fe.table",
    "DeformationLaw": "cycj.fe.law",
    "build": "cycj.fe.shapes",
    "FE_SHAPES": "cycj.fe.shapes",
    "solve_loads": "cycj.fe.solver",
    "j_domains": "cycj.fe.domain",
    "focused_mesh": "cycj.fe.mesh",
}

__all__ = list(_LAZY)


def __getattr__(name):
    if name in _LAZY:
        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
