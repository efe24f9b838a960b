"""Loss coefficients K of fittings and valves (Crane TP-410), and K from a valve's Kv or Cv.

Crane's method (Crane Co., *Flow of Fluids Through Valves, Fittings, and Pipe*, Technical Paper
No. 410): K = n·f_T, with n a number per fitting type (``presets/fittings.toml``) and f_T the fully
turbulent Darcy friction factor of clean commercial steel pipe at the fitting's nominal size.

f_T here is Crane's own formula, Colebrook's limit at full turbulence,
f_T = 0.25 / [log10(ε / (3.7 D))]², with ε = 0.045 mm and D the Schedule 40 inner diameter
(ASME B36.10M) of the nominal size. Over NPS 1/2–24 this agrees with ``fluids.friction.ft_Crane``
within 1 % (0.95 % at NPS 1/2, under 0.4 % from NPS 2 up) and with Crane's two-digit f_T table
within about 5 %.

Which nominal size: K depends on the pipe only through f_T (and, for butterfly valves, through n).
For any pipe (not steel, or not a standard size) the nominal size is the NPS whose Schedule 40
inner diameter is nearest the pipe's inner diameter, within Crane's range NPS 1/2–24; a bore
outside that range takes the end size. A 1 in type L copper tube (ID 26.0 mm) thus takes
f_T of NPS 1 (26.6 mm).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from functools import cache, lru_cache
from typing import Any

from ..errors import InputError, describe
from ..model import KV_REFERENCE_DP_PA, kv_from_cv, non_negative, positive
from . import _data
from .pipes import PipeSize, nominal_value, sizes

CRANE_ROUGHNESS_M = 0.045e-3
"""Clean commercial steel, m (Moody 1944: 0.00015 ft, commonly written 0.045 mm)."""
CRANE_NPS_RANGE = (0.5, 24.0)
"""Nominal sizes covered by Crane's f_T table, NPS."""


@dataclass(frozen=True)
class Fitting:
    """One fitting type: K = n·f_T (``n``, or ``n_by_nps`` rows), or a fixed ``k``.

    n_by_nps: rows (from NPS, to NPS, n) for fittings whose n changes with size (butterfly
    valves). ``source`` names the table the number comes from.
    """

    key: str
    name: str
    n: float | None
    k: float | None
    source: str
    n_by_nps: tuple[tuple[float, float, float], ...] = ()
    aliases: tuple[str, ...] = ()
    """Other keys read as this one (keys of earlier versions)."""

    def n_at(self, nps: float) -> float | None:
        """n at nominal size ``nps``; the nearest row outside the tabulated range."""
        if not self.n_by_nps:
            return self.n
        for low, high, n in self.n_by_nps:
            if low <= nps <= high:
                return n
        rows = sorted(self.n_by_nps)
        if nps < rows[0][0]:
            return rows[0][2]
        if nps > rows[-1][1]:
            return rows[-1][2]
        # between rows (e.g. NPS 9): the row whose range is nearest
        return min(rows, key=lambda r: min(abs(nps - r[0]), abs(nps - r[1])))[2]


def crane_bend_n(angle_deg: float, r_over_d: float, n_90: float) -> float:
    """n of a bend of ``angle_deg`` from its 90° value, by Crane TP-410's formula.

    K = (m − 1)(0.25 π f_T r/d + 0.5 K₉₀) + K₉₀, with m = angle/90 the number of 90° bends and
    K₉₀ = n_90 f_T; dividing by f_T gives n. angle_deg: degrees; r_over_d: bend radius over
    inner diameter (–).
    """
    m = angle_deg / 90.0
    return (m - 1.0) * (0.25 * math.pi * r_over_d + 0.5 * n_90) + n_90


def _fitting(raw: dict[str, Any]) -> Fitting:
    n = raw.get("n")
    if "bend" in raw:
        bend = raw["bend"]
        n = crane_bend_n(bend["angle_deg"], bend["r_over_d"], bend["n_90"])
    rows = tuple((float(low), float(high), float(n)) for low, high, n in raw.get("n_by_nps", ()))
    return Fitting(
        key=raw["key"],
        name=raw["name"],
        n=None if n is None else float(n),
        k=None if raw.get("k") is None else float(raw["k"]),
        source=raw["source"],
        n_by_nps=rows,
        aliases=tuple(raw.get("aliases", ())),
    )


@cache
def _fittings() -> dict[str, Fitting]:
    return {f.key: f for f in (_fitting(raw) for raw in _data.load("fittings.toml")["fitting"])}


@cache
def _aliases() -> dict[str, Fitting]:
    return {alias: f for f in _fittings().values() for alias in f.aliases}


def fittings() -> list[Fitting]:
    """Every fitting type shipped, in file order."""
    return list(_fittings().values())


def fitting(key: str, field: str = "fittings") -> Fitting:
    """The fitting ``key`` or one of its aliases (an earlier key), case and spaces forgiven;
    InputError listing close keys otherwise."""
    wanted = "-".join(key.strip().lower().replace("_", " ").split())
    found = _fittings().get(wanted) or _aliases().get(wanted)
    if found is None:
        close = _data.close_matches(wanted, list(_fittings()))
        if not close:  # a kind the list does not hold (a strainer, a coil): its K is typed
            raise InputError(field, describe(key), "unknown fitting, and none of the list is "
                             "close to it; give a part the list does not hold (a strainer, a "
                             "coil) as its K, from its maker's data (minor_k)")
        raise InputError(field, describe(key),
                         f"unknown fitting; did you mean {_data.spoken_list(close)}")
    return found


@cache
def _sch40() -> tuple[PipeSize, ...]:
    low, high = CRANE_NPS_RANGE
    return tuple(
        p for p in sizes("ASME B36.10M", "40") if low <= float(nominal_value(p.nominal)) <= high
    )


def crane_nominal(inner_diameter_m: float) -> PipeSize:
    """The Schedule 40 steel size whose bore is nearest ``inner_diameter_m`` (m), NPS 1/2–24."""
    return _nearest_sch40(positive("inner_diameter", inner_diameter_m))


@lru_cache(maxsize=1024)
def _nearest_sch40(d: float) -> PipeSize:
    """The nearest size to a bore, remembered (every fitting of every branch asks, on every
    solve; a site has a few bores)."""
    return min(_sch40(), key=lambda p: abs(p.inner_diameter_m - d))


def crane_ft(inner_diameter_m: float) -> float:
    """Crane's f_T (–) for a fitting in a pipe of bore ``inner_diameter_m`` (m).

    f_T = 0.25 / [log10(ε / (3.7 D))]² (Crane TP-410; Colebrook, 1939, at Re → ∞), with
    ε = 0.045 mm and D the Schedule 40 bore of the nearest nominal size (module docstring).
    """
    return _ft_at(crane_nominal(inner_diameter_m).inner_diameter_m)


@cache
def _ft_at(d40: float) -> float:
    return 0.25 / math.log10(CRANE_ROUGHNESS_M / (3.7 * d40)) ** 2


def fitting_k(
    key: str, inner_diameter_m: float, count: float = 1, field: str = "fittings"
) -> float:
    """K (–) of ``count`` fittings ``key`` in a pipe of bore ``inner_diameter_m`` (m).

    K refers to the velocity in that pipe. ``count`` may be fractional but not negative.
    """
    f = fitting(key, field)
    number = non_negative(f"{field}.{f.key}", count)
    if f.k is not None:
        return number * f.k
    nominal = crane_nominal(inner_diameter_m)
    n = f.n_at(float(nominal_value(nominal.nominal)))
    if n is None:  # a data file without n or k; caught by the tests, never by a user
        raise InputError(f"{field}.{f.key}", key, "has neither n nor k in fittings.toml")
    return number * n * _ft_at(nominal.inner_diameter_m)


def fittings_k(
    counts: Mapping[str, float], inner_diameter_m: float, field: str = "fittings"
) -> float:
    """Sum of K (–) over ``counts`` (fitting key → how many) in a pipe of bore d (m)."""
    return sum(fitting_k(key, inner_diameter_m, count, field) for key, count in counts.items())


# ---- valve flow coefficients -----------------------------------------------------------------

KV_REFERENCE_DENSITY = 1000.0
"""Reference density of water in the Kv definition, kg/m³ (IEC 60534-2-1: ρ/ρ₀, ρ₀ = 1000)."""


def k_from_kv(kv_m3_h: float, inner_diameter_m: float, field: str = "kv") -> float:
    """Loss coefficient K (–) of a valve with flow coefficient ``kv_m3_h`` in a pipe of bore d (m).

    Derivation. Kv (IEC 60534): Q = Kv·√(Δp/Δp₀ · ρ₀/ρ), Q in m³/h, Δp₀ = 1 bar, ρ₀ = 1000 kg/m³,
    so Δp = Δp₀ (ρ/ρ₀)(Q/Kv)². A loss coefficient is K = Δp / (ρ V²/2) = 2 g h / V² with
    h = Δp/(ρ g), and V = Q / (3600 · π d²/4). Substituting:

        K = 2 (Δp₀/ρ₀) (3600 π d²/4)² / Kv² = (2·100·3600²·π²/16) d⁴/Kv² ≈ 1.5989e9 d⁴/Kv²

    with d in m; with d in mm, K ≈ 0.0016 d⁴/Kv² (the check quoted by Crane TP-410 and others).
    The density cancels: K is a property of the geometry.
    """
    kv = positive(field, kv_m3_h)
    d = positive("inner_diameter", inner_diameter_m)
    area = math.pi * d * d / 4.0
    return 2.0 * (KV_REFERENCE_DP_PA / KV_REFERENCE_DENSITY) * (3600.0 * area) ** 2 / kv**2


def k_from_cv(cv: float, inner_diameter_m: float, field: str = "cv") -> float:
    """K (–) from a US flow coefficient Cv (US gpm at 1 psi, specific gravity 1); d in m.

    Cv converts to Kv by units alone (:data:`~branchwise.core.model.CV_PER_KV`, the one constant).
    SG is taken against 1000 kg/m³ as for Kv; against water at 60 °F (999.0 kg/m³) it would differ
    by 0.1 %.
    """
    return k_from_kv(kv_from_cv(positive(field, cv)), inner_diameter_m, field)
