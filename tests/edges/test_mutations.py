"""Bad input, everywhere: every command runs in-process on mutated copies of small valid inputs
(case files, histories, specimen files, test logs, POD data, inspection tables, options) and
must end with a valid result (exit 0) or exit status 2 with a few lines naming the file, key or
line — never a traceback, never an internal error (exit 1).

Generated with hypothesis, derandomized (fixed seeds), at least 200 inputs per command.
"""

from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, Phase, event, given, settings
from hypothesis import strategies as st

from cycj.cli import main
from tests.edges import mutation_inputs as MI

EXAMPLES = int(os.environ.get("CYCJ_MUTATION_EXAMPLES", "200"))
#: CYCJ_MUTATION_NOSHRINK=1 reports the first failure as found (faster while fixing)
PHASES = (
    [Phase.explicit, Phase.generate] if os.environ.get("CYCJ_MUTATION_NOSHRINK") else list(Phase)
)
SETTINGS = settings(
    max_examples=EXAMPLES,
    deadline=None,
    derandomize=True,
    database=None,
    phases=PHASES,
    suppress_health_check=[
        HealthCheck.function_scoped_fixture,
        HealthCheck.too_slow,
        HealthCheck.data_too_large,
    ],
)


class _Bases(tuple):
    def __repr__(self):
        return "<base inputs>"


@pytest.fixture(scope="module")
def bases(tmp_path_factory):
    root = tmp_path_factory.mktemp("mutations")
    return _Bases((root, MI.write_bases(root / "bases")))


def _materialise(root: Path, bases: dict, names, mutated: str | None, payload: bytes | None):
    """A fresh folder with the named base files, ``mutated`` replaced by ``payload``."""
    d = Path(tempfile.mkdtemp(dir=root))
    for name in names:
        base = bases[name]
        text = MI.to_toml(base) if isinstance(base, dict) else base
        data = payload if name == mutated else text.encode("utf-8")
        (d / name).write_bytes(data)
    return d


def _run(args, capsys):
    try:
        main([str(a) for a in args])
        code = 0
    except SystemExit as exc:
        code = exc.code if isinstance(exc.code, int) else 1
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def _check_outcome(code, err, args, what, workdir: Path, out_json: str | None = None):
    event(f"exit {code}")
    msg = f"{what}\nargs: {args}\nstderr: {err[-2000:]}"
    assert code in (0, 2), msg
    assert "Traceback" not in err and "internal error" not in err, msg
    if code == 2:
        lines = [ln for ln in err.splitlines() if ln.strip()]
        assert 1 <= len(lines) <= 3, msg
        assert "error" in lines[-1], msg
        # names the file, a key, a line or an option
        names = [p.name for p in workdir.iterdir()]
        assert any(n in err for n in names) or "[" in err or "--" in err or "line" in err, msg
    leftovers = [p.name for p in workdir.iterdir() if ".tmp-" in p.name or ".old-" in p.name]
    assert not leftovers, msg + f"\nleft over: {leftovers}"
    out = workdir / "out"
    if code == 0 and out_json is not None:
        assert (out / out_json).is_file(), msg
    if code == 2:
        assert not out.exists() or not any(out.iterdir()), msg


# ------------------------------------------------------------------------------ strategies
def toml_mutation(base: dict):
    paths = MI.leaf_paths(base)
    bad = st.tuples(
        st.sampled_from(paths),
        st.sampled_from(["delete", "replace", "replace", "replace", "unknown"]),
        st.sampled_from(MI.BAD_VALUES),
    )
    extreme = st.tuples(st.sampled_from(paths), st.just("scale"), st.sampled_from(MI.SCALES))
    one = st.one_of(bad, extreme)
    structured = st.lists(one, min_size=1, max_size=2).map(lambda ms: _apply_toml(base, ms))
    text = st.tuples(
        st.sampled_from(MI.TEXT_KINDS), st.integers(0, 10**6), st.binary(min_size=1, max_size=48)
    ).map(lambda t: (f"text {t[0]}@{t[1]}", MI.mutate_text(MI.to_toml(base), *t)))
    return st.one_of(structured, structured, structured, text)


def _apply_toml(base, ms):
    d = base
    for path, action, value in ms:
        try:
            d = MI.mutate_dict(d, path, action, value)
        except (KeyError, IndexError, TypeError):
            pass  # an earlier mutation removed the path
    return f"toml {ms!r}", MI.to_toml(d).encode("utf-8")


def csv_mutation(text: str):
    structured = st.tuples(
        st.sampled_from(MI.CSV_KINDS),
        st.integers(0, 10**6),
        st.integers(0, 5),
        st.sampled_from(MI.BAD_CELLS),
    ).map(lambda t: (f"csv {t!r}", MI.mutate_csv(text, *t).encode("utf-8")))
    raw = st.tuples(
        st.sampled_from(MI.TEXT_KINDS), st.integers(0, 10**6), st.binary(min_size=1, max_size=48)
    ).map(lambda t: (f"text {t[0]}@{t[1]}", MI.mutate_text(text, *t)))
    return st.one_of(structured, structured, raw)


def _mutated_file(data, bases, names):
    """Draw which file of ``names`` to mutate and how."""
    name = data.draw(st.sampled_from(names), label="file")
    base = bases[name]
    strat = toml_mutation(base) if isinstance(base, dict) else csv_mutation(base)
    what, payload = data.draw(strat, label="mutation")
    return name, f"{name}: {what}", payload


# ------------------------------------------------------------------------------ commands
@SETTINGS
@given(data=st.data())
def test_check_never_crashes(bases, capsys, data):
    root, b = bases
    name, what, payload = _mutated_file(
        data, b, ["case_constant.toml", "case_history.toml", "plan.toml", "history.csv"]
    )
    case = name if name.endswith(".toml") else "case_history.toml"
    d = _materialise(root, b, [case, "history.csv"], name, payload)
    args = ["check", d / case, *data.draw(st.sampled_from([[], ["--json"]]))]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, what, d)
    shutil.rmtree(d)


@SETTINGS
@given(data=st.data())
def test_run_never_crashes(bases, capsys, data):
    root, b = bases
    name, what, payload = _mutated_file(
        data, b, ["case_constant.toml", "case_history.toml", "case_history.toml", "history.csv"]
    )
    case = name if name.endswith(".toml") else "case_history.toml"
    d = _materialise(root, b, [case, "history.csv"], name, payload)
    method = data.draw(st.sampled_from([[], [], ["--method", "cycle"], ["--method", "block"]]))
    args = ["run", d / case, "--out", d / "out", "--no-plots", "--json", *method]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, what, d, "summary.json")
    shutil.rmtree(d)


COUNT_OPTIONS = [
    [],
    [],
    ["--repeat"],
    ["--gate", "abc"],
    ["--gate", "-1"],
    ["--gate", "1e300"],
    ["--gate", "nan"],
    ["--gate", "5 MPa"],
    ["--gate", "5 mm"],
    ["--unit", "MPa"],
    ["--unit", "parsec"],
    ["--unit", "kN", "--gate", "2 kN"],
    ["--column", "7"],
    ["--column", "nope"],
    ["--column", "0"],
    ["--column", "-1"],
    ["--scale", "nan"],
    ["--scale", "0"],
    ["--scale", "-2"],
    ["--scale", "1e308"],
    ["--bins", "2"],
]


@SETTINGS
@given(data=st.data())
def test_count_never_crashes(bases, capsys, data):
    root, b = bases
    option = data.draw(st.sampled_from(COUNT_OPTIONS), label="option")
    if data.draw(st.booleans(), label="mutate file") or not option:
        name, what, payload = _mutated_file(data, b, ["history.csv"])
    else:
        name, what, payload = None, "", None
    d = _materialise(root, b, ["history.csv"], name, payload)
    args = ["count", d / "history.csv", "--out", d / "out", "--no-plots", "--json", *option]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, f"{what} {option}", d, "count.json")
    shutil.rmtree(d)


@SETTINGS
@given(data=st.data())
def test_fit_never_crashes(bases, capsys, data):
    root, b = bases
    log = data.draw(st.sampled_from(["log_crack.csv", "log_crack.csv", "log_raw.csv"]))
    name, what, payload = _mutated_file(data, b, [log, "specimen.toml"])
    d = _materialise(root, b, [log, "specimen.toml"], name, payload)
    method = data.draw(st.sampled_from([[], ["--method", "secant"], ["--method", "direct"]]))
    args = [
        "fit",
        d / log,
        "--specimen",
        d / "specimen.toml",
        "--out",
        d / "out",
        "--no-plots",
        "--json",
        *method,
    ]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, what, d, "fit.json")
    shutil.rmtree(d)


@SETTINGS
@given(data=st.data())
def test_plan_never_crashes(bases, capsys, data):
    root, b = bases
    name, what, payload = _mutated_file(data, b, ["plan.toml"])
    d = _materialise(root, b, ["plan.toml"], name, payload)
    args = ["plan", d / "plan.toml", "--out", d / "out", "--no-plots", "--json"]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, what, d, "plan.json")
    shutil.rmtree(d)


POD_OPTIONS = [
    [],
    [],
    [],
    ["--link", "probit"],
    ["--decision", "0"],
    ["--decision", "nan"],
    ["--decision", "1e300"],
    ["--floor", "5"],
    ["--saturation", "0.1"],
    ["--floor", "-1"],
    ["--decision", "-3"],
    ["--saturation", "inf"],
]


@SETTINGS
@given(data=st.data())
def test_pod_never_crashes(bases, capsys, data):
    root, b = bases
    option = data.draw(st.sampled_from(POD_OPTIONS), label="option")
    name, what, payload = _mutated_file(data, b, ["pod_hit_miss.csv", "pod_signal.csv"])
    d = _materialise(root, b, [name], name, payload)
    out = data.draw(st.sampled_from([[]] * 5 + [["--out", d / "out", "--no-plots"]]))
    args = ["pod", d / name, "--json", *option, *out]
    code, _, err = _run(args, capsys)
    _check_outcome(code, err, args, f"{what} {option}", d, "pod.json" if out else None)
    shutil.rmtree(d)


def test_bases_are_valid(bases, capsys):
    """Every unmutated base input gives a valid result (so mutations start from good files)."""
    root, b = bases
    d = _materialise(root, b, list(b), None, None)
    for args, js in (
        (["run", d / "case_constant.toml", "--out", d / "o1", "--no-plots"], "summary.json"),
        (["run", d / "case_history.toml", "--out", d / "o2", "--no-plots"], "summary.json"),
        (["count", d / "history.csv", "--out", d / "o3", "--no-plots"], "count.json"),
        (
            [
                "fit",
                d / "log_crack.csv",
                "--specimen",
                d / "specimen.toml",
                "--out",
                d / "o4",
                "--no-plots",
            ],
            "fit.json",
        ),
        (
            [
                "fit",
                d / "log_raw.csv",
                "--specimen",
                d / "specimen.toml",
                "--out",
                d / "o5",
                "--no-plots",
            ],
            "fit.json",
        ),
        (["plan", d / "plan.toml", "--out", d / "o6", "--no-plots"], "plan.json"),
        (["pod", d / "pod_hit_miss.csv", "--out", d / "o7", "--no-plots"], "pod.json"),
        (["pod", d / "pod_signal.csv", "--out", d / "o8", "--no-plots"], "pod.json"),
    ):
        code, _, err = _run(args, capsys)
        assert code == 0, (args, err)
        assert (Path(args[args.index("--out") + 1]) / js).is_file()
