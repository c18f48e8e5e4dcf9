"""Load-sequence (retardation) models: Wheeler and Willenborg, with the crack-tip plastic zone
from J_max (elastic-plastic) through K_eq = √(E'·J_max).

Compiled scalar kernels for the stepper, with checked twins for notebooks.  Lengths in mm, K in
MPa√mm, stresses in MPa.

References
----------
.. [1] Irwin, G. R. (1960): plastic zone r_p = (1/βπ)(K/σ_y)², β = 2 (plane stress) or 6
   (plane strain, common practice).
.. [2] Wheeler, O. E., "Spectrum loading and crack growth", J. Basic Eng. 94 (1972) 181–186:
   C_p = [r_p,i/(a_OL + r_p,OL − a_i)]^m while a_i + r_p,i < a_OL + r_p,OL, else 1.
.. [3] Willenborg, J., Engle, R. M., Wood, H. A., "A crack growth retardation model using an
   effective stress concept", AFFDL-TM-71-1-FBR (1971).
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit
from cycj.errors import ValidityRangeError
from cycj.models import register

NONE = register(
    "retardation", "none", 0, validity="constant-amplitude growth, no sequence effect"
).code
WHEELER = register(
    "retardation",
    "wheeler",
    1,
    slots=("SEQ_EXPONENT", "ZONE_BETA", "SIGMA_Y", "E_PRIME"),
    validity="tensile overloads; the shaping exponent is fitted to the material",
    citation=(
        "Wheeler, O. E., J. Basic Eng. 94 (1972) 181–186: retardation factor C_p",
        "Irwin, G. R. (1960): plastic zone size r_p = (K/σ_y)²/(βπ)",
    ),
).code
WILLENBORG = register(
    "retardation",
    "willenborg",
    2,
    slots=("SEQ_SHUT_OFF", "ZONE_BETA", "SIGMA_Y", "E_PRIME"),
    validity="tensile overloads; growth stops above the shut-off overload ratio",
    citation=(
        "Willenborg, J., Engle, R. M., Wood, H. A., AFFDL-TM-71-1-FBR (1971): effective "
        "stress retardation (from memory)",
        "Irwin, G. R. (1960): plastic zone size r_p = (K/σ_y)²/(βπ)",
    ),
).code


@jit
def plastic_zone_size(k_max, sigma_y, beta):
    """Irwin's plastic zone r_p = (K_max/σ_y)²/(βπ) [mm]; β = 2 plane stress, 6 plane strain."""
    return (k_max / sigma_y) ** 2 / (beta * math.pi)


@jit
def wheeler_factor(r_i, a_i, a_ol, r_ol, shaping_exponent):
    """Wheeler's retardation factor C_p in (0, 1]: [r_i/(a_OL + r_OL − a_i)]^p inside the
    overload zone, 1 once the current zone reaches its boundary."""
    boundary = a_ol + r_ol
    if a_i + r_i >= boundary:
        return 1.0
    return (r_i / (boundary - a_i)) ** shaping_exponent


@jit
def willenborg_reduction(k_ol, a_ol, z_ol, a_i, k_max):
    """Willenborg's K_red = K_ap − K_max (≥ 0) [MPa√mm], K_ap = K_OL·√(1 − (a_i − a_OL)/z_OL);
    0 outside the overload zone."""
    if z_ol <= 0.0 or a_i >= a_ol + z_ol:
        return 0.0
    k_ap = k_ol * math.sqrt(1.0 - (a_i - a_ol) / z_ol)
    return max(k_ap - k_max, 0.0)


def wheeler(r_i, a_i, a_ol, r_ol, shaping_exponent):
    """Checked, vectorised :func:`wheeler_factor` (lengths mm > 0, exponent ≥ 0)."""
    arrs = [np.asarray(x, float) for x in (r_i, a_i, a_ol, r_ol)]
    if any(np.any(x < 0) for x in arrs) or shaping_exponent < 0:
        raise ValidityRangeError("Wheeler: sizes and the shaping exponent must be ≥ 0")
    f = np.vectorize(
        wheeler_factor.py_func if hasattr(wheeler_factor, "py_func") else wheeler_factor,
        otypes=[float],
    )
    return f(*arrs, float(shaping_exponent))


def willenborg_effective_range(k_ol, a_ol, z_ol, a_i, k_max, k_min):
    """ΔK_eff = K_max,eff − K_min,eff with K_max,eff = K_max − K_red and
    K_min,eff = max(K_min − K_red, 0) [MPa√mm] (Willenborg, Engle & Wood 1971)."""
    if min(k_ol, z_ol, k_max) < 0 or a_i < a_ol:
        raise ValidityRangeError("Willenborg: K and zone sizes ≥ 0, a_i ≥ a_OL")
    red = willenborg_reduction(k_ol, a_ol, z_ol, a_i, k_max)
    return (k_max - red) - max(k_min - red, 0.0)
