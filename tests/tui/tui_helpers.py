"""Helpers for driving the application with Pilot and reading what is on screen."""

from __future__ import annotations

import asyncio
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
FIXTURES = Path(__file__).parent / "fixtures"
SIZE = (80, 24)


def screen_text(app) -> str:
    """The characters on the screen now, one line per row."""
    strips = app.screen._compositor.render_strips()
    return "\n".join("".join(segment.text for segment in strip) for strip in strips)


async def settle(pilot, condition, timeout: float = 20.0) -> None:
    """Let the app run until ``condition()`` holds (workers finish, messages arrive)."""
    deadline = time.monotonic() + timeout
    while not condition():
        if time.monotonic() > deadline:
            raise AssertionError(f"timed out waiting; screen was:\n{screen_text(pilot.app)}")
        await asyncio.sleep(0.05)
        await pilot.pause()
