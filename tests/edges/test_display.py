"""The shared formatter (cycj.display): engineering numbers, US customary factors against the
exact definitions, and clean log-axis labels."""

import math

import pytest

from cycj.display import OutputUnits, hours, num, text, units, using

#: exact by definition, NIST SP 811 (2008) Appendix B: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N
INCH_MM = 25.4
LBF_N = 4.4482216152605
KSI_MPA = 1000 * LBF_N / INCH_MM**2  # 6.894757293168361 MPa


@pytest.mark.parametrize(
    "kind, one_si_in_us",
    [
        ("length", 1 / INCH_MM),
        ("rate", 1 / INCH_MM),
        ("force", 1 / LBF_N),
        ("stress", 1 / KSI_MPA),
        # 1 MPa√m = 1 MPa·√(1000 mm) → ksi·√in
        ("stress_intensity", math.sqrt(1000 / INCH_MM) / KSI_MPA),
        # 1 kJ/m² = 1 N/mm → lbf/in (= in·lbf/in²)
        ("energy_per_area", INCH_MM / LBF_N),
    ],
)
def test_us_factors_are_the_exact_ones(kind, one_si_in_us):
    assert OutputUnits("US").factor(kind) == pytest.approx(one_si_in_us, rel=1e-12)
    assert OutputUnits("SI").factor(kind) == 1.0


def test_ksi_is_the_published_value():
    assert KSI_MPA == pytest.approx(6.894757293168361, rel=1e-15)


def test_quantities_carry_their_unit():
    us = OutputUnits("US")
    assert us.q(25.4, "length") == "1 in"
    assert us.q(KSI_MPA, "stress") == "1 ksi"
    assert OutputUnits("SI").q(12.345, "length") == "12.35 mm"
    with using("US"):
        assert units().unit("energy_per_area") == "in·lbf/in²"
    assert units().system == "SI"
    with pytest.raises(ValueError):
        OutputUnits("imperial")


@pytest.mark.parametrize(
    "value, shown",
    [
        (100600.0, "100,600"),
        (1.0057e5, "100,600"),
        (4.123e6, "4.123\u00a0×\u00a010⁶"),
        (2.5e-5, "2.5\u00a0×\u00a010⁻⁵"),
        (0.01234, "0.01234"),
        (-3.0, "−3"),
        (None, "—"),
        (float("nan"), "—"),
        (True, "yes"),
        (0.0, "0"),
    ],
)
def test_engineering_numbers(value, shown):
    assert num(value) == shown


def test_text_has_no_literals_and_years_beside_hours():
    assert text({"C1": 380.0, "C2": 0.55}) == "C1 = 380; C2 = 0.55"
    assert text([1.0, None, False]) == "1, —, no"
    assert hours(412300) == "412,300 h (47 years)"
    assert hours(12) == "12 h"


def test_log_axis_labels_decades_only_over_wide_spans():
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    from cycj.display import tidy

    fig, ax = plt.subplots()
    ax.loglog([1e-6, 1e-2], [3.0, 4.0])
    ax.set_xlim(1e-6, 1e-2)
    tidy(fig)
    fig.canvas.draw()
    labels = [t.get_text() for t in ax.get_xticklabels() if t.get_text()]
    assert labels and all(lab.startswith("10") for lab in labels), labels
    minor = [t.get_text() for t in ax.xaxis.get_minorticklabels() if t.get_text()]
    assert not minor
    lo, hi = ax.get_ylim()
    ylabels = [
        t.get_text()
        for t in ax.get_yticklabels()
        if t.get_text() and lo <= t.get_position()[1] <= hi
    ]
    assert ylabels == ["3", "4"], ylabels
    plt.close(fig)


def test_linear_axis_has_no_offset():
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    from cycj.display import tidy

    fig, ax = plt.subplots()
    ax.plot([40000.0, 40000.001], [0, 1])
    tidy(fig)
    fig.canvas.draw()
    assert ax.xaxis.get_offset_text().get_text() == ""
    plt.close(fig)
