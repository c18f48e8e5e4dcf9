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
from cycj.fad import (
    FAD_OPTION_1,
    FAD_OPTION_1_2013,
    FAD_OPTION_2,
    fad_option1_2013_scalar,
    fad_option1_scalar,
    fad_option2_scalar,
)
from cycj.kernel_slots import (
    A_LIMIT,
    A_TEAR,
    CHECK_COLLAPSE,
    CHECK_FAD,
    CHECK_TOUGH,
    E_MOD,
    FAD_CURVE,
    FLOW_RATIO,
    J_C,
    K_PEAK,
    LR_MAX,
    N_PEAK,
    SIGMA_Y,
)
from cycj.models import register

# end codes (0 = still running)
(
    RUNNING,
    END_TOUGHNESS,
    END_TEARING,
    END_FAD,
    END_COLLAPSE,
    END_SIZE,
    END_MAX_CYCLES,
    END_NO_GROWTH,
    END_LEAK,
) = range(9)

# criteria a case may select (one record each; the end code is the kernel code)
register(
    "end_criterion",
    "toughness",
    END_TOUGHNESS,
    slots=("J_C", "K_PEAK", "N_PEAK"),
    validity="J_max at the peak load ≥ J_c (or J_Ic)",
    citation=(
        "ASTM E1820: fracture toughness J_c, J_Ic",
        "Ainsworth, R. A., Eng. Fract. "
        "Mech. 19 (1984) 633–642: J at peak load by the reference stress method",
    ),
)
register(
    "end_criterion",
    "tearing",
    END_TEARING,
    slots=("A_TEAR",),
    validity="J–R curve J_R = C1·(Δa/1 mm)^C2 within its measured extension",
    citation=(
        "Paris, P. C., Tada, H., Zahoor, A., Ernst, H., ASTM STP 668 (1979) 5–36: "
        "tearing instability",
        "ASTM E1820: J–R curve",
    ),
)
register(
    "end_criterion",
    "fad",
    END_FAD,
    slots=("FAD_CURVE", "J_C", "LR_MAX"),
    validity="assessment point on or outside the failure assessment curve",
    citation=(
        "R6 Rev. 4 / BS 7910:2013+A1:2015: failure assessment diagram and L_r,max",
        "R6 Rev. 3 / BS 7910:1999 level 2A: the Option 1 curve's form "
        "(1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)) (from memory)",
    ),
)
register(
    "end_criterion",
    "collapse",
    END_COLLAPSE,
    slots=("LR_MAX",),
    validity="L_r = P_max/P_L(a) ≥ L_r,max = (σ_y + σ_u)/(2σ_y)",
    citation=("R6 Rev. 4 / BS 7910:2013+A1:2015: failure assessment diagram and L_r,max",),
)
register(
    "end_criterion",
    "size-limit",
    END_SIZE,
    slots=("A_LIMIT",),
    validity="crack size limit of the user or of the K solution's range",
    citation=(),
)

END_NAMES = {
    END_TOUGHNESS: "toughness",
    END_TEARING: "tearing",
    END_FAD: "fad",
    END_COLLAPSE: "collapse",
    END_SIZE: "size-limit",
    END_MAX_CYCLES: "max-cycles",
    END_NO_GROWTH: "no-growth",
    END_LEAK: "leak",
}


@jit(inline="always")
def end_check(a, jmax, lr, j_el_max, rho, mp):
    """End code tripped at crack size ``a`` with J_max, L_r and J_el at peak (0 if none) and the
    value that tripped it; ``rho`` is the plasticity interaction added to K_r when secondary
    (residual) stresses act (R6 / BS 7910), else 0.

    Order when several trip in the same cycle (:data:`PRIORITY`): collapse (L_r ≥ L_r,max
    overrides every fracture criterion), tearing, toughness, FAD, size limit;
    :func:`tripped_criteria` lists them all."""
    return end_check_given(a, jmax, lr, j_el_max, rho, end_terms(mp))


@jit(inline="always")
def end_terms(mp):
    """The model array's values :func:`end_check_given` reads, as one tuple of scalars (the
    stepper reads them once, before its loop: no array enters the per-cycle check, so the
    loop does no reference counting)."""
    return (
        mp[CHECK_COLLAPSE] > 0.5,
        mp[LR_MAX],
        mp[A_TEAR],
        mp[CHECK_TOUGH] > 0.5,
        mp[J_C],
        mp[CHECK_FAD] > 0.5,
        int(mp[FAD_CURVE]),
        mp[SIGMA_Y],
        mp[E_MOD],
        mp[K_PEAK],
        mp[N_PEAK],
        mp[FLOW_RATIO],
        mp[A_LIMIT],
    )


@jit(inline="always")
def end_check_given(a, jmax, lr, j_el_max, rho, terms):
    """:func:`end_check` given :func:`end_terms` of the model array."""
    collapse, lr_max, a_tear, tough, j_c, fad, fad_code, sy, e_mod, k_peak, n_peak, flow, a_lim = (
        terms
    )
    if collapse and lr >= lr_max:
        return END_COLLAPSE, lr
    if a >= a_tear:
        return END_TEARING, a
    if tough and jmax >= j_c:
        return END_TOUGHNESS, jmax
    if fad:
        kr = math.sqrt(j_el_max / j_c) + rho
        f = fad_value_given(lr, fad_code, lr_max, sy, e_mod, k_peak, n_peak, flow)
        if kr >= f:
            return END_FAD, kr
    if a >= a_lim:
        return END_SIZE, a
    return RUNNING, 0.0


@jit
def fad_value(lr, mp):
    """The failure assessment curve f(L_r) the case chose (its record's code in FAD_CURVE);
    an unknown code is an error."""
    return fad_value_given(
        lr,
        int(mp[FAD_CURVE]),
        mp[LR_MAX],
        mp[SIGMA_Y],
        mp[E_MOD],
        mp[K_PEAK],
        mp[N_PEAK],
        mp[FLOW_RATIO],
    )


@jit
def fad_value_given(lr, code, lr_max, sy, e_mod, k_peak, n_peak, flow_ratio):
    """:func:`fad_value` given the curve's code, L_r,max, σ_y [MPa], E [MPa], the peak curve's
    K [MPa] and n, and σ_flow/σ_y."""
    if code == FAD_OPTION_2:
        return fad_option2_scalar(lr, lr_max, sy, e_mod, k_peak, n_peak)
    if code == FAD_OPTION_1_2013:
        su = sy * (2.0 * flow_ratio - 1.0)  # σ_flow = (σ_y + σ_u)/2
        return fad_option1_2013_scalar(
            lr, lr_max, min(0.001 * e_mod / sy, 0.6), 0.3 * (1.0 - sy / su)
        )
    if code == FAD_OPTION_1:
        return fad_option1_scalar(lr, lr_max)
    raise ValueError("unknown FAD curve code")


#: the order in which criteria tripped in the same cycle are named (the first is end_reason)
PRIORITY = ("collapse", "tearing", "toughness", "fad", "size-limit")


def tripped_criteria(a, jmax, lr, j_el_max, rho, mp) -> list[dict]:
    """Every end criterion tripped at crack size ``a`` [mm] with J_max, L_r, J_el at peak
    [kJ/m²] and ρ (as :func:`end_check`), in :data:`PRIORITY` order, each with its value and
    its limit: ``{"criterion", "value", "limit", "quantity"}``."""
    out = []
    if mp[CHECK_COLLAPSE] > 0.5 and lr >= mp[LR_MAX]:
        out.append(_row("collapse", "L_r", lr, mp[LR_MAX]))
    if a >= mp[A_TEAR]:
        out.append(_row("tearing", "a_mm", a, mp[A_TEAR]))
    if mp[CHECK_TOUGH] > 0.5 and jmax >= mp[J_C]:
        out.append(_row("toughness", "J_max_kJm2", jmax, mp[J_C]))
    if mp[CHECK_FAD] > 0.5:
        kr = math.sqrt(j_el_max / mp[J_C]) + rho
        f = fad_value(lr, mp)
        if kr >= f:
            out.append(_row("fad", "K_r", kr, f))
    if a >= mp[A_LIMIT]:
        out.append(_row("size-limit", "a_mm", a, mp[A_LIMIT]))
    return out


def _row(name, quantity, value, limit):
    return {
        "criterion": name,
        "quantity": quantity,
        "value": float(value),
        "limit": float(limit),
    }
