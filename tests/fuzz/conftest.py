"""Fuzz tests: say at the end of the session how many cases ran and the slowest one."""

from __future__ import annotations

import pytest
from fuzz_support import SLOWEST, STATS


def pytest_terminal_summary(terminalreporter: pytest.TerminalReporter) -> None:
    """After a run that fuzzed files or units: cases per outcome and the slowest case."""
    if not STATS:
        return
    for target in sorted({key.split()[0] for key in STATS}):
        counts = {k.split(maxsplit=1)[1]: n for k, n in STATS.items() if k.split()[0] == target}
        total = sum(counts.values())
        detail = ", ".join(f"{n} {outcome}" for outcome, n in sorted(counts.items()))
        slowest = (f"; slowest case {SLOWEST[target] * 1000:.0f} ms" if target in SLOWEST
                   else "")
        terminalreporter.write_line(f"fuzz {target}: {total} cases ({detail}){slowest}")
