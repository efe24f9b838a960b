"""A solved site for people: the text table, the CSV for a spreadsheet, the Markdown record.

All three are in the reader's unit system (``si`` or ``us``) with the units in the headers.
The text table fits a terminal: the flows and the losses are two tables (about 80 columns for
the demo site) and long lines are wrapped. The CSV is one rectangle a spreadsheet imports as
it is: a header row, one row per segment, then labelled rows (``Record``, ``Band``,
``Warning``, ``Note``, ``Caution``) of the same width carrying the rest of the report.
The Markdown walkdown record keeps one full results table (its layout is a contract).
"""

from __future__ import annotations

import csv
import io
import json
import math
import textwrap
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from datetime import datetime
from typing import Any

from . import bandtext
from .report import CAUTIONS, record_lines, solved_lines, summary_lines, version
from .results import BranchResult
from .sitefile import Site
from .sitesolve import SiteResult
from .sitewrite import site_to_dict
from .units import display_unit, format_number, say, to_unit, unit_label

WIDTH = 80
"""Text lines are wrapped to this many columns (a terminal's usual width)."""


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


def unit_text(key: str, system: str) -> str:
    """The unit label of column ``key`` in ``system`` (``L/s``, ``gpm``, ``%``), or ''."""
    kind = COLUMNS[key].kind
    if kind is None:
        return ""
    return "%" if kind == "%" else unit_label(display_unit(kind, system))


def titled(key: str, system: str) -> str:
    """``Flow (L/s)``: a column's title with its unit, for the CSV and Markdown headers."""
    unit = unit_text(key, system)
    return f"{COLUMNS[key].title} ({unit})" if unit else COLUMNS[key].title


def _tag(site: Site, index: int) -> str:
    tag = site.branches[index].tag if index < len(site.branches) else None
    return " ".join(tag.split()) if isinstance(tag, str) else ""


def segment_rows(sr: SiteResult, system: str) -> Iterator[tuple[BranchResult, int, dict[str, str]]]:
    """(branch, segment index, cells by column key) for every segment; the branch's own cells
    (name, tag, flow, band, share, valve loss) only on its first segment's row."""
    def q(value: float, kind: str) -> str:
        return format_number(to_unit(value, kind, display_unit(kind, system)))

    for i, b in enumerate(sr.result.branches):
        for j, s in enumerate(b.segments):
            first = j == 0
            cells = {
                "velocity": q(s.velocity, "velocity"), "reynolds": f"{s.reynolds:.0f}",
                "f": format_number(s.friction_factor, 4), "regime": s.regime,
                "diameter": q(s.diameter, "diameter"), "length": q(s.length, "length"),
                "major": q(s.major_loss, "head"), "minor": q(s.minor_loss, "head"),
                "seg": str(j + 1) if len(b.segments) > 1 else "",
            }
            if first:
                cells.update({
                    "branch": b.name, "tag": _tag(sr.site, i), "flow": q(b.flow, "flow"),
                    "band": bandtext.flow_band_cell(sr, b.name, system),
                    "share": format_number(b.share * 100, 3) if math.isfinite(b.share) else "",
                    "valve": q(b.valve_loss, "head") if b.valve_loss else "",
                })
            yield b, j, cells


def _used(keys: Sequence[str], rows: list[dict[str, str]]) -> list[str]:
    """``keys`` without the columns empty on every row (the first column always stays)."""
    return [k for n, k in enumerate(keys) if n == 0 or any(r.get(k) for r in rows)]


# ---- text table ----------------------------------------------------------------------------

def grid(keys: Sequence[str], rows: list[dict[str, str]], system: str) -> list[str]:
    """A text table of ``rows`` in the columns ``keys`` that hold something: titles, units,
    then the rows; numbers right-aligned."""
    keys = _used(keys, rows)
    table = [[COLUMNS[k].short or COLUMNS[k].title for k in keys],
             [unit_text(k, system) for k in keys], *([r.get(k, "") for k in keys] for r in rows)]
    widths = [max(len(line[n]) for line in table) for n in range(len(keys))]

    def line(cells: list[str]) -> str:
        return "  ".join(c.rjust(w) if COLUMNS[k].numeric else c.ljust(w)
                         for c, w, k in zip(cells, widths, keys, strict=True)).rstrip()

    return [line(cells) for cells in table]


def wrap(text: str, first: str = "", rest: str = "  ", width: int = WIDTH) -> list[str]:
    """``text`` broken at spaces into lines of at most ``width`` columns (a word longer than
    that stays whole), the first line led by ``first``, the others by ``rest``."""
    glued = " ".join(text.split()).replace(" %", "\u00a0%")  # "90 %" stays on one line
    lines = textwrap.wrap(glued, width, initial_indent=first, subsequent_indent=rest,
                          break_long_words=False, break_on_hyphens=False)
    return [line.replace("\u00a0", " ") for line in lines] or [first.rstrip()]


def _notes(sr: SiteResult) -> list[str]:
    return [*sr.notes, *sr.result.notes, *(sr.uncertainty.notes if sr.uncertainty else ())]


def _warnings(sr: SiteResult, system: str) -> list[str]:
    return [f"{w.branch + ': ' if w.branch else ''}{say(w, system)} [{w.code}]"
            for w in sr.result.warnings]


def to_table(sr: SiteResult, system: str = "si") -> str:
    """A readable plain-text report in the ``system`` units (``si`` or ``us``): the record
    header, the flows and the losses as two tables, then the solved unknown, the bands,
    the warnings, the notes and the cautions."""
    rows = [cells for _, _, cells in segment_rows(sr, system)]
    out = [*wrap(sr.site.title), *(line for r in record_lines(sr.site) for line in wrap(r)), ""]
    out += [line for s in summary_lines(sr, system) for line in wrap(s)]
    out += ["", "Flows:", *grid(FLOW_TABLE, rows, system)]
    out += ["", "Pipes and head losses:", *grid(LOSS_TABLE, rows, system)]
    if sr.result.solved:
        out += ["", *(line for s in solved_lines(sr, system) for line in wrap(s))]
    if sr.uncertainty is not None:
        out += ["", *(line for s in bandtext.summary_lines(sr, system) for line in wrap(s))]
        out += ["", *bandtext.ranking_lines(sr, system)]
    if sr.result.warnings:
        out += ["", "Warnings:",
                *(line for w in _warnings(sr, system) for line in wrap(w, "  - ", "    "))]
    notes = _notes(sr)
    if notes:
        out += ["", "Notes:", *(line for n in notes for line in wrap(n, "  - ", "    "))]
    out += ["", "Cautions:", *(line for c in CAUTIONS for line in wrap(c, "  - ", "    "))]
    return "\n".join(out) + "\n"


# ---- CSV -----------------------------------------------------------------------------------

CSV_LABELS = ("Result", "Value", "Record", "Band", "Warning", "Note", "Caution")
"""First cells of the rows after the data, saying what each row carries."""


def to_csv(sr: SiteResult, system: str = "si") -> str:
    """The results for a spreadsheet: every row the same width, no comment lines.

    A header row with units (``Flow (L/s)``), one row per segment (each naming its branch and
    segment, so rows can be sorted and filtered; with bands, ``Flow P5`` and ``Flow P95``
    after the flow; the line tag last), then one row per line of the result (the liquid, the
    given reading, Δp and total flow, a found unknown and its catalog size), the same headline
    figures as numbers (``Value`` rows: name with unit, then the number), the record, the total
    bands, the warnings, the notes and the cautions: its label (:data:`CSV_LABELS`) in the
    first cell, the text in the second, the other cells empty.
    """
    band = sr.uncertainty is not None
    keys = [k for k in RESULT_TABLE if k not in ("tag", "band")] + ["tag"]
    header = [titled(k, system) for k in keys]
    at = keys.index("flow") + 1
    if band:
        unit = unit_text("flow", system)
        header[at:at] = [f"Flow P5 ({unit})", f"Flow P95 ({unit})"]
    rows: list[list[str]] = [header]
    for b, j, cells in segment_rows(sr, system):
        cells["branch"], cells["seg"] = b.name, str(j + 1)
        row = [cells.get(k, "") for k in keys]
        if band:
            pair = bandtext.band_range(sr, f"branch '{b.name}' flow", system) if j == 0 else None
            row[at:at] = [format_number(v) for v in pair] if pair else ["", ""]
        rows.append(row)
    texts = ([*summary_lines(sr, system), *solved_lines(sr, system)], [],
             record_lines(sr.site), bandtext.summary_lines(sr, system), _warnings(sr, system),
             _notes(sr), CAUTIONS)
    for label, lines in zip(CSV_LABELS, texts, strict=True):
        if label == "Value":
            rows += [["Value", name, number] + [""] * (len(header) - 3)
                     for name, number in _csv_values(sr, system)]
        rows += [[label, " ".join(line.split())] + [""] * (len(header) - 2) for line in lines]
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerows(rows)
    return buf.getvalue()


def _csv_values(sr: SiteResult, system: str) -> list[tuple[str, str]]:
    """The headline figures as numbers a spreadsheet can use: (name with unit, number)."""
    def item(name: str, value: float, kind: str) -> tuple[str, str]:
        unit = display_unit(kind, system)
        return f"{name} ({unit_label(unit)})", format_number(to_unit(value, kind, unit), 6)

    r = sr.result
    out = [item("pressure drop", r.pressure_drop, "pressure"),
           item("total flow", r.total_flow, "flow")]
    if (s := r.solved) is not None:
        seg = f" segment {s.segment + 1}" if len(r.branch(s.branch).segments) > 1 else ""
        out.append(item(f"{s.quantity} of '{s.branch}'{seg} (found)", s.value, s.quantity))
        if sr.catalog is not None:
            out.append((f"catalog size for '{s.branch}'", sr.catalog.size.label))
            out.append(item(f"flow of '{s.branch}' at the catalog size", sr.catalog.flow, "flow"))
    return out


# ---- Markdown walkdown record --------------------------------------------------------------

def inputs_as_entered(site: Site) -> list[tuple[str, str]]:
    """Every value of ``site`` with its field path, as typed (for the record)."""
    out: list[tuple[str, str]] = []

    def walk(prefix: str, value: Any) -> None:
        if isinstance(value, dict):
            for k, v in value.items():
                walk(f"{prefix}.{k}" if prefix else k, v)
        elif isinstance(value, list):
            for i, v in enumerate(value):
                walk(f"{prefix}[{i}]", v)
        else:
            out.append((prefix, value if isinstance(value, str) else json.dumps(value)))

    doc = site_to_dict(site)
    for key in ("format", "kind"):
        doc.pop(key, None)
    walk("", doc)
    return out


def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def to_markdown(
    sr: SiteResult, system: str = "si", date: datetime | None = None, source: str | None = None,
    unsaved: bool = False,
) -> str:
    """A walkdown record a technician can paste into a work order.

    source: the site file to cite (default: the one the site was read from); unsaved: the
    answer is of edits not yet saved to it, which the record says.
    """
    date = date or datetime.now().astimezone()
    src = source or (str(sr.site.source) if sr.site.source else "(not saved)")
    out = [
        f"# Walkdown record: {_md(sr.site.title)}", "",
        f"- Report written: {date.strftime('%Y-%m-%d %H:%M %Z').strip()}",
        *(f"- {_md(line)}" for line in record_lines(sr.site)),
        f"- Site file: `{src}`" + (" (with unsaved changes)" if unsaved else ""),
        f"- Calculated with branchwise {version()}; units: {system.upper()}", "",
    ]
    if isinstance(sr.site.notes, str) and sr.site.notes.strip():
        out += [_md(sr.site.notes.strip()), ""]
    out += ["## Inputs as entered", "", "| Field | Value |", "|---|---|"]
    out += [f"| `{path}` | {_md(value)} |" for path, value in inputs_as_entered(sr.site)]
    out += ["", "## Results", "", *(f"- {_md(s)}" for s in summary_lines(sr, system)), ""]
    rows = [cells for _, _, cells in segment_rows(sr, system)]
    keys = _used(RESULT_TABLE, rows)
    out.append("| " + " | ".join(titled(k, system) for k in keys) + " |")
    out.append("|" + "|".join("---" for _ in keys) + "|")
    out += ["| " + " | ".join(_md(r.get(k, "")) for k in keys) + " |" for r in rows]
    if sr.result.solved:
        out += ["", "## Solved unknown", "", *(f"- {_md(s)}" for s in solved_lines(sr, system))]
    out += bandtext.markdown_lines(sr, system)
    out += ["", "## Warnings", ""]
    out += ([f"- {_md((w.branch + ': ') if w.branch else '')}{_md(say(w, system))} (`{w.code}`)"
             for w in sr.result.warnings] or ["- None."])
    notes = _notes(sr)
    if notes:
        out += ["", "## Notes", "", *(f"- {_md(n)}" for n in notes)]
    out += ["", "## Cautions", "", *(f"- {c}" for c in CAUTIONS)]
    return "\n".join(out) + "\n"
