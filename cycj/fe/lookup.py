"""Compiled look-up of a finite-element J table for the life stepper (j_method
``"finite-element"``).

The table rides at the end of the kernels' model array (slots in :mod:`cycj.kernel_slots`):
``mp[FE_NA]`` crack sizes a_i [mm] and ``mp[FE_NL]`` levels per size; from ``mp[FE_TABLE]`` the
sizes, then per size ln L_r of its levels, ln(ΔJ/ΔJ_el) and ln(J/J_el) at those levels.  The
ratio g = J_FE/J_el is interpolated linearly in ln L_r at the two sizes bracketing a and then
linearly in a; J = g·K²/E' with the stepper's own K.  Below the lowest level g keeps its
lowest-level value (the elastic limit, g → 1); sizes and levels beyond the table are refused
before the run (:func:`pack_table` and :func:`cycj.life.model.model_array`), so the clamp
at the top is never used.

References
----------
.. [1] Rice, J. R., J. Appl. Mech. 35 (1968) 379–386: J = K²/E' in the elastic limit.
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit
from cycj.kernel_slots import FE_NA, FE_NL, FE_TABLE


@jit
def _row(mp, i, ln_lr, which):
    """ln g at size index ``i`` for ln L_r ``ln_lr`` (``which`` 0: ΔJ, 1: J)."""
    na = int(mp[FE_NA])
    nl = int(mp[FE_NL])
    base = FE_TABLE + na + i * 3 * nl
    vals = base + nl * (1 + which)
    if nl == 1 or ln_lr <= mp[base]:
        return mp[vals]
    if ln_lr >= mp[base + nl - 1]:
        return mp[vals + nl - 1]
    k = 0
    while mp[base + k + 1] < ln_lr:
        k += 1
    t = (ln_lr - mp[base + k]) / (mp[base + k + 1] - mp[base + k])
    return mp[vals + k] + t * (mp[vals + k + 1] - mp[vals + k])


@jit
def fe_ratio(mp, a, lr, which):
    """g = J_FE/J_el at crack size ``a`` [mm] and L_r ``lr`` (``which`` 0: ΔJ over the load
    range, 1: J at the peak load); 1 for a vanishing load."""
    if lr <= 0.0:
        return 1.0
    na = int(mp[FE_NA])
    ln_lr = math.log(lr)
    if na == 1 or a <= mp[FE_TABLE]:
        return math.exp(_row(mp, 0, ln_lr, which))
    if a >= mp[FE_TABLE + na - 1]:
        return math.exp(_row(mp, na - 1, ln_lr, which))
    i = 0
    while mp[FE_TABLE + i + 1] < a:
        i += 1
    a0, a1 = mp[FE_TABLE + i], mp[FE_TABLE + i + 1]
    t = (a - a0) / (a1 - a0)
    g0, g1 = _row(mp, i, ln_lr, which), _row(mp, i + 1, ln_lr, which)
    return math.exp(g0 + t * (g1 - g0))


#: columns the stepper reads from a J table
NEEDED = ("a_mm", "nominal_stress_MPa", "J_kJm2", "dJ_kJm2", "J_el_kJm2")


def read_table(path):
    """A user's J table (CSV with the jtable.csv columns) as a DataFrame; a file that is not a
    CSV table is refused in one line naming it."""
    import pandas as pd

    from cycj.errors import CycjInputError

    try:
        return pd.read_csv(path)
    except (OSError, ValueError, pd.errors.ParserError) as exc:
        msg = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise CycjInputError(
            f"cannot read the J table ({msg})", source=str(path), key="analysis.j_table"
        ) from None


def _check_frame(frame, source):
    """Refuse missing columns, holes (empty or non-numeric cells) and load levels that do not
    increase within a crack size, in one line naming the file and the first bad row."""
    import pandas as pd

    from cycj.errors import CycjInputError

    def bad(message, **kw):
        return CycjInputError(message, source=source, key="analysis.j_table", **kw)

    missing = [c for c in NEEDED if c not in frame.columns]
    if missing:
        raise bad("J table lacks columns " + ", ".join(missing), expected=", ".join(NEEDED))
    if len(frame) == 0:
        raise bad("J table has no rows", expected="rows of " + ", ".join(NEEDED))
    for c in NEEDED:
        vals = pd.to_numeric(frame[c], errors="coerce").to_numpy(float)
        holes = np.flatnonzero(~np.isfinite(vals))
        if len(holes):
            row = int(holes[0])
            raise bad(
                f"J table has a hole in column {c} at data row {row + 1} (line {row + 2})",
                expected="a number in every cell",
                found=frame[c].iloc[row],
            )
    frame = frame.astype({c: float for c in NEEDED})
    for a, g in frame.groupby("a_mm", sort=True):
        s = g["nominal_stress_MPa"].to_numpy(float)
        steps = np.flatnonzero(np.diff(s) <= 0)
        if len(steps):
            row = int(g.index[steps[0] + 1])
            raise bad(
                f"J table loads at a = {a:.6g} mm do not increase at data row {row + 1} "
                f"(line {row + 2})",
                expected="nominal_stress_MPa rising row by row within each crack size",
                found=float(s[steps[0] + 1]),
            )
    return frame


def pack_table(frame, geometry, sigma_y: float, source=None):
    """The model-array tail of a J table (DataFrame with the jtable.csv columns) and, per
    crack size, the largest L_r it covers: (tail, sizes [mm], lr_max per size).  Every size
    needs the same number of levels (≥ 1), rising loads, positive J and J_el and no holes;
    ``source`` (the file) is named in the errors."""
    from cycj.errors import CycjInputError

    frame = _check_frame(frame, source)
    sizes = np.unique(frame["a_mm"].to_numpy(float))
    groups = [frame[frame["a_mm"] == a] for a in sizes]
    nl = len(groups[0])
    if any(len(g) != nl for g in groups) or nl < 1:
        raise CycjInputError(
            "every crack size of the J table needs the same number of load levels",
            source=source,
            key="analysis.j_table",
        )
    tail = [float(len(sizes)), float(nl), *sizes]
    lr_top = []
    for a, g in zip(sizes, groups, strict=True):
        s = g["nominal_stress_MPa"].to_numpy(float)
        jel = g["J_el_kJm2"].to_numpy(float)
        j, dj = g["J_kJm2"].to_numpy(float), g["dJ_kJm2"].to_numpy(float)
        if np.any(s <= 0) or np.any(jel <= 0) or np.any(j <= 0) or np.any(dj <= 0):
            raise CycjInputError(
                "J table values must be positive",
                source=source,
                key="analysis.j_table",
                found=f"a = {a}",
            )
        lr = s / float(geometry.limit_stress(a, sigma_y))
        tail += [*np.log(lr), *np.log(dj / jel), *np.log(j / jel)]
        lr_top.append(float(lr[-1]))
    return np.array(tail), sizes, np.array(lr_top)


def table_ratio(frame, geometry, sigma_y: float, a, s, which: int = 0, source=None):
    """g = J_FE/J_el from a J table at crack sizes ``a`` [mm] and nominal stresses ``s``
    [MPa] (arrays; ``which`` 0: ΔJ for the range ``s``, 1: J at the peak ``s``), by the
    stepper's own compiled look-up (:func:`fe_ratio`); refuses sizes or L_r beyond the table."""
    from cycj.errors import CycjInputError

    tail, sizes, lr_top = pack_table(frame, geometry, sigma_y, source)
    mp = np.concatenate([np.zeros(FE_NA), tail])  # the tail starts at slot FE_NA
    a, s = np.broadcast_arrays(np.asarray(a, float), np.asarray(s, float))
    lr = s / np.asarray(geometry.limit_stress(a, sigma_y), float)
    top = np.interp(a, sizes, lr_top)
    if np.any(a < sizes[0] * (1 - 1e-9)) or np.any(a > sizes[-1] * (1 + 1e-9)):
        raise CycjInputError("crack sizes beyond the J table (no extrapolation)", source=source)
    if np.any(lr > top * (1 + 1e-9)):
        raise CycjInputError(
            f"L_r {float(np.max(lr)):.4g} beyond the J table (no extrapolation)", source=source
        )
    pairs = zip(a.ravel(), lr.ravel(), strict=True)
    out = np.array([fe_ratio(mp, float(x), float(y), which) for x, y in pairs])
    return out.reshape(a.shape)
