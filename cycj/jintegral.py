"""ΔJ and J_max estimates (elastic + plastic), L_r, failure assessment curves, CTOD from J.

Units: K in MPa√mm, stresses in MPa, J in kJ/m² (= N/mm = MPa·mm), crack sizes in mm.

Each formula is written once as a compiled scalar kernel (used by the life stepper) and exposed
to notebooks as a vectorised, range-checked function of the same source.

Two L_r's are kept apart by name:

* ``lr_cyclic`` = Δσ_ref/(2σ'_y) enters only the bracket of the cyclic ΔJ estimate;
* ``lr`` (monotonic) = P_max/P_L(a) = S_max/S_L(a) enters J_max, the FAD and collapse.

References
----------
.. [1] Ainsworth, R. A., "The assessment of defects in structures of strain hardening material",
   Eng. Fract. Mech. 19 (1984) 633–642: J/J_e = Eε_ref/σ_ref + ½L_r²σ_ref/(Eε_ref).
.. [2] Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: ΔJ as a cyclic J-integral.
.. [3] Dowling, N. E., ASTM STP 637 (1977) 97–121: ΔJ = a(3.2ΔW_e + 5.0ΔW_p), small cracks.
.. [4] R6 Rev. 4 (EDF Energy) and BS 7910:2013+A1:2015, Option 1 and Option 2 FAD curves; the
   Option 1 curve as coded, (1 − 0.14L_r²)(0.3 + 0.7e^(−0.65L_r⁶)), is the form of R6 Rev. 3
   (1986) and of the BS 7910:1999 level 2A curve (from memory).
.. [5] Shih, C. F., J. Mech. Phys. Solids 29 (1981) 305–326: δ_t = d_n·J/σ_0.
"""

from __future__ import annotations

import numpy as np

from cycj._jit import jit, ufunc
from cycj.errors import ValidityRangeError
from cycj.jintegral_hoisted import (
    j_peak_hoisted,
    plastic_fraction_hoisted,
    reference_stress_delta_j_hoisted,
)
from cycj.material import masing_plastic_strain_range
from cycj.models import register

# j_method codes used by the compiled stepper
_RICE = "Rice, J. R., J. Appl. Mech. 35 (1968) 379–386: J = K²/E' in the elastic limit"
_MASING = (
    "Masing, G. (1926); Morrow, J. D., ASTM STP 378 (1965) 45–87: cyclic (Masing) "
    "branch Δε = Δσ/E + 2(Δσ/2K')^(1/n')"
)
ELASTIC = register(
    "j_method",
    "elastic",
    0,
    slots=("E_PRIME",),
    validity="small-scale yielding (LEFM)",
    citation=(_RICE,),
).code
REFERENCE_STRESS = register(
    "j_method",
    "reference-stress",
    1,
    slots=("E_MOD", "E_PRIME", "SIGMA_Y", "K_CYC", "N_CYC"),
    validity="any L_r below collapse; conservative in the fully plastic limit",
    citation=(
        _RICE,
        "Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: reference stress J estimate",
        _MASING,
    ),
).code
_DOWLING_1977 = (
    "Dowling, N. E., ASTM STP 637 (1977) 97–121: ΔJ = a(3.2ΔW_e + 5.0ΔW_p) for a small "
    "semicircular surface crack (Y ≈ 0.714); here scaled to the crack's own K, "
    "ΔJ = U²ΔK²/E' + f_pl·(5.0/1.6)(K/S)²ΔσΔε_p/(1+n')"
)
SMALL_CRACK = register(
    "j_method",
    "small-crack",
    2,
    slots=("E_PRIME", "K_CYC", "N_CYC"),
    validity=(
        "small crack in a smooth section (a ≪ section size), nominal loop on the Masing branch; "
        "the shape's own K sets the elastic part and scales the plastic part"
    ),
    citation=(_RICE, _DOWLING_1977, _MASING),
).code
NOTCH = register(
    "j_method",
    "notch",
    3,
    slots=(
        "NOTCH_KT",
        "NOTCH_DEPTH",
        "NOTCH_OWN_LONG",
        "E_MOD",
        "E_PRIME",
        "SIGMA_Y",
        "K_CYC",
        "N_CYC",
    ),
    validity=(
        "crack growing from a notch root; notch keys required.  Short crack: the shape's own K "
        "at a with the Neuber notch-root range (→ K_t·ΔS elastic); long crack: the shape's own "
        "K and limit load at a + D by the reference stress method; the smaller of the two, "
        "never below the same crack without the notch"
    ),
    citation=(
        _RICE,
        "Neuber, H., J. Appl. Mech. 28 (1961) 544; Topper, Wetzel & Morrow, J. "
        "Materials 4 (1969) 200: notch-root loop on the Masing branch",
        "Dowling, N. E., ASTM STP 677 (1979) 247–273: crack at a notch, the smaller of the "
        "short-crack estimate (≈ 1.12·K_t·ΔS√(πa) for an edge crack) and the long crack of "
        "length a + D (from memory)",
        "Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: reference stress J estimate "
        "(long crack)",
        _DOWLING_1977,
        _MASING,
    ),
).code
FINITE_ELEMENT = register(
    "j_method",
    "finite-element",
    4,
    slots=("E_PRIME", "N_CYC", "FE_NA", "FE_NL", "FE_TABLE"),
    validity="inside the J table's crack sizes and load levels (cycj j-table); no extrapolation",
    citation=(
        _RICE,
        "Shih, C. F., Moran, B., Nakamura, T., Int. J. Fract. 30 (1986) 79–102: equivalent "
        "domain integral",
        "Lamba, H. S., Eng. Fract. Mech. 7 (1975) 693–703; Dowling, N. E., Begley, J. A., ASTM "
        "STP 590 (1976) 82–103: ΔJ on the Masing branch (from memory)",
        _MASING,
    ),
).code
#: the j_methods :func:`delta_j` evaluates by formula ("finite-element" needs a J table)
FORMULA_METHODS = ("elastic", "reference-stress", "small-crack", "notch")


# --------------------------------------------------------------------------- compiled scalars
@jit
def delta_j_elastic_scalar(delta_k, e_prime):
    """ΔJ_el = ΔK²/E' [kJ/m²] for ΔK [MPa√mm] and E' [MPa]."""
    return delta_k * delta_k / e_prime


@jit(inline="always")
def plastic_fraction_scalar(u, n_prime):
    """f_pl = 1 − (1+n')x + n'x^(1+1/n'), x = 1 − U: the share of the Masing branch's plastic
    work (from the minimum) that lies above the opening load.  U in [0, 1], 0 < n' ≤ 1."""
    return plastic_fraction_hoisted(u, n_prime, 1.0 + 1.0 / n_prime)


@jit
def reference_stress_delta_j_scalar(dj_el, dsig_ref, e_mod, k_prime, n_prime, u):
    """Effective ΔJ by the cyclic reference stress method on the Masing branch [kJ/m²].

    ΔJ_eff = U²·ΔJ_el·[1 + ½L_r,cyc²·Δσ_ref/(EΔε_ref)] + f_pl·ΔJ_el·EΔε_p,ref/Δσ_ref,
    Δε_ref = Δσ_ref/E + 2(Δσ_ref/2K')^(1/n'), L_r,cyc = Δσ_ref/(2σ'_y), σ'_y = K'·0.002^n'.
    """
    sy_cyc, inv_n = k_prime * 0.002**n_prime, 1.0 / n_prime
    return reference_stress_delta_j_hoisted(
        dj_el, dsig_ref, e_mod, k_prime, n_prime, u, sy_cyc, inv_n, 1.0 + inv_n
    )


@jit
def small_crack_delta_j_scalar(a, dsig, e_mod, k_prime, n_prime, u):
    """Dowling's small-crack ΔJ = a(3.2ΔW_e + 5.0ΔW_p) [kJ/m²], with ΔW_e = Δσ²/2E and
    ΔW_p = ΔσΔε_p/(1+n') from the Masing loop; closure keeps U² of the elastic and f_pl of the
    plastic term.  ``a`` [mm], ``dsig`` [MPa]."""
    dwe = dsig * dsig / (2.0 * e_mod)
    dwp = dsig * masing_plastic_strain_range(dsig, k_prime, n_prime) / (1.0 + n_prime)
    return a * (3.2 * u * u * dwe + 5.0 * plastic_fraction_scalar(u, n_prime) * dwp)


#: Dowling's (1977) plastic-to-elastic coefficient ratio per unit (K/S)²: 5.0/1.6
DOWLING_PLASTIC_RATIO = 5.0 / 1.6


@jit
def shape_small_crack_delta_j_scalar(dk, dsig, e_prime, k_prime, n_prime, u):
    """Small-crack ΔJ with the crack's own K [kJ/m²]: Dowling's (1977) form with its elastic
    term replaced by ΔK²/E' and its plastic term scaled by the same (K/S)² factor,

    ΔJ = U²·ΔK²/E' + f_pl·(5.0/1.6)·(ΔK/Δσ)²·ΔσΔε_p/(1+n'),

    ΔK [MPa√mm] of the stress range ``dsig`` [MPa] acting on the crack, Δε_p from the Masing
    branch.  With (K/S)² = 1.6a (Y ≈ 0.714, semicircular surface crack) and E' = E it is
    a(3.2ΔW_e + 5.0ΔW_p)."""
    if dsig <= 0.0:
        return u * u * dk * dk / e_prime
    kos2 = (dk / dsig) ** 2
    dwp = dsig * masing_plastic_strain_range(dsig, k_prime, n_prime) / (1.0 + n_prime)
    return (
        u * u * dk * dk / e_prime
        + plastic_fraction_scalar(u, n_prime) * DOWLING_PLASTIC_RATIO * kos2 * dwp
    )


@jit(inline="always")
def j_peak_scalar(j_el, lr, sigma_y, e_mod, k, n):
    """J at peak load by the reference stress method (Ainsworth 1984) [kJ/m²].

    σ_ref = L_r·σ_y, ε_ref = σ_ref/E + (σ_ref/K)^(1/n) on the monotonic (or cyclic) curve.
    """
    return j_peak_hoisted(j_el, lr, sigma_y, e_mod, k, 1.0 / n)


# --------------------------------------------------------------------------- vectorised API
_plastic_fraction = ufunc(plastic_fraction_scalar)
_ref_stress_dj = ufunc(reference_stress_delta_j_scalar)
_small_crack_dj = ufunc(small_crack_delta_j_scalar)
_shape_small_dj = ufunc(shape_small_crack_delta_j_scalar)
_j_peak = ufunc(j_peak_scalar)


def _nonneg(name, x):
    x = np.asarray(x, float)
    if np.any(~np.isfinite(x)) or np.any(x < 0):
        raise ValidityRangeError(f"{name} must be finite and ≥ 0")
    return x


def _closure_u(u):
    u = np.asarray(u, float)
    if np.any(~((u >= 0) & (u <= 1))):
        raise ValidityRangeError("U (effective range ratio) must lie in [0, 1]")
    return u


def _curve(material):
    c = material.cyclic_curve
    if c is None:
        raise ValidityRangeError("this ΔJ estimate needs the material's cyclic curve (K', n')")
    return c


def delta_j_elastic(delta_k, e_prime):
    """ΔJ_el = ΔK²/E' [kJ/m²].

    Parameters
    ----------
    delta_k : array_like [MPa√mm], ≥ 0
    e_prime : float [MPa], E (plane stress) or E/(1−ν²) (plane strain)

    References
    ----------
    .. [1] Rice, J. R., J. Appl. Mech. 35 (1968) 379: J = K²/E' under small-scale yielding.
    """
    if not e_prime > 0:
        raise ValidityRangeError("E' must be > 0 MPa")
    return _nonneg("ΔK", delta_k) ** 2 / e_prime


def plastic_fraction(u, n_prime):
    """f_pl(U, n'): share of the Masing branch's plastic work above the opening load.

    f_pl = 1 − (1+n')x + n'·x^(1+1/n'), x = 1 − U; f_pl(1) = 1, f_pl(0) = 0, → U² as n' → 1.

    Derivation: on the branch Δε_p(s) = 2(s/2K')^(1/n') measured from the minimum, the plastic
    work between s = xΔσ and Δσ, ∫ (Δσ − s) dε_p, divided by the full branch's ΔσΔε_p/(1+n').
    """
    n_prime = np.asarray(n_prime, float)
    if np.any(~((n_prime > 0) & (n_prime <= 1))):
        raise ValidityRangeError("n' must lie in (0, 1]")
    return _plastic_fraction(_closure_u(u), n_prime)


def reference_stress_delta_j(delta_j_el, delta_sigma_ref, material, u=1.0):
    """Effective cyclic ΔJ [kJ/m²] by the reference stress method on the Masing branch.

    Parameters
    ----------
    delta_j_el : array_like [kJ/m²], ΔK²/E' of the full applied range
    delta_sigma_ref : array_like [MPa], ΔP·σ_y/P_L(a) (nominal stress range for infinite bodies)
    material : cycj.material.Material with a cyclic curve
    u : array_like in [0, 1], effective range ratio (1 − x, x = (P_op − P_min)/ΔP)

    Notes
    -----
    Limits: Δσ_ref → 0 gives U²ΔJ_el; vanishing plastic strain gives U²ΔJ_el(1 + ½L_r,cyc²).

    References
    ----------
    .. [1] Ainsworth, Eng. Fract. Mech. 19 (1984) 633, applied to the cyclic (doubled) curve.
    """
    c = _curve(material)
    return _ref_stress_dj(
        _nonneg("ΔJ_el", delta_j_el),
        _nonneg("Δσ_ref", delta_sigma_ref),
        material.elastic_modulus,
        c.strength_coefficient,
        c.hardening_exponent,
        _closure_u(u),
    )


def small_crack_delta_j(a, delta_sigma, material, u=1.0):
    """Dowling's (1977) ΔJ for a small surface crack in a smooth section [kJ/m²].

    Parameters
    ----------
    a : array_like [mm], crack depth > 0
    delta_sigma : array_like [MPa], stress range of the stable loop ≥ 0
    material : Material with a cyclic curve
    u : effective range ratio in [0, 1]

    Notes
    -----
    The elastic term alone is 1.6·Δσ²·a/E (U = 1), its own K with Y ≈ 0.714.

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 637 (1977) 97–121.
    """
    a = _nonneg("a", a)
    c = _curve(material)
    return _small_crack_dj(
        a,
        _nonneg("Δσ", delta_sigma),
        material.elastic_modulus,
        c.strength_coefficient,
        c.hardening_exponent,
        _closure_u(u),
    )


def lr_monotonic(geometry, a, s_max, sigma_y):
    """L_r = P_max/P_L(a) = S_max/S_L(a) (monotonic, for J_max, FAD and collapse)."""
    return np.asarray(s_max, float) / geometry.limit_stress(a, sigma_y)


def lr_cyclic(delta_sigma_ref, cyclic_curve):
    """L_r,cyc = Δσ_ref/(2σ'_y), σ'_y = K'·0.002^n' (enters only the cyclic ΔJ bracket)."""
    return _nonneg("Δσ_ref", delta_sigma_ref) / (2 * cyclic_curve.proof_stress)


def shape_small_crack_delta_j(delta_k, delta_sigma, material, e_prime, u=1.0):
    """Small-crack ΔJ with the crack's own K [kJ/m²] (Dowling's 1977 form generalised).

    ΔJ = U²·ΔK²/E' + f_pl·(5.0/1.6)·(ΔK/Δσ)²·ΔσΔε_p/(1+n').

    Parameters
    ----------
    delta_k : array_like [MPa√mm], ΔK of the crack for the range ``delta_sigma``
    delta_sigma : array_like [MPa], stress range of the loop the crack sits in, ≥ 0
    material : Material with a cyclic curve
    e_prime : float [MPa], E' of the crack's constraint
    u : effective range ratio in [0, 1]

    Notes
    -----
    With ΔK = Δσ√(1.6a) and E' = E it is :func:`small_crack_delta_j`.  Valid for a crack small
    against the section (nominal loop, no net-section plasticity).

    References
    ----------
    .. [1] Dowling, N. E., ASTM STP 637 (1977) 97–121.
    """
    c = _curve(material)
    if not e_prime > 0:
        raise ValidityRangeError("E' must be > 0 MPa")
    return _shape_small_dj(
        _nonneg("ΔK", delta_k),
        _nonneg("Δσ", delta_sigma),
        float(e_prime),
        c.strength_coefficient,
        c.hardening_exponent,
        _closure_u(u),
    )


def delta_j(geometry, material, a, delta_s, u=1.0, method="reference-stress"):
    """Effective ΔJ [kJ/m²] for crack sizes ``a`` [mm] and nominal stress ranges ``delta_s``
    [MPa] on ``geometry``; ``method`` is ``"reference-stress"``, ``"small-crack"`` (with the
    shape's own K), ``"notch"`` (needs ``geometry.notch``; ``a`` from the notch root) or
    ``"elastic"`` (U²·ΔK²/E')."""
    a = np.asarray(a, float)
    ds = _nonneg("ΔS", delta_s)
    u = _closure_u(u)
    e_prime = material.effective_modulus(geometry.plane_strain)
    dk = ds * geometry.k_over_s(a)
    if method == "small-crack":
        return shape_small_crack_delta_j(dk, ds, material, e_prime, u)
    if method == "notch":
        return _notch_delta_j(geometry, material, a, ds, u, e_prime)
    dj_el = delta_j_elastic(dk, e_prime)
    if method == "elastic":
        return u * u * dj_el
    if method == "reference-stress":
        dsig_ref = ds * material.yield_strength / geometry.limit_stress(a, material.yield_strength)
        return reference_stress_delta_j(dj_el, dsig_ref, material, u)
    raise ValueError(
        f"unknown j_method {method!r}; expected one of {', '.join(FORMULA_METHODS)} "
        "(finite-element: cycj.j_table)"
    )


def _notch_delta_j(geometry, material, a, ds, u, e_prime):
    """ΔJ of j_method "notch" on a shape (compiled kernel of :mod:`cycj.fields.notch`)."""
    from cycj.fields.notch import notch_delta_j_scalar

    notch = geometry.notch
    if notch is None:
        raise ValidityRangeError("j_method 'notch' needs the geometry's notch (kt, depth)")
    c = _curve(material)
    own = geometry.shape.name == "crack-at-hole"
    d = 0.0 if own else float(notch["depth"])
    sy = material.yield_strength
    a, ds, u = np.broadcast_arrays(a, ds, u)
    out = np.empty(a.shape, float)
    for i in np.ndindex(a.shape):
        ai = float(a[i])
        kos = float(geometry.k_over_s(ai))
        kos2 = float(geometry.k_over_s(ai + d)) if d > 0 else kos
        sl = float(geometry.limit_stress(ai, sy))
        sl2 = float(geometry.limit_stress(ai + d, sy)) if d > 0 else sl
        out[i] = notch_delta_j_scalar(
            float(ds[i]) * kos,
            float(ds[i]),
            kos2 / kos,
            sl / sl2,
            float(ds[i]) / sl,
            float(notch["kt"]),
            1.0 if own else 0.0,
            material.elastic_modulus,
            e_prime,
            sy,
            c.strength_coefficient,
            c.hardening_exponent,
            float(u[i]),
        )[0]
    return out if out.ndim else float(out)


def j_max(geometry, material, a, s_max):
    """J at the peak nominal stress ``s_max`` [MPa] by the reference stress method with the
    monotonic curve (the cyclic one if no monotonic curve is given) [kJ/m²]."""
    curve = material.peak_curve
    if curve is None:
        raise ValidityRangeError("J_max needs a monotonic or cyclic stress–strain curve")
    s = _nonneg("S_max", s_max)
    j_el = delta_j_elastic(
        s * geometry.k_over_s(a), material.effective_modulus(geometry.plane_strain)
    )
    lr = lr_monotonic(geometry, a, s, material.yield_strength)
    return _j_peak(
        j_el,
        lr,
        material.yield_strength,
        material.elastic_modulus,
        curve.strength_coefficient,
        curve.hardening_exponent,
    )


_SHIH_N = np.array([3.0, 5.0, 10.0, 13.0])
_SHIH_DN = {
    True: np.array([1.326, 1.085, 0.931, 0.898]),
    False: np.array([2.036, 1.641, 1.369, 1.306]),
}


def shih_dn(n, alpha_eps0=0.002, plane_strain=True):
    """Shih's d_n for hardening exponent n (3 ≤ n ≤ 13, ε/ε0 = σ/σ0 + α(σ/σ0)^n).

    References
    ----------
    .. [1] Shih, C. F., J. Mech. Phys. Solids 29 (1981) 305–326 (90° intercept definition);
       values interpolated in n from D_n computed from the HRR field (from memory,
       cross-checked; docs/references.md R15).
    """
    n = np.asarray(n, float)
    if np.any((n < 3) | (n > 13)):
        raise ValidityRangeError("Shih's d_n is tabulated here for 3 ≤ n ≤ 13 only")
    if not alpha_eps0 > 0:
        raise ValidityRangeError("αε_0 must be > 0")
    dn = np.interp(n, _SHIH_N, _SHIH_DN[bool(plane_strain)])
    return dn * alpha_eps0 ** (1 / n)


def ctod_from_j(j, sigma_0, n, alpha_eps0=0.002, plane_strain=True):
    """Crack-tip opening displacement δ_t = d_n·J/σ_0 [mm] for J [kJ/m²] and σ_0 [MPa]."""
    if not sigma_0 > 0:
        raise ValidityRangeError("σ_0 must be > 0 MPa")
    return shih_dn(n, alpha_eps0, plane_strain) * _nonneg("J", j) / sigma_0
