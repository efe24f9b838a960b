"""A network of a few branches solved with plain floats and :mod:`math` (numpy's cost per call
outweighs the arithmetic there): friction.py (the friction models for one segment), one.py (one
segment under Colebrook, one equation: its constants), series.py (series segments under
Colebrook), branch.py (one branch as an object: h(Q), its flow at a head), heads.py (all
branches: the flows at a head, the head of a total flow), at_head.py (the flows at a given Δp
under Colebrook, straight from the branches' numbers), unknowns.py (a diameter, length or
roughness), result.py (the same Result, last check and warnings), solve.py (every direction,
handing anything unusual to the vectorised path)."""

from .solve import SMALL_BRANCHES, try_solve

__all__ = ["SMALL_BRANCHES", "try_solve"]
