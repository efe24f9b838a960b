"""The walkdown record in Markdown: a technician pastes it into a work order."""

from __future__ import annotations

import json
from datetime import datetime
from typing import Any

from ..site.solve import SiteResult
from ..site.spec import Site
from ..site.write import site_to_dict
from ..units import Units, units_for
from . import band
from .columns import RESULT_TABLE, segment_rows, titled, used
from .lines import (
    CAUTIONS,
    assumed_lines,
    notes_of,
    record_lines,
    solved_lines,
    summary_lines,
    version,
)
from .weighed import TITLE, weighed_lines


def inputs_as_entered(site: Site) -> list[tuple[str, str]]:
    """Every value of ``site`` with its field path, as typed (for the record); the earlier
    visits are left out (they are the history's: ``branchwise history``)."""
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
    for key in ("format", "kind", "visits"):
        doc.pop(key, None)
    walk("", doc)
    return out


def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def to_markdown(
    sr: SiteResult, reader: Units | str = "si", date: datetime | None = None,
    source: str | None = None,
    unsaved: bool = False,
) -> str:
    """A walkdown record a technician can paste into a work order.

    source: the site file to cite (default: the one the site was read from); unsaved: the
    answer is of edits not yet saved to it, which the record says.
    """
    u = units_for(reader)
    date = date or datetime.now().astimezone()
    src = source or (str(sr.site.source) if sr.site.source else "(not saved)")
    out = [
        f"# Walkdown record: {_md(sr.site.title)}", "",
        f"- Report written: {date.strftime('%Y-%m-%d %H:%M %Z').strip()}",
        *(f"- {_md(line)}" for line in record_lines(sr.site)),
        f"- Site file: `{src}`" + (" (with unsaved changes)" if unsaved else ""),
        f"- Calculated with branchwise {version()}; units: {u.system.upper()}", "",
    ]
    if isinstance(sr.site.notes, str) and sr.site.notes.strip():
        out += [_md(sr.site.notes.strip()), ""]
    out += ["## Inputs as entered", "", "| Field | Value |", "|---|---|"]
    out += [f"| `{path}` | {_md(value)} |" for path, value in inputs_as_entered(sr.site)]
    out += ["", "## Results", "", *(f"- {_md(s)}" for s in summary_lines(sr, u)), ""]
    rows = [cells for _, _, cells in segment_rows(sr, u)]
    keys = used(RESULT_TABLE, rows)
    out.append("| " + " | ".join(titled(k, u) for k in keys) + " |")
    out.append("|" + "|".join("---" for _ in keys) + "|")
    out += ["| " + " | ".join(_md(r.get(k, "")) for k in keys) + " |" for r in rows]
    if sr.result.solved:
        out += ["", "## Solved unknown", "", *(f"- {_md(s)}" for s in solved_lines(sr, u))]
    weighed = weighed_lines(sr, u)
    if weighed:
        out += ["", f"## {TITLE}", "", *(f"- {_md(w)}" for w in weighed)]
    out += band.markdown_lines(sr, u)
    if sr.assumptions:
        out += ["", "## Assumed", "", *(f"- {_md(a)}" for a in assumed_lines(sr, u))]
    out += ["", "## Warnings", ""]
    out += ([f"- {_md((w.branch + ': ') if w.branch else '')}{_md(u.say(w))} (`{w.code}`)"
             for w in sr.result.warnings] or ["- None."])
    notes = notes_of(sr, u)
    if notes:
        out += ["", "## Notes", "", *(f"- {_md(n)}" for n in notes)]
    out += ["", "## Cautions", "", *(f"- {c}" for c in CAUTIONS)]
    return "\n".join(out) + "\n"
