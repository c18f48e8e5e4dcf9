"""Small valid inputs for every command and the mutations applied to them (invented data).

Used by ``tests/edges/test_mutations.py``: each command runs in-process on a mutated copy of one of
these files and must end with exit status 0 (a valid result) or 2 (one clear line), never a
traceback or an internal error.
"""

from __future__ import annotations

import copy
import math
from pathlib import Path

import numpy as np

# ---------------------------------------------------------------------------- TOML writer


def _toml_value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n") + '"'
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f'"{k}" = {_toml_value(x)}' for k, x in v.items()) + " }"
    raise TypeError(type(v))


def to_toml(d: dict) -> str:
    """A dict as TOML text: scalars first, then one [table] per dict of the top level (and
    one level below, for ``[inspection.scatter]``); deeper dicts are inline tables."""
    lines = []

    def emit(table: dict, prefix: str):
        subs = []
        for k, v in table.items():
            if isinstance(v, dict) and prefix.count(".") < 1:
                subs.append((k, v))
            else:
                lines.append(f'"{k}" = {_toml_value(v)}')
        for k, v in subs:
            name = f"{prefix}.{k}" if prefix else k
            lines.append(f"\n[{name}]")
            emit(v, name)

    emit(d, "")
    return "\n".join(lines) + "\n"


# ---------------------------------------------------------------------------- valid inputs
MATERIAL = {
    "elastic_modulus": "205 GPa",
    "poisson_ratio": 0.3,
    "yield_strength": "340 MPa",
    "tensile_strength": "510 MPa",
    "cyclic_curve": {"strength_coefficient": "880 MPa", "hardening_exponent": 0.16},
    "monotonic_curve": {"strength_coefficient": "780 MPa", "hardening_exponent": 0.19},
    "toughness": {"J_c": "220 kJ/m^2", "resistance_curve": {"C1": "380 kJ/m^2", "C2": 0.55}},
    "growth": {
        "law": "paris",
        "C": 2.0e-4,
        "m": 1.5,
        "threshold": "0.02 kJ/m^2",
        "basis": "applied",
    },
}

CASE_CONSTANT = {
    "title": "mutation base: C(T) at constant amplitude",
    "material": MATERIAL,
    "geometry": {
        "shape": "compact-tension",
        "width": "50 mm",
        "thickness": "12.5 mm",
        "crack_length": "15 mm",
        "constraint": "plane-strain",
    },
    "loading": {
        "constant": {"max": "14 kN", "min": "1.4 kN"},
        "duration": "1 s",
        "closure": "none",
    },
    "analysis": {"j_method": "reference-stress", "fad": "option-2"},
    "run": {
        "method": "auto",
        "max_cycles": 1.0e7,
        "criteria": ["toughness", "tearing", "collapse", "size-limit", "fad"],
    },
}

CASE_HISTORY = {
    "title": "mutation base: edge crack under a measured history",
    "material": {
        **MATERIAL,
        "growth": {
            "law": "paris",
            "C": 3.0e-4,
            "m": 1.6,
            "threshold": "0.01 kJ/m^2",
            "basis": "effective",
        },
    },
    "geometry": {
        "shape": "edge-crack-plate",
        "width": "60 mm",
        "thickness": "20 mm",
        "crack_length": "2 mm",
        "constraint": "plane-strain",
    },
    "loading": {
        "history": "history.csv",
        "column": "load",
        "unit": "MPa",
        "quantity": "stress",
        "scale": 1.0,
        "gate": "5 MPa",
        "duration": "10 h",
        "closure": "newman",
    },
    "analysis": {"j_method": "reference-stress", "fad": "option-1"},
    "run": {
        "method": "auto",
        "max_cycles": 1.0e8,
        "crack_length_limit": "40 mm",
        "criteria": ["toughness", "collapse", "size-limit"],
    },
}

CASE_PLAN = {
    "title": "mutation base: deck plate inspection",
    "material": {
        "elastic_modulus": "200 GPa",
        "poisson_ratio": 0.3,
        "yield_strength": "355 MPa",
        "tensile_strength": "510 MPa",
        "toughness": {"J_c": "12 kJ/m^2"},
        "growth": {
            "law": "paris",
            "basis": "applied",
            "from_delta_K": {
                "C": 1.648e-8,
                "m": 3.0,
                "rate_unit": "mm",
                "driving_unit": "MPa*m**0.5",
            },
        },
    },
    "geometry": {
        "shape": "center-crack-infinite-plate",
        "crack_length": "1 mm",
        "constraint": "plane-stress",
    },
    "loading": {"constant": {"max": "100 MPa", "min": "0 MPa"}, "duration": "20 s"},
    "analysis": {"j_method": "elastic"},
    "run": {"criteria": ["toughness", "size-limit"], "crack_length_limit": "100 mm"},
    "inspection": {
        "detectable_size": "3 mm",
        "safety_factor": 2,
        "design_life": 1.0e6,
        "intervals": [1.0e5, 2.0e5],
        "pod": {"model": "lognormal", "a50": "2 mm", "sigma": 0.4},
        "samples": 200,
        "seed": 7,
        "target_pof": 1.0e-2,
        "repair": "renew",
        "max_inspections": 8,
        "chunk_size": 200,
        "max_samples": 400,
        "scatter": {
            "growth_C": {"distribution": "lognormal", "sigma": 0.3},
            "initial_crack": {"distribution": "lognormal", "median": "0.5 mm", "sigma": 0.5},
            "toughness": {"distribution": "lognormal", "cov": 0.1},
        },
    },
}

SPECIMEN = {
    "label": "mutation specimen",
    "shape": "compact-tension",
    "width": "50 mm",
    "thickness": "12.5 mm",
    "net_thickness": "10 mm",
    "crack_length": "15 mm",
    "constraint": "plane-strain",
    "elastic_modulus": "205 GPa",
    "poisson_ratio": 0.3,
    "yield_strength": "450 MPa",
    "tensile_strength": "600 MPa",
    "cyclic_curve": {"strength_coefficient": "480 MPa", "hardening_exponent": 0.12},
    "displacement_at": "front-face",
    "log_units": {"load": "kN", "displacement": "mm", "crack_length": "mm"},
}


def history_values(n: int = 120, seed: int = 3) -> np.ndarray:
    """A short invented stress history [MPa] (start/stop-like, 0–220 MPa)."""
    from cycj.spectrum.generators import gaussian_from_irregularity

    x = gaussian_from_irregularity(n, 0.6, 1.0, seed=seed)[0]
    return 110.0 + 110.0 * x / np.max(np.abs(x))


def crack_log_text(rows: int = 14) -> str:
    """An invented crack-length log (C(T), loads in kN, lengths in mm)."""
    n = np.arange(rows) * 20000.0
    a = 15.0 + 10.0 * (n / n[-1]) ** 1.4
    lines = ["cycle,crack_length,load_max,load_min"]
    lines += [f"{c:.0f},{x:.4f},6.0,0.6" for c, x in zip(n, a, strict=True)]
    return "\n".join(lines) + "\n"


def raw_log_text() -> str:
    """A small invented raw-loop log from the virtual test frame (few loops, few samples)."""
    import tempfile

    from cycj.calibrate.simulate import simulate_test
    from cycj.calibrate.specimen import read_specimen

    with tempfile.TemporaryDirectory() as d:
        p = Path(d) / "s.toml"
        p.write_text(to_toml(SPECIMEN))
        spec = read_specimen(p)
    sim = simulate_test(
        spec,
        6e-5,
        1.5,
        p_max=17000,
        r_ratio=0.1,
        opening_fraction=0.2,
        record_every=1000,
        samples=40,
        crack_end=24,
        seed=5,
    )
    raw = sim.raw.copy()
    raw["load"] = (raw["load"] / 1000).round(5)
    raw["displacement"] = raw["displacement"].round(6)
    return raw.to_csv(index=False)


POD_HIT_MISS = "# link = logit\na_mm,hit\n" + "".join(
    f"{a:.2f},{int(h)}\n"
    for a, h in zip(
        np.linspace(0.5, 8.0, 40),
        (
            np.random.default_rng(1).random(40)
            < 1 / (1 + np.exp(-(np.linspace(0.5, 8, 40) - 3.0) * 1.5))
        ),
        strict=True,
    )
)

POD_SIGNAL = "# decision = 1.0\n# floor = 0.25\n# saturation = 9.0\na_mm,ahat\n" + "".join(
    f"{a:.2f},{min(max(0.4 * a * e, 0.25), 9.0):.3f}\n"
    for a, e in zip(
        np.linspace(0.5, 10.0, 40), np.exp(np.random.default_rng(2).normal(0, 0.3, 40)), strict=True
    )
)


def write_bases(root: Path) -> dict:
    """Write every valid base input into ``root``; returns name → text (or dict for TOML)."""
    root.mkdir(parents=True, exist_ok=True)
    hist = "load\n" + "".join(f"{v:.4f}\n" for v in history_values())
    return {
        "case_constant.toml": copy.deepcopy(CASE_CONSTANT),
        "case_history.toml": copy.deepcopy(CASE_HISTORY),
        "history.csv": hist,
        "plan.toml": copy.deepcopy(CASE_PLAN),
        "specimen.toml": copy.deepcopy(SPECIMEN),
        "log_crack.csv": crack_log_text(),
        "log_raw.csv": raw_log_text(),
        "pod_hit_miss.csv": POD_HIT_MISS,
        "pod_signal.csv": POD_SIGNAL,
    }


# ---------------------------------------------------------------------------- mutations
#: replacement values for a TOML leaf: wrong types, units, non-finite, zero, huge, empty
BAD_VALUES = [
    float("nan"),
    float("inf"),
    float("-inf"),
    0,
    0.0,
    -1,
    -1.0e-9,
    1e300,
    1e-300,
    1e30,
    7,
    0.5,
    0.999,
    1.0,
    2,
    True,
    False,
    "",
    " ",
    "abc",
    "nan",
    "inf mm",
    "nan MPa",
    "-3 mm",
    "0 mm",
    "1e400 mm",
    "12 parsec",
    "5 kN",
    "5 MPa",
    "3 mm",
    "200 GPa",
    "1 kJ/m^2",
    "60 MPa*m**0.5",
    "1 h",
    "1e9 mm",
    "1 in",
    "%%%",
    "ø∆µ",
    "x" * 300,
    [],
    [1, 2],
    ["a"],
    {},
    {"x": 1},
    {"model": "constant", "U": 2.0},
    "none",
    "auto",
    "cycle",
    "block",
    "newman",
    "include",
    "option-1",
    "plastic",
    "wheeler",
    "history.csv",
    "missing.csv",
    "../history.csv",
    "/dev/null",
    "load",
    "0",
    10**25,
]


def leaf_paths(d: dict, prefix=()):
    """Every (path tuple) to a leaf or sub-table of a nested dict (list items included)."""
    out = []
    for k, v in d.items():
        p = (*prefix, k)
        out.append(p)
        if isinstance(v, dict):
            out += leaf_paths(v, p)
        elif isinstance(v, list):
            out += [(*p, i) for i in range(len(v))]
    return out


def mutate_dict(d: dict, path: tuple, action: str, value=None) -> dict:
    """A copy of ``d`` with the item at ``path`` deleted, replaced, or a sibling key added."""
    d = copy.deepcopy(d)
    parent = d
    for k in path[:-1]:
        parent = parent[k]
    last = path[-1]
    if action == "delete":
        if isinstance(parent, list):
            parent.pop(last)
        else:
            parent.pop(last)
    elif action == "replace":
        parent[last] = value
    elif action == "unknown" and isinstance(parent, dict):
        parent[f"{last}_extra"] = value
    elif action == "scale":
        parent[last] = scale_value(parent[last], value)
    return d


#: factors for valid-but-extreme values (a quantity scaled, unit kept)
SCALES = [1e-9, 1e-4, 1e-2, 0.1, 0.5, 0.9, 0.99, 1.01, 1.1, 1.5, 2.0, 3.0, 10.0, 100.0, 1e4, 1e9]


def scale_value(v, factor):
    """``v`` times ``factor``: numbers, the number of a quantity string, or list items."""
    if isinstance(v, bool):
        return v
    if isinstance(v, (int, float)):
        return v * factor
    if isinstance(v, str):
        head, _, unit = v.partition(" ")
        try:
            return f"{float(head) * factor:.12g} {unit}".strip()
        except ValueError:
            return v
    if isinstance(v, list):
        return [scale_value(x, factor) for x in v]
    if isinstance(v, dict):
        return {k: scale_value(x, factor) for k, x in v.items()}
    return v


BAD_CELLS = [
    "nan",
    "inf",
    "-inf",
    "",
    "abc",
    "1e308",
    "-1e308",
    "0",
    "-5",
    "1e-300",
    "3,4",
    '"',
    "0x10",
    "١٢",
    "NaN",
    "None",
    "1e999",
    "  ",
    "-0",
]


def mutate_csv(text: str, kind: str, i: int, j: int, cell: str) -> str:
    """A CSV mutated by ``kind`` at row ``i`` / column ``j``."""
    lines = text.splitlines()
    head = [k for k, ln in enumerate(lines) if ln and not ln.startswith("#")]
    h = head[0] if head else 0
    body = lines[h + 1 :]
    if kind == "cell" and body:
        r = h + 1 + i % len(body)
        cells = lines[r].split(",")
        cells[j % len(cells)] = cell
        lines[r] = ",".join(cells)
    elif kind == "drop_column":
        for r in range(h, len(lines)):
            cells = lines[r].split(",")
            if len(cells) > 1:
                cells.pop(j % len(cells))
            lines[r] = ",".join(cells)
    elif kind == "rename_header":
        cells = lines[h].split(",")
        cells[j % len(cells)] = cell or "renamed"
        lines[h] = ",".join(cells)
    elif kind == "truncate":
        return text[: i % (len(text) + 1)]
    elif kind == "header_only":
        lines = lines[: h + 1]
    elif kind == "one_row":
        lines = lines[: h + 2]
    elif kind == "drop_header":
        lines = lines[:h] + lines[h + 1 :]
    elif kind == "constant" and body:
        lines = lines[: h + 1] + [lines[h + 1]] * len(body)
    elif kind == "reverse" and body:
        lines = lines[: h + 1] + body[::-1]
    elif kind == "scale_column":
        factor = (
            float(cell)
            if cell.replace(".", "", 1).replace("e", "", 1).replace("-", "").isdigit()
            else 1e12
        )
        for r in range(h + 1, len(lines)):
            cells = lines[r].split(",")
            try:
                cells[j % len(cells)] = repr(float(cells[j % len(cells)]) * factor)
            except ValueError:
                pass
            lines[r] = ",".join(cells)
    elif kind == "extra_column":
        lines = [ln + ("," + cell if ln else "") for ln in lines]
    elif kind == "semicolons":
        lines = [ln.replace(",", ";") for ln in lines]
    elif kind == "duplicate_rows" and body:
        lines = lines[: h + 1] + [b for b in body for _ in (0, 1)]
    return "\n".join(lines) + ("\n" if lines else "")


CSV_KINDS = [
    "cell",
    "cell",
    "cell",
    "drop_column",
    "rename_header",
    "truncate",
    "header_only",
    "one_row",
    "drop_header",
    "constant",
    "reverse",
    "scale_column",
    "extra_column",
    "semicolons",
    "duplicate_rows",
]


def mutate_text(text: str, kind: str, i: int, blob: bytes) -> bytes:
    """Text-level damage: truncation, inserted bytes, binary garbage, empty, BOM, CRLF."""
    b = text.encode("utf-8")
    k = i % (len(b) + 1)
    if kind == "truncate":
        return b[:k]
    if kind == "insert":
        return b[:k] + blob + b[k:]
    if kind == "garbage":
        return blob
    if kind == "empty":
        return b""
    if kind == "bom":
        return b"\xef\xbb\xbf" + b
    if kind == "crlf":
        return b.replace(b"\n", b"\r\n")
    if kind == "latin1":
        return text.encode("utf-8")[:k] + "é°".encode("latin-1") + b[k:]
    return b


TEXT_KINDS = ["truncate", "insert", "garbage", "empty", "bom", "crlf", "latin1"]
