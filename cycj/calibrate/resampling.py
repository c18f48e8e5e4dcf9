"""Intervals of C, m and da/dN that respect how the rates were measured.

Rates from one specimen share its material and its measurement errors, and incremental
polynomial rates from overlapping windows of seven readings are serially correlated: an
ordinary least-squares interval that treats every rate as independent is too narrow.  Here:

* the law is fitted with one common exponent m (the within-specimen slope: every specimen its
  own intercept) and ln C the mean of the specimen intercepts, so each specimen counts once;
* with ``CLUSTER_MIN`` specimens or more, whole specimens are resampled (cluster bootstrap);
  the interval is the estimate ± t(G−1)·s_boot·√(G/(G−1)) with G specimens;
* with fewer, the rates of each specimen are resampled in moving blocks (moving-block
  bootstrap, stratified by specimen), which keeps their serial correlation; between 2 and
  ``CLUSTER_MIN`` − 1 specimens the between-specimen variance of the intercepts (moment
  estimate) is added to the variance of ln C and of da/dN; a single specimen's interval says
  nothing about other specimens.

Everything works on per-specimen sums (n, Σx, Σy, Σx², Σxy with x = ln ΔJ, y = ln da/dN), so
a thousand resamples of a hundred specimens take milliseconds.

References
----------
.. [1] Davison, A. C., Hinkley, D. V., *Bootstrap Methods and their Application*, Cambridge
   University Press (1997): §3.8 resampling hierarchical data at the top level (cluster
   bootstrap) and its variance adjustment for few clusters; §8.2 the moving-block bootstrap
   of a dependent series; §5.2 normal-approximation intervals.  Section numbers from memory.
.. [2] Künsch, H. R., Ann. Statist. 17 (1989) 1217–1241: the moving-block bootstrap.
.. [3] Laird, N. M., Ware, J. H., Biometrics 38 (1982) 963–974: random-effects (mixed-effects)
   model of repeated measurements; the moment estimate of the between-unit variance.
"""

from __future__ import annotations

import math

import numpy as np

from cycj.errors import ValidityRangeError

__all__ = [
    "CLUSTER_MIN",
    "common_slope_fit",
    "resampled_intervals",
    "block_length",
    "direct_intervals",
]

#: fewest specimens for the cluster bootstrap (fewer: moving blocks within each specimen)
CLUSTER_MIN = 5


def _sums(x, y):
    """Per-specimen sums (n, Σx, Σy, Σx², Σxy) of lists of arrays → array (G, 5)."""
    return np.array(
        [
            [xi.size, xi.sum(), yi.sum(), (xi * xi).sum(), (xi * yi).sum()]
            for xi, yi in zip(x, y, strict=True)
        ],
        float,
    )


def _solve(s, w=None):
    """Common slope and intercepts from per-specimen sums ``s`` (…, G, 5), specimens weighted
    by ``w`` (…, G) counts.  Returns (m, mean intercept, intercepts (…, G))."""
    n, sx, sy, sxx, sxy = np.moveaxis(s, -1, 0)
    xb, yb = sx / n, sy / n
    cxx, cxy = sxx - sx * xb, sxy - sx * yb
    if w is None:
        w = np.ones(n.shape)
    den = np.sum(w * cxx, axis=-1)
    m = np.sum(w * cxy, axis=-1) / np.where(den > 0, den, np.nan)
    a = yb - m[..., None] * xb
    mean_a = np.sum(w * a, axis=-1) / np.sum(w, axis=-1)
    return m, mean_a, a


def common_slope_fit(x, y):
    """ln da/dN = a_i + m·ln ΔJ with a common m and one intercept per specimen.

    Parameters
    ----------
    x, y : lists (one per specimen) of arrays of ln ΔJ [ln kJ/m²] and ln da/dN [ln mm/cycle]

    Returns
    -------
    dict: ``m``, ``lnC`` (mean intercept: each specimen once), ``lnC_i`` (intercepts with m
    fixed), ``sigma_ln_within`` (residual standard deviation of ln da/dN about each
    specimen's line), ``n`` (rates), ``G`` (specimens).

    Raises
    ------
    ValidityRangeError
        no specimen has two distinct ΔJ values.
    """
    s = _sums(x, y)
    m, lnc, a = _solve(s)
    if not np.isfinite(m):
        raise ValidityRangeError("no specimen spans a range of ΔJ; m cannot be fitted")
    res = np.concatenate([yi - ai - m * xi for xi, yi, ai in zip(x, y, a, strict=True)])
    dof = max(res.size - len(x) - 1, 1)
    return {
        "m": float(m),
        "lnC": float(lnc),
        "lnC_i": a.tolist(),
        "sigma_ln_within": math.sqrt(float(np.sum(res**2)) / dof),
        "n": int(res.size),
        "G": len(x),
    }


def block_length(n: int) -> int:
    """Block length of the moving-block bootstrap for ``n`` rates: n^(1/3) (the order that
    balances bias and variance of the variance estimate, Künsch 1989), at least 13 so that a
    block spans the correlation of seven-point incremental polynomial rates (two windows),
    and at most n/3 so that a resample draws at least three blocks."""
    return int(max(1, min(n // 3, max(13, round(n ** (1 / 3))))))


def _block_draws(xi, yi, draws, rng):
    """Sums (draws, 5) of moving-block resamples of one specimen's series."""
    n = xi.size
    idx = _block_index(n, draws, rng)
    xs, ys = xi[idx], yi[idx]
    return np.stack(
        [np.full(draws, float(n)), xs.sum(1), ys.sum(1), (xs * xs).sum(1), (xs * ys).sum(1)],
        axis=-1,
    )


def resampled_intervals(x, y, *, x_at, confidence=0.95, resamples=1000, seed=0):
    """Fit and intervals of m, ln C and ln da/dN at ``x_at`` by resampling.

    Parameters
    ----------
    x, y : lists (one per specimen, each in cycle order) of arrays of ln ΔJ and ln da/dN
    x_at : array of ln ΔJ where the interval of da/dN is wanted
    confidence : two-sided level
    resamples : number of bootstrap resamples
    seed : random seed (the intervals are reproducible)

    Returns
    -------
    dict: the :func:`common_slope_fit` keys, ``method`` (``"cluster-bootstrap"`` or
    ``"moving-block-bootstrap"``), ``note``, ``m_interval``, ``lnC_interval``,
    ``ln_rate_at``, ``ln_rate_interval`` (2 × len(x_at)), ``se_m``, ``se_lnC``,
    ``cov_lnC_m`` (2 × 2, from the resamples), ``dof``
    (of the quantile; None for the normal quantile), ``resamples``, ``block_length``.
    """
    from scipy import stats

    fit = common_slope_fit(x, y)
    g = len(x)
    x_at = np.atleast_1d(np.asarray(x_at, float))
    rng = np.random.default_rng(seed)
    s = _sums(x, y)
    if g >= CLUSTER_MIN:
        w = rng.multinomial(g, np.full(g, 1.0 / g), size=resamples).astype(float)
        mb, lb, _ = _solve(np.broadcast_to(s, (resamples, *s.shape)), w)
        infl, dof = math.sqrt(g / (g - 1)), g - 1
        q = float(stats.t.ppf(0.5 + confidence / 2, dof))
        method = "cluster-bootstrap"
        note = (
            f"whole specimens resampled ({g} specimens, {resamples} resamples): the intervals "
            "carry the between-specimen scatter and each specimen's correlated errors; "
            f"estimate ± t({dof})·s·√(G/(G−1))"
        )
        blocks = None
    else:
        draws = np.stack(
            [_block_draws(xi, yi, resamples, rng) for xi, yi in zip(x, y, strict=True)], axis=1
        )
        mb, lb, ab = _solve(draws)
        infl, dof, q = 1.0, None, float(stats.norm.ppf(0.5 + confidence / 2))
        method = "moving-block-bootstrap"
        blocks = [block_length(xi.size) for xi in x]
        note = (
            f"rates of each specimen resampled in moving blocks of {min(blocks)}–{max(blocks)} "
            f"consecutive rates ({resamples} resamples), which keeps their serial correlation "
            "(conservative when the rates' errors come from independent reading errors, whose "
            "effect on neighbouring rates cancels across blocks)"
        )
        if g == 1:
            note += (
                "; one specimen: the intervals are those of this specimen's constants and say "
                "nothing of the scatter between specimens"
            )
    ok = np.isfinite(mb) & np.isfinite(lb)
    mb, lb = mb[ok], lb[ok]
    se_m = float(np.std(mb, ddof=1)) * infl
    se_l = float(np.std(lb, ddof=1)) * infl
    rate_b = lb[:, None] + mb[:, None] * x_at[None, :]
    se_r = np.std(rate_b, axis=0, ddof=1) * infl
    if g < CLUSTER_MIN and g >= 2:
        a = np.asarray(fit["lnC_i"])
        within = np.var(ab[ok], axis=0, ddof=1).mean()
        between = max(float(np.var(a, ddof=1)) - within, 0.0)
        se_l = math.sqrt(se_l**2 + between / g)
        se_r = np.sqrt(se_r**2 + between / g)
        note += (
            f"; between-specimen variance of ln C from {g} specimens (moment estimate, rough) "
            "added to the intervals of C and da/dN"
        )
    cov = np.cov(np.stack([lb, mb])) * infl**2
    cov[0, 0] = se_l**2
    return {
        **fit,
        "method": method,
        "note": note,
        **_interval_record(fit["m"], fit["lnC"], se_m, se_l, x_at, se_r, q, cov),
        "dof": dof,
        "resamples": int(ok.sum()),
        "block_length": blocks,
        "confidence": confidence,
    }


def _interval_record(m, lnc, se_m, se_l, x_at, se_r, q, cov) -> dict:
    """The interval keys shared by every resampling result: m, ln C and ln da/dN at ``x_at``
    (ln ΔJ) ± q standard errors, the standard errors and the covariance of (ln C, m)."""
    rate = lnc + m * x_at
    return {
        "m_interval": [m - q * se_m, m + q * se_m],
        "lnC_interval": [lnc - q * se_l, lnc + q * se_l],
        "ln_rate_at": rate.tolist(),
        "ln_rate_interval": [(rate - q * se_r).tolist(), (rate + q * se_r).tolist()],
        "se_m": se_m,
        "se_lnC": se_l,
        "cov_lnC_m": cov.tolist(),
    }


def _own_blocks(fit):
    """Per test of a direct a(N) fit: (u, V, f, e) with u = ∂a/∂m, V the columns of its own
    parameters (ln C_i first, then a_0,i when the start is fitted), f its residuals and e how
    they move per mm of error in its first reading (fixed start)."""
    lin = fit["_lin"]
    jac, res, rows = np.asarray(lin["jac"], float), np.asarray(lin["resid"], float), lin["rows"]
    start = np.asarray(lin["start"], float)
    g = len(rows)
    own = 2 if jac.shape[1] == 1 + 2 * g else 1
    out, r = [], 0
    for i, n in enumerate(rows):
        cols = [1 + i] + ([1 + g + i] if own == 2 else [])
        out.append((jac[r : r + n, 0], jac[r : r + n][:, cols], res[r : r + n], start[r : r + n]))
        r += n
    return out


def direct_intervals(fit, *, x_at, confidence=0.95, resamples=1000, seed=0):
    """Intervals of m, ln C and ln da/dN at ``x_at`` for the direct a(N) fit, by a linearised
    (one-step Gauss–Newton) resampling about its solution.

    With ``CLUSTER_MIN`` tests or more, whole tests are resampled (cluster bootstrap): each
    test's own parameters (ln C_i, and a_0,i if fitted) are profiled out, leaving its
    contribution h_i = u⊥ᵀu⊥ to the curvature in m and g_i = u⊥ᵀf to the score (Σ g_i = 0 at
    the solution); a resample with counts w_i moves m by −Σw_i·g_i/Σw_i·h_i and each ln C_i
    along with it.  With fewer tests, each test's residuals of a are resampled in moving blocks
    (their serial correlation kept), with a normal draw of the error of its first reading
    (a fixed start carries it into every residual), and pushed through the same linear map;
    between 2 and
    ``CLUSTER_MIN`` − 1 tests the moment estimates of the between-test variance of ln C_i and
    of each test's own exponent (one-step fits with its own m) are added, so that a common m
    and a mean ln C from few tests are not taken as known better than the tests agree.

    Parameters
    ----------
    fit : result of :func:`cycj.calibrate.fits.direct_fit` (needs ``_lin``)
    x_at : ln ΔJ [ln kJ/m²] where the interval of da/dN is wanted
    confidence, resamples, seed : as :func:`resampled_intervals`

    Returns
    -------
    dict with the keys of :func:`resampled_intervals` (``m``, ``lnC``, ``lnC_i``, ``G``,
    ``method``, ``note``, intervals, ``se_m``, ``se_lnC``, ``cov_lnC_m``, ``ln_rate_at``,
    ``ln_rate_interval``, ``dof``, ``resamples``, ``block_length``), ``m_i`` and ``lnC_own``
    (one-step own exponent and ln C of each test).

    References
    ----------
    .. [1] Davison & Hinkley (1997) §3.8 (cluster bootstrap), §8.2 (moving blocks of
       residuals) and §2.7 (linear approximation of a bootstrapped estimate); from memory.
    .. [2] Künsch (1989).
    """
    from scipy import stats

    blocks = _own_blocks(fit)
    g = len(blocks)
    m, lnc_i = float(fit["m"]), np.asarray(fit["lnC_per_test"], float)
    x_at = np.atleast_1d(np.asarray(x_at, float))
    rng = np.random.default_rng(seed)
    uperp, k, h, m_own = [], [], [], []
    for u, v, f, _ in blocks:
        vtv = v.T @ v
        coef = np.linalg.solve(vtv, v.T @ u)  # own parameters per unit of m
        up = u - v @ coef
        uperp.append(up)
        k.append(coef[0])
        h.append(float(up @ up))
        m_own.append(m - float(up @ f) / h[-1] if h[-1] > 0 else np.nan)
    k, h = np.asarray(k), np.asarray(h)
    if not np.all(h > 0):
        raise ValidityRangeError("a test's a(N) does not constrain m")
    if g >= CLUSTER_MIN:
        score = np.array([float(up @ b[2]) for up, b in zip(uperp, blocks, strict=True)])
        w = rng.multinomial(g, np.full(g, 1.0 / g), size=resamples).astype(float)
        dm = -(w @ score) / (w @ h)
        lb = (w @ lnc_i - dm * (w @ k)) / g
        infl, dof = math.sqrt(g / (g - 1)), g - 1
        q = float(stats.t.ppf(0.5 + confidence / 2, dof))
        method, lens = "cluster-bootstrap", None
        note = (
            f"whole tests resampled ({g} tests, {resamples} resamples) about the direct a(N) "
            "fit, linearised (one Gauss–Newton step per resample): the intervals carry the "
            f"between-specimen scatter; estimate ± t({dof})·s·√(G/(G−1))"
        )
        dc_within = None
    else:
        sc, own_c, lens = _residual_draws(blocks, uperp, resamples, rng)
        dm = -sc.sum(axis=1) / h.sum()
        dc = own_c - np.outer(dm, k)
        lb = float(np.mean(lnc_i)) + dc.mean(axis=1)
        # each test's own part, given m (a shift of the common m moves every ln C_i alike
        # and is no scatter between tests)
        dc_within = np.var(own_c, axis=0, ddof=1)
        # the tests' own two-parameter fits under the same resamples: (Δm_i, Δln C_i)
        dm_own = -sc / h
        own = list(zip(dm_own.T, (own_c - dm_own * k).T, strict=True))
        infl, dof, q = 1.0, None, float(stats.norm.ppf(0.5 + confidence / 2))
        method = "moving-block-bootstrap"
        note = (
            f"residuals of a(N) of each test resampled in moving blocks of {min(lens)}–"
            f"{max(lens)} readings ({resamples} resamples) about the direct a(N) fit, "
            "linearised (one Gauss–Newton step per resample), which keeps their serial "
            "correlation"
        )
        if g == 1:
            note += (
                "; one specimen: the intervals are those of this specimen's constants and say "
                "nothing of the scatter between specimens"
            )
    mb = m + dm
    se_m = float(np.std(mb, ddof=1)) * infl
    se_l = float(np.std(lb, ddof=1)) * infl
    rate_b = lb[:, None] + mb[:, None] * x_at[None, :]
    se_r = np.std(rate_b, axis=0, ddof=1) * infl
    lnc = float(np.mean(lnc_i))
    if 2 <= g < CLUSTER_MIN:
        between = max(float(np.var(lnc_i, ddof=1)) - float(dc_within.mean()), 0.0)
        own_var = [float(np.var(d, ddof=1)) for d, _ in own]
        between_m = max(float(np.var(m_own, ddof=1)) - float(np.mean(own_var)), 0.0)
        # each test's own law at x_at: the spread between tests less its resampling part
        lnc_own = lnc_i - k * (np.asarray(m_own) - m)
        own_rate = lnc_own[:, None] + np.asarray(m_own)[:, None] * x_at[None, :]
        own_within = np.mean(
            [np.var(c[:, None] + d[:, None] * x_at[None, :], axis=0, ddof=1) for d, c in own],
            axis=0,
        )
        between_r = np.maximum(np.var(own_rate, axis=0, ddof=1) - own_within, 0.0)
        # a variance from g tests has g − 1 degrees of freedom: its part of the half-width
        # takes the Student quantile t(g−1) (the resampling part the normal one)
        tb2 = (float(stats.t.ppf(0.5 + confidence / 2, g - 1)) / q) ** 2
        se_l = math.sqrt(se_l**2 + tb2 * between / g)
        se_m = math.sqrt(se_m**2 + between_m / g)
        # the common-m intercepts scatter alike at every ΔJ; the tests' own lines may spread
        # more at some ΔJ: the larger of the two
        se_r = np.sqrt(se_r**2 + tb2 * np.maximum(between_r, between) / g)
        note += (
            f"; between-test variances of ln C, of the tests' own m and of their own da/dN "
            f"from {g} tests (moment estimates, rough) added to the intervals, those of ln C "
            f"and da/dN with the quantile t({g - 1})"
        )
    cov = np.cov(np.stack([lb, mb])) * infl**2
    cov[0, 0], cov[1, 1] = se_l**2, se_m**2
    mixed = None
    if g >= 2:
        if g >= CLUSTER_MIN:  # the within-test resampling, for the mixed-effects estimate
            sc, own_c, _ = _residual_draws(blocks, uperp, resamples, rng)
        mixed = _mixed_effects(lnc_i, np.std(own_c, axis=0, ddof=1), k, m, sc, h, x_at, confidence)
    return {
        "m": m,
        "lnC": lnc,
        "lnC_i": lnc_i.tolist(),
        "m_i": [float(v) for v in m_own],
        "lnC_own": [float(c - kk * (mo - m)) for c, kk, mo in zip(lnc_i, k, m_own, strict=True)],
        "sigma_ln_within": None,
        "n": int(sum(b[2].size for b in blocks)),
        "G": g,
        "method": method,
        "note": note,
        **_interval_record(m, lnc, se_m, se_l, x_at, se_r, q, cov),
        "dof": dof,
        "resamples": int(resamples),
        "block_length": lens,
        "confidence": confidence,
        "mixed_effects": mixed,
    }


def _mixed_effects(lnc_i, se_i, k, m, sc, h, x_at, confidence):
    """Mixed-effects estimate beside the resampling: random intercept in ln C (REML,
    :func:`cycj.calibrate.between.random_intercept`) over the tests' ln C_i given the common
    m with their within-test errors ``se_i``; m with its within-test resampling error (the
    draws ``sc`` of each test's score, curvatures ``h``); da/dN at ``x_at`` adds the common
    m's error times its lever (x − mean k) and takes t(G−1)."""
    from scipy import stats

    from cycj.calibrate.between import random_intercept

    g = len(lnc_i)
    ri = random_intercept(lnc_i, se_i, confidence=confidence)
    se_m = float(np.std(-sc.sum(axis=1) / h.sum(), ddof=1))
    z = float(stats.norm.ppf(0.5 + confidence / 2))
    t = float(stats.t.ppf(0.5 + confidence / 2, g - 1))
    rate = ri["mean"] + m * x_at
    se_r = np.sqrt(ri["se"] ** 2 + (se_m * (x_at - float(np.mean(k)))) ** 2)
    return {
        "model": "random intercept in ln C between tests (REML), common m",
        "C": math.exp(ri["mean"]),
        "C_interval": [math.exp(v) for v in ri["interval"]],
        "sigma_ln_C": ri["tau"],
        "m": m,
        "m_interval": [m - z * se_m, m + z * se_m],
        "ln_rate_at": rate.tolist(),
        "ln_rate_interval": [(rate - t * se_r).tolist(), (rate + t * se_r).tolist()],
        "n_tests": g,
    }


def _residual_draws(blocks, uperp, draws, rng):
    """Moving-block resamples of each test's residuals of a (with a normal draw of its first
    reading's error, which a fixed start carries into every residual), pushed through the
    linear map of the fit: per test the score u⊥ᵀf* (draws, G) and the shift of its own
    ln C_i given m (draws, G), and the block lengths."""
    sc, own_c, lens = [], [], []
    for (_, v, f, e), up in zip(blocks, uperp, strict=True):
        fs = _block_series(f - f.mean(), draws, rng)
        sd = math.sqrt(float(np.sum(f**2)) / max(f.size - 2, 1))
        fs = fs + np.outer(sd * rng.standard_normal(draws), e)
        lens.append(block_length(f.size))
        sc.append(fs @ up)
        own_c.append(-np.linalg.solve(v.T @ v, v.T @ fs.T)[0])
    return np.stack(sc, axis=1), np.stack(own_c, axis=1), lens


def _block_series(f, draws, rng):
    """Moving-block resamples (draws, n) of one series ``f``."""
    return f[_block_index(f.size, draws, rng)]


def _block_index(n, draws, rng):
    """Indices (draws, n) of moving-block resamples of a series of ``n``."""
    lb = block_length(n)
    k = -(-n // lb)
    starts = rng.integers(0, n - lb + 1, size=(draws, k))
    return (starts[:, :, None] + np.arange(lb)[None, None, :]).reshape(draws, -1)[:, :n]
