"""Head loss of branches as a function of flow, and flow as a function of head — vectorised.

A :class:`Layout` flattens a network's segments into numpy arrays so that one call evaluates every
segment of every branch at once. Branches may also be grouped (``group``): each group is an
independent parallel network sharing nothing but the arrays, which lets the uncertainty module
solve thousands of sampled networks in one call.

Head loss in a branch carrying Q (m³/s), by Darcy–Weisbach plus minor losses plus the valve:

    h(Q) = Σ_s (f_s L_s/D_s + K_s) V_s|V_s| / (2g) + r_valve Q|Q|

with V_s = Q/A_s and f_s from :func:`branchwise.core.numerics.friction.darcy` at Re_s = V_s D_s/ν.
h is odd and strictly increasing in Q, so every head has exactly one flow. The root finders work
on ln h against ln Q (a slope between 1 and 2), safeguarded by a bracket, so they cannot diverge.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from functools import cached_property
from operator import attrgetter

import numpy as np
from numpy.typing import NDArray

from ..model import Branch, Network, Segment
from . import friction

Array = NDArray[np.float64]
IntArray = NDArray[np.intp]

VALVE_HEAD_FACTOR = 100.0 * 3600.0**2
"""h = VALVE_HEAD_FACTOR · (Q/Kv)² / g for Q in m³/s, Kv in m³/h at 1 bar: from IEC 60534-2-1,
Q[m³/h] = Kv √(Δp[bar] / (ρ/ρ0)), ρ0 = 1000 kg/m³, with h = Δp/(ρ g)."""

HEAD_RTOL = 1e-13
"""Convergence of a branch's flow: |ln h(Q) − ln H| below this."""
MAX_ITER = 200


@dataclass(frozen=True)
class Layout:
    """Segments of many branches as flat arrays (SI).

    seg_branch[s] is the branch of segment s; branch_group[b] the group (network) of branch b.
    valve_r[b] is the valve's head coefficient, m/(m³/s)² (0 without a valve).
    """

    seg_branch: IntArray
    diameter: Array
    length: Array
    roughness: Array
    minor_k: Array
    hw_c: Array
    valve_r: Array
    branch_group: IntArray
    nu: Array
    """Kinematic viscosity per branch, m²/s (per branch so sampled networks may differ)."""
    gravity: float
    model: str

    @property
    def n_branches(self) -> int:
        return len(self.valve_r)

    @property
    def n_groups(self) -> int:
        return int(self.branch_group.max()) + 1 if len(self.branch_group) else 0

    @cached_property
    def area(self) -> Array:
        return np.pi * self.diameter**2 / 4

    @cached_property
    def relative_roughness(self) -> Array:
        return self.roughness / self.diameter

    @cached_property
    def seg_nu(self) -> Array:
        return self.nu[self.seg_branch]

    def with_segments(self, diameter: Array | None = None, length: Array | None = None,
                      roughness: Array | None = None, minor_k: Array | None = None) -> Layout:
        """The same layout with the segment arrays given replaced (m, m, m, –)."""
        return replace(
            self, diameter=self.diameter if diameter is None else diameter,
            length=self.length if length is None else length,
            roughness=self.roughness if roughness is None else roughness,
            minor_k=self.minor_k if minor_k is None else minor_k)

    @classmethod
    def from_network(cls, net: Network) -> Layout:
        """The network's segments as arrays, read in one pass over existing objects: no
        per-segment object is made, so a network of 100k branches sets off no garbage
        collection over itself and the cost per branch stays flat."""
        branches = net.branches
        n_b = len(branches)
        counts = np.fromiter(map(len, map(_segments, branches)), np.intp, n_b)
        segs = [s for b in branches for s in b.segments]
        n_s = len(segs)

        def col(name: str) -> Array:
            return np.fromiter(map(attrgetter(name), segs), float, n_s)

        kv = np.fromiter((b.valve_kv or np.inf for b in branches), float, n_b)
        return cls(
            seg_branch=np.repeat(np.arange(n_b, dtype=np.intp), counts),
            diameter=col("diameter"),
            length=col("length"),
            roughness=col("roughness"),
            minor_k=col("minor_k"),
            hw_c=np.fromiter((np.nan if s.hw_c is None else s.hw_c for s in segs), float, n_s),
            valve_r=VALVE_HEAD_FACTOR / (kv**2 * net.gravity),
            branch_group=np.zeros(n_b, dtype=np.intp),
            nu=np.full(n_b, net.fluid.kinematic_viscosity),
            gravity=net.gravity,
            model=net.friction,
        )


def _segments(branch: Branch) -> tuple[Segment, ...]:
    return branch.segments


@dataclass(frozen=True)
class SegmentState:
    """Per-segment state at given branch flows (arrays over segments, SI)."""

    velocity: Array
    reynolds: Array
    friction_factor: Array
    slope: Array
    major: Array
    minor: Array


def _quiet() -> np.errstate:
    """A bracket being widened tries flows far past the root: heads overflow to inf there (and
    underflow to 0 far below it), which the solvers read as "too high" or "too low" (no warning
    wanted). What reaches a user is checked for inf and NaN at the end
    (``solve._check_bounds``)."""
    return np.errstate(divide="ignore", over="ignore", invalid="ignore")


def segment_state(lay: Layout, q: Array, start: Array | None = None) -> SegmentState:
    """Velocity, Re, f and the signed major and minor head losses of every segment.
    ``start``: 1/√f per segment at a nearby flow (Colebrook then takes a step or two)."""
    with _quiet():
        return _segment_state(lay, q, start)


def _segment_state(lay: Layout, q: Array, start: Array | None) -> SegmentState:
    qs = np.asarray(q, dtype=float)[lay.seg_branch]
    v = qs / lay.area
    speed = np.abs(v)
    re = speed * lay.diameter / lay.seg_nu
    if lay.model == "hazen-williams":
        f, slope = friction.hazen_williams(re, lay.relative_roughness, lay.diameter,
                                           lay.hw_c, lay.seg_nu, lay.gravity)
    else:
        f, slope = friction.darcy(re, lay.relative_roughness, lay.model, start)
    vel_head = v * speed / (2 * lay.gravity)
    major = np.where(speed > 0, f * lay.length / lay.diameter * vel_head, 0.0)
    minor = lay.minor_k * vel_head
    return SegmentState(v, re, f, slope, major, minor)


def head_and_slope(lay: Layout, q: Array) -> tuple[Array, Array]:
    """Branch head loss h(Q) (m, signed) and d ln h / d ln Q (between 1 and 2) for Q ≠ 0."""
    with _quiet():
        h, s, _ = _head_and_slope(lay, np.asarray(q, dtype=float), None)
    return h, s


def _head_and_slope(lay: Layout, q: Array, start: Array | None) -> tuple[Array, Array, Array]:
    """h, d ln h / d ln Q and each segment's f (with the errors quiet: the caller's block)."""
    st = _segment_state(lay, q, start)
    n = lay.n_branches
    valve = lay.valve_r * q * np.abs(q)
    h = np.bincount(lay.seg_branch, st.major + st.minor, minlength=n) + valve
    # d h/d ln Q per segment: major (2 + slope), minor and valve 2.
    dh = np.bincount(lay.seg_branch, st.major * (2 + st.slope) + 2 * st.minor,
                     minlength=n) + 2 * valve
    return h, np.where(h != 0, dh / h, 2.0), st.friction_factor


def branch_head(lay: Layout, q: Array) -> Array:
    """Head loss h(Q) of every branch, m (signed like Q)."""
    return head_and_slope(lay, q)[0]


@dataclass(frozen=True)
class RootInfo:
    converged: bool
    iterations: int
    residual: float
    """Largest relative residual |h(Q) − H|/|H| (or |ΣQ − Qt|/|Qt|) over the solved items."""


def _initial_flows(lay: Layout, head: Array) -> Array:
    """A starting |Q| per branch: two fixed-point passes with a 0.02 then an explicit f."""
    a = lay.area
    g = lay.gravity
    rr = lay.roughness / lay.diameter
    nu = lay.nu[lay.seg_branch]
    n = lay.n_branches
    f = np.full_like(a, 0.02)
    with np.errstate(all="ignore"):  # a branch with no resistance: q is inf, replaced below
        for _ in range(2):
            r_seg = (f * lay.length / lay.diameter + lay.minor_k) / (2 * g * a**2)
            r = np.bincount(lay.seg_branch, r_seg, minlength=n) + lay.valve_r
            q = np.sqrt(head / r)
            re = np.maximum(q[lay.seg_branch] / a * lay.diameter / nu, 1e-300)
            f = np.maximum(64 / re, friction.swamee_jain(np.maximum(re, 1.0), rr)[0])
    return np.where(np.isfinite(q) & (q > 0), q, 1e-6)


def flows_at_head(
    lay: Layout, head: Array | float, guess: Array | None = None
) -> tuple[Array, RootInfo]:
    """The flow in every branch at driving head ``head`` (m; scalar or one per branch).

    ``guess``: optional starting |Q| per branch (m³/s), e.g. the flows at a nearby head; it only
    saves iterations — the answer is the same to round-off.

    Safeguarded Newton on ln h(ln Q): the Newton step is taken when it stays inside the bracket
    known so far, otherwise the bracket is bisected (in ln Q) or widened by e^8.
    """
    n = lay.n_branches
    head = np.broadcast_to(np.asarray(head, dtype=float), (n,)).copy()
    sign = np.sign(head)
    target = np.abs(head)
    live = target > 0
    q = np.zeros(n)
    if not live.any():
        return q, RootInfo(True, 0, 0.0)
    sub = subset(lay, live) if not live.all() else lay
    t = target[live]
    ln_t = np.log(t)
    start = None if guess is None else np.abs(np.asarray(guess, dtype=float))[live]
    if start is None or not np.all(np.isfinite(start) & (start > 0)):
        start = _initial_flows(sub, t)
    x = np.log(start)
    lo = np.full_like(x, -np.inf)
    hi = np.full_like(x, np.inf)
    resid = np.full_like(x, np.inf)
    # Colebrook is started from each segment's root at the last pass's flows.
    warm: Array | None = None
    tiny = 4 * np.finfo(float).eps
    it = 0
    with _quiet():  # one block for the loop: see _quiet
        for it in range(1, MAX_ITER + 1):  # noqa: B007 (the count is reported)
            h, s, f = _head_and_slope(sub, np.exp(x), warm)
            if sub.model == "colebrook":
                warm = f**-0.5
            resid = np.log(h) - ln_t
            done = np.abs(resid) <= HEAD_RTOL
            lo = np.where(resid < 0, x, lo)
            hi = np.where(resid > 0, x, hi)
            if done.all():
                break
            step = np.clip(resid / np.where(s > 0, s, 1.0), -8.0, 8.0)
            trial = x - step
            inside = (trial > lo) & (trial < hi)
            both = np.isfinite(lo) & np.isfinite(hi)
            # lo + hi is nan where a side is still open: not taken there
            fallback = np.where(both, 0.5 * (lo + hi),
                                np.where(np.isfinite(hi), hi - 8, lo + 8))
            x = np.where(done, x, np.where(inside, trial, fallback))
            collapsed = both & (hi - lo <= tiny * np.maximum(1, np.abs(x)))
            if (done | collapsed).all():
                break
    q[live] = np.exp(x)
    worst = float(np.max(np.abs(np.expm1(resid)))) if resid.size else 0.0
    return sign * q, RootInfo(bool(worst <= 1e-11), it, worst)


def subset(lay: Layout, keep: NDArray[np.bool_]) -> Layout:
    """The layout restricted to the branches in ``keep`` (renumbered)."""
    seg_keep = keep[lay.seg_branch]
    new_index = np.cumsum(keep) - 1
    return Layout(
        seg_branch=new_index[lay.seg_branch[seg_keep]],
        diameter=lay.diameter[seg_keep],
        length=lay.length[seg_keep],
        roughness=lay.roughness[seg_keep],
        minor_k=lay.minor_k[seg_keep],
        hw_c=lay.hw_c[seg_keep],
        valve_r=lay.valve_r[keep],
        branch_group=lay.branch_group[keep],
        nu=lay.nu[keep],
        gravity=lay.gravity,
        model=lay.model,
    )


def head_for_total_flow(lay: Layout, total: Array | float) -> tuple[Array, Array, RootInfo]:
    """The driving head per group at which the group's branch flows add up to ``total`` (m³/s).

    Returns (head per group, flows per branch, info). ΣQ(H) is odd and strictly increasing in H;
    Newton on ln ΣQ against ln H (slope between ½ and 1), safeguarded by a bracket.
    """
    groups = lay.n_groups
    total = np.broadcast_to(np.asarray(total, dtype=float), (groups,)).copy()
    sign = np.sign(total)
    target = np.abs(total)
    gb = lay.branch_group
    head = np.zeros(groups)
    live = target > 0
    # Start from the head at which every branch would carry total/n_in_group (a fair guess).
    count = np.bincount(gb, minlength=groups)
    share = (target / np.maximum(count, 1))[gb]
    h0 = np.where(share > 0, np.abs(branch_head(lay, share)), 0.0)
    u = np.log(np.where(live, np.bincount(gb, h0, minlength=groups) / np.maximum(count, 1), 1.0))
    lo = np.full(groups, -np.inf)
    hi = np.full(groups, np.inf)
    q = np.zeros(lay.n_branches)
    resid = np.zeros(groups)
    iters = 0
    inner_ok = True
    slope_last: Array | None = None
    hb_last = np.ones(lay.n_branches)
    with _quiet():  # one block for the loop: see _quiet
        for iters in range(1, MAX_ITER + 1):  # noqa: B007 (the count is reported)
            hb = np.where(live, np.exp(u), 0.0)[gb]
            # From the second pass on, start each branch from its last flow, moved along its own
            # ln Q–ln H slope to the new head: the inner solve then needs a step or two.
            guess = None
            if slope_last is not None and np.all(q > 0):
                guess = q * np.exp((np.log(np.maximum(hb, 1e-300)) - np.log(hb_last)) / slope_last)
            hb_last = np.maximum(hb, 1e-300)
            q, info = flows_at_head(lay, hb, guess)
            inner_ok = info.converged
            qsum = np.bincount(gb, q, minlength=groups)
            # d ln ΣQ / d ln H = Σ Q_i / s_i / ΣQ, with s_i = d ln h_i / d ln Q_i.
            s = _head_and_slope(lay, np.where(q > 0, q, 1.0), None)[1]
            slope_last = s
            dq = np.bincount(gb, np.where(q > 0, q / s, 0.0), minlength=groups)
            resid = np.where(live, np.log(qsum) - np.log(np.where(live, target, 1.0)), 0.0)
            done = np.abs(resid) <= HEAD_RTOL
            lo = np.where(resid < 0, u, lo)
            hi = np.where(resid > 0, u, hi)
            if done.all():
                break
            slope = np.where(qsum > 0, dq / np.where(qsum > 0, qsum, 1.0), 0.5)
            trial = u - np.clip(resid / np.maximum(slope, 0.25), -16.0, 16.0)
            inside = (trial > lo) & (trial < hi)
            both = np.isfinite(lo) & np.isfinite(hi)
            fallback = np.where(both, 0.5 * (lo + hi), np.where(np.isfinite(hi), hi - 16, lo + 16))
            u = np.where(done, u, np.where(inside, trial, fallback))
            collapsed = both & (hi - lo <= 4 * np.finfo(float).eps * np.maximum(1, np.abs(u)))
            if (done | collapsed).all():
                break
    head = np.where(live, np.exp(u), 0.0) * sign
    q = q * sign[gb]
    worst = float(np.max(np.abs(np.expm1(resid)))) if resid.size else 0.0
    return head, q, RootInfo(bool(worst <= 1e-11 and inner_ok), iters, worst)
