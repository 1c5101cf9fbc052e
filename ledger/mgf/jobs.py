"""Progress reporting and cancellation for long computations.

Engine functions take an optional ``job`` and call ``job.report(fraction)``
between units of work; ``report`` raises :class:`Cancelled` once the job has
been cancelled, so a cancelled computation unwinds without partial results.

>>> seen = []
>>> job = Job(on_progress=lambda f, msg: seen.append(f))
>>> job.report(0.5, "half way")
>>> seen
[0.5]
>>> job.cancel()
>>> job.report(0.6)  # doctest: +IGNORE_EXCEPTION_DETAIL
Traceback (most recent call last):
...
ledger.mgf.jobs.Cancelled: computation cancelled
"""

from __future__ import annotations

import threading
from typing import Callable, Optional

ProgressCallback = Callable[[float, str], None]


class Cancelled(Exception):
    """Raised inside a computation whose job was cancelled."""

    def __init__(self, message: str = "computation cancelled"):
        super().__init__(message)


class Job:
    """A handle shared by a computation and whoever waits for it."""

    def __init__(self, on_progress: Optional[ProgressCallback] = None):
        self._on_progress = on_progress
        self._cancelled = threading.Event()

    def cancel(self) -> None:
        self._cancelled.set()

    @property
    def cancelled(self) -> bool:
        return self._cancelled.is_set()

    def check(self) -> None:
        """Raise :class:`Cancelled` if the job was cancelled."""
        if self._cancelled.is_set():
            raise Cancelled()

    def report(self, fraction: float, message: str = "") -> None:
        """Report progress in [0, 1]; raises :class:`Cancelled` when cancelled."""
        self.check()
        if self._on_progress is not None:
            self._on_progress(min(max(float(fraction), 0.0), 1.0), message)

    def part(self, start: float, stop: float) -> "Job":
        """A view of this job whose fractions map into [start, stop]."""
        parent = self

        def forward(fraction: float, message: str) -> None:
            if parent._on_progress is not None:
                parent._on_progress(start + (stop - start) * fraction, message)

        child = Job(on_progress=forward)
        child._cancelled = self._cancelled
        return child


def ensure_job(job: Optional[Job]) -> Job:
    """Return ``job`` or a fresh, silent one."""
    return job if job is not None else Job()
