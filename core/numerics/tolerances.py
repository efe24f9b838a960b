"""What is known about the inputs of a survey: ± limits, and how the liquid moves with temperature.

The limits are read by :mod:`.uncertainty`, which turns each into a distribution
(rectangular by the GUM, JCGM 100:2008, 4.3.7, when nothing more is known about it).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, fields

from ..errors import InputError
from ..model import Fluid, positive


@dataclass(frozen=True)
class Tolerances:
    """± limits on the inputs. The defaults are common practice for a site survey (no standard
    fixes them); change them to what is known about the instruments and the line.

    gauge_percent: pressure-gauge accuracy, % of full scale (common practice: a class 1 gauge,
    ±1 %). gauge_full_scale: the gauge's full scale, Pa; None takes the percent of the reading
    instead (optimistic for a small reading on a big gauge; the result notes it).
    flow_meter_percent: flow reading accuracy, % of reading (common practice: clamp-on ultrasonic
    meters ±2–5 %; 3): a branch's reading and the sought unknown's target flow.
    total_flow_meter_percent: the total-flow reading's accuracy, % of reading, when the header
    has a meter of its own (common practice: a full-bore magnetic meter ±0.5 %, from memory);
    None takes flow_meter_percent (the same kind of meter, clamped on the header).
    target_flow_measured: the sought unknown's target flow is a reading (True)
    or a design figure with no tolerance (False).
    roughness_factor: (low, high) multiplying the entered ε, drawn log-uniform (common practice
    for a table value: 0.5 to 2; for an aged line entered as new, e.g. (1, 10)).
    roughness_m: {branch name: (low, high)}, an explicit ε range in m for every segment of that
    branch, replacing the factor there.
    diameter_percent: ± % of inner diameter (common practice: 1, wall tolerance and deposits).
    length_percent: ± % (common practice: 5, lengths taken off drawings or paced out).
    temperature_k: ± K of the fluid temperature (common practice: 2), acting on ν and ρ through
    a :class:`Thermal` model (ignored without one; the result notes it).
    fitting_k_percent: ± % of every fitting K (common practice: 25, the scatter of tabulated K).
    valve_kv_percent: ± % of every valve's Kv or Cv (common practice: 10 — makers' published
    flow coefficients carry about that much, from memory; a balancing valve read off its
    setting chart can be worse).

    Each field's ``key`` (its metadata; :func:`path_of`) is the key of a site file's
    ``[tolerances]`` table that sets it, and names it in errors: ``tolerances.gauge_accuracy``.
    """

    gauge_percent: float = field(default=1.0, metadata={"key": "gauge_accuracy"})
    gauge_full_scale: float | None = field(default=None, metadata={"key": "gauge_full_scale"})
    flow_meter_percent: float = field(default=3.0, metadata={"key": "flow_meter_accuracy"})
    total_flow_meter_percent: float | None = field(
        default=None, metadata={"key": "total_flow_meter_accuracy"})
    target_flow_measured: bool = field(default=True, metadata={"key": "target_flow_measured"})
    roughness_factor: tuple[float, float] = field(default=(0.5, 2.0),
                                                  metadata={"key": "roughness_factor"})
    roughness_m: Mapping[str, tuple[float, float]] = field(default_factory=dict,
                                                           metadata={"key": "roughness_range"})
    diameter_percent: float = field(default=1.0, metadata={"key": "diameter"})
    length_percent: float = field(default=5.0, metadata={"key": "length"})
    temperature_k: float = field(default=2.0, metadata={"key": "temperature"})
    fitting_k_percent: float = field(default=25.0, metadata={"key": "fitting_k"})
    valve_kv_percent: float = field(default=10.0, metadata={"key": "valve_kv"})

    def validate(self) -> None:
        """InputError (on ``tolerances.<key>``) for a value that cannot be a tolerance."""
        for name in ("gauge_percent", "temperature_k"):
            _limit(name, getattr(self, name), None)
        for name in ("flow_meter_percent", "diameter_percent", "length_percent"):
            _limit(name, getattr(self, name), 100.0, closed=False)
        if self.total_flow_meter_percent is not None:
            _limit("total_flow_meter_percent", self.total_flow_meter_percent, 100.0,
                   closed=False)
        _limit("fitting_k_percent", self.fitting_k_percent, 100.0)
        _limit("valve_kv_percent", self.valve_kv_percent, 100.0, closed=False)
        if self.gauge_full_scale is not None:
            positive(path_of("gauge_full_scale"), self.gauge_full_scale)
        _range(path_of("roughness_factor"), self.roughness_factor)
        for name, pair in self.roughness_m.items():
            _range(path_of("roughness_m", name), pair)

    @property
    def total_flow_percent(self) -> float:
        """The total-flow reading's accuracy in use, % of reading: its own meter's, else the
        flow meters'."""
        own = self.total_flow_meter_percent
        return self.flow_meter_percent if own is None else own


def path_of(name: str, branch: str | None = None) -> str:
    """The field path of :class:`Tolerances` field ``name``: the site file's key that sets it,
    ``tolerances.gauge_accuracy``; for ``roughness_m``, the branch's entry,
    ``tolerances.roughness_range."Bypass"``."""
    key = _KEYS[name]
    return f"tolerances.{key}" + (f'."{branch}"' if branch is not None else "")


def _limit(name: str, value: float, upper: float | None, closed: bool = True) -> None:
    number = float(value) if isinstance(value, int | float) else math.nan
    if not (math.isfinite(number) and number >= 0):
        raise InputError(path_of(name), value, "must be a number not below zero")
    if upper is not None and (number > upper or (not closed and number == upper)):
        raise InputError(path_of(name), value,
                         f"must be {'at most' if closed else 'below'} {upper:g}")


def _range(path: str, pair: tuple[float, float]) -> None:
    try:
        low, high = (float(v) for v in pair)
    except (TypeError, ValueError):
        raise InputError(path, pair, "must be a pair (low, high)") from None
    if not (math.isfinite(low) and math.isfinite(high) and 0 < low <= high):
        raise InputError(path, pair, "must be a pair with 0 < low ≤ high")


@dataclass(frozen=True)
class Thermal:
    """How the fluid moves with temperature near the operating point: d ln ν/dT and d ln ρ/dT,
    1/K. Linear in the logarithm because liquid viscosity falls roughly exponentially with
    temperature (Andrade's equation), so a few kelvin either side stay accurate."""

    dln_nu_dt: float
    dln_rho_dt: float
    span_k: tuple[float, float] | None = None
    """The temperatures drawn, K from the operating point (low, high), where the tolerance
    reaches past what the liquid can be (frozen, boiling) and is cut there; None: ± the
    tolerance."""

    @classmethod
    def from_fluid_at(
        cls, fluid_at: Callable[[float], Fluid], temperature: float, step: float = 0.5
    ) -> Thermal:
        """Central differences of ``fluid_at(T)`` (T in K) at ``temperature`` ± ``step`` (K)."""
        positive("conditions.temperature", temperature)
        positive("uncertainty.temperature_step", step)
        cold, hot = fluid_at(temperature - step), fluid_at(temperature + step)
        return cls(
            math.log(hot.kinematic_viscosity / cold.kinematic_viscosity) / (2 * step),
            math.log(hot.density / cold.density) / (2 * step),
        )


_KEYS = {f.name: f.metadata["key"] for f in fields(Tolerances)}
