"""Rebuild examples/pipe_startstop_channels.csv (invented demonstration data).

A thick steam pipe: each start-up raises the pressure (membrane hoop stress up to ~95 MPa) and,
during the warm-up transient, a through-wall thermal stress whose bore value peaks at about
-110 MPa on heating (bore in compression) and +80 MPa on cooling at shutdown; small pressure
swings in service.  Two channels: ``pressure_MPa`` (membrane hoop stress) and
``thermal_bore_MPa`` (bore value of a linear through-wall thermal stress profile).
Run: python examples/make_pipe_channels.py
"""

from pathlib import Path

import numpy as np


def make(seed: int = 11, n_starts: int = 12):
    rng = np.random.default_rng(seed)
    p_rows, t_rows = [], []
    for _ in range(n_starts):
        top = 95.0 * rng.uniform(0.93, 1.0)
        ramp = np.linspace(0.0, top, 20)
        heat = -110.0 * np.sin(np.linspace(0, np.pi, 20)) * rng.uniform(0.85, 1.0)
        service = top + rng.normal(0.0, 2.0, 30)
        cool = 80.0 * np.sin(np.linspace(0, np.pi, 20)) * rng.uniform(0.85, 1.0)
        p_rows += [ramp, service, np.linspace(top, 0.0, 20)]
        t_rows += [heat, np.zeros(30), cool]
    return np.concatenate(p_rows), np.concatenate(t_rows)


if __name__ == "__main__":
    p, t = make()
    out = Path(__file__).with_name("pipe_startstop_channels.csv")
    with out.open("w") as fh:
        fh.write(
            "# Invented demonstration data (not a measurement): thick steam pipe, 12 "
            "start/stop cycles\n# pressure_MPa: membrane hoop stress; thermal_bore_MPa: "
            "bore value of a linear through-wall thermal stress\n"
        )
        fh.write("pressure_MPa,thermal_bore_MPa\n")
        for a, b in zip(p, t, strict=True):
            fh.write(f"{a:.3f},{b:.3f}\n")
