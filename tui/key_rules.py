"""What the app's own keys can do now: greyed out (never hidden) when they cannot — undo with
nothing to undo, save with nothing unsaved, the screen already shown — and why, said when
such a key is pressed; and the footer's keys redrawn once typing pauses, only when that
changed (the footer rebuilds itself on a refresh: too slow for every keystroke).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from .screens.registry import TITLES
from .workspace import workspace

if TYPE_CHECKING:
    from textual.app import App
    from textual.timer import Timer

KEYS_DELAY = 0.25
"""Seconds of quiet before the footer shows which keys are available now."""


class KeyRules:
    """The app's keys against the app's state now."""

    def __init__(self, app: App[Any]) -> None:
        self.app = app
        self._timer: Timer | None = None
        self._state: tuple[object, ...] | None = None

    def available(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Whether an app action can run on the screen below any dialog (None: greyed)."""
        session = workspace(self.app).session
        if action == "show" and parameters and parameters[0] == self.app.current_mode:
            return None
        if action == "undo" and not session.undo_stack:
            return None
        if action == "redo" and not session.redo_stack:
            return None
        if action == "save" and not session.dirty and session.path is not None:
            return None
        return True

    def reason(self, action: str, parameters: tuple[object, ...]) -> str:
        """Why a greyed-out app action cannot run now (shown when its key is pressed)."""
        path = workspace(self.app).session.path
        if action == "undo":
            return "Nothing to undo."
        if action == "redo":
            return "Nothing to redo."
        if action == "save" and path is not None:
            return f"Nothing to save: no changes since it was saved to {path.name}."
        if action == "show":
            return f"This is the {TITLES.get(str(parameters[0]), '')} screen."
        return ""

    def refresh(self) -> None:
        """Redraw the footer's keys once typing pauses for :data:`KEYS_DELAY`."""
        if self._timer is not None:
            self._timer.stop()
        self._timer = self.app.set_timer(KEYS_DELAY, self.refresh_now)

    def refresh_now(self) -> None:
        """Redraw the footer's keys now if what is available has changed."""
        app = self.app
        if not app.is_running or not app.screen_stack:
            return  # the app is closing
        ws = workspace(app)
        session, outcome = ws.session, ws.outcome
        state = (bool(session.undo_stack), bool(session.redo_stack), session.dirty,
                 session.path, outcome is not None and outcome.ok, app.current_mode,
                 len(app.screen_stack))
        if state != self._state:
            self._state = state
            app.refresh_bindings()
