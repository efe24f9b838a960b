"""Benchmark of a small solve (a script, not a test): prints ratios, asserts nothing.

    python tests/perf/bench_solve.py [--rounds N]

Every figure is a ratio of CPU-time medians, the functions compared run in turn in the same
process (``baseline.interleaved``), so that load on the machine falls on all alike. Each turn
lasts about 5 ms, one call of the slowest by-hand method: the first call of a turn pays for the
caches the other functions have used — about the same time for every function, a few per cent
of a by-hand call but 2–5× a solve — and in turns of equal length every function pays it in the
same proportion. Part 1 also prints that first call alone, and the figures in turns of 10 calls
each (the method of earlier rounds, which weighed that cost 10 calls of a solve against 10 of a
by-hand method, about a hundred times longer).

1. Ten branches (two segments every fifth branch), flows at a given Δp: the whole ``solve()``
   — of the same network object again, and of a network met anew each call — against the
   method one would write by hand — scipy's brentq on each branch's flow with a
   scalar friction factor inside each step: (a) ``fluids.friction.Colebrook``, (b) Colebrook
   itself solved by a nested brentq on f, (c) Colebrook by fixed-point iteration.
2. The same network in every direction against the core of the tree before the speed work
   (``baseline.BASELINE_REV``, loaded beside today's in this process).
3. Agreement: today's answers against the baseline's and the by-hand flows.
"""

from __future__ import annotations

import argparse
import itertools
import math
import statistics
import sys
import time
from collections.abc import Callable
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))

from baseline import (  # noqa: E402
    BASELINE_REV,
    convert,
    interleaved,
    load_core,
    machine,
    module,
    ratio_line,
)

from branchwise.core.model import (  # noqa: E402
    Branch,
    Find,
    FindFlows,
    FindUnknown,
    Fluid,
    Given,
    MeasuredFlow,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics.solve import solve  # noqa: E402

G = 9.80665
WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")
"""Water near 20 °C (ρ 998.2 kg/m³, μ 1.0016 mPa·s: IAPWS values, see the field notes)."""
DP = 68e3


def make_network(n: int, seed: int = 1) -> Network:
    rng = np.random.default_rng(seed)
    branches = []
    for i in range(n):
        d = float(rng.uniform(0.025, 0.3))
        segs = [Segment(d, float(rng.uniform(5, 200)), 4.5e-5, float(rng.uniform(0, 12)))]
        if i % 5 == 0:
            segs.append(Segment(d * 0.8, float(rng.uniform(2, 30)), 4.5e-5, 1.0))
        branches.append(Branch(f"b{i}", tuple(segs)))
    return Network(WATER, tuple(branches))


# ---- the method written by hand ----------------------------------------------------------------

def fixed_point_colebrook(re: float, rr: float) -> float:
    x = 8.0
    for _ in range(100):
        new = -2 * math.log10(rr / 3.7 + 2.51 * x / re)
        if abs(new - x) < 1e-13 * x:
            break
        x = new
    return 1 / (x * x)


def nested_colebrook(re: float, rr: float) -> float:
    """Colebrook solved by its own scalar brentq on f — the textbook way to write it by hand."""
    from scipy.optimize import brentq

    def residual(f: float) -> float:
        return 1 / math.sqrt(f) + 2 * math.log10(rr / 3.7 + 2.51 / (re * math.sqrt(f)))

    return float(brentq(residual, 1e-4, 1.0, xtol=1e-15))


def fluids_colebrook(re: float, rr: float) -> float:
    import fluids.friction

    return float(fluids.friction.Colebrook(re, rr))


def by_hand(net: Network, head: float,
            colebrook: Callable[[float, float], float] = fluids_colebrook) -> list[float]:
    """Each branch's flow at ``head`` by brentq, Darcy–Weisbach with the fittings' K."""
    from scipy.optimize import brentq

    nu = net.fluid.kinematic_viscosity

    def h_of(br: Branch, q: float) -> float:
        h = 0.0
        for s in br.segments:
            a = math.pi * s.diameter**2 / 4
            v = q / a
            re = v * s.diameter / nu
            f = 64 / re if re < 2000 else colebrook(re, s.roughness / s.diameter)
            h += (f * s.length / s.diameter + s.minor_k) * v * v / (2 * G)
        return h

    return [float(brentq(lambda q, b=b: h_of(b, q) - head, 1e-9, 50.0, xtol=1e-15))
            for b in net.branches]


# ---- the cases ---------------------------------------------------------------------------------

def cases(net: Network) -> dict[str, tuple[Given, Find]]:
    """Every direction on ``net``: the targets from the flows at Δp."""
    flows = solve(net, PressureDrop(DP)).flows
    third = net.branches[3].name
    target = float(flows[3]) * 1.2
    return {
        "flows at a given Δp": (PressureDrop(DP), FindFlows()),
        "total flow given": (TotalFlow(float(flows.sum())), FindFlows()),
        "a branch reading given": (MeasuredFlow(net.branches[1].name, float(flows[1])),
                                   FindFlows()),
        "diameter found": (PressureDrop(DP), FindUnknown("diameter", third, target)),
        "length found": (PressureDrop(DP), FindUnknown("length", third, target)),
        "roughness found": (PressureDrop(DP),
                            FindUnknown("roughness", third, float(flows[3]) * 0.9)),
    }


SPAN = 0.005
"""Seconds a turn of each function lasts (about one call of the slowest by-hand method)."""


def first_call(fn: Callable[[], object], before: Callable[[], object], rounds: int) -> float:
    """Median CPU seconds of one call of ``fn`` right after one of ``before``."""
    times = []
    for _ in range(rounds):
        before()
        start = time.process_time()
        fn()
        times.append(time.process_time() - start)
    return statistics.median(times)


FRESH = 50
"""Networks of equal values but objects of their own, solved in turn: each solve meets its
network anew (the solve keeps the last network's rows of constants, or branch objects, and
checks; the app builds a new network for each edit)."""

GOALS = {"total flow given": 10.0, "diameter found": 10.0}
"""Issue 15: ≥ 10× faster than the tree before the speed work."""


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=31)
    args = parser.parse_args()
    print(machine())
    net = make_network(10)
    head = DP / (WATER.density * G)

    print("\n1. ten branches, flows at a given Δp: by hand / branchwise solve()")
    fresh = itertools.cycle([make_network(10) for _ in range(FRESH)])
    fns = {
        "solve": lambda: solve(net, PressureDrop(DP)),
        "anew": lambda: solve(next(fresh), PressureDrop(DP)),
        "fluids": lambda: by_hand(net, head, fluids_colebrook),
        "nested": lambda: by_hand(net, head, nested_colebrook),
        "fixed": lambda: by_hand(net, head, fixed_point_colebrook),
    }
    times = interleaved(fns, rounds=args.rounds, span=SPAN)
    for key, words in (("solve", "the same network solved again"),
                       ("anew", "a network met anew each call (as the app's, after an edit)")):
        print(f"  {words}:")
        print(ratio_line("(a) brentq per branch, fluids.Colebrook", times["fluids"],
                         times[key], 20))
        print(ratio_line("(b) brentq per branch, Colebrook by nested brentq", times["nested"],
                         times[key], 100))
        print(ratio_line("(c) brentq per branch, Colebrook by fixed point", times["fixed"],
                         times[key]))
    first = first_call(fns["solve"], fns["nested"], args.rounds * 4)
    print(f"  the first solve right after a by-hand run: {first * 1e6:.1f} µs, "
          f"{first / times['solve']:.1f}× a solve in a turn")
    tens = interleaved(fns, rounds=args.rounds, number=10)
    for key, words in (("solve", "again"), ("anew", "anew")):
        print(f"  in turns of 10 calls, a network {words}: "
              f"(a) {tens['fluids'] / tens[key]:.1f}×, (b) {tens['nested'] / tens[key]:.1f}×, "
              f"(c) {tens['fixed'] / tens[key]:.1f}×")

    base = load_core()
    base_solve = module(base, "numerics.solve").solve
    base_net = convert(base, net)
    print(f"\n2. ten branches, whole solve(): the tree at {BASELINE_REV} / today's")
    worst = 0.0
    for label, (given, find) in cases(net).items():
        b_given, b_find = convert(base, given), convert(base, find)
        t = interleaved({
            "today": lambda g=given, f=find: solve(net, g, f),
            "base": lambda g=b_given, f=b_find: base_solve(base_net, g, f),
        }, rounds=args.rounds, span=SPAN)
        print(ratio_line(label, t["base"], t["today"], GOALS.get(label)))
        ours, theirs = solve(net, given, find), base_solve(base_net, b_given, b_find)
        worst = max(worst, float(np.max(np.abs(ours.flows / theirs.flows - 1))))
        if ours.solved is not None:
            worst = max(worst, abs(ours.solved.value / theirs.solved.value - 1))
        if [w.message for w in ours.warnings] != [w.message for w in theirs.warnings]:
            print(f"    the warnings differ from {BASELINE_REV}'s")

    ref = by_hand(net, head, fluids_colebrook)
    flows = solve(net, PressureDrop(DP)).flows
    agree = max(abs(a / b - 1) for a, b in zip(flows, ref, strict=True))
    print(f"\n3. agreement: with {BASELINE_REV}, worst relative difference {worst:.1e} (flows "
          f"and found values, warnings word for word); with the flows by hand (a) {agree:.1e}")


if __name__ == "__main__":
    sys.exit(main())
