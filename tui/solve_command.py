"""``branchwise solve [SITE]`` (and ``open`` where no terminal can show the app): the site
solved — with its band on ``--uncertainty`` and its system curve on ``--curve`` — in one of
the report formats, on standard output or in a file."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TYPE_CHECKING, TextIO

from .command_args import is_stdio, load_site_arg, may_write, same_file, text_width, whole

if TYPE_CHECKING:
    from branchwise.core.site.solve import SiteResult

SAMPLES_DEFAULT = 10_000
SAMPLES_MIN, SAMPLES_MAX = 10, 1_000_000
"""Monte Carlo draws: fewer than 10 give no percentiles worth the name; a million already takes
about 12 s and 2 GB of memory on the demo site (measured), so more is refused."""


def run_solve(site_path: Path | None, units: str, fmt: str, output: Path | None, out: TextIO,
           args: argparse.Namespace | None = None) -> int:
    from branchwise.core.errors import InputError
    from branchwise.core.report import render
    from branchwise.core.site.read import demo_site
    from branchwise.core.site.solve import solve_site, with_uncertainty
    from branchwise.core.storage.atomic import atomic_write_text

    from .progress import Progress

    samples_text, seed_text = getattr(args, "samples", None), getattr(args, "seed", None)
    samples = whole(samples_text, "--samples", SAMPLES_MIN, SAMPLES_MAX, SAMPLES_DEFAULT)
    seed = whole(seed_text, "--seed", 0, None, 0)
    curve_path: Path | None = getattr(args, "curve", None)
    if is_stdio(curve_path):
        raise InputError("--curve", "-", "needs a file name (.svg for an image, else CSV)")
    if curve_path is not None:
        if same_file(curve_path, site_path) or same_file(curve_path, output):
            raise InputError("--curve", str(curve_path), "is the site file or the --output "
                             "file; give the curve a file of its own")
    if output is not None and same_file(output, site_path):
        raise InputError("--output", str(output), "is the site file itself; the site file is "
                         "never overwritten")
    may_write(args, ("--curve", curve_path), ("--output", output))
    width = text_width(args, output)
    with Progress() as progress:  # a sign of life on stderr once the work takes a second
        progress.stage(f"reading {site_path}" if site_path is not None else "reading the demo")
        site = demo_site() if site_path is None else load_site_arg(site_path)
        progress.stage(f"working out {len(site.branches):,} branches")
        solved = solve_site(site)
        if (getattr(args, "uncertainty", False) or samples_text is not None
                or seed_text is not None):
            solved = with_uncertainty(solved, samples, seed, progress=progress.draws)
        progress.stage("working out the system curve")
        curve_text = None if curve_path is None else curve_csv(solved, units, curve_path)
        progress.stage(f"writing the {fmt}")
        from branchwise.core.errors import inert_output

        text = inert_output(render(solved, fmt, units, width) if fmt == "table"
                            else render(solved, fmt, units), fmt)
    if curve_path is not None and curve_text is not None:
        atomic_write_text(curve_path, curve_text, backup=True)
        kind = "image" if curve_path.suffix.lower() == ".svg" else (
            f"{curve_text.count(chr(10)) - 1} points")
        print(f"branchwise: system curve ({kind}) written to {curve_path}",
              file=sys.stderr)
    if fmt == "csv":  # the CSV is data only: what must not be lost goes to standard error
        csv_cautions(solved, units)
    if output is None or is_stdio(output):
        out.write(text)
    else:
        atomic_write_text(output, text, backup=True)
    return 0


STDERR_LINES = 40
"""The most assumed (or warning) lines written on standard error beside a CSV."""


def csv_cautions(solved: SiteResult, units: str) -> None:
    """What was assumed, the warnings, the notes and the cautions of a CSV's answer, on
    standard error."""
    from branchwise.core.errors import inert
    from branchwise.core.report.lines import CAUTIONS, assumed_lines, notes_of, warning_lines

    for word, lines in (("assumed", assumed_lines(solved, units)),
                        ("warning", warning_lines(solved, units)),
                        ("note", notes_of(solved, units))):
        for line in lines[:STDERR_LINES]:
            print(f"branchwise: {word}: {inert(line)}", file=sys.stderr)
        if len(lines) > STDERR_LINES:  # a site of thousands of branches: not a line each
            print(f"branchwise: {word}: … and {len(lines) - STDERR_LINES:,} more (every one "
                  "is in the Markdown, HTML and JSON reports)", file=sys.stderr)
    for line in CAUTIONS:
        print(f"branchwise: caution: {line}", file=sys.stderr)


def curve_csv(solved: SiteResult, units: str, path: Path | None = None) -> str:
    """The system curve of a solved site through its operating point, as CSV (or, for a
    ``path`` ending in .svg, an SVG image) in the display units of ``units`` (``si`` or
    ``us``)."""
    from branchwise.core.errors import InputError
    from branchwise.core.numerics.curve import system_curve
    from branchwise.core.report.curve_csv import to_csv
    from branchwise.core.report.svg import curve_svg

    result = solved.result
    try:
        curve = system_curve(result.network, operating=result)
        if path is not None and path.suffix.lower() == ".svg":
            return curve_svg(curve, units, title=f"System curve: {solved.site.title}",
                             standalone=True)
        return to_csv(curve, units)
    except InputError as exc:
        if not exc.field.startswith("curve."):
            raise
        raise InputError("--curve", "no flow", "the operating point carries no flow, so the "
                         "curve has no range to span") from None
