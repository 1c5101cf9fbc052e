"""Recording, saving and the safety rules: unsaved marker, quit prompt, changed-on-disk."""

from __future__ import annotations

import pytest
from tui_helpers import SIZE, screen_text, settle

from ledger.book import Project
from ledger.tui.app import create_app
from ledger.tui.dialogs.choice import ChoiceDialog
from ledger.tui.dialogs.path_prompt import PathDialog
from ledger.tui.dialogs.record_entry import RecordDialog
from ledger.tui.screens.compute import ComputeScreen
from ledger.tui.screens.entry import EntryScreen
from ledger.tui.screens.overview import OverviewScreen
from ledger.tui.widgets.entries_table import EntriesTable
from ledger.tui.widgets.expression_input import ExpressionInput
from ledger.tui.widgets.toggles import TickBox


async def test_record_save_reload_finds_the_entry(project_copy):
    app = create_app(str(project_copy))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("c")
        await settle(pilot, lambda: isinstance(app.screen, ComputeScreen))
        compute = app.screen
        compute.query_one(ExpressionInput).text = "C(2,1,1)"
        compute.query_one("#want-value", TickBox).value = False
        compute.query_one("#want-laurent", TickBox).value = True
        await pilot.press("ctrl+r")
        await settle(pilot, lambda: compute.results is not None)
        await pilot.press("ctrl+n")
        await settle(pilot, lambda: isinstance(app.screen, RecordDialog))
        dialog = app.screen
        dialog.query_one("#operator").value = 4
        await pilot.pause()
        dialog.query_one("#structure").value = "sigma2^2"
        dialog.query_one("#source").value = "1512.06779:(4.3)"
        await pilot.press("ctrl+o")
        await settle(pilot, lambda: app.screen is compute)
        assert app.project.dirty
        assert "[modified]" in screen_text(app)
        await pilot.press("ctrl+s")
        await settle(pilot, lambda: not app.project.dirty)
        assert "[modified]" not in screen_text(app)
        await pilot.press("ctrl+q")
    reloaded = Project.load(project_copy)
    entry = reloaded.find("flat-iib", 1, "D^8R^4", (2, 0))
    assert entry is not None and entry.coefficient == "C(2,1,1)"
    assert entry.provenance.arxiv == "1512.06779" and entry.provenance.equation == "(4.3)"
    assert entry.derived["laurent"]["exact"] is True
    assert project_copy.with_name(project_copy.name + ".bak").exists()
    app = create_app(str(project_copy))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert entry.id in {str(k.value) for k in app.screen.query_one(EntriesTable).rows}
        assert "C₂,₁,₁" in screen_text(app)


async def test_quit_with_unsaved_changes_asks(project_copy):
    before = project_copy.read_bytes()
    app = create_app(str(project_copy))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("enter")  # open the first entry
        await settle(pilot, lambda: isinstance(app.screen, EntryScreen))
        await pilot.press("t")  # change its status: the first choice differs from the current
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        assert "(now)" in screen_text(app)
        await pilot.press("enter")
        await settle(pilot, lambda: app.project.dirty and isinstance(app.screen, EntryScreen))
        assert app.project.entries[0].history[-1]["event"] == "status changed"
        await pilot.press("ctrl+q")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        text = screen_text(app)
        assert "Unsaved changes" in text and "Quit without saving" in text
        await pilot.press("escape")  # cancel: still running, still dirty
        await settle(pilot, lambda: isinstance(app.screen, EntryScreen))
        assert app.is_running and app.project.dirty
        await pilot.press("ctrl+q")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        app.screen.query_one("#choice-discard").press()
        await settle(pilot, lambda: not app.is_running)
    assert project_copy.read_bytes() == before


async def test_file_changed_on_disk_is_not_overwritten_without_asking(project_copy):
    app = create_app(str(project_copy))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("enter")
        await settle(pilot, lambda: isinstance(app.screen, EntryScreen))
        await pilot.press("t")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        await pilot.press("enter")
        await settle(pilot, lambda: app.project.dirty and isinstance(app.screen, EntryScreen))
        changed = project_copy.read_text().replace('title = "UI test ledger"', 'title = "Edited elsewhere"')
        project_copy.write_text(changed)
        await pilot.press("ctrl+s")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        assert "changed on disk" in screen_text(app)
        assert project_copy.read_text() == changed  # untouched while asking
        app.screen.query_one("#choice-overwrite").press()
        await settle(pilot, lambda: not app.project.dirty)
    assert "Edited elsewhere" not in project_copy.read_text()
    assert Project.load(project_copy).title == "UI test ledger"


async def test_scratch_project_saves_under_a_new_name(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    app = create_app(None)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert "scratch" in screen_text(app)
        await pilot.press("c")
        await settle(pilot, lambda: isinstance(app.screen, ComputeScreen))
        app.screen.query_one(ExpressionInput).text = "2*zeta(3)"
        await pilot.press("ctrl+n")
        await settle(pilot, lambda: isinstance(app.screen, RecordDialog))
        app.screen.query_one("#genus").value = 0
        await pilot.press("ctrl+o")
        await settle(pilot, lambda: isinstance(app.screen, ComputeScreen))
        await pilot.press("ctrl+q")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        app.screen.query_one("#choice-save").press()
        await settle(pilot, lambda: isinstance(app.screen, PathDialog))
        await pilot.press(*"new.toml", "enter")
        await settle(pilot, lambda: not app.is_running)
    project = Project.load(tmp_path / "new.toml")
    assert [e.coefficient for e in project.entries] == ["2*zeta(3)"]
    assert project.entries[0].genus == 0 and project.entries[0].operator == "R^4"


@pytest.mark.parametrize("key", ["escape"])
async def test_overview_stays_when_dialog_closes(project_copy, key):
    app = create_app(str(project_copy))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("delete")
        await settle(pilot, lambda: isinstance(app.screen, ChoiceDialog))
        await pilot.press(key)
        await settle(pilot, lambda: isinstance(app.screen, OverviewScreen))
        assert len(app.project.entries) == 4 and not app.project.dirty
