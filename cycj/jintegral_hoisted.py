"""The loop-invariant forms of the ΔJ and J_max kernels of :mod:`cycj.jintegral`.

The compiled stepper computes the invariants (1/n', 1 + 1/n', K'·0.002^n', 1/n) once into its
model array (:mod:`cycj.kernel_slots`) and calls these forms; the scalar kernels of
:mod:`cycj.jintegral` compute them and call the same forms, so both give the same bits.
References as in :mod:`cycj.jintegral` (Ainsworth 1984; Dowling and Begley 1976).
"""

from __future__ import annotations

from cycj._jit import jit


@jit(inline="always")
def plastic_fraction_hoisted(u, n_prime, pf_exp):
    """:func:`cycj.jintegral.plastic_fraction_scalar` given its exponent ``pf_exp`` = 1 + 1/n'."""
    x = 1.0 - u
    if x <= 0.0:
        return 1.0
    if x >= 1.0:
        return 0.0
    return 1.0 - (1.0 + n_prime) * x + n_prime * x**pf_exp


@jit(inline="always")
def reference_stress_delta_j_hoisted(
    dj_el, dsig_ref, e_mod, k_prime, n_prime, u, sy_cyc, inv_n, pf_exp
):
    """:func:`cycj.jintegral.reference_stress_delta_j_scalar` given ``sy_cyc`` = K'·0.002^n'
    [MPa], ``inv_n`` = 1/n' and ``pf_exp`` = 1 + 1/n' (held in the stepper's model array)."""
    if dsig_ref <= 0.0:
        return u * u * dj_el
    dep = 2.0 * (0.5 * dsig_ref / k_prime) ** inv_n  # masing_plastic_strain_range
    de_ref = dsig_ref / e_mod + dep
    lr_cyc = dsig_ref / (2.0 * sy_cyc)
    elastic_part = dj_el * (1.0 + 0.5 * lr_cyc * lr_cyc * dsig_ref / (e_mod * de_ref))
    plastic_part = dj_el * e_mod * dep / dsig_ref
    return u * u * elastic_part + plastic_fraction_hoisted(u, n_prime, pf_exp) * plastic_part


@jit(inline="always")
def j_peak_hoisted(j_el, lr, sigma_y, e_mod, k, inv_n):
    """:func:`cycj.jintegral.j_peak_scalar` given ``inv_n`` = 1/n."""
    if lr <= 0.0:
        return j_el
    s_ref = lr * sigma_y
    e_ref = s_ref / e_mod + (s_ref / k) ** inv_n
    return j_el * (e_mod * e_ref / s_ref + 0.5 * lr * lr * s_ref / (e_mod * e_ref))
