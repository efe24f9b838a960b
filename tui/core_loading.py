"""The core's modules loaded one thread at a time.

Two threads importing the same modules in crossed orders can make one of the imports fail
(Python 3.11: a KeyError from the import machinery, the app gone), as a screen opened while the
first solve loaded the core once did. So every thread of the app that may be the first to import
a part of the core — the app's own thread after the first paint, the solve's worker, and the
band's, curve's and history's workers — imports it under one lock (:func:`core_imports`), and
the common part in one order (:func:`load_core`). Once a module is loaded, the lock costs a
fraction of a microsecond.
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
