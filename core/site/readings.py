"""The readings a site file holds, and which one the head is solved from.

On a walkdown an engineer often has more than one reading: the differential gauge across the
headers and a clamp-on meter on one branch, say. A site may keep them all — ``pressure_drop``
and ``total_flow`` in ``[conditions]``, ``measured_flow`` on any branch — as long as
``conditions.given`` says which one fixes the head (``"pressure_drop"``, ``"total_flow"``, the
name of the branch whose measured flow it is, or ``"all"``: every reading weighed together,
:mod:`.reconcile`). With a single reading ``given`` is not needed.
The others are kept for the record and compared with what the solve makes of them.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from ..errors import InputError, describe
from ..givens import GIVENS, HEADER_READINGS
from .spec import Site, Value

if TYPE_CHECKING:  # the solve's own modules load with numpy, after the app's first screen
    from ..numerics.results import Result
    from ..numerics.uncertainty import UncertaintyResult

GIVEN_WORDS = ('must be pressure_drop, total_flow, the name of a branch with a measured_flow, '
               'or "all" (every reading weighed together)')
"""What ``conditions.given`` may say."""

RESERVED_NAMES = frozenset(["all", *GIVENS])
"""Words ``conditions.given`` reads as a kind of reading, never as a branch's name (a branch
may not be called so)."""


@dataclass(frozen=True)
class Reading:
    """One reading as typed: ``kind`` pressure_drop | total_flow | measured_flow; ``branch``
    the index of a measured branch (else None); ``path`` its field path; ``value`` as typed."""

    kind: str
    branch: int | None
    path: str
    value: Value


def readings(site: Site) -> list[Reading]:
    """Every reading the site holds, in the file's order."""
    out = [Reading(k, None, f"conditions.{k}", getattr(site.conditions, k))
           for k in HEADER_READINGS if getattr(site.conditions, k) is not None]
    out += [Reading("measured_flow", i, f"branches[{i}].measured_flow", b.measured_flow)
            for i, b in enumerate(site.branches) if b.measured_flow is not None]
    return out


class NoReading(InputError):
    """A site with no reading yet (a new site, or today's visit just closed): nothing typed
    wrong, only nothing to solve from. Saving such a site is not saving a field in error."""


def chosen(site: Site) -> tuple[Reading, list[Reading]]:
    """The reading the head is solved from, and the others (kept for the record).

    InputError when there is none, when several are given without ``conditions.given``, or when
    ``given`` names a reading the site does not hold.
    """
    held = readings(site)
    if not held:
        raise NoReading("conditions", "nothing", "needs one reading: the pressure drop "
                        "across the headers, the total flow, or one branch's measured flow "
                        "(in a site file: pressure_drop, total_flow or measured_flow)")
    given = site.conditions.given
    if given is None:
        if len(held) > 1:
            first, second = held[0], held[1]
            raise InputError(second.path, describe(second.value), f"contradicts {first.path}: "
                             "keep one reading, or say which one to solve from with "
                             "conditions.given (pressure_drop, total_flow, a branch's name, or "
                             '"all" to weigh them together)')
        return held[0], []
    if not isinstance(given, str) or not given.strip():
        raise InputError("conditions.given", describe(given), GIVEN_WORDS)
    key = given.strip()
    if key.casefold() == "all":  # every reading weighed (.reconcile): the first stands in
        if len(held) < 2:
            raise InputError("conditions.given", describe(given), "needs two readings or more "
                             "to weigh against each other; this site holds one")
        return held[0], held[1:]
    names = [b.name.strip() if isinstance(b.name, str) else b.name for b in site.branches]
    for r in held:
        if r.kind == key and r.branch is None:
            return r, [o for o in held if o is not r]
        if r.branch is not None and names[r.branch] == key:
            return r, [o for o in held if o is not r]
    measured = [r for r in held if r.kind == "measured_flow"]
    if key == "measured_flow" and len(measured) == 1:
        return measured[0], [o for o in held if o is not measured[0]]
    what = ("that branch has no measured_flow" if key in names else
            "the site holds no such reading" if key in GIVENS
            else GIVEN_WORDS)
    raise InputError("conditions.given", describe(given), what)


@dataclass(frozen=True)
class Comparison:
    """A reading not solved from, against what the solve makes of it (SI: Pa or m³/s).

    within: whether the reading lies inside the P5–P95 band of that output (None: no band)."""

    kind: str
    branch: str | None
    read: float
    solved: float
    within: bool | None

    @property
    def difference(self) -> float:
        """(solved − read) / read, or NaN for a zero reading."""
        return (self.solved - self.read) / self.read if self.read else float("nan")


def compare(site: Site, result: Result, band: UncertaintyResult | None = None
            ) -> list[Comparison]:
    """Each reading kept beside the given one, against what ``result`` (the solve of ``site``)
    makes of it, and whether it lies inside ``band``'s P5–P95 of that output.

    A reading that cannot be read (a bad unit) is left out: the site's own check reports it
    when that reading is made the given one.
    """
    from ..numerics.sampling import PRESSURE_DROP, TOTAL_FLOW, branch_flow
    from ..units import parse_quantity

    first, others = chosen(site)
    if isinstance(site.conditions.given, str) and site.conditions.given.strip().casefold() == \
            "all":
        others = [first, *others]  # solved from all of them: each is compared
    out = []
    for r in others:
        kind = GIVENS[r.kind]
        try:
            read = parse_quantity(r.value, kind.quantity, r.path)
        except InputError:
            continue
        name = None
        if kind.on_branch and r.branch is not None:
            name = result.network.branches[r.branch].name
            solved, output = float(result.flows[r.branch]), branch_flow(name)
        elif kind.quantity == "pressure":
            solved, output = result.pressure_drop, PRESSURE_DROP
        else:
            solved, output = result.total_flow, TOTAL_FLOW
        b = band.outputs.get(output) if band is not None else None
        within = None if b is None else bool(min(b.p5, b.p95) <= read <= max(b.p5, b.p95))
        out.append(Comparison(r.kind, name, read, float(solved), within))
    return out
