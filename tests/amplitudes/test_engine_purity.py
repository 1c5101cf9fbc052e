"""ledger.amplitudes is pure computation: importing it loads no UI, project or CLI code."""

from __future__ import annotations

import subprocess
import sys


def test_amplitudes_import_no_ui_book_or_cli():
    code = (
        "import sys\n"
        "import ledger.amplitudes.genus_one, ledger.amplitudes.tree, ledger.amplitudes.operators\n"
        "import ledger.amplitudes.backgrounds, ledger.amplitudes.identities\n"
        "ledger.amplitudes.genus_one.genus_one_coefficients(3, reduce=True)\n"
        "ledger.amplitudes.tree.tree_coefficients(3)\n"
        "ledger.amplitudes.backgrounds.known_backgrounds()\n"
        "bad = [m for m in sys.modules if m == 'textual' or m.startswith(('textual.', 'ledger.book',"
        " 'ledger.tui', 'ledger.cli', 'ledger.commands'))]\n"
        "print(','.join(bad))\n"
    )
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert result.returncode == 0, result.stderr
    assert result.stdout.strip() == ""
