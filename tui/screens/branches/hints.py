"""The words under the branch table: the keys, or which reading is the given."""

from __future__ import annotations

from branchwise.core.site.spec import Site

from ...state.givens import given_words, held, weighs_all


def reading_hint(site: Site, given: tuple[str, int | None]) -> str:
    """The line under the table: the keys, or, once a branch holds a reading, which reading
    is the given and where the others are compared."""
    if not site.measured_branches():
        return ("Enter edit · e form · a add · c copy · s segment · Del remove · bare numbers "
                "take the header's unit")
    if weighs_all(site):
        return ("Given: all readings, weighed together (x on Split, F4, says which agree); g "
                "there changes the given.")
    others = len(held(site)) - (1 if given in held(site) else 0)
    return f"Given: the {given_words(site, *given)}." + (
        " The other readings are compared with the answer on Split (F4); g there changes "
        "the given." if others else " g on Split (F4) changes the given.")


def reads_as_flow(text: str) -> bool:
    """Whether ``text`` reads as a flow (as the site's own check will read it)."""
    from branchwise.core.errors import InputError
    from branchwise.core.units import parse_quantity

    try:
        parse_quantity(text, "flow", "measured_flow")
    except InputError:
        return False
    return True
