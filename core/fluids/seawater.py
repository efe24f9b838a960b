"""Seawater: Sharqawy, Lienhard & Zubair (2010) density and viscosity correlations.

Source: M. H. Sharqawy, J. H. Lienhard V, S. M. Zubair, "Thermophysical properties of seawater:
a review of existing correlations and data", Desalination and Water Treatment 16 (2010)
354–380, doi:10.5004/dwt.2010.1079. Density: eq. (8), valid 0–180 °C and 0–0.16 kg/kg,
accuracy ±0.1 %. Viscosity: eqs. (22)–(23), valid 0–180 °C and 0–0.15 kg/kg, accuracy ±1.5 %.
The coefficients are the full-precision ones the authors distribute with their MIT seawater
property library (SW_Density, SW_Viscosity); the paper prints them rounded.

Both correlations are for 0.1 MPa (at saturation pressure above 100 °C). The pressure given here
is used only to refuse boiling states. Compression raises the density of seawater by about
0.045 % per MPa (from memory — verify), which this model leaves out; pressures are therefore
accepted up to 2.5 MPa, where that error stays near the correlation's own ±0.1 %.
"""

from __future__ import annotations

from ..errors import InputError
from ..messages import temperature_text
from ..model import Fluid, finite
from ._format import celsius, state
from .water import STANDARD_ATMOSPHERE_PA, boiling_error, liquid_range_k

T_MIN_K = 273.15
T_MAX_K = 453.15
PRESSURE_MAX_PA = 2.5e6
"""Pa; above it the neglected compressibility would exceed the density correlation's ±0.1 %."""
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


def seawater(
    temperature_k: float, salinity_kg_kg: float, pressure_pa: float = STANDARD_ATMOSPHERE_PA
) -> Fluid:
    """Seawater at ``temperature_k`` (K), ``salinity_kg_kg`` (kg/kg) and ``pressure_pa`` (Pa).

    Refuses salinity outside 0–0.15 kg/kg (``fluid.salinity``) and temperatures outside the
    correlations' 0–180 °C or at/above pure water's boiling point at that pressure
    (``fluid.temperature``; the dissolved salts raise it by well under 1 K, so this is the safe
    side), and pressures outside 611.657 Pa–2.5 MPa (``fluid.pressure``).
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
            f"{pressure_pa:g} Pa",
            f"must be at most {PRESSURE_MAX_PA / 1e6:g} MPa for seawater (the density model "
            "is for low pressure)",
        )
    if t >= boiling_k:
        raise boiling_error(t, boiling_k, float(pressure_pa), "seawater")
    return Fluid(
        name=f"Seawater {s * 1e3:.4g} g/kg at {celsius(t)} °C",
        density=density_sharqawy(t, s),
        viscosity=viscosity_sharqawy(t, s),
        kind="seawater",
        temperature=t,
        source="Sharqawy, Lienhard & Zubair (2010)",
    )
