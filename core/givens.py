"""What can be given: the readings that fix the driving head between the two headers.

One registry, :data:`GIVENS`, read by the site file, the solver, the reports, the uncertainty
plan and the app, so that each reading is named, measured and worded the same way everywhere.
A reading is taken at the header (the differential gauge, the plant's total-flow meter) or on
one branch (a clamp-on meter); its accuracy is a percent of the gauge's full scale or of the
meter's reading.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # the core's model loads when a given is first made, after the app's first screen
    from .model import Given, MeasuredFlow, PressureDrop, TotalFlow


@dataclass(frozen=True)
class GivenKind:
    """One kind of reading.

    key: its site-file key and the JSON ``quantity``; quantity: the units kind of its value
    (``pressure`` or ``flow``); words: how a sentence names it; label: how the app's list of
    givens names it; short: a word for a narrow screen; instrument: ``gauge`` (accuracy as a
    percent of full scale) or ``meter`` (a percent of the reading); on_branch: read on one
    branch rather than across the header; model_name: the core's class for it, by name (the
    model loads with the solver, after the app's first screen).
    """

    key: str
    quantity: str
    words: str
    label: str
    short: str
    instrument: str
    on_branch: bool
    model_name: str

    @property
    def model(self) -> type[PressureDrop] | type[TotalFlow] | type[MeasuredFlow]:
        """The core's class for it."""
        from . import model

        found: type[PressureDrop] | type[TotalFlow] | type[MeasuredFlow] = getattr(
            model, self.model_name)
        return found

    def build(self, value: float, branch: str) -> Given:
        """The given condition from an SI value (and, on a branch, the branch's name)."""
        made: Callable[..., Given] = self.model
        return made(branch, value) if self.on_branch else made(value)


GIVENS: dict[str, GivenKind] = {g.key: g for g in (
    GivenKind("pressure_drop", "pressure", "pressure drop", "Δp across the header", "Δp",
              "gauge", False, "PressureDrop"),
    GivenKind("total_flow", "flow", "total flow", "Total flow", "total", "meter", False,
              "TotalFlow"),
    GivenKind("measured_flow", "flow", "measured flow", "Reading on a branch", "reading",
              "meter", True, "MeasuredFlow"),
)}
"""Every kind of reading, by key, in the order a site file lists them."""

HEADER_READINGS = tuple(k for k, g in GIVENS.items() if not g.on_branch)
"""The readings kept under ``[conditions]`` (the others are kept on their branch)."""


def kind_of(given: Given) -> GivenKind:
    """The registry entry of a given condition."""
    for g in GIVENS.values():
        if isinstance(given, g.model):
            return g
    raise TypeError(f"not a given condition: {given!r}")


def make_given(key: str, value: float, branch: str | None = None) -> Given:
    """The core's given condition of kind ``key`` (SI value; ``branch`` for a branch reading)."""
    kind = GIVENS[key]
    if kind.on_branch and branch is None:
        raise ValueError(f"{key} needs a branch")
    return kind.build(value, branch or "")


def branch_of(given: Given) -> str | None:
    """The branch a given reading was taken on (None for a reading at the header)."""
    from .model import MeasuredFlow  # loaded already: a given was made

    return given.branch if isinstance(given, MeasuredFlow) else None


def reading_words(key: str, branch: str | None = None) -> str:
    """A reading in a sentence: ``pressure drop``, ``total flow``, ``measured flow in 'AHU-3'``."""
    words = GIVENS[key].words
    return f"{words} in '{branch}'" if GIVENS[key].on_branch and branch is not None else words


__all__ = ["GIVENS", "HEADER_READINGS", "GivenKind", "branch_of", "kind_of", "make_given",
           "reading_words"]
