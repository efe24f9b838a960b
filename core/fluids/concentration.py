"""A glycol concentration as the trade writes it: by mass (the default) or by volume.

Suppliers and test kits quote glycol either way ("30 % by volume" on a drum, a refractometer in
mass %). The tables are by mass, so a volume figure is converted with the densities of the pure
liquids at 20 °C, the usual basis of such figures (volumes measured before mixing):

    w = φ ρ_g / (φ ρ_g + (1 − φ) ρ_w)

Mixing shrinks the volume a little, which this ignores; the result stays within the scatter
between the published mass-based and volume-based property sets (checked in the tests against
CoolProp's INCOMP::AEG / INCOMP::APG, which are by volume).
"""

from __future__ import annotations

import re

from ..errors import InputError, describe

PURE_DENSITY_20C = {"ethylene-glycol": 1113.2, "propylene-glycol": 1036.1}
"""kg/m³ of the pure glycols at 20 °C (CRC Handbook of Chemistry and Physics values, from memory:
1.1132 and 1.0361 g/cm³)."""
WATER_DENSITY_20C = 998.21
"""kg/m³, water at 20 °C and 1 atm (IAPWS-IF97; the ``iapws`` package gives 998.21)."""

_BASIS = re.compile(
    r"\s*(?:(?P<vol>%?\s*(?:vol(?:ume)?\.?|v/v|by\s+vol(?:ume)?))|(?P<mass>%?\s*(?:mass|wt\.?|weight|"
    r"w/w|by\s+(?:mass|weight))))\s*%?\s*\Z", re.IGNORECASE)


def split_basis(text: str) -> tuple[str, str]:
    """(``text`` without a basis word, ``"volume"`` or ``"mass"``): ``"30 % vol"`` → ``("30 %",
    "volume")``; ``"30 %"`` → ``("30 %", "mass")``. Words: vol, volume, v/v, by volume, mass, wt,
    weight, w/w, by mass, before or after the percent sign (``30 vol%``, ``30 %v/v``)."""
    m = _BASIS.search(text)
    if m is None or m.start() == 0:
        return text, "mass"
    rest = text[: m.start()].rstrip()
    if not rest.endswith("%") and "%" in m.group(0):
        rest += " %"
    return rest, "volume" if m.group("vol") else "mass"


def mass_fraction_from_volume(kind: str, volume_fraction: float, field: str = "fluid.concentration"
                              ) -> float:
    """The mass fraction (kg/kg) of a glycol–water solution given as a volume fraction (m³/m³)
    of the pure liquids at 20 °C before mixing."""
    if kind not in PURE_DENSITY_20C:
        raise InputError(field, describe(kind), "a volume fraction is read only for a glycol")
    if not 0 <= volume_fraction <= 1:
        raise InputError(field, f"{volume_fraction * 100:g} % by volume", "must be 0 to 100 %")
    glycol = volume_fraction * PURE_DENSITY_20C[kind]
    return glycol / (glycol + (1 - volume_fraction) * WATER_DENSITY_20C)
