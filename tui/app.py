"""The branchwise app: three screens over one site, solved in a worker as the person types.

The one truth is :attr:`BranchwiseApp.session` (the site as typed, with its undo history).
Screens read it and hand edits to :meth:`BranchwiseApp.edit`; every edit bumps ``revision``,
starts a solve in a thread worker (a newer edit makes an older solve's answer stale, and it is
dropped) and schedules a recovery copy. Screens watch ``revision`` and ``outcome`` to redraw.

Heavy modules (numpy, scipy, pint) load in a worker after the first screen is drawn.
"""

from __future__ import annotations

import gc
import time
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import TYPE_CHECKING

_STARTED = time.perf_counter()
# Loading Textual and the app's modules makes tens of thousands of objects that live as long as
# the app, and hardly any garbage: the collector would walk them again and again on the way
# (about a twentieth of the start). It rests until they are loaded.
gc.disable()

try:
    from textual import events  # noqa: E402  (the clock above starts before Textual loads)
    from textual.app import App, SystemCommand  # noqa: E402
    from textual.binding import Binding  # noqa: E402
    from textual.message import Message  # noqa: E402
    from textual.notifications import SeverityLevel  # noqa: E402
    from textual.reactive import reactive  # noqa: E402
    from textual.screen import ModalScreen, Screen  # noqa: E402

    from branchwise.core.errors import inert  # noqa: E402
    from branchwise.core.site.spec import Site  # noqa: E402
    from branchwise.core.storage.settings import Settings  # noqa: E402
    from branchwise.core.units import Units  # noqa: E402

    from .core_loading import load_core  # noqa: E402
    from .files import SiteFiles  # noqa: E402
    from .key_rules import KeyRules  # noqa: E402
    from .keygate import KeyGate, Release  # noqa: E402
    from .keys import APP_KEYS, key_sections, system_commands  # noqa: E402
    from .reader_words import ReaderWords  # noqa: E402
    from .screens.registry import FIRST, SCREENS  # noqa: E402
    from .solving import Solved, SolveRunner  # noqa: E402
    from .state.session import Session, inert_note  # noqa: E402
except BaseException:  # the app cannot load; the process goes on with its collector
    gc.enable()
    raise

if TYPE_CHECKING:  # made by the solve's worker, after the first screen is drawn
    from .state.outcome import Band, Outcome

# What is loaded by now (Textual, the app's modules) lives as long as the app: kept out of the
# collector's full passes, which would otherwise walk it all once while the first screen is
# being built (about a tenth of the start).
gc.freeze()
gc.enable()  # rests once more while the first screen is built (:meth:`_first_screen`)


NOTICE_GONE = 0.3
"""Seconds after a notice's time is up by which it has been taken away (it slides out)."""


class BranchwiseApp(ReaderWords, App[None]):
    """Parallel-branch pipe hydraulics for a walkdown, on the keyboard.

    site_path: the site file to open; None opens the last site, or the bundled demo the first
    time (or when the last site is gone).
    """

    TITLE = "branchwise"
    CSS_PATH = [Path(__file__).parent / "app.tcss",
                # The first screen's own rules, read with the app's: a screen's stylesheet read
                # when the screen is first shown makes Textual parse every stylesheet twice more.
                Path(__file__).parent / "screens" / "split" / "split.tcss"]
    MODES = {s.mode: s.build for s in SCREENS}
    DEFAULT_MODE = FIRST
    BINDINGS = APP_KEYS

    # The app draws nothing itself: its screens watch these and redraw what changed. (A
    # reactive's default repaint would repaint the whole screen for each, several times a
    # keystroke: about a third of a keystroke's time at 120×40.)
    revision: reactive[int] = reactive(0, init=False, repaint=False)
    outcome: reactive[Outcome | None] = reactive(None, init=False, always_update=True,
                                                 repaint=False)
    unit_system: reactive[str] = reactive("si", init=False, repaint=False)
    dirty: reactive[bool] = reactive(False, init=False, repaint=False)
    solving: reactive[bool] = reactive(False, init=False, repaint=False)

    def __init__(self, site_path: Path | str | None = None) -> None:
        super().__init__()
        self.settings = Settings.load()
        self.set_reactive(BranchwiseApp.unit_system, self.settings.unit_system)
        self.good: Outcome | None = None
        """The last outcome without an error: shown greyed while the present one is wrong."""
        self.undone_at = -1
        """The revision an undo or redo made: a field being typed in shows it too
        (:func:`.quiet.show_text`)."""
        self.latest_band: Band | None = None
        """The last uncertainty band the Split screen worked out (exports use it if current)."""
        self.startup_seconds: float | None = None
        self._palette: Screen | None = None
        self.key_gate = KeyGate(self)
        """Keys typed in a burst, handled one after the other (see :mod:`.keygate`)."""
        self.files = SiteFiles(self)
        """Open, save, the recovery copy, exports: everything that touches files."""
        self.key_rules = KeyRules(self)
        """What the app's keys can do now, and the footer redrawn when that changes."""
        self.solver = SolveRunner(self)
        """The solve of each revision, in a worker."""
        self._modes[FIRST] = self._first_screen
        site, note, self._remember_on_start = self.files.first_site(
            Path(site_path) if site_path else None)
        self.session = Session(site)
        problems = [f"Settings: {p}" for p in self.settings.problems]
        self._note = "\n".join(filter(None, [note, _data_dir_note(), *problems,
                                              inert_note(self.session)]))

    def _first_screen(self) -> Screen:
        """The first screen, its styles taken as current: its stylesheet was read with the
        app's, and Textual would otherwise parse every stylesheet once more for a first screen
        opened through the modes (its count of style updates starts behind the app's)."""
        gc.disable()  # until the screen is drawn (:meth:`_first_paint`, or :meth:`on_unmount`)
        self.stylesheet.update(self)
        screen = next(s.build() for s in SCREENS if s.mode == FIRST)
        screen._css_update_count = self._css_update_count
        return screen

    # ---- keys, one after the other (see :mod:`.keygate`) -----------------------------------

    async def on_event(self, event: events.Event) -> None:
        if isinstance(event, events.Key):
            if not event.is_forwarded and self.key_gate.hold(event):
                return  # let go in its turn
            await super().on_event(event)
            if event.is_forwarded:
                self.key_gate.handled(event)
            return
        await super().on_event(event)

    def post_message(self, message: Message) -> bool:
        gate = getattr(self, "key_gate", None)  # None while Textual's __init__ runs
        if gate is not None:
            gate.arrived(message)
        return super().post_message(message)

    async def on_release(self, _: Release) -> None:
        await self.key_gate.turn()

    def notify(self, message: str, *, title: str = "", severity: SeverityLevel = "information",
               timeout: float | None = None, markup: bool = False) -> None:
        """A notice, its text shown as it is: a name or path in it is neither markup nor able
        to send the terminal a command (control characters escaped). Once it has gone the
        screen is drawn whole again: Textual takes the notice away but leaves it on the
        terminal until something else covers it."""
        super().notify(inert(message), title=inert(title), severity=severity, timeout=timeout,
                       markup=markup)
        shown = self.NOTIFICATION_TIMEOUT if timeout is None else timeout
        self.set_timer(shown + NOTICE_GONE, self.refresh)

    # ---- state the screens read --------------------------------------------------------------

    @property
    def site(self) -> Site:
        return self.session.site

    @property
    def units(self) -> Units:
        """How this person reads quantities: the unit system and the units chosen per kind."""
        return Units(self.unit_system, self.settings.display_units)

    # ---- start ----------------------------------------------------------------------------------

    def on_mount(self) -> None:
        from . import shutdown

        shutdown.install(self, self.files)  # SIGTERM, SIGHUP: keep the work, end cleanly
        theme = self.settings.theme
        if theme is not None and theme in self.available_themes:
            self.theme = theme  # the theme chosen last time (Ctrl+P, "Change theme")
        elif theme is not None:
            self._note = "\n".join(filter(None, [self._note, f"Settings: no theme '{theme}' "
                                                              "here; the default is used."]))
        self.sub_title = self._subtitle()
        self.call_after_refresh(self._first_paint)

    def on_unmount(self) -> None:
        from . import shutdown

        gc.enable()  # if the app closes before its first screen was drawn

        shutdown.remove()
        self.files.recovery.keeper.release()  # a copy left now is offered to the next start

    def _first_paint(self) -> None:
        gc.enable()
        self.startup_seconds = time.perf_counter() - _STARTED
        self.log(f"branchwise: first screen drawn {self.startup_seconds * 1000:.0f} ms after "
                 "the app module started loading")
        from .screens.work_screen import WorkScreen

        for stack in self._screen_stacks.values():
            for screen in stack:
                if isinstance(screen, WorkScreen):
                    screen.add_footer()
        if self._note:
            self.notify(self._note, severity="warning", timeout=8)
        if self._remember_on_start:
            self.save_settings()  # so that a plain `branchwise` comes back to this site
        load_core(solver=False)
        self.request_solve()
        self.files.offer_recovery()

    # ---- edits ------------------------------------------------------------------------------

    def edit(self, label: str, change: Callable[[Site], object], key: str = "") -> None:
        """Apply ``change`` to a copy of the site, make it the site, and solve again."""
        self.session.edit(label, change, key)
        self.site_changed()

    def site_changed(self) -> None:
        """After any change of the site: tell the screens, solve, keep a recovery copy."""
        self.revision = self.session.revision
        self.dirty = self.session.dirty
        self.sub_title = self._subtitle()
        self.request_solve()
        self.files.schedule_recovery()
        self.refresh_keys()

    def _subtitle(self) -> str:
        return f"{self.site.title}{' ●' if self.session.dirty else ''}"

    # ---- solving --------------------------------------------------------------------------------

    def request_solve(self) -> None:
        self.solving = True
        self.solver.start(self.session.site, self.session.revision)

    def on_solved(self, message: Solved) -> None:
        outcome = message.outcome
        if outcome.revision != self.session.revision:
            return  # an answer for a site that has changed since
        if outcome.ok:
            self.good = outcome
        self.solving = False
        self.outcome = outcome
        self.refresh_keys()

    # ---- screens and keys -----------------------------------------------------------------------

    def refresh_keys(self) -> None:
        """Redraw the footer's keys once typing pauses (:class:`~.key_rules.KeyRules`)."""
        self.key_rules.refresh()

    async def action_show(self, mode: str) -> None:
        if not self.is_running:  # a switch asked for as the app shuts down (a key that closed
            return               # a dialog, then Ctrl+Q): Textual's shutdown iterates the modes
        if mode in self.MODES and self.current_mode != mode:
            # Awaited, so that the next key (Ctrl+Q typed at once) finds the switch done:
            # Textual's shutdown cannot take a screen that is still being added.
            await self.switch_mode(mode)
            self.refresh_bindings()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Grey out (None) what cannot be done now; hide nothing. Under a dialog, the command
        palette included, the app's keys stand aside (False): the dialog's own keys work, and
        no dialog opens over one that is closing (a dialog closes by taking the top screen
        off, so it would close the newcomer instead of itself)."""
        if action in self._own_actions() and isinstance(self.screen, ModalScreen):
            return False
        return self.available(action, parameters)

    def available(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Whether an app action can run on the screen below any dialog (None: greyed)."""
        return self.key_rules.available(action, parameters)

    def unavailable_reason(self, action: str, parameters: tuple[object, ...]) -> str:
        """Why a greyed-out app action cannot run now (shown when its key is pressed)."""
        return self.key_rules.reason(action, parameters)

    @classmethod
    def _own_actions(cls) -> set[str]:
        return {b.action.split("(")[0] for b in cls.BINDINGS if isinstance(b, Binding)}

    def action_undo(self) -> None:
        label = self.session.undo()
        if label is not None:
            self.undone_at = self.session.revision  # shown in a field being typed in too
            self.site_changed()
            self.notify(f"Undone: {label}", timeout=3)

    def action_redo(self) -> None:
        label = self.session.redo()
        if label is not None:
            self.undone_at = self.session.revision  # shown in a field being typed in too
            self.site_changed()
            self.notify(f"Redone: {label}", timeout=3)

    def action_toggle_units(self) -> None:
        self.unit_system = "us" if self.unit_system == "si" else "si"
        self.settings.unit_system = self.unit_system
        self.settings.display_units.clear()  # the per-quantity choices belong to one system
        self.save_settings()
        self.notify(f"Showing {'US customary' if self.unit_system == 'us' else 'SI'} units",
                    timeout=3)

    def action_unit_choices(self) -> None:
        from .screens.units import UnitsScreen

        def chosen(units: dict[str, str] | None) -> None:
            if units is None:
                return
            self.settings.display_units = units
            self.save_settings()
            self.mutate_reactive(BranchwiseApp.unit_system)

        self.push_screen(UnitsScreen(self.unit_system, dict(self.settings.display_units)), chosen)

    def action_help(self) -> None:
        from .screens.help import HelpScreen

        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen(key_sections(self)))

    # ---- files (see :class:`~.files.SiteFiles`) ------------------------------------------------

    def action_save(self) -> None:
        self.files.save()

    def action_save_as(self) -> None:
        self.files.save_as()

    def action_open_sites(self) -> None:
        self.files.open_sites()

    async def action_quit(self) -> None:
        self.files.quit()

    def export(self, fmt: str) -> None:
        """Write the walkdown record (``markdown``), the report (``html``) or the CSV (``csv``)
        of the answer."""
        self.files.export(fmt)

    # ---- the command palette -------------------------------------------------------------------

    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        """Every action of the present screen and of the app, plus Textual's own."""
        return system_commands(self, screen)

    def action_command_palette(self) -> None:
        """Textual's palette, closing once; not a second one while the last one is still
        being taken down (a burst of Ctrl+P, Esc, Ctrl+P)."""

        from .screens.palette import Palette

        last = self._palette
        if not self.use_command_palette or self.screen.has_class("--textual-command-palette") or (
                last is not None and last.is_attached):
            return
        self._palette = Palette(id="--command-palette")
        self.push_screen(self._palette)

    def action_rename(self) -> None:
        from .screens.record import edit_site_details

        edit_site_details(self, self)

    def action_cautions(self) -> None:
        from .screens.cautions import CautionsScreen

        if not isinstance(self.screen, CautionsScreen):
            self.push_screen(CautionsScreen())

    def watch_theme(self, theme: str) -> None:
        """Keep the theme chosen in the settings, for the next start."""
        if theme != self.settings.theme and self.is_running:
            self.settings.theme = theme
            self.save_settings()

    def deliver_screenshot(self, filename: str | None = None, path: str | None = None,
                           time_format: str | None = None) -> str | None:
        """Textual's screenshot command: saved in a folder that exists (the data folder, or
        the current one), and the app says where."""
        from .copying import save_screenshot

        saved = save_screenshot(self)
        return None if saved is None else str(saved)

    def save_settings(self) -> None:
        from branchwise.core.errors import InputError

        try:
            self.settings.save()
        except (InputError, OSError) as exc:
            self.notify(f"Settings not saved: {exc}", severity="warning")


def _data_dir_note() -> str:
    """What is wrong with the data folder (a file where it should be), to say at start."""
    from branchwise.core.storage.paths import data_dir_problem

    problem = data_dir_problem()
    return f"Nothing can be saved: {problem}." if problem else ""


def main(site_path: Path | str | None = None) -> None:
    """Run the app on ``site_path`` (None: the last site, or the demo)."""
    BranchwiseApp(site_path).run()


if __name__ == "__main__":
    import sys

    main(sys.argv[1] if len(sys.argv) > 1 else None)
