"""Fits of the growth law da/dN = C·ΔJ^m: log–log regression, direct fit on a(N), threshold.

Units: ΔJ [kJ/m²], da/dN [mm/cycle], C [mm/cycle per (kJ/m²)^m], a [mm], N [cycles].

References
----------
.. [1] ASTM E647, Appendix X1 and §9 (regression of log da/dN on log ΔK; operational
   threshold at 10⁻¹⁰ m/cycle from a fit of at least five points between 10⁻⁹ and 10⁻¹⁰
   m/cycle; K-decreasing gradient (1/K)·dK/da ≥ −0.08 mm⁻¹); from memory.
.. [2] Dowling & Begley, ASTM STP 590 (1976): da/dN = C·ΔJ^m.
.. [3] Draper, N. R., Smith, H., *Applied Regression Analysis*, 3rd ed. (1998): confidence and
   prediction intervals of ordinary least squares.
"""

from __future__ import annotations

import math

import numpy as np

from cycj.errors import ValidityRangeError


def power_law_fit(delta_j, dadn, confidence=0.95):
    """Least squares of ln(da/dN) on ln(ΔJ): ln C, m, their covariance and intervals.

    Parameters
    ----------
    delta_j : array [kJ/m²], > 0
    dadn : array [mm/cycle], > 0
    confidence : two-sided level of the intervals

    Returns
    -------
    dict: ``C, m, lnC, cov_lnC_m`` (2×2), ``C_interval, m_interval``, ``sigma_ln`` (residual
    standard deviation of ln da/dN), ``n``, ``pivot_dJ_kJm2`` (geometric mean ΔJ, where ln C
    and m are uncorrelated), ``rate_at_pivot`` and its interval, ``r2``, ``x_mean``, ``sxx``,
    ``t`` (Student quantile).

    References
    ----------
    .. [1] Draper & Smith (1998) ch. 1; ASTM E647 X1.
    """
    from scipy import stats

    x = np.log(np.asarray(delta_j, float))
    y = np.log(np.asarray(dadn, float))
    if x.size != y.size or x.size < 3:
        raise ValidityRangeError("need at least three (ΔJ, da/dN) points")
    if not (np.all(np.isfinite(x)) and np.all(np.isfinite(y))):
        raise ValidityRangeError("ΔJ and da/dN must be finite and > 0")
    xm = x.mean()
    sxx = float(np.sum((x - xm) ** 2))
    if sxx <= 0:
        raise ValidityRangeError("all points have the same ΔJ; m cannot be fitted")
    m = float(np.sum((x - xm) * (y - y.mean())) / sxx)
    b0 = float(y.mean() - m * xm)
    res = y - (b0 + m * x)
    dof = x.size - 2
    s2 = float(np.sum(res**2) / dof) if dof > 0 else float("nan")
    var_m = s2 / sxx
    var_b0 = s2 * (1 / x.size + xm**2 / sxx)
    cov = -xm * s2 / sxx
    t = float(stats.t.ppf(0.5 + confidence / 2, dof)) if dof > 0 else float("nan")
    se_pivot = math.sqrt(s2 / x.size)
    pivot = math.exp(xm)
    rate_pivot = math.exp(b0 + m * xm)
    ss_tot = float(np.sum((y - y.mean()) ** 2))
    return {
        "C": math.exp(b0),
        "m": m,
        "lnC": b0,
        "cov_lnC_m": [[var_b0, cov], [cov, var_m]],
        "C_interval": [math.exp(b0 - t * math.sqrt(var_b0)), math.exp(b0 + t * math.sqrt(var_b0))],
        "m_interval": [m - t * math.sqrt(var_m), m + t * math.sqrt(var_m)],
        "sigma_ln": math.sqrt(s2),
        "n": int(x.size),
        "dof": dof,
        "t": t,
        "pivot_dJ_kJm2": pivot,
        "rate_at_pivot": rate_pivot,
        "rate_at_pivot_interval": [
            rate_pivot * math.exp(-t * se_pivot),
            rate_pivot * math.exp(t * se_pivot),
        ],
        "r2": 1 - float(np.sum(res**2)) / ss_tot if ss_tot > 0 else 1.0,
        "x_mean": xm,
        "sxx": sxx,
        "confidence": confidence,
    }


def prediction_band(fit, delta_j):
    """Lower and upper prediction bounds of da/dN [mm/cycle] for new points at ``delta_j``,
    at the fit's confidence level (ordinary least squares prediction interval in ln)."""
    x = np.log(np.asarray(delta_j, float))
    mid = fit["lnC"] + fit["m"] * x
    half = (
        fit["t"]
        * fit["sigma_ln"]
        * np.sqrt(1 + 1 / fit["n"] + (x - fit["x_mean"]) ** 2 / fit["sxx"])
    )
    return np.exp(mid - half), np.exp(mid + half)


def outlier_mask(delta_j, dadn, limit=3.5):
    """Points whose ln-residual from a least-squares line exceeds ``limit`` robust standard
    deviations (1.4826·MAD, at least 0.02), removed one at a time (largest first)."""
    x = np.log(np.asarray(delta_j, float))
    y = np.log(np.asarray(dadn, float))
    out = ~(np.isfinite(x) & np.isfinite(y))
    while (~out).sum() > 5:
        m, b = np.polyfit(x[~out], y[~out], 1)
        res = np.where(out, 0.0, y - (m * x + b))
        # floor: scatter below 2 % in rate is not worth rejecting points over
        mad = max(1.4826 * np.median(np.abs(res[~out] - np.median(res[~out]))), 0.02)
        worst = int(np.argmax(np.abs(res)))
        if abs(res[worst]) <= limit * mad:
            break
        out[worst] = True
    return out


def e647_threshold(delta_j, dadn, rate=1e-7, upper=1e-6, min_points=5):
    """ASTM E647 operational threshold in ΔJ [kJ/m²]: ΔJ at ``rate`` [mm/cycle] from a line
    ln ΔJ = b0 + b1·ln(da/dN) through the points with rate ≤ da/dN ≤ 10·rate (at least
    ``min_points``).  Returns a dict (``threshold_kJm2``, ``points``, ``slope``) or None.

    References
    ----------
    .. [1] ASTM E647 §9 (10⁻¹⁰ m/cycle, five points between 10⁻⁹ and 10⁻¹⁰ m/cycle), from memory.
    """
    dj = np.asarray(delta_j, float)
    r = np.asarray(dadn, float)
    sel = (r >= rate * 0.999) & (r <= upper) & (dj > 0)
    if sel.sum() < min_points:
        return None
    b1, b0 = np.polyfit(np.log(r[sel]), np.log(dj[sel]), 1)
    return {
        "threshold_kJm2": float(math.exp(b0 + b1 * math.log(rate))),
        "rate_mm_per_cycle": rate,
        "points": int(sel.sum()),
        "slope_dlnJ_dlnrate": float(b1),
    }


def k_gradient(a, delta_j):
    """Normalised K gradient (1/K)·dK/da [1/mm] of a test, from ΔJ ∝ K²:
    ½·d(ln ΔJ)/da by a least-squares line.  ASTM E647 asks for ≥ −0.08 mm⁻¹ when K decreases."""
    a = np.asarray(a, float)
    dj = np.asarray(delta_j, float)
    ok = np.isfinite(a) & np.isfinite(dj) & (dj > 0)
    a, dj = a[ok], dj[ok]
    if a.size < 3 or np.ptp(a) <= 0:
        return float("nan")
    return float(0.5 * np.polyfit(a, np.log(dj), 1)[0])


def direct_series(rows, name):
    """Readings and a smooth ΔJ_eff(a) table for :func:`direct_fit`: a least-squares polynomial
    of ln ΔJ_eff in a (degree ≤ 5, every reading) on 200 points over the crack range.  A
    smooth fit, not means of groups of readings with straight lines between them: ΔJ is
    convex in a, so group means and chords overstate it where readings are far apart (late
    in a test logged at equal cycles), which biased m low."""
    order = np.argsort(rows["cycle"], kind="stable")
    n, a, dj = (np.asarray(rows[k], float)[order] for k in ("cycle", "a_mm", "dJ_eff_kJm2"))
    ok = np.isfinite(a) & np.isfinite(dj) & (dj > 0)
    lo, hi = float(np.min(a[ok])), float(np.max(a[ok]))
    at = np.linspace(lo, hi, 200) if hi > lo else np.array([lo])
    deg = int(min(5, max(ok.sum() // 8, 1)))
    if hi > lo and ok.sum() > deg + 1:
        u = (a[ok] - lo) / (hi - lo)
        coef = np.polynomial.polynomial.polyfit(u, np.log(dj[ok]), deg)
        jt = np.exp(np.polynomial.polynomial.polyval((at - lo) / (hi - lo), coef))
    else:
        jt = np.full(at.size, float(np.mean(dj[ok])))
    return {"log": name, "cycle": n, "a_mm": a, "a_tab": at, "dj_tab": jt}


def direct_fit(series, C0, m0, confidence=0.95, *, free_start=False):
    """Fit C and m to measured a(N) by integrating da/dN = C·ΔJ(a)^m (scipy least_squares).

    Parameters
    ----------
    series : list of dicts with ``cycle, a_mm`` (readings) and ``a_tab, dj_tab`` (ΔJ_eff as a
        function of crack length for that test, increasing in a)
    C0, m0 : starting values
    free_start : fit each test's start a_0 as a parameter (default: fixed at its first
        reading, so the fit cannot trade the start of a test against C)

    Returns
    -------
    dict: ``C, m, lnC, cov_lnC_m, C_interval, m_interval, sigma_a_mm`` (residual standard
    deviation of a), ``n``, ``a0_mm`` (fitted start of each test), ``curves`` (per test: cycles
    and fitted a for plotting), ``success``, ``message``.

    Notes
    -----
    For each test N(a) = N_0 + ∫_{a_0}^{a} da'/(C·ΔJ(a')^m) on a fine grid (trapezoidal rule),
    inverted by interpolation at the measured cycles; parameters m, one ln C_i per test (C is
    exp of their mean, each test once, as in the rate fits) and one a_0 per test when
    ``free_start`` (otherwise a_0 is the test's first reading).
    Intervals from the Jacobian at the solution, cov = s²·(JᵀJ)⁻¹.
    """
    from scipy import stats
    from scipy.optimize import least_squares

    grids = []
    for s in series:
        span = np.ptp(s["a_tab"])
        ag = np.linspace(s["a_tab"][0] - 0.05 * span, s["a_tab"][-1] + 0.5 * span + 1e-6, 600)
        dj = np.interp(ag, s["a_tab"], s["dj_tab"])
        # extend beyond the data with the last slope in ln ΔJ – a
        tail = ag > s["a_tab"][-1]
        if tail.any() and len(s["a_tab"]) > 1 and min(s["dj_tab"][-2:]) > 0:
            k = np.log(s["dj_tab"][-1] / s["dj_tab"][-2]) / max(
                s["a_tab"][-1] - s["a_tab"][-2], 1e-9
            )
            dj[tail] = s["dj_tab"][-1] * np.exp(k * (ag[tail] - s["a_tab"][-1]))
        grids.append((ag, np.maximum(dj, 1e-12)))

    g = len(series)

    def predict(p, cycles=None, shift=0.0):
        m = p[0]
        out = []
        for i, s in enumerate(series):
            cyc = s["cycle"] if cycles is None else cycles[i]
            ag, dj = grids[i]
            a0 = p[1 + g + i] if free_start else s["a_mm"][0] + shift
            inv = 1.0 / (np.exp(p[1 + i]) * dj**m)
            nn = np.concatenate([[0.0], np.cumsum(0.5 * (inv[1:] + inv[:-1]) * np.diff(ag))])
            n0 = np.interp(a0, ag, nn)
            out.append(np.interp(cyc - s["cycle"][0] + n0, nn, ag))
        return out

    def resid(p):
        return np.concatenate([pa - s["a_mm"] for pa, s in zip(predict(p), series, strict=True)])

    starts = [s["a_mm"][0] for s in series] if free_start else []
    p0 = np.concatenate([[m0], np.full(g, math.log(C0)), starts])
    lo = np.concatenate([[0.05], np.full(g, -80.0), [q[0][0] for q in grids] if free_start else []])
    hi = np.concatenate([[20.0], np.full(g, 20.0), [q[0][-1] for q in grids] if free_start else []])
    p0 = np.clip(p0, lo + 1e-9, hi - 1e-9)
    sol = least_squares(
        resid, p0, bounds=(lo, hi), x_scale="jac", jac_sparsity=_sparsity(series, free_start)
    )
    n = sol.fun.size
    dof = max(n - sol.x.size, 1)
    s2 = float(np.sum(sol.fun**2) / dof)
    jac = sol.jac.toarray() if hasattr(sol.jac, "toarray") else np.asarray(sol.jac)
    try:
        cov = np.linalg.inv(jac.T @ jac) * s2
    except np.linalg.LinAlgError:
        cov = np.full((sol.x.size, sol.x.size), np.nan)
    t = float(stats.t.ppf(0.5 + confidence / 2, dof))
    # (mean ln C_i, m) as a linear map of the parameters
    tr = np.zeros((2, sol.x.size))
    tr[0, 1 : 1 + g] = 1.0 / g
    tr[1, 0] = 1.0
    cov2 = tr @ cov @ tr.T
    lnc, m = float(np.mean(sol.x[1 : 1 + g])), float(sol.x[0])
    sd = np.sqrt(np.abs(np.diag(cov2)))
    lives = []
    for i, s in enumerate(series):
        ag, dj = grids[i]
        inv = 1.0 / (np.exp(sol.x[1 + i]) * dj ** sol.x[0])
        nn = np.concatenate([[0.0], np.cumsum(0.5 * (inv[1:] + inv[:-1]) * np.diff(ag))])
        a_first = sol.x[1 + g + i] if free_start else s["a_mm"][0]
        span = np.interp([a_first, s["a_mm"][-1]], ag, nn)
        lives.append((float(span[1] - span[0]), float(s["cycle"][-1] - s["cycle"][0])))
    cyc = [np.linspace(s["cycle"][0], s["cycle"][-1], 200) for s in series]
    curves = [{"cycle": c, "a_mm": a} for c, a in zip(cyc, predict(sol.x, cyc), strict=True)]
    return {
        "C": math.exp(lnc),
        "m": m,
        "lnC": lnc,
        "cov_lnC_m": cov2.tolist(),
        "lnC_per_test": sol.x[1 : 1 + g].tolist(),
        "C_interval": [math.exp(lnc - t * sd[0]), math.exp(lnc + t * sd[0])],
        "m_interval": [float(m - t * sd[1]), float(m + t * sd[1])],
        "sigma_a_mm": math.sqrt(s2),
        "n": int(n),
        "a0_mm": sol.x[1 + g :].tolist() if free_start else [float(s["a_mm"][0]) for s in series],
        "start": "fitted per test" if free_start else "fixed at each test's first reading",
        "curves": curves,
        "life_per_test": lives,
        # working values for the resampling intervals (kept out of fit.json)
        "_lin": {
            "jac": jac,
            "resid": sol.fun,
            "rows": [s["cycle"].size for s in series],
            "start": _start_column(series, predict, sol.x, free_start),
        },
        "success": bool(sol.success),
        "message": str(sol.message),
        "confidence": confidence,
    }


def _start_column(series, predict, p, free_start):
    """How the residuals of a fixed-start fit move per mm of error in each test's first
    reading (the prediction starts there; the first residual stays 0); zeros when the
    start is fitted."""
    if free_start:
        return np.zeros(sum(s["cycle"].size for s in series))
    h = 1e-4 * max(float(np.ptp(np.concatenate([s["a_mm"] for s in series]))), 1e-3)
    base, moved = predict(p), predict(p, shift=h)
    cols = []
    for b, mv in zip(base, moved, strict=True):
        col = (mv - b) / h
        col[0] -= 1.0
        cols.append(col)
    return np.concatenate(cols)


def _sparsity(series, free_start):
    """Which parameters each residual of :func:`direct_fit` depends on (m, its own ln C_i and
    a_0)."""
    g = len(series)
    rows = [s["cycle"].size for s in series]
    out = np.zeros((sum(rows), 1 + g * (2 if free_start else 1)), int)
    out[:, 0] = 1
    r = 0
    for i, n in enumerate(rows):
        out[r : r + n, 1 + i] = 1
        if free_start:
            out[r : r + n, 1 + g + i] = 1
        r += n
    return out


def r_ratio_collapse(residuals, r_values, step=0.05):
    """Do tests at several R ratios fall on one curve in ΔJ_eff?

    Groups the ln-residuals from the pooled fit by R (rounded to ``step``) and compares the
    group means by a one-way analysis of variance.  Returns a dict with the groups (R, n, mean
    ln residual, the factor exp(mean) on the rate), the F statistic and p value, and
    ``collapses`` (True when p > 0.01 or every group is within a factor 1.25 of the fit).
    """
    from scipy import stats

    res = np.asarray(residuals, float)
    key = np.round(np.asarray(r_values, float) / step) * step
    groups = []
    for r in np.unique(key):
        sel = key == r
        groups.append(
            {
                "R": float(r),
                "n": int(sel.sum()),
                "mean_ln_residual": float(res[sel].mean()),
                "rate_factor": float(np.exp(res[sel].mean())),
            }
        )
    if len(groups) < 2:
        return {"groups": groups, "collapses": None, "note": "one R ratio only"}
    samples = [res[key == g["R"]] for g in groups if g["n"] >= 2]
    if len(samples) < 2:
        return {"groups": groups, "collapses": None, "note": "too few points per R ratio"}
    f, p = stats.f_oneway(*samples)
    close = all(abs(g["mean_ln_residual"]) < math.log(1.25) for g in groups)
    return {
        "groups": groups,
        "F": float(f),
        "p_value": float(p),
        "collapses": bool(p > 0.01 or close),
        "note": "ANOVA of ln-residuals by R; collapse if p > 0.01 or all groups within "
        "a factor 1.25",
    }
