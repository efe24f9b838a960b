"""Liquid water: IAPWS-IF97 region 1 density, IAPWS 2008 viscosity, IF97 saturation line.

Sources:
- IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial Formulation 1997 for the
  Thermodynamic Properties of Water and Steam" (IAPWS-IF97): region 1 (eq. 7, Table 2, and
  v = (R T / p) π γ_π from Table 3); region 4 saturation temperature (eq. 31, Table 34).
- IAPWS R12-08, "Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water
  Substance": μ = μ0(T) μ1(T, ρ) μ2(T, ρ) (eqs. 10–12 with Tables 1 and 2). The critical
  enhancement μ2 is taken as 1: R12-08 shows it differs noticeably from 1 only close to the
  critical point (647.096 K, 322 kg/m³), far outside the liquid range accepted here, and gives
  μ2 = 1 as its recommendation for industrial use, where an IF97 density may replace the
  IAPWS-95 one, as done here.

Range accepted: 0 °C (273.15 K) up to, not including, the boiling point at the stated pressure,
and never above 350 °C (623.15 K, the top of IF97 region 1); pressure from the triple-point
pressure (611.657 Pa) to 100 MPa (the top of region 1). 0 °C is where water freezes at
atmospheric pressure and where IF97 region 1 begins, at every pressure. The melting line of ice
(IAPWS R14-08, checked against the ``iapws`` package in the tests) puts the melting point at
273.1525 K at 101.325 kPa, 0.0025 K above 0 °C, rising to 273.16 K at the triple-point
pressure; it falls with pressure (272.40 K at 10 MPa), so above about 1.35 bar some liquid
states below 0 °C exist that IF97 does not cover and are refused as outside the model.
"""

from __future__ import annotations

import math

from ..errors import InputError, PhaseLimit
from ..messages import pressure_text, temperature_text
from ..model import Fluid, finite
from ._format import at_pressure, celsius, state

R_WATER = 461.526
"""Specific gas constant of water, J/(kg·K) (IAPWS-IF97, eq. 1)."""

TRIPLE_POINT_K = 273.16
TRIPLE_POINT_PA = 611.657
FREEZING_K = 273.15
"""K; the lowest temperature accepted: 0 °C, water's freezing point at atmospheric pressure and
the lower end of IAPWS-IF97 region 1 (see the module docstring for the melting line)."""
CRITICAL_PA = 22.064e6
REGION1_MAX_K = 623.15
REGION1_MAX_PA = 100e6
STANDARD_ATMOSPHERE_PA = 101325.0
"""Pa; the pressure a liquid is taken at when none is given (the standard atmosphere, ISO 2533)."""

# fmt: off
# IAPWS-IF97 Table 2: exponents I, J and coefficients n of the region-1 Gibbs free energy.
_I1 = (0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3,
       4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32)
_J1 = (-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6,
       -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41)
_N1 = (
    0.14632971213167, -0.84548187169114, -0.37563603672040e1, 0.33855169168385e1,
    -0.95791963387872, 0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3,
    0.28319080123804e-3, -0.60706301565874e-3, -0.18990068218419e-1, -0.32529748770505e-1,
    -0.21841717175414e-1, -0.52838357969930e-4, -0.47184321073267e-3, -0.30001780793026e-3,
    0.47661393906987e-4, -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
    -0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908000e-5, -0.65171222895601e-6,
    -0.14341729937924e-12, -0.40516996860117e-6, -0.12734301741641e-8, -0.17424871230634e-9,
    -0.68762131295531e-18, 0.14478307828521e-19, 0.26335781662795e-22, -0.11947622640071e-22,
    0.18228094581404e-23, -0.93537087292458e-25,
)

# IAPWS-IF97 Table 34: coefficients n1…n10 of the saturation-pressure equation.
_N4 = (
    0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
    -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
    -0.23855557567849, 0.65017534844798e3,
)

# IAPWS R12-08 reference constants and Tables 1 and 2.
_T_REF = 647.096  # K
_RHO_REF = 322.0  # kg/m³
_MU_REF = 1.0e-6  # Pa·s
_H0 = (1.67752, 2.20462, 0.6366564, -0.241605)
_H1 = (  # (i, j, H_ij)
    (0, 0, 5.20094e-1), (1, 0, 8.50895e-2), (2, 0, -1.08374), (3, 0, -2.89555e-1),
    (0, 1, 2.22531e-1), (1, 1, 9.99115e-1), (2, 1, 1.88797), (3, 1, 1.26613),
    (5, 1, 1.20573e-1), (0, 2, -2.81378e-1), (1, 2, -9.06851e-1), (2, 2, -7.72479e-1),
    (3, 2, -4.89837e-1), (4, 2, -2.57040e-1), (0, 3, 1.61913e-1), (1, 3, 2.57399e-1),
    (0, 4, -3.25372e-2), (3, 4, 6.98452e-2), (4, 5, 8.72102e-3), (3, 6, -4.35673e-3),
    (5, 6, -5.93264e-4),
)
# fmt: on


def density_if97(temperature_k: float, pressure_pa: float) -> float:
    """Density of liquid water, kg/m³, from the IAPWS-IF97 region-1 Gibbs equation.

    temperature_k: K (273.15–623.15); pressure_pa: Pa (from saturation to 100 MPa).
    Uses v = (R T / p) · π · γ_π with π = p / 16.53 MPa, τ = 1386 K / T (IF97 eq. 7, Table 3).
    """
    pi = pressure_pa / 16.53e6
    tau = 1386.0 / temperature_k
    gamma_pi = sum(
        -n * i * (7.1 - pi) ** (i - 1) * (tau - 1.222) ** j
        for i, j, n in zip(_I1, _J1, _N1, strict=True)
    )
    return pressure_pa / (R_WATER * temperature_k * pi * gamma_pi)


def saturation_temperature_if97(pressure_pa: float) -> float:
    """Saturation (boiling) temperature of water, K, at ``pressure_pa`` (Pa).

    IAPWS-IF97 region 4, eq. 31 (the backward equation); valid from 611.213 Pa to 22.064 MPa.
    """
    n = _N4
    beta = math.sqrt(math.sqrt(pressure_pa / 1e6))
    e = beta**2 + n[2] * beta + n[5]
    f = n[0] * beta**2 + n[3] * beta + n[6]
    g = n[1] * beta**2 + n[4] * beta + n[7]
    d = 2.0 * g / (-f - math.sqrt(f * f - 4.0 * e * g))
    return (n[9] + d - math.sqrt((n[9] + d) ** 2 - 4.0 * (n[8] + n[9] * d))) / 2.0


def saturation_pressure_if97(temperature_k: float) -> float:
    """Saturation (vapour) pressure of water, Pa, at ``temperature_k`` (K).

    IAPWS-IF97 region 4, eq. 30 (Table 34 coefficients); valid from 273.15 K to 647.096 K.
    """
    n = _N4
    theta = temperature_k + n[8] / (temperature_k - n[9])
    a = theta**2 + n[0] * theta + n[1]
    b = n[2] * theta**2 + n[3] * theta + n[4]
    c = n[5] * theta**2 + n[6] * theta + n[7]
    return 1e6 * (2.0 * c / (-b + math.sqrt(b * b - 4.0 * a * c))) ** 4


def viscosity_iapws2008(temperature_k: float, density: float) -> float:
    """Dynamic viscosity of water, Pa·s, IAPWS R12-08 with μ2 = 1 (see the module docstring).

    temperature_k: K; density: kg/m³. μ0 (dilute gas, eq. 11) times μ1 (residual, eq. 12).
    """
    t = temperature_k / _T_REF
    rho = density / _RHO_REF
    mu0 = 100.0 * math.sqrt(t) / sum(h / t**i for i, h in enumerate(_H0))
    x, y = 1.0 / t - 1.0, rho - 1.0
    mu1 = math.exp(rho * sum(h * x**i * y**j for i, j, h in _H1))
    return _MU_REF * mu0 * mu1


def liquid_range_k(pressure_pa: float) -> tuple[float, float]:
    """(lowest, highest-excluded) temperature, K, at which water is liquid here at ``pressure_pa``.

    The lower end is 0 °C (:data:`FREEZING_K`) at every pressure; the upper end is the IF97
    saturation temperature (boiling), capped at 623.15 K where IF97 region 1 ends. Raises
    InputError on ``fluid.pressure`` outside 611.657 Pa–100 MPa.
    """
    p = finite("fluid.pressure", pressure_pa)
    if p < TRIPLE_POINT_PA:
        raise InputError(
            "fluid.pressure",
            pressure_text(p),
            f"water is not liquid below {TRIPLE_POINT_PA} Pa (the triple-point pressure)",
        )
    if p > REGION1_MAX_PA:
        raise InputError(
            "fluid.pressure", pressure_text(p), "must be at most 100 MPa (IAPWS-IF97 region 1)"
        )
    top = REGION1_MAX_K if p > CRITICAL_PA else min(saturation_temperature_if97(p), REGION1_MAX_K)
    return FREEZING_K, top


def boiling_error(temperature_k: float, top_k: float, pressure_pa: float, what: str) -> InputError:
    """The InputError for a temperature at or above ``top_k`` from :func:`liquid_range_k`."""
    if top_k >= REGION1_MAX_K:  # the model's range ends first (a pressure above boiling)
        return InputError("fluid.temperature", state(temperature_k),
                          f"must be below {temperature_text(top_k)} (the top of IAPWS-IF97 "
                          "region 1)")
    phase = f"{what} boils at {temperature_text(top_k)} at {pressure_text(pressure_pa)}"
    return PhaseLimit("fluid.temperature", state(temperature_k),
                      f"{phase} (IAPWS-IF97); only liquid is handled", phase)


def check_liquid(temperature_k: float, pressure_pa: float) -> float:
    """``temperature_k`` as a float, or an InputError on ``fluid.temperature`` naming the limit."""
    low, high = liquid_range_k(pressure_pa)
    t = finite("fluid.temperature", temperature_k)
    if t < low:
        phase = f"water freezes at {temperature_text(low)} at atmospheric pressure"
        raise PhaseLimit(
            "fluid.temperature",
            state(t),
            f"must be at least {temperature_text(low)} ({phase}; IAPWS-IF97 starts there)",
            phase,
        )
    if t >= high:
        raise boiling_error(t, high, pressure_pa, "water")
    return t


def water(temperature_k: float, pressure_pa: float = STANDARD_ATMOSPHERE_PA) -> Fluid:
    """Liquid water at ``temperature_k`` (K) and ``pressure_pa`` (Pa, default 1 atm).

    Density from IAPWS-IF97 region 1, viscosity from IAPWS 2008 (μ2 = 1). Refuses frozen or
    boiling states with an InputError on ``fluid.temperature`` that names the limit in °C.
    """
    t = check_liquid(temperature_k, pressure_pa)
    p = float(pressure_pa)
    rho = density_if97(t, p)
    name = f"Water at {celsius(t)} °C{at_pressure(p)}"
    return Fluid(
        name=name,
        density=rho,
        viscosity=viscosity_iapws2008(t, rho),
        kind="water",
        temperature=t,
        source="IAPWS-IF97 region 1 + IAPWS 2008 viscosity",
    )
