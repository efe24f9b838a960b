"""Trade spellings of units that pint misreads or refuses, and the unit each one means.

One small, explicit table. Two sorts of entry:

* :data:`UNIT_ALIASES`: a whole unit as written after the number (``cp``, ``ft hd``, ``US gpm``,
  ``kg/cm²``), turned into a unit pint reads. Some mean one thing only in one kind of field:
  ``cp`` is centipoise in a viscosity (pint reads it as a cup), ``Pas`` is Pa·s in a viscosity
  (pint reads it as pascals), ``ft hd`` is a foot of water column in a pressure and a foot of
  the liquid itself in a head.
* :data:`NAME_ALIASES`: a single unit name inside a longer unit (``mil`` in ``mil/yr``, ``″`` in
  any length), swapped wherever it appears.

A head written in a pressure field (``ft hd``, ``ft head``, ``feet of water``, ``m hd``) is a
column of water at the conventional density of NIST SP 811 — water at 39.2 °F (4 °C),
999.972 kg/m³, under standard gravity — as pint's and this program's ``ftH2O``/``mH2O``: not a
column of the liquid in the pipe (at 80 °C that liquid is 2.8 % lighter). A head of the liquid
itself is a length (``ft``, ``m``).

Sources: the units are those of NIST SP 811 (2008), appendix B; the spellings are common
practice on drawings, line lists, instrument data sheets and pump curves.
"""

from __future__ import annotations

import re
from dataclasses import dataclass


@dataclass(frozen=True)
class Alias:
    """Spellings of one unit. spellings: as written (inner blanks count as one; ``any_case``:
    capitals do not matter); unit: pint's spelling of what they mean; meaning: its name for
    people; kinds: the kinds of field where the spellings mean it (empty: every kind)."""

    spellings: tuple[str, ...]
    unit: str
    meaning: str
    kinds: tuple[str, ...] = ()
    any_case: bool = False


UNIT_ALIASES: tuple[Alias, ...] = (
    # Viscosity: pint reads cp as a cup, cps as counts per second, Pas as pascals.
    Alias(("cp", "CP", "Cp", "cps", "CPS", "cPs", "cP.", "cpoise"), "cP", "centipoise",
          ("viscosity",)),
    Alias(("Pas", "Pa.s", "Pa-s", "PaS", "Pa sec"), "Pa*s", "pascal second", ("viscosity",)),
    Alias(("mPas", "mPa.s", "mPa-s", "mPaS", "mPa sec"), "mPa*s", "millipascal second",
          ("viscosity",)),
    Alias(("cst", "CST", "Cst", "cSt."), "cSt", "centistokes", ("kinematic_viscosity",)),
    # Heads of water in a pressure field: conventional water columns (see the module text).
    # (``ft wc``, ``ft H2O``, ``in. w.g.``, ``mm wc``: see WATER_COLUMN below.)
    Alias(("ft hd", "ft. hd.", "ft head", "ft of head", "feet of head", "feet head",
           "foot of head", "ft of water", "feet of water", "foot of water", "fthd", "ft.hd."),
          "ftH2O", "foot of water (conventional, 4 °C)", ("pressure",), any_case=True),
    Alias(("in of water", "inches of water", "inch of water"), "inH2O",
          "inch of water (conventional, 4 °C)", ("pressure",), any_case=True),
    Alias(("m hd", "m head", "m of head", "metres of head", "meters of head", "m of water",
           "metres of water", "meters of water", "mhd"),
          "mH2O", "metre of water (conventional, 4 °C)", ("pressure",), any_case=True),
    # A head field is a height of the liquid itself: the same words are plain lengths there.
    Alias(("ft hd", "ft. hd.", "ft head", "ft of head", "feet of head", "feet head",
           "foot of head", "fthd", "ft.hd."), "ft", "foot of the liquid", ("head",),
          any_case=True),
    Alias(("m hd", "m head", "m of head", "metres of head", "meters of head", "mhd"), "m",
          "metre of the liquid", ("head",), any_case=True),
    # Pressure in capitals or as units of force per area.
    Alias(("PSI", "Psi", "psi.", "PSID", "Psid", "psi diff"), "psi",
          "pound-force per square inch"),
    Alias(("kpa",), "kPa", "kilopascal", any_case=True),
    Alias(("MPA", "Mpa"), "MPa", "megapascal"),
    Alias(("BAR", "Bar", "bars", "BARS"), "bar", "bar"),
    Alias(("MBAR", "mBar"), "mbar", "millibar"),
    Alias(("lb/in²", "lb/in2", "lb/in^2", "lbs/in²", "lbs/in2", "lbs/in^2", "lb/sq in",
           "lb/sq. in.", "lb/sq.in", "lbs/sq in", "lbf/sq in", "lb per sq in"), "psi",
          "pound-force per square inch", ("pressure",)),
    Alias(("kg/cm²", "kg/cm2", "kg/cm^2", "kg/sq cm", "ksc", "KSC", "kgf/sq cm"), "kgf/cm^2",
          "kilogram-force per square centimetre", ("pressure",)),
    # Flow.
    Alias(("lps", "l/s", "l/sec", "L/sec", "lit/s"), "L/s", "litre per second", any_case=True),
    Alias(("lpm", "l/min", "L/MIN"), "L/min", "litre per minute", any_case=True),
    Alias(("cmh", "m3/hr", "m³/hr", "m3/h", "m3ph", "cu m/h", "cu m/hr", "m^3/hr"), "m^3/h",
          "cubic metre per hour", any_case=True),
    Alias(("gpm", "US gpm", "USgpm", "US gal/min", "usgpm", "gpm US", "gpm (US)"), "gpm",
          "US gallon per minute", any_case=True),
    Alias(("imp gpm", "UK gpm", "igpm", "Imp gal/min", "UK gal/min", "gpm (imp)", "gpm (UK)",
           "impgpm", "ukgpm"), "igpm", "imperial gallon per minute", any_case=True),
    # Temperature scales.
    Alias(("℃", "° C", "°c", "Celsius", "celsius", "CELSIUS", "deg. C", "degrees Celsius",
           "degree Celsius"), "degC", "degree Celsius", ("temperature",)),
    Alias(("℉", "° F", "°f", "Fahrenheit", "fahrenheit", "FAHRENHEIT", "deg. F",
           "degrees Fahrenheit", "degree Fahrenheit"), "degF", "degree Fahrenheit",
          ("temperature",)),
)
"""Whole units as written after the number, and what they mean (see the module text)."""

NAME_ALIASES: dict[str, str] = {
    '"': "inch", "″": "inch", "”": "inch", "'": "foot", "′": "foot", "’": "foot",
    "mil": "thou", "mils": "thou",  # 0.001 in (NIST SP 811: mil); pint's mil is an angle
    "°C": "degC", "°F": "degF", "℃": "degC", "℉": "degF", "μm": "um", "µm": "um",
}
"""Single unit names, swapped wherever they stand in a unit (drawing marks, ``mil``)."""


def _key(text: str) -> str:
    """``text`` with inner blanks as one and none around a slash (``lb / in²`` is ``lb/in²``)."""
    return re.sub(r"\s*/\s*", "/", " ".join(text.split()))


def _index() -> tuple[dict[tuple[str, str], Alias], dict[tuple[str, str], Alias]]:
    exact: dict[tuple[str, str], Alias] = {}
    folded: dict[tuple[str, str], Alias] = {}
    for alias in UNIT_ALIASES:
        for kind in alias.kinds or ("*",):
            for spelling in alias.spellings:
                exact[(_key(spelling), kind)] = alias
                if alias.any_case:
                    folded[(_key(spelling).casefold(), kind)] = alias
    return exact, folded


_EXACT, _FOLDED = _index()


def unit_alias(unit: str, kind: str) -> Alias | None:
    """The alias ``unit`` (as written after the number) is in a ``kind`` field, or None."""
    key = _key(unit)
    for k in (kind, "*"):
        found = _EXACT.get((key, k)) or _FOLDED.get((key.casefold(), k))
        if found is not None:
            return found
    return None


def alias_elsewhere(unit: str, kind: str) -> Alias | None:
    """An alias ``unit`` would be in some other kind of field (None if none): what the text
    likely meant, for a message when it reads as something else here."""
    key = _key(unit)
    for alias in UNIT_ALIASES:
        if kind in alias.kinds or not alias.kinds:
            continue
        spellings = {_key(s) for s in alias.spellings}
        if key in spellings or (alias.any_case
                                and key.casefold() in {s.casefold() for s in spellings}):
            return alias
    return None


WATER_COLUMN = re.compile(
    r"""^(?P<len>in|inch|inches|"|ft|feet|foot|mm|cm|m)\.?\s*(?:w\.?\s*[cg]\.?|h2o|water)$""",
    re.IGNORECASE)
"""Water-column spellings of the trade: ``in wc``, ``inWC``, ``"WC``, ``in. w.g.``, ``ft wc``,
``ft H2O``, ``mm wc`` — heads of water at the conventional density, as ``inH2O`` and friends."""
_WATER_COLUMN_UNIT = {"in": "inH2O", "inch": "inH2O", "inches": "inH2O", '"': "inH2O",
                      "ft": "ftH2O", "feet": "ftH2O", "foot": "ftH2O", "mm": "mmH2O",
                      "cm": "cmH2O", "m": "mH2O"}
BARE_TEMPERATURE = re.compile(r"^(?:deg(?:rees?)?\s*)?(?P<scale>[CF])$", re.IGNORECASE)
"""``5 C``, ``41 F``, ``5 deg C``: in a temperature field C and F can only mean the scales."""


def resolve(unit: str, kind: str) -> str:
    """``unit`` (as written after the number, in a ``kind`` field) in pint's spelling: a trade
    spelling turned into the unit it means, anything else left as written."""
    alias = unit_alias(unit, kind)
    if alias is not None:
        return alias.unit
    if m := WATER_COLUMN.match(unit.strip()):
        return _WATER_COLUMN_UNIT[m.group("len").lower()]
    if kind == "temperature" and (m := BARE_TEMPERATURE.match(unit.strip())):
        return f"deg{m.group('scale').upper()}"
    return unit
