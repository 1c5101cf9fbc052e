"""Slow work in named, exclusive thread workers that post typed messages back.

A :class:`Task` is a name (the worker name and group: starting a task of the
same name cancels the previous one), a title for messages and dialogs, and a
function of a :class:`ledger.mgf.jobs.Job`.  :class:`TaskRunner` starts it in
a thread worker; the worker never touches widgets: it posts
:class:`TaskProgress` (through ``app.call_from_thread``), then exactly one of
:class:`TaskFinished`, :class:`TaskFailed` or :class:`TaskCancelled` to the
widget that asked.  These messages bubble up to the app, which turns every
failure into an error dialog and every success into a notification with the
elapsed time.
"""

from __future__ import annotations

import threading
import time
from dataclasses import dataclass, field
from typing import Any, Callable

from textual.message import Message
from textual.widget import Widget

from ledger.errors import LedgerError
from ledger.mgf.jobs import Cancelled, Job

PROGRESS_INTERVAL = 0.1  # seconds between progress messages


@dataclass(frozen=True)
class Task:
    name: str
    title: str
    run: Callable[[Job], Any] = field(compare=False)


class TaskProgress(Message):
    def __init__(self, task: Task, fraction: float, text: str) -> None:
        super().__init__()
        self.task = task
        self.fraction = fraction
        self.text = text


class TaskFinished(Message):
    def __init__(self, task: Task, result: Any, seconds: float) -> None:
        super().__init__()
        self.task = task
        self.result = result
        self.seconds = seconds


class TaskFailed(Message):
    def __init__(self, task: Task, reason: str) -> None:
        super().__init__()
        self.task = task
        self.reason = reason


class TaskCancelled(Message):
    def __init__(self, task: Task) -> None:
        super().__init__()
        self.task = task


class TaskRunner:
    """Starts, tracks and cancels the tasks of one app."""

    def __init__(self, app) -> None:
        self.app = app
        self._jobs: dict[str, Job] = {}
        self._closing = threading.Event()

    def start(self, owner: Widget, task: Task) -> Job:
        """Run ``task`` in a thread worker; ``owner`` receives its messages."""
        self.cancel(task.name)
        last = [0.0]

        def progress(fraction: float, text: str) -> None:
            now = time.monotonic()
            if fraction < 1.0 and now - last[0] < PROGRESS_INTERVAL:
                return
            last[0] = now
            if self._closing.is_set():
                raise Cancelled()
            self.app.call_from_thread(owner.post_message, TaskProgress(task, fraction, text))

        job = Job(on_progress=progress)
        self._jobs[task.name] = job

        def work() -> None:
            started = time.monotonic()
            try:
                result = task.run(job)
                outcome = (TaskCancelled(task) if job.cancelled
                           else TaskFinished(task, result, time.monotonic() - started))
            except Cancelled:
                outcome = TaskCancelled(task)
            except LedgerError as error:
                outcome = TaskFailed(task, _one_line(str(error)))
            except Exception as error:  # a bug in the engine: still a dialog, not a traceback
                outcome = TaskFailed(
                    task, _one_line(f"unexpected failure ({type(error).__name__}: {error})"))
            if self._jobs.get(task.name) is job:
                del self._jobs[task.name]
            owner.post_message(outcome)

        self.app.run_worker(work, name=task.name, group=task.name, thread=True,
                            exclusive=True, exit_on_error=False)
        return job

    def running(self, name: str) -> bool:
        return name in self._jobs

    def cancel(self, name: str) -> bool:
        job = self._jobs.get(name)
        if job is None:
            return False
        job.cancel()
        return True

    def cancel_all(self) -> None:
        self._closing.set()
        for job in list(self._jobs.values()):
            job.cancel()


def _one_line(text: str) -> str:
    return " ".join(text.split())
