"""The columns of the results tables (text, CSV, Markdown) and the cells of each segment row."""

from __future__ import annotations

import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

from ..messages import reynolds_text
from ..numerics.results import BranchResult
from ..site.solve import SiteResult
from ..site.spec import Site
from ..units import Units, format_number, units_for
from . import band


@dataclass(frozen=True)
class Column:
    """A results column: ``kind`` is the units kind of its values (``"%"`` for a share, None
    for a value without a unit); ``numeric`` columns are right-aligned in the text table,
    which shows ``short`` as the title where one is given."""

    key: str
    title: str
    kind: str | None = None
    numeric: bool = True
    short: str | None = None


_ALL = (
    Column("branch", "Branch", numeric=False), Column("tag", "Tag", numeric=False),
    Column("seg", "Seg"), Column("flow", "Flow", "flow"), Column("band", "P5–P95", "flow"),
    Column("share", "Share", "%"), Column("velocity", "Velocity", "velocity"),
    Column("reynolds", "Reynolds", short="Re"), Column("f", "f"),
    Column("regime", "Regime", numeric=False),
    Column("diameter", "Diameter", "diameter"), Column("length", "Length", "length"),
    Column("major", "Major loss", "head"), Column("minor", "Minor loss", "head"),
    Column("valve", "Valve loss", "head"),
)
COLUMNS = {c.key: c for c in _ALL}
FLOW_TABLE = ("branch", "tag", "seg", "flow", "band", "share", "velocity", "reynolds", "regime")
LOSS_TABLE = ("branch", "seg", "diameter", "length", "f", "major", "minor", "valve")
RESULT_TABLE = ("branch", "tag", "seg", "flow", "band", "share", "velocity", "reynolds", "f",
                "regime", "diameter", "length", "major", "minor", "valve")
"""The columns of the Markdown record and of the CSV (whose ``tag`` comes last)."""


def unit_text(key: str, reader: Units | str) -> str:
    """The unit label of column ``key`` for this reader (``L/s``, ``gpm``, ``%``), or ''."""
    kind = COLUMNS[key].kind
    if kind is None:
        return ""
    return "%" if kind == "%" else units_for(reader).label(kind)


def titled(key: str, reader: Units | str) -> str:
    """``Flow (L/s)``: a column's title with its unit, for the CSV and Markdown headers."""
    unit = unit_text(key, reader)
    return f"{COLUMNS[key].title} ({unit})" if unit else COLUMNS[key].title


def _tag(site: Site, index: int) -> str:
    tag = site.branches[index].tag if index < len(site.branches) else None
    return " ".join(tag.split()) if isinstance(tag, str) else ""


def segment_rows(
    sr: SiteResult, reader: Units | str
) -> Iterator[tuple[BranchResult, int, dict[str, str]]]:
    """(branch, segment index, cells by column key) for every segment; the branch's own cells
    (name, tag, flow, band, share, valve loss) only on its first segment's row."""
    q = units_for(reader).number
    valves = [b.valve_kv is not None for b in sr.result.network.branches]  # blank without one

    for i, b in enumerate(sr.result.branches):
        for j, s in enumerate(b.segments):
            first = j == 0
            cells = {
                "velocity": q(s.velocity, "velocity"), "reynolds": reynolds_text(s.reynolds),
                "f": format_number(s.friction_factor, 4),
                "regime": "no flow" if s.regime == "none" else s.regime,
                "diameter": q(s.diameter, "diameter"), "length": q(s.length, "length"),
                "major": q(s.major_loss, "head"), "minor": q(s.minor_loss, "head"),
                "seg": str(j + 1) if len(b.segments) > 1 else "",
            }
            if first:
                cells.update({
                    "branch": b.name, "tag": _tag(sr.site, i), "flow": q(b.flow, "flow"),
                    "band": band.flow_band_cell(sr, b.name, reader),
                    "share": format_number(b.share * 100, 3) if math.isfinite(b.share) else "",
                    "valve": q(b.valve_loss, "head") if valves[i] else "",
                })
            yield b, j, cells


def used(keys: Sequence[str], rows: list[dict[str, str]]) -> list[str]:
    """``keys`` without the columns empty on every row (the first column always stays)."""
    return [k for n, k in enumerate(keys) if n == 0 or any(r.get(k) for r in rows)]
