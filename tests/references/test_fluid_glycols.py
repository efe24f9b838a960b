"""Glycol solutions against CoolProp (INCOMP::MEG, INCOMP::MPG) between the table nodes.

The shipped tables hold CoolProp's values at their nodes, so the checks here are at
concentrations off the 5 % rows and at temperatures off every row's nodes: they measure the
interpolation, not the copying. The spline itself is checked against scipy's CubicSpline.
"""

from __future__ import annotations

import re
import tomllib
from importlib import resources

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI
from scipy.interpolate import CubicSpline

from branchwise.core.errors import InputError
from branchwise.core.fluids import _spline
from branchwise.core.fluids.glycol import freezing_point_k, glycol

ATM = 101325.0
CODES = {"ethylene-glycol": "MEG", "propylene-glycol": "MPG"}
OFF_GRID_FRACTIONS = [0.105, 0.1675, 0.235, 0.3333, 0.415, 0.4875, 0.555, 0.595]
# Kelvin above the mixture's freezing point: close to it (where viscosity climbs fastest) and
# spread to 99.3 °C; none coincides with a table node (each row has its own node temperatures).
ABOVE_FREEZING_K = [0.05, 0.7, 3.3, 11.9, 27.4, 48.1, 77.7]


def coolprop(output: str, kind: str, t: float, x: float) -> float:
    return PropsSI(output, "T", t, "P", ATM, f"INCOMP::{CODES[kind]}[{x}]")


def coolprop_freezing_k(kind: str, x: float) -> float:
    return coolprop("T_freeze", kind, 300.0, x)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", OFF_GRID_FRACTIONS)
def test_glycol_matches_coolprop_between_nodes(kind: str, x: float) -> None:
    t_freeze = coolprop_freezing_k(kind, x)
    for t in [t_freeze + dt for dt in ABOVE_FREEZING_K] + [372.45]:
        fluid = glycol(kind, t, x)  # type: ignore[arg-type]
        # Reference: CoolProp INCOMP::MEG / INCOMP::MPG. Worst seen over a dense sweep of
        # 10–60 %: density 1.2e-5, viscosity 1.1e-3 (60 % propylene glycol at its freezing point).
        assert fluid.density == pytest.approx(coolprop("D", kind, t, x), rel=5e-5)
        assert fluid.viscosity == pytest.approx(coolprop("V", kind, t, x), rel=2e-3)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", [0.1, 0.123, 0.2468, 0.3333, 0.5051, 0.6])
def test_freezing_point_matches_coolprop(kind: str, x: float) -> None:
    # Reference: CoolProp's T_freeze of the same solution; tabulated every 1 %.
    assert freezing_point_k(kind, x) == pytest.approx(coolprop_freezing_k(kind, x), abs=1e-4)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", [0.15, 0.3333, 0.52])
def test_glycol_refuses_points_below_freezing(kind: str, x: float) -> None:
    t_freeze = coolprop_freezing_k(kind, x)  # reference: CoolProp T_freeze
    with pytest.raises(InputError) as err:
        glycol(kind, t_freeze - 0.05, x)  # type: ignore[arg-type]
    assert err.value.field == "fluid.temperature"
    said = re.search(r"freezes at (-?[\d.]+) °C", str(err.value))
    assert said is not None and float(said.group(1)) == pytest.approx(t_freeze - 273.15, abs=0.05)
    # CoolProp refuses the same state, so the limit is the reference's own.
    with pytest.raises(ValueError, match="freezing point"):
        coolprop("D", kind, t_freeze - 0.05, x)


@pytest.mark.parametrize(
    ("t", "x", "field"),
    [
        (293.15, 0.05, "fluid.concentration"),
        (293.15, 0.65, "fluid.concentration"),  # CoolProp's own MEG/MPG range ends at 60 %
        (373.5, 0.3, "fluid.temperature"),  # CoolProp's MEG/MPG range ends at 100 °C
        (float("nan"), 0.3, "fluid.temperature"),
    ],
)
def test_glycol_refuses_outside_the_table(t: float, x: float, field: str) -> None:
    with pytest.raises(InputError) as err:
        glycol("ethylene-glycol", t, x)
    assert err.value.field == field


def test_glycol_names_read_well() -> None:
    fluid = glycol("propylene-glycol", 278.15, 0.3)
    assert fluid.name == "Propylene glycol 30 % by mass at 5.0 °C"
    assert fluid.kind == "propylene-glycol"
    assert "INCOMP::MPG" in fluid.source
    eg = glycol("ethylene-glycol", 263.15, 0.325)
    assert eg.name == "Ethylene glycol 32.5 % by mass at -10.0 °C"


@pytest.mark.parametrize("kind", CODES)
def test_shipped_table_holds_coolprop_values(kind: str) -> None:
    """Every node of presets/fluids/<kind>.toml is CoolProp's value (10 significant digits)."""
    text = resources.files("branchwise.presets").joinpath("fluids", f"{kind}.toml").read_text()
    table = tomllib.loads(text)
    for x, tf in zip(
        table["freezing_point"]["mass_fraction"],
        table["freezing_point"]["temperature_k"],
        strict=True,
    ):
        assert tf == pytest.approx(coolprop_freezing_k(kind, x), rel=1e-9)
    for row in table["row"]:
        x = row["mass_fraction"]
        nodes = zip(row["temperature_k"], row["density_kg_m3"], row["viscosity_pa_s"], strict=True)
        for t, rho, mu in nodes:
            t = max(t, coolprop_freezing_k(kind, x))  # 10 digits may round just below freezing
            assert rho == pytest.approx(coolprop("D", kind, t, x), rel=1e-8)
            assert mu == pytest.approx(coolprop("V", kind, t, x), rel=1e-8)


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_spline_matches_scipy_not_a_knot(seed: int) -> None:
    rng = np.random.default_rng(seed)
    knots = np.cumsum(rng.uniform(0.2, 1.0, 12))
    values = rng.normal(size=(12, 3))
    reference = CubicSpline(knots, values, bc_type="not-a-knot")  # reference: scipy
    curvature = _spline.second_derivatives(knots, values)
    for x in np.linspace(knots[0], knots[-1], 41):
        got = _spline.evaluate(knots, values, curvature, x)
        np.testing.assert_allclose(got, reference(x), rtol=1e-10, atol=1e-12)
