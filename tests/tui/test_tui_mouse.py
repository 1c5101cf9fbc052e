"""The mouse: keys in the key bar and rows of the table are clickable."""

from __future__ import annotations

from tui_helpers import FIXTURES, SIZE, screen_text, settle

from ledger.tui.app import create_app
from ledger.tui.screens.compute import ComputeScreen
from ledger.tui.screens.entry import EntryScreen
from ledger.tui.screens.overview import OverviewScreen
from ledger.tui.widgets.entries_table import EntriesTable
from ledger.tui.widgets.key_bar import KeyBar


async def test_clicking_a_key_in_the_bar_presses_it():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        bar = app.screen.query_one(KeyBar)
        line = screen_text(app).splitlines()[bar.region.y]
        x = line.index("Compute")
        await pilot.click(KeyBar, offset=(x, 0))
        await settle(pilot, lambda: isinstance(app.screen, ComputeScreen))
        app.screen.query_one("ExpressionInput").text = "E(2)"
        await pilot.pause()
        await pilot.click("#compute-plot")
        await settle(pilot, lambda: app.screen.__class__.__name__ == "PlotScreen")


async def test_clicking_a_row_opens_the_entry():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert isinstance(app.screen, OverviewScreen)
        table = app.screen.query_one(EntriesTable)
        await pilot.click(EntriesTable, offset=(4, 4))  # border, header, then the rows
        await pilot.click(EntriesTable, offset=(4, 4))
        await settle(pilot, lambda: isinstance(app.screen, EntryScreen))
        assert app.screen.entry_id == str(table.coordinate_to_cell_key(table.cursor_coordinate).row_key.value)
