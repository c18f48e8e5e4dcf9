"""Monte Carlo probability of failure under inspections, in fixed-size seeded chunks.

Chunk ``k`` draws its samples from ``numpy.random.SeedSequence(seed, spawn_key=(k,))`` (the
k-th child of the seed), so a chunk's samples depend on neither the number of chunks nor the
number of workers, and adding chunks adds samples without changing the earlier ones; chunk
results are sums, added in chunk order.  The chunks run on threads of this process (the
compiled kernel and numpy's bulk draws release the GIL; ``CYCJ_WORKERS`` sets the number,
default all cores) or on a Dask cluster; the same seed gives the same numbers every way.

With ``shift`` set (importance sampling), the scattered inputs are drawn in standard normal
space around ``shift`` instead of at the origin and each sample carries the likelihood ratio
w = φ(u)/φ(u − shift) = exp(−z·shift − |shift|²/2) (z the unshifted draw); the probability of
failure is then the plain mean Σw·I/n with variance (Σw²·I/n − p²)/(n − 1).

Per sample and schedule: the crack grows along its life coordinate (see
:mod:`cycj.plan.simulation_kernels`); at each inspection it is found with
probability POD(a); a found
crack is replaced by a new initial crack (``renew``) or removed for good (``remove``); failure
is reaching the critical size before the horizon.  Samples may carry weights (Bayes update on
findings, :mod:`cycj.plan.findings`); the probability of failure is the weighted mean of the
failure indicator with standard error √(Σw²(I − p)²)/Σw.

References
----------
.. [1] MIL-HDBK-1823A (2009) (POD); Berens, A. P., ASM Handbook Vol. 17 (1989) 689–701.
.. [2] Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
   Wiley (2016): common random numbers (§5.2) and importance sampling (§5.7).
.. [3] numpy.random.SeedSequence: independent child streams by spawn key (NumPy
   documentation, "Parallel random number generation").
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from cycj.errors import CycjInputError
from cycj.plan import simulation_kernels as kernels
from cycj.plan.curves import CurveTable
from cycj.plan.pod import PodCurve
from cycj.plan.scatter import Scatter

#: samples per chunk (fixed, independent of the number of workers)
CHUNK_SIZE = 10_000


@dataclass(frozen=True)
class McSpec:
    """Everything a chunk needs (picklable, for Dask workers)."""

    table: CurveTable
    scatter: Scatter
    pod: PodCurve
    design_life: float
    samples: int
    seed: int
    repair: str = "renew"
    n_max: int = 20
    chunk_size: int = CHUNK_SIZE
    findings: tuple = field(default=())
    n_bins: int = 60
    #: importance-sampling centre in standard normal space, one value per scattered input
    #: in :data:`cycj.plan.scatter.VARIABLES` order (None: plain Monte Carlo)
    shift: tuple | None = None
    #: edges [cycles from the start] of the periods (years or blocks) of ``hist_period``
    period_edges: tuple = ()

    @property
    def n_chunks(self) -> int:
        return math.ceil(self.samples / self.chunk_size)

    def chunk_n(self, index: int) -> int:
        return min(self.chunk_size, self.samples - index * self.chunk_size)

    def chunk_seed(self, index: int):
        """The seed of chunk ``index`` (independent of the number of chunks and workers)."""
        return np.random.SeedSequence(self.seed, spawn_key=(index,))

    def seeds(self):
        return [self.chunk_seed(i) for i in range(self.n_chunks)]

    @property
    def start(self) -> float:
        """Cycles at which the simulated horizon starts (the last finding, else 0)."""
        return max((f.cycles for f in self.findings), default=0.0)


def uniform_schedule(interval: float, design_life: float, start: float = 0.0) -> np.ndarray:
    """Inspection times start + k·interval strictly before the design life [cycles]."""
    n = max(math.ceil((design_life - start) / interval) - 1, 0)
    return start + interval * np.arange(1, n + 1)


def _substream(seed, k: int):
    """Generator of the k-th sub-stream of a chunk's seed (detections 1, replacements 2)."""
    ss = seed if isinstance(seed, np.random.SeedSequence) else np.random.SeedSequence(seed)
    return np.random.default_rng(
        np.random.SeedSequence(ss.entropy, spawn_key=tuple(ss.spawn_key) + (k,))
    )


def _per_inspection(rng, m: int, n: int) -> np.ndarray:
    """(m, n) uniforms, one row per inspection, so the first m' < m inspections get the same
    numbers whatever m a run needs."""
    return rng.random((m, n))


def draw_chunk(spec: McSpec, index: int, seed, n_insp: int | None = None) -> dict:
    """The samples of one chunk: ln a0, C-factor, load row/weight, φ at failure, replacement
    sizes and detection uniforms (arrays of length n, or (n_insp, n), n_insp ≤ n_max: the
    inspections the run needs, one row each; the uniforms of inspection j do not depend on
    n_insp)."""
    rng = np.random.default_rng(seed)
    n = spec.chunk_n(index)
    w_is = np.ones(n)
    u_normal = None
    if spec.shift is None:
        d = spec.scatter.sample(rng, n)
    else:
        d, w_is = spec.scatter.sample_shifted(rng, n, spec.shift)
        u_normal = d.pop("u_normal")
    m = max(spec.n_max if n_insp is None else min(int(n_insp), spec.n_max), 1)
    u_det = _per_inspection(_substream(seed, 1), m, n)
    tab = spec.table
    la0 = np.maximum(np.log(d["a0_mm"]), tab.la0)
    ini = spec.scatter.initial_crack
    if spec.repair == "renew" and ini.scatters:
        u_rep = _per_inspection(_substream(seed, 2), m, n)
        la_repl = np.maximum(ini.log_ppf(u_rep), tab.la0)
    else:  # not used (remove) or one size
        la_repl = np.full((m, n), max(math.log(ini.median), tab.la0))
    k, w = tab.load_position(d["load_factor"])
    lac = tab.critical_log_size(k, w, d["toughness_factor"])
    return {
        "la0": la0,
        "xc": d["c_factor"],
        "k": k,
        "w": w,
        "lac": lac,
        "phic": tab.phi(lac, k, w),
        "la_repl": la_repl,
        "u_det": u_det,
        "la_thr": spec.pod.log_threshold(u_det),
        "w_is": w_is,
        "u_normal": u_normal,
        **d,
    }


def _chunk_start(spec: McSpec, n_insp, index: int, seed):
    """A chunk's draws, sample weights (importance sampling × findings), ln size at the
    start of the simulated horizon and the horizon [cycles]."""
    from cycj.plan.findings import apply_findings

    dr = draw_chunk(spec, index, seed, int(np.max(n_insp, initial=0)))
    weights = dr["w_is"]
    la_start = dr["la0"]
    if spec.findings:
        wf, la_start = apply_findings(dr, spec.table, spec.findings)
        weights = weights * wf
    return dr, weights, la_start, spec.design_life - spec.start


def _kernel_inputs(spec: McSpec, dr: dict, la_start, schedules, n_insp, horizon) -> tuple:
    """The leading arguments of the simulation kernels (samples, schedules, curve table)."""
    tab = spec.table
    return (
        la_start,
        dr["xc"],
        dr["k"],
        dr["w"],
        dr["phic"],
        dr["la_repl"],
        dr["la_thr"],
        np.ascontiguousarray(schedules - spec.start),
        np.asarray(n_insp, np.int64),
        horizon,
        0 if spec.repair == "renew" else 1,
        tab.la0,
        tab.dla,
        tab.logphi,
    )


def simulate_samples(spec: McSpec, schedules: np.ndarray, n_insp: np.ndarray, index: int, seed):
    """Simulate one chunk under each schedule: the draws, the sample weights, failure times
    and bins and detections (n_sched, n), and the horizon [cycles]."""
    dr, weights, la_start, horizon = _chunk_start(spec, n_insp, index, seed)
    ft, fb, nd = kernels.empty_outputs(schedules.shape[0], la_start.size)
    kernels.simulate(*_kernel_inputs(spec, dr, la_start, schedules, n_insp, horizon), ft, fb, nd)
    return dr, weights, ft, fb, nd, horizon


def run_chunk(spec: McSpec, schedules: np.ndarray, n_insp: np.ndarray, index: int, seed) -> dict:
    """Simulate one chunk under each schedule and return weighted sums.

    ``schedules`` (n_sched, n_max) holds absolute inspection times [cycles] (padded),
    ``n_insp`` the count of each.  Returns sums ``n`` (samples), ``sw, sw2`` (Σw, Σw²) and per
    schedule ``nf`` (failing samples), ``swf, sw2f`` (Σw·I, Σw²·I), ``swd`` (Σw·detections),
    ``hist`` (Σw·I per time bin of the horizon), ``hist_period`` (per reporting period) and
    ``bins`` (Σw·I per inspection interval).
    """
    dr, weights, la_start, horizon = _chunk_start(spec, n_insp, index, seed)
    n_sched = schedules.shape[0]
    sums = np.zeros((n_sched, 4))
    hist = np.zeros((n_sched, spec.n_bins))
    bins = np.zeros((n_sched, spec.n_max + 1))
    pedges = np.concatenate([[0.0], np.asarray(spec.period_edges, float)])
    hper = np.zeros((n_sched, max(pedges.size - 1, 1)))
    kernels.simulate_sums(
        *_kernel_inputs(spec, dr, la_start, schedules, n_insp, horizon),
        weights,
        np.linspace(0.0, horizon, spec.n_bins + 1),
        pedges,
        sums,
        hist,
        bins,
        hper,
    )
    return {
        "n": float(weights.size),
        "nf": sums[:, 0].copy(),
        "hist_period": hper,
        "sw": weights.sum(),
        "sw2": (weights**2).sum(),
        "swf": sums[:, 1].copy(),
        "sw2f": sums[:, 2].copy(),
        "swd": sums[:, 3].copy(),
        "hist": hist,
        "bins": bins,
    }


def _add(total: dict | None, part: dict) -> dict:
    if total is None:
        return {k: np.array(v, float, copy=True) for k, v in part.items()}
    for k, v in part.items():
        total[k] = total[k] + v
    return total


def default_workers() -> int:
    """Threads for in-process chunks (:func:`cycj.workers.usable_cores`)."""
    from cycj.workers import usable_cores

    return usable_cores()


class Runner:
    """Maps chunk jobs over threads of this process (``workers``, default
    :func:`default_workers`) or on a Dask distributed cluster (``scheduler`` is an address such
    as ``tcp://host:8786`` or a ``distributed.Client``).  Results are added in chunk order, so
    they do not depend on the number of workers."""

    def __init__(self, scheduler=None, workers: int | None = None):
        self.client = None
        self._own = False
        self.workers = default_workers() if workers is None else max(int(workers), 1)
        self._pool = None
        if scheduler is None:
            return
        try:
            from dask.distributed import Client
        except ImportError:
            raise CycjInputError(
                "running on a cluster needs dask.distributed; install it with "
                "pip install 'cycj[dask]'",
                key="--scheduler",
            ) from None
        if isinstance(scheduler, Client):
            self.client = scheduler
        else:
            try:
                self.client = Client(str(scheduler), timeout="20s")
            except OSError as exc:
                raise CycjInputError(
                    f"cannot reach the Dask scheduler ({exc})",
                    key="--scheduler",
                    found=str(scheduler),
                ) from None
            self._own = True

    def close(self):
        if self._pool is not None:
            self._pool.shutdown()
            self._pool = None
        if self._own and self.client is not None:
            self.client.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def run(self, spec: McSpec, schedules, n_insp, chunks=None) -> dict:
        """Sum of :func:`run_chunk` over ``chunks`` (default all), added in chunk order."""
        idx = list(range(spec.n_chunks) if chunks is None else chunks)
        if self.client is None:
            if self.workers > 1 and len(idx) > 1:
                if self._pool is None:
                    from concurrent.futures import ThreadPoolExecutor

                    self._pool = ThreadPoolExecutor(self.workers)
                parts = self._pool.map(
                    lambda i: run_chunk(spec, schedules, n_insp, i, spec.chunk_seed(i)), idx
                )
            else:
                parts = (run_chunk(spec, schedules, n_insp, i, spec.chunk_seed(i)) for i in idx)
            total = None
            for p in parts:  # in chunk order
                total = _add(total, p)
            return total
        c = self.client
        [fspec] = c.scatter([spec], broadcast=True, hash=False)
        [fsch] = c.scatter([(schedules, n_insp)], broadcast=True, hash=False)
        futs = [
            c.submit(_remote_chunk, fspec, fsch, i, spec.chunk_seed(i), pure=False) for i in idx
        ]
        total = None
        for f in futs:  # in chunk order
            total = _add(total, f.result())
        return total


def _remote_chunk(spec, sched, index, seed):
    return run_chunk(spec, sched[0], sched[1], index, seed)


def pack_schedules(schedules, n_max: int):
    """Pad a list of time arrays into an (n_sched, n_max) array (inf) and counts."""
    arr = np.full((len(schedules), max(n_max, 1)), np.inf)
    n = np.zeros(len(schedules), np.int64)
    for s, t in enumerate(schedules):
        t = np.sort(np.asarray(t, float))
        if t.size > n_max:
            raise ValueError(f"schedule {s} has {t.size} inspections > n_max = {n_max}")
        arr[s, : t.size] = t
        n[s] = t.size
    return arr, n


def summarise(total: dict, importance: bool = False) -> dict:
    """Probability of failure, its standard error and the mean detections per schedule.

    Weighted samples (findings) give the ratio estimate Σw·I/Σw; importance-sampling weights
    (``importance``) the plain mean Σw·I/n, whose variance does not suffer from the spread of
    Σw.
    """
    n = total["n"]
    if importance:
        p = total["swf"] / n
        var = np.maximum(total["sw2f"] / n - p**2, 0.0) / max(n - 1.0, 1.0)
        norm = n
    else:
        sw = total["sw"]
        p = total["swf"] / sw
        var = (total["sw2f"] * (1 - 2 * p) + p**2 * total["sw2"]) / sw**2
        norm = sw
    return {
        "pof": p,
        "std_error": np.sqrt(np.maximum(var, 0.0)),
        "detections_mean": total["swd"] / norm,
        "cumulative": np.cumsum(total["hist"], axis=1) / norm,
        "per_interval": total["bins"] / norm,
        "per_period": total["hist_period"] / norm,
        "failures": total["nf"],
        "samples": n,
        "effective_samples": total["sw"] ** 2 / total["sw2"],
    }


def take(total: dict, rows) -> dict:
    """The sums of the schedules ``rows`` (a slice or index array) of a :func:`run_chunk`
    total; the per-sample sums are kept."""
    return {k: (v[rows] if np.ndim(v) >= 1 else v) for k, v in total.items()}


def merge(a: dict | None, b: dict) -> dict:
    """Sums of two disjoint sets of chunks over the same schedules."""
    return _add(a, b) if a is not None else _add(None, b)
