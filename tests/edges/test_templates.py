"""``cycj new``: the starting template of every shape passes ``cycj check`` and runs; files are
never overwritten without --force, and never a file cycj new did not write.  And the one
output-folder rule of every command (out/<command>-<stem>)."""

import json
import shutil
from pathlib import Path

import pytest

from tests.helpers import run_cli

ROOT = Path(__file__).parents[2]


def _shapes():
    from cycj.geometry import SHAPES

    return list(SHAPES)


@pytest.mark.parametrize("shape", _shapes())
def test_template_of_each_shape_checks_and_runs(shape, tmp_path, capsys):
    case = tmp_path / f"{shape}.toml"
    code, out, err = run_cli(["new", shape, "--out", case], capsys)
    assert code == 0, err
    text = case.read_text(encoding="utf-8")
    assert f'shape = "{shape}"' in text and "# " in text
    code, out, err = run_cli(["check", case], capsys)
    assert code == 0 and "ok: the case is valid" in out, err
    code, out, err = run_cli(
        ["run", case, "--out", tmp_path / "o", "--no-plots", "--json"],
        capsys,
    )
    assert code == 0, err
    s = json.loads(out)
    assert s["cycles_to_end"] > 0 and s["end_reason"]


def test_template_lists_every_declared_key_of_its_sections(tmp_path):
    """Generated from the schema: each key of [material], [loading], [analysis], [run] and
    [report] appears (set or commented out) in the template."""
    from cycj import schema
    from cycj.schema.template import template

    text = template("compact-tension", "plan")
    for path in ("material", "loading", "analysis", "run", "report", "inspection"):
        for key in schema.section("case", path).names:
            assert f"{key} = " in text or f"{key}: " in text, f"{path}.{key}"


def test_plan_template_validates_its_inspection_table(tmp_path, capsys):
    case = tmp_path / "p.toml"
    assert run_cli(["new", "edge-crack-plate", "--job", "plan", "--out", case], capsys)[0] == 0
    code, out, err = run_cli(["check", case], capsys)
    assert code == 0 and "[inspection]" in out, err


def test_fit_template_is_a_valid_specimen_file(tmp_path, capsys):
    from cycj.calibrate.specimen import read_specimen

    spec = tmp_path / "s.toml"
    assert run_cli(["new", "compact-tension", "--job", "fit", "--out", spec], capsys)[0] == 0
    assert read_specimen(spec).shape == "compact-tension"
    code, _, err = run_cli(["new", "tabulated", "--job", "fit", "--out", spec], capsys)
    assert code == 2 and "specimen shapes" in err


def test_new_never_overwrites_without_force_nor_a_file_it_did_not_write(tmp_path, capsys):
    case = tmp_path / "c.toml"
    assert run_cli(["new", "compact-tension", "--out", case], capsys)[0] == 0
    first = case.read_text(encoding="utf-8")
    code, _, err = run_cli(["new", "three-point-bend", "--out", case], capsys)
    assert code == 2 and "--force" in err and case.read_text(encoding="utf-8") == first
    assert run_cli(["new", "three-point-bend", "--out", case, "--force"], capsys)[0] == 0
    assert "three-point-bend" in case.read_text(encoding="utf-8")
    mine = tmp_path / "mine.toml"
    shutil.copy(ROOT / "examples" / "lab_compact_tension.toml", mine)
    before = mine.read_bytes()
    code, _, err = run_cli(["new", "compact-tension", "--out", mine, "--force"], capsys)
    assert code == 2 and "never replaced" in err and mine.read_bytes() == before
    code, _, err = run_cli(["new", "compact", "--out", tmp_path / "x.toml"], capsys)
    assert code == 2 and "did you mean 'compact-tension'" in err
    assert not (tmp_path / "x.toml").exists()


def test_tabulated_template_writes_its_table_and_refuses_a_foreign_one(tmp_path, capsys):
    case = tmp_path / "lug.toml"
    (tmp_path / "lug_table.csv").write_text("a_over_W,F,limit_load_factor\n", encoding="utf-8")
    code, _, err = run_cli(["new", "tabulated", "--out", case, "--force"], capsys)
    assert code == 2 and "lug_table.csv" in err and not case.exists()
    (tmp_path / "lug_table.csv").unlink()
    assert run_cli(["new", "tabulated", "--out", case], capsys)[0] == 0
    assert (tmp_path / "lug_table.csv").is_file()


# --------------------------------------------------------------- output-folder defaults
def test_default_out_is_one_rule():
    from cycj.outputs import default_out

    assert default_out("run", "examples/crane_edge_crack.toml") == Path("out/run-crane_edge_crack")
    assert default_out("fit", "a/b/log1.csv") == Path("out/fit-log1")
    assert default_out("j-table", "x.toml") == Path("out/j-table-x")
    assert default_out("run", None) == Path("out/run-fleet")
    assert default_out("plan", "x.toml", "mine") == Path("mine")


def test_every_writing_command_states_the_rule_in_its_help(capsys):
    for cmd in ("run", "plan", "j-table", "fit", "count", "pod"):
        code, out, _ = run_cli([cmd, "--help"], capsys)
        assert code == 0 and f"out/{cmd}-" in " ".join(out.split()), cmd


def test_run_without_out_writes_out_run_stem(tmp_path, capsys, monkeypatch):
    case = tmp_path / "inputs" / "plate.toml"
    case.parent.mkdir()
    assert run_cli(["new", "center-crack-plate", "--out", case], capsys)[0] == 0
    monkeypatch.chdir(tmp_path)
    code, out, err = run_cli(["run", case, "--no-plots"], capsys)
    assert code == 0, err
    assert (tmp_path / "out" / "run-plate" / "summary.json").is_file()
    assert "out/run-plate" in out
    assert sorted(p.name for p in case.parent.iterdir()) == ["plate.toml"]
