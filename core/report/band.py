"""Uncertainty bands as text: the P5–P95 cells, the summary lines, the ranked list with bars,
and the JSON ``uncertainty`` object, for the reports of :mod:`branchwise.core.report.json_report`.

Everything here reads :attr:`SiteResult.uncertainty` (filled by
:func:`branchwise.core.site.solve.with_uncertainty`) and returns plain strings and data in the
reader's unit system; the bars are Unicode block characters, so they show in any terminal,
in a Markdown file and in a work order.
"""

from __future__ import annotations

import math
import textwrap
from typing import TYPE_CHECKING, Any

from ..finds import found_kind, found_noun
from ..model import TotalFlow
from ..site.solve import SiteResult
from ..units import Units, format_number, temperature_step, units_for

if TYPE_CHECKING:
    from ..numerics.sampling import InputTolerance
    from ..numerics.uncertainty import OutputBand, UncertaintyResult

BAR_WIDTH = 20
LINE_WIDTH = 80
"""Columns the text report keeps within (a terminal)."""
"""Cells of a full bar (a share of 100 %)."""
_EIGHTHS = " ▏▎▍▌▋▊▉"
TOP = 8
"""Inputs listed in a ranking; the rest are summed on one line."""


def bar(share: float, width: int = BAR_WIDTH) -> str:
    """A horizontal bar of ``share`` (0…1) of ``width`` cells, to an eighth of a cell."""
    eighths = round(max(0.0, min(1.0, share)) * width * 8)
    full, part = divmod(eighths, 8)
    return ("█" * full + (_EIGHTHS[part] if part else "")).ljust(width)


def kind_of(sr: SiteResult, output: str) -> str:
    """The units kind of an output of the uncertainty result (``flow``, ``pressure``, or the
    quantity of the found unknown: ``diameter``, ``length``, ``roughness``)."""
    if output == "pressure drop":
        return "pressure"
    if output.endswith("(found)") and sr.result.solved is not None:
        return found_kind(sr.result.solved.quantity)
    return "flow"


def focus(sr: SiteResult) -> str | None:
    """The output whose spread the ranking explains: the found unknown; else the pressure
    drop when the total flow is the given reading; else the total flow."""
    u = sr.uncertainty
    if u is None:
        return None
    found = [name for name in u.outputs if name.endswith("(found)")]
    if found:
        return found[0]
    return "pressure drop" if isinstance(sr.built.given, TotalFlow) else "total flow"


def band_range(
    sr: SiteResult, output: str, reader: Units | str = "si"
) -> tuple[float, float] | None:
    """(P5, P95) of ``output`` in the reader's unit, or None without bands."""
    u = sr.uncertainty
    if u is None or output not in u.outputs:
        return None
    b, kind = u.outputs[output], kind_of(sr, output)
    show = units_for(reader)
    return show.value(b.p5, kind), show.value(b.p95, kind)


def flow_band_cell(sr: SiteResult, branch: str, reader: Units | str = "si") -> str:
    """``"20.11–21.60"``: the P5–P95 band of a branch's flow in the display unit, or ''."""
    pair = band_range(sr, f"branch '{branch}' flow", reader)
    if pair is None:
        return ""
    lo, hi = format_number(pair[0]), format_number(pair[1])
    # "20.11–21.60"; with a negative end the dash would read as a minus: "-6.27 to -4.14"
    return f"{lo} to {hi}" if pair[0] < 0 or pair[1] < 0 else f"{lo}–{hi}"


def _label(sr: SiteResult, output: str) -> str:
    if output.endswith("(found)") and sr.result.solved is not None:
        s = sr.result.solved
        return f"{found_noun(s.quantity)} of '{s.branch}' (found)"
    return output[0].upper() + output[1:]


def band_line(sr: SiteResult, output: str, b: OutputBand, reader: Units | str = "si") -> str:
    """One output: its value, P5–P95, P50 and the GUM linear standard uncertainty."""
    kind = kind_of(sr, output)
    show = units_for(reader)

    def q(value: float) -> str:
        return show.quantity(value, kind)

    if not math.isfinite(b.p5):
        return f"{_label(sr, output)} {q(b.nominal)}: no draw has an answer"
    sigma = show.value(b.linear_sigma, kind) - show.value(0.0, kind)
    return (f"{_label(sr, output)} {q(b.nominal)}: P5–P95 {q(b.p5)} … {q(b.p95)}, "
            f"P50 {q(b.p50)}; GUM linear u = {format_number(sigma, 3)} "
            f"{show.label(kind)}")


def summary_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """The heading line, then one line per total output (total flow, pressure drop, found)."""
    u = sr.uncertainty
    if u is None:
        return []
    out = [f"Uncertainty bands: Monte Carlo, {u.samples:,} draws (seed {u.seed}); P5–P95 holds "
           "the middle 90 % of them; GUM linear u (JCGM 100:2008, 5.1.2) for comparison"]
    out += [band_line(sr, name, b, reader) for name, b in u.outputs.items()
            if not name.startswith("branch '") or name.endswith("(found)")]
    return out


def tolerance_text(inp: InputTolerance, reader: Units | str = "si") -> str:
    """An input's ± limit as typed by a person: ``± 3 %``, ``± 689 Pa``, ``× 0.5 … 2``."""
    a, show = inp.half_width, units_for(reader)
    if inp.kind == "gauge":
        return f"± {show.quantity(a, 'pressure', 3)}"
    if inp.kind == "temperature":  # a difference, in the degrees temperatures are shown in
        scale, unit = temperature_step(show.unit("temperature"))
        if inp.centre:  # cut where the liquid freezes or boils: the range drawn, from nominal
            low, high = (inp.centre - a) * scale, (inp.centre + a) * scale
            return f"{_signed(low)} … {_signed(high)} {unit}"
        return f"± {format_number(a * scale, 3)} {unit}"
    if inp.kind == "roughness":
        low, high = math.exp(inp.centre - a), math.exp(inp.centre + a)
        if inp.explicit:
            return f"{show.quantity(low, 'roughness')} … {show.quantity(high, 'roughness')}"
        return f"× {format_number(low, 3)} … {format_number(high, 3)}"
    return f"± {format_number(a * 100, 3)} %"


def _signed(value: float) -> str:
    """``+30.0``, ``−1.00``, ``0``: a difference from the nominal with its sign."""
    if value == 0:
        return "0"
    return ("+" if value > 0 else "−") + format_number(abs(value), 3)


def ranked(u: UncertaintyResult, output: str, top: int = TOP) -> tuple[list[tuple[str, float]],
                                                                       int, float]:
    """The ``top`` largest shares of ``output``, and how many more there are and their sum."""
    rows = u.ranking.get(output, [])
    rest = rows[top:]
    return rows[:top], len(rest), sum(s for _, s in rest)


def ranking_lines(sr: SiteResult, reader: Units | str = "si", top: int = TOP) -> list[str]:
    """What dominates the spread of :func:`focus`, largest first, with bars (text)."""
    u, name = sr.uncertainty, focus(sr)
    if u is None or name is None:
        return []
    rows, more, rest = ranked(u, name, top)
    what = _label(sr, name)
    if not rows:
        return [f"No input tolerance moves the {what[0].lower() + what[1:]}."]
    tol = {i.name: tolerance_text(i, reader) for i in u.inputs}
    twidth = max(len(tol.get(n, "")) for n, _ in rows)
    room = LINE_WIDTH - (2 + 2 + twidth + 2 + BAR_WIDTH + 1 + 8)  # the rest of a line
    width = min(max(len(n) for n, _ in rows), max(room, 20))
    out = textwrap.wrap(f"What dominates the spread of the {what[0].lower() + what[1:]} "
                        "(share of the GUM linear variance):", LINE_WIDTH,
                        subsequent_indent="  ")
    out += [f"  {_cut(n, width).ljust(width)}  {tol.get(n, '').ljust(twidth)}  {bar(s)} "
            f"{format_number(s * 100, 3).rjust(6)} %" for n, s in rows]
    if more:
        out.append(f"  … {more} more input{'s' if more > 1 else ''}, "
                   f"{format_number(rest * 100, 2)} % together")
    return out


def _cut(text: str, width: int) -> str:
    return text if len(text) <= width else text[: width - 1] + "…"


def markdown_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """The ``## Uncertainty`` section of the walkdown record: the bands, then every input
    with its limit and its share of the spread of :func:`focus`, largest first (or [])."""
    u, name = sr.uncertainty, focus(sr)
    if u is None or name is None:
        return []

    def md(text: str) -> str:
        return text.replace("|", "\\|").replace("\n", " ")

    out = ["", "## Uncertainty", "", *(f"- {md(line)}" for line in summary_lines(sr, reader))]
    what = _label(sr, name)
    shares = dict(u.ranking.get(name, []))
    out += ["", f"| Input | Limit | Share of the {md(what[0].lower() + what[1:])} variance | |",
            "|---|---|---:|---|"]
    for inp in sorted(u.inputs, key=lambda i: -shares.get(i.name, 0.0)):
        share = shares.get(inp.name, 0.0)
        out.append(f"| {md(inp.name)} | {md(tolerance_text(inp, reader))} | "
                   f"{format_number(share * 100, 3)} % | {bar(share).rstrip()} |")
    return out


def uncertainty_json(sr: SiteResult) -> dict[str, Any] | None:
    """The ``uncertainty`` object of the JSON report (SI): ``samples``, ``seed``, ``failed``,
    ``outputs`` {name: {unit, nominal, p5, p50, p95, mean, std, linear_sigma}}, ``ranking``
    {name: [[input, share], ...]}, ``notes``; and ``focus`` (the output the text ranks) and
    ``inputs`` [{name, kind, distribution, half_width, centre, unit, standard_uncertainty}]:
    each input is drawn over centre ± half_width, in its unit, the centre counted from the
    site's own value (0 but for a roughness, drawn about the ln of its factor's or range's
    middle, and a temperature tolerance cut where the liquid freezes or boils)."""
    u = sr.uncertainty
    if u is None:
        return None
    units = {"gauge": "Pa", "temperature": "K", "roughness": "ln(m)"}
    doc = u.to_dict()
    doc["focus"] = focus(sr)
    doc["inputs"] = [
        {"name": i.name, "kind": i.kind, "distribution": i.distribution,
         "half_width": i.half_width, "centre": i.centre,
         "unit": ("ln(m)" if i.explicit else "ln(factor)") if i.kind == "roughness"
         else units.get(i.kind, "relative"),
         "standard_uncertainty": i.standard_uncertainty}
        for i in u.inputs
    ]
    return doc


__all__ = ["bar", "band_line", "band_range", "flow_band_cell", "focus", "kind_of",
           "markdown_lines", "ranked", "ranking_lines", "summary_lines", "tolerance_text",
           "uncertainty_json"]
