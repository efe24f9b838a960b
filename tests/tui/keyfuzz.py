"""Random key sequences through the app, checked after every run: the driver behind
``test_random_keys.py`` and its regression tests.

A sequence is a list of tokens: a key name Textual knows (``enter``, ``ctrl+z``, ``f3``), a single
character, or a short text typed key by key (``kPa``, ``3 in sch 40``). :func:`draw_keys` makes
one from a seed, :func:`drive` plays it (starting the app again whenever a quit ends it, as a
person would) and returns what went wrong, so that a failure can print its seed and keys and be
replayed with ``drive(keys)``.

Nothing here writes outside the test's own folder: every file write of the app goes through
:func:`branchwise.core.storage.atomic.atomic_write_text`, which the sandbox refuses (the way a
read-only folder would) for any path outside the test's folder. The app runs as the same user
as the tests, so a typed ``/x`` in a save dialog must not reach the real file system.
"""

from __future__ import annotations

import asyncio
import random
import time
import unicodedata
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

from app_waits import workers_done
from textual import events
from textual.keys import _character_to_key, _get_unicode_name_from_key
from textual.screen import ModalScreen
from textual.worker import Worker, WorkerState

# Where each sequence begins: the key(s) that bring up the screen or dialog under test.
STARTS: dict[str, tuple[str, ...]] = {
    "liquid": ("f2",),
    "branches": ("f3",),
    "split": ("f4",),
    "help": ("f1",),
    "sites": ("ctrl+o",),
    "units": ("f6",),
    "save-as": ("ctrl+r",),
    "cautions": ("f7",),
    "branch-form": ("f3", "e"),
    "new-branch": ("f3", "a"),
    "site-details": ("f8",),
    "history": ("f5",),
    "close-visit": ("f5", "v"),
    # Reached in the large run only (the CI run keeps to the ones above).
    "palette": ("ctrl+p",),
    "record": ("f4", "r"),
    "find-diameter": ("f4", "f", "down", "enter"),
    "tolerances": ("f4", "l"),
}
CI_TOURS = (("liquid", "help"), ("branches", "sites"), ("split", "units", "history"),
            ("save-as", "branch-form", "close-visit"), ("cautions", "new-branch", "site-details"))
"""The CI run: every start above 'palette', two to an app start."""

APP_KEYS = ("f1", "question_mark", "f2", "f3", "f4", "f5", "f6", "f7", "exclamation_mark",
            "ctrl+s", "ctrl+r", "ctrl+o", "ctrl+t", "ctrl+z", "ctrl+y", "ctrl+q", "ctrl+p",
            "ctrl+c")
SCREEN_KEYS = ("g", "v", "f", "t", "r", "c", "e", "a", "x", "s", "m", "k", "q", "y", "n", "d", "i",
               "delete", "shift+up", "shift+down", "left_square_bracket",
               "right_square_bracket", "ctrl+n", "slash")
EDIT_KEYS = ("enter", "enter", "escape", "escape", "tab", "shift+tab", "up", "down", "left",
             "right", "home", "end", "pageup", "pagedown", "backspace", "backspace", "delete",
             "space", "ctrl+u", "ctrl+a", "ctrl+e", "ctrl+k")
TEXTS = ("kPa", "psi", "gpm", "L/s", "m3/h", "bar", "ftH2O", "m", "ft", "mm", "in", "degC",
         "degF", "cP", "cSt", "%", "3 in sch 40", "DN80", "1-1/2 type L", "0.045 mm",
         "commercial-steel aged", "elbow-90 4", "Kv 160", "Cv 110", " ", ".", "-", "e", "1e3",
         "0", "12.5", "250 ft", "76 m", "60 degC", "400 gpm", "water", "custom", "x")
JUNK = ("ctrl+w", "ctrl+x", "ctrl+v", "ctrl+d", "ctrl+b", "ctrl+f", "ctrl+g", "ctrl+l",
        "ctrl+h", "ctrl+j", "insert", "f8", "f9", "f10", "f11", "f12", "alt+x",
        "shift+left", "shift+right", "ctrl+left", "ctrl+right", "µ", "°", "²", "½", "é", "€",
        "∞", "😀", "\u200b", "\t", "'", '"', "[", "]", "{", "=", "#", "\\", "~", "/", "nan",
        "inf", "-0", "1e308", "999999999999999999999", "0.0000000001", "@", "<", ">")
DIGITS = tuple("0123456789")
LETTERS = tuple("abcdefghijklmnopqrstuvwxyzAKLMPSV")
GROUPS = ((DIGITS, 20), (TEXTS, 12), (LETTERS, 10), (EDIT_KEYS, 26), (SCREEN_KEYS, 14),
          (APP_KEYS, 10), (JUNK, 8))
ANSWERS = ("s", "n", "escape", "enter", "y", "r", "d")
"""Keys drawn right after a quit: the question it may ask is answered at random."""

def _is_key(token: str) -> bool:
    """True for a token pressed as one key (a key name or one character)."""
    return len(token) == 1 or token in _KEY_NAMES


_KEY_NAMES = frozenset(k for k in (*APP_KEYS, *SCREEN_KEYS, *EDIT_KEYS, *JUNK, *ANSWERS)
                       if len(k) > 1 and (k.isidentifier() or "+" in k) and k not in
                       ("nan", "inf"))


def draw_keys(seed: int, start: str, count: int) -> list[str]:
    """``count`` random tokens after the keys that open ``start``, from ``seed``."""
    rng = random.Random(seed)
    groups, weights = [g for g, _ in GROUPS], [w for _, w in GROUPS]
    keys = list(STARTS[start])
    while len(keys) < count + len(STARTS[start]):
        if rng.random() < 0.03:  # come back to the screen under test now and then
            keys += STARTS[start]
            continue
        key = rng.choice(rng.choices(groups, weights)[0])
        keys.append(key)
        if key == "ctrl+q":
            keys.append(rng.choice(ANSWERS))
    return keys


def draw_tour(seed: int, starts: tuple[str, ...], count: int) -> list[str]:
    """One sequence through several starts: for each, its opening keys and ``count`` random
    tokens (one app start for all of them: app starts are the costly part of a short run)."""
    keys: list[str] = []
    for k, start in enumerate(starts):
        keys += draw_keys(seed * 100 + k, start, count)
    return keys


@dataclass
class Report:
    """What one sequence did and what went wrong (``problems`` empty: all well)."""

    keys: list[str]
    problems: list[str] = field(default_factory=list)
    pressed: int = 0
    runs: int = 0
    quits: int = 0
    saves: list[Path] = field(default_factory=list)
    seconds: float = 0.0
    internal: list[str] = field(default_factory=list)

    def describe(self, seed: int | None = None, start: str = "") -> str:
        head = f"seed={seed} start={start!r} " if seed is not None else ""
        return (f"{head}after {self.pressed} of {len(self.keys)} keys, {self.runs} app run(s):\n"
                + "\n".join(f"  - {p}" for p in self.problems)
                + f"\nreplay: keyfuzz.drive({self.keys!r})")


class Sandbox:
    """Refuse app file writes outside ``root``; remember every site saved."""

    def __init__(self, root: Path, monkeypatch) -> None:
        import branchwise.core.site.write as sitewrite
        import branchwise.core.storage.atomic as atomic
        import branchwise.core.storage.toml_files as tomlfile
        from branchwise.core.errors import InputError

        self.root = root.resolve()
        self.saved: list[Path] = []
        real_write, real_save = tomlfile.atomic_write_text, sitewrite.save_site

        def guarded_write(path, text, *, backup=True, **options):
            target = Path(path).absolute()
            if not target.resolve().is_relative_to(self.root):
                # What atomic_write_text itself says when the folder is not writable.
                raise InputError(target.name, str(target), "could not save: Permission denied")
            return real_write(path, text, backup=backup, **options)

        def recorded_save(site, path, overwrite=False):
            written = real_save(site, path, overwrite=overwrite)
            self.saved.append(Path(written))
            return written

        monkeypatch.setattr(tomlfile, "atomic_write_text", guarded_write)
        monkeypatch.setattr(atomic, "atomic_write_text", guarded_write)
        monkeypatch.setattr(sitewrite, "save_site", recorded_save)
        home = root / "home"
        home.mkdir(parents=True, exist_ok=True)
        monkeypatch.setenv("HOME", str(home))  # a typed ~/x stays inside
        monkeypatch.setenv("XDG_DOWNLOAD_DIR", str(home))
        work = root / "cwd"
        work.mkdir(exist_ok=True)
        monkeypatch.chdir(work)  # a typed a/b.toml stays inside

    def site_files(self, data_dir: Path) -> list[Path]:
        """Every file that should hold a site: saved ones, the sites and recovery folders,
        and the backups kept beside them."""
        found = set(self.saved)
        for folder in (data_dir / "sites", data_dir / "recovery"):
            if folder.is_dir():
                found.update(folder.glob("*.toml"))
        found.update(p.with_name(p.name + ".bak") for p in list(found))
        return sorted(p for p in found if p.is_file())

    def broken_sites(self, data_dir: Path) -> list[str]:
        from branchwise.core.errors import InputError
        from branchwise.core.site.read import load_site

        broken = []
        for path in self.site_files(data_dir):
            try:
                load_site(path)
            except InputError as exc:
                broken.append(f"site file {path} does not load: {exc}")
        return broken


def _is_exited(app) -> bool:
    return bool(app._exit or app._closing or app._closed or app._exception is not None)


def _key_event(key: str) -> events.Key:
    """The event a terminal sends for ``key`` (as Pilot builds it)."""
    if len(key) == 1 and not key.isalnum():
        key = _character_to_key(key)
    try:
        char: str | None = unicodedata.lookup(_get_unicode_name_from_key(key))
    except KeyError:
        char = key if len(key) == 1 else None
    return events.Key(key, char)


async def _press(pilot, token: str, before: Callable[[str], None] | None = None) -> None:
    """Send the key(s) of ``token`` and wait until the screen has handled them; ``before`` is
    told each key just before it is sent.

    Quicker than ``Pilot.press``, which also waits for the process to go idle after every key
    (at least 40 ms, and up to a second while a solve runs in its thread): here the solves
    arrive while the next keys are typed, as they do for a quick typist.
    """
    app = pilot.app
    for key in [token] if _is_key(token) else list(token):
        if before is not None:
            before(key)
        event = _key_event(key)
        event.set_sender(app)
        app._driver.send_message(event)
        await _wait_for_screens(pilot)


async def _wait_for_screens(pilot) -> None:
    """Wait until the screen on top has handled what it was sent, and again for a screen that
    a key brought up (so that the next key goes to the screen a person would see)."""
    app = pilot.app
    for _ in range(6):
        stack = (app.current_mode, tuple(app.screen_stack))
        await pilot._wait_for_screen()
        if (app.current_mode, tuple(app.screen_stack)) == stack:
            return


async def _one_app(keys: list[str], at: int, report: Report, size: tuple[int, int]) -> int:
    """Start the app and play ``keys[at:]`` until they end or the app quits; returns the
    index of the next key to play."""
    from branchwise.tui.app import BranchwiseApp, Solved
    from branchwise.tui.screens.dialogs import ChoiceScreen

    workers: set[Worker] = set()

    def hook(message: object) -> None:
        if isinstance(message, Worker.StateChanged):
            workers.add(message.worker)
        elif isinstance(message, Solved) and message.outcome.error is not None:
            text = str(message.outcome.error)
            if text.startswith("internal error"):
                report.internal.append(text)

    app = BranchwiseApp()
    report.runs += 1
    exited_by = ""
    clean_quit = False  # Ctrl+Q typed with nothing unsaved
    answers: list[tuple[str, str]] = []  # (question, answer) of every choice made

    def before(key: str) -> None:
        nonlocal clean_quit
        if key == "ctrl+q" and not app.session.dirty:
            clean_quit = True

    choose = ChoiceScreen.action_choose

    def recorded(screen: ChoiceScreen, value: str) -> None:
        answers.append((screen.title_text, value))
        choose(screen, value)

    ChoiceScreen.action_choose = recorded  # type: ignore[method-assign]
    try:
        async with app.run_test(size=size, message_hook=hook) as pilot:
            await pilot.pause()
            while at < len(keys):
                token = keys[at]
                at += 1
                report.pressed += 1
                await _press(pilot, token, before)
                if _is_exited(app):
                    exited_by = token
                    answered = any(q == "Unsaved changes" and a in ("drop", "save")
                                   for q, a in answers)
                    if app._exception is None and app.session.dirty and not (
                            clean_quit or answered):
                        report.problems.append(
                            f"the app quit on {token!r} (key {at}) with unsaved changes and "
                            "without asking")
                    break
            if not exited_by:
                await _check_alive(pilot, report)
    except Exception as exc:  # the app's own unhandled exception, re-raised by run_test
        report.problems.append(f"unhandled {type(exc).__name__}: {exc} (near key {at}, "
                               f"{keys[at - 1]!r})")
        return len(keys)
    finally:
        ChoiceScreen.action_choose = choose  # type: ignore[method-assign]
    if app._exit_renderables:
        report.problems.append("Textual's error display was filled on exit")
    if app.return_code not in (None, 0):
        report.problems.append(f"the app ended with return code {app.return_code}")
    for worker in workers:
        if worker.state == WorkerState.ERROR:
            report.problems.append(f"worker {worker.name!r} crashed: {worker.error!r}")
    if exited_by:
        report.quits += 1
    return at


async def _check_alive(pilot, report: Report) -> None:
    """Close every dialog with Esc, then F3 and F4 must switch screens and a solve finish."""
    from branchwise.tui.screens.branches.screen import BranchesScreen
    from branchwise.tui.screens.split.screen import SplitScreen

    app = pilot.app
    await pilot.pause()  # a dialog the last keys asked for is up before it is closed
    for _ in range(12):
        if not isinstance(app.screen, ModalScreen):
            break
        # Esc closes a dialog; a form with edits asks first, and "d" drops them.
        drop = getattr(app.screen, "title_text", "") == "Drop the changes?"
        await pilot.press("d" if drop else "escape")
        await pilot.pause()
    if isinstance(app.screen, ModalScreen):
        report.problems.append(f"Esc does not close {type(app.screen).__name__}")
        return
    await pilot.press("f3")
    if not isinstance(app.screen, BranchesScreen):
        report.problems.append(f"F3 did not show the Branches screen ({app.screen!r})")
    await pilot.press("f4")
    if not isinstance(app.screen, SplitScreen):
        report.problems.append(f"F4 did not show the Split screen ({app.screen!r})")
    for _ in range(200):
        await pilot.pause()
        await workers_done(app)
        await pilot.pause()
        outcome = app.outcome
        if outcome is not None and outcome.revision == app.session.revision and not app.solving:
            return
    report.problems.append("no answer for the present site after the keys: the solve is stuck")


async def drive_async(keys: list[str], *, size: tuple[int, int] = (80, 24),
                      sandbox: Sandbox | None = None, data_dir: Path | None = None,
                      timeout: float = 90.0, max_runs: int = 8) -> Report:
    """Play ``keys``; start the app again after a quit (at most ``max_runs`` times)."""
    report = Report(list(keys))
    started = time.perf_counter()

    async def play() -> None:
        at = 0
        while at < len(keys) and report.runs < max_runs:
            at = await _one_app(keys, at, report, size)

    try:
        await asyncio.wait_for(play(), timeout)
    except TimeoutError:
        report.problems.append(f"no progress for {timeout:.0f} s: a hang "
                               f"(after {report.pressed} keys)")
    report.seconds = time.perf_counter() - started
    report.problems += [f"internal error shown: {t}" for t in report.internal]
    if sandbox is not None and data_dir is not None:
        report.problems += sandbox.broken_sites(data_dir)
    return report


def drive(keys: list[str], **options) -> Report:
    return asyncio.run(drive_async(keys, **options))
