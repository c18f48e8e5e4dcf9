"""Coverage of the fit's intervals on the virtual test frame (a check, not a user command).

Simulates replicate programmes with known C, m and between-specimen scatter
(:func:`cycj.calibrate.simulate.simulate_programme`), reduces each test as ``cycj fit`` does
(crack-length logs: :func:`~cycj.calibrate.reduction.reduce_crack_log`, every reading; the
direct a(N) fit with its resampling intervals, or the regression on seven-point incremental
polynomial rates) and counts how often the nominal intervals of m, of da/dN at mid-range and
of σ_ln C contain the truth, with readings at equal crack extension or at equal cycles
(``spacing``).  Used by the tests (a smaller count)
and by ``bench/bench_fit.py`` (the full count).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["programme_fit", "coverage_study"]


def programme_fit(prog, specimen, *, confidence=0.95, resamples=1000, seed=0, estimate="direct"):
    """Reduce and fit one :class:`~cycj.calibrate.simulate.SimulatedProgramme` as ``cycj fit``
    does: the direct a(N) fit with its resampling intervals (``estimate="direct"``, the
    recommended fit) or the regression on incremental polynomial rates (``"polynomial"``,
    the cross-check).

    Returns a dict: ``intervals`` (at the geometric middle ``dJ_mid`` of the data),
    ``per_specimen`` and ``between``, ``dJ_mid``.
    """
    from cycj.calibrate import fits as ft
    from cycj.calibrate import reduction as rd
    from cycj.calibrate.between import between_specimen, direct_rows, scatter_of_lnc
    from cycj.calibrate.logs import CrackLog
    from cycj.calibrate.resampling import direct_intervals, resampled_intervals

    tests, series = [], []
    for lab, df in prog.crack.groupby("specimen", sort=False):
        log = CrackLog(
            str(lab),
            df["cycle"].to_numpy(float),
            df["crack_length"].to_numpy(float),
            df["load_max"].to_numpy(float),
            df["load_min"].to_numpy(float),
        )
        rows, _, _ = rd.reduce_crack_log(log, specimen)
        series.append(ft.direct_series(rows, str(lab)))
        rates, _ = rd.rates_for_rows(rows, specimen)
        p = rates["polynomial"]
        ok = (p["dadN_mm_per_cycle"] > 0) & (p["dJ_eff_kJm2"] > 0)
        tests.append(
            {
                "test": str(lab),
                "specimen": str(lab),
                "dJ": p["dJ_eff_kJm2"][ok],
                "dadN": p["dadN_mm_per_cycle"][ok],
                "a_mm": p["a_mm"][ok],
                "cycle": p["cycle"][ok],
            }
        )
    x = [np.log(t["dJ"]) for t in tests]
    y = [np.log(t["dadN"]) for t in tests]
    xs = np.log(np.concatenate([s["dj_tab"] for s in series]))
    mid = 0.5 * (xs.min() + xs.max())
    kw = dict(x_at=[mid], confidence=confidence, resamples=resamples, seed=seed)
    iv = resampled_intervals(x, y, **kw)
    if estimate == "polynomial":
        rows, between = between_specimen(tests, iv["m"], confidence)
    else:
        fit = ft.direct_fit(series, math.exp(iv["lnC"]), iv["m"], confidence)
        iv = direct_intervals(fit, **kw)
        rows = direct_rows(fit, iv, series, {})
        between = scatter_of_lnc(fit["lnC_per_test"], fit["m"], confidence)
    return {"intervals": iv, "per_specimen": rows, "between": between, "dJ_mid": math.exp(mid)}


def coverage_study(
    specimen,
    *,
    programmes=200,
    n_specimens=8,
    C=6e-5,
    m=1.5,
    sigma_ln_C=0.15,
    readings=200,
    crack_noise=0.02,
    resamples=1000,
    seed=2026,
    estimate="direct",
    **kw,
):
    """Share of ``programmes`` simulated programmes whose intervals hold the truth.

    Returns a dict: ``m``, ``rate_mid``, ``sigma_ln_C``, ``mixed_m``, ``mixed_rate_mid``
    (coverage shares; ``mixed_``: the mixed-effects estimate beside the resampling of the
    direct fit), ``life_error``
    (median |predicted/observed − 1| of the per-specimen lives), ``programmes``, the
    settings, ``method`` (the resampling used), ``estimate`` and ``spacing``.
    """
    from cycj.calibrate.simulate import PROGRAMME_LOADS, programme_paths, simulate_programme

    paths = programme_paths(
        specimen,
        C,
        m,
        kw.get("p_max", PROGRAMME_LOADS),
        kw.get("r_ratio", 0.1),
        kw.get("crack_end"),
    )
    hit = {"m": 0, "rate_mid": 0, "sigma_ln_C": 0, "mixed_m": 0, "mixed_rate_mid": 0}
    life_err, method = [], None
    for k in range(programmes):
        prog = simulate_programme(
            specimen,
            C,
            m,
            n_specimens=n_specimens,
            sigma_ln_C=sigma_ln_C,
            readings=readings,
            crack_noise=crack_noise,
            seed=seed + k,
            paths=paths,
            **kw,
        )
        res = programme_fit(prog, specimen, resamples=resamples, seed=seed + k, estimate=estimate)
        iv, b = res["intervals"], res["between"]
        method = iv["method"]
        lo, hi = iv["m_interval"]
        hit["m"] += lo <= m <= hi
        # one specimen: its interval is that of its own constants (its own C is the truth)
        c_true = C if n_specimens > 1 else float(prog.C_specimens[0])
        true_rate = math.log(c_true) + m * math.log(res["dJ_mid"])
        rlo, rhi = iv["ln_rate_interval"][0][0], iv["ln_rate_interval"][1][0]
        hit["rate_mid"] += rlo <= true_rate <= rhi
        mx = iv.get("mixed_effects")
        if mx:
            hit["mixed_m"] += mx["m_interval"][0] <= m <= mx["m_interval"][1]
            lo_r, hi_r = (v[0] for v in mx["ln_rate_interval"])
            hit["mixed_rate_mid"] += lo_r <= true_rate <= hi_r
        if b["sigma_ln_C_interval"] is not None:
            slo, shi = b["sigma_ln_C_interval"]
            hit["sigma_ln_C"] += slo <= sigma_ln_C <= shi
        life_err += [abs(r["life_ratio"] - 1) for r in res["per_specimen"]]
    return {
        **{k: v / programmes for k, v in hit.items()},
        "life_error": float(np.median(life_err)),
        "programmes": programmes,
        "n_specimens": n_specimens,
        "readings": readings,
        "sigma_ln_C_true": sigma_ln_C,
        "method": method,
        "estimate": estimate,
        "spacing": kw.get("spacing", "crack"),
    }
