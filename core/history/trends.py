"""How each branch's indicators moved between visits, and whether the move is bigger than the
readings can tell apart.

A trend compares like with like: where a branch's indicator was measured (its own clamp-on
with the head from another reading) at two visits or more, only those visits count; otherwise
the solved values at every visit do (the flows; a solved resistance or roughness is the model's
own and is not trended). For the first, the previous and the last of those visits it gives the
change since the first and since the previous, each relative (last/earlier − 1), **with its
band**:

* the band combines the two visits' uncertainties by the GUM's law of propagation
  (JCGM 100:2008, 5.1.2 and 5.2) on ln y_last − ln y_earlier: the parts of a day's readings
  (the gauge, the flow meters, the temperature) are independent between visits and add in
  quadrature; the parts of the line's record (bore, length, roughness, fittings' K, valve Kv)
  are the same at both visits (correlation 1), so each enters as the difference of its two
  parts and what the two visits share cancels. Taking the readings as independent is the
  cautious choice: an instrument error that repeats from visit to visit would cancel instead;
* the band is ± :data:`K90` times that standard uncertainty (times 1 + change, the change
  being relative): the half-width of a 90 % interval of a normal distribution, the same
  coverage as the P5–P95 bands of a solve;
* a change is **flagged** when it lies outside its band.
"""

from __future__ import annotations

import math
from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass

from .indicators import INDICATORS, Indicator

K90 = 1.6448536269514722
"""The standard normal's 95th percentile: ±K90·u holds the middle 90 % (P5–P95)."""

CAUSES = {
    ("resistance", 1): "fouling, a valve moved, or a strainer filling",
    ("resistance", -1): "a valve opened further, a strainer or coil cleaned, or a reading off",
    ("effective_roughness", 1): "scale, corrosion or deposits building up (or a part-closed "
                                "valve counted as roughness)",
    ("effective_roughness", -1): "a line cleaned, or a reading off",
    ("flow", 1): "this line's resistance or the head across the header changed",
    ("flow", -1): "this line's resistance or the head across the header changed",
}
"""What a flagged change may mean, by indicator and direction (common practice)."""
SOLVED_CAUSE = "solved from the header's reading, so the head across the header changed"
REVERSED = {"flow": "the flow reversed",
            "resistance": "the resistance changed sign (R = h/(Q·|Q|): the flow or the head "
                          "across the header reversed)",
            "effective_roughness": "the flow reversed"}
REVERSED_CAUSE = ("check the clamp-on's direction (mounted or set the other way) and the "
                  "header's valves and pumps before reading anything into the line itself")
"""A change of sign said in words (common practice: a reversal is first a question of the
meter's direction or of how the plant was run, not of the line)."""
NOUNS = {"flow": "flow", "resistance": "resistance", "effective_roughness": "effective roughness"}


@dataclass(frozen=True)
class Point:
    """An indicator at one visit: the visit's place in the history, its date as shown, and
    its place among that day's visits (``nth`` of ``of``; 1 of 1 on a day of one visit)."""

    visit: int
    date: str
    indicator: Indicator
    nth: int = 1
    of: int = 1

    @property
    def words(self) -> str:
        """The visit in words: its date, and which visit of that day when it had several."""
        return self.date + place_words(self.nth, self.of)


@dataclass(frozen=True)
class Change:
    """A relative change between two visits and its ± band (90 %; NaN: no band). A change of
    sign (the flow reversed between the visits) is no percentage: ``value`` and ``band`` are
    NaN and ``reversed`` is set; it is flagged, as a reversal is a change by any reading."""

    value: float
    band: float
    since: str
    """The earlier visit's date in words (:attr:`Point.words`)."""
    reversed: bool = False

    @property
    def flagged(self) -> bool:
        return self.reversed or (math.isfinite(self.band) and abs(self.value) > self.band)

    def words(self) -> str:
        """As a table shows it: ``-18 % ± 3.3 % ⚑``, or ``reversed ⚑``."""
        if self.reversed:
            return "reversed ⚑"
        return f"{percent(self.value, True)} ± {percent(self.band)}" + (
            " ⚑" if self.flagged else "")


@dataclass(frozen=True)
class Trend:
    """One branch's indicator over the visits that count (see the module docstring)."""

    branch: str
    indicator: str
    basis: str
    """``measured`` (the branch's own clamp-on) or ``solved``."""
    points: tuple[Point, ...]
    since_first: Change
    since_previous: Change
    latest: bool
    """Whether the last point is the history's last visit."""

    @property
    def first(self) -> Point:
        return self.points[0]

    @property
    def previous(self) -> Point:
        return self.points[-2]

    @property
    def last(self) -> Point:
        return self.points[-1]

    @property
    def flagged(self) -> bool:
        return self.since_first.flagged or self.since_previous.flagged

    @property
    def has_previous(self) -> bool:
        """Whether the previous visit is one of its own (with two visits it is the first)."""
        return len(self.points) > 2

    def messages(self) -> list[str]:
        """The flagged changes in words: ``AHU-3 coil: resistance +38 % since 2025-03-12
        (band ± 12 %): fouling, a valve moved, or a strainer filling``."""
        out = []
        changes = [(self.since_first, self.first)]
        if self.has_previous:
            changes.append((self.since_previous, self.previous))
        for c, earlier in changes:
            if not c.flagged:
                continue
            same_day = earlier.date == self.last.date  # visits of one date
            between = (f"between two visits on {earlier.date}" if same_day and earlier.of == 2
                       else f"between visits {earlier.nth} and {self.last.nth} of {earlier.date}"
                       if same_day else f"between {c.since} and {self.last.words}")
            span = (between if same_day else f"since {c.since}" if self.latest else
                    f"from {c.since} to {self.last.words}")
            if c.reversed:
                cause = f": {REVERSED_CAUSE}" if self.indicator == "flow" else ""
                out.append(f"{self.branch}: {REVERSED[self.indicator]} {between}, so no "
                           f"change is given as a percentage{cause}")
                continue
            cause = (SOLVED_CAUSE if self.basis == "solved" else
                     CAUSES[(self.indicator, 1 if c.value > 0 else -1)])
            out.append(f"{self.branch}: {NOUNS[self.indicator]} {percent(c.value, True)} "
                       f"{span} (band ± {percent(c.band)}): {cause}")
        return out


def percent(x: float, signed: bool = False) -> str:
    """A fraction as a percentage: whole percent from 10 % up, one decimal below."""
    if not math.isfinite(x):
        return "—"
    digits = 0 if abs(x) >= 0.095 else 1
    return f"{x * 100:{'+' if signed else ''}.{digits}f} %"


def change(a: Indicator, b: Indicator, since: str) -> Change:
    """From ``a`` (earlier) to ``b``: b/a − 1, and its band (see the module docstring). A
    change of sign is ``reversed``; a zero or non-finite value at either end gives no number
    (NaN; :mod:`.guard` keeps such points out of a trend, with a note)."""
    if not (math.isfinite(a.value) and math.isfinite(b.value)) or a.value == 0 or b.value == 0:
        return Change(math.nan, math.nan, since)
    if (a.value > 0) != (b.value > 0):
        return Change(math.nan, math.nan, since, reversed=True)
    value = b.value / a.value - 1
    if a.parts is None or b.parts is None:
        return Change(value, math.nan, since)
    var = sum(p.relative ** 2 for p in (*a.parts, *b.parts) if not p.shared)
    earlier = {p.name: p.relative for p in a.parts if p.shared}
    later = {p.name: p.relative for p in b.parts if p.shared}
    for name in earlier.keys() | later.keys():
        var += (later.get(name, 0.0) - earlier.get(name, 0.0)) ** 2
    band = K90 * abs(1 + value) * math.sqrt(var)
    return Change(value, band if math.isfinite(band) else math.nan, since)


def trends_of(dates: Sequence[str], branches: Sequence[Sequence[tuple[str, dict[str,
              Indicator | None]]]]) -> list[Trend]:
    """The trends of every branch and indicator. ``dates``: each visit's date as shown, in
    order; ``branches``: per visit, per branch, (name, {indicator: value or None}), with
    ``solved_flow`` beside ``flow`` (the solve's, for a trend of solved flows)."""
    places = places_of(dates)
    names: list[str] = []
    for visit in branches:
        names += [n for n, _ in visit if n not in names]
    out = []
    for name in names:
        for indicator in INDICATORS:
            def points_of(key: str, name: str = name) -> list[Point]:
                return [Point(k, dates[k], ind, *places[k]) for k, visit in enumerate(branches)
                        for n, values in visit if n == name
                        if (ind := values.get(key)) is not None]

            measured = [p for p in points_of(indicator) if p.indicator.measured]
            basis = "measured" if len(measured) >= 2 else "solved"
            use = measured if basis == "measured" else points_of(f"solved_{indicator}")
            if len(use) < 2 or (basis == "solved" and indicator != "flow"):
                continue
            first, previous, last = use[0], use[-2], use[-1]
            out.append(Trend(
                name, indicator, basis, tuple(use),
                change(first.indicator, last.indicator, first.words),
                change(previous.indicator, last.indicator, previous.words),
                last.visit == len(dates) - 1))
    return out


def place_words(nth: int, of: int) -> str:
    """A visit's place among the visits of its date, to follow the date: " (visit 2 of 2 that
    day)"; nothing on a day of one visit."""
    return f" (visit {nth} of {of} that day)" if of > 1 else ""


def places_of(dates: Sequence[str]) -> list[tuple[int, int]]:
    """Each visit's place among the visits of its date, in the order taken: (nth, of)."""
    counts = Counter(dates)
    seen: Counter[str] = Counter()
    out = []
    for d in dates:
        seen[d] += 1
        out.append((seen[d], counts[d]))
    return out
