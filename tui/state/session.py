"""The site being edited, its undo history, and the edits the screens make to it.

The app holds one :class:`Session`. Screens never keep their own copy of the site: they read
``session.site`` and hand the session a change (a function applied to a fresh copy), which
becomes the new site and pushes the old one on the undo stack. Nothing here imports Textual,
numpy or pint, so the first screen can be drawn before any of them load.

Field paths are the ones :class:`~branchwise.core.errors.InputError` uses
(``branches[2].segments[0].length``, ``fluid.temperature``, ``conditions.pressure_drop``), so
an error raised anywhere in the core points straight at the widget that shows that field.
"""

from __future__ import annotations

import copy
import re
import time
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path

from branchwise.core.messages import has_marks
from branchwise.core.site.spec import BranchSpec, SegmentSpec, Site, SolveSpec

FIELD_KINDS: dict[str, str] = {
    "temperature": "temperature",
    "pressure": "pressure",
    "concentration": "fraction",
    "salinity": "salinity",
    "density": "density",
    "viscosity": "viscosity",
    "kinematic_viscosity": "kinematic_viscosity",
    "pressure_drop": "pressure",
    "total_flow": "flow",
    "elevation_change": "head",
    "diameter": "diameter",
    "length": "length",
    "roughness": "roughness",
    "measured_flow": "flow",
    "target_flow": "flow",
}
"""The kind of quantity (a key of ``units.KINDS``) each field holds, by its last path part."""

FIND_CHOICES = ("flows", "diameter", "length", "roughness")

_BARE = re.compile(r"\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*\Z")
_PLAIN_ID = re.compile(
    r"\s*(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*(?:mm|cm|m|in|inch|inches|\"|ft|um|µm)?\s*\Z"
)
_PATH_PART = re.compile(r"([a-z_]+)(?:\[(\d+)\])?")


def is_bare_number(text: str) -> bool:
    """True for ``"64"`` or ``"-1.5e3"``: a number without a unit."""
    return bool(_BARE.match(text))


def with_unit(text: str, unit: str) -> str:
    """``text`` as it should be kept: a bare number gets ``unit`` (the field's display unit)."""
    text = text.strip()
    return f"{text} {unit}" if unit and is_bare_number(text) else text


def is_plain_diameter(text: str) -> bool:
    """True when a size field holds an inner diameter (``77.9 mm``, ``3.068"``), not a catalog
    size (``3 in sch 40``, ``DN80``, ``1-1/2 type L``)."""
    return bool(_PLAIN_ID.match(text))


def parse_path(path: str) -> list[tuple[str, int | None]]:
    """``branches[2].length`` → ``[("branches", 2), ("length", None)]``.

    Parts that do not look like a field (a file name in front of a path) are skipped.
    """
    out: list[tuple[str, int | None]] = []
    for part in path.split("."):
        m = _PATH_PART.fullmatch(part.strip())
        if m:
            out.append((m.group(1), int(m.group(2)) if m.group(2) is not None else None))
    return out


@dataclass(frozen=True)
class FieldRef:
    """Where a field path points: the screen that shows it and the exact spot on it.

    area: ``fluid`` | ``branches`` | ``conditions`` | ``solve`` | ``site``; branch and segment
    indices where the path has them; name: the field's own name (``length``).
    """

    area: str
    name: str
    branch: int | None = None
    segment: int | None = None


def locate(path: str) -> FieldRef:
    """The :class:`FieldRef` of an error's field path (unknown paths point at the site)."""
    parts = parse_path(path)
    if not parts:
        return FieldRef("site", "")
    head, index = parts[0]
    name = parts[-1][0] if len(parts) > 1 else head
    if head == "branches" and index is not None:
        segment = next((i for n, i in parts[1:] if n == "segments"), None)
        if name in ("segments", "branches"):
            name = ""
        return FieldRef("branches", name, index, segment)
    if head in ("fluid", "conditions", "solve", "tolerances"):
        return FieldRef(head, "" if name == head else name)
    return FieldRef("site", name)


AREA_LABELS = {"fluid": "liquid", "conditions": "given", "solve": "find",
               "tolerances": "tolerance:", "site": ""}


def field_label(site: Site, path: str) -> str:
    """A field path in words: ``branches[2].length`` → ``AHU-3 coil, length``."""
    ref = locate(path)
    name = ref.name.replace("_", " ")
    if ref.area == "branches" and ref.branch is not None and ref.branch < len(site.branches):
        where = branch_name(site, ref.branch)
        if ref.segment is not None and len(site.branches[ref.branch].segments) > 1:
            where += f" segment {ref.segment + 1}"
        return f"{where}, {name}" if name else where
    if ref.area == "site":
        return path
    area = AREA_LABELS.get(ref.area, "")
    if name in (ref.area, area):  # conditions.given: "given", not "given given"
        return area or path
    return f"{area} {name}".strip()


def error_text(error: BaseException, site: Site, system: str = "si",
               units: Mapping[str, str] | None = None) -> str:
    """An error for a person: the field in words, the reason, the value as typed.

    system, units: the unit system (``si`` | ``us``) and the per-quantity display units
    (kind → unit) in which the quantities the core marked in a message are stated.
    """
    field = getattr(error, "field", "")
    if not field or getattr(error, "reason", None) is None:
        return said(error, system, units)
    if field == "conditions.given":
        from .givens import given_of, given_text, given_words

        if not given_text(site):  # its value being retyped: not "no such reading"
            return (f"given {given_words(site, *given_of(site))}: needs a value (the other "
                    "readings are kept)")
    return f"{field_label(site, field)}: {reason_text(error, system, units)}"


def reason_text(error: BaseException | None, system: str = "si",
                units: Mapping[str, str] | None = None) -> str:
    """An error without its field, for the message shown beside that field: ``reason, got
    value``, the quantities the core marked in either stated in ``system`` and ``units`` (as
    :func:`error_text` does). An error with no reason (no solution) is said whole."""
    reason = getattr(error, "reason", None)
    if reason is None:
        return said(error, system, units)
    value = getattr(error, "value", "")
    if has_marks(getattr(error, "marked", "")):  # quantities to state in the user's units
        from branchwise.core.units import reason_and_value

        reason, value = reason_and_value(error, system, units)
    return reason + (f", got {value}" if value not in ("", None) else "")


def said(item: object, system: str = "si", units: Mapping[str, str] | None = None) -> str:
    """A warning's or an error's text with its marked quantities in the user's units (its
    own text when nothing in it is marked: the units module is loaded only when needed)."""
    if not getattr(item, "marked", ""):
        return str(getattr(item, "message", "") or item)
    from branchwise.core.units import say

    return say(item, system, units)


# ---- reading the site ------------------------------------------------------------------------

def shown_path(path: Path) -> str:
    """A path as a person reads it: absolute, with ``~`` for the home folder
    (``./site.toml`` → ``~/plant/site.toml``)."""
    full = Path(path).expanduser().absolute()
    try:
        return str(Path("~") / full.relative_to(Path.home()))
    except ValueError:
        return str(full)


def text_of(value: object) -> str:
    """A site value as shown in a field: '' for nothing, numbers without a trailing '.0'."""
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value)


def find_of(site: Site) -> str:
    solve = site.solve
    if solve is None or not isinstance(solve.find, str) or solve.find not in FIND_CHOICES:
        return "flows"
    return solve.find


def branch_name(site: Site, index: int) -> str:
    name = text_of(site.branches[index].name).strip()
    return name or f"Branch {index + 1}"


def unique_name(site: Site, stem: str) -> str:
    """``stem``, or ``stem 2``, ``stem 3``… whichever no branch uses yet."""
    taken = {text_of(b.name).strip().casefold() for b in site.branches}
    stem = stem.strip() or "Branch"
    if stem.casefold() not in taken:
        return stem
    base = re.sub(r"\s+\d+\Z", "", stem) or stem
    n = 2
    while f"{base} {n}".casefold() in taken:
        n += 1
    return f"{base} {n}"


# ---- edits (each takes a copy of the site and changes it in place) ------------------------

def set_find(site: Site, find: str, branch: str | None = None, target: str | None = None,
             segment: int | None = None) -> None:
    """Set what to solve for; ``flows`` keeps the rest of the [solve] table for later."""
    if find not in FIND_CHOICES:
        raise ValueError(f"unknown find {find!r}")
    if site.solve is None:
        site.solve = SolveSpec()
    site.solve.find = find
    if branch is not None:
        site.solve.branch = branch or None
    if target is not None:
        site.solve.target_flow = target or None
    if segment is not None:
        site.solve.segment = segment if segment > 1 else None


def rename_branch(site: Site, index: int, new: str) -> None:
    """Rename a branch and what refers to it by name (the [solve] table, ``conditions.given``
    when its reading is the given), so that they stay together."""
    old = text_of(site.branches[index].name).strip()
    site.branches[index].name = new
    if site.solve is not None and text_of(site.solve.branch).strip().casefold() == old.casefold():
        site.solve.branch = new
    given = site.conditions.given
    if isinstance(given, str) and given.strip() == old and old:
        site.conditions.given = new.strip()


def new_branch(site: Site, like: BranchSpec | None = None) -> BranchSpec:
    """A branch to add: a copy of ``like`` without its reading, or an empty pipe."""
    if like is None:
        return BranchSpec(name=unique_name(site, "Branch"), segments=[SegmentSpec()])
    br = copy.deepcopy(like)
    br.measured_flow = None
    br.name = unique_name(site, text_of(like.name) or "Branch")
    return br


# ---- the session -----------------------------------------------------------------------------

@dataclass
class Step:
    """One entry of the undo history: the site before an edit, and what the edit was."""

    label: str
    key: str
    site: Site
    at: float


UNDO_LIMIT = 200
COALESCE_SECONDS = 2.0
"""Keystrokes in the same field within this many seconds are one undo step."""


@dataclass
class Session:
    """The one site being edited, with undo/redo and a change counter.

    ``revision`` goes up on every change (screens and the solver compare it); ``saved_revision``
    is the revision last written to ``site.source``, and ``saved`` that site itself: an edit
    undone (or typed) back to what was saved leaves nothing unsaved.
    """

    site: Site
    revision: int = 0
    saved_revision: int = 0
    undo_stack: list[Step] = field(default_factory=list)
    redo_stack: list[Step] = field(default_factory=list)
    parked: dict[str, str] = field(default_factory=dict)
    """Values the site cannot hold after a switch (a fluid field another kind does not use,
    the branch and target of a find switched to the flows), to put back on the way back.
    Readings are never parked: the site keeps them all (``givens``)."""
    carried: dict[str, str] = field(default_factory=dict)
    """Readings the app filled in from the answer when they became the given, by given key:
    one switched away from untouched is taken out again, as nobody read it."""
    saved: Site | None = None
    """The site as last saved or opened (None: nothing on disk matches it, such as restored
    work); set with the first revision when the session starts."""

    def __post_init__(self) -> None:
        if self.saved is None and self.revision == self.saved_revision:
            self.saved = copy.deepcopy(self.site)

    @property
    def dirty(self) -> bool:
        # Site equality leaves out the file and its text: only the values count.
        return self.revision != self.saved_revision and self.site != self.saved

    @property
    def path(self) -> Path | None:
        return self.site.source

    def edit(self, label: str, change: Callable[[Site], None], key: str = "") -> Site:
        """Apply ``change`` to a copy of the site and make the copy the site.

        key: the field being typed into; consecutive edits with the same non-empty key within
        :data:`COALESCE_SECONDS` are undone together.
        """
        new = copy.deepcopy(self.site)
        change(new)
        now = time.monotonic()
        top = self.undo_stack[-1] if self.undo_stack else None
        if not (key and top is not None and top.key == key and now - top.at < COALESCE_SECONDS):
            self.undo_stack.append(Step(label, key, self.site, now))
            del self.undo_stack[:-UNDO_LIMIT]
        else:
            top.at = now
        self.redo_stack.clear()
        self.site = new
        self.revision += 1
        return new

    def undo(self) -> str | None:
        """Go back one step; returns its label (None: nothing to undo)."""
        if not self.undo_stack:
            return None
        step = self.undo_stack.pop()
        self.redo_stack.append(Step(step.label, step.key, self.site, time.monotonic()))
        self._restore(step.site)
        return step.label

    def redo(self) -> str | None:
        if not self.redo_stack:
            return None
        step = self.redo_stack.pop()
        self.undo_stack.append(Step(step.label, "", self.site, time.monotonic()))
        self._restore(step.site)
        return step.label

    def _restore(self, site: Site) -> None:
        # The file this session writes to stays the same whatever the history holds.
        site.source, site.origin = self.site.source, self.site.origin
        self.site = site
        self.revision += 1

    def replace(self, site: Site) -> None:
        """Start over on another site (opened, or the demo): history and parked values go."""
        self.site = site
        self.undo_stack.clear()
        self.redo_stack.clear()
        self.parked.clear()
        self.carried.clear()
        self.revision += 1
        self.mark_saved()

    def mark_saved(self) -> None:
        self.saved_revision = self.revision
        self.saved = copy.deepcopy(self.site)

    def mark_unsaved(self) -> None:
        """Nothing on disk holds the present site (work restored from a recovery copy)."""
        self.saved_revision = -1
        self.saved = None
