"""Water, seawater and custom fluids against outside references.

References: the `iapws` package (IAPWS-95 density, IAPWS 2008 viscosity), CoolProp's
incompressible INCOMP::MITSW (seawater), and the verification tables printed in the IAPWS
releases themselves (IF97 Tables 5 and 35, R12-08 Table 4).
"""

from __future__ import annotations

import iapws
import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI
from iapws._iapws import _Melting_Pressure as iapws_melting_pressure
from iapws._iapws import _Viscosity as iapws_viscosity
from iapws.iapws97 import _TSat_P as tsat_if97
from scipy.optimize import brentq

from branchwise.core.errors import InputError
from branchwise.core.fluids import FLUID_KINDS, fluid_from_spec
from branchwise.core.fluids.custom import custom
from branchwise.core.fluids.seawater import seawater
from branchwise.core.fluids.water import (
    density_if97,
    saturation_temperature_if97,
    viscosity_iapws2008,
    water,
)

ATM = 101325.0

# ---- water --------------------------------------------------------------------------------


@pytest.mark.parametrize("t_celsius", np.arange(1.0, 100.0, 2.0))
def test_water_matches_iapws95_at_one_atmosphere(t_celsius: float) -> None:
    t = 273.15 + t_celsius
    fluid = water(t)
    ref = iapws.IAPWS95(T=t, P=ATM / 1e6)  # reference: iapws package, IAPWS-95 + R12-08
    # IF97 region 1 is a fit to IAPWS-95, and μ takes its density from it: measured worst
    # 1.53e-5 (density) and 2.18e-5 (viscosity) over 1–99 °C; bounds just above.
    assert fluid.density == pytest.approx(ref.rho, rel=1.6e-5)
    assert fluid.viscosity == pytest.approx(ref.mu, rel=2.2e-5)


@pytest.mark.parametrize(
    ("t", "p"),
    [(423.15, 1e6), (523.15, 5e6), (293.15, 50e6), (573.15, 10e6), (613.15, 30e6)],
)
def test_pressurised_water_matches_iapws95(t: float, p: float) -> None:
    fluid = water(t, p)
    ref = iapws.IAPWS95(T=t, P=p / 1e6)  # reference: iapws package
    # As at 1 atm (IF97 against IAPWS-95): measured worst 1.74e-5 and 2.25e-5, both at
    # 340 °C and 30 MPa, near the top of region 1; bounds just above.
    assert fluid.density == pytest.approx(ref.rho, rel=1.8e-5)
    assert fluid.viscosity == pytest.approx(ref.mu, rel=2.3e-5)


def test_water_check_value_at_20_celsius() -> None:
    fluid = water(293.15)
    # Field notes (values from the iapws package): 998.21 kg/m³, 1.0016 mPa·s at 20 °C, 1 atm.
    # Bounds: half a unit in the last digit quoted (measured 998.2061 and 1.00160 mPa·s).
    assert fluid.density == pytest.approx(998.21, abs=0.005)
    assert fluid.viscosity == pytest.approx(1.0016e-3, abs=0.00005e-3)
    assert fluid.name == "Water at 20.0 °C"
    assert fluid.kind == "water"


@pytest.mark.parametrize(
    ("t", "p", "v"),
    [(300.0, 3e6, 0.100215168e-2), (300.0, 80e6, 0.971180894e-3), (500.0, 3e6, 0.120241800e-2)],
)
def test_region1_verification_values(t: float, p: float, v: float) -> None:
    # IAPWS-IF97 Table 5: specific volume for computer-program verification (9 digits, so half
    # a unit in the last is up to 5e-9 of the value; measured worst 2.8e-9).
    assert 1.0 / density_if97(t, p) == pytest.approx(v, rel=5e-9)


@pytest.mark.parametrize(("p", "ts"), [(0.1e6, 372.755919), (1e6, 453.035632), (10e6, 584.149488)])
def test_saturation_temperature_verification_values(p: float, ts: float) -> None:
    # IAPWS-IF97 Table 35: saturation temperature for computer-program verification.
    assert saturation_temperature_if97(p) == pytest.approx(ts, abs=5e-7)  # half the last digit


@pytest.mark.parametrize(
    ("t", "rho", "mu_micro"),
    [(298.15, 998.0, 889.735100), (298.15, 1200.0, 1437.649467), (373.15, 1000.0, 307.883622),
     (433.15, 1000.0, 217.685358), (873.15, 600.0, 77.430195)],
)  # fmt: skip
def test_viscosity_verification_values(t: float, rho: float, mu_micro: float) -> None:
    # IAPWS R12-08 Table 4 (μ2 = 1), μPa·s; values from memory, cross-checked with iapws below.
    # Half a unit in the table's 6th decimal (measured worst 2.3e-7 μPa·s, at 873.15 K).
    assert viscosity_iapws2008(t, rho) * 1e6 == pytest.approx(mu_micro, abs=5e-7)
    # The same formula in iapws: measured 2.2e-16, round-off; bound 1e-15.
    assert viscosity_iapws2008(t, rho) == pytest.approx(iapws_viscosity(rho, t), rel=1e-15)


@pytest.mark.parametrize(
    ("t", "p", "limit"),
    [
        (373.15, ATM, "boils at 99.97 °C"),  # IF97: T_sat(101325 Pa) = 373.124 K
        (400.0, 2e5, "boils at 120.21 °C"),  # IF97: T_sat(0.2 MPa) = 393.361 K
        # 0 °C: the freezing point at 1 atm (IAPWS R14-08, checked below) and IF97's lower end.
        (273.14, ATM, "must be at least 0 °C (water freezes at 0 °C at atmospheric pressure"),
        (268.15, 5e6, "must be at least 0 °C (water freezes at 0 °C at atmospheric pressure"),
    ],
)
def test_water_refuses_ice_and_steam(t: float, p: float, limit: str) -> None:
    with pytest.raises(InputError) as err:
        water(t, p)
    assert err.value.field == "fluid.temperature"
    assert limit in str(err.value)
    # The reference for the boiling point: iapws' own IF97 saturation line.
    if "boils" in limit:
        assert tsat_if97(p / 1e6) <= t


def test_water_freezing_limit_is_0_celsius_at_one_atmosphere() -> None:
    # Reference: the IAPWS R14-08 melting line of ice Ih in the iapws package. At 101.325 kPa
    # ice melts at 273.1525 K, 0.0025 K above 0 °C: "0 °C" to the 0.01 °C a message shows.
    melting_k = brentq(lambda t: iapws_melting_pressure(t) - ATM / 1e6, 252.0, 273.16)
    assert melting_k - 273.15 == pytest.approx(0.0025, abs=0.00005)  # measured 0.0025191
    assert water(273.15).name == "Water at 0.0 °C"
    with pytest.raises(InputError) as err:
        water(273.15 - 1e-6)
    assert err.value.field == "fluid.temperature"
    # Under pressure the melting point falls (iapws: 272.40 K at 10 MPa): 0 °C stays the limit
    # there because IAPWS-IF97 region 1 starts at 273.15 K, which the message also says.
    assert brentq(lambda t: iapws_melting_pressure(t) - 10.0, 252.0, 273.16) < 273.15
    assert "IAPWS-IF97 starts there" in str(err.value)


def test_water_accepts_the_edges_of_the_liquid_range() -> None:
    for t in (273.15, tsat_if97(ATM / 1e6) - 0.01):  # 0 °C; just below boiling (iapws)
        ref = iapws.IAPWS95(T=t, P=ATM / 1e6)  # reference: iapws package
        # Bounds as at 1 atm above (measured here 5.5e-6 and 1.1e-5, just below boiling).
        assert water(t).density == pytest.approx(ref.rho, rel=1.6e-5)
        assert water(t).viscosity == pytest.approx(ref.mu, rel=2.2e-5)
    assert water(393.15, 2e5).name == "Water at 120.0 °C, 200 kPa"


@pytest.mark.parametrize("p", [100.0, 2e8, float("nan")])
def test_water_refuses_pressures_outside_region_1(p: float) -> None:
    with pytest.raises(InputError) as err:
        water(293.15, p)
    assert err.value.field == "fluid.pressure"


# ---- seawater -----------------------------------------------------------------------------


@pytest.mark.parametrize("t_celsius", [0.5, 7.3, 15.0, 26.1, 38.8, 55.5, 71.2, 89.9, 99.5])
@pytest.mark.parametrize("s", [0.0, 0.01, 0.035, 0.062, 0.09, 0.12])
def test_seawater_matches_coolprop_mitsw(t_celsius: float, s: float) -> None:
    t = 273.15 + t_celsius
    fluid = seawater(t, s)
    ref = f"INCOMP::MITSW[{s}]"  # reference: CoolProp's fit of the MIT seawater properties
    # MITSW is CoolProp's polynomial fit of the same MIT correlations, so what differs is that
    # fit's error: measured worst over this grid 9.8e-5 in density (55.5 °C, 0 g/kg) and 0.89 %
    # in viscosity (15 °C, 62 g/kg), inside Sharqawy et al.'s stated ±0.1 % and ±1.5 %; bounds
    # just above.
    assert fluid.density == pytest.approx(PropsSI("D", "T", t, "P", ATM, ref), rel=1e-4)
    assert fluid.viscosity == pytest.approx(PropsSI("V", "T", t, "P", ATM, ref), rel=9e-3)


@pytest.mark.parametrize("t_celsius", [1.0, 20.0, 45.0, 80.0, 99.0])
def test_salt_free_seawater_is_water(t_celsius: float) -> None:
    t = 273.15 + t_celsius
    ref = iapws.IAPWS95(T=t, P=ATM / 1e6)  # reference: iapws package
    # Sharqawy et al. fit their pure-water terms to IAPWS data: measured worst 1.69e-4
    # (density) and 1.21e-3 (viscosity); bounds just above.
    assert seawater(t, 0.0).density == pytest.approx(ref.rho, rel=1.7e-4)
    assert seawater(t, 0.0).viscosity == pytest.approx(ref.mu, rel=1.25e-3)


def test_seawater_name_and_kind() -> None:
    fluid = seawater(283.15, 0.035)
    assert fluid.name == "Seawater 35 g/kg at 10.0 °C"
    assert fluid.kind == "seawater"
    assert fluid.source == "Sharqawy, Lienhard & Zubair (2010); pressure: Nayar et al. (2016)"


@pytest.mark.parametrize(
    ("t", "s", "field", "text"),
    [
        (293.15, 0.16, "fluid.salinity", "150 g/kg"),  # Sharqawy et al. 2010 viscosity range
        (293.15, -0.001, "fluid.salinity", "between 0 and"),
        (272.15, 0.035, "fluid.temperature", "between 0 °C"),  # the correlations start at 0 °C
        (373.15, 0.035, "fluid.temperature", "boils at 99.97 °C"),  # IF97 saturation line
    ],
)
def test_seawater_refuses_outside_its_range(t: float, s: float, field: str, text: str) -> None:
    with pytest.raises(InputError) as err:
        seawater(t, s)
    assert err.value.field == field
    assert text in str(err.value)


def test_seawater_refuses_high_pressure() -> None:
    with pytest.raises(InputError) as err:
        seawater(293.15, 0.035, 12e6)  # viscosity has no pressure term: 10 MPa at most
    assert err.value.field == "fluid.pressure"
    assert seawater(393.15, 0.035, 2.5e5).name == "Seawater 35 g/kg at 120.0 °C, 250 kPa"


# ---- custom fluids and the spec entry point ----------------------------------------------


def test_custom_fluid_takes_either_viscosity() -> None:
    dynamic = custom("Hydraulic oil", 870.0, viscosity=0.0392)
    # ν = μ / ρ (definition of kinematic viscosity, ISO 80000-11).
    kinematic = custom("Hydraulic oil", 870.0, kinematic_viscosity=0.0392 / 870.0)
    assert kinematic.viscosity == pytest.approx(dynamic.viscosity, rel=1e-15)  # measured equal
    # 0.0392 / 870 = 45.0575e-6 m²/s, quoted to 4 digits: half a unit in the last.
    assert dynamic.kinematic_viscosity == pytest.approx(45.06e-6, abs=0.005e-6)
    assert (dynamic.kind, dynamic.name) == ("custom", "Hydraulic oil")


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"viscosity": 1e-3, "kinematic_viscosity": 1e-6}, "fluid.kinematic_viscosity"),
        ({}, "fluid.viscosity"),
        ({"viscosity": -1e-3}, "fluid.viscosity"),
        ({"kinematic_viscosity": 0.0}, "fluid.kinematic_viscosity"),
    ],
)
def test_custom_fluid_refuses_bad_viscosity(kwargs: dict[str, float], field: str) -> None:
    with pytest.raises(InputError) as err:
        custom("Oil", 870.0, **kwargs)
    assert err.value.field == field


def test_spec_builds_every_kind() -> None:
    assert set(FLUID_KINDS) == {
        "water",
        "seawater",
        "ethylene-glycol",
        "propylene-glycol",
        "custom",
    }
    assert fluid_from_spec("water", temperature_k=291.15) == water(291.15)
    assert fluid_from_spec("seawater", temperature_k=291.15, salinity_kg_kg=0.035) == seawater(
        291.15, 0.035
    )
    pg = fluid_from_spec("propylene-glycol", temperature_k=278.15, mass_fraction=0.3)
    assert pg.name == "Propylene glycol 30 % by mass at 5.0 °C"
    oil = fluid_from_spec("custom", density=850.0, kinematic_viscosity=4e-6)
    # μ = ν ρ = 4e-6 × 850 (definition); measured exact, bound round-off.
    assert (oil.name, oil.viscosity) == ("Custom fluid", pytest.approx(3.4e-3, rel=1e-15))


@pytest.mark.parametrize(
    ("kind", "kwargs", "field"),
    [
        ("water", {}, "fluid.temperature"),
        ("seawater", {"temperature_k": 290.0}, "fluid.salinity"),
        ("ethylene-glycol", {"temperature_k": 290.0}, "fluid.concentration"),
        ("custom", {"viscosity": 1e-3}, "fluid.density"),
        ("custom", {"density": 900.0}, "fluid.viscosity"),
        ("water", {"temperature_k": 290.0, "salinity_kg_kg": 0.03}, "fluid.salinity"),
        ("propylene-glycol", {"temperature_k": 290.0, "mass_fraction": 0.3, "pressure_pa": 2e5},
         "fluid.pressure"),
        ("seawater", {"temperature_k": 290.0, "salinity_kg_kg": 0.03, "density": 1000.0},
         "fluid.density"),
        ("custom", {"density": 900.0, "viscosity": 1e-3, "temperature_k": 290.0},
         "fluid.temperature"),
        ("brine", {"temperature_k": 290.0}, "fluid.kind"),
    ],
)  # fmt: skip
def test_spec_names_the_missing_or_unused_field(
    kind: str, kwargs: dict[str, float], field: str
) -> None:
    with pytest.raises(InputError) as err:
        fluid_from_spec(kind, **kwargs)
    assert err.value.field == field
