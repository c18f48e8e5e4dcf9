"""Spreadsheet inputs (.xlsx through openpyxl): load histories and test logs, the sheet and the
column chosen by name, each equal to the same data read from CSV; one-line errors naming the
file, sheet, row or column.  The workbooks are written here with openpyxl (invented data)."""

import shutil
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from tests.helpers import run_cli

openpyxl = pytest.importorskip("openpyxl")

ROOT = Path(__file__).parents[2]


def _book(path: Path, sheets: dict) -> Path:
    """Write ``{sheet name: [header, *rows]}`` as a workbook."""
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    for name, rows in sheets.items():
        ws = wb.create_sheet(name)
        for r in rows:
            ws.append(list(r))
    wb.save(path)
    return path


def _crane_rows():
    df = pd.read_csv(ROOT / "loadspectra" / "crane_duty.csv", comment="#")
    return df, [list(df.columns), *df.itertuples(index=False, name=None)]


def test_history_sheet_and_column_by_name_equal_the_csv(tmp_path):
    from cycj.spectrum.reading import read_history

    df, rows = _crane_rows()
    notes = [["what"], ["invented notes sheet, first in the book"]]
    book = _book(tmp_path / "duty.xlsx", {"Notes": notes, "Duty": rows})
    csv = read_history(ROOT / "loadspectra" / "crane_duty.csv", column="load", unit_factor=1e3)
    xl = read_history(book, column="load", unit_factor=1e3, sheet="Duty")
    np.testing.assert_array_equal(xl, csv)
    assert xl.size == len(df)
    assert np.array_equal(read_history(book, column="LOAD", sheet="duty"), csv / 1e3)


def test_case_with_an_xlsx_history_gives_the_csv_life(tmp_path):
    import tomllib

    from cycj.case import case_from_dict
    from cycj.life.predict import predict_life

    _, rows = _crane_rows()
    _book(tmp_path / "duty.xlsx", {"Shift": rows})
    text = (ROOT / "examples" / "crane_edge_crack.toml").read_text(encoding="utf-8")
    raw = tomllib.loads(text)
    csv_case = case_from_dict(raw, source="csv", base=ROOT / "examples")
    raw["loading"].update(history="duty.xlsx", sheet="Shift")
    xl_case = case_from_dict(raw, source="xlsx", base=tmp_path)
    assert xl_case.loading.sheet == "Shift"
    a, b = predict_life(csv_case).summary, predict_life(xl_case).summary
    assert a["cycles_to_end"] == b["cycles_to_end"] and a["end_reason"] == b["end_reason"]


def test_count_reads_a_sheet_by_name(tmp_path, capsys):
    _, rows = _crane_rows()
    book = _book(tmp_path / "duty.xlsx", {"Other": [["x"], [1], [2]], "Duty": rows})
    args = ["count", "--column", "load", "--unit", "kN", "--json"]
    code, xl, err = run_cli([*args, "--sheet", "Duty", book], capsys)
    assert code == 0, err
    code, csv, err = run_cli([*args, ROOT / "loadspectra" / "crane_duty.csv"], capsys)
    assert code == 0, err
    import json

    x, c = json.loads(xl), json.loads(csv)
    assert x["cycles"] == c["cycles"] and x["largest_range"] == c["largest_range"]


@pytest.mark.parametrize(
    "sheets, options, message",
    [
        ({"Duty": [["load"], [1.0], [2.0]]}, ["--sheet", "Dutty"], "no sheet 'Dutty'"),
        ({"Duty": [["load"], [1.0], [2.0]]}, ["--sheet", "Dutty"], "did you mean 'Duty'"),
        ({"Duty": [["load"], [1.0], [2.0]]}, ["--column", "force"], "no column 'force'"),
        ({"Duty": [["load"], [1.0], ["abc"], [3.0]]}, [], "not a number in column 'load'"),
        ({"Duty": [["load"], [1.0], [None, 4.0], [3.0]]}, [], "row 3]"),
        ({"Duty": [[1.0], [2.0], [3.0]]}, [], "a header row naming the columns"),
        ({"Duty": [["load"]]}, [], "no data"),
        ({"Duty": []}, [], "empty"),
    ],
)
def test_bad_sheets_are_one_line_naming_file_and_sheet(sheets, options, message, tmp_path, capsys):
    book = _book(tmp_path / "h.xlsx", sheets)
    code, out, err = run_cli(["count", *options, book], capsys)
    assert code == 2 and not out
    line = err.strip()
    assert len(line.splitlines()) == 1 and "h.xlsx" in line and message in line, line


def test_a_damaged_workbook_and_a_sheet_of_a_csv_are_refused(tmp_path, capsys):
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(b"PK\x03\x04 not really a workbook")
    code, _, err = run_cli(["count", bad], capsys)
    assert code == 2 and "not a readable .xlsx workbook" in err
    csv = tmp_path / "h.csv"
    shutil.copy(ROOT / "loadspectra" / "crane_duty.csv", csv)
    code, _, err = run_cli(["count", "--sheet", "Duty", csv], capsys)
    assert code == 2 and "only in a spreadsheet" in err
    code, _, err = run_cli(["count", "--stream", tmp_path / "bad.xlsx"], capsys)
    assert code == 2


def test_rows_are_numbered_as_the_spreadsheet_numbers_them(tmp_path, capsys):
    rows = [["load"], [1.0], [None], [None], [2.0], ["x"]]  # two blank rows: "x" is row 6
    book = _book(tmp_path / "h.xlsx", {"Duty": rows})
    code, _, err = run_cli(["count", book], capsys)
    assert code == 2 and "[sheet 'Duty', row 6]" in err and "'x'" in err


def test_a_log_sheet_equals_the_csv_log(tmp_path):
    from cycj.calibrate.replicates import read_tests

    df = pd.read_csv(ROOT / "examples" / "lab_log_ct_r01.csv")
    rows = [list(df.columns), *df.itertuples(index=False, name=None)]
    book = _book(tmp_path / "r01.xlsx", {"Summary": [["note"], ["invented"]], "Loops": rows})
    spec = ROOT / "examples" / "lab_specimen_ct.toml"
    ((csv_log, _),) = read_tests([ROOT / "examples" / "lab_log_ct_r01.csv"], [spec])
    ((xl_log, _),) = read_tests([book], [spec], sheet="Loops")
    for name in ("cycles", "load", "displacement"):
        np.testing.assert_array_equal(getattr(xl_log, name), getattr(csv_log, name))


def test_fit_takes_sheet_option(capsys):
    code, out, _ = run_cli(["fit", "--help"], capsys)
    assert code == 0 and "--sheet" in out
