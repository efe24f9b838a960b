"""``Result.made``: the small path's quicker way to the same Result as the constructor's."""

from __future__ import annotations

import dataclasses
import inspect

import pytest

from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.results import Result
from branchwise.core.numerics.solve import solve

WATER = Fluid("water 20 °C", 998.2, 1.0016e-3, "water")
"""IAPWS values near 20 °C (see the field notes)."""


def test_its_parameters_are_the_fields():
    fields = [(f.name, f.default) for f in dataclasses.fields(Result)]
    params = [(p.name, dataclasses.MISSING if p.default is inspect.Parameter.empty
               else p.default)
              for p in list(inspect.signature(Result.made).parameters.values())]
    assert params == fields


def test_it_makes_the_constructors_result_and_keeps_it_frozen():
    net = Network(WATER, (Branch("a", (Segment(0.1, 40.0, 4.5e-5, 3.0),)),
                          Branch("b", (Segment(0.08, 25.0, 4.5e-5, 1.0),))))
    quick = solve(net, PressureDrop(2e4))  # a small network: made by Result.made
    values = {f.name: getattr(quick, f.name) for f in dataclasses.fields(Result)}
    built = Result(**values)
    assert type(quick) is Result and quick == built
    assert quick.warnings == built.warnings and quick.branches == built.branches
    with pytest.raises(dataclasses.FrozenInstanceError):
        quick.total_flow = 0.0  # type: ignore[misc]
