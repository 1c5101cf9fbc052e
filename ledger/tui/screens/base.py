"""What every full screen shares: the header with the project state, the key bar."""

from __future__ import annotations

from textual.screen import Screen
from textual.widgets import Header

from ledger.tui.keys import bindings
from ledger.tui.widgets.key_bar import KeyBar


class LedgerScreen(Screen):
    """Subclasses set ``AREA`` (their key table) and yield their widgets from ``body()``."""

    AREA = "app"

    def __init_subclass__(cls, **kwargs):
        cls.BINDINGS = bindings(cls.AREA)  # before textual merges the class bindings
        super().__init_subclass__(**kwargs)

    def compose(self):
        yield Header(icon="α'")
        yield from self.body()
        yield KeyBar()

    def body(self):
        return []

    @property
    def project(self):
        return self.app.project

    def refresh_from_project(self) -> None:
        """Called by the app after the project changed; redraw what depends on it."""

    def action_back(self) -> None:
        self.dismiss()
