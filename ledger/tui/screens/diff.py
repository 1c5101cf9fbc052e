"""Two projects side by side: A is the open project, B a second file aligned to A's conventions."""

from __future__ import annotations

from functools import partial

from textual.containers import VerticalScroll
from textual.widgets import DataTable, Static

from ledger.book import Project, structure_label
from ledger.errors import LedgerError
from ledger.tui import engine
from ledger.tui.display import coefficient_unicode, operator_with_structure
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.tasks import Task, TaskFinished
from ledger.tui.widgets.entries_table import shorten

TASK = "diff"
VERDICTS = {"same": "same", "different": "different", "conflict": "conflict",
            "only-in-first": "only in A", "only-in-second": "only in B"}
FILTERS = (("all rows", None), ("differences", {"different", "conflict"}),
           ("missing on one side", {"only-in-first", "only-in-second"}))


class DiffScreen(LedgerScreen):
    AREA = "diff"

    def __init__(self, other_path: str | None = None) -> None:
        super().__init__()
        self.other_path = other_path
        self.other: Project | None = None
        self.result: engine.DiffResult | None = None
        self.filter_index = 0

    def body(self):
        yield Static("", id="diff-heading", markup=False)
        yield DataTable(id="diff-table", cursor_type="row", zebra_stripes=True)
        with VerticalScroll(id="diff-details"):
            yield Static("", id="diff-detail", markup=False)

    def on_mount(self) -> None:
        table = self.query_one(DataTable)
        for key, label in (("verdict", "Verdict"), ("where", "Background"), ("genus", "g"),
                           ("operator", "Operator"), ("a", "A"), ("b", "B"), ("factor", "A/B")):
            table.add_column(label, key=key)
        self.query_one("#diff-details").border_title = "Selected row"
        if self.other_path:
            self.load_other(self.other_path)
        else:
            self._heading("o opens the project B to compare with this one (A).")
            self.action_open_other()

    def _heading(self, text: str) -> None:
        self.query_one("#diff-heading", Static).update(text)

    def action_open_other(self) -> None:
        from ledger.tui.dialogs.path_prompt import PathDialog

        self.app.push_screen(PathDialog("Compare with", "Project file B:", self.other_path or ""),
                             lambda path: path and self.load_other(path))

    def load_other(self, path: str) -> None:
        try:
            other = Project.load(path)
        except LedgerError as error:
            self.app.show_error("Cannot open project B", str(error))
            return
        self.other_path, self.other = path, other
        self._heading(f"A: {self._project_name(self.project)}\nB: {path} — comparing…")
        self.app.tasks.start(self, Task(TASK, f"Diff with {path}",
                                        partial(engine.diff, self.project, other)))

    @staticmethod
    def _project_name(project) -> str:
        return str(project.path) if project.path else "this scratch project"

    def on_task_finished(self, message: TaskFinished) -> None:
        self.result = message.result
        self._fill()

    def action_cycle_filter(self) -> None:
        self.filter_index = (self.filter_index + 1) % len(FILTERS)
        self._fill()

    def check_action(self, action: str, parameters) -> bool | None:
        if action == "cycle_filter":
            return True if self.result else None
        return True

    def _fill(self) -> None:
        result = self.result
        if result is None:
            return
        counts = {}
        for row in result.rows:
            counts[row.status] = counts.get(row.status, 0) + 1
        summary = ", ".join(f"{n} {VERDICTS[s]}" for s, n in counts.items()) or "no entries"
        if result.aligned:
            align = ("B aligned to A's conventions: " + "; ".join(result.alignment)
                     if result.alignment else "both declare the same conventions")
        else:
            align = ("compared as written, conventions NOT aligned (not available yet)"
                     + (": they differ in " + "; ".join(result.alignment) if result.alignment else ""))
        cause = f"\nexplained by one convention: {result.cause}" if result.cause else ""
        self._heading(f"A: {self._project_name(self.project)}   B: {self.other_path}\n{align}{cause}\n"
                      f"{summary}; showing {FILTERS[self.filter_index][0]} (f changes)")
        table = self.query_one(DataTable)
        table.clear()
        wanted = FILTERS[self.filter_index][1]
        for index, row in enumerate(result.rows):
            if wanted is not None and row.status not in wanted:
                continue
            background, genus, operator, (p, q) = row.key
            table.add_row(VERDICTS[row.status], background, str(genus),
                          operator_with_structure(operator, structure_label(p, q)),
                          row.first.id if row.first is not None else "—",
                          row.second.id if row.second is not None else "—",
                          row.factor, key=str(index))
        self._show_detail()
        self.refresh_bindings()

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        self._show_detail()

    def _show_detail(self) -> None:
        table = self.query_one(DataTable)
        detail = self.query_one("#diff-detail", Static)
        if self.result is None or not table.row_count:
            detail.update("")
            return
        key = table.coordinate_to_cell_key(table.cursor_coordinate).row_key.value
        row = self.result.rows[int(key)]
        lines = []
        for side, entry in (("A", row.first), ("B", row.second)):
            if entry is not None:
                lines.append(f"{side} {entry.id}: {shorten(coefficient_unicode(entry.coefficient), 70)}"
                             f"  [{entry.status}; {entry.provenance.describe()}]")
        lines += list(row.details)
        detail.update("\n".join(lines))
