"""Plots of an inspection plan and of a POD fit (matplotlib, imported here only)."""

from __future__ import annotations

import math

import numpy as np

from cycj.display import count


def _outside(ax, handles=None, labels=None):
    """The legend beside the axes (it never covers data: the shaded band, the points)."""
    kw = dict(fontsize=7, loc="upper left", bbox_to_anchor=(1.02, 1.0), borderaxespad=0.0)
    if handles is not None:
        ax.legend(handles, labels, **kw)
    else:
        ax.legend(**kw)


def _fig(w=6.4, h=4.2):
    import matplotlib

    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt

    return plt.subplots(figsize=(w, h))


def pof_vs_interval(summary: dict):
    """Probability of failure over the design life vs inspection interval, target line."""
    fig, ax = _fig()
    srch = summary["search"]
    x = np.array([r["interval_cycles"] for r in srch])
    p = np.array([r["pof"] for r in srch])
    se = np.array([r["std_error"] for r in srch])
    ax.errorbar(
        x, p, yerr=se, fmt="o-", ms=3, lw=1, label="searched intervals (monotone fit ± s.e.)"
    )
    wi = summary["what_if"]
    if wi:
        ax.errorbar(
            [r["interval_cycles"] for r in wi],
            [r["pof"] for r in wi],
            yerr=[r["std_error"] for r in wi],
            fmt="s",
            ms=6,
            label="what-if intervals",
        )
    ax.axhline(summary["target_pof"], color="C3", ls="--", label="target")
    ax.axhline(summary["no_inspection"]["pof"], color="0.5", ls=":", label="no inspection")
    rec = summary["recommended_interval_cycles"]
    if rec is not None and summary.get("inspection_needed", True):
        ax.axvline(rec, color="C2", ls="-.", label=f"recommended {count(rec)} cycles")
        r = summary.get("recommendation") or {}
        if r.get("pof_ci"):
            lo, hi = r["pof_ci"]
            ax.errorbar(
                [rec],
                [r["pof_estimate"]],
                yerr=[[r["pof_estimate"] - lo], [hi - r["pof_estimate"]]],
                fmt="D",
                color="C2",
                ms=5,
                capsize=3,
                label=f"{round(100 * r['confidence'])} % interval there",
            )
    ax.set_xscale("log")
    if np.any(p > 0):
        ax.set_yscale("log")
        ax.set_ylim(bottom=max(min(summary["target_pof"] / 10, p[p > 0].min() / 2), 1e-9))
    ax.set_xlabel("inspection interval [cycles]")
    ax.set_ylabel("probability of failure over the design life")
    _outside(ax)
    ax.grid(True, which="both", alpha=0.3)
    return fig


def cumulative_pof(summary: dict):
    """Cumulative probability of failure vs cycles, without and with inspections."""
    fig, ax = _fig()
    cum = summary["cumulative_pof"]
    n = np.asarray(cum["cycles"])
    for k, v in cum.items():
        if k == "cycles":
            continue
        words = k.replace("_", " ")
        tail = words.rsplit(" ", 1)[-1]
        if words.startswith("interval ") and tail.replace(".", "").isdigit():
            words = f"interval {count(float(tail))} cycles"
        ax.plot(n, v, label=words)
    ax.axhline(summary["target_pof"], color="C3", ls="--", lw=1, label="target")
    ax.set_yscale("symlog", linthresh=max(summary["target_pof"] / 10, 1e-8))
    ax.set_ylim(bottom=0.0)
    ax.set_xlabel("cycles")
    ax.set_ylabel("cumulative probability of failure")
    _outside(ax)
    ax.grid(True, alpha=0.3)
    return fig


def envelope(curves: dict, summary: dict):
    """Crack size vs cycles: Monte Carlo quantiles without inspection, and the deterministic
    curve from the detectable size with the deterministic inspections marked."""
    from cycj.display import units

    u = units()
    L = u.factor("length")
    fig, ax = _fig()
    env = curves["envelope"]
    n = np.asarray(env["cycles"])
    ax.fill_between(
        n,
        np.asarray(env["a_p05_mm"]) * L,
        np.asarray(env["a_p95_mm"]) * L,
        alpha=0.25,
        label="5–95 % of samples (no inspection)",
    )
    ax.plot(n, np.asarray(env["a_p50_mm"]) * L, lw=1.5, label="median sample")
    det = curves["deterministic"]
    ax.plot(
        det["cycles"],
        np.asarray(det["a_mm"]) * L,
        "k-",
        lw=1,
        label="deterministic, from detectable",
    )
    d = summary["deterministic"]
    for i, row in enumerate(d["schedule"]):
        ax.axvline(
            row["cycle"],
            color="C2",
            lw=0.8,
            ls=":",
            label="deterministic inspections" if i == 0 else None,
        )
    ax.axhline(d["critical_crack_length_mm"] * L, color="C3", ls="--", lw=1, label="critical")
    ax.axhline(d["detectable_size_mm"] * L, color="0.4", ls="-.", lw=1, label="detectable")
    ax.set_yscale("log")
    ax.set_xlim(0, summary["design_life_cycles"])
    ax.set_xlabel("cycles")
    ax.set_ylabel(u.label("crack size a", "length"))
    _outside(ax)
    ax.grid(True, which="both", alpha=0.3)
    return fig


def lower_bound_curve(c, a90_95):
    """The POD curve of ``c``'s spread shifted so that it passes 0.9 at ``a90_95``: the lower
    confidence bound on POD at every size (MIL-HDBK-1823A (2009) §4)."""
    from cycj.plan.pod import PodCurve

    return PodCurve(c.model, c.mu + math.log(a90_95 / c.a90), c.sigma, c.ceiling)


def pod_plot(fit, a, y, kind: str):
    """Data and fitted POD (hit/miss) or â vs a with the regression line (signal response)."""
    fig, ax = _fig()
    c = fit.curve
    grid = np.geomspace(min(np.min(a), c.a50 / 5), max(np.max(a), c.a90 * 2), 200)
    if kind == "hit-miss":
        ax.plot(a, y, "o", ms=3, alpha=0.5, label="hit (1) / miss (0)")
        ax.plot(grid, c(grid), "C1-", label=f"fitted POD ({fit.link})")
        ax.set_ylabel("POD")
    else:
        ax2 = ax.twinx()
        ax.plot(a, y, "o", ms=3, alpha=0.5, label="â")
        p = fit.params
        ax.plot(
            grid,
            np.exp(p["beta0"] + p["beta1"] * np.log(grid)),
            "k-",
            lw=1,
            label="ln â regression",
        )
        ax.axhline(p["decision"], color="C3", ls="--", lw=1, label="decision â")
        ax.set_yscale("log")
        ax.set_ylabel("signal â")
        ax2.plot(grid, c(grid), "C1-", label="POD")
        ax2.set_ylabel("POD")
        ax2.set_ylim(0, 1.02)
    pod_ax = ax if kind == "hit-miss" else ax2
    if fit.a90_95 and math.isfinite(fit.a90_95):
        lb = lower_bound_curve(c, fit.a90_95)
        pod_ax.plot(grid, lb(grid), "C1--", label="lower confidence bound (through a90/95)")
    ax.axvline(c.a90, color="C2", ls=":", label=f"a90 = {c.a90:.3g} mm")
    ax.axvline(fit.a90_95, color="C2", ls="--", label=f"a90/95 = {fit.a90_95:.3g} mm")
    ax.set_xscale("log")
    ax.set_xlabel("crack size a [mm]")
    h1, l1 = ax.get_legend_handles_labels()
    if kind != "hit-miss":
        h2, l2 = ax2.get_legend_handles_labels()
        h1, l1 = h1 + h2, l1 + l2
        ax2.yaxis.set_label_position("right")
    fig.set_size_inches(7.6, 4.2)
    right = 1.02 if kind == "hit-miss" else 1.13  # beside the second axis' labels
    ax.legend(h1, l1, fontsize=7, loc="upper left", bbox_to_anchor=(right, 1.0))
    ax.grid(True, which="both", alpha=0.3)
    return fig


def pof_per_period(summary: dict):
    """Probability of failure per period (year or block) as bars and cumulative as lines,
    without inspection and at the recommended interval."""
    fig, ax = _fig()
    rows = summary.get("pof_per_period") or []
    unit = summary.get("period") or "period"
    if not rows:
        ax.text(0.5, 0.5, "no period known (no duration per cycle)", ha="center")
        return fig
    x = np.array([r["period"] for r in rows])
    ax2 = ax.twinx()
    for i, (name, label) in enumerate(
        (("no_inspection", "no inspection"), ("recommended", "recommended interval"))
    ):
        key = f"pof_in_period_{name}"
        if key not in rows[0]:
            continue
        ax.bar(
            x + (i - 0.5) * 0.4,
            [r[key] for r in rows],
            0.4,
            alpha=0.6,
            color=f"C{i}",
            label=f"per {unit}, {label}",
        )
        ax2.plot(
            x,
            [r[f"cumulative_pof_{name}"] for r in rows],
            f"C{i}-",
            lw=1.5,
            label=f"cumulative, {label}",
        )
    ax2.axhline(summary["target_pof"], color="C3", ls="--", lw=1, label="target (cumulative)")
    ax.set_xlabel(f"{unit} of service")
    ax.set_ylabel(f"probability of failure in the {unit}")
    ax2.set_ylabel("cumulative probability of failure")
    h1, l1 = ax.get_legend_handles_labels()
    h2, l2 = ax2.get_legend_handles_labels()
    ax.legend(h1 + h2, l1 + l2, fontsize=7, loc="upper left", bbox_to_anchor=(1.16, 1.0))
    ax.grid(True, alpha=0.3)
    return fig


def pod_used(summary: dict, lower_bound: bool = False):
    """The POD curve of the plan and, when asked, the curve of the same spread through the
    a90/95 size (a lower bound on POD at each size)."""
    from cycj.plan.pod import PodCurve

    d = summary["pod"]
    c = PodCurve(d["model"], d["mu"], d["sigma"], d["ceiling"], d.get("a90_95_mm"))
    from cycj.display import units

    u = units()
    L = u.factor("length")
    fig, ax = _fig()
    top = max(c.a90 * 3, (c.a90_95 or 0) * 2)
    a = np.geomspace(c.a50 / 10, top, 300)
    ax.plot(a * L, c(a), "C0-", label=f"POD (mean curve, {c.model}, a50 {u.q(c.a50, 'length', 3)})")
    ax.axvline(c.a90 * L, color="C0", ls=":", lw=1, label=f"a90 = {u.q(c.a90, 'length', 3)}")
    if c.a90_95:
        used = " — used in the plan" if lower_bound else ""
        ax.plot(
            a * L,
            lower_bound_curve(c, c.a90_95)(a),
            "C1--",
            label=f"lower confidence bound through a90/95 = {u.q(c.a90_95, 'length', 3)}{used}",
        )
    det = summary["deterministic"]["detectable_size_mm"]
    ax.axvline(
        det * L, color="0.4", ls="-.", lw=1, label=f"detectable size {u.q(det, 'length', 3)}"
    )
    ax.set_xscale("log")
    ax.set_ylim(0, 1.02)
    ax.set_xlabel(u.label("crack size a", "length"))
    ax.set_ylabel("probability of detection")
    _outside(ax)
    ax.grid(True, which="both", alpha=0.3)
    return fig
