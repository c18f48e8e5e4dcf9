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


def read_check_csv(path):
    """Rows (dicts of strings) of a published check table in tests/data.

    Lines starting with ``#`` name the source, table and confidence; they are skipped.
    """
    with open(path, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(line for line in fh if not line.startswith("#")))
    if not rows:
        raise ValueError(f"{path}: no rows")
    return rows
