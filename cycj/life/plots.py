"""Plots of a life prediction (matplotlib, imported here only): crack size vs cycles with the
end marked; ΔJ and da/dN vs crack size; ΔJ split into its elastic and plastic parts with
ΔK²/E' for comparison; the J_max or FAD trajectory against its criterion; the J–R curve with
the driving-force curve at the end when tearing ends the run.  Quantities are shown in the
output unit system in force (:func:`cycj.display.units`).

The figures are plain ``matplotlib.figure.Figure`` objects with fixed margins (no pyplot, no
tight bounding box: a ``cycj run`` draws each figure once)."""

from __future__ import annotations

import os
import sys

import numpy as np

from cycj.display import count, units

#: the end of a run in a plot's legend
END_LABELS = {
    "toughness": "J_max reaches J_c",
    "tearing": "tearing instability",
    "fad": "failure assessment diagram",
    "collapse": "plastic collapse",
    "size-limit": "crack size limit",
    "leak": "leak (through the wall)",
    "max-cycles": "cycle limit",
    "no-growth": "no growth",
}


def _figure_class():
    """``matplotlib.figure.Figure``.  On the command line (``CYCJ_COMMAND_LINE`` set by
    :func:`cycj.cli.main`) the first import skips the property lists matplotlib writes into
    the docstrings of its artists' ``set`` methods: about 0.2 s of the 0.5 s import, and a
    command reads no docstring.  Elsewhere matplotlib is imported as it is."""
    if "matplotlib.figure" in sys.modules or not os.environ.get("CYCJ_COMMAND_LINE"):
        from matplotlib.figure import Figure

        return Figure
    import matplotlib.artist as artist

    kwdoc = getattr(artist, "kwdoc", None)
    if kwdoc is not None:  # the property list of a class: matplotlib.artist.kwdoc
        artist.kwdoc = lambda _artist: ""
    try:
        from matplotlib.figure import Figure
    finally:
        if kwdoc is not None:
            artist.kwdoc = kwdoc
    return Figure


def _subplots(nrows=1, ncols=1, figsize=(6.4, 4.2), margins=(0.12, 0.97, 0.13, 0.95)):
    """A figure (Agg canvas, not managed by pyplot) and its axes; ``margins``: left, right,
    bottom, top as fractions of the figure."""
    fig = _figure_class()(figsize=figsize)
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


def _dot(a_mm):
    """A marker for the points when the run has fewer than three distinct crack sizes (it
    ended at once or did not grow: a line alone would not show), else None."""
    a = np.asarray(a_mm, float)
    return "o" if np.unique(a[~np.isnan(a)]).size < 3 else None


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
    """a vs N with the end point and the critical crack size (or the leak size)."""
    u = units()
    h, s = result.columns, result.summary
    L = u.factor("length")
    fig, ax = _subplots(figsize=(6.4, 4.2))
    ax.plot(h["cycle"], h["a_mm"] * L, lw=1.6, label="depth a" if "c_mm" in h else "crack size")
    if "c_mm" in h:
        ax.plot(h["cycle"], h["c_mm"] * L, lw=1.4, color="C1", label="half-length c")
    ax.plot(
        [s["cycles_to_end"]],
        [s["a_end_mm"] * L],
        "o",
        color="C3",
        label=f"end: {END_LABELS.get(s['end_reason'], s['end_reason'])} at "
        f"{count(s['cycles_to_end'])} cycles",
    )
    crit = s["critical_crack_criterion"]
    ax.axhline(
        s["critical_crack_length_mm"] * L,
        ls="--",
        color="0.5",
        lw=1,
        label="leak: crack through the wall"
        if crit == "leak"
        else f"critical size at peak load ({END_LABELS.get(crit, crit)})",
    )
    _widen(ax, h["cycle"])
    ax.set_xlabel("cycles N")
    ax.set_ylabel(u.label("crack size", "length"))
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8, loc="upper left")
    return fig


def driving_force_figure(result):
    """ΔJ_eq, ΔJ (largest cycle) and da/dN vs crack size."""
    u = units()
    h = result.columns
    L, J = u.factor("length"), u.factor("energy_per_area")
    fig, (ax1, ax2) = _subplots(1, 2, figsize=(9.0, 3.8), margins=(0.1, 0.98, 0.14, 0.96))
    dot = _dot(h["a_mm"])
    a = h["a_mm"] * L
    ax1.plot(a, h["dJ_eq_kJm2"] * J, marker=dot, label="ΔJ_eq of the block")
    ax1.plot(a, h["dJ_kJm2"] * J, ls="--", marker=dot, label="largest cycle ΔJ_eff")
    _widen(ax1, a)
    ax1.set_xlabel(u.label("crack size a", "length"))
    ax1.set_ylabel(u.label("ΔJ", "energy_per_area"))
    _log_axis(ax1, np.concatenate([h["dJ_eq_kJm2"], h["dJ_kJm2"]]) * J, "ΔJ")
    ax1.grid(alpha=0.3, which="both")
    ax1.legend(fontsize=8)
    rate = h["dadN_mm_per_cycle"] * L
    ok = rate > 0
    ax2.plot(a[ok], rate[ok], color="C2", marker=dot)
    _widen(ax2, a)
    ax2.set_xlabel(u.label("crack size a", "length"))
    ax2.set_ylabel(u.label("da/dN", "rate"))
    _log_axis(ax2, rate[ok], "growth rate")
    ax2.grid(alpha=0.3, which="both")
    return fig


def split_figure(result):
    """ΔJ_eff of the block's largest cycle split into its elastic part U²ΔK²/E' and its
    plastic part, against crack size, with the linear-elastic ΔK²/E' for comparison."""
    from cycj.kernel_slots import E_PRIME
    from cycj.units import MPA_SQRT_M

    u = units()
    h = result.columns
    L, J = u.factor("length"), u.factor("energy_per_area")
    a = h["a_mm"] * L
    el, pl = h["dJ_el_kJm2"], h["dJ_pl_kJm2"]
    lefm = (h["dK_MPa_sqrt_m"] * MPA_SQRT_M) ** 2 / result.model[E_PRIME]
    dot = _dot(h["a_mm"])
    fig, ax = _subplots(figsize=(6.4, 4.2))
    ax.plot(a, (el + pl) * J, "k-", lw=1.8, marker=dot, label="ΔJ_eff = elastic + plastic")
    ax.plot(a, el * J, "C0--", marker=dot, label="elastic part U²·ΔK²/E'")
    ax.plot(a, pl * J, "C3-.", marker=dot, label="plastic part")
    ax.plot(a, lefm * J, "0.45", ls=":", lw=1.4, marker=dot, label="ΔK²/E' (LEFM, no closure)")
    _widen(ax, a)
    ax.set_xlabel(u.label("crack size a", "length"))
    ax.set_ylabel(u.label("ΔJ of the largest cycle", "energy_per_area"))
    _log_axis(ax, np.concatenate([el + pl, el, pl, lefm]) * J, "ΔJ")
    ax.grid(alpha=0.3, which="both")
    ax.legend(fontsize=8, loc="best")
    return fig


def tearing_figure(result, n: int = 120):
    """The J–R curve started at the final crack size a_end against the driving force
    J_max(a_end + Δa) under the history's peak load: where they no longer cross, tearing is
    unstable (Paris, Tada, Zahoor & Ernst, ASTM STP 668 (1979))."""
    from cycj.life import end_state as ES

    u = units()
    case, s = result.case, result.summary
    jr = case.material.resistance_curve
    a_end = s["a_end_mm"]
    hi = case.geometry.size_limits[1]
    span = max(min(hi - a_end, max(1.0, 0.1 * a_end)), 1e-3)
    da = np.linspace(0.0, span, n)
    jmax = np.array([ES.peak(case, result.loads, result.model, min(a_end + d, hi))[0] for d in da])
    top = 1.4 * max(float(np.max(jr(da))), float(jmax[0]))
    L, J = u.factor("length"), u.factor("energy_per_area")
    fig, ax = _subplots(figsize=(6.4, 4.2))
    ax.plot(
        da * L,
        jr(da) * J,
        "C0-",
        lw=1.8,
        label=f"J–R curve from a = {u.q(a_end, 'length')}",
    )
    ax.plot(da * L, jmax * J, "C3--", lw=1.6, label="J_max at peak load (driving force)")
    ax.set_xlabel(u.label("crack extension Δa", "length"))
    ax.set_ylabel(u.label("J", "energy_per_area"))
    ax.set_xlim(0, span * L)
    ax.set_ylim(0, top * J)
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8, loc="upper left")
    return fig


def criterion_figure(result):
    """The peak-load trajectory: J_max vs a against J_c, or on the FAD when it is used."""
    h, case = result.columns, result.case
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
        a = np.clip(h["a_mm"], *case.geometry.size_limits)
        lr_pts, kr = result.peak_points(a, h["c_mm"] if "c_mm" in h else None)
        ax.plot(lr_pts, kr, "o-", ms=2, color="C3", label="assessment points (peak load)")
        ax.set_xlabel("L_r = P_max / P_L")
        ax.set_ylabel("K_r = K_max / K_mat")
        ax.set_xlim(0, mat.lr_max * 1.1)
        ax.set_ylim(0, 1.2)
    else:
        u = units()
        L, J = u.factor("length"), u.factor("energy_per_area")
        ax.plot(h["a_mm"] * L, h["Jmax_kJm2"] * J, label="J_max at the block's peak load")
        if mat.J_c:
            ax.axhline(
                mat.J_c * J, color="C3", ls="--", label=f"J_c = {u.q(mat.J_c, 'energy_per_area')}"
            )
        _widen(ax, h["a_mm"] * L)
        _widen(ax, h["Jmax_kJm2"] * J, "y")
        ax.set_xlabel(u.label("crack size a", "length"))
        ax.set_ylabel(u.label("J_max", "energy_per_area"))
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return fig
