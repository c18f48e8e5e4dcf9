"""Failure assessment diagram curves f(L_r): Option 1 (two editions) and Option 2 (the
material's own curve), as compiled scalars for the end criteria and checked vectorised twins.

Units: L_r and K_r are dimensionless; stresses MPa.  Each curve is 0 beyond L_r,max.

References
----------
.. [1] Milne, I., Ainsworth, R. A., Dowling, A. R., Stewart, A. T., R6 Rev. 3, Int. J. Pres.
   Ves. & Piping 32 (1988) 3–104: f(L_r) = (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)) (the
   BS 7910:1999 level 2A curve; from memory).
.. [2] BS 7910:2013+A1:2015 §7.3 and R6 Rev. 4: Option 1 f(L_r) = (1 + ½L_r²)^(−½)·[0.3 +
   0.7·exp(−μL_r⁶)] for L_r ≤ 1, μ = min(0.001E/σ_y, 0.6), and f(1)·L_r^((N−1)/(2N)) for
   1 < L_r ≤ L_r,max, N = 0.3(1 − σ_y/σ_u) (from memory; docs/references.md R20).
.. [3] Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: Option 2, K_r = (J_e/J)^½.
"""

from __future__ import annotations

import math

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.jintegral import _nonneg, j_peak_scalar
from cycj.models import register

_FAD_SOURCE = "R6 Rev. 4 / BS 7910:2013+A1:2015: failure assessment diagram and L_r,max"
#: the Option 1 curve of R6 Rev. 3 and BS 7910:1999 level 2A (from memory); BS 7910:2013 and
#: R6 Rev. 4 print another Option 1 curve, selectable as "option-1-2013"
FAD_OPTION_1_SOURCE = (
    "R6 Rev. 3 (Milne, Ainsworth, Dowling & Stewart, Int. J. Pres. Ves. & Piping 32 (1988) "
    "3–104) and BS 7910:1999 level 2A: f(L_r) = (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)) "
    "(from memory)"
)
FAD_OPTION_1 = register(
    "fad",
    "option-1",
    1,
    slots=("LR_MAX",),
    validity="0 ≤ L_r ≤ L_r,max",
    citation=(FAD_OPTION_1_SOURCE, _FAD_SOURCE),
).code
FAD_OPTION_2 = register(
    "fad",
    "option-2",
    2,
    slots=("LR_MAX", "SIGMA_Y", "E_MOD", "K_PEAK", "N_PEAK"),
    validity="0 ≤ L_r ≤ L_r,max; needs the material's monotonic curve",
    citation=(
        _FAD_SOURCE,
        "Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: "
        "K_r = (J_e/J)^½ from the material's own curve",
    ),
).code
FAD_OPTION_1_2013 = register(
    "fad",
    "option-1-2013",
    3,
    slots=("LR_MAX", "E_MOD", "SIGMA_Y", "FLOW_RATIO"),
    validity="0 ≤ L_r ≤ L_r,max; needs σ_u > σ_y",
    citation=(
        "BS 7910:2013+A1:2015 §7.3.2 / R6 Rev. 4: Option 1 f(L_r) = (1 + ½L_r²)^(−½)·[0.3 + "
        "0.7e^(−μL_r⁶)], μ = min(0.001E/σ_y, 0.6), and f(1)·L_r^((N−1)/(2N)) beyond L_r = 1, "
        "N = 0.3(1 − σ_y/σ_u) (from memory)",
        _FAD_SOURCE,
    ),
).code


@jit
def fad_option1_scalar(lr, lr_max):
    """Option 1 curve f(L_r) = (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)), 0 beyond L_r,max
    (the R6 Rev. 3 / BS 7910:1999 level 2A form, from memory)."""
    if lr > lr_max:
        return 0.0
    return (1.0 - 0.14 * lr * lr) * (0.3 + 0.7 * math.exp(-0.65 * lr**6))


@jit
def fad_option2_scalar(lr, lr_max, sigma_y, e_mod, k, n):
    """Option 2 curve from the material's own curve,
    f(L_r) = [Eε_ref/(L_rσ_y) + L_r³σ_y/(2Eε_ref)]^(−1/2); 1 at L_r = 0, 0 beyond L_r,max."""
    if lr > lr_max:
        return 0.0
    if lr <= 0.0:
        return 1.0
    return 1.0 / math.sqrt(j_peak_scalar(1.0, lr, sigma_y, e_mod, k, n))


@jit
def fad_option1_2013_scalar(lr, lr_max, mu, n_hard):
    """BS 7910:2013 / R6 Rev. 4 Option 1 curve: (1 + ½L_r²)^(−½)·[0.3 + 0.7e^(−μL_r⁶)] for
    L_r ≤ 1 and f(1)·L_r^((N−1)/(2N)) for 1 < L_r ≤ L_r,max; 0 beyond L_r,max."""
    if lr > lr_max:
        return 0.0
    if lr <= 1.0:
        return (0.3 + 0.7 * math.exp(-mu * lr**6)) / math.sqrt(1.0 + 0.5 * lr * lr)
    f1 = (0.3 + 0.7 * math.exp(-mu)) / math.sqrt(1.5)
    return f1 * lr ** ((n_hard - 1.0) / (2.0 * n_hard))


def bs7910_2013_parameters(e_mod, sigma_y, sigma_u):
    """μ = min(0.001E/σ_y, 0.6) and N = 0.3(1 − σ_y/σ_u) of the 2013 Option 1 curve."""
    if not 0 < sigma_y < sigma_u:
        raise ValidityRangeError("the 2013 Option 1 curve needs 0 < σ_y < σ_u")
    return min(0.001 * e_mod / sigma_y, 0.6), 0.3 * (1.0 - sigma_y / sigma_u)


_fad1 = ufunc(fad_option1_scalar)
_fad2 = ufunc(fad_option2_scalar)
_fad1_2013 = ufunc(fad_option1_2013_scalar)


def fad_option1(lr, lr_max=np.inf):
    """Option 1 curve f(L_r) = (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)) (0 beyond ``lr_max``).

    References
    ----------
    .. [1] R6 Rev. 3 and BS 7910:1999 level 2A (the form coded; from memory), kept as Option 1
       in R6 Rev. 4 and BS 7910:2013+A1:2015.
    """
    return _fad1(_nonneg("L_r", lr), float(lr_max))


def fad_option2(lr, material):
    """Option 2 curve from the material's own curve (monotonic if given, else cyclic)."""
    curve = material.peak_curve
    if curve is None:
        raise ValidityRangeError("Option 2 needs a stress–strain curve")
    return _fad2(
        _nonneg("L_r", lr),
        material.lr_max,
        material.yield_strength,
        material.elastic_modulus,
        curve.strength_coefficient,
        curve.hardening_exponent,
    )


# Shih (1981) D_n = d_n/(αε_0)^(1/n) at αε_0 = 0.002, computed from the HRR field
# (docs/references.md R15)


def fad_option1_2013(lr, material):
    """BS 7910:2013 / R6 Rev. 4 Option 1 curve for ``material`` (E, σ_y, σ_u; 0 beyond
    L_r,max).

    References
    ----------
    .. [1] BS 7910:2013+A1:2015 §7.3.2 (from memory; docs/references.md R20).
    """
    mu, n_hard = bs7910_2013_parameters(
        material.elastic_modulus, material.yield_strength, material.tensile_strength
    )
    return _fad1_2013(_nonneg("L_r", lr), material.lr_max, mu, n_hard)
