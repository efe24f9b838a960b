"""A site's visits and how its branches changed between them (see :mod:`.timeline`)."""

from __future__ import annotations

from .timeline import RESISTANCE_UNIT, History, Visit, history_of

__all__ = ["RESISTANCE_UNIT", "History", "Visit", "history_of"]
