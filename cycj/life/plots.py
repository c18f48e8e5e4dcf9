"""Plots of a life prediction (matplotlib, imported here only): crack size vs cycles with the
end marked; ΔJ and da/dN vs crack size; the J_max or FAD trajectory against its criterion.

The figures are plain ``matplotlib.figure.Figure`` objects with fixed margins (no pyplot, no
tight bounding box: a ``cycj run`` draws each figure once)."""

from __future__ import annotations

import numpy as np


def _subplots(nrows=1, ncols=1, figsize=(6.4, 4.2), margins=(0.12, 0.97, 0.13, 0.95)):
    """A figure (Agg canvas, not managed by pyplot) and its axes; ``margins``: left, right,
    bottom, top as fractions of the figure."""
    from matplotlib.figure import Figure

    fig = Figure(figsize=figsize)
    axes = fig.subplots(nrows, ncols)
    left, right, bottom, top = margins
    fig.subplots_adjust(left=left, right=right, bottom=bottom, top=top, wspace=0.36)
    return fig, axes


def _widen(ax, values, axis="x", log=False):
    """Give an axis a finite span when all its values are equal (a run that ends at its first
    cycle has one point; a zero span breaks the layout)."""
    v = np.asarray(values, float)
    v = v[np.isfinite(v)]
    if v.size and np.ptp(v) <= 1e-9 * np.abs(v).max():
        c = float(v[0])
        half = 0.05 * abs(c) if c else 1.0
        lim = (c / 2, c * 2) if log and c > 0 else (c - half, c + half)
        if not log and c == 0.0 and axis == "x":  # cycles of an immediate end: from 0
            lim = (0.0, 1.0)
        (ax.set_xlim if axis == "x" else ax.set_ylim)(*lim)


def _log_axis(ax, values, what: str):
    """A log y-axis over the positive finite ``values``; without any (a run with no growth),
    a linear axis from 0 with a note instead of an error."""
    v = np.asarray(values, float)
    v = v[np.isfinite(v) & (v > 0)]
    if v.size == 0:
        ax.set_ylim(0.0, 1.0)
        ax.text(
            0.5,
            0.5,
            f"no {what} > 0 in this run",
            transform=ax.transAxes,
            ha="center",
            va="center",
            color="0.4",
        )
        return
    ax.set_yscale("log")
    _widen(ax, v, "y", log=True)


def crack_growth_figure(result):
    """a vs N with the end point and the critical crack size."""
    h, s = result.history, result.summary
    fig, ax = _subplots(figsize=(6.4, 4.2))
    ax.plot(h["cycle"], h["a_mm"], lw=1.6, label="depth a" if "c_mm" in h else "crack size")
    if "c_mm" in h:
        ax.plot(h["cycle"], h["c_mm"], lw=1.4, color="C1", label="half-length c")
    ax.plot(
        [s["cycles_to_end"]],
        [s["a_end_mm"]],
        "o",
        color="C3",
        label=f"end: {s['end_reason']} at {s['cycles_to_end']:.4g} cycles",
    )
    ax.axhline(
        s["critical_crack_length_mm"],
        ls="--",
        color="0.5",
        lw=1,
        label=f"critical size at peak load ({s['critical_crack_criterion']})",
    )
    _widen(ax, h["cycle"])
    ax.set_xlabel("cycles N")
    ax.set_ylabel("crack size [mm]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8, loc="upper left")
    return fig


def driving_force_figure(result):
    """ΔJ_eq, ΔJ (largest cycle) and da/dN vs crack size."""
    h = result.history
    fig, (ax1, ax2) = _subplots(1, 2, figsize=(9.0, 3.8), margins=(0.1, 0.98, 0.14, 0.96))
    # a run that ends at once, or does not grow, has a single crack size
    dot = "o" if h["a_mm"].nunique() < 3 else None
    ax1.plot(h["a_mm"], h["dJ_eq_kJm2"], marker=dot, label="ΔJ_eq of the block")
    ax1.plot(h["a_mm"], h["dJ_kJm2"], ls="--", marker=dot, label="largest cycle ΔJ_eff")
    _widen(ax1, h["a_mm"])
    ax1.set_xlabel("crack size a [mm]")
    ax1.set_ylabel("ΔJ [kJ/m²]")
    _log_axis(ax1, np.concatenate([h["dJ_eq_kJm2"], h["dJ_kJm2"]]), "ΔJ")
    ax1.grid(alpha=0.3, which="both")
    ax1.legend(fontsize=8)
    rate = h["dadN_mm_per_cycle"].to_numpy()
    ok = rate > 0
    ax2.plot(h["a_mm"][ok], rate[ok], color="C2", marker=dot)
    _widen(ax2, h["a_mm"])
    ax2.set_xlabel("crack size a [mm]")
    ax2.set_ylabel("da/dN [mm/cycle]")
    _log_axis(ax2, rate[ok], "growth rate")
    ax2.grid(alpha=0.3, which="both")
    return fig


def criterion_figure(result):
    """The peak-load trajectory: J_max vs a against J_c, or on the FAD when it is used."""
    h, case = result.history, result.case
    mat = case.material
    fig, ax = _subplots(figsize=(6.0, 4.2))
    if "fad" in case.run.criteria and mat.J_c:
        from cycj.fad import fad_option1, fad_option1_2013, fad_option2

        lr = np.linspace(0, mat.lr_max, 200)
        if case.analysis.fad == "option-2" and mat.peak_curve:
            f = fad_option2(lr, mat)
        elif case.analysis.fad == "option-1-2013":
            f = fad_option1_2013(lr, mat)
        else:
            f = fad_option1(lr, mat.lr_max)
        ax.plot(lr, f, color="k", label=f"FAD {case.analysis.fad}")
        ax.vlines(mat.lr_max, 0, f[-1], color="k")
        a = np.clip(h["a_mm"].to_numpy(), *case.geometry.size_limits)
        lr_pts, kr = result.peak_points(a, h["c_mm"] if "c_mm" in h else None)
        ax.plot(lr_pts, kr, "o-", ms=2, color="C3", label="assessment points (peak load)")
        ax.set_xlabel("L_r = P_max / P_L")
        ax.set_ylabel("K_r = K_max / K_mat")
        ax.set_xlim(0, mat.lr_max * 1.1)
        ax.set_ylim(0, 1.2)
    else:
        ax.plot(h["a_mm"], h["Jmax_kJm2"], label="J_max at the block's peak load")
        if mat.J_c:
            ax.axhline(mat.J_c, color="C3", ls="--", label=f"J_c = {mat.J_c:g} kJ/m²")
        _widen(ax, h["a_mm"])
        _widen(ax, h["Jmax_kJm2"], "y")
        ax.set_xlabel("crack size a [mm]")
        ax.set_ylabel("J_max [kJ/m²]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return fig
