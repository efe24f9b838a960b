"""Recovery copies of unsaved work: one per running branchwise, each marked with its owner.

Two branchwise open on one site (or on two sites never saved) each keep their own copy, named
``<stem>-<hash>.<owner>.toml`` in the recovery folder, where the hash is of the site file's
resolved path (the same file opened as ``../plant/site.toml`` or through a link has the same
copies) and the owner is ``<pid>-<token>`` of the instance. While it runs, an instance holds
an exclusive lock on ``.owner-<owner>.lock`` beside the copies; a copy whose owner holds no lock
any more was left by an instance that ended without saving (killed, or its terminal closed),
and only such a copy is offered back. An instance deletes its own copies, never another's:
a copy left behind goes only when the person restores or discards it.

Each copy starts with a comment line naming its owner and the site file it belongs to.
"""

from __future__ import annotations

import os
import re
import socket
from dataclasses import dataclass
from pathlib import Path
from typing import IO

from ..errors import InputError
from . import atomic
from .file_checks import read_text
from .paths import recovery_dir, recovery_path

MARK = "# branchwise recovery copy"
"""How the first line of every copy starts."""
_OWNER = re.compile(r"\A[0-9]+-[0-9a-f]{4,}\Z")


def site_key(site_path: Path | None) -> str:
    """The start of the name of every copy of ``site_path`` (None: a site never saved): its
    stem and a short hash of its resolved path (see :func:`~.paths.recovery_path`)."""
    return recovery_path(site_path).stem


@dataclass(frozen=True)
class Copy:
    """A recovery copy found in the folder."""

    path: Path
    owner: str | None
    """``<pid>-<token>`` of the instance that wrote it (None: an older copy without a mark)."""
    modified: float
    """Its modification time (s since the epoch)."""

    @property
    def pid(self) -> int | None:
        return int(self.owner.split("-")[0]) if self.owner else None


def _lock_path(folder: Path, owner: str) -> Path:
    return folder / f".owner-{owner}.lock"


def owner_alive(owner: str, folder: Path | None = None) -> bool:
    """Whether the instance ``owner`` still runs: it holds the lock on its lock file.

    Without file locks (not POSIX) no owner counts as alive: its copies are offered, and
    deleted only when the person says so.
    """
    try:
        import fcntl
    except ImportError:
        return False
    lock = _lock_path(folder or recovery_dir(), owner)
    try:
        fd = os.open(lock, os.O_RDWR)
    except OSError:
        return False  # no lock file: the owner ended (or never wrote a copy)
    try:
        fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    except OSError:
        return True  # held: the owner runs
    else:
        fcntl.flock(fd, fcntl.LOCK_UN)
        return False
    finally:
        os.close(fd)


class Keeper:
    """The recovery copies of this running instance (one per app)."""

    def __init__(self, folder: Path | None = None) -> None:
        self.folder = folder
        # os.urandom is what secrets.token_hex draws from (secrets, with hashlib, is not
        # loaded as the app starts)
        self.owner = f"{os.getpid()}-{os.urandom(3).hex()}"
        self._lock: IO[bytes] | None = None

    @property
    def where(self) -> Path:
        return self.folder or recovery_dir()

    def copy_path(self, site_path: Path | None) -> Path:
        """Where this instance keeps its copy of ``site_path``."""
        return self.where / f"{site_key(site_path)}.{self.owner}.toml"

    def write(self, site_path: Path | None, text: str) -> Path:
        """Write this instance's copy of ``site_path`` (readable by its owner only)."""
        self._hold_lock()
        path = self.copy_path(site_path)
        where = "never saved" if site_path is None else str(Path(site_path).resolve())
        head = f"{MARK}: owner {self.owner} on {socket.gethostname()}; site: {where}\n"
        atomic.atomic_write_text(path, head + text, backup=False, private=True)
        return path

    def drop(self, site_path: Path | None) -> None:
        """Delete this instance's own copy of ``site_path`` (never another's)."""
        self.copy_path(site_path).unlink(missing_ok=True)

    def left_behind(self, site_path: Path | None) -> list[Copy]:
        """Copies of ``site_path`` whose owner no longer runs, newest first."""
        return [c for c in self.copies(site_path)
                if c.owner != self.owner and (c.owner is None or
                                              not owner_alive(c.owner, self.where))]

    def held_by_others(self, site_path: Path | None) -> list[Copy]:
        """Copies of ``site_path`` kept by other instances that still run."""
        return [c for c in self.copies(site_path)
                if c.owner is not None and c.owner != self.owner
                and owner_alive(c.owner, self.where)]

    def copies(self, site_path: Path | None) -> list[Copy]:
        """Every copy of ``site_path`` in the folder, newest first."""
        key = site_key(site_path)
        found: list[Copy] = []
        folder = self.where
        if not folder.is_dir():
            return found
        for path in folder.glob("*.toml"):
            stem = path.name[: -len(".toml")]
            if stem == key:
                owner = None  # written before copies had owners
            elif stem.startswith(key + ".") and _OWNER.match(stem[len(key) + 1:]):
                owner = stem[len(key) + 1:]
            else:
                continue
            try:
                found.append(Copy(path, owner, path.stat().st_mtime))
            except OSError:
                continue
        return sorted(found, key=lambda c: c.modified, reverse=True)

    @staticmethod
    def read(copy: Copy) -> str:
        """The text of a copy (checked as every file read is)."""
        return read_text(copy.path)

    def release(self) -> None:
        """This instance ends: give up the lock (its copies left, if any, become offerable)."""
        lock, self._lock = self._lock, None
        if lock is None:
            return
        _lock_path(self.where, self.owner).unlink(missing_ok=True)
        lock.close()

    def _hold_lock(self) -> None:
        if self._lock is not None:
            return
        try:
            import fcntl
        except ImportError:
            return
        folder = self.where
        try:
            folder.mkdir(parents=True, exist_ok=True)
            handle = open(_lock_path(folder, self.owner), "ab")  # held open while the app runs
            fcntl.flock(handle.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError as exc:
            raise InputError("recovery", str(folder), f"cannot keep a recovery copy there: "
                             f"{exc.strerror or exc}") from None
        self._lock = handle
