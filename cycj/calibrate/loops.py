"""Reduction of recorded load–displacement loops: compliance, opening load, loop area, ΔJ.

Each recorded cycle is a run of samples round its hysteresis loop.  The compiled kernel
:func:`reduce_loops_kernel` splits every loop at its load extremes into the loading branch
(minimum → maximum) and the unloading branch (maximum → minimum), fits the compliance dV/dP to
the upper part of the unloading branch, finds the opening load by the compliance-offset method
on the loading branch, and integrates the loading-branch area above the opening load.  The
Python functions turn these numbers into ΔJ (Dowling–Begley with the ASTM E1820 η factors).

Opening load: each segment's offset is assigned to the segment's midpoint force, as in
ASTM E647 X2 practice (from memory; ``segment_point`` moves it, 0 = the lower end).  An abrupt
opening is then placed up to half a segment (5 % of ΔP) high, because a segment shows the
offset as soon as its lower part dips below the opening; a specimen file can ask for the lower
end (``opening_segment_point = "lower-end"``).  The load where the offset reaches the
criterion is interpolated between segments, and the offset must also hold in the next segment
down and on average over all segments below, so one noisy segment does not decide it.
Segments holding fewer than four samples are widened about their centre until they do.

Units: P [N], V [mm], compliance [mm/N], area [N·mm], J [kJ/m² = N/mm], lengths [mm].

References
----------
.. [1] ASTM E647, Appendix X2: opening load by the compliance-offset method (segments of 10 %
   of the load range overlapping by 5 %, offset criterion 2 %); from memory.
.. [2] Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: ΔJ = η·ΔA/(B·b) from the
   loading branch of the P–v_LL loop above the crack-opening point.
.. [3] ASTM E1820: J = K²(1−ν²)/E + η_pl·A_pl/(B_N·b), η_pl = 2 + 0.522·b/W (C(T), load line),
   1.9 (SE(B), load line), 3.667 − 2.199α + 0.437α² (SE(B), crack mouth); from memory.
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit
from cycj.errors import ValidityRangeError

#: status codes of the loop kernel and the skip reason each one gives
LOOP_STATUS = {
    0: "ok",
    1: "too few samples in the loop",
    2: "no load range (maximum equals minimum)",
    3: "too few samples in the upper part of the unloading branch for a compliance fit",
    4: "non-positive compliance (displacement falls as the load rises)",
    5: "samples are not finite numbers",
}
#: columns of the kernel's output array
P_MAX, P_MIN, COMPLIANCE, P_OPEN, AREA_ABOVE, N_SAMPLES, STATUS = range(7)


@jit
def _slope(p, v, lo, hi):
    """Least-squares slope dV/dP over the points with lo ≤ P ≤ hi (NaN if fewer than 3)."""
    n = 0
    sp = 0.0
    sv = 0.0
    for i in range(p.size):
        if lo <= p[i] <= hi:
            n += 1
            sp += p[i]
            sv += v[i]
    if n < 3:
        return math.nan
    mp = sp / n
    mv = sv / n
    sxx = 0.0
    sxy = 0.0
    for i in range(p.size):
        if lo <= p[i] <= hi:
            sxx += (p[i] - mp) ** 2
            sxy += (p[i] - mp) * (v[i] - mv)
    if sxx <= 0.0:
        return math.nan
    return sxy / sxx


@jit
def _mean_finite(x, start):
    """Mean of the finite values of x[start:] (NaN if none)."""
    s = 0.0
    n = 0
    for i in range(start, x.size):
        if math.isfinite(x[i]):
            s += x[i]
            n += 1
    return s / n if n else math.nan


@jit
def _count(p, lo, hi):
    n = 0
    for i in range(p.size):
        if lo <= p[i] <= hi:
            n += 1
    return n


@jit
def _one_loop(
    p_in, v_in, fit_lo, fit_hi, seg_width, seg_step, criterion, seg_point, min_points, out
):
    n = p_in.size
    out[N_SAMPLES] = n
    for i in range(n):
        if not (math.isfinite(p_in[i]) and math.isfinite(v_in[i])):
            out[STATUS] = 5
            return
    if n < min_points:
        out[STATUS] = 1
        return
    imax, imin = _extremes(p_in)
    pmax = p_in[imax]
    pmin = p_in[imin]
    out[P_MAX] = pmax
    out[P_MIN] = pmin
    dp = pmax - pmin
    if dp <= 0.0:
        out[STATUS] = 2
        return
    pu, vu = _cyclic_slice(p_in, v_in, imax, imin)  # unloading branch
    pl, vl = _cyclic_slice(p_in, v_in, imin, imax)  # loading branch
    c_ref = _slope(pu, vu, pmax - fit_hi * dp, pmax - fit_lo * dp)
    if not math.isfinite(c_ref):
        out[STATUS] = 3
        return
    out[COMPLIANCE] = c_ref
    if c_ref <= 0.0:
        out[STATUS] = 4
        return
    # compliance offset on the loading branch, segments from the top down
    n_seg = int((1.0 - seg_width) / seg_step + 1e-9) + 1
    offs = np.full(n_seg, math.nan)
    mids = np.empty(n_seg)
    for k in range(n_seg):
        top = pmax - k * seg_step * dp
        bot = top - seg_width * dp
        mids[k] = bot + seg_point * seg_width * dp  # the load the segment's offset stands for
        # sparse samples: widen the segment about its centre until it holds five
        while _count(pl, bot, top) < 4 and top - bot < 0.5 * dp:
            bot -= 0.125 * seg_width * dp
            top += 0.125 * seg_width * dp
        c_seg = _slope(pl, vl, bot, top)
        if math.isfinite(c_seg):
            offs[k] = (c_ref - c_seg) / c_ref
    p_op = pmin
    for k in range(n_seg):
        if (
            offs[k] >= criterion
            and (k + 1 >= n_seg or not offs[k + 1] < criterion)
            and (_mean_finite(offs, k) >= criterion)
        ):
            if k == 0 or not math.isfinite(offs[k - 1]):
                p_op = mids[k]
            else:
                f = (criterion - offs[k - 1]) / (offs[k] - offs[k - 1])
                p_op = mids[k - 1] + f * (mids[k] - mids[k - 1])
            break
    p_op = min(max(p_op, pmin), pmax)
    out[P_OPEN] = p_op
    out[AREA_ABOVE] = _area_above(pl, vl, p_op)
    out[STATUS] = 0


@jit
def _loading_branch(p_in, v_in):
    """Samples from the minimum to the maximum load (cyclically)."""
    imax, imin = _extremes(p_in)
    return _cyclic_slice(p_in, v_in, imin, imax)


@jit
def _extremes(p_in):
    """Indices of the (first) largest and smallest load of a loop."""
    imax = 0
    imin = 0
    for i in range(p_in.size):
        if p_in[i] > p_in[imax]:
            imax = i
        if p_in[i] < p_in[imin]:
            imin = i
    return imax, imin


@jit
def _cyclic_slice(p_in, v_in, i_from, i_to):
    """Samples from index ``i_from`` to ``i_to`` of a loop, wrapping round its end."""
    n = p_in.size
    m = (i_to - i_from) % n + 1
    p = np.empty(m)
    v = np.empty(m)
    for t in range(m):
        j = (i_from + t) % n
        p[t] = p_in[j]
        v[t] = v_in[j]
    return p, v


@jit
def loop_area_kernel(load, disp, starts, ends, p_open):
    """Loading-branch area above ``p_open[i]`` of every loop, ∫ (P − P_op) dV [N·mm]."""
    m = starts.size
    out = np.full(m, math.nan)
    for i in range(m):
        if ends[i] - starts[i] >= 3 and math.isfinite(p_open[i]):
            pl, vl = _loading_branch(load[starts[i] : ends[i]], disp[starts[i] : ends[i]])
            out[i] = _area_above(pl, vl, p_open[i])
    return out


@jit
def _area_above(pl, vl, p_op):
    """∫ (P − P_op) dV along a branch, counting only the parts above P_op (trapezoids, with
    the crossing points interpolated)."""
    n_ld = pl.size
    area = 0.0
    for t in range(n_ld - 1):
        p1 = pl[t] - p_op
        p2 = pl[t + 1] - p_op
        v1 = vl[t]
        v2 = vl[t + 1]
        if p1 >= 0.0 and p2 >= 0.0:
            area += 0.5 * (p1 + p2) * (v2 - v1)
        elif p1 < 0.0 <= p2:
            vc = v1 + (-p1) / (p2 - p1) * (v2 - v1)
            area += 0.5 * p2 * (v2 - vc)
        elif p2 < 0.0 <= p1:
            vc = v1 + p1 / (p1 - p2) * (v2 - v1)
            area += 0.5 * p1 * (vc - v1)
    return area


@jit
def reduce_loops_kernel(
    load, disp, starts, ends, fit_lo, fit_hi, seg_width, seg_step, criterion, seg_point, min_points
):
    """Reduce every loop ``load[starts[i]:ends[i]]`` (compiled).

    Returns an array (n_loops, 7) with columns P_max, P_min [N], compliance dV/dP [mm/N] of the
    unloading branch between P_max − fit_hi·ΔP and P_max − fit_lo·ΔP, opening load [N] (first
    segment from the top whose offset reaches ``criterion`` and stays there, interpolated to
    the criterion between the segments' points (``seg_point`` of the way up each segment,
    0.5: its midpoint); P_min if none), loading-branch area
    above the opening load [N·mm], sample count and status (see :data:`LOOP_STATUS`).
    """
    m = starts.size
    out = np.full((m, 7), math.nan)
    for i in range(m):
        _one_loop(
            load[starts[i] : ends[i]],
            disp[starts[i] : ends[i]],
            fit_lo,
            fit_hi,
            seg_width,
            seg_step,
            criterion,
            seg_point,
            min_points,
            out[i],
        )
    return out


def reduce_loops(
    load,
    disp,
    starts,
    ends,
    *,
    fit_window=(0.02, 0.5),
    segment=(0.10, 0.05),
    offset_criterion=0.02,
    segment_point=0.5,
    min_points=20,
):
    """Reduce recorded loops to P_max, P_min, compliance, opening load and area.

    Parameters
    ----------
    load, disp : 1-D arrays [N], [mm], all loops concatenated
    starts, ends : int arrays, sample range of each loop
    fit_window : fractions of ΔP below P_max bounding the unloading compliance fit
    segment : width and step of the offset segments, fractions of ΔP (ASTM E647 X2: 10 %, 5 %)
    offset_criterion : compliance offset that marks the opening load (E647 default 2 % = 0.02)
    segment_point : where in its segment each offset is placed, 0 (lower end) to 1 (upper
        end); 0.5, the segment midpoint, is the ASTM E647 X2 practice (from memory)
    min_points : fewer samples than this skip the loop

    Returns
    -------
    dict of arrays ``p_max, p_min, compliance, p_open, area_above, n_samples, status``.

    References
    ----------
    .. [1] ASTM E647 Appendix X2 (compliance offset); Dowling & Begley, ASTM STP 590 (1976).
    """
    if not 0 <= fit_window[0] < fit_window[1] <= 1:
        raise ValidityRangeError("fit window must satisfy 0 ≤ lower < upper ≤ 1")
    if not (0 < segment[0] <= 0.5 and 0 < segment[1] <= segment[0]):
        raise ValidityRangeError("segment width in (0, 0.5] and step in (0, width]")
    if not 0 < offset_criterion < 0.5:
        raise ValidityRangeError("offset criterion must lie in (0, 0.5)")
    if not 0 <= segment_point <= 1:
        raise ValidityRangeError("segment point must lie in [0, 1]")
    res = reduce_loops_kernel(
        np.ascontiguousarray(load, float),
        np.ascontiguousarray(disp, float),
        np.asarray(starts, np.int64),
        np.asarray(ends, np.int64),
        float(fit_window[0]),
        float(fit_window[1]),
        float(segment[0]),
        float(segment[1]),
        float(offset_criterion),
        float(segment_point),
        int(min_points),
    )
    names = ("p_max", "p_min", "compliance", "p_open", "area_above", "n_samples", "status")
    out = {k: res[:, i] for i, k in enumerate(names)}
    out["status"] = out["status"].astype(int)
    out["n_samples"] = out["n_samples"].astype(int)
    return out


def eta_plastic(shape, crack_length, width, location="load-line"):
    """Plastic η factor of ASTM E1820 (dimensionless).

    Parameters
    ----------
    shape : ``"compact-tension"`` or ``"three-point-bend"``
    crack_length, width : [mm], a from the load line for C(T)
    location : ``"load-line"`` (both shapes) or ``"crack-mouth"`` (SE(B))

    Notes
    -----
    C(T), load line: η = 2 + 0.522·b/W; SE(B), load line: 1.9; SE(B), crack mouth:
    3.667 − 2.199α + 0.437α².  Valid for 0.2 ≤ a/W ≤ 0.95 (C(T)), 0.1 ≤ a/W ≤ 0.9 (SE(B)).

    References
    ----------
    .. [1] ASTM E1820 (from memory, docs/references.md R8).
    """
    a = np.asarray(crack_length, float)
    alpha = a / width
    if shape == "compact-tension" and location == "load-line":
        if np.any((alpha < 0.2 - 1e-9) | (alpha > 0.95 + 1e-9)):
            raise ValidityRangeError("C(T) η is used for 0.2 ≤ a/W ≤ 0.95")
        return 2.0 + 0.522 * (1.0 - alpha)
    if shape == "three-point-bend":
        if np.any((alpha < 0.1 - 1e-9) | (alpha > 0.9 + 1e-9)):
            raise ValidityRangeError("SE(B) η is used for 0.1 ≤ a/W ≤ 0.9")
        if location == "load-line":
            return np.full(alpha.shape, 1.9) if alpha.ndim else 1.9
        if location == "crack-mouth":
            return 3.667 - 2.199 * alpha + 0.437 * alpha**2
    raise ValidityRangeError(f"no published η for {shape} measured at the {location}")


def dowling_begley_delta_j(area, thickness, ligament, eta):
    """ΔJ from a loop area, η·ΔA/(B·b) [kJ/m²].

    Parameters
    ----------
    area : array_like [N·mm] (= mJ), loop area (total, or plastic part only)
    thickness : float [mm], B (B_N for side-grooved specimens, as in E1820)
    ligament : array_like [mm], b = W − a > 0
    eta : array_like, η factor

    References
    ----------
    .. [1] Dowling & Begley, ASTM STP 590 (1976) 82–103; ASTM E1820 (docs/references.md R8, R9).
    """
    b = np.asarray(ligament, float)
    if not thickness > 0 or np.any(b <= 0):
        raise ValidityRangeError("thickness and ligament must be > 0 mm")
    return np.asarray(eta, float) * np.asarray(area, float) / (thickness * b)


def e1820_j(k, e_mod, poisson, plastic_area, net_thickness, ligament, eta):
    """J = K²(1−ν²)/E + η·A_pl/(B_N·b) [kJ/m²] (ASTM E1820, plane strain).

    ``k`` [MPa√mm], ``e_mod`` [MPa], ``plastic_area`` [N·mm], ``net_thickness`` and
    ``ligament`` [mm].

    References
    ----------
    .. [1] ASTM E1820 (docs/references.md R8).
    """
    if not e_mod > 0:
        raise ValidityRangeError("E must be > 0")
    return np.asarray(k, float) ** 2 * (1 - poisson**2) / e_mod + dowling_begley_delta_j(
        plastic_area, net_thickness, ligament, eta
    )


def plastic_area_above_opening(area_above, delta_p_eff, compliance):
    """Plastic part of the loading-branch area above the opening load [N·mm]:
    ΔA_pl = ΔA − ½·C·ΔP_eff² (the elastic triangle of the open-crack compliance C [mm/N])."""
    return (
        np.asarray(area_above, float)
        - 0.5 * np.asarray(compliance, float) * np.asarray(delta_p_eff, float) ** 2
    )
