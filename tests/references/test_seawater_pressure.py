"""Seawater under pressure: Nayar, Sharqawy, Banchik & Lienhard (2016) against TEOS-10 and IAPWS-95.

References:
- the ``gsw`` package (TEOS-10, the Gibbs SeaWater toolbox): in-situ density
  ``rho_t_exact(SA, t, p)`` with SA the absolute salinity in g/kg, t the in-situ temperature
  in °C and p the *sea* pressure in dbar (absolute pressure − 10.1325 dbar). Its saline part
  is accurate in the oceanographic range (0–42 g/kg, −2–40 °C), which is where it is used here.
- the ``iapws`` package: IAPWS-95 for salt-free water from 0.5 to 180 °C.

Nayar et al. state (from memory) that their pressure factor reproduces the IAPWS 2008
seawater formulation within about ±0.1 %; the bounds below are tighter, set just above what
was measured, so that a wrong coefficient shows.
"""

from __future__ import annotations

import gsw
import iapws
import pytest

from branchwise.core.errors import InputError
from branchwise.core.fluids import fluid_from_spec
from branchwise.core.fluids.seawater import (
    density_sharqawy,
    pressure_factor,
    reference_pressure_pa,
    seawater,
)
from branchwise.core.fluids.water import saturation_pressure_if97

ATM = 101325.0


def teos10_density(t_celsius: float, salinity_g_kg: float, pressure_pa: float) -> float:
    """gsw's in-situ density at an absolute pressure in Pa (sea pressure in dbar for gsw)."""
    return float(gsw.rho_t_exact(salinity_g_kg, t_celsius, (pressure_pa - ATM) / 1e4))


@pytest.mark.parametrize("pressure_mpa", [0.101325, 1.0, 2.5, 5.0, 10.0])
def test_density_at_20_celsius_35_g_kg(pressure_mpa: float) -> None:
    p = pressure_mpa * 1e6
    ours = seawater(293.15, 0.035, p).density
    # Reference: TEOS-10 (gsw). Measured 0.0264–0.0286 % at 0.1–10 MPa, nearly all of it the
    # low-pressure correlation's own (Sharqawy et al. 2010, stated ±0.1 %): bound 0.03 %.
    assert ours == pytest.approx(teos10_density(20.0, 35.0, p), rel=3e-4)


@pytest.mark.parametrize("t_celsius", [0.5, 5.0, 10.0, 20.0, 30.0, 40.0])
@pytest.mark.parametrize("salinity_g_kg", [0.0, 10.0, 20.0, 35.0, 42.0])
@pytest.mark.parametrize("pressure_mpa", [0.5, 1.0, 2.5, 5.0, 7.5, 10.0])
def test_pressure_factor_matches_teos10(t_celsius: float, salinity_g_kg: float,
                                        pressure_mpa: float) -> None:
    p = pressure_mpa * 1e6
    ours = pressure_factor(t_celsius + 273.15, salinity_g_kg / 1e3, p)
    # Reference: TEOS-10 (gsw), ρ(p) / ρ(1 atm) at the same T and S. Worst measured over this
    # grid 6.5e-5 (0.5 °C, 42 g/kg, 10 MPa); bound 7e-5. The compression itself is 0.02–0.5 %,
    # so a coefficient 1 % off in c1–c3 or d1 fails here.
    reference = (teos10_density(t_celsius, salinity_g_kg, p)
                 / teos10_density(t_celsius, salinity_g_kg, ATM))
    assert ours == pytest.approx(reference, rel=7e-5)
    # The whole density, absolute: worst measured 0.055 % (40 °C, 42 g/kg), the low-pressure
    # correlation's share (Sharqawy et al. 2010 state ±0.1 %); bound 0.06 %.
    fluid = seawater(t_celsius + 273.15, salinity_g_kg / 1e3, p)
    assert fluid.density == pytest.approx(teos10_density(t_celsius, salinity_g_kg, p), rel=6e-4)


# Water at 180 °C boils below 1.0028 MPa (IAPWS-IF97), so its lowest pressure here is 2.5 MPa.
PURE_WATER_STATES = [(t, p) for t in (0.5, 10.0, 20.0, 40.0, 60.0, 80.0, 99.0, 120.0, 150.0, 180.0)
                     for p in (0.5, 1.0, 2.5, 5.0, 10.0) if not (t == 180.0 and p <= 1.0)]


@pytest.mark.parametrize(("t_celsius", "pressure_mpa"), PURE_WATER_STATES)
def test_pressure_factor_of_pure_water_matches_iapws95(t_celsius: float,
                                                       pressure_mpa: float) -> None:
    t, p = t_celsius + 273.15, pressure_mpa * 1e6
    p0 = reference_pressure_pa(t)  # 1 atm up to 100 °C, the saturation pressure above
    # Reference: IAPWS-95 (iapws) at the same temperature, ρ(p) / ρ(p0). This checks the
    # salt-free terms c1–c9 over the correlation's whole 0–180 °C. Worst measured 8.9e-6
    # (180 °C, 10 MPa); bound 1e-5.
    reference = iapws.IAPWS95(T=t, P=p / 1e6).rho / iapws.IAPWS95(T=t, P=p0 / 1e6).rho
    assert pressure_factor(t, 0.0, p) == pytest.approx(reference, rel=1e-5)


def test_the_correction_is_the_one_the_issue_measured() -> None:
    # Without the correction seawater at 2.5 MPa was read as at 1 atm: 0.07 % light against
    # TEOS-10 (the factor itself is 1.00101, 0.1 %). With it, what is left is the low-pressure
    # correlation's own 0.028 % (see test_density_at_20_celsius_35_g_kg).
    reference = teos10_density(20.0, 35.0, 2.5e6)
    old = density_sharqawy(293.15, 0.035)
    new = seawater(293.15, 0.035, 2.5e6).density
    assert old / reference - 1 == pytest.approx(-7.3e-4, abs=0.2e-4)
    assert abs(new / reference - 1) < 3e-4
    assert pressure_factor(293.15, 0.035, 2.5e6) == pytest.approx(1.00101, abs=1e-5)


def test_reference_pressure_above_100_celsius_is_saturation() -> None:
    # IAPWS-IF97 Table 35 (verification values): p_sat(500 K) = 2.63889776 MPa.
    assert saturation_pressure_if97(500.0) == pytest.approx(2.63889776e6, rel=1e-8)
    assert saturation_pressure_if97(300.0) == pytest.approx(3.53658941e3, rel=1e-8)
    assert saturation_pressure_if97(600.0) == pytest.approx(12.3443146e6, rel=1e-8)
    assert reference_pressure_pa(353.15) == ATM
    assert reference_pressure_pa(453.15) == pytest.approx(saturation_pressure_if97(453.15))
    # At p0 the factor is 1: the correlations' own state.
    assert pressure_factor(453.15, 0.035, reference_pressure_pa(453.15)) == 1.0


def test_site_pressure_reaches_seawater() -> None:
    """The liquid's pressure (``fluid.pressure``) feeds the correction, as it does for water."""
    from branchwise.core.site.build import build_fluid
    from branchwise.core.site.read import parse_site

    site = parse_site('format = 1\n[fluid]\nkind = "seawater"\ntemperature = "20 degC"\n'
                      'salinity = "35 g/kg"\npressure = "5 MPa"\n')
    fluid = build_fluid(site)
    assert fluid.density == pytest.approx(teos10_density(20.0, 35.0, 5e6), rel=3e-4)  # gsw
    assert fluid.name == "Seawater 35 g/kg at 20.0 °C, 5000 kPa"
    assert fluid == fluid_from_spec("seawater", temperature_k=293.15, salinity_kg_kg=0.035,
                                    pressure_pa=5e6)


def test_seawater_refuses_pressure_beyond_the_viscosity_limit() -> None:
    # Viscosity has no pressure term (Nayar et al. 2016 give none); for pure water the effect
    # reaches 1.5 % at 10 MPa (IAPWS 2008, iapws: 180 °C), the viscosity correlation's own
    # ±1.5 % (Sharqawy et al. 2010); above 10 MPa it is refused.
    mu_1atm = iapws.IAPWS95(T=453.15, P=saturation_pressure_if97(453.15) / 1e6 * 1.0001).mu
    assert iapws.IAPWS95(T=453.15, P=10.0).mu / mu_1atm - 1 == pytest.approx(0.0149, abs=5e-4)
    assert seawater(293.15, 0.035, 10e6).viscosity == seawater(293.15, 0.035).viscosity
    with pytest.raises(InputError) as err:
        seawater(293.15, 0.035, 10.5e6)
    assert err.value.field == "fluid.pressure"
    assert "at most 10 MPa" in str(err.value)
