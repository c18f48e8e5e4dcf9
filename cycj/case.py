"""Case files (TOML) → validated, typed objects in internal units, with one-line errors.

Every key is declared once in :mod:`cycj.schema` (reference: docs/keys.md); see ``examples/``
for complete cases.
Paths inside a case are relative to the case file.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import asdict, dataclass, field
from pathlib import Path

from cycj import models
from cycj.errors import CycjInputError
from cycj.geometry import SHAPE_NAMES, Geometry, make_geometry
from cycj.growth import GrowthLaw
from cycj.loading_inputs import Loading, read_loading
from cycj.material import Material
from cycj.material_inputs import read_growth, read_material
from cycj.tables import Table, read_toml

# the names a case may choose come from the models' records (cycj.models)
CRITERIA = models.names("end_criterion")
END_REASONS = (
    "toughness",
    "tearing",
    "fad",
    "collapse",
    "size-limit",
    "leak",
    "max-cycles",
    "no-growth",
)


@dataclass(frozen=True)
class Analysis:
    j_method: str = "reference-stress"
    fad: str = "option-2"
    j_table: str | None = None  # jtable.csv for j_method "finite-element" (path resolved)


@dataclass(frozen=True)
class RunOptions:
    method: str = "auto"
    max_cycles: float = 1e9
    crack_length_limit: float | None = None
    criteria: tuple[str, ...] = ("toughness", "collapse", "size-limit")
    after_leak: str = "stop"  # surface crack through the wall: "stop" or "through-crack"


@dataclass(frozen=True)
class Case:
    """A resolved case: every quantity in internal units (N, mm, MPa, kJ/m², h)."""

    title: str
    material: Material
    geometry: Geometry
    growth: GrowthLaw
    loading: Loading
    analysis: Analysis
    run: RunOptions
    path: Path | None = None
    inspection: dict | None = None
    raw: dict = field(default_factory=dict, repr=False)
    toughness_source: str = "J_c"
    fields: object | None = None  # cycj.fields.inputs.FieldSpec (stress fields, channels)
    #: every file the case reads, as (role, path): the case, history, tables, profiles
    files: tuple = ()
    #: units of reports and plots, [report] units: "SI" (default) or "US" (files stay SI)
    report_units: str = "SI"

    @property
    def sha256(self) -> str | None:
        if self.path is None:
            return None
        return hashlib.sha256(Path(self.path).read_bytes()).hexdigest()

    def newman_constraint_factor(self) -> tuple[float, str]:
        """Newman's constraint factor α used by the closure model, and where it comes from:
        the case's ``constraint_factor``, else 3 (plane strain) or 1 (plane stress), the two
        bounds of Newman (1984)."""
        alpha = self.loading.closure.constraint_factor
        if alpha is not None:
            return float(alpha), "loading.closure.constraint_factor"
        if self.geometry.plane_strain:
            return 3.0, "default for plane strain (Newman 1984: α = 3)"
        return 1.0, "default for plane stress (Newman 1984: α = 1)"

    def resolved(self) -> dict:
        """The case in internal units, as plain JSON-ready data."""
        geo = self.geometry
        out = {
            "title": self.title,
            "units": {
                "force": "N",
                "length": "mm",
                "stress": "MPa",
                "J": "kJ/m^2",
                "K": "MPa*mm^0.5",
                "rate": "mm/cycle",
                "time": "h",
            },
            "material": _plain(asdict(self.material)),
            "geometry": {
                "shape": geo.shape.name,
                "crack_length_mm": geo.crack_length,
                "constraint": "plane-strain" if geo.plane_strain else "plane-stress",
                **{f"{k}_mm" if k != "bending_ratio" else k: v for k, v in geo.dims.items()},
            },
            "growth": _plain(asdict(self.growth)),
            "loading": _plain(asdict(self.loading)),
            "analysis": asdict(self.analysis),
            "run": _plain(asdict(self.run)),
            "report": {"units": self.report_units},
        }
        out["material"]["flow_stress"] = self.material.flow_stress
        out["material"]["effective_modulus"] = self.material.effective_modulus(geo.plane_strain)
        if geo.notch is not None:
            out["geometry"]["notch"] = geo.notch
        if self.loading.closure.model == "newman":
            alpha, basis = self.newman_constraint_factor()
            out["loading"]["closure"]["constraint_factor_used"] = alpha
            out["loading"]["closure"]["constraint_factor_basis"] = basis
        if self.fields is not None:
            out["fields"] = _fields_plain(self.fields)
        if self.inspection is not None:
            out["inspection"] = self.inspection
        return out


def _fields_plain(spec) -> dict:
    """Stress-field inputs as plain data (profiles by kind and coefficients or table)."""

    def prof(p):
        if p is None or isinstance(p, float):
            return p
        return {
            "kind": p.kind,
            "coefficients": list(p.coefficients),
            "x_over_t": list(p.x_over_t),
            "stress": list(p.stress),
            "scale": p.scale,
        }

    return {
        "stress_profile": prof(spec.profile),
        "residual_stress": prof(spec.residual),
        "residual_relaxation": spec.relaxation,
        "channels": [
            {
                "name": c.name,
                "column": c.column,
                "unit_factor": c.unit_factor,
                "scale": c.scale,
                "stress_profile": prof(c.profile),
            }
            for c in spec.channels
        ],
    }


def _plain(obj):
    if isinstance(obj, dict):
        return {k: _plain(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_plain(v) for v in obj]
    if isinstance(obj, Path):
        return str(obj)
    if isinstance(obj, float) and not math.isfinite(obj):
        return str(obj)
    return obj


def load_case(path) -> Case:
    """Read and validate a case file.  Raises :class:`CycjInputError` with one clear line."""
    path = Path(path)
    from dataclasses import replace

    from cycj.inputs_read import noted_mark, noted_since

    mark = noted_mark()
    raw = read_toml(path, role="case")
    case = case_from_dict(raw, source=str(path), base=path.parent, path=path)
    return replace(case, files=noted_since(mark))


def case_from_dict(
    raw: dict, *, source: str | None = None, base: Path | None = None, path: Path | None = None
) -> Case:
    """Validate a case given as a dict (the parsed TOML)."""
    top = Table(raw, "", source)
    title = top.string("title", default=path.stem if path else "untitled case")
    mat_t = top.table("material", required=True)
    geo_t = top.table("geometry", required=True)
    geometry = _geometry(geo_t, base or Path("."))
    material, jc_note = read_material(mat_t, geometry)
    growth = read_growth(mat_t.table("growth", required=True), material, geometry)
    mat_t.finish()
    loading = read_loading(top.table("loading", required=True), geometry, base or Path("."))
    analysis = _analysis(top.table("analysis"), base or Path("."))
    run = _run(top.table("run"), geometry, source)
    inspection = top.get("inspection")
    from cycj.fe.inputs import read_fe

    read_fe(top.get("fe"), source)  # [fe]: options of `cycj j-table`, validated here
    report_t = top.table("report")
    units = "SI"
    if report_t is not None:
        units = report_t.choice("units", ("SI", "US"), default="SI")
        report_t.finish()
    if inspection is not None and not isinstance(inspection, dict):
        raise CycjInputError(
            "must be a table",
            source=source,
            key="inspection",
            expected="a TOML table [inspection]",
            found=inspection,
        )
    top.finish()
    if loading.closure.model != "none" and growth.basis == "applied":
        raise CycjInputError(
            "closure with a growth law fitted on the applied range would count closure twice; "
            'use a law with basis = "effective" or closure = "none"',
            source=source,
            key="loading.closure",
            expected="'none' for an applied-basis law",
            found=loading.closure.model,
        )
    if analysis.j_method != "elastic" and material.cyclic_curve is None:
        raise CycjInputError(
            f"j_method '{analysis.j_method}' needs the cyclic curve",
            source=source,
            key="material.cyclic_curve",
            expected="{ strength_coefficient = ..., hardening_exponent = ... }",
        )
    if analysis.j_method == "notch" and geometry.notch is None:
        raise CycjInputError(
            "j_method 'notch' needs [geometry] notch = { kt, depth } (or the crack-at-hole shape)",
            source=source,
            key="analysis.j_method",
        )
    if analysis.j_method == "notch" and geometry.notch and geometry.shape.name != "crack-at-hole":
        hi = geometry.size_limits[1]
        if not geometry.crack_length + geometry.notch["depth"] < hi:
            raise CycjInputError(
                "the crack plus the notch depth leaves the K solution's range (the long crack "
                "of j_method 'notch' has length a + D)",
                source=source,
                key="geometry.notch.depth",
                expected=f"a + D < {hi:g} mm",
                found=geometry.notch["depth"],
            )
    if analysis.j_method == "small-crack" and geometry.shape.name not in (
        "edge-crack-semi-infinite",
        "center-crack-infinite-plate",
    ):
        raise CycjInputError(
            "the small-crack estimate is for a small crack in a smooth section",
            source=source,
            key="analysis.j_method",
            expected=f"'reference-stress' or 'elastic' for {geometry.shape.name}",
            found="small-crack",
        )
    if analysis.j_method == "finite-element" and analysis.j_table is None:
        from cycj.fe.shapes import FE_SHAPES

        if geometry.shape.name not in FE_SHAPES:
            raise CycjInputError(
                f"no finite-element model of {geometry.shape.name}: give [analysis] j_table",
                source=source,
                key="analysis.j_method",
                expected="a shape of " + ", ".join(FE_SHAPES),
            )
    for crit in run.criteria:
        if crit == "toughness" and material.J_c is None:
            raise CycjInputError(
                "criterion 'toughness' needs material.toughness.J_c (or K_c)",
                source=source,
                key="run.criteria",
            )
        if crit == "tearing" and material.resistance_curve is None:
            raise CycjInputError(
                "criterion 'tearing' needs material.toughness.resistance_curve",
                source=source,
                key="run.criteria",
            )
        if (
            crit == "fad"
            and analysis.fad == "option-1-2013"
            and not (
                material.tensile_strength and material.tensile_strength > material.yield_strength
            )
        ):
            raise CycjInputError(
                "the 2013 Option 1 curve needs a tensile strength above the yield strength",
                source=source,
                key="analysis.fad",
                expected="material.tensile_strength > material.yield_strength",
            )
        if crit == "fad" and material.J_c is None:
            raise CycjInputError(
                "criterion 'fad' needs a toughness (J_c or K_c)", source=source, key="run.criteria"
            )
    fields = _fields(raw, source, base or Path("."), geometry, loading)
    return Case(
        title,
        material,
        geometry,
        growth,
        loading,
        analysis,
        run,
        path,
        inspection,
        raw,
        jc_note,
        fields,
        report_units=units,
    )


#: shapes whose stress-field (weight-function) solutions are wired into the life engine
FIELD_SHAPES = ("edge-crack-plate", "surface-crack-plate")


def _fields(raw, source, base, geometry, loading):
    from cycj.fields.inputs import read_fields

    spec = read_fields(
        raw.get("geometry", {}), raw.get("loading", {}).get("channels"), source, base
    )
    if spec is None:
        return None
    if geometry.shape.name not in FIELD_SHAPES:
        raise CycjInputError(
            "stress profiles, residual stress and load channels are "
            f"available for {', '.join(FIELD_SHAPES)}",
            source=source,
            key="geometry.shape",
            found=geometry.shape.name,
        )
    if not spec.channels and loading.quantity != "stress":
        raise CycjInputError(
            "with stress fields the loads are stresses (MPa)",
            source=source,
            key="loading.quantity",
            expected="'stress'",
            found=loading.quantity,
        )
    if spec.channels and loading.history is None:
        raise CycjInputError(
            "load channels read their columns from loading.history",
            source=source,
            key="loading.history",
        )
    return spec


def _geometry(t: Table, base: Path) -> Geometry:
    shape = t.choice("shape", SHAPE_NAMES, required=True)
    kw = {}
    for k in (
        "width",
        "thickness",
        "net_thickness",
        "span",
        "half_length",
        "inner_radius",
        "hole_radius",
    ):
        v = t.quantity(k, "length", positive=True)
        if v is not None:
            kw[k] = v
    t.known |= {"stress_profile", "residual_stress"}  # read by cycj.fields.inputs
    cracks = t.number("cracks", integer=True)
    if cracks is not None:
        kw["cracks"] = cracks
    notch_raw = t.table("notch")
    notch = None
    if notch_raw is not None:
        kt = notch_raw.number("kt", required=True, lo=(1.0, "1"), hi=(20.0, "20"))
        depth = notch_raw.quantity("depth", "length", required=True, positive=True)
        radius = notch_raw.quantity("root_radius", "length", positive=True)
        notch_raw.finish()
        notch = {"kt": kt, "depth": depth, "root_radius": radius}
    br = t.number("bending_ratio")
    if br is not None:
        kw["bending_ratio"] = br
    table = t.string("table")
    if table is not None:
        from cycj.geometry.tabulated import read_table

        path = base / table
        if not path.is_file():
            raise t.error("table", "table file not found", found=str(path))
        from cycj.inputs_read import note_input

        note_input(path, "table")
        kw["table"] = read_table(path, source=str(path))
    a = t.quantity("crack_length", "length", required=True, positive=True)
    constraint = t.choice("constraint", ("plane-strain", "plane-stress"), default="plane-strain")
    t.finish()
    geo = make_geometry(shape, a, constraint=constraint, source=t.source, prefix=t.path, **kw)
    if notch is None and shape == "crack-at-hole":  # the hole is the notch: K_t = 3, depth R
        notch = {"kt": 3.0, "depth": kw["hole_radius"], "root_radius": kw["hole_radius"]}
    from dataclasses import replace

    return replace(geo, notch=notch)


def _analysis(t: Table | None, base: Path = Path(".")) -> Analysis:
    if t is None:
        return Analysis()
    jm = t.choice("j_method", models.names("j_method"), default="reference-stress")
    fad = t.choice("fad", models.names("fad"), default="option-2")
    table = t.string("j_table")
    if table is not None:
        if jm != "finite-element":
            raise t.error("j_table", "a J table is read only by j_method 'finite-element'")
        path = base / table
        if not path.is_file():
            raise t.error("j_table", "file not found", found=str(path))
        table = str(path)
    t.finish()
    return Analysis(jm, fad, table)


#: largest crack size a run may aim at [mm] (beyond it growth and J overflow)
MAX_CRACK_MM = 1e5
NEEDS_LIMIT = (
    "an infinite or semi-infinite body sets no size limit of its own: give crack_length_limit"
)


def _run(t: Table | None, geometry: Geometry, source: str | None = None) -> RunOptions:
    unbounded = math.isinf(geometry.size_limits[1])
    if t is None:
        if unbounded:
            raise CycjInputError(
                NEEDS_LIMIT,
                source=source,
                key="run.crack_length_limit",
                expected='a size such as "100 mm"',
            )
        return RunOptions()
    method = t.choice("method", ("auto", "cycle", "block"), default="auto")
    maxc = t.number("max_cycles", default=1e9, positive=True)
    limit = t.quantity(
        "crack_length_limit", "length", lo=(1e-9, "0 mm"), hi=(MAX_CRACK_MM, f"{MAX_CRACK_MM:g} mm")
    )
    if limit is None and unbounded:
        raise t.error("crack_length_limit", NEEDS_LIMIT, expected='a size such as "100 mm"')
    if limit is not None and not limit > geometry.crack_length:
        raise t.error(
            "crack_length_limit",
            "must exceed the initial crack",
            expected=f"> {geometry.crack_length:g} mm",
            found=limit,
        )
    crit = t.get("criteria", ["toughness", "collapse", "size-limit"])
    if not isinstance(crit, list) or not crit:
        raise t.error("criteria", "must be a list", expected=f"a list from {CRITERIA}", found=crit)
    for c in crit:
        if c not in CRITERIA:
            import difflib

            near = difflib.get_close_matches(str(c), CRITERIA, n=1)
            hint = f" (did you mean '{near[0]}'?)" if near else ""
            raise t.error(
                "criteria",
                f"unknown criterion{hint}",
                expected="any of " + ", ".join(CRITERIA),
                found=c,
            )
    after = t.choice("after_leak", ("stop", "through-crack"), default="stop")
    if after != "stop" and not geometry.two_d:
        raise t.error(
            "after_leak",
            "only a surface crack leaks and becomes a through crack",
            expected="'stop'",
            found=after,
        )
    t.finish()
    return RunOptions(method, maxc, limit, tuple(crit), after)
