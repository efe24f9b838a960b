"""Which friction law holds where, and the warnings every liquid gets.

References: Hagen–Poiseuille (laminar pipe flow, any fluid-mechanics text: Q = π D⁴ Δp / (128 μ L));
`fluids.friction.Colebrook` (Caleb Bell's fluids library) for the Darcy check; the Hazen–Williams
rule "water only, about 5–25 °C, turbulent" and the 3 m/s ↔ 10 ft/s velocity limit are common
practice (field notes).
"""

from __future__ import annotations

import math

import pytest
from iapws import IAPWS95

from branchwise.core import units
from branchwise.core.errors import InputError
from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.solve import solve


def _water(celsius: float) -> Fluid:
    w = IAPWS95(T=celsius + 273.15, P=0.101325)  # IAPWS-95, the iapws package
    return Fluid(f"water at {celsius} °C", w.rho, w.mu, "water", temperature=celsius + 273.15)


def _line(d: float, length: float, c: float = 130.0, eps: float = 4.5e-5) -> Branch:
    return Branch("L", (Segment(d, length, eps, 0.0, hw_c=c),))


@pytest.mark.parametrize("fluid", [
    Fluid("oil", 880.0, 0.44, "custom"),
    Fluid("glycol", 1040.0, 4e-3, "ethylene-glycol", temperature=280.0),
])
def test_hazen_williams_is_refused_for_other_liquids(fluid: Fluid) -> None:
    # Common practice: Hazen–Williams is an empirical fit for water alone. The case: an
    # oil of 500 cSt got 4–12× the Darcy laminar flow under it.
    net = Network(fluid, (_line(0.05, 10.0),), friction="hazen-williams")
    with pytest.raises(InputError) as caught:
        solve(net, PressureDrop(5e4))
    assert caught.value.field == "conditions.friction"
    assert "water" in caught.value.reason and "colebrook" in caught.value.reason


def test_hazen_williams_takes_the_laminar_law_in_laminar_flow() -> None:
    # Hagen–Poiseuille by hand: water at 20 °C in a 5 mm bore, 10 m, 100 Pa: Re ≈ 39.
    water = _water(20.0)
    d, length, dp = 0.005, 10.0, 100.0
    expected = math.pi * d**4 * dp / (128 * water.viscosity * length)
    res = solve(Network(water, (_line(d, length, eps=0.0),), friction="hazen-williams"),
                PressureDrop(dp))
    assert res.flows[0] == pytest.approx(expected, rel=1e-12)
    laminar = [w for w in res.warnings if w.code == "laminar"]
    assert laminar and "laminar law was used" in laminar[0].message


def test_hazen_williams_warns_outside_its_temperatures() -> None:
    # Common practice: Hazen–Williams' C was fitted for water at about 5–25 °C; at 90 °C it is
    # 8.7 % off Colebrook (the measurement), so a warning.
    for celsius, warned in ((15.0, False), (90.0, True), (2.0, True)):
        net = Network(_water(celsius), (_line(0.1, 100.0),), friction="hazen-williams")
        codes = {w.code for w in solve(net, PressureDrop(2e4)).warnings}
        assert ("hazen-williams-range" in codes) is warned, celsius


def test_velocity_is_checked_for_every_liquid() -> None:
    oil = Fluid("light oil", 850.0, 2e-3, "custom")
    res = solve(Network(oil, (Branch("Fast", (Segment(0.025, 5.0, 1e-6),)),)), PressureDrop(3e5))
    fast = [w for w in res.warnings if w.code == "velocity-high"]
    assert fast and fast[0].branch == "Fast"
    # 3 m/s stated in US units is quoted as the trade does: 10 ft/s, not 9.843.
    assert "above 10 ft/s" in units.restate(fast[0].marked, "us")
    assert "above 3 m/s" in units.restate(fast[0].marked, "si")


def test_a_reynolds_number_beyond_the_correlations_range_is_said() -> None:
    # Colebrook's, Haaland's and Swamee–Jain's fits end at about Re 1e8 (the authors' stated
    # ranges, from memory); a 2 m line at 60 m/s of water is past it.
    water = _water(20.0)
    net = Network(water, (Branch("Big", (Segment(2.0, 50.0, 1e-5),)),))
    res = solve(net, PressureDrop(8e5))
    assert abs(res.branches[0].segments[0].reynolds) > 1e8
    assert "reynolds-range" in {w.code for w in res.warnings}


def test_swamee_jain_outside_its_roughness_range_is_said() -> None:
    # Swamee–Jain (1976): stated for ε/D ≤ 0.01 (from memory).
    net = Network(_water(20.0), (Branch("Rough", (Segment(0.05, 20.0, 1e-3),)),),
                  friction="swamee-jain")
    codes = {w.code for w in solve(net, PressureDrop(2e4)).warnings}
    assert "reynolds-range" in codes


@pytest.mark.parametrize("branches", [1, 2, 150])  # the plain-float path and the numpy one
def test_the_laminar_law_beyond_laminar_flow_is_said_on_every_branch(branches: int) -> None:
    # Laminar pipe flow ends at about Re 2000 (any fluid-mechanics text; field notes): the law
    # f = 64/Re chosen for a line whose Re is far above it gives far too little friction —
    # here 4.6× the Colebrook flow — and must not pass unsaid.
    water = _water(20.0)
    line = (Segment(0.0525, 30.0, 4.5e-5, 0.0),)
    net = Network(water, tuple(Branch(f"L{i}", line) for i in range(branches)),
                  friction="laminar")
    res = solve(net, PressureDrop(500.0))
    beyond = [w for w in res.warnings if w.code == "laminar-law-beyond"]
    assert {w.branch for w in beyond} == {f"L{i}" for i in range(branches)}
    assert "not laminar" in beyond[0].message and "colebrook" in beyond[0].message
    darcy = solve(Network(water, net.branches, friction="colebrook"), PressureDrop(500.0))
    assert not any(w.code == "laminar-law-beyond" for w in darcy.warnings)
    # Where the flow is laminar, the law holds: Hagen–Poiseuille by hand, no such warning.
    d, length, dp = 0.004, 2.0, 500.0
    slow = solve(Network(water, (Branch("S", (Segment(d, length, 0.0, 0.0),)),),
                         friction="laminar"), PressureDrop(dp))
    assert slow.flows[0] == pytest.approx(math.pi * d**4 * dp / (128 * water.viscosity * length),
                                          rel=1e-12)
    assert not any(w.code == "laminar-law-beyond" for w in slow.warnings)
