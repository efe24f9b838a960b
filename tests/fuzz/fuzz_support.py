"""What the fuzz tests share: a hard time bound per case and the counts of cases run."""

from __future__ import annotations

import signal
import time
from collections import Counter
from collections.abc import Iterator
from contextlib import contextmanager

CASE_SECONDS = 10.0
"""A case that runs longer than this (s) counts as a hang. A site solves in milliseconds; the
bound is loose because the machine is shared and the first case loads pint and the catalogs."""

STATS: Counter[str] = Counter()
"""Cases run per test and outcome (``"site ok"``, ``"site input"``, ``"units value"`` ...)."""
SLOWEST: dict[str, float] = {}
"""The longest case (s) per fuzz target."""


class Hang(BaseException):
    """A case ran past :data:`CASE_SECONDS` (BaseException: no ``except Exception`` hides it)."""


@contextmanager
def time_limit(target: str, seconds: float = CASE_SECONDS) -> Iterator[None]:
    """Run the body under a real-time alarm; record its duration for ``target``."""
    def alarm(signum: int, frame: object) -> None:
        raise Hang(f"a case ran longer than {seconds} s")

    previous = signal.signal(signal.SIGALRM, alarm)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    start = time.perf_counter()
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
        SLOWEST[target] = max(SLOWEST.get(target, 0.0), time.perf_counter() - start)
