"""Ending when told to: SIGTERM (``kill``, a shutdown) or SIGHUP (the terminal closed).

Either signal writes the recovery copy at once (the usual copy waits for typing to pause, so an
edit a moment old would be lost), once the keys already typed have reached the site (at most
:data:`SETTLE` seconds), and ends the app the ordinary way, which gives the terminal back as it
was: main screen, mouse reporting off, cursor shown. Should the app not have ended
within :data:`GRACE` seconds (something stuck), the terminal is put back by hand and the
process ends with the signal's exit status (128 + its number).
"""

from __future__ import annotations

import asyncio
import os
import signal
import sys
import threading
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from textual.app import App

    from .files import SiteFiles

GRACE = 2.0
"""Seconds the app has to end by itself after the signal."""

SIGNALS = tuple(getattr(signal, name) for name in ("SIGTERM", "SIGHUP") if hasattr(signal, name))

RESET = ("\x1b[?1000l\x1b[?1002l\x1b[?1003l\x1b[?1006l\x1b[?1015l\x1b[?2004l\x1b[?1004l"
         "\x1b[?25h\x1b[?1049l")
"""Mouse reporting, bracketed paste and focus reports off, the cursor shown, the main screen."""


def install(app: App[None], files: SiteFiles) -> None:
    """Handle the ending signals while ``app`` runs (undone by :func:`remove`)."""
    try:
        loop = asyncio.get_running_loop()
    except RuntimeError:
        return
    for number in SIGNALS:
        try:
            loop.add_signal_handler(number, _ended, app, files, number)
        except (NotImplementedError, RuntimeError, ValueError):
            return  # not the main thread, or no signals here: the defaults stay


def remove() -> None:
    try:
        loop = asyncio.get_running_loop()
    except RuntimeError:
        return
    for number in SIGNALS:
        try:
            loop.remove_signal_handler(number)
        except (NotImplementedError, RuntimeError, ValueError):
            return


SETTLE = 1.0
"""Seconds the keys typed before the signal may take to reach the site (a busy app handles
them a moment late) before the copy is written without them."""


def _ended(app: App[None], files: SiteFiles, number: int) -> None:
    status = 128 + number
    watchdog = threading.Thread(target=_force, args=(app, status), daemon=True)
    watchdog.start()
    asyncio.ensure_future(_end(app, files, status))


async def _end(app: App[None], files: SiteFiles, status: int) -> None:
    """Let the keys already typed reach the site, write the copy, end the app."""
    gate = getattr(app, "key_gate", None)
    waited = 0.0
    while gate is not None and not gate.settled() and waited < SETTLE:
        await asyncio.sleep(0.01)
        waited += 0.01
    files.write_recovery_now()
    app.exit(return_code=status)


def _force(app: App[None], status: int) -> None:
    """The last resort: the app did not end within :data:`GRACE` seconds."""
    import time

    time.sleep(GRACE)
    if not app.is_running:
        return  # it ended: the ordinary way out gave the terminal back
    driver = getattr(app, "_driver", None)
    attrs = getattr(driver, "attrs_before", None)
    stdin, stdout = sys.__stdin__, sys.__stdout__
    try:
        if attrs is not None and stdin is not None:
            import termios

            termios.tcsetattr(stdin.fileno(), termios.TCSANOW, attrs)
        if stdout is not None:
            stdout.write(RESET)
            stdout.flush()
    except Exception:  # the terminal is gone (SIGHUP): nothing to give back
        pass
    os._exit(status)
