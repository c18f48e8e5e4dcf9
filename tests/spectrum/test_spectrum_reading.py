"""Reading load histories, and the ``cycj count`` command."""

import json

import numpy as np
import pytest

from cycj.cli import main
from cycj.errors import CycjInputError
from cycj.spectrum import count_cycles, read_history, read_history_with_time
from cycj.spectrum.reading import history_unit


def _write(tmp_path, name, text):
    p = tmp_path / name
    p.write_text(text)
    return p


@pytest.mark.parametrize("sep", [",", ";", "\t", " ", "|"])
def test_sniffs_delimiter_header_and_comments(tmp_path, sep):
    text = (
        "# invented demo history\n# unit: kN\n"
        f"time_s{sep}load{sep}strain\n"
        + "".join(f"{0.1 * i:.1f}{sep}{v}{sep}{2 * v}\n" for i, v in enumerate([0, 5, 1, 4]))
        + "# trailing comment\n"
    )
    p = _write(tmp_path, "h.csv", text)
    values, times = read_history_with_time(p)
    assert values.tolist() == [0.0, 5.0, 1.0, 4.0]  # first non-time column
    assert times == pytest.approx([0.0, 0.1, 0.2, 0.3], abs=1e-12)
    assert read_history(p, column="STRAIN", unit_factor=1000.0, scale=0.5).tolist() == [
        0.0,
        5000.0,
        1000.0,
        4000.0,
    ]
    assert read_history(p, column=2).tolist() == [0.0, 10.0, 2.0, 8.0]


def test_no_header_single_column(tmp_path):
    p = _write(tmp_path, "h.txt", "1.5\n-2\n\n3e1\n")
    assert read_history(p).tolist() == [1.5, -2.0, 30.0]


def test_npy_and_parquet(tmp_path):
    import pandas as pd

    x = np.array([0.0, 3.0, -1.0, 2.0])
    np.save(tmp_path / "h.npy", x)
    assert read_history(tmp_path / "h.npy", scale=2.0).tolist() == [0.0, 6.0, -2.0, 4.0]
    np.save(tmp_path / "two.npy", np.c_[np.arange(4.0), x])
    assert read_history(tmp_path / "two.npy", column=1).tolist() == x.tolist()
    pd.DataFrame({"time": np.arange(4.0), "load": x}).to_parquet(tmp_path / "h.parquet")
    v, t = read_history_with_time(tmp_path / "h.parquet")
    assert v.tolist() == x.tolist() and t.tolist() == [0.0, 1.0, 2.0, 3.0]


BAD_TEXT = [
    # (content, expected line, message fragment)
    ("", 1, "empty"),
    ("# only a comment\n", 1, "no data"),
    ("time,load\n", 2, "header but no data"),
    ("load\n# c\n4.0\n", 3, "only one sample"),
    ("time,load\n0,1.0\n1,abc\n2,3.0\n", 3, "not a number"),
    ("# c\nload\n1.0\n# c\nnan\n2.0\n", 5, "not a finite"),
    ("load\n1.0\n2.0\ninf\n", 4, "not a finite"),
    ("time,load\n0,1.0\n1,\n2,3\n", 3, "not a finite"),
]


@pytest.mark.parametrize(("text", "line", "fragment"), BAD_TEXT)
def test_bad_text_names_file_and_line(tmp_path, text, line, fragment):
    p = _write(tmp_path, "bad.csv", text)
    with pytest.raises(CycjInputError, match=fragment) as err:
        read_history(p)
    assert err.value.source == str(p) and err.value.line == line
    assert f"bad.csv:{line}" in str(err.value)


def test_bad_binary_rows(tmp_path):
    np.save(tmp_path / "b.npy", np.array([1.0, 2.0, np.inf, 3.0]))
    with pytest.raises(CycjInputError, match="not a finite") as err:
        read_history(tmp_path / "b.npy")
    assert err.value.line == 3
    np.save(tmp_path / "one.npy", np.array([1.0]))
    with pytest.raises(CycjInputError, match="only one sample"):
        read_history(tmp_path / "one.npy")


def test_unknown_column_lists_available(tmp_path):
    p = _write(tmp_path, "h.csv", "time_s,load\n0,1\n1,2\n")
    with pytest.raises(CycjInputError, match="'time_s', 'load'"):
        read_history(p, column="force")


def test_constant_history_reads_and_counts_no_cycles(tmp_path):
    p = _write(tmp_path, "c.csv", "load\n" + "7.0\n" * 50)
    x = read_history(p)
    assert len(count_cycles(x)) == 0


def test_history_unit():
    assert history_unit("kN")[:2] == (pytest.approx(1000.0, rel=1e-12), "N")
    assert history_unit("ksi")[0] == pytest.approx(6.894757, rel=1e-6)
    with pytest.raises(CycjInputError, match="force or stress"):
        history_unit("mm")


# ---------------------------------------------------------------- the command


def _run(args, capsys):
    with pytest.raises(SystemExit) as ex:
        main(args)
    out = capsys.readouterr()
    return ex.value.code, out.out, out.err


def test_count_command_astm_example(tmp_path, capsys):
    # ASTM E1049-85 Fig. 6 history (docs/references.md R7, from memory): 4.0 cycles, range 9 max
    p = _write(tmp_path, "h.csv", "load\n-2\n1\n-3\n5\n-1\n3\n-4\n4\n-2\n")
    code, out, _ = _run(["count", str(p), "--json"], capsys)
    assert code == 0
    s = json.loads(out)
    assert (s["samples"], s["reversals"], s["full_cycles"], s["half_cycles"]) == (9, 9, 1, 6)
    assert s["cycles"] == pytest.approx(4.0, abs=1e-12)
    assert s["largest_range"] == pytest.approx(9.0, abs=1e-12)
    code, out, _ = _run(
        ["count", str(p), "--repeat", "--unit", "kN", "--gate", "3.5 kN", "--json"], capsys
    )
    s = json.loads(out)
    # repeating variant: full cycles of 9, 7, 4 (3 is below the 3.5 kN gate)
    assert (s["full_cycles"], s["half_cycles"], s["unit"]) == (3, 0, "N")
    assert s["largest_range"] == pytest.approx(9000.0, rel=1e-12)


def test_count_command_outputs_and_refusal(tmp_path, capsys):
    x = np.tile([0.0, 10.0, 2.0, 8.0], 50)
    np.save(tmp_path / "h.npy", x)
    out_dir = tmp_path / "out"
    code, out, _ = _run(
        ["count", str(tmp_path / "h.npy"), "--out", str(out_dir), "--bins", "8"], capsys
    )
    assert code == 0 and "largest range: 10" in out
    names = sorted(p.name for p in out_dir.iterdir())
    assert names == sorted(
        [
            ".cycj-output.json",
            "cycles.csv",
            "range_mean_matrix.csv",
            "from_to_matrix.csv",
            "exceedance.csv",
            "history.png",
            "exceedance.png",
            "rainflow_matrix.png",
            "count.json",
            "report.html",
        ]
    )
    import pandas as pd

    table = pd.read_csv(out_dir / "cycles.csv")
    assert list(table.columns) == ["range", "mean", "count", "start", "end"]
    assert table["count"].sum() == pytest.approx(count_cycles(x)["count"].sum(), abs=1e-12)
    code, _, err = _run(["count", str(tmp_path / "h.npy"), "--out", str(out_dir)], capsys)
    assert code == 2 and "not empty" in err and len(err.strip().splitlines()) == 1
    code, _, _ = _run(["count", str(tmp_path / "h.npy"), "--out", str(out_dir), "--force"], capsys)
    assert code == 0


@pytest.mark.parametrize(
    ("text", "args", "fragment"),
    [
        ("load\n1\nabc\n", [], "bad.csv:3"),
        ("load\n1\n2\n", ["--column", "force"], "'load'"),
        ("load\n1\n2\n", ["--unit", "mm"], "force or stress"),
        ("load\n1\n2\n", ["--gate", "-1"], "gate"),
    ],
)
def test_count_command_errors_one_line_exit_2(tmp_path, capsys, text, args, fragment):
    p = _write(tmp_path, "bad.csv", text)
    code, out, err = _run(["count", str(p), *args], capsys)
    assert code == 2
    assert len(err.strip().splitlines()) == 1 and fragment in err
    assert "Traceback" not in err


def test_count_command_constant(tmp_path, capsys):
    p = _write(tmp_path, "c.csv", "load\n5\n5\n5\n")
    code, out, _ = _run(["count", str(p)], capsys)
    assert code == 0 and "cycles: none" in out


# ---------------------------------------------------------------- demonstration spectra

SPECTRA_DIR = __import__("pathlib").Path(__file__).resolve().parents[2] / "loadspectra"


@pytest.mark.parametrize(
    "name",
    [
        "crane_duty.csv",
        "pressure_vessel.csv",
        "wind_member.csv",
        "press_frame.csv",
        "suspension_arm.csv",
    ],
)
def test_demo_spectra_are_small_labelled_and_readable(name):
    path = SPECTRA_DIR / name
    head = path.read_text().splitlines()[:8]
    assert any("invented" in line.lower() for line in head if line.startswith("#"))
    assert any("unit" in line.lower() for line in head if line.startswith("#"))
    assert path.stat().st_size < 1_000_000
    x = read_history(path, column="load")
    assert 2 <= x.size <= 20_000
    assert count_cycles(x)["count"].sum() > 10


def test_demo_crane_and_pressure_ranges():
    crane = read_history(SPECTRA_DIR / "crane_duty.csv")  # kN
    df = count_cycles(crane, gate=1.0)
    peaks = df["mean"] + 0.5 * df["range"]
    assert crane.min() >= 0.0 and 40.0 <= crane.max() <= 65.0
    assert peaks[df["range"] > 5.0].min() >= 8.0
    vessel = read_history(SPECTRA_DIR / "pressure_vessel.csv")  # MPa
    assert vessel.min() >= 0.0 and 130.0 <= vessel.max() <= 160.0
