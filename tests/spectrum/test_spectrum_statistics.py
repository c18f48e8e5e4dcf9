"""Spectrum statistics, generators and plots."""

import numpy as np
import pytest

from cycj.spectrum import count_cycles
from cycj.spectrum.generators import (
    block_programme,
    constant_amplitude,
    exceedance_sequence,
    gaussian_from_irregularity,
    gaussian_from_psd,
    insert_excursions,
)
from cycj.spectrum.statistics import (
    from_to_matrix,
    irregularity_factor,
    level_crossings,
    range_exceedance,
    range_mean_matrix,
    spectral_moments,
)


def test_constant_amplitude_counts():
    x = constant_amplitude(10.0, 2.0, 25)
    df = count_cycles(x)
    full = df[df["count"] == 1.0]
    assert df["count"].sum() == pytest.approx(25.0, abs=1e-12)
    assert full["range"].to_numpy() == pytest.approx(8.0, abs=1e-12)
    assert full["mean"].to_numpy() == pytest.approx(6.0, abs=1e-12)
    wave = constant_amplitude(10.0, 2.0, 25, points_per_cycle=16)
    assert count_cycles(wave)["count"].sum() == pytest.approx(25.0, abs=1e-12)


def test_block_programme_repeat_count():
    x = block_programme([(10.0, 0.0, 3), (6.0, 2.0, 5)], repeats=2)
    df = count_cycles(x, repeat=True)
    per = df.groupby("range")["count"].sum().to_dict()
    # 3 + 5 cycles a pass; where the blocks meet, one small cycle grows to 0 → 6 (range 6)
    assert per == {4.0: 8.0, 6.0: 2.0, 10.0: 6.0}


def test_level_crossings_exact():
    x = constant_amplitude(10.0, 0.0, 5)
    # up-crossing of L on a rise v → p when v < L <= p
    assert level_crossings(x, [11.0, 10.0, 0.5, 0.0, -1.0]).tolist() == [0, 5, 5, 0, 0]


def test_range_exceedance():
    levels, cum = range_exceedance([2.0, 5.0, 2.0, 1.0], [1.0, 0.5, 1.0, 0.5])
    assert levels.tolist() == [5.0, 2.0, 1.0]
    assert cum.tolist() == pytest.approx([0.5, 2.5, 3.0], abs=1e-12)


def test_matrices_conserve_counts():
    rng = np.random.default_rng(3)
    x = rng.normal(size=2000)
    df = count_cycles(x)
    rm, r_edges, m_edges = range_mean_matrix(df["range"], df["mean"], df["count"], 10, 12)
    assert rm.shape == (10, 12) and len(r_edges) == 11 and len(m_edges) == 13
    assert rm.sum() == pytest.approx(df["count"].sum(), rel=1e-12)
    ft, edges = from_to_matrix(x, df["start"], df["end"], df["count"], 16)
    assert ft.sum() == pytest.approx(df["count"].sum(), rel=1e-12)
    # rising cycles never lie below the diagonal of the from–to matrix, falling ones never above
    up = x[df["end"]] > x[df["start"]]
    assert np.tril(ft, -1).sum() <= df["count"][~up].sum() + 1e-9
    assert np.triu(ft, 1).sum() <= df["count"][up].sum() + 1e-9
    assert np.tril(ft, -1).sum() > 0 and np.triu(ft, 1).sum() > 0


def test_irregularity_factor_limits():
    # narrow band (constant amplitude): one mean up-crossing per peak (Rice 1944/45)
    assert irregularity_factor(constant_amplitude(5.0, -5.0, 100, 20)) == pytest.approx(
        1.0, abs=0.02
    )


@pytest.mark.parametrize("target", [0.4, 0.7, 0.95])
def test_gaussian_from_irregularity(target):
    # Rice (1944/45): expected irregularity factor m2/sqrt(m0 m4) of the PSD used
    x, f, s = gaussian_from_irregularity(100_000, target, rms=3.0, mean=20.0, seed=7)
    m0, m2, m4 = spectral_moments(f, s)
    assert m2 / np.sqrt(m0 * m4) == pytest.approx(target, abs=1e-6)
    assert x.std() == pytest.approx(3.0, rel=0.05)
    assert x.mean() == pytest.approx(20.0, abs=0.1)
    assert irregularity_factor(x) == pytest.approx(target, abs=0.05)
    again, _, _ = gaussian_from_irregularity(100_000, target, rms=3.0, mean=20.0, seed=7)
    assert np.array_equal(x, again)


def test_gaussian_from_psd_variance():
    f = np.array([0.5, 1.0, 2.0, 2.5])
    s = np.array([0.0, 4.0, 4.0, 0.0])
    x = gaussian_from_psd(f, s, 2**16, 0.05, mean=1.0, seed=1)
    m0 = spectral_moments(f, s, (0,))[0]
    assert x.var() == pytest.approx(m0, rel=0.05)


def test_exceedance_sequence_reproduces_table():
    amps = [40.0, 25.0, 10.0, 4.0]
    cum = [2, 20, 200, 2000]
    x = exceedance_sequence(amps, cum, mean=50.0, n_subblocks=5, seed=11)
    # counted as a repeating block, the rainflow cycles give back the table exactly
    df = count_cycles(x, repeat=True)
    assert df["mean"].to_numpy() == pytest.approx(50.0, abs=1e-12)
    for a, c in zip(amps, cum, strict=True):
        assert df["count"][df["range"] >= 2 * a].sum() == pytest.approx(c, abs=1e-12)
    # the two largest cycles sit in different sub-blocks (randomised, spread)
    big = np.flatnonzero(x == 90.0)
    assert len(big) == 2 and big[1] - big[0] > len(x) // 10
    assert not np.array_equal(x, exceedance_sequence(amps, cum, 50.0, 5, seed=12))


def test_insert_excursions():
    base = constant_amplitude(10.0, 0.0, 6)
    x = insert_excursions(base, 4, 25.0, offset=2)
    assert len(x) == len(base) + 3
    df = count_cycles(x, repeat=True)
    # each overload (after a valley) replaces one 0–10 cycle by a 0–25 cycle
    assert (df["range"] == 25.0).sum() == 3 and len(df) == 6


def test_plots_write_png(tmp_path):
    from cycj.spectrum import plots

    x = constant_amplitude(10.0, 0.0, 20, 8)
    df = count_cycles(x)
    rm, re_, me = range_mean_matrix(df["range"], df["mean"], df["count"], 5, 5)
    levels, cum = range_exceedance(df["range"], df["count"])
    for p in (
        plots.plot_history(x, tmp_path / "h.png", unit="kN"),
        plots.plot_exceedance(levels, cum, tmp_path / "e.png", unit="kN"),
        plots.plot_rainflow_matrix(rm, re_, me, tmp_path / "m.png", unit="kN"),
    ):
        assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
