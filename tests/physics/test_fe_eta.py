"""The domain-integral J of a C(T) against the η-factor estimate from its own load–load-line
displacement curve.

Source of the check: ASTM E1820 (basic procedure), J = K²/E' + η·A_pl/(B·b_0) with
η = 2 + 0.522·b_0/W for the C(T) specimen, A_pl the area under the load against plastic
load-line displacement.  The η estimate is the specimen-test reading of J (Rice, Paris &
Merkle, ASTM STP 536, 1973, for deep cracks); it is independent of the domain integral, which
the model evaluates from the near-tip field.  E1820 gives the formula for the specimen
proportions the C(T) model has (H/W = 0.6, pin hole 0.25W).
"""

import numpy as np
import pytest

from cycj.fe.domain import j_domains
from cycj.fe.linear import factorise
from cycj.fe.shapes import build
from cycj.fe.solver import solve_loads
from tests.physics.test_fe import E_PRIME, W, _geometry, _power_law


def _plastic_area(p, d_pl):
    """∫P dΔ_pl [N·mm/mm] from 0, each segment a power law Δ_pl ∝ P^m (exact for one)."""
    area = np.zeros(len(p))
    total = 0.0
    p_prev, d_prev = 0.0, 0.0
    for k in range(len(p)):
        if d_prev > 0 and d_pl[k] > d_prev:
            m = np.log(d_pl[k] / d_prev) / np.log(p[k] / p_prev)
            total += m / (m + 1) * (p[k] * d_pl[k] - p_prev * d_prev)
        elif d_prev <= 0 and d_pl[k] > 0:
            total += 0.5 * p[k] * d_pl[k]  # first segment: a linear start (small)
        p_prev, d_prev = p[k], d_pl[k]
        area[k] = total
    return area


@pytest.mark.parametrize("n", [5, 10])
def test_domain_j_matches_eta_factor_estimate(n):
    a = 0.5 * W
    b = W - a
    law = _power_law(n)
    geo = _geometry("compact-tension", a)
    s_l = geo.limit_stress(a, 400.0)
    s = s_l * np.geomspace(0.05, 1.2, 12)
    pb = build("compact-tension", W, a, law)
    sols = solve_loads(pb, s)
    f = pb.unit_force  # pin force per unit S: resultant W (per mm of thickness)
    # load-line displacement of both halves: the work-conjugate of the pin force, doubled
    delta = np.array([2 * (f @ x.u) / f[1::2].sum() for x in sols])
    p = s * W  # load per mm of thickness, B = 1
    # elastic compliance of the same model: the linear solution of unit load
    u_el = np.zeros(pb.n_dofs)
    u_el[pb.free] = factorise(pb.state(u_el)["K"]).solve(f[pb.free])
    c_el = 2 * (f @ u_el) / f[1::2].sum() / W
    d_pl = delta - c_el * p
    eta = 2 + 0.522 * b / W
    k = s * geo.k_over_s(a)
    j_eta = k * k / E_PRIME + eta * _plastic_area(p, d_pl) / b
    j_fe = np.array([j_domains(pb, x)[0].mean() for x in sols])
    lr = s / s_l
    high = lr >= 0.6
    ratio = j_fe[high] / j_eta[high]
    print(f"n = {n}: J_domain / J_eta at L_r {np.round(lr[high], 2)}: {np.round(ratio, 4)}")
    assert j_fe[-1] > 1.8 * k[-1] ** 2 / E_PRIME  # the plastic part is most of J
    np.testing.assert_allclose(j_fe[high], j_eta[high], rtol=0.05)
