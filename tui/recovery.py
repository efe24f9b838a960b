"""The app's recovery copy: unsaved work kept on disk while there is some, offered back.

Every change schedules a copy (written atomically in a worker, a second after the typing
stops); an undo back to the saved state drops it at once, so that it is never offered stale. The
copies are this instance's own (:mod:`branchwise.core.storage.recovery`: one per running
instance, under its owner mark, readable by the owner only); a copy left by an instance that
ended without saving is offered when its site is opened, one held by an instance that still runs
is only mentioned.
"""

from __future__ import annotations

import threading
from datetime import datetime
from pathlib import Path

from textual.app import App
from textual.timer import Timer

from branchwise.core.errors import InputError, inert
from branchwise.core.site.read import parse_site
from branchwise.core.site.spec import Site
from branchwise.core.storage.recovery import Copy, Keeper

from .core_loading import core_imports
from .state.values import shown_path
from .workspace import workspace

RECOVERY_DELAY = 1.0
"""Seconds of quiet after a change before the recovery copy is written."""


class Recovery:
    """This instance's recovery copy of the present site (the app's files service holds one)."""

    def __init__(self, app: App[None]) -> None:
        self.app = app
        self.ws = workspace(app)
        self._recovery_timer: Timer | None = None
        self.keeper = Keeper()
        """This instance's recovery copies (its own, under its own owner mark)."""
        self._copy_lock = threading.Lock()
        self._generation = 0
        """Goes up when the copy is dropped: a copy being written for an older one is not."""

    def copy_path(self) -> Path:
        """This instance's copy of the present site (see :mod:`~branchwise.core.storage.
        recovery`: one copy per running instance, never another's touched)."""
        return self.keeper.copy_path(self.ws.session.path)

    def schedule(self) -> None:
        """After a change: write the copy once typing pauses; with nothing unsaved (an undo
        back to the saved state) the copy goes at once, so that it is never offered stale."""
        if self._recovery_timer is not None:
            self._recovery_timer.stop()
            self._recovery_timer = None
        if not self.ws.session.dirty:
            self.drop()
            return
        self._recovery_timer = self.app.set_timer(RECOVERY_DELAY, self.write)

    def write(self) -> None:
        if not self.ws.session.dirty:
            self.drop()
            return
        self._write_recovery(self.ws.session.site, self._generation)

    def _write_recovery(self, site: Site, generation: int) -> None:
        """Write the copy in a thread worker (one at a time: a newer copy replaces an older);
        a copy dropped meanwhile (saved, undone) is not written again."""
        def write() -> None:
            with core_imports():  # throughout the text's making (tomlkit loads on first use)
                from branchwise.core.site.write import dump_site

                text = dump_site(site)
            try:
                with self._copy_lock:
                    if generation == self._generation:
                        self.keeper.write(site.source, text)
            except InputError as exc:
                self.app.call_from_thread(self.app.notify, f"Recovery copy not written: {exc}",
                                          severity="warning")

        self.app.run_worker(write, thread=True, exclusive=True, exit_on_error=False,
                            group="recovery")

    def write_now(self) -> bool:
        """Write the copy at once, in this thread (a signal ends the app): True if written or
        nothing was unsaved."""
        from branchwise.core.site.write import dump_site

        if not self.ws.session.dirty:
            return True
        site = self.ws.session.site
        try:
            text = dump_site(site)
            with self._copy_lock:
                self.keeper.write(site.source, text)
        except (InputError, OSError):
            return False
        return True

    def drop(self) -> None:
        """Delete this instance's copy of the present site."""
        self.drop_copy_of(self.ws.session.path)

    def drop_copy_of(self, site_path: Path | None) -> None:
        """Delete this instance's copy of ``site_path`` (a copy being written is not kept)."""
        if self._recovery_timer is not None:
            self._recovery_timer.stop()
            self._recovery_timer = None
        with self._copy_lock:
            self._generation += 1
            try:
                self.keeper.drop(site_path)
            except OSError as exc:
                self.app.notify(f"Could not remove the recovery copy: {exc}", severity="warning")

    def offer(self) -> None:
        """If a copy of this site was left by an instance that ended without saving, offer to
        bring it back (the newest; older ones stay in the recovery folder, and the question
        says how many). Copies held by instances that still run are only mentioned."""
        path = self.ws.session.path
        busy = self.keeper.held_by_others(path)
        if busy:
            pids = ", ".join(str(c.pid) for c in busy)
            self.app.notify(f"Another branchwise (process {pids}) has unsaved changes to this "
                            "site: saving here may replace them.", severity="warning",
                            timeout=8)
        left = self.keeper.left_behind(path)
        if left:
            self._offer(left[0], path, len(left) - 1)

    def _offer(self, copy: Copy, site_path: Path | None, more: int = 0) -> None:
        from .screens.dialogs import ChoiceScreen

        try:
            text = self.keeper.read(copy)
            recovered = parse_site(text, copy.path)
        except InputError as exc:
            self.app.notify(f"A recovery copy could not be read ({exc}); it is left at "
                            f"{copy.path}.", severity="warning")
            return
        when = datetime.fromtimestamp(copy.modified).strftime("%Y-%m-%d %H:%M")
        older = ""
        if site_path is not None:
            try:
                saved_at = site_path.stat().st_mtime
            except OSError:
                saved_at = 0.0
            if saved_at > copy.modified:
                older = (f" The file was saved after it, at "
                         f"{datetime.fromtimestamp(saved_at).strftime('%Y-%m-%d %H:%M')}: "
                         "restoring brings back the older work (the file keeps a .bak when "
                         "you save).")

        def answer(choice: str | None) -> None:
            if choice == "restore":
                recovered.source = self.ws.session.path
                recovered.origin = self.ws.session.site.origin
                self.ws.session.replace(recovered)
                self.ws.session.mark_unsaved()  # restored work is unsaved work
                self.ws.site_changed()
                if self.write_now():  # ours now: the copy left behind can go
                    self._discard(copy)
                self.app.notify("Restored the unsaved changes.")
            elif choice == "discard":
                self._discard(copy)

        others = (f" ({more} older cop{'y' if more == 1 else 'ies'} of this site stay in "
                  f"{shown_path(copy.path.parent)}.)" if more else "")
        question = (f"Unsaved changes to “{inert(recovered.title)}” from {when} were kept in a "
                    f"recovery copy by a branchwise that ended without saving.{older} Bring "
                    f"them back?{others}")
        self.app.push_screen(ChoiceScreen("Recovered work", question,
                                          [("r", "restore", "Restore them"),
                                           ("d", "discard", "Discard them"),
                                           ("escape", "later", "Decide later")]), answer)

    def _discard(self, copy: Copy) -> None:
        try:
            copy.path.unlink(missing_ok=True)
        except OSError as exc:
            self.app.notify(f"Could not remove the recovery copy {copy.path}: {exc}",
                            severity="warning")
