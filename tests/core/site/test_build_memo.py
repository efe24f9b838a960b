"""Branches built once (the app builds the whole site on every keystroke): a build with kept
branches is the build of a fresh process, an edited branch is built again, ``1`` and ``True``
are not taken for each other, and a changed presets file is read again."""

from __future__ import annotations

import copy
import os
from pathlib import Path

import pytest

from branchwise.core.errors import InputError
from branchwise.core.site import build as build_module
from branchwise.core.site.build import build
from branchwise.core.site.read import demo_site


def fresh(site):
    build_module._built.clear()
    return build(site)


def test_a_build_with_kept_branches_is_a_fresh_build() -> None:
    site = demo_site()
    first = build(site)
    assert build(site) == first == fresh(site)
    edited = copy.deepcopy(site)
    edited.branches[1].segments[0].length = "123 m"
    again = build(edited)
    assert again.network.branches[1].segments[0].length == pytest.approx(123.0)
    assert again.network.branches[0] == first.network.branches[0]
    assert again == fresh(edited)


def test_one_and_true_are_different_entries() -> None:
    site = demo_site()
    site.branches[0].segments[0].minor_k = 1
    assert build(site).network.branches[0].segments[0].minor_k >= 1
    site.branches[0].segments[0].minor_k = True
    with pytest.raises(InputError) as caught:
        build(site)
    assert caught.value.field.startswith("branches[0]")


def test_a_changed_presets_file_is_read_again(tmp_path: Path,
                                               monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(tmp_path))
    presets = tmp_path / "presets.toml"
    presets.write_text("[materials.mine]\nroughness = \"0.2 mm\"\n")
    site = demo_site()
    for branch in site.branches:
        for seg in branch.segments:
            seg.material, seg.roughness, seg.condition = "mine", None, None
    assert build(site).network.branches[0].segments[0].roughness == pytest.approx(2e-4)
    presets.write_text("[materials.mine]\nroughness = \"0.5 mm\"\n")
    stamp = presets.stat().st_mtime_ns + 10**9  # a second later, on any file system
    os.utime(presets, ns=(stamp, stamp))
    assert build(site).network.branches[0].segments[0].roughness == pytest.approx(5e-4)
