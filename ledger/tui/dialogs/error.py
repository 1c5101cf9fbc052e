"""An error shown as a titled dialog with a one-line reason (never a traceback)."""

from __future__ import annotations

from textual.widgets import Button, Static

from ledger.tui.dialogs.base import Dialog


class ErrorDialog(Dialog):
    """Shows ``reason`` under ``title``; any of ctrl+o, esc or the button closes it."""

    def __init__(self, title: str, reason: str) -> None:
        super().__init__(title)
        self.reason = reason

    def body(self):
        yield Static(self.reason, classes="dialog-text", id="error-reason", markup=False)
        yield Button("OK", id="ok", variant="primary", compact=True)

    def on_mount(self) -> None:
        self.add_class("-error")
        self.query_one("#ok").focus()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss(None)
