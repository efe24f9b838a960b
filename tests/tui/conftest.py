"""Helpers for the app tests: a private data folder, settling after a change, screen text.

Pilot tests run under ``asyncio.run`` (no async plugin is needed). "Settled" means every
worker has finished and the answer on screen belongs to the present revision of the site, so
tests wait on state, never on sleeps.
"""

from __future__ import annotations

import asyncio
import io
from collections.abc import AsyncIterator, Awaitable, Callable
from contextlib import asynccontextmanager
from pathlib import Path
from types import SimpleNamespace
from typing import Any

import pytest
from app_waits import workers_done
from textual.pilot import Pilot


@pytest.fixture(autouse=True)
def data_dir(tmp_path, monkeypatch):
    """Every app test keeps its settings, sites and recovery copies in its own folder."""
    folder = tmp_path / "data"
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(folder))
    return folder


@pytest.fixture(autouse=True)
def keys_handled(monkeypatch):
    """``pilot.press`` returns once the app has dealt with every key sent: the app lets typed
    keys go one after the other (``tui/keygate.py``), so the screen's queues alone do not say
    that a key has been handled."""
    original = Pilot._wait_for_screen

    async def wait(self, timeout: float = 30.0) -> bool:
        gate = getattr(self.app, "key_gate", None)
        for _ in range(2000):
            if gate is None or gate.settled() or not self.app.is_running:
                break
            await asyncio.sleep(0.001)
        return await original(self, timeout)

    monkeypatch.setattr(Pilot, "_wait_for_screen", wait)


async def settle(pilot) -> None:
    """Wait until the answer on screen is the answer for the site as it now is."""
    app = pilot.app
    for _ in range(400):
        await pilot.pause()
        await workers_done(app)
        await pilot.pause()
        outcome = app.outcome
        if (outcome is not None and outcome.revision == app.session.revision
                and not app.solving):
            await pilot.pause()
            return
    raise AssertionError("the app never settled on an answer for the present site")


async def type_text(pilot, text: str) -> None:
    """Type ``text`` key by key, as a person would."""
    await pilot.press(*text)


def screen_text(app) -> str:
    """The screen as plain text, the way a person sees it (what the SVG shows, without colour)."""
    from rich.console import Console

    width, height = app.size
    console = Console(width=width, height=height, file=io.StringIO(), record=True,
                      force_terminal=True, color_system="truecolor", legacy_windows=False)
    console.print(app.screen._compositor.render_update(
        full=True, screen_stack=app._background_screens))
    return console.export_text()


def run(scenario: Callable[[], Awaitable[None]]) -> None:
    asyncio.run(scenario())


@asynccontextmanager
async def started(key: str | None = None, size: tuple[int, int] = (80, 24),
                  site: str | Path | None = None) -> AsyncIterator[tuple[Any, Pilot]]:
    """The app on ``site`` (None: the last site, or the demo), settled on its first answer,
    then (``key``, such as ``f3``) on another screen, settled again."""
    from branchwise.tui.app import BranchwiseApp

    app = BranchwiseApp(site)
    async with app.run_test(size=size) as pilot:
        await settle(pilot)
        if key is not None:
            await pilot.press(key)
            await settle(pilot)
        yield app, pilot


@pytest.fixture
def ui():
    return SimpleNamespace(settle=settle, type=type_text, text=screen_text, run=run,
                           started=started, workers_done=workers_done)
