"""Examples as tests: every command line in the README's bash blocks and its Python block run,
every file in ``examples/`` is used by a command here (or in test_examples.py), and the example
generators reproduce the bundled data.  Commands run in-process (compiled kernels stay loaded);
paths under ``out/`` (where the README's commands write) are moved into a temporary folder."""

import importlib.util
import json
import re
import shlex
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from tests.helpers import run_cli

ROOT = Path(__file__).parents[2]
EXAMPLES = ROOT / "examples"


def readme_blocks(full: bool = False) -> list[list[list[str]]]:
    """The ``cycj ...`` command lines of each fenced bash block of the README (install steps
    skipped), as argument lists without the program (``full``: with it)."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    out = []
    for block in re.findall(r"```bash\n(.*?)```", text, flags=re.S):
        cmds = []
        for line in block.replace("\\\n", " ").splitlines():
            for part in line.split("&&"):
                words = shlex.split(part.strip(), comments=True)
                if words and Path(words[0]).name == "cycj":
                    cmds.append(words if full else words[1:])
        if cmds:
            out.append(cmds)
    return out


def readme_commands() -> list[list[str]]:
    return [c for block in readme_blocks() for c in block]


def _redirect_out(args, tmp_path):
    """Paths under ``out/`` (and the demo's folder) moved into ``tmp_path``."""
    args = [str(tmp_path / a[4:]) if a.startswith("out/") else a for a in args]
    if args and args[0] == "demo":
        args = ["demo", str(tmp_path / "demo"), *[a for a in args[2:] if a.startswith("--")]]
    return args


def test_readme_has_commands():
    cmds = readme_commands()
    for name in ("run", "demo", "new", "check", "count", "fit", "plan", "pod"):
        assert any(c[0] == name for c in cmds), name
    assert any(c[0] == "run" and len([a for a in c if a.endswith(".toml")]) > 1 for c in cmds)


def test_readme_commands_are_runnable_as_written():
    """After the two set-up commands cycj is .venv/bin/cycj (a bare cycj is not on the path),
    and every command writes under out/ (or the demo's folder), never beside the inputs."""
    for block in readme_blocks(full=True):
        for words in block:
            assert words[0] == ".venv/bin/cycj", words
            if words[1] not in ("demo", "check"):
                assert "--out" in words and words[words.index("--out") + 1].startswith("out/")


@pytest.mark.parametrize(
    "block", range(len(readme_blocks())), ids=lambda i: " | ".join(readme_blocks()[i][0][:2])
)
def test_readme_block_runs(block, tmp_path, capsys, monkeypatch):
    """Each bash block of the README, its commands in order (a later one may read what an
    earlier one wrote)."""
    monkeypatch.chdir(ROOT)
    for args in readme_blocks()[block]:
        code, out, err = run_cli(_redirect_out(args, tmp_path), capsys)
        assert code == 0, (args, err)
        assert out.strip()


def test_readme_python_block_runs(monkeypatch):
    monkeypatch.chdir(ROOT)
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    block = re.findall(r"```python\n(.*?)```", text, flags=re.S)[0]
    scope = {"values": np.array([0.0, 10.0, 2.0, 8.0, 1.0, 9.0, 0.0])}
    exec(compile(block, "README.md", "exec"), scope)
    assert scope["res"].summary["end_reason"] and len(scope["cycles"])


# ------------------------------------------------------------------------------ examples
EXAMPLE_COMMANDS = {
    "plan": ["plan", "examples/plate_inspection.toml", "--no-plots"],
    "fit-two-R": [
        "fit",
        "examples/lab_log_ct_r01.csv",
        "examples/lab_log_ct_r05.csv",
        "--specimen",
        "examples/lab_specimen_ct.toml",
        "--no-plots",
    ],
    "fit-shedding": [
        "fit",
        "examples/lab_log_ct_shedding.csv",
        "--specimen",
        "examples/lab_specimen_ct.toml",
        "--no-plots",
    ],
    "pod-hit-miss": ["pod", "examples/pod_hit_miss.csv"],
    "pod-signal": ["pod", "examples/pod_signal_response.csv"],
    "count-crane": [
        "count",
        "loadspectra/crane_duty.csv",
        "--column",
        "load",
        "--unit",
        "kN",
        "--no-plots",
    ],
}
#: examples run by tests/edges/test_examples.py (predict_life, cycle stepper and block mode)
from tests.edges.test_examples import LIFE_EXAMPLES as _BLOCK_EXAMPLES  # noqa: E402
from tests.edges.test_examples import REACH_EXAMPLES  # noqa: E402

LIFE_EXAMPLES = (*_BLOCK_EXAMPLES, *(name for name, _ in REACH_EXAMPLES))
#: data read by the life examples (run with them)
LIFE_DATA = ("lug_table.csv", "pipe_startstop_channels.csv")
GENERATORS = ("make_lab_logs.py", "make_pipe_channels.py")
#: a ΔJ case and its ΔK twin, run as a fleet; the API tour in notebook form
FLEET = ("examples/lab_compact_tension.toml", "examples/lab_compact_tension_lefm.toml")
TOUR = "api_tour.py"


@pytest.mark.parametrize("name", sorted(EXAMPLE_COMMANDS))
def test_example_command_runs(name, tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(ROOT)
    out = tmp_path / "out"
    code, _, err = run_cli([*EXAMPLE_COMMANDS[name], "--out", out, "--json"], capsys)
    assert code == 0, err
    assert [p for p in out.iterdir() if p.suffix == ".json"]


@pytest.mark.parametrize("name", LIFE_EXAMPLES[:1])
def test_life_example_through_the_cli(name, tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(ROOT)
    code, out, err = run_cli(
        ["run", f"examples/{name}", "--out", tmp_path / "o", "--json", "--no-plots"], capsys
    )
    assert code == 0, err
    assert json.loads(out)["end_reason"]


def test_every_example_file_is_used():
    used = " ".join(" ".join(c) for c in [*EXAMPLE_COMMANDS.values(), FLEET])
    for p in EXAMPLES.iterdir():
        assert (
            f"examples/{p.name}" in used
            or p.name in LIFE_EXAMPLES
            or p.name in GENERATORS
            or p.name in LIFE_DATA
            or p.name == TOUR
        ), f"{p.name} is not run by any test"


def test_fleet_puts_the_delta_k_and_delta_j_answers_side_by_side(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(ROOT)
    code, out, err = run_cli(["run", *FLEET, "--out", tmp_path / "fleet"], capsys)
    assert code == 0, err
    table = pd.read_csv(tmp_path / "fleet" / "fleet.csv")
    assert sorted(table["j_method"]) == ["elastic", "reference-stress"]
    assert table["error"].isna().all() and (table["cycles_to_end"] > 0).all()
    assert "elastic" in out


def test_api_tour_runs(monkeypatch, capsys):
    """examples/api_tour.py (notebook form, # %% cells) runs end to end as a script."""
    import runpy

    monkeypatch.chdir(ROOT)
    text = (EXAMPLES / TOUR).read_text(encoding="utf-8")
    assert text.count("# %%") >= 6
    for name in ("load_case", "predict_life", "count_cycles", "fit_logs", "plan_inspections"):
        assert f"cycj.{name}(" in text, name
    assert "cycj.j_table(" in text
    runpy.run_path(str(EXAMPLES / TOUR), run_name="__main__")
    out = capsys.readouterr().out
    assert "ends by" in out and "C = " in out and "deterministic interval" in out


def _load(path: Path):
    spec = importlib.util.spec_from_file_location(path.stem, path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def test_lab_log_generator_reproduces_the_bundled_logs(tmp_path, capsys):
    """examples/make_lab_logs.py (seeded) writes the same logs as those bundled."""
    mod = _load(EXAMPLES / "make_lab_logs.py")
    (tmp_path / "lab_specimen_ct.toml").write_text((EXAMPLES / "lab_specimen_ct.toml").read_text())
    mod.HERE = tmp_path
    mod.main()
    for name in ("lab_log_ct_r01.csv", "lab_log_ct_r05.csv", "lab_log_ct_shedding.csv"):
        new, old = pd.read_csv(tmp_path / name), pd.read_csv(EXAMPLES / name)
        assert list(new.columns) == list(old.columns) and new.shape == old.shape
        np.testing.assert_allclose(new.to_numpy(float), old.to_numpy(float), rtol=1e-6, atol=2e-5)


def test_pipe_channel_generator_reproduces_the_bundled_history(tmp_path):
    """examples/make_pipe_channels.py (seeded) gives the bundled two-channel history."""
    mod = _load(EXAMPLES / "make_pipe_channels.py")
    p, t = mod.make()
    old = pd.read_csv(EXAMPLES / "pipe_startstop_channels.csv", comment="#")
    np.testing.assert_allclose(old["pressure_MPa"], p, atol=1e-3)
    np.testing.assert_allclose(old["thermal_bore_MPa"], t, atol=1e-3)


# --------------------------------------------------------------------------------- demo
def test_demo_refuses_a_non_empty_folder(tmp_path, capsys):
    (tmp_path / "d").mkdir()
    (tmp_path / "d" / "x").write_text("mine")
    code, _, err = run_cli(["demo", tmp_path / "d"], capsys)
    assert code == 2 and "--force" in err
    assert (tmp_path / "d" / "x").read_text() == "mine"


def test_demo_scenario_inputs_are_valid(tmp_path):
    """The demo's generated inputs read cleanly (the full demo runs as a README command)."""
    from cycj.calibrate.specimen import read_specimen
    from cycj.case import case_from_dict
    from cycj.demo import case_text, write_inputs

    paths = write_inputs(tmp_path)
    read_specimen(paths["specimen"])
    import tomllib

    raw = tomllib.loads(
        case_text('growth = { law = "paris", C = 8e-5, m = 1.45, basis = "effective" }')
    )
    case = case_from_dict(raw, source="demo", base=tmp_path)
    assert case.inspection is not None and case.loading.history.is_file()
