"""The solve of each revision of the site, in a thread worker, and the core loaded for it.

The app starts one solve per edit (:meth:`SolveRunner.start`); a newer one cancels the older,
whose answer is then dropped, and the answer comes back to the app as a :class:`Solved`
message. Bad input is part of the answer (an :class:`~.state.outcome.Outcome` holds the
error); a fault in the core is said on screen as an internal error, and the app carries on.
"""

from __future__ import annotations

from functools import partial
from typing import TYPE_CHECKING, Any

from textual.message import Message
from textual.worker import get_current_worker

from .core_loading import core_imports, load_core

if TYPE_CHECKING:
    from textual.app import App

    from branchwise.core.site.spec import Site

    from .state.outcome import Outcome


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
        # Under the core's lock throughout: a solve imports what its site needs (a reading
        # weighed, a diameter sought…) on first use; a solve takes milliseconds.
        with core_imports():
            load_core(solver=True)
            from branchwise.core.errors import BranchwiseError

            from .state.outcome import Outcome, compute

            try:
                outcome = compute(site, revision)
            except Exception as exc:  # a bug, not bad input: said on screen, the app goes on
                self.app.log.error(f"solve failed: {exc!r}")
                outcome = Outcome(revision, None, None, BranchwiseError(
                    f"internal error while solving ({type(exc).__name__}: {exc}); the inputs "
                    "are kept — please report it"), 0.0)
        if not get_current_worker().is_cancelled:
            self.app.post_message(Solved(outcome))
