"""The virtual test frame on a finite-element J: loops whose plastic part is the FE ΔJ (not the
reference-stress estimate the frame uses otherwise), reduced by ``cycj fit`` (η-factor loop
areas, ASTM E1820 / Dowling & Begley 1976), recover the growth law they were built from.

The FE table is computed here (C(T), plane strain, Masing curve K* = 2^(1−n')·K'); its ΔJ is
J of the deformation-plasticity model, independent of the reference-stress formula, which
differs from it by 4–7 % at these loads (more than 5 % is asserted: the loops are not the
frame's own estimate).
"""

import numpy as np
import pandas as pd
import pytest

from cycj.calibrate import fit_logs
from cycj.calibrate.simulate import simulate_test, true_delta_j
from cycj.calibrate.specimen import read_specimen
from cycj.fe.table import COLUMNS, laws, solve_series
from tests.calibrate.test_calibrate import write_log, write_spec

CURVE = 'cyclic_curve = { strength_coefficient = "400 MPa", hardening_exponent = 0.12 }'
C_TRUE, M_TRUE = 6e-5, 1.5


def _fe_table(spec, sizes, p_top):
    """ΔJ by finite elements at each size for load ranges up to ``p_top`` [N]; the frame
    reads only ΔJ, so the J column repeats it."""
    geo, mat = spec.geometry, spec.material
    _, law_dj, _ = laws(mat, True)
    per_force = geo.nominal_stress_per_force()
    rows = []
    for a in sizes:
        s = per_force * p_top * np.geomspace(0.02, 1.05, 6)
        dj, _, _ = solve_series("compact-tension", spec.width, a, law_dj, s)
        jel = (s * geo.k_over_s(a)) ** 2 / spec.e_prime
        for k in range(len(s)):
            rows.append((a, s[k] / per_force, s[k], dj[k], dj[k], jel[k], jel[k], 0.0))
    return pd.DataFrame(rows, columns=list(COLUMNS))


@pytest.fixture(scope="module")
def frame_fit(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("fe_frame")
    p = write_spec(tmp, "s.toml", a0="14 mm", curve=CURVE, sy="380 MPa")
    spec = read_specimen(p)
    p_max, r = 22000.0, 0.1
    table = _fe_table(spec, (14.0, 21.0, 28.5), (1 - r) * p_max)
    sim = simulate_test(
        spec,
        C_TRUE,
        M_TRUE,
        p_max=p_max,
        r_ratio=r,
        record_every=100,
        crack_end=28.0,
        seed=7,
        j_table=table,
    )
    res = fit_logs([write_log(tmp, sim.raw, "fe.csv")], p)
    return spec, table, sim, res


def test_fit_recovers_the_law_on_fe_loops(frame_fit):
    spec, table, sim, res = frame_fit
    share = res.reduced["dJ_pl_kJm2"] / res.reduced["dJ_eff_kJm2"]
    assert share.max() > 0.3  # large plasticity
    piv = res.summary["pivot_dJ_kJm2"]
    for meth in ("polynomial", "direct"):
        f = res.fits[meth]
        assert f["m"] == pytest.approx(M_TRUE, abs=0.1), meth
        assert f["C"] * piv ** f["m"] == pytest.approx(C_TRUE * piv**M_TRUE, rel=0.12), meth


def test_fe_frame_is_not_the_reference_stress_frame(frame_fit):
    spec, table, sim, _ = frame_fit
    t = sim.truth
    args = (spec, t["a_mm"], t["P_max_N"], t["P_min_N"], t["P_open_N"])
    fe, ref = true_delta_j(*args, table), true_delta_j(*args)
    # the truth is interpolated from the frame's crack-length grid: equal to ~1e-6
    np.testing.assert_allclose(t["dJ_eff_kJm2"], fe, rtol=1e-4)
    assert np.max(np.abs(ref / fe - 1)) > 0.05
