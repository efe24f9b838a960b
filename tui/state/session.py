"""The site being edited, its undo history, and the edits the screens make to it.

The app holds one :class:`Session`. Screens never keep their own copy of the site: they read
``session.site`` and hand the session a change (a function applied to a fresh copy), which
becomes the new site and pushes the old one on the undo stack. Nothing here imports Textual,
numpy or pint, so the first screen can be drawn before any of them load.

Field paths are the ones :class:`~branchwise.core.errors.InputError` uses
(:class:`~branchwise.core.site.fields.FieldPath`), so an error raised anywhere in the core
points straight at the widget that shows that field.
"""

from __future__ import annotations

import copy
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path, PosixPath, WindowsPath
from typing import TypeVar, cast

from branchwise.core.finds import FINDS
from branchwise.core.names import name_key
from branchwise.core.site.spec import BranchSpec, SegmentSpec, Site, SolveSpec

from .values import field_names, make_inert, text_of, unique_name

T = TypeVar("T")


def find_of(site: Site) -> str:
    """What the site asks to find (a key of ``core.finds.FINDS``; the flows when unset)."""
    solve = site.solve
    if solve is None or not isinstance(solve.find, str) or solve.find not in FINDS:
        return "flows"
    return solve.find


# ---- edits (each takes a copy of the site and changes it in place) ------------------------

def set_find(site: Site, find: str, branch: str | None = None, target: str | None = None,
             segment: int | None = None) -> None:
    """Set what to solve for; ``flows`` keeps the rest of the [solve] table for later."""
    if find not in FINDS:
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
    when its reading is the given, its readings in the earlier visits), so that they stay
    together."""
    old = text_of(site.branches[index].name).strip()
    site.branches[index].name = new
    if site.solve is not None and name_key(text_of(site.solve.branch)) == name_key(old):
        site.solve.branch = new
    given = site.conditions.given
    if isinstance(given, str) and given.strip() == old and old:
        site.conditions.given = new.strip()
    from branchwise.core.site.visits import rename_in_visits  # on a rename only

    rename_in_visits(site, old, new)


def new_branch(site: Site, like: BranchSpec | None = None) -> BranchSpec:
    """A branch to add: a copy of ``like`` without its reading and its tag (a plant tag
    names one line; two lines do not share it), or an empty pipe."""
    if like is None:
        return BranchSpec(name=unique_name(site, "Branch"), segments=[SegmentSpec()])
    br = copy.deepcopy(like)
    br.measured_flow = None
    br.tag = None
    br.name = unique_name(site, text_of(like.name) or "Branch")
    return br


def inert_note(session: Session) -> str:
    """Said when a site opened holds control characters in its texts (shown escaped)."""
    if not session.made_inert:
        return ""
    return ("Control characters in this site's names, tags or notes are shown escaped "
            "(such as \\x1b), so that they cannot act on the terminal; saving keeps them so.")


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
    saved: Site | None = None
    """The site as last saved or opened (None: nothing on disk matches it, such as restored
    work); set with the first revision when the session starts."""

    opened: int = 0
    """The revision at which the present site was opened: what was worked out before it (a
    band, an answer) belongs to another site."""

    made_inert = False
    """Control characters in the site's texts were shown escaped when it was opened (said
    once by the app; a save keeps them so)."""

    def __post_init__(self) -> None:
        self.made_inert = make_inert(self.site)
        if self.saved is None and self.revision == self.saved_revision:
            self.saved = copy.deepcopy(self.site)

    @property
    def dirty(self) -> bool:
        # Site equality leaves out the file and its text: only the values count.
        return self.revision != self.saved_revision and self.site != self.saved

    @property
    def path(self) -> Path | None:
        return self.site.source

    def edit(self, label: str, change: Callable[[Site], object], key: str = "") -> Site:
        """Apply ``change`` to a copy of the site and make the copy the site.

        key: the field being typed into; consecutive edits with the same non-empty key within
        :data:`COALESCE_SECONDS` are undone together.
        """
        new = copied(self.site)
        change(new)
        make_inert(new)  # a pasted control character too
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
        self.made_inert = make_inert(site)
        self.site = site
        self.undo_stack.clear()
        self.redo_stack.clear()
        self.parked.clear()
        self.revision += 1
        self.opened = self.revision
        self.mark_saved()

    def mark_saved(self) -> None:
        self.saved_revision = self.revision
        self.saved = copy.deepcopy(self.site)

    def mark_unsaved(self) -> None:
        """Nothing on disk holds the present site (work restored from a recovery copy)."""
        self.saved_revision = -1
        self.saved = None


_ATOMS = frozenset({str, int, float, bool, type(None)})
"""Values a copy may share with the original (immutable, of exactly these types)."""


def copied(value: T) -> T:
    """A deep copy of a site (a tree of dataclasses, lists and dicts holding text and numbers),
    the same as :func:`copy.deepcopy` makes of it, several times faster: an edit copies the
    whole site, on every keystroke. Anything else in the tree is copied by ``deepcopy``."""
    kind = type(value)
    if kind in _ATOMS or kind is PosixPath or kind is WindowsPath:
        return value
    if kind is list:
        return cast(T, [copied(v) for v in cast(list[object], value)])
    if kind is dict:
        return cast(T, {k: copied(v) for k, v in cast(dict[object, object], value).items()})
    names = field_names(kind)  # (worked out once per type)
    if names is not None and not hasattr(kind, "__slots__"):
        new = copy.copy(value)
        for name in names:
            object.__setattr__(new, name, copied(getattr(value, name)))
        return new
    return copy.deepcopy(value)
