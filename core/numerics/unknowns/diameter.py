"""The diameter of one segment such that its branch carries the target flow at the driving head.

The branch's head loss falls strictly as the diameter grows, so the diameter is bracketed on
ln D between :data:`DIAMETER_MIN` and :data:`DIAMETER_MAX` (the "sane bound") and found by a
bracketed root finder on ln h − ln H. No answer when even the widest pipe loses too much (the
rest of the branch, a valve), or when even the narrowest carries the target flow.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from ...errors import NoSolutionError
from ...messages import diameter_text, flow_text
from ...model import FindUnknown, Given, Network
from ..hydraulics import Array, branch_head, flows_at_head
from ..roots import FAST_TOL, illinois
from .common import Sought, valve_hint, where, with_value

DIAMETER_MIN = 1e-5
"""m; below any pipe that carries a liquid on a plant."""
DIAMETER_MAX = 10.0
"""m; the largest diameter considered when sizing (far above any branch off a header)."""


def check(net: Network, want: FindUnknown, index: int) -> None:
    """Any diameter can be sought: nothing to refuse before solving."""


def _excess(s: Sought) -> Callable[[Array], Array]:
    """ln |h_X(Q_x)| − ln |H| per copy as a function of ln D of the sought segment."""
    ln_head = np.log(np.abs(np.nan_to_num(s.head, nan=1.0)))

    def excess(ln_d: Array) -> Array:
        diameter = s.variants.diameter.copy()
        with np.errstate(over="ignore"):  # a copy with no root may step far out (its inf is
            diameter[:, s.index] = np.exp(ln_d)  # dropped with it; no warning to the person)
        lay, _ = s.layout(diameter=diameter)
        with np.errstate(divide="ignore", over="ignore"):
            return np.log(np.abs(branch_head(lay, s.target))) - ln_head

    return excess


def _bracket(s: Sought) -> tuple[Array, Array]:
    """ln D at the ends of the search: the narrowest pipe whose roughness still fits, the widest."""
    lo = np.log(np.maximum(DIAMETER_MIN, 2 * s.variants.roughness[:, s.index] * (1 + 1e-9)))
    return lo, np.full_like(lo, np.log(DIAMETER_MAX))


def solve(s: Sought, tol: float = FAST_TOL) -> Array:
    """The diameter per copy (m); NaN where there is none."""
    excess = _excess(s)
    lo, hi = _bracket(s)
    f_lo, f_hi = excess(lo), excess(hi)
    ok = (f_lo >= 0) & (f_hi <= 0) & np.isfinite(s.head)
    return np.where(ok, np.exp(illinois(excess, lo, hi, f_lo, f_hi, ok, tol)), np.nan)


def why_not(s: Sought, given: Given) -> NoSolutionError:
    """Why the one copy of ``s`` has no diameter."""
    br = s.network.branches[s.branch]
    q, head = float(s.target[0]), float(s.head[0])
    excess = _excess(s)
    lo, hi = _bracket(s)
    if float(excess(hi)[0]) > 0:
        widest = with_value(br, s.segment, "diameter", DIAMETER_MAX)
        diameter = s.column("diameter", DIAMETER_MAX)
        lay, _ = s.layout(diameter=diameter)
        q_max = float(flows_at_head(lay, head)[0][0])
        return NoSolutionError(
            f"branch '{br.name}' cannot pass {flow_text(q)} {where(given, head)} with any "
            f"diameter up to {diameter_text(DIAMETER_MAX)}: at that size it carries "
            f"{flow_text(q_max)} (the rest of the branch loses too much)"
            f"{valve_hint(s.network, widest, q, head)}", "solve.target_flow")
    return NoSolutionError(
        f"branch '{br.name}' carries {flow_text(q)} even at {diameter_text(float(np.exp(lo[0])))}"
        ": check the target flow", "solve.target_flow")
