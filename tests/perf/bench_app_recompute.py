"""How long the app takes from a changed value to the new answer on screen (a script, not a test).

Runs the app headless on a site of 20 branches (the demo's four, copied five times), puts new
pressure drops into the given field one after another (as the last keystroke of each value would),
and for each measures the wall time until the answer for that value has been drawn: the edit,
the solve in its worker thread, the message back, and the redraw of the screen.

    python tests/perf/bench_app_recompute.py [--branches 20] [--repeat 30]
"""

from __future__ import annotations

import argparse
import asyncio
import os
import statistics
import sys
import tempfile
import time


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


async def measure(n: int, repeat: int) -> list[float]:
    from branchwise.tui.app import BranchwiseApp

    app = BranchwiseApp()
    latencies: list[float] = []
    async with app.run_test(size=(120, 40)) as pilot:
        app.session.replace(site_with(n))
        app.site_changed()
        while app.outcome is None or app.outcome.revision != app.session.revision:
            await asyncio.sleep(0.005)
        await pilot.press("v")
        box = app.focused
        for k in range(repeat):
            value = f"{8 + (k % 10) * 0.5:g} psi"
            drawn = asyncio.Event()
            want = app.session.revision + 1
            start = time.perf_counter()
            box.value = value  # as the last keystroke of a value would leave it
            while app.outcome is None or app.outcome.revision != want:
                await asyncio.sleep(0.0005)
            app.call_after_refresh(drawn.set)
            await drawn.wait()
            latencies.append(time.perf_counter() - start)
            assert app.outcome.ok, app.outcome.error
            assert len(app.outcome.solved.result.branches) == n
    return latencies


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--branches", type=int, default=20)
    parser.add_argument("--repeat", type=int, default=30)
    args = parser.parse_args(argv)
    os.environ["BRANCHWISE_DATA_DIR"] = tempfile.mkdtemp(prefix="branchwise-bench-")
    times = asyncio.run(measure(args.branches, args.repeat))
    ms = sorted(t * 1000 for t in times)
    print(f"branches: {args.branches}; changes: {len(ms)}; Python {sys.version.split()[0]}")
    print(f"keystroke to new answer drawn: median {statistics.median(ms):.1f} ms, "
          f"90th percentile {ms[int(0.9 * (len(ms) - 1))]:.1f} ms, worst {ms[-1]:.1f} ms")


if __name__ == "__main__":
    main()
