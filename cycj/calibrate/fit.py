"""Calibration of da/dN = C·ΔJ^m from fatigue crack growth test logs (``cycj fit``).

Orchestrator: logs and specimen files → reduced loops (:mod:`.reduction`) → da/dN
(:mod:`.rates`) → fits (:mod:`.fits`) → :class:`FitResult` with ``summary`` (the content of
``fit.json``), ``reduced`` and ``rates`` (DataFrames), ``snippet`` (a ``growth = {...}`` line for
a case's ``[material]`` table), skip reasons and warnings.

Estimates for engineering judgement: they do not replace the applicable test standard or a
qualified engineer's review.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from cycj.errors import CycjInputError

__all__ = ["FitResult", "fit_logs", "METHODS"]

#: fit methods: the recommended fit is chosen among these (``auto`` explains its choice)
METHODS = ("auto", "polynomial", "secant", "direct")
#: rates below this belong to the near-threshold region and stay out of the Paris fit when a
#: threshold was determined [mm/cycle] (ASTM E647 near-threshold region, 10⁻⁹ m/cycle)
NEAR_THRESHOLD_RATE = 1e-6
CAUTION = (
    "Estimates for engineering judgement: they depend on the quality of the test logs "
    "and do not replace the applicable test standard (ASTM E647, E1820) or a qualified "
    "engineer's review."
)


@dataclass
class FitResult:
    """Outcome of :func:`fit_logs`."""

    summary: dict
    reduced: object
    rates: object
    snippet: str
    skipped: list = field(default_factory=list)
    warnings: list = field(default_factory=list)
    typical_loop: dict | None = None
    curves: list = field(default_factory=list)
    fits: dict = field(default_factory=dict)

    @property
    def C(self) -> float:
        return self.summary["C"]

    @property
    def m(self) -> float:
        return self.summary["m"]


def _specimens(log_paths, specimen_path):
    from cycj.calibrate.specimen import read_specimen

    paths = [specimen_path] if isinstance(specimen_path, (str, Path)) else list(specimen_path)
    if not paths:
        raise CycjInputError("no specimen file given", key="--specimen")
    if len(paths) not in (1, len(log_paths)):
        raise CycjInputError(
            "give one specimen file for all logs or one per log",
            key="--specimen",
            expected=f"1 or {len(log_paths)}",
            found=len(paths),
        )
    specs = [read_specimen(p) for p in paths]
    return specs * len(log_paths) if len(specs) == 1 else specs


def fit_logs(
    log_paths, specimen_path, method="auto", *, spacing="e647", confidence=0.95, outlier_limit=3.5
):
    """Fit da/dN = C·ΔJ_eff^m to fatigue crack growth test logs.

    Parameters
    ----------
    log_paths : path or list of paths, CSV logs (raw loops ``cycle, load, displacement`` or
        crack lengths ``cycle, crack_length, load_max, load_min``)
    specimen_path : path, or list of paths (one per log), specimen TOML files
    method : ``"auto"`` | ``"polynomial"`` | ``"secant"`` | ``"direct"``: the fit reported as
        the recommended C, m (all are computed)
    spacing : ``"e647"`` (thin readings to the E647 minimum crack extension) or ``"all"``
    confidence : level of the intervals and the prediction band
    outlier_limit : rate points farther than this many robust σ from the line are skipped

    Returns
    -------
    FitResult

    Raises
    ------
    CycjInputError
        unreadable files, unknown method, nothing left to fit, logs of both bases mixed.
    """
    import pandas as pd

    from cycj.calibrate import fits as ft
    from cycj.calibrate import reduction as rd
    from cycj.calibrate.logs import RawLog, read_log

    if method not in METHODS:
        raise CycjInputError(
            "unknown fit method", key="--method", expected=", ".join(METHODS), found=method
        )
    if isinstance(log_paths, (str, Path)):
        log_paths = [log_paths]
    log_paths = list(log_paths)
    if not log_paths:
        raise CycjInputError("no log file given", key="LOG")
    specs = _specimens(log_paths, specimen_path)
    skipped, warnings, frames, rate_frames, notes, series, typical = [], [], [], [], {}, [], None
    kinds, spacing_info, gradients = set(), {}, {}
    for path, spec in zip(log_paths, specs, strict=True):
        log = read_log(
            path,
            load_factor=spec.load_factor,
            displacement_factor=spec.displacement_factor,
            crack_factor=spec.crack_factor,
        )
        if isinstance(log, RawLog):
            kinds.add("raw")
            rows, sk, nt, typ = rd.reduce_raw_log(log, spec)
            typical = typical or typ
        else:
            kinds.add("crack")
            rows, sk, nt = rd.reduce_crack_log(log, spec)
        skipped += sk
        if rows is None or rows["cycle"].size < 5:
            warnings.append(f"{log.name}: fewer than five usable readings; log left out")
            continue
        notes[log.name] = nt
        rows = _ligament(rows, spec, warnings, log.name)
        rates, info = rd.rates_for_rows(rows, spec, spacing=spacing)
        spacing_info[log.name] = info
        if "note" in info:
            warnings.append(f"{log.name}: {info['note']}")
        frame = pd.DataFrame(rows)
        frame.insert(0, "specimen", spec.label)
        frame.insert(0, "log", log.name)
        frame["dadN_mm_per_cycle"] = np.nan
        frame["dadN_secant_mm_per_cycle"] = np.nan
        for meth, col in (
            ("polynomial", "dadN_mm_per_cycle"),
            ("secant", "dadN_secant_mm_per_cycle"),
        ):
            if meth in rates:
                frame.loc[frame.index[rates[meth]["row"]], col] = rates[meth]["dadN_mm_per_cycle"]
                rf = pd.DataFrame({k: v for k, v in rates[meth].items() if k != "row"})
                rf.insert(0, "method", meth)
                rf.insert(0, "log", log.name)
                rate_frames.append(rf)
        frames.append(frame)
        gradients[log.name] = ft.k_gradient(rows["a_mm"], rows["dJ_eff_kJm2"])
        series.append(_series(rows, log.name))
    if not frames:
        raise CycjInputError("no log has enough usable readings to fit", source=str(log_paths[0]))
    if len(kinds) > 1:
        raise CycjInputError(
            "logs mix raw loops (effective range above the opening load) and "
            "crack-length readings (applied range); fit them separately",
            source=", ".join(map(str, log_paths)),
        )
    basis = "effective" if kinds == {"raw"} else "applied"
    reduced = pd.concat(frames, ignore_index=True)
    rates_df = (
        pd.concat(rate_frames, ignore_index=True)
        if rate_frames
        else pd.DataFrame(
            columns=["log", "method", "cycle", "a_mm", "dadN_mm_per_cycle", "dJ_eff_kJm2"]
        )
    )
    fits, threshold = {}, None
    for meth in ("polynomial", "secant"):
        sub = rates_df[rates_df["method"] == meth]
        res = _regression(sub, meth, outlier_limit, confidence, skipped)
        if res is not None:
            fits[meth] = res
    if "polynomial" in fits or "secant" in fits:
        base = fits.get("polynomial", fits.get("secant"))
        threshold = base.pop("_threshold", None)
        for f in fits.values():
            f.pop("_threshold", None)
        c0, m0 = base["C"], base["m"]
    else:
        c0, m0 = 1e-4, 1.5
    try:
        direct = ft.direct_fit(series, c0, m0, confidence)
        curves = direct.pop("curves")
        fits["direct"] = direct
    except (ValueError, np.linalg.LinAlgError) as exc:
        warnings.append(f"direct fit on a(N) failed: {exc}")
        curves = []
    chosen, reason = _choose(method, fits)
    best = fits[chosen]
    summary = _summary(
        best,
        chosen,
        reason,
        fits,
        basis,
        reduced,
        rates_df,
        threshold,
        notes,
        spacing_info,
        gradients,
        skipped,
        warnings,
        confidence,
        log_paths,
        specs,
    )
    snippet = growth_snippet(summary)
    for name, g in gradients.items():
        if round(g, 3) < -0.08:
            warnings.append(
                f"{name}: K-decreasing gradient (1/K)dK/da = {g:.3f} /mm is "
                "steeper than the ASTM E647 limit −0.08 /mm"
            )
    summary["warnings"] = warnings
    return FitResult(
        summary,
        reduced,
        rates_df,
        snippet,
        skipped,
        warnings,
        typical,
        [
            {
                "log": s["log"],
                "cycle": s["cycle"],
                "a_mm": s["a_mm"],
                "fit_cycle": c["cycle"],
                "fit_a_mm": c["a_mm"],
            }
            for s, c in zip(series, curves, strict=False)
        ],
        fits,
    )


def _ligament(rows, spec, warnings, name):
    """ASTM E1820-style size check b > 10·J/σ_Y for J-controlled growth, with J_max taken as
    ΔJ_eff·(P_max/ΔP_eff)² (elastic scaling) and σ_Y the flow stress."""
    b = spec.width - rows["a_mm"]
    dpe = rows["P_max_N"] - rows["P_open_N"]
    jmax = rows["dJ_eff_kJm2"] * (rows["P_max_N"] / np.maximum(dpe, 1e-300)) ** 2
    ok = b > 10 * jmax / spec.material.flow_stress
    rows["ligament_ok"] = ok
    if (~ok).any():
        warnings.append(
            f"{name}: {int((~ok).sum())} readings have a ligament below "
            "10·J_max/σ_Y (ASTM E1820 size limit): growth may not be J-controlled"
        )
    return rows


def _series(rows, name):
    """Readings and a smoothed ΔJ_eff(a) table (means of ~30 groups) for the direct fit."""
    order = np.argsort(rows["cycle"])
    n, a, dj = (rows[k][order] for k in ("cycle", "a_mm", "dJ_eff_kJm2"))
    groups = np.array_split(np.arange(n.size), min(30, max(n.size // 3, 2)))
    at = np.maximum.accumulate(np.array([a[g].mean() for g in groups]))
    jt = np.array([dj[g].mean() for g in groups])
    keep = np.concatenate([[True], np.diff(at) > 1e-9])
    return {"log": name, "cycle": n, "a_mm": a, "a_tab": at[keep], "dj_tab": jt[keep]}


def _regression(sub, meth, outlier_limit, confidence, skipped):
    from cycj.calibrate import fits as ft

    if len(sub) < 3:
        return None
    dj = sub["dJ_eff_kJm2"].to_numpy(float)
    r = sub["dadN_mm_per_cycle"].to_numpy(float)
    pos = (r > 0) & (dj > 0)
    for _, row in sub[~pos].iterrows():
        skipped.append(
            {
                "log": row["log"],
                "cycle": float(row["cycle"]),
                "reason": f"non-positive da/dN or ΔJ ({meth} rate)",
            }
        )
    sub, dj, r = sub[pos], dj[pos], r[pos]
    thr = ft.e647_threshold(dj, r)
    use = np.ones(r.size, bool)
    if thr is not None:
        use = r >= NEAR_THRESHOLD_RATE
        if use.sum() < 5:
            use[:] = True
    out = ft.outlier_mask(dj[use], r[use], outlier_limit)
    idx = np.flatnonzero(use)[out]
    for i in idx:
        skipped.append(
            {
                "log": sub["log"].iloc[i],
                "cycle": float(sub["cycle"].iloc[i]),
                "reason": f"outlier in the {meth} da/dN–ΔJ fit (> {outlier_limit} robust σ)",
            }
        )
    use[idx] = False
    if use.sum() < 3:
        return None
    fit = ft.power_law_fit(dj[use], r[use], confidence)
    fit["residuals"] = np.log(r[use]) - (fit["lnC"] + fit["m"] * np.log(dj[use]))
    fit["R_of_points"] = sub["R"].to_numpy(float)[use]
    fit["dJ_range_kJm2"] = [float(dj[use].min()), float(dj[use].max())]
    fit["_threshold"] = thr
    return fit


def _choose(method, fits):
    if method != "auto":
        if method not in fits:
            raise CycjInputError(
                f"the {method} fit could not be made from these logs",
                key="--method",
                expected=", ".join(fits) or "more data",
            )
        return method, f"requested with --method {method}"
    if "polynomial" in fits and fits["polynomial"]["n"] >= 10:
        return "polynomial", (
            "log–log regression on seven-point incremental polynomial rates (ASTM E647 X1): "
            "the standard's reduction, it gives the scatter of da/dN about the line directly "
            "(sigma_ln) for probabilistic planning; the direct a(N) fit is a cross-check"
        )
    if "direct" in fits and fits["direct"]["success"]:
        return "direct", (
            "fewer than ten incremental-polynomial rates: the direct fit on "
            "a(N) uses every reading without differentiating noisy data"
        )
    if "secant" in fits:
        return "secant", "only the secant rates could be fitted"
    raise CycjInputError("no fit could be made from these logs")


def _summary(
    best,
    chosen,
    reason,
    fits,
    basis,
    reduced,
    rates_df,
    threshold,
    notes,
    spacing_info,
    gradients,
    skipped,
    warnings,
    confidence,
    log_paths,
    specs,
):
    from cycj.calibrate.fits import r_ratio_collapse

    reg = fits.get(chosen) if chosen != "direct" else fits.get("polynomial", fits.get("secant"))
    sigma_ln = reg["sigma_ln"] if reg else None
    lnc, m = best["lnC"], best["m"]
    dj = reduced["dJ_eff_kJm2"].to_numpy(float)
    pivot = reg["pivot_dJ_kJm2"] if reg else float(np.exp(np.mean(np.log(dj[dj > 0]))))
    r = reduced["R"].to_numpy(float)
    collapse = (
        r_ratio_collapse(reg["residuals"], reg["R_of_points"])
        if reg
        else {"collapses": None, "note": "no regression"}
    )
    plain = {
        k: {
            kk: vv
            for kk, vv in v.items()
            if kk not in ("residuals", "R_of_points", "x_mean", "sxx", "t")
        }
        for k, v in fits.items()
    }
    closure = (
        "opening load measured by compliance offset; ΔJ_eff above it"
        if basis == "effective"
        else "none: applied range, P_min < 0 counted as 0"
    )
    return {
        "C": best["C"],
        "m": m,
        "C_interval": best["C_interval"],
        "m_interval": best["m_interval"],
        "confidence": confidence,
        "units": {"C": "mm/cycle per (kJ/m^2)^m", "dJ": "kJ/m^2", "dadN": "mm/cycle"},
        "recommended_fit": chosen,
        "recommended_reason": reason,
        "pivot_dJ_kJm2": pivot,
        "rate_at_pivot_mm_per_cycle": math.exp(lnc + m * math.log(pivot)),
        "rate_at_pivot_interval": reg["rate_at_pivot_interval"] if reg else None,
        "cov_lnC_m": best["cov_lnC_m"],
        "sigma_ln": sigma_ln,
        "sigma_ln_note": "residual standard deviation of ln(da/dN) about the regression line",
        "dJ_range_kJm2": [float(np.nanmin(dj)), float(np.nanmax(dj))],
        "R_range": [float(np.nanmin(r)), float(np.nanmax(r))],
        "basis": basis,
        "closure": closure,
        "threshold_kJm2": threshold["threshold_kJm2"] if threshold else None,
        "threshold": threshold
        or {
            "note": "no load-shedding data between 1e-7 and 1e-6 "
            "mm/cycle (ASTM E647 needs ≥ 5 points)"
        },
        "k_gradient_per_mm": gradients,
        "spacing": spacing_info,
        "r_ratio_collapse": collapse,
        "fits": plain,
        "methods_used": notes,
        "n_readings": int(len(reduced)),
        "n_rates": int(len(rates_df)),
        "skipped": skipped,
        "logs": [str(p) for p in log_paths],
        "specimens": sorted({s.source for s in specs}),
        "caution": CAUTION,
        "references": _fit_references(basis, specs),
    }


def growth_snippet(summary) -> str:
    """A ``growth = {...}`` line (with comment lines) for a case's ``[material]`` table."""
    thr = summary.get("threshold_kJm2")
    parts = ['law = "paris"', f"C = {summary['C']:.5g}", f"m = {summary['m']:.5g}"]
    if thr:
        parts.append(f'threshold = "{thr:.4g} kJ/m^2"')
    parts.append(f'basis = "{summary["basis"]}"')
    lo, hi = summary["dJ_range_kJm2"]
    r0, r1 = summary["R_range"]
    lines = [
        f"# fitted by cycj fit ({summary['recommended_fit']} fit); C in mm/cycle per "
        f"(kJ/m^2)^m; data ΔJ {lo:.3g}–{hi:.3g} kJ/m^2, R {r0:.2f}–{r1:.2f}",
        f"# scatter: sigma_ln = {summary['sigma_ln']:.3g}"
        if summary["sigma_ln"]
        else "# scatter: see fit.json",
    ]
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


def _fit_references(basis, specs) -> list[str]:
    """References of the reduction methods used (from their records): E647 rates always; for
    raw loops the compliance crack length and the loop-area ΔJ (η factor, or the reference
    stress for shapes without one); the Paris-type law in ΔJ."""
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
    return cited.references
