"""What tells two branch names apart, for every place that compares them."""

from __future__ import annotations


def name_key(name: str) -> str:
    """A name as compared: not by letter case, spaces at its ends, or how many spaces stand
    between its words ("AHU 1" and "ahu  1 " are one name)."""
    return " ".join(name.split()).casefold()
