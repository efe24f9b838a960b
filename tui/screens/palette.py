"""Textual's command palette, made to close once, and never two at a time.

Keys typed in a burst can reach the palette after it has closed. A second Enter would close
it again (Textual then takes the screen below off the stack, the app's last one: a crash) and
run the chosen command a second time; a letter would start a search in a palette whose list
is gone (NoMatches in the search worker: a crash). The app opens this palette instead of
Textual's own. PageDown and PageUp page the list only while it is shown: Textual's option list
pages by its laid-out lines, which a hidden list has not got (KeyError).
"""

from __future__ import annotations

from typing import Any

from textual import events
from textual.await_complete import AwaitComplete
from textual.binding import Binding
from textual.command import CommandList, CommandPalette
from textual.widgets import Input

from ..modal import app_key


async def _nothing() -> None:
    return None


class Palette(CommandPalette):
    """The command palette, deaf once closed (see also
    :class:`~branchwise.tui.screens.dialogs.Dialog`)."""

    BINDINGS = [
        Binding("pagedown", "page(1)", show=False),
        Binding("pageup", "page(-1)", show=False),
    ]

    def action_page(self, direction: int) -> None:
        options = self.query_one(CommandList)
        if options.option_count and options.scrollable_content_region.area:
            if direction > 0:
                options.action_page_down()
            else:
                options.action_page_up()

    def dismiss(self, result: Any = None) -> AwaitComplete:
        if self.app.screen is not self:
            return AwaitComplete(_nothing())
        self.workers.cancel_all()  # a search still running would look for the list once gone
        return super().dismiss(result)

    def on_key(self, event: events.Key) -> None:
        # An app key (F3, Ctrl+S…) closes the palette and does its work: nothing is lost.
        app_key(self, event, pass_keys=True, hint="Esc")

    def on_input_changed(self, event: Input.Changed) -> None:
        if self.app.screen is not self:
            event.prevent_default()  # closed: no search (the palette's own handler)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        if self.app.screen is not self:
            event.prevent_default()  # closed: the command is not chosen a second time
