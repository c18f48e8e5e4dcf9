"""Crack growth rates da/dN from crack length vs cycles (ASTM E647 Appendix X1).

Units: a [mm], N [cycles], da/dN [mm/cycle].

References
----------
.. [1] ASTM E647, Appendix X1: secant and seven-point incremental polynomial methods; §8
   (minimum crack extension between readings).  From memory (docs/references.md R6, R35).
"""

from __future__ import annotations

import numpy as np

from cycj.errors import ValidityRangeError


def _series(cycles, a, n_min):
    n = np.asarray(cycles, float)
    a = np.asarray(a, float)
    if n.shape != a.shape or n.ndim != 1:
        raise ValidityRangeError("cycles and crack lengths must be 1-D arrays of equal length")
    if n.size < n_min:
        raise ValidityRangeError(f"need at least {n_min} readings, got {n.size}")
    if np.any(np.diff(n) <= 0):
        raise ValidityRangeError("cycle counts must increase strictly")
    return n, a


def secant_rate(cycles, crack_length):
    """Secant da/dN = (a_{i+1} − a_i)/(N_{i+1} − N_i) at ā = (a_i + a_{i+1})/2.

    Returns
    -------
    (N_mid [cycles], a_mid [mm], dadN [mm/cycle]), each of length n − 1.

    References
    ----------
    .. [1] ASTM E647 X1.1; USAF Damage Tolerant Design Handbook §9.3.3.
    """
    n, a = _series(cycles, crack_length, 2)
    return 0.5 * (n[1:] + n[:-1]), 0.5 * (a[1:] + a[:-1]), np.diff(a) / np.diff(n)


def incremental_polynomial_rate(cycles, crack_length, half_width=3):
    """Incremental polynomial da/dN: a parabola fitted over 2n+1 readings (n = 3: seven).

    â = b0 + b1·X + b2·X², X = (N − C1)/C2, C1 = (N_{i−n} + N_{i+n})/2,
    C2 = (N_{i+n} − N_{i−n})/2;  dâ/dN = b1/C2 + 2·b2·(N_i − C1)/C2².

    Returns
    -------
    (N_i [cycles], â_i [mm], dadN [mm/cycle]) for i = n … len−n−1; ΔK (or ΔJ) belongs at â_i.

    References
    ----------
    .. [1] ASTM E647 Appendix X1.2 (docs/references.md R6).
    """
    k = int(half_width)
    if k < 1:
        raise ValidityRangeError("half width must be ≥ 1")
    n, a = _series(cycles, crack_length, 2 * k + 1)
    idx = np.arange(k, n.size - k)
    win = idx[:, None] + np.arange(-k, k + 1)[None, :]
    nw, aw = n[win], a[win]
    c1 = 0.5 * (nw[:, 0] + nw[:, -1])
    c2 = 0.5 * (nw[:, -1] - nw[:, 0])
    x = (nw - c1[:, None]) / c2[:, None]
    design = np.stack([np.ones_like(x), x, x * x], axis=-1)  # (m, 2k+1, 3)
    coef = np.linalg.solve(
        np.einsum("mij,mik->mjk", design, design), np.einsum("mij,mi->mj", design, aw)[..., None]
    )[..., 0]
    xi = (n[idx] - c1) / c2
    a_hat = coef[:, 0] + coef[:, 1] * xi + coef[:, 2] * xi**2
    rate = coef[:, 1] / c2 + 2 * coef[:, 2] * (n[idx] - c1) / c2**2
    return n[idx], a_hat, rate


def e647_minimum_spacing(shape, crack_length, width):
    """Recommended minimum crack extension between readings [mm] (ASTM E647 §8.6, from memory).

    C(T): 0.25 mm for a/W < 0.40, 0.50 mm for 0.40 ≤ a/W < 0.60, 0.02·W for a/W ≥ 0.60.
    M(T) (a = half length, 2a/W): 0.25 mm below 0.60, 0.02·W from 0.60.  Other shapes: the
    C(T) rule on a/W (an assumption, stated in the output).
    """
    a = np.asarray(crack_length, float)
    ratio = 2 * a / width if shape == "center-crack-plate" else a / width
    if shape == "center-crack-plate":
        return np.where(ratio < 0.6, 0.25, 0.02 * width)
    return np.where(ratio < 0.4, 0.25, np.where(ratio < 0.6, 0.5, 0.02 * width))


def thin_to_spacing(cycles, crack_length, spacing):
    """Indices of readings kept so that successive kept readings are at least ``spacing`` [mm]
    apart (array or scalar, evaluated at the last kept reading).  Selection runs on a running
    median of five readings so a single noisy reading does not decide it; the first reading is
    always kept.  Returns an int array."""
    a = np.asarray(crack_length, float)
    n = a.size
    if n == 0:
        return np.zeros(0, int)
    pad = np.pad(a, 2, mode="edge")
    smooth = np.median(np.lib.stride_tricks.sliding_window_view(pad, 5), axis=1)
    sp = np.broadcast_to(np.asarray(spacing, float), a.shape)
    keep = [0]
    for i in range(1, n):
        if smooth[i] - smooth[keep[-1]] >= sp[keep[-1]]:
            keep.append(i)
    return np.asarray(keep, int)
