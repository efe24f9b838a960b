"""The Split screen: given and find rows, the results area (table, band, curve)."""

from .screen import SplitScreen

__all__ = ["SplitScreen"]
