"""Benchmark of a large solve (a script, not a test): prints ratios, asserts nothing.

    python tests/perf/bench_scale.py [--rounds N] [--largest N]

Networks of 1k to 100k branches (two segments every fifth branch), flows at a given Δp. For each
size, in turn in the same process (CPU-time medians, ``baseline.interleaved``):

* the core solve on prepared arrays (``Layout`` → ``flows_at_head``);
* ``Layout.from_network`` alone;
* the whole ``solve()`` (the checks, the arrays, the last check, the result; its warnings are
  written when first read);
* ``solve()`` and then every warning read, and every branch's result.

Goals (issue 15): whole ``solve()`` / core solve at 10k ≤ 3×, the cost per branch flat from 1k
to 100k. At 10k the tree before the speed work (``baseline.BASELINE_REV``) is timed too.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from baseline import (  # noqa: E402
    BASELINE_REV,
    convert,
    interleaved,
    load_core,
    machine,
    module,
    ratio_line,
    verdict,
)
from bench_solve import DP, WATER, G, make_network  # noqa: E402

from branchwise.core.model import Network, PressureDrop  # noqa: E402
from branchwise.core.numerics.hydraulics import Layout, flows_at_head  # noqa: E402
from branchwise.core.numerics.solve import solve  # noqa: E402


def read_all(net: Network) -> None:
    r = solve(net, PressureDrop(DP))
    for w in r.warnings:
        w.message  # noqa: B018 (written when read)
    r.branches  # noqa: B018


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=7)
    parser.add_argument("--largest", type=int, default=100_000)
    args = parser.parse_args()
    print(machine())
    head = DP / (WATER.density * G)
    sizes = [n for n in (1_000, 10_000, 100_000) if n <= args.largest]
    print(f"\n  {'branches':>9} {'core':>9} {'Layout':>9} {'solve()':>9} {'+ read':>9}   "
          "µs per branch; solve() / core")
    per_branch: dict[int, float] = {}
    ratios: dict[int, float] = {}
    for n in sizes:
        net = make_network(n)
        lay = Layout.from_network(net)
        t = interleaved({
            "core": lambda lay=lay: flows_at_head(lay, head),
            "layout": lambda net=net: Layout.from_network(net),
            "solve": lambda net=net: solve(net, PressureDrop(DP)),
            "read": lambda net=net: read_all(net),
        }, rounds=args.rounds if n < 100_000 else max(3, args.rounds // 2))
        per_branch[n] = t["solve"] / n
        ratios[n] = t["solve"] / t["core"]
        print(f"  {n:>9} {t['core'] / n * 1e6:9.2f} {t['layout'] / n * 1e6:9.2f} "
              f"{t['solve'] / n * 1e6:9.2f} {t['read'] / n * 1e6:9.2f}   {ratios[n]:.2f}×")
    if 10_000 in ratios:
        print(f"\n  whole solve() / core solve at 10k: {ratios[10_000]:.2f}×   goal ≤ 3×: "
              f"{verdict(ratios[10_000] <= 3)}")
    if len(per_branch) > 1:
        growth = per_branch[sizes[-1]] / per_branch[sizes[0]]
        print(f"  solve() per branch, {sizes[-1]:,} / {sizes[0]:,} branches: {growth:.2f}×   "
              f"(flat: about 1×)")

    base = load_core()
    base_solve = module(base, "numerics.solve").solve
    net = make_network(10_000)
    base_net = convert(base, net)
    base_dp = convert(base, PressureDrop(DP))
    t = interleaved({
        "today": lambda: solve(net, PressureDrop(DP)),
        "base": lambda: base_solve(base_net, base_dp),
    }, rounds=max(3, args.rounds // 2))
    print(f"\n  10k branches, whole solve(): the tree at {BASELINE_REV} / today's")
    print(ratio_line("flows at a given Δp", t["base"], t["today"]))


if __name__ == "__main__":
    sys.exit(main())
