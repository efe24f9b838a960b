"""The one-line editor under the branch table while a cell is edited in place.

It says what is being edited and holds the text; the screen opens it on a cell, and takes the
text when Enter submits it (``Input.Submitted`` from ``#cell-input`` bubbles up to the screen)
or closes it on Esc.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import Label, Static

from ...widgets.value_input import ValueInput


class CellEditor(Vertical):
    """A title line (what is edited, and the keys) over a label and the text field."""

    def compose(self) -> ComposeResult:
        yield Static("", id="cell-title", markup=False)
        with Horizontal():
            yield Label("", id="cell-label", markup=False)
            yield ValueInput(id="cell-input", compact=True)

    def open(self, doing: str, label: str, text: str) -> None:
        """Show the editor for ``doing`` ("Editing B-2 · Length"), the field labelled
        ``label`` and holding ``text``, the cursor at its end, the focus in it."""
        self.query_one("#cell-title", Static).update(f"✎ {doing} — Enter keeps · Esc cancels")
        self.query_one("#cell-label", Label).update(f"{label}: ")
        self.display = True
        box = self.query_one("#cell-input", ValueInput)
        box.value = text
        box.cursor_position = len(text)
        box.focus()

    def close(self) -> None:
        self.display = False
