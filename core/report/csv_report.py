"""The results as CSV for a spreadsheet, in the reader's units with the units in the headers."""

from __future__ import annotations

import csv
import io
from collections.abc import Sequence

from ..finds import found_kind, found_noun
from ..site.solve import SiteResult
from ..units import Units, format_number, units_for
from . import band
from .columns import RESULT_TABLE, segment_rows, titled, unit_text
from .lines import (
    CAUTIONS,
    notes_of,
    record_lines,
    solved_lines,
    summary_lines,
    warning_lines,
)

CSV_LABELS = ("Result", "Value", "Record", "Band", "Warning", "Note", "Caution")
"""First cells of the rows after the data, saying what each row carries."""


def to_csv(sr: SiteResult, reader: Units | str = "si") -> str:
    """The results for a spreadsheet: every row the same width, no comment lines.

    A header row with units (``Flow (L/s)``), one row per segment (each naming its branch and
    segment, so rows can be sorted and filtered; with bands, ``Flow P5`` and ``Flow P95``
    after the flow; the line tag last), then one row per line of the result (the liquid, the
    given reading, Δp and total flow, a found unknown and its catalog size), the same headline
    figures as numbers (``Value`` rows: name with unit, then the number), the record, the total
    bands, the warnings, the notes and the cautions: its label (:data:`CSV_LABELS`) in the
    first cell, the text in the second, the other cells empty.
    """
    u = units_for(reader)
    banded = sr.uncertainty is not None
    keys = [k for k in RESULT_TABLE if k not in ("tag", "band")] + ["tag"]
    header = [titled(k, u) for k in keys]
    at = keys.index("flow") + 1
    if banded:
        unit = unit_text("flow", u)
        header[at:at] = [f"Flow P5 ({unit})", f"Flow P95 ({unit})"]
    rows: list[list[str]] = [header]
    for b, j, cells in segment_rows(sr, u):
        cells["branch"], cells["seg"] = b.name, str(j + 1)
        row = [cells.get(k, "") for k in keys]
        if banded:
            pair = band.band_range(sr, f"branch '{b.name}' flow", u) if j == 0 else None
            row[at:at] = [format_number(v) for v in pair] if pair else ["", ""]
        rows.append(row)
    texts: tuple[Sequence[str], ...] = ([*summary_lines(sr, u), *solved_lines(sr, u)], [],
             record_lines(sr.site), band.summary_lines(sr, u), warning_lines(sr, u),
             notes_of(sr), CAUTIONS)
    for label, lines in zip(CSV_LABELS, texts, strict=True):
        if label == "Value":
            rows += [["Value", name, number] + [""] * (len(header) - 3)
                     for name, number in _csv_values(sr, u)]
        rows += [[label, " ".join(line.split())] + [""] * (len(header) - 2) for line in lines]
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerows(rows)
    return buf.getvalue()


def _csv_values(sr: SiteResult, u: Units) -> list[tuple[str, str]]:
    """The headline figures as numbers a spreadsheet can use: (name with unit, number)."""
    def item(name: str, value: float, kind: str) -> tuple[str, str]:
        return f"{name} ({u.label(kind)})", u.number(value, kind, 6)

    r = sr.result
    out = [item("pressure drop", r.pressure_drop, "pressure"),
           item("total flow", r.total_flow, "flow")]
    if (s := r.solved) is not None:
        seg = f" segment {s.segment + 1}" if len(r.branch(s.branch).segments) > 1 else ""
        out.append(item(f"{found_noun(s.quantity).lower()} of '{s.branch}'{seg} (found)",
                        s.value, found_kind(s.quantity)))
        if sr.catalog is not None:
            out.append((f"catalog size for '{s.branch}'", sr.catalog.size.label))
            out.append(item(f"flow of '{s.branch}' at the catalog size", sr.catalog.flow, "flow"))
    return out
