"""The band of the Split screen's results area (``b``): Monte Carlo P5–P95 of every flow, the
pressure drop and a found unknown, and what dominates the spread, worked out in a thread worker
(10,000 draws, a fixed seed: the same site always shows the same band). A band belongs to one
revision of the site: after an edit it is greyed and marked stale at once, and worked out again
once typing pauses while the view is open (or at once when it is opened again). A site with an
error shows no current band.

Loaded when the band is first shown (the view it draws in, and the band's own modules, wait
until then).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from rich.text import Text
from textual import work
from textual.message import Message
from textual.worker import get_current_worker

from ...core_loading import core_imports, load_sampling
from ...theme import colour
from ...widgets.bandview import WIDE, BandView, band_body, band_notes
from ...workspace import workspace

if TYPE_CHECKING:
    from textual.timer import Timer

    from branchwise.core.site.solve import SiteResult
    from branchwise.core.site.spec import Site

    from ...state.outcome import Band
    from ...workspace import Workspace

BAND_SAMPLES = 10_000
BAND_SEED = 0
"""A fixed seed (the CLI's default too): the app and ``branchwise solve --uncertainty`` agree."""
BAND_PAUSE = 0.6
"""Seconds of quiet after an edit before an open band is worked out again."""


class BandPanel(BandView):
    """The band view with the band it shows: the newest band worked out, the worker working
    one out, and when to start one. Tells its parent when a band has come in
    (:class:`Changed`): the table's reading lines weigh the readings against it."""

    @dataclass
    class Progress(Message):
        """How far a long band has got (posted from its thread)."""

        revision: int
        done: int
        total: int

    @dataclass
    class Ready(Message):
        """A band worker finished (posted from its thread)."""

        band: Band

    class Changed(Message):
        """A band came in: what shows it may need drawing again."""

    band: Band | None = None
    """The newest band worked out (maybe for an earlier revision: then it is shown as stale)."""
    band_pause = BAND_PAUSE
    now = False
    """Work the band out at once (the view was just opened), not after a pause."""
    _band_running: int | None = None
    """The revision the worker is working a band out for."""
    _band_share = 0.0
    """How much of the running band is done (0 until it has run a second)."""
    _band_timer: Timer | None = None

    @property
    def bw(self) -> Workspace:
        return workspace(self.app)

    def _wanted(self) -> bool:
        app = self.bw
        rev, outcome = app.session.revision, app.outcome
        return (self.display and self._band_running != rev
                and (self.band is None or self.band.revision != rev)
                and outcome is not None and outcome.revision == rev and outcome.ok)

    def schedule(self) -> None:
        """Start a band for the site as it is now if none is current: at once after
        :attr:`now` was set, else once typing has paused for :attr:`band_pause`."""
        if self._band_timer is not None:
            self._band_timer.stop()
            self._band_timer = None
        if not self._wanted():
            band = self.band
            if band is not None and band.revision == self.bw.session.revision:
                self.now = False  # opened on a current band: the next edit waits for a pause
            return
        if self.now:
            self._start()
        else:
            self._band_timer = self.set_timer(self.band_pause, self._start)

    def _start(self) -> None:
        self._band_timer = None
        if not self._wanted():
            return
        self.now = False
        app = self.bw
        if app.outcome is None or app.outcome.solved is None:
            return
        self._band_running = app.session.revision
        self._band_share = 0.0
        self._compute(app.session.site, app.session.revision, app.outcome.solved,
                      app.unit_system, dict(app.settings.display_units))
        self.draw()

    @work(thread=True, exclusive=True, exit_on_error=False, group="band",
          description="band")  # not the repr of its arguments (the whole site)
    def _compute(self, site: Site, revision: int, solved: SiteResult, system: str,
                 units: dict[str, str]) -> None:
        load_sampling()
        with core_imports():
            from branchwise.core.errors import BranchwiseError
            from branchwise.core.site.fields import error_text
            from branchwise.core.site.solve import with_uncertainty
            from branchwise.core.units import Units

            from ...state.outcome import Band, BandStopped, band_progress

        worker = get_current_worker()

        def report(done: int, total: int) -> None:
            self.post_message(self.Progress(revision, done, total))

        progress = band_progress(lambda: worker.is_cancelled, report)
        try:
            band = Band(revision, with_uncertainty(solved, BAND_SAMPLES, BAND_SEED,
                                                   progress=progress))
        except BandStopped:
            return  # the app closes, or a newer band took over: nothing to show
        except BranchwiseError as exc:
            band = Band(revision, None, error_text(exc, Units(system, units),
                                           [b.name for b in site.branches]),
                        getattr(exc, "field", "") or "")
        except Exception as exc:  # a bug, not bad input: shown, and the app carries on
            self.log.error(f"band failed: {exc!r}")
            band = Band(revision, None, f"internal error ({type(exc).__name__}: {exc}); "
                        "please report it")
        if not get_current_worker().is_cancelled:
            self.post_message(self.Ready(band))

    def on_band_panel_progress(self, message: Progress) -> None:
        if self._band_running == message.revision:
            self._band_share = message.done / message.total if message.total else 0.0
            if self.display and self.screen.is_current:
                self.draw()

    def on_band_panel_ready(self, message: Ready) -> None:
        band = message.band
        if self._band_running == band.revision:
            self._band_running = None
        if self.band is None or band.revision >= self.band.revision:
            self.band = band
            self.bw.latest_band = band  # the exports include it while it is current
        self.post_message(self.Changed())

    def band_state(self) -> str:
        """``current``, ``computing``, ``error`` (no band for these inputs, see its message),
        ``broken`` (the site has no answer: bad input, or readings no flow fits), ``stale``
        or ``none``."""
        app = self.bw
        rev, band, outcome = app.session.revision, self._own_band(), app.outcome
        if self._band_running == rev:
            return "computing"
        if band is not None and band.revision == rev:
            return "error" if band.solved is None else "current"
        if outcome is not None and outcome.revision == rev and not outcome.ok:
            return "broken"
        return "none" if band is None else "stale"

    def _own_band(self) -> Band | None:
        """The last band worked out, unless it was for a site opened before this one."""
        band = self.band
        return band if band is not None and band.revision >= self.bw.session.opened else None

    def draw(self) -> None:
        """The state line and the band (greyed unless it is the current one)."""
        app, band, state = self.bw, self._own_band(), self.band_state()
        warn = f"bold {colour(self.app, 'text-warning')}".strip()
        draws = f"{BAND_SAMPLES:,} Monte Carlo draws"
        head = {
            "computing": Text(f"computing… {draws} (seed {BAND_SEED})"
                              + (f", {self._band_share:.0%} done" if self._band_share else ""),
                              style="italic"),
            "current": Text(f"P5 … P95: the middle 90 % of {draws} (seed {BAND_SEED})",
                            style="dim"),
            "broken": Text("No band: this site has no answer now (see the message above)",
                           style=warn),
            "stale": Text("STALE: the inputs changed since this band; it is worked out "
                          "again when typing pauses", style=warn),
            "none": Text("No band yet: it is worked out once the site solves", style="dim"),
        }.get(state)
        if head is None:  # error: the band of these inputs says why it has no figures
            head = Text(f"✗ No band: {band.error if band else ''}",
                        style=f"bold {colour(self.app, 'text-error')}".strip())
            if band is not None and band.field.startswith("tolerances"):
                head.append("  (l: tolerances)", style="dim")
        elif state in ("computing", "broken") and band is not None and band.solved is not None:
            head.append("; below, the band of earlier inputs", style="dim")
        body = Text()
        if band is not None and band.solved is not None:
            wide = self.app.size.width >= WIDE
            # the screen's width, less the view's padding and a scroll bar
            notes = band_notes(app, band.solved, max(self.app.size.width - 4, 0))
            body = band_body(app, band.solved, wide) + notes
        self.show(head, body, stale=state != "current")
