"""An unknown fitting's message: the keys it looks like (a typo, a first word), or — for a
part the list does not hold — how to enter it, never a list of unrelated keys (a strainer was
offered a sharp entrance)."""

from __future__ import annotations

import pytest

from branchwise.core.catalogs.fittings import fitting
from branchwise.core.errors import InputError


@pytest.mark.parametrize(("typed", "offered"), [
    ("elbw-90", "elbow-90"), ("gate", "gate-valve"), ("tee", "tee-run"),
    ("globe valv", "globe-valve")])
def test_a_near_miss_is_offered_the_key_it_means(typed, offered):
    with pytest.raises(InputError) as err:
        fitting(typed)
    assert "did you mean" in err.value.reason and offered in err.value.reason


@pytest.mark.parametrize("typed", ["strainer", "coil", "zzz"])
def test_a_part_the_list_does_not_hold_is_told_to_go_in_as_its_k(typed):
    with pytest.raises(InputError) as err:
        fitting(typed)
    assert "did you mean" not in err.value.reason and "as its K" in err.value.reason
