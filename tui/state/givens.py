"""The readings a site holds, which one is the given, and the edits that change either.

A site may keep every reading of a walkdown (``core.readings``): the gauge's pressure drop, a
total flow, any branch's clamp-on measured flow. ``conditions.given`` names the one the head
is solved from; the app writes it only while another reading is held beside that one, so a
site with one reading saves exactly as it always did. Switching the given never takes a
reading out of the site: a commissioning record needs them side by side.

Nothing here imports Textual, numpy or pint (``core.readings`` loads pint only to compare).
"""

from __future__ import annotations

from branchwise.core.errors import InputError
from branchwise.core.givens import GIVENS, HEADER_READINGS
from branchwise.core.site.readings import chosen, readings
from branchwise.core.site.reconcile import ALL, solves_from_all
from branchwise.core.site.spec import Site

from .values import branch_name, text_of

Given = tuple[str, int | None]
"""(a key of ``core.givens.GIVENS``, the branch's index for a branch reading, else None)."""


def given_of(site: Site) -> Given:
    """The reading the head is solved from, as ``core.readings.chosen`` picks it.

    A site the core refuses still opens: ``given`` as written when it names a kind or a branch
    (a given whose value is being retyped stays the given), else the first reading held
    (the pressure drop before the total flow before the branches), else the pressure drop,
    the one to fill in on a new site.
    """
    try:
        reading, _ = chosen(site)
    except InputError:
        pass
    else:
        return reading.kind, reading.branch
    named = _named(site)
    if named is not None:
        return named
    return first_held(site)


def _named(site: Site) -> Given | None:
    given = site.conditions.given
    if not isinstance(given, str):
        return None
    key = given.strip()
    if key in HEADER_READINGS:
        return key, None
    for i, br in enumerate(site.branches):
        if text_of(br.name).strip() == key:
            return "measured_flow", i
    return None


def first_held(site: Site) -> Given:
    """The reading to fall back on: the first held, or the pressure drop when none is."""
    held = readings(site)
    return (held[0].kind, held[0].branch) if held else ("pressure_drop", None)


def held(site: Site) -> list[Given]:
    """Every reading the site holds, as (kind, branch)."""
    return [(r.kind, r.branch) for r in readings(site)]


def given_key(site: Site, kind: str, branch: int | None) -> str:
    """What ``conditions.given`` says for a reading: its kind, or the branch's name."""
    if kind == "measured_flow" and branch is not None:
        return text_of(site.branches[branch].name).strip()
    return kind


def reading_text(site: Site, kind: str, branch: int | None = None) -> str:
    """A reading's value as typed ('' when the site does not hold it)."""
    if kind == "measured_flow":
        if branch is None or not 0 <= branch < len(site.branches):
            return ""
        return text_of(site.branches[branch].measured_flow)
    return text_of(getattr(site.conditions, kind))


def given_text(site: Site) -> str:
    """The given reading's value as typed ('' when it has none yet; '' when every reading is
    weighed: no one reading is the given)."""
    return "" if weighs_all(site) else reading_text(site, *given_of(site))


ALL_WORDS = "all readings, weighed"
"""The given in words when every reading is weighed (``conditions.given = "all"``)."""


def weighs_all(site: Site) -> bool:
    """Whether the site is solved from all its readings weighed together."""
    return solves_from_all(site)


def weigh_all(site: Site) -> None:
    """Solve from every reading weighed together (the readings stay as they are)."""
    site.conditions.given = ALL


# ---- edits (on a copy of the site, as session.edit hands them) ------------------------------

def set_reading(site: Site, kind: str, value: str | None, branch: int | None = None) -> None:
    """Write one reading (empty clears it); the other readings and ``given`` stay."""
    text = value or None
    if kind == "measured_flow":
        if branch is None or not 0 <= branch < len(site.branches):
            raise ValueError(f"no branch {branch}")
        site.branches[branch].measured_flow = text
    elif kind in HEADER_READINGS:
        setattr(site.conditions, kind, text)
    else:
        raise ValueError(f"unknown given {kind!r}")


def _still_all(site: Site, was_all: bool) -> bool:
    """Keep "all readings, weighed" as the given after a reading changed, while two or more
    readings are left to weigh (the person chose it; editing one reading does not undo that)."""
    if was_all and len(held(site)) >= 2:
        site.conditions.given = ALL
        return True
    return False


def make_given(site: Site, kind: str, branch: int | None = None) -> None:
    """Make (kind, branch) the given: named in ``conditions.given`` while another reading is
    held beside it (or while it holds no value yet, so that it stays the one being typed);
    ``given`` cleared when it is the only reading, or when nothing is held and it is the
    pressure drop (the given a site without readings starts from)."""
    now = held(site)
    alone = now == [(kind, branch)] or (not now and kind == "pressure_drop")
    site.conditions.given = None if alone else given_key(site, kind, branch)


def set_given(site: Site, kind: str, value: str, branch: int | None = None) -> None:
    """Give ``kind`` (on ``branch`` for a measured flow) the value ``value`` and make it the
    given; the other readings are kept."""
    set_reading(site, kind, value, branch)
    make_given(site, kind, branch)


def clear_reading(site: Site, kind: str, branch: int | None = None) -> None:
    """Take a reading out of the site. When it was the given, the first reading left takes
    its place; ``given`` goes when only one reading is left."""
    was, was_all = given_of(site), weighs_all(site)
    set_reading(site, kind, None, branch)
    if not _still_all(site, was_all):
        make_given(site, *(first_held(site) if was == (kind, branch) or was_all else was))


def remove_branch(site: Site, index: int) -> None:
    """Take a branch out, and its reading with it (as :func:`clear_reading` does)."""
    if site.branches[index].measured_flow is not None:
        clear_reading(site, "measured_flow", index)
    if weighs_all(site):  # still two readings or more: weighed they stay
        site.branches.pop(index)
        return
    was = given_of(site)
    site.branches.pop(index)
    if was[1] == index:  # the given, still without a value: the first reading left instead
        was = first_held(site)
    elif was[1] is not None and was[1] > index:
        was = (was[0], was[1] - 1)
    if site.conditions.given is not None:
        make_given(site, *was)


def add_reading(site: Site, branch: int, value: str) -> bool:
    """A branch's measured flow typed in the branch table: kept beside the given, or made
    the given when the site has no reading to solve from. True when it is the given."""
    was, was_all = given_of(site), weighs_all(site)
    keep = was_all or (bool(reading_text(site, *was)) and was != ("measured_flow", branch))
    set_reading(site, "measured_flow", value, branch)
    if not _still_all(site, was_all):
        make_given(site, *(was if keep and not was_all else ("measured_flow", branch)))
    return not keep


def given_words(site: Site, kind: str, branch: int | None) -> str:
    """A reading in words: ``Δp across the header``, ``total flow``, ``reading on AHU-3``."""
    if GIVENS[kind].on_branch and branch is not None:
        return f"reading on {branch_name(site, branch)}"
    label = GIVENS[kind].label  # "Total flow" reads "total flow"; "Δp…" stays as it is
    return label[0].lower() + label[1:] if label[:1].isascii() else label


def given_label(site: Site, kind: str, branch: int | None) -> str:
    """A reading as the list of givens shows it: ``Δp across the header``, ``Reading on
    AHU-3``."""
    words = given_words(site, kind, branch)
    return words[0].upper() + words[1:]


def needs_value(error: BaseException, site: Site) -> str | None:
    """The words for an error on the given reading while its value is being retyped (not
    "no such reading": the reading is there, waiting for its value); None for any other."""
    if getattr(error, "field", "") != "conditions.given" or given_text(site):
        return None
    return (f"given {given_words(site, *given_of(site))}: needs a value (the other readings "
            "are kept)")
