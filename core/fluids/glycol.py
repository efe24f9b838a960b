"""Ethylene- and propylene-glycol solutions in water, interpolated from shipped tables.

Two data sets per glycol, each read as it stands (a concentration is never converted from one
basis to the other):

- by mass fraction (``presets/fluids/<kind>.toml``): CoolProp's INCOMP::MEG / INCOMP::MPG
  (Melinder 2010), 10–60 %, from the mixture's freezing point to 100 °C;
- by volume fraction (``presets/fluids/<kind>-volume.toml``): CoolProp's INCOMP::AEG /
  INCOMP::APG (the ASHRAE Handbook data), 10–60 %, from the mixture's freezing point, but never
  below −35 °C where that data set ends, to 100 °C.

All hold values at 101325 Pa, written by ``tests/tools/make_glycol_tables.py``, so the package
needs neither CoolProp nor scipy at run time.

Each concentration row runs from its lowest state (its freezing point, or the data set's lowest
temperature where the mixture freezes below that) to 100 °C in equal steps, so in the
normalised temperature s = (T − T_low(x)) / (T_top − T_low(x)) the nodes form a rectangle. A
query is answered by a tensor-product cubic spline (not-a-knot): along s in every row, then
across the rows at the fraction x. Where T_low(x) turns from the freezing line to the fixed
lowest temperature it has a corner; a row sits on it, and the rows on either side are
interpolated apart. Viscosity is interpolated as ln μ, which is nearly linear in temperature
where μ itself changes a thousandfold. The freezing curve is a separate, finer table (every
1 %), interpolated by a cubic spline in x.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from functools import cache
from importlib import resources
from typing import Literal

import numpy as np

from ..errors import InputError, PhaseLimit
from ..messages import temperature_text
from ..model import Fluid, finite
from . import _spline
from ._format import celsius, percent, state

GlycolKind = Literal["ethylene-glycol", "propylene-glycol"]
GLYCOL_KINDS: tuple[GlycolKind, ...] = ("ethylene-glycol", "propylene-glycol")
Basis = Literal["mass", "volume"]
BASES: tuple[Basis, ...] = ("mass", "volume")
_TITLES = {"ethylene-glycol": "Ethylene glycol", "propylene-glycol": "Propylene glycol"}
_FILES = {"mass": "{kind}.toml", "volume": "{kind}-volume.toml"}


@dataclass(frozen=True)
class _Rows:
    """Rows interpolated among themselves, with the spline curvatures along s computed once."""

    fractions: np.ndarray  # (rows,)
    density: np.ndarray  # (steps + 1, rows)
    density_m: np.ndarray
    log_viscosity: np.ndarray  # (steps + 1, rows)
    log_viscosity_m: np.ndarray

    @classmethod
    def of(cls, s_knots: np.ndarray, fractions: np.ndarray, density: np.ndarray,
           log_viscosity: np.ndarray) -> _Rows:
        if fractions.size < 4:
            raise ValueError("a side of the corner needs at least 4 rows for the spline")
        return cls(fractions, density, _spline.second_derivatives(s_knots, density),
                   log_viscosity, _spline.second_derivatives(s_knots, log_viscosity))


@dataclass(frozen=True)
class _Table:
    """One glycol's table on one basis."""

    source: str
    basis: Basis
    bottom_k: float
    top_k: float
    s_knots: np.ndarray  # (steps + 1,), shared by every row
    freezing_side: _Rows  # rows whose lowest state is their freezing point
    bottom_side: _Rows | None  # rows from the corner on, starting at bottom_k
    corner: float  # fraction where the sides meet (above every row when there is one side)
    freeze_x: np.ndarray
    freeze_t: np.ndarray
    freeze_m: np.ndarray

    @property
    def low(self) -> float:
        return float(self.freezing_side.fractions[0])

    @property
    def high(self) -> float:
        side = self.bottom_side or self.freezing_side
        return float(side.fractions[-1])

    def freezing_k(self, x: float) -> float:
        return float(_spline.evaluate(self.freeze_x, self.freeze_t, self.freeze_m, x))

    def rows(self, x: float) -> _Rows:
        return self.bottom_side if self.bottom_side is not None and x > self.corner \
            else self.freezing_side


@cache
def _table(kind: GlycolKind, basis: Basis) -> _Table:
    """Read and check ``presets/fluids/<kind>[-volume].toml`` once."""
    name = _FILES[basis].format(kind=kind)
    resource = resources.files("branchwise.presets").joinpath("fluids", name)
    data = tomllib.loads(resource.read_text(encoding="utf-8"))
    if data["basis"] != basis:
        raise ValueError(f"{resource}: basis is {data['basis']!r}, not {basis!r}")
    key = f"{basis}_fraction"
    top = float(data["temperature_top_k"])
    bottom = float(data["temperature_bottom_k"])
    rows = data["row"]
    fractions = np.array([r[key] for r in rows], dtype=float)
    temps = np.array([r["temperature_k"] for r in rows], dtype=float).T
    freeze_x = np.array(data["freezing_point"][key], dtype=float)
    freeze_t = np.array(data["freezing_point"]["temperature_k"], dtype=float)
    freeze_m = _spline.second_derivatives(freeze_x, freeze_t)
    s = (temps - temps[0]) / (temps[-1] - temps[0])
    if not (np.allclose(s, s[:, :1], atol=1e-6) and np.allclose(temps[-1], top)):
        raise ValueError(f"{resource}: rows are not on the shared normalised temperature grid")
    lows = [max(float(_spline.evaluate(freeze_x, freeze_t, freeze_m, x)), bottom)
            for x in fractions]
    if not np.allclose(lows, temps[0], atol=1e-3):
        raise ValueError(f"{resource}: rows do not start at their lowest liquid state")
    s_knots = s[:, 0]
    density = np.array([r["density_kg_m3"] for r in rows], dtype=float).T
    log_mu = np.log(np.array([r["viscosity_pa_s"] for r in rows], dtype=float).T)
    corner = float(data.get("corner_fraction", np.inf))
    left = fractions <= corner
    right = fractions >= corner
    return _Table(
        source=str(data["source"]),
        basis=basis,
        bottom_k=bottom,
        top_k=top,
        s_knots=s_knots,
        freezing_side=_Rows.of(s_knots, fractions[left], density[:, left], log_mu[:, left]),
        bottom_side=(_Rows.of(s_knots, fractions[right], density[:, right], log_mu[:, right])
                     if right.any() else None),
        corner=corner,
        freeze_x=freeze_x,
        freeze_t=freeze_t,
        freeze_m=freeze_m,
    )


def _checked(kind: str, basis: str) -> _Table:
    if kind not in GLYCOL_KINDS:
        raise InputError("fluid.kind", kind, f"must be one of {', '.join(GLYCOL_KINDS)}")
    if basis not in BASES:
        raise ValueError(f"basis must be one of {BASES}, not {basis!r}")
    return _table(kind, basis)


def _checked_fraction(table: _Table, fraction: float) -> float:
    x = finite("fluid.concentration", fraction)
    if not table.low <= x <= table.high:
        raise InputError(
            "fluid.concentration",
            f"{percent(x)} % by {table.basis}",
            f"must be between {percent(table.low)} % and {percent(table.high)} % glycol by "
            f"{table.basis} (the tabulated range)",
        )
    return x


def freezing_point_k(kind: str, fraction: float, basis: Basis = "mass") -> float:
    """Freezing point of the solution, K, at ``fraction`` of glycol (0.10–0.60) by ``basis``
    (kg/kg by mass, m³/m³ by volume).

    Source: the freezing curve of CoolProp's INCOMP::MEG / MPG (by mass) or INCOMP::AEG / APG
    (by volume), tabulated every 1 %. By volume it may lie below the data set's lowest
    temperature (see :func:`lowest_temperature_k`).
    """
    table = _checked(kind, basis)
    return table.freezing_k(_checked_fraction(table, fraction))


def lowest_temperature_k(kind: str, fraction: float, basis: Basis = "mass") -> float:
    """The lowest temperature, K, taken for the solution: its freezing point, or the data set's
    lowest temperature (−35 °C by volume) where the mixture freezes below that."""
    table = _checked(kind, basis)
    return max(table.freezing_k(_checked_fraction(table, fraction)), table.bottom_k)


def glycol(kind: GlycolKind, temperature_k: float, fraction: float,
           basis: Basis = "mass") -> Fluid:
    """A glycol–water solution at ``temperature_k`` (K) with ``fraction`` of glycol by
    ``basis``: kg glycol/kg by mass (the default), m³/m³ by volume.

    Density (kg/m³) and dynamic viscosity (Pa·s) at 101325 Pa (the liquid is treated as
    incompressible), interpolated from CoolProp's INCOMP::MEG / MPG (by mass) or INCOMP::AEG /
    APG (by volume) tables. Refuses temperatures below the mixture's freezing point, below the
    data set's lowest temperature or above 100 °C (``fluid.temperature``), and fractions outside
    10–60 % (``fluid.concentration``).
    """
    table = _checked(kind, basis)
    x = _checked_fraction(table, fraction)
    t = finite("fluid.temperature", temperature_k)
    t_freeze = table.freezing_k(x)
    mixture = f"{_TITLES[kind].lower()} at {percent(x)} % by {basis}"
    if t < t_freeze:
        phase = f"{mixture} freezes at {temperature_text(t_freeze)}"
        raise PhaseLimit("fluid.temperature", state(t), phase, phase)
    if t < table.bottom_k:
        raise InputError(
            "fluid.temperature",
            state(t),
            f"must be at least {temperature_text(table.bottom_k)} (the tabulated range; the "
            f"mixture freezes at {temperature_text(t_freeze)})",
        )
    if t > table.top_k:
        raise InputError(
            "fluid.temperature",
            state(t),
            f"must be at most {temperature_text(table.top_k)} (the tabulated range)",
        )
    t_low = max(t_freeze, table.bottom_k)
    s = (t - t_low) / (table.top_k - t_low)
    rows = table.rows(x)
    rho_rows = _spline.evaluate(table.s_knots, rows.density, rows.density_m, s)
    ln_mu_rows = _spline.evaluate(table.s_knots, rows.log_viscosity, rows.log_viscosity_m, s)
    rho = float(_spline.interpolate(rows.fractions, rho_rows, x))
    mu = float(np.exp(_spline.interpolate(rows.fractions, ln_mu_rows, x)))
    return Fluid(
        name=f"{_TITLES[kind]} {percent(x)} % by {basis} at {celsius(t)} °C",
        density=rho,
        viscosity=mu,
        kind=kind,
        temperature=t,
        source=f"{table.source} table, cubic-spline interpolation",
    )
