"""Networks of our own that several tests share (invented for the tests; no plant's data).

The liquid's properties need only be consistent between a test and its reference; the test
header has a branch of two sizes in series and two branches with a valve.
"""

from __future__ import annotations

from branchwise.core.model import Branch, Fluid, Network, Segment

RHO, MU = 999.1, 1.138e-3
"""kg/m³, Pa·s: a liquid like water near 15 °C."""

BRANCHES: list[tuple[str, list[tuple[float, float, float, float]], float | None]] = [
    ("Coil 1", [(0.0779, 42.0, 4.6e-5, 4.2)], None),
    ("Coil 2", [(0.0627, 35.0, 4.6e-5, 6.0)], 40.0),
    ("Reducer run", [(0.1023, 20.0, 1.5e-4, 1.5), (0.0525, 12.0, 1.5e-4, 2.5)], None),
    ("Bypass", [(0.0409, 8.0, 4.6e-5, 9.0)], 18.0),
]
"""(name, [(D m, L m, ε m, K)], Kv m³/h or None) of each branch of the test header."""


def test_header(elevation: float = 0.0, branches=BRANCHES) -> Network:
    """The test header (``branches``: a selection of :data:`BRANCHES`); elevation: m."""
    return Network(
        Fluid("test liquid", RHO, MU, "water"),
        tuple(Branch(n, tuple(Segment(*s) for s in segs), kv) for n, segs, kv in branches),
        elevation_change=elevation,
    )


test_header.__test__ = False  # a builder, not a test
