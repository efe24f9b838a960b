"""The system curve: the pressure drop a network needs against the total flow it carries.

Every point is solved at once: one copy of the network per point in a tiled layout
(:func:`~.variants.tiled_layout`), each copy a group of its own.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import InputError, NoSolutionError
from ..model import Network, positive
from .hydraulics import Array, Layout, head_for_total_flow
from .results import Result
from .variants import tiled_layout


@dataclass(frozen=True)
class SystemCurve:
    """Pressure drop against total flow for a fixed network (SI).

    total_flow: m³/s, (points,); pressure_drop: p_in − p_out, Pa, with the static ρ g Δz of the
    elevation change; driving_head: m; branch_flows: m³/s, (points, branches);
    operating_index: the row of the operating point (None when none was given).
    """

    total_flow: Array
    pressure_drop: Array
    driving_head: Array
    branch_flows: Array
    branch_names: tuple[str, ...]
    operating_index: int | None = None

    @property
    def operating_point(self) -> tuple[float, float] | None:
        """(total flow m³/s, pressure drop Pa) at the operating point, if one is marked."""
        i = self.operating_index
        return None if i is None else (float(self.total_flow[i]), float(self.pressure_drop[i]))


def system_curve(
    network: Network, total_flows: Array | None = None, points: int = 50,
    max_factor: float = 1.5, operating: Result | None = None,
) -> SystemCurve:
    """The system curve of ``network``, every point solved at once (one group per point).

    total_flows: m³/s to evaluate; by default ``points`` flows evenly from zero to
    ``max_factor`` (–) times the operating total flow. The operating flow itself is put in, so
    the curve passes exactly through it. operating: a solved result; its network (with any found
    diameter, length or roughness put in) is the one drawn.
    """
    net = operating.network if operating is not None else network
    op_flow = operating.total_flow if operating is not None else None
    if total_flows is None:
        if op_flow is None or op_flow == 0:
            raise InputError("curve.total_flows", "nothing",
                             "give the total flows, or an operating point that carries flow")
        if int(points) < 2:
            raise InputError("curve.points", points, "must be at least 2")
        positive("curve.max_factor", max_factor)
        flows = np.linspace(0.0, max_factor * op_flow, int(points))
    else:
        flows = np.asarray(total_flows, dtype=float).ravel()
        if flows.size == 0 or not np.all(np.isfinite(flows)):
            raise InputError("curve.total_flows", total_flows, "must be finite numbers")
    index = None
    if op_flow is not None:
        near = np.abs(flows - op_flow) <= 1e-9 * np.max(np.abs(flows), initial=abs(op_flow))
        flows = np.unique(np.append(flows[~near], op_flow))  # sorted; the operating flow exactly
        index = int(np.flatnonzero(flows == op_flow)[0])
    base = Layout.from_network(net)
    moving = flows != 0  # no flow, no loss: solved only where there is flow
    head, q = np.zeros(len(flows)), np.zeros((len(flows), base.n_branches))
    if moving.any():
        h, qm, _ = head_for_total_flow(tiled_layout(base, int(moving.sum())), flows[moving])
        head[moving], q[moving] = h, qm.reshape(-1, base.n_branches)
    if not (np.all(np.isfinite(head)) and np.all(np.isfinite(q))):  # never inf or NaN out
        raise NoSolutionError("the system curve has no finite pressure drop at some of these "
                              "flows; narrow the range of flows", "curve.total_flows")
    return SystemCurve(
        total_flow=flows,
        pressure_drop=net.fluid.density * net.gravity * (head + net.elevation_change),
        driving_head=head, branch_flows=q,
        branch_names=tuple(b.name for b in net.branches), operating_index=index,
    )
