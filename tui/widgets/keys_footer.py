"""The footer of every work screen: Textual's Footer, rebuilt only when its keys change.

Textual's Footer takes itself down and builds every key again each time the screen says its
bindings changed: when a screen comes back (every F-key switch), when the focus moves, when the
app refreshes its bindings. Most of the time the keys shown are the same, and the rebuild
(about fifteen widgets, each restyled) is most of what a screen switch costs; the screen being
left is told too, and rebuilt out of sight. This footer notes what it shows and rebuilds only
when that differs, and only on the screen in sight (a screen coming back is told again).
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.screen import Screen
from textual.widgets import Footer

Shown = tuple[object, ...]


class KeysFooter(Footer):
    """A Footer that is rebuilt only when the keys it would show, or their state, change."""

    _shown: Shown | None = None
    """What the footer was last built from (None: not built with keys yet)."""

    def _what_is_shown(self) -> Shown | None:
        if not self._bindings_ready:
            return None
        app = self.app
        keys = tuple((binding.key, app.get_key_display(binding), binding.description,
                      binding.action, binding.group, enabled, tooltip)
                     for (_, binding, enabled, tooltip) in self.screen.active_bindings.values()
                     if binding.show)
        return keys, self.show_command_palette, app.ENABLE_COMMAND_PALETTE

    def compose(self) -> ComposeResult:
        self._shown = self._what_is_shown()
        yield from super().compose()

    def bindings_changed(self, screen: Screen[object]) -> None:
        self._bindings_ready = True
        if not screen.app.app_focus:
            return
        if self.is_attached and screen is self.screen:
            self.call_after_refresh(self._rebuild_if_changed)

    async def _rebuild_if_changed(self) -> None:
        if (self.is_attached and self.screen.is_current
                and self._what_is_shown() != self._shown):
            await self.recompose()
