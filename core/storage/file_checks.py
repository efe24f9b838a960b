"""What branchwise reads and replaces, checked before it happens.

* Only a regular file is read: a FIFO would wait for a writer for ever, ``/dev/zero`` never ends,
  a terminal or socket blocks. Anything else is refused before it is opened, and what is read
  is capped at :data:`MAX_READ_BYTES` (a site of 100,000 branches is about 10 MB).
* One rule for every file the command line writes: an existing file is replaced only when asked
  (``--force``), a ``.bak`` of it is kept, and never a file that is not a regular file or is
  read-only.
* A folder on the way that is in fact a file is named as such, not left as "File exists".
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from ..errors import InputError

MAX_READ_BYTES = 16 * 1024 * 1024
"""The largest file read (16 MB): a site file is a few kB; 100,000 branches take about 10 MB."""


def _size_words(size: int) -> str:
    if size >= 1024 ** 3:
        return f"{size / 1024 ** 3:.1f} GB"
    return f"{size / 1024 ** 2:.1f} MB"


def what_it_is(mode: int) -> str:
    """The kind of a file that is not a regular one, in words."""
    if stat.S_ISDIR(mode):
        return "a folder"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def _refusal(path: Path, field: str, mode: int) -> InputError:
    kind = what_it_is(mode)
    if stat.S_ISDIR(mode):
        return InputError(field, str(path), "is a folder, not a file")
    return InputError(field, str(path), f"is {kind}, not a regular file; branchwise reads and "
                      "writes only regular files")


def _os_error(path: Path, field: str, exc: OSError, doing: str) -> InputError:
    if isinstance(exc, FileNotFoundError):
        return InputError(field, str(path), "file not found")
    if isinstance(exc, NotADirectoryError):
        blocker = file_in_the_way(path)
        where = f" ({blocker} is a file)" if blocker is not None else ""
        return InputError(field, str(path), f"a folder on the way is a file{where}")
    return InputError(field, str(path), f"cannot {doing}: {exc.strerror or exc}")


def read_bytes(path: Path, field: str = "", limit: int = MAX_READ_BYTES) -> bytes:
    """The bytes of the regular file ``path``, at most ``limit`` of them; an InputError
    (naming ``field``, by default the file's name) for anything else, before it is opened."""
    path = Path(path)
    field = field or path.name
    try:
        info = os.stat(path)
    except OSError as exc:
        raise _os_error(path, field, exc, "read") from None
    if not stat.S_ISREG(info.st_mode):
        raise _refusal(path, field, info.st_mode)
    if info.st_size > limit:
        raise _too_big(path, field, info.st_size, limit)
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0)
    try:
        fd = os.open(path, flags)
    except OSError as exc:
        raise _os_error(path, field, exc, "read") from None
    try:
        opened = os.fstat(fd)
        if not stat.S_ISREG(opened.st_mode):  # swapped for something else since the stat
            raise _refusal(path, field, opened.st_mode)
        chunks: list[bytes] = []
        total = 0
        while total <= limit:
            chunk = os.read(fd, min(1 << 20, limit + 1 - total))
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
    except OSError as exc:
        raise _os_error(path, field, exc, "read") from None
    finally:
        os.close(fd)
    if total > limit:  # it grew while being read
        raise _too_big(path, field, total, limit)
    return b"".join(chunks)


def _too_big(path: Path, field: str, size: int, limit: int) -> InputError:
    return InputError(field, str(path), f"is {_size_words(size)}; branchwise reads files up to "
                      f"{_size_words(limit)} (a site of 100,000 branches is about 10 MB)")


def read_text(path: Path, field: str = "") -> str:
    """The UTF-8 text of the regular file ``path`` (a byte-order mark dropped), checked as
    :func:`read_bytes` checks it."""
    data = read_bytes(path, field)
    try:
        return data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError:
        raise InputError(field or Path(path).name, str(path),
                         "is not UTF-8 text (binary data or another encoding)") from None


def file_in_the_way(path: Path) -> Path | None:
    """The first part of ``path``'s folders that exists and is not a folder (a file where a
    folder should be), or None."""
    for parent in reversed(Path(path).absolute().parents):
        try:
            info = os.stat(parent)
        except OSError:
            return None  # missing from here on: nothing in the way yet
        if not stat.S_ISDIR(info.st_mode):
            return parent
    return None


def check_folder(path: Path, field: str) -> None:
    """Refuse to write ``path`` when a folder it needs is a file (say which)."""
    blocker = file_in_the_way(path)
    if blocker is not None:
        raise InputError(field, str(path), f"could not save: {blocker} is a file where a "
                         "folder should be; move it away or choose another place")


def check_replace(path: Path, field: str, force: bool) -> None:
    """The command line's one rule for a file it is about to write: a missing file is fine
    (in a folder that exists: none is made); an existing one only with ``force`` (and a
    ``.bak`` is then kept by the writer); never something that is not a regular file, nor a
    read-only file."""
    path = Path(path)
    check_folder(path, field)
    if not path.parent.is_dir():  # never made on the way: a typo in it would go unseen
        raise InputError(field, str(path), f"its folder {path.parent} does not exist")
    try:
        info = os.stat(path)
    except FileNotFoundError:
        return
    except OSError as exc:
        raise _os_error(path, field, exc, "write") from None
    if not stat.S_ISREG(info.st_mode):
        raise _refusal(path, field, info.st_mode)
    if not force:
        raise InputError(field, str(path), "already exists; choose another name, or add "
                         "--force to replace it (the old file is kept as .bak)")
    if is_read_only(path, info.st_mode):
        raise InputError(field, str(path), "is read-only; it is not replaced even with --force")


def is_read_only(path: Path, mode: int | None = None) -> bool:
    """True for a file nobody may write (no write permission bit: someone made it read-only,
    which counts even for an administrator who could write it), or that this user may not."""
    if mode is None:
        try:
            mode = os.stat(path).st_mode
        except OSError:
            return False
    return not mode & 0o222 or not os.access(path, os.W_OK)
