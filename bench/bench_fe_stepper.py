"""Stepper throughput with a finite-element J table against the reference-stress estimate
(a ratio measured in one run; not a test).

The C(T) case of bench_stepper.py (Newman closure, Masing ΔJ, J_max at peak, end checks),
the same random block, once with ``j_method = "reference-stress"`` and once with
``"finite-element"`` reading an invented table of 8 crack sizes × 10 load levels (g = J/J_el
rising with L_r; its values do not change the cost of the look-up).

Run from the repository root::

    python bench/bench_fe_stepper.py
"""

import sys
import tempfile
import time
from dataclasses import replace
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
sys.path.insert(0, str(HERE))

from bench_stepper import ct_case  # noqa: E402

from cycj import kernel_slots as M  # noqa: E402
from cycj.life import model_array  # noqa: E402
from cycj.life import stepper as K  # noqa: E402


def invented_table(case, path, sizes=8, levels=10):
    """A J table spanning the case's crack range and L_r 0.01–3 (J = g·K²/E', g = 1 + L_r²)."""
    import pandas as pd

    geo, mat = case.geometry, case.material
    e_prime = mat.effective_modulus(geo.plane_strain)
    rows = []
    for a in np.linspace(14.0, 0.95 * geo.dims["width"], sizes):
        s_l = float(geo.limit_stress(a, mat.yield_strength))
        for lr in np.geomspace(0.01, 3.0, levels):
            s = lr * s_l
            jel = (s * geo.k_over_s(a)) ** 2 / e_prime
            g = 1 + lr * lr
            rows.append((a, s / geo.nominal_stress_per_force(), s, g * jel, g * jel, jel, jel, 0))
    cols = "a_mm load_N nominal_stress_MPa J_kJm2 dJ_kJm2 J_el_kJm2 J_ref_kJm2 domain_spread"
    pd.DataFrame(rows, columns=cols.split()).to_csv(path, index=False)


def main(n_block=200_000, blocks=10):
    rng = np.random.default_rng(1)
    ref = ct_case()
    per_force = ref.geometry.nominal_stress_per_force()
    smax = rng.uniform(2e3, 6e3, n_block) * per_force
    smin = smax * rng.uniform(-0.3, 0.5, n_block)
    lmax, lmin = smax[:, None].copy(), smin[:, None].copy()
    ct = np.zeros((1, 2, 1))
    geo = ref.geometry
    rec = np.zeros((10, K.N_REC))
    acc = np.zeros(8)
    with tempfile.TemporaryDirectory() as tmp:
        table = Path(tmp) / "jt.csv"
        invented_table(ref, table)
        fe = replace(ref, analysis=replace(ref.analysis, j_method="finite-element"))
        fe = replace(fe, analysis=replace(fe.analysis, j_table=str(table)))
        arrays = {"reference-stress": model_array(ref), "finite-element": model_array(fe)}
    best = {}
    for mp in arrays.values():
        mp[M.J_C] = 1e30
    for _ in range(3):  # alternate, best of three each (shared machine)
        for name, mp in arrays.items():
            st = np.zeros(M.N_STATE)
            st[M.ST_A] = 15.0
            t = time.perf_counter()
            K.run_cycles(
                lmax, lmin, st, blocks, 1e18, geo.code, geo.params.copy(), ct, mp, 1e9, rec, 0, acc
            )
            best[name] = min(best.get(name, np.inf), time.perf_counter() - t)
    n = n_block * blocks
    for name, t in best.items():
        print(f"{name}: {n:.3g} cycles in {t:.3f} s = {n / t / 1e6:.2f} M cycles/s")
    ratio = best["reference-stress"] / best["finite-element"]
    print(f"throughput ratio finite-element / reference-stress = {ratio:.2f} (target ≥ 0.67)")


if __name__ == "__main__":
    main()
