"""How far to trust a solve: Monte Carlo bands, the GUM linear estimate and a sensitivity ranking.

Every tolerance here is a ± limit with nothing more known about it, so by the GUM (JCGM 100:2008,
4.3.7, Type B) it is a rectangular distribution: uniform between the limits, standard uncertainty
u = a/√3 for half-width a. Roughness is known only to a factor, so it is uniform in ln ε
(log-uniform) and its half-width is taken in ln ε.

* Monte Carlo (the method of JCGM 101:2008, GUM Supplement 1): draw every input, solve all the
  drawn networks in one vectorised call (:func:`.copies.solve_copies`), and read
  P5, P50 and P95 of every output.
* Linear estimate (JCGM 100:2008, 5.1.2, law of propagation of uncertainty, uncorrelated inputs):
  u_c²(y) = Σ c_i² u²(x_i), with c_i = ∂y/∂x_i from central differences at ±δ around the centre
  of every input. The shares c_i² u_i² / u_c² rank the inputs by their part in the spread.

One draw per branch is shared by the segments of that branch (the same pipe, the same age, the
same survey): fully correlated within a branch, independent between branches.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt

from ..errors import InputError
from ..messages import render
from ..model import (
    Find,
    FindFlows,
    FindUnknown,
    Given,
    MeasuredFlow,
    Network,
    PressureDrop,
)
from .copies import solve_copies
from .draws import Index, LinearShares, OutputStore, Progress, chunk_rows, chunks
from .hydraulics import Array, Layout
from .results import Result
from .solve import solve
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
        inputs.append(InputTolerance("flow meter (total flow)", "meter", meter))
    want = find if isinstance(find, FindUnknown) else None
    x = network.index_of(want.branch) if want is not None else -1
    if want is not None and tol.target_flow_measured:
        name = network.branches[x].name
        inputs.append(InputTolerance(f"flow meter on branch '{name}' (target)", "target", meter))
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
    for b, br in enumerate(network.branches):
        segs = [int(s) for s in np.flatnonzero(base.seg_branch == b)]

        def free(quantity: str, segs: list[int] = segs) -> tuple[int, ...]:
            drop = sought if want is not None and want.quantity == quantity else -1
            return tuple(s for s in segs if s != drop)

        label = f"branch '{br.name}'"
        low, high = explicit.get(b, tol.roughness_factor)
        rough = free("roughness")
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


@dataclass(frozen=True)
class OutputBand:
    """One output's spread, in its SI unit: the deterministic value, P5/P50/P95, the Monte Carlo
    mean and standard deviation, and the GUM linear standard uncertainty ``linear_sigma``."""

    name: str
    unit: str
    nominal: float
    p5: float
    p50: float
    p95: float
    mean: float
    std: float
    linear_sigma: float


@dataclass(frozen=True)
class UncertaintyResult:
    """Bands per output, the inputs drawn, and per output the inputs ranked by their share of
    the linear variance, as (input name, share 0…1), largest first.

    failed: draws for which the sought unknown has no solution (left out of the bands).
    draws: the Monte Carlo values per output (for histograms), in the outputs' units; empty
    for a run too large to keep them in memory (see :mod:`.draws`).
    """

    samples: int
    seed: int
    outputs: dict[str, OutputBand]
    ranking: dict[str, list[tuple[str, float]]]
    inputs: tuple[InputTolerance, ...]
    failed: int = 0
    notes: tuple[str, ...] = ()
    draws: dict[str, Array] = field(default_factory=dict, repr=False)

    def to_dict(self) -> dict[str, object]:
        """JSON-ready: samples, seed, failed, per output its band, the ranking, the notes."""
        outputs = {
            name: {"unit": b.unit, "nominal": b.nominal, "p5": b.p5, "p50": b.p50, "p95": b.p95,
                   "mean": b.mean, "std": b.std, "linear_sigma": b.linear_sigma}
            for name, b in self.outputs.items()
        }
        ranking = {name: [[inp, share] for inp, share in rows]
                   for name, rows in self.ranking.items()}
        return {"samples": self.samples, "seed": self.seed, "failed": self.failed,
                "outputs": outputs, "ranking": ranking,
                "notes": [render(n) for n in self.notes]}  # quantities in SI


RANKING_KEPT = 100
"""Inputs kept in each output's ranking, the largest shares (all of them on any usual site: a
site of 20 branches draws about 90 inputs; a network of a thousand branches thousands, whose
every share of every output would fill memory)."""


def monte_carlo(
    network: Network, given: Given, find: Find | None = None, tol: Tolerances | None = None,
    samples: int = 10_000, seed: int = 0, thermal: Thermal | None = None,
    progress: Progress | None = None, given_sigma: tuple[str, float] | None = None,
) -> UncertaintyResult:
    """Propagate ``tol`` through the solve of ``network`` with ``given`` and ``find``
    (given_sigma: the given's own spread, see :func:`build_plan`).

    samples: Monte Carlo draws (≥ 10); seed: for numpy's ``default_rng`` (same seed, same
    answer); thermal: how ν and ρ move with temperature (see :meth:`Thermal.from_fluid_at`);
    progress: told (rows solved, rows in all) as the run goes (see :mod:`.draws`: the draws
    are solved in chunks, so memory stays bounded; what it raises ends the run).
    Raises what :func:`solve` raises for the nominal inputs.
    """
    find = FindFlows() if find is None else find
    tol = Tolerances() if tol is None else tol
    tol.validate()
    if isinstance(samples, bool) or not isinstance(samples, int | np.integer) or samples < 10:
        raise InputError("uncertainty.samples", samples, "must be a whole number of at least 10")
    samples = int(samples)
    nominal = solve(network, given, find)
    plan = build_plan(network, given, find, tol, thermal, given_sigma)
    notes, n_in = list(plan.notes), len(plan.inputs)
    size = chunk_rows(len(Layout.from_network(network).diameter), n_in)
    total_rows = samples + 2 * n_in
    rng = np.random.default_rng(seed)
    store = OutputStore(samples, list(plan.outputs_of(nominal)))
    failed_rows = np.zeros(samples, dtype=bool)
    all_converged = True
    try:
        for start, stop in chunks(samples, size):
            # Row after row from the one generator: the same draws as one (samples, n_in) call.
            values, converged = plan.evaluate(rng.uniform(-1.0, 1.0, size=(stop - start, n_in)))
            all_converged = all_converged and converged
            store.add(start, stop, values)
            for column in values.values():
                failed_rows[start:stop] |= np.isnan(column)
            if progress is not None:
                progress(stop, total_rows)
        shares, converged = _linear(plan, n_in, size, samples, total_rows, progress,
                                    store.names)
        return _result(plan, nominal, store, shares, failed_rows, all_converged and converged,
                       notes, seed)
    finally:
        store.close()


def _linear(plan: SamplingPlan, n_in: int, size: int, done: int, total_rows: int,
            progress: Progress | None, names: list[str]) -> tuple[LinearShares, bool]:
    """c_i u(x_i) of every input for every output (JCGM 100:2008, 5.1.2), from central
    differences at ±δ, the ± steps solved in chunks of inputs."""
    shares = LinearShares(n_in, names, RANKING_KEPT)
    all_converged = True
    for start, stop in chunks(n_in, max(1, size // 2)):
        block = np.zeros((stop - start, n_in))
        block[np.arange(stop - start), np.arange(start, stop)] = STEP
        values, converged = plan.evaluate(np.vstack([block, -block]))
        all_converged = all_converged and converged
        m = stop - start
        for name in names:
            plus, minus = values[name][:m], values[name][m:]
            shares.add(start, stop, name, (plus - minus) / (2 * STEP) / SQRT3)
        if progress is not None:
            progress(done + 2 * stop, total_rows)
    return shares, all_converged


def _result(plan: SamplingPlan, nominal: Result, store: OutputStore, shares: LinearShares,
            failed_rows: npt.NDArray[np.bool_], converged: bool, notes: list[str],
            seed: int) -> UncertaintyResult:
    samples = store.rows
    if not converged:
        notes.append("some drawn networks did not converge to the usual tolerance")
    failed = int(failed_rows.sum())
    if failed:
        notes.append(f"{failed} of {samples} draws have no solution for the sought unknown; "
                     "they are left out of the bands")
    outputs: dict[str, OutputBand] = {}
    ranking: dict[str, list[tuple[str, float]]] = {}
    nominal_values = plan.outputs_of(nominal)
    for name in store.names:
        variance = shares.variance(name)
        mc = store.column(name)[~failed_rows]
        outputs[name] = _band(name, plan.unit_of(name), nominal_values[name], mc, variance)
        ranking[name] = _ranked(plan.inputs, *shares.squares(name), variance)[:RANKING_KEPT]
    kept = store.all_kept()
    return UncertaintyResult(
        samples=samples, seed=seed, outputs=outputs, ranking=ranking, inputs=plan.inputs,
        failed=failed, notes=tuple(notes), draws={} if kept is None else dict(kept),
    )


def _band(name: str, unit: str, nominal: float, mc: Array, variance: float) -> OutputBand:
    if mc.size:
        p5, p50, p95 = (float(v) for v in np.percentile(mc, [5.0, 50.0, 95.0]))
        mean, std = float(mc.mean()), float(mc.std(ddof=1))
    else:
        p5 = p50 = p95 = mean = std = math.nan
    return OutputBand(name, unit, nominal, p5, p50, p95, mean, std, math.sqrt(variance))


def _ranked(
    inputs: tuple[InputTolerance, ...], index: Index, shares: Array, variance: float
) -> list[tuple[str, float]]:
    if not variance > 0:
        return []
    rows = [(inputs[int(i)].name, float(s / variance))
            for i, s in zip(index, shares, strict=True)]
    return sorted((r for r in rows if r[1] > 0), key=lambda r: -r[1])


__all__ = ["InputTolerance", "OutputBand", "SamplingPlan", "Thermal", "Tolerances",
           "UncertaintyResult", "build_plan", "monte_carlo"]
