"""Compiled dispatch from an integer shape code to the shape's kernels.

The life stepper calls :func:`k_over_s` and :func:`limit_stress` with the code and the plain
parameter array (layout in :mod:`cycj.geometry._params`).  Adding a shape: write its module with
``CODE``, ``k_over_s`` and ``limit_stress``, add one branch to each function here and one entry
to the registry in :mod:`cycj.geometry`.
"""

from cycj._jit import jit
from cycj.geometry import (
    axial_crack_cylinder as _cyl,
)
from cycj.geometry import (
    center_crack_infinite as _cci,
)
from cycj.geometry import (
    center_crack_plate as _mt,
)
from cycj.geometry import (
    compact_tension as _ct,
)
from cycj.geometry import (
    crack_at_hole as _hole,
)
from cycj.geometry import (
    edge_crack_plate as _set,
)
from cycj.geometry import (
    edge_crack_semi_infinite as _esi,
)
from cycj.geometry import (
    surface_crack_plate as _scp,
)
from cycj.geometry import (
    tabulated as _tab,
)
from cycj.geometry import (
    three_point_bend as _seb,
)

# each shape's kernel code, from its module (the same code its record in cycj.geometry holds)
_CCI, _ESI, _MT, _SET, _CT, _SEB = _cci.CODE, _esi.CODE, _mt.CODE, _set.CODE, _ct.CODE, _seb.CODE
_SCP, _CYL, _TAB, _HOLE = _scp.CODE, _cyl.CODE, _tab.CODE, _hole.CODE


@jit(inline="always")
def k_over_s(code, a, p):
    """K per unit nominal stress [√mm] for shape ``code`` at crack size ``a`` [mm]."""
    if code == _CT:
        return _ct.k_over_s(a, p)
    if code == _MT:
        return _mt.k_over_s(a, p)
    if code == _SET:
        return _set.k_over_s(a, p)
    if code == _SEB:
        return _seb.k_over_s(a, p)
    if code == _ESI:
        return _esi.k_over_s(a, p)
    if code == _SCP:
        return _scp.k_over_s(a, p)
    if code == _CYL:
        return _cyl.k_over_s(a, p)
    if code == _TAB:
        return _tab.k_over_s(a, p)
    if code == _HOLE:
        return _hole.k_over_s(a, p)
    if code == _CCI:
        return _cci.k_over_s(a, p)
    raise ValueError("unknown geometry code")


@jit(inline="always")
def limit_stress(code, a, p, sigma_y):
    """Nominal stress at the plastic limit load [MPa] for shape ``code`` and crack ``a`` [mm]."""
    if code == _CT:
        return _ct.limit_stress(a, p, sigma_y)
    if code == _MT:
        return _mt.limit_stress(a, p, sigma_y)
    if code == _SET:
        return _set.limit_stress(a, p, sigma_y)
    if code == _SEB:
        return _seb.limit_stress(a, p, sigma_y)
    if code == _ESI:
        return _esi.limit_stress(a, p, sigma_y)
    if code == _SCP:
        return _scp.limit_stress(a, p, sigma_y)
    if code == _CYL:
        return _cyl.limit_stress(a, p, sigma_y)
    if code == _TAB:
        return _tab.limit_stress(a, p, sigma_y)
    if code == _HOLE:
        return _hole.limit_stress(a, p, sigma_y)
    if code == _CCI:
        return _cci.limit_stress(a, p, sigma_y)
    raise ValueError("unknown geometry code")


@jit
def k_over_s_surface(code, a, p):
    """K/S [√mm] at the surface point of a two-dimensional crack (0 for other shapes)."""
    if code == _SCP:
        return _scp.k_over_s_surface(a, p)
    return 0.0
