"""Bad J tables given by the user (``[analysis] j_table``) and an unconverged finite-element
step: one line naming the file (or the load reached and why), exit status 2, nothing written."""

import numpy as np
import pytest

from tests.edges.mutation_inputs import to_toml
from tests.helpers import case_dict, run_cli

CT = {"shape": "compact-tension", "width": "50 mm", "thickness": "10 mm", "crack_length": "15 mm"}


def _rows():
    rows = []
    for a in (15.0, 20.0, 25.0):
        for s in (1.0, 10.0, 100.0):
            rows.append([a, 500 * s, s, 0.2 * s, 0.8 * s, 0.2 * s, 0.2 * s, 0.0])
    return rows


COLS = "a_mm,load_N,nominal_stress_MPa,J_kJm2,dJ_kJm2,J_el_kJm2,J_ref_kJm2,domain_spread"


def _case(tmp_path, text):
    (tmp_path / "user.csv").write_text(text)
    d = case_dict(
        geometry=CT,
        loading={"constant": {"max": "8 kN", "min": "0 kN"}},
        analysis={"j_method": "finite-element", "j_table": "user.csv"},
        run={"criteria": ["size-limit"], "crack_length_limit": "25 mm"},
    )
    p = tmp_path / "c.toml"
    p.write_text(to_toml(d))
    return p


def _csv(rows, cols=COLS):
    return cols + "\n" + "\n".join(",".join(str(v) for v in r) for r in rows) + "\n"


def _dropped_column():
    cols = COLS.replace(",dJ_kJm2", "")
    return _csv([r[:4] + r[5:] for r in _rows()], cols)


def _hole():
    rows = _rows()
    rows[4][3] = ""
    return _csv(rows)


def _not_rising():
    rows = _rows()
    rows[4][2], rows[5][2] = rows[5][2], rows[4][2]
    return _csv(rows)


@pytest.mark.parametrize(
    ("text", "words"),
    [
        (_dropped_column(), ("lacks columns dJ_kJm2",)),
        (_hole(), ("hole in column J_kJm2", "line 6")),
        (_not_rising(), ("do not increase", "a = 20")),
        ("not,a\ntable", ("lacks columns",)),
        ("", ("cannot read",)),
    ],
)
def test_bad_user_table_is_one_line_exit_2_nothing_written(tmp_path, capsys, text, words):
    case = _case(tmp_path, text)
    out = tmp_path / "out"
    code, stdout, err = run_cli(["run", case, "--out", out, "--no-plots"], capsys)
    assert code == 2, (stdout, err)
    line = err.strip()
    assert "\n" not in line and "user.csv" in line, line
    for w in words:
        assert w in line, line
    assert not out.exists()


def test_good_user_table_runs(tmp_path, capsys):
    case = _case(tmp_path, _csv(_rows()))
    code, _, err = run_cli(["run", case, "--out", tmp_path / "out", "--no-plots"], capsys)
    assert code == 0, err


def test_unconverged_step_names_the_load_and_why(monkeypatch):
    # a Newton budget of one iteration cannot reach a plastic load: the error names the
    # crack size, the nominal stress that failed, the last one reached and the reason
    import cycj.fe.solver as S
    from cycj.errors import ValidityRangeError
    from cycj.fe.table import solve_series
    from tests.physics.test_fe import W, _power_law

    real = S.solve_loads
    monkeypatch.setattr(
        "cycj.fe.table.solve_loads",
        lambda pb, loads, **kw: real(pb, loads, max_iter=1, max_halvings=1, **kw),
    )
    with pytest.raises(ValidityRangeError) as info:
        solve_series("edge-crack-plate", W, 0.5 * W, _power_law(10), np.array([5.0, 80.0]))
    msg = str(info.value)
    assert "a = 25 mm" in msg and "nominal stress 5 MPa" in msg
    assert "last converged 0 MPa" in msg and "residual" in msg
