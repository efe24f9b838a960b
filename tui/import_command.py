"""``branchwise import LINES.csv [-o SITE]``: a line list from a spreadsheet as a site file.

The line list is read whole first (:func:`branchwise.core.site.line_list.read_line_list`);
a file with any bad cell writes nothing and names every bad cell, one per line, by its line
in the file and its column title. Without ``-o`` (or with ``-o -``) the site goes to standard
output; ``-`` as LINES.csv reads standard input.
"""

from __future__ import annotations

import sys
from pathlib import Path
from typing import TextIO

from branchwise.core.errors import InputError

MAX_BYTES = 16 * 1024 * 1024
"""Standard input or a line list larger than this is refused (a line list is kilobytes)."""


def read_text(path: Path, label: str, save_as: str = "CSV UTF-8") -> str:
    """A text file, or standard input for ``-``, as UTF-8 (a byte-order mark dropped); at most
    :data:`MAX_BYTES`; every failure an InputError naming ``label`` (a text in another encoding
    is told to be saved as ``save_as``)."""
    from branchwise.core.storage.file_checks import read_bytes

    if str(path) != "-":  # a regular file only, checked before it is opened (never a FIFO)
        data = read_bytes(path, label, MAX_BYTES)
    else:
        try:
            data = sys.stdin.buffer.read(MAX_BYTES + 1)
        except OSError as exc:
            raise InputError(label, str(path), f"cannot read: {exc.strerror or exc}") from None
    if len(data) > MAX_BYTES:
        raise InputError(label, f"more than {MAX_BYTES // 2**20} MiB", "is too large")
    try:
        return data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        raise InputError(f"{label} line {line}", repr(data[exc.start:exc.start + 8]),
                         f"is not UTF-8 text; save it as {save_as}") from None


def run_import(lines: Path, output: Path | None, template: Path | None, force: bool,
               out: TextIO, err: TextIO) -> int:
    """Read ``lines``, write the site (see the module docstring); the exit status."""
    from branchwise.core.site.line_list import LineListError, read_line_list
    from branchwise.core.site.read import load_site
    from branchwise.core.site.write import dump_site
    from branchwise.core.storage.atomic import atomic_write_text
    from branchwise.core.storage.file_checks import check_replace

    label = "<stdin>" if str(lines) == "-" else lines.name
    to_stdout = output is None or str(output) == "-"
    if not to_stdout and output is not None:
        if str(lines) != "-" and lines.exists() and output.resolve() == lines.resolve():
            raise InputError("--output", str(output), "is the line list itself; give the site "
                             "a file of its own")
        check_replace(output, "--output", force)
    like = load_site(template) if template is not None else None
    try:
        listed = read_line_list(read_text(lines, label), label)
    except LineListError as exc:
        for problem in exc.problems:
            print(f"branchwise: {problem}", file=err)
        print(f"branchwise: {label}: {len(exc.problems)} bad "
              f"cell{'s' if len(exc.problems) > 1 else ''}; nothing written", file=err)
        return 2
    stem = "line list" if str(lines) == "-" else lines.stem
    site = listed.site(stem, like)
    text = dump_site(site)
    if to_stdout:
        out.write(text)
    else:
        assert output is not None
        atomic_write_text(output, text, backup=True)
    segments = sum(len(b.segments) for b in listed.branches)
    where = "standard output" if to_stdout else str(output)
    print(f"branchwise: {len(listed.branches)} branches ({segments} segments) from {label} "
          f"written to {where}", file=err)
    if listed.ignored:
        print(f"branchwise: columns left out: {', '.join(listed.ignored)}", file=err)
    if like is None:
        read = sum(b.measured_flow is not None for b in listed.branches)
        todo = ("no reading yet: set the liquid and a pressure drop or a total flow" if not read
                else "one branch reading, the head solved from it: set the liquid" if read == 1
                else f"{read} branch readings: set the liquid, and in [conditions] the reading "
                     "to solve from (given = a branch's name, or \"all\" to weigh them together)")
        print(f"branchwise: the site has water at 20 °C and {todo} before solving (or use "
              "--template SITE)", file=err)
    return 0
