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


Kept = tuple[Pipe, ...]
Loan = tuple[list[Kept], Kept]
"""Pipes lent by :func:`lend`, and the list they go back to."""

_last: tuple[weakref.ref[Network], Kept, list[Kept]] | None = None
"""The last network met (a weak reference: it is not kept alive), its pipes as first made, and
those pipes again while no solve holds them: a network is frozen, so their constants serve
every later solve of the same object (a script solving it in several directions, say) without
being worked out again. One network's are kept, no more; a network met anew pays for its pipes
(the flows at a given Δp under Colebrook need none: :mod:`.at_head`)."""


def _kept(network: Network) -> tuple[Kept, list[Kept], bool]:
    """The network's kept pipes, the list of those free, and whether they were made just now:
    then they are in no list yet, the caller's alone (as new: no solve has used them), and
    the caller puts them in the free list or lends them itself."""
    global _last
    last = _last
    if last is not None and last[0]() is network:
        return last[1], last[2], False
    nu = network.fluid.kinematic_viscosity
    g, model = network.gravity, network.friction
    # not owned: shared by later solves of this network, never changed in place
    kept = tuple([Pipe(b, nu, g, model, owned=False) for b in network.branches])
    free: list[Kept] = []
    _last = (weakref.ref(network), kept, free)
    return kept, free, True


def pipes_of(network: Network) -> list[Pipe]:
    """A pipe for each branch, as new and the caller's own to keep; their constants are
    shared (``Pipe.copy``)."""
    kept, free, new = _kept(network)
    if new:
        free.append(kept)  # not used: free for the next solve
    return list(map(Pipe.copy, kept))


def lend(network: Network) -> tuple[Sequence[Pipe], Loan | None]:
    """A pipe for each branch, as new, for one solve: the kept pipes themselves when no other
    solve holds them (hand the loan to :func:`give_back` when done), else copies (no loan).
    Lending spares a solve of a few branches much of its time (making copies, and the fresh
    memory they touch). A list's pop and append are atomic, so two threads never hold the
    same pipes. Pipes made just now are lent as they are: no other thread has seen them (had
    they been put in the free list first, another solve of the same network could have used
    them, given them back and left its state in them)."""
    kept, free, new = _kept(network)
    if new:
        return kept, (free, kept)
    try:
        pipes = free.pop()
    except IndexError:  # held by a solve in another thread (or further up this one)
        return list(map(Pipe.copy, kept)), None
    Pipe.reset(pipes)
    return pipes, (free, pipes)


def give_back(loan: Loan | None) -> None:
    if loan is not None:
        loan[0].append(loan[1])


def flows_at(pipes: Sequence[Pipe], head: float) -> tuple[list[float], int]:
    """Every branch's signed flow at driving head ``head`` (m, not 0), and the iterations."""
    if not (head != 0 and math.isfinite(head)):
        raise Fallback("no head")
    sign = 1.0 if head > 0 else -1.0
    t = abs(head)
    iterations = 0
    flows: list[float] = []
    add = flows.append
    for p in pipes:
        # (a one-segment Colebrook branch asked directly: flow_at would ask it first)
        it = p.colebrook_one_flow(t) if p.one_colebrook else 0
        if not it:
            it = p.flow_at(t)
        if it > iterations:
            iterations = it
        add(sign * p.q)
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
