"""The plots people plan with draw the numbers of the plan: the POD used and its a90/95 bound,
and the probability of failure per period beside the cumulative one.

a90/95 (MIL-HDBK-1823A, 2009, §5): the crack size at which the 95 % lower confidence bound of
POD reaches 0.9, so the bound drawn through it must read 0.9 (times the ceiling) there, and
the curve used must read 0.9 at a90.
"""

import math

import matplotlib

matplotlib.use("Agg")

import numpy as np
import pytest

from cycj.plan import plots as P
from cycj.plan.pod import pod_from_a50


def _line_at(line, a):
    x, y = (np.asarray(v, float) for v in line.get_data())
    return float(np.interp(math.log(a), np.log(x), y))


@pytest.mark.parametrize("model", ["lognormal", "loglogistic"])
def test_pod_plot_draws_the_curve_used_and_its_a90_95_bound(model):
    a90 = pod_from_a50(model, 2.0, 0.4).a90
    a90_95 = 1.3 * a90  # invented: the bound lies above a90
    pod = pod_from_a50(model, 2.0, 0.4, ceiling=0.95, a90_95=a90_95)
    summary = {"pod": pod.as_dict(), "deterministic": {"detectable_size_mm": 3.0}}
    ax = P.pod_used(summary, lower_bound=True).axes[0]
    curves = [ln for ln in ax.get_lines() if len(ln.get_xdata()) > 2]
    assert len(curves) == 2
    used, bound = curves
    assert _line_at(used, pod.a90) == pytest.approx(0.9 * 0.95, abs=2e-3)
    assert _line_at(bound, a90_95) == pytest.approx(0.9 * 0.95, abs=2e-3)
    for a in (a90 / 2, a90, a90_95):  # a lower bound at every size
        assert _line_at(bound, a) < _line_at(used, a)
    assert "used in the plan" in bound.get_label()
    # a plan on the curve itself still draws the bound it was given, not labelled as used
    ax_plain = P.pod_used(summary, lower_bound=False).axes[0]
    plain = [ln for ln in ax_plain.get_lines() if len(ln.get_xdata()) > 2]
    assert len(plain) == 2 and "used in the plan" not in plain[1].get_label()


def test_pof_per_period_plot_draws_the_rows():
    # invented rows: probabilities of failure per year and their running sums
    per = {"no_inspection": [1e-5, 4e-5, 2e-4], "recommended": [1e-5, 2e-5, 3e-5]}
    rows = [
        {
            "period": i + 1,
            **{f"pof_in_period_{k}": v[i] for k, v in per.items()},
            **{f"cumulative_pof_{k}": float(np.cumsum(v)[i]) for k, v in per.items()},
        }
        for i in range(3)
    ]
    fig = P.pof_per_period({"pof_per_period": rows, "period": "year", "target_pof": 1e-4})
    ax, ax2 = fig.axes
    heights = [[p.get_height() for p in c] for c in ax.containers]
    assert heights == [per["no_inspection"], per["recommended"]]
    lines = [ln for ln in ax2.get_lines() if len(ln.get_xdata()) == 3]
    np.testing.assert_allclose(lines[0].get_ydata(), np.cumsum(per["no_inspection"]))
    np.testing.assert_allclose(lines[1].get_ydata(), np.cumsum(per["recommended"]))
    assert "year" in ax.get_xlabel()
