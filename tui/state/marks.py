"""The mark before an error's words, the same on every screen: ✗ for something wrong, ○ for a
site that only waits for a reading."""

from __future__ import annotations

from typing import TYPE_CHECKING

from branchwise.core.site.readings import NoReading

from .givens import needs_value

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site


def error_mark(error: BaseException | None, site: Site | None = None) -> str:
    """The mark before an error's words: ✗ for something wrong, ○ for a site that only waits
    for a reading (a new site, today's visit just closed, or a given just chosen whose value is
    not typed yet: ``site`` tells that one)."""
    if isinstance(error, NoReading):
        return "○"
    if error is not None and site is not None and needs_value(error, site) is not None:
        return "○"
    return "✗"
