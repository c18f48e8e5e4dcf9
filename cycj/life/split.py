"""ΔJ split into its elastic and plastic parts along a run: the history's ``dK_MPa_sqrt_m``,
``dJ_el_kJm2`` and ``dJ_pl_kJm2`` columns.

At every recorded crack size the block's largest cycle (the cycle of largest ΔJ_eff at the
initial crack) is evaluated with the run's own ΔJ estimate, and once more with the elastic
estimate under the same closure:

    ΔJ_el = U²·ΔK²/E'            (the linear-elastic part, Rice (1968): J = K²/E')
    ΔJ_pl = ΔJ_eff − ΔJ_el       (what plasticity adds: the reference-stress, small-crack,
                                  notch or finite-element part)

with ΔK = K_max − K_min of the cycle and U the closure model's opening fraction (U = 1
without closure).  The split is that of the crack-tip driving force; a sequence model's
retardation acts on the rate, not on it.  ΔK²/E' (no closure) is what linear-elastic fracture
mechanics would use; the driving-force plot shows it for comparison.

Units: K in MPa√mm inside (MPa√m in the column), J in kJ/m².

References
----------
Rice, J. R., J. Appl. Mech. 35 (1968) 379–386 (docs/references.md); the plastic parts are
those of the ΔJ estimates cited by the run (cycj.models records).
"""

from __future__ import annotations

import numpy as np

from cycj._jit import jit
from cycj.jintegral import ELASTIC
from cycj.kernel_slots import E_PRIME, J_METHOD
from cycj.life.stepper import cycle_driving_force, cycle_k, k_driving_force, notch_long_factors
from cycj.units import MPA_SQRT_M

#: history columns added by :func:`add_split`
SPLIT_COLUMNS = ("dK_MPa_sqrt_m", "dJ_el_kJm2", "dJ_pl_kJm2")


@jit
def largest_cycle(lmax, lmin, a, code, gp, ct, mp):
    """Index of the block's cycle with the largest ΔJ_eff at crack size ``a`` [mm]."""
    best, i_best = -1.0, 0
    for i in range(lmax.shape[0]):
        dj = cycle_driving_force(lmax, lmin, i, a, code, gp, ct, mp)[0]
        if dj > best:
            best, i_best = dj, i
    return i_best


@jit
def split_at_sizes(lmax, lmin, i, a_arr, c_arr, code, gp, ct, mp, mp_el, out):
    """``out[k] = (ΔK [MPa√mm], ΔJ_el, ΔJ_pl, ΔK²/E' [kJ/m²])`` of cycle ``i`` at crack size
    ``a_arr[k]`` (half-length ``c_arr[k]`` for a two-dimensional crack, else 0)."""
    for k in range(a_arr.shape[0]):
        a = a_arr[k]
        if c_arr[k] > 0.0:
            gp[5] = c_arr[k]
        kmax, kmin, lr_max, lr_range, ds, kres = cycle_k(lmax, lmin, i, a, gp[5], code, gp, ct, mp)
        gl, ll = notch_long_factors(code, a, gp, mp)
        dj = k_driving_force(kmax, kmin, lr_max, lr_range, ds, a, mp, gl, ll)[0]
        dj_el = k_driving_force(kmax, kmin, lr_max, lr_range, ds, a, mp_el, gl, ll)[0]
        dk = kmax - kmin if kmax > 0.0 and kmax > kmin else 0.0
        out[k, 0] = dk
        out[k, 1] = dj_el
        out[k, 2] = max(dj - dj_el, 0.0)
        out[k, 3] = dk * dk / mp[E_PRIME]


def split_table(case, loads, mp, a, c=None) -> np.ndarray:
    """(rows × 4) array of :func:`split_at_sizes` at crack sizes ``a`` [mm] for the block's
    largest cycle at ``a[0]``: ΔK [MPa√mm], ΔJ_el, ΔJ_pl, ΔK²/E' [kJ/m²]."""
    geo = case.geometry
    a = np.ascontiguousarray(a, dtype=float)
    c = np.zeros_like(a) if c is None else np.ascontiguousarray(c, dtype=float)
    gp = geo.params.copy()
    if c.size and c[0] > 0:
        gp[5] = c[0]
    i = largest_cycle(loads.lmax, loads.lmin, float(a[0]), geo.code, gp, loads.ct, mp)
    mp_el = mp.copy()
    mp_el[J_METHOD] = ELASTIC
    out = np.zeros((a.shape[0], 4))
    split_at_sizes(loads.lmax, loads.lmin, i, a, c, geo.code, gp, loads.ct, mp, mp_el, out)
    return out


def add_split(hist, case, loads, mp):
    """``hist`` (columns ``{name: array}`` or a DataFrame) with the columns
    :data:`SPLIT_COLUMNS` added after the existing ones."""
    a = np.asarray(hist["a_mm"], dtype=float)
    if a.size == 0:
        for col in SPLIT_COLUMNS:
            hist[col] = np.zeros(0)
        return hist
    c = np.asarray(hist["c_mm"], dtype=float) if "c_mm" in hist else None
    t = split_table(case, loads, mp, a, c)
    hist["dK_MPa_sqrt_m"] = t[:, 0] / MPA_SQRT_M
    hist["dJ_el_kJm2"] = t[:, 1]
    hist["dJ_pl_kJm2"] = t[:, 2]
    return hist
