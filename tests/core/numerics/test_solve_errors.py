"""Bad input names the field and the value; impossible targets give the clear no-solution error."""

from __future__ import annotations

import math

import pytest

from branchwise.core.errors import InputError, NoSolutionError
from branchwise.core.model import (
    Branch,
    FindUnknown,
    Fluid,
    MeasuredFlow,
    Network,
    PressureDrop,
    Segment,
    TotalFlow,
    branch,
)
from branchwise.core.numerics.solve import solve

WATER = Fluid("water", 998.2, 1.0016e-3, "water")  # 20 °C, values from the iapws package


def two() -> Network:
    return Network(WATER, (branch("A", 0.1, 50, 4.5e-5, 3), branch("B", 0.05, 30, 4.5e-5, 8)))


@pytest.mark.parametrize(("build", "field", "shown"), [
    (lambda: Network(WATER, (branch("A", 0.1, -5, 0.0),)), "branches[0].segments[0].length", "-5"),
    (lambda: Network(WATER, (branch("A", 0.0, 5, 0.0),)), "branches[0].segments[0].diameter",
     "0.0"),
    (lambda: Network(WATER, (branch("A", math.nan, 5),)), "branches[0].segments[0].diameter",
     "nan"),
    (lambda: Network(WATER, (branch("A", 0.1, math.inf),)), "branches[0].segments[0].length",
     "inf"),
    (lambda: Network(WATER, (branch("A", 0.1, 5, 0.05),)), "branches[0].segments[0].roughness",
     "0.05"),
    (lambda: Network(WATER, (branch("A", 0.1, 5, 0, -1),)), "branches[0].segments[0].minor_k",
     "-1"),
    (lambda: Network(WATER, ()), "branches", "[]"),
    (lambda: Network(WATER, (branch("A", 0.1, 5), branch("a ", 0.1, 5))), "branches[1].name",
     "'a '"),
    (lambda: Network(WATER, (Branch("A", ()),)), "branches[0].segments", "[]"),
    (lambda: Network(WATER, (branch("A", 0.1, 5, valve_kv=0),)), "branches[0].valve_kv", "0"),
    (lambda: Fluid("x", -1, 1e-3), "fluid.density", "-1"),
    (lambda: Network(WATER, (branch("A", 0.1, 5),), friction="moody"), "conditions.friction",
     "moody"),
    (lambda: solve(two(), PressureDrop(math.nan)), "conditions.pressure_drop", "nan"),
    (lambda: solve(two(), MeasuredFlow("C", 0.01)), "conditions.measured_flow", "'C'"),
    (lambda: solve(two(), PressureDrop(1e4), FindUnknown("length", "Z", 0.01)), "solve.branch",
     "'Z'"),
    (lambda: solve(two(), PressureDrop(1e4), FindUnknown("colour", "A", 0.01)), "solve.find",
     "colour"),
    (lambda: solve(two(), PressureDrop(1e4), FindUnknown("length", "A", 0.0)),
     "solve.target_flow", "0.0"),
    (lambda: solve(two(), MeasuredFlow("A", 0.01), FindUnknown("length", "A", 0.01)),
     "solve.branch", "A"),
    (lambda: Network(WATER, (branch("A", 0.1, 5),), friction="hazen-williams"),
     "branches[0].segments[0].hw_c", "nothing"),
])
def test_bad_input_names_field_and_value(build, field, shown):
    with pytest.raises(InputError) as err:
        build()
    assert err.value.field == field
    assert str(err.value).startswith(f"{field}: ")
    assert str(err.value).endswith(f"got {shown}")


def test_length_with_no_answer_states_the_fittings_limit():
    net = two()
    with pytest.raises(NoSolutionError) as err:
        solve(net, PressureDrop(68e3), FindUnknown("length", "B", 0.030))
    text = str(err.value)
    assert text.startswith("branch 'B' cannot pass 30 L/s at 68 kPa with any length")
    # the quoted limit is the flow the branch passes at zero length, checked by solving it
    zero = net.replace_branch(1, branch("B", 0.05, 0.0, 4.5e-5, 8))
    q0 = solve(zero, PressureDrop(68e3)).flows[1]
    assert f"its fittings alone allow {q0 * 1000:.4g} L/s" in text


def test_total_flow_not_above_target_is_refused():
    with pytest.raises(NoSolutionError, match="is not more than the target"):
        solve(two(), TotalFlow(0.010), FindUnknown("diameter", "A", 0.012))


def test_a_target_against_the_total_flow_is_said_so():
    # A target that runs one way while the header's total runs the other: no head does that
    # (the message is no longer "not more than the target", which reads as a size).
    with pytest.raises(NoSolutionError) as caught:
        solve(two(), TotalFlow(0.03), FindUnknown("diameter", "A", -0.01))
    assert "runs against the total flow" in str(caught.value)
    assert "not more than" not in str(caught.value)
    assert caught.value.field == "solve.target_flow"


def test_roughness_below_zero_is_refused():
    net = two()
    q = solve(net, PressureDrop(5e4)).flows[0]
    with pytest.raises(NoSolutionError, match="roughness below zero"):
        solve(net, PressureDrop(5e4), FindUnknown("roughness", "A", q * 1.3))


def test_diameter_beyond_the_sane_bound_is_refused():
    # All of B's head goes in its fittings at 8 L/s... K = 8 on a 50 mm pipe; a huge target fails.
    with pytest.raises(NoSolutionError, match="with any diameter up to 10 m"):
        solve(two(), PressureDrop(1.0), FindUnknown("diameter", "A", 50.0))


def test_reverse_flow_when_head_is_below_the_lift():
    net = Network(WATER, two().branches, elevation_change=10.0)
    res = solve(net, PressureDrop(5e4))  # 5.1 m of pressure head against a 10 m lift
    assert res.driving_head < 0
    assert all(q < 0 for q in res.flows)
    assert {w.code for w in res.warnings} == {"reverse-flow"}
    with pytest.raises(NoSolutionError, match="in reverse"):
        solve(net, PressureDrop(5e4), FindUnknown("length", "A", 0.01))


def test_series_segments_carry_the_same_flow_and_losses_add():
    net = Network(WATER, (Branch("S", (Segment(0.1, 20, 4.5e-5, 1), Segment(0.08, 10, 4.5e-5, 2))),
                          branch("T", 0.09, 40, 4.5e-5, 2)))
    res = solve(net, PressureDrop(4e4))
    s = res.branches[0]
    areas = [math.pi * seg.diameter**2 / 4 for seg in s.segments]
    assert [seg.velocity * a for seg, a in zip(s.segments, areas, strict=True)] == pytest.approx(
        [s.flow, s.flow], rel=1e-14)
    assert s.head_loss == pytest.approx(res.head_loss, rel=1e-12)
    assert res.branches[1].head_loss == pytest.approx(res.head_loss, rel=1e-12)


def test_warnings_for_high_velocity_and_laminar_flow():
    net = Network(WATER, (branch("Fast", 0.025, 5, 1e-6), branch("Slow", 0.3, 5000, 1e-6)))
    res = solve(net, PressureDrop(2e5))
    codes = {(w.code, w.branch) for w in res.warnings}
    assert ("velocity-high", "Fast") in codes  # common practice: ~3 m/s for water lines
    oil = Fluid("oil", 870, 0.5)
    res = solve(Network(oil, net.branches), PressureDrop(2e4))
    assert ("laminar", "Slow") in {(w.code, w.branch) for w in res.warnings}


@pytest.mark.parametrize(("build", "field"), [
    (lambda: Network(WATER, (branch("A", 1e200, 5),)), "branches[0].segments[0].diameter"),
    (lambda: Network(WATER, (branch("A", 0.1, 1e12),)), "branches[0].segments[0].length"),
    (lambda: Network(WATER, (branch("A", 0.1, 5, 0, 1e30),)), "branches[0].segments[0].minor_k"),
    (lambda: Fluid("x", 1e9, 1e-3), "fluid.density"),
    (lambda: Network(WATER, (branch("A", 0.1, 5),), elevation_change=-1e6),
     "conditions.elevation_change"),
])
def test_absurd_sizes_are_refused_before_they_become_inf(build, field):
    with pytest.raises(InputError) as err:
        build()
    assert err.value.field == field
    assert "is beyond any" in str(err.value)


def test_length_beyond_any_pipe_run_is_a_clear_no_solution():
    net = two()
    q = solve(net, PressureDrop(5e4)).flows[0]
    with pytest.raises(NoSolutionError, match="more than any pipe run"):
        solve(net, PressureDrop(5e4), FindUnknown("length", "A", q * 1e-4))


def test_reverse_flow_says_why():
    # With no lift, reverse flow can only come from a negative pressure drop: say so.
    res = solve(two(), PressureDrop(-5e3))
    assert all(q < 0 for q in res.flows)
    assert all("check the sign of the pressure drop" in w.message for w in res.warnings)
    lifted = Network(WATER, two().branches, elevation_change=10.0)
    res = solve(lifted, PressureDrop(5e4))
    assert all("less than the static lift" in w.message for w in res.warnings)


@pytest.mark.parametrize("quantity", ["diameter", "length"])
def test_a_valve_that_limits_the_flow_is_named_with_the_kv_it_would_need(quantity):
    import re

    def net(kv):
        return Network(WATER, (branch("A", 0.0627, 40, 4.5e-5, 3, valve_kv=kv),
                               branch("B", 0.05, 30, 4.5e-5, 8)))

    want = FindUnknown(quantity, "A", 0.012)  # 12 L/s through a Kv 30 valve at 45 kPa: no
    with pytest.raises(NoSolutionError) as caught:
        solve(net(30.0), PressureDrop(45e3), want)
    needed = float(re.search(r"would need Kv ([\d.]+) or more", str(caught.value)).group(1))
    assert needed > 30
    # The hint is right if a valve of the Kv printed (rounded up, "or more") makes the target
    # reachable and one 1 % below does not (diameter: at the 10 m limit; length: at zero).
    solve(net(needed), PressureDrop(45e3), want)
    with pytest.raises(NoSolutionError):
        solve(net(needed * 0.99), PressureDrop(45e3), want)


@pytest.mark.parametrize("given", [TotalFlow(2e6), MeasuredFlow("A", -2e6)])
def test_a_flow_beyond_any_pipe_is_refused_before_it_overflows(given):
    with pytest.raises(InputError) as caught:
        solve(two(), given)
    assert "beyond any pipe flow" in caught.value.reason


def test_every_branch_too_fast_names_the_given_reading():
    """1e12 Pa (a pressure drop typed in the wrong unit) sends every branch past 300 m/s:
    the field blamed is the reading, not the first branch's length."""
    with pytest.raises(NoSolutionError) as err:
        solve(two(), PressureDrop(1e12))
    assert err.value.field == "conditions.pressure_drop"
    assert "every branch would be beyond its bounds" in str(err.value)
    with pytest.raises(NoSolutionError) as err:
        solve(two(), TotalFlow(1e4))
    assert err.value.field == "conditions.total_flow"
    with pytest.raises(NoSolutionError) as err:
        solve(two(), MeasuredFlow("B", 1e3))
    assert err.value.field == "branches[1].measured_flow"


def test_one_branch_too_fast_names_that_branch():
    """A 1 mm stub with no fittings beside a real line at 1 MPa: only the stub is beyond
    its bounds, so it is the one named."""
    net = Network(WATER, (branch("stub", 0.1, 1e-3, 0.0), branch("B", 0.05, 30, 4.5e-5, 8)))
    with pytest.raises(NoSolutionError) as err:
        solve(net, PressureDrop(1e6))
    assert err.value.field == "branches[0].length"


def test_branch_names_are_told_apart_by_more_than_case_and_spaces() -> None:
    # Two lines named "AHU 1" and "ahu  1" on one header are one name mistyped, not two lines.
    water = Fluid("water", 998.2, 1.0016e-3, "water")  # near 20 °C (IAPWS, field notes)
    pipe = (Segment(0.05, 10.0, 4.5e-5),)
    with pytest.raises(InputError) as caught:
        Network(water, (Branch("AHU 1", pipe), Branch("ahu  1", pipe)))
    assert caught.value.field == "branches[1].name"
    net = Network(water, (Branch("AHU 1", pipe), Branch("AHU 2", pipe)))
    assert net.index_of(" ahu   2") == 1
