"""The error types that reach a user.

``InputError`` is the one error for bad input: it names the field path (``branches[2].length``)
and the value as the user gave it, so the command line can print one line and the app can
show it beside the field. ``NoSolutionError`` says that the inputs are valid but the physics has
no answer, and states the limit that was hit.
"""

from __future__ import annotations


class BranchwiseError(Exception):
    """Base of every error meant for the user (the CLI prints it, exit 2)."""


class InputError(BranchwiseError, ValueError):
    """Bad input: names the field path and the value.

    >>> str(InputError("branches[2].length", "-5 m", "must be positive"))
    'branches[2].length: must be positive, got -5 m'
    """

    def __init__(self, field: str, value: object, reason: str) -> None:
        self.field = field
        self.value = value
        self.reason = reason
        # One printable line whatever the file held: a message is printed on one line by the
        # command line and shown beside a field by the app.
        super().__init__(one_line(f"{field}: {reason}, got {value}"))

    def within(self, prefix: str) -> InputError:
        """The same error with ``prefix`` put in front of its field path."""
        field = f"{prefix}.{self.field}" if self.field else prefix
        return InputError(field, self.value, self.reason)


def one_line(text: str) -> str:
    """``text`` with line breaks and other control characters shown escaped (``\\n``)."""
    if text.isprintable():
        return text
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


class NoSolutionError(BranchwiseError):
    """Valid inputs for which no answer exists; the message states the limit.

    ``field`` points at the input the user would change (for example ``solve.target_flow``).
    """

    def __init__(self, message: str, field: str = "") -> None:
        self.field = field
        super().__init__(one_line(message))
