"""SIGTERM or SIGHUP a moment after an edit: the edit is in a recovery copy, and the terminal is
given back (main screen, mouse reporting off).

The app runs as a person starts it (``branchwise open SITE``) in a pseudo-terminal of its own;
the edit is typed and the signal sent well inside the second the ordinary copy waits for.
"""

from __future__ import annotations

import os
import select
import signal
import subprocess
import sys
import time

import pytest

from branchwise.core.site.read import demo_site, load_site
from branchwise.core.site.write import save_site

pytestmark = pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals and terminals")

HANG = 60.0
"""Seconds after which a step counts as a hang (a guard only: the steps take about a second)."""


def _read_until(fd: int, wanted: bytes, seen: bytearray, limit: float = HANG) -> bool:
    end = time.monotonic() + limit
    while wanted not in seen and time.monotonic() < end:
        ready, _, _ = select.select([fd], [], [], 0.2)
        if ready:
            try:
                chunk = os.read(fd, 65536)
            except OSError:
                return wanted in seen
            if not chunk:
                break
            seen += chunk
    return wanted in seen


def _run_until_eof(fd: int, seen: bytearray, proc: subprocess.Popen[bytes]) -> int:
    end = time.monotonic() + HANG
    while time.monotonic() < end:
        ready, _, _ = select.select([fd], [], [], 0.2)
        if ready:
            try:
                chunk = os.read(fd, 65536)
            except OSError:
                break
            if not chunk:
                break
            seen += chunk
        elif proc.poll() is not None:
            break
    return proc.wait(timeout=HANG)


@pytest.mark.parametrize("number", [signal.SIGTERM, signal.SIGHUP])
def test_a_signal_right_after_an_edit_keeps_it_and_gives_the_terminal_back(tmp_path, number):
    import pty

    site = demo_site()
    path = save_site(site, tmp_path / "plant.toml")
    data = tmp_path / "data"
    env = {**os.environ, "BRANCHWISE_DATA_DIR": str(data), "TERM": "xterm-256color",
           "COLUMNS": "80", "LINES": "24"}
    main, child = pty.openpty()
    proc = subprocess.Popen([sys.executable, "-m", "branchwise.tui.cli", "open", str(path)],
                            stdin=child, stdout=child, stderr=child, env=env,
                            start_new_session=True)
    os.close(child)
    seen = bytearray()
    try:
        assert _read_until(main, b"solved", seen), seen[-400:]
        time.sleep(0.3)
        os.write(main, b"v\x1555 kPa")  # the given's field, Ctrl+U, then the new value
        assert _read_until(main, b"55 kPa", seen), seen[-400:]
        time.sleep(0.2)  # well inside the second the ordinary copy waits for
        proc.send_signal(number)
        mark = len(seen)
        status = _run_until_eof(main, seen, proc)
    finally:
        if proc.poll() is None:
            proc.kill()
        os.close(main)
    assert status == 128 + number
    after = bytes(seen[mark:])
    assert b"\x1b[?1049l" in after  # back on the main screen
    assert b"\x1b[?1000l" in after  # mouse reporting off
    copies = list((data / "recovery").glob("*.toml"))
    assert len(copies) == 1
    assert load_site(copies[0]).conditions.pressure_drop == "55 kPa"
    assert copies[0].stat().st_mode & 0o077 == 0  # the owner's only
    assert load_site(path).conditions.pressure_drop == site.conditions.pressure_drop
