"""The length of one segment such that its branch carries the target flow at the driving head.

Friction in the sought segment is f L/D · V|V|/2g with f independent of L, so

    L = (H − h_X(Q_x; L = 0)) / (f/D · V|V|/2g)

— explicit and exact. No answer when the rest of the branch alone loses the whole head at that
flow (L ≤ 0), or when L would exceed any pipe run (:data:`~branchwise.core.model.MAX_LENGTH`).
"""

from __future__ import annotations

import numpy as np

from ...errors import NoSolutionError
from ...messages import flow_text, length_text
from ...model import MAX_LENGTH, FindUnknown, Given, Network
from ..hydraulics import Array, IntArray, Layout, branch_head, flows_at_head, segment_state
from ..roots import FAST_TOL
from .common import Sought, valve_hint, where, with_value


def check(net: Network, want: FindUnknown, index: int) -> None:
    """Any length can be sought: nothing to refuse before solving."""


def _required(lay: Layout, k: IntArray, q: Array, head: Array, gravity: float) -> Array:
    """L of the segments ``k`` of ``lay`` (whose own length is 0) for flows ``q`` at ``head``."""
    st = segment_state(lay, q)
    per_metre = st.friction_factor[k] / lay.diameter[k] * st.velocity[k] * np.abs(
        st.velocity[k]) / (2 * gravity)
    found: Array = (head - branch_head(lay, q)) / per_metre
    return found


def solve(s: Sought, tol: float = FAST_TOL) -> Array:
    """The length per copy (m); NaN where there is none. (Explicit: ``tol`` is not needed.)"""
    lay, k = s.layout(length=s.column("length", 0.0))
    found = _required(lay, k, s.target, s.head, s.gravity)
    return np.where((found > 0) & (found <= MAX_LENGTH), found, np.nan)


def why_not(s: Sought, given: Given) -> NoSolutionError:
    """Why the one copy of ``s`` has no length."""
    br = s.network.branches[s.branch]
    q, head = float(s.target[0]), float(s.head[0])
    lay, k = s.layout(length=s.column("length", 0.0))
    found = float(_required(lay, k, s.target, s.head, s.gravity)[0])
    if not found > 0:
        q0 = float(flows_at_head(lay, head)[0][0])
        zero = with_value(br, s.segment, "length", 0.0)
        return NoSolutionError(
            f"branch '{br.name}' cannot pass {flow_text(q)} {where(given, head)} with any "
            f"length: at zero length its fittings{' and valve' if br.valve_kv is not None else ''}"
            f" alone allow {flow_text(q0)}{valve_hint(s.network, zero, q, head)}",
            "solve.target_flow")
    return NoSolutionError(
        f"branch '{br.name}' would need {length_text(found)} of pipe to hold {flow_text(q)} "
        f"{where(given, head)}: more than any pipe run ({length_text(MAX_LENGTH)}); check the "
        "target flow", "solve.target_flow")
