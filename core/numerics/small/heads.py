"""The branches of a small network together: every flow at a head, and the head of a total flow.

The same equations and tests as :func:`..hydraulics.flows_at_head` and
:func:`..hydraulics.head_for_total_flow`, in plain floats: Newton on ln ΣQ against ln H with
d ln ΣQ / d ln H = Σ (Qᵢ/sᵢ) / ΣQ (sᵢ = d ln hᵢ / d ln Qᵢ), inside a bracket, each branch
started from its last flow moved along its own slope.
"""

from __future__ import annotations

import math
import weakref
from collections.abc import Sequence

from ...model import Network
from ..hydraulics import HEAD_RTOL, MAX_ITER
from .branch import Fallback, Pipe

_log = math.log
_exp = math.exp


_last: tuple[weakref.ref[Network], tuple[Pipe, ...]] | None = None
"""The last network given to :func:`pipes_of` (a weak reference: it is not kept alive) and its
pipes as first made: a network is frozen, so their constants serve every later solve of the
same object (a script solving it in several directions, say) without being worked out again.
One network's are kept, no more; a network met anew (the app builds one for each edit) pays
for its pipes as before."""


def pipes_of(network: Network) -> list[Pipe]:
    """A pipe for each branch, with no state; their constants are shared (``Pipe.copy``)."""
    global _last
    last = _last
    if last is not None and last[0]() is network:
        return list(map(Pipe.copy, last[1]))
    nu = network.fluid.kinematic_viscosity
    g, model = network.gravity, network.friction
    pipes = [Pipe(b, nu, g, model) for b in network.branches]
    for p in pipes:
        p.owned = False  # kept for the next solve of this network: never changed in place
    _last = (weakref.ref(network), tuple(pipes))  # the caller's list may be changed, not this
    return pipes


def flows_at(pipes: Sequence[Pipe], head: float) -> tuple[list[float], int]:
    """Every branch's signed flow at driving head ``head`` (m, not 0), and the iterations."""
    if not (head != 0 and math.isfinite(head)):
        raise Fallback("no head")
    sign = 1.0 if head > 0 else -1.0
    t = abs(head)
    iterations = 0
    flows: list[float] = []
    for p in pipes:
        it = p.flow_at(t)
        if it > iterations:
            iterations = it
        flows.append(sign * p.q)
    return flows, iterations


def head_for_total(pipes: Sequence[Pipe], total: float) -> tuple[float, int, float]:
    """The head (m, signed) at which the flows add up to ``total`` (m³/s, not 0), the
    iterations and the relative residual; the pipes hold the flows (magnitudes) at it."""
    if not (total != 0 and math.isfinite(total)):
        raise Fallback("no total flow")
    sign = 1.0 if total > 0 else -1.0
    target = abs(total)
    # The start: each branch's loss taken as r Q² with r read at an equal share, the head at
    # which those would carry the total (exact but for the change of f with the flow).
    share = target / len(pipes)
    conductance = 0.0
    for p in pipes:
        conductance += share / math.sqrt(abs(p.evaluate(share)))
    u = 2 * _log(target / conductance)
    ln_target = _log(target)
    lo, hi = -math.inf, math.inf
    eps4 = 4 * 2.220446049250313e-16
    resid = math.inf
    last_ln_h = math.nan
    first = True
    for iters in range(1, MAX_ITER + 1):
        ln_h = u
        head = _exp(u)
        qsum = dq = 0.0
        for p in pipes:
            guess = 0.0 if first else p.q * _exp((ln_h - last_ln_h) / p.s)
            p.flow_at(head, guess)
            qsum += p.q
            dq += p.q / p.s
        first = False
        last_ln_h = ln_h
        resid = _log(qsum) - ln_target
        if abs(resid) <= HEAD_RTOL:
            return sign * head, iters, abs(math.expm1(resid))
        if resid < 0:
            lo = u
        elif resid > 0:
            hi = u
        slope = dq / qsum if qsum > 0 else 0.5
        trial = u - min(max(resid / max(slope, 0.25), -16.0), 16.0)
        if lo < trial < hi:
            u = trial
        elif math.isfinite(lo) and math.isfinite(hi):
            u = 0.5 * (lo + hi)
        else:
            u = hi - 16 if math.isfinite(hi) else lo + 16
        if math.isfinite(lo) and math.isfinite(hi) and hi - lo <= eps4 * max(1.0, abs(u)):
            break
    raise Fallback("the total flow was not met to the vectorised test")
