"""The core's modules loaded one thread at a time.

Two threads importing the same modules in crossed orders can make one of the imports fail
(Python 3.11: a KeyError from the import machinery, the app gone), as a screen opened while the
first solve loaded the core once did. So the worker threads — the solve's, the band's, the
curve's, the history's and the recovery copy's — import the core (and numpy's, scipy's and
tomlkit's parts) under one lock (:func:`core_imports`), and the app's thread loads the part its
screens read first under it too, once its first screen is drawn (:func:`load_core`). A solve,
a curve and a recovery copy (milliseconds each) run under the lock throughout, so whatever
their path loads on first use loads under it; a band (longer) loads first what its draws use
(:func:`load_sampling`), the history its module, then each works without the lock.
The app's own thread, once its first screen is drawn, imports under the lock too the reports'
modules a copy, an export or the list of readings weighed needs when first asked (the band's
and the history's words are loaded by their workers, before the view draws with them). Other
modules of the core its screens import on first use are, in practice, loaded before (the test
below finds none outside the lock), but nothing enforces it.
tests/tui/test_core_loading.py records every first import of a worker thread, and of the app's
thread after its first screen, and checks that it held the lock. Once a module is loaded, the
lock costs a fraction of a microsecond.
"""

from __future__ import annotations

import threading
from collections.abc import Iterator
from contextlib import contextmanager

_CORE_LOCK = threading.RLock()
"""Held while a thread imports core modules (re-entrant: a worker inside :func:`core_imports`
may call :func:`load_core`)."""


@contextmanager
def core_imports() -> Iterator[None]:
    """Import the core's modules inside this block: one thread at a time."""
    with _CORE_LOCK:
        yield


def load_core(solver: bool) -> None:
    """Load the core's plain-Python modules that the screens import when first drawn (the
    catalogs, the liquids, the reader of typed values; about 25 ms), and with ``solver`` the
    solve's own (numpy and the rest). The app's thread does the first part once its first
    screen is drawn, the solve's worker both; one at a time and in this order."""
    with core_imports():
        import branchwise.core.catalogs.bare_size  # noqa: F401
        import branchwise.core.fluids  # noqa: F401
        import branchwise.core.units.parse  # noqa: F401

        if solver:
            import branchwise.core.site.build  # noqa: F401
            import branchwise.core.site.solve  # noqa: F401
            import branchwise.tui.state.outcome  # noqa: F401


def load_sampling() -> None:
    """What the draws of a band load on first use (the Monte Carlo, numpy's random numbers and
    masked arrays), and the band's words the view then draws with, under the lock."""
    with core_imports():
        import numpy.ma  # noqa: F401
        import numpy.random  # noqa: F401

        import branchwise.core.numerics.uncertainty  # noqa: F401
        import branchwise.core.report.band  # noqa: F401
