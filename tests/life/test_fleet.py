"""A fleet of cases: one output folder per case and a table sorted by remaining life; the Dask
path gives the same table as the in-process path."""

from pathlib import Path

import pandas as pd
import pytest

from cycj.life.fleet import run_fleet

EX = Path(__file__).parents[2] / "examples"
CASES = [str(EX / "lab_compact_tension.toml"), str(EX / "plate_inspection.toml")]


def test_fleet_in_process(tmp_path):
    table = run_fleet(CASES, tmp_path / "fleet")
    assert list(table["cycles_to_end"]) == sorted(table["cycles_to_end"])
    assert (tmp_path / "fleet" / "fleet.csv").is_file()
    for out in table["output"]:
        assert (Path(out) / "summary.json").is_file()
    saved = pd.read_csv(tmp_path / "fleet" / "fleet.csv")
    assert len(saved) == 2


def test_fleet_on_dask_matches(tmp_path):
    distributed = pytest.importorskip("distributed")
    local = run_fleet(CASES, tmp_path / "a")
    with distributed.LocalCluster(
        n_workers=1, threads_per_worker=1, processes=False, dashboard_address=":0"
    ) as cluster:
        remote = run_fleet(CASES, tmp_path / "b", scheduler=cluster.scheduler_address)
    assert list(remote["cycles_to_end"]) == list(local["cycles_to_end"])
    assert list(remote["end_reason"]) == list(local["end_reason"])


def test_interrupted_run_leaves_nothing(tmp_path):
    from cycj.case import load_case
    from cycj.life import LifeInterrupted
    from cycj.life.write import run_and_write

    def stop(cycles, a):
        raise KeyboardInterrupt

    out = tmp_path / "o"
    with pytest.raises(LifeInterrupted, match="stopped by the user after"):
        run_and_write(load_case(EX / "crane_edge_crack.toml"), out, method="cycle", progress=stop)
    assert not out.exists()
    assert list(tmp_path.iterdir()) == []
