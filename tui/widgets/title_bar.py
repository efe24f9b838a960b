"""The line at the top of every work screen: the app's name and the site's title, centred, and
≡ at the left (a click on it opens the command palette, as Ctrl+P does). One widget: the
screens are built sooner than with a header of four."""

from __future__ import annotations

from textual import events
from textual.content import Content
from textual.widget import Widget

ICON = "≡"
ICON_CELLS = 4
"""Cells at the left that belong to the icon (a click there opens the palette)."""


class TitleBar(Widget):
    """The app's title and sub-title (the site's title, ● while unsaved), kept up to date."""

    DEFAULT_CSS = """
    TitleBar { dock: top; width: 100%; height: 1; background: $panel; color: $foreground;
               text-wrap: nowrap; text-overflow: ellipsis; }
    """

    def on_mount(self) -> None:
        for name in ("title", "sub_title"):
            self.watch(self.app, name, self._changed, init=False)

    def _changed(self, _: object = None) -> None:
        self.refresh()

    def render(self) -> Content:
        title = self.app.format_title(self.app.title, self.app.sub_title)
        width = self.size.width
        left = max((width - title.cell_length) // 2, ICON_CELLS)
        return Content.assemble(f" {ICON}".ljust(left), title)

    async def on_click(self, event: events.Click) -> None:
        if event.x < ICON_CELLS and self.app.ENABLE_COMMAND_PALETTE:
            event.stop()
            await self.run_action("app.command_palette")
