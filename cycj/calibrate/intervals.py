"""The recommended constants with intervals that cover, per-specimen fits and the scatter
between specimens: the step of :func:`cycj.calibrate.fit.fit_logs` after the regressions.

The rates behind the recommended regression (every rate the pooled fit used) are grouped by
test, in cycle order; :func:`cycj.calibrate.resampling.resampled_intervals` gives C, m and
da/dN with their intervals, :func:`cycj.calibrate.between.between_specimen` each test's C
with m fixed, its life over its own crack range and σ_ln C between specimens.
"""

from __future__ import annotations

import math

import numpy as np

from cycj.errors import ValidityRangeError

__all__ = ["scatter_and_intervals", "test_groups"]


def test_groups(points, labels):
    """One dict per test (``test, specimen, dJ, dadN, a_mm, cycle`` in cycle order) from the
    rate points of a regression (DataFrame with ``log, cycle, a_mm, dJ_eff_kJm2,
    dadN_mm_per_cycle``); tests with fewer than three rates are left out."""
    out = []
    for name in dict.fromkeys(points["log"]):
        sub = points[points["log"] == name].sort_values("cycle", kind="stable")
        if len(sub) < 3:
            continue
        out.append(
            {
                "test": name,
                "specimen": labels.get(name, name),
                "dJ": sub["dJ_eff_kJm2"].to_numpy(float),
                "dadN": sub["dadN_mm_per_cycle"].to_numpy(float),
                "a_mm": sub["a_mm"].to_numpy(float),
                "cycle": sub["cycle"].to_numpy(float),
            }
        )
    return out


def scatter_and_intervals(
    fits, chosen, labels, confidence, resamples, seed, dJ_at, warnings, series=()
):
    """Recommended constants, resampling intervals, per-specimen rows and the
    ``between_specimen`` block.

    Returns
    -------
    (best, intervals, per_specimen, between): ``best`` the recommended fit's dict (``C, m,
    lnC, C_interval, m_interval, cov_lnC_m, dJ_range_kJm2, interval_method,
    interval_note``); ``intervals`` the result of
    :func:`~cycj.calibrate.resampling.resampled_intervals` (None without rates), or of
    :func:`~cycj.calibrate.resampling.direct_intervals` when the direct a(N) fit is the
    recommended one (``series``: its readings, :func:`cycj.calibrate.fits.direct_series`).
    """
    from cycj.calibrate.between import between_specimen
    from cycj.calibrate.resampling import common_slope_fit, resampled_intervals

    if chosen == "direct" and "_lin" in fits["direct"]:
        best, iv, rows, between = _direct(
            fits["direct"], series, labels, confidence, resamples, seed, dJ_at, warnings
        )
        reg = fits.get("polynomial") or fits.get("secant")
        if iv is not None and reg is not None:
            # the within-test scatter of single rates (labelled so, never for planning)
            groups = test_groups(reg["points"], labels)
            if groups:
                within = common_slope_fit(
                    [np.log(t["dJ"]) for t in groups], [np.log(t["dadN"]) for t in groups]
                )
                iv["sigma_ln_within"] = within["sigma_ln_within"]
        return best, iv, rows, between
    reg = fits.get(chosen) if chosen != "direct" else None
    reg = reg or fits.get("polynomial") or fits.get("secant")
    if reg is None:
        best = dict(fits[chosen])
        return best, None, [], _no_between(0, "no rates: no per-specimen fits")
    groups = test_groups(reg["points"], labels)
    x = [np.log(g["dJ"]) for g in groups]
    y = [np.log(g["dadN"]) for g in groups]
    lo, hi = reg["dJ_range_kJm2"]
    at = np.atleast_1d(np.asarray(dJ_at if dJ_at is not None else math.sqrt(lo * hi), float))
    try:
        if not groups:
            raise ValidityRangeError("no test has three rates")
        iv = resampled_intervals(
            x, y, x_at=np.log(at), confidence=confidence, resamples=resamples, seed=seed
        )
    except ValidityRangeError as exc:
        warnings.append(
            f"no resampling intervals ({exc}): the intervals are those of ordinary least "
            "squares, which treat every rate as independent (too narrow)"
        )
        best = dict(fits[chosen])
        best["interval_method"] = "ordinary least squares (rates taken as independent)"
        return best, None, [], _no_between(len(groups), f"no per-specimen fits: {exc}")
    if chosen == "direct":
        best = dict(fits["direct"])
        m = best["m"]
    else:
        m = iv["m"]
        best = {
            "C": math.exp(iv["lnC"]),
            "m": m,
            "lnC": iv["lnC"],
            "C_interval": [math.exp(v) for v in iv["lnC_interval"]],
            "m_interval": iv["m_interval"],
            "cov_lnC_m": iv["cov_lnC_m"],
            "dJ_range_kJm2": reg["dJ_range_kJm2"],
            "interval_method": iv["method"],
            "interval_note": iv["note"],
        }
    _warn_one_specimen(iv, warnings)
    per_spec, between = between_specimen(groups, m, confidence)
    return best, iv, per_spec, between


def _direct(fit, series, labels, confidence, resamples, seed, dJ_at, warnings):
    """The step of :func:`scatter_and_intervals` for the direct a(N) fit: linearised
    resampling intervals, per-test rows and σ_ln C from the tests' own ln C_i."""
    from cycj.calibrate.between import direct_rows, scatter_of_lnc
    from cycj.calibrate.resampling import direct_intervals

    lo, hi = fit["dJ_range_kJm2"]
    at = np.atleast_1d(np.asarray(dJ_at if dJ_at is not None else math.sqrt(lo * hi), float))
    try:
        iv = direct_intervals(
            fit, x_at=np.log(at), confidence=confidence, resamples=resamples, seed=seed
        )
    except (ValidityRangeError, np.linalg.LinAlgError) as exc:
        warnings.append(
            f"no resampling intervals ({exc}): the intervals are those of the Jacobian of "
            "the a(N) least squares (too narrow)"
        )
        best = dict(fit)
        best["interval_method"] = "least squares on a(N) (Jacobian)"
        return best, None, [], _no_between(len(series), f"no per-specimen fits: {exc}")
    best = {
        **fit,
        "C_interval": [math.exp(v) for v in iv["lnC_interval"]],
        "m_interval": iv["m_interval"],
        "cov_lnC_m": iv["cov_lnC_m"],
        "interval_method": iv["method"],
        "interval_note": iv["note"],
    }
    _warn_one_specimen(iv, warnings)
    return (
        best,
        iv,
        direct_rows(fit, iv, series, labels),
        scatter_of_lnc(fit["lnC_per_test"], fit["m"], confidence),
    )


def _no_between(n, note):
    """The ``between_specimen`` block when no per-specimen fits could be made."""
    return {
        "sigma_ln_C": None,
        "sigma_ln_C_interval": None,
        "n_specimens": n,
        "m_fixed": None,
        "note": note,
    }


def _warn_one_specimen(iv, warnings):
    """Say, for an interval from one specimen, that it cannot tell the scatter between
    specimens."""
    if iv["G"] == 1:
        warnings.append(
            "one specimen: the intervals are those of its own constants (moving-block "
            "bootstrap); the scatter between specimens is unknown"
        )
