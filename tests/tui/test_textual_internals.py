"""The start leans on two Textual internals (`App._modes`, `_css_update_count`; see
`BranchwiseApp._first_screen`): these fail when a Textual release renames or retypes them, before
the start silently loses its shortcut."""

from __future__ import annotations

from textual.app import App
from textual.screen import Screen

from branchwise.tui.app import BranchwiseApp


def test_textual_still_has_the_internals_the_start_uses():
    app = App()
    assert isinstance(app._modes, dict)
    assert isinstance(app._css_update_count, int)
    assert isinstance(Screen()._css_update_count, int)


def test_the_first_screen_is_the_one_built_for_the_start(ui, monkeypatch):
    built = []
    real = BranchwiseApp._first_screen

    def spy(self):
        screen = real(self)
        built.append(screen)
        return screen

    monkeypatch.setattr(BranchwiseApp, "_first_screen", spy)

    async def scenario() -> None:
        async with ui.started() as (app, pilot):
            await ui.settle(pilot)
            assert built and app.screen is built[0]
            assert built[0]._css_update_count == app._css_update_count

    ui.run(scenario)
