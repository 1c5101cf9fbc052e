"""The frame shared by every dialog: a titled box, its keys, ctrl+o / esc."""

from __future__ import annotations

from textual.containers import Vertical
from textual.screen import ModalScreen

from ledger.tui.keys import bindings
from ledger.tui.widgets.key_bar import KeyBar


class Dialog(ModalScreen):
    """A modal box titled ``title``; subclasses fill ``body()`` and implement ``answer()``."""

    AREA = "dialog"
    BINDINGS = bindings("dialog")

    def __init__(self, title: str) -> None:
        super().__init__()
        self.dialog_title = title

    def compose(self):
        with Vertical(classes="dialog-box") as box:
            box.border_title = self.dialog_title
            yield from self.body()
            yield KeyBar(classes="dialog-keys")

    def body(self):
        return []

    def answer(self):
        """The value to return on OK; raise ValueError with a message to refuse."""
        return True

    def action_ok(self) -> None:
        try:
            result = self.answer()
        except ValueError as problem:
            self.notify(str(problem), title="Not accepted", severity="warning")
            return
        self.dismiss(result)

    def action_cancel(self) -> None:
        self.dismiss(None)

