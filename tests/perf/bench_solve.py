"""Benchmark of the parallel solve (a script, not a test): prints figures, asserts nothing.

    python tests/perf/bench_solve.py

1. A 10-branch network solved for the flows at a given Δp: branchwise's vectorised solve against
   the scalar per-branch method one would write by hand (scipy.optimize.brentq on each branch's
   flow, with a scalar Colebrook solved by fixed-point iteration inside) — same process, ratio.
2. Scaling: 100 / 1k / 10k / 100k branches (two segments every fifth branch), timed both for the
   core solve on prepared arrays (Layout → flows_at_head) and for the whole ``solve()`` call
   (building the network objects, warnings and result arrays included).
"""

from __future__ import annotations

import math
import os
import platform
import sys
import time

import numpy as np

from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.hydraulics import Layout, flows_at_head
from branchwise.core.numerics.solve import solve

G = 9.80665
WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")


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


def scalar_colebrook(re: float, rr: float) -> float:
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

    return brentq(residual, 1e-4, 1.0, xtol=1e-15)


def fluids_colebrook(re: float, rr: float) -> float:
    import fluids.friction

    return fluids.friction.Colebrook(re, rr)


def scalar_flows(net: Network, head: float, colebrook=scalar_colebrook) -> list[float]:
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

    return [brentq(lambda q, b=b: h_of(b, q) - head, 1e-9, 50.0, xtol=1e-15) for b in net.branches]


def best_of(fn, repeat: int) -> float:
    best = math.inf
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def main() -> None:
    print(f"machine: {platform.machine()}, {os.cpu_count()} cores, Python "
          f"{platform.python_version()}, numpy {np.__version__}")
    net = make_network(10)
    dp = 68e3
    head = dp / (WATER.density * G)
    solve(net, PressureDrop(dp))  # warm-up (imports)
    scalar_flows(net, head)
    print("\nflows at a given pressure drop: scalar per-branch method vs branchwise solve()")
    print("  scalar Colebrook inside each brentq step: (a) brentq on f, (b) fluids.Colebrook,")
    print("  (c) fixed-point iteration; ratio = scalar time / branchwise solve() time")
    print(f"  {'branches':>8} {'(a) ms':>9} {'(b) ms':>9} {'(c) ms':>9} {'solve() ms':>11} "
          f"{'ratio a':>8} {'ratio b':>8} {'ratio c':>8}  agreement")
    for n in (10, 100, 1000):
        small = make_network(n)
        reps = 5 if n < 1000 else 1
        t_vec = best_of(lambda s=small: solve(s, PressureDrop(dp)), 30 if n < 1000 else 5)
        t_nb = best_of(lambda s=small: scalar_flows(s, head, nested_colebrook), reps)
        t_fl = best_of(lambda s=small: scalar_flows(s, head, fluids_colebrook), reps)
        t_fp = best_of(lambda s=small: scalar_flows(s, head), reps)
        ours = solve(small, PressureDrop(dp)).flows
        ref = scalar_flows(small, head, fluids_colebrook)
        agree = max(abs(a / b - 1) for a, b in zip(ours, ref, strict=True))
        print(f"  {n:>8} {t_nb * 1e3:9.2f} {t_fl * 1e3:9.2f} {t_fp * 1e3:9.2f} "
              f"{t_vec * 1e3:11.2f} {t_nb / t_vec:7.1f}x {t_fl / t_vec:7.1f}x "
              f"{t_fp / t_vec:7.1f}x  {agree:.1e}")
    print("\nscaling (best of several runs)")
    print(f"  {'branches':>9} {'core ms':>9} {'per 1k':>8} {'solve() ms':>11} {'per 1k':>8}")
    for n in (100, 1_000, 10_000, 100_000):
        big = make_network(n)
        lay = Layout.from_network(big)
        repeat = 20 if n <= 10_000 else 3
        t_core = best_of(lambda lay=lay: flows_at_head(lay, head), repeat)
        t_full = best_of(lambda big=big: solve(big, PressureDrop(dp)), max(2, repeat // 4))
        print(f"  {n:>9} {t_core * 1e3:9.2f} {t_core * 1e6 / n:8.1f} {t_full * 1e3:11.2f} "
              f"{t_full * 1e6 / n:8.1f}")


if __name__ == "__main__":
    sys.exit(main())
