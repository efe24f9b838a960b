"""A site file's field paths in the words of someone reading the file: branches by name.

Errors keep their field path (``branches[1].length``: the app finds the widget by it); the
command line puts the branch's name in front of it so that a technician with the file open
reads ``branch "AHU-2 coil" length`` rather than counting tables from zero.
"""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence

from ..errors import describe
from .spec import Value

_BRANCH_REF = re.compile(r"branches\[(\d+)\](?:\.segments\[(\d+)\])?(\.[^\s,;:()]+)?")
"""A branch's field path inside a message: ``branches[1].length``,
``branches[3].segments[0].size``."""


def branch_names(text: str) -> list[Value]:
    """The ``name`` of each ``[[branches]]`` table of the site file text ``text``, as typed
    (None where a table has none); [] when the text is not TOML or has no branch list. Used to
    put an error's field path in the branch's own name."""
    import tomllib

    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError:
        return []
    tables = doc.get("branches")
    if not isinstance(tables, list):
        return []
    return [t.get("name") if isinstance(t, Mapping) else None for t in tables]


def in_words(text: str, names: Sequence[Value]) -> str:
    """``text`` with every branch field path put by the branch's name, as a technician reading
    the file would say it: ``branches[1].length`` → ``branch "AHU-2 coil" length``,
    ``branches[3].segments[0].size`` → ``branch "Bypass" segment 1 size`` (segments count
    from 1, as ``solve.segment`` does). ``names``: the branches' names in file order; a branch
    with no usable name is called by its place, ``branch 2 (no name)``."""

    def words(m: re.Match[str]) -> str:
        i = int(m[1])
        name = names[i] if i < len(names) else None
        if isinstance(name, str) and name.strip():
            who = f'branch "{describe(name.strip(), 40)}"'
        else:
            who = f"branch {i + 1} (no name)"
        seg = f" segment {int(m[2]) + 1}" if m[2] is not None else ""
        return who + seg + (f" {m[3][1:]}" if m[3] else "")

    return _BRANCH_REF.sub(words, text)
