"""Faults found by random keys (test_random_keys.py), each replayed with the keys that found it
and, where the fault is a race, also forced in a fixed order so that the test cannot pass by
luck. Robustness, no outside reference."""

from __future__ import annotations

import keyfuzz
import pytest

from branchwise.tui.app import BranchwiseApp
from branchwise.tui.screens.branchform import BranchForm
from branchwise.tui.widgets.field import Field


@pytest.fixture
def sandbox(tmp_path, monkeypatch, data_dir):
    return keyfuzz.Sandbox(tmp_path, monkeypatch)


def test_enter_then_ctrl_n_in_the_branch_form(ui, sandbox, data_dir, monkeypatch):
    """Seed 7108: Enter in the branch form, then Ctrl+N before the Enter was handled. The form
    handled the Enter while its fields were being rebuilt (the branch had two segments, the
    fields one) and raised KeyError '1.size'."""
    keys = ["f3", "e", "ctrl+u", "]", "enter", "ctrl+n", "f"]
    report = keyfuzz.drive(keys, sandbox=sandbox, data_dir=data_dir, timeout=60)
    assert not report.problems, report.describe(7108, "branch-form")

    async def scenario() -> None:
        app = BranchwiseApp()
        async with app.run_test(size=(80, 24)) as pilot:
            await ui.settle(pilot)
            await pilot.press("f3", "e")
            form = app.screen
            assert isinstance(form, BranchForm)
            rebuild = BranchForm.recompose

            async def enter_arrives_late(self: BranchForm) -> None:
                field = self.query_one("#f-0-size", Field)
                self.on_field_done(Field.Done(field, field.text))  # the queued Enter
                await rebuild(self)

            monkeypatch.setattr(BranchForm, "recompose", enter_arrives_late)
            await pilot.press("ctrl+n")
            assert app.screen is form and len(form.branch.segments) == 2
            assert len(form.query(Field)) == 3 + 2 * 5  # name, valve, note; 5 per segment
            monkeypatch.undo()
            await pilot.press("enter")  # Enter on the new layout applies the form
            await ui.settle(pilot)
            assert not isinstance(app.screen, BranchForm)
            assert len(app.site.branches[0].segments) == 2

    ui.run(scenario)


@pytest.mark.parametrize("keys", [["f3", "ctrl+q"], ["f2", "ctrl+q"]])
def test_quit_while_a_screen_is_being_built(keys, sandbox, data_dir):
    """Found by the driver's own quit test: F3 (or F2) then Ctrl+Q before the screen was
    built. The app quit, then the new screen's mount ran without its widgets and raised
    NoMatches ('#cell-editor', '#liquid-kind-select') on the way out."""
    report = keyfuzz.drive(keys, sandbox=sandbox, data_dir=data_dir, timeout=60)
    assert not report.problems, report.describe()
    assert report.quits == 1 and report.pressed == 2
