"""Field paths of a site file, read once (FieldPath) and said by the branch's name.

The paths are the site file's own keys (README, DEVELOPERS.md); the words are ours, so these
checks are against the paths a person can find in the file.
"""

from __future__ import annotations

import pytest

from branchwise.core.errors import InputError, NoSolutionError
from branchwise.core.site.fields import FieldPath, error_text, in_words

NAMES = ["AHU-1 coil", "AHU-2 coil", None, "Bypass"]


@pytest.mark.parametrize(("path", "area", "branch", "segment", "name", "key"), [
    ("fluid.temperature", "fluid", None, None, "temperature", None),
    ("conditions.given", "conditions", None, None, "given", None),
    ("conditions", "conditions", None, None, "", None),
    ("branches[1].length", "branches", 1, None, "length", None),
    ("branches[3].segments[0].size", "branches", 3, 0, "size", None),
    ("branches[0].fittings.elbow-90", "branches", 0, None, "fittings", "elbow-90"),
    ('tolerances.roughness_range."AHU-2 coil"', "tolerances", None, None, "roughness_range",
     "AHU-2 coil"),
    ("name", "site", None, None, "name", None),
    ("demo.toml line 7", "site", None, None, "", None),
])
def test_a_path_is_read_into_its_parts(path, area, branch, segment, name, key):
    field = FieldPath.parse(path)
    assert (field.area, field.branch, field.segment, field.name, field.key) == (
        area, branch, segment, name, key)
    assert str(field) == path


def test_a_one_pipe_branch_is_written_without_segments():
    model = FieldPath.parse("branches[1].segments[0].hw_c")
    assert str(model.as_written(1)) == "branches[1].hw_c"
    assert model.as_written(2) is model  # a branch of two segments keeps them


@pytest.mark.parametrize(("path", "words"), [
    ("branches[1].length", 'branch "AHU-2 coil" length'),
    ("branches[3].segments[0].size", 'branch "Bypass" segment 1 size'),
    ("branches[2].name", "branch 3 (no name) name"),
    ("branches[9].length", "branch 10 (no name) length"),
    ("fluid.temperature", "fluid.temperature"),
])
def test_words_name_a_branch_by_its_name(path, words):
    assert FieldPath.parse(path).words(NAMES) == words


def test_paths_inside_a_reason_are_worded_too():
    assert in_words("duplicates branches[0].name", NAMES) == 'duplicates branch "AHU-1 coil" name'


def test_one_wording_for_the_app_and_the_command_line():
    error = InputError("branches[1].length", "-180 ft", "must not be negative").naming(NAMES)
    assert error_text(error) == 'branch "AHU-2 coil" length: must not be negative, got -180 ft'
    assert error_text(NoSolutionError("no flow fits")) == "no flow fits"
