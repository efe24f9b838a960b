"""Every warning and note of the present answer, in a dialog (``w`` on the Split screen).

The Split screen shows as many warning lines as fit under its table (every branch row stays
in sight on 80×24) and ends with "+k more — w lists them"; this dialog lists them all.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import Label, Static

from ..modal import Dialog


def fit_lines(lines: list[str], room: int) -> list[str]:
    """``lines`` cut to ``room`` lines (at least one): when some are left out, the last line
    says how many and which key lists them all."""
    room = max(1, room)
    if len(lines) <= room:
        return list(lines)
    more = len(lines) - room + 1
    return [*lines[:room - 1], f"… +{more} more — w lists them"]


class WarningsScreen(Dialog[None]):
    """The warnings and notes, one per paragraph, scrolling when there are many."""

    BINDINGS = [Binding("escape,w,q", "close", "Close", id="warnings-close")]
    PASS_KEYS = True
    DEFAULT_CSS = """
    WarningsScreen { align: center middle; }
    WarningsScreen > Vertical {
        width: 90; max-width: 100%; height: auto; max-height: 90%; border: thick $warning;
        background: $surface; padding: 0 1;
    }
    WarningsScreen Label { text-style: bold; color: $warning; }
    WarningsScreen VerticalScroll { height: auto; max-height: 30; }
    WarningsScreen .warnings-keys { color: $text-muted; }
    """

    def __init__(self, lines: list[str], title: str | None = None,
                 keys: str = "Esc closes.  The walkdown record (r) lists them too.") -> None:
        super().__init__()
        self.lines = lines
        self.title_text = title
        self.keys = keys

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text or f"Warnings and notes ({len(self.lines)})")
            with VerticalScroll():
                yield Static("\n".join(self.lines) or "None for this answer.", markup=False)
            yield Static(self.keys, classes="warnings-keys", markup=False)

    def action_close(self) -> None:
        self.dismiss(None)
