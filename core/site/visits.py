"""Earlier visits to a site: each one's readings as a site of its own, and closing today's visit.

A site file keeps today's visit in ``[conditions]`` (the readings) and ``[record]`` (who, when,
with what), and every earlier one as a ``[[visits]]`` table: its date, record and notes, that
day's ``pressure_drop``, ``total_flow`` and ``given``, the clamp-on readings as
``measured = { "AHU-3 coil" = "80 gpm" }`` and, optionally, the liquid's ``temperature`` that
day. Everything else — the branches, the liquid's kind, the tolerances — is today's site:
:func:`visit_site` makes a visit a site of its own to solve, and an error in it names the
visit's field (``visits[0].measured."AHU-9"``). :func:`close_visit` moves today's readings
and record into a new visit and clears them for the next one.

A visit with several readings and no ``given`` is solved from all of them at once (``given =
"all"``, the reconciled head), as the history weighs every reading of a day.
"""

from __future__ import annotations

import copy
import re
from datetime import date, datetime

from ..errors import BranchwiseError, InputError, NoSolutionError, describe
from ..names import name_key
from .spec import RecordSpec, Site, Value, VisitSpec

_ISO_DATE = re.compile(r"\d{4}-\d{2}-\d{2}")
DATE_HINT = "must be a date, YYYY-MM-DD (2025-03-12)"


def visit_date(value: Value, path: str) -> date:
    """The calendar date of a visit's ``date`` (ISO text, optionally with a time after it).

    InputError on ``path`` for anything else: a visit's date orders the history."""
    if value is None:
        raise InputError(path, "nothing", "every visit needs its date, YYYY-MM-DD")
    text = value.strip() if isinstance(value, str) else ""
    if _ISO_DATE.fullmatch(text[:10]):
        try:
            day = date.fromisoformat(text[:10])
            if len(text) > 10:
                datetime.fromisoformat(text)
            return day
        except ValueError:
            pass
    raise InputError(path, describe(value), DATE_HINT)


def has_reading(visit: VisitSpec) -> bool:
    """Whether the visit holds a reading: a pressure drop, a total flow or a clamp-on."""
    return (visit.pressure_drop is not None or visit.total_flow is not None
            or any(v is not None for v in visit.measured.values()))


def today_has_reading(site: Site) -> bool:
    """Whether today's ``[conditions]`` or a branch hold a reading (one to close)."""
    c = site.conditions
    return (c.pressure_drop is not None or c.total_flow is not None
            or bool(site.measured_branches()))


def _key(name: object) -> str:
    return name_key(name) if isinstance(name, str) else ""


def _branch_index(site: Site, name: str) -> int | None:
    keys = [_key(b.name) for b in site.branches]
    return keys.index(_key(name)) if _key(name) in keys else None


# ---- a visit as a site ---------------------------------------------------------------------

def visit_site(site: Site, index: int | None) -> Site:
    """The site as it stood at visit ``index`` (None: today's visit): that day's readings,
    record and temperature on today's branches, liquid and tolerances; nothing to find but the
    flows, and no visits of its own. Several readings without ``given`` are all weighed
    (``given = "all"``) — unless one of them is a flow of exactly 0 (a line shut, a meter
    fault): a tolerance that is a share of the reading gives it no spread to weigh by, so the
    visit is solved from the gauge's reading, else from another branch's clamp-on (a head
    across the header that a shut line does not change), and the zero is kept as that
    branch's reading (not trended, with a note). Not from the total flow: the model would
    share it with the shut line. InputError for a reading of a branch the site does not
    have."""
    out = copy.deepcopy(site)
    out.visits, out.solve, out.origin = [], None, None
    if index is not None:
        v = site.visits[index]
        out.record = RecordSpec(v.technician, v.date, v.pressure_instrument, v.flow_instrument)
        out.conditions.pressure_drop = v.pressure_drop
        out.conditions.total_flow = v.total_flow
        out.conditions.given = v.given
        for b in out.branches:
            b.measured_flow = None
        for name, value in v.measured.items():
            i = _branch_index(site, name)
            if i is None:
                known = ", ".join(f'"{b.name}"' for b in site.branches if isinstance(b.name, str))
                raise InputError(f'visits[{index}].measured."{name}"', describe(value),
                                 f"no branch of that name; the branches are {known}")
            out.branches[i].measured_flow = value
        if v.temperature is not None:
            out.fluid.temperature = v.temperature
    held = ((out.conditions.pressure_drop is not None) + (out.conditions.total_flow is not None)
            + len(out.measured_branches()))
    if out.conditions.given is None and held > 1:
        out.conditions.given = _given_beside_zero(out) or "all"
    return out


def _given_beside_zero(site: Site) -> str | None:
    """The reading to solve from when one of the site's flow readings is exactly 0: the gauge's,
    else a clamp-on that is not 0, else — every flow reading 0, a header off that day — the
    first of them (a head of 0, which the history notes and does not trend). None when no
    reading is 0, when only a total flow that is not 0 is left, or when a reading cannot be
    read: the weighing then says what is wrong."""
    from ..units import parse_quantity

    def zero(value: Value, path: str) -> bool | None:
        try:
            return parse_quantity(value, "flow", path) == 0
        except InputError:
            return None

    c = site.conditions
    flows = [(c.total_flow, "total_flow", "conditions.total_flow")] + [
        (b.measured_flow, str(b.name), f"branches[{i}].measured_flow")
        for i, b in enumerate(site.branches) if b.measured_flow is not None]
    read = [(given, zero(value, path)) for value, given, path in flows if value is not None]
    if any(z is None for _, z in read) or not any(z for _, z in read):
        return None
    if c.pressure_drop is not None:
        return "pressure_drop"
    if all(z for _, z in read):  # every line shut (a header off that day): a head of 0
        return read[0][0]
    return next((given for given, z in read if z is False and given != "total_flow"), None)


def visit_path(site: Site, index: int | None, field: str) -> str:
    """A visit's own path for a field of its :func:`visit_site` (``conditions.pressure_drop``
    → ``visits[0].pressure_drop``, ``branches[2].measured_flow`` → ``visits[0].measured."AHU-3
    coil"``); a field the visit does not hold, and every field of today's visit, is unchanged."""
    if index is None:
        return field
    head, v = f"visits[{index}]", site.visits[index]
    if field == "conditions":
        return head
    for key in ("pressure_drop", "total_flow", "given"):
        if field == f"conditions.{key}":
            return f"{head}.{key}"
    if field == "fluid.temperature" and v.temperature is not None:
        return f"{head}.temperature"
    match = re.fullmatch(r"branches\[(\d+)\]\.measured_flow", field)
    if match and int(match[1]) < len(site.branches):
        name = site.branches[int(match[1])].name
        for key in v.measured:
            if _key(key) == _key(name):
                return f'{head}.measured."{key}"'
    return field


def naming_visit(exc: BranchwiseError, site: Site, index: int | None) -> BranchwiseError:
    """``exc`` raised for :func:`visit_site`'s site, its field moved to the visit's own keys."""
    if index is None:
        return exc
    if isinstance(exc, NoSolutionError):  # a limit hit by that day's reading: its field
        moved = visit_path(site, index, exc.field)
        return exc if moved == exc.field else NoSolutionError(exc.marked, moved).naming(
            exc.names)
    if not isinstance(exc, InputError):
        return exc
    field = visit_path(site, index, exc.field)
    if field == exc.field:
        return exc
    reason = exc.marked_reason.replace("conditions.given", f"visits[{index}].given").replace(
        "this site holds one", "this visit holds one")
    return InputError(field, exc.marked_value, reason).naming(exc.names)


# ---- closing today's visit -------------------------------------------------------------------

def close_visit(site: Site, day: str, notes: str | None = None) -> None:
    """Move today's readings and record into a new ``[[visits]]`` table dated ``day``
    (ISO text), with ``notes`` and the liquid's temperature, and clear them for the next visit
    (in place). InputError when today holds no reading, or for a date that is no date."""
    visit_date(day, "visits.date")
    if not today_has_reading(site):
        raise InputError("conditions", "nothing", "today holds no reading to keep as a visit")
    c, r = site.conditions, site.record or RecordSpec()
    measured: dict[str, Value] = {b.name: b.measured_flow for b in site.branches
                if b.measured_flow is not None and isinstance(b.name, str)}
    site.visits.append(VisitSpec(
        date=day.strip(), technician=r.technician, pressure_instrument=r.pressure_instrument,
        flow_instrument=r.flow_instrument, notes=notes or None, pressure_drop=c.pressure_drop,
        total_flow=c.total_flow, given=c.given, measured=measured,
        temperature=site.fluid.temperature))
    c.pressure_drop = c.total_flow = c.given = None
    for b in site.branches:
        b.measured_flow = None
    site.record = None


def rename_in_visits(site: Site, old: str, new: str) -> None:
    """A branch renamed: its readings in the earlier visits (and a visit's ``given`` naming
    it) follow, in place, so that no visit points at a branch that is gone."""
    for v in site.visits:
        for name in list(v.measured):
            if _key(name) == _key(old) and _key(old):
                v.measured = {(new if k == name else k): val for k, val in v.measured.items()}
        if isinstance(v.given, str) and _key(v.given) == _key(old) and _key(old):
            v.given = new.strip()
