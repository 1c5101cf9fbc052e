"""A question with a few answers as buttons (esc answers ``None``)."""

from __future__ import annotations

from textual.containers import Horizontal
from textual.widgets import Button, Static

from ledger.tui.dialogs.base import Dialog


class ChoiceDialog(Dialog):
    """``choices`` is a list of (answer id, button label); the first is the default."""

    def __init__(self, title: str, question: str, choices: list[tuple[str, str]]) -> None:
        super().__init__(title)
        self.question = question
        self.choices = choices

    def body(self):
        yield Static(self.question, classes="dialog-text", markup=False)
        with Horizontal(classes="dialog-buttons"):
            for answer, label in self.choices:
                yield Button(label, id=f"choice-{answer}", compact=True)

    def on_mount(self) -> None:
        self.query(Button).first().focus()

    def answer(self):
        focused = self.focused
        if isinstance(focused, Button) and focused.id and focused.id.startswith("choice-"):
            return focused.id.removeprefix("choice-")
        return self.choices[0][0]

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss(event.button.id.removeprefix("choice-"))
