"""Nothing the user owns is lost, every end reason is true, and inputs are read strictly.

Regression tests for the reproducers of the data-safety issue: each checks the exact outcome
(exit status 2 naming the folder or key, the user's files still present with the same hash,
the end reason and size within 1 % of the critical size …).  Invented data only.
"""

import json
import os
import subprocess
import sys
from pathlib import Path

import pandas as pd
import pytest

from cycj.outputs import LOCK_TAG, MANIFEST, TMP_TAG, OutputDir, sha256_of
from tests.helpers import run_cli

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = ROOT / "examples"


def _hashes(folder: Path) -> dict:
    return {
        p.relative_to(folder).as_posix(): sha256_of(p) for p in folder.rglob("*") if p.is_file()
    }


def _history(path: Path, n: int = 40) -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    rows = "\n".join(f"{v:g}" for _ in range(n) for v in (0.0, 20.0, 4.0, 16.0))
    path.write_text("load\n" + rows + "\n", encoding="utf-8")
    return path


def _lug(folder: Path, *, table_dir: str = ".", history: str = "h.csv", scale=True) -> Path:
    """The tabulated-lug example with its table and a history in ``folder`` (a small one of its
    own with ``scale``, else a copy of the example's)."""
    folder.mkdir(parents=True, exist_ok=True)
    (folder / table_dir).mkdir(parents=True, exist_ok=True)
    (folder / table_dir / "lug_table.csv").write_bytes((EXAMPLES / "lug_table.csv").read_bytes())
    if scale:
        _history(folder / history)
    else:
        (folder / history).write_bytes((ROOT / "loadspectra" / "suspension_arm.csv").read_bytes())
    text = (EXAMPLES / "lug_tabulated.toml").read_text(encoding="utf-8")
    text = text.replace('table = "lug_table.csv"', f'table = "{table_dir}/lug_table.csv"')
    text = text.replace('history = "../loadspectra/suspension_arm.csv"', f'history = "{history}"')
    if not scale:
        text = text.replace("scale = 6.0\n", "")
    case = folder / "lug.toml"
    case.write_text(text, encoding="utf-8")
    return case


def _ct(folder: Path, name="ct.toml", C="2.0e-4", criteria=None) -> Path:
    text = (EXAMPLES / "lab_compact_tension.toml").read_text(encoding="utf-8")
    text = text.replace("C = 2.0e-4", f"C = {C}")
    if criteria is not None:
        text = text.replace(
            'criteria = ["toughness", "tearing", "collapse", "size-limit"]',
            "criteria = [" + ", ".join(f'"{c}"' for c in criteria) + "]",
        )
    folder.mkdir(parents=True, exist_ok=True)
    p = folder / name
    p.write_text(text, encoding="utf-8")
    return p


# ----------------------------------------------------------------- item 1: nothing is lost
def test_fleet_out_holding_the_cases_is_refused(tmp_path, capsys):
    f = tmp_path / "f"
    a, b = _ct(f, "a.toml"), _ct(f, "b.toml")
    before = _hashes(f)
    code, _, err = run_cli(["run", a, b, "--out", f, "--force", "--no-plots"], capsys)
    assert code == 2 and "contains an input" in err and str(f) in err
    assert _hashes(f) == before


def test_table_of_a_tabulated_geometry_is_never_deleted(tmp_path, capsys):
    case = _lug(tmp_path / "job", table_dir="tables")
    tables = tmp_path / "job" / "tables"
    before = _hashes(tables)
    code, _, err = run_cli(["run", case, "--out", tables, "--force", "--no-plots"], capsys)
    assert code == 2 and "contains an input" in err and "lug_table.csv" in err
    assert _hashes(tables) == before


def test_plan_never_deletes_the_history(tmp_path, capsys):
    text = (EXAMPLES / "plate_inspection.toml").read_text(encoding="utf-8")
    text = text.replace(
        'constant = { max = "100 MPa", min = "0 MPa" }',
        'history = "spectra/h.csv"\ncolumn = "load"\nunit = "MPa"\nquantity = "stress"',
    )
    (tmp_path / "plate.toml").write_text(text, encoding="utf-8")
    _history(tmp_path / "spectra" / "h.csv")
    before = _hashes(tmp_path / "spectra")
    out = tmp_path / "spectra"
    code, _, err = run_cli(["plan", tmp_path / "plate.toml", "--out", out, "--force"], capsys)
    assert code == 2 and "contains an input" in err and "h.csv" in err
    assert _hashes(tmp_path / "spectra") == before


def test_demo_into_the_current_folder_is_refused(tmp_path, capsys, monkeypatch):
    (tmp_path / "mine.txt").write_text("keep me")
    monkeypatch.chdir(tmp_path)
    code, _, err = run_cli(["demo", str(tmp_path), "--force"], capsys)
    assert code == 2 and "current folder" in err and "internal error" not in err
    assert (tmp_path / "mine.txt").read_text() == "keep me"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["mine.txt"]


def test_out_dot_is_a_clear_refusal(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    case = _ct(tmp_path / "cases")
    for force in ([], ["--force"]):
        code, _, err = run_cli(["run", case, "--out", ".", "--no-plots", *force], capsys)
        assert code == 2 and "current folder" in err and "internal error" not in err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["cases"]


def test_force_replaces_only_a_folder_cycj_wrote(tmp_path, capsys):
    case = _ct(tmp_path / "cases")
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_text("mine")
    code, _, err = run_cli(["run", case, "--out", out, "--force", "--no-plots"], capsys)
    assert code == 2 and MANIFEST in err and (out / "notes.txt").read_text() == "mine"
    (out / "notes.txt").unlink()
    assert run_cli(["run", case, "--out", out, "--no-plots"], capsys)[0] == 0
    manifest = json.loads((out / MANIFEST).read_text())
    assert manifest["cycj_output"] is True and "summary.json" in manifest["files"]
    (out / "notes.txt").write_text("added later by the user")
    code, _, err = run_cli(["run", case, "--out", out, "--force", "--no-plots"], capsys)
    assert code == 2 and "did not write" in err and "notes.txt" in err
    (out / "notes.txt").unlink()
    assert run_cli(["run", case, "--out", out, "--force", "--no-plots"], capsys)[0] == 0
    assert sorted(p.name for p in tmp_path.iterdir()) == ["cases", "out"]


def test_a_second_writer_fails_clearly(tmp_path, capsys):
    case = _ct(tmp_path / "cases")
    out = tmp_path / "out"
    import platform

    lock = tmp_path / f".out{LOCK_TAG}"
    lock.write_text(json.dumps({"pid": os.getppid(), "host": platform.node()}))  # a live run
    code, _, err = run_cli(["run", case, "--out", out, "--no-plots"], capsys)
    assert code == 2 and "another cycj run" in err and not out.exists()
    # the lock of a run that was killed (its process is gone) is taken over
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()
    lock.write_text(json.dumps({"pid": dead.pid, "host": platform.node()}))
    code, _, err = run_cli(["run", case, "--out", out, "--no-plots"], capsys)
    assert code == 0, err
    assert not lock.exists()


def test_lock_held_while_writing(tmp_path):
    with OutputDir(tmp_path / "out") as od:
        od.write_text("a.txt", "a")
        with pytest.raises(Exception, match="another cycj run"), OutputDir(tmp_path / "out"):
            pass
    assert (tmp_path / "out" / "a.txt").is_file()


def test_stale_work_folders_of_killed_runs_are_removed(tmp_path, capsys):
    case = _ct(tmp_path / "cases")
    stale = tmp_path / f".out{TMP_TAG}999999-abcd"
    stale.mkdir()
    (stale / MANIFEST).write_text('{"cycj_output": true, "complete": false, "files": []}')
    (stale / "history.csv").write_text("half written")
    lookalike = tmp_path / f".out{TMP_TAG}5-user"  # the pattern but no manifest: not ours
    lookalike.mkdir()
    (lookalike / "x.txt").write_text("mine")
    assert run_cli(["run", case, "--out", tmp_path / "out", "--no-plots"], capsys)[0] == 0
    assert not stale.exists()
    assert (lookalike / "x.txt").read_text() == "mine"


def test_demo_folder_can_be_replaced_with_force(tmp_path, capsys):
    """The demo writes stages into its own folder; --force may replace all of it again."""
    code, _, err = run_cli(["demo", tmp_path / "d"], capsys)
    assert code == 0, err
    code, _, err = run_cli(["demo", tmp_path / "d", "--force"], capsys)
    assert code == 0, err


# ------------------------------------------------------------- item 5: provenance of all
def test_provenance_has_every_file_read(tmp_path, capsys):
    case = _lug(tmp_path / "job")
    out = tmp_path / "out"
    code, _, err = run_cli(["run", case, "--out", out, "--no-plots"], capsys)
    assert code == 0, err
    s = json.loads((out / "summary.json").read_text())
    job = tmp_path / "job"
    assert s["case_sha256"] == sha256_of(job / "lug.toml")
    assert s["history_sha256"] == sha256_of(job / "h.csv")
    assert s["table_sha256"] == sha256_of(job / "lug_table.csv")
    roles = {f["role"]: f["sha256"] for f in s["provenance"]["files"]}
    assert roles == {
        "case": s["case_sha256"],
        "table": s["table_sha256"],
        "history": s["history_sha256"],
    }


# ------------------------------------------------------------- item 2: true end reasons
@pytest.mark.parametrize("C", ["1", "1e3"])
@pytest.mark.parametrize("method", ["cycle", "block"])
def test_huge_growth_ends_on_the_criterion_crossed(tmp_path, capsys, C, method):
    case = _ct(tmp_path, C=C)
    out = tmp_path / "out"
    code, _, err = run_cli(["run", case, "--out", out, "--no-plots", "--method", method], capsys)
    assert code == 0, err
    s = json.loads((out / "summary.json").read_text())
    assert s["end_reason"] == s["critical_crack_criterion"] == "tearing"
    assert s["a_end_mm"] == pytest.approx(s["critical_crack_length_mm"], rel=0.01)
    h = pd.read_csv(out / "history.csv")
    assert h["a_mm"].max() <= 50.0  # the specimen is 50 mm wide


@pytest.mark.parametrize("criterion", ["toughness", "collapse", "fad", "size-limit"])
def test_each_criterion_crossed_in_one_cycle(tmp_path, capsys, criterion):
    case = _ct(tmp_path, C="1e3", criteria=[criterion])
    out = tmp_path / "out"
    assert run_cli(["run", case, "--out", out, "--no-plots"], capsys)[0] == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["end_reason"] == criterion
    assert s["a_end_mm"] == pytest.approx(s["critical_crack_length_mm"], rel=0.01)
    assert pd.read_csv(out / "history.csv")["a_mm"].max() <= 0.95 * 50.0 + 1e-9


def test_near_unit_hardening_exponent_ends_truly(tmp_path, capsys):
    case = _ct(tmp_path, C="1e3", criteria=["toughness", "size-limit"])
    text = case.read_text().replace("hardening_exponent = 0.16", "hardening_exponent = 0.95")
    case.write_text(text.replace("hardening_exponent = 0.19", "hardening_exponent = 0.95"))
    out = tmp_path / "out"
    assert run_cli(["run", case, "--out", out, "--no-plots"], capsys)[0] == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["end_reason"] in ("toughness", "size-limit") and s["end_reason"] != "no-growth"
    assert s["a_end_mm"] <= 0.95 * 50.0 + 1e-9
    if s["a_end_mm"] > s["a_initial_mm"]:
        assert s["a_end_mm"] == pytest.approx(s["critical_crack_length_mm"], rel=0.01)


def test_surface_crack_never_passes_the_wall(tmp_path, capsys):
    text = (EXAMPLES / "weld_toe_surface_crack.toml").read_text(encoding="utf-8")
    text = text.replace("C = 1.648e-11", "C = 1.648e-3")
    text = text.replace('history = "../loadspectra/', f'history = "{ROOT}/loadspectra/')
    case = tmp_path / "w.toml"
    case.write_text(text, encoding="utf-8")
    out = tmp_path / "out"
    code, _, err = run_cli(["run", case, "--out", out, "--no-plots"], capsys)
    assert code == 0, err
    s = json.loads((out / "summary.json").read_text())
    assert s["end_reason"] in ("leak", "size-limit")
    assert pd.read_csv(out / "history.csv")["a_mm"].max() <= 0.8 * 25.0 * 1.02


# ----------------------------------------------------- item 3: early ends write everything
def test_no_growth_run_writes_its_plots(tmp_path, capsys):
    case = _lug(tmp_path / "job", scale=False)
    out = tmp_path / "out"
    code, stdout, err = run_cli(["run", case, "--out", out], capsys)
    assert code == 0, err
    assert "no growth" in stdout
    for name in ("crack_growth.png", "driving_force.png", "criterion.png", "report.html"):
        assert (out / name).stat().st_size > 0


def test_immediate_end_writes_its_plots(tmp_path, capsys):
    case = _ct(tmp_path, C="1e3")
    out = tmp_path / "out"
    code, _, err = run_cli(["run", case, "--out", out], capsys)
    assert code == 0, err
    assert (out / "driving_force.png").stat().st_size > 0


# --------------------------------------------------------------- item 4: strict inputs
@pytest.mark.parametrize(
    ("old", "new", "key"),
    [
        ('width = "50 mm"', 'width = "10**10**10 mm"', "geometry.width"),
        ('width = "50 mm"', 'width = "10**400 mm"', "geometry.width"),
        ('width = "50 mm"', 'width = "50 mm # c"', "geometry.width"),
        ('width = "50 mm"', 'width = "1.5.3 mm"', "geometry.width"),
        ('J_c = "220 kJ/m^2"', 'K_c = "("', "material.toughness.K_c"),
        ('width = "50 mm"', 'width = "' + "5" * 300 + ' mm"', "geometry.width"),
    ],
)
def test_bad_quantities_are_one_line_errors(tmp_path, old, new, key):
    case = _ct(tmp_path)
    case.write_text(case.read_text().replace(old, new))
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    r = subprocess.run(
        [sys.executable, "-m", "cycj", "check", str(case)],
        capture_output=True,
        text=True,
        timeout=120,  # "10**10**10 mm" once hung here
        env=env,
    )
    assert r.returncode == 2, r.stderr
    lines = r.stderr.strip().splitlines()
    assert len(lines) == 1 and f"[{key}]" in lines[0] and "internal error" not in lines[0]
    assert len(lines[0]) < 400  # the bad value is quoted short


def test_rate_unit_is_one_unit(tmp_path, capsys):
    text = (EXAMPLES / "plate_inspection.toml").read_text(encoding="utf-8")
    p = tmp_path / "c.toml"
    p.write_text(text.replace('rate_unit = "mm"', 'rate_unit = "1.5.3 mm"'), encoding="utf-8")
    code, _, err = run_cli(["check", p], capsys)
    assert code == 2 and "[material.growth.from_delta_K.rate_unit]" in err


@pytest.mark.parametrize("drop", ['rate_unit = "mm", ', ', driving_unit = "MPa*m**0.5"'])
def test_from_delta_k_needs_both_units(tmp_path, capsys, drop):
    text = (EXAMPLES / "plate_inspection.toml").read_text(encoding="utf-8")
    assert drop in text
    p = tmp_path / "c.toml"
    p.write_text(text.replace(drop, ""), encoding="utf-8")
    code, _, err = run_cli(["check", p], capsys)
    name = "rate_unit" if "rate" in drop else "driving_unit"
    assert code == 2 and f"[material.growth.from_delta_K.{name}]" in err
    assert "missing" in err and 'rate_unit = "m"' in err  # shows an example


def test_specimen_needs_displacement_at(tmp_path, capsys):
    text = (EXAMPLES / "lab_specimen_ct.toml").read_text(encoding="utf-8")
    lines = [ln for ln in text.splitlines() if not ln.startswith("displacement_at")]
    p = tmp_path / "s.toml"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    log = EXAMPLES / "lab_log_ct_r01.csv"
    code, _, err = run_cli(["fit", log, "--specimen", p, "--out", tmp_path / "o"], capsys)
    assert code == 2 and "[displacement_at]" in err and "missing" in err and "s.toml" in err


def test_check_validates_the_inspection_table(tmp_path, capsys):
    text = (EXAMPLES / "plate_inspection.toml").read_text(encoding="utf-8")
    p = tmp_path / "c.toml"
    p.write_text(text.replace("design_life = 1.0e6", "design_life = -3"), encoding="utf-8")
    code, _, err = run_cli(["check", p], capsys)
    assert code == 2 and "[inspection.design_life]" in err


def test_byte_order_marks_are_accepted(tmp_path, capsys):
    case = _lug(tmp_path / "job")
    case.write_text(case.read_text(encoding="utf-8"), encoding="utf-8-sig")
    hist = tmp_path / "job" / "h.csv"
    hist.write_text(hist.read_text(encoding="utf-8"), encoding="utf-8-sig")  # "load" header
    code, _, err = run_cli(["run", case, "--out", tmp_path / "o", "--no-plots"], capsys)
    assert code == 0, err
    pod = tmp_path / "pod.csv"
    pod.write_text((EXAMPLES / "pod_hit_miss.csv").read_text(), encoding="utf-8-sig")
    code, _, err = run_cli(["pod", pod, "--out", tmp_path / "p", "--no-plots"], capsys)
    assert code == 0, err


@pytest.mark.parametrize("sep", [";", "\t", "  "])
def test_fit_logs_and_pod_data_sniff_the_delimiter(tmp_path, capsys, sep):
    log = tmp_path / "log.csv"
    log.write_text((EXAMPLES / "lab_log_ct_r01.csv").read_text().replace(",", sep))
    spec = EXAMPLES / "lab_specimen_ct.toml"
    code, _, err = run_cli(
        ["fit", log, "--specimen", spec, "--out", tmp_path / "f", "--no-plots"], capsys
    )
    assert code == 0, err
    pod = tmp_path / "pod.csv"
    pod.write_text((EXAMPLES / "pod_hit_miss.csv").read_text().replace(",", sep))
    code, _, err = run_cli(["pod", pod, "--out", tmp_path / "p", "--no-plots"], capsys)
    assert code == 0, err


@pytest.mark.parametrize("name", ["lab_log_ct_r01.csv", "pod_hit_miss.csv"])
def test_decimal_commas_are_refused(tmp_path, capsys, name):
    p = tmp_path / name
    p.write_text((EXAMPLES / name).read_text().replace(",", ";").replace(".", ","))
    if name.startswith("pod"):
        args = ["pod", p, "--out", tmp_path / "o"]
    else:
        args = ["fit", p, "--specimen", EXAMPLES / "lab_specimen_ct.toml", "--out", tmp_path / "o"]
    code, _, err = run_cli(args, capsys)
    assert code == 2 and "decimal comma" in err and name in err
    assert not (tmp_path / "o").exists()


def test_empty_what_if_intervals_are_refused(tmp_path, capsys):
    """Found by the mutation tests: `intervals = []` in [inspection] ended `cycj check` in an
    internal error (min of an empty list)."""
    import shutil

    from tests.helpers import run_cli

    ex = Path(__file__).parents[2] / "examples"
    text = (ex / "plate_inspection.toml").read_text(encoding="utf-8")
    assert "intervals" in text
    import re

    text = re.sub(r"(?m)^intervals\s*=.*$", "intervals = []", text)
    case = tmp_path / "plate_inspection.toml"
    case.write_text(text, encoding="utf-8")
    for f in ex.iterdir():
        if f.suffix == ".csv":
            shutil.copy(f, tmp_path / f.name)
    code, out, err = run_cli(["check", case], capsys)
    assert code == 2
    assert "inspection.intervals" in err and "at least one" in err


# ------------------------------------------- crashes found by tests/edges/test_fuzz_corpus.py
def test_toml_integer_beyond_the_float_range_is_input_error(tmp_path, capsys):
    text = (EXAMPLES / "lab_compact_tension.toml").read_text(encoding="utf-8")
    case = tmp_path / "ct.toml"
    case.write_text(text.replace("max_cycles = 1e8", "max_cycles = " + "9" * 400))
    code, _, err = run_cli(["check", case], capsys)
    assert code == 2 and "ct.toml" in err and "[run.max_cycles]" in err
    assert "beyond the range" in err and len(err.strip().splitlines()) == 1
    case.write_text(text.replace("max_cycles = 1e8", "max_cycles = " + "9" * 5000))
    code, _, err = run_cli(["check", case], capsys)
    assert code == 2 and "ct.toml" in err and "not valid TOML" in err
    assert "set_int_max_str_digits" not in err and "internal error" not in err


def test_log_integer_beyond_the_float_range_is_input_error(tmp_path, capsys):
    lines = (EXAMPLES / "lab_log_ct_r05.csv").read_text(encoding="utf-8").splitlines()[:400]
    lines[300] = "9" * 400 + lines[300][lines[300].index(",") :]
    log = tmp_path / "log.csv"
    log.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec = tmp_path / "s.toml"
    spec.write_bytes((EXAMPLES / "lab_specimen_ct.toml").read_bytes())
    before = _hashes(tmp_path)
    args = ["fit", log, "--specimen", spec, "--out", tmp_path / "o", "--no-plots"]
    code, _, err = run_cli(args, capsys)
    assert code == 2 and "log.csv:301" in err and "'cycle'" in err
    assert not (tmp_path / "o").exists() and _hashes(tmp_path) == before


def test_table_factor_beyond_any_geometry_is_input_error(tmp_path, capsys):
    case = _lug(tmp_path / "job")
    table = tmp_path / "job" / "lug_table.csv"
    text = table.read_text(encoding="utf-8").replace("1.15552", "1e308")
    table.write_text(text, encoding="utf-8")
    code, _, err = run_cli(["check", case], capsys)
    assert code == 2 and "lug_table.csv:5:" in err and "implausible factor" in err  # line 5
    assert "np.float64" not in err and "internal error" not in err
    table.write_text(text.replace("1e308", "9" * 400), encoding="utf-8")
    code, _, err = run_cli(["check", case], capsys)
    assert code == 2 and "lug_table.csv" in err and "internal error" not in err
