"""Growth laws in ΔJ, crack closure (opening load) models and the compressive part.

All functions here are compiled scalar kernels (used by the life stepper) with vectorised,
range-checked twins for notebooks.  Units: stresses MPa, ΔJ kJ/m², da/dN mm/cycle.

Closure enters ΔJ through x = (S_op − S_min)/ΔS = 1 − U (see :mod:`cycj.jintegral`):
U² of the elastic part and the fraction f_pl of the plastic part of the Masing branch drive
growth.

References
----------
.. [1] Elber, W., "The significance of fatigue crack closure", ASTM STP 486 (1971) 230–242:
   U = 0.5 + 0.4R for −0.1 ≤ R ≤ 0.7 (2024-T3).
.. [2] Newman, J. C., Jr., "A crack opening stress equation for fatigue crack growth",
   Int. J. Fract. 24 (1984) R131–R135.
.. [3] ASTM E647: the compressive part of a cycle (P < 0) is excluded from ΔK (R < 0).
.. [4] Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: da/dN = C·ΔJ^m.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.models import records, register

# closure model codes of the stepper
# closure models: one record each (name, kernel code, slots read, validity, citation)
NONE = register(
    "closure",
    "none",
    0,
    slots=("INCLUDE_COMP",),
    validity="opening at the minimum load, or at zero load when the compressive part is excluded",
    citation=(),
).code
CONSTANT = register(
    "closure",
    "constant",
    1,
    slots=("U_CONST",),
    validity="0 < U ≤ 1 (measured or assumed)",
    citation=(
        "Elber, W., ASTM STP 486 (1971) 230–242: effective range U·ΔK above the opening load",
    ),
).code
ELBER = register(
    "closure",
    "elber",
    2,
    validity="−0.1 ≤ R ≤ 0.7 (2024-T3); R is clipped and counted",
    citation=("Elber, W., ASTM STP 486 (1971) 230–242: U = 0.5 + 0.4R",),
).code
NEWMAN = register(
    "closure",
    "newman",
    3,
    slots=("ALPHA_NEWMAN", "FLOW_RATIO"),
    validity="−1 ≤ R < 1, S_max/σ_0 ≤ 0.8 (clipped and counted), 1 ≤ α ≤ 3",
    citation=("Newman, J. C., Jr., Int. J. Fract. 24 (1984) R131–R135: crack-opening function",),
).code
#: codes of the closure models opening_fraction evaluates itself
BUILT_IN_CLOSURES = (NONE, CONSTANT, ELBER, NEWMAN)

# growth laws
PARIS = register(
    "growth_law",
    "paris",
    0,
    slots=("C_LAW", "M_LAW", "DJ_TH", "Q_TOUGH"),
    validity="the ΔJ range of the data the law was fitted on",
    citation=("Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: da/dN = C·ΔJ^m",),
).code

ELBER_R_RANGE = (-0.1, 0.7)
NEWMAN_R_MIN = -1.0
NEWMAN_SMAX_FLOW_MAX = 0.8


@jit(inline="always")
def elber_u(r):
    """Elber's U = 0.5 + 0.4R (valid −0.1 ≤ R ≤ 0.7; the stepper clips R and counts it)."""
    return 0.5 + 0.4 * r


@jit(inline="always")
def newman_terms(alpha):
    """The α terms of Newman's A_0 and A_1: 0.825 − 0.34α + 0.05α², 0.415 − 0.071α, 1/α."""
    return 0.825 - 0.34 * alpha + 0.05 * alpha * alpha, 0.415 - 0.071 * alpha, 1.0 / alpha


@jit(inline="always")
def newman_opening_ratio(r, smax_flow, alpha):
    """Newman's S_o/S_max for stress ratio R (−1 ≤ R < 1), S_max/σ_0 (≤ 0.8) and constraint
    factor α (1 plane stress … 3 plane strain); never below R (S_o ≥ S_min)."""
    c0, c1, inv_alpha = newman_terms(alpha)
    return newman_opening_ratio_hoisted(r, smax_flow, c0, c1, inv_alpha)


@jit(inline="always")
def newman_opening_ratio_hoisted(r, smax_flow, c0, c1, inv_alpha):
    """:func:`newman_opening_ratio` given its α terms (:func:`newman_terms`)."""
    a0 = c0 * math.cos(0.5 * math.pi * smax_flow) ** inv_alpha
    a1 = c1 * smax_flow
    a3 = 2.0 * a0 + a1 - 1.0
    a2 = 1.0 - a0 - a1 - a3
    if r >= 0.0:
        so = a0 + a1 * r + a2 * r * r + a3 * r * r * r
    else:
        so = a0 + a1 * r
    return max(so, r)


@jit(inline="always")
def newman_u(r, smax_flow, alpha):
    """U = (1 − S_o/S_max)/(1 − R) from Newman's opening function."""
    return (1.0 - newman_opening_ratio(r, smax_flow, alpha)) / (1.0 - r)


@jit(inline="always")
def newman_u_hoisted(r, smax_flow, c0, c1, inv_alpha):
    """:func:`newman_u` given the α terms (:func:`newman_terms`)."""
    return (1.0 - newman_opening_ratio_hoisted(r, smax_flow, c0, c1, inv_alpha)) / (1.0 - r)


def _chain_of_openings(added):
    """A compiled dispatcher over the closure models added through their records: calls the
    record's ``opening(r, smax_flow, u_const, alpha)`` for its code, −1 for an unknown code."""
    if not added:

        @jit
        def no_model_left(model, r, smax_flow, u_const, alpha):
            return -1.0

        return no_model_left
    kernel, code, rest = added[0].kernel, added[0].code, _chain_of_openings(added[1:])

    @jit
    def one_model(model, r, smax_flow, u_const, alpha):
        if model == code:
            return max(kernel(r, smax_flow, u_const, alpha), 0.0)
        return rest(model, r, smax_flow, u_const, alpha)

    return one_model


#: closure models registered (before this module is imported) with their own opening kernel
_extension_opening = _chain_of_openings(
    [r for r in records("closure") if r.kernel is not None and r.code not in BUILT_IN_CLOSURES]
)


@jit(inline="always")
def opening_fraction(model, smax, smin, smax_flow, u_const, alpha, include_compressive):
    """x = (S_op − S_min)/ΔS for one cycle (0 ≤ x ≤ 1), and a flag: 1 if R or S_max/σ_0 had to
    be clipped into the model's range (counted by the stepper, warned by Python).

    ``model``: the closure record's code (none, constant U, Elber, Newman, or a model added
    through its record with an ``opening`` kernel).  With ``none`` and S_min < 0 the
    compressive part is excluded (S_op = 0) unless ``include_compressive``.  An unknown code
    is an error.
    """
    c0, c1, inv_alpha = newman_terms(alpha)
    return opening_fraction_hoisted(
        model, smax, smin, smax_flow, u_const, alpha, include_compressive, c0, c1, inv_alpha
    )


@jit(inline="always")
def opening_fraction_hoisted(
    model, smax, smin, smax_flow, u_const, alpha, include_compressive, c0, c1, inv_alpha
):
    """:func:`opening_fraction` given Newman's α terms (:func:`newman_terms`)."""
    ds = smax - smin
    if ds <= 0.0 or smax <= 0.0:
        return 1.0, 0
    clipped = 0
    if model == CONSTANT:
        return 1.0 - u_const, 0
    if model == NONE:
        if smin < 0.0 and include_compressive < 0.5:
            return -smin / ds, 0
        return 0.0, 0
    r = smin / smax
    if model == ELBER:
        if r < -0.1:
            r, clipped = -0.1, 1
        elif r > 0.7:
            r, clipped = 0.7, 1
        return 1.0 - elber_u(r), clipped
    if model == NEWMAN:
        if r < -1.0:
            r, clipped = -1.0, 1
        sf = smax_flow
        if sf > 0.8:
            sf, clipped = 0.8, 1
        x = 1.0 - newman_u_hoisted(r, sf, c0, c1, inv_alpha)
        return min(max(x, 0.0), 1.0), clipped
    x = _extension_opening(model, r, smax_flow, u_const, alpha)
    if x < 0.0:
        raise ValueError("unknown closure model code")
    return min(x, 1.0), 0


@jit(inline="always")
def paris_rate_from_power(dj, djm, c, threshold):
    """da/dN = C·ΔJ^m [mm/cycle] given ``djm`` = ΔJ^m, above the threshold ΔJ_th, else 0."""
    if dj <= threshold or dj <= 0.0:
        return 0.0
    return c * djm


@jit
def paris_rate(dj, c, m, threshold):
    """da/dN = C·ΔJ^m [mm/cycle] above the threshold ΔJ_th, else 0."""
    return paris_rate_from_power(dj, dj**m if dj > 0.0 else 0.0, c, threshold)


# ------------------------------------------------------------------ vectorised, checked twins
_newman_ratio = ufunc(newman_opening_ratio)


def elber_closure(r):
    """Elber's U(R) = 0.5 + 0.4R; raises outside −0.1 ≤ R ≤ 0.7 (Elber 1971)."""
    r = np.asarray(r, float)
    if np.any((r < ELBER_R_RANGE[0]) | (r > ELBER_R_RANGE[1])):
        raise ValidityRangeError("Elber's U(R) is published for −0.1 ≤ R ≤ 0.7")
    return 0.5 + 0.4 * r


def newman_closure(r, smax_flow, alpha):
    """Newman's (1984) S_o/S_max; raises outside −1 ≤ R < 1, 0 ≤ S_max/σ_0 ≤ 0.8,
    1 ≤ α ≤ 3."""
    r, s = np.asarray(r, float), np.asarray(smax_flow, float)
    if np.any((r < -1) | (r >= 1)):
        raise ValidityRangeError("Newman's opening function needs −1 ≤ R < 1")
    if np.any((s < 0) | (s > NEWMAN_SMAX_FLOW_MAX)):
        raise ValidityRangeError("Newman's opening function is for 0 ≤ S_max/σ_0 ≤ 0.8")
    if not 1 <= alpha <= 3:
        raise ValidityRangeError("Newman's constraint factor α lies in [1, 3]")
    return _newman_ratio(r, s, float(alpha))


# ------------------------------------------------------------------ law parameters as data


@dataclass(frozen=True)
class GrowthLaw:
    """da/dN [mm/cycle] = C·ΔJ^m (ΔJ in kJ/m²), zero below ``threshold`` [kJ/m²].

    ``basis`` is ``"applied"`` (fitted on the applied range) or ``"effective"`` (fitted on the
    range above the opening load).  ``toughness_exponent`` q > 0 adds the acceleration
    1/(1 − J_max/J_c)^q as J_max nears the toughness (0 = none).
    """

    C: float
    m: float
    threshold: float = 0.0
    basis: str = "applied"
    law: str = "paris"
    toughness_exponent: float = 0.0
    converted_from: dict | None = None
    #: ΔJ range [kJ/m²] of the data behind the constants (``valid_dJ``), or None
    valid_dJ: tuple | None = None

    def rate(self, delta_j):
        """da/dN [mm/cycle] for ΔJ [kJ/m²] (vectorised; no acceleration term)."""
        import numpy as np

        return np.vectorize(paris_rate, otypes=[float])(
            np.asarray(delta_j, float), self.C, self.m, self.threshold
        )


def from_delta_k(
    C_k: float, m_k: float, e_prime: float, threshold_k: float = 0.0, **kw
) -> GrowthLaw:
    """Convert da/dN = C_K·ΔK^m_K (mm/cycle, ΔK in MPa√mm) to the ΔJ form.

    ΔK = √(E'·ΔJ) ⇒ da/dN = C_K·E'^(m_K/2)·ΔJ^(m_K/2);  ΔJ_th = ΔK_th²/E'.
    """
    return GrowthLaw(
        C=C_k * e_prime ** (m_k / 2), m=m_k / 2, threshold=threshold_k**2 / e_prime, **kw
    )
