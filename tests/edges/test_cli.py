"""Command line: the main job writes its outputs; bad input is one line and exit status 2."""

import json
from pathlib import Path

import pytest

from cycj.cli import main

EXAMPLE = Path(__file__).parents[2] / "examples" / "lab_compact_tension.toml"


def run_cli(args, capsys):
    with pytest.raises(SystemExit) as exc:
        main(list(args))
    out = capsys.readouterr()
    return exc.value.code, out.out, out.err


def test_run_example_writes_contract_outputs(tmp_path, capsys):
    code, out, err = run_cli(["run", str(EXAMPLE), "--out", str(tmp_path / "o")], capsys)
    assert code == 0, err
    s = json.loads((tmp_path / "o" / "summary.json").read_text())
    for key in (
        "cycles_to_end",
        "end_reason",
        "end_values",
        "a_initial_mm",
        "a_end_mm",
        "critical_crack_length_mm",
        "blocks_to_end",
        "hours_to_end",
        "method",
        "j_method",
        "version",
    ):
        assert key in s
    head = (tmp_path / "o" / "history.csv").read_text().splitlines()[0]
    assert head == (
        "cycle,block,a_mm,dJ_kJm2,dJ_eq_kJm2,Jmax_kJm2,Lr,dadN_mm_per_cycle,"
        "dK_MPa_sqrt_m,dJ_el_kJm2,dJ_pl_kJm2"
    )
    html = (tmp_path / "o" / "report.html").read_text()
    assert "Caution" in html and "data:image/png;base64" in html
    assert "End by" in out


def test_json_flag(tmp_path, capsys):
    code, out, _ = run_cli(
        ["run", str(EXAMPLE), "--out", str(tmp_path / "o"), "--json", "--no-plots"], capsys
    )
    assert code == 0 and json.loads(out)["end_reason"] == "tearing"


def test_check_and_geometries(capsys):
    code, out, _ = run_cli(["check", str(EXAMPLE)], capsys)
    assert code == 0 and "ok: the case is valid" in out
    code, out, _ = run_cli(["geometries", "--json"], capsys)
    assert code == 0 and len(json.loads(out)) >= 6


def _write(tmp_path, text):
    p = tmp_path / "case.toml"
    p.write_text(text)
    return p


BAD = [
    ('elastic_modulus = "205 GPa"', 'elastic_modulus = "3 mm"', "wrong dimension"),
    ("poisson_ratio = 0.3", "poisson_ration = 0.3", "did you mean 'poisson_ratio'"),
    ('shape = "compact-tension"', 'shape = "compact-tensoin"', "did you mean"),
    ('crack_length = "15 mm"', 'crack_length = "2 mm"', "validity"),
    ('crack_length = "15 mm"', "", "missing required key"),
    ("hardening_exponent = 0.16", "hardening_exponent = 1.6", "out of range"),
    ("[geometry]", "[geometry", "not valid TOML"),
    ('closure = "none"', 'closure = "newman"', "count closure twice"),
    ('max = "14 kN"', 'max = "abc"', "cannot read the quantity"),
    ('j_method = "reference-stress"', 'j_method = "plastic"', "unknown value"),
]


@pytest.mark.parametrize("old,new,msg", BAD)
def test_bad_input_one_line_exit_2(tmp_path, capsys, old, new, msg):
    text = EXAMPLE.read_text()
    assert old in text
    p = _write(tmp_path, text.replace(old, new, 1))
    code, out, err = run_cli(["check", str(p)], capsys)
    assert code == 2
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert len(lines) == 1 and msg in lines[0] and str(p) in lines[0]
    assert "Traceback" not in err


def test_out_folder_not_overwritten(tmp_path, capsys):
    out = tmp_path / "o"
    out.mkdir()
    (out / "keep.txt").write_text("precious")
    code, _, err = run_cli(["run", str(EXAMPLE), "--out", str(out)], capsys)
    assert code == 2 and "not empty" in err
    assert (out / "keep.txt").read_text() == "precious"
