"""The app's file actions: open, save, save as, the recovery copy, export, quit.

Unsaved work is never lost: every change schedules a recovery copy (written atomically in a
worker, a second after the typing stops); quitting or opening another site with unsaved changes
asks first; a recovery copy found at start-up is offered back. Saving goes through
:func:`branchwise.core.site.read.save_site` (atomic, keeps a ``.bak``, keeps the file's comments).
"""

from __future__ import annotations

import re
from collections.abc import Callable
from datetime import datetime
from pathlib import Path

from textual.app import App

from branchwise.core.errors import InputError, inert
from branchwise.core.site.read import demo_site, load_site
from branchwise.core.site.readings import NoReading
from branchwise.core.site.spec import BranchSpec, ConditionsSpec, FluidSpec, SegmentSpec, Site
from branchwise.core.storage.paths import sites_dir

from .core_loading import core_imports
from .recovery import Recovery
from .state.values import shown_path
from .workspace import workspace


def new_site() -> Site:
    """An empty site to fill in: water at 20 °C and one branch without values."""
    return Site(
        name="New site",
        fluid=FluidSpec(kind="water", temperature="20 degC"),
        conditions=ConditionsSpec(),
        branches=[BranchSpec(name="Branch 1", segments=[SegmentSpec()])],
    )


def file_name_for(title: str) -> str:
    """A file name from a site's title: ``North header`` → ``north-header.toml``."""
    stem = re.sub(r"[^a-z0-9]+", "-", title.casefold()).strip("-")[:60] or "site"
    return f"{stem}.toml"


class SiteFiles:
    """Everything the app does with files: the app holds one (``app.files``) and its file
    actions hand over to it."""

    def __init__(self, app: App[None]) -> None:
        self.app = app
        self.ws = workspace(app)
        """The same app as the workspace it is: the site, the settings, the answer."""
        self.recovery = Recovery(app)
        """This instance's recovery copy of the present site."""

    def first_site(self, path: Path | None) -> tuple[Site, str, bool]:
        """The site to start on, a note to show (a file that could not be opened), and whether
        the settings should remember it (written once the first screen is drawn)."""
        settings = self.ws.settings
        if path is None and settings.last_site is not None:
            path = settings.last_site
            if not path.exists():
                return demo_site(), f"The last site is gone ({path}): opened the demo.", False
        if path is None:
            return demo_site(), "", False
        try:
            site = load_site(path)
        except InputError as exc:
            return demo_site(), f"Could not open {path}: {exc}. Opened the demo instead.", False
        settings.remember_site(path)
        return site, "", True

    # ---- recovery (see :mod:`.recovery`) ------------------------------------------------------

    def recovery_file(self) -> Path:
        return self.recovery.copy_path()

    def schedule_recovery(self) -> None:
        self.recovery.schedule()

    def write_recovery(self) -> None:
        self.recovery.write()

    def write_recovery_now(self) -> bool:
        return self.recovery.write_now()

    def drop_recovery(self) -> None:
        self.recovery.drop()

    def offer_recovery(self) -> None:
        self.recovery.offer()

    # ---- save ---------------------------------------------------------------------------------

    def save(self) -> None:
        def go() -> None:
            if self.ws.session.path is None:
                self.save_as()
            else:
                self.save_to(self.ws.session.path)

        self.unless_wrong(go)

    def unless_wrong(self, go: Callable[[], object],
                     cancel: Callable[[], object] | None = None) -> None:
        """Run ``go`` (a save) at once when every field reads well; with a field in error,
        first ask, saying what the file will hold."""
        from .screens.dialogs import ChoiceScreen

        error = self.input_error()
        if error is None:
            go()
            return

        def answer(choice: str | None) -> None:
            if choice == "save":
                go()
            elif cancel is not None:
                cancel()

        typed = inert(str(error.value))
        question = (f"{self.ws.error_words(error)}.\n\nSaved now, the file keeps “{typed}” as "
                    "typed, and opens with this same message until it is put right.")
        self.app.push_screen(ChoiceScreen("Save with a field in error?", question,
                                          [("s", "save", "Save as it is"),
                                           ("escape", "back", "Go back and fix it")]), answer)

    def input_error(self) -> InputError | None:
        """The error of a field of the present site, if one reads wrong (an answer that does
        not exist for valid values is no such error)."""
        outcome = self.ws.outcome
        if outcome is None or outcome.revision != self.ws.session.revision:
            from .state.outcome import compute

            outcome = compute(self.ws.session.site, self.ws.session.revision)
        if isinstance(outcome.error, NoReading):
            return None  # nothing typed wrong: today's readings are still to come
        return outcome.error if isinstance(outcome.error, InputError) else None

    def save_as(self, then: object = None) -> None:
        from .screens.dialogs import SaveAsScreen

        path = self.ws.session.path
        folder = path.parent if path else sites_dir()
        name = path.name if path else file_name_for(self.ws.site.title)

        def chosen(path: Path | None) -> None:
            if path is not None:
                self.save_to(path, then=then)

        self.app.push_screen(SaveAsScreen(folder, name), chosen)

    def save_to(self, path: Path, overwrite: bool = False,
                then: object = None) -> bool:
        """Save the site to ``path``; asks before replacing a file that is not ours."""
        from branchwise.core.site.write import save_site

        from .screens.dialogs import ChoiceScreen

        old_site = self.ws.session.path
        site = self.ws.session.site
        try:
            save_site(site, path, overwrite=overwrite)
        except InputError as exc:
            if (path.exists() or path.is_symlink()) and not overwrite:
                def answer(choice: str | None) -> None:
                    if choice == "replace":
                        self.save_to(path, overwrite=True, then=then)

                title, question = replace_question(path, exc.reason)
                self.app.push_screen(ChoiceScreen(title, question,
                                              [("y", "replace", "Replace it"),
                                               ("escape", "cancel", "Cancel")]), answer)
            else:
                self.app.notify(str(exc), title="Not saved", severity="error", timeout=10)
            return False
        self.ws.session.mark_saved()
        self.recovery.drop_copy_of(old_site)
        self.ws.settings.remember_site(path)
        self.ws.save_settings()
        self.ws.site_changed()
        self.app.notify(f"Saved {file_and_folder(path)}", timeout=4)
        if callable(then):
            then()
        return True

    # ---- open ---------------------------------------------------------------------------------

    def open_sites(self) -> None:
        from .screens.sites import SitesScreen

        def chosen(choice: Path | str | None) -> None:
            if choice is not None:
                self.leave_site(lambda: self.open_choice(choice), "opening another site")

        self.app.push_screen(SitesScreen(self.ws.settings.recent_sites, self.ws.session.path),
                             chosen)

    def open_choice(self, choice: Path | str) -> None:
        if choice == "demo":
            site = demo_site()
        elif choice == "new":
            site = new_site()
        elif Path(choice).suffix.lower() == ".csv":  # a line list: a new site of its branches
            from .line_list_import import open_line_list

            open_line_list(self.app, Path(choice))
            return
        else:
            try:
                site = load_site(Path(choice))
            except InputError as exc:
                self.app.notify(str(exc), title="Not opened", severity="error", timeout=10)
                return
            self.ws.settings.remember_site(Path(choice))
            self.ws.save_settings()
        self.ws.session.replace(site)
        self.ws.good = None
        self.ws.latest_band = None
        self.ws.site_changed()
        if self.ws.session.made_inert:
            from .state.session import inert_note

            self.app.notify(inert_note(self.ws.session), severity="warning", timeout=8)
        self.offer_recovery()

    def leave_site(self, go: Callable[[], object], doing: str) -> None:
        """Run ``go`` once the present site's changes are saved or knowingly dropped."""
        from .screens.dialogs import ChoiceScreen

        if not self.ws.session.dirty:
            go()
            return

        def answer(choice: str | None) -> None:
            if choice == "save":
                path = self.ws.session.path
                self.unless_wrong(lambda: self.save_as(then=go) if path is None
                                  else self.save_to(path, then=go))
            elif choice == "drop":
                self.drop_recovery()
                go()

        self.app.push_screen(ChoiceScreen(
            "Unsaved changes", f"“{self.ws.site.title}” has unsaved changes. Save them before "
            f"{doing}?", [("s", "save", "Save"), ("n", "drop", "Don't save"),
                          ("escape", "cancel", "Cancel")]), answer)

    def quit(self) -> None:
        self.leave_site(self.app.exit, "quitting")

    # ---- export -------------------------------------------------------------------------------

    def export(self, fmt: str) -> None:
        """Write the Markdown walkdown record (``markdown``), the HTML report (``html``) or
        the CSV (``csv``) of the present results next to the site file (or in the sites
        folder)."""
        from .screens.dialogs import SaveAsScreen

        outcome = self.ws.outcome
        if outcome is None or not outcome.ok:
            self.app.notify("Nothing to export: the site does not solve yet.", severity="warning")
            return
        folder = self.ws.session.path.parent if self.ws.session.path else sites_dir()
        stem = Path(file_name_for(self.ws.site.title)).stem
        suffix = {"markdown": ".md", "html": ".html"}.get(fmt, ".csv")
        name = _free(folder / f"{stem}-{datetime.now():%Y%m%d-%H%M}{suffix}").name
        solved = outcome.solved
        band = self.ws.latest_band
        with_band = (band is not None and band.solved is not None
                     and band.revision == self.ws.session.revision)
        if band is not None and band.solved is not None and with_band:
            solved = band.solved  # the same answer, with its P5–P95 band
        if solved is None:
            return

        # The answer is the site's as it is now: with edits not yet saved, the file alone
        # would not give it back, and the record says so.
        unsaved = self.ws.session.dirty
        saved_at = self.ws.session.path
        reader = self.ws.units

        def chosen(path: Path | None) -> None:
            if path is None:
                return
            with core_imports():
                from branchwise.core.report.csv_report import to_csv
                from branchwise.core.report.markdown import to_markdown
                from branchwise.core.storage.atomic import atomic_write_text

            source = None if saved_at is None else str(saved_at)
            text = (to_markdown(solved, reader, source=source,
                                unsaved=unsaved and saved_at is not None)
                    if fmt == "markdown" else to_csv(solved, reader))
            if fmt == "html":
                with core_imports():
                    from branchwise.core.report.html_report import to_html

                text = to_html(solved, reader, source=source,
                               unsaved=unsaved and saved_at is not None)
            wanted, path = path, _free(path)  # an export never replaces a file
            try:
                atomic_write_text(path, text)
            except InputError as exc:
                self.app.notify(str(exc), title="Not written", severity="error", timeout=10)
                return
            extra = "\nwith the P5–P95 band" if with_band else ""
            if unsaved:
                extra += "\nfrom the site with unsaved changes (Ctrl+S saves them)"
            if path != wanted:
                extra += f"\n({wanted.name} exists and was kept)"
            self.app.notify(f"Wrote {file_and_folder(path)}{extra}", timeout=5)

        title = {"markdown": "Walkdown record (Markdown)",
                 "html": "Walkdown report (HTML)"}.get(fmt, "Results (CSV)")
        self.app.push_screen(SaveAsScreen(folder, name, title=title, suffix=suffix), chosen)


def replace_question(path: Path, reason: str) -> tuple[str, str]:
    """The title and question before a save replaces the file at ``path``."""
    where = file_and_folder(path)
    if reason.startswith("is read-only"):
        return ("Read-only file", f"{where}\nis read-only. Replace it all the same? It stays "
                "read-only; the version replaced is kept as .bak.")
    return "Replace file?", f"{where}\n{reason}. Replace it? (The old one is kept as .bak.)"


def file_and_folder(path: Path) -> str:
    """A written file for a message: its name, then its folder on a line of its own (with
    ``~`` for home), so that a narrow notice never breaks the name in the middle."""
    return f"{path.name}\nin {shown_path(path.parent)}"


def _free(path: Path) -> Path:
    """``path`` if no file is there, else the first free ``name-2``, ``name-3``… beside it."""
    n = 2
    candidate = path
    while candidate.exists():
        candidate = path.with_name(f"{path.stem}-{n}{path.suffix}")
        n += 1
    return candidate
