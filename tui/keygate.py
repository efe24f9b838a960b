"""Keys typed in a burst are handled one after the other, each to the end.

Textual hands a key to the focused widget's own message queue. A letter is used there at once;
any other key (Backspace, Ctrl+A, Ctrl+K, Enter, Esc, F3) bubbles up through the queue of every
container above it before a binding acts on it. While it travels, the keys typed after it are
already being handled: at a terminal that delivers ``Ctrl+A Ctrl+K 62 kPa`` in one read, the
field took ``62 kPa`` first and then went home and cleared itself; ``Enter`` on the branch
table followed by ``7 in sch 40`` sent the letters to the table, not to the cell editor the
Enter was opening. The deeper the widget sits, the more keys overtake.

:class:`KeyGate` holds every key from the terminal in order and lets the next one go only when
the last one has been dealt with: stopped by a widget, or handled by the app after bubbling,
and the present screen's queues empty again (so that a focus move, a dialog or a cell editor
the key opened is in place for the next). A key still in flight after :data:`MAX_WAIT` seconds
lets the next one go anyway: a slow screen never freezes the keyboard.
"""

from __future__ import annotations

import asyncio
import time
from collections import deque
from typing import TYPE_CHECKING

from textual import events
from textual.message import Message

if TYPE_CHECKING:
    from textual.app import App
    from textual.message_pump import MessagePump

MAX_WAIT = 1.0
"""Seconds a key may stay in flight before the next one is let go regardless."""


class Release(Message):
    """The gate's turn: let the next held key go if the last one is done."""


def busy(pump: MessagePump) -> bool:
    """Whether ``pump`` has messages queued or one being handled."""
    queue: asyncio.Queue[object] = pump._message_queue
    return bool(getattr(queue, "_unfinished_tasks", 0) or not queue.empty())


class KeyGate:
    """The keys of one app, held in order (see the module's text)."""

    def __init__(self, app: App[None]) -> None:
        self.app = app
        self.held: deque[events.Key] = deque()
        self.flight: events.Key | None = None
        """The key let go last, until it has been dealt with."""
        self.back = False
        """The key in flight has bubbled back to the app's own queue."""
        self.since = 0.0
        self._turn_posted = False
        self.letting: events.Key | None = None

    # ---- what the app calls -----------------------------------------------------------------

    def hold(self, event: events.Key) -> bool:
        """A key from the terminal: True if the gate keeps it for later (the app drops it
        now); False for the key the gate itself is letting go."""
        if event is self.letting:
            return False
        self.held.append(event)
        self._post_turn()
        return True

    def arrived(self, message: Message) -> None:
        """Every message posted to the app passes here: spots the key in flight coming back."""
        if message is self.flight and message is not None:
            self.back = True

    def handled(self, event: events.Event) -> None:
        """The app has handled ``event`` after it bubbled back (its bindings have acted); what
        they started in the widgets is still waited for."""
        if event is self.flight:
            self.back = False

    async def turn(self) -> None:
        """Let the next key go when the last one is done; else look again soon."""
        self._turn_posted = False
        if not self.held:
            return
        if self.flight is not None and not self._done():
            await asyncio.sleep(0.001 if time.monotonic() - self.since > 0.02 else 0)
            self._post_turn()
            return
        self.flight = None
        event = self.held.popleft()
        self.letting = event
        try:
            await self.app.on_event(event)
        finally:
            self.letting = None
        # On its way through the widgets, or acted on by a priority binding: either way, what
        # it set going (a dialog, a focus move) settles before the next key.
        self.flight, self.back, self.since = event, False, time.monotonic()
        self._post_turn()

    def settled(self) -> bool:
        """No key held, and the last one let go has been dealt with (tests wait for this)."""
        return not self.held and (self.flight is None or self._done())

    # ---- inside -----------------------------------------------------------------------------

    def _post_turn(self) -> None:
        if self.held and not self._turn_posted:
            self._turn_posted = True
            self.app.post_message(Release())

    def _done(self) -> bool:
        if time.monotonic() - self.since > MAX_WAIT or not self.app.is_running:
            return True
        if self.back:
            return False  # waiting in the app's own queue: handled() ends it
        try:
            screen = self.app.screen
        except Exception:  # no screen (closing): nothing left to wait for
            return True
        return not any(busy(node) for node in screen.walk_children(with_self=True))
