"""Rebuild the demonstration load spectra in this folder (all invented, seeded).

Run from the repository root::

    python loadspectra/make_spectra.py

Each CSV has ``#`` header lines (what it represents, its unit, that it is invented), then the
columns ``time_s,load``.  The README table is rewritten with the sample and cycle counts.
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # run from a source checkout

from cycj.spectrum import count_cycles  # noqa: E402
from cycj.spectrum.generators import (  # noqa: E402
    block_programme,
    exceedance_sequence,
    gaussian_from_irregularity,
    gaussian_from_psd,
    insert_excursions,
)

HERE = Path(__file__).resolve().parent
INVENTED = "Invented for demonstration with cycj's generators; not a measurement."


def crane_duty(seed=101):
    """Overhead crane hoist rope anchor force: 60 lifts of a shift [kN]."""
    rng = np.random.default_rng(seed)
    hook = 2.0  # hook block and slings alone
    parts = []
    for _ in range(60):
        payload = float(np.clip(rng.gamma(2.2, 9.0), 6.0, 55.0))  # mostly light lifts
        n_up, n_hold, n_down, n_idle = 8, int(rng.integers(25, 60)), 8, int(rng.integers(6, 20))
        rise = np.linspace(hook, hook + payload, n_up)
        t = np.arange(n_hold)
        # dynamic factor at lift-off, decaying rope-mass oscillation while travelling
        osc = payload * 0.12 * np.exp(-t / 12.0) * np.sin(2 * np.pi * t / 6.0)
        hold = hook + payload + osc + rng.normal(0.0, 0.15, n_hold)
        lower = np.linspace(hook + payload, hook, n_down)
        idle = hook + rng.normal(0.0, 0.08, n_idle)
        parts += [rise, hold, lower, idle]
    load = np.clip(np.concatenate(parts), 0.0, None)
    return (
        load,
        0.5,
        "kN",
        (
            "Overhead crane hoist: rope anchor force over one shift of 60 lifts",
            "Hook block 2 kN; payloads 6-55 kN (mostly light); lift-off overshoot and a decaying",
            "rope oscillation while travelling; valleys near the hook weight (never below 0)",
        ),
    )


def pressure_vessel(seed=202):
    """Process vessel shell: start/stop cycles and operating pressure swings [MPa]."""
    rng = np.random.default_rng(seed)
    parts = []
    for _ in range(16):
        full = 150.0 * float(rng.uniform(0.9, 1.0))
        ramp = np.linspace(0.0, full, 40)
        n_op = int(rng.integers(500, 800))
        swings, _, _ = gaussian_from_irregularity(
            n_op, 0.9, rms=4.0, mean=0.0, seed=int(rng.integers(1 << 31))
        )
        op = full - 10.0 + swings
        trips = rng.choice(n_op, size=2, replace=False)
        op[trips] -= rng.uniform(25.0, 45.0, size=2)  # upsets: sudden pressure dips
        down = np.linspace(op[-1], 0.0, 40)
        parts += [ramp, op, down, np.zeros(20)]
    load = np.clip(np.concatenate(parts), 0.0, None)
    return (
        load,
        60.0,
        "MPa",
        (
            "Pressure vessel shell: nominal membrane stress over 16 start/stop cycles",
            "0 to about 150 MPa at each start-up; operating pressure swings (rms 4 MPa)",
            "and two upsets (dips of 25-45 MPa) per run; unit MPa of nominal membrane stress",
        ),
    )


def wind_member(seed=303):
    """Lattice-tower diagonal under gusts and vortex shedding [MPa]."""
    f = np.linspace(0.0, 2.5, 501)
    gust = 120.0 / (1.0 + (f / 0.05) ** 2) ** (5.0 / 6.0)  # low-frequency gust part
    resonance = 40.0 * np.exp(-0.5 * ((f - 1.2) / 0.05) ** 2)  # first bending mode 1.2 Hz
    load = gaussian_from_psd(f, gust + resonance, 16384, 0.1, mean=35.0, seed=seed)
    return (
        load,
        0.1,
        "MPa",
        (
            "Wind-excited lattice tower diagonal: axial stress over about 27 minutes",
            "Mean 35 MPa from dead load and mean wind; gust spectrum plus a narrow resonant",
            "peak at the member's first bending mode (1.2 Hz); Gaussian, spectral synthesis",
        ),
    )


def press_frame(seed=404):
    """C-frame press throat: tool programmes with occasional double-blank overloads [kN]."""
    rng = np.random.default_rng(seed)
    programme = [(850.0, 20.0, 400), (520.0, 20.0, 900), (300.0, 20.0, 1200)]
    order = rng.permutation(len(programme))
    base = block_programme([programme[i] for i in order], repeats=2)
    # a double blank every ~1000 strokes: 1.4 x nominal tonnage of the heaviest tool
    load = insert_excursions(base, 2001, 1200.0, offset=600)
    load = load + rng.normal(0.0, 2.0, load.shape[0])
    load = np.clip(load, 0.0, None)
    return (
        load,
        1.0,
        "kN",
        (
            "Mechanical press frame: throat force over two rounds of three tool programmes",
            "Tools at 850, 520 and 300 kN nominal tonnage in a random order; a double-blank",
            "overload of 1200 kN about every 1000 strokes; 2 kN measurement noise",
        ),
    )


def suspension_arm(seed=505):
    """Lower control arm, vertical wheel load path: rough road plus potholes [kN]."""
    amps = [9.0, 7.0, 5.0, 3.5, 2.0, 1.0]
    cum = [2, 10, 60, 300, 1200, 3500]  # cycles with amplitude >= each level, per run
    events = exceedance_sequence(amps, cum, mean=4.0, n_subblocks=8, seed=seed)
    rough, _, _ = gaussian_from_irregularity(events.shape[0] * 2, 0.6, rms=0.4, seed=seed + 1)
    load = np.repeat(events, 2) + rough
    # two rebound hits (underloads) on kerbs
    load = insert_excursions(load, 7000, -9.0, offset=2500)
    return (
        load,
        0.01,
        "kN",
        (
            "Road vehicle lower suspension arm: ball-joint vertical force over a test track lap",
            "Static wheel share 4 kN; load cycles from an invented exceedance table in 8",
            "randomised sub-blocks, rough-road noise (irregularity 0.6) and two rebound hits",
        ),
    )


SPECTRA = {
    "crane_duty.csv": crane_duty,
    "pressure_vessel.csv": pressure_vessel,
    "wind_member.csv": wind_member,
    "press_frame.csv": press_frame,
    "suspension_arm.csv": suspension_arm,
}


def write(name, load, dt, unit, lines):
    path = HERE / name
    load = np.round(load, 3)
    head = [f"# {line}" for line in lines] + [
        f"# unit of load: {unit}; sampling interval {dt:g} s",
        f"# {INVENTED}",
    ]
    t = np.arange(load.shape[0]) * dt
    with path.open("w", newline="\n") as fh:
        fh.write("\n".join(head) + "\ntime_s,load\n")
        np.savetxt(fh, np.c_[t, load], fmt=["%.3f", "%.3f"], delimiter=",")
    return path


def main():
    rows = []
    for name, build in SPECTRA.items():
        load, dt, unit, lines = build()
        assert load.shape[0] <= 20_000, name
        path = write(name, load, dt, unit, lines)
        df = count_cycles(np.round(load, 3))
        rows.append(
            (
                name,
                lines[0],
                unit,
                load.shape[0],
                df["count"].sum(),
                load.min(),
                load.max(),
                path.stat().st_size,
            )
        )
    table = [
        "| file | scenario | unit | samples | cycles (rainflow) | min | max |",
        "|---|---|---|---|---|---|---|",
    ]
    for name, scen, unit, n, cyc, lo, hi, _ in rows:
        table.append(f"| `{name}` | {scen} | {unit} | {n} | {cyc:g} | {lo:.1f} | {hi:.1f} |")
    readme = HERE / "README.md"
    text = readme.read_text() if readme.exists() else ""
    start, end = "<!-- table -->", "<!-- /table -->"
    if start in text and end in text:
        text = (
            text[: text.index(start) + len(start)]
            + "\n"
            + "\n".join(table)
            + "\n"
            + text[text.index(end) :]
        )
        readme.write_text(text)
    for r in rows:
        print(
            f"{r[0]}: {r[3]} samples, {r[4]:g} cycles, {r[5]:.1f}..{r[6]:.1f} {r[2]}, "
            f"{r[7] / 1024:.0f} KiB"
        )


if __name__ == "__main__":
    main()
