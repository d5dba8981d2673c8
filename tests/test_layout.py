"""The package layout that DEVELOPERS.md describes: a short top level, no core module importing
the command line, no import cycles (function-local imports included) and short functions on the
solve path.  The rules are the project's own (common practice for a readable package)."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parents[1] / "twoel"
#: the longest function (lines) allowed in hand-written code
MAX_FUNCTION_LINES = 80


def _modules() -> dict[str, Path]:
    out = {}
    for path in PACKAGE.rglob("*.py"):
        parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
        name = ".".join(parts[:-1] if parts[-1] == "__init__" else parts)
        out[name] = path
    return out


def _imports(name: str, path: Path, known) -> set[str]:
    """Every twoel module that ``name`` imports, at module level or inside functions."""
    package = name if path.name == "__init__.py" else name.rsplit(".", 1)[0]
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            targets = [alias.name for alias in node.names]
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                parts = package.split(".")[: len(package.split(".")) - node.level + 1]
                base = ".".join(parts + ([base] if base else []))
            targets = [base] + [f"{base}.{alias.name}" for alias in node.names]
        else:
            continue
        found.update(t for t in targets if t in known and t != name)
    return found


@pytest.fixture(scope="module")
def graph():
    modules = _modules()
    return {name: _imports(name, path, modules) for name, path in modules.items()}


def test_top_level_holds_at_most_ten_modules():
    assert len(list(PACKAGE.glob("*.py"))) <= 10


def test_no_module_outside_the_command_line_imports_it(graph):
    offenders = sorted(m for m, targets in graph.items()
                       if not m.startswith("twoel.cli") and m != "twoel.__main__"
                       and any(t == "twoel.cli" or t.startswith("twoel.cli.") for t in targets))
    assert offenders == []


def test_there_are_no_import_cycles(graph):
    state: dict[str, int] = {}
    cycles = []

    def visit(node, path):
        state[node] = 1
        for target in sorted(graph[node]):
            if state.get(target) == 1:
                cycles.append(path[path.index(target):] + [target])
            elif target not in state:
                visit(target, path + [target])
        state[node] = 2

    for module in sorted(graph):
        if module not in state:
            visit(module, [module])
    assert cycles == []


def test_hand_written_functions_are_short():
    long = []
    for path in PACKAGE.rglob("*.py"):
        if "generated" in path.parts:
            continue
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
                length = node.end_lineno - node.lineno + 1
                if length > MAX_FUNCTION_LINES:
                    long.append(f"{path.relative_to(PACKAGE)}:{node.lineno} {node.name} ({length} lines)")
    assert long == []
