"""The copy an edit makes of the site (every keystroke copies it whole): the same site as
``copy.deepcopy`` makes, sharing nothing that can change."""

from __future__ import annotations

import copy
from dataclasses import fields, is_dataclass
from pathlib import Path

from site_texts import PUMP_ROOM

from branchwise.core.site.read import demo_site, parse_site
from branchwise.tui.state.session import copied


def _mutable_parts(value: object, out: list[object]) -> list[object]:
    if isinstance(value, (list, dict)) or (is_dataclass(value) and not isinstance(value, type)):
        out.append(value)
    if isinstance(value, list):
        for v in value:
            _mutable_parts(v, out)
    elif isinstance(value, dict):
        for v in value.values():
            _mutable_parts(v, out)
    elif is_dataclass(value) and not isinstance(value, type):
        for item in fields(value):
            _mutable_parts(getattr(value, item.name), out)
    return out


def test_the_copy_is_deepcopys_and_shares_nothing_mutable() -> None:
    sites = [demo_site(), parse_site(PUMP_ROOM, Path("pump-room.toml"))]
    for site in sites:
        mine, theirs = copied(site), copy.deepcopy(site)
        assert repr(mine) == repr(theirs) and mine == site
        assert mine.source == site.source and mine.origin == site.origin
        originals = {id(p) for p in _mutable_parts(site, [])}
        assert not originals & {id(p) for p in _mutable_parts(mine, [])}
        mine.branches[0].segments[0].fittings["elbow_90"] = 99
        mine.branches[0].name = "changed"
        assert site == theirs  # the original is untouched
