"""Every worker of the app imports the core under one lock (tui/core_loading.py): two threads
importing the same modules in crossed orders can make one import fail (Python 3.11), as a
screen opened while the first solve loaded the core once did. A race cannot be made to happen
on demand, so this checks what prevents it: in a fresh interpreter, every module of the core,
numpy, scipy and tomlkit that a worker thread imports first, it imports holding the lock —
through the solve (the flows, then a diameter sought), the band, the curve, an edit, the
recovery copy and the history (the history first, or the band first). Once its first screen
is drawn, the app's own thread too: the band's and the history's words, the table and the
answer copied, the list of readings weighed."""

from __future__ import annotations

import os
import subprocess
import sys

import pytest

WORKERS_IMPORTING = r"""
import asyncio, sys, threading

WATCHED = ("branchwise.core", "numpy", "scipy", "tomlkit")
outside: list[str] = []
started = [False]  # the app's first screen drawn


class Recorder:
    '''Notes a watched module imported first without the core's lock by a worker thread, or
    by the app's once its first screen is drawn.'''

    def find_spec(self, name, path=None, target=None):
        worker = threading.current_thread() is not threading.main_thread()
        if (name.startswith(WATCHED) and (worker or started[0])
                and not core_loading._CORE_LOCK._is_owned()):
            outside.append(f"{threading.current_thread().name}: {name}")
        return None


from branchwise.tui import core_loading, recovery

sys.meta_path.insert(0, Recorder())
recovery.RECOVERY_DELAY = 0.05  # the recovery copy soon after an edit
from branchwise.core.site.spec import SolveSpec
from branchwise.tui.app import BranchwiseApp

sys.path.insert(0, sys.argv[1])
from conftest import settle


async def main():
    app = BranchwiseApp()
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        started[0] = True
        first = ("f5",) if sys.argv[2] == "history" else ("b",)
        for keys in (first, ("f4", "b"), ("p",), ("x",), ("escape",), ("f5",),
                     ("f3", "enter", "3", "enter")):
            await pilot.press(*keys)
            await settle(pilot)
        await asyncio.sleep(0.3)  # the recovery copy
        app.edit("find a diameter", lambda s: setattr(s, "solve", SolveSpec(
            "diameter", app.site.branches[0].name, "30 L/s")))
        await settle(pilot)
        await pilot.press("f4", "b")
        await settle(pilot)
        from branchwise.tui.copying import answer_text, table_text

        assert table_text(app) and answer_text(app)
        assert app.outcome.solved is not None and app.outcome.solved.result.solved is not None
    print("OUTSIDE", len(outside))
    print("\n".join(outside))

asyncio.run(main())
"""


@pytest.mark.parametrize("first", ["history", "band"])
def test_no_worker_imports_a_module_of_the_core_without_the_lock(tmp_path, first):
    env = {**os.environ, "BRANCHWISE_DATA_DIR": str(tmp_path)}
    here = os.path.dirname(__file__)
    out = subprocess.run([sys.executable, "-c", WORKERS_IMPORTING, here, first],
                         capture_output=True, text=True, timeout=300, env=env)
    assert out.returncode == 0, out.stderr[-3000:]
    assert "OUTSIDE 0" in out.stdout, out.stdout[-3000:]
