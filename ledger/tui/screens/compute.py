"""The calculator: an expression, tau and digits; value, Laurent polynomial, integral.

Results arrive complete from a worker and can be recorded as a new entry or
attached to an existing one; a cancelled run leaves nothing behind.
"""

from __future__ import annotations

from functools import partial

from rich.table import Table
from textual.containers import Horizontal, VerticalScroll
from textual.widgets import Button, Input, Label, Static

from ledger.errors import LedgerError
from ledger.tui import engine
from ledger.tui.display import coefficient_unicode
from ledger.tui.project_edits import (
    add_recorded_entry, attach_results, guess_slot, same_expression,
)
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.tasks import Task, TaskFinished
from ledger.tui.widgets.entry_sheet import LABEL_WIDTH, integral_text, laurent_text, values_text
from ledger.tui.widgets.expression_input import ExpressionInput
from ledger.tui.widgets.progress_panel import ProgressPanel, TaskPanelMixin
from ledger.tui.widgets.toggles import TickBox

TASK = "compute"
DEFAULT_DIGITS = 30


def canonical_text(text: str) -> str:
    from ledger.expr import parse, to_text

    return to_text(parse(text))


class ComputeScreen(TaskPanelMixin, LedgerScreen):
    task_name = TASK
    AREA = "compute"

    def __init__(self, expression: str = "", attach_to: str | None = None) -> None:
        super().__init__()
        self.initial_expression = expression
        self.attach_to = attach_to
        self.results: dict | None = None
        self.results_expression = ""
        self._request_running: engine.ComputeRequest | None = None

    def body(self):
        with Horizontal(classes="compute-row"):
            yield Label("Expression", classes="row-label")
            yield ExpressionInput(self.initial_expression, id="expression")
        with Horizontal(classes="compute-row"):
            yield Label("τ", classes="row-label")
            yield Input(engine.DEFAULT_TAU, id="tau", compact=True, placeholder="e.g. 0.27+1.31i or i")
            yield Label("digits", classes="inline-label")
            yield Input(str(DEFAULT_DIGITS), id="digits", compact=True, restrict=r"\d*", max_length=3)
            yield Static("", id="tau-feedback", markup=False)
        with Horizontal(classes="compute-row"):
            yield Label("Compute", classes="row-label")
            yield TickBox("value at τ", True, id="want-value", compact=True)
            yield TickBox("Laurent polynomial", id="want-laurent", compact=True)
            yield TickBox("integral over F", id="want-integral", compact=True)
        with Horizontal(classes="compute-buttons"):
            yield Button("Run", id="compute-run", compact=True, action="screen.run")
            yield Button("Cancel", id="compute-cancel", compact=True, action="screen.cancel")
            yield Button("Record new…", id="compute-record", compact=True, action="screen.record")
            yield Button("Attach…", id="compute-attach", compact=True, action="screen.attach")
            yield Button("Plot", id="compute-plot", compact=True, action="screen.plot")
        yield ProgressPanel()
        with VerticalScroll(id="compute-results"):
            yield Static("", id="results", markup=False)

    def on_mount(self) -> None:
        self.query_one("#compute-results").border_title = "Results"
        self._show_placeholder()
        self._check_tau()
        self.query_one(ExpressionInput).focus()

    def _show_placeholder(self) -> None:
        target = f"; attach sends them to entry {self.attach_to}" if self.attach_to else ""
        self.query_one("#results", Static).update(
            f"Run (^r) computes the checked items{target}. Record new (^n) keeps the expression "
            "as an entry, with any results.")

    # ---- inputs -----------------------------------------------------------
    @property
    def expression(self) -> str:
        return self.query_one(ExpressionInput).text

    def on_input_changed(self, event: Input.Changed) -> None:
        if event.input.id == "tau":
            self._check_tau()

    def _check_tau(self) -> None:
        feedback = self.query_one("#tau-feedback", Static)
        try:
            engine.parse_tau(self.query_one("#tau", Input).value)
        except LedgerError as error:
            feedback.update(f"✗ {error}")
        else:
            feedback.update("")

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_run()

    def on_expression_input_checked(self, event: ExpressionInput.Checked) -> None:
        self.refresh_bindings()

    # ---- actions ----------------------------------------------------------
    def check_action(self, action: str, parameters) -> bool | None:
        running = self.app.tasks.running(TASK)
        if action == "cancel":
            return True if running else None
        if action == "run":
            return None if running else True
        if action == "attach":
            return True if self.results and not running else None
        if action == "record":
            return None if running else True
        return True

    def _request(self) -> engine.ComputeRequest:
        if not self.query_one(ExpressionInput).valid:
            raise LedgerError("the expression does not parse: see the message under it")
        digits_text = self.query_one("#digits", Input).value
        return engine.ComputeRequest(
            self.expression, self.query_one("#tau", Input).value.strip(),
            int(digits_text) if digits_text else 0,
            value=self.query_one("#want-value", TickBox).value,
            laurent=self.query_one("#want-laurent", TickBox).value,
            integral=self.query_one("#want-integral", TickBox).value)

    def action_run(self) -> None:
        if self.app.tasks.running(TASK):
            return
        try:
            request = self._request()
            engine.check_digits(request.digits)
        except LedgerError as error:
            self.notify(str(error), title="Cannot run", severity="warning")
            return
        self._request_running = request
        title = f"Computing {coefficient_unicode(request.expr_text)}"
        self.query_one(ProgressPanel).start(title)
        self.app.tasks.start(self, Task(TASK, title, partial(engine.compute, request)))
        self.refresh_bindings()

    def action_cancel(self) -> None:
        self.app.tasks.cancel(TASK)

    def action_back(self) -> None:
        if self.app.tasks.cancel(TASK):
            self.notify("computation cancelled; nothing was stored", title="Cancelled")
        self.dismiss()

    def action_plot(self) -> None:
        if self.query_one(ExpressionInput).valid:
            self.app.open_plot(self.expression)
        else:
            self.notify("the expression does not parse", title="Cannot plot", severity="warning")

    def action_record(self) -> None:
        from ledger.tui.dialogs.record_entry import RecordDialog

        if not self.query_one(ExpressionInput).valid:
            self.notify("the expression does not parse", title="Cannot record", severity="warning")
            return
        coefficient = canonical_text(self.expression)
        results = self.results if self.results and same_expression(
            self.results_expression, coefficient) else {}
        target = self.app.project.entry(self.attach_to) if self.attach_to else None
        genus, weight = (target.genus, target.weight) if target else guess_slot(coefficient)
        carried = [name for name in ("values", "laurent", "integral") if name in results]

        def done(answer) -> None:
            if answer is None:
                return
            try:
                entry = add_recorded_entry(self.app.project, answer, coefficient, results)
            except LedgerError as error:
                self.app.show_error("Could not record the entry", str(error))
                return
            self.app.project_changed()
            stored = " with its results" if results else ""
            self.notify(f"recorded as {entry.id}{stored} (ctrl+s saves the file)", title="Recorded")

        self.app.push_screen(RecordDialog(self.app.project, coefficient, weight, genus, carried), done)

    def action_attach(self) -> None:
        from ledger.tui.dialogs.choose_entry import ChooseEntryDialog

        if not self.results:
            return
        if self.attach_to and self.app.project.entry(self.attach_to) is not None:
            self._attach_results(self.attach_to)
            return
        self.app.push_screen(ChooseEntryDialog("Attach the results to", self.app.project.entries),
                             lambda ident: ident and self._attach_results(ident))

    def _attach_results(self, ident: str) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        entry = self.app.project.entry(ident)
        results, expression = self.results, canonical_text(self.results_expression)

        def store(replace: bool) -> None:
            attach_results(self.app.project, entry, results, expression if replace else None)
            self.app.project_changed()
            self.notify(f"stored in {entry.id} (ctrl+s saves the file)", title="Attached")

        if same_expression(expression, entry.coefficient):
            store(False)
            return
        question = (f"The results are for {coefficient_unicode(expression)}, but entry {entry.id} "
                    f"has the coefficient {coefficient_unicode(entry.coefficient)}. Replace its "
                    "coefficient (its old derived data are dropped)?")
        self.app.push_screen(
            ChoiceDialog("Different coefficient", question,
                         [("cancel", "Keep the entry as it is"), ("replace", "Replace and attach")]),
            lambda answer: answer == "replace" and store(True))

    # ---- task messages ----------------------------------------------------
    def on_task_finished(self, message: TaskFinished) -> None:
        self.query_one(ProgressPanel).stop()
        self.results = message.result
        self.results_expression = self._request_running.expr_text
        self._show_results(message.seconds)
        self.refresh_bindings()

    def _show_results(self, seconds: float) -> None:
        table = Table.grid(padding=(0, 1), expand=True)
        table.add_column(style="bold", width=LABEL_WIDTH, no_wrap=True)
        table.add_column(ratio=1)
        table.add_row("Expression", coefficient_unicode(self.results_expression))
        if "values" in self.results:
            table.add_row("Value", values_text(self.results))
        if "laurent" in self.results:
            table.add_row("Laurent", laurent_text(self.results))
        if "integral" in self.results:
            table.add_row("Integral F", integral_text(self.results))
        where = f"entry {self.attach_to}" if self.attach_to else "an entry"
        table.add_row("", f"done in {seconds:.1f} s; ^n records a new entry, ^t attaches to {where}")
        self.query_one("#results", Static).update(table)
