"""Monte Carlo uncertainty: one vectorised solve of 10,000 drawn networks of 10 branches, against a
per-sample Python loop of the deterministic ``solve``.

Run: /tmp/venv/bin/python tests/perf/bench_uncertainty.py  (prints figures; not a test)

The loop is timed on a subset (LOOP_SAMPLES draws) and scaled to the full count; each of its
steps builds the drawn network as model objects and calls ``solve`` (what a caller without the
vectorised path would do). The vectorised figure is the whole ``monte_carlo`` call: the nominal
solve, the draws, the GUM finite-difference rows and the percentiles. Best of REPEATS runs.
"""

from __future__ import annotations

import os
import platform
import time

import numpy as np

from branchwise.core.model import (
    Branch,
    FindFlows,
    FindUnknown,
    Fluid,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
)
from branchwise.core.numerics.sampling import build_plan
from branchwise.core.numerics.solve import solve
from branchwise.core.numerics.uncertainty import Thermal, Tolerances, monte_carlo

SAMPLES = 10_000
LOOP_SAMPLES = 300
REPEATS = 3


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


def best(fn, repeats: int = REPEATS) -> float:
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def run(label: str, net: Network, given, find=None) -> None:
    tol = Tolerances(gauge_full_scale=400e3)
    thermal = Thermal(dln_nu_dt=-0.0245, dln_rho_dt=-2.1e-4)  # water near 20 °C (from memory)
    monte_carlo(net, given, find, tol, samples=200, thermal=thermal)  # warm-up
    vec = best(lambda: monte_carlo(net, given, find, tol, samples=SAMPLES, thermal=thermal))
    plan = build_plan(net, given, find or FindFlows(), tol, thermal)
    z = np.random.default_rng(1).uniform(-1, 1, size=(LOOP_SAMPLES, len(plan.inputs)))

    def loop() -> None:
        for row in z:
            solve(*plan.network_for(row))

    per_sample = best(loop, 1) / LOOP_SAMPLES
    scaled = per_sample * SAMPLES
    print(f"{label}")
    print(f"  inputs drawn            {len(plan.inputs)}")
    print(f"  vectorised, {SAMPLES} draws  {vec * 1000:8.1f} ms  (whole monte_carlo call)")
    print(f"  per-sample loop          {per_sample * 1e3:8.3f} ms per draw, timed on "
          f"{LOOP_SAMPLES} draws, scaled to {SAMPLES}: {scaled:6.2f} s")
    print(f"  ratio loop / vectorised  {scaled / vec:8.0f} x   (goal: vectorised <= 0.5 s: "
          f"{'met' if vec <= 0.5 else 'NOT met'})")


def main() -> None:
    print(f"machine: {platform.platform()}, {platform.processor() or platform.machine()}, "
          f"{os.cpu_count()} CPUs, python {platform.python_version()}, numpy {np.__version__}")
    net = network()
    op = solve(net, PressureDrop(120e3))
    print(f"network: 10 branches, 13 segments; nominal total flow {op.total_flow * 1000:.2f} L/s "
          f"at 120 kPa\n")
    run("flows from a pressure drop (120 kPa, gauge 1 % of 400 kPa)", net, PressureDrop(120e3))
    run("flows from a total flow (clamp-on 3 %)", net, TotalFlow(op.total_flow))
    target = 0.97 * float(op.flows[4])
    run("roughness of 'Loop 5' from a pressure drop and its flow", net, PressureDrop(120e3),
        FindUnknown("roughness", "Loop 5", target))
    run("diameter of 'Loop 5' from a pressure drop and its flow", net, PressureDrop(120e3),
        FindUnknown("diameter", "Loop 5", target))


if __name__ == "__main__":
    main()
