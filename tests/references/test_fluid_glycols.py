"""Glycol solutions by mass against CoolProp (INCOMP::MEG, INCOMP::MPG) between the table nodes.

The shipped tables hold CoolProp's values at their nodes, so the checks here are at
concentrations off the 5 % rows and at temperatures off every row's nodes: they measure the
interpolation, not the copying. The spline itself is checked against scipy's CubicSpline.
Every bound is set just above the worst error measured over a sweep of 251 fractions × 110
temperatures (13 of them within 3 K of the freezing point); the volume-based tables are
checked in test_glycol_volume.py.
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
from branchwise.core.fluids.glycol import GlycolKind, freezing_point_k, glycol

ATM = 101325.0
CODES: dict[GlycolKind, str] = {"ethylene-glycol": "MEG", "propylene-glycol": "MPG"}
# Worst relative error measured (see the docstring), and the bound just above it:
#   ethylene glycol (MEG): density 4.2e-6 (11.8 %, 100 °C), viscosity 5.7e-4 (58.2 %, −48.2 °C);
#   propylene glycol (MPG): density 1.15e-5 and viscosity 1.06e-3 (58.2 %, −46.2 °C), both
#   within a few kelvin of the freezing point, where viscosity climbs fastest.
BOUNDS: dict[GlycolKind, tuple[float, float]] = {
    "ethylene-glycol": (5e-6, 6e-4),
    "propylene-glycol": (1.2e-5, 1.1e-3),
}
OFF_GRID_FRACTIONS = [0.105, 0.1675, 0.235, 0.3333, 0.415, 0.4875, 0.555, 0.595]
# Kelvin above the mixture's freezing point: close to it (where viscosity climbs fastest) and
# spread to 99.3 °C; none coincides with a table node (each row has its own node temperatures).
ABOVE_FREEZING_K = [0.05, 0.7, 3.3, 11.9, 27.4, 48.1, 77.7]


def coolprop(output: str, kind: GlycolKind, t: float, x: float) -> float:
    return PropsSI(output, "T", t, "P", ATM, f"INCOMP::{CODES[kind]}[{x}]")


def coolprop_freezing_k(kind: GlycolKind, x: float) -> float:
    return coolprop("T_freeze", kind, 300.0, x)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", OFF_GRID_FRACTIONS)
def test_glycol_matches_coolprop_between_nodes(kind: GlycolKind, x: float) -> None:
    t_freeze = coolprop_freezing_k(kind, x)
    rho_bound, mu_bound = BOUNDS[kind]
    for t in [t_freeze + dt for dt in ABOVE_FREEZING_K] + [372.45]:
        fluid = glycol(kind, t, x)
        # Reference: CoolProp INCOMP::MEG / INCOMP::MPG; bounds as measured (BOUNDS).
        assert fluid.density == pytest.approx(coolprop("D", kind, t, x), rel=rho_bound)
        assert fluid.viscosity == pytest.approx(coolprop("V", kind, t, x), rel=mu_bound)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", [0.1, 0.123, 0.2468, 0.3333, 0.5051, 0.6])
def test_freezing_point_matches_coolprop(kind: GlycolKind, x: float) -> None:
    # Reference: CoolProp's T_freeze of the same solution; tabulated every 1 %. Worst measured
    # over 251 fractions: 3.2e-6 K (MPG, 10.4 %); bound 4e-6 K.
    assert freezing_point_k(kind, x) == pytest.approx(coolprop_freezing_k(kind, x), abs=4e-6)


@pytest.mark.parametrize("kind", CODES)
@pytest.mark.parametrize("x", [0.15, 0.3333, 0.52])
def test_glycol_refuses_points_below_freezing(kind: GlycolKind, x: float) -> None:
    t_freeze = coolprop_freezing_k(kind, x)  # reference: CoolProp T_freeze
    with pytest.raises(InputError) as err:
        glycol(kind, t_freeze - 0.05, x)
    assert err.value.field == "fluid.temperature"
    said = re.search(r"by mass freezes at (-?[\d.]+) °C", str(err.value))
    # The message gives 0.01 °C: half of it, plus the 4e-6 K of the table.
    assert said is not None and float(said.group(1)) == pytest.approx(t_freeze - 273.15,
                                                                      abs=0.0051)
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


SHIPPED = [  # (file, kind, basis, CoolProp data set)
    ("ethylene-glycol.toml", "ethylene-glycol", "mass", "MEG"),
    ("propylene-glycol.toml", "propylene-glycol", "mass", "MPG"),
    ("ethylene-glycol-volume.toml", "ethylene-glycol", "volume", "AEG"),
    ("propylene-glycol-volume.toml", "propylene-glycol", "volume", "APG"),
]


@pytest.mark.parametrize(("name", "kind", "basis", "code"), SHIPPED)
def test_shipped_table_holds_coolprop_values(name: str, kind: str, basis: str, code: str) -> None:
    """Every node of presets/fluids/<name> is CoolProp's value, written to 10 significant digits.

    Bounds: measured worst 2.1e-10 (freezing points), 5.2e-10 (density) and 5.2e-9 (viscosity):
    half a unit in the 10th digit is 5e-10, and the node temperature is itself rounded to 10
    digits, which moves the steep viscosity a little more. Bounds 2.5e-10, 6e-10 and 6e-9.
    """
    text = resources.files("branchwise.presets").joinpath("fluids", name).read_text()
    table = tomllib.loads(text)
    assert (table["kind"], table["basis"]) == (kind, basis)
    assert table["source"].endswith(f"INCOMP::{code}")  # the source is named in the file
    key = f"{basis}_fraction"

    def reference(output: str, t: float, x: float) -> float:
        return PropsSI(output, "T", t, "P", ATM, f"INCOMP::{code}[{x}]")  # CoolProp

    for x, tf in zip(table["freezing_point"][key], table["freezing_point"]["temperature_k"],
                     strict=True):
        assert tf == pytest.approx(reference("T_freeze", 300.0, x), rel=2.5e-10)
    bottom = table["temperature_bottom_k"]
    for row in table["row"]:
        x = row[key]
        lowest = max(reference("T_freeze", 300.0, x), bottom)
        nodes = zip(row["temperature_k"], row["density_kg_m3"], row["viscosity_pa_s"], strict=True)
        for t, rho, mu in nodes:
            t = max(t, lowest)  # 10 digits may round just below the lowest state
            assert rho == pytest.approx(reference("D", t, x), rel=6e-10)
            assert mu == pytest.approx(reference("V", t, x), rel=6e-9)


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_spline_matches_scipy_not_a_knot(seed: int) -> None:
    rng = np.random.default_rng(seed)
    knots = np.cumsum(rng.uniform(0.2, 1.0, 12))
    values = rng.normal(size=(12, 3))
    reference = CubicSpline(knots, values, bc_type="not-a-knot")  # reference: scipy
    curvature = _spline.second_derivatives(knots, values)
    for x in np.linspace(knots[0], knots[-1], 41):
        got = _spline.evaluate(knots, values, curvature, x)
        # Measured worst 1.8e-15 on values of order 1 (round-off of the 12-knot solve).
        np.testing.assert_allclose(got, reference(x), rtol=0, atol=1e-14)
