"""Assembly and the Newton solver with load continuation and an energy line search.

The body is a nonlinear elastic solid (deformation plasticity), so the equilibrium state
minimises the potential Π(u) = ∫W dA − f·u over the free degrees of freedom; the tangent is
symmetric positive definite.  Each Newton step solves K_t·du = f − f_int(u) inexactly (forcing
term min(10⁻², √(‖r‖/‖f‖))) by conjugate gradients preconditioned with a kept factorisation
of an earlier tangent, or directly (``linear.py``), and backtracks along du until Π decreases
enough (Armijo).  Loads are applied in increasing order; each starts from the previous
solution scaled to the new load, and a load that does not converge is approached in halves.

Units: N, mm, MPa; forces per mm of thickness (2-D); energies in N·mm per mm.

References
----------
.. [1] Nocedal, J., Wright, S. J., *Numerical Optimization*, 2nd ed. (2006), ch. 3 (Armijo
   backtracking) and ch. 6 (Newton's method with line search).
.. [2] Eisenstat, S. C., Walker, H. F., SIAM J. Sci. Comput. 17 (1996) 16–32: forcing terms.
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
            k = sp.csr_matrix((data, cols, indptr), shape=(n, n), copy=False)
            k.has_sorted_indices = True  # the pattern's keys are sorted row by row
            out["K"] = k
        return out


class Unconverged(RuntimeError):
    """A load level that Newton did not reach: ``target`` load, the last converged ``reached``
    load (0 if none) and the ``reason``."""

    def __init__(self, target: float, reached: float, reason: str):
        self.target, self.reached, self.reason = target, reached, reason
        super().__init__(
            f"no equilibrium at load {target:.6g}: the last converged load was {reached:.6g} "
            f"({reason})"
        )


@dataclass
class Solution:
    """One converged load level."""

    load: float
    u: np.ndarray
    state: dict
    iterations: int
    seconds: float


def linear_solver(problem: Problem, method: str = "reuse"):
    """The :class:`cycj.fe.linear.LinearSolver` of ``problem`` (``method`` in
    :data:`cycj.fe.linear.METHODS`)."""
    from cycj.fe.linear import LinearSolver, rigid_modes

    modes = rigid_modes(problem.mesh.nodes, problem.free) if method == "amg" else None
    return LinearSolver(method, modes)


def newton(problem: Problem, load: float, u0, *, tol=1e-9, max_iter=40, ezz=None, linear=None):
    """Equilibrium at ``load`` from the start ``u0``; returns (u, state, iterations) or raises
    RuntimeError when Newton does not converge in ``max_iter`` iterations (the message says
    how far the residual came down)."""
    linear = linear_solver(problem) if linear is None else linear
    free = problem.free
    f = load * problem.unit_force
    fnorm = max(np.linalg.norm(f[free]), 1e-300)
    u = u0.copy()
    st = problem.state(u, True, ezz)
    for it in range(1, max_iter + 1):
        r = (f - st["fint"])[free]
        rel = float(np.linalg.norm(r)) / fnorm
        if rel <= tol and it > 1:
            return u, st, it - 1
        du = np.zeros_like(u)
        du[free] = linear.solve(st["K"], r, min(1e-2, np.sqrt(rel)))
        pi0 = st["energy"] - f @ u
        slope = -float(du[free] @ r)
        step, trial = _line_search(problem, u, du, f, st["ezz"], pi0, slope)
        if trial is None:
            raise RuntimeError(
                f"the line search found no lower energy (residual {rel:.1e} of the load)"
            )
        u, st = trial, problem.state(trial, True, st["ezz"])
        if abs(step * slope) <= 1e-16 * max(abs(pi0), 1e-300) and it > 2:
            return u, st, it
    rel = float(np.linalg.norm((f - st["fint"])[free])) / fnorm
    if rel <= tol:
        return u, st, max_iter
    raise RuntimeError(
        f"Newton's residual was still {rel:.1e} of the load after {max_iter} iterations"
    )


def _line_search(problem, u, du, f, ezz, pi0, slope):
    """Step along ``du`` (Π(0) = ``pi0``, Π'(0) = ``slope`` < 0): backtracking (Armijo) from 1
    when the full step does not lower Π enough; when it does and Π still falls at the full step,
    extended by secant steps on Π' (up to 64): under the power law near the limit load Newton
    steps fall short by about the factor 1/N.  Returns (step, u + step·du) or (0, None)."""
    step = 1.0
    for _ in range(30):
        trial = u + step * du
        st = problem.state(trial, False, ezz)
        pi = st["energy"] - f @ trial
        if pi <= pi0 + 1e-4 * step * slope + 1e-12 * abs(pi0):
            break
        # minimiser of the quadratic through Π(0), Π'(0), Π(step), kept in [0.1, 0.5]·step
        denom = 2 * (pi - pi0 - slope * step)
        new = -slope * step * step / denom if denom > 0 else 0.5 * step
        step = float(np.clip(new, 0.1 * step, 0.5 * step))
    else:
        return 0.0, None
    if step < 1.0:
        return step, trial
    for _ in range(6):
        g = float(du @ (st["fint"] - f))  # Π'(step)
        if g >= 0.25 * slope:  # the full step is near the minimum along du
            break
        new = min(step * slope / (slope - g), 4 * step, 64.0)
        t_new = u + new * du
        st_new = problem.state(t_new, False, ezz)
        pi_new = st_new["energy"] - f @ t_new
        if pi_new >= pi:
            break
        step, trial, st, pi = new, t_new, st_new, pi_new
    return step, trial


def solve_loads(problem: Problem, loads, *, tol=1e-9, max_iter=40, max_halvings=8, linear="reuse"):
    """Solutions at the given loads (sorted ascending; units of ``problem.unit_force``).

    ``linear``: the linear solver's method (:data:`cycj.fe.linear.METHODS`) or a
    :class:`cycj.fe.linear.LinearSolver`, kept over all loads.  Raises :class:`Unconverged`
    (which says the load reached and why) when a level fails after ``max_halvings`` halvings.
    """
    loads = np.sort(np.asarray(loads, float))
    if isinstance(linear, str):
        linear = linear_solver(problem, linear)
    if np.any(loads <= 0):
        raise ValueError("loads must be positive")
    out = []
    u = np.zeros(problem.n_dofs)
    # the linear elastic solution of unit load: the elastic part of every start
    unit = np.zeros(problem.n_dofs)
    unit[problem.free] = linear.solve(problem.state(u)["K"], problem.unit_force[problem.free])
    prev, ezz = 0.0, None
    u_before, prev_before = u, 0.0
    for target in loads:
        t0 = time.perf_counter()
        iters = 0
        queue = [target]
        halvings = 0
        while queue:
            level = queue[-1]
            start = _start(problem, level, (prev, u), (prev_before, u_before), unit, ezz)
            try:
                u_new, st, it = newton(
                    problem, level, start, tol=tol, max_iter=max_iter, ezz=ezz, linear=linear
                )
            except RuntimeError as exc:
                halvings += 1
                if halvings > max_halvings:
                    raise Unconverged(target, prev, str(exc)) from None
                queue.append(0.5 * (prev + level))
                continue
            iters += it
            u_before, prev_before = u, prev
            u, prev, ezz = u_new, level, st["ezz"]
            queue.pop()
        out.append(Solution(target, u.copy(), st, iters, time.perf_counter() - t0))
    return out


def _start(problem, level, last, before, unit, ezz):
    """Start of Newton at ``level`` from the ``last`` and ``before`` solutions (load, u) and
    the elastic solution of unit load: whichever of these has the lowest potential energy —
    the last solution scaled linearly or with the power p its last two show (|u| ∝ P^p); its
    part beyond the elastic solution scaled with P^N (N = 1/n', the fully plastic limit:
    Ilyushin's proportional loading, as used by Kumar, German & Shih 1981) or with the power
    that part shows; the secant of the last two, extended."""
    prev, u = last
    prev_before, u_before = before
    if prev <= 0:
        return level * unit
    ratio = level / prev
    cands = [u * ratio]
    plastic = u - prev * unit
    big_n = 1.0 / problem.law.n_prime
    if big_n > 1.0:
        cands.append(level * unit + plastic * ratio**big_n)
    nu, nb = np.linalg.norm(u), np.linalg.norm(u_before)
    if prev_before > 0 and nb > 0 and nu > nb:
        log_ratio = np.log(prev / prev_before)
        p = np.log(nu / nb) / log_ratio
        if p > 1.05:
            cands.append(u * ratio ** min(p, 50.0))
        pb = np.linalg.norm(u_before - prev_before * unit)
        pu = np.linalg.norm(plastic)
        if pb > 0 and pu > pb:
            p_pl = min(np.log(pu / pb) / log_ratio, 50.0)
            cands.append(level * unit + plastic * ratio**p_pl)
        # the secant through the last two solutions, extended to the new load
        cands.append(u + (u - u_before) * (level - prev) / (prev - prev_before))
    f = level * problem.unit_force
    pis = [problem.state(c, False, ezz)["energy"] - f @ c for c in cands]
    return cands[int(np.argmin(pis))]
