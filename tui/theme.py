"""Colours for the text the app draws itself (the curve, the share bars, marks in the status
line and the band), taken from the theme in use, so that they stay readable on a light theme
as on a dark one; and the theme kept in the settings.

Textual's ``text-*`` variables are the theme's colours adjusted to read on its background;
:func:`colour` turns one into a Rich colour (a translucent one is laid over the background),
:func:`muted` mixes the foreground into the background for guide lines.
"""

from __future__ import annotations

from typing import Any

from textual.color import Color, ColorParseError

SERIES = ("text-primary", "text-success", "text-secondary", "text-accent", "text-error",
          "text-warning")
"""The curve's branch lines, in turn (the total is drawn in the foreground, bold)."""

_cache: dict[tuple[int, str], dict[str, str]] = {}


def variables(app: Any) -> dict[str, str]:
    """The theme's CSS variables (computed once per theme); ``app``: the running App (typed
    loosely, as the widgets know it by its Workspace face)."""
    key = (id(app), str(app.theme))
    if key not in _cache:
        _cache.clear()
        _cache[key] = dict(app.get_css_variables())
    return _cache[key]


def _parse(text: str | None) -> Color | None:
    if not text:
        return None
    try:
        return Color.parse(text)
    except ColorParseError:
        return None


def colour(app: Any, name: str) -> str:
    """The theme's ``name`` (``text-warning``, ``text-error``…) as ``#rrggbb``; '' (the plain
    text colour) when the theme does not give one."""
    found = _parse(variables(app).get(name))
    if found is None:
        return ""
    if found.a < 1:
        back = _parse(variables(app).get("background")) or Color(0, 0, 0)
        found = back + found
    return found.hex6


def muted(app: Any, share: float = 0.5) -> str:
    """The foreground mixed into the background (``share`` of the way): guide lines."""
    fore = _parse(variables(app).get("foreground"))
    back = _parse(variables(app).get("background"))
    if fore is None or back is None:
        return "dim"
    return fore.blend(back, share).hex6


def series(app: Any, index: int) -> str:
    """The colour of the ``index``-th branch's line."""
    return colour(app, SERIES[index % len(SERIES)])
