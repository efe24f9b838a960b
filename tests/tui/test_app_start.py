"""What the app does before its first screen is drawn, and what it leaves for later.

What loads before the first screen: neither the heavy modules (numpy, scipy, pint) nor the
core's model, the solve's modules and the reader of typed values, which the worker loads after
it (the first screen shows each field's text as typed).

The garbage collector rests while the app loads and while its first screen is built (a
shorter start: tests/perf/bench_startup.py), and is always back on afterwards: once the first
screen is drawn, when the app closes before that, and after a plain import of the app's module
(a test or a tool may import it without running it). A collector left off would let the
memory of a long session grow without bound."""

from __future__ import annotations

import gc
import os
import subprocess
import sys

import pytest

from branchwise.tui.app import BranchwiseApp


def test_importing_the_app_leaves_the_collector_on():
    # A fresh interpreter, so that the module really loads here.
    code = "import gc; import branchwise.tui.app; print(gc.isenabled(), gc.get_freeze_count() > 0)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=120, check=True).stdout.split()
    assert out == ["True", "True"]


def test_the_collector_rests_while_the_first_screen_is_built_and_is_back_once_drawn(
        ui, monkeypatch):
    seen: list[bool] = []
    real = BranchwiseApp._first_screen

    def spy(self):
        screen = real(self)
        seen.append(gc.isenabled())
        return screen

    monkeypatch.setattr(BranchwiseApp, "_first_screen", spy)
    assert gc.isenabled()

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await ui.settle(pilot)
            assert app.startup_seconds is not None  # the first screen was drawn
            assert gc.isenabled()

    ui.run(scenario)
    assert seen == [False]
    assert gc.isenabled()


def test_an_app_closed_before_its_first_screen_is_drawn_turns_the_collector_back_on(
        ui, monkeypatch):
    # _first_paint never runs: the app is closed while the collector still rests.
    monkeypatch.setattr(BranchwiseApp, "_first_paint", lambda self: None)

    async def scenario() -> None:
        app = BranchwiseApp()
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.pause()
            assert app.startup_seconds is None and not gc.isenabled()

    try:
        ui.run(scenario)
        assert gc.isenabled()
    finally:
        gc.enable()  # whatever happened, the rest of the suite runs with the collector on


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
             "branchwise.core.site.build", "branchwise.tui.state.outcome",
             "branchwise.core.units.parse", "branchwise.core.units.grammar",
             "branchwise.core.site.fields"}
    assert not later & loaded


EARLY_KEY = r"""
import asyncio, sys
from branchwise.tui.app import BranchwiseApp

async def main():
    app = BranchwiseApp()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(sys.argv[1])  # at once: the first solve is loading the core
        for _ in range(100):
            await pilot.pause(0.01)
            if app.outcome is not None:
                break
        print("shown", type(app.screen).__name__, app.outcome is not None)

asyncio.run(main())
"""


@pytest.mark.parametrize("key", ["f3", "f2"])
def test_a_screen_opened_while_the_first_solve_loads_the_core_opens(tmp_path, key):
    # The Branches screen reads the pipe catalogs as it is drawn, the Liquid screen the
    # liquids, while the first solve imports the same modules in its worker: imported in
    # crossed orders by two threads, one import failed (a traceback, the app gone; about one
    # start in two with F3 pressed at once). Each run is a fresh interpreter.
    env = {**os.environ, "BRANCHWISE_DATA_DIR": str(tmp_path)}
    for _ in range(4):
        out = subprocess.run([sys.executable, "-c", EARLY_KEY, key], capture_output=True,
                             text=True, timeout=120, env=env)
        assert out.returncode == 0 and "Error" not in out.stdout + out.stderr, out.stdout[-3000:]
        assert "shown" in out.stdout and out.stdout.split()[-1] == "True"


def test_an_app_that_fails_to_load_leaves_the_collector_on(tmp_path):
    # A module of the app that cannot be imported (simulated): the import fails, and the
    # process that tried goes on with its collector.
    code = ("import gc, sys\n"
            "sys.modules['branchwise.tui.keygate'] = None  # makes its import fail\n"
            "try:\n"
            "    import branchwise.tui.app\n"
            "except ImportError:\n"
            "    print(gc.isenabled())\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=120, check=True).stdout.split()
    assert out == ["True"]
