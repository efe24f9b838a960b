"""A typing field for values the answer follows keystroke by keystroke.

Textual's Input keeps its virtual size at the width of its text, a change that asks for a new
layout of the screen; at 120×40 a new layout redraws the whole screen (about 10 ms of a
keystroke's 40, measured by tests/perf/bench_app_recompute.py). A field whose width is set by
its style does not need one: :class:`ValueInput` sets that size quietly and repaints itself
only. A field sized by its text (``width: auto``) still lays the screen out, as it must.
"""

from __future__ import annotations

from textual.geometry import Size
from textual.widget import Widget
from textual.widgets import Input


class ValueInput(Input):
    """An Input whose change of text repaints it, without a new layout where its style fixes
    its size."""

    def _watch_value(self, value: str) -> None:
        if not self.styles.auto_dimensions:
            size = Size(self.content_width, 1)  # as Input's own watcher sets it, next
            if size != self.virtual_size:
                self.set_reactive(Widget.virtual_size, size)
                self.scroll_x = self.validate_scroll_x(self.scroll_x)
                self.refresh()
        # Input's own watcher, by the name Textual 6 to 8 give it (a release that renamed it
        # would call its own and this one both: nothing is lost, the layout comes back)
        own = getattr(super(), "_watch_value", None)
        if own is not None:
            own(value)
