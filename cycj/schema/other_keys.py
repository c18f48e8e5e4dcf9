"""Keys of a case's ``[inspection]`` table and of the specimen file of ``cycj fit`` (declared
once; see :mod:`cycj.schema`).  Bare numbers: mm, cycles, kJ/m², MPa."""

from __future__ import annotations

from cycj.schema import Key as K
from cycj.schema import declare

C, S = "case", "specimen"

# fmt: off
POD = (
    K("model", "choice", "POD curve", default='"lognormal"', allowed="model:pod"),
    K("a50", "length", "size found half the time (or give a90)", required="without a90",
      example='"2 mm"'),
    K("a90", "length", "size found 90 % of the time (or give a50)", required="without a50"),
    K("sigma", "number", "spread of the curve in ln a (0 to 5)", required=True, example="0.4"),
    K("ceiling", "number", "largest probability of detection (0 < ceiling ≤ 1)", default="1"),
    K("a90_95", "length", "a90 at 95 % confidence, from a fit (`cycj pod`)"),
)
declare(C, "inspection", "[inspection]", (
    K("pod", "table", "probability of detection curve", required=True,
      example='{ model = "lognormal", a50 = "2 mm", sigma = 0.4 }'),
    K("design_life", "cycles", "life the plan covers [cycles]", required=True, example="1.0e6"),
    K("detectable_size", "length", "size an inspection finds for the deterministic plan",
      default="the POD's a90/95 if given, else its a90"),
    K("safety_factor", "number", "deterministic interval = life from detectable size to the "
      "end / safety_factor (≥ 1)", default="2"),
    K("intervals", "list", "what-if inspection intervals [cycles]",
      default="design life / 16, 8, 4, 2", example="[5.0e4, 1.0e5]"),
    K("schedule", "list", "fixed inspection times [cycles] within the design life"),
    K("samples", "integer", "Monte Carlo samples (100 to 1e8)", default="20000"),
    K("seed", "integer", "random seed", default="0"),
    K("target_pof", "number", "probability of failure the interval must keep", default="1e-4"),
    K("repair", "choice", "a found crack is renewed to the initial size, or removed",
      default='"renew"', allowed=("renew", "remove")),
    K("max_inspections", "integer", "smallest interval searched = design life / this",
      default="100"),
    K("chunk_size", "integer", "samples per Monte Carlo chunk (results do not depend on the "
      "workers)", default="10000"),
    K("max_samples", "integer", "sample budget of the converged search",
      default="max(1e6, samples)"),
    K("pof_tolerance", "number", "half-width of the PoF's interval ≤ this × target_pof",
      default="0.2"),
    K("confidence", "number", "confidence of that interval", default="0.95"),
    K("method", "choice", "sampling method", default='"auto"',
      allowed=("auto", "monte-carlo", "importance-sampling")),
    K("hours_per_year", "number", "operating hours in a year", default="8766"),
    K("pod_lower_bound", "bool", "also plot the POD through a90/95 (needs a90_95)",
      default="false"),
    K("scatter", "table", "[inspection.scatter]: scattered inputs"),
    K("findings", "list", "results of inspections done: { cycles, result, size, sizing_sd, "
      "pod }"),
), note="See docs/inspection_planning.md.")
declare(C, "inspection.pod", "inspection.pod", POD)
declare(C, "inspection.scatter", "[inspection.scatter]", tuple(
    K(name, "table", what, example='{ distribution = "lognormal", sigma = 0.3 }')
    for name, what in (
        ("growth_C", "scatter of the growth coefficient C (a factor, median 1)"),
        ("initial_crack", "scatter of the initial crack size"),
        ("toughness", "scatter of J_c (a factor of the case's J_c)"),
        ("load_scale", "scatter of a factor on every load"),
    )
))
DIST = (
    K("distribution", "choice", "distribution", required=True,
      allowed=("lognormal", "weibull", "normal", "fixed")),
    K("median", "number", "median (a factor; a length for initial_crack)",
      default="the case's value"),
    K("mean", "number", "mean instead of the median"),
    K("value", "length", "the fixed size (distribution fixed, initial_crack)"),
    K("sigma", "number", "σ of ln (lognormal, 0 to 3)"),
    K("cov", "number", "coefficient of variation (any distribution)"),
    K("sd", "number", "standard deviation (normal; a length for initial_crack)"),
    K("shape", "number", "Weibull shape (0.5 to 1000)"),
)
for _var in ("growth_C", "initial_crack", "toughness", "load_scale"):
    declare(C, f"inspection.scatter.{_var}", f"inspection.scatter.{_var}", DIST)
declare(C, "inspection.findings[]", "inspection.findings element", (
    K("cycles", "cycles", "when the inspection was done [cycles]", required=True),
    K("result", "choice", "what it found", required=True, allowed=("found", "not-found")),
    K("size", "length", "the size found", required="result found"),
    K("sizing_sd", "length", "standard deviation of the sizing", default="0.1·size"),
    K("pod", "table", "that inspection's POD", default="the plan's pod"),
))
declare(C, "inspection.findings[].pod", "inspection.findings[].pod", POD)

declare(S, "", "Specimen file (`cycj fit --specimen`)", (
    K("shape", "choice", "specimen shape", required=True,
      allowed=("compact-tension", "three-point-bend", "center-crack-plate", "edge-crack-plate"),
      example='"compact-tension"'),
    K("width", "length", "W (from the load line for C(T))", required=True, example='"50 mm"'),
    K("thickness", "length", "B", required=True, example='"12.5 mm"'),
    K("net_thickness", "length", "B_N between side grooves", default="= thickness"),
    K("crack_length", "length", "initial crack (from the load line for C(T))", required=True,
      example='"15 mm"'),
    K("span", "length", "support span of three-point-bend", default="4·width"),
    K("constraint", "choice", "plane strain or plane stress", default='"plane-strain"',
      allowed=("plane-strain", "plane-stress")),
    K("elastic_modulus", "stress", "Young's modulus", required=True, example='"205 GPa"'),
    K("poisson_ratio", "number", "Poisson's ratio", default="0.3"),
    K("yield_strength", "stress", "σ_y", required=True, example='"340 MPa"'),
    K("tensile_strength", "stress", "σ_u", default="none"),
    K("cyclic_curve", "table", "{ strength_coefficient, hardening_exponent } for the plastic "
      "part of ΔJ", example='{ strength_coefficient = "880 MPa", hardening_exponent = 0.16 }'),
    K("displacement_at", "choice", "where the displacement gauge sits (compact-tension: "
      "front-face, load-line, crack-mouth; other shapes load-line)", required=True,
      allowed=("front-face", "load-line", "crack-mouth"), example='"front-face"'),
    K("log_units", "table", "{ load, displacement, crack_length } units of the log columns",
      default="N and mm", example='{ load = "kN", displacement = "mm" }'),
    K("final_crack_length", "length", "optical reading after the test"),
    K("crack_correction", "choice", "correct compliance crack sizes to the optical readings",
      default='"none"', allowed=("none", "first", "first-last")),
    K("opening_offset", "number", "compliance-offset criterion of opening (0.001 to 0.2)",
      default="0.02"),
    K("opening_segment_point", "choice",
      "the force a compliance-offset segment stands for: its midpoint (ASTM E647 practice) or "
      "its lower end (for an opening that is abrupt within one segment)",
      default='"midpoint"', allowed=("midpoint", "lower-end")),
    K("label", "text", "the test's name (matches a specimen column)", default="the file name"),
))
declare(S, "cyclic_curve", "cyclic_curve", (
    K("strength_coefficient", "stress", "K'", required=True),
    K("hardening_exponent", "number", "n'", required=True),
))
declare(S, "log_units", "log_units", (
    K("load", "text", "unit of the load columns", default='"N"'),
    K("displacement", "text", "unit of the displacement column", default='"mm"'),
    K("crack_length", "text", "unit of the crack_length column", default='"mm"'),
))
# fmt: on
