"""Small builders of case dicts for tests (invented data), and a reader of check tables."""

import copy
import csv

BASE = {
    "title": "test case",
    "material": {
        "elastic_modulus": "200 GPa",
        "poisson_ratio": 0.3,
        "yield_strength": "350 MPa",
        "tensile_strength": "500 MPa",
        "cyclic_curve": {"strength_coefficient": "900 MPa", "hardening_exponent": 0.15},
        "toughness": {"J_c": "200 kJ/m^2"},
        "growth": {"law": "paris", "C": 1e-4, "m": 1.6},
    },
    "geometry": {"shape": "center-crack-infinite-plate", "crack_length": "1 mm"},
    "loading": {"constant": {"max": "100 MPa", "min": "0 MPa"}},
    "analysis": {"j_method": "elastic"},
    "run": {"criteria": ["size-limit"], "crack_length_limit": "10 mm"},
}


def case_dict(**sections):
    """BASE with sections replaced or updated: case_dict(material={...}) updates keys."""
    d = copy.deepcopy(BASE)
    for name, val in sections.items():
        if val is None:
            d.pop(name, None)
        elif isinstance(val, dict) and isinstance(d.get(name), dict):
            d[name].update(val)
        else:
            d[name] = val
    return d


def make_case(**sections):
    from cycj.case import case_from_dict

    return case_from_dict(case_dict(**sections), source="<test>")


def run_cli(args, capsys):
    """Run the command line in-process: (exit status, stdout, stderr)."""
    from cycj.cli import main

    try:
        main([str(a) for a in args])
        code = 0
    except SystemExit as exc:
        code = exc.code
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def expected_models(case, summary) -> list[tuple[str, str]]:
    """The (kind, name) of every model a run of ``case`` used, read from the case file and the
    run's summary (independently of the code that cites them)."""
    used = [
        ("geometry", case.geometry.shape.name),
        ("j_method", case.analysis.j_method),
        ("growth_law", case.growth.law),
        ("closure", case.loading.closure.model),
        ("retardation", case.loading.sequence),
    ]
    used += [("end_criterion", c) for c in case.run.criteria]
    if "fad" in case.run.criteria:
        fad = case.analysis.fad
        used.append(
            ("fad", "option-1" if fad == "option-2" and not case.material.peak_curve else fad)
        )
    methods = []
    if case.growth.converted_from:
        methods.append("delta-k-conversion")
    if case.loading.compressive_part == "ignore":
        methods.append("compressive-part-excluded")
    if case.loading.history is not None or case.fields is not None:
        methods.append("rainflow")
    if case.fields is not None:
        methods += ["weight-functions", "plate-reference-stress"]
        if case.fields.residual is not None:
            methods.append("residual-stress")
    if summary["method"] == "block":
        methods.append("block-integration")
    if "phases" in summary:  # the through-crack phase runs on a centre-cracked plate
        methods.append("surface-to-through")
        used.append(("geometry", "center-crack-plate"))
    return used + [("method", m) for m in methods]


def assert_references_match(case, summary):
    """The references a run printed are exactly those its models declare in their records:
    nothing printed that no used model declares, nothing declared by a used model missing."""
    from cycj import models

    declared = set()
    for kind, name in expected_models(case, summary):
        rec = models.record(kind, name)
        declared.update(rec.citation)
        missing = set(rec.citation) - set(summary["references"])
        assert not missing, f"{kind} {name!r} used but not cited: {missing}"
    extra = set(summary["references"]) - declared
    assert not extra, f"printed but declared by no model the run used: {extra}"


def read_check_csv(path):
    """Rows (dicts of strings) of a published check table in tests/data.

    Lines starting with ``#`` name the source, table and confidence; they are skipped.
    """
    with open(path, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(line for line in fh if not line.startswith("#")))
    if not rows:
        raise ValueError(f"{path}: no rows")
    return rows
