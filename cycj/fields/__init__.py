"""Real stress fields over the crack plane (issue #9): pure physics for the life stepper.

Profiles (:mod:`cycj.fields.profiles`)
    ``StressProfile``, ``polynomial_stress``, ``tabulated_stress``, ``linearise_polynomial``,
    ``linearise_table``, ``peak_stress``.
Weight functions (:mod:`cycj.fields.weight_functions`, Glinka–Shen)
    ``glinka_shen_coefficients``, ``glinka_shen_weight``, ``glinka_shen_k``,
    ``glinka_shen_influence``, ``edge_crack_plate_k``, ``edge_crack_semi_infinite_k``,
    ``surface_crack_k``, ``surface_crack_influence_coefficients``,
    ``surface_crack_polynomial_k``, ``tada_pure_bending_factor`` and the reference factors.
Residual and secondary stress (:mod:`cycj.fields.residual`)
    ``residual_stress_k``, ``bs7910_residual_relaxation``, ``r6_plasticity_interaction``,
    ``kr_with_secondary``, ``residual_k_shift``.
Notches (:mod:`cycj.fields.notch`)
    ``neuber_masing``, ``notch_root_delta_j``, ``notch_delta_j`` (Dowling 1979 transition),
    ``smith_miller_notch_field_depth``, ``k_over_s_crack_at_hole``; compiled scalars
    ``neuber_masing_stress_range_scalar``, ``notch_delta_j_scalar``,
    ``crack_at_hole_factor_scalar``.

See ``docs/stress_fields.md`` for formulas, sources and the proposed case-file keys.
"""

from cycj.fields.notch import (
    crack_at_hole_factor_scalar,
    k_over_s_crack_at_hole,
    neuber_masing,
    neuber_masing_stress_range_scalar,
    notch_delta_j,
    notch_delta_j_scalar,
    notch_root_delta_j,
    smith_miller_notch_field_depth,
)
from cycj.fields.profiles import (
    StressProfile,
    linearise_polynomial,
    linearise_table,
    peak_stress,
    polynomial_stress,
    tabulated_stress,
)
from cycj.fields.residual import (
    bs7910_residual_relaxation,
    kr_with_secondary,
    r6_plasticity_interaction,
    residual_k_shift,
    residual_stress_k,
)
from cycj.fields.weight_functions import (
    edge_crack_plate_k,
    edge_crack_plate_references,
    edge_crack_semi_infinite_k,
    glinka_shen_coefficients,
    glinka_shen_influence,
    glinka_shen_k,
    glinka_shen_weight,
    surface_crack_influence_coefficients,
    surface_crack_k,
    surface_crack_polynomial_k,
    surface_crack_references,
    tada_pure_bending_factor,
)

__all__ = [
    "StressProfile",
    "bs7910_residual_relaxation",
    "crack_at_hole_factor_scalar",
    "edge_crack_plate_k",
    "edge_crack_plate_references",
    "edge_crack_semi_infinite_k",
    "glinka_shen_coefficients",
    "glinka_shen_influence",
    "glinka_shen_k",
    "glinka_shen_weight",
    "k_over_s_crack_at_hole",
    "kr_with_secondary",
    "linearise_polynomial",
    "linearise_table",
    "neuber_masing",
    "neuber_masing_stress_range_scalar",
    "notch_delta_j",
    "notch_delta_j_scalar",
    "notch_root_delta_j",
    "peak_stress",
    "polynomial_stress",
    "r6_plasticity_interaction",
    "residual_k_shift",
    "residual_stress_k",
    "smith_miller_notch_field_depth",
    "surface_crack_influence_coefficients",
    "surface_crack_k",
    "surface_crack_polynomial_k",
    "surface_crack_references",
    "tabulated_stress",
    "tada_pure_bending_factor",
]
