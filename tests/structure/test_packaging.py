"""pyproject.toml lists every package folder (setuptools maps them by hand through
package-dir), ships the data files the code reads, and maps ``branchwise`` itself to the folder
holding ``__main__.py`` (``python -m branchwise``)."""

from __future__ import annotations

import tomllib

from import_graph import PACKAGES, ROOT


def _project() -> dict:
    return tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))


def test_every_package_folder_is_listed():
    tool = _project()["tool"]["setuptools"]
    listed = set(tool["packages"])
    for folder, package in PACKAGES.items():
        for init in (ROOT / folder).rglob("__init__.py"):
            parts = init.parent.relative_to(ROOT / folder).parts
            assert ".".join([package, *parts]) in listed, init.relative_to(ROOT)
    assert tool["package-dir"]["branchwise"] == "tui/entry"
    assert (ROOT / "tui/entry/__main__.py").exists() and "branchwise" in listed


def test_data_files_are_shipped():
    data = _project()["tool"]["setuptools"]["package-data"]
    assert "*.json" in data["branchwise.core.report"]  # result.schema.json
    assert (ROOT / "core/report/result.schema.json").exists()


def test_every_dependency_declares_a_minimum():
    for dep in _project()["project"]["dependencies"]:
        assert ">=" in dep, dep
