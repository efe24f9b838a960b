"""Close today's visit: its readings and record move into the site's earlier visits, dated,
and the fields clear for the next visit — asked first, and one step for Ctrl+Z.

The dialog says what moves and offers the record's date (or today's): Enter in the date moves
to the notes, Enter there closes the visit, Esc leaves everything as it was.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Label, Static

from branchwise.core.errors import InputError
from branchwise.core.givens import reading_words
from branchwise.core.site.readings import readings
from branchwise.core.site.visits import close_visit, today_has_reading, visit_date

from ..modal import Dialog
from ..state.values import text_of
from ..widgets.field import Field
from .dialogs import FORM_HINT, FORM_KEYS
from .record import today

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site

    from ..workspace import Workspace

Closing = tuple[str, str | None]
"""What the dialog gives back: the visit's date (ISO text) and its notes (None: none)."""


def what_moves(site: Site) -> str:
    """Today's readings and record in words, for the question."""
    parts = []
    names = [text_of(b.name) for b in site.branches]
    for r in readings(site):
        where = names[r.branch] if r.branch is not None else None
        parts.append(f"{reading_words(r.kind, where)} {text_of(r.value)}")
    record = site.record
    who = text_of(record.technician) if record is not None else ""
    return "; ".join(parts) + (f"; the record ({who})" if who else "")


def proposed_date(site: Site) -> str:
    """The record's date when it is a date, else today's."""
    typed = site.record.date if site.record is not None else None
    try:
        return visit_date(typed, "record.date").isoformat()
    except InputError:
        return today()


class CloseVisitScreen(Dialog[Closing | None]):
    """Ask before closing today's visit; the date and notes it is kept with."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="close-visit-cancel",
                tooltip="Keep today's readings where they are"),
        Binding("ctrl+d", "today", "Today", id="close-visit-today", priority=True,
                tooltip="Put today's date in the date field"),
    ]
    QUIT_PASSES = True
    CLOSE_HINT = FORM_HINT
    DEFAULT_CSS = """
    CloseVisitScreen { align: center middle; }
    CloseVisitScreen > Vertical {
        width: 84; max-width: 100%; height: auto; border: thick $warning; padding: 0 1;
        background: $surface;
    }
    CloseVisitScreen .close-title { text-style: bold; }
    CloseVisitScreen .close-note { margin-bottom: 1; }
    CloseVisitScreen .close-keys { color: $text-muted; margin-top: 1; }
    CloseVisitScreen Field .field-unit { display: none; }
    CloseVisitScreen Field .field-label { width: 8; }
    CloseVisitScreen Field .field-message { padding-left: 8; }
    """

    def __init__(self, site: Site) -> None:
        super().__init__()
        self.moving = what_moves(site)
        self.day = proposed_date(site)

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label("Close today's visit?", classes="close-title")
            yield Static(f"Moves into the site's earlier visits: {self.moving}. The readings "
                         "and the record then clear for the next visit; the branches, the "
                         "liquid and the tolerances stay. Ctrl+Z brings it all back.",
                         classes="close-note", markup=False)
            yield Field("Date", "visits.date", value=self.day,
                        placeholder="YYYY-MM-DD (Ctrl+D: today)", id="close-visit-date")
            yield Field("Notes", "visits.notes", placeholder="what was seen (optional)",
                        id="close-visit-notes")
            yield Static(f"{FORM_KEYS}\nEnter on Notes closes the visit", classes="close-keys",
                         markup=False)

    def on_mount(self) -> None:
        if self.children:  # nothing was composed when the app is closing
            self.query_one("#close-visit-date", Field).input.focus()

    def action_today(self) -> None:
        field = self.query_one("#close-visit-date", Field)
        field.show(today(), force=True)
        field.input.focus()

    def on_field_done(self, event: Field.Done) -> None:
        event.stop()
        date_field = self.query_one("#close-visit-date", Field)
        try:
            day = visit_date(date_field.text, "visits.date").isoformat()
        except InputError as exc:
            date_field.set_error(f"{exc.reason}, got {exc.value}")
            date_field.input.focus()
            return
        date_field.set_error(None)
        if self.next_field(event.field):
            return
        notes = " ".join(self.query_one("#close-visit-notes", Field).text.split())
        self.dismiss((day, notes or None))

    def action_cancel(self) -> None:
        self.dismiss(None)


def ask_close_visit(app: Workspace, ui: App[None]) -> None:
    """Ask, then close today's visit as one undoable edit (nothing happens on Esc)."""
    site = app.site
    if not today_has_reading(site):
        ui.notify("Nothing to close: today holds no reading (F4 Split, or a branch's "
                  "measured flow on F3).", timeout=4)
        return

    def closed(answer: Closing | None) -> None:
        if answer is None:
            return
        day, notes = answer

        def change(new: Site) -> None:
            close_visit(new, day, notes)

        app.edit(f"Close the visit of {day}", change)
        ui.notify(f"Visit of {day} kept; the readings are clear for the next one "
                  "(Ctrl+Z brings them back).", timeout=5)

    ui.push_screen(CloseVisitScreen(site), closed)


__all__ = ["CloseVisitScreen", "ask_close_visit", "what_moves"]
