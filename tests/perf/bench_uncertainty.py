"""Monte Carlo uncertainty, ten branches (a script, not a test): prints figures, asserts nothing.

    python tests/perf/bench_uncertainty.py [--rounds N] [--no-memory]

1. Time: one ``monte_carlo`` call of 10,000 draws (the nominal solve, the draws, the GUM
   finite-difference rows and the percentiles) against a loop of the deterministic ``solve`` over
   the same drawn networks — what a caller without the vectorised path would write — in every
   direction. The two run in turn in one process (``baseline.interleaved``, turns of about 0.3 s
   each), CPU-time medians; the loop is timed on LOOP_SAMPLES draws a turn and scaled to 10,000.
   The goal (issue 15) is on the wall-clock time of one call: the median of the same turns' wall
   times is printed beside it.
2. Memory: 100,000 draws in a fresh process for each direction: the process's peak resident
   memory during the call (``/proc/self/status`` VmHWM, reset just before it), its rise over
   the process's memory just before (imports and a small run done), and the call's own
   allocations at their peak (``tracemalloc``, numpy's arrays included; a second call). Goal:
   ≤ 300 MB. Linux only.
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import tracemalloc
from pathlib import Path

import numpy as np

from branchwise.core.model import (
    Branch,
    Find,
    FindFlows,
    FindUnknown,
    Fluid,
    Given,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics.sampling import build_plan
from branchwise.core.numerics.solve import solve
from branchwise.core.numerics.uncertainty import Thermal, Tolerances, monte_carlo

sys.path.insert(0, str(Path(__file__).resolve().parent))

from baseline import interleaved, machine  # noqa: E402

SAMPLES = 10_000
LOOP_SAMPLES = 300
MEMORY_SAMPLES = 100_000
WALL_GOAL = 0.5
"""Seconds, one call of 10,000 draws × 10 branches (issue 15)."""
MEMORY_GOAL = 300.0
"""MB, the peak of a call of 100,000 draws × 10 branches (issue 15)."""


def network() -> Network:
    """Ten branches off a header: mixed sizes, two with a reducer, three with a valve."""
    branches = []
    for i in range(10):
        d = 0.04 + 0.006 * i
        segs = [Segment(d, 20.0 + 3 * i, 4.5e-5 * (1 + i % 3), 2.0 + 0.5 * i)]
        if i % 4 == 1:
            segs.append(Segment(0.7 * d, 6.0, 4.5e-5, 1.5))
        kv = 25.0 + 5 * i if i % 3 == 0 else None
        branches.append(Branch(f"Loop {i + 1}", tuple(segs), kv))
    # water near 20 °C (ρ 998.2 kg/m³, μ 1.002 mPa·s: IAPWS values, see field notes)
    return Network(Fluid("water", 998.2, 1.002e-3, "water"), tuple(branches), elevation_change=2.0)


TOLERANCES = Tolerances(gauge_full_scale=400e3)
THERMAL = Thermal(dln_nu_dt=-0.0245, dln_rho_dt=-2.1e-4)
"""How ν and ρ of water near 20 °C move with temperature (from memory)."""


def cases(net: Network) -> dict[str, tuple[Given, Find | None]]:
    op = solve(net, PressureDrop(120e3))
    target = 0.97 * float(op.flows[4])
    return {
        "flows from a pressure drop (120 kPa, gauge 1 % of 400 kPa)": (PressureDrop(120e3), None),
        "flows from a total flow (clamp-on 3 %)": (TotalFlow(op.total_flow), None),
        "roughness of 'Loop 5' from a pressure drop and its flow": (
            PressureDrop(120e3), FindUnknown("roughness", "Loop 5", target)),
        "diameter of 'Loop 5' from a pressure drop and its flow": (
            PressureDrop(120e3), FindUnknown("diameter", "Loop 5", target)),
    }


def timed(label: str, net: Network, given: Given, find: Find | None, rounds: int) -> None:
    plan = build_plan(net, given, find or FindFlows(), TOLERANCES, THERMAL)
    z = np.random.default_rng(1).uniform(-1, 1, size=(LOOP_SAMPLES, len(plan.inputs)))

    def vectorised() -> None:
        monte_carlo(net, given, find, TOLERANCES, samples=SAMPLES, thermal=THERMAL)

    def loop() -> None:
        for row in z:
            solve(*plan.network_for(row))

    walls: dict[str, float] = {}
    t = interleaved({"vectorised": vectorised, "loop": loop}, rounds=rounds, span=0.3,
                    wall=walls)
    wall = walls["vectorised"]
    scaled = t["loop"] / LOOP_SAMPLES * SAMPLES
    print(label)
    print(f"  inputs drawn {len(plan.inputs)}; {SAMPLES} draws: one call "
          f"{t['vectorised'] * 1e3:.1f} ms CPU, {wall * 1e3:.1f} ms wall (goal ≤ {WALL_GOAL:g} s: "
          f"{'met' if wall <= WALL_GOAL else 'NOT met'})")
    print(f"  a loop of solve(): {t['loop'] / LOOP_SAMPLES * 1e3:.3f} ms a draw, "
          f"{scaled:.2f} s for {SAMPLES}: {scaled / t['vectorised']:.0f}× the call")


def status_mb(key: str) -> float:
    """A figure of this process's /proc/self/status (Linux), MB: VmHWM, the peak resident
    memory since it started or was last reset (:func:`reset_peak`), or VmRSS, the present.
    (``getrusage``'s ru_maxrss would not do: a child process starts with its parent's.)"""
    with open("/proc/self/status") as status:
        for line in status:
            if line.startswith(key + ":"):
                return int(line.split()[1]) / 1024  # kB
    raise RuntimeError(f"no {key} in /proc/self/status")


def reset_peak() -> None:
    """Start this process's peak resident memory again from the present (Linux ≥ 4.0)."""
    with open("/proc/self/clear_refs", "w") as refs:
        refs.write("5")


def memory_child(index: int) -> None:
    """In a fresh process: the peak of one call of MEMORY_SAMPLES draws, the process's memory
    just before it, and the call's own allocations at their peak (a second call)."""
    net = network()
    given, find = list(cases(net).values())[index]
    monte_carlo(net, given, find, TOLERANCES, samples=200, thermal=THERMAL)
    reset_peak()
    before = status_mb("VmRSS")
    monte_carlo(net, given, find, TOLERANCES, samples=MEMORY_SAMPLES, thermal=THERMAL)
    after = status_mb("VmHWM")
    tracemalloc.start()  # the call's own allocations at their peak (numpy's are traced too)
    monte_carlo(net, given, find, TOLERANCES, samples=MEMORY_SAMPLES, thermal=THERMAL)
    traced = tracemalloc.get_traced_memory()[1] / 2**20
    print(f"{before:.1f} {after:.1f} {traced:.1f}")


def memory(net: Network) -> None:
    print(f"\n2. memory: {MEMORY_SAMPLES} draws, each direction in a fresh process")
    for index, label in enumerate(cases(net)):
        out = subprocess.run([sys.executable, __file__, "--memory-child", str(index)],
                             capture_output=True, text=True, check=True).stdout.split()
        before, after, traced = (float(v) for v in out)
        print(f"  {label:<60} process peak {after:6.1f} MB (rise {after - before:5.1f} MB; "
              f"goal ≤ {MEMORY_GOAL:g} MB: {'met' if after <= MEMORY_GOAL else 'NOT met'}); "
              f"the call's own peak {traced:5.1f} MB")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=7)
    parser.add_argument("--no-memory", action="store_true")
    parser.add_argument("--memory-child", type=int, default=None, help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.memory_child is not None:
        memory_child(args.memory_child)
        return
    print(machine())
    net = network()
    print("network: 10 branches, 13 segments, three valves, 2 m of lift; water near 20 °C\n")
    print(f"1. time: {SAMPLES} draws")
    for label, (given, find) in cases(net).items():
        timed(label, net, given, find, args.rounds)
    if not args.no_memory:
        memory(net)


if __name__ == "__main__":
    main()
