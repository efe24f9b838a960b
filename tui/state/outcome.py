"""One solve of the site, as the app's worker runs it, and what the screens read from it.

:func:`compute` is called in a worker thread: it imports the heavy modules (numpy, scipy, pint)
on first use, so the first screen is drawn before they load. It never raises for anything the
user typed: an :class:`~branchwise.core.errors.InputError` or a
:class:`~branchwise.core.errors.NoSolutionError` comes back in :attr:`Outcome.error`, with the
liquid worked out on its own so the liquid screen can show it even when a branch is wrong.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass
from time import monotonic
from typing import TYPE_CHECKING, Any

from branchwise.core.errors import BranchwiseError

if TYPE_CHECKING:
    from branchwise.core.model import Fluid
    from branchwise.core.site.build import Built
    from branchwise.core.site.solve import SiteResult
    from branchwise.core.site.spec import Site


@dataclass(frozen=True, eq=False)
class Outcome:
    """The answer for one revision of the site.

    solved: the solved site, or None when ``error`` says why not; fluid: the liquid at its
    state (None when its own fields are wrong); seconds: wall time of the solve; built: the
    site as the core read it (bores, ε, K, Kv), also when only the solve failed.
    """

    revision: int
    solved: SiteResult | None
    fluid: Fluid | None
    error: BranchwiseError | None
    seconds: float
    built: Built | None = None

    @property
    def ok(self) -> bool:
        return self.error is None and self.solved is not None

    @property
    def field(self) -> str:
        """The field path the error points at ('' when there is none)."""
        return getattr(self.error, "field", "") or ""


@dataclass(frozen=True, eq=False)
class Band:
    """The band worked out for one revision of the site: ``solved`` carries it in
    :attr:`SiteResult.uncertainty`; or ``error`` says why there is none (``field``: the path
    of the input at fault, such as ``tolerances.gauge_full_scale``)."""

    revision: int
    solved: SiteResult | None
    error: str = ""
    field: str = ""


def compute(site: Site, revision: int, presets: Any = None) -> Outcome:
    """Solve ``site``; every failure the user can fix comes back as ``Outcome.error``."""
    from branchwise.core import catalogs, fluids, units  # noqa: F401  (loaded, not timed)
    from branchwise.core.numerics import solve  # noqa: F401
    from branchwise.core.site.build import build, build_fluid
    from branchwise.core.site.solve import solve_site

    units.registry()
    start = time.perf_counter()
    fluid = built = None
    try:
        fluid = build_fluid(site, presets)
        built = build(site, presets)
        solved = solve_site(site, presets, built)
    except BranchwiseError as exc:
        return Outcome(revision, None, fluid, exc, time.perf_counter() - start, built)
    return Outcome(revision, solved, fluid, None, time.perf_counter() - start, solved.built)


class BandStopped(Exception):
    """A band's run was stopped: its worker was cancelled (the app closes, or a newer band
    replaced it)."""


SHOW_AFTER = 1.0
"""Seconds before a band's progress is shown (a quick band just appears)."""


def band_progress(cancelled: Callable[[], bool], report: Callable[[int, int], None],
                  every: float = 0.25) -> Callable[[int, int], None]:
    """The ``progress`` of a band's Monte Carlo run in a worker: stops the run at the next
    chunk once ``cancelled()`` (so that quitting never waits for a long band), and hands
    (solves done, in all) to ``report`` at most every ``every`` seconds once the run has
    taken :data:`SHOW_AFTER` seconds."""
    started = monotonic()
    last = [0.0]

    def progress(done: int, total: int) -> None:
        if cancelled():
            raise BandStopped
        now = monotonic()
        if now - started >= SHOW_AFTER and now - last[0] >= every:
            last[0] = now
            report(done, total)

    return progress
