"""The solve of each revision of the site, in a thread worker, and the core loaded for it.

The app starts one solve per edit (:meth:`SolveRunner.start`); a newer one cancels the older,
whose answer is then dropped, and the answer comes back to the app as a :class:`Solved`
message. Bad input is part of the answer (an :class:`~.state.outcome.Outcome` holds the
error); a fault in the core is said on screen as an internal error, and the app carries on.
"""

from __future__ import annotations

import threading
from functools import partial
from typing import TYPE_CHECKING, Any

from textual.message import Message
from textual.worker import get_current_worker

if TYPE_CHECKING:
    from textual.app import App

    from branchwise.core.site.spec import Site

    from .state.outcome import Outcome

_CORE_LOCK = threading.Lock()


def load_core(solver: bool) -> None:
    """Load the core's plain-Python modules that the screens import when first drawn (the
    catalogs, the liquids, the reader of typed values; about 25 ms), and with ``solver`` the
    solve's own (numpy and the rest). The app's thread does the first part once its first
    screen is drawn, the solve's worker both; one at a time and in this order: two threads
    importing the same modules in crossed orders can make one of the imports fail (Python
    3.11), as a screen opened while the first solve loaded once did."""
    with _CORE_LOCK:
        import branchwise.core.catalogs.bare_size  # noqa: F401
        import branchwise.core.fluids  # noqa: F401
        import branchwise.core.units.parse  # noqa: F401

        if solver:
            import branchwise.core.site.build  # noqa: F401
            import branchwise.core.site.solve  # noqa: F401
            import branchwise.tui.state.outcome  # noqa: F401


class Solved(Message):
    """A solve finished (posted from the worker thread)."""

    def __init__(self, outcome: Outcome) -> None:
        super().__init__()
        self.outcome = outcome


class SolveRunner:
    """Runs the solves of one app, one at a time (a newer one cancels the older)."""

    def __init__(self, app: App[Any]) -> None:
        self.app = app

    def start(self, site: Site, revision: int) -> None:
        """Solve ``site`` (revision ``revision``) in a worker; a :class:`Solved` follows."""
        # (named here: Textual would describe it by the repr of its arguments, the whole site,
        # about 1 ms at 200 branches)
        self.app.run_worker(partial(self._run, site, revision), name="solve", group="solve",
                            description=f"solve of revision {revision}", thread=True,
                            exclusive=True, exit_on_error=False)

    def _run(self, site: Site, revision: int) -> None:
        from branchwise.core.errors import BranchwiseError

        load_core(solver=True)
        from .state.outcome import Outcome, compute

        try:
            outcome = compute(site, revision)
        except Exception as exc:  # a bug, not bad input: say so on screen, keep the app alive
            self.app.log.error(f"solve failed: {exc!r}")
            outcome = Outcome(revision, None, None, BranchwiseError(
                f"internal error while solving ({type(exc).__name__}: {exc}); the inputs are "
                "kept — please report it"), 0.0)
        if not get_current_worker().is_cancelled:
            self.app.post_message(Solved(outcome))
