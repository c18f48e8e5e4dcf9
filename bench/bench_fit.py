"""Benchmarks of ``cycj fit`` (targets < 30 s each on 2 shared cores).

1. Reduce 10⁴ recorded loops of 500 samples each: synthesises the loops with the virtual test
   frame (not timed), then times the compiled loop reduction alone and the whole per-log
   reduction (compliance → a, opening load, loop area, ΔJ, rates).  The first call includes
   numba compilation (or loading from the cache); it is timed separately.
2. A replicate programme of 100 specimens × 200 readings in one long-format file, fitted with
   1,000 resamples (``fit_logs``: reduction, rates, regressions, cluster bootstrap,
   per-specimen fits, direct a(N) fit).
3. The coverage study on the virtual test frame: 200 programmes of 8 specimens (known C, m,
   noise on a, σ_ln C = 0.15 between specimens, fixed seed): the share of nominal 95 %
   intervals of m, da/dN at mid-range and σ_ln C that hold the truth (the tests run fewer),
   for the recommended direct a(N) fit with readings at equal crack extension and at equal
   cycles (as the example logs), the incremental polynomial regression at equal cycles (its
   bias where growth accelerates), then 200 single-specimen programmes (moving-block
   bootstrap; the truth of da/dN is the specimen's own C).

    python bench/bench_fit.py [n_loops] [samples] [all|coverage]
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

import numpy as np

SPECIMEN = """
shape = "compact-tension"
width = "50 mm"
thickness = "12.5 mm"
crack_length = "15 mm"
elastic_modulus = "205 GPa"
poisson_ratio = 0.3
yield_strength = "450 MPa"
cyclic_curve = { strength_coefficient = "820 MPa", hardening_exponent = 0.14 }
displacement_at = "front-face"
"""


def main(n_loops=10_000, samples=500):
    from cycj.calibrate import loops, reduction
    from cycj.calibrate.logs import RawLog
    from cycj.calibrate.simulate import simulate_test
    from cycj.calibrate.specimen import read_specimen

    with tempfile.TemporaryDirectory() as tmp:
        p = Path(tmp) / "spec.toml"
        p.write_text(SPECIMEN)
        spec = read_specimen(p)
    t0 = time.perf_counter()
    # choose the recording interval that gives about n_loops loops over the test
    sim0 = simulate_test(
        spec,
        6e-5,
        1.5,
        p_max=14000,
        r_ratio=0.1,
        crack_end=30,
        record_every=100,
        samples=8,
        opening_fraction=0.2,
    )
    life = sim0.truth.cycle.iloc[-1]
    every = max(int(life / n_loops), 1)
    sim = simulate_test(
        spec,
        6e-5,
        1.5,
        p_max=14000,
        r_ratio=0.1,
        opening_fraction=0.2,
        crack_end=30,
        record_every=every,
        samples=samples,
        seed=1,
    )
    n = min(len(sim.truth), n_loops)
    t_gen = time.perf_counter() - t0
    cyc = sim.raw["cycle"].to_numpy()
    starts = np.arange(n) * samples
    log = RawLog(
        "bench",
        cyc[starts].astype(float),
        starts,
        starts + samples,
        sim.raw["load"].to_numpy(float)[: n * samples],
        sim.raw["displacement"].to_numpy(float)[: n * samples],
    )
    t0 = time.perf_counter()
    loops.reduce_loops(
        log.load[: samples * 2], log.displacement[: samples * 2], starts[:2], starts[:2] + samples
    )
    t_first = time.perf_counter() - t0
    t0 = time.perf_counter()
    loops.reduce_loops(log.load, log.displacement, log.starts, log.ends)
    t_kernel = time.perf_counter() - t0
    t0 = time.perf_counter()
    rows, skipped, _, _ = reduction.reduce_raw_log(log, spec)
    reduction.rates_for_rows(rows, spec)
    t_all = time.perf_counter() - t0
    print(
        f"loops: {n} x {samples} samples ({n * samples / 1e6:.1f} M samples); "
        f"synthesis {t_gen:.1f} s (not part of the figure)"
    )
    print(f"first call (compile or cache load): {t_first:.2f} s")
    print(f"compiled loop kernel:    {t_kernel:.2f} s  ({1e6 * t_kernel / n:.1f} µs per loop)")
    print(
        f"whole per-log reduction: {t_all:.2f} s  (target < 30 s); "
        f"{len(rows['cycle'])} loops kept, {len(skipped)} skipped"
    )


def programme(n_specimens=100, readings=200, resamples=1000):
    """Time fit_logs on one long-format log of a simulated replicate programme."""
    from cycj.calibrate import fit_logs
    from cycj.calibrate.simulate import simulate_programme
    from cycj.calibrate.specimen import read_specimen

    with tempfile.TemporaryDirectory() as tmp:
        p = Path(tmp) / "spec.toml"
        p.write_text(SPECIMEN.replace("cyclic_curve", "# cyclic_curve"))
        spec = read_specimen(p)
        prog = simulate_programme(
            spec, 6e-5, 1.5, n_specimens=n_specimens, readings=readings, crack_end=30, seed=4
        )
        log = Path(tmp) / "programme.csv"
        prog.crack.to_csv(log, index=False)
        t0 = time.perf_counter()
        res = fit_logs(log, p, resamples=resamples)
        t_fit = time.perf_counter() - t0
    s = res.summary
    b = s["between_specimen"]
    print(
        f"programme: {n_specimens} specimens x {readings} readings, {resamples} resamples: "
        f"fit_logs {t_fit:.1f} s (target < 30 s)"
    )
    print(
        f"  m = {s['m']:.4f} [{s['m_interval'][0]:.4f}, {s['m_interval'][1]:.4f}] (true 1.5), "
        f"sigma_ln_C = {b['sigma_ln_C']:.3f} [{b['sigma_ln_C_interval'][0]:.3f}, "
        f"{b['sigma_ln_C_interval'][1]:.3f}] (true 0.15), {s['interval_method']}"
    )


def coverage(programmes=200, n_specimens=8, spacing="crack", estimate="direct"):
    """The full coverage study (the tests run a smaller count)."""
    from cycj.calibrate.coverage import coverage_study
    from cycj.calibrate.specimen import read_specimen

    with tempfile.TemporaryDirectory() as tmp:
        p = Path(tmp) / "spec.toml"
        p.write_text(SPECIMEN.replace("cyclic_curve", "# cyclic_curve"))
        spec = read_specimen(p)
    t0 = time.perf_counter()
    cov = coverage_study(
        spec,
        programmes=programmes,
        n_specimens=n_specimens,
        crack_end=30,
        spacing=spacing,
        estimate=estimate,
    )
    print(
        f"coverage over {cov['programmes']} programmes of {cov['n_specimens']} specimens, "
        f"readings at equal {'crack extension' if spacing == 'crack' else 'cycles'}, "
        f"{estimate} fit ({cov['method']}, nominal 95 %): m {100 * cov['m']:.1f} %, "
        f"da/dN at mid-range "
        f"{100 * cov['rate_mid']:.1f} %, sigma_ln_C "
        + (f"{100 * cov['sigma_ln_C']:.1f} %; " if n_specimens > 1 else "n/a; ")
        + (
            f"mixed-effects estimate: m {100 * cov['mixed_m']:.1f} %, da/dN at mid-range "
            f"{100 * cov['mixed_rate_mid']:.1f} %; "
            if n_specimens > 1 and estimate == "direct"
            else ""
        )
        + f"median |life error| per specimen {100 * cov['life_error']:.2f} % "
        f"({time.perf_counter() - t0:.0f} s)"
    )


if __name__ == "__main__":
    args = [int(a) for a in sys.argv[1:3]]
    if len(sys.argv) <= 3 or sys.argv[3] == "all":
        main(*args)
        programme()
    which = sys.argv[3] if len(sys.argv) > 3 else "all"
    if which in ("all", "coverage"):
        coverage()
        coverage(spacing="cycles")  # readings at equal cycles, as the example logs
        coverage(spacing="cycles", estimate="polynomial")  # the rate regression's bias
        coverage(n_specimens=1)  # one specimen: moving-block bootstrap, its own constants
        coverage(n_specimens=1, spacing="cycles")
