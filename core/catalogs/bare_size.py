"""A plain length where a pipe size is expected: a bore, or a nominal size with no schedule.

``size = "3 in"`` may mean NPS 3 — a 3.068 in bore in schedule 40 (ASME B36.10M) — or a bore of
3.000 in; read the second way the flow of the demo's AHU-2 branch moves 4 % (10.74 → 10.30 L/s)
without a word. So a plain length in a size field that is also a nominal size of a shipped
standard — a nominal pipe size in inches (``3 in``, ``3/4"``, ``1½"``) or a DN or polyethylene
outside diameter in mm (``80 mm``, ``110 mm``) — is refused with the choices (:func:`refusal`).
Any other plain length (``77.9 mm``, ``3.068 in``) is a bore, and so is a length written as one:
``ID 3 in``, ``bore 3 in``, ``3 in ID`` (:func:`bore_text`).
"""

from __future__ import annotations

import re
from fractions import Fraction

from ..errors import InputError, describe
from .pipes import INCH, MM, PipeSize, _Table, dn_labelled, make, table
from .size_text import _NUMBER, _number

_BORE = re.compile(
    r"^\s*(?:i\.?d\.?|bore|inside\s+diameter|inner\s+diameter)\s*[:=]?\s*(?P<before>\S.*?)\s*$"
    r"|^\s*(?P<after>\S.*?)\s+(?:i\.?d\.?|bore)\s*$", re.I)
_PLAIN = re.compile(
    rf"^\s*(?P<v>{_NUMBER})\s*(?P<unit>in\.?|inch|inches|\"|″|”|''|mm)\s*$", re.I)


def bore_text(text: str) -> str | None:
    """The length of a size field written as a bore (``ID 3 in``, ``bore 77.9 mm``, ``3 in
    ID``), or None when the text is not written so."""
    m = _BORE.match(text)
    if m is None:
        return None
    return m["before"] if m["before"] is not None else m["after"]


def refusal(text: str, field: str) -> InputError | None:
    """The InputError for ``text`` in a size field when it is a plain length that is also a
    nominal size (None otherwise: a catalog size, a bore, or no length at all).

    The reason names the bore of the usual choices for that nominal size, in the unit typed,
    and how to write either reading: ``is a nominal size without a schedule or type: NPS 3 sch
    40 has a 3.068 in bore; 3 in type L has a 2.945 in bore; write "NPS 3 sch 40" (or another
    schedule), or for a 3.000 in bore "ID 3 in" (diameter = "3 in" in a site file)``.
    """
    m = _PLAIN.match(text)
    if m is None:
        return None
    try:
        value = _number(m["v"], lambda reason: InputError(field, text, reason))
    except InputError:
        return None  # not a number this module reads: the length reader says what is wrong
    inches = m["unit"].lower() != "mm"
    choices = _inch_choices(value) if inches else _mm_choices(value)
    if not choices:
        return None
    unit = "in" if inches else "mm"
    plain = f"{float(value):g} {unit}"

    def bore(size: PipeSize) -> str:
        return (f"{size.inner_diameter_m / INCH:.3f} in" if inches
                else f"{size.inner_diameter_m / MM:.2f} mm")

    listed = "; ".join(f"{s.label} has {_a(bore(s))} bore" for s in choices)
    typed_bore = f"{float(value):.3f} in" if inches else f"{float(value):.2f} mm"
    words = list(dict.fromkeys(_designation(s) for s in choices))
    return InputError(
        field, describe(text),
        f"is a nominal size without {'an' if words[0] == 'SDR' else 'a'} {' or '.join(words)}: "
        f"{listed}; write "
        f"\"{choices[0].label}\" (or another {words[0]}), or for {_a(typed_bore)} bore "
        f"\"ID {plain}\" (diameter = \"{plain}\" in a site file)")


def _designation(size: PipeSize) -> str:
    """What names the wall in ``size``'s standard: a schedule, a type (copper), an SDR."""
    if "DR" in size.schedule:
        return "SDR"
    return "type" if size.standard == "ASTM B88" else "schedule"


def _a(number_text: str) -> str:
    """``number_text`` with its article as it is read aloud: a 3.068 in, an 80.00 mm, an 11 mm."""
    whole = number_text.split(".")[0].split()[0]
    vowel = whole.startswith("8") or whole in ("11", "18")
    return f"{'an' if vowel else 'a'} {number_text}"


def _first_schedule(t: _Table, nominal: str, preferred: tuple[str, ...]) -> str | None:
    listed = [name for name, sc in t.schedules.items() if nominal in sc.walls_m]
    for name in preferred:
        if name in listed:
            return name
    return listed[0] if listed else None


def _inch_choices(value: Fraction) -> list[PipeSize]:
    """Steel (ASME B36.10M, sch 40) and copper (ASTM B88, type L) of nominal size ``value``."""
    out: list[PipeSize] = []
    for standard, preferred in (("ASME B36.10M", ("40", "STD")), ("ASTM B88", ("L",))):
        t = table(standard)
        nominal = next((s.nominal for s in t.sizes if s.value == value), None)
        schedule = _first_schedule(t, nominal, preferred) if nominal else None
        if nominal and schedule:
            out.append(make(t, nominal, schedule))
    return out


def _mm_choices(value: Fraction) -> list[PipeSize]:
    """Steel by DN (ASME B36.10M, sch 40) and polyethylene by OD (ISO 4427, SDR 11)."""
    out: list[PipeSize] = []
    if value.denominator != 1:
        return out
    steel = table("ASME B36.10M")
    nominal = next((s.nominal for s in steel.sizes if s.dn == value), None)
    schedule = _first_schedule(steel, nominal, ("40", "STD")) if nominal else None
    if nominal and schedule:
        out.append(dn_labelled(make(steel, nominal, schedule)))
    pe = table("ISO 4427")
    nominal = next((s.nominal for s in pe.sizes if s.value == value), None)
    schedule = _first_schedule(pe, nominal, ("SDR 11",)) if nominal else None
    if nominal and schedule:
        out.append(make(pe, nominal, schedule))
    return out
