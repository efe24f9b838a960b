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
    Given,
    Network,
)
from .draws import Index, LinearShares, OutputStore, Progress, chunk_rows, chunks
from .hydraulics import Array, Layout
from .results import Result
from .sampling import (
    SQRT3,
    STEP,
    InputTolerance,
    SamplingPlan,
    build_plan,
    target_note,
)
from .solve import solve
from .tolerances import Thermal, Tolerances


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
    if (target := target_note(plan)) is not None:
        notes.append(target)
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


__all__ = ["OutputBand", "Thermal", "Tolerances", "UncertaintyResult", "monte_carlo"]
