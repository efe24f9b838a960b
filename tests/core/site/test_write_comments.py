"""Saving an edited site keeps each comment of the file beside the key it was written next to.

The demo site file carries every kind of comment a person writes: end-of-line comments, a
commented-out hint inside a branch, and a commented-out table standing before the next header.
Every written text is read back by Python's own TOML reader (``tomllib``, the reference parser
of the standard library) and must give the same site, so no fix for comments can break a value.
"""

from __future__ import annotations

import copy
import re
import tomllib

import pytest

from branchwise.core.site.read import demo_text, parse_site
from branchwise.core.site.spec import SolveSpec
from branchwise.core.site.write import dump_site

ASME = "# ASME B36.10M: inner diameter"
STRAINER = "# entrance, exit and strainer, summed by hand"
BALANCING = "# balancing valve, partly closed"
HINT = '# measured_flow = "80 gpm"'
HINT_MORE = '# in [conditions] to compare it, "all" to weigh both'
SOLVE_BLOCK = "# [solve]"
RANGE_HINT = "# roughness_range = "
_KEY = re.compile(r"([A-Za-z0-9_-]+)\s*=")


def _demo():
    return parse_site(demo_text())


def _sections(text: str) -> list[tuple[str, str, str]]:
    """(section, key or "", line) for every line: section is the table name, or for a
    ``[[branches]]`` element its ``name`` value once read."""
    rows: list[tuple[str, str, str]] = []
    section = ""
    for line in text.splitlines():
        bare = line.strip()
        if bare.startswith("[[branches]]"):
            section = "branch ?"
        elif bare.startswith("["):
            section = bare.split("]")[0].strip("[ ")
        found = _KEY.match(bare)  # array continuation lines (`{ size = ...`) carry no key
        key = found.group(1) if found else ""
        if key == "name" and section.startswith("branch"):
            section = "branch " + tomllib.loads(bare)["name"]
            rows = [(section if s == "branch ?" else s, k, t) for s, k, t in rows]
        rows.append((section, key, line))
    return rows


def _line_of(text: str, fragment: str) -> int:
    rows = _sections(text)
    found = [i for i, (_, _, line) in enumerate(rows) if fragment in line]
    assert len(found) == 1, f"{fragment!r} found {len(found)} times"
    return found[0]


def _on_line(text: str, fragment: str) -> tuple[str, str]:
    """The (section, key) written on the same line as ``fragment``."""
    section, key, _ = _sections(text)[_line_of(text, fragment)]
    return section, key


def _key_above(text: str, fragment: str) -> tuple[str, str]:
    """The (section, key) of the nearest key line above the comment line ``fragment``."""
    rows = _sections(text)
    i = _line_of(text, fragment)
    while rows[i][1] == "":
        i -= 1
    return rows[i][0], rows[i][1]


def _line_below(text: str, fragment: str) -> str:
    """The first line below ``fragment`` that is neither blank nor a comment."""
    rows = _sections(text)
    for _, _, line in rows[_line_of(text, fragment) + 1:]:
        if line.strip() and not line.lstrip().startswith("#"):
            return line.strip()
    return ""


def _reads_back(site, text: str) -> None:
    # tomllib (Python's standard-library TOML parser) is the reference for the values.
    tomllib.loads(text)
    assert parse_site(text) == site


def _check_untouched_comments(text: str) -> None:
    """The comments of the demo that no edit in these tests should move."""
    assert _key_above(text, HINT) == ("branch AHU-3 coil", "valve_cv")
    assert _line_of(text, HINT_MORE) == _line_of(text, HINT) + 1
    assert _key_above(text, SOLVE_BLOCK)[0].startswith("branch ")
    assert _line_below(text, SOLVE_BLOCK).startswith("[tolerances]")
    assert _line_below(text, RANGE_HINT) == 'diameter = "1 %"                   ' \
        "# bore: wall tolerance and deposits"


def test_unedited_demo_is_written_byte_for_byte() -> None:
    assert dump_site(_demo()) == demo_text()


def test_reading_and_solve_table_added_leave_every_comment_in_place() -> None:
    # The reported case: a reading set on AHU-2 in place of the header pressure drop, and a
    # [solve] table added.
    site = _demo()
    site.conditions.pressure_drop = None
    site.branches[1].measured_flow = "160 gpm"
    site.solve = SolveSpec(find="diameter", branch="AHU-2 coil", target_flow="220 gpm")
    text = dump_site(site)
    _reads_back(site, text)
    assert _on_line(text, ASME) == ("branch AHU-1 coil", "size")
    assert _on_line(text, STRAINER) == ("branch AHU-2 coil", "minor_k")
    assert _on_line(text, BALANCING) == ("branch Bypass", "valve_kv")
    assert _on_line(text, "# both headers at the same height") == ("conditions",
                                                                     "elevation_change")
    assert _on_line(text, 'measured_flow = "160 gpm"') == ("branch AHU-2 coil",
                                                           "measured_flow")
    assert _key_above(text, HINT) == ("branch AHU-3 coil", "valve_cv")
    assert _key_above(text, SOLVE_BLOCK) == ("branch Bypass", "segments")
    _check_untouched_comments(text)
    assert "supply header minus return header" not in text  # went with its key
    # Lines whose values did not change keep their text exactly.
    old = demo_text().splitlines()
    kept = [line for line in old if "pressure_drop = " not in line or line.startswith("#")]
    lines = iter(text.splitlines())
    assert all(line in lines for line in kept)  # in the same order, each line unchanged
    new = [line for line in text.splitlines() if line not in old]
    assert new == ['measured_flow = "160 gpm"', "[solve]", 'find = "diameter"',
                   'branch = "AHU-2 coil"', 'target_flow = "220 gpm"']


@pytest.mark.parametrize("order", [[3, 2, 1, 0], [1, 0, 3, 2], [2, 3, 0, 1]])
def test_reordered_branches_take_their_comments_along(order: list[int]) -> None:
    site = _demo()
    site.branches = [site.branches[i] for i in order]
    text = dump_site(site)
    _reads_back(site, text)
    assert _on_line(text, ASME) == ("branch AHU-1 coil", "size")
    assert _on_line(text, STRAINER) == ("branch AHU-2 coil", "minor_k")
    assert _on_line(text, BALANCING) == ("branch Bypass", "valve_kv")
    _check_untouched_comments(text)
    # The branch that is now last is the one above the commented-out [solve] block.
    assert _key_above(text, SOLVE_BLOCK)[0] == "branch " + site.branches[-1].name
    # Each header still stands after a blank line.
    assert "\n\n[[branches]]" in text and "]\n[[branches]]" not in text
    # Back in the original order: the original file, byte for byte.
    site.branches = [site.branches[order.index(i)] for i in range(4)]
    assert dump_site(site) == demo_text()


@pytest.mark.parametrize(("index", "gone"), [(0, ASME), (1, STRAINER), (3, BALANCING)])
def test_deleted_branch_takes_only_its_own_comments(index: int, gone: str) -> None:
    site = _demo()
    del site.branches[index]
    text = dump_site(site)
    _reads_back(site, text)
    assert gone not in text
    for fragment, where in [(ASME, ("branch AHU-1 coil", "size")),
                            (STRAINER, ("branch AHU-2 coil", "minor_k")),
                            (BALANCING, ("branch Bypass", "valve_kv"))]:
        if fragment != gone:
            assert _on_line(text, fragment) == where
    _check_untouched_comments(text)
    assert _on_line(text, "# supply header minus") == ("conditions", "pressure_drop")


def test_deleted_middle_branch_does_not_shift_others_into_its_place() -> None:
    site = _demo()
    del site.branches[2]  # AHU-3: its hint goes with it
    text = dump_site(site)
    _reads_back(site, text)
    assert HINT not in text and HINT_MORE not in text
    assert _on_line(text, STRAINER) == ("branch AHU-2 coil", "minor_k")
    assert _key_above(text, SOLVE_BLOCK) == ("branch Bypass", "segments")


def test_added_keys_leave_comments_beside_their_keys() -> None:
    site = _demo()
    site.branches[2].measured_flow = "80 gpm"  # where the hint says
    site.branches[0].note = "coil cleaned in May"
    site.conditions.gravity = "9.81 m/s**2"
    assert site.tolerances is not None
    site.tolerances.target_flow_measured = "5 %"
    text = dump_site(site)
    _reads_back(site, text)
    _check_untouched_comments(text)
    assert _on_line(text, ASME) == ("branch AHU-1 coil", "size")
    assert _on_line(text, 'note = "coil cleaned in May"') == ("branch AHU-1 coil", "note")
    # New keys go below the table's last key and its own comments, above the blank line.
    rows = _sections(text)
    i = _line_of(text, 'gravity = "9.81')
    assert rows[i - 1][1] == "friction" and rows[i + 1][2] == ""
    i = rows.index(("branch AHU-3 coil", "measured_flow", 'measured_flow = "80 gpm"'))
    assert rows[i - 1][2].strip() == HINT_MORE  # below the hint, not between
    assert rows[_line_of(text, "target_flow_measured")][0] == "tolerances"


def test_changed_value_keeps_its_end_of_line_comment_and_rename_keeps_the_table() -> None:
    site = _demo()
    site.branches[1].valve_cv = 120
    site.branches[1].name = "AHU-2 coil (new valve)"
    text = dump_site(site)
    _reads_back(site, text)
    assert _on_line(text, "# coil and control valve together, Cv") == (
        "branch AHU-2 coil (new valve)", "valve_cv")
    assert _on_line(text, STRAINER) == ("branch AHU-2 coil (new valve)", "minor_k")
    _check_untouched_comments(text)


def test_edits_applied_twice_give_the_same_file() -> None:
    # Saving, reading back and saving again (the app's save then save) changes nothing more.
    site = _demo()
    site.branches = [site.branches[i] for i in (2, 0, 3, 1)]
    site.branches[0].measured_flow = "80 gpm"
    first = dump_site(site)
    again = parse_site(first)
    assert dump_site(again) == first
    assert dump_site(copy.deepcopy(again)) == first
