"""The strip under the title on every screen: what is given, what is sought, and the state.

It reads the app's reactive attributes (``revision``, ``outcome``, ``unit_system``) and redraws
itself when they change, so that the solve mode and the given condition are always in sight.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from rich.console import Console
from rich.text import Text
from textual.timer import Timer
from textual.widgets import Static

from ..state.givens import ALL_WORDS, given_of, given_text, given_words, weighs_all
from ..state.marks import error_mark
from ..state.session import find_of
from ..state.values import text_of
from ..theme import colour
from ..workspace import workspace

if TYPE_CHECKING:
    from ..workspace import Workspace

AREA_KEYS = {"fluid": "F2 Liquid", "branches": "F3 Branches", "conditions": "F4 Split",
             "solve": "F4 Split", "tolerances": "F4 Split, l tolerances", "record": "F8",
             "site": "F3 Branches"}


WAIT = 0.15
"""Seconds a changed site's given waits for its answer before the strip shows it alone."""

ERROR_LINES = 2
"""At most this many lines for an error: one that does not fit on one line is wrapped, so
that its figures (the value typed, the limit) are in sight on a narrow terminal too; a longer
one ends with where to read it whole."""


class StatusStrip(Static):
    """The given condition and the find choice on one line; then the solver's state (an
    error on as many as :data:`ERROR_LINES` lines)."""

    DEFAULT_CSS = """
    StatusStrip { height: auto; padding: 0 1; background: $boost; text-wrap: nowrap; }
    """
    _lines = 2

    _wait: Timer | None = None

    def on_mount(self) -> None:
        app = self.app
        for name in ("outcome", "unit_system", "dirty", "theme"):
            self.watch(app, name, self._redraw, init=False)
        self.watch(app, "revision", self._site_changed, init=False)
        self._redraw()

    def _site_changed(self, *_: object) -> None:
        """The site changed: its answer follows within milliseconds, and the strip is drawn
        once with both (one paint less per keystroke); at the latest after :data:`WAIT`."""
        if self._wait is not None:
            self._wait.stop()
        self._wait = self.set_timer(WAIT, self._redraw)

    def _redraw(self, *_: object) -> None:
        if self._wait is not None:
            self._wait.stop()
            self._wait = None
        width = self.content_size.width or max(1, self.app.size.width - 2)
        text = describe(workspace(self.app), getattr(self.screen, "LISTS_WARNINGS", False),
                        width, self.app.console)
        if self.content != text:
            lines = text.plain.count("\n") + 1
            # A new layout only when an error takes more lines or gives them back.
            self.update(text, layout=lines != self._lines)
            self._lines = lines

    def on_resize(self) -> None:
        self._redraw()


def describe(app: Workspace, on_split: bool = False, width: int | None = None,
             console: Console | None = None) -> Text:
    """The strip's text for the app's present state (``on_split``: the strip of the Split
    screen, where ``w`` lists the warnings); ``width`` (cells): the room on each line, where
    the first line is cut and an error wrapped (None: one line each, uncut)."""
    site = app.session.site
    kind, index = given_of(site)
    value = given_text(site) or ("" if weighs_all(site) else "—")
    given = ALL_WORDS if weighs_all(site) else given_words(site, kind, index)
    find = find_of(site)
    if find == "flows":
        sought = "the flow in every branch"
    else:
        solve = site.solve
        target = text_of(solve.target_flow if solve else None) or "—"
        branch = text_of(solve.branch if solve else None) or "—"
        sought = f"{find} of {branch} for {target}"
    line = Text()
    line.append("Given ", style="dim")
    line.append(f"{given} {value}", style="bold")
    line.append("  Find ", style="dim")
    line.append(sought, style="bold")
    line.append(f"  [{app.unit_system.upper()} ^T]", style="dim")
    if width is not None:
        line.truncate(width, overflow="ellipsis")
    line.append("\n")
    state, where = _state(app, on_split)
    if width is not None and state.cell_len + where.cell_len > width:
        # An error that does not fit: wrapped on the lines it may take, the last cut to leave
        # room for where to read it whole (the Split's message area, the Branches screen's,
        # the field on the Liquid screen).
        lines = list(state.wrap(console or Console(), width, overflow="fold"))
        if len(lines) > ERROR_LINES:
            lines = lines[:ERROR_LINES]
            lines[-1].truncate(max(1, width - where.cell_len - 1))
            lines[-1].rstrip()
            lines[-1].append("…")
        if lines[-1].cell_len + where.cell_len <= width:
            lines[-1].append_text(where)
        state = Text("\n").join(lines)
    else:
        state.append_text(where)
    line.append_text(state)
    line.no_wrap = True
    line.overflow = "ellipsis"
    return line


def _state(app: Workspace, on_split: bool) -> tuple[Text, Text]:
    """The solver's state (solving, the error, or how many branches were solved), and for an
    error, the screen where it is read in full (``  (F3 Branches)``)."""
    line, where = Text(), Text()
    outcome = app.outcome
    if outcome is None:  # (a later answer replaces this line; no flicker while typing)
        line.append("… solving", style="italic dim")
    elif outcome.error is not None:
        from branchwise.core.site.fields import FieldPath  # loaded with the first answer

        mark = error_mark(outcome.error, app.site)
        line.append(f"{mark} {app.error_words(outcome.error)}",
                    style=colour(app, "text-warning") if mark == "○"
                    else f"bold {colour(app, 'text-error')}".strip())
        where = Text(f"  ({AREA_KEYS[FieldPath.parse(outcome.field).area]})", style="dim")
    else:
        n = len(outcome.solved.result.branches) if outcome.solved else 0
        line.append(f"✓ solved {n} branches in {outcome.seconds * 1000:.1f} ms",
                    style=colour(app, "text-success"))
        warnings = len(outcome.solved.result.warnings) if outcome.solved else 0
        if warnings:
            listed = "w lists them" if on_split else "F4"
            line.append(f"  ⚠ {warnings} warning{'s' if warnings > 1 else ''} ({listed})",
                        style=colour(app, "text-warning"))
    return line, where
