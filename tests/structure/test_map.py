"""DEVELOPERS.md's map of the tree names every module there is, and no module that is not."""

from __future__ import annotations

import re

from import_graph import ROOT


def _map() -> str:
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    section = text.split("## Architecture", 1)[1]
    return section.split("```", 2)[1]


def test_every_module_is_on_the_map():
    named = set(re.findall(r"[a-z_]+\.py", _map())) | set(re.findall(r"\b([a-z_]+)\b", _map()))
    for folder in ("core", "tui"):
        for path in (ROOT / folder).rglob("*.py"):
            if path.name == "__init__.py" and path.parent.name not in ("core", "fluids",
                                                                      "unknowns"):
                continue
            stem = path.stem if path.name != "__init__.py" else "__init__"
            assert path.name in named or stem in named, path.relative_to(ROOT)


def test_no_module_on_the_map_is_missing():
    files = {p.name for folder in ("core", "tui", "tests")
             for p in (ROOT / folder).rglob("*.py")}
    files |= {p.name for p in (ROOT / "tui").rglob("*.tcss")}
    for name in re.findall(r"\b([a-z_]+\.(?:py|tcss))\b", _map()):
        assert name in files, name
