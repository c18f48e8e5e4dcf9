"""Rules of the house, checked on the source tree: no import cycle, no import from a physics
stage up to a job wing or the edges, modules of at most 500 lines, kernels free of edges, and no
citation of a document outside the repository."""

import ast
import re
from pathlib import Path

ROOT = Path(__file__).parents[2]
PKG = ROOT / "cycj"
#: the job wings and the edges; physics stages must not import them
UPPER = (
    "cycj.life",
    "cycj.calibrate",
    "cycj.plan",
    "cycj.cli",
    "cycj.commands",
    "cycj.report",
    "cycj.display",
    "cycj.outputs",
    "cycj.demo",
)
PHYSICS = (
    "cycj.material",
    "cycj.geometry",
    "cycj.jintegral",
    "cycj.growth",
    "cycj.retardation",
    "cycj.end_criteria",
    "cycj.fields",
    "cycj.kernel_slots",
    "cycj.models",
    "cycj.methods",
    "cycj.citations",
    "cycj.units",
)
EDGE_PACKAGES = ("pandas", "matplotlib", "click", "pint")


def _module_name(path: Path) -> str:
    rel = path.relative_to(ROOT).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def _imports(path: Path, top_level_only: bool):
    """cycj modules imported by ``path`` (at module level only, or anywhere)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    nodes = tree.body if top_level_only else list(ast.walk(tree))
    out = set()
    for node in nodes:
        if isinstance(node, ast.ImportFrom) and node.module and node.module.startswith("cycj"):
            for a in node.names:
                sub = f"{node.module}.{a.name}"
                out.add(
                    sub
                    if (PKG.parent / (sub.replace(".", "/") + ".py")).exists()
                    or (PKG.parent / sub.replace(".", "/")).is_dir()
                    else node.module
                )
        elif isinstance(node, ast.Import):
            out.update(a.name for a in node.names if a.name.startswith("cycj"))
    return out


def _graph(top_level_only=True):
    return {_module_name(p): _imports(p, top_level_only) for p in PKG.rglob("*.py")}


def test_no_import_cycle_at_module_level():
    graph = _graph()
    state = {}

    def visit(node, stack):
        state[node] = 1
        for dep in graph.get(node, ()):
            if dep not in graph or dep == node:
                continue
            if state.get(dep) == 1:
                raise AssertionError("import cycle: " + " → ".join([*stack, node, dep]))
            if dep not in state:
                visit(dep, [*stack, node])
        state[node] = 2

    for mod in graph:
        if mod not in state:
            visit(mod, [])


def test_physics_stages_do_not_import_jobs_or_edges():
    """Anywhere in the file, deferred imports included."""
    bad = []
    for mod, deps in _graph(top_level_only=False).items():
        if mod.startswith(PHYSICS):
            bad += [f"{mod} → {d}" for d in deps if d.startswith(UPPER)]
    assert not bad, bad


def test_compiled_kernels_import_no_edges():
    """Modules holding compiled kernels import no pandas, matplotlib, click or pint at module
    level (they are imported inside the edge functions that need them)."""
    bad = []
    for path in PKG.rglob("*.py"):
        text = path.read_text(encoding="utf-8")
        if "@jit" not in text:
            continue
        for node in ast.parse(text).body:
            if isinstance(node, (ast.Import, ast.ImportFrom)):
                names = (
                    [node.module or ""]
                    if isinstance(node, ast.ImportFrom)
                    else [a.name for a in node.names]
                )
                bad += [f"{path.name}: {n}" for n in names if n.split(".")[0] in EDGE_PACKAGES]
    assert not bad, bad


def test_modules_are_short():
    long = {
        str(p.relative_to(ROOT)): n
        for p in PKG.rglob("*.py")
        if (n := len(p.read_text(encoding="utf-8").splitlines())) > 500
    }
    assert not long, long


def test_wings_have_named_orchestrators_and_writers():
    for wing, orchestrator in (
        ("life", "predict"),
        ("calibrate", "fit"),
        ("plan", "inspections"),
        ("spectrum", "reversals"),
    ):
        assert (PKG / wing / f"{orchestrator}.py").exists()
        if wing != "spectrum":
            init = (PKG / wing / "__init__.py").read_text(encoding="utf-8")
            assert "def " not in init.replace("def __getattr__", ""), f"{wing}/__init__ holds code"
    for wing in ("life", "calibrate", "plan", "spectrum"):
        assert (PKG / wing / "write.py").exists(), wing


def test_no_citation_of_documents_outside_the_repository():
    pattern = re.compile(
        r"REFERENCE (item|§|\d)|REFERENCE\.md|DESIGN\.md|STYLE\.md|\bDESIGN\b|\.\./shared|"
        r"shared/(DESIGN|REFERENCE|STYLE)"
    )
    bad = []
    for folder in ("cycj", "tests", "bench", "examples", "docs"):
        for path in (ROOT / folder).rglob("*"):
            if path.suffix in (".py", ".md", ".toml", ".txt") and path != Path(__file__):
                for i, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
                    if pattern.search(line):
                        bad.append(f"{path.relative_to(ROOT)}:{i}")
    assert not bad, bad[:20]
