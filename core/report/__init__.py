"""A solved site as a report: JSON for scripts (SI), a text table, CSV, a Markdown record and a
self-contained HTML report.

The text formats are in the reader's units and share their lines (:mod:`.lines`); the columns
of their tables are in :mod:`.columns`, the uncertainty band's text in :mod:`.band`.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..site.solve import SiteResult
from ..units import Units

if TYPE_CHECKING:
    from ..history import History

FORMATS = ("table", "json", "csv", "markdown", "html")


def render(sr: SiteResult, fmt: str = "table", reader: Units | str = "si",
           width: int | None = None) -> str:
    """``sr`` in one of :data:`FORMATS` (JSON is always SI); ``width``: the columns the
    text table's lines are wrapped to (default 80)."""
    if fmt == "json":
        from .json_report import to_json

        return to_json(sr)
    if fmt == "csv":
        from .csv_report import to_csv

        return to_csv(sr, reader)
    if fmt == "markdown":
        from .markdown import to_markdown

        return to_markdown(sr, reader)
    if fmt == "html":
        from .html_report import to_html

        return to_html(sr, reader)
    from .text_table import to_table

    return to_table(sr, reader) if width is None else to_table(sr, reader, width)


def render_history(h: History, fmt: str = "table", reader: Units | str = "si",
                   width: int = 80) -> str:
    """A site's history (:func:`branchwise.core.history.history_of`) in one of
    :data:`FORMATS` (JSON is always SI); ``width``: as for :func:`render`."""
    from . import history_report as report

    if fmt == "json":
        return report.to_json(h)
    if fmt == "csv":
        return report.to_csv(h, reader)
    if fmt == "markdown":
        return report.to_markdown(h, reader)
    if fmt == "html":
        from .html_report import history_html

        return history_html(h, reader)
    return report.to_text(h, reader, width)
