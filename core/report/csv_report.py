"""The results as CSV: tidy data for a spreadsheet or a data frame.

One header row, then one row per segment, and nothing else: a column sums to what it says.
The header carries each column's unit in plain ASCII (``Flow (L/s)``, ``Flow (m3/h)``,
``Velocity (ft/s)``), so that a spreadsheet's default import never garbles ``°``, ``³`` or ``µ``.
Numbers are written at full precision (the shortest text that reads back as the same double);
a text cell that a spreadsheet would run as a formula is neutralised (OWASP, "CSV Injection").

A branch's own figures (its flow, share, P5/P95 band and valve loss) are on its first segment's
row only, empty on its further segments, so the flow column sums to the total flow (the valve
loss is empty too for a branch with no valve). Everything
that is not a row of the table — the liquid, the given reading, the totals, a found unknown,
the record, the bands of the totals, warnings, notes and cautions — is in the human-readable
formats (table, Markdown, HTML) and in the JSON; the command line prints what was assumed, the
warnings, the notes and the cautions on standard error when it writes CSV.
"""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Callable
from dataclasses import dataclass

from ..numerics.results import BranchResult, SegmentResult
from ..site.solve import SiteResult
from ..units import Units, unit_label, units_for

FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r", "\n", "\uff1d", "\uff0b", "\uff0d", "\uff20")
"""First characters that make a spreadsheet read a cell as a formula (OWASP CSV Injection:
``=``, ``+``, ``-``, ``@``, tab, carriage return; the full-width forms too, which some
spreadsheets fold to the ASCII ones)."""

_ASCII = (("°C", "degC"), ("°F", "degF"), ("²", "2"), ("³", "3"), ("·", "*"), ("µ", "u"),
          ("μ", "u"), ("Δ", "d"))


def ascii_unit(unit: str) -> str:
    """A unit's label in plain ASCII: ``m³/h`` → ``m3/h``, ``°C`` → ``degC``, ``µm`` → ``um``."""
    text = unit_label(unit)
    for fancy, plain in _ASCII:
        text = text.replace(fancy, plain)
    return text.encode("ascii", "replace").decode("ascii")


def safe_text(text: str) -> str:
    """A text cell a spreadsheet shows as text: one line, and led by ``'`` where it would
    otherwise start a formula (``=HYPERLINK(…)`` → ``'=HYPERLINK(…)``)."""
    one = " ".join(text.split()) if text.strip() else ""
    return "'" + one if one.startswith(FORMULA_STARTS) else one


def full(value: float | None) -> str:
    """A number at full precision (``repr``: it reads back as the same double), or '' when
    absent or not finite."""
    if value is None or not math.isfinite(value):
        return ""
    return repr(float(value))


@dataclass(frozen=True)
class CsvColumn:
    """A column: its title, the units kind of its values (None: no unit), and the value of a
    segment row (branch index, branch, segment index, segment); ``branch_level`` values
    appear on the branch's first segment only."""

    title: str
    kind: str | None
    value: Callable[[int, BranchResult, int, SegmentResult], float | str | None]
    branch_level: bool = False


def _valve_loss(sr: SiteResult) -> Callable[[int, BranchResult, int, SegmentResult],
                                            float | None]:
    """A branch's valve loss, blank for a branch with no valve (as the other reports and the
    app: a 0 would read as a valve that loses nothing)."""
    branches = sr.result.network.branches

    def get(i: int, b: BranchResult, j: int, s: SegmentResult) -> float | None:
        return b.valve_loss if branches[i].valve_kv is not None else None
    return get


def _columns(sr: SiteResult) -> list[CsvColumn]:
    tags = [b.tag if isinstance(b.tag, str) else "" for b in sr.site.branches]

    def tag(i: int, b: BranchResult, j: int, s: SegmentResult) -> str:
        return tags[i] if i < len(tags) else ""

    cols = [
        CsvColumn("Branch", None, lambda i, b, j, s: b.name),
        CsvColumn("Segment", None, lambda i, b, j, s: str(j + 1)),
        CsvColumn("Tag", None, tag, branch_level=True),
        CsvColumn("Flow", "flow", lambda i, b, j, s: b.flow, branch_level=True),
    ]
    if sr.uncertainty is not None:
        outputs = sr.uncertainty.outputs

        def band(which: str) -> Callable[[int, BranchResult, int, SegmentResult], float | None]:
            def get(i: int, b: BranchResult, j: int, s: SegmentResult) -> float | None:
                out = outputs.get(f"branch '{b.name}' flow")
                return None if out is None else float(getattr(out, which))
            return get

        cols += [CsvColumn("Flow P5", "flow", band("p5"), branch_level=True),
                 CsvColumn("Flow P95", "flow", band("p95"), branch_level=True)]
    cols += [
        CsvColumn("Share", "%", lambda i, b, j, s: b.share * 100, branch_level=True),
        CsvColumn("Velocity", "velocity", lambda i, b, j, s: s.velocity),
        CsvColumn("Reynolds", None, lambda i, b, j, s: s.reynolds),
        CsvColumn("Friction factor", None, lambda i, b, j, s: s.friction_factor),
        CsvColumn("Regime", None, lambda i, b, j, s: s.regime),
        CsvColumn("Diameter", "diameter", lambda i, b, j, s: s.diameter),
        CsvColumn("Length", "length", lambda i, b, j, s: s.length),
        CsvColumn("Roughness", "roughness", lambda i, b, j, s: s.roughness),
        CsvColumn("K", None, lambda i, b, j, s: s.minor_k),
        CsvColumn("Major loss", "head", lambda i, b, j, s: s.major_loss),
        CsvColumn("Minor loss", "head", lambda i, b, j, s: s.minor_loss),
        CsvColumn("Valve loss", "head", _valve_loss(sr), branch_level=True),
    ]
    return cols


def header(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """The titles with their ASCII units: ``Flow (L/s)``, ``Share (%)``, ``Reynolds``."""
    u = units_for(reader)
    out = []
    for c in _columns(sr):
        unit = "%" if c.kind == "%" else ascii_unit(u.unit(c.kind)) if c.kind else ""
        out.append(f"{c.title} ({unit})" if unit else c.title)
    return out


def rows(sr: SiteResult, reader: Units | str = "si") -> list[list[str]]:
    """The header, then one row per segment, every cell as text (numbers at full precision,
    texts neutralised)."""
    u = units_for(reader)
    cols = _columns(sr)
    table = [header(sr, u)]
    for i, b in enumerate(sr.result.branches):
        for j, s in enumerate(b.segments):
            row = []
            for c in cols:
                if c.branch_level and j > 0:
                    row.append("")
                    continue
                v = c.value(i, b, j, s)
                if isinstance(v, str):
                    row.append(safe_text(v))
                elif v is None or c.kind in (None, "%"):
                    row.append(full(v))
                else:
                    row.append(full(u.value(v, c.kind)))
            table.append(row)
    return table


def to_csv(sr: SiteResult, reader: Units | str = "si") -> str:
    """The results as tidy CSV in the reader's units (see the module docstring): RFC 4180,
    every row the same width, ``\\n`` line ends."""
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerows(rows(sr, reader))
    return buf.getvalue()


def to_tsv(sr: SiteResult, reader: Units | str = "si") -> str:
    """The same rows tab-separated, for pasting into a spreadsheet (the app's copy)."""
    return "\n".join("\t".join(c.replace("\t", " ") for c in r) for r in rows(sr, reader)) + "\n"
