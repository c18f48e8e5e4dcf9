"""Regenerate the invented lab logs in this folder with the virtual test frame (seeded).

Scenario (invented): two C(T) specimens of a valve-body steel in an imaginary lab frame,
front-face clip gauge, one at R = 0.1 with crack closure and high load (visible plasticity
late in the test), one at R = 0.5 without closure; the true law is da/dN = 6e-5·ΔJ_eff^1.5.
A third log holds load-shedding readings (crack length only, K gradient −0.08/mm) down to
the threshold ΔJ_th = 0.012 kJ/m²; fit it on its own (applied basis).

    python examples/make_lab_logs.py
"""

from pathlib import Path

from cycj.calibrate.simulate import simulate_test
from cycj.calibrate.specimen import read_specimen

HERE = Path(__file__).parent
TRUE_C, TRUE_M, TRUE_THRESHOLD = 6e-5, 1.5, 0.012


def main():
    spec = read_specimen(HERE / "lab_specimen_ct.toml")
    runs = {
        "lab_log_ct_r01.csv": dict(
            p_max=17000, r_ratio=0.1, opening_fraction=0.2, record_every=250, crack_end=31, seed=11
        ),
        "lab_log_ct_r05.csv": dict(
            p_max=19000, r_ratio=0.5, opening_fraction=0.0, record_every=500, crack_end=30, seed=12
        ),
    }
    for name, kw in runs.items():
        sim = simulate_test(spec, TRUE_C, TRUE_M, samples=100, **kw)
        raw = sim.raw.copy()
        raw["load"] = (raw["load"] / 1000).round(5)  # log_units load = kN
        raw["displacement"] = raw["displacement"].round(6)
        raw.to_csv(HERE / name, index=False)
        print(name, len(sim.truth), "loops", f"a {sim.truth.a_mm.iloc[-1]:.2f} mm")
    shed = simulate_test(
        spec,
        TRUE_C,
        TRUE_M,
        p_max=2900,
        r_ratio=0.1,
        k_gradient=-0.08,
        threshold=TRUE_THRESHOLD,
        record_every=200000,
        crack_noise=0.005,
        rate_floor=5e-8,
        seed=13,
        crack_end=34,
    )
    crack = shed.crack.copy()
    crack["load_max"] = (crack["load_max"] / 1000).round(5)
    crack["load_min"] = (crack["load_min"] / 1000).round(5)
    crack["crack_length"] = crack["crack_length"].round(4)
    crack.to_csv(HERE / "lab_log_ct_shedding.csv", index=False)
    print("lab_log_ct_shedding.csv", len(crack), "readings")


if __name__ == "__main__":
    main()
