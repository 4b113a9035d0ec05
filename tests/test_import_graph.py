"""The package's import graph, built from the source with `ast`: no cycle, and no import of the
project's own modules inside a function body (the usual way to dodge a cycle).
"""

from __future__ import annotations

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1] / "auditor"


def module_name(path: Path) -> str:
    parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def resolve(node: ast.ImportFrom, current: str, is_package: bool) -> str:
    if not node.level:
        return node.module or ""
    base = current.split(".")
    if not is_package:
        base = base[:-1]
    base = base[: len(base) - (node.level - 1)]
    return ".".join(base + ([node.module] if node.module else []))


def graph() -> tuple[dict[str, set[str]], list[str]]:
    modules = {module_name(p): p for p in PACKAGE.rglob("*.py")}
    edges: dict[str, set[str]] = {m: set() for m in modules}
    local_imports: list[str] = []
    for name, path in modules.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), str(path))
        in_function: set[int] = set()
        for node in ast.walk(tree):
            if isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef):
                in_function.update(id(n) for n in ast.walk(node) if n is not node)
        for node in ast.walk(tree):
            targets: list[str] = []
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom):
                base = resolve(node, name, path.name == "__init__.py")
                targets = [base] + [f"{base}.{alias.name}" for alias in node.names]
            # A module's own parent packages are always imported before it: not an edge.
            ancestors = {name.rsplit(".", k)[0] for k in range(1, name.count(".") + 1)}
            own = [t for t in targets if t in modules and t != name and t not in ancestors]
            if not own:
                continue
            if id(node) in in_function:
                local_imports.append(f"{path.relative_to(PACKAGE.parent)}:{node.lineno}")
            # `from auditor.x import y`: an edge to auditor.x, and to auditor.x.y when y is a module.
            edges[name].update(own)
            # importing auditor.a.b runs auditor/a/__init__.py first
            for target in own:
                parent = target.rpartition(".")[0]
                while parent and parent != name and parent not in ancestors:
                    if parent in modules:
                        edges[name].add(parent)
                    parent = parent.rpartition(".")[0]
    return edges, local_imports


def find_cycle(edges: dict[str, set[str]]) -> list[str] | None:
    state: dict[str, int] = {}
    stack: list[str] = []

    def visit(node: str) -> list[str] | None:
        state[node] = 1
        stack.append(node)
        for nxt in sorted(edges[node]):
            if state.get(nxt) == 1:
                return stack[stack.index(nxt) :] + [nxt]
            if nxt not in state and (found := visit(nxt)):
                return found
        stack.pop()
        state[node] = 2
        return None

    for node in sorted(edges):
        if node not in state and (found := visit(node)):
            return found
    return None


def test_the_package_has_no_import_cycle():
    edges, _ = graph()
    assert find_cycle(edges) is None


def test_no_project_import_inside_a_function():
    _, local = graph()
    assert local == []


def test_the_checks_can_fail():
    # A made-up graph with a cycle, so the cycle finder is shown to find one.
    assert find_cycle({"a": {"b"}, "b": {"c"}, "c": {"a"}}) == ["a", "b", "c", "a"]
    assert find_cycle({"a": {"b"}, "b": set()}) is None
