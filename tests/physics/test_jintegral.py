"""ΔJ, J_max, FAD curves and CTOD against published values and exact limits."""

import math

import numpy as np
import pytest
from scipy import integrate

from cycj import fad as F
from cycj import jintegral as J
from cycj.errors import ValidityRangeError
from cycj.geometry import make_geometry
from cycj.material import Material, StressStrainCurve, fit_cyclic_curve


def mat(k=900.0, n=0.15, mono=None):
    return Material(200e3, 0.3, 350.0, 500.0, StressStrainCurve(k, n), mono, 200.0)


def test_delta_j_elastic_rice():
    # ΔK = 20 MPa√m, E = 207 GPa, ν = 0.3 → ΔJ = 1758.5 J/m² (docs/references.md R13, from memory;
    # arithmetic of ΔJ = ΔK²/E', Rice 1968)
    e_prime = 207e3 / (1 - 0.3**2)
    assert J.delta_j_elastic(20 * math.sqrt(1000), e_prime) == pytest.approx(1.7585, rel=1e-4)


def test_masing_branch_reference_values():
    # Masing; Morrow (1965), docs/references.md R18 (from memory): E = 200 GPa, K' = 1000,
    # n' = 0.15, Δσ = 800 MPa → Δε_p = 0.0044473, Δε = 0.0084473, ΔW_p = 3.0938 MJ/m³
    c = StressStrainCurve(1000.0, 0.15)
    assert c.masing_strain_range(800.0, 200e3) == pytest.approx(0.0084473, rel=1e-4)
    assert c.masing_plastic_work(800.0) == pytest.approx(3.0938, rel=1e-4)


def test_small_crack_dowling_check_value():
    # Dowling (1977), docs/references.md R9 (from memory): Δσ = 600, E = 200 GPa, Δε_p = 0.005,
    # n' = 0.15, a = 1 mm → ΔJ = 15.92 kJ/m².  K' chosen so the Masing branch gives Δε_p = 0.005.
    k = 300.0 / 0.0025**0.15
    m = Material(200e3, 0.3, 350.0, None, StressStrainCurve(k, 0.15))
    assert J.small_crack_delta_j(1.0, 600.0, m) == pytest.approx(15.92, rel=1e-3)


def test_small_crack_elastic_limit():
    # Dowling 1977 limit (docs/references.md R9): with no plastic strain the estimate is its
    # own elastic term 1.6·Δσ²·a/E
    m = Material(200e3, 0.3, 350.0, None, StressStrainCurve(1e9, 0.15))
    assert J.small_crack_delta_j(2.0, 300.0, m) == pytest.approx(1.6 * 300**2 * 2 / 200e3, rel=1e-9)


def test_reference_stress_limits():
    # Ainsworth 1984 exact limits (docs/references.md R10): vanishing plastic strain →
    # ΔJ_el(1 + ½L_r,cyc²); load → 0 → ΔJ_el
    m = Material(200e3, 0.3, 350.0, None, StressStrainCurve(1e12, 0.15))
    dsig = 300.0
    lr_cyc = J.lr_cyclic(dsig, m.cyclic_curve)
    assert J.reference_stress_delta_j(10.0, dsig, m) == pytest.approx(
        10.0 * (1 + 0.5 * lr_cyc**2), rel=1e-9
    )
    m2 = mat()
    assert J.reference_stress_delta_j(10.0, 1e-9, m2) == pytest.approx(10.0, rel=1e-9)
    assert J.reference_stress_delta_j(10.0, 0.0, m2) == 10.0


def test_plastic_fraction_limits_and_integral():
    # f_pl(1) = 1, f_pl(0) = 0, f_pl → U² as n' → 1 (Masing branch, docs/references.md R18);
    # and equal to the numerical share
    # of the Masing branch's plastic work ∫ (s − s_op) dε_p above the opening level (Dowling &
    # Begley 1976 measure the loop area above the opening load)
    assert J.plastic_fraction(1.0, 0.15) == 1.0
    assert J.plastic_fraction(0.0, 0.15) == 0.0
    assert J.plastic_fraction(0.6, 1.0) == pytest.approx(0.36, rel=1e-12)
    n, kp, ds = 0.15, 900.0, 700.0

    def dep(s):  # dε_p/ds on the branch ε_p = 2(s/2K')^(1/n')
        return (1 / n) * 2 * (s / (2 * kp)) ** (1 / n) / s

    total = integrate.quad(lambda s: s * dep(s), 0, ds)[0]
    for u in (0.3, 0.55, 0.8):
        xs = (1 - u) * ds
        above = integrate.quad(lambda s, xs=xs: (s - xs) * dep(s), xs, ds)[0]
        assert J.plastic_fraction(u, n) == pytest.approx(above / total, rel=1e-8)


def test_delta_j_monotonic_in_load_range():
    g = make_geometry("compact-tension", 20, width=50, thickness=12)
    dj = J.delta_j(g, mat(), 20.0, np.linspace(1, 20, 30))
    assert np.all(np.diff(dj) > 0)


def test_reference_stress_and_small_crack_same_order():
    # both estimates apply to a shallow edge crack in a wide body: same order of magnitude
    g = make_geometry("edge-crack-semi-infinite", 1.0)
    m = mat(k=700.0)
    rs = J.delta_j(g, m, 1.0, 500.0)
    sc = J.delta_j(g, m, 1.0, 500.0, method="small-crack")
    assert 0.3 < rs / sc < 3.0


def test_scalar_kernel_and_vectorised_agree():
    m = mat()
    dj_el = np.array([1.0, 5.0, 12.0])
    ds = np.array([100.0, 400.0, 650.0])
    u = np.array([1.0, 0.7, 0.45])
    vec = J.reference_stress_delta_j(dj_el, ds, m, u)
    for i in range(3):
        s = J.reference_stress_delta_j_scalar(dj_el[i], ds[i], 200e3, 900.0, 0.15, u[i])
        assert vec[i] == pytest.approx(s, rel=1e-14)


def test_option1_fad_values():
    # R6 / BS 7910 Option 1 (docs/references.md R10, from memory): f(0)=1, f(0.5)=0.95817,
    # f(1)=0.57227
    assert F.fad_option1([0.0, 0.5, 1.0]) == pytest.approx([1.0, 0.95817, 0.57227], abs=1e-5)
    assert F.fad_option1(1.3, lr_max=1.2) == 0.0


def test_ainsworth_ramberg_osgood_check_values():
    # Ainsworth (1984), docs/references.md R10 (confirmed): α = 1, n = 5, σ0 = σ_y →
    # J/J_e = 1.18015 at L_r = 0.5 (K_r = 0.92052) and 2.25 at L_r = 1 (K_r = 0.6667).  In
    # cycj's form ε = σ/E + (σ/K)^(1/n_h): n_h = 1/5 and K = σ0/(αε0)^(1/5).
    sy, e = 355.0, 200e3
    curve = StressStrainCurve(sy / (sy / e) ** 0.2, 0.2)
    m = Material(e, 0.3, sy, 470.0, None, curve, 100.0)
    assert F.fad_option2(0.5, m) == pytest.approx(0.92052, abs=1e-5)
    assert F.fad_option2(1.0, m) == pytest.approx(2 / 3, abs=1e-4)
    assert m.lr_max == pytest.approx(1.1620, abs=1e-4)  # (355 + 470)/(2·355)


def test_j_max_tends_to_elastic_at_small_load():
    g = make_geometry("compact-tension", 25, width=50, thickness=25)
    m = mat(mono=StressStrainCurve(800.0, 0.18))
    s = 1e-3
    jel = (s * g.k_over_s(25)) ** 2 / m.effective_modulus(True)
    assert J.j_max(g, m, 25.0, s) == pytest.approx(jel, rel=1e-6)


def test_shih_dn_table_values():
    # Shih (1981), docs/references.md R15 (computed from the HRR field, cross-checked): plane
    # strain d_n = 0.313 at n = 5, αε0 = 0.002; plane stress 0.474
    assert J.shih_dn(5.0) == pytest.approx(0.313, abs=2e-3)
    assert J.shih_dn(5.0, plane_strain=False) == pytest.approx(0.474, abs=2e-3)
    assert J.ctod_from_j(100.0, 400.0, 5.0) == pytest.approx(0.313 * 100 / 400, abs=1e-3)
    with pytest.raises(ValidityRangeError):
        J.shih_dn(20.0)


def test_outside_validity_raises():
    with pytest.raises(ValidityRangeError):
        J.plastic_fraction(1.2, 0.15)
    with pytest.raises(ValidityRangeError):
        J.delta_j_elastic(-1.0, 200e3)


def test_fit_cyclic_curve_recovers_parameters():
    # loop tips generated from σ_a = K'ε_pa^n' (Landgraf, Morrow & Endo 1969 form)
    k, n, e = 950.0, 0.14, 205e3
    sa = np.array([250.0, 320.0, 400.0, 480.0, 560.0])
    ea = sa / e + (sa / k) ** (1 / n)
    curve, info = fit_cyclic_curve(sa, ea, e)
    assert curve.strength_coefficient == pytest.approx(k, rel=1e-8)
    assert curve.hardening_exponent == pytest.approx(n, rel=1e-8)


def test_small_crack_uses_the_shapes_factor():
    # Dowling (1977): ΔJ = a(3.2ΔW_e + 5.0ΔW_p) holds for a small semicircular surface crack
    # ((K/S)² = 1.6a); on a straight-fronted edge crack the shape's own factor 1.1215√(πa)
    # (Tada) replaces it: ΔJ = (FΔS)²πa/E' + (5.0/1.6)·F²πa·ΔSΔε_p/(1+n'), by hand
    g = make_geometry("edge-crack-semi-infinite", 1.0)
    m = mat(k=700.0)
    a, ds = 1.0, 500.0
    dep = 2 * (ds / 1400.0) ** (1 / 0.15)
    f2pa = 1.1215**2 * math.pi * a
    hand = f2pa * ds**2 / (200e3 / 0.91) + 5.0 / 1.6 * f2pa * ds * dep / 1.15
    assert J.delta_j(g, m, a, ds, method="small-crack") == pytest.approx(hand, rel=1e-9)
    # with (K/S)² = 1.6a and E' = E it is Dowling's own form
    dk = ds * math.sqrt(1.6 * a)
    assert J.shape_small_crack_delta_j(dk, ds, m, 200e3) == pytest.approx(
        a * (3.2 * ds**2 / 400e3 + 5.0 * ds * dep / 1.15), rel=1e-12
    )


def _ainsworth_cyclic_by_hand(dj_el, ds, e, kp, n, u=1.0):
    """The published cyclic reference stress estimate evaluated term by term (Ainsworth 1984
    on the Masing branch): U²ΔJ_el[1 + ½L_r,cyc²Δσ/(EΔε)] + f_pl·ΔJ_el·EΔε_p/Δσ with
    L_r,cyc = Δσ/(2K'·0.002^n') and f_pl = 1 − (1+n')x + n'x^(1+1/n'), x = 1 − U."""
    dep = 2 * (ds / (2 * kp)) ** (1 / n)
    de = ds / e + dep
    lr = ds / (2 * kp * 0.002**n)
    x = 1 - u
    f_pl = 1 - (1 + n) * x + n * x ** (1 + 1 / n)
    return u * u * dj_el * (1 + 0.5 * lr * lr * ds / (e * de)) + f_pl * dj_el * e * dep / ds


def test_reference_stress_delta_j_by_hand_with_every_term_significant():
    # Δσ_ref = 600 MPa on K' = 900, n' = 0.15: L_r,cyc = 0.85, ½L_r²Δσ/(EΔε) ≈ 0.25 and
    # EΔε_p/Δσ ≈ 0.43 — a halved plastic part or L_r,cyc = Δσ/σ'_y would move ΔJ by > 10 %
    m = mat()
    for ds, u in ((600.0, 1.0), (600.0, 0.7), (450.0, 0.55), (800.0, 1.0)):
        hand = _ainsworth_cyclic_by_hand(10.0, ds, 200e3, 900.0, 0.15, u)
        assert J.reference_stress_delta_j(10.0, ds, m, u) == pytest.approx(hand, rel=1e-12)
    dep = 2 * (600 / 1800) ** (1 / 0.15)
    lr = 600 / (2 * 900 * 0.002**0.15)
    bracket = 0.5 * lr * lr * 600 / (200e3 * (600 / 200e3 + dep))
    assert bracket > 0.2 and 200e3 * dep / 600 > 0.3
    assert J.lr_cyclic(600.0, m.cyclic_curve) == pytest.approx(lr, rel=1e-14)


def test_delta_j_reference_stress_on_a_shape_by_hand():
    # M(T): K = S√(πa)·[1 − 0.025λ² + 0.06λ⁴]√sec(πλ/2), λ = 2a/W (Tada 1973), and
    # S_L = σ_y(1 − 2a/W) in plane stress (EPRI NP-1931)
    g = make_geometry(
        "center-crack-plate", 10.0, width=100, thickness=10, constraint="plane-stress"
    )
    m = mat()
    ds = 300.0
    lam = 0.2
    kos = math.sqrt(math.pi * 10) * (1 - 0.025 * lam**2 + 0.06 * lam**4)
    kos *= math.sqrt(1 / math.cos(math.pi * lam / 2))
    dj_el = (ds * kos) ** 2 / 200e3
    dsig_ref = ds / (1 - 20 / 100)
    hand = _ainsworth_cyclic_by_hand(dj_el, dsig_ref, 200e3, 900.0, 0.15)
    assert J.delta_j(g, m, 10.0, ds) == pytest.approx(hand, rel=1e-6)
    assert J.delta_j(g, m, 10.0, ds, method="elastic", u=0.6) == pytest.approx(
        0.36 * dj_el, rel=1e-6
    )


def _ainsworth_peak_by_hand(j_el, s, sy, e, k, n):
    """J at peak load by Ainsworth (1984): σ_ref = L_r·σ_y = S_max·σ_y/S_L,
    ε_ref = σ_ref/E + (σ_ref/K)^(1/n), J/J_el = Eε_ref/σ_ref + ½L_r²σ_ref/(Eε_ref)."""
    lr = s / sy
    e_ref = s / e + (s / k) ** (1 / n)
    return j_el * (e * e_ref / s + 0.5 * lr * lr * s / (e * e_ref))


def test_j_max_uses_the_monotonic_curve_not_the_cyclic_one():
    # a cyclically softening material: cyclic K' = 700 (σ'_y = 275 MPa) and a monotonic curve
    # with proof stress σ_y = 350 MPa; at S_max = 330 MPa on an infinite plate (S_L = σ_y)
    mono = StressStrainCurve(350.0 / 0.002**0.1, 0.1)
    m = Material(200e3, 0.3, 350.0, 500.0, StressStrainCurve(700.0, 0.15), mono, 200.0)
    g = make_geometry("center-crack-infinite-plate", 2.0)
    s = 330.0
    j_el = (s * math.sqrt(math.pi * 2.0)) ** 2 / (200e3 / 0.91)
    hand = _ainsworth_peak_by_hand(j_el, s, 350.0, 200e3, mono.strength_coefficient, 0.1)
    cyclic = _ainsworth_peak_by_hand(j_el, s, 350.0, 200e3, 700.0, 0.15)
    assert abs(cyclic / hand - 1) > 0.5
    assert J.j_max(g, m, 2.0, s) == pytest.approx(hand, rel=1e-9)
    # Option 2 is built from the same monotonic curve: f = (J_el/J)^½ at L_r = S/σ_y
    assert F.fad_option2(s / 350.0, m) == pytest.approx(math.sqrt(j_el / hand), rel=1e-9)
    # without a monotonic curve, the cyclic one
    m2 = Material(200e3, 0.3, 350.0, 500.0, StressStrainCurve(700.0, 0.15), None, 200.0)
    assert J.j_max(g, m2, 2.0, s) == pytest.approx(cyclic, rel=1e-9)


def test_option1_curve_by_hand_and_cut_off():
    # (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)), R6 Rev. 3 / BS 7910:1999 level 2A (from memory)
    for lr in (0.2, 0.8, 1.1):
        hand = (1 - 0.14 * lr**2) * (0.3 + 0.7 * math.exp(-0.65 * lr**6))
        assert F.fad_option1(lr, lr_max=1.15) == pytest.approx(hand, rel=1e-14)
    assert F.fad_option1(1.15, lr_max=1.15) > 0.0
    assert F.fad_option1(1.1501, lr_max=1.15) == 0.0


def test_plastic_fraction_near_full_opening_by_hand():
    # f_pl = 1 − (1+n')x + n'x^(1+1/n'), x = 1 − U, just below U = 1 and just above U = 0
    for u in (0.9995, 0.99, 0.0005):
        x = 1 - u
        hand = 1 - 1.15 * x + 0.15 * x ** (1 + 1 / 0.15)
        assert J.plastic_fraction(u, 0.15) == pytest.approx(hand, rel=1e-12, abs=1e-300)


def test_shape_small_crack_without_a_primary_range_is_elastic():
    # a K range with no nominal loop (e.g. a secondary stress only): U²ΔK²/E' (Rice 1968)
    m = mat()
    assert J.shape_small_crack_delta_j(50.0, 0.0, m, 210e3, 0.6) == pytest.approx(
        0.36 * 2500 / 210e3, rel=1e-14
    )


def test_option2_curve_is_cut_off_just_beyond_lr_max():
    # R6 / BS 7910: f(L_r) = 0 only for L_r > L_r,max; at L_r,max it is the curve's value
    mono = StressStrainCurve(350.0 / 0.002**0.1, 0.1)
    m = Material(200e3, 0.3, 350.0, 500.0, StressStrainCurve(700.0, 0.15), mono, 200.0)
    lr = m.lr_max
    s = lr * 350.0
    er = s / 200e3 + (s / mono.strength_coefficient) ** 10
    hand = (200e3 * er / s + 0.5 * lr**2 * s / (200e3 * er)) ** -0.5
    assert F.fad_option2(lr, m) == pytest.approx(hand, rel=1e-12)
    assert F.fad_option2(lr * (1 + 1e-9), m) == 0.0
    assert F.fad_option2(0.0, m) == 1.0
