"""history.csv's ΔK, ΔJ_el and ΔJ_pl columns (cycj.life.split) against closed forms."""

import math

import numpy as np

from cycj.life import predict_life
from tests.helpers import make_case


def _e_prime(case):
    m = case.material
    return (
        m.elastic_modulus / (1 - m.poisson_ratio**2)
        if case.geometry.plane_strain
        else (m.elastic_modulus)
    )


def test_elastic_split_is_irwin_k_and_no_plastic_part():
    # centre crack in an infinite plate: K = S·√(πa) exactly (Irwin; Tada, Paris & Irwin),
    # ΔJ = ΔK²/E' (Rice 1968) — docs/references.md
    case = make_case()
    h = predict_life(case).history
    a = h["a_mm"].to_numpy()
    dk = 100.0 * np.sqrt(math.pi * a) / math.sqrt(1000.0)
    np.testing.assert_allclose(h["dK_MPa_sqrt_m"], dk, rtol=1e-12)
    np.testing.assert_allclose(h["dJ_el_kJm2"], (dk**2 * 1000.0) / _e_prime(case), rtol=1e-12)
    assert np.all(h["dJ_pl_kJm2"] == 0.0)
    np.testing.assert_allclose(h["dJ_el_kJm2"], h["dJ_kJm2"], rtol=1e-12)


def test_closure_scales_the_elastic_part_by_u_squared_and_parts_add_up():
    # constant closure U: ΔJ_el = U²·ΔK²/E'; the reference-stress ΔJ adds a plastic part
    case = make_case(
        loading={
            "constant": {"max": "300 MPa", "min": "30 MPa"},
            "closure": {"model": "constant", "U": 0.8},
        },
        analysis={"j_method": "reference-stress"},
        material={"growth": {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "effective"}},
    )
    h = predict_life(case).history
    dk = h["dK_MPa_sqrt_m"].to_numpy() * math.sqrt(1000.0)
    # the cycle's range, 270 MPa, on K = S·√(πa)
    np.testing.assert_allclose(dk, 270.0 * np.sqrt(math.pi * h["a_mm"].to_numpy()), rtol=1e-12)
    np.testing.assert_allclose(h["dJ_el_kJm2"], 0.64 * dk**2 / _e_prime(case), rtol=1e-12)
    assert np.all(h["dJ_pl_kJm2"] > 0)
    np.testing.assert_allclose(h["dJ_el_kJm2"] + h["dJ_pl_kJm2"], h["dJ_kJm2"], rtol=1e-9)
    assert list(h.columns[-3:]) == ["dK_MPa_sqrt_m", "dJ_el_kJm2", "dJ_pl_kJm2"]
