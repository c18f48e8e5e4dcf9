"""Linear solves of the Newton iterations: preconditioned conjugate gradients with a kept
preconditioner, and a sparse direct factorisation as the fallback.

The tangent of deformation plasticity is symmetric positive definite (see ``law.py``), so the
conjugate gradient method applies; preconditioned by an exact factorisation of a nearby tangent
(an earlier Newton iteration or the previous load level) it converges in a few iterations, and
the preconditioner is rebuilt only when it stops doing so.  Three methods:

* ``"reuse"`` (default) — the preconditioner is a sparse LU factorisation (SuperLU in symmetric
  mode: diagonal pivots, minimum-degree ordering of Kᵀ+K) of an earlier tangent; it is
  refactorised when conjugate gradients would need more than 20 iterations (about what one
  factorisation costs on these meshes; a fixed count, so the answer does not depend on the
  machine's timings);
* ``"amg"`` — the preconditioner is a smoothed-aggregation algebraic multigrid hierarchy
  (pyamg; near null space: the three rigid-body modes of the plane), kept while conjugate
  gradients converge within 60 iterations, rebuilt once otherwise, and replaced by the direct
  solve if it still fails;
* ``"direct"`` — a fresh factorisation at every iteration.

The solves are inexact (Newton's forcing term ``rtol``, chosen by the caller); any iterate of
preconditioned conjugate gradients is a descent direction of the potential, which is what the
line search needs.  The solver counts factorisations, hierarchy set-ups, iterations and seconds.

Units: those of the stiffness (N/mm per mm of thickness) and forces (N/mm).

References
----------
.. [1] Hestenes, M. R., Stiefel, E., J. Res. Natl. Bur. Stand. 49 (1952) 409–436: conjugate
   gradients; Saad, Y., *Iterative Methods for Sparse Linear Systems*, 2nd ed. (2003), ch. 9.
.. [2] Vaněk, P., Mandel, J., Brezina, M., "Algebraic multigrid by smoothed aggregation for
   second and fourth order elliptic problems", Computing 56 (1996) 179–196.
.. [3] Li, X. S., "An overview of SuperLU", ACM Trans. Math. Softw. 31 (2005) 302–325.
.. [4] Eisenstat, S. C., Walker, H. F., SIAM J. Sci. Comput. 17 (1996) 16–32: forcing terms of
   inexact Newton methods.
"""

from __future__ import annotations

import time

import numpy as np

#: the linear solvers of the Newton iterations
METHODS = ("reuse", "amg", "direct")
_AMG_MAX_ITER = 60
#: CG iterations with a kept factorisation before it is renewed
REUSE_MAX_ITER = 20


def factorise(k):
    """SuperLU factorisation of the SPD matrix ``k`` in symmetric mode (``.solve``)."""
    from scipy.sparse.linalg import splu

    return splu(
        k.tocsc(),
        permc_spec="MMD_AT_PLUS_A",
        diag_pivot_thresh=0.0,
        options={"SymmetricMode": True},
    )


def pcg(k, b, precond, rtol: float, max_iter: int):
    """Preconditioned conjugate gradients from x = 0: (x, iterations, converged), converged
    when ‖b − k·x‖ ≤ rtol·‖b‖.  Gives up early (from the third iteration) when the mean
    rate of decrease so far would not reach ``rtol`` within ``max_iter``."""
    x = np.zeros_like(b)
    r = b.copy()
    bnorm = float(np.linalg.norm(b))
    if bnorm == 0.0:
        return x, 0, True
    z = precond(r)
    p = z.copy()
    rz = float(r @ z)
    for it in range(1, max_iter + 1):
        kp = k @ p
        pkp = float(p @ kp)
        if pkp <= 0.0:  # lost positive definiteness (round-off): stop with the descent so far
            return x, it, False
        alpha = rz / pkp
        x += alpha * p
        r -= alpha * kp
        rel = float(np.linalg.norm(r)) / bnorm
        if rel <= rtol:
            return x, it, True
        if it >= 3 and (rel >= 1.0 or it * np.log(rtol) / np.log(rel) > max_iter):
            return x, it, False
        z = precond(r)
        rz_new = float(r @ z)
        p *= rz_new / rz
        p += z
        rz = rz_new
    return x, max_iter, False


def rigid_modes(nodes, free) -> np.ndarray:
    """The plane's rigid-body modes (two translations, one rotation) on the free degrees of
    freedom: (n_free, 3), the near null space for smoothed aggregation."""
    b = np.zeros((2 * len(nodes), 3))
    b[0::2, 0] = 1.0
    b[1::2, 1] = 1.0
    c = nodes - nodes.mean(axis=0)
    b[0::2, 2] = -c[:, 1]
    b[1::2, 2] = c[:, 0]
    return b[free]


class LinearSolver:
    """Solves tangent systems for one problem, keeping its preconditioner between calls.

    Parameters
    ----------
    method : one of :data:`METHODS`
    modes : (n_free, 3) near null space for ``"amg"`` (:func:`rigid_modes`)
    """

    def __init__(self, method: str = "reuse", modes=None):
        if method not in METHODS:
            raise ValueError(f"linear solver must be one of {', '.join(METHODS)}")
        self.method = method
        self.modes = modes
        self._pre = None
        self.stats = {"factorisations": 0, "amg_setups": 0, "cg_iterations": 0, "seconds": 0.0}

    def _factor(self, k):
        lu = factorise(k)
        self._pre = lu.solve
        self.stats["factorisations"] += 1
        return lu

    def _amg(self, k):
        import pyamg

        ml = pyamg.smoothed_aggregation_solver(
            k.tocsr(),
            B=self.modes,
            strength=("symmetric", {"theta": 0.0}),
            smooth="energy",
        )
        m = ml.aspreconditioner(cycle="V")
        self._pre = m.matvec
        self.stats["amg_setups"] += 1

    def _cg(self, k, r, rtol, max_iter):
        x, it, ok = pcg(k, r, self._pre, rtol, max_iter)
        self.stats["cg_iterations"] += it
        return x, ok

    def solve(self, k, r, rtol: float = 1e-10):
        """x with ‖r − k·x‖ ≤ rtol·‖r‖ (exactly, up to round-off, after a factorisation)."""
        t0 = time.perf_counter()
        try:
            return self._solve(k, r, rtol)
        finally:
            self.stats["seconds"] += time.perf_counter() - t0

    def _solve(self, k, r, rtol):
        if self.method == "direct":
            return self._factor(k).solve(r)
        if self.method == "reuse":
            if self._pre is not None:
                x, ok = self._cg(k, r, rtol, REUSE_MAX_ITER)
                if ok:
                    return x
            return self._factor(k).solve(r)
        for attempt in range(2):  # amg: the kept hierarchy, then a new one
            if self._pre is None or attempt:
                self._amg(k)
            x, ok = self._cg(k, r, rtol, _AMG_MAX_ITER)
            if ok:
                return x
        self.stats["direct_fallbacks"] = self.stats.get("direct_fallbacks", 0) + 1
        lu = factorise(k)
        self._pre = None
        return lu.solve(r)
