"""What can be found: the flows, or one segment's diameter, length or roughness for a target flow.

One registry, :data:`FINDS`, read by the site file, the solver, the reports and the app. Each
unknown's equations live in its own module of :mod:`branchwise.core.numerics.unknowns`, under
the same key.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class FindKind:
    """One thing to find. key: the site file's ``solve.find`` (and, for an unknown, the
    :class:`~branchwise.core.model.Segment` field it sets); label: in the app's list; noun: in
    a sentence (``Diameter of 'AHU-3 coil'``); quantity: the units kind of the found value
    (None for the flows, which are always found).
    """

    key: str
    label: str
    noun: str
    quantity: str | None


FINDS: dict[str, FindKind] = {f.key: f for f in (
    FindKind("flows", "the flows", "flows", None),
    FindKind("diameter", "the diameter", "diameter", "diameter"),
    FindKind("length", "the length", "length", "length"),
    FindKind("roughness", "the roughness", "roughness", "roughness"),
)}
"""Everything that can be found, by key, the flows first."""

UNKNOWNS = tuple(key for key, f in FINDS.items() if f.quantity is not None)
"""The keys of the finds that size one segment for a target flow."""


def found_kind(key: str) -> str:
    """The units kind of the value found for ``key`` (an unknown's key)."""
    return FINDS[key].quantity or key


def found_noun(key: str) -> str:
    """The found value in a sentence, capitalised: ``Diameter``."""
    noun = FINDS[key].noun if key in FINDS else key
    return noun[:1].upper() + noun[1:]


__all__ = ["FINDS", "UNKNOWNS", "FindKind", "found_kind", "found_noun"]
