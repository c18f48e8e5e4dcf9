"""Calibration of da/dN = C·ΔJ^m from fatigue crack growth test logs (``cycj fit``).

Orchestrator: logs and specimen files (one test a file, or many tests in a long-format file:
:mod:`.replicates`) → reduced loops (:mod:`.reduction`) → da/dN on every reading
(:mod:`.rates`) → fits (:mod:`.fits`), intervals by resampling (:mod:`.resampling`) and the
scatter between specimens (:mod:`.between`) → :class:`FitResult` with ``summary`` (the
content of ``fit.json``, :mod:`.summary`), ``reduced`` and ``rates`` (DataFrames),
``snippet`` (a ``growth = {...}`` line for a case's ``[material]`` table), skip reasons and
warnings.

Estimates for engineering judgement: they do not replace the applicable test standard or a
qualified engineer's review.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from cycj.calibrate.summary import CAUTION, growth_snippet
from cycj.errors import CycjInputError

__all__ = ["FitResult", "fit_logs", "METHODS", "CAUTION", "growth_snippet"]

#: fit methods: the recommended fit is chosen among these (``auto`` explains its choice)
METHODS = ("auto", "polynomial", "secant", "direct")
#: rates below this belong to the near-threshold region and stay out of the Paris fit when a
#: threshold was determined [mm/cycle] (ASTM E647 near-threshold region, 10⁻⁹ m/cycle)
NEAR_THRESHOLD_RATE = 1e-6


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


def _as_list(paths):
    return [paths] if isinstance(paths, (str, Path)) else list(paths)


def fit_logs(
    log_paths,
    specimen_path,
    method="auto",
    *,
    spacing="all",
    confidence=0.95,
    outlier_limit=None,
    resamples=1000,
    seed=0,
    dJ_at=None,
    free_start=False,
    sheet=None,
):
    """Fit da/dN = C·ΔJ_eff^m to fatigue crack growth test logs.

    Parameters
    ----------
    log_paths : path or list of paths, CSV logs (raw loops ``cycle, load, displacement`` or
        crack lengths ``cycle, crack_length, load_max, load_min``; with a ``specimen`` column
        one file holds many tests)
    specimen_path : path or list of paths, specimen TOML files: one for all tests, one per
        test (matched by label, else in order) or one per log file
    method : ``"auto"`` | ``"polynomial"`` | ``"secant"`` | ``"direct"``: the fit reported as
        the recommended C, m (all are computed)
    spacing : ``"all"`` (every reading, the default) or ``"e647"`` (thin readings to the E647
        minimum crack extension)
    confidence : level of the intervals and the prediction band
    outlier_limit : None (the default: no rejection) or a number: rate points farther than
        this many robust σ from the line, and loops whose crack length is far off its
        neighbours, are dropped (each listed in ``skipped`` with its reason)
    resamples, seed : bootstrap resamples behind the intervals and their random seed
    dJ_at : ΔJ values [kJ/m²] where da/dN and its interval are reported (default: the
        geometric middle of the data range)
    free_start : direct a(N) fit with each test's start fitted (default: fixed at its first
        reading)
    sheet : worksheet of .xlsx logs, by name (default: each workbook's first sheet)

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
    from cycj.calibrate.intervals import scatter_and_intervals
    from cycj.calibrate.logs import RawLog
    from cycj.calibrate.replicates import read_tests
    from cycj.calibrate.summary import summary as make_summary

    if method not in METHODS:
        raise CycjInputError(
            "unknown fit method", key="--method", expected=", ".join(METHODS), found=method
        )
    if spacing not in ("all", "e647"):
        raise CycjInputError(
            "unknown spacing", key="--spacing", expected="all, e647", found=spacing
        )
    log_paths = _as_list(log_paths)
    if not log_paths:
        raise CycjInputError("no log file given", key="LOG")
    tests = read_tests(log_paths, _as_list(specimen_path), sheet=sheet)
    specs = [spec for _, spec in tests]
    skipped, warnings, frames, rate_frames, notes, series, typical = [], [], [], [], {}, [], None
    kinds, spacing_info, gradients, labels = set(), {}, {}, {}
    for log, spec in tests:
        if isinstance(log, RawLog):
            kinds.add("raw")
            rows, sk, nt, typ = rd.reduce_raw_log(log, spec, outliers=outlier_limit is not None)
            typical = typical or typ
        else:
            kinds.add("crack")
            rows, sk, nt = rd.reduce_crack_log(log, spec)
        skipped += sk
        if rows is None or rows["cycle"].size < 5:
            warnings.append(f"{log.name}: fewer than five usable readings; log left out")
            continue
        notes[log.name] = nt
        labels[log.name] = spec.label
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
        series.append(ft.direct_series(rows, log.name))
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
        direct = ft.direct_fit(series, c0, m0, confidence, free_start=free_start)
        curves = direct.pop("curves")
        dj = reduced["dJ_eff_kJm2"].to_numpy(float)
        dj = dj[np.isfinite(dj) & (dj > 0.0)]
        if dj.size == 0:
            raise ValueError("no reading has a positive finite ΔJ_eff")
        direct["dJ_range_kJm2"] = [float(dj.min()), float(dj.max())]
        fits["direct"] = direct
    except (ValueError, np.linalg.LinAlgError) as exc:
        warnings.append(f"direct fit on a(N) failed: {exc}")
        curves = []
    chosen, reason = _choose(method, fits)
    best, iv, per_spec, between = scatter_and_intervals(
        fits, chosen, labels, confidence, resamples, seed, dJ_at, warnings, series
    )
    summary = make_summary(
        {
            "fits": fits,
            "chosen": chosen,
            "best": best,
            "reason": reason,
            "reduced": reduced,
            "rates_df": rates_df,
            "intervals": iv,
            "between": between,
            "per_specimen": per_spec,
            "basis": basis,
            "threshold": threshold,
            "gradients": gradients,
            "spacing_info": spacing_info,
            "outliers": "off (every reading used)"
            if outlier_limit is None
            else f"rates beyond {outlier_limit} robust σ and loops off their neighbours dropped",
            "notes": notes,
            "skipped": skipped,
            "confidence": confidence,
            "log_paths": log_paths,
            "specs": specs,
        }
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
        for i in np.flatnonzero(~use):
            skipped.append(
                {
                    "log": sub["log"].iloc[i],
                    "cycle": float(sub["cycle"].iloc[i]),
                    "reason": f"near-threshold {meth} rate below {NEAR_THRESHOLD_RATE:g} "
                    "mm/cycle: in the threshold fit, not in the Paris fit",
                }
            )
    idx = np.zeros(0, int)
    if outlier_limit is not None:
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
    fit["points"] = sub[use]
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
    if "direct" in fits and fits["direct"]["success"]:
        return "direct", (
            "direct fit on a(N): da/dN = C·ΔJ^m integrated over each test from its first "
            "reading, one exponent m for all specimens and one C per specimen (each counts "
            "once in C); it uses every reading without differentiating them, so it has no "
            "bias of the incremental polynomial where growth accelerates between readings "
            "(readings at equal cycles); intervals by resampling about it; the "
            "incremental polynomial fit (ASTM E647 X1) is the cross-check"
        )
    if "polynomial" in fits and fits["polynomial"]["n"] >= 10:
        return "polynomial", (
            "the direct a(N) fit failed: log–log regression on seven-point incremental "
            "polynomial rates from every reading (ASTM E647 X1), one exponent m for all "
            "specimens and one intercept per specimen; intervals by resampling"
        )
    if "secant" in fits:
        return "secant", "only the secant rates could be fitted"
    raise CycjInputError("no fit could be made from these logs")
