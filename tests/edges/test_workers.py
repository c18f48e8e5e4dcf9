"""The default worker count, shared by the planning Monte Carlo and the finite-element table."""

import os

import pytest

from cycj.fe.parallel import cores, processes
from cycj.plan.montecarlo import default_workers
from cycj.workers import usable_cores


def test_cycj_workers_sets_every_default(monkeypatch):
    monkeypatch.setenv("CYCJ_WORKERS", "3")
    assert usable_cores() == cores() == default_workers() == 3
    assert processes(None, 2) == 2  # never more processes than jobs
    assert processes(5, 10) == 5


@pytest.mark.parametrize("raw", ["", "0", "-2", "two", "1.5"])
def test_without_a_positive_count_the_affinity_decides(monkeypatch, raw):
    monkeypatch.setenv("CYCJ_WORKERS", raw)
    assert usable_cores() == len(os.sched_getaffinity(0)) == default_workers() == cores()
