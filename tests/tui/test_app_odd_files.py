"""Odd files never freeze the app: a FIFO given to open, remembered as the last site, or lying
in the sites folder is refused before it is read, and the app stays live (Ctrl+Q quits); a
data folder that is a file is said at start."""

from __future__ import annotations

import os
import sys

import pytest

from branchwise.core.site.read import demo_site
from branchwise.core.site.write import save_site
from branchwise.tui.app import BranchwiseApp

pytestmark = pytest.mark.skipif(sys.platform == "win32", reason="FIFOs are POSIX")


def _notes(app) -> str:
    return " ".join(str(n.message) for n in app._notifications)


def test_a_fifo_as_the_site_the_last_site_or_in_the_sites_folder(ui, data_dir, tmp_path):
    fifo = tmp_path / "site.toml"
    os.mkfifo(fifo)
    sites = data_dir / "sites"
    sites.mkdir(parents=True)
    os.mkfifo(sites / "pipe.toml")
    save_site(demo_site(), sites / "good.toml")

    async def opened_on_the_fifo() -> None:
        app = BranchwiseApp(fifo)  # `branchwise open site.toml`
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert "FIFO" in _notes(app) and app.site.source is None  # the demo
            await pilot.press("ctrl+o")  # the sites folder holds a FIFO too
            await pilot.pause()
            assert "good.toml" in ui.text(app)
            await pilot.press("escape", "ctrl+q")
            await pilot.pause()
        assert not app.is_running

    async def plain_start_with_the_fifo_remembered() -> None:
        app = BranchwiseApp()
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            assert app.site.source is None and "FIFO" in _notes(app)

    ui.run(opened_on_the_fifo)
    from branchwise.core.storage.settings import Settings

    settings = Settings.load()
    settings.remember_site(fifo)
    settings.save()
    ui.run(plain_start_with_the_fifo_remembered)


def test_a_data_folder_that_is_a_file_is_said_at_start(ui, tmp_path, monkeypatch):
    blocker = tmp_path / "data-file"
    blocker.write_text("x")
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(blocker))

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await pilot.pause()
            assert f"the data folder {blocker} is a file" in _notes(app)

    ui.run(scenario)
