"""The error types that reach a user.

``InputError`` is the one error for bad input: it names the field path (``branches[2].length``)
and the value as the user gave it, so the command line can print one line and the app can
show it beside the field (:class:`PhaseLimit`, one kind of it, says that a liquid would freeze or
boil). ``NoSolutionError`` says that the inputs are valid but the physics has
no answer, and states the limit that was hit.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any, Self


class BranchwiseError(Exception):
    """Base of every error meant for the user (the CLI prints it, exit 2).

    ``names``: the branch names of the site the error belongs to, in file order (as typed;
    set where a site is read, built or solved), so that a boundary without the site can still
    say a branch's field by the branch's name.
    """

    names: tuple[object, ...] = ()

    def naming(self, names: Sequence[object]) -> Self:
        """This error, with the branch names of its site (see :attr:`names`)."""
        self.names = tuple(names)
        return self


class InputError(BranchwiseError, ValueError):
    """Bad input: names the field path and the value.

    >>> str(InputError("branches[2].length", "-5 m", "must be positive"))
    'branches[2].length: must be positive, got -5 m'
    """

    def __init__(self, field: str, value: object, reason: str) -> None:
        from .messages import render

        self.field = field
        # ``reason`` and a text ``value`` may hold quantities marked by ``core.messages``: the
        # plain attributes say them in SI, ``marked_*`` keep them for ``units.say``.
        self.marked_reason, self.marked_value = reason, value
        self.value = render(value) if isinstance(value, str) else value
        self.reason = render(reason)
        self.marked = f"{field}: {reason}, got {value}"
        # One printable line whatever the file held: a message is printed on one line by the
        # command line and shown beside a field by the app.
        super().__init__(one_line(f"{field}: {self.reason}, got {self.value}"))

    def within(self, prefix: str) -> InputError:
        """The same error with ``prefix`` put in front of its field path."""
        field = f"{prefix}.{self.field}" if self.field else prefix
        return InputError(field, self.marked_value, self.marked_reason)


class PhaseLimit(InputError):
    """A liquid's temperature beyond where it is a liquid: frozen or boiling (not merely past
    the range a property model covers). ``phase``: the change in words, its quantities marked,
    such as "water freezes at 0 °C at atmospheric pressure"."""

    def __init__(self, field: str, value: object, reason: str, phase: str) -> None:
        super().__init__(field, value, reason)
        self.phase = phase

    def within(self, prefix: str) -> PhaseLimit:
        field = f"{prefix}.{self.field}" if self.field else prefix
        return PhaseLimit(field, self.marked_value, self.marked_reason, self.phase)


def one_line(text: str) -> str:
    """``text`` with line breaks and other control characters shown escaped (``\\n``)."""
    if text.isprintable():
        return text
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


_BIDI = frozenset("\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069")
"""Marks that reorder the text around them on screen (a name could read backwards)."""


def inert(text: str) -> str:
    """``text`` safe to print to a terminal: control characters other than line breaks and
    tabs (the escape that starts a terminal command, a carriage return, a bell) and marks that
    reorder text are shown escaped (``\\x1b``), so a name, tag or note read from a file can
    neither clear the screen, set the window title nor hide what follows it."""
    if text.isprintable():
        return text
    return "".join(repr(c)[1:-1] if (not c.isprintable() and c not in "\n\t"
                                     and (ord(c) < 0x20 or 0x7f <= ord(c) < 0xa0))
                   or c in _BIDI else c for c in text)


def inert_output(text: str, fmt: str) -> str:
    """A report in format ``fmt`` safe to print: a control character in a name, tag or record
    line is shown escaped as :func:`inert` does. JSON escapes its own below U+0020; the rest
    get JSON's ``\\u`` escapes, so that it stays valid JSON."""
    if fmt != "json":
        return inert(text)
    return "".join(f"\\u{ord(c):04x}" if inert(c) != c else c for c in text)


class NoSolutionError(BranchwiseError):
    """Valid inputs for which no answer exists; the message states the limit.

    ``field`` points at the input the user would change (for example ``solve.target_flow``).
    ``marked`` is the message with its quantities still marked (see ``core.messages``), for a
    boundary that states them in the user's units; the plain message states them in SI.
    """

    def __init__(self, message: str, field: str = "") -> None:
        from .messages import render

        self.field = field
        self.marked = message
        super().__init__(one_line(render(message)))


def describe(value: Any, limit: int = 60) -> str:
    """A value as it appears in a one-line message: strings as typed, other values by repr.

    Control characters are escaped and long text is cut to ``limit`` characters, so that a
    message stays one printable line whatever the file held.
    """
    try:
        text = value if isinstance(value, str) else repr(value)
    except ValueError:  # an int longer than Python turns into text (4300 digits by default)
        if not isinstance(value, int):
            raise
        text = f"a whole number of about {value.bit_length() * 0.30103:.0f} digits"
    except RecursionError:  # lists inside lists, thousands deep
        text = f"a {type(value).__name__} nested too deeply to show"
    text = one_line(text)
    return text if len(text) <= limit else text[: limit - 1] + "…"
