"""Keys of a case file outside ``[inspection]``: top, material, geometry, loading, analysis,
fe, run, report (declared once; see :mod:`cycj.schema`).  Bare numbers are internal units."""

from __future__ import annotations

from cycj.schema import Key as K
from cycj.schema import declare

C = "case"

# fmt: off
CURVE = (
    K("strength_coefficient", "stress", "K' (or K) of σ = K·ε_p^n", required=True,
      example='"880 MPa"'),
    K("hardening_exponent", "number", "n' (or n) of σ = K·ε_p^n, 0 < n < 1", required=True,
      example="0.16"),
)
PROFILE = (
    K("kind", "choice", "a polynomial in x/t or a table of stress against x/t",
      required="without file", allowed=("polynomial", "table"), example='"polynomial"'),
    K("coefficients", "list", "σ(x) = Σ c_i·(x/t)^i [MPa], c_0 first (kind polynomial)",
      required="kind polynomial", example="[120.0, -240.0]"),
    K("x_over_t", "list", "depth positions x/t from the cracked surface (kind table)",
      required="kind table", example="[0.0, 0.5, 1.0]"),
    K("stress", "list", "stress at each x/t [MPa] (kind table)", required="kind table",
      example="[100.0, 20.0, -60.0]"),
    K("file", "file", "a CSV of x/t, stress [MPa] (one header row), relative to the case",
      example='"profile.csv"'),
)

declare(C, "", "Top level", (
    K("title", "text", "a title for reports", default="the file name",
      example='"Hoist plate, edge crack"'),
    K("material", "table", "the material: elastic, cyclic and toughness data, growth law",
      required=True),
    K("geometry", "table", "the crack configuration and its dimensions", required=True),
    K("loading", "table", "the load history or constant amplitude, closure, sequence",
      required=True),
    K("analysis", "table", "how ΔJ is estimated and which FAD curve is used"),
    K("run", "table", "integration method, end criteria, limits"),
    K("fe", "table", "crack sizes and loads of `cycj j-table`"),
    K("inspection", "table", "inspection planning (`cycj plan`), see docs/inspection_planning.md"),
    K("report", "table", "how reports present results"),
))

declare(C, "material", "[material]", (
    K("elastic_modulus", "stress", "Young's modulus E", required=True, example='"205 GPa"'),
    K("poisson_ratio", "number", "Poisson's ratio ν (E' = E/(1−ν²) in plane strain)",
      default="0.3", example="0.3"),
    K("yield_strength", "stress", "0.2 % proof stress σ_y (limit load, L_r)", required=True,
      example='"340 MPa"'),
    K("tensile_strength", "stress", "σ_u; the flow stress is (σ_y + σ_u)/2",
      default="none (flow stress = σ_y)", example='"510 MPa"'),
    K("cyclic_curve", "table", "cyclic stress–strain curve { strength_coefficient, "
      "hardening_exponent } (K', n'); needed by every j_method but elastic",
      example='{ strength_coefficient = "880 MPa", hardening_exponent = 0.16 }'),
    K("monotonic_curve", "table", "monotonic curve { strength_coefficient, hardening_exponent }"
      " (FAD option 2)"),
    K("toughness", "table", "{ J_c or K_c, resistance_curve }", example='{ J_c = "220 kJ/m^2" }'),
    K("growth", "table", "the growth law da/dN = C·ΔJ^m", required=True,
      example='{ C = 2.0e-4, m = 1.5 }'),
))
declare(C, "material.cyclic_curve", "material.cyclic_curve", CURVE)
declare(C, "material.monotonic_curve", "material.monotonic_curve", CURVE)
declare(C, "material.toughness", "material.toughness", (
    K("J_c", "energy_per_area", "critical J (criterion toughness, the FAD's K_r)",
      example='"220 kJ/m^2"'),
    K("K_c", "stress_intensity", "critical K instead of J_c (converted J_c = K_c²/E')",
      example='"150 MPa*m**0.5"'),
    K("resistance_curve", "table", "J–R curve J = C1·Δa^C2 (Δa in mm), criterion tearing",
      example='{ C1 = "380 kJ/m^2", C2 = 0.55 }'),
))
declare(C, "material.toughness.resistance_curve", "material.toughness.resistance_curve", (
    K("C1", "energy_per_area", "J at 1 mm of tearing", required=True, example='"380 kJ/m^2"'),
    K("C2", "number", "exponent of Δa", required=True, example="0.55"),
))
DRIVING = (
    "unit of the driving force the law was printed in: a ΔJ unit ('kJ/m^2', 'N/mm', 'J/m^2')"
    " or a ΔK unit written with ** for powers ('MPa*m**0.5', 'MPa*mm**0.5', 'ksi*in**0.5');"
    " a ΔK unit makes C, m a ΔK law, converted exactly with ΔK² = E'·ΔJ"
)
declare(C, "material.growth", "material.growth", (
    K("law", "choice", "the growth law", default='"paris"', allowed="model:growth_law"),
    K("C", "number", "coefficient of da/dN = C·ΔJ^m in rate_unit per driving_unit^m",
      required="without from_delta_K", example="2.0e-4"),
    K("m", "number", "exponent (0.001 to 20)", required="without from_delta_K", example="1.5"),
    K("threshold", "energy_per_area", "ΔJ below which there is no growth (a ΔK if "
      "driving_unit is a ΔK unit)", default="0", example='"0.02 kJ/m^2"'),
    K("basis", "choice", "range the law was fitted on: the applied range, or the effective "
      "range above opening (needed with closure)", default='"applied"',
      allowed=("applied", "effective")),
    K("rate_unit", "text", "length unit of da/dN per cycle ('mm', 'm', 'in')", default='"mm"',
      example='"mm"'),
    K("driving_unit", "text", DRIVING, default='"kJ/m^2"', example='"kJ/m^2"'),
    K("toughness_exponent", "number", "q of the acceleration (1 − J_max/J_c)^−q near J_c",
      default="0"),
    K("from_delta_K", "table", "a published ΔK law as printed { C, m, rate_unit, driving_unit,"
      " threshold }, converted exactly", example='{ C = 1.65e-11, m = 3.0, rate_unit = "m", '
      'driving_unit = "MPa*m**0.5" }'),
    K("valid_dJ", "list", "ΔJ range of the data behind C, m (written by `cycj fit`); a run "
      "warns outside it", example='["1.5 kJ/m^2", "3.9 kJ/m^2"]'),
))
declare(C, "material.growth.from_delta_K", "material.growth.from_delta_K", (
    K("C", "number", "C of da/dN = C·ΔK^m as printed", required=True, example="1.65e-11"),
    K("m", "number", "m as printed", required=True, example="3.0"),
    K("rate_unit", "text", "length unit of the printed da/dN", required=True, example='"m"'),
    K("driving_unit", "text", "unit of the printed ΔK, powers with **", required=True,
      example='"MPa*m**0.5"'),
    K("threshold", "stress_intensity", "ΔK threshold", default="0", example='"2 MPa*m**0.5"'),
))

declare(C, "geometry", "[geometry]", (
    K("shape", "choice", "crack configuration (`cycj geometries` lists each with its "
      "dimensions)", required=True, allowed="shapes", example='"edge-crack-plate"'),
    K("crack_length", "length", "initial crack size a: depth of an edge or surface crack, half"
      " length of a centre or axial through crack, from the load line for C(T), from the hole "
      "edge for crack-at-hole", required=True, example='"5 mm"'),
    K("width", "length", "W, the section dimension the crack grows across; for an edge crack "
      "in a wall (edge-crack-plate) the wall thickness; full width for centre-crack-plate; "
      "from the load line for C(T)", required="shape needs it", example='"40 mm"'),
    K("thickness", "length", "B, along the crack front (S = P/(B·W)); wall thickness t of "
      "surface-crack-plate and axial-crack-cylinder", required="shape needs it",
      example='"20 mm"'),
    K("net_thickness", "length", "B_N between side grooves", default="= thickness"),
    K("span", "length", "support span of three-point-bend", default="4·width"),
    K("half_length", "length", "surface length half c of surface-crack-plate",
      required="surface-crack-plate", example='"8 mm"'),
    K("bending_ratio", "number", "bending stress / membrane stress (surface-crack-plate)",
      default="0"),
    K("inner_radius", "length", "bore radius R_i of axial-crack-cylinder",
      required="axial-crack-cylinder", example='"300 mm"'),
    K("hole_radius", "length", "hole radius R of crack-at-hole", required="crack-at-hole",
      example='"10 mm"'),
    K("cracks", "integer", "one or two cracks at the hole (crack-at-hole)", default="2"),
    K("table", "file", "CSV a_over_W, F, limit_load_factor of shape tabulated, relative to "
      "the case", required="tabulated", example='"lug_table.csv"'),
    K("constraint", "choice", "plane strain (E' = E/(1−ν²)) or plane stress (E' = E)",
      default='"plane-strain"', allowed=("plane-strain", "plane-stress")),
    K("notch", "table", "a notch the crack starts at { kt, depth, root_radius } "
      "(j_method notch)", example='{ kt = 2.5, depth = "4 mm", root_radius = "1 mm" }'),
    K("stress_profile", "table", "through-wall primary stress profile (docs/stress_fields.md)"),
    K("residual_stress", "table", "{ uniform or profile, relaxation } (docs/stress_fields.md)"),
))
declare(C, "geometry.notch", "geometry.notch", (
    K("kt", "number", "elastic stress concentration factor K_t (1 to 20)", required=True,
      example="2.5"),
    K("depth", "length", "notch depth D from the surface to the notch root, along the crack "
      "line; the crack is measured from the root, and the long crack it becomes has length "
      "a + D (Dowling)", required=True, example='"4 mm"'),
    K("root_radius", "length", "notch root radius ρ", default="none", example='"1 mm"'),
))
declare(C, "geometry.stress_profile", "geometry.stress_profile", PROFILE)
declare(C, "geometry.residual_stress", "geometry.residual_stress", (
    K("uniform", "stress", "a uniform residual stress", example='"200 MPa"'),
    K("profile", "table", "a residual stress profile (as stress_profile)"),
    K("relaxation", "number", 'factor in [0, 1] on the residual stress, or "bs7910"',
      default="1"),
))
declare(C, "geometry.residual_stress.profile", "geometry.residual_stress.profile", PROFILE)

declare(C, "loading", "[loading]", (
    K("history", "file", "load history file (.csv, .tsv, .txt, .parquet, .npy, .xlsx), "
      "relative to the case", required="without constant", example='"crane_duty.csv"'),
    K("sheet", "text", "worksheet of an .xlsx history, by name", default="the first sheet",
      example='"Duty"'),
    K("column", "text", "column of the history, by name (or 0-based position)",
      default="the only (or first non-time) numeric column", example='"load_kN"'),
    K("unit", "text", "unit of the history's (or constant's bare) values", default="internal "
      "(N or MPa)", example='"kN"'),
    K("quantity", "choice", "what the values are", default="from the unit and the shape",
      allowed=("force", "stress", "pressure")),
    K("scale", "number", "factor applied to every load", default="1"),
    K("gate", "number", "reversal pairs smaller than this are dropped (file unit or a "
      "quantity)", default="0"),
    K("duration", "time", "the time of one pass of the history (or of one constant cycle), "
      "for lives in hours", default="none (lives in cycles only)", example='"8 h"'),
    K("constant", "table", "constant amplitude { max, min }", required="without history",
      example='{ max = "14 kN", min = "1.4 kN" }'),
    K("closure", "choice", 'crack closure: a name or { model = "constant", U = 0.8 }',
      default='"none"', allowed="model:closure"),
    K("compressive_part", "choice", "whether the load range below zero drives growth",
      default='"ignore"', allowed=("ignore", "include")),
    K("sequence", "choice", 'load sequence model: a name or { model = "wheeler", '
      'shaping_exponent = 1.3 }', default='"none"', allowed="model:retardation"),
    K("channels", "list", "[[loading.channels]] load channels (docs/stress_fields.md)"),
))
declare(C, "loading.constant", "loading.constant", (
    K("max", "number", "peak load (unit as [loading] unit, or a quantity)", required=True,
      example='"14 kN"'),
    K("min", "number", "valley load", required=True, example='"1.4 kN"'),
))
declare(C, "loading.closure", "loading.closure", (
    K("model", "choice", "closure model", required=True, allowed="model:closure"),
    K("U", "number", "constant opening fraction 0 < U ≤ 1", required="model constant",
      example="0.8"),
    K("constraint_factor", "number", "Newman's α (1 to 3)", default="3 plane strain, 1 plane "
      "stress"),
))
declare(C, "loading.sequence", "loading.sequence", (
    K("model", "choice", "sequence model", required=True, allowed="model:retardation"),
    K("shaping_exponent", "number", "Wheeler's exponent (0 to 10)"),
    K("shut_off_ratio", "number", "Willenborg's shut-off overload ratio (1.01 to 10)"),
    K("zone_factor", "number", "plastic zone size factor (1 to 10)"),
))
declare(C, "loading.channels[]", "[[loading.channels]]", (
    K("name", "text", "a name for reports", default="channel N"),
    K("column", "text", "column of loading.history", required=True, example='"p"'),
    K("unit", "text", "stress unit of the column", default="MPa"),
    K("scale", "number", "factor on the column", default="1"),
    K("secondary", "bool", "a secondary (thermal) stress: in K and ρ, never in L_r",
      default="false"),
    K("stress_profile", "table", "the channel's profile per unit value", default="uniform"),
))
declare(C, "loading.channels[].stress_profile", "loading.channels[].stress_profile", PROFILE)

declare(C, "analysis", "[analysis]", (
    K("j_method", "choice", "estimate of ΔJ", default='"reference-stress"',
      allowed="model:j_method"),
    K("fad", "choice", "failure assessment curve", default='"option-2"', allowed="model:fad"),
    K("j_table", "file", "a jtable.csv (from `cycj j-table`) for j_method finite-element"),
))
declare(C, "fe", "[fe]", (
    K("crack_lengths", "list", "crack sizes of the J table", default="the case's crack range",
      example='["20 mm", "25 mm"]'),
    K("nominal_stresses", "list", "nominal stress levels", default="L_r = 0.05 to 2"),
    K("loads", "list", "load levels instead of nominal_stresses"),
    K("refine", "integer", "mesh refinement 1 to 4 (elements per ring 16·refine)", default="1"),
    K("domains", "integer", "domains of the J integral (3 to 8)", default="4"),
), note="See docs/finite_element_j.md.")
declare(C, "run", "[run]", (
    K("method", "choice", "cycle by cycle, block integration, or chosen by the history",
      default='"auto"', allowed=("auto", "cycle", "block")),
    K("max_cycles", "number", "stop after this many cycles", default="1e9"),
    K("crack_length_limit", "length", "stop at this crack size", required="infinite or "
      "semi-infinite shapes", default="the shape's size limit", example='"50 mm"'),
    K("criteria", "list", "end criteria checked", default='["toughness", "collapse", '
      '"size-limit"]', allowed="model:end_criterion"),
    K("after_leak", "choice", "a surface crack through the wall stops, or goes on as a "
      "through crack", default='"stop"', allowed=("stop", "through-crack")),
))
declare(C, "report", "[report]", (
    K("units", "choice", "units of reports and plots (files keep SI columns)", default='"SI"',
      allowed=("SI", "US")),
))
# fmt: on
