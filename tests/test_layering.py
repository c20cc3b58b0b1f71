"""The pipeline's layers, checked by walking every import of the package with ``ast``.

read → measure → compare → decide → report, with the CLI and API on top (DEVELOPERS.md,
"Which module may import which"). Imports inside functions count too: a lazy import is still
a dependency, and the only cycle the package ever had (batch ↔ cli) was a lazy one.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "matcheck"

# Layer -> the matcheck layers it must never import.
FORBIDDEN = {
    "model": {"readers", "language", "measures", "compare", "report", "api", "cli", "batch"},
    "errors": {"readers", "language", "measures", "compare", "report", "api", "cli", "batch"},
    "findings": {"readers", "language", "measures", "compare", "report", "api", "cli", "batch"},
    "readers": {"language", "measures", "compare", "report", "api", "cli", "batch", "study"},
    "language": {"readers", "measures", "compare", "report", "api", "cli", "batch", "study"},
    "measures": {"readers", "compare", "report", "api", "cli", "batch", "study"},
    "compare": {"readers", "report", "api", "cli", "batch", "study"},
    "report": {"readers", "language", "compare", "api", "cli", "batch", "study"},
    "study": {"readers", "compare.engine", "report", "api", "cli", "batch"},
    "api": {"report", "cli", "batch"},
    "batch": {"report", "cli"},
    # The Python API: entry points call the orchestrator, the result renders; neither is CLI.
    "library": {"report", "cli"},
    "result": {"readers", "language", "compare", "api", "cli", "batch", "library"},
    "progress": {"readers", "language", "measures", "compare", "report", "api", "cli", "batch"},
    "output_names": {"readers", "language", "measures", "compare", "api", "cli", "batch"},
    # The cache stores what api computes and knows nothing of how (measures: type hints only).
    "cache": {"readers", "language", "compare", "report", "api", "cli", "batch", "study"},
    "shared": {"report", "cli", "batch"},
    "cluster": {"readers", "language", "measures", "compare", "report", "api", "cli", "batch"},
    "power": {
        "readers",
        "language",
        "measures",
        "compare",
        "report",
        "api",
        "cli",
        "batch",
        "study",
    },
}


def _module_name(path: Path) -> str:
    parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def _imports(path: Path) -> set[str]:
    """Every matcheck module ``path`` imports, at any depth of the file."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    found: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            found.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            found.add(node.module)
            found.update(f"{node.module}.{alias.name}" for alias in node.names)
    modules = {_module_name(p) for p in PACKAGE.rglob("*.py")}
    return {name for name in found if name in modules and name.startswith("matcheck")}


GRAPH = {_module_name(path): _imports(path) for path in sorted(PACKAGE.rglob("*.py"))}


def _layer(module: str) -> str:
    return module.split(".")[1] if module.count(".") else ""


@pytest.mark.parametrize("module", sorted(GRAPH))
def test_module_respects_its_layer(module: str) -> None:
    forbidden = FORBIDDEN.get(_layer(module), set())
    wrong = sorted(
        target
        for target in GRAPH[module]
        if any(
            target == f"matcheck.{layer}" or target.startswith(f"matcheck.{layer}.")
            for layer in forbidden
        )
    )
    assert not wrong, f"{module} imports {wrong}"


def test_no_import_cycle_between_modules() -> None:
    # A package's __init__ importing its own modules is not a cycle of layers; count edges
    # between modules that are not each other's package.
    def edges(module: str) -> set[str]:
        return {t for t in GRAPH[module] if t != module and not module.startswith(t + ".")}

    state: dict[str, int] = {}
    stack: list[str] = []

    def visit(module: str) -> None:
        state[module] = 1
        stack.append(module)
        for target in sorted(edges(module)):
            if state.get(target) == 1:
                cycle = [*stack[stack.index(target) :], target]
                pytest.fail("import cycle: " + " → ".join(cycle))
            if target not in state:
                visit(target)
        stack.pop()
        state[module] = 2

    for module in sorted(GRAPH):
        if module not in state:
            visit(module)


def test_the_walk_sees_imports() -> None:
    # The checks above would pass on an empty graph: make sure the walk finds real edges.
    assert "matcheck.compare.decide" in GRAPH["matcheck.compare.engine"]
    assert "matcheck.report.registry" in GRAPH["matcheck.cli"]
