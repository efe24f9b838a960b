"""Every copy of a network solved in one vectorised call, in every direction :func:`.solve.solve`
knows: the flows from a pressure drop, a total flow or a branch reading, or one branch's
diameter, length or roughness for a target flow (the same equations, no per-copy Python loop).
The uncertainty module feeds it drawn samples.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..model import Find, FindUnknown, Given, MeasuredFlow, Network, PressureDrop
from . import unknowns
from .hydraulics import Array, Layout, branch_head, flows_at_head, head_for_total_flow
from .variants import Variants


@dataclass(frozen=True)
class CopiesSolution:
    """Per copy: branch flows (copies, branches) m³/s, total flow m³/s, pressure drop Pa, driving
    head m, the found unknown m (None when flows were sought). NaN where a copy has no answer."""

    flows: Array
    total_flow: Array
    pressure_drop: Array
    head: Array
    found: Array | None
    converged: bool


def solve_copies(network: Network, given: Given, find: Find, v: Variants) -> CopiesSolution:
    """Solve every copy as :func:`.solve.solve` solves one (the inputs are checked there)."""
    base = Layout.from_network(network)
    n, nb, g = v.copies, base.n_branches, network.gravity
    fixed = np.zeros(nb, dtype=bool)
    flows = np.full((n, nb), np.nan)
    converged, flows_done = True, False
    want = find if isinstance(find, FindUnknown) else None
    x = network.index_of(want.branch) if want is not None else -1
    if want is not None:
        fixed[x] = True
        flows[:, x] = v.target
    if isinstance(given, PressureDrop):
        head = v.reading / (v.density * g) - network.elevation_change
    elif isinstance(given, MeasuredFlow):
        m = network.index_of(given.branch)
        head = branch_head(v.layout(base, np.arange(nb) == m), v.reading)
        fixed[m] = True
        flows[:, m] = v.reading
    elif want is not None:  # a total flow: the other branches carry what X does not
        rest = v.reading - v.target
        ok = (rest != 0) & (np.sign(rest) == np.sign(v.target))
        h, _, info = head_for_total_flow(v.layout(base, ~fixed), np.where(ok, rest, 1.0))
        head, converged = np.where(ok, h, np.nan), info.converged
    else:
        head, q, info = head_for_total_flow(v.layout(base), v.reading)
        flows[:], converged, flows_done = q.reshape(n, nb), info.converged, True
    found = None
    if want is not None:
        head = np.where((head != 0) & (np.sign(head) == np.sign(v.target)), head, np.nan)
        sought = unknowns.Sought(network, base, v, x, want.segment, head)
        found = unknowns.SOLVERS[want.quantity].solve(sought)
        head = np.where(np.isnan(found), np.nan, head)
    free = ~fixed
    if free.any() and not flows_done:
        q, info = flows_at_head(v.layout(base, free), np.repeat(np.nan_to_num(head), free.sum()))
        flows[:, free] = q.reshape(n, -1)
        converged = converged and info.converged
    flows[np.isnan(head)] = np.nan
    dp = v.density * g * (head + network.elevation_change)
    return CopiesSolution(flows, flows.sum(axis=1), dp, head, found, converged)
