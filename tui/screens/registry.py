"""The app's screens, in one registry: the mode, its key, its title, and how it is built.

The app's modes and its screen keys (F2, F3, F4) are made from this table, and the help and the
palette read the titles from it. A screen other than the first is imported when first shown,
so that the app starts sooner. Adding a screen: its module (and stylesheet) and one entry here.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from textual.screen import Screen

from .split.screen import SplitScreen


@dataclass(frozen=True)
class ScreenEntry:
    """One screen: ``mode`` (its name in the app), ``key`` (F2…), ``title``, ``tooltip`` (what
    the key says in help), ``build`` (makes the screen)."""

    mode: str
    key: str
    title: str
    tooltip: str
    build: Callable[[], Screen[object]]


def _liquid() -> Screen[object]:
    from .liquid import LiquidScreen

    return LiquidScreen()


def _branches() -> Screen[object]:
    from .branches.screen import BranchesScreen

    return BranchesScreen()


def _history() -> Screen[object]:
    from .history import HistoryScreen

    return HistoryScreen()


SCREENS: tuple[ScreenEntry, ...] = (
    ScreenEntry("liquid", "f2", "Liquid", "The liquid: kind, temperature, properties", _liquid),
    ScreenEntry("branches", "f3", "Branches", "The branches between the two headers",
                _branches),
    ScreenEntry("split", "f4", "Split", "Given condition, what to find, the flow split",
                SplitScreen),
    ScreenEntry("history", "f5", "History", "Each visit solved, and how each branch changed "
                "between visits; closing today's visit", _history),
)
"""Every screen of the app, in the order of their keys."""
FIRST = "split"
"""The screen the app opens on."""

TITLES = {s.mode: s.title for s in SCREENS}
