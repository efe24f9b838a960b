"""The keys of the app: its own (:data:`APP_KEYS`), and every key gathered for the help
screen (F1) and the command palette (Ctrl+P).

Both are built from the bindings themselves (the present screen's, its widgets', and the
app's), so that what they list cannot drift from what the keys do.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from typing import Any

from textual.app import App, SystemCommand
from textual.binding import Binding, BindingType
from textual.dom import DOMNode
from textual.screen import Screen

from .screens.registry import SCREENS, TITLES
from .workspace import workspace

SCREENS_GROUP = Binding.Group("Screens")
SCREEN_KEYS = [Binding(s.key, f"show('{s.mode}')", s.title, id=f"show-{s.mode}",
                       key_display=s.key.upper(), group=SCREENS_GROUP, tooltip=s.tooltip)
               for s in SCREENS]
"""A key for each screen of the registry (F2 Liquid, F3 Branches, F4 Split)."""

APP_KEYS: list[BindingType] = [
    Binding("f1,question_mark", "help", "Help", id="help", key_display="F1",
            tooltip="Every key of this screen, and where things are"),
    *SCREEN_KEYS,
    Binding("ctrl+s", "save", "Save", id="save", priority=True,
            tooltip="Save the site to its file (asks for a name the first time)"),
    Binding("ctrl+r", "save_as", "Save as", id="save-as", priority=True, show=False,
            tooltip="Save the site under another name"),
    Binding("f8", "rename", "Site, readings", id="rename", show=False, key_display="F8",
            tooltip="The site's name; who took the readings, when, with which instruments "
                    "(the walkdown record)"),
    Binding("ctrl+o", "open_sites", "Sites", id="open", priority=True, show=False,
            tooltip="Open a saved or recent site, the demo, or a new one"),
    Binding("ctrl+t", "toggle_units", "SI/US", id="units", priority=True, show=False,
            tooltip="Show results in SI or US customary units"),
    Binding("f6", "unit_choices", "Units", id="unit-choices", show=False, key_display="F6",
            tooltip="Choose the display unit of each quantity"),
    Binding("ctrl+z", "undo", "Undo", id="undo", tooltip="Undo the last change"),
    Binding("ctrl+y", "redo", "Redo", id="redo", show=False, tooltip="Redo"),
    Binding("ctrl+q", "quit", "Quit", id="quit", priority=True,
            tooltip="Quit (asks first if there are unsaved changes)"),
    Binding("exclamation_mark,f7", "cautions", "Cautions", id="cautions", key_display="!",
            show=False,
            tooltip="What these numbers are and are not good for"),
]
"""The app's own keys (:attr:`~.app.BranchwiseApp.BINDINGS`): on every screen."""


def base_screen(app: App[Any]) -> Screen[Any] | None:
    """The screen under any dialogs."""
    stack = app.screen_stack
    return stack[0] if stack else None


def key_sections(app: App[Any]) -> list[tuple[str, list[Binding]]]:
    """The bindings of the present screen and of the whole app, for help and the palette."""
    sections: list[tuple[str, list[Binding]]] = []
    screen = base_screen(app)
    if screen is not None:
        own = bindings(type(screen).BINDINGS)
        for widget_type in getattr(screen, "HELP_WIDGETS", ()):
            own += bindings(widget_type.BINDINGS)
        sections.append((f"{TITLES.get(app.current_mode, '')} screen", own))
    sections.append(("Everywhere", bindings(type(app).BINDINGS)))
    return sections


def system_commands(app: App[Any], screen: Screen[Any]) -> Iterable[SystemCommand]:
    """Every action of the present screen and of the app, plus Textual's own."""
    base = base_screen(app)
    for title, items in key_sections(app):
        target: DOMNode | None = base if not title.startswith("Everywhere") else app
        if target is None:
            continue
        for binding in items:
            if not binding.description:
                continue
            name = binding.action.split("(")[0]
            if target is app:
                state = workspace(app).available(name, ())
            else:
                state = target.check_action(name, ())
            if state is False:
                continue
            key = app.get_key_display(binding)
            yield SystemCommand(f"{binding.description} ({key})",
                                binding.tooltip or binding.description,
                                _runner(app, binding.action, target))
    for command in App.get_system_commands(app, screen):
        if command.title not in ("Quit", "Keys"):
            yield command


def bindings(items: Iterable[object]) -> list[Binding]:
    """The :class:`Binding` objects of a BINDINGS list (Textual's own left out)."""
    return [b for b in items if isinstance(b, Binding) and not b.system]


def _runner(app: App[Any], action: str, target: DOMNode) -> Callable[[], object]:
    async def run() -> None:
        await app.run_action(action, target)

    return run
