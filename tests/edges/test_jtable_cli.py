"""``cycj j-table`` and ``cycj.j_table``: files, columns, JSON keys, refusals, bad input."""

import json

import numpy as np
import pytest

from tests.helpers import case_dict, run_cli

SET = {
    "shape": "edge-crack-plate",
    "width": "40 mm",
    "thickness": "10 mm",
    "crack_length": "12 mm",
}
FE = {"crack_lengths": ["12 mm"], "nominal_stresses": ["5 MPa", "120 MPa"]}


def _write(tmp_path, fe=FE):
    from tests.edges.mutation_inputs import to_toml

    d = case_dict(geometry=SET, loading={"constant": {"max": "40 kN", "min": "0 kN"}}, fe=fe)
    d["run"] = {"criteria": ["size-limit"]}
    p = tmp_path / "set.toml"
    p.write_text(to_toml(d))
    return p


def test_j_table_command_writes_the_contract(tmp_path, capsys):
    case = _write(tmp_path)
    out = tmp_path / "jt"
    code, stdout, err = run_cli(["j-table", case, "--out", out, "--json"], capsys)
    assert code == 0, err
    names = {p.name for p in out.iterdir()}
    assert {"jtable.csv", "jtable.json", "j_vs_load.png", "dj_vs_range.png", "report.html"} <= names
    import pandas as pd

    frame = pd.read_csv(out / "jtable.csv")
    assert list(frame.columns) == [
        "a_mm",
        "load_N",
        "nominal_stress_MPa",
        "J_kJm2",
        "dJ_kJm2",
        "J_el_kJm2",
        "J_ref_kJm2",
        "domain_spread",
    ]
    np.testing.assert_allclose(frame["load_N"], frame["nominal_stress_MPa"] * 400.0)
    low = frame.iloc[0]
    # elastic limit: Tada's SE(T) K gives J = K²/E' (within 1 %)
    assert low["J_kJm2"] == pytest.approx(low["J_el_kJm2"], rel=0.01)
    info = json.loads((out / "jtable.json").read_text())
    for key in ("dofs_max", "worst_domain_spread", "seconds", "per_crack", "curve_for_J"):
        assert key in info
    assert info["per_crack"][0]["J"]["newton_iterations"]
    assert "case_sha256" in info and "provenance" in info
    assert json.loads(stdout)["rows"] == 2
    # a non-empty folder is refused without --force
    code, _, err = run_cli(["j-table", case, "--out", out, "--no-plots"], capsys)
    assert code == 2 and "not empty" in err


def test_j_table_api_counts(tmp_path):
    import cycj

    case = cycj.load_case(_write(tmp_path, fe={}))
    frame = cycj.j_table(case, sizes=[10.0], loads=2)
    assert len(frame) == 2 and frame["a_mm"].unique().tolist() == [10.0]
    s_l = case.geometry.limit_stress(10.0, case.material.yield_strength)
    np.testing.assert_allclose(frame["nominal_stress_MPa"], [0.05 * s_l, 2.0 * s_l])


@pytest.mark.parametrize(
    ("fe", "key"),
    [
        ({"crack_lengths": "12 mm"}, "fe.crack_lengths"),
        ({"loads": ["1 kN"], "nominal_stresses": ["5 MPa"]}, "fe.loads"),
        ({"refine": 9}, "fe.refine"),
        ({"mesh": 1}, "fe.mesh"),
    ],
)
def test_bad_fe_table_is_one_line_error(tmp_path, capsys, fe, key):
    code, _, err = run_cli(["check", _write(tmp_path, fe)], capsys)
    assert code == 2 and key in err


def test_shape_without_model_is_refused(tmp_path, capsys):
    from tests.edges.mutation_inputs import to_toml

    p = tmp_path / "inf.toml"
    p.write_text(to_toml(case_dict()))
    code, _, err = run_cli(["j-table", p, "--out", tmp_path / "o"], capsys)
    assert code == 2 and "geometry.shape" in err
