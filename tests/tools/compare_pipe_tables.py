"""Developer check: the shipped pipe tables against the `fluids` package's tabulations.

Run:  /tmp/venv/bin/python tests/tools/compare_pipe_tables.py

Prints, per schedule, how many sizes agree with fluids.piping (OD, wall and ID within 0.001 mm, or
0.0005 in on walls for the F714/F2619 pair), the sizes fluids lists that the shipped file does not
(within the file's NPS range) and the other way round, and every disagreeing value. The shipped
data state their own standard as the source; fluids is only the cross-check (it is a test
dependency, never imported by branchwise itself).
"""

from __future__ import annotations

import fluids.piping as ref

from branchwise.core.catalogs import sizes
from branchwise.core.catalogs.pipes import nominal_value, tables

PAIRS = {
    "ASME B36.10M": {s: s for s in tables()["ASME B36.10M"].schedules},
    "ASME B36.19M": {s: s for s in tables()["ASME B36.19M"].schedules},
    "ASTM D1785": {"40": "40D1785", "80": "80D1785"},
    "ASTM F714": {
        "DR 7.3": "DR73F2619IPS", "DR 9": "DR9F2619IPS", "DR 11": "DR11F2619IPS",
        "DR 13.5": "DR135F2619IPS", "DR 17": "DR17F2619IPS", "DR 21": "DR21F2619IPS",
        "DR 26": "DR26F2619IPS", "DR 32.5": "DR325F2619IPS",
    },
}  # fmt: skip


def compare(standard: str, schedule: str, theirs_name: str) -> list[str]:
    wall_tol = 0.0127e-3 if standard == "ASTM F714" else 1e-6
    ours = {float(nominal_value(p.nominal)): p for p in sizes(standard, schedule)}
    nps_list, dis, dos, ts = ref.schedule_lookup[theirs_name]
    low, high = min(ours), max(ours)
    theirs = {
        n: (di / 1000, do / 1000, t / 1000)  # fluids.piping tables are in mm
        for n, di, do, t in zip(nps_list, dis, dos, ts, strict=True)
        if low <= n <= high
    }
    lines = []
    agree = 0
    for nps, p in ours.items():
        if nps not in theirs:
            lines.append(f"    only here: {p.label}")
            continue
        di, do, t = theirs[nps]
        diffs = [
            f"{name} {ours_v * 1000:.4f} vs {their_v * 1000:.4f} mm"
            for name, ours_v, their_v, tol in (
                ("OD", p.outside_diameter_m, do, 1e-6),
                ("wall", p.wall_m, t, wall_tol),
                ("ID", p.inner_diameter_m, di, 2 * wall_tol),
            )
            if abs(ours_v - their_v) > tol
        ]
        if diffs:
            lines.append(f"    {p.label}: " + "; ".join(diffs))
        else:
            agree += 1
    for nps in sorted(set(theirs) - set(ours)):
        lines.append(f"    only in fluids: NPS {nps:g}")
    lines.insert(0, f"  {schedule:>8} vs fluids {theirs_name:<14} {agree}/{len(ours)} agree")
    return lines


def main() -> None:
    for standard, pairs in PAIRS.items():
        print(standard)
        for schedule, theirs_name in pairs.items():
            print("\n".join(compare(standard, schedule, theirs_name)))


if __name__ == "__main__":
    main()
