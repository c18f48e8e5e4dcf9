"""Life on a finite-element J table (j_method "finite-element"): the plumbing against exact
limits — a table with J = K²/E' gives the elastic life (Rice 1968), a table with ΔJ = g·ΔK²/E'
gives the elastic life / g^m for a Paris law without threshold — and refusals of
extrapolation."""

import numpy as np
import pytest

from cycj.case import case_from_dict
from cycj.errors import CycjInputError
from tests.helpers import case_dict

CT = {"shape": "compact-tension", "width": "50 mm", "thickness": "10 mm", "crack_length": "15 mm"}
MAT = {"growth": {"law": "paris", "C": 1e-4, "m": 1.6, "basis": "applied"}}


def _case(tmp_path, table=None, fe=None, j_method="finite-element", smax="8 kN"):
    d = case_dict(
        material=MAT,
        geometry=CT,
        loading={"constant": {"max": smax, "min": "0 kN"}},
        analysis={"j_method": j_method},
        run={"criteria": ["size-limit"], "crack_length_limit": "25 mm"},
    )
    if table is not None:
        d["analysis"]["j_table"] = table
    if fe is not None:
        d["fe"] = fe
    return case_from_dict(d, source="<test>", base=tmp_path)


def _synthetic(tmp_path, g_dj, sizes=(15.0, 20.0, 25.0), lr_top=3.0):
    import pandas as pd

    base = _case(tmp_path, j_method="elastic")
    geo, mat = base.geometry, base.material
    e_prime = mat.effective_modulus(True)
    rows = []
    for a in sizes:
        for lr in np.geomspace(0.01, lr_top, 5):
            s = lr * geo.limit_stress(a, mat.yield_strength)
            jel = (s * geo.k_over_s(a)) ** 2 / e_prime
            rows.append((a, s * 500.0, s, jel, g_dj * jel, jel, jel, 0.0))
    cols = ["a_mm", "load_N", "nominal_stress_MPa", "J_kJm2", "dJ_kJm2", "J_el_kJm2"]
    frame = pd.DataFrame(rows, columns=[*cols, "J_ref_kJm2", "domain_spread"])
    frame.to_csv(tmp_path / "jt.csv", index=False)
    return "jt.csv"


def _cycles(case):
    from cycj.life.predict import predict_life

    return predict_life(case).summary["cycles_to_end"]


@pytest.mark.parametrize("g", [1.0, 2.0])
def test_table_life_matches_elastic_limit(tmp_path, g):
    elastic = _cycles(_case(tmp_path, j_method="elastic"))
    fe_case = _case(tmp_path, table=_synthetic(tmp_path, g))
    assert fe_case.analysis.j_table.endswith("jt.csv")
    assert _cycles(fe_case) == pytest.approx(elastic / g**1.6, rel=0.005)


def test_table_must_span_the_crack_sizes(tmp_path):
    case = _case(tmp_path, table=_synthetic(tmp_path, 1.0, sizes=(15.0, 20.0)))
    with pytest.raises(CycjInputError, match="no extrapolation"):
        _cycles(case)


def test_table_must_span_the_loads(tmp_path):
    case = _case(tmp_path, table=_synthetic(tmp_path, 1.0, lr_top=0.2), smax="30 kN")
    with pytest.raises(CycjInputError, match="L_r"):
        _cycles(case)


def test_j_table_key_needs_the_finite_element_method(tmp_path):
    _synthetic(tmp_path, 1.0)
    with pytest.raises(CycjInputError, match="j_table"):
        _case(tmp_path, table="jt.csv", j_method="reference-stress")


def test_life_on_a_computed_table(tmp_path):
    # the table computed by finite elements at the run's start: between the elastic life and
    # a little below it at this moderate load (plasticity raises ΔJ)
    fe = {"crack_lengths": ["15 mm", "25 mm"], "nominal_stresses": ["1 MPa", "60 MPa"]}
    elastic = _cycles(_case(tmp_path, j_method="elastic"))
    life = _cycles(_case(tmp_path, fe=fe))
    assert 0.5 * elastic < life <= elastic * 1.02
