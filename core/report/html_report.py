"""The walkdown report as one self-contained HTML file, for a manager to open by double-click.

Everything is inline — the styles, the split as bars, the system curve, the band — so the file
opens offline in any browser and can be mailed on its own; no script, font or image is
fetched. It prints on A4 and on US Letter alike (a page margin, no fixed page size, tables and
charts kept whole across pages). Every text that comes from the site or the person is escaped.
The words and figures are the reports' own (:mod:`.lines`, :mod:`.columns`, :mod:`.band`), in
the reader's units, so it says what the table says.
"""

from __future__ import annotations

from datetime import datetime
from html import escape
from typing import TYPE_CHECKING

from ..errors import BranchwiseError
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
    version,
    warning_lines,
)
from .svg import Bar, bars_svg, curve_svg
from .weighed import TITLE, weighed_lines

if TYPE_CHECKING:
    from ..history import History

STYLE = """
:root { color-scheme: light; }
body { font-family: Helvetica, Arial, sans-serif; color: #1f2933; background: #fff;
       margin: 2rem auto; max-width: 60rem; padding: 0 1rem; line-height: 1.4; }
h1 { font-size: 1.5rem; margin: 0 0 .25rem; }
h2 { font-size: 1.15rem; margin: 1.6rem 0 .5rem; border-bottom: 1px solid #c7ccd1; }
h3 { font-size: 1rem; margin: 1rem 0 .4rem; }
.meta { margin: 0; padding: 0; list-style: none; color: #3e4c59; font-size: .9rem; }
.cautions { border: 2px solid #b45309; background: #fff8eb; padding: .5rem 1rem;
            margin: 1rem 0; }
.cautions h2 { border: 0; margin: .3rem 0; color: #7c2d12; }
table { border-collapse: collapse; width: 100%; font-size: .85rem; }
th, td { border: 1px solid #c7ccd1; padding: .2rem .4rem; vertical-align: top; }
th { background: #eef1f4; text-align: left; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
th.num { text-align: right; }
thead { display: table-header-group; }
tr, figure, .cautions { break-inside: avoid; page-break-inside: avoid; }
figure { margin: .5rem 0 1rem; }
figcaption { font-size: .85rem; color: #3e4c59; }
ul { padding-left: 1.3rem; }
code { font-size: .85rem; }
td code { font-size: inherit; }
tr.flagged td { background: #fff1e6; font-weight: bold; }
footer { margin-top: 2rem; font-size: .8rem; color: #52606d; }
@page { margin: 14mm; }
@media print {
  body { margin: 0; max-width: none; padding: 0; font-size: 10pt; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  .cautions, th, rect, path { print-color-adjust: exact; -webkit-print-color-adjust: exact; }
  table { font-size: 8pt; }
  figure svg { max-height: 105mm; }
}
"""


def _e(text: object) -> str:
    return escape(str(text), quote=True)


def _list(lines: list[str], cls: str = "") -> str:
    attr = f' class="{cls}"' if cls else ""
    return f"<ul{attr}>" + "".join(f"<li>{_e(line)}</li>" for line in lines) + "</ul>"


def _tables(sr: SiteResult, u: Units) -> str:
    """The flows and the pipes with their head losses: the text table's two tables (two, so
    that each fits the width of a printed page)."""
    rows = [cells for _, _, cells in segment_rows(sr, u)]
    return "\n".join(_table(keys, rows, u, title)
                     for keys, title in ((FLOW_TABLE, "Flows"),
                                         (LOSS_TABLE, "Pipes and head losses")))


def _table(columns: tuple[str, ...], rows: list[dict[str, str]], u: Units, title: str) -> str:
    keys = used(columns, rows)

    def th(k: str) -> str:
        unit = unit_text(k, u)
        title = COLUMNS[k].title + (f" ({unit})" if unit else "")
        return f'<th scope="col"{" class=num" if COLUMNS[k].numeric else ""}>{_e(title)}</th>'

    head = "<thead><tr>" + "".join(th(k) for k in keys) + "</tr></thead>"
    body = "".join(
        "<tr>" + "".join(f'<td{" class=num" if COLUMNS[k].numeric else ""}>{_e(r.get(k, ""))}'
                         "</td>" for k in keys) + "</tr>" for r in rows)
    return f"<h3>{_e(title)}</h3><table>{head}<tbody>{body}</tbody></table>"


def _split(sr: SiteResult, u: Units) -> str:
    bars = []
    for b in sr.result.branches:
        pair = band.band_range(sr, f"branch '{b.name}' flow", u)
        share = f" ({b.share * 100:.1f} %)" if b.share == b.share else ""
        bars.append(Bar(b.name, u.value(b.flow, "flow"), f"{u.quantity(b.flow, 'flow')}{share}",
                        pair))
    note = " The whiskers span each flow's P5–P95 band." if sr.uncertainty else ""
    return (f"<figure>{bars_svg(bars, u.label('flow'))}<figcaption>How the total flow splits "
            f"between the branches.{_e(note)}</figcaption></figure>")


def _curve(sr: SiteResult, u: Units) -> str:
    from ..numerics.curve import system_curve

    try:
        curve = system_curve(sr.result.network, operating=sr.result)
    except BranchwiseError as exc:
        return f"<p>No system curve: {_e(exc)}</p>"
    return (f"<figure>{curve_svg(curve, u)}<figcaption>The pressure drop the header needs "
            "against the total flow (black) and against each branch's flow, from zero to 1.5 "
            "times the operating point; the operating point is circled.</figcaption></figure>")


def _band(sr: SiteResult, u: Units) -> str:
    unc, name = sr.uncertainty, band.focus(sr)
    if unc is None or name is None:
        return ""
    out = ["<h2>How sure is the answer</h2>", _list(band.summary_lines(sr, u))]
    rows, more, rest = band.ranked(unc, name, band.TOP)
    tol = {i.name: band.tolerance_text(i, u) for i in unc.inputs}
    if rows:
        out.append(f"<p>What dominates the spread of the {_e(name)} (share of the GUM linear "
                   "variance):</p>")
        cells = "".join(
            f"<tr><td>{_e(n)}</td><td>{_e(tol.get(n, ''))}</td><td class=num>{s * 100:.3g} %"
            f'</td><td><svg width="120" height="10" viewBox="0 0 120 10"><rect width='
            f'"{max(0.0, min(1.0, s)) * 120:.1f}" height="10" fill="#1b6fb5"/></svg></td></tr>'
            for n, s in rows)
        if more:
            cells += (f"<tr><td colspan=4>… {more} more input{'s' if more > 1 else ''}, "
                      f"{rest * 100:.2g} % together</td></tr>")
        out.append("<table><thead><tr><th>Input</th><th>Limit</th><th class=num>Share</th>"
                   f"<th></th></tr></thead><tbody>{cells}</tbody></table>")
    return "\n".join(out)


def history_html(h: History, reader: Units | str = "si") -> str:
    """A site's history (``branchwise history --format html``) as one self-contained HTML
    document: the cautions, then the visits and trends (:func:`.history_report.html_section`)."""
    from .history_report import html_section

    title = f"History: {h.site}"
    body = [f"<h1>{_e(title)}</h1>",
            f"<p class=meta>Calculated with branchwise {_e(version())}; units: "
            f"{_e(units_for(reader).system.upper())}</p>",
            '<section class="cautions"><h2>Cautions</h2>' + _list(list(CAUTIONS))
            + "</section>", html_section(h, reader), f"<footer>{_e(' '.join(CAUTIONS))}</footer>"]
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            '<meta name="viewport" content="width=device-width, initial-scale=1">\n'
            f"<title>{_e(title)}</title>\n<style>{STYLE}</style>\n</head>\n"
            "<body>\n" + "\n".join(body) + "\n</body>\n</html>\n")


def _history(sr: SiteResult, u: Units) -> str:
    """The visits and trends, for a site that keeps earlier visits ('' without)."""
    if not sr.site.visits:
        return ""
    from ..history import history_of
    from .history_report import html_section

    try:
        return html_section(history_of(sr.site), u)
    except BranchwiseError as exc:
        return f"<h2>Visits and trends</h2><p>Not worked out: {_e(u.say(exc))}</p>"


def to_html(sr: SiteResult, reader: Units | str = "si", date: datetime | None = None,
            source: str | None = None, unsaved: bool = False, curve: bool = True) -> str:
    """The walkdown report as one HTML document (see the module docstring).

    source: the site file to cite (default: the one the site was read from); unsaved: the
    answer is of edits not yet saved to it, which the report says; curve: draw the system
    curve (a few milliseconds more).
    """
    from .markdown import inputs_as_entered

    u = units_for(reader)
    date = date or datetime.now().astimezone()
    src = source or (str(sr.site.source) if sr.site.source else "(not saved)")
    title = f"Walkdown report: {sr.site.title}"
    meta = [f"Report written {date.strftime('%Y-%m-%d %H:%M %Z').strip()}",
            *record_lines(sr.site),
            f"Site file: {src}" + (" (with unsaved changes)" if unsaved else ""),
            f"Calculated with branchwise {version()}; units: {u.system.upper()}"]
    body = [f"<h1>{_e(title)}</h1>", _list(meta, "meta")]
    body.append('<section class="cautions"><h2>Cautions</h2>' + _list(list(CAUTIONS))
                + "</section>")
    if isinstance(sr.site.notes, str) and sr.site.notes.strip():
        body.append(f"<p>{_e(sr.site.notes.strip())}</p>")
    body += ["<h2>Results</h2>", _list(summary_lines(sr, u)), _split(sr, u), _tables(sr, u)]
    if sr.result.solved:
        body += ["<h2>Solved unknown</h2>", _list(solved_lines(sr, u))]
    weighed = weighed_lines(sr, u)
    if weighed:
        body += [f"<h2>{_e(TITLE)}</h2>", _list(weighed)]
    body.append(_band(sr, u))
    if curve:
        body += ["<h2>System curve</h2>", _curve(sr, u)]
    body.append(_history(sr, u))
    if sr.assumptions:
        body += ["<h2>Assumed</h2>", _list(assumed_lines(sr, u))]
    body += ["<h2>Warnings</h2>", _list(warning_lines(sr, u) or ["None."])]
    notes = notes_of(sr, u)
    if notes:
        body += ["<h2>Notes</h2>", _list(notes)]
    inputs = "".join(f"<tr><td><code>{_e(path)}</code></td><td>{_e(value)}</td></tr>"
                     for path, value in inputs_as_entered(sr.site))
    body += ["<h2>Inputs as entered</h2>",
             "<table><thead><tr><th>Field</th><th>Value</th></tr></thead>"
             f"<tbody>{inputs}</tbody></table>",
             f"<footer>{_e(' '.join(CAUTIONS))}</footer>"]
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            '<meta name="viewport" content="width=device-width, initial-scale=1">\n'
            f"<title>{_e(title)}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n"
            + "\n".join(part for part in body if part) + "\n</body>\n</html>\n")
