"""What can be found: the flows, or one segment's diameter, length or roughness for a target flow.

One registry, :data:`FINDS`, read by the site file, the solver, the reports and the app. Each
unknown's equations live in its own module of :mod:`branchwise.core.numerics.unknowns`, under
the same key.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class FindKind:
    """One thing to find. key: the site file's ``solve.find``; label: in the app's list;
    quantity: the units kind of the found value (None for the flows, which are always found).
    """

    key: str
    label: str
    quantity: str | None


FINDS: dict[str, FindKind] = {f.key: f for f in (
    FindKind("flows", "the flows", None),
    FindKind("diameter", "the diameter", "diameter"),
    FindKind("length", "the length", "length"),
    FindKind("roughness", "the roughness", "roughness"),
)}
"""Everything that can be found, by key, the flows first."""

UNKNOWNS = tuple(key for key, f in FINDS.items() if f.quantity is not None)
"""The keys of the finds that size one segment for a target flow."""


__all__ = ["FINDS", "UNKNOWNS", "FindKind"]
