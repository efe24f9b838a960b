"""A site's history: every visit solved from its own readings, in date order, and the trends.

The earlier visits are the site file's ``[[visits]]`` (sorted by date; the file's order breaks
a tie); today's visit, ``[conditions]`` and ``[record]``, comes last when it holds a reading.
Each is solved on today's branches, liquid and tolerances with that day's readings and
temperature (:func:`branchwise.core.site.visits.visit_site`), reconciled when it holds several
readings; see :mod:`.indicators` for what is worked out per branch and :mod:`.trends` for the
changes and their bands.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from datetime import date
from typing import Any

from ..errors import BranchwiseError, InputError, NoSolutionError, describe
from ..givens import branch_of, kind_of
from ..messages import render
from ..site.spec import Site
from ..site.visits import naming_visit, today_has_reading, visit_date, visit_site
from .guard import Row, trendable
from .indicators import INDICATORS, VisitIndicators, visit_indicators
from .trends import Trend, place_words, places_of, trends_of

RESISTANCE_UNIT = "m/(m³/s)²"
"""R = h/Q² in SI: metres of the liquid's head per (m³/s)² (= s²/m⁵)."""
TODAY = "today"
"""How today's visit is dated when ``[record]`` gives no date."""


@dataclass(frozen=True)
class Visit:
    """One visit solved. field: ``visits[i]`` or ``conditions`` (today's); date: its ISO date
    (None for today's visit without a dated record); label: the date as shown."""

    field: str
    date: str | None
    label: str
    technician: str | None
    notes: str | None
    solved: VisitIndicators
    own_temperature: bool = False
    """The visit gave the liquid's temperature of that day (its values are at it)."""
    place: tuple[int, int] = (1, 1)
    """Its place among the visits of its date, in the order taken (nth, of)."""

    @property
    def today(self) -> bool:
        return self.field == "conditions"

    @property
    def heading(self) -> str:
        """Its date as a heading: with its place when the day held several visits (the flags
        of changes name a visit so), and "(today)" for today's."""
        return self._dated(place_words(*self.place))

    @property
    def short(self) -> str:
        """The heading in few words, for a list of the visits: "2024-09-18 (2 of 2)"."""
        nth, of = self.place
        return self._dated(f" ({nth} of {of})" if of > 1 else "")

    def _dated(self, place: str) -> str:
        return f"{self.label}{place}{' (today)' if self.today and self.label != TODAY else ''}"


@dataclass(frozen=True)
class History:
    """The visits in date order and the trends of every branch."""

    site: str
    visits: tuple[Visit, ...]
    trends: tuple[Trend, ...]

    @property
    def flagged(self) -> list[Trend]:
        return [t for t in self.trends if t.flagged]

    def messages(self) -> list[str]:
        """Every flagged change in words."""
        return [m for t in self.trends for m in t.messages()]

    def to_json(self) -> dict[str, Any]:
        """The JSON's ``history`` object (SI; see :mod:`branchwise.core.report.json_report`)."""
        return {
            "visits": [_visit_json(v) for v in self.visits],
            "trends": [_trend_json(t) for t in self.trends],
            "units": {"flow": "m³/s", "resistance": RESISTANCE_UNIT,
                      "effective_roughness": "m"},
            "flagged": self.messages(),
        }


def _text(value: object) -> str | None:
    return " ".join(value.split()) if isinstance(value, str) and value.strip() else None


def history_of(site: Site) -> History:
    """The history of ``site`` (see the module docstring). An error in a visit names that
    visit's field (``visits[1].date``, ``visits[0].measured."AHU-9"``); InputError when the
    site holds no visit at all."""
    today = _record_date(site)
    order: list[tuple[str, int]] = []
    for i, v in enumerate(site.visits):
        day = visit_date(v.date, f"visits[{i}].date")
        if today is not None and day > today:
            raise InputError(f"visits[{i}].date", describe(v.date),
                             f"after today's record date ({today.isoformat()}, record.date): "
                             "an earlier visit must be dated on or before today's; correct "
                             "the one that is wrong")
        if day > (now := date.today()):  # no usable record date: the calendar's today
            raise InputError(f"visits[{i}].date", describe(v.date),
                             f"is after today ({now.isoformat()}): an earlier visit cannot be "
                             "dated in the future; correct the date")
        order.append((day.isoformat(), i))
    order.sort()
    indices: list[int | None] = [i for _, i in order]
    if today_has_reading(site):
        indices.append(None)
    if not indices:
        raise InputError("visits", "nothing", "no visit to look back on: the site holds no "
                         "[[visits]] and no reading today")
    visits: list[Visit] = []
    rows: list[list[Row]] = []
    for index in indices:
        visit = _visit(site, index)
        solved, row = trendable(visit.solved, visit.label)
        visits.append(replace(visit, solved=solved))
        rows.append(row)
    dates = [v.label for v in visits]
    visits = [replace(v, place=p) for v, p in zip(visits, places_of(dates), strict=True)]
    return History(site.title, tuple(visits), tuple(trends_of(dates, rows)))


def _record_date(site: Site) -> date | None:
    """Today's record date, when ``[record] date`` holds one (None: absent or free text)."""
    typed = site.record.date if site.record is not None else None
    try:
        return visit_date(typed, "record.date") if typed is not None else None
    except InputError:
        return None


def _visit(site: Site, index: int | None) -> Visit:
    try:
        own = visit_site(site, index)
        solved = visit_indicators(own)
    except BranchwiseError as exc:
        if not exc.names:  # an error of the visit's own readings: its branches by name
            exc.naming([b.name for b in site.branches])
        named = naming_visit(exc, site, index)
        if isinstance(named, NoSolutionError) and index is not None:
            named = NoSolutionError(f"visit {site.visits[index].date}: {named.marked}",
                                    named.field).naming(named.names)
        elif (isinstance(named, InputError) and index is not None
              and not named.field.startswith("visits[")):
            # a field of today's (a tolerance) refused for that visit's reading: say which
            named = InputError(named.field, named.marked_value,
                               f"at the visit of {site.visits[index].date} (visits[{index}]): "
                               f"{named.marked_reason}").naming(named.names)
        raise named from None
    if index is None:
        record = site.record
        typed = record.date if record is not None else None
        try:
            day: str | None = visit_date(typed, "record.date").isoformat()
        except InputError:
            day = None
        who = record.technician if record is not None else None
        return Visit("conditions", day, day or TODAY, _text(who), None, solved)
    v = site.visits[index]
    label = _text(v.date) or ""
    return Visit(f"visits[{index}]", label, label, _text(v.technician), _text(v.notes), solved,
                 v.temperature is not None)


# ---- JSON ---------------------------------------------------------------------------------

def _num(value: float | None) -> float | None:
    return float(value) if value is not None and math.isfinite(value) else None


def _visit_json(v: Visit) -> dict[str, Any]:
    sr = v.solved.solved
    g = sr.built.given
    given = sr.site.conditions.given
    every = isinstance(given, str) and given.strip().casefold() == "all"
    rec = sr.reconciliation
    return {
        "date": v.date,
        "field": v.field,
        "technician": v.technician,
        "notes": v.notes,
        "given": {"quantity": "all" if every else kind_of(g).key,
                  "branch": None if every else branch_of(g),
                  "value_si": g.value},
        "readings": [{"quantity": r.kind, "branch": r.name, "value_si": r.value}
                     for r in v.solved.readings],
        "pressure_drop_pa": _num(sr.result.pressure_drop),
        "total_flow_m3_s": _num(sr.result.total_flow),
        "driving_head_m": _num(sr.result.driving_head),
        "temperature_k": _num(getattr(sr.result.network.fluid, "temperature", None)),
        "reconciliation": rec.to_json() if rec is not None else None,
        "branches": [{
            "name": b.name,
            "flow_m3_s": _num(b.flow.value if b.flow else None),
            "resistance": _num(b.resistance.value if b.resistance else None),
            "effective_roughness_m": _num(b.effective_roughness.value
                                          if b.effective_roughness else None),
            "measured": bool(b.resistance is not None and b.resistance.measured),
            "relative_uncertainty": {
                k: _num(ind.relative_uncertainty) if (ind := b.get(k)) is not None else None
                for k in INDICATORS},
        } for b in v.solved.branches],
        "solve_notes": [render(n) for n in v.solved.notes],
    }


def _trend_json(t: Trend) -> dict[str, Any]:
    return {
        "branch": t.branch, "indicator": t.indicator, "basis": t.basis,
        "first": t.first.indicator.value, "previous": t.previous.indicator.value,
        "last": t.last.indicator.value,
        "dates": {"first": t.first.date, "previous": t.previous.date, "last": t.last.date},
        "change": {"since_first": _num(t.since_first.value),
                   "since_previous": _num(t.since_previous.value)},
        "band": {"since_first": _num(t.since_first.band),
                 "since_previous": _num(t.since_previous.band)},
        "flagged": t.flagged,
        "reversed": {"since_first": t.since_first.reversed,
                     "since_previous": t.since_previous.reversed},
        "messages": t.messages(),
    }
