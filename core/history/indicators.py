"""One visit solved from its own readings, and per branch what a commissioning engineer trends.

Per branch and visit (SI):

* **flow** (m³/s): the branch's own clamp-on reading when that visit took one, else the flow
  the visit's solve gives it (reconciled when the visit holds several readings);
* **resistance** R = h/Q² (m of liquid per (m³/s)², i.e. s²/m⁵): h the driving head across the
  header, Q the branch's flow. In fully turbulent flow R of a fixed line is nearly constant,
  so its drift shows fouling, a valve moved or a strainer filling (common practice);
* **effective roughness** (m): the ε of the branch's pipe that makes the model carry the
  branch's own clamp-on flow at the head found from another reading (the existing ``find =
  roughness``, :mod:`branchwise.core.numerics.unknowns.roughness`), for a branch of one pipe.

An indicator is **measured** when it comes from that branch's own clamp-on with the head fixed
by another reading of the same day — the gauge's pressure drop first, then the total-flow
meter, then another branch's clamp-on — so that the clamp-on measures the line rather than
being measured by it. Otherwise it is the model's (``measured`` False): a branch without its
own reading has the flow and the R of today's line model at that day's head.

Each indicator carries the signed first-order parts of its standard uncertainty, one per input
of the uncertainty plan (:func:`branchwise.core.numerics.uncertainty.build_plan`, the same
tolerances and rectangular distributions as the P5–P95 bands): ``cᵢ·u(xᵢ)/y`` from central
differences, the law of propagation of the GUM (JCGM 100:2008, 5.1.2). The parts say which
inputs belong to that day (the gauge, the meters, the temperature) and which to the line's
record (bore, length, roughness, fittings' K, valve Kv: the same at every visit), so that a
change between two visits can combine them (:mod:`.trends`).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace

import numpy as np

from ..errors import BranchwiseError
from ..givens import GIVENS, make_given, reading_words
from ..model import Find, FindFlows, FindUnknown, Given, Network, PressureDrop, TotalFlow
from ..numerics.copies import CopiesSolution, solve_copies
from ..numerics.draws import chunk_rows, chunks
from ..numerics.hydraulics import Array, Layout
from ..numerics.reconcile_result import p_said
from ..numerics.sampling import CONDITION_NOT_DRAWN, SQRT3, STEP, InputTolerance, build_plan
from ..numerics.tolerances import Thermal, Tolerances
from ..site.readings import readings
from ..site.reconcile import solves_from_all
from ..site.solve import WEIGHED, SiteResult, solve_site
from ..site.spec import Site
from ..site.tolerances import site_thermal
from ..units import parse_quantity

INDICATORS = ("flow", "resistance", "effective_roughness")
"""The indicators trended per branch, by their JSON names."""
DAY_KINDS = frozenset({"gauge", "meter", "target", "temperature"})
"""Inputs of the uncertainty plan that belong to one day's readings; the others (bore,
length, roughness, fitting K, valve Kv) are the line's record, the same at every visit."""
HEAD_ORDER = ("pressure_drop", "total_flow", "measured_flow")
"""Which other reading fixes the head for a branch's own indicators, best first."""


@dataclass(frozen=True)
class Part:
    """One input's part in an indicator's standard uncertainty, relative to the indicator
    (signed: cᵢ·u(xᵢ)/y). shared: an input of the line's record, the same at every visit."""

    name: str
    shared: bool
    relative: float


@dataclass(frozen=True)
class Indicator:
    """One indicator at one visit: its value (SI), whether it was measured on the branch, and
    the parts of its uncertainty (None: no band could be worked out; see the visit's notes)."""

    value: float
    measured: bool
    parts: tuple[Part, ...] | None

    @property
    def relative_uncertainty(self) -> float:
        """The combined standard uncertainty relative to the value (NaN without a band)."""
        if self.parts is None:
            return math.nan
        return math.sqrt(sum(p.relative ** 2 for p in self.parts))


@dataclass(frozen=True)
class BranchIndicators:
    """A branch's indicators at one visit (None where the visit cannot give one)."""

    name: str
    flow: Indicator | None
    resistance: Indicator | None
    effective_roughness: Indicator | None
    solved_flow: Indicator | None = None
    """The flow the visit's solve gives the branch, read or not (a trend of solved flows
    compares it, never a clamp-on with a solve)."""

    def get(self, indicator: str) -> Indicator | None:
        """The indicator named as in :data:`INDICATORS` (or ``solved_flow``)."""
        found: Indicator | None = getattr(self, indicator)
        return found


@dataclass(frozen=True)
class ReadingSI:
    """One reading of a visit in SI: kind (a :data:`~branchwise.core.givens.GIVENS` key),
    the branch's index and name for a clamp-on, the value in Pa or m³/s."""

    kind: str
    branch: int | None
    name: str | None
    value: float


@dataclass(frozen=True)
class VisitIndicators:
    """A visit solved (``solved``, with its reconciliation) and its indicators per branch."""

    solved: SiteResult
    readings: tuple[ReadingSI, ...]
    branches: tuple[BranchIndicators, ...]
    notes: tuple[str, ...]


# ---- spreads: the solve at the nominal inputs and at ±δ of each --------------------------

@dataclass(frozen=True)
class _Spread:
    """Row 0 the nominal solve (every input at the site's own value, as ``solve`` takes it),
    rows 1…n each input at +δ, rows n+1…2n at −δ about the centre of its range (δ in units of
    its half-width, as :func:`~branchwise.core.numerics.uncertainty.monte_carlo` takes it)."""

    inputs: tuple[InputTolerance, ...]
    sol: CopiesSolution
    notes: tuple[str, ...] = ()
    """What the draws leave out or take as assumed (the plan's notes)."""

    def indicator(self, column: Array, measured: bool,
                  extra: tuple[Part, ...] = ()) -> Indicator | None:
        nominal = float(column[0])
        if not math.isfinite(nominal) or nominal == 0:
            return None
        n = len(self.inputs)
        steps = (column[1:1 + n] - column[1 + n:]) / (2 * STEP) / SQRT3 / nominal
        moved = np.flatnonzero(steps)  # an input that leaves it as it is adds nothing (the
        # trends take a part missing at one visit as 0): a branch keeps its own few, not one
        # part for every input of the site
        parts = tuple(Part(self.inputs[k].name, self.inputs[k].kind not in DAY_KINDS,
                           float(steps[k])) for k in moved)
        return Indicator(nominal, measured, parts + extra)


SPREAD_BYTES = 1024 * 1024 * 1024
"""The most the kept flows of a visit's ± steps may take (rows × branches × 8 bytes, 1 GiB):
beyond it (about 3,500 branches) the visit's indicators are given without bands, said in a
note. The copies themselves are solved a chunk of rows at a time (:func:`.draws.chunk_rows`)."""


MAX_SHARED_PARTS = 1_000_000
"""With the head from a flow reading, each branch keeps a part of every input (about 280 bytes
each, measured): beyond this many (about 470 branches) the bands are not worked out."""


class TooLarge(BranchwiseError):
    """A visit's ± steps would keep more than :data:`SPREAD_BYTES`."""


def _spread(network: Network, given: Given, find: Find, tol: Tolerances,
            thermal: Thermal | None, given_sigma: tuple[str, float] | None = None) -> _Spread:
    """given_sigma: the given's own spread when it is no one instrument's reading (the
    readings weighed together), as :func:`..numerics.sampling.build_plan` takes it."""
    plan = build_plan(network, given, find, tol, thermal, given_sigma)
    n = len(plan.inputs)
    rows = 1 + 2 * n
    nb = len(network.branches)
    if rows * nb * 8 > SPREAD_BYTES:
        raise TooLarge(f"{nb:,} branches and {n:,} uncertain inputs are too many to step "
                       f"through here (more than {SPREAD_BYTES // 2**20:,} MiB)")
    if not isinstance(given, PressureDrop) and n * nb > MAX_SHARED_PARTS:
        raise TooLarge(f"with the head solved from a flow reading every input moves every "
                       f"branch, and {nb:,} branches × {n:,} inputs are too many parts to keep "
                       f"(at most {MAX_SHARED_PARTS:,})")
    # z = 0 is the centre of every input's range; for a roughness that is the log-centre of
    # its factor or range, not the line's own ε (and for a cut temperature the middle of the
    # range left). Row 0 is the visit's value, so it takes the site's own roughness and
    # temperature (every other input is at its own value at z = 0): the same network as the
    # site's solve. The ± rows stay about the centre, as the linear estimate
    # of the uncertainty module takes them.
    own = Layout.from_network(network).roughness
    size = chunk_rows(len(own), n)
    parts: list[CopiesSolution] = []
    for start, stop in chunks(rows, size):
        z = np.zeros((stop - start, n))  # row r: 0 nominal, 1…n +δ, n+1…2n −δ
        for r in range(start, stop):
            if r > 0:
                z[r - start, (r - 1) % n] = STEP if r <= n else -STEP
        if start == 0:
            # a temperature cut where the liquid freezes or boils is drawn about the middle
            # of what is left: row 0 at the site's own temperature all the same
            for k, inp in enumerate(plan.inputs):
                if inp.kind == "temperature" and inp.centre:
                    z[0, k] = -inp.centre / inp.half_width
        variants = plan.variants(z)
        if start == 0:
            roughness = variants.roughness.copy()
            roughness[0] = own
            variants = replace(variants, roughness=roughness)
        parts.append(solve_copies(network, given, find, variants))
    return _Spread(plan.inputs, _joined(parts), plan.notes)


def _joined(parts: list[CopiesSolution]) -> CopiesSolution:
    """The chunks' solutions as one, rows in order."""
    if len(parts) == 1:
        return parts[0]
    found = [p.found for p in parts]
    return CopiesSolution(
        flows=np.concatenate([p.flows for p in parts]),
        total_flow=np.concatenate([p.total_flow for p in parts]),
        pressure_drop=np.concatenate([p.pressure_drop for p in parts]),
        head=np.concatenate([p.head for p in parts]),
        found=None if any(f is None for f in found) else np.concatenate(
            [f for f in found if f is not None]),
        converged=all(p.converged for p in parts))


def _resistance(head: Array, flow: Array | float) -> Array:
    """R = h/(Q|Q|): positive for reverse flow too (h and Q change sign together)."""
    q = np.asarray(flow, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.asarray(head / (q * np.abs(q)), dtype=float)


def _unbanded(value: float, measured: bool) -> Indicator | None:
    return Indicator(value, measured, None) if math.isfinite(value) and value != 0 else None


# ---- one visit ------------------------------------------------------------------------------

def visit_indicators(site: Site) -> VisitIndicators:
    """Solve ``site`` (one visit's, :func:`branchwise.core.site.visits.visit_site`) from its
    own readings and work out every branch's indicators with their uncertainty parts."""
    sr = solve_site(site)
    built, net = sr.built, sr.built.network
    notes: list[str] = []
    tol, thermal, thermal_notes = site_thermal(site, built.tolerances or Tolerances())
    tol = replace(tol, target_flow_measured=True)  # a clamp-on held as a target is a reading
    notes += thermal_notes
    held = tuple(_si(r.kind, r.branch, r.value, r.path, net) for r in readings(site))
    spreads: dict[tuple[str, int | None], _Spread | None] = {}
    weighed = _weighed_spread(site, sr, notes)

    def spread(given: Given, find: Find, key: tuple[str, int | None]) -> _Spread | None:
        if key not in spreads:
            try:
                spreads[key] = made = _spread(net, given, find, tol, thermal,
                                              weighed if key == ("base", None) else None)
                notes.extend(f"bands: {n}" for n in made.notes
                             if f"bands: {n}" not in notes and n != CONDITION_NOT_DRAWN)
            except BranchwiseError as exc:
                notes.append("no band for the visit's indicators: "
                             f"{getattr(exc, 'marked', '') or exc}")
                spreads[key] = None
        return spreads[key]

    base = spread(built.given, FindFlows(), ("base", None))
    u_meter = tol.flow_meter_percent / 100 / SQRT3
    out = []
    for b, br in enumerate(net.branches):
        own = next((r for r in held if r.kind == "measured_flow" and r.branch == b), None)
        heads = sorted((r for r in held if r is not own), key=lambda r: HEAD_ORDER.index(r.kind))
        meter = Part(f"flow meter on branch '{br.name}'", False, u_meter)
        if base is not None:
            solved = base.indicator(base.sol.flows[:, b], False)
        else:
            solved = _unbanded(float(sr.result.flows[b]), False)
        flow = solved if own is None else Indicator(own.value, True, (meter,))
        if own is None or not heads:
            if base is not None:
                resistance = base.indicator(_resistance(base.sol.head, base.sol.flows[:, b]),
                                            False)
            else:
                resistance = _unbanded(float(_resistance(np.array(sr.result.driving_head),
                                                         float(sr.result.flows[b]))), False)
            out.append(BranchIndicators(br.name, flow, resistance, None, solved))
            continue
        if own.value == 0:  # a line shut or a meter fault: nothing of the line to work out
            out.append(BranchIndicators(br.name, flow, None, None, solved))
            continue
        r = heads[0]
        given = make_given(r.kind, r.value, r.name)
        find = FindUnknown("roughness", br.name, own.value, 0)
        rough_ok = len(br.segments) == 1 and net.friction not in ("hazen-williams", "laminar")
        resistance = roughness = None
        against = False  # the clamp-on reads against the way the other reading drives
        if isinstance(given, TotalFlow):  # the others carry what this branch does not
            against = given.value * own.value < 0
            ev = spread(given, find, ("find", b)) if not against else None
            if ev is not None:
                resistance = ev.indicator(_resistance(ev.sol.head, ev.sol.flows[:, b]), True)
        else:
            ev = spread(given, FindFlows(), (r.kind, r.branch))
            if ev is not None:
                resistance = ev.indicator(_resistance(ev.sol.head, own.value), True,
                                          (replace(meter, relative=-2 * u_meter),))
                against = float(ev.sol.head[0]) * own.value < 0
        if against:
            which = reading_words(r.kind, r.name)
            either = ("either clamp-on mounted or set the other way round?"
                      if r.kind == "measured_flow" else
                      "a meter mounted or set the other way round?")
            notes.append(f"{br.name}: its clamp-on reads a flow against the way the {which} "
                         f"drives the header: {either}"
                         + (" Its R is given with that sign (R = h/(Q·|Q|))"
                            if resistance is not None else ""))
        elif resistance is None:
            notes.append(f"{br.name}: no resistance from the clamp-on at the head of the "
                         f"{GIVENS[r.kind].words} (the readings admit no state of the line)")
        if rough_ok and not against:
            roughness = _roughness(net, given, find, br.name, notes, spread, b)
        elif len(br.segments) > 1:
            notes.append(f"{br.name}: several pipes in series, so no one effective roughness")
        out.append(BranchIndicators(br.name, flow, resistance, roughness, solved))
    return VisitIndicators(sr, held, tuple(out), tuple(notes))


def _weighed_spread(site: Site, sr: SiteResult, notes: list[str]) -> tuple[str, float] | None:
    """For a visit solved from all its readings weighed together, the spread the instruments
    leave of that head (the visit's pressure drop is then no gauge's reading: drawing the
    gauge's tolerance on it gave bands of an instrument that was maybe never read; the model's
    part is drawn by the visit's own inputs, shared between visits), and a note when they
    disagree."""
    rec = sr.reconciliation
    if rec is None or not solves_from_all(site):
        return None
    if not rec.consistent:
        notes.append(f"the visit's readings weighed together disagree (p {p_said(rec.p_value)}): "
                     "its bands take them as agreeing, so they are too narrow, and a change "
                     "against this visit may be the reading at fault, not the line")
    sigma = rec.pressure_drop_sigma_instruments_pa
    return WEIGHED, sigma if math.isfinite(sigma) else rec.pressure_drop_sigma_pa


SpreadOf = Callable[[Given, Find, tuple[str, int | None]], "_Spread | None"]
"""A spread for a given and a find, worked out once per key."""


def _roughness(net: Network, given: Given, find: FindUnknown, name: str, notes: list[str],
               spread: SpreadOf, b: int) -> Indicator | None:
    """The effective roughness found from the branch's own clamp-on (None, with a note saying
    why, where the readings admit none)."""
    from ..numerics.solve import solve

    try:
        solve(net, given, find)
    except BranchwiseError as exc:
        notes.append(f"{name}: no effective roughness from that visit's readings: "
                     f"{getattr(exc, 'marked', '') or exc}")
        return None
    ev = spread(given, find, ("find", b))
    if ev is None or ev.sol.found is None:
        return None
    found: Indicator | None = ev.indicator(ev.sol.found, True)
    return found


def _si(kind: str, branch: int | None, value: object, path: str, net: Network) -> ReadingSI:
    number = parse_quantity(value, GIVENS[kind].quantity, path)
    name = net.branches[branch].name if branch is not None else None
    return ReadingSI(kind, branch, name, number)
