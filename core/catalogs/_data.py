"""Reading the shipped catalog files: lazily, once, read-only.

The data live in ``branchwise.presets`` as TOML so that an engineer can read every number beside
its source. They are parsed on first use (``tomllib``, via ``importlib.resources`` so that they are
found inside an installed wheel as well as in a checkout) and cached; nothing here ever writes them.
"""

from __future__ import annotations

import difflib
import tomllib
from functools import cache
from importlib.resources import files
from typing import Any

PRESETS = "branchwise.presets"


@cache
def load(*parts: str) -> dict[str, Any]:
    """The parsed TOML file at ``presets/<parts...>`` (cached: call freely).

    A file that does not parse is a packaging bug, not user input: the TOMLDecodeError is left to
    propagate with the file name added.
    """
    resource = files(PRESETS).joinpath(*parts)
    try:
        return tomllib.loads(resource.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        raise tomllib.TOMLDecodeError(f"{'/'.join(parts)}: {exc}") from exc


@cache
def pipe_files() -> tuple[str, ...]:
    """Names of the pipe catalog files under ``presets/pipes``, sorted."""
    folder = files(PRESETS).joinpath("pipes")
    return tuple(sorted(p.name for p in folder.iterdir() if p.name.endswith(".toml")))


def close_matches(word: str, choices: list[str], n: int = 4) -> list[str]:
    """Up to ``n`` of ``choices`` that look like ``word``, best first (for error messages):
    those it begins, then those difflib finds alike (at its usual cutoff, 0.6: below it a
    strainer looked like a sharp entrance)."""
    starts = [c for c in choices if word and c.startswith(word)]
    alike = difflib.get_close_matches(word, choices, n=n, cutoff=0.6)
    return list(dict.fromkeys(starts + alike))[:n]


def spoken_list(items: list[str]) -> str:
    """``a, b, c`` — the form error messages use for lists of valid values."""
    return ", ".join(items)
