"""Mutants of the input edges (schema, key checks, templates, .xlsx reading, output rule,
fleet table): each is applied to the source in place, its test is run, the file restored.

    python bench/mutate_inputs.py        # prints KILLED/SURVIVED per mutant and the score

Run it from a clean checkout (it edits and restores files of cycj/).
"""

# ruff: noqa: E501 - a table of source snippets, one mutant a row
import os
import subprocess
import sys
from pathlib import Path

W = str(Path(__file__).resolve().parents[1])
# fmt: off
MUTANTS = [
    ("cycj/tables.py", "if near:\n            return self.error(", "if False:\n            return self.error(",
     "tests/edges/test_schema.py::test_a_misspelt_required_key_says_missing_and_did_you_mean"),
    ("cycj/tables.py", "        if sec is not None:\n            from cycj import schema", "        if False:\n            from cycj import schema",
     "tests/edges/test_schema.py::test_a_declared_key_these_settings_do_not_read_is_refused"),
    ("cycj/tables.py", "schema.UNDECLARED.update(", "set().update(",
     "tests/edges/test_schema.py::test_a_reader_reading_an_undeclared_key_is_recorded"),
    ("cycj/schema/case_keys.py", '    K("duration", "time",', '    K("duration_", "time",',
     "tests/edges/test_schema.py::test_every_key_of_every_example_is_declared"),
    ("cycj/schema/case_keys.py", '    K("zone_factor", "number",', '    K("zone_size", "number",',
     "tests/edges/test_schema.py::test_every_declared_key_is_read_by_the_code"),
    ("cycj/schema/case_keys.py", '"units of reports and plots', '"unit of reports and plots',
     "tests/edges/test_schema.py::test_the_key_reference_is_the_generated_one"),
    ("cycj/case.py", 'units = report_t.choice("units", ("SI", "US"), default="SI")', 'units = "SI"',
     "tests/edges/test_schema.py::test_report_units"),
    ("cycj/schema/template.py", '{"width": \'"40 mm"\', "thickness": \'"100 mm"\', "crack_length": \'"4 mm"\'}', '{"width": \'"40 mm"\', "thickness": \'"100 mm"\', "crack_length": \'"39 mm"\'}',
     "tests/edges/test_templates.py::test_template_of_each_shape_checks_and_runs"),
    ("cycj/schema/template.py", 'if not path.is_file() or not first or not first[0].startswith(MARK):', 'if False:',
     "tests/edges/test_templates.py::test_new_never_overwrites_without_force_nor_a_file_it_did_not_write"),
    ("cycj/schema/template.py", '    if not force:\n', '    if False:\n',
     "tests/edges/test_templates.py::test_new_never_overwrites_without_force_nor_a_file_it_did_not_write"),
    ("cycj/outputs.py", 'return Path(DEFAULT_ROOT) / f"{command}-{stem}"', 'return Path(f"{stem}-{command}")',
     "tests/edges/test_templates.py"),
    ("cycj/spectrum/xlsx_reading.py", "    if sheet is None:\n        return names[0]", "    if True:\n        return names[0]",
     "tests/spectrum/test_xlsx_inputs.py"),
    ("cycj/spectrum/xlsx_reading.py", "for no, r in enumerate(ws.iter_rows(values_only=True), start=1)", "for no, r in enumerate(ws.iter_rows(values_only=True), start=0)",
     "tests/spectrum/test_xlsx_inputs.py::test_rows_are_numbered_as_the_spreadsheet_numbers_them"),
    ("cycj/spectrum/xlsx_reading.py", "data = [tuple(r[:width]) + (None,) * (width - len(r)) for r in rows[1:]]", "data = [tuple(r[:width]) + (None,) * (width - len(r)) for r in rows[2:]]",
     "tests/spectrum/test_xlsx_inputs.py"),
    ("cycj/life/fleet.py", '"j_method": case.analysis.j_method,', '"j_method": "reference-stress",',
     "tests/edges/test_examples_cli.py::test_fleet_puts_the_delta_k_and_delta_j_answers_side_by_side"),
]
# fmt: on
env = dict(os.environ, PYTHONPATH=W)
killed = 0
for path, old, new, test in MUTANTS:
    p = os.path.join(W, path)
    src = open(p, encoding="utf-8").read()
    assert src.count(old) == 1, (path, old)
    open(p, "w", encoding="utf-8").write(src.replace(old, new))
    try:
        r = subprocess.run(
            ["nice", sys.executable, "-m", "pytest", "-q", "-x", "-p", "no:cacheprovider", test],
            cwd=W,
            env=env,
            capture_output=True,
            text=True,
            timeout=900,
        )
        dead = r.returncode != 0
    finally:
        open(p, "w", encoding="utf-8").write(src)
    killed += dead
    print(("KILLED " if dead else "SURVIVED ") + f"{path}: {new[:50]!r}", flush=True)
print(f"{killed}/{len(MUTANTS)} mutants killed")
