"""Saving a file so that it is never half-written: a temporary file in the same folder, flushed
and fsynced, then swapped in with ``os.replace`` (atomic on POSIX and Windows); the previous
version survives as ``<name>.bak``.
"""

from __future__ import annotations

import glob
import os
import stat
import time
from pathlib import Path

from ..errors import InputError

BACKUP_SUFFIX = ".bak"
_TEMP_SUFFIX = ".tmp"
STALE_TEMP_SECONDS = 3600.0
"""A temporary file this old (s) was left by a writer that died; a live save takes seconds."""


def backup_path(path: Path) -> Path:
    """``north.toml`` → ``north.toml.bak``: where the previous version of ``path`` is kept."""
    return path.with_name(path.name + BACKUP_SUFFIX)


def _fsync_dir(folder: Path) -> None:
    """Make a rename in ``folder`` durable. POSIX only: Windows cannot open a folder."""
    if os.name != "posix":
        return
    fd = os.open(folder, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _replace_with_bytes(path: Path, data: bytes, mode: int | None) -> None:
    """Write ``data`` to a fresh temporary file beside ``path``, fsync it, rename it over ``path``.

    The temporary name starts with a dot and ends in ``.tmp`` so that folder listings of
    ``*.toml`` never pick it up, even when a killed process leaves one behind.
    """
    # os.urandom is what secrets.token_hex draws from (secrets, with hashlib, is not loaded
    # as the app starts)
    temp = path.with_name(f".{path.name}.{os.urandom(4).hex()}{_TEMP_SUFFIX}")
    # 0o666 lets the umask decide the permissions of a new file, as for any other save.
    fd = os.open(temp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0), 0o666)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        if mode is not None:
            os.chmod(temp, mode)
        os.replace(temp, path)
    except BaseException:
        # Also on KeyboardInterrupt: the temp file is ours and useless; the error goes on.
        temp.unlink(missing_ok=True)
        raise


def _through_links(path: Path) -> Path:
    """The file a symbolic link ``path`` points to (through every link), else ``path``."""
    if not path.is_symlink():
        return path
    try:
        return path.resolve(strict=False)
    except (OSError, RuntimeError):  # a loop of links: written as the name given, refused there
        return path


def _sweep_stale_temps(path: Path) -> None:
    """Delete temporary files of ``path`` (and of its backup) left by a killed writer."""
    cutoff = time.time() - STALE_TEMP_SECONDS
    for leftover in path.parent.glob(f".{glob.escape(path.name)}.*{_TEMP_SUFFIX}"):
        try:
            if leftover.stat().st_mtime < cutoff:
                leftover.unlink()
        except FileNotFoundError:
            continue  # another writer swept it first


def atomic_write_text(path: Path, text: str, *, backup: bool = True,
                      private: bool = False) -> None:
    """Save ``text`` (UTF-8) as ``path`` so that a crash at any instant leaves a complete file.

    With ``backup``, the file being replaced is first copied to ``<name>.bak``, also through
    a temporary file and ``os.replace``, so that at every instant the real name holds either
    the complete old text or the complete new one, and the ``.bak`` is complete too. The new
    file keeps the permissions of the one it replaces. Missing folders are created here, and
    temporary files older than :data:`STALE_TEMP_SECONDS` left by a killed writer are removed.

    A symbolic link is written through: the file it points to gets the new text (and its
    ``.bak`` beside it), the link stays a link. Only a regular file is ever replaced. With
    ``private``, the file is readable by its owner only (a recovery copy); otherwise a file
    replaced keeps its own permissions and a new one gets the umask's.

    An operating-system failure (permissions, full disk) becomes an InputError naming the
    file; no temporary file is left behind.
    """
    from .file_checks import check_folder, what_it_is

    path = _through_links(Path(path))
    data = text.encode("utf-8")
    check_folder(path, path.name)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        try:
            info = path.stat()
        except FileNotFoundError:
            old_mode: int | None = None
        else:
            if not stat.S_ISREG(info.st_mode):
                raise InputError(path.name, str(path), f"is {what_it_is(info.st_mode)}, not a "
                                 "regular file; it is not replaced")
            old_mode = stat.S_IMODE(info.st_mode)
        new_mode = 0o600 if private else old_mode
        if backup and old_mode is not None:
            _replace_with_bytes(backup_path(path), path.read_bytes(), old_mode)
        _replace_with_bytes(path, data, new_mode)
        _fsync_dir(path.parent)
        _sweep_stale_temps(path)
    except OSError as exc:
        reason = f"could not save: {exc.strerror or exc}"
        raise InputError(path.name, str(path), reason) from exc
