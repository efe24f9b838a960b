"""Safe reading and writing of the TOML files people keep.

Three promises, because these files hold a person's field work:

* A save never leaves a half-written file under the real name. :func:`atomic_write_text`
  writes a temporary file in the same folder, flushes and fsyncs it, then swaps it in with
  ``os.replace`` (atomic on POSIX and Windows); the previous version survives as ``<name>.bak``.
* A file that does not load is reported (which file, which line, why) and never modified:
  :func:`load_toml` only reads.
* Every file written carries ``format = N`` and ``kind = "..."``; :func:`migrate` brings older
  formats up to :data:`FORMAT` one step at a time and refuses newer ones.
"""

from __future__ import annotations

import copy
import re
import sys
import tomllib
from collections.abc import Callable, Mapping, MutableMapping
from pathlib import Path
from typing import Any

from ..errors import InputError, one_line
from .atomic import atomic_write_text
from .file_checks import read_bytes, read_text

FORMAT = 1
"""The file format this version writes and reads. History: 0 = no ``format`` key (written by
hand); 1 = adds ``format`` and ``kind`` at the top of the file."""

KINDS = ("presets", "settings", "site")
"""What a file can be; a format-1 file says which in its ``kind`` key."""

# Reading -----------------------------------------------------------------------------------

_POSITION = re.compile(r"\s*\((?:at line (\d+), column (\d+)|at end of document)\)\s*$")
_PLAIN_WORDS: tuple[tuple[str, str], ...] = (
    ("Invalid value", "this value is not valid TOML (text needs quotes)"),
    ("Invalid statement", "this line is neither `key = value` nor a `[table]` header"),
    ("Expected '=' after a key", "expected `=` after the key"),
    ("Cannot overwrite a value", "this key is set twice"),
    ("Cannot declare", "this table is declared twice"),
    ("Unterminated string", "a quoted string is not closed"),
    ("Unclosed array", "a list is not closed with `]`"),
    ("Unclosed inline table", "an inline table is not closed with `}`"),
    ("Illegal character '\\n'", "a quoted string is not closed on its line"),
    ("Illegal character", "contains a character that TOML does not allow"),
    ("Expected ']' at the end of a table", "a `[table]` header is not closed with `]`"),
    ("Invalid initial character for a key", "a key starts with a character keys cannot have"),
    ("Invalid date or datetime", "this date or time is not valid"),
)


def _printable(text: str, limit: int = 60) -> str:
    """``text`` with control characters escaped and cut to ``limit`` characters, for messages."""
    shown = one_line(text.strip())
    return shown if len(shown) <= limit else shown[: limit - 1] + "…"


def _shown(value: object) -> str:
    """A value read from a file as one short printable line, text in quotes (``'1'``: the
    quotes say why a number in quotes is refused where a number belongs)."""
    return _printable(repr(value))


def _plain(message: str) -> str:
    for start, words in _PLAIN_WORDS:
        if message.startswith(start):
            return words
    return message[:1].lower() + message[1:]


def _decode_error(field: str, text: str, exc: tomllib.TOMLDecodeError) -> InputError:
    """Turn the parser's ``"Invalid value (at line 7, column 5)"`` into file, line and reason."""
    message = str(exc)
    found = _POSITION.search(message)
    lines = text.splitlines()
    if found and found.group(1):
        line, column = int(found.group(1)), int(found.group(2))
        where = f"column {column}"
    else:
        line, where = max(len(lines), 1), "end of file"
    core = message[: found.start()] if found else message
    offending = lines[line - 1] if 0 < line <= len(lines) else ""
    return InputError(f"{field} line {line}", _printable(offending), f"{_plain(core)} ({where})")


def load_toml(path: Path, field: str = "") -> dict[str, Any]:
    """Read and parse the TOML file ``path``; never modifies it.

    ``field`` names the file in errors (default: its file name). Every failure is an
    InputError: a missing file, an unreadable one, bytes that are not UTF-8 text, and a parse
    error, whose field is ``"<file> line <n>"``, whose value is the offending line and whose
    reason is the parser's complaint in plain words. A UTF-8 byte-order mark is accepted.
    Only a regular file is read, and at most :data:`~.file_checks.MAX_READ_BYTES` of it
    (:func:`~.file_checks.read_bytes`): a FIFO or a device is refused before it is opened.
    """
    path = Path(path)
    field = field or path.name
    return parse_toml(decode_text(read_bytes(path, field), field), field)


def decode_text(data: bytes, field: str) -> str:
    """UTF-8 bytes of the file named ``field`` as text (a byte-order mark dropped); an
    InputError naming the line of the first byte that is not UTF-8."""
    try:
        text = data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        bad = data[exc.start : exc.start + 8]
        reason = "is not UTF-8 text (binary data or another encoding); save it as UTF-8"
        raise InputError(f"{field} line {line}", repr(bad), reason) from None
    return text


MAX_DEPTH = 20
"""Lists and tables inside each other beyond this many levels are refused (a site file has six
at most): far below Python's recursion limit, so a damaged file is a message, not a crash."""

_DEEP_KEY = re.compile(  # more than MAX_DEPTH parts: Python's parser takes time as parts²
    r"^[ \t]*\[{0,2}[ \t]*(?:(?:[\w-]++|\"[^\"\n]*+\"|'[^'\n]*+')[ \t]*\.[ \t]*)"
    + f"{{{MAX_DEPTH}}}", re.MULTILINE | re.ASCII)
"""A dotted key (``a.b.c = 1``, ``[a.b.c]``) too deep, at the start of a line."""
_TOO_DEEP = (f"lists or tables are nested more than {MAX_DEPTH} levels deep "
             "(a site file needs a handful)")


_RESERVED = re.compile("[\ue000\ue001]")


def parse_toml(text: str, field: str) -> dict[str, Any]:
    """Parse TOML ``text`` of the file named ``field``. Besides the parser's complaints (as in
    :func:`load_toml`), InputErrors naming the line for what breaks Python's parser itself:
    nesting past :data:`MAX_DEPTH` (the recursion limit, or time growing as depth²) and a
    whole number longer than ``sys.get_int_max_str_digits()`` (4300 digits by default)."""
    if deep := _DEEP_KEY.search(text):  # before parsing: its time grows as depth²
        raise _located(field, text, text.count("\n", 0, deep.start()) + 1, _TOO_DEEP)
    if reserved := _RESERVED.search(text):  # core.messages marks quantities with them
        raise _located(field, text, text.count("\n", 0, reserved.start()) + 1,
                       "holds a private-use character (U+E000 or U+E001) that branchwise "
                       "keeps for its own use")
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise _decode_error(field, text, exc) from None
    except RecursionError:
        error = _located(field, text, _deepest_line(text) or 1, _TOO_DEEP)
    except ValueError as exc:  # int() refuses a number with too many digits
        line = _long_number_line(text)
        if line is None or "digits" not in str(exc):
            raise
        error = _located(field, text, line, f"a number longer than "
                         f"{sys.get_int_max_str_digits()} digits cannot be read")
    else:
        where = _too_deep(doc)
        if where is None:
            return doc
        line = _deepest_line(text)  # brackets show the line; dotted keys only the path
        error = (_located(field, text, line, _TOO_DEEP) if line
                 else InputError(field, _printable(where), _TOO_DEEP))
    raise error


def _located(field: str, text: str, line: int, reason: str) -> InputError:
    lines = text.splitlines()
    shown = _printable(lines[line - 1]) if 0 < line <= len(lines) else ""
    return InputError(f"{field} line {line}", shown, reason)


def _long_number_line(text: str) -> int | None:
    """The line of the first run of digits longer than Python reads (None without a limit)."""
    limit = sys.get_int_max_str_digits()
    found = re.search(f"[0-9_]{{{limit + 1},}}", text) if limit else None
    return None if found is None else text.count("\n", 0, found.start()) + 1


def _deepest_line(text: str) -> int | None:
    """The first line where brackets and braces open more than :data:`MAX_DEPTH` deep.

    A rough count (brackets inside quoted text count too), used only to point at the place
    of a document already known to be nested too deeply; None if no line stands out.
    """
    depth = 0
    for number, line in enumerate(text.splitlines(), start=1):
        for char in line:
            depth += (char in "[{") - (char in "]}")
            if depth > MAX_DEPTH:
                return number
    return None


def _too_deep(doc: Mapping[str, Any]) -> str | None:
    """The path to the first point of ``doc`` nested deeper than :data:`MAX_DEPTH`, or None.
    Iterative, so it is safe at any depth."""
    stack: list[tuple[object, str, int]] = [(doc, "", 0)]
    while stack:
        value, where, depth = stack.pop()
        if depth > MAX_DEPTH:
            return where
        if isinstance(value, Mapping):
            stack.extend((v, f"{where}.{k}" if where else str(k), depth + 1)
                         for k, v in value.items())
        elif isinstance(value, list):
            stack.extend((v, f"{where}[{i}]", depth + 1) for i, v in enumerate(value))
    return None


def check_depth(doc: Mapping[str, Any], field: str) -> None:
    """Refuse a document nested more than :data:`MAX_DEPTH` levels: an InputError naming
    ``field`` (the file), with the path to the first point too deep as its value."""
    where = _too_deep(doc)
    if where is not None:
        raise InputError(field, _printable(where), _TOO_DEEP)


# Format versions ---------------------------------------------------------------------------


def _from_0(doc: dict[str, Any], kind: str) -> dict[str, Any]:
    """Format 0 → 1: a hand-written file without ``format`` gains ``format`` and ``kind``."""
    doc["kind"] = kind
    doc["format"] = 1
    return doc


_STEPS: dict[int, Callable[[dict[str, Any], str], dict[str, Any]]] = {0: _from_0}
"""One step per older format: ``_STEPS[n]`` turns format n into format n + 1."""


def _check_kind(kind: str) -> None:
    if kind not in KINDS:
        raise ValueError(f"kind must be one of {', '.join(KINDS)}, not {kind!r}")


def migrate(doc: dict[str, Any], kind: str, path: Path | str) -> dict[str, Any]:
    """``doc`` as read from ``path``, brought to format :data:`FORMAT`; ``doc`` is not changed.

    A missing ``format`` key means format 0. A file from a newer branchwise is refused rather
    than half-read; a file that says it is another kind (a settings file opened as a site) is
    refused too. ``kind`` is one of :data:`KINDS`.
    """
    _check_kind(kind)
    name = Path(path).name
    check_depth(doc, name)  # before the deep copy below, which recurses
    version = doc.get("format", 0)
    if isinstance(version, bool) or not isinstance(version, int) or version < 0:
        raise InputError(f"{name} format", _shown(version), "must be a whole number such as 1")
    if version > FORMAT:
        reason = f"written by a newer branchwise (format {version}); this one reads format {FORMAT}"
        raise InputError(f"{name} format", version, reason)
    said = doc.get("kind", kind)
    if said != kind:
        raise InputError(f"{name} kind", _shown(said), f"this is not a {kind} file")
    result = copy.deepcopy(doc)
    while version < FORMAT:
        result = _STEPS[version](result, kind)
        version += 1
    return result


def stamp(doc: MutableMapping[str, Any], kind: str) -> None:
    """Set ``format`` and ``kind`` in a document about to be written (dict or tomlkit doc)."""
    _check_kind(kind)
    # Only when different: re-setting a tomlkit item would drop a comment on its line.
    if doc.get("format") != FORMAT:
        doc["format"] = FORMAT
    if doc.get("kind") != kind:
        doc["kind"] = kind


# Comment-preserving edits ------------------------------------------------------------------


def plain(item: object) -> object:
    """A tomlkit item as a plain Python value (plain values pass through)."""
    unwrap = getattr(item, "unwrap", None)
    return unwrap() if callable(unwrap) else item


def sync_table(table: MutableMapping[str, Any], values: Mapping[str, object]) -> None:
    """Make ``table`` hold exactly ``values``, touching only what changed: a value left as it
    was keeps its line and its comment."""
    for name in [name for name in table if name not in values]:
        del table[name]
    for name, value in values.items():
        if name not in table or plain(table[name]) != value:
            table[name] = value


def editable(path: Path, kind: str, header: str) -> Any:
    """The file at ``path`` as a tomlkit document to change and save, or a new one that
    starts with the comment ``header``.

    Refuses (InputError) a file that does not load or comes from a newer version: saving over
    it would destroy what the person wrote.
    """
    import tomlkit  # lazy: only a save needs the comment-preserving writer

    if not path.exists():
        doc = tomlkit.document()
        doc.add(tomlkit.comment(header))
        doc.add(tomlkit.nl())
        stamp(doc, kind)
        return doc
    try:
        migrate(load_toml(path), kind, path)
    except InputError as exc:
        reason = f"has an error and must be fixed first ({exc})"
        raise InputError(path.name, str(path), reason) from exc
    return tomlkit.parse(read_text(path))


def save_document(path: Path, doc: Any, kind: str) -> None:
    """Stamp ``doc`` (a tomlkit document) with format and kind and write it atomically."""
    import tomlkit

    stamp(doc, kind)
    atomic_write_text(path, tomlkit.dumps(doc))
