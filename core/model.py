"""The network as plain, frozen dataclasses in SI units.

A network is a fluid, two common nodes and the branches between them; each branch is one or more
series segments and an optional valve. Validation happens here, once, so the solver can trust
its arrays. Every failure is an :class:`InputError` naming the field path.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from typing import Literal, get_args

from .errors import InputError, describe
from .names import name_key

STANDARD_GRAVITY = 9.80665
"""Standard acceleration of gravity, m/s² (ISO 80000-3; CGPM 1901)."""

FrictionModel = Literal[
    "colebrook", "haaland", "swamee-jain", "churchill", "hazen-williams", "laminar"
]
FRICTION_MODELS: tuple[FrictionModel, ...] = get_args(FrictionModel)
"""The friction models a network may use (see :mod:`branchwise.core.numerics.friction`)."""


_FRICTION_NAMES = {"colebrook-white": "colebrook"}
"""Other names of a friction model in common use: Colebrook–White is Colebrook's equation."""


def friction_model(text: object, path: str = "conditions.friction") -> FrictionModel:
    """``text`` as one of :data:`FRICTION_MODELS` in any capitals, with spaces, underscores,
    hyphens or dashes between the words (``Hazen Williams``, ``COLEBROOK``, ``Swamee_Jain``),
    or an InputError on ``path`` naming them."""
    if isinstance(text, str):
        words = re.sub(r"[\s_\-\u2010-\u2015]+", " ", text.casefold()).split()
        key = "-".join(words)
        key = _FRICTION_NAMES.get(key, key)
        for model in FRICTION_MODELS:
            if key == model:
                return model
    raise InputError(path, describe(text), f"must be one of {', '.join(FRICTION_MODELS)}")


US_GALLON_M3 = 231 * 0.0254**3
"""The US gallon, m³: 231 cubic inches, the inch 0.0254 m exactly (NIST SP 811)."""
PSI_PA = 0.45359237 * STANDARD_GRAVITY / 0.0254**2
"""The pound-force per square inch, Pa: 0.453 592 37 kg under standard gravity on a square inch
(exact by definition; 6894.757…)."""
KV_REFERENCE_DP_PA = 1.0e5
"""Kv is defined at a pressure drop of 1 bar (IEC 60534-1)."""
CV_PER_KV: float = math.sqrt(PSI_PA / KV_REFERENCE_DP_PA) / (60 * US_GALLON_M3)
"""Cv (US gpm at 1 psi) per Kv (m³/h at 1 bar) of one valve, from the units' definitions alone:
Cv/Kv = (m³/h per gpm) · √(bar per psi) = 1.156 099 2…; the 1.156 printed in IEC 60534-1 and
ISA-75.01 tables is this rounded. One constant, used everywhere a Cv is read or shown."""


def _finite(path: str, value: float) -> float:
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise InputError(path, value, "must be a number") from None
    if not math.isfinite(number):
        raise InputError(path, value, "must be a finite number")
    return number


def positive(path: str, value: float) -> float:
    """``value`` as a float, or an InputError unless it is finite and > 0."""
    number = _finite(path, value)
    if number <= 0:
        raise InputError(path, value, "must be positive")
    return number


def non_negative(path: str, value: float) -> float:
    """``value`` as a float, or an InputError unless it is finite and ≥ 0."""
    number = _finite(path, value)
    if number < 0:
        raise InputError(path, value, "must not be negative")
    return number


def finite(path: str, value: float) -> float:
    """``value`` as a float, or an InputError unless it is finite."""
    return _finite(path, value)


def at_most(path: str, value: float, limit: float, unit: str, what: str) -> float:
    """``value`` unless its size exceeds ``limit`` — a bound far beyond any real plant, which
    catches a slipped unit (mm typed as m) before it turns into inf or nonsense."""
    if abs(value) > limit:
        raise InputError(path, value, f"is beyond any {what} (limit {limit:g}"
                         f"{' ' + unit if unit else ''})")
    return value


# Sanity bounds: far outside anything on a plant, well inside floating-point range.
MAX_DIAMETER = 100.0  # m
MAX_LENGTH = 1e7  # m (10 000 km)
MAX_K = 1e7  # –
MAX_DENSITY = 3e4  # kg/m³ (denser than any liquid)
MAX_VISCOSITY = 1e6  # Pa·s (stiffer than pitch)
MAX_ELEVATION = 1e4  # m
MAX_KV = 1e7  # m³/h
MIN_DENSITY = 50.0  # kg/m³: lighter than any liquid (liquid hydrogen, about 71; from memory)
MIN_DIAMETER = 1e-4  # m: a tenth of a millimetre, narrower than any pipe or capillary tube
MIN_LENGTH = 1e-3  # m: a non-zero run shorter than 1 mm is a slip (0: a run of fittings only)
MIN_KV = 1e-6  # m³/h (a needle valve passes thousands of times more)
MIN_FLOW = 1e-30  # m³/s: a non-zero flow below this is no reading (and underflows in the solve)
MAX_FLOW = 1e6  # m³/s (the largest penstocks carry about a thousand)


@dataclass(frozen=True)
class Fluid:
    """An incompressible liquid at its operating state.

    density: kg/m³; viscosity: dynamic viscosity, Pa·s. ``kind`` says where the properties
    came from (``water``, ``seawater``, ``custom``…); ``source`` names the property model;
    ``temperature``: K, the state the properties belong to (None when not known), so that a
    boundary can restate the name's "at … °C" in other units (``units.fluid_name``).
    """

    name: str
    density: float
    viscosity: float
    kind: str = "custom"
    source: str = "entered by the user"
    temperature: float | None = None

    def __post_init__(self) -> None:
        rho = at_most("fluid.density", positive("fluid.density", self.density), MAX_DENSITY,
                      "kg/m³", "liquid")
        if rho < MIN_DENSITY:
            raise InputError("fluid.density", self.density,
                             f"is lighter than any liquid (at least {MIN_DENSITY:g} kg/m³); a gas "
                             "or vapour needs a compressible-flow method")
        at_most("fluid.viscosity", positive("fluid.viscosity", self.viscosity), MAX_VISCOSITY,
                "Pa·s", "liquid")

    @property
    def kinematic_viscosity(self) -> float:
        """m²/s."""
        return self.viscosity / self.density


@dataclass(frozen=True)
class Segment:
    """One straight run of one size, with the fittings along it.

    diameter: inner diameter, m; length: m; roughness: absolute roughness ε, m;
    minor_k: sum of minor-loss coefficients referred to this segment's velocity (–);
    hw_c: Hazen–Williams C (–), used only by that friction model.
    """

    diameter: float
    length: float
    roughness: float = 0.0
    minor_k: float = 0.0
    hw_c: float | None = None

    def validate(self, path: str) -> None:
        d = at_most(f"{path}.diameter", positive(f"{path}.diameter", self.diameter),
                    MAX_DIAMETER, "m", "pipe")
        if d < MIN_DIAMETER:
            raise InputError(f"{path}.diameter", self.diameter,
                             f"is narrower than any pipe (at least {MIN_DIAMETER * 1000:g} mm)")
        length = at_most(f"{path}.length", non_negative(f"{path}.length", self.length),
                         MAX_LENGTH, "m", "pipe run")
        if 0 < length < MIN_LENGTH:
            raise InputError(f"{path}.length", self.length,
                             f"is shorter than any pipe run (at least {MIN_LENGTH * 1000:g} mm; "
                             "0 for a run of fittings only)")
        eps = non_negative(f"{path}.roughness", self.roughness)
        if eps >= d / 2:
            raise InputError(
                f"{path}.roughness", self.roughness,
                f"must be below half the diameter ({d / 2:g} m)",
            )
        at_most(f"{path}.minor_k", non_negative(f"{path}.minor_k", self.minor_k), MAX_K, "",
                "fitting loss")
        if self.hw_c is not None:
            positive(f"{path}.hw_c", self.hw_c)

    @property
    def area(self) -> float:
        """Flow area, m²."""
        return math.pi * self.diameter**2 / 4


@dataclass(frozen=True)
class Branch:
    """A path between the two common nodes: series segments and an optional valve.

    valve_kv: the valve's flow coefficient Kv in m³/h at 1 bar (None: no valve loss beyond the K
    values). Use :func:`kv_from_cv` for a Cv.
    """

    name: str
    segments: tuple[Segment, ...]
    valve_kv: float | None = None

    def validate(self, path: str) -> None:
        if not self.name or not self.name.strip():
            raise InputError(f"{path}.name", repr(self.name), "must not be empty")
        if not self.segments:
            raise InputError(f"{path}.segments", "[]", "a branch needs at least one segment")
        for j, seg in enumerate(self.segments):
            seg.validate(f"{path}.segments[{j}]")
        if self.valve_kv is not None:
            kv = at_most(f"{path}.valve_kv", positive(f"{path}.valve_kv", self.valve_kv),
                         MAX_KV, "m³/h", "valve")
            if kv < MIN_KV:
                raise InputError(f"{path}.valve_kv", self.valve_kv,
                                 f"is below any valve (at least {MIN_KV:g} m³/h)")


def kv_from_cv(cv: float) -> float:
    """Kv (m³/h, bar) from Cv (US gpm, psi): Kv = Cv / :data:`CV_PER_KV`."""
    return cv / CV_PER_KV


@dataclass(frozen=True)
class Network:
    """Branches in parallel between two common nodes.

    elevation_change: z_outlet − z_inlet, m; gravity: m/s²; friction: the model for the
    turbulent regime (see :mod:`branchwise.core.numerics.friction`).
    """

    fluid: Fluid
    branches: tuple[Branch, ...]
    elevation_change: float = 0.0
    gravity: float = STANDARD_GRAVITY
    friction: FrictionModel = "colebrook"
    velocity_limit: float = 3.0
    """m/s; above it a water line gets a warning (common practice: noise and erosion)."""

    def __post_init__(self) -> None:
        if not self.branches:
            raise InputError("branches", "[]", "a network needs at least one branch")
        seen: dict[str, int] = {}
        for i, br in enumerate(self.branches):
            br.validate(f"branches[{i}]")
            key = name_key(br.name)
            if key in seen:
                raise InputError(
                    f"branches[{i}].name", repr(br.name), f"duplicates branches[{seen[key]}].name"
                )
            seen[key] = i
        at_most("conditions.elevation_change",
                finite("conditions.elevation_change", self.elevation_change), MAX_ELEVATION, "m",
                "elevation change")
        positive("conditions.gravity", self.gravity)
        object.__setattr__(self, "friction", friction_model(self.friction))  # its own spelling
        if self.friction == "hazen-williams":
            for i, br in enumerate(self.branches):
                for j, seg in enumerate(br.segments):
                    if seg.hw_c is None:
                        raise InputError(
                            f"branches[{i}].segments[{j}].hw_c",
                            "nothing",
                            "Hazen-Williams needs a C value for every segment",
                        )

    def index_of(self, name: str, path: str = "solve.branch") -> int:
        """Index of the branch called ``name`` (as :func:`name_key` tells names apart), or an
        InputError."""
        key = name_key(name)
        for i, br in enumerate(self.branches):
            if name_key(br.name) == key:
                return i
        names = ", ".join(repr(b.name) for b in self.branches)
        raise InputError(path, repr(name), f"no such branch (have {names})")

    def replace_branch(self, index: int, branch: Branch) -> Network:
        branches = list(self.branches)
        branches[index] = branch
        return replace(self, branches=tuple(branches))


# ---- what is given and what is sought -------------------------------------------------------

@dataclass(frozen=True)
class PressureDrop:
    """Measured p_inlet − p_outlet between the common nodes, Pa."""

    value: float


@dataclass(frozen=True)
class TotalFlow:
    """Measured total flow into the inlet node, m³/s (signed)."""

    value: float


@dataclass(frozen=True)
class MeasuredFlow:
    """A flow measured on one branch (a clamp-on reading), m³/s (signed)."""

    branch: str
    value: float


Given = PressureDrop | TotalFlow | MeasuredFlow


@dataclass(frozen=True)
class FindFlows:
    """Find the flow in every branch (the default)."""


@dataclass(frozen=True)
class FindUnknown:
    """Find one property of one segment of a branch so that the branch carries ``target_flow``.

    quantity: ``diameter`` | ``length`` | ``roughness``; target_flow: m³/s; segment: index of the
    segment within the branch whose property is sought.
    """

    quantity: str
    branch: str
    target_flow: float
    segment: int = 0


Find = FindFlows | FindUnknown


def branch(
    name: str,
    diameter: float,
    length: float,
    roughness: float = 0.0,
    minor_k: float = 0.0,
    valve_kv: float | None = None,
    hw_c: float | None = None,
) -> Branch:
    """A one-segment branch: the common case, short to write."""
    return Branch(name, (Segment(diameter, length, roughness, minor_k, hw_c),), valve_kv)


__all__ = [
    "Branch", "Find", "FindFlows", "FindUnknown", "Fluid", "Given", "MeasuredFlow", "Network",
    "PressureDrop", "Segment", "TotalFlow", "branch", "kv_from_cv",
]
