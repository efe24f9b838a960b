"""The reconciled head's search: heads of either sign, and no answer when there is none.

The optimum itself is checked against `scipy.optimize.least_squares` in
tests/references/test_reconcile_reference.py; here the search's own edges.
"""

from __future__ import annotations

import numpy as np
import pytest

from branchwise.core.errors import NoSolutionError
from branchwise.core.numerics.reconcile_optimum import least_head


def test_a_flat_sum_of_squares_is_no_answer_naming_the_readings():
    # S the same at every head: no lowest point, so no head is given (not the last one tried).
    with pytest.raises(NoSolutionError, match=r"differential gauge, clamp-on on 'A'"):
        least_head(lambda h: np.zeros(2), lambda h: np.zeros(2), np.array([1.0, 2.0]),
                   np.eye(2), [1.0, 2.0], ["differential gauge", "clamp-on on 'A'"])


def test_the_least_of_a_quadratic_across_zero():
    # g(H) = (H, H): S = (1 − H)² + (−3 − H)², least at H = −1 by hand (the mean).
    head = least_head(lambda h: np.array([h, h]), lambda h: np.array([1.0, 1.0]),
                      np.array([1.0, -3.0]), np.eye(2), [1.0, -3.0], ["a", "b"])
    assert head == pytest.approx(-1.0, rel=1e-12)
