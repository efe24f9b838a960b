"""No inf or NaN and no flow beyond the physical bounds reaches any output.

The cases are the ones an engineer can type: a branch left empty (length 0, no fittings, no
valve), a length of 1e-300 m, a loss coefficient of 1e-300, a liquid lighter than any liquid.
Rule (Hagen–Poiseuille and Darcy–Weisbach alike): with no resistance, no finite head fixes the
flow of a branch, so there is no answer to give.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from branchwise.core.errors import InputError, NoSolutionError
from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment, TotalFlow
from branchwise.core.numerics.curve import system_curve
from branchwise.core.numerics.solve import solve

WATER = Fluid("water", 998.2, 1.0016e-3, "water", temperature=293.15)  # iapws, 20 °C
PIPE = Branch("A", (Segment(0.1, 10.0, 4.5e-5),))


@pytest.mark.parametrize("given", [PressureDrop(5e4), TotalFlow(0.05)])
def test_a_branch_with_no_resistance_is_refused_by_name(given) -> None:
    empty = Branch("Empty", (Segment(0.1, 0.0, 4.5e-5),))
    with pytest.raises(InputError) as caught:
        solve(Network(WATER, (PIPE, empty)), given)
    assert caught.value.field == "branches[1].length"
    assert "no resistance" in caught.value.reason


def test_a_network_is_refused_each_time_it_is_solved() -> None:
    """A network that failed the checks fails them again (solves of other networks between):
    only one that passed is spared them the next time."""
    bad = Network(WATER, (PIPE, Branch("Empty", (Segment(0.1, 0.0, 4.5e-5),))))
    good = Network(WATER, (PIPE,))
    for _ in range(2):
        for given in (PressureDrop(5e4), TotalFlow(0.05)):
            with pytest.raises(InputError) as caught:
                solve(bad, given)
            assert caught.value.field == "branches[1].length"
            assert np.isfinite(solve(good, given).total_flow)
            assert np.isfinite(solve(good, given).total_flow)


def test_fittings_alone_or_a_valve_alone_are_resistance_enough() -> None:
    fittings = Branch("Fittings", (Segment(0.1, 0.0, 4.5e-5, 2.0),))
    valve = Branch("Valve", (Segment(0.1, 0.0, 4.5e-5),), 120.0)
    res = solve(Network(WATER, (PIPE, fittings, valve)), PressureDrop(1e4))
    assert np.all(np.isfinite(res.flows)) and np.all(res.flows > 0)


def test_a_length_below_a_millimetre_is_refused() -> None:
    with pytest.raises(InputError) as caught:
        Network(WATER, (PIPE, Branch("B", (Segment(0.1, 1e-300, 4.5e-5),))))
    assert caught.value.field == "branches[1].segments[0].length"


def test_a_liquid_lighter_than_any_liquid_is_refused() -> None:
    # The case: 1e-6 kg/m³ gave 432 km/s with no word.
    with pytest.raises(InputError) as caught:
        Fluid("custom", 1e-6, 1e-3)
    assert caught.value.field == "fluid.density"


@pytest.mark.parametrize("given", [PressureDrop(5e4), TotalFlow(0.05)])
def test_an_almost_empty_branch_ends_in_the_clear_error(given) -> None:
    tiny = Branch("Tiny", (Segment(0.1, 0.0, 4.5e-5, 1e-300),))
    with pytest.raises(NoSolutionError) as caught:
        solve(Network(WATER, (PIPE, tiny)), given)
    assert caught.value.field in ("branches[1].length", "conditions")
    assert "nan" not in str(caught.value) and "inf" not in str(caught.value)


def test_a_flow_faster_than_a_liquid_line_can_run_is_refused() -> None:
    # Incompressible flow holds well below the speed of sound (about 1500 m/s in water); 10 MPa
    # over a metre of smooth 1 m pipe with no exit loss would give about 600 m/s.
    net = Network(WATER, (Branch("Short", (Segment(1.0, 1.0, 0.0),)),))
    with pytest.raises(NoSolutionError) as caught:
        solve(net, PressureDrop(1e7))
    assert caught.value.field == "branches[0].length"


def test_every_number_of_a_solved_result_and_its_curve_is_finite() -> None:
    fittings = Branch("Fittings", (Segment(0.05, 0.0, 4.5e-5, 0.5),))
    res = solve(Network(WATER, (PIPE, fittings)), PressureDrop(2e4))
    for value in (res.pressure_drop, res.total_flow, *res.flows):
        assert math.isfinite(value)
    curve = system_curve(res.network, operating=res)
    assert np.all(np.isfinite(curve.pressure_drop)) and np.all(np.isfinite(curve.branch_flows))
