"""How long the app takes from a changed value to the new answer on screen (a script, not a test).

Runs the app headless on sites of 20 and of 200 branches (the demo's four, copied), puts new
pressure drops into the given field one after another (as the last keystroke of each value would),
and for each measures the time until the answer for that value has been drawn: the edit, the
solve in its worker thread, the message back, and the redraw of the screen. The two sizes take
turns (a few changes on one, then on the other, each round in a fresh app), so that other work on
the machine falls on both alike. The figure is the process's CPU time (every thread: the solve
runs in a worker), median over the changes; wall time beside it. The goal: ≤ 50 ms at both sizes.

    python tests/perf/bench_app_recompute.py [--branches 20 200] [--rounds 5] [--changes 8]
"""

from __future__ import annotations

import argparse
import asyncio
import os
import statistics
import sys
import tempfile
import time

GOAL_MS = 50.0


def site_with(n: int):
    """The demo site with ``n`` branches (copies of the demo's, renamed)."""
    import copy

    from branchwise.core.site.read import demo_site

    site = demo_site()
    base = site.branches
    site.branches = []
    for i in range(n):
        br = copy.deepcopy(base[i % len(base)])
        br.name = f"{br.name} #{i + 1}"
        site.branches.append(br)
    return site


async def measure(n: int, changes: int, start_at: int = 0) -> list[tuple[float, float]]:
    """(wall, CPU) seconds of each of ``changes`` changes on a site of ``n`` branches."""
    from branchwise.tui.app import BranchwiseApp

    class Probe(BranchwiseApp):
        """Says when the answer for a revision has come (no polling loop to burn CPU)."""

        want: tuple[int, asyncio.Event] | None = None

        def watch_outcome(self, outcome) -> None:
            if self.want is not None and outcome is not None and outcome.revision == self.want[0]:
                self.want[1].set()

    app = Probe()
    times: list[tuple[float, float]] = []
    async with app.run_test(size=(120, 40)) as pilot:
        app.session.replace(site_with(n))
        app.site_changed()
        while app.outcome is None or app.outcome.revision != app.session.revision:
            await asyncio.sleep(0.005)
        await pilot.press("v")
        box = app.focused
        for k in range(start_at, start_at + changes + 1):
            value = f"{8 + (k % 10) * 0.5:g} psi"
            drawn, answered = asyncio.Event(), asyncio.Event()
            app.want = (app.session.revision + 1, answered)
            wall, cpu = time.perf_counter(), time.process_time()
            box.value = value  # as the last keystroke of a value would leave it
            await answered.wait()
            app.call_after_refresh(drawn.set)
            await drawn.wait()
            if k > start_at:  # the first change after a start warms the caches: not counted
                times.append((time.perf_counter() - wall, time.process_time() - cpu))
            assert app.outcome.ok, app.outcome.error
            assert len(app.outcome.solved.result.branches) == n
            await pilot.pause()  # let the footer's and the recovery copy's timers run apart
    return times


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--branches", type=int, nargs="+", default=[20, 200])
    parser.add_argument("--rounds", type=int, default=5)
    parser.add_argument("--changes", type=int, default=8, help="changes per round and size")
    args = parser.parse_args(argv)
    os.environ["BRANCHWISE_DATA_DIR"] = tempfile.mkdtemp(prefix="branchwise-bench-")
    results: dict[int, list[tuple[float, float]]] = {n: [] for n in args.branches}
    for r in range(args.rounds):
        for n in args.branches:
            results[n] += asyncio.run(measure(n, args.changes, r * args.changes))
    print(f"keystroke to new answer drawn, {args.rounds} rounds × {args.changes} changes per "
          f"size, sizes taking turns, 120×40 headless, Python {sys.version.split()[0]}:")
    print(f"  {'branches':>8} {'CPU median':>11} {'wall median':>12} {'wall 90th':>10}")
    for n, times in results.items():
        cpu = statistics.median(c for _, c in times) * 1000
        walls = sorted(w * 1000 for w, _ in times)
        print(f"  {n:>8} {cpu:8.1f} ms {statistics.median(walls):9.1f} ms "
              f"{walls[int(0.9 * (len(walls) - 1))]:7.1f} ms   goal ≤ {GOAL_MS:g} ms: "
              f"{'met' if cpu <= GOAL_MS else 'not met'}")


if __name__ == "__main__":
    main()
