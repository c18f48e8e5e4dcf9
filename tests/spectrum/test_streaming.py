"""Streaming rainflow counts equal the in-memory count of the whole history, whatever the chunk
boundaries (ASTM E1049-85 §5.4.4 rules are the same; only the state is carried)."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cycj.spectrum.rainflow import rainflow_cycles
from cycj.spectrum.streaming import StreamingCount

COLUMNS = ("range", "mean", "count", "start", "end")


def _streamed(x, gate, cuts):
    sc = StreamingCount(gate)
    for part in np.split(np.asarray(x, float), sorted(cuts)):
        sc.feed(part)
    return sc.finish()


def _assert_same(x, gate, cuts):
    ref = rainflow_cycles(np.asarray(x, float), gate)
    got = _streamed(x, gate, cuts)
    for c in COLUMNS:
        np.testing.assert_array_equal(got[c], ref[c], err_msg=c)
    assert got["n_reversals"] == ref["n_reversals"]


# ASTM E1049-85 Fig. 6 history (docs/references.md R7): 4.0 cycles in all
E1049 = [-2.0, 1, -3, 5, -1, 3, -4, 4, -2]


@pytest.mark.parametrize("cuts", [[], [1], [3], [3, 4], list(range(1, 9)), [0, 0, 9]])
def test_e1049_example_at_every_kind_of_boundary(cuts):
    """Boundaries before, at and after turning points, every sample its own chunk, empty
    chunks."""
    _assert_same(E1049, 0.0, cuts)
    assert _streamed(E1049, 0.0, cuts)["count"].sum() == 4.0


def test_boundary_inside_a_plateau_and_in_the_lead_in():
    x = [0.0, 0.1, 0.0, 3, 3, 3, -2, -2, 4, 4, 4, -1]
    for cuts in ([4], [2], [1, 5, 7], [9]):
        _assert_same(x, 0.5, cuts)
        _assert_same(x, 0.0, cuts)


def test_constant_and_empty_histories():
    for x in ([], [2.0], [2.0, 2.0, 2.0], [0.0, 0.1, 0.0]):
        for cuts in ([], [1]):
            _assert_same(x, 0.5, [c for c in cuts if c <= len(x)])


@settings(max_examples=300, deadline=None, derandomize=True)
@given(
    st.lists(st.integers(-6, 6), min_size=0, max_size=120),
    st.lists(st.integers(0, 120), max_size=8),
    st.sampled_from([0.0, 0.5, 2.0, 5.0]),
)
def test_random_histories_random_boundaries(steps, cuts, gate):
    """Integer steps give plateaus and exact ties; cuts anywhere, repeated or empty chunks."""
    x = np.cumsum(np.asarray(steps, float)) if steps else np.empty(0)
    _assert_same(x, gate, [c for c in cuts if c <= x.size])


def test_non_finite_and_finished_are_errors():
    sc = StreamingCount()
    sc.feed([1.0, 2.0])
    with pytest.raises(ValueError, match="non-finite value at sample 3"):
        sc.feed([0.0, np.nan])
    sc.finish()
    with pytest.raises(ValueError, match="finished"):
        sc.feed([1.0])
    with pytest.raises(ValueError, match="gate"):
        StreamingCount(-1.0)
