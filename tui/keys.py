"""The keys of the app, gathered for the help screen (F1) and the command palette (Ctrl+P).

Both are built from the bindings themselves (the present screen's, its widgets', and the
app's), so that what they list cannot drift from what the keys do.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from typing import TYPE_CHECKING

from textual.app import App, SystemCommand
from textual.binding import Binding
from textual.screen import Screen

if TYPE_CHECKING:
    from .app import BranchwiseApp

SCREEN_TITLES = {"liquid": "Liquid", "branches": "Branches", "split": "Split"}


class KeyIndex:
    """The app's key lists (a mixin of the App)."""

    def key_sections(self: BranchwiseApp) -> list[tuple[str, list[Binding]]]:
        """The bindings of the present screen and of the whole app, for help and the palette."""
        sections: list[tuple[str, list[Binding]]] = []
        screen = self._base_screen()
        if screen is not None:
            own = [b for b in _bindings(type(screen).BINDINGS)]
            for widget_type in getattr(screen, "HELP_WIDGETS", ()):
                own += _bindings(widget_type.BINDINGS)
            sections.append((f"{SCREEN_TITLES.get(self.current_mode, '')} screen", own))
        sections.append(("Everywhere", _bindings(self.BINDINGS)))
        return sections

    def _base_screen(self: BranchwiseApp) -> Screen | None:
        stack = self.screen_stack
        return stack[0] if stack else None

    def get_system_commands(self: BranchwiseApp, screen: Screen) -> Iterable[SystemCommand]:
        """Every action of the present screen and of the app, plus Textual's own."""
        base = self._base_screen()
        for title, bindings in self.key_sections():
            target = base if not title.startswith("Everywhere") else self
            for binding in bindings:
                if not binding.description:
                    continue
                name = binding.action.split("(")[0]
                state = self.available(name, ()) if target is self else \
                    target.check_action(name, ()) if target is not None else True
                if state is False:
                    continue
                key = self.get_key_display(binding)
                yield SystemCommand(f"{binding.description} ({key})",
                                    binding.tooltip or binding.description,
                                    _runner(self, binding.action, target))
        for command in App.get_system_commands(self, screen):
            if command.title not in ("Quit", "Keys"):
                yield command

    def action_command_palette(self: BranchwiseApp) -> None:
        """Textual's palette, closing once; not a second one while the last one is still
        being taken down (a burst of Ctrl+P, Esc, Ctrl+P)."""
        from textual.command import CommandPalette

        from .screens.palette import Palette

        last = getattr(self, "_palette", None)
        if not self.use_command_palette or CommandPalette.is_open(self) or (
                last is not None and last.is_attached):
            return
        self._palette = Palette(id="--command-palette")
        self.push_screen(self._palette)


def _bindings(items: Iterable[object]) -> list[Binding]:
    return [b for b in items if isinstance(b, Binding) and not b.system]


def _runner(app: App, action: str, target: object) -> Callable[[], object]:
    async def run() -> None:
        await app.run_action(action, target)  # type: ignore[arg-type]

    return run
