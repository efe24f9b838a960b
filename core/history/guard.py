"""Which of a visit's figures can be trended, and a note for each one that cannot.

A relative change b/a − 1 and its band mean something only between figures clearly away from
zero and known to better than their own size. Before the trends (:mod:`.trends`), each
visit's indicators (:mod:`.indicators`) pass this guard:

* a visit whose head across the header is not meaningfully positive (not finite, or below
  :data:`HEAD_FLOOR`: a reconciliation that lands on no head, or a header with no
  differential) gives no trend at all: R = h/Q² and the solved flows are then near zero and
  their relative uncertainty without bound;
* a branch whose flow at a visit is still (its clamp-on or its solved flow below
  :data:`STILL_VELOCITY` in its widest pipe, a zero reading among them) gives no trend at that
  visit: a line shut or a meter fault, not a change of the line that a percentage can show;
* an indicator whose relative standard uncertainty is not finite or above
  :data:`MAX_RELATIVE_U` is not trended, and its band is not given.

Each is said in a note under the visit, naming the visit's date and the branch. The figures
themselves still show at the visit; only the bands given up are dropped from it.
"""

from __future__ import annotations

import math
from dataclasses import replace

from ..messages import marked
from .indicators import INDICATORS, BranchIndicators, Indicator, VisitIndicators

HEAD_FLOOR = 1e-3
"""m of the liquid: a millimetre of head (about 10 Pa of water), below what a differential
gauge across a header tells from zero (common practice)."""
STILL_VELOCITY = 0.01
"""m/s: below about this a clamp-on ultrasonic meter reads no flow (its low-flow cut-off is
commonly set between 0.01 and 0.03 m/s; value from memory, common practice)."""
MAX_RELATIVE_U = 10.0
"""A relative standard uncertainty above 1000 %: the figure is not known to a factor of ten,
and a change of it says nothing."""

Row = tuple[str, dict[str, Indicator | None]]
"""A branch's name and its indicators to trend (None: not trended at that visit)."""
TRENDED = (*INDICATORS, "solved_flow")


def trendable(v: VisitIndicators, label: str) -> tuple[VisitIndicators, list[Row]]:
    """The visit ``v`` (dated ``label`` as shown) with the bands beyond bounds taken off and a
    note for every figure held back, and per branch the indicators to trend."""
    notes: list[str] = []
    head = v.solved.result.driving_head
    flat = not (math.isfinite(head) and head > HEAD_FLOOR)
    if flat:
        state = ("is reversed: the header ran backwards that day" if head < -HEAD_FLOOR
                 else "is not clearly above zero")
        notes.append(f"visit {label}: the head across the header ({marked('head', head)} of "
                     f"the liquid) {state}, so no figure of this visit is trended")
    net = v.solved.built.network
    branches: list[BranchIndicators] = []
    rows: list[Row] = []
    for br, b in zip(net.branches, v.branches, strict=True):
        widest = max(s.diameter for s in br.segments)
        still_flow = STILL_VELOCITY * math.pi * widest ** 2 / 4
        flows = [i.value for i in (b.flow, b.solved_flow) if i is not None]
        still = any(not math.isfinite(q) or abs(q) < still_flow for q in flows)
        if still and not flat:
            read = b.flow is not None and b.flow.measured
            what = "its clamp-on reads" if read else "the solve gives it"
            notes.append(f"visit {label}, {b.name}: {what} no flow (a line shut or a meter "
                         f"fault), so its figures at this visit are not trended")
        kept: dict[str, Indicator | None] = {}
        shown: dict[str, Indicator | None] = {}
        for key in TRENDED:
            ind = b.get(key)
            u = ind.relative_uncertainty if ind is not None else math.nan
            if ind is not None and ind.parts is not None and not u <= MAX_RELATIVE_U:
                if key != "solved_flow" and not (flat or still):
                    notes.append(f"visit {label}, {b.name}: the {key.replace('_', ' ')} is not "
                                 f"known to a factor of ten here (its standard uncertainty "
                                 f"is beyond 1000 %), so it is not trended")
                ind = Indicator(ind.value, ind.measured, None)
                kept[key] = None
            else:
                kept[key] = None if flat or still else ind
            shown[key] = ind
        branches.append(BranchIndicators(b.name, shown["flow"], shown["resistance"],
                                         shown["effective_roughness"], shown["solved_flow"]))
        rows.append((b.name, kept))
    return replace(v, branches=tuple(branches), notes=(*v.notes, *notes)), rows
