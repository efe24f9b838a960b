"""The shape of the package, checked from its source: no import circles, and each layer
importing only the layers below it (read with ``ast``; nothing is imported)."""

from __future__ import annotations

import ast

import pytest
from import_graph import ROOT, _imports, cycles, graph, modules


def test_no_import_circles():
    """No module reaches itself through its imports — at run time or for the type checker."""
    assert cycles(graph()) == []
    assert cycles(graph(type_checking=True)) == []


def test_the_graph_sees_the_imports():
    """The check above proves something only if the graph holds the package's edges."""
    edges = graph()
    assert "branchwise.core.numerics.hydraulics" in edges["branchwise.core.numerics.solve"]
    assert "branchwise.core.units.registry" in edges["branchwise.core.units.parse"]
    assert len(modules()) > 100


def _imported_names(prefix: str) -> dict[str, set[str]]:
    """Module of ``prefix`` → every top-level name it imports (run-time imports only)."""
    out = {}
    for name, path in modules().items():
        if name.startswith(prefix):
            names = set()
            for node in _imports(ast.parse(path.read_text(encoding="utf-8"))):
                if isinstance(node, ast.Import):
                    names |= {alias.name.split(".")[0] for alias in node.names}
                elif node.module and not node.level:
                    names.add(node.module.split(".")[0])
            out[name] = names
    return out


def test_core_imports_no_user_interface():
    """core/ is pure computation: no Textual, no Rich (house style)."""
    for name, names in _imported_names("branchwise.core").items():
        assert not names & {"textual", "rich"}, name


def test_pint_only_in_the_units_package():
    """One unit registry, at one boundary: pint is imported by core/units alone."""
    for name, names in _imported_names("branchwise.core").items():
        if "pint" in names:
            assert name.startswith("branchwise.core.units"), name


@pytest.mark.parametrize(("lower", "upper"), [
    ("branchwise.core", "branchwise.tui"),
    ("branchwise.tui.state", "branchwise.tui.screens"),
    ("branchwise.tui.state", "branchwise.tui.widgets"),
    ("branchwise.tui.widgets", "branchwise.tui.screens"),
    ("branchwise.tui.drawing", "branchwise.tui.widgets"),
    ("branchwise.tui.drawing", "branchwise.tui.screens"),
    ("branchwise.core.numerics", "branchwise.core.site"),
    ("branchwise.core.numerics", "branchwise.core.report"),
    ("branchwise.core.site", "branchwise.core.report"),
    ("branchwise.core.site", "branchwise.core.history"),
    ("branchwise.core.numerics", "branchwise.core.history"),
    ("branchwise.core.history", "branchwise.core.report"),
    ("branchwise.core.units", "branchwise.core.numerics"),
])
def test_layers_import_downwards(lower, upper):
    """A lower layer never imports a higher one (the arrows of DEVELOPERS.md point down)."""
    for name, targets in graph(type_checking=True).items():
        if name.startswith(lower):
            assert not {t for t in targets if t.startswith(upper)}, name


def test_the_state_of_the_app_needs_no_textual():
    """The site, its undo history and the readings are plain objects: drawn by screens, kept
    apart from them."""
    for name, names in _imported_names("branchwise.tui.state").items():
        assert not names & {"textual", "rich"}, name


def test_widgets_holds_widgets():
    """Each module of tui/widgets defines a widget class (helpers live elsewhere: drawing/,
    state/, quiet.py)."""
    for name, path in modules().items():
        if name.startswith("branchwise.tui.widgets."):
            tree = ast.parse(path.read_text(encoding="utf-8"))
            assert any(isinstance(node, ast.ClassDef) and node.bases for node in tree.body), name


def test_root_is_the_checkout():
    assert (ROOT / "core" / "model.py").exists()
