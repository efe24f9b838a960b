"""The import graph of the package, read from the source with ``ast`` (nothing is imported).

An edge A → B means module A imports module B when it runs: at the top of the file or inside a
function. Imports under ``if TYPE_CHECKING:`` run only for a type checker and are left out.
"""

from __future__ import annotations

import ast
from collections.abc import Iterator
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
PACKAGES = {"core": "branchwise.core", "tui": "branchwise.tui", "presets": "branchwise.presets"}


def modules() -> dict[str, Path]:
    """Every module of core/ and tui/ by its dotted name."""
    out = {}
    for folder, package in PACKAGES.items():
        for path in sorted((ROOT / folder).rglob("*.py")):
            parts = list(path.relative_to(ROOT / folder).with_suffix("").parts)
            if parts[-1] == "__init__":
                parts = parts[:-1]
            out[".".join([package, *parts])] = path
    return out


def _type_checking(node: ast.If) -> bool:
    test = node.test
    return (isinstance(test, ast.Name) and test.id == "TYPE_CHECKING") or (
        isinstance(test, ast.Attribute) and test.attr == "TYPE_CHECKING")


def _imports(tree: ast.AST, type_checking: bool = False) -> Iterator[ast.Import | ast.ImportFrom]:
    """The import statements of ``tree``, those under ``if TYPE_CHECKING:`` only when
    ``type_checking``."""
    stack = [tree]
    while stack:
        node = stack.pop()
        for child in ast.iter_child_nodes(node):
            if isinstance(child, ast.If) and _type_checking(child) and not type_checking:
                stack.extend(child.orelse)
                continue
            if isinstance(child, ast.Import | ast.ImportFrom):
                yield child
            stack.append(child)


def graph(type_checking: bool = False) -> dict[str, set[str]]:
    """Module → the modules of the package it imports (with ``type_checking``, also those it
    imports for the type checker alone)."""
    known = modules()
    edges: dict[str, set[str]] = {name: set() for name in known}
    for name, path in known.items():
        package = name if path.name == "__init__.py" else name.rpartition(".")[0]
        for node in _imports(ast.parse(path.read_text(encoding="utf-8")), type_checking):
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            else:
                base = node.module or ""
                if node.level:
                    parts = package.split(".")
                    parts = parts[: len(parts) - (node.level - 1)]
                    base = ".".join([*parts, base] if base else parts)
                # ``from package import module`` imports the module; otherwise the names
                # come from ``base`` itself.
                targets = [f"{base}.{a.name}" if f"{base}.{a.name}" in known else base
                           for a in node.names]
            for target in targets:
                while target and target not in known:
                    target = target.rpartition(".")[0]
                if target and target != name:
                    edges[name].add(target)
    return edges


def cycles(edges: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected groups of more than one module (Tarjan's algorithm)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    on_stack: set[str] = set()
    stack: list[str] = []
    found: list[list[str]] = []
    counter = 0

    def visit(v: str) -> None:
        nonlocal counter
        index[v] = low[v] = counter
        counter += 1
        stack.append(v)
        on_stack.add(v)
        for w in sorted(edges.get(v, ())):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            group = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                group.append(w)
                if w == v:
                    break
            if len(group) > 1:
                found.append(sorted(group))

    for v in sorted(edges):
        if v not in index:
            visit(v)
    return found
