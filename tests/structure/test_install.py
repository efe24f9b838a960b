"""The Quick start works on a fresh machine: two commands, each making its own virtual
environment; CI runs the README's test command exactly; a plain (not editable) install carries
every package of the tree."""

from __future__ import annotations

import re
import subprocess
import tomllib

from import_graph import ROOT


def _quick_start() -> str:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    return text.split("## Quick start", 1)[1].split("\n## ", 1)[0]


def _commands() -> list[str]:
    return re.findall(r"```\n(.*?)\n```", _quick_start(), flags=re.S)


def test_the_quick_start_is_two_commands_in_a_virtual_environment():
    commands = _commands()
    assert len(commands) == 2 and all("\n" not in c for c in commands)
    run_app, run_tests = commands
    venv = "python3 -m venv .venv && . .venv/bin/activate && "
    assert run_app == f"{venv}pip install . && branchwise"
    assert run_tests == f'{venv}pip install -e ".[test]" && pytest'
    words = " ".join(_quick_start().split())
    assert "Python 3.11 or newer" in words
    assert "several minutes on a two-core laptop" in words
    assert "a plain `branchwise` opens the last site" in words and "the demo the first" in words
    project = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    assert project["project"]["requires-python"] == ">=3.11"


def test_ci_runs_exactly_the_readme_test_command():
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8")
    pattern = re.search(r"grep -m1 -oE '(.*?)' README\.md", ci)
    assert pattern is not None
    found = subprocess.run(["grep", "-m1", "-oE", pattern.group(1), "README.md"], cwd=ROOT,
                           capture_output=True, text=True, check=True).stdout.strip()
    assert found == _commands()[1]
    assert 'bash -c "$test_cmd"' in ci


def test_a_plain_install_carries_every_package():
    project = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    listed = set(project["tool"]["setuptools"]["packages"])
    roots = project["tool"]["setuptools"]["package-dir"]
    for name, folder in roots.items():
        for init in (ROOT / folder).rglob("__init__.py"):
            parts = init.parent.relative_to(ROOT / folder).parts
            package = ".".join((name, *parts))
            assert package in listed, f"{package} is not in pyproject's packages"
