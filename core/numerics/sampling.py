"""What a band draws: every input with its tolerance (:class:`InputTolerance`), and the map
from standard draws to drawn networks and their solved outputs (:class:`SamplingPlan`), made by
:func:`build_plan` from a network, its given and find, and the tolerances.

A row of draws holds one value in [−1, 1] per input, its limits at ±1: uniform between them by
the GUM (JCGM 100:2008, 4.3.7, a rectangular distribution); roughness uniform in ln ε. The Monte
Carlo run (:mod:`.uncertainty`), the reconciliation's model covariance (:mod:`.reconcile`) and
the history's bands (``core.history``) all read the same plan.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..messages import marked
from ..model import (
    Find,
    FindUnknown,
    Given,
    MeasuredFlow,
    Network,
    PressureDrop,
)
from .copies import solve_copies
from .hydraulics import Array, Layout
from .results import Result
from .tolerances import Thermal, Tolerances, path_of
from .variants import Variants

PRESSURE_DROP = "pressure drop"
TOTAL_FLOW = "total flow"
"""The names of the bands of the pressure drop and the total flow (each branch's flow is
:func:`branch_flow`; a found unknown's is :attr:`SamplingPlan.found_name`)."""


def branch_flow(name: str) -> str:
    """The name of the band of branch ``name``'s flow: ``branch 'AHU-3 coil' flow``."""
    return f"branch '{name}' flow"


SQRT3 = math.sqrt(3.0)
STEP = 1e-4
"""δ of the finite differences, as a fraction of each input's half-width (–). Outputs are solved to
about 1e-13 relative, so the differences carry about 1e-9 relative round-off."""


@dataclass(frozen=True)
class InputTolerance:
    """One drawn input. half_width: Pa (gauge), relative (meter, target, diameter, length,
    fitting K, valve Kv), K (temperature, about ``centre`` K from the operating point: not 0
    where the tolerance was cut at the liquid's freezing or boiling point) or ln ε (roughness,
    drawn log-uniform about ``centre``, the ln of a factor, or of ε in m when ``explicit``).
    segments: the layout's segment indices it moves (for a valve Kv: the branch's index)."""

    name: str
    kind: str
    half_width: float
    segments: tuple[int, ...] = ()
    centre: float = 0.0
    explicit: bool = False

    @property
    def distribution(self) -> str:
        return "log-uniform" if self.kind == "roughness" else "uniform"

    @property
    def standard_uncertainty(self) -> float:
        """u = a/√3 of a rectangular distribution (JCGM 100:2008, 4.3.7), in half_width's unit."""
        return self.half_width / SQRT3


CONDITION_NOT_DRAWN = ("the pipes' condition is not drawn: under Hazen–Williams it is each "
                       "line's C, which has no tolerance here (the roughness tolerance does not "
                       "apply), so the bands leave out how far the lines have aged")
"""A band's note under Hazen–Williams. Not for a history: there C is the line's record, the
same at every visit, and an aging line is what its trends are for."""


@dataclass(frozen=True)
class SamplingPlan:
    """The inputs to draw for one solve, and the map from standard draws to solved outputs.

    A row of ``z`` holds one value in [−1, 1] per input: −1 and +1 are its limits."""

    network: Network
    given: Given
    find: Find
    inputs: tuple[InputTolerance, ...]
    thermal: Thermal | None
    notes: tuple[str, ...] = ()

    @property
    def found_name(self) -> str | None:
        """The output name of the sought unknown (None when the flows are sought)."""
        if not isinstance(want := self.find, FindUnknown):
            return None
        br = self.network.branches[self.network.index_of(want.branch)]
        seg = f" segment {want.segment + 1}" if len(br.segments) > 1 else ""
        return f"branch '{br.name}'{seg} {want.quantity} (found)"

    def unit_of(self, output: str) -> str:
        return {PRESSURE_DROP: "Pa", self.found_name: "m"}.get(output, "m³/s")

    def variants(self, z: Array, base: Layout | None = None) -> Variants:
        """The networks that the rows of ``z`` stand for, as arrays (``base``: the network's
        layout, when it is at hand)."""
        z = np.atleast_2d(np.asarray(z, dtype=float))
        base = Layout.from_network(self.network) if base is None else base
        n, net = len(z), self.network
        seg = {k: np.tile(getattr(base, k), (n, 1)) for k in
               ("diameter", "length", "roughness", "minor_k")}
        nu, rho = np.full(n, net.fluid.kinematic_viscosity), np.full(n, net.fluid.density)
        reading = np.full(n, float(self.given.value))
        valve = np.ones((n, len(net.branches)))
        target = np.full(n, getattr(self.find, "target_flow", np.nan), dtype=float)
        for col, inp in enumerate(self.inputs):
            zc = z[:, col]
            s = list(inp.segments)
            if inp.kind == "gauge":
                reading = reading + inp.half_width * zc
            elif inp.kind == "meter":
                reading = reading * (1 + inp.half_width * zc)
            elif inp.kind == "target":
                target = target * (1 + inp.half_width * zc)
            elif inp.kind == "temperature" and self.thermal is not None:
                dt = inp.centre + inp.half_width * zc  # K from the operating point
                nu = nu * np.exp(self.thermal.dln_nu_dt * dt)
                rho = rho * np.exp(self.thermal.dln_rho_dt * dt)
            elif inp.kind == "valve Kv":
                valve[:, s] *= (1 + inp.half_width * zc)[:, None]
            elif inp.kind == "roughness":
                scale = np.exp(inp.centre + inp.half_width * zc)[:, None]
                seg["roughness"][:, s] = scale if inp.explicit else base.roughness[s] * scale
            else:
                key = "minor_k" if inp.kind == "fitting K" else inp.kind
                seg[key][:, s] *= (1 + inp.half_width * zc)[:, None]
        return Variants(nu=nu, density=rho, reading=reading, target=target, valve_scale=valve,
                        **seg)

    def evaluate(self, z: Array) -> tuple[dict[str, Array], bool]:
        """Every output for every row of ``z`` (NaN where no answer), and whether all converged."""
        sol = solve_copies(self.network, self.given, self.find, self.variants(z))
        out = {branch_flow(b.name): sol.flows[:, i]
               for i, b in enumerate(self.network.branches)}
        out |= {TOTAL_FLOW: sol.total_flow, PRESSURE_DROP: sol.pressure_drop}
        if self.found_name is not None and sol.found is not None:
            out[self.found_name] = sol.found
        return out, sol.converged

    def outputs_of(self, result: Result) -> dict[str, float]:
        """The same outputs from a deterministic :func:`solve` result."""
        out = {branch_flow(b.name): float(q)
               for b, q in zip(self.network.branches, result.flows, strict=True)}
        out |= {TOTAL_FLOW: result.total_flow, PRESSURE_DROP: result.pressure_drop}
        if self.found_name is not None and result.solved is not None:
            out[self.found_name] = result.solved.value
        return out

    def network_for(self, z_row: Array) -> tuple[Network, Given, Find]:
        """One row as plain model objects, for :func:`solve` (tests and the benchmark baseline)."""
        v = self.variants(np.asarray(z_row, dtype=float)[None, :])
        return v.as_model(self.network, self.given, self.find)


def build_plan(
    network: Network, given: Given, find: Find, tol: Tolerances, thermal: Thermal | None,
    given_sigma: tuple[str, float] | None = None,
) -> SamplingPlan:
    """The inputs that ``tol`` makes uncertain for this solve (zero-width ones left out).

    given_sigma: (name, standard uncertainty in the given's unit) when the given is not one
    instrument's reading (several readings weighed together): drawn in its place."""
    inputs: list[InputTolerance] = []
    notes: list[str] = []
    meter = tol.flow_meter_percent / 100
    if given_sigma is not None and isinstance(given, PressureDrop):
        inputs.append(InputTolerance(given_sigma[0], "gauge", SQRT3 * given_sigma[1]))
    elif isinstance(given, PressureDrop):
        if tol.gauge_full_scale is None:
            notes.append("pressure-gauge accuracy taken as a percent of the reading: no full "
                         "scale was given")
        span = abs(given.value) if tol.gauge_full_scale is None else tol.gauge_full_scale
        inputs.append(InputTolerance("pressure gauge", "gauge", tol.gauge_percent / 100 * span))
    elif isinstance(given, MeasuredFlow):
        name = network.branches[network.index_of(given.branch)].name
        inputs.append(InputTolerance(f"flow meter on branch '{name}'", "meter", meter))
    else:
        inputs.append(InputTolerance("flow meter (total flow)", "meter",
                                     tol.total_flow_percent / 100))
    want = find if isinstance(find, FindUnknown) else None
    x = network.index_of(want.branch) if want is not None else -1
    if want is not None and tol.target_flow_measured:
        name = network.branches[x].name
        # named target first: a ranking cut to its column keeps what it is
        inputs.append(InputTolerance(f"target flow of branch '{name}' (a meter's reading)",
                                     "target", meter))
    if tol.temperature_k > 0 and thermal is None:
        notes.append("temperature tolerance not applied: no model of ν and ρ against "
                     "temperature was given")
    elif thermal is not None and thermal.span_k is not None:  # cut where the liquid ends
        low, high = thermal.span_k
        inputs.append(InputTolerance("temperature", "temperature", (high - low) / 2,
                                     centre=(high + low) / 2))
    elif thermal is not None:
        inputs.append(InputTolerance("temperature", "temperature", float(tol.temperature_k)))
    explicit = {network.index_of(k, path_of("roughness_m", k)): v
                for k, v in tol.roughness_m.items()}
    base = Layout.from_network(network)
    sought = int(np.flatnonzero(base.seg_branch == x)[want.segment]) if want is not None else -1
    rough_model = network.friction not in ("hazen-williams", "laminar")
    if network.friction == "hazen-williams":
        notes.append(CONDITION_NOT_DRAWN)
    for b, br in enumerate(network.branches):
        segs = [int(s) for s in np.flatnonzero(base.seg_branch == b)]

        def free(quantity: str, segs: list[int] = segs) -> tuple[int, ...]:
            drop = sought if want is not None and want.quantity == quantity else -1
            return tuple(s for s in segs if s != drop)

        label = f"branch '{br.name}'"
        low, high = explicit.get(b, tol.roughness_factor)
        rough = free("roughness")
        if rough_model and b in explicit and any(  # (round-off of a unit's conversion kept in)
                not low * (1 - 1e-9) <= base.roughness[s] <= high * (1 + 1e-9) for s in rough):
            entered = ", ".join(marked("roughness", float(base.roughness[s])) for s in rough)
            notes.append(f"{label}: the roughness range drawn ({marked('roughness', low)} … "
                         f"{marked('roughness', high)}) does not hold the roughness entered "
                         f"({entered}): the band is of a line in that range, the answer of "
                         "the line as entered")
        if rough_model and rough and (b in explicit or base.roughness[list(rough)].max() > 0):
            top = high if b in explicit else high * base.roughness[list(rough)].max()
            narrowest = base.diameter[segs].min() * (1 - tol.diameter_percent / 100)
            if top >= narrowest / 2:
                path = (path_of("roughness_m", br.name) if b in explicit
                        else path_of("roughness_factor"))
                raise InputError(path, (low, high), f"reaches half the narrowest diameter of "
                                 f"branch '{br.name}' ({narrowest / 2:g} m)")
            centre, half = (math.log(low) + math.log(high)) / 2, math.log(high / low) / 2
            if half > 0:
                inputs.append(InputTolerance(f"{label} roughness", "roughness", half, rough,
                                             centre, b in explicit))
        for kind, percent, values in (
            ("diameter", tol.diameter_percent, base.diameter),
            ("length", tol.length_percent, base.length),
            ("fitting K", tol.fitting_k_percent, base.minor_k),
        ):
            moved = free(kind)
            if percent > 0 and moved and values[list(moved)].max() > 0:
                inputs.append(InputTolerance(f"{label} {kind}", kind, percent / 100, moved))
        if br.valve_kv is not None and tol.valve_kv_percent > 0:
            inputs.append(InputTolerance(f"{label} valve Kv", "valve Kv",
                                         tol.valve_kv_percent / 100, (b,)))
    kept = tuple(i for i in inputs if i.half_width > 0)
    return SamplingPlan(network, given, find, kept, thermal, tuple(notes))


def target_note(plan: SamplingPlan) -> str | None:
    """What a band of a found unknown says of its target flow when the plan draws it as a
    meter's reading (the default), for a reader who sizes a line to a design figure."""
    target = next((i for i in plan.inputs if i.kind == "target"), None)
    if target is None or not isinstance(plan.find, FindUnknown):
        return None
    name = plan.network.branches[plan.network.index_of(plan.find.branch)].name
    return (f"the target flow of '{name}' is drawn as a meter's reading "
            f"(± {target.half_width * 100:g} %); for a design figure, say so in the "
            "tolerances (target_flow_measured = false)")


__all__ = ["CONDITION_NOT_DRAWN", "PRESSURE_DROP", "SQRT3", "STEP", "TOTAL_FLOW",
           "InputTolerance", "SamplingPlan", "branch_flow", "build_plan", "target_note"]
