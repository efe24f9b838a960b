"""Every worker of the app imports the core under one lock (tui/core_loading.py): two threads
importing the same modules in crossed orders can make one import fail (Python 3.11), as a
screen opened while the first solve loaded the core once did. A race cannot be made to happen
on demand, so this checks what prevents it: each kind of worker takes the lock."""

from __future__ import annotations

import threading

from textual.worker import NoActiveWorker, get_current_worker

from branchwise.tui import core_loading


class RecordingLock:
    """The core's lock, noting the worker (by group) of each thread that takes it."""

    def __init__(self) -> None:
        self.lock = threading.RLock()
        self.takers: set[str] = set()

    def __enter__(self) -> bool:
        self.lock.acquire()
        try:
            self.takers.add(get_current_worker().group)
        except NoActiveWorker:
            self.takers.add("app")
        return True

    def __exit__(self, *exc: object) -> None:
        self.lock.release()


def test_every_worker_imports_the_core_under_the_one_lock(ui, monkeypatch):
    lock = RecordingLock()
    monkeypatch.setattr(core_loading, "_CORE_LOCK", lock)

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.press("v")
            await ui.type(pilot, "12 psi")  # the solve's worker
            await ui.settle(pilot)
            await pilot.press("escape", "b")  # the band's
            await ui.settle(pilot)
            await pilot.press("p")  # the curve's
            await ui.settle(pilot)
            await pilot.press("f5")  # the history's
            await ui.settle(pilot)
        assert {"solve", "band", "curve", "history"} <= lock.takers, lock.takers

    ui.run(scenario)
