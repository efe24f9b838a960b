"""Snapshots of each screen at 80×24 and 120×40, compared with the SVGs in ``snapshots/``.

The SVGs are also the pictures in the README. After a deliberate change of the screens,
regenerate them with ``BRANCHWISE_UPDATE_SNAPSHOTS=1 pytest tests/tui/test_app_snapshots.py``
and look at them before committing. Each SVG has a text twin (``.txt``) so that a failure shows
which characters moved; the solve time on the status line comes from a fixed clock here.
"""

from __future__ import annotations

import difflib
import os
from pathlib import Path

import pytest

import branchwise.tui.state.outcome as outcome_module
from branchwise.tui.app import BranchwiseApp
from branchwise.tui.state.session import set_find

SNAPSHOTS = Path(__file__).parent / "snapshots"
UPDATE = os.environ.get("BRANCHWISE_UPDATE_SNAPSHOTS", "") not in ("", "0")


class FixedClock:
    """perf_counter for the solve timer: every solve takes 1.5 ms."""

    def __init__(self) -> None:
        self.calls = 0

    def perf_counter(self) -> float:
        self.calls += 1
        return 0.0 if self.calls % 2 else 0.0015


@pytest.fixture(autouse=True)
def fixed_clock(monkeypatch):
    monkeypatch.setattr(outcome_module, "time", FixedClock())


async def shot(pilot, ui, name: str, problems: list[str]) -> None:
    """Settle, let the footer catch up with what is available, and compare the screen."""
    app = pilot.app
    await ui.settle(pilot)
    app.key_rules.refresh_now()  # the footer otherwise waits for a pause in typing
    await pilot.pause()
    await pilot.pause()
    check(name, app.export_screenshot(), ui.text(app), problems)


def check(name: str, svg: str, text: str, problems: list[str]) -> None:
    svg_path, text_path = SNAPSHOTS / f"{name}.svg", SNAPSHOTS / f"{name}.txt"
    if UPDATE:
        SNAPSHOTS.mkdir(exist_ok=True)
        svg_path.write_text(svg, encoding="utf-8")
        text_path.write_text(text, encoding="utf-8")
        return
    if not svg_path.exists():
        problems.append(f"{name}: no stored snapshot (set BRANCHWISE_UPDATE_SNAPSHOTS=1)")
        return
    want_text = text_path.read_text(encoding="utf-8")
    if text != want_text:
        diff = "\n".join(difflib.unified_diff(want_text.splitlines(), text.splitlines(),
                                              "stored", "now", lineterm="", n=1))
        problems.append(f"{name}: the text differs\n{diff}")
    elif svg != svg_path.read_text(encoding="utf-8"):
        problems.append(f"{name}: same text, different colours or styles")


def test_snapshots_80x24(ui):
    problems: list[str] = []

    async def scenario() -> None:
        app = BranchwiseApp()
        async with app.run_test(size=(80, 24)) as pilot:
            await shot(pilot, ui, "split-80x24", problems)
            await pilot.press("f3")
            await shot(pilot, ui, "branches-80x24", problems)
            await pilot.press("f2")
            await shot(pilot, ui, "liquid-80x24", problems)
            await pilot.press("f1")
            await shot(pilot, ui, "help-80x24", problems)

    ui.run(scenario)
    assert not problems, "\n\n".join(problems)


def test_snapshots_120x40(ui):
    problems: list[str] = []

    async def scenario() -> None:
        async with ui.started(size=(120, 40)) as (app, pilot):
            app.edit("size AHU-1", lambda s: set_find(s, "diameter", "AHU-1 coil", "25 L/s"))
            await shot(pilot, ui, "split-120x40", problems)
            await pilot.press("f3")
            await shot(pilot, ui, "branches-120x40", problems)
            await pilot.press("f2")
            await shot(pilot, ui, "liquid-120x40", problems)

    ui.run(scenario)
    assert not problems, "\n\n".join(problems)


def test_snapshots_of_several_readings(ui):
    """The demo with its clamp-on reading on AHU-3 made the given: Split compares the gauge's
    Δp with the answer (the short line at 80×24); Branches marks the given's reading."""
    from branchwise.tui.state.givens import set_given

    problems: list[str] = []

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            app.edit("clamp-on", lambda s: set_given(s, "measured_flow", "80 gpm", 2))
            await shot(pilot, ui, "readings-split-80x24", problems)
        async with ui.started(size=(120, 40)) as (app, pilot):
            app.edit("clamp-on", lambda s: set_given(s, "measured_flow", "80 gpm", 2))
            await pilot.press("f3")
            await shot(pilot, ui, "readings-branches-120x40", problems)

    ui.run(scenario)
    assert not problems, "\n\n".join(problems)


def test_snapshots_of_the_history(ui):
    """The demo's two earlier visits and today's on the History screen: the AHU-3 coil's
    resistance flagged, a braille trend per branch."""
    problems: list[str] = []

    async def scenario() -> None:
        for size, name in (((80, 24), "history-80x24"), ((120, 40), "history-120x40")):
            async with ui.started("f5", size) as (app, pilot):
                await shot(pilot, ui, name, problems)

    ui.run(scenario)
    assert not problems, "\n\n".join(problems)
