"""A coefficient along a vertical line tau = tau1 + i tau2 against its Laurent polynomial.

Two views: both curves, and log10 of their difference beside log10 of the
evaluation error, which shows where the exponentially small terms (of order
exp(-2 pi tau2)) stop mattering at the working precision.
"""

from __future__ import annotations

import math
from functools import partial

from textual.containers import Horizontal
from textual.widgets import Input, Label, Static

from ledger.errors import LedgerError
from ledger.tui import engine
from ledger.tui.display import coefficient_unicode
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.tasks import Task, TaskFinished
from ledger.tui.widgets.braille_plot import BraillePlot, Series
from ledger.tui.widgets.expression_input import ExpressionInput
from ledger.tui.widgets.progress_panel import ProgressPanel, TaskPanelMixin

TASK = "plot"
DEFAULT_RANGE = ("0", "0.9", "6", "30")  # tau1, tau2 from, tau2 to, points


def _log10(x: float) -> float:
    return math.log10(x) if x > 0 else math.nan


class PlotScreen(TaskPanelMixin, LedgerScreen):
    task_name = TASK
    AREA = "plot"

    def __init__(self, expression: str = "") -> None:
        super().__init__()
        self.initial_expression = expression
        self.samples: engine.LineSamples | None = None
        self.difference_view = False

    def body(self):
        with Horizontal(classes="compute-row"):
            yield Label("Expression", classes="row-label")
            yield ExpressionInput(self.initial_expression, id="expression")
        with Horizontal(classes="compute-row"):
            yield Label("τ₁", classes="row-label")
            yield Input(DEFAULT_RANGE[0], id="tau1", compact=True, restrict=r"[-0-9.]*")
            yield Label("τ₂ from", classes="inline-label")
            yield Input(DEFAULT_RANGE[1], id="tau2-min", compact=True, restrict=r"[0-9.]*")
            yield Label("to", classes="inline-label")
            yield Input(DEFAULT_RANGE[2], id="tau2-max", compact=True, restrict=r"[0-9.]*")
            yield Label("points", classes="inline-label")
            yield Input(DEFAULT_RANGE[3], id="points", compact=True, restrict=r"\d*", max_length=3)
        yield ProgressPanel()
        yield BraillePlot(id="plot-canvas")
        yield Static("", id="plot-caption", markup=False)

    def on_mount(self) -> None:
        self.query_one(BraillePlot).clear("^r evaluates the expression along the line and draws it")
        self.query_one(ExpressionInput).focus()

    def _numbers(self) -> tuple[float, float, float, int]:
        try:
            tau1, low, high = (float(self.query_one(f"#{name}", Input).value)
                               for name in ("tau1", "tau2-min", "tau2-max"))
            points = int(self.query_one("#points", Input).value)
        except ValueError:
            raise LedgerError("τ₁, the τ₂ range and the number of points must be numbers") from None
        return tau1, low, high, points

    def check_action(self, action: str, parameters) -> bool | None:
        running = self.app.tasks.running(TASK)
        if action == "cancel":
            return True if running else None
        if action == "draw":
            return None if running else True
        if action == "toggle_view":
            return True if self.samples else None
        return True

    def action_draw(self) -> None:
        if self.app.tasks.running(TASK):
            return
        try:
            if not self.query_one(ExpressionInput).valid:
                raise LedgerError("the expression does not parse")
            tau1, low, high, points = self._numbers()
        except LedgerError as error:
            self.notify(str(error), title="Cannot plot", severity="warning")
            return
        expression = self.query_one(ExpressionInput).text
        title = f"Plot of {coefficient_unicode(expression)} on τ₁ = {tau1:g}"
        self.query_one(ProgressPanel).start(title)
        self.app.tasks.start(self, Task(TASK, title, partial(
            engine.sample_line, expression, tau1, low, high, points)))
        self.refresh_bindings()

    def action_cancel(self) -> None:
        self.app.tasks.cancel(TASK)

    def action_back(self) -> None:
        self.app.tasks.cancel(TASK)
        self.dismiss()

    def action_toggle_view(self) -> None:
        self.difference_view = not self.difference_view
        self._draw()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_draw()

    def on_task_finished(self, message: TaskFinished) -> None:
        self.query_one(ProgressPanel).stop()
        self.samples = message.result
        self._draw()
        self.refresh_bindings()

    def _draw(self) -> None:
        samples = self.samples
        if samples is None:
            return
        plot = self.query_one(BraillePlot)
        caption = self.query_one("#plot-caption", Static)
        if self.difference_view:
            gaps = [_log10(g) for g in samples.gaps]
            # what the evaluation resolves: its error bound, or the working precision
            resolution = 10.0 ** -engine.PLOT_DIGITS
            floor = [_log10(max(e, abs(v) * resolution)) for e, v in zip(samples.errors, samples.values)]
            plot.plot([Series("log₁₀|f − Laurent|", samples.tau2, gaps),
                       Series(f"log₁₀ of the {engine.PLOT_DIGITS}-digit resolution", samples.tau2,
                              floor, dotted=True)], "τ₂")
            crossing = next((t for t, g, f in zip(samples.tau2, gaps, floor)
                             if not math.isnan(g) and not math.isnan(f) and g <= f), None)
            caption.update(
                "The difference falls like exp(−2πτ₂) until it meets the resolution"
                + (f": beyond τ₂ ≈ {crossing:.2f} the Laurent polynomial is the function at "
                   f"{engine.PLOT_DIGITS} digits." if crossing else
                   "; in this range it stays above it."))
        else:
            plot.plot([Series("coefficient f(τ)", samples.tau2, samples.values),
                       Series("Laurent polynomial", samples.tau2, samples.laurent, dotted=True)], "τ₂")
            caption.update(f"Along τ = {samples.tau1:g} + iτ₂, real part, {engine.PLOT_DIGITS} digits; "
                           "^t shows log₁₀ of the difference.")
