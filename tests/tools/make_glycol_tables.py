"""Write the glycol tables in presets/fluids/ from CoolProp's incompressible data.

Developer-only: run it by hand after a CoolProp upgrade, review the diff, commit the tables.
The package never imports this script (nor CoolProp); it reads the TOML files it writes.

    /path/to/python tests/tools/make_glycol_tables.py

Four tables, one per data set:

- ethylene-glycol.toml, propylene-glycol.toml: by mass fraction, INCOMP::MEG / INCOMP::MPG
  (Melinder 2010, "Properties of secondary working fluids for indirect systems", IIR);
- ethylene-glycol-volume.toml, propylene-glycol-volume.toml: by volume fraction,
  INCOMP::AEG / INCOMP::APG (ASHRAE Handbook — Fundamentals 2001, as fitted by Skovrup's
  SecCool 1.33, 2013). These data sets are given by volume; a volume concentration is read
  from them as it stands, with no conversion to mass.

Layout of a table (why it is not a plain rectangle in temperature): CoolProp refuses states
below a mixture's freezing point, and that point falls from about −3 °C at 10 % to about
−50 °C at 60 %; the volume-based sets also stop at a fixed lowest temperature (−35 °C) that the
stronger mixtures' freezing points fall below. So every concentration row runs from its own
lowest state, the higher of its freezing point and the data set's lowest temperature, up to
100 °C in the same number of equal steps (no step wider than 2.5 K). In the normalised
temperature s = (T − T_low) / (T_top − T_low) the grid is a rectangle, every node is a real
liquid state, and the lower limit is a grid line, which keeps the spline accurate right down to
it. Where the lower limit switches from the freezing line to the fixed lowest temperature it
has a corner; a row is placed exactly there (``corner_fraction``), and the reader never
interpolates across it (across it, with rows every 5 %, viscosity was measured up to 6 % off
next to the corner; with the corner row and rows every 2.5 %, 1.9e-4 at worst).
"""

from __future__ import annotations

import math
import sys
from dataclasses import dataclass
from pathlib import Path

import CoolProp
from CoolProp.CoolProp import PropsSI
from scipy.optimize import brentq

OUT_DIR = Path(__file__).resolve().parents[2] / "presets" / "fluids"
PRESSURE_PA = 101325.0
TEMPERATURE_TOP_K = 373.15  # CoolProp's upper limit for all four data sets (100 °C)
MAX_STEP_K = 2.5
FREEZING_STEP = 0.01  # the freezing line is tabulated every 1 %


@dataclass(frozen=True)
class DataSet:
    """One CoolProp incompressible data set and the table written from it."""

    kind: str
    basis: str  # "mass" or "volume": what the fraction is a fraction of
    code: str  # CoolProp's name, INCOMP::<code>
    title: str
    reference: str  # the data behind CoolProp's fit (CoolProp's own reference for the set)
    bottom_k: float  # CoolProp's lowest temperature for the set (Tmin)
    low: float  # lowest and highest fraction
    high: float
    row_step: float  # rows every this much (plus the corner row, if any)

    @property
    def file_name(self) -> str:
        return f"{self.kind}.toml" if self.basis == "mass" else f"{self.kind}-{self.basis}.toml"


# CoolProp's own references for the sets (its bibliography: Melinder2010; ASHRAE2001 and
# Skovrup2013).
MELINDER = "Melinder, Properties of Secondary Working Fluids for Indirect Systems (IIR 2010)"
ASHRAE = ("2001 ASHRAE Handbook: Fundamentals, as fitted in SecCool Properties 1.33 "
          "(Skovrup 2013)")

DATA_SETS = (
    DataSet("ethylene-glycol", "mass", "MEG", "Ethylene glycol (monoethylene glycol) in water",
            MELINDER, 173.15, 0.10, 0.60, 0.05),
    DataSet("propylene-glycol", "mass", "MPG",
            "Propylene glycol (monopropylene glycol) in water", MELINDER, 173.15, 0.10, 0.60,
            0.05),
    DataSet("ethylene-glycol", "volume", "AEG", "Ethylene glycol in water", ASHRAE, 238.15,
            0.10, 0.60, 0.025),
    DataSet("propylene-glycol", "volume", "APG", "Propylene glycol in water", ASHRAE, 238.15,
            0.10, 0.60, 0.025),
)


def _coolprop(output: str, temperature_k: float, code: str, fraction: float) -> float:
    return PropsSI(output, "T", temperature_k, "P", PRESSURE_PA, f"INCOMP::{code}[{fraction}]")


def _freezing_k(code: str, fraction: float) -> float:
    return _coolprop("T_freeze", 300.0, code, fraction)


def _check_limits(data: DataSet) -> None:
    """The set's own limits, as CoolProp states them, are the ones written into the table."""
    probe = f"INCOMP::{data.code}[{data.low}]"
    t_min = PropsSI("Tmin", "T", 300.0, "P", PRESSURE_PA, probe)
    t_max = PropsSI("Tmax", "T", 300.0, "P", PRESSURE_PA, probe)
    if not (math.isclose(t_min, data.bottom_k) and math.isclose(t_max, TEMPERATURE_TOP_K)):
        raise SystemExit(f"INCOMP::{data.code}: CoolProp now gives {t_min}–{t_max} K")
    for fraction in (data.low, data.high):  # raises if CoolProp no longer takes the ends
        _freezing_k(data.code, fraction)


def _corner(data: DataSet) -> float | None:
    """The fraction where the freezing point meets the set's lowest temperature, or None."""
    gap = lambda x: _freezing_k(data.code, x) - data.bottom_k  # noqa: E731
    if gap(data.high) >= 0:
        return None
    return float(brentq(gap, data.low, data.high, xtol=1e-12))


def _numbers(values: list[float], per_line: int = 6) -> str:
    """A TOML array, a few numbers to a line so diffs stay readable."""
    text = [f"{v:.10g}" for v in values]
    lines = [", ".join(text[i : i + per_line]) for i in range(0, len(text), per_line)]
    return "[\n    " + ",\n    ".join(lines) + ",\n]"


def table_text(data: DataSet) -> str:
    _check_limits(data)
    key = f"{data.basis}_fraction"
    freezing_fractions = [round(data.low + FREEZING_STEP * i, 2)
                          for i in range(round((data.high - data.low) / FREEZING_STEP) + 1)]
    freezing = [_freezing_k(data.code, x) for x in freezing_fractions]
    corner = _corner(data)
    rows = [round(data.low + data.row_step * i, 4)
            for i in range(round((data.high - data.low) / data.row_step) + 1)]
    if corner is not None:
        # The corner replaces the nearest row, so that no two rows crowd each other.
        rows = sorted([x for x in rows if abs(x - corner) > data.row_step / 2] + [corner])
    lows = {x: max(_freezing_k(data.code, x), data.bottom_k) for x in rows}
    widest = max(TEMPERATURE_TOP_K - t for t in lows.values())
    steps = math.ceil(widest / MAX_STEP_K)
    version = CoolProp.__version__
    out = [
        f"# {data.title}: density and dynamic viscosity of the liquid",
        f"# at {PRESSURE_PA:.0f} Pa, by {data.basis} fraction of glycol, from its lowest state to "
        "100 °C.",
        f"# Source: CoolProp {version}, incompressible fluid INCOMP::{data.code}, CoolProp's fit",
        f"# to {data.reference}.",
        "# Generated by tests/tools/make_glycol_tables.py; do not edit by hand, re-run the script.",
        "# Each [[row]] runs from its lowest state (the higher of its freezing point and",
        "# temperature_bottom_k, CoolProp's lowest temperature for the data set) to",
        f"# temperature_top_k in equal steps, the same number of steps ({steps}) for every row.",
        "# Units: K, kg/m³, Pa·s, and fractions of 1 (m³/m³ for volume: the glycol's volume before",
        "# mixing over the sum of the two volumes).",
        "",
        "format = 1",
        f'kind = "{data.kind}"',
        f'basis = "{data.basis}"',
        f'source = "CoolProp {version} INCOMP::{data.code}"',
        f'reference = "{data.reference}"',
        'generated_by = "tests/tools/make_glycol_tables.py"',
        f"pressure_pa = {PRESSURE_PA:.1f}",
        f"temperature_bottom_k = {data.bottom_k}",
        f"temperature_top_k = {TEMPERATURE_TOP_K}",
        f"steps = {steps}",
    ]
    if corner is not None:
        out.append(f"corner_fraction = {corner:.10g}")
    out += [
        "",
        "[freezing_point]",
        f"{key} = {_numbers(freezing_fractions, 10)}",
        f"temperature_k = {_numbers(freezing)}",
    ]
    for x in rows:
        x = float(f"{x:.10g}")  # as written, so the nodes are CoolProp's values at that fraction
        t_low = max(_freezing_k(data.code, x), data.bottom_k)
        temps = [t_low + (TEMPERATURE_TOP_K - t_low) * j / steps for j in range(steps + 1)]
        temps[-1] = TEMPERATURE_TOP_K
        density = [_coolprop("D", t, data.code, x) for t in temps]
        viscosity = [_coolprop("V", t, data.code, x) for t in temps]
        out += [
            "",
            "[[row]]",
            f"{key} = {x:.10g}",
            f"temperature_k = {_numbers(temps)}",
            f"density_kg_m3 = {_numbers(density)}",
            f"viscosity_pa_s = {_numbers(viscosity)}",
        ]
    return "\n".join(out) + "\n"


def main() -> int:
    OUT_DIR.mkdir(parents=True, exist_ok=True)
    for data in DATA_SETS:
        path = OUT_DIR / data.file_name
        tmp = path.with_suffix(".toml.tmp")
        tmp.write_text(table_text(data), encoding="utf-8")
        tmp.replace(path)
        print(f"wrote {path}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
