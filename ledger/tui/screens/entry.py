"""One entry: coefficient, Laurent polynomial, values, integral, provenance, notes, history."""

from __future__ import annotations

from functools import partial

from textual.containers import VerticalScroll

from ledger.book import STATUSES
from ledger.tui import engine
from ledger.tui.display import operator_unicode, structure_unicode
from ledger.tui.project_edits import attach_results, set_notes, set_status
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.tasks import Task, TaskFinished
from ledger.tui.widgets.entry_sheet import EntrySheet
from ledger.tui.widgets.progress_panel import ProgressPanel, TaskPanelMixin

VALUE_DIGITS = 30
TASK = "entry"


class EntryScreen(TaskPanelMixin, LedgerScreen):
    task_name = TASK
    AREA = "entry"

    def __init__(self, entry_id: str) -> None:
        super().__init__()
        self.entry_id = entry_id

    @property
    def entry(self):
        return self.project.entry(self.entry_id)

    def body(self):
        with VerticalScroll(id="entry-scroll"):
            yield EntrySheet(id="entry-sheet")
        yield ProgressPanel()

    def on_mount(self) -> None:
        self.refresh_from_project()
        self.query_one("#entry-scroll").focus()

    def refresh_from_project(self) -> None:
        entry = self.entry
        if entry is None:  # deleted or reloaded away
            self.dismiss()
            return
        self.sub_title = (f"entry {entry.id}: {operator_unicode(entry.operator)} "
                          f"{structure_unicode(entry.structure)}")
        self.query_one(EntrySheet).show(entry, self.project.background(entry.background))
        scroll = self.query_one("#entry-scroll", VerticalScroll)
        scroll.border_title = f"Entry {entry.id}"

    # ---- editing ----------------------------------------------------------
    def action_edit_notes(self) -> None:
        from ledger.tui.dialogs.notes import NotesDialog

        def done(notes) -> None:
            if notes is not None and self.entry is not None:
                set_notes(self.project, self.entry, notes)
                self.app.project_changed()

        self.app.push_screen(NotesDialog(f"Notes of {self.entry_id}", self.entry.notes), done)

    def action_choose_status(self) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        entry = self.entry

        def chosen(status) -> None:
            if status in STATUSES and self.entry is not None and status != self.entry.status:
                set_status(self.project, self.entry, status)
                self.app.project_changed()

        choices = [(s, f"{s} (now)" if s == entry.status else s) for s in STATUSES]
        choices.sort(key=lambda c: c[0] == entry.status)  # the current one last
        self.app.push_screen(ChoiceDialog(f"Status of {entry.id}",
                                          f"{entry.id} is {entry.status}. Mark it as:", choices),
                             chosen)

    # ---- computing --------------------------------------------------------
    def check_action(self, action: str, parameters) -> bool | None:
        running = self.app.tasks.running(TASK)
        if action == "cancel":
            return True if running else None
        if action in ("compute_values", "compute_laurent", "compute_integral", "plot"):
            tree_level = self.entry is not None and self.entry.genus == 0
            return None if running or tree_level else True
        return True

    def _run_task(self, title: str, run) -> None:
        self.query_one(ProgressPanel).start(title)
        self.app.tasks.start(self, Task(TASK, title, run))
        self.refresh_bindings()

    def action_compute_values(self) -> None:
        entry = self.entry
        taus = [v["tau"] for v in entry.derived.get("values", [])] or [engine.DEFAULT_TAU]
        digits = max([int(v.get("digits", VALUE_DIGITS)) for v in entry.derived.get("values", [])]
                     + [VALUE_DIGITS])
        self._run_task(f"Values of {entry.id} at {len(taus)} point(s)",
                    partial(_values_at, entry.coefficient, taus, digits))

    def action_compute_laurent(self) -> None:
        entry = self.entry
        self._run_task(f"Laurent polynomial of {entry.id}",
                    lambda job: {"laurent": engine.laurent_record(entry.coefficient, VALUE_DIGITS, job)})

    def action_compute_integral(self) -> None:
        entry = self.entry
        self._run_task(f"Integral over F of {entry.id}",
                    lambda job: {"integral": engine.integral_record(entry.coefficient, VALUE_DIGITS, job)})

    def action_cancel(self) -> None:
        self.app.tasks.cancel(TASK)

    def action_compute_here(self) -> None:
        self.app.open_compute(self.entry.coefficient, attach_to=self.entry_id)

    def action_plot(self) -> None:
        self.app.open_plot(self.entry.coefficient)

    def on_task_finished(self, message: TaskFinished) -> None:
        self.query_one(ProgressPanel).stop()
        entry = self.entry
        if entry is not None:
            attach_results(self.project, entry, message.result)
            self.app.project_changed()
        self.refresh_bindings()


def _values_at(expression: str, taus: list[str], digits: int, job) -> dict:
    """Values at several points; all of them or nothing."""
    records = [engine.value_record(expression, tau, digits, job.part(k / len(taus), (k + 1) / len(taus)))
               for k, tau in enumerate(taus)]
    return {"values": records}
