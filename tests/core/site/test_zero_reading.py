"""A zero reading given: nothing flows, and nothing is made up for it — no friction factor
(f = 64/Re is no number at Re = 0), no regime, and a note that says why (Darcy–Weisbach:
h = f (L/D) v²/2g, so with h = 0 and no lift every v is 0)."""

from __future__ import annotations

import json
import math

import pytest

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
    zero = "Nothing flows: the head across the header comes out zero"
    assert any(n.startswith(zero) for n in solved.notes)
    doc = json.loads(render(solved, "json", "si"))  # a standard JSON reader: no Infinity
    assert all(s["friction_factor"] is None for b in doc["branches"] for s in b["segments"])
    for fmt in ("table", "csv", "markdown", "html"):
        text = render(solved, fmt, "si")
        assert "inf" not in text.lower().replace("information", ""), fmt


def test_readings_that_cancel_weigh_to_a_head_of_exactly_zero():
    """Two like branches, clamp-ons of +2 and −2 L/s, weighed together: χ² is symmetric in the
    head, so its least is at zero (by symmetry). It came out as 1e-33 m, with f = 1.5e28 and
    reverse-flow warnings on flows of 1e-31 L/s."""
    branch = ('[[branches]]\nname = "{}"\nsize = "3 in sch 40"\nlength = "40 m"\n'
              'material = "commercial-steel"\nmeasured_flow = "{}"\n')
    text = ('format = 1\nname = "cancel"\n[fluid]\nkind = "water"\ntemperature = "20 degC"\n'
            '[conditions]\ngiven = "all"\n' + branch.format("A", "2 L/s")
            + branch.format("B", "-2 L/s"))
    solved = solve_site(parse_site(text))
    assert solved.reconciliation is not None and solved.reconciliation.head_m == 0.0
    assert not any(solved.result.flows) and not solved.result.warnings
    # By hand: like branches move alike with the head, so the residuals' covariance is
    # V − V u uᵀ with u = (1, 1)/√2 (V = σ² I): each residual's σ is σ/√2, and 2 L/s over it
    # is the normalised residual (σ, the clamp-on's 3 % of 2 L/s over √3, from the fit).
    for fit in solved.reconciliation.readings:
        want = fit.measured_si / (fit.sigma_si / math.sqrt(2))
        assert fit.normalised_residual == pytest.approx(want, rel=1e-6)
    assert math.isfinite(solved.reconciliation.head_sigma_m)
    doc = json.loads(render(solved, "json", "si"))
    assert all(s["friction_factor"] is None for b in doc["branches"] for s in b["segments"])
