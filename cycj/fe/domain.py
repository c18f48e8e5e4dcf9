"""J by the equivalent domain integral.

For a traction-free straight crack along x_1 and no body forces,

    J = ∫_A (σ_ij·∂u_i/∂x_1 − W·δ_1j)·∂q/∂x_j dA,

with q = 1 near the tip and 0 on the domain's outer edge.  Here q is interpolated with the
element shape functions from nodal values that ramp linearly in the square distance
ρ = max(|x − a|, y) between two ring edges of the focused mesh (the ramp follows element edges;
the tip core and the first ring have q ≡ 1 and add nothing).  In a half model (symmetry about
the crack plane) the integral over the half is doubled.  For deformation plasticity (a
nonlinear elastic solid) J is path independent; the spread of the domains measures the
discretisation error.

Units: stresses in MPa, lengths in mm, J in N/mm = kJ/m².

References
----------
.. [1] Shih, C. F., Moran, B., Nakamura, T., "Energy release rate along a three-dimensional
   crack front in a thermally stressed body", Int. J. Fract. 30 (1986) 79–102.
.. [2] Li, F. Z., Shih, C. F., Needleman, A., "A comparison of methods for calculating energy
   release rates", Eng. Fract. Mech. 21 (1985) 405–421.
.. [3] Rice, J. R., J. Appl. Mech. 35 (1968) 379–386: the J-integral.
"""

from __future__ import annotations

import numpy as np


def ring_domains(mesh, count: int = 4):
    """``count`` ramps (ρ_in, ρ_out) [mm] on ring edges, spread over the outer ~85 % of the
    rings (the innermost rings, nearest the tip, are left out)."""
    n = len(mesh.ring_sizes) - 1
    out = []
    for k in range(count):
        lo = int(round(n * (0.15 + 0.15 * k)))
        hi = int(round(n * (0.4 + 0.18 * k)))
        hi = min(max(hi, lo + 2), n)
        out.append((float(mesh.ring_sizes[lo]), float(mesh.ring_sizes[hi])))
    return out


def domain_j(problem, st, u, rho_in: float, rho_out: float, symmetric: bool = True) -> float:
    """J [N/mm] over the domain ramping from ``rho_in`` to ``rho_out`` [mm]."""
    kin = problem.kin
    rho = problem.mesh.rho
    q = np.clip((rho_out - rho) / (rho_out - rho_in), 0.0, 1.0)
    qe = q[problem.mesh.elements]  # (ne, 8)
    active = np.flatnonzero(np.ptp(qe, axis=1) > 0)
    dq = np.einsum("egnj,en->egj", kin.dN[active], qe[active])  # ∂q/∂x_j
    ue = u[kin.dofs[active]].reshape(len(active), 8, 2)
    du1 = np.einsum("egn,eni->egi", kin.dN[active][..., 0], ue)  # ∂u_i/∂x_1
    s = st["stress"][active]  # (σ_xx, σ_yy, σ_xy)
    sig = np.empty(s.shape[:-1] + (2, 2))
    sig[..., 0, 0], sig[..., 1, 1] = s[..., 0], s[..., 1]
    sig[..., 0, 1] = sig[..., 1, 0] = s[..., 2]
    term = np.einsum("egij,egi,egj->eg", sig, du1, dq) - st["W"][active] * dq[..., 0]
    j = float(np.sum(term * kin.wdet[active]))
    return j * (2.0 if symmetric else 1.0)


def j_domains(problem, solution, count: int = 4):
    """J on ``count`` domains [N/mm] and their spread (max − min)/mean."""
    values = np.array(
        [
            domain_j(problem, solution.state, solution.u, lo, hi)
            for lo, hi in ring_domains(problem.mesh, count)
        ]
    )
    spread = float((values.max() - values.min()) / abs(values.mean()))
    return values, spread
