"""What the three work screens share: the title bar, the status strip, the footer, and redrawing
when the site, the answer or the units change."""

from __future__ import annotations

from typing import TYPE_CHECKING, ClassVar

from textual import events
from textual.actions import parse
from textual.app import ComposeResult
from textual.message import Message
from textual.screen import Screen
from textual.widget import Widget

from ..widgets.caution_line import CautionLine
from ..widgets.status import StatusStrip
from ..widgets.title_bar import TitleBar
from ..workspace import workspace

if TYPE_CHECKING:
    from ..workspace import Workspace


class WorkScreen(Screen):
    """A screen over the app's one site. Subclasses give :meth:`body` and :meth:`redraw`."""

    HELP_WIDGETS: ClassVar[tuple[type[Widget], ...]] = ()
    """Widget classes whose bindings the help screen lists for this screen."""
    HINT_KEYS: ClassVar[tuple[tuple[str, str], ...]] = ()
    """This screen's keys that the footer has no room for, shown on the caution line."""

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def compose(self) -> ComposeResult:
        yield TitleBar()
        yield StatusStrip()
        yield from self.body()
        # The cautions on every screen, and the keys the footer has no room for.
        yield CautionLine(self.HINT_KEYS, id="caution-line")
        # The keys that matter on this screen; F1 lists them all, Ctrl+P finds any by name.
        # The first screen gets its footer once it is drawn (:meth:`add_footer`): building the
        # footer's keys is a good part of the start.
        if getattr(self.app, "startup_seconds", None) is not None:
            yield _footer()

    def add_footer(self) -> None:
        """The footer, if this screen was built before the first screen was drawn."""
        from ..widgets.keys_footer import KeysFooter

        if self.is_attached and not self.query(KeysFooter):
            self.mount(_footer())

    def body(self) -> ComposeResult:
        raise NotImplementedError

    _resumed = False
    """Whether this screen has been shown (resumed) before."""

    def post_message(self, message: Message) -> bool:
        # The first time a screen is shown, every widget in it was styled a moment ago, as
        # it was mounted: Textual styles them all once more (the whole screen) unless told
        # that nothing has changed since. Later returns to the screen restyle as usual.
        if isinstance(message, events.ScreenResume) and not self._resumed:
            self._resumed = True
            message.refresh_styles = False
        return super().post_message(message)

    ready = False
    """False until the widgets have settled (an input may report its first value as a change)."""

    def on_mount(self) -> None:
        if not self.is_attached:
            return  # the app quit while this screen was being built: nothing to draw
        for name in ("revision", "outcome", "unit_system", "theme"):
            self.watch(self.app, name, self._changed, init=False)
        self.redraw()
        self.call_after_refresh(self._settled)

    def _settled(self) -> None:
        self.ready = True

    _stale_view = False
    """Something changed while another screen was shown: redrawn when this one comes back."""

    def _changed(self, *_: object) -> None:
        if self.is_current:
            self.redraw()
        else:
            self.redraw_on_return()

    def redraw_on_return(self) -> None:
        """Redraw when this screen is shown again (it is not in sight now)."""
        self._stale_view = True

    def on_screen_resume(self) -> None:
        if self._stale_view:
            self._stale_view = False
            self.redraw()

    def on_input_blurred(self) -> None:
        # A field shows what was typed while it has focus; afterwards, the site's text
        # (a bare number with its unit added).
        self.call_after_refresh(self.redraw)

    def redraw(self) -> None:
        """Show the app's present site and answer."""
        raise NotImplementedError

    # ---- keys that cannot act now ----------------------------------------------------------------

    def on_key(self, event: events.Key) -> None:
        """A key whose action is greyed out now (Ctrl+Z with nothing to undo, r with no
        answer) would do nothing: say why instead. (Keys reach the screen before its
        bindings run; an enabled binding is left to act.)"""
        active = self.active_bindings.get(event.key)
        if active is None or active.enabled:
            return
        explain = getattr(active.node, "unavailable_reason", None)
        _, action, params = parse(active.binding.action)
        reason = explain(action, params) if explain is not None else ""
        if reason:
            event.stop()
            self.notify(reason, timeout=3)

    def unavailable_reason(self, action: str, parameters: tuple[object, ...]) -> str:
        """Why a greyed-out action of this screen cannot run now ('' to say nothing)."""
        return ""


def _footer() -> Widget:
    """The keys footer (its module, a Textual widget class, is loaded after the first screen
    is drawn: the first screen gets its footer then)."""
    from ..widgets.keys_footer import KeysFooter

    return KeysFooter(compact=True, show_command_palette=False)
