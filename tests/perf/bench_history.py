"""A site's history against the solve of one visit: what each earlier visit costs.

Run: python tests/perf/bench_history.py  (prints figures; not a test)

Three cases, run interleaved in one process (ROUNDS rounds, CPU time, medians): the demo's
today alone (``solve_site``: one solve, no reconciliation), the demo's history (three visits,
two of them reconciled, the indicators' uncertainty parts and the trends), and the same site
with VISITS earlier visits (copies of the demo's two, dated a month apart). The ratios are the
figures to compare; absolute times move between machines and runs.
"""

from __future__ import annotations

import copy
import os
import platform
import statistics
import time
from datetime import date, timedelta

from branchwise.core.history import history_of
from branchwise.core.site.read import demo_site
from branchwise.core.site.solve import solve_site

ROUNDS = 15
VISITS = 12


def many_visits():
    site = demo_site()
    start = date(2023, 1, 15)
    visits = []
    for k in range(VISITS):
        v = copy.deepcopy(site.visits[k % 2])
        v.date = (start + timedelta(days=30 * k)).isoformat()
        visits.append(v)
    site.visits = visits
    return site


def main() -> None:
    today = demo_site()
    today.visits = []
    demo, many = demo_site(), many_visits()
    history_of(demo)  # warm up: imports and caches
    cases = {"today's solve": lambda: solve_site(today),
             "history, 2 visits + today": lambda: history_of(demo),
             f"history, {VISITS} visits + today": lambda: history_of(many)}
    times: dict[str, list[float]] = {name: [] for name in cases}
    for _ in range(ROUNDS):
        for name, fn in cases.items():
            t0 = time.process_time()
            fn()
            times[name].append(time.process_time() - t0)
    base = statistics.median(times["today's solve"])
    print(f"{platform.machine()}, {os.cpu_count()} cores, Python {platform.python_version()}; "
          f"CPU medians of {ROUNDS} interleaved rounds")
    for name, t in times.items():
        m = statistics.median(t)
        print(f"  {name:<30} {m * 1000:8.1f} ms   {m / base:6.1f}× today's solve")


if __name__ == "__main__":
    main()
