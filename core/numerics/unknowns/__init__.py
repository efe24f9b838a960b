"""One segment's diameter, length or roughness such that its branch carries a target flow.

Branch X must lose exactly the driving head H at the target flow Q_x: h_X(Q_x) = H. Each
unknown is one module, under its key in :data:`branchwise.core.finds.FINDS`, with its equations
written once and solved for many copies of a network at once (``solve``: Monte Carlo runs) —
and for the network itself as one copy (:func:`find`), which also says why there is no answer
when there is none (``why_not``) and refuses a request that has no meaning (``check``).
"""

from __future__ import annotations

import math
from types import ModuleType

import numpy as np

from ...model import FindUnknown, Given, Network
from ..hydraulics import RootInfo, branch_head
from ..results import Solved
from ..roots import EXACT_TOL
from . import diameter, length, roughness
from .common import Sought, branch_layout, with_value

SOLVERS: dict[str, ModuleType] = {"diameter": diameter, "length": length,
                                  "roughness": roughness}
"""The solver module of each unknown, by its key in :data:`branchwise.core.finds.FINDS`."""


def find(
    net: Network, want: FindUnknown, index: int, head: float, given: Given
) -> tuple[Network, Solved, RootInfo]:
    """Solve for ``want.quantity`` (head: m, the driving head branch ``index`` must lose);
    returns the network with the value put in, the solved value and how well it holds."""
    solver = SOLVERS[want.quantity]
    solver.check(net, want, index)
    sought = Sought.one(net, want, index, head)
    value = float(solver.solve(sought, EXACT_TOL)[0])
    if not math.isfinite(value):
        raise solver.why_not(sought, given)
    br = net.branches[index]
    new_branch = with_value(br, want.segment, want.quantity, value)
    net = net.replace_branch(index, new_branch)
    h = float(branch_head(branch_layout(net, new_branch), np.array([want.target_flow]))[0])
    residual = abs(h - head) / abs(head)
    solved = Solved(want.quantity, br.name, want.segment, value, want.target_flow)
    return net, solved, RootInfo(residual <= 1e-9, 1, residual)


__all__ = ["SOLVERS", "Sought", "find"]
