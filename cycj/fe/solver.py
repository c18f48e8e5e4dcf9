"""Assembly and the Newton solver with load continuation and an energy line search.

The body is a nonlinear elastic solid (deformation plasticity), so the equilibrium state
minimises the potential Π(u) = ∫W dA − f·u over the free degrees of freedom; the tangent is
symmetric positive definite.  Each Newton step solves K_t·du = f − f_int(u) with scipy's sparse
direct solver (SuperLU in symmetric mode: diagonal pivots, minimum-degree ordering of Kᵀ+K; no
sparse Cholesky package was installable) and backtracks along du until Π decreases enough
(Armijo).  Loads are applied in increasing order; each starts from the previous
solution scaled to the new load, and a load that does not converge is approached in halves.

Units: N, mm, MPa; forces per mm of thickness (2-D); energies in N·mm per mm.

References
----------
.. [1] Nocedal, J., Wright, S. J., *Numerical Optimization*, 2nd ed. (2006), ch. 3 (Armijo
   backtracking) and ch. 6 (Newton's method with line search).
.. [2] Li, X. S., "An overview of SuperLU", ACM Trans. Math. Softw. 31 (2005) 302–325.
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np


@dataclass
class Problem:
    """A meshed body with its law, supports and the load pattern of unit load.

    Attributes
    ----------
    mesh : :class:`cycj.fe.mesh.Mesh`
    law : :class:`cycj.fe.law.DeformationLaw`
    fixed : fixed degrees of freedom (zero displacement)
    unit_force : (n_dofs,) nodal forces of unit load [N/mm per unit of the load measure]
    elastic : element mask kept linear elastic (round point loads), or None
    order : Gauss order (2 reduced, 3 full)
    """

    mesh: object
    law: object
    fixed: np.ndarray
    unit_force: np.ndarray
    elastic: np.ndarray | None = None
    order: int = 2
    _kin: object = field(default=None, repr=False)
    _pattern: tuple | None = field(default=None, repr=False)

    @property
    def kin(self):
        if self._kin is None:
            from cycj.fe.element import kinematics

            self._kin = kinematics(self.mesh.nodes, self.mesh.elements, self.order)
        return self._kin

    @property
    def n_dofs(self) -> int:
        return 2 * len(self.mesh.nodes)

    @property
    def free(self) -> np.ndarray:
        mask = np.ones(self.n_dofs, bool)
        mask[self.fixed] = False
        return np.flatnonzero(mask)

    def gp_elastic(self):
        if self.elastic is None:
            return None
        return np.repeat(self.elastic[:, None], self.kin.wdet.shape[1], axis=1)

    def pattern(self):
        """CSR structure of the free–free stiffness and the map from element entries to it."""
        if self._pattern is None:
            index = -np.ones(self.n_dofs, np.int64)
            free = self.free
            index[free] = np.arange(len(free))
            d = index[self.kin.dofs]
            rows = np.repeat(d, 16, axis=1).ravel()
            cols = np.tile(d, (1, 16)).ravel()
            keep = (rows >= 0) & (cols >= 0)
            keys = rows[keep] * len(free) + cols[keep]
            uniq, inv = np.unique(keys, return_inverse=True)
            r = uniq // len(free)
            indptr = np.searchsorted(r, np.arange(len(free) + 1))
            self._pattern = (keep, inv, uniq % len(free), indptr, len(uniq))
        return self._pattern

    def state(self, u, tangent=True, ezz=None):
        """Strains, stresses, W at the Gauss points, internal forces, Π's strain energy and
        (optionally) the free–free tangent for displacements ``u`` (n_dofs,)."""
        kin = self.kin
        ue = u[kin.dofs]
        eps = np.einsum("egij,ej->egi", kin.B, ue)
        s, d, w, ezz = self.law.response(eps, ezz, self.gp_elastic(), tangent)
        fe = np.einsum("egij,egi,eg->ej", kin.B, s, kin.wdet)
        fint = np.bincount(kin.dofs.ravel(), fe.ravel(), minlength=self.n_dofs)
        energy = float(np.sum(w * kin.wdet))
        out = {"eps": eps, "stress": s, "W": w, "ezz": ezz, "fint": fint, "energy": energy}
        if tangent:
            import scipy.sparse as sp

            db = np.einsum("egij,egjb->egib", d * kin.wdet[..., None, None], kin.B)
            ke = np.einsum("egia,egib->eab", kin.B, db, optimize=True)
            keep, inv, cols, indptr, nnz = self.pattern()
            data = np.bincount(inv, ke.ravel()[keep], minlength=nnz)
            n = len(self.free)
            out["K"] = sp.csr_matrix((data, cols, indptr), shape=(n, n))
        return out


@dataclass
class Solution:
    """One converged load level."""

    load: float
    u: np.ndarray
    state: dict
    iterations: int
    seconds: float


def _solve_linear(k, r):
    from scipy.sparse.linalg import splu

    # symmetric positive definite: diagonal pivots and a symmetric ordering suffice
    lu = splu(
        k.tocsc(),
        permc_spec="MMD_AT_PLUS_A",
        diag_pivot_thresh=0.0,
        options={"SymmetricMode": True},
    )
    return lu.solve(r)


def newton(problem: Problem, load: float, u0, *, tol=1e-9, max_iter=40, ezz=None):
    """Equilibrium at ``load`` from the start ``u0``; returns (u, state, iterations) or raises
    RuntimeError when Newton does not converge in ``max_iter`` iterations."""
    free = problem.free
    f = load * problem.unit_force
    fnorm = max(np.linalg.norm(f[free]), 1e-300)
    u = u0.copy()
    st = problem.state(u, True, ezz)
    for it in range(1, max_iter + 1):
        r = (f - st["fint"])[free]
        if np.linalg.norm(r) <= tol * fnorm and it > 1:
            return u, st, it - 1
        du = np.zeros_like(u)
        du[free] = _solve_linear(st["K"], r)
        pi0 = st["energy"] - f @ u
        slope = -float(du[free] @ r)
        step = 1.0
        for _ in range(30):
            trial = u + step * du
            st_t = problem.state(trial, False, st["ezz"])
            pi = st_t["energy"] - f @ trial
            if pi <= pi0 + 1e-4 * step * slope + 1e-12 * abs(pi0):
                break
            # minimiser of the quadratic through Π(0), Π'(0), Π(step), kept in [0.1, 0.5]·step
            denom = 2 * (pi - pi0 - slope * step)
            new = -slope * step * step / denom if denom > 0 else 0.5 * step
            step = float(np.clip(new, 0.1 * step, 0.5 * step))
        else:
            raise RuntimeError("line search failed")
        u, st = trial, problem.state(trial, True, st["ezz"])
        if abs(step * slope) <= 1e-16 * max(abs(pi0), 1e-300) and it > 2:
            return u, st, it
    r = (f - st["fint"])[free]
    if np.linalg.norm(r) <= tol * fnorm:
        return u, st, max_iter
    raise RuntimeError(f"Newton did not converge at load {load:.6g}")


def solve_loads(problem: Problem, loads, *, tol=1e-9, max_iter=40, max_halvings=8):
    """Solutions at the given loads (sorted ascending; units of ``problem.unit_force``)."""
    loads = np.sort(np.asarray(loads, float))
    if np.any(loads <= 0):
        raise ValueError("loads must be positive")
    out = []
    u = np.zeros(problem.n_dofs)
    prev, ezz = 0.0, None
    u_before, prev_before = u, 0.0
    for target in loads:
        t0 = time.perf_counter()
        iters = 0
        queue = [target]
        halvings = 0
        while queue:
            level = queue[-1]
            start = _start(problem, level, prev, u, u_before, prev_before, ezz)
            try:
                u_new, st, it = newton(problem, level, start, tol=tol, max_iter=max_iter, ezz=ezz)
            except RuntimeError:
                halvings += 1
                if halvings > max_halvings:
                    raise
                queue.append(0.5 * (prev + level))
                continue
            iters += it
            u_before, prev_before = u, prev
            u, prev, ezz = u_new, level, st["ezz"]
            queue.pop()
        out.append(Solution(target, u.copy(), st, iters, time.perf_counter() - t0))
    return out


def _start(problem, level, prev, u, u_before, prev_before, ezz):
    """Start of Newton at ``level``: the previous solution scaled to the new load, either
    linearly or with the power p the last two solutions show (|u| ∝ P^p, p ≥ 1, as in the
    fully plastic range), or extended along the secant of the last two solutions; whichever
    has the lowest potential energy."""
    if prev <= 0:
        return u
    ratio = level / prev
    cands = [u * ratio]
    nu, nb = np.linalg.norm(u), np.linalg.norm(u_before)
    if prev_before > 0 and nb > 0 and nu > nb:
        p = np.log(nu / nb) / np.log(prev / prev_before)
        if p > 1.05:
            cands.append(u * ratio ** min(p, 50.0))
        # the secant through the last two solutions, extended to the new load
        cands.append(u + (u - u_before) * (level - prev) / (prev - prev_before))
    if len(cands) == 1:
        return cands[0]
    f = level * problem.unit_force
    pis = [problem.state(c, False, ezz)["energy"] - f @ c for c in cands]
    return cands[int(np.argmin(pis))]
