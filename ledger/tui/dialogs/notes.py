"""Edit an entry's notes (free text, several lines)."""

from __future__ import annotations

from textual.widgets import TextArea

from ledger.tui.dialogs.base import Dialog


class NotesDialog(Dialog):
    """Returns the edited notes, or None when cancelled."""

    def __init__(self, title: str, notes: str) -> None:
        super().__init__(title)
        self.notes = notes

    def body(self):
        yield TextArea(self.notes, id="notes", soft_wrap=True, show_line_numbers=False)

    def on_mount(self) -> None:
        self.query_one("#notes").focus()

    def answer(self):
        return self.query_one("#notes", TextArea).text.strip()
