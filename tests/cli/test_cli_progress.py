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


def test_a_large_site_says_what_stage_it_is_in(tmp_path, monkeypatch):
    """A site of many branches (the 100,000 of the report took most of a minute with no sign
    of life): the line names the stage, with the number of branches."""
    import sys

    from branchwise.core.site.read import demo_site
    from branchwise.core.site.spec import BranchSpec, SegmentSpec
    from branchwise.core.site.write import save_site

    site = demo_site()
    site.branches = [BranchSpec(name=f"B{i}", segments=[SegmentSpec(
        size="3 in sch 40", length="20 m", material="commercial-steel")])
        for i in range(2_000)]
    path = save_site(site, tmp_path / "big.toml")
    monkeypatch.setattr(progress_module, "TICK", 0.002)
    monkeypatch.setattr(progress_module, "DELAY", 0.0)
    screen = Terminal()
    monkeypatch.setattr(sys, "stderr", screen)
    assert main(["solve", str(path), "-o", str(tmp_path / "out.txt")]) == 0
    text = screen.getvalue()
    assert "working out 2,000 branches" in text
    assert text.endswith("\r\x1b[K")
