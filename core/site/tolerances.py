"""A site's ``[tolerances]`` table: from text as typed to :class:`~.uncertainty.Tolerances`.

Every key is optional; a missing one keeps the common-practice default of
:class:`~branchwise.core.numerics.tolerances.Tolerances`. Values are text with units where they
have a dimension, so the file says what it means::

    [tolerances]
    gauge_accuracy = "1 %"          # of the gauge's full scale (of the reading without one)
    gauge_full_scale = "250 kPa"
    flow_meter_accuracy = "3 %"     # of the reading: a branch's (a clamp-on), the target flow's
    total_flow_meter_accuracy = "0.5 %"   # the header's own meter (absent: flow_meter_accuracy)
    target_flow_measured = true     # the target flow of [solve] is a reading, not a design figure
    roughness_factor = [0.5, 3]     # the entered roughness times 0.5 … 3 (log-uniform)
    roughness_range = { "Bypass" = ["0.05 mm", "0.5 mm"] }   # replaces the factor there
    diameter = "1 %"
    length = "5 %"
    temperature = "2 K"             # a temperature difference: K, delta_degC, degC or degF steps
    fitting_k = "25 %"
    valve_kv = "10 %"               # of every valve's Kv or Cv (several in series: each)

A bad value is an InputError on ``tolerances.<key>``. The temperature tolerance acts through the
site's own fluid model, rebuilt at T ± δ (:func:`site_thermal`).
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import fields, replace
from typing import TYPE_CHECKING, Any

from ..errors import InputError, PhaseLimit, describe
from ..messages import pressure_text, temperature_difference_text, temperature_text
from ..model import Fluid, Given, Network, PressureDrop
from ..numerics.tolerances import Thermal, Tolerances
from ..units import parse_quantity
from .spec import Site, TolerancesSpec, Value
from .values import is_bare_number, number

if TYPE_CHECKING:
    from ..storage.presets import PresetSource

PERCENT_KEYS = {f.metadata["key"]: f.name for f in fields(Tolerances)
                if f.name.endswith("_percent")}
"""Site key → :class:`Tolerances` field, for the keys given as percentages."""

_NUMBER_THEN_UNIT = re.compile(r"\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?(.*)\Z", re.S)


def _tidy(number: float) -> float:
    """Round away the last-digit noise of a unit conversion (0.03 · 100 → 3.0)."""
    return float(f"{number:.12g}")


def percent(value: Value, path: str) -> float:
    """A percentage typed with its sign (``"3 %"``), in % (so ``3.0``). A bare number is
    refused: 3 could mean 3 % or 300 %."""
    if value is None or isinstance(value, bool):
        raise InputError(path, describe(value), "must be a percentage such as '3 %'")
    if is_bare_number(value):
        raise InputError(path, describe(value), f"give the percent sign, such as '{value} %'")
    return _tidy(parse_quantity(value, "fraction", path) * 100)


def temperature_difference(value: Value, path: str) -> float:
    """A temperature difference in K: ``"2 K"``, ``"2 delta_degC"``, ``"2 degC"`` (a step of
    2 °C, not the temperature 2 °C) or ``"3.6 degF"`` (= 2 K)."""
    if not isinstance(value, str):
        raise InputError(path, describe(value), "needs a unit, such as '2 K'")
    value = value.replace("delta_", "")  # delta_degC: a step of degC, the same difference
    match = _NUMBER_THEN_UNIT.match(value)
    unit = match.group(1).strip() if match else ""
    if not unit:  # parse_quantity names what is wrong: no number, or no unit
        parse_quantity(value, "temperature", path)
    # The difference of two readings in the same unit: offset units (degC, degF) cancel.
    delta = parse_quantity(value, "temperature", path) - parse_quantity(
        f"0 {unit}", "temperature", path)
    return _tidy(delta)


def _pair_numbers(pair: list[Value], path: str) -> tuple[float, float]:
    if len(pair) != 2:
        raise InputError(path, describe(pair), "must be a pair [low, high]")
    low, high = (number(v, f"{path}[{i}]") for i, v in enumerate(pair))
    return _ordered(low, high, pair, path)


def _pair_roughness(pair: list[Value], path: str) -> tuple[float, float]:
    if len(pair) != 2:
        raise InputError(path, describe(pair), "must be a pair [low, high], such as "
                         "[\"0.05 mm\", \"0.5 mm\"]")
    low, high = (parse_quantity(v, "roughness", f"{path}[{i}]") for i, v in enumerate(pair))
    return _ordered(low, high, pair, path)


def _ordered(low: float, high: float, pair: list[Value], path: str) -> tuple[float, float]:
    if not (math.isfinite(low) and math.isfinite(high) and 0 < low <= high):
        raise InputError(path, describe(pair), "must be a pair with 0 < low ≤ high")
    return low, high


def build_tolerances(spec: TolerancesSpec, network: Network, given: Given,
                     gauge_reading: float | None = None) -> Tolerances:
    """The :class:`Tolerances` of a ``[tolerances]`` table; missing keys keep the defaults.

    network: to resolve the branch names of ``roughness_range``; given, gauge_reading (Pa, the
    site's pressure drop when it holds one, given or not: it is weighed against the other
    readings all the same): a gauge's full scale below the pressure drop read on it is refused.
    """
    path = "tolerances"
    kw: dict[str, Any] = {}
    for key, core in PERCENT_KEYS.items():
        if (value := getattr(spec, key)) is not None:
            kw[core] = percent(value, f"{path}.{key}")
    if kw.get("gauge_percent", 0.0) >= 100:  # the core has no upper limit; a gauge has
        raise InputError(f"{path}.gauge_accuracy", describe(spec.gauge_accuracy),
                         "must be below 100 %")
    if (value := spec.gauge_full_scale) is not None:
        full = parse_quantity(value, "pressure", f"{path}.gauge_full_scale")
        if not full > 0:
            raise InputError(f"{path}.gauge_full_scale", describe(value), "must be positive")
        read_pa = abs(given.value) if isinstance(given, PressureDrop) else gauge_reading
        if read_pa is not None and abs(read_pa) > full * (1 + 1e-9):
            read = pressure_text(abs(read_pa))
            raise InputError(f"{path}.gauge_full_scale", describe(value),
                             f"is below the pressure drop read on the gauge ({read})")
        kw["gauge_full_scale"] = full
    if (value := spec.target_flow_measured) is not None:
        if not isinstance(value, bool):
            quoted = isinstance(value, str) and value.strip().casefold() in ("true", "false")
            raise InputError(f"{path}.target_flow_measured", describe(value),
                             "must be true or false without quotes (a TOML true or false, "
                             "not text)" if quoted else "must be true or false")
        kw["target_flow_measured"] = value
    if spec.roughness_factor is not None:
        kw["roughness_factor"] = _pair_numbers(spec.roughness_factor,
                                               f"{path}.roughness_factor")
    ranges: dict[str, tuple[float, float]] = {}
    for name, pair in spec.roughness_range.items():
        where = f'{path}.roughness_range."{name}"'
        branch = network.branches[network.index_of(name, where)].name
        if branch in ranges:
            raise InputError(where, describe(name), f"names the branch '{branch}' twice")
        ranges[branch] = _pair_roughness(pair, where)
    if ranges:
        kw["roughness_m"] = ranges
    if (value := spec.temperature) is not None:
        kw["temperature_k"] = temperature_difference(value, f"{path}.temperature")
    tol = Tolerances(**kw)
    try:
        tol.validate()
    except InputError as exc:  # the value as typed ("-1 %"), not as the core read it (-1.0)
        key = exc.field.removeprefix(f"{path}.")
        typed = getattr(spec, key, None) if key.isidentifier() else None
        if typed is None or isinstance(typed, list | dict):
            raise
        raise InputError(exc.field, describe(typed), exc.marked_reason) from None
    return tol


def site_thermal(
    site: Site, tol: Tolerances, presets: PresetSource | None = None
) -> tuple[Tolerances, Thermal | None, tuple[str, ...]]:
    """How the site's liquid moves over T ± the temperature tolerance: the fluid model of the
    site rebuilt at both ends (:meth:`Thermal.from_fluid_at` with the tolerance as the step,
    so the ln-linear model meets the fluid model at the band's limits).

    Returns the tolerances (the temperature one set to zero where it cannot apply), the model
    (None without one) and notes saying why a temperature tolerance was left out or cut. A
    fluid without a temperature (a custom one) ignores it with a note. A tolerance that reaches
    past where the liquid freezes or boils (:class:`~branchwise.core.errors.PhaseLimit`) is cut
    there, with a note: a liquid flowing in the pipe lies on this side of those points, so the
    draws are uniform over the part of T ± the tolerance where it is a liquid (the rectangular
    distribution given that it is one), and the ln-linear model takes the chord over that
    part. One that reaches past the range a property model covers (the liquid is still liquid
    there, but its properties are not known) is an InputError when typed, and left out with a
    note when it is the common-practice default.
    """
    from ..fluids import fluid_from_spec
    from .liquid import fluid_inputs

    if tol.temperature_k == 0:
        return tol, None, ()
    kind, args = fluid_inputs(site, presets)
    centre = args.get("temperature_k")
    if centre is None:
        return replace(tol, temperature_k=0.0), None, (
            f"temperature tolerance not applied: the {kind} fluid's density and viscosity "
            "do not depend on a temperature here",)

    def fluid_at(t_k: float) -> Fluid:
        return fluid_from_spec(kind, **(args | {"temperature_k": t_k}))

    step = tol.temperature_k
    try:
        return tol, Thermal.from_fluid_at(fluid_at, centre, step), ()
    except InputError:
        pass  # T ± the tolerance leaves the liquid's model: where, and why?
    (low, below, low_far), (high, above, high_far) = (
        _liquid_end(fluid_at, centre, far) for far in (centre - step, centre + step))
    beyond = [e for e in (below, above) if e is not None]
    phases = "; ".join(e.phase for e in beyond if isinstance(e, PhaseLimit))
    if any(not isinstance(e, PhaseLimit) for e in beyond):
        # the model's range ends, not the liquid: nothing to cut at (said as at the far end)
        outside = next(e for e in (low_far, high_far, *beyond)
                       if e is not None and not isinstance(e, PhaseLimit))
        typed = site.tolerances.temperature if site.tolerances is not None else None
        reason = (f"takes the liquid outside its model ({outside.field}: "
                  f"{outside.marked_reason}, got {outside.marked_value})")
        if typed is not None:
            raise InputError("tolerances.temperature", describe(typed), reason)
        return replace(tol, temperature_k=0.0), None, (
            f"temperature tolerance not applied: ± {temperature_difference_text(step)} "
            f"{reason}",)
    if high - low < MIN_SPAN_K:  # at the edge on both sides: nothing left to draw
        return replace(tol, temperature_k=0.0), None, (
            "temperature tolerance not applied: the liquid has no room either side of its "
            f"temperature ({phases})",)
    thermal = Thermal.from_fluid_at(fluid_at, (low + high) / 2, (high - low) / 2)
    thermal = replace(thermal, span_k=(low - centre, high - centre))
    return tol, thermal, (
        f"temperature drawn over {temperature_text(low)} – {temperature_text(high)} only, "
        f"the part of its tolerance where the liquid can be ({phases})",)


SPAN_RESOLUTION_K = 1e-6
"""How closely the end of the liquid's range is found (K): well inside the 0.01 K the notes
give a temperature to."""
MIN_SPAN_K = 1e-3
"""A range narrower than this (K) is no range to draw from."""


def _error_at(fluid_at: Callable[[float], Fluid], t_k: float) -> InputError | None:
    """Why ``fluid_at(t_k)`` gives no liquid (None: it gives one)."""
    try:
        fluid_at(t_k)
    except InputError as exc:
        return exc
    return None


def _liquid_end(fluid_at: Callable[[float], Fluid], centre: float, far: float
                ) -> tuple[float, InputError | None, InputError | None]:
    """How far from ``centre`` towards ``far`` (K) ``fluid_at`` gives a liquid: ``far`` itself
    when it does (and None, None); else the last temperature that does, found by bisection to
    within :data:`SPAN_RESOLUTION_K`, the error just beyond it (a :class:`PhaseLimit` where the
    liquid freezes or boils there) and the error at ``far``. ``centre`` holds: the site's own
    fluid was built there."""
    at_far = error = _error_at(fluid_at, far)
    if at_far is None:
        return far, None, None
    good, bad = centre, far
    while abs(bad - good) > SPAN_RESOLUTION_K:
        mid = (good + bad) / 2
        found = _error_at(fluid_at, mid)
        if found is None:
            good = mid
        else:
            bad, error = mid, found
    return good, error, at_far


__all__ = ["build_tolerances", "percent", "site_thermal",
           "temperature_difference"]
