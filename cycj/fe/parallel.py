"""The load sequences of a J table in parallel: worker processes of this machine, or tasks on
a Dask distributed cluster.

Each job is one call of :func:`cycj.fe.table.solve_series` (one crack size, one curve) and is
deterministic, so the table does not depend on where or in which order its jobs ran.  Worker
processes are started with ``spawn`` and keep one thread for the numerical libraries each
(the jobs themselves are the parallelism).  ``CYCJ_WORKERS`` sets the number of processes, as
for the other jobs of cycj; the default is the usable cores, at most the number of jobs.
"""

from __future__ import annotations

import os

from cycj.errors import CycjInputError
from cycj.workers import usable_cores

_THREAD_VARS = ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS")


def cores() -> int:
    """Usable cores (:func:`cycj.workers.usable_cores`)."""
    return usable_cores()


def processes(workers, n_jobs: int) -> int:
    """Worker processes for ``n_jobs`` jobs: ``workers`` (default :func:`cores`), at most one
    per job."""
    return min(cores() if workers is None else max(int(workers), 1), n_jobs)


def _job(kwargs):
    from cycj.fe.table import solve_series

    return solve_series(**kwargs)


def _client(scheduler):
    try:
        from dask.distributed import Client
    except ImportError:
        raise CycjInputError(
            "--scheduler needs dask.distributed; install it with pip install 'cycj[dask]'",
            key="--scheduler",
        ) from None
    if isinstance(scheduler, Client):
        return scheduler, False
    try:
        return Client(str(scheduler), timeout="20s"), True
    except OSError as exc:
        raise CycjInputError(
            f"cannot reach the Dask scheduler ({exc})", key="--scheduler", found=str(scheduler)
        ) from None


def run_jobs(jobs, workers: int | None = None, scheduler=None) -> list:
    """Results of :func:`cycj.fe.table.solve_series` for each job (a dict of its keyword
    arguments), in the jobs' order: on the Dask ``scheduler`` (address or client) if given,
    else in ``workers`` processes (default :func:`cores`; 1 runs them here)."""
    jobs = list(jobs)
    if scheduler is not None:
        client, own = _client(scheduler)
        try:
            futures = [client.submit(_job, j, pure=False) for j in jobs]
            return client.gather(futures)
        finally:
            if own:
                client.close()
    n = processes(workers, len(jobs))
    import multiprocessing as mp

    if n <= 1 or mp.current_process().daemon:  # a daemonic worker (Dask's) may not fork
        return [_job(j) for j in jobs]
    from concurrent.futures import ProcessPoolExecutor

    saved = {v: os.environ.get(v) for v in _THREAD_VARS}
    os.environ.update({v: "1" for v in _THREAD_VARS})  # inherited by the spawned workers
    try:
        with ProcessPoolExecutor(n, mp_context=mp.get_context("spawn")) as ex:
            return list(ex.map(_job, jobs))
    finally:
        for v, old in saved.items():
            if old is None:
                os.environ.pop(v, None)
            else:
                os.environ[v] = old
