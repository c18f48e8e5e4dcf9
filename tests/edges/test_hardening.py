"""Regression tests for the crashes the mutation tests found, nothing-lost outputs (refusal of a
non-empty folder, Ctrl-C), and provenance in every command's JSON (issue #8)."""

import json

import numpy as np
import pytest

from cycj.errors import CycjInputError
from tests.edges import mutation_inputs as MI
from tests.helpers import run_cli


@pytest.fixture(scope="module")
def inputs(tmp_path_factory):
    d = tmp_path_factory.mktemp("inputs")
    for name, base in MI.write_bases(d).items():
        (d / name).write_text(MI.to_toml(base) if isinstance(base, dict) else base)
    return d


# ------------------------------------------------------------- crashes found, now errors
def test_history_scale_overflow_is_input_error(inputs, capsys):
    code, _, err = run_cli(["count", inputs / "history.csv", "--scale", "1e308"], capsys)
    assert code == 2 and "overflow" in err and "history.csv" in err


def test_implausible_history_value_is_input_error(tmp_path, capsys):
    p = tmp_path / "h.csv"
    p.write_text("load\n1\n1e308\n2\n")
    code, _, err = run_cli(["count", p, "--out", tmp_path / "o"], capsys)
    assert code == 2 and "not a plausible load" in err and not (tmp_path / "o").exists()


@pytest.mark.parametrize("name", ["h.csv", "pod.csv"])
def test_non_utf8_text_is_input_error(tmp_path, capsys, name):
    p = tmp_path / name
    p.write_bytes(b"a_mm,hit\n1,0\n2,\x9b1\n" if name == "pod.csv" else b"load\n1\n\x9b2\n")
    cmd = "pod" if name == "pod.csv" else "count"
    code, _, err = run_cli([cmd, p], capsys)
    assert code == 2 and "not a UTF-8 text file" in err and name in err


def test_pod_decision_outside_responses_is_input_error(inputs, capsys):
    code, _, err = run_cli(["pod", inputs / "pod_signal.csv", "--decision", "1e300"], capsys)
    assert code == 2 and "extrapolation" in err and "pod_signal.csv" in err


def test_growth_exponent_out_of_range(tmp_path, capsys):
    d = MI.mutate_dict(MI.CASE_PLAN, ("material", "growth", "from_delta_K", "m"), "replace", 300.0)
    p = tmp_path / "c.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["check", p], capsys)
    assert code == 2 and "material.growth.from_delta_K.m" in err and "out of range" in err


def test_log_spanning_less_than_a_cycle(inputs, tmp_path, capsys):
    p = tmp_path / "log.csv"
    p.write_text(MI.mutate_csv(MI.raw_log_text(), "scale_column", 0, 0, "1e-300"))
    code, _, err = run_cli(
        ["fit", p, "--specimen", inputs / "specimen.toml", "--out", tmp_path / "o"], capsys
    )
    assert code == 2 and "less than one cycle" in err


def test_implausible_cyclic_curve_in_specimen(inputs, tmp_path, capsys):
    p = tmp_path / "s.toml"
    p.write_text(MI.to_toml(MI.mutate_dict(MI.SPECIMEN, ("cyclic_curve",), "scale", 1e-4)))
    code, _, err = run_cli(
        ["fit", inputs / "log_crack.csv", "--specimen", p, "--out", tmp_path / "o", "--no-plots"],
        capsys,
    )
    assert code == 2 and "cyclic_curve" in err and "s.toml" in err


def test_k_gradient_ignores_non_positive_delta_j():
    from cycj.calibrate.fits import k_gradient

    assert np.isnan(k_gradient([1.0, 2.0, 3.0], [0.0, -1.0, 1.0]))
    assert k_gradient([1.0, 2.0, 3.0, 4.0], [1.0, 0.0, np.e**2, np.e**3]) == pytest.approx(0.5)


def test_plan_with_critical_initial_crack_is_input_error(tmp_path, capsys):
    d = MI.mutate_dict(MI.CASE_PLAN, ("loading", "constant", "max"), "scale", 1e4)
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["plan", p, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 2 and "nothing to plan" in err and not (tmp_path / "o").exists()


# ------------------------------------------------------------------------ nothing lost
COMMANDS = {
    "run": lambda d, out: ["run", d / "case_constant.toml", "--out", out],
    "count": lambda d, out: ["count", d / "history.csv", "--out", out],
    "fit": lambda d, out: [
        "fit",
        d / "log_crack.csv",
        "--specimen",
        d / "specimen.toml",
        "--out",
        out,
    ],
    "plan": lambda d, out: ["plan", d / "plan.toml", "--out", out],
    "pod": lambda d, out: ["pod", d / "pod_hit_miss.csv", "--out", out],
}


@pytest.mark.parametrize("cmd", sorted(COMMANDS))
def test_non_empty_out_refused_without_force(inputs, tmp_path, capsys, cmd):
    out = tmp_path / "out"
    out.mkdir()
    (out / "keep.txt").write_text("mine")
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--no-plots"], capsys)
    assert code == 2 and "not empty" in err and "--force" in err
    assert sorted(p.name for p in out.iterdir()) == ["keep.txt"]
    # --force replaces only a folder cycj wrote (with its manifest): the user's file stays
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--no-plots", "--force"], capsys)
    assert code == 2 and "only a folder cycj wrote" in err
    assert sorted(p.name for p in out.iterdir()) == ["keep.txt"]
    (out / "keep.txt").unlink()
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--no-plots"], capsys)
    assert code == 0, err
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--no-plots", "--force"], capsys)
    assert code == 0, err
    assert (out / ".cycj-output.json").is_file()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]  # no work folder, no lock


@pytest.mark.parametrize("cmd", sorted(COMMANDS))
def test_out_folder_holding_an_input_refused(inputs, tmp_path, capsys, cmd):
    code, _, err = run_cli([*COMMANDS[cmd](inputs, inputs), "--force", "--no-plots"], capsys)
    assert code == 2 and "contains an input" in err
    assert (inputs / "case_constant.toml").is_file()


def test_ctrl_c_from_progress_leaves_nothing(inputs, tmp_path, capsys, monkeypatch):
    """A KeyboardInterrupt raised between compiled chunks (as Ctrl-C is) leaves no output
    folder and no temporary folder, with a clear message and exit status 130."""
    import cycj.commands.run as R
    import cycj.life.predict as L

    monkeypatch.setattr(L, "CHUNK_CYCLES", 50)

    class Stop:
        def __init__(self, enabled):
            pass

        def __call__(self, cycles, a):
            raise KeyboardInterrupt

        def close(self):
            pass

    monkeypatch.setattr(R, "_Progress", Stop)
    out = tmp_path / "out"
    code, _, err = run_cli(
        ["run", inputs / "case_constant.toml", "--out", out, "--method", "cycle"], capsys
    )
    assert code == 130 and "stopped by the user" in err
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("cmd", sorted(COMMANDS))
def test_interrupt_while_writing_leaves_nothing(inputs, tmp_path, capsys, monkeypatch, cmd):
    """Ctrl-C in the middle of writing (here: at the JSON) removes the temporary folder; an
    existing output folder given with --force keeps its old content."""
    from cycj import outputs

    out = tmp_path / "out"
    with outputs.OutputDir(out) as od:  # an earlier output folder of cycj
        od.write_text("old.txt", "old")

    def boom(self, name, data):
        raise KeyboardInterrupt

    monkeypatch.setattr(outputs.OutputDir, "write_json", boom)
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--force", "--no-plots"], capsys)
    assert code == 130 and "stopped" in err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]
    assert sorted(p.name for p in out.iterdir()) == [".cycj-output.json", "old.txt"]


def test_error_while_writing_leaves_nothing(inputs, tmp_path, capsys, monkeypatch):
    from cycj import outputs

    def boom(self, name, frame, **kw):
        raise CycjInputError("disk said no", source=name)

    monkeypatch.setattr(outputs.OutputDir, "write_csv", boom)
    code, _, err = run_cli(COMMANDS["run"](inputs, tmp_path / "out"), capsys)
    assert code == 2 and "disk said no" in err
    assert list(tmp_path.iterdir()) == []


# ---------------------------------------------------------------------------- provenance
@pytest.mark.parametrize(
    "cmd,name,keys",
    [
        ("run", "summary.json", ["case_sha256"]),
        ("count", "count.json", ["history_sha256"]),
        ("fit", "fit.json", ["log_sha256", "specimen_sha256"]),
        ("plan", "plan.json", ["case_sha256"]),
        ("pod", "pod.json", ["data_sha256"]),
    ],
)
def test_provenance_in_every_json(inputs, tmp_path, capsys, cmd, name, keys):
    from cycj._version import __version__
    from cycj.outputs import sha256_of

    out = tmp_path / "out"
    code, _, err = run_cli([*COMMANDS[cmd](inputs, out), "--no-plots"], capsys)
    assert code == 0, err
    s = json.loads((out / name).read_text())
    prov = s["provenance"]
    assert prov["cycj_version"] == __version__ and prov["platform"] and "method" in prov
    for k in keys:
        assert k in s
    first = COMMANDS[cmd](inputs, out)[1]
    digests = [s[keys[0]]] if isinstance(s[keys[0]], str) else s[keys[0]]
    assert sha256_of(first) in digests
    if cmd == "plan":
        assert prov["seed"] == 7
    if cmd == "count":
        assert s["parameters"]["gate"] == 0.0 and "rainflow" in s["method"]


def test_doubtful_inputs_warn(tmp_path, capsys):
    """a/W near the solution's limit, L_r near collapse and a large plastic part are warned
    about in summary.json and in the report."""
    d = MI.mutate_dict(MI.CASE_CONSTANT, ("geometry", "crack_length"), "replace", "46.5 mm")
    d["loading"]["constant"] = {"max": "0.9 kN", "min": "0.09 kN"}
    p = tmp_path / "c.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["run", p, "--out", tmp_path / "o"], capsys)
    assert code == 0, err
    s = json.loads((tmp_path / "o" / "summary.json").read_text())
    text = " ".join(s["warnings"])
    assert "near the upper end" in text and "close to plastic collapse" in text
    html = (tmp_path / "o" / "report.html").read_text()
    assert "near the upper end" in html and "<h2>Validity</h2>" in html


def test_huge_scatter_is_input_error(tmp_path, capsys):
    """A lognormal sigma of 3000 overflowed the Monte Carlo sampling (found by the mutation
    tests); spreads are now bounded when read."""
    d = MI.mutate_dict(MI.CASE_PLAN, ("inspection", "scatter", "growth_C"), "scale", 1e4)
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["plan", p, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 2 and "inspection.scatter.growth_C.sigma" in err and "out of range" in err


@pytest.mark.parametrize("drop", ["crack_length_limit", "run"])
def test_infinite_body_needs_a_size_limit(tmp_path, capsys, drop):
    """An infinite plate without crack_length_limit built a grid up to infinity (found by the
    mutation tests); it is now an input error naming the key."""
    path = ("run", "crack_length_limit") if drop != "run" else ("run",)
    d = MI.mutate_dict(MI.CASE_PLAN, path, "delete")
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["check", p], capsys)
    assert code == 2 and "run.crack_length_limit" in err and "p.toml" in err


def test_tiny_inspection_interval_is_input_error(tmp_path, capsys):
    """An interval of 1e-300 cycles asked for an array of 1e306 inspections (found by the
    mutation tests)."""
    d = MI.mutate_dict(MI.CASE_PLAN, ("inspection", "intervals", 1), "replace", 1e-300)
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["plan", p, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 2 and "inspection.intervals" in err and "more than 2000" in err


def test_huge_crack_length_limit_is_input_error(tmp_path, capsys):
    """crack_length_limit = 1e300 mm made the block growth overflow (mutation tests)."""
    d = MI.mutate_dict(MI.CASE_PLAN, ("run", "crack_length_limit"), "replace", 1e300)
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["check", p], capsys)
    assert code == 2 and "run.crack_length_limit" in err and "out of range" in err


def test_huge_pod_spread_is_input_error(tmp_path, capsys):
    """A POD sigma of 4000 overflowed math.exp (mutation tests)."""
    d = MI.mutate_dict(MI.CASE_PLAN, ("inspection", "pod"), "scale", 1e4)
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(d))
    code, _, err = run_cli(["plan", p, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 2 and "inspection.pod.sigma" in err and "out of range" in err


def test_error_with_control_characters_stays_on_one_line(tmp_path, capsys):
    """A key holding a form feed (TOML escape) split the error over two lines (mutation
    tests)."""
    p = tmp_path / "p.toml"
    p.write_text(MI.to_toml(MI.CASE_PLAN).replace('"safety_factor"', '"safety_\\factor"'))
    code, _, err = run_cli(["plan", p, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 2 and len(err.strip().splitlines()) == 1 and "\\x0c" in err
