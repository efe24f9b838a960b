"""The lines of a solved site for people, written once: the CLI's table, the CSV, the walkdown
record and the app's Split screen all say a result the same way, in the reader's units
(:class:`~branchwise.core.units.Units`, or a unit system's name).
"""

from __future__ import annotations

from ..errors import BranchwiseError
from ..finds import found_kind, found_noun
from ..givens import GIVENS, branch_of, kind_of, reading_words
from ..site.readings import Comparison, compare
from ..site.reconcile import solves_from_all
from ..site.solve import SiteResult
from ..site.spec import Site
from ..storage.user_presets import material_for
from ..units import Units, units_for

CAUTIONS = (
    "Pressurised, hot or hazardous lines can injure: keep clear of them unless the owner's "
    "procedures allow the work.",
    "These figures are estimates for planning and troubleshooting; confirm them with site "
    "measurements before acting on them.",
    "Follow local codes, the owner's procedures and the engineer of record.",
    "A licensed professional decides design and safety questions.",
)
"""The cautions every report and every screen carries."""


def version() -> str:
    """The installed branchwise version, or ``unknown`` when run from an uninstalled tree."""
    from importlib.metadata import PackageNotFoundError
    from importlib.metadata import version as _version

    try:
        return _version("branchwise")
    except PackageNotFoundError:
        return "unknown"


def given_text(sr: SiteResult, reader: Units | str = "si") -> str:
    """The reading the head is solved from: ``pressure drop 68.00 kPa``."""
    u, g = units_for(reader), sr.built.given
    if solves_from_all(sr.site):
        n = len(sr.reconciliation.readings) if sr.reconciliation else 0
        which = "both readings" if n == 2 else f"all {n} readings" if n else "all readings"
        return (f"{which} weighed together (reconciled pressure drop "
                f"{u.quantity(g.value, 'pressure')})")
    kind = kind_of(g)
    value = u.quantity(g.value, kind.quantity)
    if kind.on_branch:
        return f"{kind.words} {value} in '{branch_of(g)}'"
    return f"{kind.words} {value}"


def held_text(sr: SiteResult, reader: Units | str = "si") -> str:
    """What stays fixed when a branch is resized: the given reading, and what follows."""
    u, g = units_for(reader), sr.built.given
    if solves_from_all(sr.site):
        return (f"the reconciled pressure drop of {u.quantity(g.value, 'pressure')} held (all "
                "readings weighed)")
    kind = kind_of(g)
    value = u.quantity(g.value, kind.quantity)
    if kind.key == "total_flow":
        return f"the total flow of {value} held: the other branches then carry less"
    if kind.on_branch:
        return f"the measured {value} in '{branch_of(g)}' held, so the driving head is unchanged"
    return f"the {kind.words} of {value} held"


def summary_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """The few lines above a results table: the liquid, the given reading, the head and the
    total flow, then the other readings against the answer."""
    u = units_for(reader)
    r, net = sr.result, sr.result.network
    fl = net.fluid
    return [
        f"Fluid: {u.fluid_name(fl)}: density {u.quantity(fl.density, 'density')}, "
        f"viscosity {u.quantity(fl.viscosity, 'viscosity')} ({fl.source})",
        f"Given: {given_text(sr, u)}; elevation change "
        f"{u.quantity(net.elevation_change, 'length')}; friction {net.friction}",
        f"Pressure drop {u.quantity(r.pressure_drop, 'pressure')}, head loss "
        f"{u.quantity(r.head_loss, 'head')}, total flow {u.quantity(r.total_flow, 'flow')}",
        *readings_lines(sr, u),
    ]


def reading_line(c: Comparison, reader: Units | str = "si", short: bool = False) -> str:
    """One reading kept beside the given one, against what the solve makes of it; ``short``:
    the few words a narrow screen has room for."""
    u = units_for(reader)
    kind = GIVENS[c.kind]
    read, solved = u.quantity(c.read, kind.quantity), u.quantity(c.solved, kind.quantity)
    diff = _difference(c)
    if short:
        band = "" if c.within is None else ", in band" if c.within else ", OUT of band"
        what = c.branch if kind.on_branch else kind.short
        return f"Also read {what}: {read}; solve {solved} ({diff}{band})"
    band = ("" if c.within is None else
            "; within the P5–P95 band" if c.within else "; outside the P5–P95 band")
    return (f"Also read: {reading_words(c.kind, c.branch)} {read}; the solve gives {solved} "
            f"({diff}{band})")


def _difference(c: Comparison) -> str:
    """How far the solve is from a reading: relative, except where a ratio says nothing (a
    zero reading, or one of the other direction)."""
    if c.read == 0:
        return "the reading is zero"
    if c.solved * c.read < 0:
        return "the other direction: check the meter's mounting or the reading's sign"
    return f"{c.difference:+.1%}"


def readings_lines(sr: SiteResult, reader: Units | str = "si", short: bool = False) -> list[str]:
    """Each reading kept beside the given one, against what the solve makes of it (none when
    every reading was weighed: the reconciliation lines say it, :mod:`.weighed`)."""
    if solves_from_all(sr.site):
        return []
    return [reading_line(c, reader, short) for c in compare(sr.site, sr.result, sr.uncertainty)]


def solved_lines(sr: SiteResult, reader: Units | str = "si", short: bool = False) -> list[str]:
    """The found unknown and, for a catalog pipe, the size to buy and what it carries; ``short``:
    the catalog line without what is held (for a screen's two lines)."""
    u = units_for(reader)
    s = sr.result.solved
    if s is None:
        return []
    kind = found_kind(s.quantity)
    seg = f" (segment {s.segment + 1})" if len(sr.result.branch(s.branch).segments) > 1 else ""
    lines = [f"{found_noun(s.quantity)} of '{s.branch}'{seg} to carry "
             f"{u.quantity(s.target_flow, 'flow')}: {u.quantity(s.value, kind)}"
             f"{_against_table(sr, u)}"]
    if sr.catalog is not None and short:
        c = sr.catalog
        lines.append(f"→ catalog size {c.size.label} (bore "
                     f"{u.quantity(c.size.inner_diameter_m, 'diameter')}) carries "
                     f"{u.quantity(c.flow, 'flow')}")
    elif sr.catalog is not None:
        c = sr.catalog
        lines.append(
            f"Smallest catalog size at least that large: {c.size.label} "
            f"(inner diameter {u.quantity(c.size.inner_diameter_m, 'diameter')}); "
            f"with it the branch carries {u.quantity(c.flow, 'flow')} ({held_text(sr, u)}).")
    return lines


def _against_table(sr: SiteResult, u: Units) -> str:
    """For a found roughness, the material's table value for new pipe beside it ('' when the
    segment names no material): how much rougher the line has become."""
    s = sr.result.solved
    if s is None or s.quantity != "roughness":
        return ""
    names = [b.name for b in sr.site.branches]
    if s.branch not in names:
        return ""
    specs = sr.site.branches[names.index(s.branch)].segments
    key = specs[s.segment].material if s.segment < len(specs) else None
    if not isinstance(key, str):
        return ""
    try:
        new = material_for(key.strip(), "material").roughness_m
    except BranchwiseError:
        return ""
    if new <= 0:
        return f" (the table value for {key.strip()} is smooth, 0)"
    return (f" ({s.value / new:.2g}× the table value for new {key.strip()}, "
            f"{u.quantity(new, 'roughness')})")


def _text(value: object) -> str:
    """A record value as one line of text ('' when absent or blank)."""
    return " ".join(value.split()) if isinstance(value, str) else ""


def record_lines(site: Site) -> list[str]:
    """The record's lines for a report header: ``Readings taken 2025-03-12 by R. Example``,
    ``Pressure instrument: ...``, ``Flow instrument: ...`` ([] without a ``[record]``)."""
    r = site.record
    if r is None:
        return []
    when, who = _text(r.date), _text(r.technician)
    out = []
    if when or who:
        out.append("Readings taken" + (f" {when}" if when else "") + (f" by {who}" if who else ""))
    for label, value in (("Pressure instrument", r.pressure_instrument),
                         ("Flow instrument", r.flow_instrument)):
        if _text(value):
            out.append(f"{label}: {_text(value)}")
    return out


def notes_of(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """Every note of the answer: the site's, the solve's and the band's, their quantities in
    the reader's units (a note keeps them marked, see ``core.messages``)."""
    u = units_for(reader)
    return [u.restate(n) for n in (*sr.notes, *sr.result.notes,
                                   *(sr.uncertainty.notes if sr.uncertainty else ()))]


def assumed_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """What was taken for granted or resolved: ``AHU-1 coil: NPS 4 sch 40: bore 102.3 mm …``."""
    u = units_for(reader)
    return [f"{a.branch + ': ' if a.branch else ''}{u.say(a)}" for a in sr.assumptions]


def warning_lines(sr: SiteResult, reader: Units | str = "si") -> list[str]:
    """Every warning of the answer: ``AHU-3 coil: velocity … [velocity-high]``."""
    u = units_for(reader)
    return [f"{w.branch + ': ' if w.branch else ''}{u.say(w)} [{w.code}]"
            for w in sr.result.warnings]
