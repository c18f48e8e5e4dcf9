"""Reversals, rainflow counting and cycles in sequence."""

from collections import Counter
from pathlib import Path

import numpy as np
import pytest
import rainflow
from hypothesis import given, settings
from hypothesis import strategies as st

from cycj.spectrum import count_cycles, cycles_in_sequence, reversals
from cycj.spectrum.cycle_order import cycle_indices_in_sequence
from cycj.spectrum.reversals import block_reversal_values, block_reversals
from tests.helpers import read_check_csv

DATA = Path(__file__).parents[1] / "data"
_COUNTS = read_check_csv(DATA / "astm_e1049_85_fig6_counts.csv")
# ASTM E1049-85 Fig. 6 example history, points A..I (docs/references.md R7, from memory)
ASTM_E1049_FIG6 = [
    float(r["load"]) for r in read_check_csv(DATA / "astm_e1049_85_fig6_history.csv")
]
# from memory (ASTM E1049-85 §5.4.4; docs/references.md R7): cycles counted per range
ASTM_E1049_TABLE = {int(r["range"]): float(r["cycles_5_4_4"]) for r in _COUNTS}
# from memory (ASTM E1049-85 §5.4.5; docs/references.md R7): repeating history started at D, the
# ranges with a count (every one a full cycle)
ASTM_E1049_REPEAT = {
    int(r["range"]): float(r["cycles_5_4_5"]) for r in _COUNTS if float(r["cycles_5_4_5"]) != 0
}


def _per_range(df):
    out = Counter()
    for r, c in zip(df["range"], df["count"], strict=True):
        out[round(float(r), 9)] += float(c)
    return out


def test_astm_e1049_fig6_counts_from_memory():
    df = count_cycles(ASTM_E1049_FIG6)
    got = _per_range(df)
    for rng, cycles in ASTM_E1049_TABLE.items():
        assert got.get(float(rng), 0.0) == pytest.approx(cycles, abs=1e-12), rng
    assert df["count"].sum() == pytest.approx(4.0, abs=1e-12)
    assert list(df.columns) == ["range", "mean", "count", "start", "end"]
    # the two full cycles of range 4 and 8 (C-D is 8, E-F is 4): B-C is the half cycle
    full = df[df["count"] == 1.0]
    assert sorted(full["range"]) == pytest.approx([4.0], abs=0)
    assert full.iloc[0]["start"] == 4 and full.iloc[0]["end"] == 5  # E–F


def test_astm_e1049_repeating_history_from_memory():
    df = count_cycles(ASTM_E1049_FIG6, repeat=True)
    assert (df["count"] == 1.0).all()
    assert _per_range(df) == {float(k): v for k, v in ASTM_E1049_REPEAT.items()}
    # the count starts at D (sample 3), the largest absolute peak
    assert df["start"].min() == 3


def test_constant_history_has_no_cycles():
    for repeat in (False, True):
        df = count_cycles(np.full(1000, 3.5), repeat=repeat)
        assert len(df) == 0 and list(df.columns) == ["range", "mean", "count", "start", "end"]
    peak, valley = cycles_in_sequence(np.full(10, 2.0))
    assert peak.size == 0 and valley.size == 0


def test_plateaus_and_monotonic_stretches():
    x = np.array([0.0, 0.0, 1.0, 2.0, 2.0, 2.0, 1.0, -1.0, -1.0, 3.0, 3.0])
    v, i = reversals(x)
    assert v.tolist() == [0.0, 2.0, -1.0, 3.0]
    assert i.tolist() == [0, 3, 7, 9]  # a plateau is one point, at its first sample


def test_gate_keeps_values_and_indices():
    x = np.array([0.0, 10.0, 9.5, 9.8, 0.5, 0.7, 0.2, 8.0, -1.0])
    v, i = reversals(x, gate=1.0)
    assert v.tolist() == [0.0, 10.0, 0.2, 8.0, -1.0]
    assert i.tolist() == [0, 1, 6, 7, 8]
    ungated_v, _ = reversals(x)
    assert set(v) <= set(ungated_v)  # nothing shifted


def test_rejects_non_finite():
    with pytest.raises(ValueError, match="non-finite"):
        count_cycles([0.0, np.nan, 1.0])
    with pytest.raises(ValueError, match="gate"):
        count_cycles([0.0, 1.0], gate=-1.0)


def _multiset(rows):
    return Counter((round(r, 9), round(m, 9), c) for r, m, c in rows)


histories = st.lists(st.integers(min_value=-20, max_value=20), min_size=3, max_size=60).map(
    lambda xs: np.array(xs, dtype=float) / 4.0
)


@settings(max_examples=300, deadline=None)
@given(histories)
def test_matches_rainflow_package_oracle(x):
    # oracle: PyPI `rainflow` 3.2 (general-purpose ASTM E1049 §5.4.4 implementation)
    ours = count_cycles(x)
    oracle = [
        (r, m, c) for r, m, c, _, _ in rainflow.extract_cycles(x.tolist()) if r > 0
    ]  # `rainflow` reports a constant history as one zero-range half cycle
    got = zip(ours["range"], ours["mean"], ours["count"], strict=True)
    assert _multiset(got) == _multiset(oracle)


@settings(max_examples=200, deadline=None)
@given(histories, st.sampled_from([0.0, 0.25, 1.0, 2.5]))
def test_every_reversal_used_once(x, gate):
    v, _ = reversals(x, gate)
    df = count_cycles(x, gate=gate)
    full = (df["count"] == 1.0).sum()
    half = (df["count"] == 0.5).sum()
    assert 2 * full + half == max(len(v) - 1, 0)
    rep = count_cycles(x, gate=gate, repeat=True)
    bv, _ = block_reversals(x, gate)
    assert (rep["count"] == 1.0).all()
    assert 2 * len(rep) == max(len(bv) - 1, 0)


@settings(max_examples=200, deadline=None)
@given(histories, st.sampled_from([0.25, 1.0, 2.5]))
def test_gate_drops_only_small_pairs(x, gate):
    v, i = reversals(x, gate)
    # inner ranges of the gated reversals are all at least the gate
    if len(v) > 3:
        assert np.abs(np.diff(v))[1:-1].min() >= gate
    # gated points are samples of the history, unchanged
    assert np.array_equal(x[i], v)
    # the repeat-mode count keeps every full cycle whose range is at least the gate
    big = sorted(r for r in count_cycles(x, repeat=True)["range"] if r >= gate)
    gated = sorted(count_cycles(x, gate=gate, repeat=True)["range"])
    assert gated == pytest.approx(big, abs=1e-12)


@settings(max_examples=200, deadline=None)
@given(histories, st.sampled_from([0.0, 1.0]))
def test_cycles_in_sequence_orders(x, gate):
    rep = count_cycles(x, gate=gate, repeat=True)
    peak, valley = cycles_in_sequence(x, gate, order="closing")
    assert peak.dtype == np.float64 and valley.dtype == np.float64
    assert np.all(peak >= valley)
    assert (peak - valley) == pytest.approx(rep["range"].to_numpy(), abs=1e-12)
    assert 0.5 * (peak + valley) == pytest.approx(rep["mean"].to_numpy(), abs=1e-12)
    p2, v2 = cycles_in_sequence(x, gate, order="reversal")
    assert len(p2) == len(peak) and np.all(p2 >= v2)
    # the same reversals are used: same multiset of peaks and of valleys
    assert sorted(p2) == sorted(peak) and sorted(v2) == sorted(valley)


@settings(max_examples=300, deadline=None)
@given(
    st.lists(st.integers(min_value=-20, max_value=20), min_size=0, max_size=60).map(
        lambda xs: np.array(xs, dtype=float) / 4.0
    ),
    st.sampled_from([0.0, 0.25, 1.0, 2.5]),
)
def test_lean_block_path_equals_the_index_path(x, gate):
    # the life engine's block (values only, rotated and cleaned in place, rainflow writing the
    # cycles' extremes) equals the reversals and sample indices of the counting path, value
    # for value, plateaus, gates, empty and constant histories included
    v_index = block_reversals(x, gate)[0] if x.size else np.empty(0)
    assert np.array_equal(block_reversal_values(x, gate), v_index)
    peak_i, valley_i = cycle_indices_in_sequence(x, gate, "closing")
    peak, valley = cycles_in_sequence(x, gate, order="closing")
    assert np.array_equal(peak, x[peak_i]) and np.array_equal(valley, x[valley_i])


def test_lean_block_path_starts_on_the_first_largest_extreme():
    # |−4| = |4| twice: the block starts on the first of them, as np.argmax(np.abs(v)) does
    x = np.array([1.0, -4.0, 2.0, 4.0, 0.0, -4.0, 3.0])
    # reversals 1, −4, 4, −4, 3; rotated to the first −4 and closed: −4, 4, −4, 3, 1, −4;
    # 3 → 1 → −4 falls throughout, so 1 is no longer a turning point at the junction
    assert np.array_equal(block_reversal_values(x), [-4.0, 4.0, -4.0, 3.0, -4.0])
    assert np.array_equal(block_reversal_values([5.0, 1.0, 9.0, -9.0]), [9.0, -9.0, 5.0, 1.0, 9.0])


def test_reversal_order_keeps_overload_in_place():
    base = np.tile([0.0, 10.0], 20)
    x = np.concatenate((base[:10], [0.0, 25.0], base[10:], [0.0]))
    p_rev, _ = cycles_in_sequence(x, order="reversal")
    p_cls, _ = cycles_in_sequence(x, order="closing")
    assert int(np.argmax(p_rev)) == 5  # sixth rising reversal, as in time
    assert int(np.argmax(p_cls)) == len(p_cls) - 1  # closes last in rainflow order
    with pytest.raises(ValueError, match="closing"):
        cycles_in_sequence(x, order="random")
