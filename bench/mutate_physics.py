"""Mutation testing of the physics stage modules against the physics tests (not a test).

Small source mutations — operator swaps (+ −, * /, ** → *, < ≤, > ≥, == ≠), numeric constants
changed by ±5 %, dropped terms (a ± b → a, a + b → b, −x → x) — are generated from the syntax
tree of each target module, plus the named mutants every test suite must kill.  Each mutant is
written into a private copy of the repository (the working tree is never touched) and the
physics tests are run on it in plain Python (``CYCJ_DISABLE_JIT=1``, no compile), the target's
mirror test file first and stopping at the first failure.  A mutant is *killed* when the tests
fail (or time out) and *survives* when they pass.

Validation guards (a condition whose branch only raises, the text of errors, f-strings, string
constants and integer subscripts) are not mutated: they decide the message of a refusal, not a
value.  Survivors that are equivalent to the original (no input can tell them apart) are listed
in :data:`EQUIVALENT` with the reason, and left out of the score.

Run: python bench/mutate_physics.py [--max N] [--seed S] [--only jintegral] [--json out.json]
"""

from __future__ import annotations

import argparse
import ast
import json
import os
import random
import re
import shutil
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

TARGETS = [
    "cycj/jintegral.py",
    "cycj/growth.py",
    "cycj/end_criteria.py",
    *sorted(
        str(p.relative_to(ROOT))
        for p in (ROOT / "cycj" / "geometry").glob("*.py")
        if p.name not in ("__init__.py", "_params.py", "dispatch.py")
    ),
    "cycj/geometry/__init__.py",
    "cycj/geometry/dispatch.py",
    "cycj/fields/notch.py",
]

#: the test file that mirrors each target (run first, so most mutants die quickly)
MIRROR = {
    "cycj/jintegral.py": "tests/physics/test_jintegral.py",
    "cycj/growth.py": "tests/physics/test_growth.py",
    "cycj/end_criteria.py": "tests/physics/test_end_criteria.py",
    "cycj/fields/notch.py": "tests/physics/test_fields_notch.py",
}

_GUARD = "\n    if curve is None:\n        raise ValidityRangeError("

#: mutants that must be killed, by name: (file, original text, mutated text)
NAMED = {
    "reference-stress plastic part halved": (
        "cycj/jintegral.py",
        "plastic_part = dj_el * e_mod * dep / dsig_ref",
        "plastic_part = 0.5 * dj_el * e_mod * dep / dsig_ref",
    ),
    "L_r,cyc = Δσ_ref/σ'_y (not /2σ'_y)": (
        "cycj/jintegral.py",
        "lr_cyc = dsig_ref / (2.0 * sy_cyc)",
        "lr_cyc = dsig_ref / sy_cyc",
    ),
    "J_max from the cyclic curve": (
        "cycj/jintegral.py",
        "    curve = material.peak_curve" + _GUARD + '"J_max',
        "    curve = material.cyclic_curve" + _GUARD + '"J_max',
    ),
    "Option 2 FAD from the cyclic curve": (
        "cycj/jintegral.py",
        "    curve = material.peak_curve" + _GUARD + '"Option 2',
        "    curve = material.cyclic_curve" + _GUARD + '"Option 2',
    ),
}

#: survivors shown to be equivalent: (file, original text, mutated text) → reason
EQUIVALENT: dict[tuple[str, str, str], str] = {
    ("cycj/fields/notch.py", "far < root", "far <= root"): (
        "ties: at far = root both branches give the same ΔJ"
    ),
    ("cycj/geometry/surface_crack_plate.py", "w >= 2.0 * (c + t)", "w > 2.0 * (c + t)"): (
        "at W = 2(c + t) both forms of α″ are (a/t)/(1 + t/c)"
    ),
    ("cycj/growth.py", "1.0", "0.95"): (
        "only when on the line 'return min(max(x, 0.0), 1.0), clipped': Newman's U stays in "
        "[0.23, 1] over its range (checked on a grid of R, S_max/σ0, α), so x ≤ 0.77"
    ),
    ("cycj/growth.py", "dj > 0.0", "dj >= 0.0"): ("at ΔJ = 0, ΔJ^m = 0 either way"),
    ("cycj/jintegral.py", "x <= 0.0", "x < 0.0"): (
        "at x = 0 the formula 1 − (1+n')x + n'x^(1+1/n') is 1, the value returned"
    ),
    ("cycj/jintegral.py", "0.0", "1e-3"): (
        "only when on the line 'if dsig_ref <= 0.0:': below Δσ_ref = 1e-3 MPa the bracket "
        "½L_r,cyc² and the plastic term are below 1e-12 of ΔJ_el"
    ),
    ("cycj/jintegral.py", "d > 0", "d >= 0"): (
        "at D = 0 the shape's K and limit load at a + D are those at a"
    ),
    ("cycj/growth.py", "dj <= 0.0", "dj < 0.0"): (
        "ΔJ = 0 is already caught by ΔJ ≤ ΔJ_th (the threshold is ≥ 0)"
    ),
    ("cycj/fields/notch.py", "dk <= 0.0", "dk < 0.0"): (
        "at ΔK = 0 every estimate is 0 (and the stepper returns before)"
    ),
}

_FLAG = re.compile(r"(mp\[[A-Z_]+\]|p\[\d\]|n_cracks|own) [<>]=? (0\.5|1\.5)\b")


#: (file, start of the source line, reason): lines where no small mutation can change a result
CONTEXT_EQUIVALENT = [
    (
        "cycj/jintegral.py",
        "1.0 if own else 0.0,",
        "a flag read as > 0.5 by the notch kernel",
    ),
    (
        "cycj/geometry/surface_crack_plate.py",
        "g = 1.0 + (0.1",
        "only φ = 90° and φ = 0 are evaluated, where (1 − sin φ)^2 is 0 or 1 for any exponent",
    ),
    (
        "cycj/geometry/surface_crack_plate.py",
        "p = 0.2 + ac + 0.6 * at",
        "exponent of sin φ in H: sin^p φ is 1 at φ = 90° and 0 at φ = 0 for any p > 0",
    ),
    (
        "cycj/fields/notch.py",
        "return 0.0, 1.0",
        "no load range: ΔJ = 0 and the K factor is not used (the stepper returns before)",
    ),
    (
        "cycj/geometry/__init__.py",
        'p[P.PLANE_STRAIN] = 1.0 if constraint == "plane-strain" else 0.0',
        "a flag read as > 0.5: any stored value below one half is plane stress",
    ),
    (
        "cycj/geometry/__init__.py",
        "inner_radius: float = 0.0,",
        "default of a dimension the shape does not use (a required one is checked > 0)",
    ),
    (
        "cycj/geometry/__init__.py",
        "hole_radius: float = 0.0,",
        "default of a dimension the shape does not use (a required one is checked > 0)",
    ),
    (
        "cycj/geometry/__init__.py",
        "return out if out.size > 1",
        "array sizes are whole numbers; a one-element array and its float hold the same value",
    ),
    (
        "cycj/fields/notch.py",
        "df = ",
        "Newton derivative of Neuber's root finder: sets only the speed of convergence; the "
        "bracket guard keeps every iterate inside [lo, hi] and the same root is found",
    ),
    (
        "cycj/fields/notch.py",
        "x_new = 0.5 * (lo + hi)",
        "bisection fall-back: any point inside the bracket keeps the same root",
    ),
    (
        "cycj/fields/notch.py",
        "if f > 0.0:",
        "bracket update at f = 0 (the root itself): either side is the root",
    ),
    (
        "cycj/fields/notch.py",
        "if abs(x_new - x) <= 1e-15 * x:",
        "stopping tolerance at 1e-15: changes the result below the last digit tested",
    ),
]


def survivor_equivalent_reason(m: Mutant) -> str:
    """Why a *surviving* mutant cannot change any result, or '' (:data:`CONTEXT_EQUIVALENT`,
    :data:`EQUIVALENT`).  Applied only after the tests passed on it."""
    for path, start, reason in CONTEXT_EQUIVALENT:
        if m.file == path and m.context.startswith(start):
            return reason
    reason = EQUIVALENT.get(m.key, "")
    if reason.startswith("only when on the line"):
        line = reason.split("'")[1]
        return reason if m.context == line else ""
    return reason


def equivalent_reason(m: Mutant) -> str:
    """Why a mutant is equivalent before running it, or ''.

    Flags and counts are stored as whole numbers in float arrays (0.0/1.0 switches, one or two
    cracks) and tested against a half-way threshold: moving the threshold by 5 % or making the
    comparison inclusive selects the same branch for every stored value."""
    line = m.context
    if _FLAG.search(line):
        if m.kind.startswith("constant") and m.before in ("0.5", "1.5"):
            return "flag threshold between stored whole numbers"
        if m.kind == "comparison" and _FLAG.search(m.before):
            return "flag comparison: inclusive or strict is the same for whole numbers"
    return ""


@dataclass
class Mutant:
    file: str
    line: int
    kind: str
    before: str
    after: str
    start: int  # character offsets in the file's source
    end: int
    name: str = ""
    context: str = ""  # the source line

    @property
    def key(self):
        return (self.file, self.before, self.after)

    def describe(self) -> str:
        head = f"{self.name}: " if self.name else ""
        return f"{head}{self.file}:{self.line} [{self.kind}] {self.before!r} → {self.after!r}"


# ------------------------------------------------------------------------- generation
_SWAP = {
    ast.Add: ast.Sub,
    ast.Sub: ast.Add,
    ast.Mult: ast.Div,
    ast.Div: ast.Mult,
    ast.Pow: ast.Mult,
}
_CMP = {
    ast.Lt: ast.LtE,
    ast.LtE: ast.Lt,
    ast.Gt: ast.GtE,
    ast.GtE: ast.Gt,
    ast.Eq: ast.NotEq,
    ast.NotEq: ast.Eq,
}


def _skipped_nodes(tree) -> set[int]:
    """ids of nodes not to mutate: docstrings, raise statements, validation guards (an ``if``
    whose body only raises), f-strings, subscripts' indices, decorators, register(...) calls
    and module-level code outside functions."""
    skip: set[int] = set()

    def mark(node):
        for sub in ast.walk(node):
            skip.add(id(sub))

    for node in ast.walk(tree):
        if isinstance(node, ast.Raise | ast.JoinedStr | ast.Assert):
            mark(node)
        elif isinstance(node, ast.If) and all(isinstance(s, ast.Raise) for s in node.body):
            mark(node.test)
        elif isinstance(node, ast.Subscript):
            mark(node.slice)
        elif isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef):
            for d in node.decorator_list:
                mark(d)
            body = node.body
            if body and isinstance(body[0], ast.Expr) and isinstance(body[0].value, ast.Constant):
                mark(body[0])
        elif isinstance(node, ast.Call):
            fn = node.func
            if isinstance(fn, ast.Name) and fn.id in ("register", "range", "_register"):
                mark(node)
    # only code inside functions is mutated
    inside: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef):
            for sub in ast.walk(node):
                inside.add(id(sub))
    for node in ast.walk(tree):
        if id(node) not in inside:
            skip.add(id(node))
    return skip


def _offsets(src: str):
    starts = [0]
    for line in src.splitlines(keepends=True):
        starts.append(starts[-1] + len(line))
    return starts


def generate(path: str) -> list[Mutant]:
    src = (ROOT / path).read_text()
    tree = ast.parse(src)
    skip = _skipped_nodes(tree)
    starts = _offsets(src)
    out: list[Mutant] = []

    def span(node):
        a = starts[node.lineno - 1] + node.col_offset
        b = starts[node.end_lineno - 1] + node.end_col_offset
        return a, b

    def add(node, kind, new_text):
        a, b = span(node)
        before = src[a:b]
        if new_text != before:
            line = src.splitlines()[node.lineno - 1].strip()
            out.append(Mutant(path, node.lineno, kind, before, new_text, a, b, "", line))

    for node in ast.walk(tree):
        if id(node) in skip:
            continue
        if isinstance(node, ast.BinOp) and type(node.op) in _SWAP:
            swapped = ast.BinOp(node.left, _SWAP[type(node.op)](), node.right)
            add(node, "operator", "(" + ast.unparse(swapped) + ")")
            if isinstance(node.op, ast.Add | ast.Sub):
                add(node, "drop term", "(" + ast.unparse(node.left) + ")")
            if isinstance(node.op, ast.Add):
                add(node, "drop term", "(" + ast.unparse(node.right) + ")")
        elif isinstance(node, ast.Compare) and len(node.ops) == 1 and type(node.ops[0]) in _CMP:
            cmp = ast.Compare(node.left, [_CMP[type(node.ops[0])]()], node.comparators)
            add(node, "comparison", ast.unparse(cmp))
        elif isinstance(node, ast.UnaryOp) and isinstance(node.op, ast.USub):
            add(node, "drop sign", "(" + ast.unparse(node.operand) + ")")
        elif (
            isinstance(node, ast.Constant)
            and isinstance(node.value, int | float)
            and not isinstance(node.value, bool)
        ):
            v = float(node.value)
            if v == 0.0:
                add(node, "constant", "1e-3")
            else:
                add(node, "constant +5%", repr(v * 1.05))
                add(node, "constant −5%", repr(v * 0.95))
    return out


def named_mutants() -> list[Mutant]:
    out = []
    for name, (path, old, new) in NAMED.items():
        src = (ROOT / path).read_text()
        a = src.find(old)
        if a < 0 or src.find(old, a + 1) >= 0:
            raise SystemExit(f"named mutant {name!r}: text not found once in {path}")
        line = src.count("\n", 0, a) + 1
        out.append(Mutant(path, line, "named", old, new, a, a + len(old), name))
    return out


# ------------------------------------------------------------------------------ running
def _copy_repo(dest: Path) -> None:
    for part in ("cycj", "tests", "examples", "loadspectra", "docs"):
        if not (ROOT / part).exists():
            continue
        shutil.copytree(ROOT / part, dest / part, ignore=shutil.ignore_patterns("__pycache__"))
    for f in ("pyproject.toml", "README.md", "DEVELOPERS.md"):
        if (ROOT / f).exists():
            shutil.copy2(ROOT / f, dest / f)


def _tests(path: str) -> list[str]:
    """The physics test files, the target's mirror first."""
    first = MIRROR.get(path, "tests/physics/test_geometry.py")
    rest = sorted(str(p.relative_to(ROOT)) for p in (ROOT / "tests" / "physics").glob("test_*.py"))
    return [first, *[t for t in rest if t != first]]


def _pytest(work: Path, tests: list[str], timeout: float):
    env = dict(os.environ, CYCJ_DISABLE_JIT="1", PYTHONPATH=str(work))
    env.setdefault("CYCJ_CACHE_DIR", str(work / ".cache"))
    cmd = [
        sys.executable,
        "-m",
        "pytest",
        "-x",
        "-q",
        "-p",
        "no:cacheprovider",
        "-p",
        "no:randomly",
    ]
    return subprocess.run(
        [*cmd, *tests], cwd=work, env=env, capture_output=True, text=True, timeout=timeout
    )


def run_one(m: Mutant, work: Path, timeout: float) -> tuple[str, float, str]:
    """Apply ``m`` in the copy ``work``, run the physics tests; (outcome, seconds, first failing
    test).  The copy's file is restored afterwards."""
    target = work / m.file
    original = (ROOT / m.file).read_text()
    mutated = original[: m.start] + m.after + original[m.end :]
    try:
        ast.parse(mutated)
    except SyntaxError:
        return "invalid", 0.0, ""
    target.write_text(mutated)
    t0 = time.perf_counter()
    try:
        proc = _pytest(work, _tests(m.file), timeout)
        outcome = "survived" if proc.returncode == 0 else "killed"
        failed = ""
        for line in proc.stdout.splitlines():
            if line.startswith("FAILED") or line.startswith("ERROR"):
                failed = line.split(" ")[1].replace("tests/physics/", "")
                break
    except subprocess.TimeoutExpired:
        outcome, failed = "killed", "(timeout)"
    finally:
        target.write_text(original)
    return outcome, time.perf_counter() - t0, failed


def _match_key(row: dict) -> tuple:
    """Identity of a mutant across edits of other lines (no line numbers or offsets)."""
    return (row["file"], row["kind"], row["before"], row["after"], row.get("context", ""))


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--max", type=int, default=250, help="generated mutants sampled (all: 0)")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--only", default="", help="substring of the target files to mutate")
    ap.add_argument("--timeout", type=float, default=180.0)
    ap.add_argument("--json", default="", help="write the outcomes to this file")
    ap.add_argument("--list", action="store_true", help="list the mutants and stop")
    ap.add_argument("--rerun", default="", help="repeat the survivors of this JSON report")
    args = ap.parse_args(argv)

    targets = [t for t in TARGETS if args.only in t]
    generated = [m for t in targets for m in generate(t)]
    if args.rerun:
        old = json.loads(Path(args.rerun).read_text())["rows"]
        want = {_match_key(r) for r in old if r["outcome"] == "survived" and r["kind"] != "named"}
        generated = [m for m in generated if _match_key(m.__dict__) in want]
    elif args.max and len(generated) > args.max:
        generated = random.Random(args.seed).sample(generated, args.max)
        generated.sort(key=lambda m: (m.file, m.start))
    mutants = [m for m in named_mutants() if args.only in m.file] + generated
    print(f"{len(mutants)} mutants ({len(mutants) - len(generated)} named) in {len(targets)} files")
    if args.list:
        for m in mutants:
            print("  " + m.describe())
        return 0

    rows = []
    with tempfile.TemporaryDirectory(prefix="cycj_mutate_") as tmp:
        work = Path(tmp)
        _copy_repo(work)
        base = _pytest(work, _tests("cycj/jintegral.py"), args.timeout)
        if base.returncode != 0:
            print(base.stdout[-3000:])
            raise SystemExit("the physics tests fail on the unmutated copy; fix them first")
        for i, m in enumerate(mutants, 1):
            reason = equivalent_reason(m)
            if reason:
                outcome, secs, failed = "equivalent", 0.0, reason
            else:
                outcome, secs, failed = run_one(m, work, args.timeout)
                if outcome == "survived" and survivor_equivalent_reason(m):
                    outcome, failed = "equivalent", survivor_equivalent_reason(m)
            rows.append({**m.__dict__, "outcome": outcome, "seconds": secs, "killed_by": failed})
            print(f"[{i}/{len(mutants)}] {outcome:10s} {secs:5.1f}s  {m.describe()}", flush=True)

    if args.rerun:  # merge: the earlier run's decided mutants, the survivors as run now
        kept = [r for r in old if r["outcome"] != "survived" and r["kind"] != "named"]
        print(f"merged with {len(kept)} decided mutants of {args.rerun}")
        rows = [*rows, *kept]
    counted = [r for r in rows if r["outcome"] in ("killed", "survived")]
    killed = sum(r["outcome"] == "killed" for r in counted)
    score = killed / len(counted) if counted else float("nan")
    print()
    print(f"mutation score: {killed}/{len(counted)} = {100 * score:.1f} % killed")
    print(f"  equivalent (not counted): {sum(r['outcome'] == 'equivalent' for r in rows)}")
    print(f"  invalid (not counted): {sum(r['outcome'] == 'invalid' for r in rows)}")
    for r in rows:
        if r["outcome"] == "equivalent":
            print(
                f"  equivalent: {r['file']}:{r['line']} {r['before']!r} → {r['after']!r}: "
                f"{r['killed_by']}"
            )
    for r in rows:
        if r["kind"] == "named":
            print(f"  named: {r['name']}: {r['outcome']} ({r['killed_by']})")
    survivors = [r for r in rows if r["outcome"] == "survived"]
    if survivors:
        print("survivors:")
        for r in survivors:
            m = Mutant(**{k: r.get(k, "") for k in Mutant.__dataclass_fields__})
            print("  " + m.describe())
    if args.json:
        Path(args.json).write_text(json.dumps({"score": score, "rows": rows}, indent=1))
    return 0 if all(r["outcome"] == "killed" for r in rows if r["kind"] == "named") else 1


if __name__ == "__main__":
    raise SystemExit(main())
