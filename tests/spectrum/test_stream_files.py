"""Streaming a history file: chunked readers give read_history's values exactly, and ``cycj count
--stream`` writes the same count.json values, cycle table and matrices as the in-memory count,
at small chunks landing anywhere (ASTM E1049-85 §5.4.4: the rules are the same, only the state
is carried between chunks)."""

import json

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cycj.cli import main
from cycj.errors import CycjInputError
from cycj.spectrum import statistics
from cycj.spectrum.chunked_reading import iter_history_chunks, iter_history_chunks_with_time
from cycj.spectrum.cycle_parts import CycleParts, part_from_cycles
from cycj.spectrum.rainflow import rainflow_cycles
from cycj.spectrum.reading import read_history, read_history_with_time
from cycj.spectrum.statistics import (
    RunningMean,
    history_mean,
    irregularity_factor,
    range_exceedance,
)
from cycj.spectrum.streaming import StreamingCount

TABLES = ("cycles.csv", "range_mean_matrix.csv", "from_to_matrix.csv", "exceedance.csv")


def _history(seed, n=3000):
    """Integer steps: plateaus, exact ties and turning points everywhere (common practice)."""
    rng = np.random.default_rng(seed)
    return np.cumsum(rng.integers(-4, 5, size=n)).astype(float) * 0.25


def _write(x, path):
    t = np.arange(x.size) * 0.01
    suffix = path.suffix
    if suffix == ".csv":
        pd.DataFrame({"time": t, "load": x}).to_csv(path, index=False)
    elif suffix == ".tsv":  # BOM, comments, blank lines, no header
        with path.open("w", encoding="utf-8-sig") as fh:
            fh.write("# measured\n")
            for a, b in zip(t, x, strict=True):
                fh.write(f"{float(a)!r}\t{float(b)!r}\n\n")
    elif suffix == ".parquet":
        pd.DataFrame({"time": t, "load": x}).to_parquet(path)
    elif suffix == ".npy":
        np.save(path, x)
    return path


@pytest.mark.parametrize("suffix", [".csv", ".tsv", ".parquet", ".npy"])
@pytest.mark.parametrize("chunk", [1, 2, 97, 1000, 10_000])
def test_chunks_equal_read_history(tmp_path, suffix, chunk):
    x = _history(1, 1500)
    p = _write(x, tmp_path / f"h{suffix}")
    column = 1 if suffix == ".tsv" else None
    ref, ref_t = read_history_with_time(p, column, 1000.0, 0.37)
    parts = list(iter_history_chunks_with_time(p, column, 1000.0, 0.37, chunk))
    assert all(v.dtype == np.float64 and v.size <= chunk for v, _ in parts)
    np.testing.assert_array_equal(np.concatenate([v for v, _ in parts]), ref)
    if ref_t is not None:
        np.testing.assert_array_equal(np.concatenate([t for _, t in parts]), ref_t)
    np.testing.assert_array_equal(np.concatenate(list(iter_history_chunks(p, column))), x)


def test_npy_two_d_and_structured(tmp_path):
    x = _history(2, 500)
    np.save(tmp_path / "a.npy", np.c_[np.arange(500.0), x])
    s = np.zeros(500, dtype=[("time", "f8"), ("force", "f4")])
    s["time"], s["force"] = np.arange(500.0), x
    np.save(tmp_path / "s.npy", s)
    for name, col in (("a.npy", 1), ("s.npy", "force"), ("s.npy", None)):
        ref = read_history(tmp_path / name, col)
        got = np.concatenate(list(iter_history_chunks(tmp_path / name, col, chunk_samples=33)))
        np.testing.assert_array_equal(got, ref)


def test_bad_value_named_at_its_line_in_any_chunk(tmp_path):
    p = tmp_path / "bad.csv"
    p.write_text("load\n1\n2\n3\nabc\n4\n")
    with pytest.raises(CycjInputError) as ref:
        read_history(p)
    for chunk in (1, 2, 3, 100):
        with pytest.raises(CycjInputError) as got:
            list(iter_history_chunks(p, chunk_samples=chunk))
        assert str(got.value) == str(ref.value)
    one = tmp_path / "one.npy"
    np.save(one, np.array([1.0]))
    with pytest.raises(CycjInputError, match="only one sample"):
        list(iter_history_chunks(one, chunk_samples=1))


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(0, 10_000), st.lists(st.integers(0, 400), max_size=6))
def test_running_mean_equals_history_mean(seed, cuts):
    x = np.random.default_rng(seed).normal(size=400) * 1e3
    old = statistics.MEAN_BLOCK
    statistics.MEAN_BLOCK = 16  # many blocks, and cuts inside them
    try:
        rm = RunningMean()
        for part in np.split(x, sorted(cuts)):
            rm.feed(part)
        assert rm.mean() == history_mean(x)
    finally:
        statistics.MEAN_BLOCK = old


@settings(max_examples=100, deadline=None, derandomize=True)
@given(
    st.lists(st.integers(-5, 5), min_size=0, max_size=150),
    st.lists(st.integers(0, 150), max_size=6),
    st.sampled_from([0.0, 1.0, 3.0]),
)
def test_streaming_irregularity_and_exceedance(steps, cuts, gate):
    x = np.cumsum(np.asarray(steps, float)) if steps else np.zeros(2)
    parts = CycleParts()
    sc = StreamingCount(gate, level=history_mean(x), sink=parts.add)
    for part in np.split(x, sorted(c for c in cuts if c <= x.size)):
        sc.feed(part)
    sc.finish()
    ref = irregularity_factor(x, gate)
    got = sc.irregularity()
    assert (np.isnan(ref) and np.isnan(got)) or ref == got
    cyc = rainflow_cycles(x, gate)
    lv, cum = range_exceedance(cyc["range"], cyc["count"])
    blocks = list(parts.exceedance_blocks(rows=3))
    got_lv = np.concatenate([b[0] for b in blocks]) if blocks else np.empty(0)
    got_cum = np.concatenate([b[1] for b in blocks]) if blocks else np.empty(0)
    np.testing.assert_array_equal(got_lv, lv)
    np.testing.assert_array_equal(got_cum, cum)
    whole = CycleParts()
    whole.add(part_from_cycles(x, cyc))
    assert (whole.n, whole.full, whole.half) == (parts.n, parts.full, parts.half)


def _count(args, capsys):
    with pytest.raises(SystemExit) as exc:
        main(["count", *map(str, args)])
    out = capsys.readouterr()
    assert exc.value.code == 0, out.err
    return out.out


def _json(folder):
    d = json.loads((folder / "count.json").read_text())
    for k in ("provenance", "outputs"):
        d.pop(k, None)
    for k in ("stream", "cycles_format"):
        d["parameters"].pop(k, None)
    return d


@pytest.mark.parametrize("suffix", [".csv", ".tsv", ".parquet", ".npy"])
@pytest.mark.parametrize(("seed", "gate"), [(3, "0"), (5, "2")])
def test_command_streaming_equals_in_memory(tmp_path, capsys, monkeypatch, suffix, seed, gate):
    x = _history(seed)
    # a chunk boundary on a turning point and one inside a plateau
    k = int(np.flatnonzero(np.diff(np.sign(np.diff(x))) != 0)[5]) + 1
    x[k + 40 : k + 45] = x[k + 40]
    p = _write(x, tmp_path / f"h{suffix}")
    column = ["--column", "1"] if suffix == ".tsv" else []
    common = [p, *column, "--gate", gate, "--unit", "kN", "--bins", "12"]
    _count([*common, "--out", tmp_path / "mem"], capsys)
    for chunk in (k, k + 42, 257):
        monkeypatch.setenv("CYCJ_STREAM_CHUNK", str(chunk))
        out = tmp_path / f"s{chunk}"
        _count([*common, "--stream", "--out", out], capsys)
        for name in TABLES:
            assert (out / name).read_bytes() == (tmp_path / "mem" / name).read_bytes(), name
        assert _json(out) == _json(tmp_path / "mem")
        assert json.loads((out / "count.json").read_text())["parameters"]["stream"] is True


def test_parquet_tables_and_automatic_streaming(tmp_path, capsys, monkeypatch):
    x = _history(7)
    p = _write(x, tmp_path / "h.npy")
    _count([p, "--out", tmp_path / "mem"], capsys)
    monkeypatch.setattr("cycj.spectrum.stream_count.STREAM_SAMPLES", 100)
    monkeypatch.setenv("CYCJ_STREAM_CHUNK", "101")
    text = _count([p, "--out", tmp_path / "auto", "--cycles-format", "parquet"], capsys)
    assert "cycles.parquet" in text
    d = json.loads((tmp_path / "auto" / "count.json").read_text())
    assert d["parameters"]["stream"] is True
    for name in ("cycles", "exceedance"):
        got = pd.read_parquet(tmp_path / "auto" / f"{name}.parquet")
        ref = pd.read_csv(tmp_path / "mem" / f"{name}.csv")
        assert list(got.columns) == list(ref.columns)
        assert len(got) == len(ref)
    cyc = rainflow_cycles(x)
    got = pd.read_parquet(tmp_path / "auto" / "cycles.parquet")
    for c in ("range", "mean", "count", "start", "end"):
        np.testing.assert_array_equal(got[c].to_numpy(), cyc[c])
    assert _json(tmp_path / "auto") == _json(tmp_path / "mem")


def test_stream_with_repeat_is_refused(tmp_path, capsys):
    p = _write(_history(8, 50), tmp_path / "h.npy")
    with pytest.raises(SystemExit) as exc:
        main(["count", str(p), "--stream", "--repeat"])
    assert exc.value.code == 2
    assert "--stream" in capsys.readouterr().err


@settings(max_examples=80, deadline=None, derandomize=True)
@given(
    st.lists(st.integers(-6, 6), min_size=0, max_size=60),
    st.lists(st.integers(-6, 6), min_size=60, max_size=60),
    st.integers(1, 7),
)
def test_compiled_histogram_bins_as_numpy(xs, ys, bins):
    """Points on edges, on the last edge and outside land as in numpy.histogram2d."""
    from cycj.spectrum.cycle_parts import histogram2d_add

    x = np.asarray(xs, float) * 0.5
    y = np.asarray(ys[: x.size], float) * 0.5
    w = np.where(np.arange(x.size) % 3 == 0, 0.5, 1.0)
    ex = np.linspace(-2.0, 2.0, bins + 1)
    ey = np.linspace(-1.5, 2.5, bins + 1)
    ref, _, _ = np.histogram2d(x, y, bins=(ex, ey), weights=w)
    got = np.zeros((bins, bins))
    histogram2d_add(x, y, w, ex, ey, got)
    np.testing.assert_array_equal(got, ref)
