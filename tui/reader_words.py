"""How the app words things for the person reading: quantities in their units, a warning's or
an error's text, the liquid's name.

A mixin of :class:`~branchwise.tui.app.BranchwiseApp`, whose screens and widgets call these as
``app.say(...)``, ``app.fmt(...)``; the app gives the :attr:`units` and the :attr:`site`.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from branchwise.core.messages import is_marked

if TYPE_CHECKING:
    from branchwise.core.site.spec import Site
    from branchwise.core.units import Units


class ReaderWords:
    """Words for this reader (see the module docstring)."""

    @property
    def units(self) -> Units:
        """How this person reads quantities (the app's)."""
        raise NotImplementedError

    @property
    def site(self) -> Site:
        """The site as typed (the app's)."""
        raise NotImplementedError

    def unit(self, kind: str) -> str:
        """The unit a ``kind`` of quantity is shown in, and a bare number is read in."""
        return self.units.unit(kind)

    def unit_text(self, kind: str) -> str:
        return self.units.label(kind)

    def say(self, item: object) -> str:
        """A warning's, an error's or a note's text, its quantities in the units the person
        reads."""
        if isinstance(item, str):  # a note: its quantities may be marked
            return self.units.say(item) if is_marked(item) else item
        if not getattr(item, "marked", ""):  # nothing to restate: the units stay unloaded
            return str(getattr(item, "message", "") or item)
        return self.units.say(item)

    def error_words(self, error: BaseException) -> str:
        """An error as the person reads it: the field in words, the reason, in these units."""
        from branchwise.core.site.fields import error_text

        from .state.givens import needs_value

        retyping = needs_value(error, self.site)
        if retyping is not None:
            return retyping
        return error_text(error, self.units, [b.name for b in self.site.branches])

    def reason_words(self, error: BaseException | None) -> str:
        """An error without its field, for beside the field, in these units."""
        from branchwise.core.site.fields import reason_text

        return "" if error is None else reason_text(error, self.units)

    def fluid_name(self, fluid: object) -> str:
        """The liquid's name, its temperature in the temperature display unit."""
        return self.units.fluid_name(fluid)

    def fmt(self, value_si: float, kind: str, digits: int = 4, unit: bool = True) -> str:
        """``value_si`` in the display unit of ``kind`` (needs the units module warmed up)."""
        if not unit:
            return self.units.number(value_si, kind, digits)
        return self.units.quantity(value_si, kind, digits)
