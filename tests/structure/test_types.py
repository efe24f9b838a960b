"""The type checker's verdict on the package: mypy --strict on core/, and tui/ with every
function checked (the settings are pyproject.toml's ``[tool.mypy]``).

mypy reads the package as it is installed (``branchwise.core``, ``branchwise.tui``): the test
lays the checkout out that way with symbolic links in a temporary folder and runs mypy there.
"""

from __future__ import annotations

import os
import subprocess
import sys

import pytest
from import_graph import ROOT


@pytest.fixture(scope="module")
def tree(tmp_path_factory):
    root = tmp_path_factory.mktemp("typed")
    package = root / "branchwise"
    package.mkdir()
    for name in ("core", "tui", "presets"):
        (package / name).symlink_to(ROOT / name, target_is_directory=True)
    return root


def mypy(tree, *args: str) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "MYPY_FORCE_COLOR": "0"}
    return subprocess.run(
        [sys.executable, "-m", "mypy", "--config-file", str(ROOT / "pyproject.toml"),
         "--cache-dir", str(tree / ".mypy_cache"), "--no-error-summary", *args],
        cwd=tree, capture_output=True, text=True, env=env, timeout=600)


def test_core_is_clean_under_strict(tree):
    done = mypy(tree, "--strict", "-p", "branchwise.core")
    assert done.returncode == 0, done.stdout + done.stderr


def test_tui_is_clean(tree):
    done = mypy(tree, "-p", "branchwise.tui")
    assert done.returncode == 0, done.stdout + done.stderr


def test_no_type_ignore_comments():
    """A ``# type: ignore`` hides a question from the checker: none in the package."""
    found = [f"{path.relative_to(ROOT)}:{n}" for folder in ("core", "tui")
             for path in (ROOT / folder).rglob("*.py")
             for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1)
             if "type: ignore" in line]
    assert found == []
