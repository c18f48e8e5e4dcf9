"""Does a run stay inside the ΔJ range its growth law was fitted to?

A growth law written by ``cycj fit`` carries ``valid_dJ``, the ΔJ range of the data behind
its constants.  After a run, the ΔJ_eff of the block's cycles is evaluated at crack sizes
spread evenly over the run's cycles; the share of cycles (with ΔJ_eff > 0) outside the range
is one warning.
"""

from __future__ import annotations

import numpy as np

__all__ = ["valid_range_warning"]

#: crack sizes at which the block is evaluated (evenly spread over the run's cycles)
N_SIZES = 9
#: at most this many cycles of a block are evaluated at each size (evenly picked)
MAX_CYCLES = 2000


def valid_range_warning(case, loads, mp, hist):
    """One warning string when the run's ΔJ_eff leaves the law's ``valid_dJ``, else None.

    Parameters
    ----------
    case : Case; loads : BlockLoads; mp : model array; hist : the run's history (columns
        ``{name: array}`` or a DataFrame, with ``cycle`` and ``a_mm``)
    """
    from cycj.life import stepper as K

    valid = getattr(case.growth, "valid_dJ", None)
    cyc = np.asarray(hist["cycle"], dtype=float)
    if valid is None or cyc.size == 0:
        return None
    lo, hi = valid
    a_hist = np.asarray(hist["a_mm"], dtype=float)
    if cyc[-1] > 0:
        at = np.interp(np.linspace(0, 1, N_SIZES) * cyc[-1], cyc, a_hist)
    else:
        at = a_hist[:1]
    pick = np.unique(np.linspace(0, loads.n - 1, min(loads.n, MAX_CYCLES)).astype(int))
    geo = case.geometry
    outside, counted, seen = 0, 0, []
    for a in at:
        for i in pick:
            dj = K.cycle_driving_force(
                loads.lmax, loads.lmin, int(i), float(a), geo.code, geo.params, loads.ct, mp
            )[0]
            if dj > 0:
                counted += 1
                seen.append(dj)
                outside += dj < lo or dj > hi
    if not counted or not outside:
        return None
    return (
        f"ΔJ_eff of this run spans {min(seen):.3g}–{max(seen):.3g} kJ/m², beyond the growth "
        f"law's valid_dJ {lo:.3g}–{hi:.3g} kJ/m² (the data range of its fit) in "
        f"{100 * outside / counted:.1f} % of the cycles: the law is extrapolated there"
    )
