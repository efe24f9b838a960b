"""A site solved: the core result, plus the catalog size for a diameter that was found.

For a diameter found on a segment whose size came from a pipe catalog, :func:`solve_site` adds
the smallest size of the same standard and schedule whose bore is at least the one found
(:func:`branchwise.core.catalogs.smallest_at_least`) and the flow the branch carries with it.
That second solve holds the site's given condition fixed: the same pressure drop, the same total
flow (the other branches then carry less), or the same measured flow in another branch (so the
driving head is unchanged). The resized segment's fittings K are recomputed at its new bore.

A found diameter is itself found with the fittings' K of the bore found: Crane's K = n·f_T
depends on the nominal size, so the solve is repeated with the K of the bore just found until
the two agree (:func:`_fittings_at_found_bore`).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

from ..errors import BranchwiseError, InputError
from ..messages import marked
from ..model import FindFlows, FindUnknown, PressureDrop
from ..numerics.results import Result
from .assumptions import Assumption, assumptions_of
from .build import Built, build
from .reconcile import reconcile_site, solves_from_all
from .spec import Site
from .values import plain_number

if TYPE_CHECKING:
    from ..numerics.draws import Progress
    from ..numerics.reconcile_result import Reconciliation
    from ..numerics.uncertainty import Tolerances, UncertaintyResult
    from ..storage.presets import PresetSource


WEIGHED = "readings weighed together"
"""The given's uncertainty input with ``conditions.given = "all"``."""


@dataclass(frozen=True)
class CatalogPick:
    """The smallest catalog size at least as large as a found diameter, and what it carries.

    flow: m³/s in the branch with that size, with the site's given condition (pressure drop,
    total flow or measured branch flow) held at its value; ``result`` is that whole solve.
    """

    size: Any
    flow: float
    result: Result


UNWEIGHED = "Readings not weighed against each other"
"""How the note begins when the readings beside the given cannot be weighed (shown on its own
where the weighed readings would be)."""


@dataclass(frozen=True)
class SiteResult:
    """A solved site: the core result, the built network, the catalog size if any, and the
    uncertainty bands when they were asked for (:func:`with_uncertainty`)."""

    site: Site
    built: Built
    result: Result
    catalog: CatalogPick | None
    notes: tuple[str, ...] = ()
    uncertainty: UncertaintyResult | None = None
    assumptions: tuple[Assumption, ...] = ()
    """What was taken for granted or resolved from the site (:mod:`.assumptions`)."""
    reconciliation: Reconciliation | None = None
    """Every reading weighed against the others (:mod:`.reconcile`); None with fewer than two."""
    unweighed: str = ""
    """Why the readings could not be weighed against each other (a note, also in ``notes``,
    its quantities marked); '' when they were, or when there are fewer than two."""


def solve_site(site: Site, presets: PresetSource | None = None,
               built: Built | None = None) -> SiteResult:
    """Build and solve ``site``; for a diameter found on a catalog-sized segment, also the
    smallest catalog size (same standard and schedule) with a bore at least that large, and the
    flow the branch then carries with the site's given condition held. built: the site already
    built (saves a build)."""
    from ..numerics.solve import solve

    built = build(site, presets) if built is None else built
    notes = list(built.notes)
    names = [b.name for b in built.network.branches]
    unweighed = ""
    if solves_from_all(site):  # the reconciled head fixes the solve
        try:
            rec = reconcile_site(site, built, presets)
        except BranchwiseError as exc:
            raise exc.naming(names) from None
        if rec is not None:
            built = replace(built, given=PressureDrop(rec.pressure_drop_pa))
    else:  # beside the answer: a reading that cannot be weighed does not stop it
        try:
            rec = reconcile_site(site, built, presets)
        except InputError as exc:
            rec = None
            from .fields import marked_error_text

            unweighed = f"{UNWEIGHED}: {marked_error_text(exc, names)}"
            notes.append(unweighed)
    try:
        result = solve(built.network, built.given, built.find)
    except BranchwiseError as exc:
        raise exc.naming([b.name for b in built.network.branches]) from None
    pick = None
    find = built.find
    if isinstance(find, FindUnknown) and find.quantity == "diameter" and result.solved:
        i = built.network.index_of(find.branch)
        try:
            result = _fittings_at_found_bore(site, built, i, find, result, notes)
        except BranchwiseError as exc:
            raise exc.naming([b.name for b in built.network.branches]) from None
        built = _with_fittings_of(built, result, i, find.segment)
        like = built.sizes[i][find.segment]
        if like is not None and result.solved is not None:
            pick = _catalog_pick(site, built, i, find, like, result.solved.value, notes)
    if not any(result.flows):  # no regime, no friction factor: said, not left as zeros
        notes.append("Nothing flows: the head across the header comes out zero, so every "
                     "branch is still (no Reynolds number, regime or friction factor to give)")
    found = None
    if isinstance(find, FindUnknown) and find.quantity == "diameter" and result.solved:
        found = (built.network.index_of(find.branch), find.segment, result.solved.value)
    return SiteResult(site, built, result, pick, tuple(notes),
                      assumptions=assumptions_of(site, built, found), reconciliation=rec,
                      unweighed=unweighed)


def _fittings_at_found_bore(site: Site, built: Built, i: int, find: FindUnknown,
                            result: Result, notes: list[str]) -> Result:
    """``result`` solved again with the fittings' K of the bore it found, until they agree.

    Crane's f_T steps with the nominal size, so near a step the K of one size can give a bore
    of the next and back: then the larger of the two bores is given (its K is the smaller
    size's, the higher one) and a note says so.
    """
    from ..catalogs import crane_nominal, fittings_k
    from ..catalogs.pipes import nominal_value
    from ..numerics.solve import solve

    counts = _fitting_counts(site, i, find.segment)
    if not counts or result.solved is None:
        return result
    entered = built.fittings_k[i][find.segment]
    base = built.network.branches[i].segments[find.segment].minor_k - entered
    held: float = entered
    used: dict[str, Result] = {}  # nominal size -> the result found with that size's K
    for _ in range(12):
        if result.solved is None:
            break
        nominal = crane_nominal(result.solved.value).nominal
        k_here = fittings_k(counts, result.solved.value)
        if abs(k_here - held) <= 1e-12 * max(1.0, k_here):
            return result  # the K used is the K of the bore found
        if nominal in used:  # this size's K was tried and gave a bore of another size
            both = (used[nominal], result)
            best = max(both, key=lambda r: r.solved.value if r.solved else 0.0)
            sizes = sorted({crane_nominal(r.solved.value).nominal for r in both if r.solved},
                           key=lambda n: float(nominal_value(n)))
            notes.append(f"the fittings' K steps between NPS {' and '.join(sizes)} at this bore "
                         "(Crane's f_T is taken by nominal size): the larger bore found is given")
            return best
        net = result.network
        seg = replace(net.branches[i].segments[find.segment], minor_k=base + k_here)
        segments = list(net.branches[i].segments)
        segments[find.segment] = seg
        net = net.replace_branch(i, replace(net.branches[i], segments=tuple(segments)))
        result, held = solve(net, built.given, find), k_here
        used[nominal] = result
    return result


def _with_fittings_of(built: Built, result: Result, i: int, segment: int) -> Built:
    """``built`` with the sought segment's K as ``result`` used it (the K of the bore found),
    so that the bands and the catalog pick start from the same network."""
    old = built.network.branches[i].segments[segment]
    new_k = result.network.branches[i].segments[segment].minor_k
    if new_k == old.minor_k:
        return built
    segments = list(built.network.branches[i].segments)
    segments[segment] = replace(old, minor_k=new_k)
    network = built.network.replace_branch(
        i, replace(built.network.branches[i], segments=tuple(segments)))
    ks = [list(row) for row in built.fittings_k]
    ks[i][segment] += new_k - old.minor_k
    return replace(built, network=network, fittings_k=tuple(tuple(row) for row in ks))


def _fitting_counts(site: Site, i: int, segment: int) -> dict[str, float]:
    spec = site.branches[i].segments[segment]
    return {k: float(plain_number(v, "fittings") or 0.0) for k, v in spec.fittings.items()}


def _catalog_pick(site: Site, built: Built, i: int, find: FindUnknown, like: Any,
                  required: float, notes: list[str]) -> CatalogPick | None:
    from ..catalogs import fittings_k, smallest_at_least
    from ..numerics.solve import solve

    size = smallest_at_least(required, like)
    if size is None:
        notes.append(f"no {like.standard} schedule {like.schedule} size has a bore of "
                     f"{marked('diameter', required)} or more")
        return None
    seg = built.network.branches[i].segments[find.segment]
    counts = _fitting_counts(site, i, find.segment)
    k_fit = fittings_k(counts, size.inner_diameter_m) if counts else 0.0
    minor = seg.minor_k - built.fittings_k[i][find.segment] + k_fit
    segments = list(built.network.branches[i].segments)
    segments[find.segment] = replace(seg, diameter=size.inner_diameter_m, minor_k=minor)
    branch = replace(built.network.branches[i], segments=tuple(segments))
    network = built.network.replace_branch(i, branch)
    result = solve(network, built.given, FindFlows())
    return CatalogPick(size, float(result.flows[i]), result)


def uncertainty_for_site(
    site: Site, samples: int = 10_000, seed: int = 0, presets: PresetSource | None = None,
    tolerances: Tolerances | None = None, built: Built | None = None,
    progress: Progress | None = None, reconciliation: Reconciliation | None = None,
) -> UncertaintyResult:
    """Monte Carlo bands, the GUM linear estimate and the ranking for ``site``
    (:func:`branchwise.core.numerics.uncertainty.monte_carlo`), with the site's own tolerances.

    samples: Monte Carlo draws (at least 10); seed: the same seed gives the same bands.
    tolerances: use these instead of the site's ``[tolerances]`` (None: the site's table, or
    the common-practice defaults without one). built: the site already built (saves a build).
    The temperature tolerance moves ν and ρ through the site's fluid model
    (:func:`~branchwise.core.site.tolerances.site_thermal`). Errors name the site's fields
    (``tolerances.<key>``); nothing is printed. progress: told (rows solved, rows in all)
    as the run goes; what it raises ends the run. With ``conditions.given = "all"`` the bands
    start from the reconciled pressure drop and draw its own spread (:data:`WEIGHED`: the
    head's standard uncertainty from the readings weighed together) in place of one
    instrument's; reconciliation: the site's, when it is at hand (saves weighing again).
    """
    from ..numerics.reconcile_result import p_said
    from ..numerics.uncertainty import Tolerances, monte_carlo
    from .tolerances import site_thermal

    built = build(site, presets) if built is None else built
    tol = tolerances or built.tolerances or Tolerances()
    tol, thermal, notes = site_thermal(site, tol, presets)
    spread, rec = None, None
    if solves_from_all(site):
        rec = reconcile_site(site, built, presets) if reconciliation is None else reconciliation
        if rec is not None:
            built = replace(built, given=PressureDrop(rec.pressure_drop_pa))
            spread = (WEIGHED, rec.pressure_drop_sigma_pa)
    try:
        res = monte_carlo(built.network, built.given, built.find, tol, samples, seed, thermal,
                          progress, spread)
    except BranchwiseError as exc:
        raise exc.naming([b.name for b in built.network.branches]) from None
    if spread is not None and rec is not None and not rec.consistent:
        notes = (*notes, f"the readings weighed together disagree (p {p_said(rec.p_value)}): the "
                 "spread of the reconciled pressure drop takes them as agreeing, so the bands "
                 "are too narrow until the reading at fault is found")
    return _say_cv(site, replace(res, notes=(*notes, *res.notes)))


def _say_cv(site: Site, res: UncertaintyResult) -> UncertaintyResult:
    """The inputs of the branches whose valve was given by Cv named by Cv (the drawn factor
    is the same on Kv and Cv: Cv = 1.156 Kv)."""
    by_cv = {f"branch '{b.name}' valve Kv" for b in site.branches
             if b.valve_cv is not None and b.valve_kv is None}
    if not by_cv:
        return res

    def say(name: str) -> str:
        return name[:-2] + "Cv" if name in by_cv else name

    inputs = tuple(replace(i, name=say(i.name)) for i in res.inputs)
    ranking = {out: [(say(n), share) for n, share in rows] for out, rows in res.ranking.items()}
    return replace(res, inputs=inputs, ranking=ranking)


def with_uncertainty(sr: SiteResult, samples: int = 10_000, seed: int = 0,
                     presets: PresetSource | None = None,
                     progress: Progress | None = None) -> SiteResult:
    """``sr`` with its :attr:`SiteResult.uncertainty` filled (see :func:`uncertainty_for_site`);
    the reports then show the bands and the ranking."""
    res = uncertainty_for_site(sr.site, samples, seed, presets, built=sr.built,
                               progress=progress, reconciliation=sr.reconciliation)
    return replace(sr, uncertainty=res)
