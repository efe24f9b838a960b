"""A labelled one-line input for one site value, with its message shown right under it."""

from __future__ import annotations

from dataclasses import dataclass

from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.message import Message
from textual.widgets import Input, Label, Static

from ..quiet import put, show_text
from .value_input import ValueInput


class Field(Vertical):
    """One value as typed (``18 degC``), its label, the unit a bare number takes, and the
    message of the error that points at it (hidden when there is none).

    ``path`` is the field path errors use (``fluid.temperature``); ``kind`` the quantity kind
    of :mod:`branchwise.core.units` (None for text and plain numbers).
    """

    DEFAULT_CSS = """
    Field { height: auto; }
    Field > Horizontal { height: 1; }
    Field .field-label { width: 22; color: $text-muted; }
    Field Input { width: 1fr; }
    Field .field-unit { width: 12; padding-left: 1; color: $text-muted; }
    Field .field-message { display: none; color: $error; padding-left: 22; }
    Field.-error .field-message { display: block; }
    Field.-error .field-label { color: $error; }
    """

    meaning: str = ""
    """What a bare number typed here means, where it is no unit (``% of reading``)."""

    @dataclass
    class Edited(Message):
        """The person changed the text (sent on every keystroke)."""

        field: Field
        text: str

    @dataclass
    class Done(Message):
        """The person pressed Enter in the field."""

        field: Field
        text: str

    def __init__(
        self, label: str, path: str, kind: str | None = None, *, value: str = "",
        placeholder: str = "", id: str | None = None,
    ) -> None:
        super().__init__(id=id)
        self.label = label
        self.path = path
        self.kind = kind
        self._value = value
        self._placeholder = placeholder

    def compose(self) -> ComposeResult:
        with Horizontal():
            yield Label(self.label, classes="field-label")
            yield ValueInput(self._value, placeholder=self._placeholder, compact=True)
            yield Label("", classes="field-unit", markup=False)
        yield Static("", classes="field-message", markup=False)

    @property
    def input(self) -> Input:
        return self.query_one(Input)

    @property
    def text(self) -> str:
        return self.input.value

    def show(self, text: str, *, force: bool = False) -> None:
        """Put ``text`` in the input, unless the person is typing there (or ``force``)."""
        show_text(self.input, text, force=force)

    def set_unit(self, unit: str) -> None:
        """Say which unit a bare number takes (shown after the input)."""
        put(self.query_one(".field-unit", Label), f"[{unit}]" if unit else "", layout=False)

    def set_error(self, message: str | None) -> None:
        put(self.query_one(".field-message", Static), message or "")
        self.set_class(bool(message), "-error")

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        self.post_message(self.Edited(self, event.value))

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.post_message(self.Done(self, event.value))
