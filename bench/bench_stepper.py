"""Benchmark of the life engine (ratios measured in one run; not a test).

1. Stepper throughput: C(T), full reference-stress ΔJ on the Masing branch, Newman closure,
   J_max at peak, end checks, Paris law — cycj's compiled stepper as ``predict_life`` runs it
   (specialised on the closure model and the j_method) vs a plain C loop of the same
   arithmetic and per-cycle bookkeeping (bench/stepper_ref.c, gcc -O2, loaded through ctypes),
   same random block, same number of cycles, alternating in pairs in one process, CPU times;
   the median of the pairs' ratios; the generic stepper (models read from the model array each
   cycle) for comparison.
2. Block mode vs the stepper on a 10⁹-cycle case.
3. Peak memory and a warm `cycj run` are measured from the shell (see DEVELOPERS.md).

Run: python bench/bench_stepper.py
"""

import ctypes
import os
import subprocess
import sys
import tempfile
import time
from dataclasses import replace
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))

from cycj import kernel_slots as M  # noqa: E402
from cycj.case import case_from_dict  # noqa: E402
from cycj.life import model_array, predict_life  # noqa: E402
from cycj.life import stepper as K  # noqa: E402


def ct_case(closure="newman", max_cycles=1e12):
    return case_from_dict(
        {
            "material": {
                "elastic_modulus": "205 GPa",
                "poisson_ratio": 0.3,
                "yield_strength": "340 MPa",
                "tensile_strength": "510 MPa",
                "cyclic_curve": {"strength_coefficient": "880 MPa", "hardening_exponent": 0.16},
                "monotonic_curve": {"strength_coefficient": "780 MPa", "hardening_exponent": 0.19},
                "growth": {"C": 2e-7, "m": 1.5, "basis": "effective"},
            },
            "geometry": {
                "shape": "compact-tension",
                "width": "50 mm",
                "thickness": "12.5 mm",
                "crack_length": "15 mm",
            },
            "loading": {"constant": {"max": "6 kN", "min": "0.6 kN"}, "closure": closure},
            "run": {"criteria": ["collapse", "size-limit"], "max_cycles": max_cycles},
        }
    )


def stepper_vs_c(n_block=200_000, blocks=10, rounds=15):
    rng = np.random.default_rng(1)
    case = ct_case()
    per_force = case.geometry.nominal_stress_per_force()
    smax = rng.uniform(2e3, 6e3, n_block) * per_force
    smin = smax * rng.uniform(-0.3, 0.5, n_block)
    mp = model_array(case)
    lmax, lmin = smax[:, None].copy(), smin[:, None].copy()
    ct = np.zeros((1, 2, 1))
    mp[M.J_C] = 1e30
    geo = case.geometry
    rec = np.zeros((10, K.N_REC))
    acc = np.zeros(8)

    def state():
        st = np.zeros(M.N_STATE)
        st[M.ST_A] = 15.0
        return st

    run = K.stepper_for(False, False, False, int(mp[M.CLOSURE]), int(mp[M.J_METHOD]))
    for stepper in (run, K.run_cycles):  # compile / load from cache
        stepper(lmax, lmin, state(), 1, 1e18, geo.code, geo.params.copy(), ct, mp, 1e9, rec, 0, acc)
    acc[:] = 0
    with tempfile.TemporaryDirectory() as tmp:
        lib = Path(tmp) / "stepper_ref.so"
        subprocess.run(
            ["gcc", "-O2", "-shared", "-fPIC", "-o", str(lib), str(HERE / "stepper_ref.c"), "-lm"],
            check=True,
        )
        ref = ctypes.CDLL(str(lib))
        dp = ctypes.POINTER(ctypes.c_double)
        ref.ref_run.restype = ctypes.c_long
        ref.ref_run.argtypes = [ctypes.c_long, ctypes.c_long, dp, dp, dp]
        smax_c, smin_c = np.ascontiguousarray(smax), np.ascontiguousarray(smin)

        def c_loop():
            a = ctypes.c_double(15.0)
            cycles = ref.ref_run(
                n_block,
                blocks,
                smax_c.ctypes.data_as(dp),
                smin_c.ctypes.data_as(dp),
                ctypes.byref(a),
            )
            return cycles, a.value

        def cycj_loop(stepper):
            st = state()
            stepper(
                lmax, lmin, st, blocks, 1e18, geo.code, geo.params.copy(), ct, mp, 1e9, rec, 0, acc
            )
            return st[M.ST_CYCLES], st[M.ST_A]

        # alternate in pairs, both in this process, CPU time: the ratio of each pair sees the
        # same machine load; the median of the pairs' ratios is the figure
        clock = time.process_time
        pairs, t_gen = [], float("inf")
        for _ in range(rounds):
            t = clock()
            cyc_py, a_py = cycj_loop(run)
            t_py = clock() - t
            t = clock()
            cyc_c, a_c = c_loop()
            t_c = clock() - t
            pairs.append((t_py, t_c))
            t = clock()
            cycj_loop(K.run_cycles)
            t_gen = min(t_gen, clock() - t)
    ratios = sorted(tc / tp for tp, tc in pairs)
    t_py = min(tp for tp, _ in pairs)
    t_c = min(tc for _, tc in pairs)
    n = n_block * blocks
    assert cyc_py == cyc_c == n, (cyc_py, cyc_c)
    print(
        f"stepper: {n:.3g} cycles in {t_py:.3f} s CPU (best) = {n / t_py / 1e6:.2f} M cycles/s; "
        f"a = {a_py:.9f} mm"
    )
    print(
        f"plain C (gcc -O2): {t_c:.3f} s CPU (best) = {n / t_c / 1e6:.2f} M cycles/s; "
        f"a = {a_c:.9f} mm"
    )
    print(
        f"throughput ratio cycj/C = {ratios[len(ratios) // 2]:.2f} (median of {rounds} pairs; "
        f"range {ratios[0]:.2f}–{ratios[-1]:.2f}; ratio of the bests {t_c / t_py:.2f}) "
        "(target ≥ 0.9)"
    )
    print(f"  generic stepper (models read each cycle): ratio to C {t_c / t_gen:.2f} (bests)")
    for name, code in (("Wheeler", 1), ("Willenborg", 2)):
        mp_s = mp.copy()
        mp_s[M.SEQ_MODEL], mp_s[M.SEQ_EXPONENT], mp_s[M.SEQ_SHUT_OFF] = code, 1.3, 3.0
        mp_s[M.ZONE_BETA] = 6.0
        seq_stepper = K.stepper_for(False, False, True, int(mp[M.CLOSURE]), int(mp[M.J_METHOD]))
        seq_stepper(
            lmax, lmin, state(), 1, 1e18, geo.code, geo.params.copy(), ct, mp_s, 1e9, rec, 0, acc
        )
        t_s = float("inf")
        for _ in range(3):
            t = time.process_time()
            seq_stepper(
                lmax,
                lmin,
                state(),
                blocks,
                1e18,
                geo.code,
                geo.params.copy(),
                ct,
                mp_s,
                1e9,
                rec,
                0,
                acc,
            )
            t_s = min(t_s, time.process_time() - t)
        print(
            f"with {name}: {n / t_s / 1e6:.2f} M cycles/s; throughput ratio to no sequence "
            f"model = {t_py / t_s:.2f} (target ≥ 0.5)"
        )
    return n / t_py


def channels_vs_uniform(n_block=200_000, blocks=5):
    """Throughput with two load channels (weight-function K tables, plate reference stress)
    against one uniform-stress channel on the same edge-crack plate."""
    from cycj.life.loads import channel_block

    base = {
        "material": {
            "elastic_modulus": "200 GPa",
            "yield_strength": "350 MPa",
            "tensile_strength": "500 MPa",
            "cyclic_curve": {"strength_coefficient": "900 MPa", "hardening_exponent": 0.15},
            "growth": {"C": 1e-9, "m": 1.6},
        },
        "geometry": {
            "shape": "edge-crack-plate",
            "width": "40 mm",
            "thickness": "10 mm",
            "crack_length": "2 mm",
        },
        "loading": {"constant": {"max": "100 MPa", "min": "10 MPa"}},
        "run": {"criteria": ["size-limit"]},
    }
    rng = np.random.default_rng(2)
    plain = case_from_dict(base)
    prof = case_from_dict(
        {
            **base,
            "geometry": {
                **base["geometry"],
                "stress_profile": {"kind": "polynomial", "coefficients": [1.0, -0.5]},
                "residual_stress": {"uniform": "50 MPa"},
            },
        }
    )
    geo = plain.geometry
    rec = np.zeros((10, K.N_REC))
    acc = np.zeros(8)
    times = []
    for case, nch in ((plain, 1), (prof, 2)):
        lmax = rng.uniform(60, 100, (n_block, nch))
        lmin = lmax * 0.1
        if nch == 1:
            ct = np.zeros((1, 2, 1))
            mp = model_array(case)
        else:
            _, _, ct1, _, slots, _, _ = channel_block(case, 1.0, "closing")
            ct = np.concatenate([ct1[:1], ct1[:1] * 0.5, ct1[1:]])  # two channels + residual
            mp = model_array(case)
            for k, v in slots.items():
                mp[k] = v
            mp[M.CH_N] = 2.0
            mp[M.CH_PM + 1], mp[M.CH_PB + 1] = mp[M.CH_PM], mp[M.CH_PB]
        stepper = K.stepper_for(nch > 1, False, False, int(mp[M.CLOSURE]), int(mp[M.J_METHOD]))
        best = float("inf")
        for _ in range(3):
            st = np.zeros(M.N_STATE)
            st[M.ST_A] = 2.0
            t = time.process_time()
            stepper(
                lmax, lmin, st, blocks, 1e18, geo.code, geo.params.copy(), ct, mp, 1e9, rec, 0, acc
            )
            best = min(best, time.process_time() - t)
        times.append(best)
    n = n_block * blocks
    print(
        f"edge crack, one uniform channel: {n / times[0] / 1e6:.2f} M cycles/s; two "
        f"profiled channels + residual stress: {n / times[1] / 1e6:.2f} M cycles/s → "
        f"ratio {times[0] / times[1]:.2f} (target ≥ 0.67, i.e. within 1.5×)"
    )


def block_vs_stepper(throughput):
    case = ct_case(closure="none", max_cycles=1e9)
    law = replace(case.growth, C=2e-12, basis="applied")
    case = replace(case, growth=law)
    predict_life(case, method="block")
    t = time.perf_counter()
    res = predict_life(case, method="block")
    tb = time.perf_counter() - t
    n = res.summary["cycles_to_end"]
    print(
        f"block mode: {n:.4g} cycles ({res.summary['end_reason']}) in {tb:.3f} s; the "
        f"stepper at {throughput / 1e6:.1f} M cycles/s would need {n / throughput:.1f} s "
        f"→ ratio {n / throughput / tb:.0f}× (targets < 1 s, ≥ 1000×)"
    )


if __name__ == "__main__":
    os.environ.setdefault("MPLBACKEND", "Agg")
    thr = stepper_vs_c()
    channels_vs_uniform()
    block_vs_stepper(thr)
