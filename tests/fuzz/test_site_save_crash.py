"""A site save killed at a random instant leaves the complete previous site or the complete new
one, and it loads.

A forked child process saves two different sites in turn over the same file with
:func:`~branchwise.core.site.write.save_site` (``overwrite=True``) and is killed with SIGKILL
after a random delay. The reference is the POSIX guarantee for rename(2) (POSIX.1-2017: the
new name "shall remain visible ... and refer either to the file referred to by new or old"),
which protects only a writer that never writes into the real name. The harness itself is
checked against a writer that saves in place (tests/core/storage/test_saves_killed.py does the same
for the bare atomic write).
"""

from __future__ import annotations

import os
import random
import re
import signal
import time
from pathlib import Path

import pytest
from fuzz_support import STATS
from site_mutations import CUSTOM_SEGMENTS

from branchwise.core.site.read import demo_text, load_site, parse_site
from branchwise.core.site.solve import solve_site
from branchwise.core.site.spec import Site
from branchwise.core.site.write import dump_site, save_site
from branchwise.core.storage.paths import list_sites

pytestmark = pytest.mark.skipif(not hasattr(os, "fork"), reason="needs POSIX fork and signals")

TEMP_NAME = re.compile(r"\.site\.toml(\.bak)?\.[0-9a-f]{8}\.tmp")
ROUND_BUDGET_S = 3.0
"""Stop starting new rounds after this long (s), once a kill has landed inside a save (at
most three times as long): the test must stay a few seconds."""


def _writer(target: Path, sites: list[Site], mode: str) -> None:
    """The child's loop: save the two sites in turn until killed (never returns)."""
    i = 1  # the file starts as sites[0]: the first save changes it
    while True:
        site = sites[i % 2]
        if mode == "save_site":
            save_site(site, target, overwrite=True)
        else:  # in place, as a careless writer would: truncate, then write a line at a time,
            # each synced to disk, as slowly as a network drive or a memory card takes it
            with open(target, "w", encoding="utf-8") as handle:
                for line in dump_site(site).splitlines(keepends=True):
                    handle.write(line)
                    handle.flush()
                    os.fsync(handle.fileno())
        i += 1


def _sites() -> tuple[list[str], list[Site]]:
    """The two sites the child saves: their text as save_site writes it, and the sites."""
    sites = [parse_site(demo_text()), parse_site(CUSTOM_SEGMENTS)]
    texts = [dump_site(site) for site in sites]
    assert texts[0] != texts[1] and sites[0] != sites[1]
    return texts, sites


def _leftovers(folder: Path) -> list[str]:
    return [p.name for p in folder.iterdir() if p.name not in {"site.toml", "site.toml.bak"}]


def _kill_once(target: Path, sites: list[Site], mode: str, delay: float) -> None:
    """Fork a writer (a child process with branchwise already loaded, so a round costs
    milliseconds, not an interpreter start), let it run ``delay`` s, SIGKILL it."""
    pid = os.fork()
    if pid == 0:  # the child: never return into pytest, whatever happens
        try:
            _writer(target, sites, mode)
        finally:
            os._exit(1)
    time.sleep(delay)
    os.kill(pid, signal.SIGKILL)
    _, status = os.waitpid(pid, 0)
    assert os.WIFSIGNALED(status) and os.WTERMSIG(status) == signal.SIGKILL, \
        "the writer stopped before it was killed"


def _kill_rounds(folder: Path, mode: str, max_rounds: int, seed: int) -> list[str]:
    """Kill a writer at random moments; per round what the real name held: "0"/"1" (one of
    the two complete sites) or "partial"; "+temp" when the kill left a temporary file, i.e.
    it landed inside a save, between creating the temporary file and renaming it."""
    texts, sites = _sites()
    target = folder / "site.toml"
    pick = random.Random(seed)
    found: list[str] = []
    for site in sites:  # load the solver and the units now, not inside the timed rounds
        solve_site(site)
    start = time.monotonic()
    while len(found) < max_rounds:
        spent = time.monotonic() - start
        enough = mode != "save_site" or any(state.endswith("+temp") for state in found)
        if spent > 3 * ROUND_BUDGET_S or (spent > ROUND_BUDGET_S and enough):
            break
        save_site(sites[0], target, overwrite=True)
        _kill_once(target, sites, mode, pick.uniform(0.0, 0.15))
        text = target.read_text(encoding="utf-8", errors="replace")
        state = str(texts.index(text)) if text in texts else "partial"
        stray = _leftovers(folder)
        found.append(state + ("+temp" if stray else ""))
        if mode != "save_site":
            continue
        STATS[f"save-kill {'inside-a-write' if stray else 'between-writes'}"] += 1
        assert state != "partial", f"a partial site after a kill ({len(text)} characters)"
        loaded = load_site(target)
        assert loaded == sites[int(state)], "the file holds the text but not the site"
        assert solve_site(loaded).result.flows.size == len(loaded.branches)
        backup = folder / "site.toml.bak"
        if backup.exists():
            assert backup.read_text(encoding="utf-8") in texts, "a partial backup"
        assert all(TEMP_NAME.fullmatch(name) for name in stray), stray
        assert [entry.path.name for entry in list_sites(folder)] == ["site.toml"]
        for name in stray:  # as the next save would after an hour; keeps the count honest
            (folder / name).unlink()
    return found


def test_killed_site_save_leaves_a_complete_site_that_loads(tmp_path: Path) -> None:
    found = _kill_rounds(tmp_path, "save_site", max_rounds=30, seed=7)
    assert len(found) >= 8, found
    # The kills must have hit the write itself, not only the moments around it.
    assert any(state.endswith("+temp") for state in found), found


def test_kill_harness_catches_a_site_written_in_place(tmp_path: Path) -> None:
    # Without the temporary file and the rename, some kill finds half a site: if this stopped
    # catching anything, the test above would prove nothing.
    found = _kill_rounds(tmp_path, "in-place", max_rounds=6, seed=8)
    assert "partial" in found, found
