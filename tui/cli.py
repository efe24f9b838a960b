"""The ``branchwise`` command: open the app, or solve a site file from a shell or a script.

    branchwise                      open the app (without a terminal: print the demo solve)
    branchwise solve [SITE]         solve a site file (default: the bundled demo) and print it
    branchwise demo PATH            write the demo site as a starting file
    branchwise open SITE            open the app on a site file
    branchwise where                show where user files live
    branchwise import LINES.csv     a line list (CSV) as a site file
    branchwise history SITE         each visit solved, and how each branch changed since
    python -m branchwise ...        the same, where the script is not on the PATH

Nothing here imports Textual at module level: ``branchwise solve`` must start fast and work
where no terminal UI can run. Bad input prints one line, ``branchwise: <file>: <field>: <reason>,
got <value>`` (a branch's field by the branch's name, the field path after it:
``branch "AHU-2 coil" length: ... (branches[1].length)``), and exits with status 2; the input
file is only ever read. ``-`` as the site (or line list) reads standard input; ``-o -`` writes
standard output.

Exit status (:data:`EXIT_STATUSES`, also in ``--help`` and the README): 0 done; 1 an
unexpected fault (a bug: one line, no traceback; please report it); 2 bad input, a site with no
answer, a file that cannot be read or written, or a command line argparse refuses; 130
interrupted (Ctrl+C).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TextIO

from .command_args import (
    WIDTH_DEFAULT,
    WIDTH_MAX,
    WIDTH_MIN,
    load_site_arg,
    may_write,
    same_file,
    text_width,
)
from .solve_command import SAMPLES_DEFAULT, SAMPLES_MAX, SAMPLES_MIN, run_solve

EXIT_OK = 0
EXIT_INPUT = 2
"""Exit status for bad input or a site with no answer (argparse uses 2 for bad usage too)."""
EXIT_FAULT = 1
"""Exit status for an unexpected fault: a bug in branchwise, said on one line."""
EXIT_INTERRUPTED = 130
"""Exit status after Ctrl+C (128 + SIGINT, the shells' convention)."""
EXIT_STATUSES = ("exit status: 0 done; 1 an unexpected fault (a bug, please report it); "
                 "2 bad input, a site with no answer, a file that cannot be read or written, "
                 "a wrong command line, or a reader that went away (| head); 130 interrupted")
FORMATS = ("table", "json", "csv", "markdown", "html")
BY_SUFFIX = {".csv": "csv", ".json": "json", ".md": "markdown", ".markdown": "markdown",
             ".html": "html", ".htm": "html"}
"""The format an -o FILE's name asks for when --format is not given."""


def _version() -> str:
    from branchwise.core.report.lines import version

    return version()


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="branchwise",
        description="Flow split in parallel pipe branches for site work: flows, or one "
                    "branch's diameter, length or roughness, from a field reading.",
        epilog="Run 'branchwise COMMAND --help' for a command's options. " + EXIT_STATUSES
               + ".",
    )
    p.add_argument("--version", action="version", version=f"branchwise {_version()}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    solve = sub.add_parser(
        "solve", help="solve a site file and print the result",
        description="Solve a site file (default: the bundled demo site) and print the result. "
                    "The site file is only read, never changed.",
        epilog=EXIT_STATUSES + ".")
    solve.add_argument("site", nargs="?", type=Path,
                       help="site file (TOML), or - to read it from standard input; default: "
                            "the demo")
    _output_options(solve)
    band = solve.add_argument_group(
        "uncertainty and system curve",
        "Bands come from the site's [tolerances] table (common-practice defaults without one).")
    band.add_argument(
        "--uncertainty", action="store_true",
        help="add P5–P95 bands from a Monte Carlo run over the input tolerances, the GUM "
             "linear estimate, and a ranked list of what dominates the spread")
    band.add_argument(
        "--samples", metavar="N",
        help=f"Monte Carlo draws, {SAMPLES_MIN} to {SAMPLES_MAX:,} (default "
             f"{SAMPLES_DEFAULT:,}); implies --uncertainty")
    band.add_argument(
        "--seed", metavar="S",
        help="random seed, a whole number from 0 (default 0): the same seed gives the same "
             "bands; implies --uncertainty")
    band.add_argument(
        "--curve", type=Path, metavar="FILE",
        help="also write the system curve (pressure drop and each branch's flow against the "
             "total flow, from zero to 1.5 times the operating point) to FILE, in the --units "
             "system: an image when FILE ends in .svg, else CSV with the unit in each column "
             "title")
    band.add_argument("--force", action="store_true",
                      help="replace an existing --curve FILE or -o FILE (the old one is kept "
                           "as FILE.bak)")

    demo = sub.add_parser(
        "demo", help="write the demo site to a file to start from",
        description="Write the bundled demo site (a made-up chilled-water header) to PATH "
                    "(default: demo-site.toml in the current folder).")
    demo.add_argument("path", type=Path, nargs="?", default=Path("."),
                      help="file to write, or a folder to write it into (default: this folder)")
    demo.add_argument("--force", action="store_true", help="replace an existing file")

    open_ = sub.add_parser(
        "open", help="open the app on a site file",
        description="Open the app on a site file (until the app is installed: solve it).")
    open_.add_argument("site", type=Path, help="site file (TOML)")
    _output_options(open_)
    open_.add_argument("--force", action="store_true",
                       help="replace an existing -o FILE (the old one is kept as FILE.bak)")

    history = sub.add_parser(
        "history", help="each visit solved, and how each branch changed between visits",
        description="Solve every visit a site file keeps ([[visits]], and today's readings) "
                    "from its own readings, and show per branch the flow, the resistance "
                    "R = h/Q² and the effective roughness, with the change since the first and "
                    "the previous visit and its band; a change beyond its band is flagged. "
                    "The site file is only read, never changed.",
        epilog=EXIT_STATUSES + ".")
    history.add_argument("site", type=Path,
                         help="site file (TOML), or - to read it from standard input")
    _output_options(history, rows="one row per visit and branch", curve=False)
    history.add_argument("--force", action="store_true",
                         help="replace an existing -o FILE (the old one is kept as FILE.bak)")

    sub.add_parser("where", help="show where user files live",
                   description="Print the folders and files branchwise keeps for the user.")

    lines = sub.add_parser(
        "import", help="read a line list (CSV from a spreadsheet) into a site file",
        description="Read a line list, a CSV whose columns are titled with the trade's words "
                    "(name, tag, size or bore, schedule, length, material or roughness, "
                    "fittings, K, valve Kv or Cv, measured flow), a unit in a title (Length "
                    "(ft)) or in a cell (76 m); rows of the same name one after another are "
                    "one branch's series segments. Every bad cell is named by its line and "
                    "column, and nothing is written unless the whole list reads.",
        epilog=EXIT_STATUSES + ".")
    lines.add_argument("lines", type=Path, metavar="LINES.csv",
                       help="the line list, or - to read it from standard input")
    lines.add_argument("-o", "--output", type=Path, metavar="SITE",
                       help="write the site file here (default, or -: standard output)")
    lines.add_argument("--template", type=Path, metavar="SITE",
                       help="take the liquid, the readings, the record and the tolerances from "
                            "this site file (default: water at 20 °C, no reading yet)")
    lines.add_argument("--force", action="store_true", help="replace an existing SITE")

    presets = sub.add_parser(
        "presets", help="list, add or delete your own liquids and materials",
        description="Your own liquids and pipe materials, kept in your data folder (see "
                    "'branchwise where'). A site uses one by its key: fluid.kind = \"KEY\" or "
                    "material = \"KEY\". Yours override shipped ones with the same key.",
        epilog="Examples:  branchwise presets add fluids light-oil density='870 kg/m^3' "
               "viscosity='32 cSt'    branchwise presets add materials old-steel "
               "roughness='0.5 mm'    branchwise presets delete fluids light-oil")
    presets.add_argument("action", choices=("list", "add", "delete"), nargs="?", default="list",
                         help="list (default), add (or replace), or delete")
    presets.add_argument("kind", nargs="?", choices=("fluids", "materials"),
                         help="fluids or materials")
    presets.add_argument("key", nargs="?", help="the preset's key: lowercase, digits, hyphens")
    presets.add_argument("values", nargs="*", metavar="NAME=VALUE",
                         help="values with units as on a tag, e.g. density='870 kg/m^3'")
    return p


def _output_options(p: argparse.ArgumentParser, rows: str = "one row per segment",
                    curve: bool = True) -> None:
    p.add_argument("--units", choices=("si", "us"), default="si",
                   help="unit system of the table, CSV, Markdown"
                        + (" and --curve file" if curve else " and HTML") + " (JSON is always SI)")
    p.add_argument("--format", choices=FORMATS, default=None,
                   help="output format (default: the one -o FILE's name says, such as .csv, "
                        f"else table); csv is {rows} (the "
                        "cautions then go to standard error); html a walkdown report that "
                        "opens in a browser")
    p.add_argument("-o", "--output", type=Path, metavar="FILE",
                   help="write the output to FILE instead of the screen (- : standard output)")
    p.add_argument("--width", metavar="N",
                   help=f"wrap the table's text to N columns ({WIDTH_MIN} to {WIDTH_MAX}; "
                        f"default: the terminal's width, or COLUMNS, or {WIDTH_DEFAULT} when "
                        "not writing to a terminal)")


# ---- commands ------------------------------------------------------------------------------

def _demo(path: Path, force: bool, out: TextIO) -> int:
    from branchwise.core.site.read import DEMO_NAME, demo_text
    from branchwise.core.storage.atomic import atomic_write_text
    from branchwise.core.storage.file_checks import check_replace

    if str(path) == "-":  # the demo on standard output, as `-o -` writes elsewhere
        out.write(demo_text())
        return EXIT_OK
    if path.is_dir():
        path = path / DEMO_NAME
    check_replace(path, path.name, force)
    atomic_write_text(path, demo_text(), backup=True)
    word = shell_word(path)
    out.write(f"wrote the demo site to {path}\n"
              f"open it in the app: branchwise open {word}\n"
              f"or solve it here:   branchwise solve {word}\n")
    return EXIT_OK


def shell_word(path: Path) -> str:
    """``path`` as it can be pasted into a shell command: quoted where it needs quotes, and
    ``./`` before a name that starts with ``-`` (it would read as an option)."""
    import shlex

    text = str(path)
    if text.startswith("-"):
        text = f".{'/'}{text}"
    return shlex.quote(text)


def _where(out: TextIO) -> int:
    from branchwise.core.storage.paths import DATA_DIR_ENV, where_files_live

    labels = {"data_dir": "data folder", "presets_file": "presets", "settings_file": "settings",
              "sites_dir": "sites", "recovery_dir": "recovery copies"}
    places = where_files_live()
    width = max(len(labels.get(k, k)) for k in places)
    for key, path in places.items():
        out.write(f"{labels.get(key, key).ljust(width)}  {path}\n")
    out.write(f"(set {DATA_DIR_ENV} to use another data folder)\n")
    _say_data_dir_problem()
    return EXIT_OK


def _say_data_dir_problem() -> None:
    """A data folder that is a file, said on stderr (nothing could be saved there)."""
    from branchwise.core.storage.paths import data_dir_problem

    problem = data_dir_problem()
    if problem:
        print(f"branchwise: {problem}", file=sys.stderr)


# ---- the app (another module; loaded only when a terminal can show it) ---------------------

def _launch_app(site_path: Path | None) -> int | None:
    """APP HOOK: run ``branchwise.tui.app.BranchwiseApp(site_path=...)`` if it is installed.

    Returns the app's exit status, or None when there is no app module yet or no terminal to
    draw on (standard input or output redirected), so the caller prints a solve instead.
    """
    import importlib.util

    if not (sys.stdin.isatty() and sys.stdout.isatty()):
        return None
    if importlib.util.find_spec("branchwise.tui.app") is None:
        return None
    from branchwise.tui.app import BranchwiseApp  # Textual loads only here

    app = BranchwiseApp(site_path=site_path)
    code = app.run()
    return code if isinstance(code, int) else (app.return_code or 0)


# ---- entry point ---------------------------------------------------------------------------

def _site_label(args: argparse.Namespace) -> str:
    site = getattr(args, "site", None)
    if args.command == "demo":
        from branchwise.core.site.read import DEMO_NAME

        return str(args.path / DEMO_NAME if args.path.is_dir() else args.path)
    if args.command in ("presets", "where"):
        return "presets"
    if args.command == "import":
        return "<stdin>" if str(args.lines) == "-" else str(args.lines)
    if site is not None and str(site) == "-":
        return "<stdin>"
    return str(site) if site is not None else "demo site"


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _message(exc: Exception, label: str, system: str = "si") -> str:
    """``<file>: <field>: <reason>, got <value>`` on one line, the file named once: the error
    as the app words it (:func:`~branchwise.core.site.fields.error_text`), then the field's
    path in the file where the words differ from it: ``site.toml: branch "AHU-2 coil"
    length: must not be negative, got -5 m (branches[1].length)``."""
    from branchwise.core.errors import InputError
    from branchwise.core.site.fields import FieldPath, error_text

    if isinstance(exc, InputError) and exc.field.startswith("--"):  # an option, not the file
        return _one_line(f"{exc.field}: {exc.reason}, got {exc.value}")
    field, name = getattr(exc, "field", "") or "", Path(label).name
    if isinstance(exc, InputError) and (field == name or field.startswith(name + " ")):
        # "demo.toml line 7" → "line 7"
        field = field[len(name):].strip()
        exc = InputError(field, exc.marked_value, exc.marked_reason).naming(exc.names)
    text = error_text(exc, system)
    path = FieldPath.parse(field)
    if field and path.parts and path.words(getattr(exc, "names", ())) != field:
        text += f" ({field})"
    return _one_line(f"{label}: {text}")


def _format(chosen: str | None, output: Path | None) -> str:
    """--format as given; without it, the one an -o FILE's name asks for (r.csv: CSV), said
    on standard error; else the text table."""
    if chosen is not None:
        return chosen
    by_name = BY_SUFFIX.get(output.suffix.lower()) if output is not None else None
    if output is None or by_name is None:
        if output is not None and output.suffix.lower() not in ("", ".txt", ".text"):
            print(f"branchwise: writing the text table: the name {output.name} asks for no "
                  "format known here (--format to choose csv, json, markdown or html)",
                  file=sys.stderr)
        return "table"
    print(f"branchwise: writing {by_name.upper() if by_name != 'markdown' else 'Markdown'}, "
          f"as the name {output.name} says (--format to choose another)", file=sys.stderr)
    return by_name


def main(argv: list[str] | None = None) -> int:
    """Run the command line; returns the exit status (0 fine, 2 bad input or no answer)."""
    from branchwise.core.errors import BranchwiseError

    args = _parser().parse_args(argv)
    if hasattr(args, "format"):
        args.format = _format(args.format, getattr(args, "output", None))
    out = sys.stdout
    try:
        if args.command is None:
            code = _launch_app(None)
            return code if code is not None else run_solve(None, "si", "table", None, out)
        if args.command == "open":
            code = _launch_app(args.site)
            if code is not None:
                return code
            return run_solve(args.site, args.units, args.format, args.output, out, args)
        if args.command == "solve":
            return run_solve(args.site, args.units, args.format, args.output, out, args)
        if args.command == "demo":
            return _demo(args.path, args.force, out)
        if args.command == "history":
            from .history_command import run_history

            if args.output is not None and same_file(args.output, args.site):
                from branchwise.core.errors import InputError

                raise InputError("--output", str(args.output), "is the site file itself; the "
                                 "site file is never overwritten")
            may_write(args, ("--output", args.output))
            return run_history(load_site_arg(args.site), args.units, args.format, args.output,
                               text_width(args, args.output), out, sys.stderr)
        if args.command == "presets":
            from .presets_command import run_presets

            return run_presets(args.action, args.kind, args.key, args.values, out)
        if args.command == "import":
            from .import_command import run_import

            return run_import(args.lines, args.output, args.template, args.force, out,
                              sys.stderr)
        return _where(out)
    except BranchwiseError as exc:
        system = getattr(args, "units", "si")
        print(f"branchwise: {_message(exc, _site_label(args), system)}", file=sys.stderr)
        return EXIT_INPUT
    except BrokenPipeError:  # the reader went away (``| head``): stop quietly
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return EXIT_INPUT
    except OSError as exc:
        target = exc.filename if exc.filename is not None else _site_label(args)
        print(f"branchwise: {target}: {_one_line(exc.strerror or str(exc))}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("branchwise: interrupted", file=sys.stderr)
        return EXIT_INTERRUPTED
    except Exception as exc:  # a bug: one line, never a traceback (house rule)
        print(f"branchwise: internal error ({type(exc).__name__}: {_one_line(str(exc))}); "
              "please report it", file=sys.stderr)
        return EXIT_FAULT


if __name__ == "__main__":
    sys.exit(main())
