"""The one schema of the input files (cycj.schema): honest (every key used in an example is
declared, every declared key is read by the code), used for unknown and misspelt keys, the
generated key reference equals the committed docs/keys.md, and the starting templates of
``cycj new`` are valid and run for every shape."""

import re
import tomllib
from pathlib import Path

import pytest

from tests.helpers import case_dict, run_cli

ROOT = Path(__file__).parents[2]
EXAMPLES = ROOT / "examples"
CASES = sorted(p for p in EXAMPLES.glob("*.toml") if "specimen" not in p.name)
SPECIMENS = sorted(EXAMPLES.glob("*specimen*.toml"))


def _used_keys(obj, path=""):
    """(section path, key) of every key in parsed TOML (arrays of tables as ``name[]``)."""
    for k, v in obj.items():
        yield path, k
        sub = f"{path}.{k}" if path else k
        if isinstance(v, dict):
            yield from _used_keys(v, sub)
        elif isinstance(v, list) and v and all(isinstance(x, dict) for x in v):
            for x in v:
                yield from _used_keys(x, sub + "[]")


def _demo_case() -> dict:
    from cycj.demo import case_text

    return tomllib.loads(
        case_text('growth = { law = "paris", C = 8e-5, m = 1.45, basis = "effective" }')
    )


def test_every_key_of_every_example_is_declared():
    from cycj import schema

    files = [(p.name, "case", tomllib.loads(p.read_text(encoding="utf-8"))) for p in CASES]
    files += [(p.name, "specimen", tomllib.loads(p.read_text("utf-8"))) for p in SPECIMENS]
    files.append(("cycj demo", "case", _demo_case()))
    undeclared = []
    for name, doc, raw in files:
        for path, key in _used_keys(raw):
            sec = schema.section(doc, path)
            if path and sec is None and schema.section(doc, path.rpartition(".")[0]):
                continue  # a list of quantities read as a pseudo-table (fe.crack_lengths)
            if sec is None or sec.key(key) is None:
                undeclared.append(f"{name}: {path}.{key}")
    assert not undeclared, undeclared
    assert len(files) >= 12


def test_reading_every_example_reads_no_undeclared_key(tmp_path):
    """Table.finish records any key the code reads that its section does not declare."""
    from cycj import schema
    from cycj.calibrate.specimen import read_specimen
    from cycj.case import case_from_dict, load_case
    from cycj.demo import write_inputs
    from cycj.plan.inputs import read_inspection

    schema.UNDECLARED.clear()
    for p in CASES:
        case = load_case(p)
        if case.inspection is not None:
            read_inspection(case)
    for p in SPECIMENS:
        read_specimen(p)
    write_inputs(tmp_path)
    read_inspection(case_from_dict(_demo_case(), source="demo", base=tmp_path))
    assert not schema.UNDECLARED


def test_every_declared_key_is_read_by_the_code():
    """No phantom keys: each declared name is a string literal in a reader outside the
    schema (the readers name the keys they read: t.quantity("width", ...))."""
    from cycj import schema

    source = "\n".join(
        p.read_text(encoding="utf-8")
        for p in (ROOT / "cycj").rglob("*.py")
        if "schema" not in p.parts
    )
    literals = set(re.findall(r'"([A-Za-z_][A-Za-z0-9_]*)"', source))
    phantom = [
        f"{s.doc}:{s.path}.{k.name}"
        for s in schema.sections()
        for k in s.keys
        if k.name not in literals
    ]
    assert not phantom, phantom


def test_the_key_reference_is_the_generated_one():
    from cycj.schema.docs import markdown

    committed = (ROOT / "docs" / "keys.md").read_text(encoding="utf-8")
    assert committed == markdown(), "run: cycj keys --write docs/keys.md"


def test_the_key_reference_answers_what_users_guessed():
    text = (ROOT / "docs" / "keys.md").read_text(encoding="utf-8")
    for phrase in (
        "for an edge crack in a wall (edge-crack-plate) the wall thickness",
        "the time of one pass of the history",
        "'MPa*m**0.5'",
        "notch depth D from the surface to the notch root",
        "| `units` |",
    ):
        assert phrase in text, phrase


def _write_case(tmp_path, raw: dict) -> Path:
    """A case dict as TOML (strings, numbers, lists and nested tables only)."""

    def val(v):
        if isinstance(v, str):
            return '"' + v + '"'
        if isinstance(v, bool):
            return "true" if v else "false"
        if isinstance(v, list):
            return "[" + ", ".join(val(x) for x in v) + "]"
        if isinstance(v, dict):
            return "{ " + ", ".join(f"{k} = {val(x)}" for k, x in v.items()) + " }"
        return repr(v)

    lines = []
    for k, v in raw.items():
        if isinstance(v, dict):
            lines.append(f"[{k}]")
            lines += [f"{kk} = {val(vv)}" for kk, vv in v.items()]
        else:
            lines.insert(0, f"{k} = {val(v)}")
    path = tmp_path / "case.toml"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


@pytest.mark.parametrize(
    "section, wrong, right",
    [
        ("material", "elastic_modulous", "elastic_modulus"),
        ("material", "yeild_strength", "yield_strength"),
        ("geometry", "crack_lenght", "crack_length"),
    ],
)
def test_a_misspelt_required_key_says_missing_and_did_you_mean(
    section, wrong, right, tmp_path, capsys
):
    raw = case_dict()
    raw[section][wrong] = raw[section].pop(right)
    code, _, err = run_cli(["check", _write_case(tmp_path, raw)], capsys)
    assert code == 2
    line = err.strip()
    assert len(line.splitlines()) == 1
    assert f"missing required key '{right}'; did you mean '{right}' for '{wrong}'?" in line
    assert f"{section}.{right}" in line


def test_a_misspelt_history_or_constant_says_did_you_mean():
    from cycj.case import case_from_dict
    from cycj.errors import CycjInputError

    raw = case_dict()
    raw["loading"] = {"constnt": raw["loading"]["constant"]}
    with pytest.raises(CycjInputError, match="did you mean 'constant' for 'constnt'"):
        case_from_dict(raw, source="<test>")


def test_a_misspelt_required_specimen_key_says_did_you_mean(tmp_path):
    from cycj.calibrate.specimen import read_specimen
    from cycj.errors import CycjInputError

    text = (EXAMPLES / "lab_specimen_ct.toml").read_text(encoding="utf-8")
    bad = tmp_path / "spec.toml"
    bad.write_text(text.replace("displacement_at", "displacment_at"), encoding="utf-8")
    with pytest.raises(CycjInputError, match="did you mean 'displacement_at' for"):
        read_specimen(bad)


def test_an_unknown_key_suggests_a_declared_one(tmp_path, capsys):
    raw = case_dict(loading={"durration": "1 s"})
    code, _, err = run_cli(["check", _write_case(tmp_path, raw)], capsys)
    assert code == 2 and "loading.durration" in err and "did you mean 'duration'" in err


def test_a_declared_key_these_settings_do_not_read_is_refused():
    """threshold beside from_delta_K is declared but not read there: refused, not ignored."""
    from cycj.case import case_from_dict
    from cycj.errors import CycjInputError

    growth = {
        "threshold": "1 kJ/m^2",
        "from_delta_K": {"C": 1e-11, "m": 3.0, "rate_unit": "m", "driving_unit": "MPa*m**0.5"},
    }
    with pytest.raises(CycjInputError, match="material.growth.threshold.*not used"):
        case_from_dict(case_dict(material={"growth": growth}), source="<test>")


@pytest.mark.parametrize("units, ok", [(None, "SI"), ("SI", "SI"), ("US", "US"), ("metric", "")])
def test_report_units(units, ok):
    from cycj.case import case_from_dict
    from cycj.errors import CycjInputError

    raw = case_dict() if units is None else case_dict(report={"units": units})
    if not ok:
        with pytest.raises(CycjInputError, match="report.units"):
            case_from_dict(raw, source="<test>")
        return
    case = case_from_dict(raw, source="<test>")
    assert case.report_units == ok and case.resolved()["report"] == {"units": ok}


def test_a_reader_reading_an_undeclared_key_is_recorded():
    """The check behind test_reading_every_example_reads_no_undeclared_key can fail."""
    from cycj import schema
    from cycj.tables import Table

    t = Table({"units": "SI"}, "report", "<test>")
    t.get("units")
    t.get("colour_scheme")  # a reader asking for a key no section declares
    t.finish()
    assert ("case", "report", "colour_scheme") in schema.UNDECLARED
    schema.UNDECLARED.discard(("case", "report", "colour_scheme"))
