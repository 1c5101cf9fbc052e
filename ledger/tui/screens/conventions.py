"""The project's declared conventions: key, value and meaning; enter changes one."""

from __future__ import annotations

from textual.widgets import DataTable, Static

from ledger.book.conventions import CONVENTION_KEYS
from ledger.errors import LedgerError
from ledger.tui.project_edits import set_convention
from ledger.tui.screens.base import LedgerScreen


def value_meaning(key, value: str) -> str:
    if key.values:
        return key.values.get(value, "unknown value")
    return "overall factor multiplying every coefficient"


class ConventionsScreen(LedgerScreen):
    AREA = "conventions"

    def body(self):
        yield DataTable(id="conventions-table", cursor_type="row", zebra_stripes=True)
        yield Static("", id="conventions-detail", markup=False)

    def on_mount(self) -> None:
        table = self.query_one(DataTable)
        table.add_column("Convention", key="name")
        table.add_column("Value", key="value")
        table.add_column("Meaning", key="meaning")
        table.border_title = "Declared conventions (the engine computes in the defaults)"
        self.refresh_from_project()
        table.focus()

    def refresh_from_project(self) -> None:
        table = self.query_one(DataTable)
        row = table.cursor_row
        table.clear()
        for key in CONVENTION_KEYS:
            value = self.project.conventions[key.name]
            marker = "" if value == key.default else " *"
            table.add_row(key.name, value + marker, value_meaning(key, value), key=key.name)
        table.move_cursor(row=min(row, table.row_count - 1))
        self._detail()

    def _current_key(self):
        table = self.query_one(DataTable)
        name = table.coordinate_to_cell_key(table.cursor_coordinate).row_key.value
        return next(k for k in CONVENTION_KEYS if k.name == name)

    def _detail(self) -> None:
        key = self._current_key()
        value = self.project.conventions[key.name]
        differs = "" if value == key.default else f" (differs from the engine's {key.default}, marked *)"
        self.query_one("#conventions-detail", Static).update(
            f"{key.name} = {value}: {value_meaning(key, value)}{differs}\n"
            f"{key.meaning}. Enter changes it.")

    def on_data_table_row_highlighted(self, event) -> None:
        self._detail()

    def on_data_table_row_selected(self, event) -> None:
        self.action_edit()

    def action_edit(self) -> None:
        from ledger.tui.dialogs.convention_value import ConventionDialog

        key = self._current_key()

        def done(value) -> None:
            if value is None:
                return
            try:
                set_convention(self.project, key.name, value)
            except LedgerError as error:
                self.app.show_error("Convention not changed", str(error))
                return
            self.app.project_changed()

        self.app.push_screen(ConventionDialog(key, self.project.conventions[key.name]), done)
