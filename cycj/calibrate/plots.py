"""Figures of a calibration: da/dN vs ΔJ with fit and band, a vs N, one typical loop.

matplotlib is imported inside each function (the command line starts fast).
"""

from __future__ import annotations

import numpy as np


def _figure():
    import matplotlib

    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt

    return plt.subplots(figsize=(6.4, 4.4))


def rate_plot(result):
    """da/dN [mm/cycle] against ΔJ_eff [kJ/m²], log–log, by log, with the recommended line
    and the prediction band of the regression."""
    from cycj.calibrate.fits import prediction_band
    from cycj.display import num, units

    u = units()
    J, R = u.factor("energy_per_area"), u.factor("rate")
    fig, ax = _figure()
    s = result.summary
    rates = result.rates
    meth = s["recommended_fit"] if s["recommended_fit"] != "direct" else "polynomial"
    sub = rates[(rates["method"] == meth) & (rates["dadN_mm_per_cycle"] > 0)]
    for name, g in sub.groupby("log"):
        ax.loglog(g["dJ_eff_kJm2"] * J, g["dadN_mm_per_cycle"] * R, "o", ms=4, label=str(name))
    lo, hi = s["dJ_range_kJm2"]
    lo = max(lo, 1e-6)
    x = np.geomspace(lo, hi, 100)
    ax.loglog(
        x * J,
        s["C"] * x ** s["m"] * R,
        "k-",
        label=f"{s['recommended_fit']}: C = {num(s['C'], 3)}, m = {num(s['m'], 3)}",
    )
    reg = result.fits.get(meth)
    if reg is not None:
        blo, bhi = prediction_band(reg, x)
        ax.fill_between(
            x * J,
            np.asarray(blo) * R,
            np.asarray(bhi) * R,
            color="0.8",
            alpha=0.6,
            label=f"{100 * reg['confidence']:g} % prediction band",
        )
    if s.get("threshold_kJm2"):
        ax.axvline(s["threshold_kJm2"] * J, color="r", ls="--", lw=1, label="E647 threshold")
    ax.set_xlabel(u.label("ΔJ_eff", "energy_per_area"))
    ax.set_ylabel(u.label("da/dN", "rate"))
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=8)
    return fig


def crack_plot(result):
    """Measured crack length against cycles, with the direct fit's integrated curves."""
    from cycj.display import units

    u = units()
    L = u.factor("length")
    fig, ax = _figure()
    for c in result.curves:
        line = ax.plot(
            c["cycle"], np.asarray(c["a_mm"]) * L, ".", ms=3, label=f"{c['log']} measured"
        )[0]
        ax.plot(
            c["fit_cycle"],
            np.asarray(c["fit_a_mm"]) * L,
            "-",
            color=line.get_color(),
            label=f"{c['log']} direct fit",
        )
    ax.set_xlabel("cycles N")
    ax.set_ylabel(u.label("crack length a", "length"))
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=8)
    return fig


def loop_plot(typical):
    """One recorded loop with its compliance line and opening load."""
    from cycj.display import units

    u = units()
    F, L = u.factor("force"), u.factor("length")
    fig, ax = _figure()
    p, v = np.asarray(typical["load"]), np.asarray(typical["disp"])
    ax.plot(v * L, p * F, ".-", ms=3, lw=0.6, label=f"cycle {typical['cycle']:,.0f}")
    pmax = typical["p_max"]
    imax = int(np.argmax(p))
    pp = np.linspace(p.min(), pmax, 20)
    ax.plot(
        (v[imax] - typical["compliance"] * (pmax - pp)) * L,
        pp * F,
        "k--",
        lw=1,
        label="compliance line (upper unloading)",
    )
    ax.axhline(
        typical["p_open"] * F,
        color="r",
        lw=1,
        label=f"opening load {u.q(typical['p_open'], 'force')} (this loop)",
    )
    ax.set_xlabel(u.label("displacement", "length"))
    ax.set_ylabel(u.label("load", "force"))
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=8)
    return fig
