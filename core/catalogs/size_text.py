"""Reading a pipe size the way people write it: ``3 in sch 40``, ``DN80 sch 40``, ``110 mm SDR 11``.

The text must carry a catalog keyword (sch/schedule, type, SDR/DR, NPS, DN, NB, an S-suffix
schedule such as 10S, or STD/XS/XXS); without one :func:`parse_size` returns None and the caller
reads the text as a plain length (:mod:`.bare_size`: a bore, or a nominal size refused for want of
a schedule; this module knows nothing of units beyond in and mm). Sizes may be written with
fractions as drawings write them (``1-1/2``, ``1 1/2``, ``3/4``, ``1½``).

``NB`` (nominal bore, common practice on line lists): ``80 NB``, ``NB 80`` and ``80 mm NB`` are
DN 80; ``3" NB`` and ``NB 3 in`` are NPS 3. ``PN`` (``DN80 PN16``) is a pressure class, not a
wall: it is accepted beside a schedule or SDR and never changes the bore, which follows from the
schedule or SDR alone; without one the size is refused as any size without a schedule.

Which standard a size belongs to follows from what is written:

- ``type K/L/M`` → ASTM B88 copper tube (nominal size in inches);
- ``SDR``/``DR`` with mm or DN → ISO 4427 PE; with inches or NPS → ASTM F714 PE (IPS);
- a schedule with an S suffix (``10S``, ``sch 40S``) or the word *stainless* → ASME B36.19M;
- a schedule with the word *PVC* → ASTM D1785;
- any other schedule → ASME B36.10M carbon steel.

A size or schedule the standard does not list raises InputError naming the nearest valid ones.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from fractions import Fraction

from ..errors import InputError, describe
from . import _data
from .pipes import PipeSize, _Table, dn_labelled, make, nominal_value, schedule_name, table

Fail = Callable[[str], InputError]

_VULGAR = {"½": Fraction(1, 2), "¼": Fraction(1, 4), "¾": Fraction(3, 4), "⅛": Fraction(1, 8),
           "⅜": Fraction(3, 8), "⅝": Fraction(5, 8), "⅞": Fraction(7, 8)}
"""The vulgar fractions of Unicode that nominal sizes use (``1½"``, ``¾ in``)."""
_NUMBER = (r"(?:\d+\s*[- ]\s*\d+\s*/\s*\d+|\d+\s*/\s*\d+|\d*\s*[½¼¾⅛⅜⅝⅞]|\d+(?:\.\d*)?"
           r"|\.\d+)")

_PATTERNS = {
    "nps": re.compile(rf"\bnps\s*(?P<v>{_NUMBER})"),
    "dn": re.compile(r"\bdn\s*(?P<v>\d+)\b"),
    # NB (nominal bore): by itself or with mm the DN, with in or " the NPS (common practice)
    "nb": re.compile(rf"\bnb\s*(?P<v>{_NUMBER})\s*(?P<unit>in\b|\"|mm\b)?"
                     rf"|(?<![\w.])(?P<w>{_NUMBER})\s*(?P<wunit>in\b|\"|mm\b)?\s*nb\b"),
    # PN (nominal pressure, bar) is a pressure class: it never gives the bore
    "pn": re.compile(r"\bpn\s*(?P<v>\d+(?:\.\d+)?)\b"),
    "sch": re.compile(r"\bsch(?:edule)?\.?\s*(?P<v>\d+s?|std|xxs|xs)\b"),
    "type": re.compile(r"\btype\s*(?P<v>[klm])\b"),
    "dr": re.compile(r"\b(?P<kind>s?dr)\s*(?P<v>\d+(?:\.\d+)?)\b"),
    "ssuffix": re.compile(r"\b(?P<v>\d+s)\b"),
    "weight": re.compile(r"\b(?P<v>std|xxs|xs)\b"),
}
_MATERIALS = {
    "pvc": re.compile(r"\b(?:u?pvc)\b"),
    "stainless": re.compile(r"\b(?:stainless(?:\s+steel)?|ss)\b"),
    "copper": re.compile(r"\b(?:copper|cu)\b"),
    "pe": re.compile(r"\b(?:hdpe|pe(?:100|80)?|poly(?:ethylene)?)\b"),
    "steel": re.compile(r"\b(?:carbon\s+steel|steel|cs)\b"),
}
_KEYWORD = re.compile(r"\b(?:sch(?:edule)?|type|s?dr|nps|dn|nb|pn)\b")
_SIZE = re.compile(rf"^(?P<v>{_NUMBER})\s*(?P<unit>in|\"|mm)?$")


def _normalise(text: str) -> str:
    s = text.strip().lower()
    for quote in ("″", "”", "“", "''"):
        s = s.replace(quote, '"')
    s = re.sub(r"\binch(?:es)?\b|\bins\b|\bin\.", "in", s)
    return re.sub(r"\s+", " ", s)


def _take(s: str, pattern: re.Pattern[str]) -> tuple[re.Match[str] | None, str]:
    """The first match of ``pattern`` and ``s`` with it blanked out."""
    m = pattern.search(s)
    if m is None:
        return None, s
    return m, s[: m.start()] + " " + s[m.end() :]


MAX_SIZE_DIGITS = 8
"""Digits in a nominal size or DN; more is not a pipe (and would overflow the conversions)."""


def _number(text: str, fail: Fail) -> Fraction:
    """``1-1/2``, ``1 1/2``, ``3/4``, ``2.5`` → an exact Fraction; ``1/0`` or a number with
    more than :data:`MAX_SIZE_DIGITS` digits → ``fail``."""
    text = re.sub(r"\s+", " ", text.strip())
    if sum(c.isdigit() for c in text) > MAX_SIZE_DIGITS:
        raise fail(f"{_shown(text)} is not a pipe size (too many digits)")
    if text[-1:] in _VULGAR:
        whole = text[:-1].strip()
        return (Fraction(int(whole)) if whole else Fraction(0)) + _VULGAR[text[-1]]
    try:
        mixed = re.fullmatch(r"(\d+)\s*[- ]\s*(\d+)\s*/\s*(\d+)", text)
        if mixed:
            return int(mixed[1]) + Fraction(int(mixed[2]), int(mixed[3]))
        return Fraction(text.replace(" ", ""))
    except (ZeroDivisionError, ValueError):
        raise fail(f"cannot read the size {_shown(text)}; write e.g. '3 in sch 40'") from None


def _shown(text: str) -> str:
    return repr(describe(text, 30))


def parse_size(text: str, field: str = "size") -> PipeSize | None:
    """The catalog size ``text`` names, or None when it has no catalog keyword.

    Case and spaces do not matter. Raises InputError(field, text, reason) when the text names a
    catalog size that does not exist (the reason lists the nearest valid sizes or schedules) or
    cannot be read.
    """
    s = _normalise(text)
    found: dict[str, re.Match[str]] = {}
    for key, pattern in _PATTERNS.items():
        m, s = _take(s, pattern)
        if m is not None:
            found[key] = m
    if not found:
        if keyword := _KEYWORD.search(s):  # "type X", "sch abc": meant as a catalog size
            raise _unreadable(field, text, keyword[0])
        return None
    materials: set[str] = set()
    for key, pattern in _MATERIALS.items():
        m, s = _take(s, pattern)
        if m is not None:
            materials.add(key)
    rest = re.sub(r"\b(?:pipe|tube)\b", " ", s).strip(" ,")
    leftover = _KEYWORD.search(rest)
    if leftover:
        raise _unreadable(field, text, leftover[0])
    return _resolve(text, field, found, materials, rest)


def _unreadable(field: str, text: str, word: str) -> InputError:
    examples = "'3 in sch 40', '1 in type L', '110 mm SDR 11'"
    return InputError(field, describe(text), f"cannot read {word!r} here; write e.g. {examples}")


def _resolve(
    text: str, field: str, found: dict[str, re.Match[str]], materials: set[str], rest: str
) -> PipeSize:
    def fail(reason: str) -> InputError:
        return InputError(field, describe(text), reason)

    if len(materials) > 1:
        raise fail(f"names more than one material ({', '.join(sorted(materials))})")
    material = next(iter(materials), None)

    # The size: NPS n, DN n, or "n in" / "n mm" / bare n (taken as inches).
    value: Fraction | None = None
    unit = "in"
    dn: int | None = None
    if "nps" in found:
        value = _number(found["nps"]["v"], fail)
    if "dn" in found:
        dn = int(_number(found["dn"]["v"], fail))
    if "nb" in found:
        if value is not None or dn is not None:
            raise fail("gives the size twice")
        value, dn = _nominal_bore(found["nb"], fail)
    if rest:
        m = _SIZE.match(rest)
        if m is None:
            raise fail(f"cannot read the size {_shown(rest.strip())}; write e.g. '3 in sch 40'")
        if value is not None or dn is not None:
            raise fail("gives the size twice")
        value = _number(m["v"], fail)
        unit = "mm" if m["unit"] == "mm" else "in"
    if value is None and dn is None:
        raise fail("has no size; write e.g. '3 in sch 40' or 'DN 80 sch 40'")
    metric = unit == "mm" or dn is not None

    # The standard and its schedule.
    if "type" in found:
        if material not in (None, "copper"):
            raise fail(f"type {found['type']['v'].upper()} is copper tube, not {material}")
        standard, schedule = "ASTM B88", found["type"]["v"].upper()
    elif "dr" in found:
        if material not in (None, "pe"):
            raise fail(f"SDR sizes here are polyethylene, not {material}")
        ratio = found["dr"]["v"]
        if metric:
            standard, schedule = "ISO 4427", f"SDR {ratio}"
        else:
            standard, schedule = "ASTM F714", f"DR {ratio}"
    else:
        standard, schedule = _steel_like(found, material, fail)
    t = table(standard)

    # The nominal size in this table.
    if dn is not None and t.nominal_unit == "in":
        by_dn = [sz for sz in t.sizes if sz.dn == dn]
        if not by_dn:
            raise fail(f"{t.standard} has no DN {dn}; {_nearest_dn(t, dn)}")
        nominal = by_dn[0].nominal
    else:
        if t.nominal_unit != unit and dn is None:
            has_dn = any(sz.dn is not None for sz in t.sizes)
            how = "OD in mm" if t.nominal_unit == "mm" else "nominal inches"
            how += " (NPS) or DN" if has_dn and t.nominal_unit == "in" else ""
            raise fail(f"{t.standard} sizes are given in {how}, not {unit}")
        wanted = Fraction(dn) if dn is not None else value
        if wanted is None:  # checked above: a size or a DN was found
            raise fail("has no size; write e.g. '3 in sch 40' or 'DN 80 sch 40'")
        matches = [sz for sz in t.sizes if sz.value == wanted]
        if not matches:
            hint = ""
            if t.standard == "ASTM F714" and wanted > t.sizes[-1].value:
                hint = f"; for a metric OD write '{_fraction_text(wanted)} mm SDR ...'"
            raise fail(f"{t.standard} has no size {_show(wanted, t)}; {_nearest(t, wanted)}{hint}")
        nominal = matches[0].nominal

    if schedule is None:
        listed = [n for n, sc in t.schedules.items() if nominal in sc.walls_m]
        pn = (f" (PN {found['pn']['v']} is a pressure class: it does not give the bore)"
              if "pn" in found else "")
        raise fail(
            f"needs a schedule{pn}; {t.standard} lists for {_show_nominal(t, nominal)}: "
            f"{_data.spoken_list(listed)}"
        )
    name = schedule_name(t, schedule)
    if name is None:
        raise fail(
            f"{t.standard} has no schedule {schedule}; it lists "
            f"{_data.spoken_list(list(t.schedules))}"
        )
    if nominal not in t.schedules[name].walls_m:
        listed = [n for n, sc in t.schedules.items() if nominal in sc.walls_m]
        others = [sz.nominal for sz in t.sizes if sz.nominal in t.schedules[name].walls_m]
        near = _neighbours(t, nominal_value(nominal), others)
        raise fail(
            f"{t.standard} lists no {_show_schedule(t, name)} for {_show_nominal(t, nominal)}; "
            f"it lists {_data.spoken_list(listed)} for that size; nearest sizes with "
            f"{_show_schedule(t, name)}: {near}"
        )
    size = make(t, nominal, name)
    return dn_labelled(size) if dn is not None else size


def _nominal_bore(m: re.Match[str], fail: Fail) -> tuple[Fraction | None, int | None]:
    """(NPS, DN) of an NB size: ``NB 80``, ``80 NB``, ``80 mm NB`` are DN 80; ``3" NB``,
    ``NB 3 in`` NPS 3 (a nominal bore without a unit is read in mm, as line lists write it)."""
    number, unit = (m["v"], m["unit"]) if m["v"] is not None else (m["w"], m["wunit"])
    value = _number(number, fail)
    if unit in ("in", '"'):
        return value, None
    if value.denominator != 1:
        raise fail(f"NB {_shown(number)} without a unit is a DN in mm, a whole number; "
                   f"for inches write '{number}\" NB'")
    return None, int(value)


def _steel_like(
    found: dict[str, re.Match[str]], material: str | None, fail: Fail
) -> tuple[str, str | None]:
    """Standard and schedule for a schedule-designated pipe (steel, stainless or PVC)."""
    sched = None
    for key in ("sch", "ssuffix", "weight"):
        if key in found:
            sched = found[key]["v"].upper()
            break
    if material == "copper":
        raise fail("copper tube is sized by type (K, L, M), not schedule: e.g. '1 in type L'")
    if material == "pe":
        raise fail("PE pipe is sized by SDR, not schedule: e.g. '110 mm SDR 11', '4 in DR 17'")
    if sched is not None and re.fullmatch(r"\d+S", sched):
        if material == "pvc":
            raise fail(f"schedule {sched} is stainless steel pipe, not PVC")
        return "ASME B36.19M", sched
    if material == "stainless":
        return "ASME B36.19M", (f"{sched}S" if sched and sched.isdigit() else sched)
    if material == "pvc":
        return "ASTM D1785", sched
    return "ASME B36.10M", sched


def _show(value: Fraction, t: _Table) -> str:
    text = _fraction_text(value) if t.nominal_unit == "in" else f"{float(value):g}"
    return _show_nominal(t, text)


def _show_nominal(t: _Table, nominal: str) -> str:
    if t.nominal_unit == "mm":
        return f"{nominal} mm"
    return f"NPS {nominal}" if t.standard != "ASTM B88" else f"{nominal} in"


def _show_schedule(t: _Table, name: str) -> str:
    if t.standard == "ASTM B88":
        return f"type {name}"
    if "DR" in name:
        return name
    return f"sch {name}"


def _fraction_text(value: Fraction) -> str:
    whole, part = divmod(value, 1)
    if part == 0:
        return str(whole)
    if whole == 0:
        return f"{part.numerator}/{part.denominator}"
    return f"{whole}-{part.numerator}/{part.denominator}"


def _neighbours(t: _Table, wanted: Fraction, nominals: list[str]) -> str:
    """The listed sizes just below and just above ``wanted`` (among ``nominals``)."""
    values = sorted((nominal_value(n), n) for n in nominals)
    below = [n for v, n in values if v < wanted][-1:]
    above = [n for v, n in values if v > wanted][:1]
    picks = [_show_nominal(t, n) for n in below + above]
    return " or ".join(picks) if picks else "none"


def _nearest(t: _Table, wanted: Fraction) -> str:
    return "nearest: " + _neighbours(t, wanted, [s.nominal for s in t.sizes])


def _nearest_dn(t: _Table, dn: int) -> str:
    dns = sorted(s.dn for s in t.sizes if s.dn is not None)
    if not dns:
        return "its sizes carry no DN designation: give the nominal size in inches"
    below = [d for d in dns if d < dn][-1:]
    above = [d for d in dns if d > dn][:1]
    picks = [f"DN {d}" for d in below + above]
    return "nearest: " + (" or ".join(picks) if picks else "none")
