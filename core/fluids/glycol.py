"""Ethylene- and propylene-glycol solutions in water, interpolated from shipped tables.

The tables (``presets/fluids/<kind>.toml``) hold CoolProp's incompressible-fluid values
(INCOMP::MEG, INCOMP::MPG) at 101325 Pa, written by ``tests/tools/make_glycol_tables.py``, so
the package needs neither CoolProp nor scipy at run time.

Each concentration row runs from that mixture's freezing point to 100 °C in equal steps, so in
the normalised temperature s = (T − T_freeze(x)) / (T_top − T_freeze(x)) the nodes form a
rectangle. A query is answered by a tensor-product cubic spline (not-a-knot): along s in every
row, then across the rows at the mass fraction x. Viscosity is interpolated as ln μ, which is
nearly linear in temperature where μ itself changes a thousandfold. The freezing curve is a
separate, finer table (every 1 %), interpolated by a cubic spline in x.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from functools import cache
from importlib import resources
from typing import Literal

import numpy as np

from ..errors import InputError
from ..messages import temperature_text
from ..model import Fluid, finite
from . import _spline
from ._format import celsius, percent, state

GlycolKind = Literal["ethylene-glycol", "propylene-glycol"]
GLYCOL_KINDS: tuple[GlycolKind, ...] = ("ethylene-glycol", "propylene-glycol")
_TITLES = {"ethylene-glycol": "Ethylene glycol", "propylene-glycol": "Propylene glycol"}


@dataclass(frozen=True)
class _Table:
    """One glycol's table, with the spline curvatures along s computed once."""

    source: str
    top_k: float
    fractions: np.ndarray  # (rows,)
    s_knots: np.ndarray  # (steps + 1,), shared by every row
    density: np.ndarray  # (steps + 1, rows)
    density_m: np.ndarray
    log_viscosity: np.ndarray  # (steps + 1, rows)
    log_viscosity_m: np.ndarray
    freeze_x: np.ndarray
    freeze_t: np.ndarray
    freeze_m: np.ndarray


@cache
def _table(kind: GlycolKind) -> _Table:
    """Read and check ``presets/fluids/<kind>.toml`` once."""
    resource = resources.files("branchwise.presets").joinpath("fluids", f"{kind}.toml")
    data = tomllib.loads(resource.read_text(encoding="utf-8"))
    top = float(data["temperature_top_k"])
    rows = data["row"]
    fractions = np.array([r["mass_fraction"] for r in rows], dtype=float)
    temps = np.array([r["temperature_k"] for r in rows], dtype=float).T
    freeze_x = np.array(data["freezing_point"]["mass_fraction"], dtype=float)
    freeze_t = np.array(data["freezing_point"]["temperature_k"], dtype=float)
    s = (temps - temps[0]) / (temps[-1] - temps[0])
    if not (np.allclose(s, s[:, :1], atol=1e-6) and np.allclose(temps[-1], top)):
        raise ValueError(f"{resource}: rows are not on the shared normalised temperature grid")
    if not np.allclose(np.interp(fractions, freeze_x, freeze_t), temps[0], atol=1e-6):
        raise ValueError(f"{resource}: row freezing points disagree with [freezing_point]")
    s_knots = s[:, 0]
    density = np.array([r["density_kg_m3"] for r in rows], dtype=float).T
    log_mu = np.log(np.array([r["viscosity_pa_s"] for r in rows], dtype=float).T)
    return _Table(
        source=str(data["source"]),
        top_k=top,
        fractions=fractions,
        s_knots=s_knots,
        density=density,
        density_m=_spline.second_derivatives(s_knots, density),
        log_viscosity=log_mu,
        log_viscosity_m=_spline.second_derivatives(s_knots, log_mu),
        freeze_x=freeze_x,
        freeze_t=freeze_t,
        freeze_m=_spline.second_derivatives(freeze_x, freeze_t),
    )


def _checked_kind(kind: str) -> GlycolKind:
    if kind not in GLYCOL_KINDS:
        raise InputError("fluid.kind", kind, f"must be one of {', '.join(GLYCOL_KINDS)}")
    return kind


def _checked_fraction(table: _Table, mass_fraction: float) -> float:
    x = finite("fluid.concentration", mass_fraction)
    lo, hi = float(table.fractions[0]), float(table.fractions[-1])
    if not lo <= x <= hi:
        raise InputError(
            "fluid.concentration",
            f"{percent(x)} %",
            f"must be between {percent(lo)} % and {percent(hi)} % glycol by mass "
            "(the tabulated range)",
        )
    return x


def freezing_point_k(kind: str, mass_fraction: float) -> float:
    """Freezing point of the solution, K, at ``mass_fraction`` of glycol (kg/kg, 0.10–0.60).

    Source: CoolProp INCOMP::MEG / INCOMP::MPG freezing curve, tabulated every 1 %.
    """
    table = _table(_checked_kind(kind))
    x = _checked_fraction(table, mass_fraction)
    return float(_spline.evaluate(table.freeze_x, table.freeze_t, table.freeze_m, x))


def glycol(kind: GlycolKind, temperature_k: float, mass_fraction: float) -> Fluid:
    """A glycol–water solution at ``temperature_k`` (K) and ``mass_fraction`` (kg glycol/kg).

    Density (kg/m³) and dynamic viscosity (Pa·s) at 101325 Pa (the liquid is treated as
    incompressible), interpolated from CoolProp's INCOMP::MEG / INCOMP::MPG tables. Refuses
    temperatures below the mixture's freezing point or above 100 °C (``fluid.temperature``) and
    mass fractions outside 10–60 % (``fluid.concentration``).
    """
    table = _table(_checked_kind(kind))
    x = _checked_fraction(table, mass_fraction)
    t = finite("fluid.temperature", temperature_k)
    t_freeze = float(_spline.evaluate(table.freeze_x, table.freeze_t, table.freeze_m, x))
    if t < t_freeze:
        raise InputError(
            "fluid.temperature",
            state(t),
            f"{_TITLES[kind].lower()} at {percent(x)} % freezes at {temperature_text(t_freeze)}",
        )
    if t > table.top_k:
        raise InputError(
            "fluid.temperature",
            state(t),
            f"must be at most {temperature_text(table.top_k)} (the tabulated range)",
        )
    s = (t - t_freeze) / (table.top_k - t_freeze)
    rho_rows = _spline.evaluate(table.s_knots, table.density, table.density_m, s)
    ln_mu_rows = _spline.evaluate(table.s_knots, table.log_viscosity, table.log_viscosity_m, s)
    rho = float(_spline.interpolate(table.fractions, rho_rows, x))
    mu = float(np.exp(_spline.interpolate(table.fractions, ln_mu_rows, x)))
    return Fluid(
        name=f"{_TITLES[kind]} {percent(x)} % by mass at {celsius(t)} °C",
        density=rho,
        viscosity=mu,
        kind=kind,
        temperature=t,
        source=f"{table.source} table, cubic-spline interpolation",
    )
