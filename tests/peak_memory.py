"""The peak memory of one `branchwise` command run in a fresh process, as Linux counts it.

The child's VmHWM (/proc/self/status), not `ru_maxrss`: Linux carries `ru_maxrss` across fork
and exec, so a child started by a test process of 420 MB reported 420 MB before it had done
anything (seen on CI; a child of a 500 MB parent reports 511 MB against a VmHWM of 11 MB)."""

from __future__ import annotations

import os
import subprocess
import sys

import pytest

ON_LINUX = pytest.mark.skipif(not os.path.exists("/proc/self/status"),
                              reason="VmHWM is read from Linux's /proc")


def peak_kb(argv: list[str]) -> tuple[int, int]:
    """The exit status of `branchwise ARGV` and its process's peak resident memory (kB)."""
    code = ("from branchwise.tui.cli import main; "
            f"code = main({argv!r}); "
            "hwm = [l.split()[1] for l in open('/proc/self/status') if l.startswith('VmHWM:')]; "
            "print(code, hwm[0])")
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=600, check=True)
    status, peak = (int(x) for x in run.stdout.split()[-2:])
    return status, peak
