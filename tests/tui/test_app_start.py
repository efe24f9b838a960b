"""What the app does before its first screen is drawn, and what it leaves for later.

What loads before the first screen: neither the heavy modules (numpy, scipy, pint) nor the
core's model and the solve's modules, which the worker loads after it."""

from __future__ import annotations

import os
import subprocess
import sys

FIRST_SCREEN_MODULES = r"""
import os, sys
from branchwise.tui.app import BranchwiseApp

class Probe(BranchwiseApp):
    def _first_paint(self):
        print(" ".join(sorted(sys.modules)), flush=True)
        os._exit(0)

Probe().run(headless=True, size=(80, 24))
"""


def test_the_first_screen_is_drawn_before_the_model_and_the_solver_load(tmp_path):
    env = {**os.environ, "BRANCHWISE_DATA_DIR": str(tmp_path)}
    out = subprocess.run([sys.executable, "-c", FIRST_SCREEN_MODULES], capture_output=True,
                         text=True, timeout=120, env=env)
    loaded = set(out.stdout.split())
    assert "branchwise.tui.screens.split.screen" in loaded, out.stderr[-2000:]
    later = {"numpy", "scipy", "pint", "branchwise.core.model", "branchwise.core.numerics",
             "branchwise.core.site.build", "branchwise.tui.state.outcome"}
    assert not later & loaded
