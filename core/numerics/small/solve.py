"""A small network solved in every direction with plain floats, to the same :class:`Result`.

Chosen by :func:`..solve.solve` for a network of at most :data:`SMALL_BRANCHES` branches. It
solves the happy case only: whenever anything would end in an error or a warning about the
solve itself (no head, a branch beyond the physical bounds, no unknown that fits, a solve that
does not meet the vectorised solver's test), it returns None and the vectorised path solves the
network again and words the answer. The inputs have been checked by then.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from ...errors import BranchwiseError
from ...model import Find, FindUnknown, Given, MeasuredFlow, Network, PressureDrop, TotalFlow
from ..results import Result, Solved
from ..unknowns import SOLVERS
from ..unknowns.common import with_value
from . import unknowns
from .at_head import flows_at_given_head
from .branch import Fallback, Pipe
from .heads import flows_at, give_back, head_for_total, lend
from .result import build_result, convergence

SMALL_BRANCHES = 100
"""Up to this many branches a network is solved in plain floats (measured by
tests/perf/bench_solve.py: the scalar path costs a few µs a branch, the vectorised one a
fixed ~0.5 ms and a little per branch, so the two meet at a few hundred branches)."""

CONVERGED = 1e-11
"""The relative residual the vectorised solver calls converged (``hydraulics.flows_at_head``)."""


def try_solve(network: Network, given: Given, find: Find, index: int | None) -> Result | None:
    """The result, or None when the vectorised path must take the network (module docstring).
    index: the branch of a sought unknown (None when the flows are sought)."""
    try:
        return _solve(network, given, find, index)
    except BranchwiseError:
        raise
    except (Fallback, ArithmeticError, ValueError):
        return None


def _branch_head(pipe: Pipe, flow: float) -> float:
    """h(Q) of one branch, signed like Q."""
    if flow == 0:
        raise Fallback("no flow")
    h = pipe.evaluate(abs(flow))
    return h if flow > 0 else -h


def _driving_head(network: Network, pressure_drop: float) -> float:
    fl = network.fluid
    return pressure_drop / (fl.density * network.gravity) - network.elevation_change


def _solve(network: Network, given: Given, find: Find, index: int | None) -> Result:
    """The flows at a given Δp straight from the branches' numbers where that lane takes the
    network (:mod:`.at_head`), else through an object per branch."""
    if type(given) is PressureDrop and index is None:
        result = flows_at_given_head(network, given, find, _driving_head(network, given.value))
        if result is not None:
            return result
    pipes, loan = lend(network)
    try:
        return _solve_with(pipes, network, given, find, index)
    finally:
        give_back(loan)


def _solve_with(pipes: Sequence[Pipe], network: Network, given: Given, find: Find,
                index: int | None) -> Result:
    infos: list[tuple[bool, int, float]] = []
    solved = None
    measured = None
    if isinstance(given, MeasuredFlow):
        measured = network.index_of(given.branch, "conditions.measured_flow")
    if isinstance(find, FindUnknown) and index is not None:
        head = _head_for_unknown(network, pipes, given, find, index, measured, infos)
        SOLVERS[find.quantity].check(network, find, index)  # an InputError, as the other path
        br = network.branches[index]
        pipes = list(pipes)  # the sought branch's pipe is replaced
        pipe = pipes[index].copy(own=True)  # its segment is changed while sought
        quantity, j, q = find.quantity, find.segment, find.target_flow
        value = getattr(unknowns, quantity)(pipe, j, q, head)
        new_branch = with_value(br, j, quantity, value)
        network = network.replace_branch(index, new_branch)
        pipe = pipes[index] = Pipe(new_branch, pipe.nu, pipe.g, pipe.model)
        residual = abs(_branch_head(pipe, q) - head) / abs(head)
        infos.append((residual <= 1e-9, 1, residual))
        solved = Solved(quantity, br.name, j, value, q)
        flows, it = flows_at(pipes, head)
        infos.append((True, it, 0.0))
    elif isinstance(given, TotalFlow):
        head, it, res = head_for_total(pipes, given.value)
        infos.append((res <= CONVERGED, it, res))
        sign = 1.0 if head > 0 else -1.0
        flows = [sign * p.q for p in pipes]
    else:
        if isinstance(given, PressureDrop):
            head = _driving_head(network, given.value)
        else:
            assert measured is not None
            head = _branch_head(pipes[measured], given.value)
        flows, it = flows_at(pipes, head)
        infos.append((True, it, 0.0))
    if measured is not None:
        flows[measured] = given.value
        pipes[measured].evaluate(abs(given.value))
    conv = convergence(infos)
    if not conv.converged:
        raise Fallback("not converged")
    return build_result(network, given, find, pipes, head, flows, solved, conv)


def _head_for_unknown(network: Network, pipes: Sequence[Pipe], given: Given, find: FindUnknown,
                      index: int, measured: int | None,
                      infos: list[tuple[bool, int, float]]) -> float:
    """The head branch X must lose; Fallback where the vectorised path raises."""
    target = find.target_flow
    if isinstance(given, TotalFlow):
        rest = given.value - target
        if len(pipes) == 1 or rest == 0 or math.copysign(1, rest) != math.copysign(1, target):
            raise Fallback("no head")
        others = [p for i, p in enumerate(pipes) if i != index]
        h, it, res = head_for_total(others, rest)
        infos.append((res <= CONVERGED, it, res))
    elif isinstance(given, PressureDrop):
        h = _driving_head(network, given.value)
    else:
        assert measured is not None
        h = _branch_head(pipes[measured], given.value)
    if h == 0 or math.copysign(1, h) != math.copysign(1, target):
        raise Fallback("no head")
    return h
