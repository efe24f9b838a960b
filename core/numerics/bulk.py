"""Many small objects made at once, without Python's cyclic garbage collector walking them.

Every few hundred container objects made, the collector looks at the young ones, and now and then
at every object alive — a network of 100k branches is several hundred thousand. Making the
warnings or the per-branch results of such a network would set off many of those full passes,
so their cost per branch grew with the size of the network. The objects made here hold no
reference cycles (plain values, the network, each other in one direction), so nothing is lost
by pausing the collector while they are made; reference counting frees them as usual.
"""

from __future__ import annotations

import gc
from collections.abc import Iterator
from contextlib import contextmanager


@contextmanager
def no_collection() -> Iterator[None]:
    """Pauses the cyclic collector for the block (it runs again after, as it was)."""
    if not gc.isenabled():
        yield
        return
    gc.disable()
    try:
        yield
    finally:
        gc.enable()
