"""The history of a run kept as numpy columns: the DataFrame built from them on first access,
history.csv written from them as pandas writes it, the row bookkeeping as pandas does it, and
a single `cycj run` (plots and report included) that never imports pandas."""

import json
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd

from cycj.life import history as H
from cycj.life import predict_life
from cycj.outputs import columns_csv
from cycj.report import Rows, _table
from tests.helpers import make_case

ROOT = Path(__file__).parents[2]


def test_history_frame_is_built_once_from_the_columns():
    res = predict_life(make_case())
    h = res.history
    assert h is res.history
    assert list(h.columns) == list(res.columns)
    assert isinstance(h.index, pd.RangeIndex)
    for name, v in res.columns.items():
        assert h[name].dtype == np.float64
        assert np.array_equal(h[name].to_numpy(), v, equal_nan=True)


def test_columns_csv_is_pandas_to_csv_byte_for_byte(tmp_path):
    # awkward floats: exponents both ways, the switch to exponent form, NaN, ±inf, −0
    v = np.array([0.0, -0.0, 1e-5, 1.5e-4, 0.1 + 0.2, 1e15, 1e16, 123456789.123, np.nan, np.inf])
    cols = {"cycle": v, "a_mm": -v[::-1], "dJ_kJm2": np.arange(v.size) / 7.0}
    path = tmp_path / "h.csv"
    pd.DataFrame(cols).to_csv(path, index=False)
    assert columns_csv(cols) == path.read_text()


def test_row_bookkeeping_is_drop_duplicates_then_stable_sort():
    rng = np.random.default_rng(3)
    cyc = rng.integers(0, 6, 40).astype(float)
    a = rng.integers(0, 3, 40).astype(float)
    a[[3, 9]] = np.nan
    cols = {"cycle": cyc, "a_mm": a, "x": np.arange(40.0)}
    want = (
        pd.DataFrame(cols)
        .drop_duplicates(subset=["cycle", "a_mm"])
        .sort_values("cycle", kind="stable")
    )
    got = H.drop_repeats_sorted(cols)
    for name in cols:
        assert np.array_equal(got[name], want[name].to_numpy(), equal_nan=True)


def test_rows_table_is_the_pandas_table():
    rows = [("crack size", "12.5 mm"), ("a < b & c", 3.0), ("cycles", None)]
    frame = pd.DataFrame(rows, columns=["quantity", "value"])
    assert _table(Rows(("quantity", "value"), rows)) == _table(frame)


def test_single_run_imports_no_pandas(tmp_path):
    out_dir = str(tmp_path / "o")
    code = (
        "import sys\n"
        "from cycj.cli import main\n"
        "try:\n"
        f"    main(['run', 'examples/lab_compact_tension.toml', '--out', {out_dir!r}])\n"
        "except SystemExit:\n"
        "    pass\n"
        "print(sorted(m for m in ('pandas', 'matplotlib') if m in sys.modules))\n"
    )
    env = {**os.environ, "MPLBACKEND": "Agg", "PYTHONPATH": str(ROOT)}
    out = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, env=env, capture_output=True, text=True
    )
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip().splitlines()[-1] == "['matplotlib']", out.stdout
    assert json.loads((tmp_path / "o" / "summary.json").read_text())["plots"]
