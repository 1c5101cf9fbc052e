"""Expand the amplitude to a weight and bring the coefficients into the project."""

from __future__ import annotations

from functools import partial

from textual.containers import Horizontal
from textual.widgets import Input, Label, Select, Static

from ledger.tui import engine
from ledger.tui.dialogs.base import Dialog
from ledger.tui.tasks import Task, TaskCancelled, TaskFailed, TaskFinished, TaskProgress
from ledger.tui.widgets.progress_panel import ProgressPanel
from ledger.tui.widgets.toggles import TickBox

TASK = "expand"


class ExpandDialog(Dialog):
    """Runs the expansion in a worker; returns its payload (as the ``expand`` command prints it)."""

    def __init__(self, backgrounds: list[tuple[str, str]]) -> None:
        super().__init__("Expand into the project")
        self.backgrounds = backgrounds

    def body(self):
        yield Static("B_(p,q) at genus one (graph functions) or T_(p,q) at tree level "
                     "(zeta values), for 2p + 3q ≤ W; existing entries are left untouched.",
                     classes="dialog-text", markup=False)
        with Horizontal(classes="field"):
            yield Label("Weight W", classes="field-label")
            yield Input("4", id="order", compact=True, restrict=r"\d*", max_length=2)
        with Horizontal(classes="field"):
            yield Label("Level", classes="field-label")
            yield Select([("genus one", 1), ("tree level", 0)], id="genus", value=1,
                         allow_blank=False, compact=True)
        with Horizontal(classes="field"):
            yield Label("Background", classes="field-label")
            yield Select([(label, ident) for ident, label in self.backgrounds], id="background",
                         allow_blank=False, compact=True)
        yield TickBox("apply known identities (reduce)", id="reduce", compact=True)
        yield ProgressPanel(cancel_hint="esc cancels")

    def on_mount(self) -> None:
        self.query_one("#order").focus()

    def action_ok(self) -> None:
        if self.app.tasks.running(TASK):
            self.notify("the expansion is already running", severity="warning")
            return
        text = self.query_one("#order", Input).value
        if not text:
            self.notify("type the weight W (0 to 10)", title="Not accepted", severity="warning")
            return
        order = int(text)
        tree = self.query_one("#genus", Select).value == 0
        reduce = self.query_one("#reduce", TickBox).value
        background = self.query_one("#background", Select).value
        level = "tree level" if tree else "genus one"
        task = Task(TASK, f"Expansion to weight {order} ({level})",
                    partial(_expand_and_plan, self.app.project, order, tree, reduce, background))
        self.query_one(ProgressPanel).start(task.title)
        self.app.tasks.start(self, task)

    def action_cancel(self) -> None:
        if self.app.tasks.cancel(TASK):
            self.notify("expansion cancelled; the project is unchanged", title="Cancelled")
        self.dismiss(None)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_ok()

    def on_task_progress(self, message: TaskProgress) -> None:
        self.query_one(ProgressPanel).advance(message.fraction, message.text)

    def on_task_finished(self, message: TaskFinished) -> None:
        self.query_one(ProgressPanel).stop()
        self.dismiss(message.result)

    def on_task_failed(self, message: TaskFailed) -> None:
        self.query_one(ProgressPanel).stop()

    def on_task_cancelled(self, message: TaskCancelled) -> None:
        self.query_one(ProgressPanel).stop()


def _expand_and_plan(project, order, tree, reduce, background, job):
    """Worker body: the expansion, then the merge plan with its derived data (nothing stored)."""
    from ledger.book.fill import plan_merge

    payload = engine.expand(order, tree, reduce, background, job.part(0, 0.1))
    return plan_merge(project, payload, job=job.part(0.1, 1))
