"""A site's history for people and scripts: the visits, each branch's indicators and the
trends, as a text table, Markdown, CSV, an HTML section (in the walkdown report, and in the
history's own document, :func:`.html_report.history_html`) and JSON (SI), in the reader's
units.

The resistance R = h/Q² is shown in the reader's head unit per flow unit squared (``m/(L/s)²``,
``ft/gpm²``); the JSON keeps it in SI, m/(m³/s)². A change is shown with its band (90 %, see
:mod:`branchwise.core.history.trends`); a flagged one also in words. Every format carries the
cautions.
"""

from __future__ import annotations

import csv
import io
import json
from html import escape
from typing import Any

from ..history import History, Visit
from ..history.indicators import INDICATORS, BranchIndicators, Indicator
from ..history.trends import NOUNS, Trend
from ..units import Units, units_for
from ..units.display import format_number
from .csv_report import ascii_unit, full, safe_text
from .lines import CAUTIONS, version
from .schema import SCHEMA_VERSION

BAND_NOTE = ("A change is flagged when it lies outside its band: ± 1.645 combined standard "
             "uncertainties (90 %, like the P5–P95 bands), the two visits' readings taken as "
             "independent and the line's own record (bore, length, roughness, K, Kv) as the "
             "same at both. Measured: from the branch's own clamp-on with the head from "
             "another reading; solved: from the model at that day's head.")
KINDS = {"flow": "flow", "effective_roughness": "roughness"}
"""The units kind of each indicator (the resistance has its own unit, :func:`r_unit`)."""


# ---- the reader's units -------------------------------------------------------------------

def r_unit(u: Units) -> str:
    """The resistance's unit for this reader: ``m/(L/s)²``, ``ft/gpm²``."""
    flow = u.label("flow")
    return f"{u.label('head')}/({flow})²" if "/" in flow else f"{u.label('head')}/{flow}²"


def r_value(value_si: float, u: Units) -> float:
    """R (SI, m/(m³/s)²) in :func:`r_unit`: head scales once, flow twice (no offsets)."""
    return value_si * u.value(1.0, "head") / u.value(1.0, "flow") ** 2


def unit_of(indicator: str, u: Units) -> str:
    return r_unit(u) if indicator == "resistance" else u.label(KINDS[indicator])


def number(indicator: str, value: float | None, u: Units, digits: int = 4) -> str:
    """An indicator's value as a number in the reader's unit ('—' when absent)."""
    if value is None:
        return "—"
    if indicator == "resistance":
        return format_number(r_value(value, u), digits)
    return u.number(value, KINDS[indicator], digits)


def _ind(b: BranchIndicators, indicator: str) -> Indicator | None:
    return b.get(indicator)


def source(b: BranchIndicators) -> str:
    """Where a branch's figures of a visit come from, in a word or two."""
    if b.resistance is not None and b.resistance.measured:
        return "clamp-on"
    if b.flow is not None and b.flow.measured:
        return "clamp-on only"
    return "solved"


def visit_lines(v: Visit, u: Units) -> list[str]:
    """A visit's header lines: date, who, what it was solved from, its readings, the verdict
    of its readings weighed together, its notes."""
    from ..givens import reading_words
    from .lines import given_text

    sr = v.solved.solved
    every = str(sr.site.conditions.given or "").strip().casefold() == "all"
    given = ("every reading weighed (reconciled pressure drop "
             f"{u.quantity(sr.result.pressure_drop, 'pressure')})" if every
             else given_text(sr, u))
    out = [f"{v.heading}{' · ' + v.technician if v.technician else ''} · solved from {given}"]
    read = [f"{reading_words(r.kind, r.name)} {u.quantity(r.value, _qkind(r.kind))}"
            for r in v.solved.readings]
    out.append("Read: " + "; ".join(read))
    if v.own_temperature:  # (said in the JSON as temperature_k; here in the reader's unit)
        out.append(f"Liquid that day: {u.fluid_name(sr.result.network.fluid)}")
    if sr.reconciliation is not None:
        out.append(f"Readings weighed: {sr.reconciliation.verdict}")
    if v.notes:
        out.append(f"Notes: {v.notes}")
    out += [f"Note: {u.restate(n)}" for n in v.solved.notes]
    return out


def _qkind(kind: str) -> str:
    from ..givens import GIVENS

    return GIVENS[kind].quantity


AS_FIRST = "as first"
"""The previous visit's cells of a trend of two visits: the previous one is the first."""


def trend_cells(t: Trend, u: Units) -> list[str]:
    """Branch, indicator (unit), first, previous, last, since first ± band, since previous
    (:data:`AS_FIRST` for a trend of two visits)."""
    two = not t.has_previous
    return [t.branch, f"{NOUNS[t.indicator]} ({unit_of(t.indicator, u)})"
            + (" solved" if t.basis == "solved" else ""),
            number(t.indicator, t.first.indicator.value, u),
            AS_FIRST if two else number(t.indicator, t.previous.indicator.value, u),
            number(t.indicator, t.last.indicator.value, u),
            t.since_first.words(), AS_FIRST if two else t.since_previous.words()]


TREND_TITLES = ["Branch", "Indicator", "First", "Previous", "Last", "Since first",
                "Since previous"]


def branch_cells(b: BranchIndicators, u: Units) -> list[str]:
    return [b.name, *(number(k, i.value if (i := _ind(b, k)) else None, u) for k in INDICATORS),
            source(b)]


def branch_titles(u: Units) -> list[str]:
    return ["Branch", f"Flow ({u.label('flow')})", f"R ({r_unit(u)})",
            f"Eff. roughness ({u.label('roughness')})", "From"]


# ---- text ---------------------------------------------------------------------------------

def _grid(titles: list[str], rows: list[list[str]], left: int = 1) -> list[str]:
    table = [titles, *rows]
    widths = [max(len(r[c]) for r in table) for c in range(len(titles))]
    return ["  ".join(cell.ljust(w) if c < left else cell.rjust(w)
                      for c, (cell, w) in enumerate(zip(row, widths, strict=True))).rstrip()
            for row in table]


def to_text(h: History, reader: Units | str = "si", width: int = 80) -> str:
    """The history as plain text: per visit its readings and branches, then the trends, the
    flagged changes in words, how the bands are made, and the cautions."""
    import textwrap

    u = units_for(reader)

    def wrap(text: str, first: str = "", rest: str = "  ") -> list[str]:
        return textwrap.wrap(" ".join(text.split()), width, initial_indent=first,
                             subsequent_indent=rest, break_long_words=False,
                             break_on_hyphens=False) or [first.rstrip()]

    out = [*wrap(f"History: {h.site}"), *wrap(
        f"{len(h.visits)} visit{'s' if len(h.visits) != 1 else ''}; R = h/Q², the head "
        f"across the header over the branch's flow squared, in {r_unit(u)}"), ""]
    for v in h.visits:
        lines = visit_lines(v, u)
        out += wrap(lines[0])
        out += [line for text in lines[1:] for line in wrap(text, "  ", "    ")]
        out += ["  " + line for line in _grid(branch_titles(u),
                                              [branch_cells(b, u) for b in v.solved.branches])]
        out.append("")
    if h.trends:
        out += ["Trends:", *_grid(TREND_TITLES, [trend_cells(t, u) for t in h.trends], 2)]
    else:
        out.append(f"Trends: {_after_colon(no_trends(h))}")
    messages = h.messages()
    out += ["", "Flagged:" if messages else f"Flagged: {_after_colon(no_flags(h))}"]
    out += [line for m in messages for line in wrap(m, "  - ", "    ")]
    out += ["", *wrap(BAND_NOTE)]
    out += ["", "Cautions:", *(line for c in CAUTIONS for line in wrap(c, "  - ", "    "))]
    return "\n".join(out) + "\n"


def no_trends(h: History) -> str:
    """Why there is no trend: too few visits, or none of their figures could be trended."""
    if len(h.visits) < 2:
        return "None yet (a trend needs two visits)."
    return "None (no figure could be trended: the visits' notes say why)."


def _after_colon(sentence: str) -> str:
    """A sentence continuing a title ("Trends: none …"): its first letter in lower case."""
    return sentence[:1].lower() + sentence[1:]


def no_flags(h: History) -> str:
    """What no flag means: every change within its band, or no change to judge."""
    return "None: every change lies within its band." if h.trends else "None."


# ---- Markdown -----------------------------------------------------------------------------

def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def _md_table(titles: list[str], rows: list[list[str]]) -> list[str]:
    return ["| " + " | ".join(_md(t) for t in titles) + " |",
            "|" + "|".join("---" for _ in titles) + "|",
            *("| " + " | ".join(_md(c) for c in r) + " |" for r in rows)]


def to_markdown(h: History, reader: Units | str = "si") -> str:
    """The history in Markdown (a work order, a wiki page)."""
    u = units_for(reader)
    out = [f"# History: {_md(h.site)}", "",
           f"- Calculated with branchwise {version()}; units: {u.system.upper()}",
           f"- R = h/Q²: the head across the header over the branch's flow squared, in "
           f"{r_unit(u)}", ""]
    for v in h.visits:
        lines = visit_lines(v, u)
        out += [f"## {_md(lines[0])}", "", *(f"- {_md(x)}" for x in lines[1:]), ""]
        out += _md_table(branch_titles(u), [branch_cells(b, u) for b in v.solved.branches])
        out.append("")
    out += ["## Trends", ""]
    out += (_md_table(TREND_TITLES, [trend_cells(t, u) for t in h.trends]) if h.trends
            else [no_trends(h)])
    flagged = [f"- {_md(m)}" for m in h.messages()]
    out += ["", "## Flagged", "", *(flagged or [f"- {no_flags(h)}"])]
    out += ["", BAND_NOTE, "", "## Cautions", "", *(f"- {c}" for c in CAUTIONS)]
    return "\n".join(out) + "\n"


# ---- CSV ----------------------------------------------------------------------------------

def to_csv(h: History, reader: Units | str = "si") -> str:
    """Tidy data: one header row, then one row per visit and branch (the trends and the
    cautions are in the other formats; the command line prints them on standard error)."""
    u = units_for(reader)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["Date", "Branch", f"Flow ({ascii_unit(u.unit('flow'))})",
                f"Resistance ({ascii_unit(r_unit(u))})",
                f"Effective roughness ({ascii_unit(u.unit('roughness'))})", "From"])
    for v in h.visits:
        for b in v.solved.branches:
            flow, res, rough = (_ind(b, k) for k in INDICATORS)
            w.writerow([safe_text(v.label), safe_text(b.name),
                        full(u.value(flow.value, "flow") if flow else None),
                        full(r_value(res.value, u) if res else None),
                        full(u.value(rough.value, "roughness") if rough else None),
                        source(b)])
    return buf.getvalue()


# ---- HTML ---------------------------------------------------------------------------------

def _e(text: object) -> str:
    return escape(str(text), quote=True)


def _html_table(titles: list[str], rows: list[list[str]], numeric: range,
                marked: list[bool] | None = None) -> str:
    def cls(c: int) -> str:
        return " class=num" if c in numeric else ""

    head = "".join(f'<th scope="col"{cls(c)}>{_e(t)}</th>' for c, t in enumerate(titles))
    body = "".join(
        f"<tr{' class=flagged' if marked and marked[i] else ''}>"
        + "".join(f"<td{cls(c)}>{_e(x)}</td>" for c, x in enumerate(r))
        + "</tr>" for i, r in enumerate(rows))
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def html_section(h: History, reader: Units | str = "si") -> str:
    """The visits and trends as a section of an HTML report (the walkdown report's too)."""
    u = units_for(reader)
    out = ["<h2>Visits and trends</h2>",
           f"<p>R = h/Q²: the head across the header over the branch's flow squared, in "
           f"{_e(r_unit(u))}. {_e(BAND_NOTE)}</p>"]
    messages = h.messages()
    out.append("<ul class=flags>" + ("".join(f"<li>{_e(m)}</li>" for m in messages) or
                                     "<li>No change beyond its band.</li>") + "</ul>")
    if h.trends:
        out.append(_html_table(TREND_TITLES, [trend_cells(t, u) for t in h.trends],
                               range(2, len(TREND_TITLES)), [t.flagged for t in h.trends]))
    for v in h.visits:
        lines = visit_lines(v, u)
        out += [f"<h3>{_e(lines[0])}</h3>", "<ul>" + "".join(f"<li>{_e(x)}</li>"
                                                               for x in lines[1:]) + "</ul>",
                _html_table(branch_titles(u), [branch_cells(b, u) for b in v.solved.branches],
                            range(1, 4))]
    return "\n".join(out)


# ---- JSON ---------------------------------------------------------------------------------

def history_document(h: History) -> dict[str, Any]:
    """The ``branchwise history --format json`` document (SI): the ``history`` object with
    the schema version, the site, the version and the cautions."""
    return {"schema_version": SCHEMA_VERSION, "site": h.site, "branchwise_version": version(),
            "units": "SI", "history": h.to_json(), "cautions": list(CAUTIONS)}


def to_json(h: History) -> str:
    from .json_report import _finite

    return json.dumps(_finite(history_document(h)), indent=2, ensure_ascii=False,
                      allow_nan=False) + "\n"
