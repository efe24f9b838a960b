"""A zero reading given: nothing flows, and nothing is made up for it — no friction factor
(f = 64/Re is no number at Re = 0), no regime, and a note that says why (Darcy–Weisbach:
h = f (L/D) v²/2g, so with h = 0 and no lift every v is 0)."""

from __future__ import annotations

import json
import math

from branchwise.core.report import render
from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.solve import solve_site


def test_a_zero_pressure_drop_gives_no_regime_and_no_friction_factor():
    site = parse_site(demo_text().replace('pressure_drop = "10 psid"', 'pressure_drop = "0 psid"'))
    solved = solve_site(site)
    assert not any(solved.result.flows)
    for br in solved.result.branches:
        for seg in br.segments:
            assert seg.regime == "none" and not math.isfinite(seg.friction_factor)
    assert any(n.startswith("Nothing flows: the given reading is zero") for n in solved.notes)
    doc = json.loads(render(solved, "json", "si"))  # a standard JSON reader: no Infinity
    assert all(s["friction_factor"] is None for b in doc["branches"] for s in b["segments"])
    for fmt in ("table", "csv", "markdown", "html"):
        text = render(solved, fmt, "si")
        assert "inf" not in text.lower().replace("information", ""), fmt
