"""Fixtures of the UI tests (helpers live in tui_helpers.py)."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest
from tui_helpers import FIXTURES


@pytest.fixture
def project_copy(tmp_path) -> Path:
    """A writable copy of the fixture project."""
    target = tmp_path / "ledger.toml"
    shutil.copy(FIXTURES / "two-levels.toml", target)
    return target
