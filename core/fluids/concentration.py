"""A glycol concentration as the trade writes it: by mass (the default) or by volume.

Suppliers and test kits quote glycol either way ("30 % by volume" on a drum, a refractometer in
mass %). Each basis is read from its own data set (:mod:`.glycol`: CoolProp's INCOMP::MEG /
MPG by mass, INCOMP::AEG / APG by volume), never converted from the other: a conversion through
the pure liquids' densities ignores the volume lost on mixing and carries one data set's
properties over to another's (up to 36 % in viscosity near freezing).
"""

from __future__ import annotations

import re

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

