"""``branchwise history SITE``: every visit of a site solved from its own readings, each
branch's flow, resistance and effective roughness, and how they changed between visits.

The site file is only read. ``-`` as SITE reads standard input, ``-o -`` writes standard
output; with ``--format csv`` the flagged changes and the cautions go to standard error (the
CSV holds the rows only), as ``branchwise solve`` does.
"""

from __future__ import annotations

from pathlib import Path
from typing import TextIO

from branchwise.core.site.spec import Site


def run_history(site: Site, units: str, fmt: str, output: Path | None, width: int,
                out: TextIO, err: TextIO) -> int:
    """Work out ``site``'s history and write it (see the module docstring); exit status 0."""
    from branchwise.core.history import history_of
    from branchwise.core.report import render_history
    from branchwise.core.report.lines import CAUTIONS
    from branchwise.core.storage.atomic import atomic_write_text

    history = history_of(site)
    text = render_history(history, fmt, units, width)
    if fmt == "csv":  # the CSV is data only: what must not be lost goes to standard error
        for line in history.messages():
            print(f"branchwise: flagged: {line}", file=err)
        for line in CAUTIONS:
            print(f"branchwise: caution: {line}", file=err)
    if output is None or str(output) == "-":
        out.write(text)
    else:
        atomic_write_text(output, text, backup=False)
    return 0
