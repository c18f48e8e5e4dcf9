"""The life engine against closed forms, independent integrations and its own invariants."""

import math

import numpy as np
import pytest
from scipy import integrate

from cycj.life import predict_life
from tests.helpers import make_case

BS7910 = {
    "law": "paris",
    "basis": "applied",
    "from_delta_K": {"C": 1.648e-11, "m": 3.0, "rate_unit": "m", "driving_unit": "MPa*m**0.5"},
}


def paris_closed_form(c_k, m, ds, a0, af, y=1.0):
    """∫ da / (C (YΔσ√(πa))^m), m ≠ 2 (Anderson, Fracture Mechanics 3rd ed. Eq. 10.9)."""
    return (a0 ** (1 - m / 2) - af ** (1 - m / 2)) / (
        c_k * (m / 2 - 1) * (y * ds * math.sqrt(math.pi)) ** m
    )


@pytest.mark.parametrize("method", ["cycle", "block"])
def test_infinite_plate_closed_form_bs7910(method):
    # BS 7910:2013+A1:2015 §8 simplified law, docs/references.md R13 (from memory): Δσ = 100 MPa,
    # a = 1 → 10 mm gives N = 4.714e5 cycles; Paris closed form (Anderson 2005 Eq. 10.9)
    case = make_case(material={"growth": BS7910})
    res = predict_life(case, method=method)
    assert res.summary["end_reason"] == "size-limit"
    c_k = 1.648e-8 / math.sqrt(1000) ** 3  # mm/cycle per (MPa√mm)^3
    exact = paris_closed_form(c_k, 3.0, 100.0, 1.0, 10.0)
    assert exact == pytest.approx(4.714e5, rel=1e-3)
    assert res.summary["cycles_to_end"] == pytest.approx(exact, rel=5e-3)


def test_delta_k_law_in_other_units_same_life():
    # BS 7910:2013 §8: A = 5.21e-13 mm/cycle with ΔK in N·mm^-3/2 is the same law
    law = {
        "law": "paris",
        "from_delta_K": {"C": 5.21e-13, "m": 3.0, "rate_unit": "mm", "driving_unit": "N*mm**-1.5"},
    }
    n1 = predict_life(make_case(material={"growth": law})).summary["cycles_to_end"]
    n2 = predict_life(make_case(material={"growth": BS7910})).summary["cycles_to_end"]
    assert n1 == pytest.approx(n2, rel=2e-3)


def _ct_case(**kw):
    geo = {
        "shape": "compact-tension",
        "width": "50 mm",
        "thickness": "12.5 mm",
        "crack_length": "12.5 mm",
    }
    return make_case(
        geometry=geo,
        loading={"constant": {"max": "6 kN", "min": "0.6 kN"}},
        run={"crack_length_limit": "30 mm", "criteria": ["size-limit"]},
        **kw,
    )


def test_compact_tension_elastic_matches_independent_integration():
    # ASTM E399 f(a/W) (Srawley 1976) integrated with scipy, ΔJ = ΔK²/E'
    case = _ct_case()
    res = predict_life(case, method="cycle")
    w, b, e_prime = 50.0, 12.5, 200e3 / (1 - 0.09)

    def f(al):
        return (
            (2 + al)
            * (0.886 + 4.64 * al - 13.32 * al**2 + 14.72 * al**3 - 5.6 * al**4)
            / (1 - al) ** 1.5
        )

    def rate(a):
        dk = 5400.0 / (b * math.sqrt(w)) * f(a / w)
        return 1e-4 * (dk**2 / e_prime) ** 1.6

    exact = integrate.quad(lambda a: 1 / rate(a), 12.5, 30.0, limit=200)[0]
    assert res.summary["cycles_to_end"] == pytest.approx(exact, rel=5e-3)


def test_constant_closure_scales_life_by_u_power():
    # elastic ΔJ: ΔJ_eff = U²ΔJ, so N ∝ U^(−2m) exactly (Elber's effective range,
    # docs/references.md R12)
    law = {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "effective"}
    n1 = predict_life(make_case(material={"growth": law})).summary["cycles_to_end"]
    n2 = predict_life(
        make_case(material={"growth": law}, loading={"closure": {"model": "constant", "U": 0.7}})
    ).summary["cycles_to_end"]
    assert n2 / n1 == pytest.approx(0.7 ** (-2 * 1.6), rel=2e-3)


def test_constant_closure_with_plasticity_n_to_one():
    # reference stress method with n' → 1: f_pl → U², so N ∝ U^(−2m) again
    mat = {
        "growth": {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "effective"},
        "cyclic_curve": {"strength_coefficient": "1e5 MPa", "hardening_exponent": 0.9999},
    }
    kw = {"analysis": {"j_method": "reference-stress"}, "material": mat}
    n1 = predict_life(
        make_case(**kw, loading={"constant": {"max": "200 MPa", "min": "0 MPa"}})
    ).summary["cycles_to_end"]
    n2 = predict_life(
        make_case(
            **kw,
            loading={
                "constant": {"max": "200 MPa", "min": "0 MPa"},
                "closure": {"model": "constant", "U": 0.75},
            },
        )
    ).summary["cycles_to_end"]
    assert n2 / n1 == pytest.approx(0.75 ** (-3.2), rel=3e-3)


def test_larger_plastic_part_shorter_life():
    kw = {
        "analysis": {"j_method": "reference-stress"},
        "loading": {"constant": {"max": "250 MPa", "min": "0 MPa"}},
    }
    lives = []
    for k in ("1500 MPa", "900 MPa", "600 MPa"):
        c = make_case(
            material={"cyclic_curve": {"strength_coefficient": k, "hardening_exponent": 0.15}}, **kw
        )
        lives.append(predict_life(c).summary["cycles_to_end"])
    assert lives[0] > lives[1] > lives[2]


def test_threshold_gives_runout():
    law = {"law": "paris", "C": 1e-4, "m": 1.6, "threshold": "100 kJ/m^2"}
    res = predict_life(make_case(material={"growth": law}))
    assert res.summary["end_reason"] == "no-growth"
    assert res.summary["cycles_to_end"] == 1.0


def test_max_cycles_end():
    res = predict_life(make_case(run={"max_cycles": 1000, "criteria": ["size-limit"]}))
    assert res.summary["end_reason"] == "max-cycles"
    assert res.summary["cycles_to_end"] == 1000


@pytest.mark.parametrize("method", ["cycle", "block"])
def test_toughness_end(method):
    # j_method "elastic" is the LEFM comparison: J_max = K_max²/E' = J_c at
    # a = J_c·E'/(S²π) exactly (Griffith–Irwin K = S√(πa))
    case = make_case(
        material={"toughness": {"J_c": "20 kJ/m^2"}},
        run={"criteria": ["toughness"], "crack_length_limit": "1000 mm"},
    )
    res = predict_life(case, method=method)
    assert res.summary["end_reason"] == "toughness"
    e_prime = 200e3 / 0.91
    a_elastic = 20.0 * e_prime / (100.0**2 * math.pi)
    assert res.summary["critical_crack_length_mm"] == pytest.approx(a_elastic, rel=1e-9)
    assert res.summary["a_end_mm"] == pytest.approx(a_elastic, rel=2e-3)
    assert res.summary["end_values"]["J_max_kJm2"] >= 20.0


def test_toughness_end_with_plasticity_is_earlier():
    # the reference stress J_max (Ainsworth 1984) exceeds K²/E', so the crack is critical sooner
    case = make_case(
        material={"toughness": {"J_c": "20 kJ/m^2"}},
        analysis={"j_method": "reference-stress"},
        run={"criteria": ["toughness"], "crack_length_limit": "1000 mm"},
    )
    res = predict_life(case)
    a_elastic = 20.0 * (200e3 / 0.91) / (100.0**2 * math.pi)
    assert res.summary["end_reason"] == "toughness"
    assert res.summary["a_end_mm"] < a_elastic


def test_collapse_end():
    geo = {
        "shape": "center-crack-plate",
        "width": "100 mm",
        "thickness": "10 mm",
        "crack_length": "10 mm",
        "constraint": "plane-stress",
    }
    case = make_case(
        geometry=geo,
        loading={"constant": {"max": "150 kN", "min": "0 kN"}},
        run={"criteria": ["collapse"], "crack_length_limit": "45 mm"},
    )
    res = predict_life(case)
    assert res.summary["end_reason"] == "collapse"
    # net section: P = L_r,max·(W − 2a)·B·σ_y ⇒ 2a = W − P/(L_r,max·B·σ_y)
    lr_max = (350 + 500) / 700
    a_c = (100 - 150e3 / (lr_max * 10 * 350)) / 2
    assert res.summary["critical_crack_length_mm"] == pytest.approx(a_c, rel=1e-6)


def test_fad_end_before_collapse():
    geo = {
        "shape": "center-crack-plate",
        "width": "100 mm",
        "thickness": "10 mm",
        "crack_length": "10 mm",
    }
    case = make_case(
        geometry=geo,
        loading={"constant": {"max": "150 kN", "min": "0 kN"}},
        material={"toughness": {"J_c": "30 kJ/m^2"}},
        run={"criteria": ["fad", "collapse"], "crack_length_limit": "45 mm"},
    )
    res = predict_life(case)
    assert res.summary["end_reason"] == "fad"


def test_tearing_end_and_method_agreement():
    from pathlib import Path

    from cycj.case import load_case

    case = load_case(Path(__file__).parents[2] / "examples" / "lab_compact_tension.toml")
    c = predict_life(case, method="cycle").summary
    b = predict_life(case, method="block").summary
    assert c["end_reason"] == b["end_reason"] == "tearing"
    assert b["cycles_to_end"] == pytest.approx(c["cycles_to_end"], rel=5e-3)


def test_history_is_sparse_and_monotone():
    res = predict_life(make_case(), method="cycle")
    h = res.history
    assert len(h) < 1000 < res.summary["cycles_to_end"]
    assert np.all(np.diff(h["a_mm"]) >= 0) and np.all(np.diff(h["cycle"]) >= 0)
    assert list(h.columns) == [
        "cycle",
        "block",
        "a_mm",
        "dJ_kJm2",
        "dJ_eq_kJm2",
        "Jmax_kJm2",
        "Lr",
        "dadN_mm_per_cycle",
        "dK_MPa_sqrt_m",
        "dJ_el_kJm2",
        "dJ_pl_kJm2",
    ]


def test_fad_end_point_lies_on_the_curve():
    # the assessment point at the end of a FAD-ended run sits on the Option 1 curve
    # (R6 / BS 7910), and the first one inside it
    from cycj.fad import fad_option1

    geo = {
        "shape": "center-crack-plate",
        "width": "100 mm",
        "thickness": "10 mm",
        "crack_length": "10 mm",
    }
    case = make_case(
        geometry=geo,
        loading={"constant": {"max": "150 kN", "min": "0 kN"}},
        material={"toughness": {"J_c": "30 kJ/m^2"}},
        analysis={"fad": "option-1"},
        run={"criteria": ["fad", "collapse"], "crack_length_limit": "45 mm"},
    )
    res = predict_life(case)
    assert res.summary["end_reason"] == "fad"
    lr, kr = res.peak_points([res.summary["a_initial_mm"], res.summary["a_end_mm"]])
    f = fad_option1(lr, case.material.lr_max)
    assert kr[0] < f[0]
    assert kr[1] == pytest.approx(f[1], rel=2e-3)


def test_growth_curve_from_another_start():
    # the notebook helper: a–N from a chosen initial size; starting later on the same curve
    # takes the remaining cycles of the full run (same closed form, Anderson Eq. 10.9)
    from cycj.life import growth_curve

    case = make_case(material={"growth": BS7910})
    a, n = growth_curve(case)
    a2, n2 = growth_curve(case, a_start_mm=4.0)
    assert n[0] == 0 and n2[0] == 0 and a2[0] == 4.0
    assert np.all(np.diff(a) > 0)
    c_k = 1.648e-8 / math.sqrt(1000) ** 3
    assert n2[-1] == pytest.approx(paris_closed_form(c_k, 3.0, 100.0, 4.0, 10.0), rel=5e-3)


def test_criteria_tripped_together_are_all_named_collapse_first():
    # centre crack in an infinite plate: S_L = σ_y, so L_r = S_max/σ_y = 1000/350 = 2.857 by
    # hand, above L_r,max = (350 + 500)/(2·350) = 1.214 (R6 / BS 7910); J_max ≫ J_c as well
    from cycj.life.write import answer_sentence
    from tests.helpers import make_case

    case = make_case(
        loading={"constant": {"max": "1000 MPa", "min": "0 MPa"}},
        analysis={"j_method": "reference-stress"},
        run={"criteria": ["toughness", "collapse", "size-limit"], "crack_length_limit": "10 mm"},
    )
    s = predict_life(case).summary
    assert s["end_reason"] == "collapse"
    names = [r["criterion"] for r in s["end_criteria_tripped"]]
    assert names[:2] == ["collapse", "toughness"]
    first = s["end_criteria_tripped"][0]
    assert first["value"] == pytest.approx(1000 / 350, rel=1e-12)
    assert first["limit"] == pytest.approx(850 / 700, rel=1e-12)
    assert s["end_criteria_tripped"][1]["limit"] == pytest.approx(200.0)
    assert s["initially_critical"] is True
    text = answer_sentence(s)
    assert text.startswith("The initial crack (1 mm) is already critical")
    assert "collapse: L_r = 2.857 ≥ 1.214" in text and "toughness: J_max" in text


def test_single_criterion_headline_unchanged():
    from cycj.life.write import answer_sentence
    from tests.helpers import make_case

    s = predict_life(make_case()).summary
    assert s["end_reason"] == "size-limit" and not s["initially_critical"]
    assert [r["criterion"] for r in s["end_criteria_tripped"]] == ["size-limit"]
    assert answer_sentence(s).startswith("End by the crack size limit")


def test_newman_constraint_factor_is_stated_in_the_resolved_inputs():
    # Newman (1984): α = 3 in plane strain, 1 in plane stress unless the case gives α
    from tests.helpers import make_case

    g = {"shape": "center-crack-plate", "width": "100 mm", "thickness": "10 mm"}
    law = {"growth": {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "effective"}}
    for constraint, alpha in (("plane-strain", 3.0), ("plane-stress", 1.0)):
        case = make_case(
            geometry={**g, "constraint": constraint},
            loading={"closure": {"model": "newman"}},
            material=law,
        )
        closure = case.resolved()["loading"]["closure"]
        assert closure["constraint_factor_used"] == alpha
        assert "default" in closure["constraint_factor_basis"]
    case = make_case(
        geometry=g,
        loading={"closure": {"model": "newman", "constraint_factor": 2.0}},
        material=law,
    )
    assert case.resolved()["loading"]["closure"]["constraint_factor_used"] == 2.0


def test_stepper_j_max_uses_the_monotonic_curve():
    # Ainsworth (1984) at peak load with the monotonic curve (proof stress = σ_y = 350 MPa),
    # not the softer cyclic one (K' = 700): centre crack in an infinite plate, S_L = σ_y
    import math

    from cycj.life import block_loads, model_array
    from cycj.life import stepper as K
    from tests.helpers import make_case

    mono_k = 350.0 / 0.002**0.1
    case = make_case(
        material={
            "cyclic_curve": {"strength_coefficient": "700 MPa", "hardening_exponent": 0.15},
            "monotonic_curve": {"strength_coefficient": f"{mono_k} MPa", "hardening_exponent": 0.1},
        },
        loading={"constant": {"max": "330 MPa", "min": "0 MPa"}},
        analysis={"j_method": "reference-stress"},
    )
    loads = block_loads(case)
    mp = model_array(case, loads=loads)
    g = case.geometry
    out = K.cycle_driving_force(loads.lmax, loads.lmin, 0, 2.0, g.code, g.params, loads.ct, mp)
    j_el = (330.0 * math.sqrt(math.pi * 2.0)) ** 2 / (200e3 / 0.91)
    e_ref = 330.0 / 200e3 + (330.0 / mono_k) ** 10
    lr = 330.0 / 350.0
    hand = j_el * (200e3 * e_ref / 330.0 + 0.5 * lr**2 * 330.0 / (200e3 * e_ref))
    assert out[1] == pytest.approx(hand, rel=1e-9)
    assert out[3] == pytest.approx(j_el, rel=1e-12)
