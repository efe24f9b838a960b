"""What the screens, widgets and the files service need of the app: the one site and its
answer, the person's units, and the way to change the site.

:class:`~branchwise.tui.app.BranchwiseApp` is the one :class:`Workspace`; a screen or widget
reaches it through :func:`workspace` (the Textual side of the app through ``self.app``), so that
nothing below the app imports the app itself.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING, Protocol, cast

from branchwise.core.site.spec import Site
from branchwise.core.storage.settings import Settings
from branchwise.core.units import Units

from .state.session import Session

if TYPE_CHECKING:  # made by the solve's worker, after the first screen is drawn
    from .state.outcome import Band, Outcome


class Workspace(Protocol):
    """The app as its screens use it."""

    session: Session
    """The site as typed, with its undo history."""
    settings: Settings
    outcome: Outcome | None
    """The answer for the present revision of the site (None while it is worked out)."""
    good: Outcome | None
    """The last answer without an error (shown greyed while the present one is wrong)."""
    latest_band: Band | None
    """The last uncertainty band worked out (exports include it while it is current)."""
    unit_system: str

    @property
    def site(self) -> Site: ...

    @property
    def units(self) -> Units: ...

    def edit(self, label: str, change: Callable[[Site], object], key: str = "") -> None: ...

    def site_changed(self) -> None: ...

    def save_settings(self) -> None: ...

    def export(self, fmt: str) -> None: ...

    def available(self, action: str, parameters: tuple[object, ...]) -> bool | None: ...

    def unit(self, kind: str) -> str: ...

    def unit_text(self, kind: str) -> str: ...

    def fmt(self, value_si: float, kind: str, digits: int = 4, unit: bool = True) -> str: ...

    def say(self, item: object) -> str: ...

    def error_words(self, error: BaseException) -> str: ...

    def reason_words(self, error: BaseException | None) -> str: ...

    def fluid_name(self, fluid: object) -> str: ...


def workspace(app: object) -> Workspace:
    """The running app as the :class:`Workspace` it is (every screen runs inside
    :class:`~branchwise.tui.app.BranchwiseApp`)."""
    return cast(Workspace, app)
