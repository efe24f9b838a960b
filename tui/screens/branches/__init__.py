"""The Branches screen: the branch table, its cells and the branch form."""

from .screen import BranchesScreen

__all__ = ["BranchesScreen"]
