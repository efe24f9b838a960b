"""A save interrupted at any instant leaves either the whole old file or the whole new one.

Two kinds of interruption: an exception after the temporary file is written (the rename
fails), and a real writer process killed with SIGKILL at random moments. The reference is the
POSIX guarantee for rename(2) (POSIX.1-2017: "If the link named by the new argument exists, it
shall be removed and old renamed to new ... a link named new shall remain visible to other
threads throughout the renaming operation and refer either to the file referred to by new or
old") — which only helps a writer that never writes into the real name directly. The kill
harness is itself checked on a naive writer, which it must catch.
"""

from __future__ import annotations

import os
import random
import re
import select
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from branchwise.core.errors import InputError
from branchwise.core.storage.atomic import atomic_write_text
from branchwise.core.storage.paths import list_sites
from branchwise.core.storage.toml_files import load_toml

TEMP_NAME = re.compile(r"\.site\.toml(\.bak)?\.[0-9a-f]{8}\.tmp")


def _text(label: str, lines: int = 10_000) -> str:
    """A TOML file of about 1 MB whose last line proves it is complete."""
    body = "".join(f"{label}-{i:06d} {'x' * 80}\n" for i in range(lines))
    return f'format = 1\nkind = "site"\nname = "{label}"\nfill = """\n{body}"""\ncomplete = true\n'


def _leftovers(folder: Path) -> list[str]:
    names = {"site.toml", "site.toml.bak", "old.txt", "new.txt"}
    return [p.name for p in folder.iterdir() if p.name not in names]


# (1) The rename fails after the temporary file was written --------------------------------


@pytest.mark.parametrize("failing", ["site.toml", "site.toml.bak", "any"])
def test_failed_rename_leaves_old_file_and_no_temp(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, failing: str
) -> None:
    target = tmp_path / "site.toml"
    atomic_write_text(target, _text("old", 50))
    atomic_write_text(target, _text("older", 50), backup=False)
    atomic_write_text(target, _text("old", 50))  # now site.toml.bak holds "older"
    real_replace = os.replace

    def crash(src: str | os.PathLike[str], dst: str | os.PathLike[str]) -> None:
        if failing == "any" or Path(dst).name == failing:
            raise OSError(28, "No space left on device")
        real_replace(src, dst)

    monkeypatch.setattr(os, "replace", crash)
    with pytest.raises(InputError, match="could not save: No space left on device"):
        atomic_write_text(target, _text("new", 50))
    monkeypatch.undo()
    assert target.read_text() == _text("old", 50)
    assert load_toml(target)["complete"] is True
    backup = (tmp_path / "site.toml.bak").read_text()
    # The backup either stayed "older" or already received the complete "old".
    assert backup in (_text("older", 50), _text("old", 50))
    assert _leftovers(tmp_path) == []


def test_interrupt_during_write_cleans_up(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    target = tmp_path / "site.toml"
    atomic_write_text(target, "a = 1\n")

    def interrupted(fd: int) -> None:
        raise KeyboardInterrupt

    monkeypatch.setattr(os, "fsync", interrupted)
    with pytest.raises(KeyboardInterrupt):  # not turned into an InputError, not swallowed
        atomic_write_text(target, "a = 2\n", backup=False)
    monkeypatch.undo()
    assert target.read_text() == "a = 1\n"
    assert _leftovers(tmp_path) == []


# (2) A writer process killed with SIGKILL --------------------------------------------------

CHILD = """
import sys
from pathlib import Path
from branchwise.core.storage.atomic import atomic_write_text
target, old, new, mode = Path(sys.argv[1]), Path(sys.argv[2]), Path(sys.argv[3]), sys.argv[4]
texts = [new.read_text(), old.read_text()]
print("go", flush=True)
i = 0
while True:
    if mode == "atomic":
        atomic_write_text(target, texts[i % 2])
    else:
        target.write_text(texts[i % 2])
    i += 1
"""


def _kill_rounds(folder: Path, mode: str, rounds: int, seed: int) -> list[str]:
    """Run a writer, kill it at a random moment, return what was found under the real name."""
    old, new = _text("old"), _text("new")
    (folder / "old.txt").write_text(old)
    (folder / "new.txt").write_text(new)
    target = folder / "site.toml"
    pick = random.Random(seed)
    env = {**os.environ, "PYTHONDONTWRITEBYTECODE": "1"}
    found = []
    for _ in range(rounds):
        target.write_text(old)
        args = [str(target), str(folder / "old.txt"), str(folder / "new.txt"), mode]
        child = subprocess.Popen(
            [sys.executable, "-c", CHILD, *args], stdout=subprocess.PIPE, text=True, env=env
        )
        try:
            ready, _, _ = select.select([child.stdout], [], [], 20.0)
            assert ready and child.stdout.readline() == "go\n", "writer did not start"
            time.sleep(pick.uniform(0.0, 0.04))
        finally:
            child.send_signal(signal.SIGKILL)
            child.wait(timeout=20)
            child.stdout.close()  # type: ignore[union-attr]
        assert child.returncode == -signal.SIGKILL
        text = target.read_text(errors="replace")
        found.append("old" if text == old else "new" if text == new else "partial")
        if mode == "atomic":
            assert found[-1] != "partial", f"partial file after a kill ({len(text)} chars)"
            assert load_toml(target)["complete"] is True
            backup = folder / "site.toml.bak"
            if backup.exists():
                assert backup.read_text() in (old, new)
            stray = _leftovers(folder)
            assert all(TEMP_NAME.fullmatch(name) for name in stray), stray
            # Temporary files a killed writer leaves are never listed as sites.
            assert [entry.path.name for entry in list_sites(folder)] == ["site.toml"]
    return found


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")
def test_killed_writer_never_leaves_a_partial_file(tmp_path: Path) -> None:
    found = _kill_rounds(tmp_path, "atomic", rounds=8, seed=1)
    assert len(found) == 8


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")
def test_kill_harness_catches_a_naive_writer(tmp_path: Path) -> None:
    # Writing straight into the real name truncates it first, so most kills find it partial;
    # if this stopped catching anything, the test above would prove nothing.
    found = _kill_rounds(tmp_path, "naive", rounds=4, seed=2)
    assert "partial" in found, found
