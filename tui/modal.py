"""The base of every dialog: closes once, and says what the app's keys do while it is open."""

from __future__ import annotations

from typing import TypeVar

from textual import events
from textual.await_complete import AwaitComplete
from textual.binding import Binding
from textual.screen import ModalScreen
from textual.widget import Widget
from textual.widgets import Input

ResultT = TypeVar("ResultT")


async def _nothing() -> None:
    return None


class Dialog(ModalScreen[ResultT]):
    """A dialog that closes once, and says what the app's keys do while it is open.

    Keys typed in a burst (a double Enter, Enter then Esc) can reach a dialog after the first
    of them has closed it; Textual's ``dismiss`` takes the top screen off, so a second close
    would take away the screen below (the app's last screen: ScreenStackError). Here a close
    of a dialog that is no longer on top does nothing.

    An app key (F2, Ctrl+S…) pressed while a dialog is open is never silently dropped: a
    dialog that only shows something (:attr:`PASS_KEYS`) closes and the key does its work; a
    dialog holding typed values or a question keeps them and says how to close it first.
    """

    PASS_KEYS = False
    """True: an app key closes this dialog and then acts (nothing typed here is lost)."""
    QUIT_PASSES = True
    """Ctrl+Q closes this dialog and quits (False: a question whose answer a quit needs)."""
    CLOSE_HINT = "Enter keeps, Esc cancels"
    """How this dialog closes, for the notice shown when an app key is pressed in it."""

    def dismiss(self, result: ResultT | None = None) -> AwaitComplete:
        if self.app.screen is not self:
            return AwaitComplete(_nothing())
        return super().dismiss(result)

    def on_key(self, event: events.Key) -> None:
        app_key(self, event, pass_keys=self.PASS_KEYS, hint=self.CLOSE_HINT)

    def next_field(self, widget: Widget) -> bool:
        """Enter in a field of a dialog with several: the focus goes to the next field shown
        (True); on the last one it stays, and the caller keeps the dialog (False)."""
        shown = [f for f in self.query("Field") if f.display]  # the widgets.field.Field
        at = next((i for i, f in enumerate(shown) if f is widget), None)
        if at is None or at == len(shown) - 1:
            return False
        shown[at + 1].query_one(Input).focus()
        return True


def app_key(screen: ModalScreen, event: events.Key, *, pass_keys: bool, hint: str) -> bool:
    """Deal with an app key (one of the app's own bindings) that reached a dialog unused:
    close the dialog and act (``pass_keys``; Ctrl+Q always, the question of a quit aside), or
    say how to close it first. True if the key was an app key."""
    app = screen.app
    if event.key in screen.active_bindings:
        return False  # the dialog's own key (checked after this handler): it acts
    binding = next((b for b in getattr(type(app), "BINDINGS", ())
                    if isinstance(b, Binding) and event.key in b.key.split(",")), None)
    if binding is None or app.screen is not screen:
        return False
    event.stop()
    event.prevent_default()
    if pass_keys or (binding.action == "quit" and getattr(screen, "QUIT_PASSES", True)):
        closing = screen.dismiss(None)

        async def act() -> None:
            await closing
            await app.run_action(binding.action)

        app.call_later(act)
    else:
        app.notify(f"Close this dialog first ({hint}), then {key_name(event.key)}: "
                   f"{binding.description}.", timeout=4)
    return True


def key_name(key: str) -> str:
    """``ctrl+s`` → ``Ctrl+S``, ``f3`` → ``F3``, ``exclamation_mark`` → ``!``."""
    names = {"exclamation_mark": "!", "question_mark": "?"}
    if key in names:
        return names[key]
    return "+".join(part.capitalize() if len(part) > 1 and not part[1:].isdigit()
                    else part.upper() for part in key.split("+"))
