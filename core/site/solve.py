"""A site solved: the core result, plus the catalog size for a diameter that was found.

For a diameter found on a segment whose size came from a pipe catalog, :func:`solve_site` adds
the smallest size of the same standard and schedule whose bore is at least the one found
(:func:`branchwise.core.catalogs.smallest_at_least`) and the flow the branch carries with it.
That second solve holds the site's given condition fixed: the same pressure drop, the same total
flow (the other branches then carry less), or the same measured flow in another branch (so the
driving head is unchanged). The resized segment's fittings K are recomputed at its new bore.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

from ..errors import BranchwiseError
from ..model import FindFlows, FindUnknown
from ..numerics.results import Result
from ..units import format_quantity
from .build import Built, build
from .spec import Site
from .values import plain_number

if TYPE_CHECKING:
    from ..numerics.draws import Progress
    from ..numerics.uncertainty import Tolerances, UncertaintyResult
    from ..storage.presets import PresetSource


@dataclass(frozen=True)
class CatalogPick:
    """The smallest catalog size at least as large as a found diameter, and what it carries.

    flow: m³/s in the branch with that size, with the site's given condition (pressure drop,
    total flow or measured branch flow) held at its value; ``result`` is that whole solve.
    """

    size: Any
    flow: float
    result: Result


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


def solve_site(site: Site, presets: PresetSource | None = None) -> SiteResult:
    """Build and solve ``site``; for a diameter found on a catalog-sized segment, also the
    smallest catalog size (same standard and schedule) with a bore at least that large, and the
    flow the branch then carries with the site's given condition held."""
    from ..numerics.solve import solve

    built = build(site, presets)
    try:
        result = solve(built.network, built.given, built.find)
    except BranchwiseError as exc:
        raise exc.naming([b.name for b in built.network.branches]) from None
    pick = None
    notes = list(built.notes)
    find = built.find
    if isinstance(find, FindUnknown) and find.quantity == "diameter" and result.solved:
        i = built.network.index_of(find.branch)
        like = built.sizes[i][find.segment]
        if like is not None:
            pick = _catalog_pick(site, built, i, find, like, result.solved.value, notes)
    return SiteResult(site, built, result, pick, tuple(notes))


def _catalog_pick(site: Site, built: Built, i: int, find: FindUnknown, like: Any,
                  required: float, notes: list[str]) -> CatalogPick | None:
    from ..catalogs import fittings_k, smallest_at_least
    from ..numerics.solve import solve

    size = smallest_at_least(required, like)
    if size is None:
        notes.append(f"no {like.standard} schedule {like.schedule} size has a bore of "
                     f"{format_quantity(required, 'diameter')} or more")
        return None
    spec = site.branches[i].segments[find.segment]
    seg = built.network.branches[i].segments[find.segment]
    counts = {k: float(plain_number(v, "fittings") or 0.0) for k, v in spec.fittings.items()}
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
    progress: Progress | None = None,
) -> UncertaintyResult:
    """Monte Carlo bands, the GUM linear estimate and the ranking for ``site``
    (:func:`branchwise.core.numerics.uncertainty.monte_carlo`), with the site's own tolerances.

    samples: Monte Carlo draws (at least 10); seed: the same seed gives the same bands.
    tolerances: use these instead of the site's ``[tolerances]`` (None: the site's table, or
    the common-practice defaults without one). built: the site already built (saves a build).
    The temperature tolerance moves ν and ρ through the site's fluid model
    (:func:`~branchwise.core.site.tolerances.site_thermal`). Errors name the site's fields
    (``tolerances.<key>``); nothing is printed. progress: told (rows solved, rows in all)
    as the run goes; what it raises ends the run.
    """
    from ..numerics.uncertainty import Tolerances, monte_carlo
    from .tolerances import site_thermal

    built = build(site, presets) if built is None else built
    tol = tolerances or built.tolerances or Tolerances()
    tol, thermal, notes = site_thermal(site, tol, presets)
    try:
        res = monte_carlo(built.network, built.given, built.find, tol, samples, seed, thermal,
                          progress)
    except BranchwiseError as exc:
        raise exc.naming([b.name for b in built.network.branches]) from None
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
                               progress=progress)
    return replace(sr, uncertainty=res)
