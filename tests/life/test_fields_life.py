"""Stress fields in the life engine: weight-function K of a profile, several load channels,
residual stress (issue: real stress fields)."""

import math

import numpy as np
import pytest

from cycj.case import case_from_dict
from cycj.errors import CycjInputError
from cycj.life import predict_life
from tests.helpers import case_dict

GEO = {"shape": "edge-crack-plate", "width": "40 mm", "thickness": "10 mm", "crack_length": "2 mm"}
RUN = {"criteria": ["size-limit"], "crack_length_limit": "20 mm"}


def _case(tmp_path=None, geometry=None, loading=None, analysis=None, material=None):
    d = case_dict(
        geometry={**GEO, **(geometry or {})},
        run=RUN,
        loading=loading or {"constant": {"max": "120 MPa", "min": "12 MPa"}},
        analysis=analysis or {"j_method": "elastic"},
    )
    if material:
        d["material"].update(material)
    if "history" in d["loading"]:
        d["loading"].pop("constant", None)
    return case_from_dict(d, base=tmp_path)


def test_uniform_profile_reproduces_shape_solution():
    # Glinka–Shen with Tada's SE(T) as reference reproduces the shape's own K (Tada 1973), so
    # the LEFM life is the same as with the edge-crack-plate formula
    plain = predict_life(_case()).summary["cycles_to_end"]
    prof = predict_life(
        _case(geometry={"stress_profile": {"kind": "polynomial", "coefficients": [1.0]}})
    ).summary["cycles_to_end"]
    assert prof == pytest.approx(plain, rel=2e-3)


def test_bending_profile_grows_slower_than_membrane():
    # a through-wall bending profile σ(1 − 2x/t) falls off with depth (BS 7910 linearisation)
    mem = predict_life(_case()).summary["cycles_to_end"]
    bend = predict_life(
        _case(geometry={"stress_profile": {"kind": "polynomial", "coefficients": [1.0, -2.0]}})
    )
    assert bend.summary["cycles_to_end"] > 1.3 * mem


def test_two_channels_with_same_profile_equal_their_sum(tmp_path):
    # superposition: channels with the same profile act as one carrying their sum
    rng = np.random.default_rng(3)
    p = 60 + 40 * rng.random(300)
    q = 20 * rng.random(300)
    np.savetxt(
        tmp_path / "h.csv",
        np.column_stack([p, q, p + q]),
        delimiter=",",
        header="p,q,total",
        comments="",
    )
    uniform = {"kind": "polynomial", "coefficients": [1.0]}
    two = _case(
        tmp_path,
        loading={
            "history": "h.csv",
            "quantity": "stress",
            "channels": [
                {"name": "p", "column": "p", "unit": "MPa", "stress_profile": uniform},
                {"name": "q", "column": "q", "unit": "MPa", "stress_profile": uniform},
            ],
        },
    )
    one = _case(
        tmp_path,
        loading={"history": "h.csv", "column": "total", "unit": "MPa"},
        geometry={"stress_profile": uniform},
    )
    n2 = predict_life(two, method="cycle").summary["cycles_to_end"]
    n1 = predict_life(one, method="cycle").summary["cycles_to_end"]
    assert n2 == pytest.approx(n1, rel=1e-9)


def test_residual_stress_raises_r_shortens_life_and_leaves_lr():
    # a tensile residual stress raises K_min and R; with closure (Newman 1984) more of the
    # range is open, so the crack grows faster (BS 7910 §7.3: secondary stress in K only);
    # L_r is from the primary load alone (R6 II.2)
    law = {"growth": {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "effective"}}
    kw = {
        "loading": {"constant": {"max": "120 MPa", "min": "12 MPa"}, "closure": "newman"},
        "analysis": {"j_method": "reference-stress"},
        "material": law,
    }
    base = predict_life(
        _case(geometry={"stress_profile": {"kind": "polynomial", "coefficients": [1.0]}}, **kw)
    )
    res = predict_life(_case(geometry={"residual_stress": {"uniform": "150 MPa"}}, **kw))
    assert res.summary["cycles_to_end"] < 0.9 * base.summary["cycles_to_end"]
    assert res.history["Lr"].iloc[0] == pytest.approx(base.history["Lr"].iloc[0], rel=1e-12)


def test_fields_refused_for_other_shapes():
    d = case_dict(
        geometry={
            "shape": "compact-tension",
            "width": "50 mm",
            "thickness": "10 mm",
            "crack_length": "15 mm",
            "residual_stress": {"uniform": "100 MPa"},
        },
        run={"crack_length_limit": "40 mm"},
    )
    with pytest.raises(CycjInputError, match="available for edge-crack-plate"):
        case_from_dict(d)


def _hole_case(jm):
    from tests.helpers import make_case

    return make_case(
        geometry={"shape": "crack-at-hole", "hole_radius": "5 mm", "crack_length": "0.1 mm"},
        loading={"constant": {"max": "220 MPa", "min": "-220 MPa"}, "compressive_part": "include"},
        analysis={"j_method": jm},
        run={"criteria": ["size-limit"], "crack_length_limit": "15 mm"},
    )


def test_notch_short_crack_uses_neuber_loop_and_tends_to_long_crack():
    # Dowling (1979): a short crack at a notch sees the notch-root loop (Neuber 1961 on the
    # Masing branch) until the long-crack ΔJ is the smaller; far from the hole the notch
    # estimate equals the plain long-crack (reference-stress) value.  At the hole the shape's
    # K holds K_t = 3, so the short crack's K is the shape's own K scaled by Δσ_N/(K_t·ΔS),
    # its plastic part (5.0/1.6)·(K/S/K_t)²·Δσ_NΔε_p/(1+n') (Dowling 1977 scaled), by hand.
    from scipy.optimize import brentq

    from cycj.life import block_loads, model_array
    from cycj.life import stepper as K

    notch, plain = _hole_case("notch"), _hole_case("reference-stress")
    loads = block_loads(notch)
    mp_n, mp_p = model_array(notch, loads=loads), model_array(plain, loads=loads)
    g = notch.geometry

    def dj(mp, a):
        return K.cycle_driving_force(loads.lmax, loads.lmin, 0, a, g.code, g.params, loads.ct, mp)[
            0
        ]

    assert dj(mp_n, 12.0) == pytest.approx(dj(mp_p, 12.0), rel=1e-12)
    a, e, kp, n, ds = 0.02, 200e3, 900.0, 0.15, 440.0
    dsig = brentq(
        lambda x: x * (x / e + 2 * (x / (2 * kp)) ** (1 / n)) - (3 * ds) ** 2 / e, 1.0, 3 * ds
    )
    dep = 2 * (dsig / (2 * kp)) ** (1 / n)
    sh = a / (a + 5.0)  # two cracks (default), Tada's fit of Bowie's F2(s), ÷ K_t = 3
    kos = math.sqrt(math.pi * a) * 0.5 * (3 - sh) * (1 + 1.243 * (1 - sh) ** 3) / 3
    root = (kos * dsig) ** 2 / (e / 0.91) + 5.0 / 1.6 * kos**2 * dsig * dep / (1 + n)
    assert dj(mp_n, a) == pytest.approx(min(root, dj(mp_p, a)), rel=1e-6)
    assert dj(mp_n, a) <= dj(mp_p, a)


def _hole_near_elastic(jm):
    from tests.helpers import make_case

    return make_case(
        geometry={"shape": "crack-at-hole", "hole_radius": "5 mm", "crack_length": "0.2 mm"},
        loading={"constant": {"max": "120 MPa", "min": "0 MPa"}},
        analysis={"j_method": jm},
        run={"criteria": ["size-limit"], "crack_length_limit": "5 mm"},
    )


def test_notch_at_a_hole_near_elastic_matches_lefm_with_the_shapes_own_k():
    # near-elastic (K_t·S_max = 360 MPa, σ'_y = 354 MPa, loop range 360 < 2σ'_y): the notch
    # estimate must give the LEFM life of the shape's own K (Bowie/Tada) within 10 %
    lefm = predict_life(_hole_near_elastic("elastic")).summary["cycles_to_end"]
    notch = predict_life(_hole_near_elastic("notch")).summary["cycles_to_end"]
    assert notch == pytest.approx(lefm, rel=0.10)


def _edge(jm, notch=True):
    from tests.helpers import make_case

    geo = {"shape": "edge-crack-plate", "width": "100 mm", "thickness": "10 mm"}
    geo["crack_length"] = "1 mm"
    if notch:
        geo["notch"] = {"kt": 2.2, "depth": "10 mm", "root_radius": "20 mm"}
    return make_case(
        geometry=geo,
        loading={"constant": {"max": "120 MPa", "min": "0 MPa"}},
        analysis={"j_method": jm},
        run={"criteria": ["toughness", "size-limit"], "crack_length_limit": "30 mm"},
    )


def test_a_notch_never_lengthens_life():
    # the same file with j_method reference-stress (the notch is then ignored) against notch:
    # the notch adds K_t at the root and its depth to the long crack (Dowling 1979)
    plain = predict_life(_edge("reference-stress")).summary["cycles_to_end"]
    notch = predict_life(_edge("notch")).summary["cycles_to_end"]
    assert notch < plain
    # and the driving force at every crack size is at least the plain one
    from cycj.jintegral import delta_j

    case = _edge("notch")
    a = np.geomspace(0.05, 30.0, 40)
    m, g = case.material, case.geometry
    assert np.all(delta_j(g, m, a, 120.0, method="notch") >= delta_j(g, m, a, 120.0) * (1 - 1e-12))


def test_notch_j_max_uses_the_same_k_as_delta_j():
    # short crack at the root: K_max = F·K_t·S_max√(πa)-like (shape's K × Δσ_N/ΔS), so
    # J_el at peak = (K_max·Δσ_N/ΔS)²/E'; long crack: the shape's K at a + D (Tada's SE(T)
    # factor evaluated here by hand)
    from scipy.optimize import brentq

    from cycj.life import block_loads, model_array
    from cycj.life import stepper as K

    case = _edge("notch")
    loads = block_loads(case)
    mp = model_array(case, loads=loads)
    g = case.geometry
    e, kp, n, ep = 200e3, 900.0, 0.15, 200e3 / 0.91

    def tada(a, w=100.0):
        x = math.pi * a / (2 * w)
        al = a / w
        f = math.sqrt(math.tan(x) / x) * (0.752 + 2.02 * al + 0.37 * (1 - math.sin(x)) ** 3)
        return math.sqrt(math.pi * a) * f / math.cos(x)

    out = K.cycle_driving_force(loads.lmax, loads.lmin, 0, 0.05, g.code, g.params, loads.ct, mp)
    dsig = brentq(
        lambda x: x * (x / e + 2 * (x / (2 * kp)) ** (1 / n)) - (2.2 * 120) ** 2 / e, 1.0, 264.0
    )
    assert out[3] == pytest.approx((120 * tada(0.05) * dsig / 120) ** 2 / ep, rel=1e-9)
    out = K.cycle_driving_force(loads.lmax, loads.lmin, 0, 15.0, g.code, g.params, loads.ct, mp)
    assert out[3] == pytest.approx((120 * tada(25.0)) ** 2 / ep, rel=1e-9)


def _surface(geometry=None, **kw):
    from tests.helpers import make_case

    geo = {
        "shape": "surface-crack-plate",
        "width": "200 mm",
        "thickness": "20 mm",
        "crack_length": "2 mm",
        "half_length": "4 mm",
        **(geometry or {}),
    }
    return make_case(
        geometry=geo,
        loading={"constant": {"max": "150 MPa", "min": "0 MPa"}},
        run={"criteria": ["size-limit"], "crack_length_limit": "100 mm"},
        **kw,
    )


def test_surface_crack_uniform_profile_reproduces_newman_raju_life():
    # Shen & Glinka (1991) weight functions use Newman–Raju tension and bending as references,
    # so a uniform profile gives the shape's own K at both points and the same LEFM life
    plain = predict_life(_surface()).summary
    prof = predict_life(
        _surface(geometry={"stress_profile": {"kind": "polynomial", "coefficients": [1.0]}})
    ).summary
    assert prof["end_reason"] == plain["end_reason"] == "leak"
    assert prof["cycles_to_end"] == pytest.approx(plain["cycles_to_end"], rel=5e-3)


def test_surface_crack_bending_profile_matches_bending_ratio():
    # a linear profile σ(1 − 2x/t)·… equals membrane + bending (BS 7910 linearisation): the
    # profile [1 + β, −2β] is P_m = 1, P_b = β, as bending_ratio = β in the Newman–Raju shape
    beta = 0.5
    shape = predict_life(_surface(geometry={"bending_ratio": beta})).summary
    prof = predict_life(
        _surface(
            geometry={
                "stress_profile": {"kind": "polynomial", "coefficients": [1.0 + beta, -2.0 * beta]}
            }
        )
    ).summary
    assert prof["cycles_to_end"] == pytest.approx(shape["cycles_to_end"], rel=1e-2)


def test_secondary_channel_adds_to_k_not_to_lr(tmp_path):
    # R6 / BS 7910: a secondary (e.g. thermal) stress enters K (and ρ) but never L_r
    rng = np.random.default_rng(4)
    p = 60 + 40 * rng.random(200)
    q = 30 * rng.random(200)
    np.savetxt(
        tmp_path / "h.csv", np.column_stack([p, q]), delimiter=",", header="p,q", comments=""
    )
    bend = {"kind": "polynomial", "coefficients": [1.0, -2.0]}
    uniform = {"kind": "polynomial", "coefficients": [1.0]}

    def run(secondary):
        chans = [{"name": "p", "column": "p", "unit": "MPa", "stress_profile": uniform}]
        if secondary is not None:
            chans.append(
                {
                    "name": "q",
                    "column": "q",
                    "unit": "MPa",
                    "stress_profile": bend,
                    "secondary": secondary,
                }
            )
        return predict_life(
            _case(
                tmp_path,
                loading={"history": "h.csv", "channels": chans},
                analysis={"j_method": "reference-stress"},
            ),
            method="cycle",
        )

    alone, sec, prim = run(None), run(True), run(False)
    assert sec.summary["cycles_to_end"] < alone.summary["cycles_to_end"]
    assert sec.history["Lr"].iloc[0] == pytest.approx(alone.history["Lr"].iloc[0], rel=1e-9)
    assert prim.history["Lr"].iloc[0] > alone.history["Lr"].iloc[0]
