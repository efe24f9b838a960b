"""The readings a site file holds, and which one the head is solved from.

On a walkdown an engineer often has more than one reading: the differential gauge across the
headers and a clamp-on meter on one branch, say. A site may keep them all — ``pressure_drop``
and ``total_flow`` in ``[conditions]``, ``measured_flow`` on any branch — as long as
``conditions.given`` says which one fixes the head (``"pressure_drop"``, ``"total_flow"`` or the
name of the branch whose measured flow it is). With a single reading ``given`` is not needed.
The others are kept for the record and compared with what the solve makes of them.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import InputError, describe
from .spec import Site, Value

CONDITION_READINGS = ("pressure_drop", "total_flow")


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
           for k in CONDITION_READINGS if getattr(site.conditions, k) is not None]
    out += [Reading("measured_flow", i, f"branches[{i}].measured_flow", b.measured_flow)
            for i, b in enumerate(site.branches) if b.measured_flow is not None]
    return out


def chosen(site: Site) -> tuple[Reading, list[Reading]]:
    """The reading the head is solved from, and the others (kept for the record).

    InputError when there is none, when several are given without ``conditions.given``, or when
    ``given`` names a reading the site does not hold.
    """
    held = readings(site)
    if not held:
        raise InputError("conditions", "nothing", "needs one reading: the pressure drop "
                         "across the headers, the total flow, or one branch's measured flow "
                         "(in a site file: pressure_drop, total_flow or measured_flow)")
    given = site.conditions.given
    if given is None:
        if len(held) > 1:
            first, second = held[0], held[1]
            raise InputError(second.path, describe(second.value), f"contradicts {first.path}: "
                             "keep one reading, or say which one to solve from with "
                             "conditions.given (pressure_drop, total_flow or a branch's name)")
        return held[0], []
    if not isinstance(given, str) or not given.strip():
        raise InputError("conditions.given", describe(given), "must be pressure_drop, "
                         "total_flow or the name of a branch with a measured_flow")
    key = given.strip()
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
            "the site holds no such reading" if key in (*CONDITION_READINGS, "measured_flow")
            else "must be pressure_drop, total_flow or the name of a branch with a "
                 "measured_flow")
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


def compare(sr: object) -> list[Comparison]:
    """Each reading kept beside the given one, against the solve of ``sr`` (a SiteResult).

    A reading that cannot be read (a bad unit) is left out: the site's own check reports it
    when that reading is made the given one.
    """
    from ..units import parse_quantity

    site, result = sr.site, sr.result  # type: ignore[attr-defined]
    band = sr.uncertainty  # type: ignore[attr-defined]
    _, others = chosen(site)
    out = []
    for r in others:
        quantity = "pressure" if r.kind == "pressure_drop" else "flow"
        try:
            read = parse_quantity(r.value, quantity, r.path)
        except InputError:
            continue
        if r.kind == "pressure_drop":
            solved, output, name = result.pressure_drop, "pressure drop", None
        elif r.kind == "total_flow":
            solved, output, name = result.total_flow, "total flow", None
        else:
            name = result.network.branches[r.branch].name
            solved, output = float(result.flows[r.branch]), f"branch '{name}' flow"
        b = band.outputs.get(output) if band is not None else None
        within = None if b is None else bool(min(b.p5, b.p95) <= read <= max(b.p5, b.p95))
        out.append(Comparison(r.kind, name, read, float(solved), within))
    return out
