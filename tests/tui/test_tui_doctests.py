"""The worked examples in the docstrings of the UI's helper modules run."""

from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = ("ledger.tui.display", "ledger.tui.engine", "ledger.tui.project_edits", "ledger.tui.keys",
           "ledger.tui.widgets.braille_plot")


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    result = doctest.testmod(importlib.import_module(name))
    assert result.attempted > 0 and result.failed == 0
