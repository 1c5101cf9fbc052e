"""The overview: backgrounds and orders on the left, the table of entries on the right."""

from __future__ import annotations

from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.widgets import DataTable, Input, Tree

from ledger.tui.display import coefficient_unicode
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.widgets.entries_table import COLUMNS, SORTABLE, EntriesTable
from ledger.tui.widgets.orders_tree import OrdersTree, describe, matches
from ledger.tui.widgets.sector_sheet import SectorSheet

_LABELS = dict(COLUMNS)


def _haystack(entry) -> str:
    """Everything the filter looks in, lower case."""
    return " ".join([entry.id, entry.background, entry.operator, entry.structure, entry.coefficient,
                     coefficient_unicode(entry.coefficient), entry.status,
                     entry.provenance.describe(), entry.notes]).lower()


class OverviewScreen(LedgerScreen):
    AREA = "overview"

    def __init__(self) -> None:
        super().__init__()
        self.scope: dict = {}
        self.sort_column = "operator"
        self.sort_reverse = False

    def body(self):
        with Horizontal(id="overview"):
            yield OrdersTree(id="orders")
            with Vertical(id="entries-pane"):
                yield Input(id="filter", compact=True,
                            placeholder="/ filter: id, operator, coefficient, status, source, notes")
                yield EntriesTable(id="entries")
                with VerticalScroll(id="sector-pane"):
                    yield SectorSheet(id="sector-sheet")

    def on_mount(self) -> None:
        self.refresh_from_project()
        self.query_one(EntriesTable).focus()

    # ---- drawing --------------------------------------------------------
    def refresh_from_project(self) -> None:
        self.query_one(OrdersTree).build(self.project)
        self.refill()

    def visible_entries(self) -> list:
        words = self.query_one("#filter", Input).value.lower().split()
        return [e for e in self.project.entries
                if matches(e, self.scope) and all(w in _haystack(e) for w in words)]

    def refill(self) -> None:
        table = self.query_one(EntriesTable)
        background = self.project.background(self.scope["background"]) if "sectors" in self.scope else None
        pane = self.query_one("#sector-pane")
        table.display, pane.display = background is None, background is not None
        if background is not None:
            self.query_one(SectorSheet).show_background(background)
            pane.border_title = describe(self.scope)
            return
        entries = self.visible_entries()
        table.show(entries, self.sort_column, self.sort_reverse,
                   tuple(b.id for b in self.project.backgrounds))
        arrow = "↓" if self.sort_reverse else "↑"
        table.border_title = f"{describe(self.scope)} · {len(entries)}/{len(self.project.entries)} entries"
        table.border_subtitle = (f"sorted by {_LABELS[self.sort_column].lower()} {arrow}"
                                 if self.project.entries else
                                 "empty project: c computes, x expands the amplitude")

    # ---- events ---------------------------------------------------------
    def on_tree_node_highlighted(self, event: Tree.NodeHighlighted) -> None:
        if event.node.data is not None and event.node.data != self.scope:
            self.scope = dict(event.node.data)
            self.refill()

    def on_input_changed(self, event: Input.Changed) -> None:
        if event.input.id == "filter":
            self.refill()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        if event.input.id == "filter":
            self.query_one(EntriesTable).focus()

    def on_key(self, event) -> None:
        if event.key == "escape" and self.focused is self.query_one("#filter"):
            event.stop()
            self.query_one(EntriesTable).focus()

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        self.app.open_entry(event.row_key.value)

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        self.refresh_bindings()

    def on_data_table_header_selected(self, event: DataTable.HeaderSelected) -> None:
        column = event.column_key.value
        if column == self.sort_column:
            self.sort_reverse = not self.sort_reverse
        else:
            self.sort_column, self.sort_reverse = column, False
        self.refill()

    # ---- actions --------------------------------------------------------
    def selected_entry(self):
        ident = self.query_one(EntriesTable).selected_id()
        return self.project.entry(ident) if ident else None

    def check_action(self, action: str, parameters) -> bool | None:
        if action in ("open_entry", "delete_entry"):
            return True if self.selected_entry() is not None else None
        if action == "plot_entry":  # a tree-level coefficient is a number: nothing to plot
            entry = self.selected_entry()
            return True if entry is not None and entry.genus > 0 else None
        return True

    def action_open_entry(self) -> None:
        entry = self.selected_entry()
        if entry is not None:
            self.app.open_entry(entry.id)

    def action_focus_filter(self) -> None:
        self.query_one("#filter").focus()

    def action_cycle_sort(self) -> None:
        index = SORTABLE.index(self.sort_column)
        self.sort_column, self.sort_reverse = SORTABLE[(index + 1) % len(SORTABLE)], False
        self.refill()

    def action_toggle_tree(self) -> None:
        tree = self.query_one(OrdersTree)
        tree.display = not tree.display
        if not tree.display and self.scope:
            self.scope = {}
            self.refill()

    def action_plot_entry(self) -> None:
        entry = self.selected_entry()
        if entry is not None:
            self.app.open_plot(entry.coefficient)

    def action_delete_entry(self) -> None:
        entry = self.selected_entry()
        if entry is not None:
            self.app.delete_entry(entry.id)
