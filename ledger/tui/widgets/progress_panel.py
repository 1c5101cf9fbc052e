"""A running computation: what it is doing, a progress bar, elapsed time, how to cancel."""

from __future__ import annotations

import time

from textual.containers import Horizontal
from textual.widgets import Label, ProgressBar

from ledger.tui.tasks import TaskCancelled, TaskFailed, TaskProgress


class ProgressPanel(Horizontal):
    """Hidden while idle; ``start``, ``advance`` and ``stop`` drive it from task messages."""

    def __init__(self, cancel_hint: str = "^g cancels", **kwargs) -> None:
        super().__init__(**kwargs)
        self.cancel_hint = cancel_hint

    def compose(self):
        yield Label("", classes="progress-text")
        yield ProgressBar(total=1.0, show_eta=False, classes="progress-bar")
        yield Label("", classes="progress-elapsed")

    def on_mount(self) -> None:
        self.display = False
        self._started = 0.0
        self._elapsed_timer = self.set_interval(0.5, self._show_elapsed, pause=True)

    def start(self, text: str) -> None:
        self._started = time.monotonic()
        self.query_one(ProgressBar).update(progress=0.0)
        self.query_one(".progress-text", Label).update(f"{self.cancel_hint} · {text}")
        self.query_one(".progress-elapsed", Label).update("0 s")
        self.display = True
        self._elapsed_timer.resume()

    def advance(self, fraction: float, text: str) -> None:
        self.query_one(ProgressBar).update(progress=fraction)
        if text:
            self.query_one(".progress-text", Label).update(f"{self.cancel_hint} · {text}")

    def stop(self) -> None:
        self._elapsed_timer.pause()
        self.display = False

    def _show_elapsed(self) -> None:
        self.query_one(".progress-elapsed", Label).update(f"{time.monotonic() - self._started:.0f} s")


class TaskPanelMixin:
    """The shared task-message handling of a screen with one ProgressPanel and one task name.

    The screen sets ``task_name``; failures and cancellations only stop the panel (the
    app shows the dialog or notification), and leaving the screen cancels its task.
    """

    task_name = ""

    def on_task_progress(self, message: TaskProgress) -> None:
        self.query_one(ProgressPanel).advance(message.fraction, message.text)

    def on_task_failed(self, message: TaskFailed) -> None:
        self.query_one(ProgressPanel).stop()
        self.refresh_bindings()

    def on_task_cancelled(self, message: TaskCancelled) -> None:
        self.query_one(ProgressPanel).stop()
        self.refresh_bindings()

    def on_unmount(self) -> None:
        self.app.tasks.cancel(self.task_name)
