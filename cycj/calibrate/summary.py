"""The content of ``fit.json``, the growth snippet and the references of a calibration.

Split from :mod:`cycj.calibrate.fit` (the orchestrator) so that each stays short.
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["summary", "growth_snippet", "fit_references", "CAUTION"]

CAUTION = (
    "Estimates for engineering judgement: they depend on the quality of the test logs "
    "and do not replace the applicable test standard (ASTM E647, E1820) or a qualified "
    "engineer's review."
)
#: keys of a fit kept out of fit.json (arrays and working values)
_PRIVATE = ("residuals", "R_of_points", "x_mean", "sxx", "t", "points", "_lin", "life_per_test")


def _rate_rows(iv):
    """da/dN and its interval at each chosen ΔJ, from the resampling result ``iv``."""
    return [
        {
            "dJ_kJm2": float(math.exp((r - iv["lnC"]) / iv["m"])) if iv["m"] else None,
            "dadN_mm_per_cycle": math.exp(r),
            "interval": [math.exp(lo), math.exp(hi)],
        }
        for r, lo, hi in zip(iv["ln_rate_at"], *iv["ln_rate_interval"], strict=True)
    ]


def _mixed_rows(iv):
    """The mixed-effects estimate beside the resampling (direct fit, two tests or more)."""
    mx = (iv or {}).get("mixed_effects")
    if not mx:
        return None
    out = {k: v for k, v in mx.items() if not k.startswith("ln_rate")}
    out["rate_at"] = _rate_rows(
        {**mx, "lnC": math.log(mx["C"]), "ln_rate_interval": mx["ln_rate_interval"]}
    )
    out["note"] = (
        "a cross-check of the recommended intervals: ln C_i of the tests (m fixed) with "
        "their within-test errors, a random intercept between tests by REML; m's interval "
        "is within-test only (a common m)"
    )
    return out


def summary(ctx) -> dict:
    """fit.json as a dict from the orchestrator's working values ``ctx`` (a dict)."""
    from cycj.calibrate.fits import r_ratio_collapse

    fits, chosen, best = ctx["fits"], ctx["chosen"], ctx["best"]
    reduced, iv = ctx["reduced"], ctx["intervals"]
    reg = fits.get(chosen) if chosen != "direct" else fits.get("polynomial", fits.get("secant"))
    lnc, m = best["lnC"], best["m"]
    dj = reduced["dJ_eff_kJm2"].to_numpy(float)
    valid = best.get("dJ_range_kJm2") or [float(np.nanmin(dj)), float(np.nanmax(dj))]
    pivot = reg["pivot_dJ_kJm2"] if reg else float(np.exp(np.mean(np.log(dj[dj > 0]))))
    r = reduced["R"].to_numpy(float)
    collapse = (
        r_ratio_collapse(reg["residuals"], reg["R_of_points"])
        if reg
        else {"collapses": None, "note": "no regression"}
    )
    plain = {k: {kk: vv for kk, vv in v.items() if kk not in _PRIVATE} for k, v in fits.items()}
    for k in ("polynomial", "secant"):
        if k in plain:
            plain[k]["interval_note"] = (
                "ordinary least squares: treats every rate as independent (too narrow for "
                "rates that share a specimen); see C_interval, m_interval at the top level"
            )
    if "direct" in plain:
        plain["direct"]["interval_note"] = (
            "Jacobian of the a(N) least squares: readings taken as independent and C as the "
            "mean of the tests' own ln C_i without their scatter (narrow)"
        )
    basis = ctx["basis"]
    closure = (
        "opening load measured by compliance offset; ΔJ_eff above it"
        if basis == "effective"
        else "none: applied range, P_min < 0 counted as 0"
    )
    between = ctx["between"]
    out = {
        "C": best["C"],
        "m": m,
        "C_interval": best["C_interval"],
        "m_interval": best["m_interval"],
        "confidence": ctx["confidence"],
        "interval_method": best.get("interval_method", "least squares on a(N) (Jacobian)"),
        "interval_note": best.get("interval_note", ""),
        "units": {"C": "mm/cycle per (kJ/m^2)^m", "dJ": "kJ/m^2", "dadN": "mm/cycle"},
        "recommended_fit": chosen,
        "recommended_reason": ctx["reason"],
        "pivot_dJ_kJm2": pivot,
        "rate_at_pivot_mm_per_cycle": math.exp(lnc + m * math.log(pivot)),
        # the regression's own interval; for the direct fit see rate_at (resampled)
        "rate_at_pivot_interval": reg["rate_at_pivot_interval"]
        if reg and chosen != "direct"
        else None,
        "rate_at": _rate_rows(iv) if iv else [],
        "cov_lnC_m": best["cov_lnC_m"],
        "sigma_ln": reg["sigma_ln"] if reg else None,
        "sigma_ln_note": "within-test scatter: residual standard deviation of ln(da/dN) about "
        "the pooled regression line, mostly measurement noise of single rates; not a scatter "
        "for planning (use between_specimen.sigma_ln_C)",
        "sigma_ln_within": iv["sigma_ln_within"] if iv else None,
        "between_specimen": between,
        "mixed_effects": _mixed_rows(iv),
        "per_specimen": ctx["per_specimen"],
        "dJ_range_kJm2": valid,
        "dJ_range_note": "ΔJ range of the data behind the recommended fit (its validity)",
        "dJ_range_readings_kJm2": [float(np.nanmin(dj)), float(np.nanmax(dj))],
        "R_range": [float(np.nanmin(r)), float(np.nanmax(r))],
        "basis": basis,
        "closure": closure,
        "threshold_kJm2": ctx["threshold"]["threshold_kJm2"] if ctx["threshold"] else None,
        "threshold": ctx["threshold"]
        or {
            "note": "no load-shedding data between 1e-7 and 1e-6 "
            "mm/cycle (ASTM E647 needs ≥ 5 points)"
        },
        "k_gradient_per_mm": ctx["gradients"],
        "spacing": ctx["spacing_info"],
        "outliers": ctx["outliers"],
        "r_ratio_collapse": collapse,
        "fits": plain,
        "methods_used": ctx["notes"],
        "n_readings": int(len(reduced)),
        "n_rates": int(len(ctx["rates_df"])),
        "n_tests": len(ctx["per_specimen"]),
        "skipped": ctx["skipped"],
        "logs": [str(p) for p in ctx["log_paths"]],
        "specimens": sorted({s.source for s in ctx["specs"]}),
        "caution": CAUTION,
        "references": fit_references(basis, ctx["specs"], iv, between),
    }
    return out


def growth_snippet(summary) -> str:
    """A ``growth = {...}`` line (with comment lines) for a case's ``[material]`` table: the
    constants, the ΔJ range of the data behind them (``valid_dJ``) and, as comments, a ready
    ``[inspection.scatter]`` line with the between-specimen scatter of C."""
    thr = summary.get("threshold_kJm2")
    parts = ['law = "paris"', f"C = {summary['C']:.5g}", f"m = {summary['m']:.5g}"]
    if thr:
        parts.append(f'threshold = "{thr:.4g} kJ/m^2"')
    parts.append(f'basis = "{summary["basis"]}"')
    lo, hi = summary["dJ_range_kJm2"]
    parts.append(f'valid_dJ = ["{lo:.4g} kJ/m^2", "{hi:.4g} kJ/m^2"]')
    r0, r1 = summary["R_range"]
    between = summary.get("between_specimen") or {}
    g = between.get("n_specimens", 0)
    lines = [
        f"# fitted by cycj fit ({summary['recommended_fit']} fit); C in mm/cycle per "
        f"(kJ/m^2)^m; data ΔJ {lo:.4g}–{hi:.4g} kJ/m^2 (valid_dJ), R {r0:.2f}–{r1:.2f}",
    ]
    if between.get("sigma_ln_C") is not None:
        hi_s = (between.get("sigma_ln_C_interval") or [None, None])[1]
        rough = f"; rough: its interval reaches {hi_s:.3g}" if g < 5 and hi_s else ""
        lines += [
            f"# scatter between specimens ({g} specimens, m fixed{rough}): "
            "for [inspection.scatter]",
            f'# growth_C = {{ distribution = "lognormal", sigma = {between["sigma_ln_C"]:.3g} }}',
        ]
    else:
        why = "one specimen" if g == 1 else "see between_specimen in fit.json"
        lines.append(
            f"# scatter between specimens: unknown ({why}); the within-test rate "
            "scatter in fit.json is not a planning scatter"
        )
    if summary["basis"] == "effective":
        lines.append(
            '# basis "effective": fitted on ΔJ above the measured opening load; pair it '
            'with a closure model in [loading] (closure = "none" treats the whole '
            "applied range as effective, which is conservative)"
        )
    else:
        lines.append(
            '# basis "applied": use with closure = "none" (closure is already in the data)'
        )
    return "\n".join(lines) + "\ngrowth = { " + ", ".join(parts) + " }\n"


def fit_references(basis, specs, intervals=None, between=None) -> list[str]:
    """References of the methods used (from their records): E647 rates always; for raw loops
    the compliance crack length and the loop-area ΔJ (η factor, or the reference stress for
    shapes without one); the Paris-type law in ΔJ; the resampling behind the intervals; the
    random-intercept model behind the between-specimen scatter."""
    from cycj.calibrate.reduction import ETA_SHAPES
    from cycj.citations import Citations

    cited = Citations()
    cited.cite("e647-reduction")
    if basis == "effective":  # raw loops
        cited.cite("compliance-crack-length")
        cited.cite("loop-area-delta-j")
        if any(s.shape not in ETA_SHAPES for s in specs):
            cited.cite("reference-stress-specimen")
    cited.choose("growth_law", "paris")
    if intervals:
        cited.cite(intervals["method"])
    if between and between.get("sigma_ln_C") is not None:
        cited.cite("between-specimen-scatter")
    return cited.references
