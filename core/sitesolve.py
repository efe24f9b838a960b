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
from typing import Any

from .model import FindFlows, FindUnknown
from .results import Result
from .sitebuild import Built, PresetSource, build, plain_number
from .sitefile import Site
from .units import format_quantity


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
    """A solved site: the core result, the built network, and the catalog size if any."""

    site: Site
    built: Built
    result: Result
    catalog: CatalogPick | None
    notes: tuple[str, ...] = ()


def solve_site(site: Site, presets: PresetSource | None = None) -> SiteResult:
    """Build and solve ``site``; for a diameter found on a catalog-sized segment, also the
    smallest catalog size (same standard and schedule) with a bore at least that large, and the
    flow the branch then carries with the site's given condition held."""
    from .solve import solve

    built = build(site, presets)
    result = solve(built.network, built.given, built.find)
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
    from .catalogs import fittings_k, smallest_at_least
    from .solve import solve

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
