"""Every key of every screen, and the command palette names."""

from __future__ import annotations

from rich.table import Table
from textual.containers import VerticalScroll
from textual.widgets import Static

from ledger.tui.keys import AREAS
from ledger.tui.screens.base import LedgerScreen


def _key_text(app, key) -> str:
    if not key.key:
        return "—"
    from textual.binding import Binding

    return app.get_key_display(Binding(key.key, key.action, key_display=key.display))


def help_table(app) -> Table:
    table = Table(expand=True, show_edge=False, pad_edge=False, box=None)
    table.add_column("Key", no_wrap=True, style="bold", width=6)
    table.add_column("What it does", ratio=2)
    table.add_column("Palette (^p)", ratio=1)
    for area in AREAS.values():
        table.add_row("", f"[{area.title}]", "", style="bold")
        for key in area.keys:
            table.add_row(_key_text(app, key), key.help or key.label, key.command)
    return table


class HelpScreen(LedgerScreen):
    AREA = "help"

    def body(self):
        with VerticalScroll(id="help-scroll"):
            yield Static(id="help-text")

    def on_mount(self) -> None:
        scroll = self.query_one("#help-scroll")
        scroll.border_title = "Keys (↑↓ PgUp PgDn scroll; the mouse works too)"
        self.query_one("#help-text", Static).update(help_table(self.app))
        scroll.focus()
