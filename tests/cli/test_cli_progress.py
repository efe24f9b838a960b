"""Long runs show a sign of life on the terminal: a line on stderr saying what is being done,
rewritten in place and cleared at the end; nothing for a quick run, and nothing at all when
stderr is not a terminal (a script still gets one line for an error)."""

from __future__ import annotations

import io
import time

import branchwise.tui.progress as progress_module
from branchwise.tui.cli import main
from branchwise.tui.progress import Progress


class Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_the_line_says_what_is_done_and_goes_at_the_end(monkeypatch):
    monkeypatch.setattr(progress_module, "TICK", 0.01)
    screen = Terminal()
    with Progress(screen, delay=0.0) as progress:
        progress.stage("reading big.toml")
        time.sleep(0.1)
        progress.draws(30_000, 100_000)
        time.sleep(0.1)
    text = screen.getvalue()
    assert "branchwise: reading big.toml…" in text
    assert "Monte Carlo: 30,000 of 100,000 solves" in text
    assert text.endswith("\r\x1b[K")  # cleared before anything else is written


def test_nothing_for_a_quick_run_or_off_a_terminal(monkeypatch):
    monkeypatch.setattr(progress_module, "TICK", 0.01)
    screen = Terminal()
    with Progress(screen, delay=60.0) as progress:
        progress.stage("reading site.toml")
        time.sleep(0.05)
    assert screen.getvalue() == ""
    log = io.StringIO()
    with Progress(log, delay=0.0) as progress:
        progress.stage("reading site.toml")
        time.sleep(0.05)
    assert log.getvalue() == ""


def test_a_monte_carlo_run_reports_its_solves(monkeypatch, capsys):
    seen: list[tuple[int, int]] = []
    real = Progress.draws

    def spy(self, done, total):
        seen.append((done, total))
        real(self, done, total)

    monkeypatch.setattr(Progress, "draws", spy)
    assert main(["solve", "--samples", "20000"]) == 0
    assert seen and seen[-1][0] == seen[-1][1] > 20_000
    assert capsys.readouterr().err == ""  # not a terminal: nothing written
