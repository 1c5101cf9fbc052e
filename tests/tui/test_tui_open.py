"""Opening projects: every example project shows its entries; bad files give a dialog."""

from __future__ import annotations

from pathlib import Path

import pytest
from tui_helpers import FIXTURES, ROOT, SIZE, screen_text, settle

from ledger.book import Project
from ledger.tui.app import create_app
from ledger.tui.dialogs.error import ErrorDialog
from ledger.tui.display import coefficient_unicode, operator_unicode
from ledger.tui.screens.overview import OverviewScreen
from ledger.tui.widgets.entries_table import EntriesTable

EXAMPLES = sorted((ROOT / "projects").glob("*.toml")) + [FIXTURES / "two-levels.toml"]


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.name)
async def test_example_project_entries_are_on_screen(path: Path):
    project = Project.load(path)
    app = create_app(str(path))
    async with app.run_test(size=SIZE) as pilot:
        await settle(pilot, lambda: isinstance(app.screen, OverviewScreen))
        table = app.screen.query_one(EntriesTable)
        assert {str(key.value) for key in table.rows} == {e.id for e in project.entries}
        text = screen_text(app)
        assert path.name in text  # the file is named in the header
        for entry in project.entries[: table.size.height - 4]:
            row = table.get_row(entry.id)
            assert row[-1] == entry.id and row[0].startswith(operator_unicode(entry.operator))
        # the first rows are visible as text, coefficient in screen math
        order = [b.id for b in project.backgrounds]
        first = sorted(project.entries,
                       key=lambda e: (order.index(e.background), e.genus, e.alpha_order))[0]
        assert operator_unicode(first.operator) in text
        assert coefficient_unicode(first.coefficient)[:10] in text


async def test_tree_filters_by_background_and_order():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen = app.screen
        tree = screen.query_one("#orders")
        node = next(n for n in tree.root.children if n.data == {"background": "flat-iia"})
        tree.move_cursor(node)
        await settle(pilot, lambda: screen.scope == {"background": "flat-iia"})
        assert [str(k.value) for k in screen.query_one(EntriesTable).rows] == ["e0004"]
        assert "(none)" in screen_text(app)  # D⁴R⁴ is missing at genus one for flat-iia


async def test_filter_and_sort():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("slash", *"conflict")
        table = app.screen.query_one(EntriesTable)
        await settle(pilot, lambda: table.row_count == 1)
        assert table.get_row("e0004")[3] == "conflict"
        await pilot.press("escape")
        await pilot.press(*["backspace"] * 10)  # focus went back to the table: nothing is deleted
        assert table.row_count == 1
        app.screen.query_one("#filter").value = ""
        await settle(pilot, lambda: table.row_count == 4)
        await pilot.press("s")  # operator -> genus
        await pilot.pause()
        assert app.screen.sort_column == "genus"
        assert [str(k.value) for k in table.rows][0] == "e0001"  # tree level first
        assert "sorted by g" in screen_text(app)


@pytest.mark.parametrize("name", ["not-toml.toml", "missing.toml"])
async def test_bad_file_opens_error_dialog_and_is_untouched(name, tmp_path):
    path = tmp_path / name
    if name != "missing.toml":
        path.write_bytes((FIXTURES / name).read_bytes())
    before = path.read_bytes() if path.exists() else None
    app = create_app(str(path))
    async with app.run_test(size=SIZE) as pilot:
        await settle(pilot, lambda: isinstance(app.screen, ErrorDialog))
        text = screen_text(app)
        assert "Cannot open" in text
        reason = app.screen.reason.splitlines()[0]
        assert ("not valid TOML" in reason) if before else ("no such file" in reason)
        assert "Traceback" not in text
        await pilot.press("escape")
        await settle(pilot, lambda: isinstance(app.screen, OverviewScreen))
        assert "scratch" in screen_text(app)
        await pilot.press("ctrl+q")
    assert (path.read_bytes() if path.exists() else None) == before
