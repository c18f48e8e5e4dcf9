"""Monte Carlo probability of failure under inspections, in fixed-size seeded chunks.

Each chunk draws its samples from its own child of ``numpy.random.SeedSequence(seed)``
(``spawn(n_chunks)``), so the answer does not depend on how chunks are spread over workers;
chunk results are sums, added in chunk order.  With a Dask scheduler the chunks run on the
cluster, otherwise in this process; the same seed gives the same numbers both ways.

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
   Wiley (2016): common random numbers (§5.2) and importance weights (§5.7).
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

    @property
    def n_chunks(self) -> int:
        return math.ceil(self.samples / self.chunk_size)

    def chunk_n(self, index: int) -> int:
        return min(self.chunk_size, self.samples - index * self.chunk_size)

    def seeds(self):
        return np.random.SeedSequence(self.seed).spawn(self.n_chunks)

    @property
    def start(self) -> float:
        """Cycles at which the simulated horizon starts (the last finding, else 0)."""
        return max((f.cycles for f in self.findings), default=0.0)


def uniform_schedule(interval: float, design_life: float, start: float = 0.0) -> np.ndarray:
    """Inspection times start + k·interval strictly before the design life [cycles]."""
    n = max(math.ceil((design_life - start) / interval) - 1, 0)
    return start + interval * np.arange(1, n + 1)


def draw_chunk(spec: McSpec, index: int, seed) -> dict:
    """The samples of one chunk: ln a0, C-factor, load row/weight, φ at failure, replacement
    sizes and detection uniforms (arrays of length n, or (n, n_max))."""
    rng = np.random.default_rng(seed)
    n = spec.chunk_n(index)
    d = spec.scatter.sample(rng, n)
    u_det = rng.random((n, spec.n_max))
    u_rep = rng.random((n, spec.n_max))
    tab = spec.table
    la0 = np.maximum(np.log(d["a0_mm"]), tab.la0)
    la_repl = np.maximum(np.log(spec.scatter.initial_crack.ppf(u_rep)), tab.la0)
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
        **d,
    }


def run_chunk(spec: McSpec, schedules: np.ndarray, n_insp: np.ndarray, index: int, seed) -> dict:
    """Simulate one chunk under each schedule and return weighted sums.

    ``schedules`` (n_sched, n_max) holds absolute inspection times [cycles] (padded),
    ``n_insp`` the count of each.  Returns sums ``sw, sw2`` (Σw, Σw²) and per schedule
    ``swf, sw2f`` (Σw·I, Σw²·I), ``swd`` (Σw·detections), ``hist`` (Σw·I per time bin of the
    horizon) and ``bins`` (Σw·I per inspection interval).
    """
    from cycj.plan.findings import apply_findings

    dr = draw_chunk(spec, index, seed)
    tab = spec.table
    weights = np.ones(dr["la0"].size)
    la_start = dr["la0"]
    t_start = spec.start
    if spec.findings:
        weights, la_start = apply_findings(dr, tab, spec.findings)
    horizon = spec.design_life - t_start
    n_sched = schedules.shape[0]
    ft, fb, nd = kernels.empty_outputs(n_sched, la_start.size)
    rel = np.ascontiguousarray(schedules - t_start)
    kernels.simulate(
        la_start,
        dr["xc"],
        dr["k"],
        dr["w"],
        dr["phic"],
        dr["la_repl"],
        dr["u_det"],
        rel,
        np.asarray(n_insp, np.int64),
        horizon,
        0 if spec.repair == "renew" else 1,
        spec.pod.model_code,
        spec.pod.mu,
        spec.pod.sigma,
        spec.pod.ceiling,
        tab.la0,
        tab.dla,
        tab.logphi,
        ft,
        fb,
        nd,
    )
    fail = ft <= horizon
    w2 = weights**2
    edges = np.linspace(0.0, horizon, spec.n_bins + 1)
    hist = np.zeros((n_sched, spec.n_bins))
    bins = np.zeros((n_sched, spec.n_max + 1))
    for s in range(n_sched):
        f = fail[s]
        idx = np.clip(np.searchsorted(edges, ft[s, f], side="right") - 1, 0, spec.n_bins - 1)
        hist[s] = np.bincount(idx, weights[f], minlength=spec.n_bins)
        bins[s] = np.bincount(fb[s, f], weights[f], minlength=spec.n_max + 1)[: spec.n_max + 1]
    return {
        "sw": weights.sum(),
        "sw2": w2.sum(),
        "swf": (fail * weights).sum(axis=1),
        "sw2f": (fail * w2).sum(axis=1),
        "swd": (nd * weights).sum(axis=1),
        "hist": hist,
        "bins": bins,
    }


def _add(total: dict | None, part: dict) -> dict:
    if total is None:
        return {k: np.array(v, float, copy=True) for k, v in part.items()}
    for k, v in part.items():
        total[k] = total[k] + v
    return total


class Runner:
    """Maps chunk jobs in this process or on a Dask distributed cluster (``scheduler`` is an
    address such as ``tcp://host:8786`` or a ``distributed.Client``)."""

    def __init__(self, scheduler=None):
        self.client = None
        self._own = False
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
        if self._own and self.client is not None:
            self.client.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def run(self, spec: McSpec, schedules, n_insp) -> dict:
        """Sum of :func:`run_chunk` over all chunks, added in chunk order."""
        seeds = spec.seeds()
        idx = range(spec.n_chunks)
        if self.client is None:
            parts = (run_chunk(spec, schedules, n_insp, i, seeds[i]) for i in idx)
            total = None
            for p in parts:
                total = _add(total, p)
            return total
        c = self.client
        [fspec] = c.scatter([spec], broadcast=True, hash=False)
        [fsch] = c.scatter([(schedules, n_insp)], broadcast=True, hash=False)
        futs = [c.submit(_remote_chunk, fspec, fsch, i, seeds[i], pure=False) for i in idx]
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


def summarise(total: dict) -> dict:
    """Probability of failure, its standard error and the mean detections per schedule."""
    sw = total["sw"]
    p = total["swf"] / sw
    var = (total["sw2f"] * (1 - 2 * p) + p**2 * total["sw2"]) / sw**2
    return {
        "pof": p,
        "std_error": np.sqrt(np.maximum(var, 0.0)),
        "detections_mean": total["swd"] / sw,
        "cumulative": np.cumsum(total["hist"], axis=1) / sw,
        "per_interval": total["bins"] / sw,
        "effective_samples": sw**2 / total["sw2"],
    }
