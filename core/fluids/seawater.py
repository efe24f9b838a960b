"""Seawater: Sharqawy, Lienhard & Zubair (2010) at low pressure, with the pressure correction of
density by Nayar, Sharqawy, Banchik & Lienhard (2016).

Sources:
- M. H. Sharqawy, J. H. Lienhard V, S. M. Zubair, "Thermophysical properties of seawater: a
  review of existing correlations and data", Desalination and Water Treatment 16 (2010)
  354–380, doi:10.5004/dwt.2010.1079. Density: eq. (8), valid 0–180 °C and 0–0.16 kg/kg,
  accuracy ±0.1 %. Viscosity: eqs. (22)–(23), valid 0–180 °C and 0–0.15 kg/kg, accuracy ±1.5 %.
  The coefficients are the full-precision ones the authors distribute with their MIT seawater
  property library (SW_Density, SW_Viscosity); the paper prints them rounded. Both are for
  0.1 MPa (at saturation pressure above 100 °C).
- K. G. Nayar, M. H. Sharqawy, L. D. Banchik, J. H. Lienhard V, "Thermophysical properties of
  seawater: A review and new correlations that include pressure dependence", Desalination 390
  (2016) 1–24, doi:10.1016/j.desal.2016.02.024. Density at pressure p is the low-pressure
  density times a factor F_P (:func:`pressure_factor`), fitted to the IAPWS 2008 seawater
  formulation for 0–180 °C, 0–150 g/kg and up to 12 MPa. Its coefficients are written here
  from memory; the tests check the factor against TEOS-10 (the ``gsw`` package) and, for
  salt-free water up to 180 °C, against IAPWS-95 (the ``iapws`` package): it agrees with both
  within 0.01 % where they apply.

The 2016 paper gives no pressure term for viscosity, so viscosity stays at its low-pressure
value. For pure water that leaves out at most 1.5 % at 10 MPa over 0–180 °C (IAPWS 2008,
measured with the ``iapws`` package), within the viscosity correlation's own ±1.5 %, so
pressures are accepted up to 10 MPa.
"""

from __future__ import annotations

import math

from ..errors import InputError
from ..messages import pressure_text, temperature_text
from ..model import Fluid, finite
from ._format import at_pressure, celsius, state
from .water import (
    STANDARD_ATMOSPHERE_PA,
    boiling_error,
    liquid_range_k,
    saturation_pressure_if97,
)

T_MIN_K = 273.15
T_MAX_K = 453.15
PRESSURE_MAX_PA = 10e6
"""Pa; above it the pressure effect on viscosity, which no term covers, could exceed the viscosity
correlation's ±1.5 % (see the module docstring). The density correction reaches 12 MPa."""
SOURCE = "Sharqawy, Lienhard & Zubair (2010); pressure: Nayar et al. (2016)"
SALINITY_MAX = 0.15
"""kg/kg; the viscosity correlation's upper limit (the density one reaches 0.16)."""

_A = (9.9992293295e2, 2.0341179217e-2, -6.1624591598e-3, 2.2614664708e-5, -4.6570659168e-8)
_B = (8.0200240891e2, -2.0005183488e0, 1.6771024982e-2, -3.0600536746e-5, -1.6132224742e-5)
_MU = (
    1.5700386464e-1,
    6.4992620050e1,
    -9.1296496657e1,
    4.2844324477e-5,
    1.5409136040e0,
    1.9981117208e-2,
    -9.5203865864e-5,
    7.9739318223e0,
    -7.5614568881e-2,
    4.7237011074e-4,
)
# Nayar et al. (2016), the pressure factor F_P: c1…c9 and d1…d4 (T in °C, S in g/kg, p in MPa).
# From memory; verified numerically by the tests (see the module docstring).
_C = (5.0792e-4, -3.4168e-6, 5.6931e-8, -3.7263e-10, 1.4465e-12, -1.7058e-15,
      -1.3389e-6, 4.8603e-9, -6.8039e-13)
_D = (-1.1077e-6, 5.5584e-9, -4.2539e-11, 8.3702e-9)


def density_sharqawy(temperature_k: float, salinity_kg_kg: float) -> float:
    """Seawater density, kg/m³, Sharqawy et al. (2010) eq. (8), at 0.1 MPa.

    temperature_k: K; salinity_kg_kg: kg of salts per kg of seawater.
    """
    t = temperature_k - 273.15
    s = salinity_kg_kg
    a, b = _A, _B
    pure = a[0] + a[1] * t + a[2] * t**2 + a[3] * t**3 + a[4] * t**4
    return pure + s * (b[0] + b[1] * t + b[2] * t**2 + b[3] * t**3) + b[4] * s**2 * t**2


def viscosity_sharqawy(temperature_k: float, salinity_kg_kg: float) -> float:
    """Seawater dynamic viscosity, Pa·s, Sharqawy et al. (2010) eqs. (22)–(23).

    μ_sw = μ_w (1 + A S + B S²), with μ_w a fit to IAPWS 2008 pure-water values.
    temperature_k: K; salinity_kg_kg: kg/kg.
    """
    t = temperature_k - 273.15
    s = salinity_kg_kg
    c = _MU
    mu_w = c[3] + 1.0 / (c[0] * (t + c[1]) ** 2 + c[2])
    a = c[4] + c[5] * t + c[6] * t**2
    b = c[7] + c[8] * t + c[9] * t**2
    return mu_w * (1.0 + a * s + b * s**2)


def reference_pressure_pa(temperature_k: float) -> float:
    """Pa; the pressure the low-pressure correlations are for: 0.101325 MPa up to 100 °C, the
    saturation pressure above (pure water's, IAPWS-IF97; the salts lower it by a few per cent,
    which moves the density by under 1e-5)."""
    if temperature_k <= 373.15:
        return STANDARD_ATMOSPHERE_PA
    return max(STANDARD_ATMOSPHERE_PA, saturation_pressure_if97(temperature_k))


def pressure_factor(temperature_k: float, salinity_kg_kg: float, pressure_pa: float) -> float:
    """ρ(T, S, p) / ρ(T, S, p0), Nayar et al. (2016): the factor F_P by which seawater at
    ``pressure_pa`` (Pa, absolute) is denser than at the correlations' p0
    (:func:`reference_pressure_pa`).

    F_P = exp[(p − p0)(c1 + c2 t + c3 t² + c4 t³ + c5 t⁴ + c6 t⁵ + S (d1 + d2 t + d3 t²))
              + ½ (p² − p0²)(c7 + c8 t + c9 t³ + d4 S)], with t in °C, S in g/kg, p in MPa.
    """
    t = temperature_k - 273.15
    s = salinity_kg_kg * 1e3
    p = pressure_pa / 1e6
    p0 = reference_pressure_pa(temperature_k) / 1e6
    c, d = _C, _D
    linear = (c[0] + c[1] * t + c[2] * t**2 + c[3] * t**3 + c[4] * t**4 + c[5] * t**5
              + s * (d[0] + d[1] * t + d[2] * t**2))
    quadratic = c[6] + c[7] * t + c[8] * t**3 + d[3] * s
    return math.exp((p - p0) * linear + 0.5 * (p * p - p0 * p0) * quadratic)


def density(temperature_k: float, salinity_kg_kg: float, pressure_pa: float) -> float:
    """Seawater density, kg/m³: Sharqawy et al. (2010) times Nayar et al.'s (2016) F_P."""
    return (density_sharqawy(temperature_k, salinity_kg_kg)
            * pressure_factor(temperature_k, salinity_kg_kg, pressure_pa))


def seawater(
    temperature_k: float, salinity_kg_kg: float, pressure_pa: float = STANDARD_ATMOSPHERE_PA
) -> Fluid:
    """Seawater at ``temperature_k`` (K), ``salinity_kg_kg`` (kg/kg) and ``pressure_pa`` (Pa).

    Refuses salinity outside 0–0.15 kg/kg (``fluid.salinity``) and temperatures outside the
    correlations' 0–180 °C or at/above pure water's boiling point at that pressure
    (``fluid.temperature``; the dissolved salts raise it by well under 1 K, so this is the safe
    side), and pressures outside 611.657 Pa–10 MPa (``fluid.pressure``). Density includes the
    pressure correction of Nayar et al. (2016); viscosity is the low-pressure value.
    """
    s = finite("fluid.salinity", salinity_kg_kg)
    if not 0.0 <= s <= SALINITY_MAX:
        raise InputError(
            "fluid.salinity",
            f"{s * 1e3:g} g/kg",
            f"must be between 0 and {SALINITY_MAX * 1e3:g} g/kg (range of Sharqawy et al. 2010)",
        )
    t = finite("fluid.temperature", temperature_k)
    if t < T_MIN_K or t > T_MAX_K:
        raise InputError(
            "fluid.temperature",
            state(t),
            f"must be between {temperature_text(T_MIN_K)} and {temperature_text(T_MAX_K)} "
            "(range of Sharqawy et al. 2010)",
        )
    _, boiling_k = liquid_range_k(pressure_pa)
    if pressure_pa > PRESSURE_MAX_PA:
        raise InputError(
            "fluid.pressure",
            pressure_text(pressure_pa),
            f"must be at most {PRESSURE_MAX_PA / 1e6:g} MPa for seawater (the viscosity "
            "correlation has no pressure term)",
        )
    p = float(pressure_pa)
    if t >= boiling_k:
        raise boiling_error(t, boiling_k, p, "seawater")
    return Fluid(
        name=f"Seawater {s * 1e3:.4g} g/kg at {celsius(t)} °C{at_pressure(p)}",
        density=density(t, s, p),
        viscosity=viscosity_sharqawy(t, s),
        kind="seawater",
        temperature=t,
        source=SOURCE,
    )
