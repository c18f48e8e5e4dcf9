"""The set-up of a life run on long blocks: peak kernels on the peak row only, the block table
sized by the block length and the life, the stepper for a life of a few blocks."""

import math

import numpy as np
import pytest

from cycj.life import blockmode as B
from cycj.life import model_array, predict_life
from cycj.life import stepper as K
from cycj.life.loads import block_loads
from tests.helpers import make_case


def test_grid_unchanged_for_short_blocks_and_long_lives():
    grid = B._grid(2.0, 20.0, 1000)
    assert np.array_equal(grid, np.linspace(2.0, 20.0, 600))
    assert np.array_equal(B._grid(2.0, 20.0, 200_000), np.linspace(2.0, 20.0, 100))


def test_grid_geometric_and_small_for_long_blocks_or_short_lives():
    long_block = B._grid(2.0, 20.0, 10_000_000)
    assert long_block.size == B.LONG_BLOCK_POINTS
    assert long_block[0] == 2.0 and long_block[-1] == 20.0
    assert np.allclose(np.diff(np.log(long_block)), math.log(10.0) / (long_block.size - 1))
    assert B._grid(2.0, 20.0, 1000, life_blocks=40.0).size == 10  # a quarter of the life
    assert B._grid(2.0, 20.0, 1000, life_blocks=9.0).size == B.FEW_BLOCKS


def test_estimated_life_is_the_power_law_segment():
    # G = g0 (a/a0)^p with p = 2: ∫ da / G = a0/(g0 (p − 1)) (1 − a0/a1) by hand
    assert B.estimated_life_blocks(1.0, 2.0, 1e-3, 4e-3) == pytest.approx(500.0, rel=1e-12)
    assert B.estimated_life_blocks(1.0, 2.0, 0.0, 4e-3) == math.inf


def test_peak_state_on_the_row_equals_the_whole_block():
    case = make_case()
    loads = block_loads(case, 1.0)
    mp = model_array(case, loads=loads)
    geo = case.geometry
    lmax = np.vstack([loads.lmax * 0.5, loads.lmax, loads.lmax * 0.7])
    got = K.peak_state(lmax, 1, 3.0, geo.code, geo.params, loads.ct, mp)
    whole = K.cycle_driving_force(lmax, 0.0 * lmax, 1, 3.0, geo.code, geo.params, loads.ct, mp)
    assert got == whole


def test_block_mode_on_a_life_of_a_few_blocks_is_the_stepper():
    # one cycle per block and a life of a few cycles: no table, the stepper all the way
    case = make_case(material={"growth": {"C": 4.0, "m": 1.0}})
    block = predict_life(case, method="block").summary
    cycle = predict_life(case, method="cycle").summary
    assert 1 < cycle["cycles_to_end"] < B.FEW_BLOCKS
    assert block["cycles_to_end"] == cycle["cycles_to_end"]
    assert block["a_end_mm"] == cycle["a_end_mm"]
