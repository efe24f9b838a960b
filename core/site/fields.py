"""The one field path of a site: parsed, located, and put in words.

Every error names the field it is about by its path in the site file — ``fluid.temperature``,
``branches[1].length``, ``branches[3].segments[0].size``, ``tolerances.roughness_range."Bypass"``
— so that the app can find the field on screen and the command line can point into the file.
:class:`FieldPath` reads such a path once; :meth:`FieldPath.words` says it the way a technician
with the file open would (``branch "AHU-2 coil" length``), the same in the app and the command
line.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass

from ..errors import BranchwiseError, InputError, describe
from ..units import Units, reason_and_value, units_for

_PART = re.compile(r'(?:"((?:[^"\\]|\\.)*)"|([A-Za-z0-9_-]+))(?:\[(\d+)\])?')
AREAS = ("fluid", "conditions", "solve", "tolerances", "record", "branches")
"""The parts of a site a path can point into (anything else points at the site itself)."""


@dataclass(frozen=True)
class FieldPath:
    """A field of a site file, parsed from its path text.

    parts: (name, index) pairs, ``branches[2].length`` → (("branches", 2), ("length", None));
    a quoted part keeps its text as the name. A text that is no site path (a file name and
    line, ``demo.toml line 7``) keeps no parts and points at the site as a whole.
    """

    text: str
    parts: tuple[tuple[str, int | None], ...]

    @classmethod
    def parse(cls, text: str) -> FieldPath:
        """The path ``text`` (what :attr:`InputError.field` holds)."""
        parts: list[tuple[str, int | None]] = []
        pos = 0
        while pos < len(text):
            m = _PART.match(text, pos)
            if m is None:
                return cls(text, ())
            name = m[2] if m[2] is not None else m[1]
            parts.append((name, int(m[3]) if m[3] is not None else None))
            pos = m.end()
            if pos < len(text):
                if text[pos] != ".":
                    return cls(text, ())
                pos += 1
        return cls(text, tuple(parts))

    def __str__(self) -> str:
        return self.text

    @property
    def area(self) -> str:
        """Which part of the site: one of :data:`AREAS`, or ``site`` (its name, notes, or the
        file as a whole)."""
        if self.parts and self.parts[0][0] in AREAS:
            return self.parts[0][0]
        return "site"

    @property
    def branch(self) -> int | None:
        """The branch's index for a path under ``branches[i]``."""
        if self.area == "branches" and self.parts:
            return self.parts[0][1]
        return None

    @property
    def segment(self) -> int | None:
        """The segment's index for a path under ``branches[i].segments[j]``."""
        return next((i for n, i in self.parts[1:] if n == "segments"), None)

    @property
    def name(self) -> str:
        """The field's own name: ``length``, ``temperature``, ``fittings`` ('' for a whole
        branch or area)."""
        if len(self.parts) < 2:
            return "" if self.area != "site" or not self.parts else self.parts[0][0]
        rest = [n for n, _ in self.parts[1:] if n != "segments"]
        return rest[0] if rest else ""

    @property
    def key(self) -> str | None:
        """The key inside the field, where it has one: the fitting of ``fittings.elbow-90``,
        the branch of ``tolerances.roughness_range."Bypass"``."""
        rest = [n for n, _ in self.parts[1:] if n != "segments"]
        return rest[1] if len(rest) > 1 else None

    def as_written(self, segments: int) -> FieldPath:
        """The path as the site file writes it: a branch of one pipe (``segments`` == 1) keeps
        its pipe keys at the top, so ``branches[1].segments[0].hw_c`` is ``branches[1].hw_c``."""
        if self.segment == 0 and segments == 1:
            text = re.sub(r"^(branches\[\d+\])\.segments\[0\]", r"\1", self.text)
            return FieldPath.parse(text)
        return self

    def words(self, names: Sequence[object] = ()) -> str:
        """The path as a technician with the file open would say it: a branch's field by the
        branch's name, ``branch "AHU-2 coil" length``, ``branch "Bypass" segment 1 size``
        (segments count from 1, as ``solve.segment`` does); any other field as the file writes
        it (``fluid.temperature``). ``names``: the branches' names in file order; a branch with
        no usable name is called by its place."""
        i = self.branch
        if i is None:
            return self.text
        typed = names[i] if i < len(names) else None
        who = (f'branch "{describe(typed.strip(), 40)}"'
               if isinstance(typed, str) and typed.strip() else f"branch {i + 1} (no name)")
        seg = f" segment {self.segment + 1}" if self.segment is not None else ""
        rest = ".".join(n if k is None else f"{n}[{k}]" for n, k in self.parts[1:]
                        if n != "segments")
        return f"{who}{seg}{' ' + rest if rest else ''}"


_BRANCH_REF = re.compile(r"branches\[\d+\](?:\.segments\[\d+\])?(?:\.[A-Za-z0-9_-]+)*")
"""A branch's field path inside message text."""


def in_words(text: str, names: Sequence[object]) -> str:
    """``text`` with every branch field path in it put in words (see :meth:`FieldPath.words`):
    a reason may name another field (``duplicates branches[0].name``)."""
    return _BRANCH_REF.sub(lambda m: FieldPath.parse(m[0]).words(names), text)


def reason_text(error: BaseException, reader: Units | str = "si") -> str:
    """An error without its field, as shown beside that field: ``reason, got value``, the
    quantities the core marked in either stated in the reader's units. An error with no
    reason (a no-solution error) is said whole."""
    u = units_for(reader)
    if not isinstance(error, InputError):
        return u.say(error)
    reason, value = reason_and_value(error, u.system, u.chosen)
    return reason + (f", got {value}" if value not in ("", None) else "")


def error_text(error: BaseException, reader: Units | str = "si",
               names: Sequence[object] | None = None) -> str:
    """An error for a person, worded the same in the app and on the command line: the field
    in words (:meth:`FieldPath.words`), then the reason: ``branch "AHU-2 coil" length: must
    not be negative, got -180 ft``. ``names``: the site's branch names (default: those the
    error carries, :attr:`~branchwise.core.errors.BranchwiseError.names`)."""
    return _with_field(error, reason_text(error, reader), names)


def marked_error_text(error: BaseException, names: Sequence[object] | None = None) -> str:
    """:func:`error_text` with the quantities left marked, for a text kept and said later in
    its reader's units (a note: ``Units.restate``)."""
    if isinstance(error, InputError):
        value = error.marked_value
        reason = error.marked_reason + (f", got {value}" if value not in ("", None) else "")
    else:
        reason = getattr(error, "marked", "") or str(error)
    return _with_field(error, reason, names)


def _with_field(error: BaseException, reason: str, names: Sequence[object] | None) -> str:
    """``reason`` after the error's field in words, and with any field path in it in words."""
    names = error.names if names is None and isinstance(error, BranchwiseError) else names
    reason = in_words(reason, names or ())
    field = getattr(error, "field", "") or ""
    return f"{FieldPath.parse(field).words(names or ())}: {reason}" if field else reason


__all__ = ["AREAS", "FieldPath", "error_text", "in_words", "marked_error_text", "reason_text"]
