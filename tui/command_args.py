"""What the command line's arguments mean to every command: ``-`` for standard input or
output, the files a command may write, whole numbers, the text table's width, the site read."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site

WIDTH_DEFAULT, WIDTH_MIN, WIDTH_MAX = 80, 40, 1000
"""The text table's line width: the terminal's (or COLUMNS) when writing to a terminal, 80
otherwise, --width over both; kept within WIDTH_MIN to WIDTH_MAX columns."""


def whole(text: str | None, option: str, low: int, high: int | None, default: int) -> int:
    """The whole number typed for ``option`` (``10000``, ``10_000``, ``1e4``), in range."""
    from branchwise.core.errors import InputError

    if text is None:
        return default
    number: int | None
    try:
        number = int(text)
    except ValueError:
        try:
            value = float(text)
        except ValueError:
            value = float("nan")
        number = int(value) if value.is_integer() else None
    if number is None or number < low or (high is not None and number > high):
        span = f"from {low:,} to {high:,}" if high is not None else f"of at least {low}"
        raise InputError(option, text, f"must be a whole number {span}")
    return number


def same_file(a: Path, b: Path | None) -> bool:
    if is_stdio(a) or is_stdio(b):
        return False
    return b is not None and a.resolve() == b.resolve()


def is_stdio(path: Path | None) -> bool:
    """``-``: standard input for a site, standard output for ``-o``."""
    return path is not None and str(path) == "-"


def text_width(args: argparse.Namespace | None, output: Path | None) -> int:
    """The text table's line width: --width; else, writing to standard output, COLUMNS or the
    terminal's width (80 when it is not a terminal); else (a file) 80."""
    import shutil

    text = getattr(args, "width", None)
    if text is not None:
        return whole(text, "--width", WIDTH_MIN, WIDTH_MAX, WIDTH_DEFAULT)
    if output is not None and not is_stdio(output):
        return WIDTH_DEFAULT
    columns = shutil.get_terminal_size((WIDTH_DEFAULT, 24)).columns
    return max(WIDTH_MIN, min(WIDTH_MAX, columns)) if columns > 0 else WIDTH_DEFAULT


def load_site_arg(site_path: Path) -> Site:
    """The site file, or for ``-`` the site read from standard input."""
    from branchwise.core.site.read import load_site, parse_site

    if not is_stdio(site_path):
        return load_site(site_path)
    from .import_command import read_text

    site = parse_site(read_text(site_path, "<stdin>", "UTF-8 text"), "<stdin>")
    site.source = None
    return site


def may_write(args: argparse.Namespace | None, *targets: tuple[str, Path | None]) -> None:
    """The one rule for a file the command line writes: a new file is written; an existing
    one is replaced only with --force (kept as ``.bak``), never a FIFO, device or read-only
    file."""
    from branchwise.core.storage.file_checks import check_replace

    force = bool(getattr(args, "force", False))
    for option, path in targets:
        if path is not None and not is_stdio(path):
            check_replace(path, option, force)
