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

#: public name → module (imported on first use: the stepper needs only the compiled
#: scalars, not scipy's quadrature helpers)
_LAZY = {
    "StressProfile": "cycj.fields.profiles",
    "bs7910_residual_relaxation": "cycj.fields.residual",
    "crack_at_hole_factor_scalar": "cycj.fields.notch",
    "edge_crack_plate_k": "cycj.fields.weight_functions",
    "edge_crack_plate_references": "cycj.fields.weight_functions",
    "edge_crack_semi_infinite_k": "cycj.fields.weight_functions",
    "glinka_shen_coefficients": "cycj.fields.weight_functions",
    "glinka_shen_influence": "cycj.fields.weight_functions",
    "glinka_shen_k": "cycj.fields.weight_functions",
    "glinka_shen_weight": "cycj.fields.weight_functions",
    "k_over_s_crack_at_hole": "cycj.fields.notch",
    "kr_with_secondary": "cycj.fields.residual",
    "linearise_polynomial": "cycj.fields.profiles",
    "linearise_table": "cycj.fields.profiles",
    "neuber_masing": "cycj.fields.notch",
    "neuber_masing_stress_range_scalar": "cycj.fields.notch",
    "notch_delta_j": "cycj.fields.notch",
    "notch_delta_j_scalar": "cycj.fields.notch",
    "notch_root_delta_j": "cycj.fields.notch",
    "peak_stress": "cycj.fields.profiles",
    "polynomial_stress": "cycj.fields.profiles",
    "r6_plasticity_interaction": "cycj.fields.residual",
    "residual_k_shift": "cycj.fields.residual",
    "residual_stress_k": "cycj.fields.residual",
    "smith_miller_notch_field_depth": "cycj.fields.notch",
    "surface_crack_influence_coefficients": "cycj.fields.weight_functions",
    "surface_crack_k": "cycj.fields.weight_functions",
    "surface_crack_polynomial_k": "cycj.fields.weight_functions",
    "surface_crack_references": "cycj.fields.weight_functions",
    "tabulated_stress": "cycj.fields.profiles",
    "tada_pure_bending_factor": "cycj.fields.weight_functions",
}

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


def __getattr__(name):
    if name in _LAZY:
        import importlib

        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module 'cycj.fields' has no attribute {name!r}")
