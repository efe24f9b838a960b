"""The results as plain text for a terminal, in the reader's units with the units in the headers.

The flows and the losses are two tables (about 80 columns for the demo site) and long lines
are wrapped, so that the report reads in a terminal of the usual width.
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence

from ..site.solve import SiteResult
from ..units import Units, units_for
from . import band
from .columns import COLUMNS, FLOW_TABLE, LOSS_TABLE, segment_rows, unit_text, used
from .lines import (
    CAUTIONS,
    assumed_lines,
    notes_of,
    record_lines,
    solved_lines,
    summary_lines,
    warning_lines,
)
from .weighed import TITLE, weighed_lines

WIDTH = 80
"""Text lines are wrapped to this many columns (a terminal's usual width)."""


def grid(keys: Sequence[str], rows: list[dict[str, str]], reader: Units | str) -> list[str]:
    """A text table of ``rows`` in the columns ``keys`` that hold something: titles, units,
    then the rows; numbers right-aligned."""
    keys = used(keys, rows)
    table = [[COLUMNS[k].short or COLUMNS[k].title for k in keys],
             [unit_text(k, reader) for k in keys], *([r.get(k, "") for k in keys] for r in rows)]
    widths = [max(len(line[n]) for line in table) for n in range(len(keys))]

    def line(cells: list[str]) -> str:
        return "  ".join(c.rjust(w) if COLUMNS[k].numeric else c.ljust(w)
                         for c, w, k in zip(cells, widths, keys, strict=True)).rstrip()

    return [line(cells) for cells in table]


def _wrap(text: str, first: str = "", rest: str = "  ", width: int = WIDTH) -> list[str]:
    """``text`` broken at spaces into lines of at most ``width`` columns (a word longer than
    that stays whole), the first line led by ``first``, the others by ``rest``."""
    glued = " ".join(text.split()).replace(" %", "\u00a0%")  # "90 %" stays on one line
    lines = textwrap.wrap(glued, width, initial_indent=first, subsequent_indent=rest,
                          break_long_words=False, break_on_hyphens=False)
    return [line.replace("\u00a0", " ") for line in lines] or [first.rstrip()]


def to_table(sr: SiteResult, reader: Units | str = "si", width: int = WIDTH) -> str:
    """A readable plain-text report in the reader's units: the record header, the flows and
    the losses as two tables, then the solved unknown, the bands, the warnings, the notes and
    the cautions; lines of text wrapped to ``width`` columns (the tables are never cut)."""
    u = units_for(reader)

    def wrap(text: str, first: str = "", rest: str = "  ") -> list[str]:
        return _wrap(text, first, rest, width)

    rows = [cells for _, _, cells in segment_rows(sr, u)]
    out = [*wrap(sr.site.title), *(line for r in record_lines(sr.site) for line in wrap(r)), ""]
    out += [line for s in summary_lines(sr, u) for line in wrap(s)]
    out += ["", "Flows:", *grid(FLOW_TABLE, rows, u)]
    out += ["", "Pipes and head losses:", *grid(LOSS_TABLE, rows, u)]
    if sr.result.solved:
        out += ["", *(line for s in solved_lines(sr, u) for line in wrap(s))]
    weighed = weighed_lines(sr, u)
    if len(weighed) > 1:
        out += ["", f"{TITLE}:", *(line for w in weighed for line in wrap(w, "  - ", "    "))]
    elif weighed:
        out += ["", *(line for w in weighed for line in wrap(w))]
    if sr.uncertainty is not None:
        out += ["", *(line for s in band.summary_lines(sr, u) for line in wrap(s))]
        out += ["", *band.ranking_lines(sr, u)]
    if sr.assumptions:
        out += ["", "Assumed:",
                *(line for a in assumed_lines(sr, u) for line in wrap(a, "  - ", "    "))]
    if sr.result.warnings:
        out += ["", "Warnings:",
                *(line for w in warning_lines(sr, u) for line in wrap(w, "  - ", "    "))]
    notes = notes_of(sr, u)
    if notes:
        out += ["", "Notes:", *(line for n in notes for line in wrap(n, "  - ", "    "))]
    out += ["", "Cautions:", *(line for c in CAUTIONS for line in wrap(c, "  - ", "    "))]
    return "\n".join(out) + "\n"
