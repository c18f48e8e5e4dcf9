"""Plots of a J table: J against load per crack size, with the elastic and reference-stress
curves; ΔJ against load range on the Masing curve."""

from __future__ import annotations


def j_vs_load(frame, which: str = "J_kJm2"):
    """Figure of ``which`` (J_kJm2 or dJ_kJm2) against load, one colour per crack size, with
    the elastic K²/E' (dashed) and, for J, the reference-stress estimate (dotted)."""
    import matplotlib.pyplot as plt

    fig, ax = plt.subplots(figsize=(7, 4.8))
    for k, (a, grp) in enumerate(frame.groupby("a_mm")):
        c = f"C{k % 10}"
        p = grp["load_N"] / 1000
        ax.loglog(p, grp[which], "o-", color=c, label=f"a = {a:.4g} mm, finite elements")
        ax.loglog(p, grp["J_el_kJm2"], "--", color=c, lw=1)
        if which == "J_kJm2":
            ax.loglog(p, grp["J_ref_kJm2"], ":", color=c, lw=1.2)
    ax.plot([], [], "k--", lw=1, label="elastic K²/E'")
    if which == "J_kJm2":
        ax.plot([], [], "k:", lw=1.2, label="reference stress")
        ax.set_xlabel("load P [kN]")
        ax.set_ylabel("J at peak load [kJ/m²]")
    else:
        ax.set_xlabel("load range ΔP [kN]")
        ax.set_ylabel("ΔJ on the Masing curve [kJ/m²]")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=7)
    return fig
