"""The site's name and its walkdown record (F8): who took the readings, when, with what.

The values are free text kept in the site file's optional ``[record]`` table (the reports print
them in their header); the solve never reads them. The date field offers today's date: Ctrl+D
puts it in, and the word ``today`` typed there becomes it when the dialog is kept.
"""

from __future__ import annotations

import datetime
from typing import TYPE_CHECKING

from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Label, Static
from textual.widgets.input import Selection

from branchwise.core.site.spec import RecordSpec

from ..modal import Dialog
from ..state.values import text_of
from ..widgets.field import Field
from .dialogs import FORM_HINT, FORM_KEYS

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site

    from ..workspace import Workspace

RECORD_FIELDS = (
    ("technician", "Technician", "who took the readings"),
    ("date", "Date", ""),
    ("pressure_instrument", "Pressure instrument", "e.g. DPG-14, 0-30 psid, cal. 2025-01"),
    ("flow_instrument", "Flow instrument", "e.g. clamp-on meter UFM-2, ±3 % of reading"),
)
"""The keys of the site file's [record] table, with their labels and hints."""
Details = tuple[str, RecordSpec | None]
"""What the dialog gives back: the site's name and its record (None: no record at all)."""


def date_problem(text: str) -> str | None:
    """Why the record's date cannot be kept (None when it can): empty, ``today``, or a real
    calendar date YYYY-MM-DD (a time may follow); 2025-02-30 or 12/03/2025 are refused, as a
    visit's date is, so that what a report prints is a day that exists and reads one way."""
    from branchwise.core.errors import InputError
    from branchwise.core.site.visits import visit_date

    text = " ".join(text.split())
    if not text or text.casefold() == "today":
        return None
    try:
        visit_date(text, "record.date")
    except InputError as exc:
        return f"{exc.reason} or today, got {exc.value}"
    return None


def today() -> str:
    """Today's date as ISO text (2025-03-12), the form a TOML date is read back as."""
    return datetime.date.today().isoformat()


class SiteDetailsScreen(Dialog[Details | None]):
    """Edit the site's name and the walkdown record together; Enter moves to the next field
    and keeps on the last, Esc cancels."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="details-cancel",
                tooltip="Close without changing the name or the record"),
        Binding("ctrl+d", "today", "Today", id="details-today", priority=True,
                tooltip="Put today's date in the date field"),
    ]
    CLOSE_HINT = FORM_HINT
    DEFAULT_CSS = """
    SiteDetailsScreen { align: center middle; }
    SiteDetailsScreen > Vertical {
        width: 84; max-width: 100%; height: auto; border: thick $primary; padding: 0 1;
        background: $surface;
    }
    SiteDetailsScreen .details-title { text-style: bold; }
    SiteDetailsScreen .details-note { color: $text-muted; margin-bottom: 1; }
    SiteDetailsScreen .details-keys { color: $text-muted; margin-top: 1; }
    SiteDetailsScreen .details-message { color: $error; height: auto; display: none; }
    SiteDetailsScreen Field .field-unit { display: none; }
    """

    def __init__(self, name: str, record: RecordSpec | None) -> None:
        super().__init__()
        self.name_text = name
        self.record = record or RecordSpec()

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label("Site and readings", classes="details-title")
            yield Label("The walkdown record's header; nothing here changes the answer.\n"
                        "The instruments' accuracy sets the band: l (Tolerances) on Split.",
                        classes="details-note", markup=False)
            yield Field("Site name", "name", value=self.name_text, id="details-name")
            for key, label, hint in RECORD_FIELDS:
                if key == "date":
                    hint = f"e.g. {today()} (Ctrl+D: today)"
                yield Field(label, f"record.{key}", value=text_of(getattr(self.record, key)),
                            placeholder=hint, id=f"details-{key}")
            yield Static("", classes="details-message", markup=False)
            yield Static(f"{FORM_KEYS}\nCtrl+D: today's date", classes="details-keys",
                         markup=False)

    def on_mount(self) -> None:
        if not self.children:  # the app is closing: nothing was composed
            return
        box = self.query_one("#details-name", Field).input
        box.focus()
        box.selection = Selection(0, len(box.value))  # typing replaces the name at once

    def action_today(self) -> None:
        field = self.query_one("#details-date", Field)
        field.show(today(), force=True)
        field.input.focus()

    def details(self) -> Details:
        """The name and the record as the fields now say (blank fields left out)."""
        values = {f.path: " ".join(f.text.split()) for f in self.query(Field)}
        record = RecordSpec()
        for key, _, _ in RECORD_FIELDS:
            setattr(record, key, values[f"record.{key}"] or None)
        if isinstance(record.date, str) and record.date.casefold() == "today":
            record.date = today()
        empty = all(getattr(record, key) is None for key, _, _ in RECORD_FIELDS)
        return values["name"], None if empty else record

    def on_field_done(self, event: Field.Done) -> None:
        event.stop()
        if event.field.path == "name" and not event.field.text.strip():
            event.field.set_error("type the site's name")
            return
        date_field = self.query_one("#details-date", Field)
        problem = date_problem(date_field.text)
        if problem is not None and (event.field is date_field or not self._has_next(event)):
            date_field.set_error(problem)  # said on Enter in it, and before the dialog closes
            date_field.input.focus()
            return
        event.field.set_error(None)
        if self.next_field(event.field):
            return
        name, record = self.details()
        if not name:
            message = self.query_one(".details-message", Static)
            message.update("Type the site's name.")
            message.display = True
            self.query_one("#details-name", Field).input.focus()
            return
        self.dismiss((name, record))

    def _has_next(self, event: Field.Done) -> bool:
        fields = list(self.query(Field))
        return fields.index(event.field) < len(fields) - 1

    def action_cancel(self) -> None:
        self.dismiss(None)


def edit_site_details(app: Workspace, ui: App[None]) -> None:
    """Open the dialog on the app's site; a change is one undoable edit (saved with the site)."""
    site = app.site

    def kept(details: Details | None) -> None:
        if details is None:
            return
        name, record = details
        if name == site.name and record == site.record:
            return

        def change(new: Site) -> None:
            new.name, new.record = name, record

        app.edit("Site and readings", change)

    ui.push_screen(SiteDetailsScreen(text_of(site.name) or site.title, site.record), kept)
