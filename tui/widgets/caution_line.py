"""The line above the footer on every screen: the caution first, always, then the keys a person
would not find in the footer (the screen's own first, then the app's), as many as fit."""

from __future__ import annotations

from textual import events
from textual.widgets import Static

CAUTION = "Estimates only, not design: confirm on site.  ! cautions"
CAUTION_SHORT = "Estimates only: confirm on site (!)"
APP_KEYS = (("F8", "site name"), ("^T", "SI/US"), ("^O", "open, new"))
"""The app's keys shown on the line (the footer shows F1, F2–F4, ^S, ^Z, ^Q)."""
GAP = "   "


def fit_line(width: int, keys: tuple[tuple[str, str], ...]) -> str:
    """The caution, then ``keys`` and :data:`APP_KEYS` in that order while they fit ``width``
    (the caution in its short form when that leaves room for more keys)."""
    items = [f"{key} {words}" for key, words in (*keys, *APP_KEYS)]

    def filled(head: str) -> tuple[str, int]:
        line, count = head, 0
        for item in items:
            more = f"{line}{GAP if count == 0 else ' · '}{item}"
            if len(more) > width:
                break
            line, count = more, count + 1
        return line, count

    long, shown = filled(CAUTION)
    short, more = filled(CAUTION_SHORT)
    return short if more > shown else long


class CautionLine(Static):
    """The caution and the keys not in the footer, fitted to the width."""

    DEFAULT_CSS = """
    CautionLine { height: 1; padding: 0 1; color: $text-muted; background: $boost;
                  text-wrap: nowrap; text-overflow: ellipsis; }
    """

    def __init__(self, keys: tuple[tuple[str, str], ...] = (), *, id: str | None = None) -> None:
        super().__init__("", id=id, markup=False)
        self.keys = keys

    def on_mount(self) -> None:
        self._fit()

    def on_resize(self, _: events.Resize) -> None:
        self._fit()

    def _fit(self) -> None:
        width = (self.content_size.width or self.app.size.width - 2)
        text = fit_line(max(width, 1), self.keys)
        if str(self.content) != text:
            self.update(text)
