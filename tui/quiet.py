"""Setting a widget's value from the site without it reporting the change as an edit."""

from __future__ import annotations

from typing import TYPE_CHECKING

from textual.widgets import Input, Static

if TYPE_CHECKING:
    from textual.visual import VisualType


def show_text(box: Input, text: str, *, force: bool = False) -> None:
    """Put ``text`` in ``box`` unless the person is typing there (or ``force``; an undo or
    redo is shown there too: the field would show a value the site no longer holds)."""
    if box.value == text:
        return
    app = box.app
    undone = getattr(app, "undone_at", -1) == getattr(app, "revision", -2)
    if not box.has_focus or force or undone:
        with box.prevent(Input.Changed):
            box.value = text
            box.cursor_position = len(text)


def put(static: Static, content: VisualType, *, layout: bool = True) -> None:
    """``static.update(content)`` only when the content changes (an update lays the screen
    out again, which is the slow part of redrawing while someone types)."""
    if static.content != content:
        static.update(content, layout=layout)
