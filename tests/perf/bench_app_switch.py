"""How long a screen switch takes, F1 to F5 (a script, not a test).

Runs the app headless on the demo site at 120×40 and presses the screen keys in turn (F2 Liquid,
F3 Branches, F4 Split, F5 History, and F1 Help with Esc to close it), measuring each from the
key to the new screen drawn. The first visit of each screen (when it is built) and the later
visits are reported apart; the figure is the process's CPU time, median over the switches
(wall time beside it), several rounds of the same order of keys. The goal: a median ≤ 100 ms.

    python tests/perf/bench_app_switch.py [--rounds 5]
"""

from __future__ import annotations

import argparse
import asyncio
import os
import statistics
import sys
import tempfile
import time

GOAL_MS = 100.0
KEYS = ("f2", "f3", "f4", "f5", "f1")


async def drawn(app) -> None:
    done = asyncio.Event()
    app.call_after_refresh(done.set)
    await done.wait()


async def measure(rounds: int) -> dict[str, list[tuple[float, float, bool]]]:
    """For each key: (wall, CPU) seconds of each press, and whether it was the first visit."""
    from branchwise.tui.app import BranchwiseApp

    app = BranchwiseApp()
    out: dict[str, list[tuple[float, float, bool]]] = {k: [] for k in KEYS}
    async with app.run_test(size=(120, 40)) as pilot:
        while app.outcome is None or app.outcome.revision != app.session.revision:
            await asyncio.sleep(0.005)
        await pilot.pause()
        for r in range(rounds):
            for key in KEYS:
                before = app.screen
                wall, cpu = time.perf_counter(), time.process_time()
                await pilot.press(key)
                while app.screen is before:
                    await asyncio.sleep(0.0005)
                await drawn(app)
                out[key].append((time.perf_counter() - wall, time.process_time() - cpu, r == 0))
                await app.workers.wait_for_complete()
                await pilot.pause()
                if key == "f1":
                    await pilot.press("escape")
                    await pilot.pause()
                    await pilot.pause()
    return out


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=5)
    args = parser.parse_args(argv)
    os.environ["BRANCHWISE_DATA_DIR"] = tempfile.mkdtemp(prefix="branchwise-bench-")
    out = asyncio.run(measure(args.rounds))
    print(f"screen switch, key to new screen drawn, {args.rounds} rounds, 120×40 headless, "
          f"Python {sys.version.split()[0]} (CPU ms; wall in brackets):")
    print(f"  {'key':<4} {'first visit':>18} {'later, median':>20}")
    later_cpu: list[float] = []
    every_cpu: list[float] = []
    for key, times in out.items():
        first = [t for t in times if t[2]]
        later = [t for t in times if not t[2]]
        later_cpu += [c for _, c, _ in later]
        every_cpu += [c for _, c, _ in times]
        f = first[0] if first else (float("nan"), float("nan"), True)
        lc = statistics.median(c for _, c, _ in later) * 1000 if later else float("nan")
        lw = statistics.median(w for w, _, _ in later) * 1000 if later else float("nan")
        print(f"  {key.upper():<4} {f[1] * 1000:8.1f} ({f[0] * 1000:6.1f}) "
              f"{lc:10.1f} ({lw:6.1f})")
    median = statistics.median(every_cpu) * 1000
    print(f"  median of every switch (first visits included): {median:.1f} ms CPU; "
          f"later visits only: {statistics.median(later_cpu) * 1000:.1f} ms   "
          f"goal ≤ {GOAL_MS:g} ms: {'met' if median <= GOAL_MS else 'not met'}")


if __name__ == "__main__":
    main()
