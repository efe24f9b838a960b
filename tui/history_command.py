"""``branchwise history SITE``: every visit of a site solved from its own readings, each
branch's flow, resistance and effective roughness, and how they changed between visits.

The site file is only read. ``-`` as SITE reads standard input, ``-o -`` writes standard
output; with ``--format csv`` the flagged changes, each visit's notes and the cautions go to
standard error (the CSV holds the rows only), as ``branchwise solve`` does.
"""

from __future__ import annotations

from pathlib import Path
from typing import TextIO

from branchwise.core.site.spec import Site


def run_history(site: Site, units: str, fmt: str, output: Path | None, width: int,
                out: TextIO, err: TextIO) -> int:
    """Work out ``site``'s history and write it (see the module docstring); exit status 0."""
    from branchwise.core.errors import inert_output
    from branchwise.core.history import history_of
    from branchwise.core.report import render_history
    from branchwise.core.report.lines import CAUTIONS
    from branchwise.core.storage.atomic import atomic_write_text

    history = history_of(site)
    text = inert_output(render_history(history, fmt, units, width), fmt)
    if fmt == "csv":  # the CSV is data only: what must not be lost goes to standard error
        from branchwise.core.units import units_for

        for line in history.messages():
            print(f"branchwise: flagged: {inert_output(line, 'csv')}", file=err)
        say = units_for(units).restate
        for visit in history.visits:
            for note in visit.solved.notes:
                line = inert_output(f"{visit.label}: {say(note)}", "csv")
                print(f"branchwise: note: {line}", file=err)
        for line in CAUTIONS:
            print(f"branchwise: caution: {line}", file=err)
    if output is None or str(output) == "-":
        out.write(text)
    else:
        atomic_write_text(output, text, backup=True)
    return 0
