"""A sign of life on stderr while the command line works on something that takes a while.

Nothing is shown for work done within :data:`DELAY` seconds. After that one line on the
terminal says what is being done and for how long (a Monte Carlo run: how many of its solves
are done), rewritten in place every :data:`TICK` seconds and cleared when the work ends, before
any message or the output. Only on a terminal: when stderr is a file or a pipe nothing is
written, so that a script still gets exactly one line for an error and nothing else.
"""

from __future__ import annotations

import sys
import threading
import time
from typing import TextIO

DELAY = 1.0
"""Seconds of work before anything is shown."""
TICK = 0.5
"""Seconds between two updates of the line."""


class Progress:
    """What the command is doing now (:meth:`stage`), and how far the draws are (:meth:`draws`,
    the callback of a Monte Carlo run). A context manager: the line goes at the end."""

    def __init__(self, stream: TextIO | None = None, delay: float | None = None) -> None:
        self.stream = sys.stderr if stream is None else stream
        self.delay = DELAY if delay is None else delay
        self.started = time.monotonic()
        try:
            self.live = bool(self.stream.isatty())
        except (AttributeError, ValueError):
            self.live = False
        self._lock = threading.Lock()
        self._what = ""
        self._line = False  # a line is on the terminal now
        self._stop = threading.Event()
        self._ticker: threading.Thread | None = None

    def __enter__(self) -> Progress:
        if self.live:
            self._ticker = threading.Thread(target=self._tick, daemon=True)
            self._ticker.start()
        return self

    def __exit__(self, *_: object) -> None:
        self.close()

    def stage(self, what: str) -> None:
        """Now doing ``what`` (``reading site.toml``)."""
        with self._lock:
            self._what = what

    def draws(self, done: int, total: int) -> None:
        """Monte Carlo: ``done`` of ``total`` solves made (drawn networks and the linear
        estimate's steps)."""
        with self._lock:
            self._what = f"Monte Carlo: {done:,} of {total:,} solves"

    def close(self) -> None:
        self._stop.set()
        if self._ticker is not None:
            self._ticker.join(timeout=2 * TICK)
        with self._lock:
            if self._line:
                self.stream.write("\r\x1b[K")
                self.stream.flush()
                self._line = False

    def _tick(self) -> None:
        while not self._stop.wait(TICK):  # (read each time: a test may make it short)
            seconds = time.monotonic() - self.started
            with self._lock:
                if seconds < self.delay or not self._what or self._stop.is_set():
                    continue
                self.stream.write(f"\rbranchwise: {self._what}… {seconds:.0f} s\x1b[K")
                self.stream.flush()
                self._line = True
