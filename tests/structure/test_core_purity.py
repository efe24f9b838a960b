"""core/ stays pure: importing every core module loads no Textual or Rich, and no pint or scipy
until they are used (start-up speed)."""

from __future__ import annotations

import pkgutil
import subprocess
import sys

import branchwise.core as core


def _core_modules() -> list[str]:
    return [m.name for m in pkgutil.walk_packages(core.__path__, "branchwise.core.")]


def test_core_imports_no_ui_and_no_heavy_modules():
    code = (
        "import importlib, sys\n"
        f"for name in {_core_modules()!r}:\n"
        "    importlib.import_module(name)\n"
        "bad = [m for m in ('textual', 'rich', 'pint', 'scipy') if m in sys.modules]\n"
        "print(','.join(bad))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_core_has_modules():
    # The walk above must see the package's modules, or the purity check proves nothing.
    walked = set(_core_modules())
    assert {"branchwise.core.numerics.solve", "branchwise.core.numerics.friction"} <= walked
