"""The public API of ``branchwise.core``: what the README promises runs, and stays."""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest

README = Path(__file__).resolve().parents[2] / "README.md"
STABLE = {
    "load_site", "solve_site", "solve", "Network", "Branch", "Segment", "Fluid", "PressureDrop",
    "TotalFlow", "MeasuredFlow", "FindFlows", "FindUnknown", "Result", "InputError",
    "NoSolutionError", "render",
}
"""The names the API promises (added to, never taken away)."""


def _examples() -> list[str]:
    text = README.read_text(encoding="utf-8")
    section = text.split("## Using branchwise from Python", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```python\n(.*?)```", section, re.S)


def test_the_public_names_are_there():
    import branchwise.core as core

    assert STABLE <= set(core.__all__)
    assert set(core.__all__) == set(core._PUBLIC)  # every name exported has its module
    for name in core.__all__:
        assert getattr(core, name) is not None, name


def test_importing_the_package_loads_no_numpy():
    """The app imports ``branchwise.core`` before its first screen: the names load on use."""
    code = "import sys, branchwise.core as c; assert 'numpy' not in sys.modules; c.solve; " \
           "assert 'numpy' in sys.modules"
    subprocess.run([sys.executable, "-c", code], check=True, timeout=120)


def test_the_readme_examples_run(tmp_path, monkeypatch, capsys):
    from branchwise.tui.cli import main

    monkeypatch.chdir(tmp_path)
    assert main(["demo"]) == 0  # what the README says writes demo-site.toml
    capsys.readouterr()
    examples = _examples()
    assert len(examples) == 2
    for code in examples:
        exec(compile(code, "README.md", "exec"), {})  # noqa: S102 (our own README)
    out = capsys.readouterr().out
    assert "Coil 1:" in out and "L/s" in out and "# Walkdown record" in out


def test_the_first_example_agrees_with_the_engine_by_hand():
    """The README's two-coil header: each branch loses the 68 kPa (less nothing: no lift)
    across it, checked with fluids' Colebrook (a library outside the project) and
    Darcy–Weisbach written out here."""
    from fluids.friction import Colebrook

    from branchwise.core import Network, PressureDrop, branch, fluid_from_spec, solve

    water = fluid_from_spec("water", temperature_k=280.15)
    header = Network(water, (
        branch("Coil 1", diameter=0.1023, length=60.0, roughness=4.5e-5, minor_k=8.0),
        branch("Coil 2", diameter=0.0779, length=45.0, roughness=4.5e-5, minor_k=6.0),
    ))
    result = solve(header, PressureDrop(68_000.0))
    g = 9.80665
    head = 68_000.0 / (water.density * g)
    for b, (d, length, k) in zip(result.branches, ((0.1023, 60.0, 8.0), (0.0779, 45.0, 6.0)),
                                 strict=True):
        v = b.flow / (3.141592653589793 * d * d / 4)
        f = Colebrook(v * d / water.kinematic_viscosity, 4.5e-5 / d)
        assert (f * length / d + k) * v * v / (2 * g) == pytest.approx(head, rel=1e-9)
