"""Per-log reduction: loops → crack length, opening load, ΔK, ΔJ; readings → da/dN.

Strings the step modules together for one log and one specimen; returns tables in internal
units (columns name their units).  Invalid readings are dropped with a listed reason.

References
----------
.. [1] ASTM E647 (compliance crack length, compliance offset, da/dN, reading spacing).
.. [2] Dowling & Begley, ASTM STP 590 (1976); ASTM E1820 (η factors, B_e, ligament limit).
.. [3] Ainsworth, Eng. Fract. Mech. 19 (1984) 633 (reference stress ΔJ where no η exists).
"""

from __future__ import annotations

import numpy as np

from cycj.calibrate import compliance as cm
from cycj.calibrate import loops as lp
from cycj.calibrate import rates as rt
from cycj.units import MPA_SQRT_M

#: shapes whose plastic ΔJ comes from the loop area (η published in ASTM E1820)
ETA_SHAPES = ("compact-tension", "three-point-bend")


def _skip(skipped, log, cycles, mask, reason):
    for c in np.asarray(cycles)[mask]:
        skipped.append({"log": log, "cycle": float(c), "reason": reason})


def crack_from_compliance(specimen, comp, ok, cycles=None):
    """Crack length [mm] from the measured compliance [mm/N] of each loop; NaN where the
    expression's range is left.  ``ok`` marks loops usable for anchoring.  Returns (a, note)."""
    geo = specimen.geometry
    e = specimen.material.elastic_modulus
    be = cm.effective_thickness(geo.dims["thickness"], geo.dims["net_thickness"])
    if specimen.shape == "compact-tension":
        alpha = cm.e647_ct_crack_ratio(e * be * comp, specimen.compliance_point)
        lo, hi = cm.E647_CT_RANGE
        alpha = np.where((alpha >= lo) & (alpha <= min(hi, 0.95)), alpha, np.nan)
        return alpha * specimen.width, (
            f"ASTM E647 C(T) compliance expression, {specimen.compliance_point} row, "
            "E·B_e·V/P with B_e = B − (B − B_N)²/B"
        )
    from cycj.calibrate.simulate import _tips

    a_grid, dc = cm.castigliano_compliance_table(geo, specimen.e_prime, tips=_tips(specimen.shape))
    first = np.flatnonzero(ok)[:5]
    if first.size >= 3 and cycles is not None:  # trend of the first loops, at the first one
        c_first = np.polyval(np.polyfit(cycles[first], comp[first], 1), cycles[first[0]])
    else:
        c_first = comp[first[0]]
    c0 = c_first - np.interp(specimen.initial_crack, a_grid, dc)
    a = cm.crack_from_table(comp - c0, a_grid, dc)
    return a, (
        "load-point compliance from K by Castigliano's theorem (Tada, Paris & Irwin), "
        "uncracked-body part anchored at the initial crack length (trend of the first five "
        "loops)"
    )


def _outliers(a, ok, cycles):
    """Loops whose crack length is off the running-median trend by more than 6 robust σ."""
    idx = np.flatnonzero(ok)
    out = np.zeros(a.size, bool)
    if idx.size < 9:
        return out
    x = a[idx]
    pad = np.pad(x, 3, mode="edge")
    med = np.median(np.lib.stride_tricks.sliding_window_view(pad, 7), axis=1)
    res = x - med
    mad = 1.4826 * np.median(np.abs(res - np.median(res)))
    if mad <= 0:
        return out
    out[idx[np.abs(res) > 6 * mad]] = True
    return out


def _smooth_opening(p_op, p_max, p_min):
    """Opening load with its ratio x = (P_op − P_min)/ΔP replaced by the running median of
    seven recorded loops, so one loop with a noisy offset does not decide it (laboratories
    average the opening load over several cycles in the same spirit)."""
    x = (p_op - p_min) / (p_max - p_min)
    if x.size >= 7:
        pad = np.pad(x, 3, mode="edge")
        x = np.median(np.lib.stride_tricks.sliding_window_view(pad, 7), axis=1)
    return p_min + x * (p_max - p_min)


def _correct(specimen, a, ok):
    idx = np.flatnonzero(ok)
    if specimen.crack_correction == "none" or idx.size < 3:
        return a, "none"
    a_first = np.median(a[idx[:3]])
    if specimen.crack_correction == "first":
        return a + (specimen.initial_crack - a_first), "offset to the initial optical reading"
    a_last = np.median(a[idx[-3:]])
    scale = (specimen.final_crack - specimen.initial_crack) / (a_last - a_first)
    return (
        specimen.initial_crack + (a - a_first) * scale,
        "linear in extension to the first and last optical readings",
    )


def _finite_delta_j(specimen, dj_el, dsig, mat, u):
    """Reference-stress ΔJ; an overflow (a cyclic curve far below the logged stresses) is an
    input error naming the specimen file."""
    from cycj.errors import CycjInputError
    from cycj.jintegral import reference_stress_delta_j

    with np.errstate(over="ignore", invalid="ignore"):
        total = reference_stress_delta_j(dj_el, dsig, mat, u)
    if not np.all(np.isfinite(total)):
        raise CycjInputError(
            "ΔJ overflows with this cyclic curve at the logged loads",
            source=specimen.source,
            key="cyclic_curve",
            expected="K', n' of the material (σ'_y = K'·0.002^n' near the cyclic yield strength)",
        )
    return total


def _delta_j(specimen, a, p_max, p_min_eff, p_op, comp_pt, area_above):
    """ΔK, ΔK_eff [MPa√mm], ΔJ_el and ΔJ_pl [kJ/m²] and the plastic method used."""

    geo, mat = specimen.geometry, specimen.material
    kos = geo.k_over_s(a) * geo.nominal_stress_per_force()
    dp = p_max - p_min_eff
    dpe = p_max - p_op
    dk, dk_eff = dp * kos, dpe * kos
    dj_el = dk_eff**2 / specimen.e_prime
    b = specimen.width - a
    if specimen.shape in ETA_SHAPES:
        if specimen.shape == "compact-tension":
            # plastic displacement scales with the distance from the arms' hinge, not with the
            # elastic compliances (docs/references.md R35)
            ratio = cm.ct_plastic_displacement_ratio(a / specimen.width, specimen.compliance_point)
        else:
            ratio = np.ones_like(a)
        # the elastic triangle off with the measuring point's own compliance, then the plastic
        # area to the load line
        a_pl = ratio * lp.plastic_area_above_opening(area_above, dpe, comp_pt)
        eta = lp.eta_plastic(specimen.shape, a, specimen.width, "load-line")
        dj_pl = lp.dowling_begley_delta_j(a_pl, geo.dims["net_thickness"], b, eta)
        how = "loop area above the opening load, η of ASTM E1820 (load line" + (
            ", front-face plastic area scaled by the plastic displacement ratio of the arms' "
            "hinge, r_p = 0.46)"
            if specimen.compliance_point == "front-face"
            else ")"
        )
        return dk, dk_eff, dj_el, dj_pl, how
    if mat.cyclic_curve is None:
        return (
            dk,
            dk_eff,
            dj_el,
            np.zeros_like(a),
            (
                "none: no published η for this shape and no cyclic curve for the reference "
                "stress method (elastic ΔJ only)"
            ),
        )
    u = np.clip(dpe / dp, 0, 1)
    dsig = (
        dp
        * geo.nominal_stress_per_force()
        * mat.yield_strength
        / geo.limit_stress(a, mat.yield_strength)
    )
    total = _finite_delta_j(specimen, dk**2 / specimen.e_prime, dsig, mat, u)
    return (
        dk,
        dk_eff,
        dj_el,
        total - dj_el,
        (
            "cyclic reference stress method (jintegral.reference_stress_delta_j): no published η "
            "for this shape"
        ),
    )


def reduce_raw_log(log, specimen, *, fit_window=(0.02, 0.35), min_points=20, outliers=False):
    """Reduce a :class:`~cycj.calibrate.logs.RawLog` to one row per recorded cycle.

    ``outliers``: drop loops whose crack length is more than 6 robust σ off the running
    median of its neighbours (off by default: every reading is used, ASTM E647 practice);
    every dropped loop is listed with its reason.

    Returns (rows: dict of arrays for accepted loops, skipped: list of dicts, notes: dict,
    typical: dict with one loop's samples and its compliance line for plotting).
    """
    skipped = list(log.skipped)
    res = lp.reduce_loops(
        log.load,
        log.displacement,
        log.starts,
        log.ends,
        fit_window=fit_window,
        offset_criterion=specimen.opening_offset,
        segment_point=0.0 if specimen.opening_segment_point == "lower-end" else 0.5,
        min_points=min_points,
    )
    cyc = log.cycles
    ok = res["status"] == 0
    for code, reason in lp.LOOP_STATUS.items():
        if code:
            _skip(skipped, log.name, cyc, res["status"] == code, reason)
    comp = res["compliance"]
    a, how_a = crack_from_compliance(specimen, comp, ok, cyc)
    bad = ok & ~np.isfinite(a)
    _skip(skipped, log.name, cyc, bad, "crack length outside the compliance expression's range")
    ok &= ~bad
    out = _outliers(a, ok, cyc) if outliers else np.zeros(a.size, bool)
    _skip(skipped, log.name, cyc, out, "outlier: crack length off the trend of its neighbours")
    ok &= ~out
    a, how_corr = _correct(specimen, a, ok)
    lo, hi = specimen.geometry.size_limits
    bad = ok & ~((a >= lo) & (a <= hi))
    _skip(skipped, log.name, cyc, bad, "corrected crack length outside the geometry's range")
    ok &= ~bad
    if ok.sum() == 0:
        return None, skipped, {"crack_length": how_a}, None
    idx = np.flatnonzero(ok)
    p_max, p_min = res["p_max"][idx], res["p_min"][idx]
    p_min_eff = np.maximum(p_min, 0.0)  # compressive part ignored (ASTM E647 convention)
    p_op_raw = np.clip(res["p_open"][idx], p_min_eff, p_max)
    p_op = _smooth_opening(p_op_raw, p_max, p_min_eff)
    area = lp.loop_area_kernel(log.load, log.displacement, log.starts[idx], log.ends[idx], p_op)
    dk, dk_eff, dj_el, dj_pl, how_j = _delta_j(
        specimen, a[idx], p_max, p_min_eff, p_op, comp[idx], area
    )
    rows = {
        "cycle": cyc[idx],
        "a_mm": a[idx],
        "P_max_N": p_max,
        "P_min_N": p_min,
        "P_open_N": p_op,
        "P_open_loop_N": p_op_raw,
        "U": (p_max - p_op) / (p_max - p_min_eff),
        "R": p_min / p_max,
        "compliance_mm_per_N": comp[idx],
        "dK_MPa_sqrt_m": dk / MPA_SQRT_M,
        "dK_eff_MPa_sqrt_m": dk_eff / MPA_SQRT_M,
        "dJ_el_kJm2": dj_el,
        "dJ_pl_kJm2": dj_pl,
        "dJ_eff_kJm2": dj_el + dj_pl,
    }
    j = idx[len(idx) // 2]
    s, e = log.starts[j], log.ends[j]
    typical = {
        "cycle": float(cyc[j]),
        "load": log.load[s:e],
        "disp": log.displacement[s:e],
        "compliance": comp[j],
        "p_max": res["p_max"][j],
        "p_open": res["p_open"][j],
        "fit_window": fit_window,
        "a_mm": float(a[j]),
    }
    notes = {
        "crack_length": how_a,
        "crack_correction": how_corr,
        "plastic_dJ": how_j,
        "closure": f"opening load by compliance offset ({100 * specimen.opening_offset:g} %"
        " criterion, ASTM E647 X2, offsets at the segments' "
        + ("lower ends" if specimen.opening_segment_point == "lower-end" else "midpoints")
        + "), running median of 7 loops; ΔJ_eff above the opening load",
    }
    return rows, skipped, notes, typical


def reduce_crack_log(log, specimen):
    """Rows for a :class:`~cycj.calibrate.logs.CrackLog` (applied basis: no opening load is
    measured; P_min < 0 counts as 0).  Plastic part by the reference stress method when the
    specimen has a cyclic curve."""

    skipped = list(log.skipped)
    geo, mat = specimen.geometry, specimen.material
    a = log.crack_length
    lo, hi = geo.size_limits
    ok = (a >= lo) & (a <= hi) & (log.load_max > log.load_min) & (log.load_max > 0)
    _skip(
        skipped,
        log.name,
        log.cycles,
        ~ok,
        "crack length outside the geometry's range or no load range",
    )
    idx = np.flatnonzero(ok)
    if idx.size == 0:
        return None, skipped, {}
    a = a[idx]
    p_max, p_min = log.load_max[idx], log.load_min[idx]
    dp = p_max - np.maximum(p_min, 0.0)
    kos = geo.k_over_s(a) * geo.nominal_stress_per_force()
    dk = dp * kos
    dj_el = dk**2 / specimen.e_prime
    if mat.cyclic_curve is not None:
        dsig = (
            dp
            * geo.nominal_stress_per_force()
            * mat.yield_strength
            / geo.limit_stress(a, mat.yield_strength)
        )
        total = _finite_delta_j(specimen, dj_el, dsig, mat, 1.0)
        how = "cyclic reference stress method on the applied range"
    else:
        total = dj_el
        how = "none (elastic ΔJ only: no cyclic curve given)"
    rows = {
        "cycle": log.cycles[idx],
        "a_mm": a,
        "P_max_N": p_max,
        "P_min_N": p_min,
        "P_open_N": np.maximum(p_min, 0.0),
        "U": np.ones_like(a),
        "R": p_min / p_max,
        "compliance_mm_per_N": np.full_like(a, np.nan),
        "dK_MPa_sqrt_m": dk / MPA_SQRT_M,
        "dK_eff_MPa_sqrt_m": dk / MPA_SQRT_M,
        "dJ_el_kJm2": dj_el,
        "dJ_pl_kJm2": total - dj_el,
        "dJ_eff_kJm2": total,
    }
    notes = {
        "crack_length": "measured (crack-length log)",
        "plastic_dJ": how,
        "closure": "none measured: applied range (P_min < 0 counts as 0)",
    }
    return rows, skipped, notes


def rates_for_rows(rows, specimen, *, spacing="all"):
    """da/dN by secant and incremental polynomial on every reading (``spacing="all"``, the
    default) or on readings thinned to the E647 minimum spacing (``"e647"``).

    Returns (dict method → dict of arrays ``cycle, a_mm, dadN_mm_per_cycle, dJ_eff_kJm2,
    dK_eff_MPa_sqrt_m, R, row``), spacing info).  ΔJ at a rate point is the mean of the rows
    that the point stands for (between the midpoints to its neighbours).
    """
    n, a = rows["cycle"], rows["a_mm"]
    minsp = rt.e647_minimum_spacing(specimen.shape, a, specimen.width)
    keep = rt.thin_to_spacing(n, a, minsp) if spacing == "e647" else np.arange(n.size)
    info = {
        "readings": int(n.size),
        "kept": int(keep.size),
        "median_spacing_mm": float(np.median(np.diff(a))) if a.size > 1 else None,
        "e647_minimum_mm": [float(minsp.min()), float(minsp.max())],
    }
    info["spacing"] = (
        "every reading (no thinning)" if spacing != "e647" else "thinned to the E647 minimum"
    )
    if spacing == "e647" and keep.size < 9:
        keep = np.arange(n.size)
        info["note"] = (
            "too few readings at the E647 spacing; rates from all readings (scatter will be larger)"
        )
    info["kept"] = int(keep.size)
    nk, ak = n[keep], a[keep]
    out = {}
    edges = np.concatenate([[-np.inf], 0.5 * (nk[1:] + nk[:-1]), [np.inf]])
    bins = np.searchsorted(edges, n, side="right") - 1
    means = {
        c: np.bincount(bins, rows[c], minlength=nk.size)
        / np.maximum(np.bincount(bins, minlength=nk.size), 1)
        for c in ("dJ_eff_kJm2", "dK_eff_MPa_sqrt_m", "R")
    }
    if nk.size >= 7:
        ni, ahat, r = rt.incremental_polynomial_rate(nk, ak)
        sel = np.arange(3, nk.size - 3)
        out["polynomial"] = {
            "cycle": ni,
            "a_mm": ahat,
            "dadN_mm_per_cycle": r,
            **{c: means[c][sel] for c in means},
            "row": keep[sel],
        }
    if nk.size >= 2:
        nm, am, r = rt.secant_rate(nk, ak)
        inside = (n[:, None] >= nk[None, :-1]) & (n[:, None] <= nk[None, 1:])
        cnt = np.maximum(inside.sum(0), 1)
        sec = {c: (rows[c][:, None] * inside).sum(0) / cnt for c in means}
        out["secant"] = {"cycle": nm, "a_mm": am, "dadN_mm_per_cycle": r, **sec, "row": keep[:-1]}
    return out, info
