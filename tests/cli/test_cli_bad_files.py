"""Bad site files through ``branchwise solve``: each gives exit status 2 and one line on stderr
that names the file, the field and the value; never a traceback; the file is left untouched."""

from __future__ import annotations

import contextlib
import io
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st
from site_texts import PUMP_ROOM

from branchwise.tui.cli import main

GOOD = PUMP_ROOM


def edit(old: str, new: str) -> str:
    assert old in GOOD, old  # the table below must really change the file
    return GOOD.replace(old, new, 1)


SOLVE = '\n[solve]\nfind = "diameter"\nbranch = "{branch}"\ntarget_flow = "{flow}"\n'

# (case, file content, text the one-line message must contain)
BAD_FILES = [
    ("bad TOML, with its line", edit('kind = "water"', "kind = water"), "line 5"),
    ("unclosed string", edit('name = "Pump room"', 'name = "Pump room'), "line 2"),
    ("wrong unit dimension", edit('length = "64 m"', 'length = "64 kPa"'),
     'branch "Condenser A" length: is not a length'),
    ("unknown unit", edit('length = "64 m"', 'length = "64 furlongz"'),
     'branch "Condenser A" length: unknown unit'),
    ("bare number for a length", edit('length = "64 m"', "length = 64"),
     'branch "Condenser A" length: needs a unit'),
    ("NaN number", edit('length = "64 m"', "length = nan"), "(branches[0].length)"),
    ("NaN text", edit('length = "64 m"', 'length = "nan m"'), 'branch "Condenser A" length'),
    ("infinite", edit('pressure_drop = "68 kPa"', 'pressure_drop = "1e999 kPa"'),
     "conditions.pressure_drop"),
    ("negative length", edit('length = "64 m"', 'length = "-64 m"'),
     'branch "Condenser A" length: must not be negative'),
    ("roughness at least D/2", edit('roughness = "0.045 mm"', 'roughness = "60 mm"'),
     'branch "Condenser A" roughness: must be below half the diameter'),
    ("a bore far too small is said of the bore, not of the material's roughness",
     edit('size = "3 in sch 40"', 'diameter = "0.05 mm"'),
     'branch "Jacket loop" diameter: is narrower than any pipe (at least 0.1 mm), got 0.05 mm'),
    ("missing condition", edit('pressure_drop = "68 kPa"', ""), "conditions: needs one reading"),
    ("contradictory conditions", edit('pressure_drop = "68 kPa"',
                                      'pressure_drop = "68 kPa"\ntotal_flow = "30 L/s"'),
     "conditions.total_flow: contradicts conditions.pressure_drop"),
    ("pressure drop and a measured flow", edit('minor_k = 6.2', 'minor_k = 6.2\n'
                                               'measured_flow = "20 L/s"'),
     'branch "Condenser A" measured_flow: contradicts'),
    ("unknown branch in [solve]", GOOD + SOLVE.format(branch="Tower", flow="9 L/s"),
     "solve.branch: no such branch"),
    ("duplicate names", edit('name = "Jacket loop"', 'name = "condenser a"'),
     'branch "condenser a" name: duplicates branch "Condenser A" name'),
    ("unknown fluid kind", edit('kind = "water"', 'kind = "mercury"'), "fluid.kind"),
    ("a branch named as a kind of reading (the given's word would win)",
     edit('name = "Jacket loop"', 'name = "All"'),
     'branch "All" name: is a word conditions.given keeps'),
    ("a billion elbows (named as typed, not as the segment's minor_k)",
     edit('minor_k = 6.2', 'minor_k = 6.2\nfittings = { elbow-90 = 1e9 }'),
     'branch "Condenser A" fittings.elbow-90: is more fittings of one kind'),
    ("water above boiling", edit('"18 degC"', '"120 degC"'), "fluid.temperature"),
    ("unknown material", edit('material = "commercial-steel"', 'material = "unobtainium"'),
     'branch "Jacket loop" material'),
    ("size not in the catalog", edit('"3 in sch 40"', '"3 in sch 41"'),
     'branch "Jacket loop" size'),
    ("diameter and size both", edit('size = "3 in sch 40"',
                                    'size = "3 in sch 40"\ndiameter = "3 in"'),
     'branch "Jacket loop" size: give diameter or size, not both'),
    ("unknown key (typo)", edit('length = "64 m"', 'lenght = "64 m"'),
     'branch "Condenser A" lenght: unknown key (did you mean \'length\'?)'),
    ("unknown fitting", edit("minor_k = 6.2", "minor_k = 6.2\nfittings = { elbow-91 = 2 }"),
     'branch "Condenser A" fittings'),
    ("newer format", edit("format = 1", "format = 99"), "format: written by a newer branchwise"),
    ("no branches", GOOD.split("[[branches]]")[0], "branches: a site needs at least one"),
    ("unknown find", GOOD + '\n[solve]\nfind = "colour"\n', "solve.find: must be one of"),
    ("no answer for the target", GOOD + SOLVE.format(branch="Jacket loop", flow="-9 L/s"),
     "solve.target_flow"),
    ("fluid not a table", edit('[fluid]\nkind = "water"\ntemperature = "18 degC"\n',
                               'fluid = "water"\n'), "fluid: must be a table"),
    ("empty file", "", "fluid: this file holds no site"),
    ("a file of comments only", "# notes\nformat = 1\n", "fluid: this file holds no site"),
]


@pytest.mark.parametrize(("case", "content", "expected"), BAD_FILES, ids=[c[0] for c in BAD_FILES])
def test_bad_site_file(tmp_path, capsys, case, content, expected):
    path = tmp_path / "site.toml"
    path.write_text(content, encoding="utf-8")
    before = path.read_bytes()
    assert main(["solve", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert err.count("\n") == 1 and err.startswith(f"branchwise: {path}: "), err
    assert expected in err, err
    assert "Traceback" not in err
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["site.toml"]  # nothing written beside


BRANCH_WORDS = [
    # (change, the branch by name and the field, the field path as in the file)
    (('length = "180 ft"', 'length = "-180 ft"'), 'branch "Jacket loop" length: must not be '
     'negative, got -180 ft', "(branches[1].length)"),
    (('name = "Jacket loop"', 'name = "  "'), "branch 2 (no name) name: must be non-empty text",
     "(branches[1].name)"),
    (('size = "3 in sch 40"\nlength = "180 ft"\nmaterial = "commercial-steel"\n',
      'segments = [ { size = "3 in sch 40", length = "180 ft" },\n'
      '  { size = "2 in sch 40", length = "9 kPa" } ]\n'), 'branch "Jacket loop" segment 2 '
     "length: is not a length", "(branches[1].segments[1].length)"),
]


@pytest.mark.parametrize(("change", "words", "path"), BRANCH_WORDS)
def test_branch_fields_are_named_by_the_branch(tmp_path, capsys, change, words, path):
    # A technician reads the file by branch names, not zero-based places (newcomer trial).
    site = tmp_path / "site.toml"
    site.write_text(edit(*change), encoding="utf-8")
    assert main(["solve", str(site)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith(f"branchwise: {site}: {words}"), err
    assert err.rstrip().endswith(path), err


def test_branch_error_keeps_its_field_path_for_the_app(tmp_path):
    # The app places the message beside the widget of InputError.field: it stays a path.
    from branchwise.core.errors import InputError
    from branchwise.core.site.read import load_site
    from branchwise.core.site.solve import solve_site

    site = tmp_path / "site.toml"
    site.write_text(edit('length = "180 ft"', 'length = "-180 ft"'), encoding="utf-8")
    with pytest.raises(InputError) as caught:
        solve_site(load_site(site))
    assert caught.value.field == "branches[1].length"


def test_in_words_puts_every_branch_reference_by_name():
    from branchwise.core.site.fields import in_words
    from branchwise.core.site.read import parse_site

    names = [b.name for b in parse_site(GOOD).branches]
    assert names == ["Condenser A", "Jacket loop"]
    assert (in_words("branches[1].fittings.elbow-90", names)
            == 'branch "Jacket loop" fittings.elbow-90')
    assert in_words("duplicates branches[0].name", names) == 'duplicates branch "Condenser A" name'
    assert in_words("branches[5]", names) == "branch 6 (no name)"  # beyond the list: by place
    assert in_words("conditions.pressure_drop", names) == "conditions.pressure_drop"


def test_there_are_at_least_fifteen_kinds_of_bad_file():
    assert len({case for case, _, _ in BAD_FILES}) >= 15


def test_binary_junk_missing_file_and_folder(tmp_path, capsys):
    junk = tmp_path / "junk.toml"
    junk.write_bytes(b"format = 1\n\xff\xfe\x00\x81binary")
    assert main(["solve", str(junk)]) == 2
    err = capsys.readouterr().err
    assert "line 2" in err and "UTF-8" in err and err.count("\n") == 1
    assert junk.read_bytes() == b"format = 1\n\xff\xfe\x00\x81binary"

    assert main(["solve", str(tmp_path / "missing.toml")]) == 2
    assert "file not found" in capsys.readouterr().err

    assert main(["solve", str(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("branchwise: ") and err.count("\n") == 1


def test_bad_file_in_a_real_process_has_no_traceback(tmp_path):
    path = tmp_path / "site.toml"
    path.write_bytes(b"\x00\x01\x02 junk")
    run = subprocess.run([sys.executable, "-m", "branchwise.tui.cli", "solve", str(path)],
                         capture_output=True, text=True, timeout=60)
    assert run.returncode == 2
    assert run.stdout == ""
    assert run.stderr.count("\n") == 1 and "Traceback" not in run.stderr
    assert path.read_bytes() == b"\x00\x01\x02 junk"


def test_output_file_cannot_be_the_site_file(tmp_path, capsys):
    path = tmp_path / "site.toml"
    path.write_text(GOOD)
    assert main(["solve", str(path), "-o", str(path)]) == 2
    assert "never overwritten" in capsys.readouterr().err
    assert path.read_text() == GOOD


# ---- any value in any field: exit 0 or 2, never an exception ------------------------------

_LINES = [line for line in GOOD.splitlines() if " = " in line]
_ODD = ['"-1 m"', '"0 m"', '"0 mm"', '"1e-300 m"', '"1E200 m"', '"0 L/s"', "[]", "{}", "[1, 2]",
        "{ a = 1 }", '"-68 kPa"', '"-300 degC"', '"1 K"', '"3 in sch 40"', '"0 cP"', "nan",
        "-inf", "true", "0", "1e308"]


def _toml(value: object) -> str:
    if isinstance(value, str):
        return value if value in _ODD else '"' + value.encode("unicode_escape").decode(
            "ascii").replace('"', '\\"') + '"'
    return str(value)


@given(st.lists(st.tuples(st.sampled_from(_LINES),
                          st.one_of(st.sampled_from(_ODD), st.text(max_size=10),
                                    st.integers(-10**20, 10**20))),
                min_size=1, max_size=3))
def test_any_value_in_any_field_exits_0_or_2(changes):
    # Robustness, no outside reference: bad input is reported, never raised.
    text = GOOD
    for line, value in changes:
        text = text.replace(line, f"{line.split(' = ')[0]} = {_toml(value)}", 1)
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "site.toml"
        path.write_bytes(text.encode())
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = main(["solve", str(path), "--format", "json"])
        assert code in (0, 2)
        assert code == 0 or err.getvalue().count("\n") == 1
        assert path.read_bytes() == text.encode()
