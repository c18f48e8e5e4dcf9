"""J-based end criteria: J_max ≥ J_c, tearing instability on the J–R curve, the failure
assessment diagram, net-section collapse and the crack size limit.

The per-cycle check is a compiled kernel used by the stepper; the tearing check (which needs a
search over crack extension) is evaluated once per run, as the crack size at which the history's
peak load becomes unstable on the J–R curve.  All criteria use the monotonic L_r = S_max/S_L(a).

References
----------
.. [1] Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633 (J at peak load, reference stress).
.. [2] Paris, P. C., Tada, H., Zahoor, A., Ernst, H., ASTM STP 668 (1979) 5–36: tearing
   instability when the applied J cannot be matched by the J–R curve (dJ/da ≥ dJ_R/da).
.. [3] R6 Rev. 4 and BS 7910:2013+A1:2015: FAD Options 1 and 2, L_r,max.
.. [4] ASTM E1820: J–R curve, J_c.
"""

from __future__ import annotations

import math

from cycj._jit import jit
from cycj.jintegral import fad_option1_scalar, fad_option2_scalar
from cycj.model_params import (
    A_LIMIT,
    A_TEAR,
    CHECK_COLLAPSE,
    CHECK_FAD,
    CHECK_TOUGH,
    E_MOD,
    FAD_CURVE,
    J_C,
    K_PEAK,
    LR_MAX,
    N_PEAK,
    SIGMA_Y,
)

# end codes (0 = still running)
RUNNING, END_TOUGHNESS, END_TEARING, END_FAD, END_COLLAPSE, END_SIZE, END_MAX_CYCLES, \
    END_NO_GROWTH, END_LEAK = range(9)
END_NAMES = {END_TOUGHNESS: "toughness", END_TEARING: "tearing", END_FAD: "fad",
             END_COLLAPSE: "collapse", END_SIZE: "size-limit", END_MAX_CYCLES: "max-cycles",
             END_NO_GROWTH: "no-growth", END_LEAK: "leak"}



@jit
def end_check(a, jmax, lr, j_el_max, rho, mp):
    """End code tripped at crack size ``a`` with J_max, L_r and J_el at peak (0 if none) and the
    value that tripped it; ``rho`` is the plasticity interaction added to K_r when secondary
    (residual) stresses act (R6 / BS 7910), else 0."""
    if a >= mp[A_TEAR]:
        return END_TEARING, a
    if mp[CHECK_TOUGH] > 0.5 and jmax >= mp[J_C]:
        return END_TOUGHNESS, jmax
    if mp[CHECK_COLLAPSE] > 0.5 and lr >= mp[LR_MAX]:
        return END_COLLAPSE, lr
    if mp[CHECK_FAD] > 0.5:
        kr = math.sqrt(j_el_max / mp[J_C]) + rho
        if mp[FAD_CURVE] > 1.5:
            f = fad_option2_scalar(lr, mp[LR_MAX], mp[SIGMA_Y], mp[E_MOD], mp[K_PEAK],
                                   mp[N_PEAK])
        else:
            f = fad_option1_scalar(lr, mp[LR_MAX])
        if kr >= f:
            return END_FAD, kr
    if a >= mp[A_LIMIT]:
        return END_SIZE, a
    return RUNNING, 0.0



def tearing_margin(geometry, loads, a, c1, c2, mp, n_points=400):
    """max over Δa of [J_R(Δa) − J(a + Δa)] under the history's peak load [kJ/m²].

    Positive: a stable equilibrium exists on the J–R curve J_R = C1·(Δa/1 mm)^C2 (tearing
    arrests); negative: the crack of size ``a`` [mm] tears unstably.  ``loads`` is the block
    (:class:`cycj.life.BlockLoads`), ``mp`` the model-parameter array (J_max by the reference
    stress method).
    """
    from cycj.kernels import tearing_margin_kernel

    hi = geometry.size_limits[1]
    return float(tearing_margin_kernel(loads.lmax, loads.i_peak, a, hi, c1, c2, geometry.code,
                                       geometry.params, loads.ct, mp, n_points))


def tearing_instability_size(geometry, loads, a_from, a_to, c1, c2, mp, tol=1e-4):
    """Smallest crack size in [a_from, a_to] [mm] that is unstable on the J–R curve under the
    history's peak load (bisection; ``inf`` if the whole range is stable)."""
    def margin(a):
        return tearing_margin(geometry, loads, a, c1, c2, mp)

    if margin(a_to) >= 0:
        return math.inf
    if margin(a_from) < 0:
        return a_from
    lo, hi = a_from, a_to
    while hi - lo > tol * max(hi, 1.0):
        mid = 0.5 * (lo + hi)
        if margin(mid) < 0:
            hi = mid
        else:
            lo = mid
    return hi
