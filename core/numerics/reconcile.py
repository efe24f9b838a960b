"""Weigh several readings of one header against each other: data reconciliation.

A header holds one unknown state, the driving head H between its two nodes. Each reading yᵢ —
the differential gauge's Δp, a total-flow meter, a clamp-on on a branch — is a model gᵢ(H) plus
an error: Δp = ρ g (H + Δz), Q_total = Σ Q_b(H), Q_b(H). The reconciled head minimises the
weighted sum of squares (Narasimhan & Jordache, *Data Reconciliation and Gross Error
Detection*, 2000, ch. 3; Madron, 1992)

    S(H) = r(H)ᵀ V⁻¹ r(H),   r = y − g(H),

with V the covariance of the residuals: the instruments' variances on the diagonal plus the
model's own uncertainty of g(H), propagated to first order (JCGM 100:2008, 5.1.2) from the same
tolerances the bands use (roughness, bore, length, fitting K, valve Kv, temperature). The model
terms are correlated between readings (a total flow and a clamp-on share that branch's pipe), so
V is full. A ± bound with nothing more known is a rectangular distribution, u = a/√3 (GUM, JCGM
100:2008, 4.3.7): gauge accuracy as % of full scale, flow meters as % of reading.

The global test: at the optimum S follows χ² with m − 1 degrees of freedom (m readings, one
unknown); the readings are called consistent when its p-value is at least 5 %. Each reading's
normalised residual is rᵢ / √(V_r)ᵢᵢ with V_r = V − J (Jᵀ V⁻¹ J)⁻¹ Jᵀ the covariance of the
residuals at the optimum, J = dg/dH; the largest one points at the reading most likely at fault
(the maximum-power test of Narasimhan & Jordache, 7.2). With two readings both normalised
residuals are equal: the test can say that they disagree, not which one is off.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
from functools import cached_property

import numpy as np

from ..errors import BranchwiseError, InputError
from ..model import FindFlows, Network, PressureDrop
from .hydraulics import Array, Layout, flows_at_head, head_and_slope, head_for_total_flow
from .nudges import Nudges, nudges
from .reconcile_optimum import least_head
from .reconcile_result import (
    ALPHA,
    READING_WORDS,
    Observation,
    ReadingFit,
    Reconciliation,
    chi_square_p,
    verdict_words,
)
from .sampling import SQRT3, build_plan
from .small import SMALL_BRANCHES
from .small.branch import Fallback
from .small.heads import flows_at, head_for_total, pipes_of
from .tolerances import Thermal, Tolerances

MODEL_STEP = 1e-4
"""δ of the finite differences of the model terms, in units of each input's half-width."""


class _Model:
    """g(H), dg/dH and the model covariance of g at H for one header and its readings."""

    def __init__(self, network: Network, obs: Sequence[Observation], tol: Tolerances,
                 thermal: Thermal | None) -> None:
        self.net, self.obs = network, list(obs)
        self.lay = Layout.from_network(network)
        # The model's inputs: every tolerance but the instruments' (they are the readings).
        plan = build_plan(network, PressureDrop(1.0), FindFlows(), tol, thermal)
        self.plan = replace(plan, inputs=tuple(i for i in plan.inputs
                                               if i.kind not in ("gauge", "meter", "target")))
        self.rho_g = network.fluid.density * network.gravity
        small = len(network.branches) <= SMALL_BRANCHES
        self.pipes = pipes_of(network) if small else None
        self._states: dict[float, tuple[Array, Array]] = {}
        self.alone: dict[tuple[int, float], float] = {}
        """The head each reading alone gives, by (reading, value)."""

    def state(self, head: float) -> tuple[Array, Array]:
        """The flows at ``head`` and each branch's d ln h / d ln Q there, solved once per head
        (the optimum, fit and covariance ask for the same heads); a few branches in plain
        floats (:mod:`.small`), Colebrook started from its root at the last head."""
        known = self._states.get(head)
        if known is None:
            known = self._states[head] = self._solve(head)
        return known

    def _solve(self, head: float) -> tuple[Array, Array]:
        if self.pipes is not None:
            try:
                flows, _ = flows_at(self.pipes, head)
                return np.array(flows), np.array([p.s for p in self.pipes])
            except (Fallback, ArithmeticError, ValueError):
                pass  # no head, or a branch beyond the small path's test: the arrays' solver
        q = flows_at_head(self.lay, head)[0]
        return q, head_and_slope(self.lay, q)[1]

    def flows(self, head: float) -> Array:
        return self.state(head)[0]

    def values(self, head: float, q: Array | None = None, rho_g: float | None = None) -> Array:
        q = self.flows(head) if q is None else q
        rho_g = self.rho_g if rho_g is None else rho_g
        return np.array([self._one(o, head, q, rho_g) for o in self.obs])

    def _one(self, o: Observation, head: float, q: Array, rho_g: float) -> float:
        if o.kind == "pressure_drop":
            return rho_g * (head + self.net.elevation_change)
        if o.kind == "total_flow":
            return float(q.sum())
        assert o.branch is not None
        return float(q[o.branch])

    def slope(self, head: float) -> Array:
        """dg/dH for every reading: ρg for Δp, dQ/dH = Q/(H · d ln h/d ln Q) for a flow (at
        H = 0 its limit, the laminar conductance, taken at a head of 1e-30 m)."""
        head = head if head != 0 else 1e-30
        q, s = self.state(head)
        dq = np.where(q != 0, q / (head * s), 0.0)
        return np.array([self.rho_g if o.kind == "pressure_drop" else
                         float(dq.sum()) if o.kind == "total_flow" else float(dq[o.branch])
                         for o in self.obs])

    def covariance(self, head: float) -> Array:
        """The model's covariance of g at ``head`` (first order; inputs independent)."""
        n_in = len(self.plan.inputs)
        m = len(self.obs)
        if n_in == 0:
            return np.zeros((m, m))
        moves = self._moves
        dq = moves.flow_changes(head, self.flows(head))
        dg = np.zeros((2 * n_in, m))  # each row's change of every reading
        for k, o in enumerate(self.obs):
            if o.kind == "pressure_drop":
                dg[:, k] = (moves.rho_g - self.rho_g) * (head + self.net.elevation_change)
            elif o.kind == "total_flow":
                dg[:, k] = moves.total_flow(dq)
            else:
                assert o.branch is not None
                dg[:, k] = moves.branch_flow(dq, o.branch)
        sens = (dg[:n_in] - dg[n_in:]).T / (2 * MODEL_STEP)  # (readings, inputs), per unit z
        scaled: Array = sens / SQRT3  # z uniform on [−1, 1]: u(z) = 1/√3
        return np.asarray(scaled @ scaled.T, dtype=float)

    @cached_property
    def _moves(self) -> Nudges:
        """Each input ± δ, only the branches it moves (:mod:`.nudges`: memory bounded); the
        same at every head, so made once."""
        return nudges(self.plan, self.lay, MODEL_STEP, self.net.gravity)


def instrument_sigma(o: Observation, tol: Tolerances) -> float:
    """The instrument's standard uncertainty: a/√3 of its ± bound (GUM, 4.3.7)."""
    if o.kind == "pressure_drop":
        span = abs(o.value) if tol.gauge_full_scale is None else tol.gauge_full_scale
        return tol.gauge_percent / 100 * span / SQRT3
    percent = tol.total_flow_percent if o.kind == "total_flow" else tol.flow_meter_percent
    return percent / 100 * abs(o.value) / SQRT3


def reconcile(network: Network, obs: Sequence[Observation], tol: Tolerances | None = None,
              thermal: Thermal | None = None, names: Sequence[str] | None = None
              ) -> Reconciliation:
    """The reconciled state of ``network`` from two or more readings ``obs`` (module docstring).

    tol: the instruments' and the model's tolerances (default: common practice); thermal: how
    the liquid moves with temperature (None: the temperature tolerance is left out).
    """
    tol = tol or Tolerances()
    if len(obs) < 2:
        raise InputError("conditions.given", "all", "needs two readings or more to weigh")
    model = _Model(network, obs, tol, thermal)
    y = np.array([o.value for o in obs])
    meas = np.array([instrument_sigma(o, tol) for o in obs]) ** 2
    if not np.all(meas > 0):
        raise InputError("tolerances", "0", "an instrument with no tolerance cannot be weighed "
                         "against the others; give the gauge and flow-meter accuracy")
    head = _start(model, y, meas)
    for _ in range(2):  # V at the start, then at the first optimum
        cov = np.diag(meas) + model.covariance(head)
        head = _optimum(model, y, cov, head)
    fit = _fit(model, y, cov, head)
    labels = _labels(network, obs, names)
    fits = tuple(ReadingFit(o.kind, labels[k], float(y[k]), float(fit.g[k]),
                            float(math.sqrt(cov[k, k])), float(fit.nr[k]))
                 for k, o in enumerate(obs))
    dof = len(obs) - 1
    p = chi_square_p(fit.chi2, dof)
    consistent = p >= ALPHA
    suspect, without = None, None
    if not consistent and len(obs) >= 3:
        k = int(np.argmax(np.abs(fit.nr)))
        suspect = fits[k]
        keep = [i for i in range(len(obs)) if i != k]
        rest = _Model(network, [obs[i] for i in keep], tol, thermal)
        sub_cov = cov[np.ix_(keep, keep)]
        sub_head = _optimum(rest, y[keep], sub_cov, head)
        sub = _fit(rest, y[keep], sub_cov, sub_head)
        without = (sub.chi2, chi_square_p(sub.chi2, dof - 1))
    q = fit.q
    sigma = 1 / math.sqrt(fit.info) if fit.info > 0 else math.nan
    inst = math.sqrt(float(np.sum(fit.gain**2 * meas))) if fit.info > 0 else math.nan
    return Reconciliation(
        head_m=head, pressure_drop_pa=model.rho_g * (head + network.elevation_change),
        total_flow_m3_s=float(q.sum()), flows_m3_s=tuple(float(v) for v in q),
        chi_square=fit.chi2, degrees_of_freedom=dof, p_value=p, consistent=consistent,
        suspect=suspect, without_suspect=without, readings=fits,
        verdict=verdict_words(fits, fit.chi2, dof, p, consistent, suspect, without),
        covariance=tuple(tuple(float(v) for v in row) for row in cov),
        head_sigma_m=sigma, pressure_drop_sigma_pa=model.rho_g * sigma,
        pressure_drop_sigma_instruments_pa=model.rho_g * inst,
    )


@dataclass(frozen=True)
class _Fit:
    g: Array
    q: Array
    chi2: float
    nr: Array
    info: float
    gain: Array
    """d head / d reading at the optimum: V⁻¹J / (Jᵀ V⁻¹ J)."""


def _fit(model: _Model, y: Array, cov: Array, head: float) -> _Fit:
    q = model.flows(head)
    g = model.values(head, q)
    r = y - g
    w = np.linalg.inv(cov)
    j = model.slope(head)
    info = float(j @ w @ j)
    vr = cov - np.outer(j, j) / info
    with np.errstate(invalid="ignore", divide="ignore"):
        nr = np.where(np.diag(vr) > 0, r / np.sqrt(np.abs(np.diag(vr))), 0.0)
        gain = w @ j / info
    return _Fit(g, q, float(r @ w @ r), nr, info, gain)


def _start(model: _Model, y: Array, meas: Array) -> float:
    """A first head: the one the most precise reading gives on its own (relative σ)."""
    k = int(np.argmin(np.sqrt(meas) / np.maximum(np.abs(y), 1e-300)))
    return _head_of(model, k, float(y[k]))


def _head_of(model: _Model, k: int, value: float) -> float:
    """The head at which reading ``k`` alone would read ``value`` (asked once per reading)."""
    key = (k, value)
    if key not in model.alone:
        model.alone[key] = _solve_alone(model, model.obs[k], value)
    return model.alone[key]


def _solve_alone(model: _Model, o: Observation, value: float) -> float:
    if o.kind == "pressure_drop":
        return value / model.rho_g - model.net.elevation_change
    if o.kind == "total_flow":
        if model.pipes is not None and value != 0:
            try:
                return head_for_total(model.pipes, value)[0]
            except (Fallback, ArithmeticError, ValueError):
                pass  # the arrays' solver
        return float(head_for_total_flow(model.lay, value)[0][0])
    assert o.branch is not None
    if model.pipes is not None and value != 0:
        try:
            return math.copysign(model.pipes[o.branch].evaluate(abs(value)), value)
        except (Fallback, ArithmeticError, ValueError):
            pass  # the arrays' solver
    q = np.zeros(model.lay.n_branches)
    q[o.branch] = value
    return float(head_and_slope(model.lay, q)[0][o.branch])


def _optimum(model: _Model, y: Array, cov: Array, head: float) -> float:
    """The head of least S with V fixed, over heads of either sign (:mod:`.reconcile_optimum`)."""
    heads = [head]
    for k in range(len(y)):
        try:
            heads.append(_head_of(model, k, float(y[k])))
        except (ArithmeticError, ValueError, BranchwiseError):
            continue  # a reading the model cannot reach alone: the others span the search
    labels = [_reading_label(model, o) for o in model.obs]
    return least_head(model.values, model.slope, y, cov, heads, labels)


def _reading_label(model: _Model, o: Observation) -> str:
    words = READING_WORDS[o.kind]
    return words if o.branch is None else f"{words} on '{model.net.branches[o.branch].name}'"


def _labels(network: Network, obs: Sequence[Observation],
            names: Sequence[str] | None) -> list[str | None]:
    names = names or [b.name for b in network.branches]
    return [names[o.branch] if o.branch is not None else None for o in obs]
