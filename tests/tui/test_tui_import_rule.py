"""The model and the engine never import textual (DESIGN.md section 7, as in the admired apps)."""

from __future__ import annotations

import subprocess
import sys

from tui_helpers import ROOT

CORE = ("ledger.mgf", "ledger.amplitudes", "ledger.book", "ledger.expr")
UI_FREE_HELPERS = ("ledger.tui.display", "ledger.tui.engine", "ledger.tui.project_edits")

SCRIPT = """
import importlib, pkgutil, sys
names = []
for package in {core!r}:
    module = importlib.import_module(package)
    names.append(package)
    for info in pkgutil.walk_packages(module.__path__, package + "."):
        importlib.import_module(info.name)
        names.append(info.name)
for name in {helpers!r}:
    importlib.import_module(name)
leaked = sorted(m for m in sys.modules if m == "textual" or m.startswith("textual."))
assert not leaked, f"textual was imported: {{leaked[:3]}}"
assert "ledger.mgf.graph" in names
print(len(names))
"""


def test_core_never_imports_textual():
    # the brief's one-liner, extended to every module of the core packages that exists
    script = SCRIPT.format(core=CORE, helpers=UI_FREE_HELPERS)
    result = subprocess.run([sys.executable, "-c", script], cwd=ROOT, capture_output=True,
                            text=True, timeout=120)
    assert result.returncode == 0, result.stderr[-2000:]
    assert int(result.stdout.strip()) > 10
