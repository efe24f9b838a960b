"""A one-line pick-one control: shows the chosen label; Enter opens the list, ←/→ step through.
Focused, it is drawn in reverse colours (plain to see on any theme, and without colour).

Lighter than Textual's Select (whose drop-down list is built with the screen): the list here
is a small dialog built only when opened, which keeps the first screen quick to draw.
"""

from __future__ import annotations

from dataclasses import dataclass

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.message import Message
from textual.widget import Widget

from ..modal import Dialog


class Choice(Widget, can_focus=True):
    """Pick one of ``options`` (label, value). Posts :class:`Choice.Changed` when the person
    picks; setting :attr:`value` from code does not post it."""

    BINDINGS = [
        Binding("enter,space", "open", "Choose", show=False, id="choice-open"),
        Binding("right", "step(1)", "Next", show=False, id="choice-next"),
        Binding("left", "step(-1)", "Previous", show=False, id="choice-previous"),
    ]
    DEFAULT_CSS = """
    Choice { height: 1; width: 24; background: $boost; padding: 0 1; }
    Choice:focus { text-style: bold reverse; }
    """

    @dataclass
    class Changed(Message):
        choice: Choice
        value: str

        @property
        def control(self) -> Choice:
            return self.choice

    def __init__(self, options: list[tuple[str, str]], value: str | None = None, *,
                 id: str | None = None, classes: str | None = None,
                 prompt: str = "choose") -> None:
        super().__init__(id=id, classes=classes)
        self.options = list(options)
        self.prompt = prompt
        self._value = value if value is not None else (options[0][1] if options else "")

    @property
    def value(self) -> str:
        return self._value

    @value.setter
    def value(self, value: str) -> None:
        if value != self._value:
            self._value = value
            self.refresh()

    def set_options(self, options: list[tuple[str, str]], value: str | None = None) -> None:
        """New options (and value); quiet, like setting :attr:`value`."""
        self.options = list(options)
        if value is not None:
            self._value = value
        self.refresh()

    def label(self) -> str:
        return next((label for label, v in self.options if v == self._value), self.prompt)

    def render(self) -> Text:
        return Text.assemble(self.label(), " ▾", no_wrap=True, overflow="ellipsis")

    def pick(self, value: str) -> None:
        """Choose ``value`` as the person would (posts Changed when it differs)."""
        if value != self._value and value in (v for _, v in self.options):
            self.value = value
            self.post_message(self.Changed(self, value))

    def action_step(self, step: int) -> None:
        values = [v for _, v in self.options]
        if not values:
            return
        i = values.index(self._value) if self._value in values else -1
        self.pick(values[(i + step) % len(values)])

    def action_open(self) -> None:
        def chosen(value: str | None) -> None:
            if value is not None:
                self.pick(value)

        self.app.push_screen(ChoiceMenu(self.options, self._value, self.region), chosen)


class ChoiceMenu(Dialog[str | None]):
    """The list of a :class:`Choice`, just below it."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", id="menu-cancel")]
    PASS_KEYS = True
    DEFAULT_CSS = """
    ChoiceMenu { background: $background 30%; }
    ChoiceMenu OptionList { width: auto; min-width: 24; max-width: 60; height: auto;
                            max-height: 14; border: tall $primary; }
    """

    def __init__(self, options: list[tuple[str, str]], value: str, anchor: object) -> None:
        super().__init__()
        self.options = options
        self.value = value
        self.at = anchor

    def compose(self) -> ComposeResult:
        from textual.widgets import OptionList

        yield OptionList(*[label for label, _ in self.options])

    def on_mount(self) -> None:
        from textual.widgets import OptionList

        menu = self.query_one(OptionList)
        values = [v for _, v in self.options]
        if self.value in values:
            menu.highlighted = values.index(self.value)
        x, y = getattr(self.at, "x", 0), getattr(self.at, "y", 0) + 1
        menu.styles.offset = (max(0, x - 1), y)
        menu.focus()

    def on_option_list_option_selected(self, event: object) -> None:
        index = getattr(event, "option_index", None)
        self.dismiss(self.options[index][1] if index is not None else None)

    def action_cancel(self) -> None:
        self.dismiss(None)
