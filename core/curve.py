"""Many variants of one network solved in one vectorised call; the system curve built on that.

A :class:`~branchwise.core.hydraulics.Layout` may hold many independent parallel networks, one per
``branch_group``. :func:`tiled_layout` stacks copies of a network's branches that way, each copy
with its own sizes and viscosity, and :func:`solve_copies` solves every copy in every direction
that :func:`branchwise.core.solve.solve` knows (same equations, no per-copy Python loop). The
uncertainty module feeds it drawn samples; :func:`system_curve` feeds it one copy per point.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Callable
from dataclasses import dataclass, replace

import numpy as np
from numpy.typing import NDArray

from . import friction
from .errors import InputError
from .hydraulics import (
    Array,
    Layout,
    branch_head,
    flows_at_head,
    head_for_total_flow,
    segment_state,
)
from .model import Find, FindUnknown, Given, MeasuredFlow, Network, PressureDrop, positive
from .results import Result
from .unknowns import DIAMETER_MAX, DIAMETER_MIN

BoolArray = NDArray[np.bool_]
ROOT_TOL = 1e-12
"""Residual asked of the bracketed unknowns (relative in head or friction factor)."""


def tiled_layout(
    base: Layout, copies: int, keep: BoolArray | None = None, *, diameter: Array | None = None,
    length: Array | None = None, roughness: Array | None = None, minor_k: Array | None = None,
    nu: Array | None = None, valve_scale: Array | None = None,
) -> Layout:
    """``copies`` copies of the branches of ``base`` selected by ``keep``, one group per copy.

    Segment arrays are per copy, shape (copies, segments of ``base``): m for diameter, length
    and roughness, – for minor_k; None repeats the base values. ``nu``: kinematic viscosity per
    copy, m²/s. ``valve_scale``: per copy and branch of ``base``, a factor on each valve's Kv
    (its resistance goes as 1/Kv²). Copy c holds branches c·n_kept … c·n_kept + n_kept − 1 in the
    order of ``base``.
    """
    n_seg = len(base.diameter)
    keep = np.ones(base.n_branches, dtype=bool) if keep is None else keep
    seg_keep = keep[base.seg_branch]
    n_kept = int(keep.sum())
    local = (np.cumsum(keep) - 1)[base.seg_branch[seg_keep]]
    offsets = np.arange(copies, dtype=np.intp)[:, None] * n_kept

    def per_copy(values: Array | None, default: Array) -> Array:
        full = default[None, :] if values is None else values
        return np.broadcast_to(full, (copies, n_seg))[:, seg_keep].ravel()

    branch_nu = base.nu[keep][None, :] if nu is None else np.asarray(nu)[:, None]
    valve_r = np.tile(base.valve_r[keep], copies) if valve_scale is None else (
        base.valve_r[keep][None, :] / np.broadcast_to(valve_scale, (copies, base.n_branches))[
            :, keep] ** 2).ravel()
    return Layout(
        seg_branch=(offsets + local[None, :]).ravel(),
        diameter=per_copy(diameter, base.diameter), length=per_copy(length, base.length),
        roughness=per_copy(roughness, base.roughness), minor_k=per_copy(minor_k, base.minor_k),
        hw_c=per_copy(None, base.hw_c), valve_r=valve_r,
        branch_group=np.repeat(np.arange(copies, dtype=np.intp), n_kept),
        nu=np.broadcast_to(branch_nu, (copies, n_kept)).ravel().copy(),
        gravity=base.gravity, model=base.model,
    )


@dataclass(frozen=True)
class Variants:
    """Per-copy inputs of one network (SI). Segment arrays have shape (copies, segments) in the
    order of ``Layout.from_network``: diameter, length, roughness m; minor_k –. Per copy:
    nu m²/s, density kg/m³, reading (the given's value: Pa or m³/s), target (the sought
    unknown's target flow, m³/s; unused when the flows are sought). valve_scale: shape (copies,
    branches), a factor on each branch's valve Kv (None: the entered Kv)."""

    diameter: Array
    length: Array
    roughness: Array
    minor_k: Array
    nu: Array
    density: Array
    reading: Array
    target: Array
    valve_scale: Array | None = None

    @property
    def copies(self) -> int:
        return len(self.nu)

    def as_model(
        self, network: Network, given: Given, find: Find, copy: int = 0
    ) -> tuple[Network, Given, Find]:
        """Copy ``copy`` as plain model objects (for :func:`branchwise.core.solve.solve`)."""
        k, branches = 0, []
        for br in network.branches:
            segs = []
            for sg in br.segments:
                segs.append(replace(
                    sg, diameter=float(self.diameter[copy, k]), length=float(self.length[copy, k]),
                    roughness=float(self.roughness[copy, k]), minor_k=float(self.minor_k[copy, k])))
                k += 1
            kv = br.valve_kv
            if kv is not None and self.valve_scale is not None:
                kv = kv * float(self.valve_scale[copy, len(branches)])
            branches.append(replace(br, segments=tuple(segs), valve_kv=kv))
        rho = float(self.density[copy])
        fluid = replace(network.fluid, density=rho, viscosity=float(self.nu[copy]) * rho)
        if isinstance(find, FindUnknown):
            find = replace(find, target_flow=float(self.target[copy]))
        given = replace(given, value=float(self.reading[copy]))
        return replace(network, fluid=fluid, branches=tuple(branches)), given, find

    def layout(self, base: Layout, keep: BoolArray | None = None, **change: Array) -> Layout:
        arrays = {"diameter": self.diameter, "length": self.length,
                  "roughness": self.roughness, "minor_k": self.minor_k} | change
        return tiled_layout(base, self.copies, keep, nu=self.nu, valve_scale=self.valve_scale,
                            **arrays)


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
    """Solve every copy as :func:`branchwise.core.solve.solve` solves one (inputs checked there)."""
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
        found = _FIND[want.quantity](network, base, v, x, want.segment, head)
        head = np.where(np.isnan(found), np.nan, head)
    free = ~fixed
    if free.any() and not flows_done:
        q, info = flows_at_head(v.layout(base, free), np.repeat(np.nan_to_num(head), free.sum()))
        flows[:, free] = q.reshape(n, -1)
        converged = converged and info.converged
    flows[np.isnan(head)] = np.nan
    dp = v.density * g * (head + network.elevation_change)
    return CopiesSolution(flows, flows.sum(axis=1), dp, head, found, converged)


def _branch(base: Layout, v: Variants, x: int, j: int, **change: Array) -> tuple[Layout, Array]:
    """The copies of branch x alone, and the index of its segment j in every copy."""
    lay = v.layout(base, np.arange(base.n_branches) == x, **change)
    per_copy = int(np.sum(base.seg_branch == x))
    return lay, np.arange(v.copies) * per_copy + j


def _segment(base: Layout, x: int, j: int) -> int:
    return int(np.flatnonzero(base.seg_branch == x)[j])


def _find_length(net: Network, base: Layout, v: Variants, x: int, j: int, head: Array) -> Array:
    """L = (H − h_X(Q; L = 0)) / (f/D · V|V|/2g): explicit (see core/unknowns.py)."""
    length = v.length.copy()
    length[:, _segment(base, x, j)] = 0.0
    lay, s = _branch(base, v, x, j, length=length)
    st = segment_state(lay, v.target)
    per_metre = st.friction_factor[s] / lay.diameter[s] * st.velocity[s] * np.abs(
        st.velocity[s]) / (2 * net.gravity)
    found = (head - branch_head(lay, v.target)) / per_metre
    return np.where(found > 0, found, np.nan)


def _find_roughness(net: Network, base: Layout, v: Variants, x: int, j: int, head: Array) -> Array:
    """The friction factor the segment must have, then ε: Colebrook explicit, else bracketed."""
    lay, s = _branch(base, v, x, j)
    st = segment_state(lay, v.target)
    re, d = st.reynolds[s], lay.diameter[s]
    coeff = lay.length[s] / d * st.velocity[s] * np.abs(st.velocity[s]) / (2 * net.gravity)
    f_need = (head - (branch_head(lay, v.target) - st.major[s])) / coeff
    rr_max = 0.5 * (1 - 1e-12)
    turbulent = (re >= friction.RE_TURBULENT) & (net.friction == "colebrook")
    with np.errstate(invalid="ignore", divide="ignore"):
        smooth = friction.darcy(re, np.zeros_like(re), net.friction)[0]
        roughest = friction.darcy(re, np.full_like(re, rr_max), net.friction)[0]
        ok = (re >= friction.RE_LAMINAR) & (f_need > smooth) & (f_need <= roughest)
        f_need = np.where(ok, f_need, smooth * 1.5)  # a harmless stand-in where there is none
        xs = 1 / np.sqrt(f_need)
        eps = 3.7 * d * (10 ** (-xs / 2) - 2.51 * xs / re)

    def excess(rr: Array) -> Array:
        return friction.darcy(re, rr, net.friction)[0] / f_need - 1

    if not turbulent.all():
        lo, hi = np.zeros_like(re), np.full_like(re, rr_max)
        found = _illinois(excess, lo, hi, excess(lo), excess(hi), ok & ~turbulent)
        eps = np.where(turbulent, eps, d * found)
    return np.where(ok, eps, np.nan)


def _find_diameter(net: Network, base: Layout, v: Variants, x: int, j: int, head: Array) -> Array:
    """h_X falls strictly with the diameter: bracketed on ln D between the sane bounds."""
    g = _segment(base, x, j)
    ln_head = np.log(np.abs(np.nan_to_num(head, nan=1.0)))

    def excess(ln_d: Array) -> Array:
        diameter = v.diameter.copy()
        diameter[:, g] = np.exp(ln_d)
        lay, _ = _branch(base, v, x, j, diameter=diameter)
        return np.log(np.abs(branch_head(lay, v.target))) - ln_head

    lo = np.log(np.maximum(DIAMETER_MIN, 2 * v.roughness[:, g] * (1 + 1e-9)))
    hi = np.full_like(lo, np.log(DIAMETER_MAX))
    f_lo, f_hi = excess(lo), excess(hi)
    ok = (f_lo >= 0) & (f_hi <= 0) & np.isfinite(head)
    return np.where(ok, np.exp(_illinois(excess, lo, hi, f_lo, f_hi, ok)), np.nan)


_FIND = {"length": _find_length, "roughness": _find_roughness, "diameter": _find_diameter}


def _illinois(
    fun: Callable[[Array], Array], a: Array, b: Array, fa: Array, fb: Array, active: BoolArray,
    max_iter: int = 200,
) -> Array:
    """Illinois (modified regula falsi), vectorised over rows. Only ``active`` rows (those with
    a sign change) are waited for; the others give values the caller masks. A row is done when
    |fun| ≤ ROOT_TOL or its bracket has collapsed to round-off."""
    side = np.zeros_like(a)
    c = a
    for _ in range(max_iter):
        with np.errstate(invalid="ignore", divide="ignore"):
            c = np.where(fb != fa, (a * fb - b * fa) / (fb - fa), 0.5 * (a + b))
        c = np.where(np.isfinite(c), c, 0.5 * (a + b))
        fc = fun(c)
        collapsed = np.abs(b - a) <= 4 * np.finfo(float).eps * np.maximum(1.0, np.abs(c))
        if np.all((np.abs(fc) <= ROOT_TOL) | collapsed | ~active):
            break
        move_b = fc * fb > 0
        move_a = ~move_b & (fc * fa > 0)
        fa = np.where(move_b & (side < 0), fa / 2, fa)
        fb = np.where(move_a & (side > 0), fb / 2, fb)
        b, fb = np.where(move_b, c, b), np.where(move_b, fc, fb)
        a, fa = np.where(move_a, c, a), np.where(move_a, fc, fa)
        side = np.where(move_b, -1.0, np.where(move_a, 1.0, side))
    return c


# ---- the system curve ------------------------------------------------------------------------

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
    return SystemCurve(
        total_flow=flows,
        pressure_drop=net.fluid.density * net.gravity * (head + net.elevation_change),
        driving_head=head, branch_flows=q,
        branch_names=tuple(b.name for b in net.branches), operating_index=index,
    )


def to_csv(curve: SystemCurve, system: str = "si") -> str:
    """The curve as CSV text in the display units of ``system`` (``si``: L/s, kPa, m; ``us``:
    gpm, psi, ft), the unit in each header (``Total flow (L/s)``), one row per point, values
    to 10 significant figures (``10``, not ``9.999999999999991``); the last column,
    ``Operating point``, is 1 on the operating point's row."""
    from .units import display_unit, to_unit, unit_label  # pint loads here, never in a solve

    def unit(kind: str) -> str:
        return display_unit(kind, system)

    flow, pressure, head = unit("flow"), unit("pressure"), unit("head")
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([f"Total flow ({unit_label(flow)})", f"Pressure drop ({unit_label(pressure)})",
                     f"Driving head ({unit_label(head)})"]
                    + [f"Flow {name} ({unit_label(flow)})" for name in curve.branch_names]
                    + ["Operating point"])
    for i, total in enumerate(curve.total_flow):
        numbers = [to_unit(float(total), "flow", flow),
                   to_unit(float(curve.pressure_drop[i]), "pressure", pressure),
                   to_unit(float(curve.driving_head[i]), "head", head),
                   *(to_unit(float(q), "flow", flow) for q in curve.branch_flows[i])]
        writer.writerow([f"{a:.10g}" for a in numbers] + [int(i == curve.operating_index)])
    return out.getvalue()


__all__ = ["CopiesSolution", "SystemCurve", "Variants", "solve_copies", "system_curve",
           "tiled_layout", "to_csv"]
