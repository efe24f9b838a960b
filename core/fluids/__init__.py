"""The liquids branchwise knows, in one registry, and the entry point that builds one.

Each kind of liquid is one :class:`LiquidKind` in :data:`LIQUIDS`: its key (the site file's
``fluid.kind``), its label, the inputs it needs and takes (:data:`INPUTS`), the published model
that gives its properties (one module each, imported on first use), and what holds for it
(water-based, so that the trade's velocity rule applies; Hazen–Williams meaningful). The site
loader, the ``presets`` command, the Liquid screen and the reports all read this registry.

Models (SI: K, Pa, kg/kg, kg/m³, Pa·s):

- :mod:`.water`: IAPWS-IF97 region 1 density, IAPWS 2008 viscosity.
- :mod:`.seawater`: Sharqawy, Lienhard & Zubair (2010); density under pressure by Nayar,
  Sharqawy, Banchik & Lienhard (2016).
- :mod:`.glycol`: ethylene/propylene glycol in water, by mass or by volume, each from its own
  CoolProp data set, tabulated in ``presets/fluids/`` (read on first use).
- :mod:`.custom`: density plus a dynamic or kinematic viscosity.

Adding a liquid: its model module, and one entry (with its builder) here.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ..errors import InputError, describe
from ..model import Fluid
from .water import STANDARD_ATMOSPHERE_PA

if TYPE_CHECKING:
    from .glycol import GlycolKind


@dataclass(frozen=True)
class LiquidInput:
    """One value a liquid may need. key: the site file's key under ``[fluid]``; arg: the keyword
    of :func:`fluid_from_spec` (SI, its unit in the name); quantity: the units kind of its text
    (None: free text); label and hint: for a form; alternates: other keywords that carry the same
    input on another basis (a glycol concentration by volume), one of them at most given."""

    key: str
    arg: str
    quantity: str | None
    label: str
    hint: str = ""
    alternates: tuple[str, ...] = ()

    @property
    def args(self) -> tuple[str, ...]:
        """Every keyword that carries this input."""
        return (self.arg, *self.alternates)


INPUTS: dict[str, LiquidInput] = {i.key: i for i in (
    LiquidInput("temperature", "temperature_k", "temperature", "Temperature"),
    LiquidInput("pressure", "pressure_pa", "pressure", "Pressure (absolute)", "empty: 1 atm"),
    LiquidInput("concentration", "mass_fraction", "fraction", "Glycol concentration",
                "by mass (30 %) unless vol is written (30 % vol)", ("volume_fraction",)),
    LiquidInput("salinity", "salinity_kg_kg", "salinity", "Salinity"),
    LiquidInput("name", "name", None, "Name"),
    LiquidInput("density", "density", "density", "Density"),
    LiquidInput("viscosity", "viscosity", "viscosity", "Dynamic viscosity"),
    LiquidInput("kinematic_viscosity", "kinematic_viscosity", "kinematic_viscosity",
                "Kinematic viscosity"),
)}
"""Every input a liquid can take, in the order a form shows them."""
_BY_ARG = {arg: i for i in INPUTS.values() for arg in i.args}


@dataclass(frozen=True)
class LiquidKind:
    """One kind of liquid.

    key: ``fluid.kind`` in a site file; label: for people; required / optional: keys of
    :data:`INPUTS`; build: makes the :class:`~branchwise.core.model.Fluid` from the inputs by
    their ``arg`` names (SI); water_based: water or a water solution (the trade's velocity rule
    of thumb applies); hazen_williams: the Hazen–Williams formula may be used (water at
    ordinary temperatures: an empirical fit for water alone); aliases: other names the trade
    writes for it, as :func:`liquid` normalises them (``EG``, ``MEG``, ``sea water``; common
    practice).
    """

    key: str
    label: str
    required: tuple[str, ...]
    optional: tuple[str, ...]
    build: Callable[..., Fluid]
    water_based: bool = False
    hazen_williams: bool = False
    aliases: tuple[str, ...] = ()

    @property
    def inputs(self) -> tuple[str, ...]:
        """Every input this kind takes, required first."""
        return self.required + self.optional


def _water(temperature_k: float, pressure_pa: float = STANDARD_ATMOSPHERE_PA) -> Fluid:
    from .water import water

    return water(temperature_k, pressure_pa)


def _seawater(temperature_k: float, salinity_kg_kg: float,
              pressure_pa: float = STANDARD_ATMOSPHERE_PA) -> Fluid:
    from .seawater import seawater

    return seawater(temperature_k, salinity_kg_kg, pressure_pa)


def _glycol(kind: GlycolKind) -> Callable[..., Fluid]:
    def build(temperature_k: float, mass_fraction: float | None = None,
              volume_fraction: float | None = None) -> Fluid:
        from .glycol import glycol

        if volume_fraction is not None:
            return glycol(kind, temperature_k, volume_fraction, "volume")
        if mass_fraction is None:
            raise InputError("fluid.concentration", "nothing", f"needed for {kind}")
        return glycol(kind, temperature_k, mass_fraction)

    return build


def _custom(density: float, viscosity: float | None = None,
            kinematic_viscosity: float | None = None, name: str | None = None) -> Fluid:
    from .custom import custom

    return custom(name or "Custom fluid", density, viscosity, kinematic_viscosity)


LIQUIDS: dict[str, LiquidKind] = {k.key: k for k in (
    LiquidKind("water", "Water", ("temperature",), ("pressure",), _water,
               water_based=True, hazen_williams=True),
    LiquidKind("seawater", "Seawater", ("temperature", "salinity"), ("pressure",), _seawater,
               water_based=True, hazen_williams=True, aliases=("sea-water",)),
    LiquidKind("ethylene-glycol", "Ethylene glycol in water", ("temperature", "concentration"),
               (), _glycol("ethylene-glycol"), water_based=True,
               aliases=("eg", "meg", "monoethylene-glycol")),
    LiquidKind("propylene-glycol", "Propylene glycol in water",
               ("temperature", "concentration"), (), _glycol("propylene-glycol"),
               water_based=True, aliases=("pg", "mpg", "monopropylene-glycol")),
    LiquidKind("custom", "Custom (density and viscosity)", ("density",),
               ("viscosity", "kinematic_viscosity", "name"), _custom),
)}
"""Every built-in kind of liquid, by key."""

FLUID_KINDS: tuple[str, ...] = tuple(LIQUIDS)
_BY_ALIAS = {alias: k for k in LIQUIDS.values() for alias in k.aliases}


def liquid(kind: str) -> LiquidKind | None:
    """The built-in kind written ``kind`` in any capitals, spaces, hyphens or underscores
    (``Propylene glycol`` is ``propylene-glycol``), or by one of its aliases (``EG``,
    ``sea water``), or None."""
    key = ("-".join(kind.lower().replace("_", " ").replace("-", " ").split())
           if isinstance(kind, str) else "")
    return LIQUIDS.get(key) or _BY_ALIAS.get(key)


def fluid_from_spec(kind: str, **inputs: Any) -> Fluid:
    """The :class:`Fluid` for ``kind`` (one of :data:`FLUID_KINDS`) from the inputs that kind
    takes, by their ``arg`` names in SI (``temperature_k`` K, ``pressure_pa`` Pa,
    ``mass_fraction`` and ``salinity_kg_kg`` kg/kg, ``volume_fraction`` m³/m³ (a glycol by
    volume, instead of ``mass_fraction``), ``density`` kg/m³, ``viscosity`` Pa·s,
    ``kinematic_viscosity`` m²/s, ``name``); None counts as not given.

    An input the kind needs but lacks, or one it does not use (a salinity for a glycol), is
    refused with an InputError on its field, so a form or a saved site never silently loses
    a value.
    """
    spec = liquid(kind) if isinstance(kind, str) and kind == kind.strip().lower() else None
    if spec is None:
        raise InputError("fluid.kind", describe(kind), f"must be one of {', '.join(LIQUIDS)}")
    given = {arg: value for arg, value in inputs.items() if value is not None}
    for arg, value in given.items():
        item = _BY_ARG.get(arg)
        if item is None:
            raise TypeError(f"fluid_from_spec() got an unexpected keyword argument {arg!r}")
        if item.key not in spec.inputs:
            takes = ", ".join(spec.inputs)
            shown = f"{value:.6g}" if isinstance(value, float) else describe(value)
            raise InputError(f"fluid.{item.key}", shown, f"not used for {spec.key} (it takes "
                             f"{takes})")
    for key in spec.inputs:
        carried = [arg for arg in INPUTS[key].args if arg in given]
        if not carried and key in spec.required:
            raise InputError(f"fluid.{key}", "nothing", f"needed for {spec.key}")
        if len(carried) > 1:
            raise InputError(f"fluid.{key}", " and ".join(f"{given[a]:.6g}" for a in carried),
                             f"give it once ({' or '.join(carried)})")
    return spec.build(**given)


__all__ = ["FLUID_KINDS", "INPUTS", "LIQUIDS", "STANDARD_ATMOSPHERE_PA", "LiquidInput",
           "LiquidKind", "fluid_from_spec", "liquid"]
