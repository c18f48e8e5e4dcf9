"""Plots of a J table: J against load per crack size, with the elastic and reference-stress
curves; ΔJ against load range on the Masing curve."""

from __future__ import annotations


def j_vs_load(frame, which: str = "J_kJm2"):
    """Figure of ``which`` (J_kJm2 or dJ_kJm2) against load, one colour per crack size, with
    the elastic K²/E' (dashed) and, for J, the reference-stress estimate (dotted)."""
    import matplotlib.pyplot as plt

    from cycj.display import units

    u = units()
    F, J = u.factor("force"), u.factor("energy_per_area")
    kilo = "kip" if u.us else "kN"
    fig, ax = plt.subplots(figsize=(7, 4.8))
    for k, (a, grp) in enumerate(frame.groupby("a_mm")):
        c = f"C{k % 10}"
        p = grp["load_N"] * F / 1000
        ax.loglog(
            p, grp[which] * J, "o-", color=c, label=f"a = {u.q(a, 'length')}, finite elements"
        )
        ax.loglog(p, grp["J_el_kJm2"] * J, "--", color=c, lw=1)
        if which == "J_kJm2":
            ax.loglog(p, grp["J_ref_kJm2"] * J, ":", color=c, lw=1.2)
    ax.plot([], [], "k--", lw=1, label="elastic K²/E'")
    if which == "J_kJm2":
        ax.plot([], [], "k:", lw=1.2, label="reference stress")
        ax.set_xlabel(f"load P [{kilo}]")
        ax.set_ylabel(u.label("J at peak load", "energy_per_area"))
    else:
        ax.set_xlabel(f"load range ΔP [{kilo}]")
        ax.set_ylabel(u.label("ΔJ on the Masing curve", "energy_per_area"))
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=7)
    return fig
